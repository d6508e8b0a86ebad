"""Radiative moments U_L, V_L of a planar binary, channel by channel.

Through relative 1.5PN (Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 3):

    U_L = d^l I_L/dt^l + (2 G M/c^3) int_0^oo dtau I_L^(l+2)(t - tau) [ln(c tau/(2 r0)) + kappa_l]
          + (G/c^3) (quadratic interactions, l >= 4) + O(c^-5),
    V_L = d^l J_L/dt^l + (2 G M/c^3) int_0^oo dtau J_L^(l+2)(t - tau) [ln(c tau/(2 r0)) + pi_l]
          + (G/c^3) (quadratic interactions, l >= 3) + O(c^-5).

The instantaneous part is computed on the spinor channel of a mode (see
:mod:`stfalgebra.moments.relative_tensor`): each time derivative acts as d/dt - i m phidot on
the channel coefficient, with d/dt along the PN relative orbit
(:class:`stfalgebra.binary.dynamics.OrbitTimeDerivative`). On a circular orbit, r, rdot and
phidot are constants of the motion, so the l derivatives reduce to (-i m omega)^l, the tail
multiplies the harmonic exp(-i m omega t) by the derived factor of
:func:`~stfalgebra.radiative.tails.tail_factor` (M = m at this order) and the quadratic terms
come from :mod:`stfalgebra.radiative.nonlinear`. On a general orbit the tail stays an
unevaluated hereditary integral (:func:`general_orbit_tail`).

Accuracy bookkeeping (:func:`radiative_accuracy`): with Newtonian source moments a radiative
moment is known through relative order 1/2, with 1PN moments through relative 1; with 1PN
moments, the tail and the quadratic interactions through relative 3/2 (non-spinning point-mass
moments have no 1.5PN instantaneous terms). Circular modes whose quadratic interactions the
toolkit does not have are refused beyond relative 1, with the missing interactions named.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache

import sympy as sp

from ..binary.dynamics import OrbitTimeDerivative
from ..errors import OrderBeyondInputsError, RefusedModeError
from ..moments.current import current_moment
from ..moments.mass import mass_moment
from ..moments.relative_tensor import RelativeTensor
from ..pnseries import PNSeries
from ..symbols import M_adm, c, m as total_mass, omega, phidot, r, r0, rdot, t
from .nonlinear import (
    QUADRATIC_INTERACTIONS, QUADRATIC_SOURCE, missing_quadratic_interactions, quadratic_channel_circular,
)
from .phase import absorb_tail_log_into_psi
from .projection import alpha_on_spinor_basis, mode_channel, mode_kind
from .tails import KAPPA_PI_SOURCE, canonical_logs, tail_factor, tail_term

__all__ = [
    "GENERAL_MAX_RELATIVE", "RADIATIVE_MAX_RELATIVE", "RadiativeAccuracy", "radiative_accuracy", "radiative_channel",
    "radiative_channel_circular", "circular_tail_series", "general_orbit_tail",
]

#: Highest relative PN order of the circular radiative moments the toolkit derives.
RADIATIVE_MAX_RELATIVE = sp.Rational(3, 2)

#: Highest relative PN order of the general-orbit (instantaneous) radiative moments.
GENERAL_MAX_RELATIVE = sp.Integer(1)

_PHASES = ("psi", "phi")


@dataclass(frozen=True)
class RadiativeAccuracy:
    """What a mode needs at a given relative order: the source-moment order, whether the
    tails (and with them the quadratic interactions of the moment, where it has any) enter,
    and the relative order through which the result is then known."""

    moment_order: int
    tails: bool
    relative_known: sp.Rational
    provenance: tuple[str, ...]


def _check_mode(l, m) -> None:
    for name, value in (("l", l), ("m", m)):
        if isinstance(value, bool) or not isinstance(value, int):
            raise TypeError(f"{name} must be an int, got {value!r}")
    if l < 2:
        raise ValueError(f"radiative moments start at l = 2, got l = {l}")
    if abs(m) > l:
        raise ValueError(f"|m| must not exceed l: got l = {l}, m = {m}")


def radiative_accuracy(l: int, m: int, relative: sp.Rational, orbit: str) -> RadiativeAccuracy:
    """Choose the inputs for relative order ``relative`` of mode (l, m), or refuse.

    Parameters
    ----------
    l, m:
        The mode (l >= 2, |m| <= l); l + m even is a mass mode (U_L), odd a current mode (V_L).
    relative:
        PN orders beyond the mode's leading term (a non-negative multiple of 1/2).
    orbit:
        "circular" or "general".

    Returns
    -------
    RadiativeAccuracy
        Newtonian moments through relative 1/2; 1PN moments through relative 1; on circular
        orbits, 1PN moments with the tail (and the quadratic interactions of U_ijkl, V_ijk)
        through relative 3/2.

    Raises
    ------
    OrderBeyondInputsError
        General orbits beyond relative 1 (the tail stays an unevaluated integral there, see
        :func:`general_orbit_tail`); circular orbits beyond relative 3/2, or beyond relative 1
        for modes whose quadratic interactions the toolkit lacks (l >= 5 mass, l >= 4
        current): the message names them.

    **Conventions**: relative orders count powers of 1/c^2 beyond the leading term.

    Example
    -------
    >>> radiative_accuracy(2, 2, sp.Rational(3, 2), "circular").tails
    True

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 3 (radiative moments at 1.5PN).
    """
    _check_mode(l, m)
    if orbit not in ("circular", "general"):
        raise ValueError(f"orbit must be 'circular' or 'general', got {orbit!r}")
    relative = sp.sympify(relative)
    kind = mode_kind(l, m)
    moment = "I_L (mass)" if kind == "mass" else "J_L (current)"
    if relative <= sp.Rational(1, 2):
        return RadiativeAccuracy(0, False, sp.Rational(1, 2), (
            f"source moment {moment}, l = {l}: Newtonian, point masses",
            "time derivatives: Newtonian equation of motion dv/dt = -G m x/r^3",
        ))
    eom = "1PN harmonic-coordinate relative acceleration"
    formula = ("Blanchet & Damour (1989) 1PN mass moment" if kind == "mass" else
               "Damour & Iyer (1991) 1PN current moment with the non-compact field terms")
    one_pn = (f"source moment {moment}, l = {l}: 1PN, {formula}, 1PN centre-of-mass relations",
              f"time derivatives: {eom}")
    if relative <= 1:
        return RadiativeAccuracy(1, False, sp.Integer(1), one_pn + (
            "no tail: hereditary terms start at relative 1.5PN",))
    if orbit == "general" and relative > GENERAL_MAX_RELATIVE:
        raise OrderBeyondInputsError(
            f"general-orbit mode ({l},{m}) at relative order {relative}: general-orbit modes are "
            f"derived through relative 1PN; from relative 1.5PN the radiative moment carries "
            f"the hereditary tail, which on a general orbit stays an unevaluated integral "
            f"(Python API: general_orbit_tail({l}, {m}))")
    if relative > RADIATIVE_MAX_RELATIVE:
        raise OrderBeyondInputsError(
            f"mode ({l},{m}) at relative order {relative}: the toolkit derives circular radiative "
            f"moments through relative 1.5PN; relative {relative} needs 2PN source moments "
            f"(and beyond: 1PN corrections to the tails, tails of tails)")
    missing = missing_quadratic_interactions(l, kind)
    if missing:
        symbol = "U_L" if kind == "mass" else "V_L"
        raise OrderBeyondInputsError(
            f"mode ({l},{m}) at relative order {relative}: the relative-1.5PN term of the "
            f"{kind} radiative moment {symbol}, l = {l}, needs the quadratic interactions "
            f"{'; '.join(missing)}, which the toolkit does not have (it has the tails, and the "
            f"quadratic interactions of U_ijkl and V_ijk only)")
    notes = [f"tail: (2 G M/c^3) int_0^oo dtau {moment[0]}_L^(l+2)(t - tau) [ln(c tau/(2 r0)) + "
             f"{'kappa_l' if kind == 'mass' else 'pi_l'}], harmonic factor derived (Abel-regulated), "
             f"M = m at this order; constants: {KAPPA_PI_SOURCE}"]
    if (kind, l) in QUADRATIC_INTERACTIONS:
        terms = ", ".join(term.describe() for term in QUADRATIC_INTERACTIONS[(kind, l)])
        notes.append(f"quadratic interactions (G/c^3) {{{terms}}}: {QUADRATIC_SOURCE}; memory "
                     f"integral: oscillating part on the circular orbit")
    else:
        notes.append("no quadratic interactions at relative 1.5PN for this moment")
    return RadiativeAccuracy(1, True, RADIATIVE_MAX_RELATIVE, one_pn + tuple(notes))


@lru_cache(maxsize=None)
def _source_moment(l: int, c: int, moment_order: int, circular: bool) -> RelativeTensor:
    """The source moment feeding channels with c ell-factors (mass: c = 0, current: c = 1),
    put once on the circular orbit (rdot = 0, phidot = omega) when ``circular``: every m of
    the same l shares it."""
    moment = mass_moment(l, moment_order) if c == 0 else current_moment(l, moment_order)
    return moment.on_circular_orbit(omega) if circular else moment


@lru_cache(maxsize=None)
def _source_channel(l: int, m: int, moment_order: int, circular: bool = False) -> PNSeries:
    p, q, c = mode_channel(l, m)
    moment = _source_moment(l, c, moment_order, circular)
    if circular:
        return moment.channel(p, q, c, circular_frequency=omega)
    return moment.channel(p, q, c)


@lru_cache(maxsize=None)
def radiative_channel(l: int, m: int, moment_order: int) -> PNSeries:
    """Instantaneous radiative moment (U_L or V_L) on the channel of mode (l, m), general orbit.

    A PN series in eps = 1/c whose coefficients are functions of r, rdot, phidot, G, m, nu,
    delta; the factor exp(-i m phi) is implied.
    """
    derivative = OrbitTimeDerivative(moment_order)
    value = _source_channel(l, m, moment_order)
    rotation = -sp.I * m * phidot
    for _ in range(l):
        value = (derivative(value) + value * rotation).expand()
    return value


def circular_tail_series(l: int, m: int, phase: str = "psi") -> PNSeries:
    """Return the tail factor of mode (l, m) of a circular orbit as a PN series in eps = 1/c.

    Parameters
    ----------
    l, m:
        The mode, m != 0 (its kind sets kappa_l or pi_l).
    phase:
        "psi" (default): the factor that multiplies exp(-i m psi), free of r0 and ln(omega);
        "phi": the bare factor of exp(-i m phi), with ln(2 |m| omega r0/c).

    Returns
    -------
    PNSeries
        ``1 + eps^3 (2 G M K(m omega))`` (M = m at this order, K from
        :func:`~stfalgebra.radiative.tails.tail_kernel`), known through relative 3/2.

    **Conventions**: harmonics exp(-i m omega t); ``../shared/conventions.md`` for psi.

    Example
    -------
    >>> circular_tail_series(2, 2).coefficient(sp.Rational(3, 2))
    2*pi*G*m*omega

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 3 and sec. 9.4.
    """
    _check_mode(l, m)
    if phase not in _PHASES:
        raise ValueError(f"phase must be 'psi' or 'phi', got {phase!r}")
    if m == 0:
        raise RefusedModeError(f"mode ({l},0): m = 0 modes of circular orbits come from the "
                               f"non-linear memory, which the toolkit does not compute")
    return _circular_tail_series(l, m, phase)


@lru_cache(maxsize=None)
def _circular_tail_series(l: int, m: int, phase: str) -> PNSeries:
    factor = tail_factor(l, mode_kind(l, m), m * omega, adm_mass=total_mass)
    if phase == "psi":
        factor = absorb_tail_log_into_psi(factor, m, adm_mass=total_mass)
        if factor.has(r0) or factor.has(sp.log(omega)):
            raise AssertionError(f"tail factor of ({l},{m}) in psi still has r0 or ln omega: {factor}")
    correction = canonical_logs(sp.expand((factor - 1) * c**3))
    if correction.subs(sp.log(c), 0).has(c):
        raise AssertionError(f"tail factor of ({l},{m}) is not 1 + O(c^-3): {factor}")
    return PNSeries({0: 1, sp.Rational(3, 2): correction}, RADIATIVE_MAX_RELATIVE)


@lru_cache(maxsize=None)
def radiative_channel_circular(l: int, m: int, accuracy: RadiativeAccuracy,
                               phase: str = "psi") -> PNSeries:
    """The radiative moment (U_L or V_L) on the channel of mode (l, m), circular orbit.

    Parameters
    ----------
    l, m:
        The mode.
    accuracy:
        From :func:`radiative_accuracy` (circular orbit).
    phase:
        "psi" (default) or "phi": the phase variable of the implied exponential
        exp(-i m psi) or exp(-i m phi); matters only when the tails enter.

    Returns
    -------
    PNSeries
        In eps = 1/c, coefficients in r, omega, G, m, nu, delta: (-i m omega)^l times the
        source channel (rdot = 0, phidot = omega: the constants of the motion are unaffected
        by d/dt), times :func:`circular_tail_series`, plus the quadratic interactions
        (:func:`~stfalgebra.radiative.nonlinear.quadratic_channel_circular`) when
        ``accuracy.tails``.

    **Conventions**: ``../shared/conventions.md``; M = m in the tail.

    Example
    -------
    >>> acc = radiative_accuracy(2, 2, 0, "circular")
    >>> radiative_channel_circular(2, 2, acc).coefficient(0)
    -m*nu*omega**2*r**2

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 3 (radiative moments at 1.5PN).
    """
    if phase not in _PHASES:
        raise ValueError(f"phase must be 'psi' or 'phi', got {phase!r}")
    value = _source_channel(l, m, accuracy.moment_order, circular=True)
    value = value * (-sp.I * m * omega)**l
    if not accuracy.tails:
        return value
    value = value * circular_tail_series(l, m, phase)
    quadratic = quadratic_channel_circular(l, m)
    if quadratic.orders:
        value = value + quadratic
    return value.truncate(accuracy.relative_known).map_coefficients(sp.expand)


def general_orbit_tail(l: int, m: int) -> sp.Expr:
    """Return the tail of the (l, m) projection of the radiative moment on a general orbit.

    Parameters
    ----------
    l, m:
        The mode (l >= 2, |m| <= l); l + m even projects U_L, odd projects V_L.

    Returns
    -------
    sympy.Expr
        ``alpha_L^lm U_L^tail = (2 G M/c^3) TailIntegral(l, kind, alpha_L^lm I_L(t))``
        (likewise V_L with J_L), unevaluated; the integrand is the Newtonian source moment
        projected on alpha_L^lm, ``exp(-i m phi(t)) C(r(t), r'(t), phi'(t))``, written with
        the undefined functions r(t), phi(t). The general-orbit modes of
        :func:`~stfalgebra.radiative.modes.derive_mode` stop at relative 1PN; this object
        shows where the 1.5PN tail enters. With r(t) = r, phi(t) = omega t substituted,
        :meth:`~stfalgebra.radiative.tails.TailIntegral.evaluate_harmonics` gives the
        circular-orbit tail used by :func:`radiative_channel_circular`.

    **Conventions**: alpha_L^lm as in ``../shared/conventions.md``; M the ADM mass, r0 the
    constant of the tail integrals.

    Example
    -------
    >>> print(general_orbit_tail(2, 2))
    2*G*M*TailIntegral(2, mass, sqrt(30)*sqrt(pi)*m*nu*r(t)**2*exp(-2*I*phi(t))/15)/c**3

    References
    ----------
    Blanchet & Damour, Phys. Rev. D 46, 4304 (1992); Blanchet, Living Rev. Relativ. 17, 2
    (2014), sec. 3.
    """
    _check_mode(l, m)
    kind = mode_kind(l, m)
    p, q, cc = mode_channel(l, m)
    coefficient = _source_channel(l, m, 0).coefficient(0)
    radius = sp.Function("r", positive=True)(t)
    angle = sp.Function("phi", real=True)(t)
    coefficient = coefficient.subs({rdot: sp.Derivative(radius, t), phidot: sp.Derivative(angle, t)})
    coefficient = coefficient.subs(r, radius)
    projected = alpha_on_spinor_basis(l, m, p, q, cc) * coefficient * sp.exp(-sp.I * m * angle)
    return tail_term(l, kind, sp.expand(projected), t, adm_mass=M_adm)
