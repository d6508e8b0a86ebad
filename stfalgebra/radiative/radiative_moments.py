"""Radiative moments U_L, V_L of a planar binary on the channel of a mode: the evaluators of the
table of contributions.

Through relative 1.5PN (Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 3):

    U_L = d^l I_L/dt^l + (2 G M/c^3) int_0^oo dtau I_L^(l+2)(t - tau) [ln(c tau/(2 r0)) + kappa_l]
          + (G/c^3) (quadratic interactions, l >= 4) + O(c^-5),
    V_L = d^l J_L/dt^l + (2 G M/c^3) int_0^oo dtau J_L^(l+2)(t - tau) [ln(c tau/(2 r0)) + pi_l]
          + (G/c^3) (quadratic interactions, l >= 3) + O(c^-5).

Each function named in a row of :data:`~stfalgebra.radiative.contributions.CONTRIBUTIONS` gives
its part of U_L (mass modes) or V_L (current modes) on the spinor channel (p, q, c) of mode
(l, m) (see :mod:`stfalgebra.moments.orbit_tensor`), as a PN series in eps = 1/c with exact
engine coefficients; the factor exp(-i m phi) is implied. The instantaneous part differentiates
the channel l times, each time as d/dt - i m phidot with d/dt along the PN relative orbit; on
a circular orbit r and phidot = omega are constants of the motion and the l derivatives are
(-i m omega)^l. The tail multiplies the harmonic exp(-i m omega t) by the derived factor of
:func:`~stfalgebra.radiative.tails.tail_factor` (M = m at this order); the quadratic terms come
from :mod:`stfalgebra.radiative.nonlinear`. On a general orbit the tail stays an unevaluated
hereditary integral (:func:`general_orbit_tail`).

At relative 2.5PN the tail is evaluated with the 1PN moments and the ADM mass M = m + E/c^2
(:func:`adm_tail_channel`), and the reaction, canonical and quadratic parts of U_ij come from
:mod:`stfalgebra.radiative.circular_reaction` and :mod:`stfalgebra.radiative.circular_quadratic`.
"""

from __future__ import annotations

from fractions import Fraction
from functools import lru_cache

from ..binary.orbit_derivative import OrbitTimeDerivative
from ..errors import RefusedModeError
from ..exact import ExactPolynomial, log_of_rational
from ..lazy_sympy import sp
from ..moments.current import current_moment
from ..moments.mass import mass_moment
from ..moments.orbit_tensor import OrbitTensor
from ..orders import PNOrder
from ..pnseries import PNSeries
from .contributions import Contribution, check_mode, mode_kind
from .projection import alpha_on_spinor_basis, mode_channel

__all__ = [
    "instantaneous_channel", "tail_channel", "quadratic_channel", "source_channel", "tail_correction_in_psi",
    "circular_tail_series", "general_orbit_tail", "adm_mass_ratio", "adm_tail_channel", "instantaneous_2pn_circular",
]

_PHASES = ("psi", "phi")




@lru_cache(maxsize=None)
def _source_moment(l: int, c: int, pn_order: int, circular: bool) -> OrbitTensor:
    """The source moment feeding channels with c ell-factors (mass: c = 0, current: c = 1),
    put once on the circular orbit (rdot = 0) when ``circular``: every m of the same l shares it."""
    moment = mass_moment(l, pn_order) if c == 0 else current_moment(l, pn_order)
    return moment.on_circular_orbit() if circular else moment


@lru_cache(maxsize=None)
def source_channel(l: int, m: int, pn_order: int, circular: bool = False) -> PNSeries:
    """The source moment (I_L or J_L) on the channel of mode (l, m): a PN series in 1/c.

    Example
    -------
    >>> source_channel(2, 2, 0)
    PNSeries(nu*m*r**2/4 + O(eps**2))
    """
    check_mode(l, m)
    p, q, c = mode_channel(l, m)
    moment = _source_moment(l, c, pn_order, circular)
    return moment.channel(p, q, c, circular_frequency=True if circular else None)


def _rotation(m: int) -> ExactPolynomial:
    return -ExactPolynomial("I") * m * ExactPolynomial("phidot")


@lru_cache(maxsize=None)
def _instantaneous(l: int, m: int, pn_order: int, eom_order: int, orbit: str) -> PNSeries:
    if orbit == "circular":
        return source_channel(l, m, pn_order, circular=True) * (_rotation(m) ** l)
    derivative = OrbitTimeDerivative(eom_order)
    value = source_channel(l, m, pn_order)
    rotation = _rotation(m)
    for _ in range(l):
        value = derivative(value) + value * rotation
    return value


def instantaneous_channel(l: int, m: int, *, row: Contribution, orbit: str) -> PNSeries:
    """The instantaneous part ``d^l I_L/dt^l`` (or ``d^l J_L/dt^l``) on the channel of (l, m).

    Parameters
    ----------
    l, m:
        The mode.
    row:
        The row of the table (its ``needs`` give the source-moment and equation-of-motion
        orders).
    orbit:
        "circular" (``rdot = 0``, ``phidot = omega``) or "general".

    Returns
    -------
    PNSeries
        In eps = 1/c, engine coefficients in r, 1/r, rdot, phidot, G, m, nu, delta, I.

    Example
    -------
    >>> from stfalgebra.radiative.contributions import CONTRIBUTIONS
    >>> instantaneous_channel(2, 2, row=CONTRIBUTIONS[0], orbit="circular")
    PNSeries(-nu*m*r**2*phidot**2 + O(eps**2))

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 3 (U_L = I_L^(l) + ...).
    """
    return _instantaneous(l, m, row.need("source moments"), row.need("equations of motion"), orbit)


def conservative_instantaneous_channel(l: int, m: int, *, row: Contribution, orbit: str) -> PNSeries:
    """:func:`instantaneous_channel` of a conservative row known beyond its equations of motion.

    The 2PN harmonic-coordinate equations of motion and the 2PN current moments have no
    conservative c^-5 term: the c^-5 part of d^l J_L/dt^l (the 2.5PN terms of J_L and the
    reaction acceleration in the derivatives) is the radiation-reaction row of the table. On a
    general orbit the derivative along the 2PN motion is therefore known through the row's
    ``known_through`` (one half-order beyond the motion), with no term at c^-5; on the circle
    the channel already is.

    Example
    -------
    >>> from stfalgebra.radiative.contributions import CONTRIBUTIONS
    >>> row = next(r for r in CONTRIBUTIONS if r.evaluator and r.evaluator.endswith("conservative_instantaneous_channel"))
    >>> conservative_instantaneous_channel(2, 1, row=row, orbit="general").known_through
    PNOrder(5/2)
    """
    value = instantaneous_channel(l, m, row=row, orbit=orbit)
    known2 = int(2 * row.known_through)
    if orbit == "circular" or value._known2 >= known2:
        return value
    return PNSeries._from_trusted(dict(value._terms), known2)


def instantaneous_2pn_circular(l: int, m: int) -> PNSeries:
    """``d^l I_L/dt^l`` of the 2PN mass moment on the channel of (l, m), circular orbit (2PN dynamics)."""
    return _instantaneous(l, m, 2, 2, "circular")


def tail_correction_in_psi(l: int, m: int) -> ExactPolynomial:
    """The coefficient of 1/c^3 in the tail factor of the (l, m) harmonic, in the phase psi.

    ``(2 G M omega) [(pi/2) |m| + i m (ln(|m|/2) + 11/12 - k_l)]`` with M = m at this order,
    ``omega = phidot`` on the circular orbit and ``k_l`` the tail constant
    derived by the MPM iteration (:func:`~stfalgebra.radiative.interaction_table.derived_tail_constant`):
    the hereditary integral of one harmonic
    ``exp(-i s t)``, ``(-i s)^2 int_0^oo exp(i s tau) [ln(c tau/(2 r0)) + k_l] dtau =
    (pi/2)|s| + i s [gamma_E + ln(2 |s| r0/c) - k_l]`` (Abel-regulated Laplace transforms:
    :func:`~stfalgebra.radiative.tails.hereditary_log_integral`), times the change of phase
    variable ``exp(-i m phi) = exp(-i m psi)[1 - i m (2 G M omega/c^3) ln(omega/omega_0)]``
    (``../shared/conventions.md``), which removes ln(omega) and r0. The tests check it against
    the tail factor derived with sympy (:func:`circular_tail_series`).

    Example
    -------
    >>> print(tail_correction_in_psi(2, 2))
    2*G*m*phidot*pi
    """
    from .interaction_table import derived_tail_constant

    check_mode(l, m)
    if m == 0:
        raise RefusedModeError(f"mode ({l},0): m = 0 modes of circular orbits have no oscillating tail")
    constant = derived_tail_constant(l, mode_kind(l, m))
    bracket = (ExactPolynomial("pi") * Fraction(abs(m), 2)
               + ExactPolynomial("I") * m * (log_of_rational(Fraction(abs(m), 2)) + Fraction(11, 12) - constant))
    return 2 * ExactPolynomial("G") * ExactPolynomial("m") * ExactPolynomial("phidot") * bracket


@lru_cache(maxsize=None)
def _tail_piece(l: int, m: int) -> PNSeries:
    if m == 0:
        # the non-oscillating part of a circular orbit's moments is constant: no tail
        return PNSeries._from_trusted({}, float("inf"))
    leading = source_channel(l, m, 0, circular=True) * (_rotation(m) ** l)
    # the Newtonian channel is known through relative 1/2 (no 0.5PN term), so the product is
    # known through relative 2, where the tail's next correction (2.5PN) starts
    return leading * PNSeries._from_trusted({3: tail_correction_in_psi(l, m)}, 4)


def tail_channel(l: int, m: int, *, row: Contribution, orbit: str) -> PNSeries:
    """The leading tail on the channel of (l, m), circular orbit, in the phase psi.

    The Newtonian channel times ``(-i m omega)^l`` times the relative tail factor minus one
    (:func:`circular_tail_series`): the factor that multiplies exp(-i m psi), free of r0 and
    of ln(omega).

    Example
    -------
    >>> from stfalgebra.radiative.contributions import CONTRIBUTIONS
    >>> tail = [row for row in CONTRIBUTIONS if row.family == "tail"][0]
    >>> tail_channel(2, 2, row=tail, orbit="circular").orders
    (PNOrder(3/2),)
    """
    if orbit != "circular":
        raise ValueError(f"the tail is evaluated on circular orbits only, got {orbit!r}")
    return _tail_piece(l, m)


@lru_cache(maxsize=None)
def adm_mass_ratio() -> PNSeries:
    """M/m, the ADM mass of the binary over its total mass, through relative 1PN.

    ``M = m + E/c^2`` with E the conserved (binding) energy of the binary
    (:func:`~stfalgebra.binary.cited_inputs.energy_per_reduced_mass`, its Newtonian term, times
    mu = nu m): ``M/m = 1 + nu (E/mu)/c^2 + O(c^-4)``, in r, rdot, phidot; on the circular orbit
    ``1 - nu x/2``.

    Example
    -------
    >>> adm_mass_ratio()
    PNSeries(1 + (nu*rdot**2/2 - nu*G*m*r**(-1) + nu*r**2*phidot**2/2)*eps**2 + O(eps**4))

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 3 (M, the ADM mass, in the tails and in psi).
    """
    from ..binary.cited_inputs import energy_per_reduced_mass
    from ..exact import engine_symbols

    s = engine_symbols()
    return PNSeries._from_trusted({0: ExactPolynomial(1), 2: s.nu * energy_per_reduced_mass(s)[0]}, 3)


@lru_cache(maxsize=None)
def _adm_tail_piece(l: int, m: int, adm_mass: bool) -> PNSeries:
    if m == 0:
        return PNSeries._from_trusted({}, float("inf"))
    # on the circle the 1PN channel is one harmonic exp(-i m omega t): its tail integral is the
    # same harmonic factor times the channel
    leading = source_channel(l, m, 1, circular=True) * (_rotation(m) ** l)
    # tail factor minus one, known through relative 5/2 (tails of tails enter at 3)
    factor = PNSeries._from_trusted({3: tail_correction_in_psi(l, m)}, 5)
    if adm_mass:
        # M enters both the tail (2 G M/c^3) and psi (2 G M omega/c^3 ln omega), so the factor
        # in psi scales with M/m
        ratio = adm_mass_ratio().map_coefficients(lambda v: v.substitute({"rdot": 0}))
        factor = factor * ratio
    return (leading * factor).truncate(PNOrder(5, 2))


def adm_tail_channel(l: int, m: int, *, row: Contribution, orbit: str, adm_mass: bool = True) -> PNSeries:
    """The tail through relative 2.5PN on the channel of (l, m), circular orbit, in the phase psi:
    the 1PN moment's channel times ``(-i m omega)^l`` times the tail factor minus one, with the
    ADM mass M = m + E/c^2 (:func:`adm_mass_ratio`) in the tail and in psi.

    ``adm_mass=False`` puts M = m (for the test that the change is what the ADM mass implies).

    Example
    -------
    >>> from stfalgebra.radiative.contributions import CONTRIBUTIONS
    >>> row = next(row for row in CONTRIBUTIONS if row.family == "tail" and row.known_through == PNOrder(5, 2))
    >>> adm_tail_channel(2, 2, row=row, orbit="circular").orders
    (PNOrder(3/2), PNOrder(5/2))

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 3 (U_L with the tail, M the ADM mass) and
    sec. 9.4 (psi with M).
    """
    if orbit != "circular":
        raise ValueError(f"the tail is evaluated on circular orbits only, got {orbit!r}")
    return _adm_tail_piece(l, m, bool(adm_mass))


@lru_cache(maxsize=None)
def _newtonian_circular(value: ExactPolynomial) -> ExactPolynomial:
    """G^k -> (phidot^2 r^3/m)^k: Kepler's law G m = omega^2 r^3 of the Newtonian circular orbit
    (enough inside a term that is already of relative order 3/2), so that every term carries
    the phidot the memory integral i/(m phidot) divides by."""
    phidot, radius, mass = ExactPolynomial("phidot"), ExactPolynomial("r"), ExactPolynomial("m")
    total = ExactPolynomial(0)
    for power, coefficient in value.coefficients_in("G").items():
        total = total + coefficient / mass**power * (phidot**2 * radius**3) ** power
    return total


def _quadratic_piece(l: int, m: int) -> PNSeries:
    """(G/c^3) times the quadratic terms of U_L or V_L on the channel of (l, m), circular orbit,
    in the engine: the products of Newtonian moments put on the orbit, the memory integral of a
    harmonic exp(-i m omega t) being ``i/(m omega)`` (:func:`~stfalgebra.radiative.tails.hereditary_harmonic_integral`).

    For m = 0 the instantaneous products give the constant (DC) part; a memory integral there
    grows with the whole past of the inspiral and is refused."""
    from .nonlinear import _term_tensor, quadratic_terms

    p, q, c = mode_channel(l, m)
    kind = mode_kind(l, m)
    terms = quadratic_terms(l, kind)
    if m == 0 and any(term.hereditary for term in terms):
        raise RefusedModeError(f"mode ({l},0): the non-oscillating (m = 0) part of the non-linear memory is "
                               f"not computed")
    memory = ExactPolynomial("I") / m if m else None
    total = PNSeries._from_trusted({}, float("inf"))
    for term in terms:
        channel = _term_tensor(term).on_circular_orbit().channel(p, q, c, circular_frequency=True)
        if term.hereditary:
            channel = channel.map_coefficients(lambda v: _newtonian_circular(v) * memory / ExactPolynomial("phidot"))
        total = total + channel
    return (total * ExactPolynomial("G")).shift(PNOrder(3, 2))


def quadratic_channel(l: int, m: int, *, row: Contribution, orbit: str) -> PNSeries:
    """The quadratic interactions of U_L or V_L on the channel of (l, m), circular orbit.

    The terms are derived by the MPM iteration (:func:`~stfalgebra.radiative.nonlinear.quadratic_terms`).

    Example
    -------
    >>> from stfalgebra.radiative.contributions import CONTRIBUTIONS
    >>> quad = [row for row in CONTRIBUTIONS if row.family == "quadratic"][0]
    >>> quadratic_channel(4, 4, row=quad, orbit="circular").leading_order
    PNOrder(3/2)
    """
    if orbit != "circular":
        raise ValueError(f"the quadratic interactions are evaluated on circular orbits only, got {orbit!r}")
    return _quadratic_piece(l, m)


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
    check_mode(l, m)
    if phase not in _PHASES:
        raise ValueError(f"phase must be 'psi' or 'phi', got {phase!r}")
    if m == 0:
        raise RefusedModeError(f"mode ({l},0): m = 0 modes of circular orbits come from the "
                               f"non-linear memory, which the toolkit does not compute")
    return _circular_tail_series(l, m, phase)


@lru_cache(maxsize=None)
def _circular_tail_series(l: int, m: int, phase: str) -> PNSeries:
    from ..symbols import c, m as total_mass, omega, r0
    from .psi_phase import absorb_tail_log_into_psi
    from .tails import canonical_logs, tail_factor

    factor = tail_factor(l, mode_kind(l, m), m * omega, adm_mass=total_mass)
    if phase == "psi":
        factor = absorb_tail_log_into_psi(factor, m, adm_mass=total_mass)
        if factor.has(r0) or factor.has(sp.log(omega)):
            raise AssertionError(f"tail factor of ({l},{m}) in psi still has r0 or ln omega: {factor}")
    correction = canonical_logs(sp.expand((factor - 1) * c**3))
    if correction.subs(sp.log(c), 0).has(c):
        raise AssertionError(f"tail factor of ({l},{m}) is not 1 + O(c^-3): {factor}")
    return PNSeries({0: 1, sp.Rational(3, 2): correction}, PNOrder(2))


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
    from ..symbols import M_adm, phidot, r, rdot, t
    from .tails import tail_term

    check_mode(l, m)
    kind = mode_kind(l, m)
    p, q, cc = mode_channel(l, m)
    coefficient = sp.sympify(source_channel(l, m, 0).coefficient(0))
    radius = sp.Function("r", positive=True)(t)
    angle = sp.Function("phi", real=True)(t)
    coefficient = coefficient.subs({rdot: sp.Derivative(radius, t), phidot: sp.Derivative(angle, t)})
    coefficient = coefficient.subs(r, radius)
    projected = alpha_on_spinor_basis(l, m, p, q, cc) * coefficient * sp.exp(-sp.I * m * angle)
    return tail_term(l, kind, sp.expand(projected), t, adm_mass=M_adm)
