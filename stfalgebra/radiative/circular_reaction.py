"""The 2.5PN (radiation-reaction) parts of U_ij on the inspiralling circular orbit: evaluators of
the table of contributions.

At relative 2.5PN the mass radiative moment U_L = M_L^(l) + ... receives, besides the tail
(:func:`~stfalgebra.radiative.radiative_moments.adm_tail_channel`) and the quadratic interactions
(:mod:`stfalgebra.radiative.circular_quadratic` for l = 2):

1. the 2.5PN term of the source moment I_L (derived for every l, :mod:`stfalgebra.moments.mass_reaction`);
2. the l-th time derivative of the Newtonian I_L taken along the *inspiralling* orbit: the
   2.5PN reaction acceleration a_RR (:func:`~stfalgebra.binary.cited_inputs.acceleration_reaction_n_factor`,
   ``..._v_factor``) in d(rdot)/dt and d(phidot)/dt, and the radial velocity of the inspiral
   ``rdot_RR`` (:func:`inspiral_radial_velocity`), derived here from a_RR;
3. the canonical correction ``M_ij - I_ij = (4 G/c^5)[W^(2) I_ij - W^(1) I_ij^(1)]``
   (:mod:`stfalgebra.moments.canonical`), differentiated twice (l = 2 here; the other l are
   rows of their own).

On the quasi-circular orbit the radial equation keeps ``phidot^2 = G m/r^3 (1 + O(c^-2))`` with
no 2.5PN term (the radial reaction force is proportional to rdot, so O(c^-10)); the tangential
one, ``d(r^2 phidot)/dt = r a_lambda``, with ``d phidot/dt = -(3/2)(phidot/r) rdot`` from that
relation, gives ``rdot_RR = 2 a_lambda/phidot = 2 r beta`` (``a = alpha n + beta v``, at
``rdot = 0``): ``-(64/5) nu (G m)^3/(c^5 r^3)``. A general channel ``P(r, rdot, phidot)`` along
the inspiral is then ``P(r, 0, omega) + rdot_RR dP/drdot(r, 0, omega) + O(c^-10)``.

**Conventions**: channels of :mod:`stfalgebra.moments.orbit_tensor` (the factor exp(-i m phi)
implied), PN series in eps = 1/c with engine coefficients; harmonic coordinates.
"""

from __future__ import annotations

from functools import lru_cache

from ..binary.cited_inputs import (
    REACTION_ORDER, acceleration_n_factor, acceleration_reaction_n_factor, acceleration_reaction_v_factor,
    acceleration_v_factor,
)
from ..binary.orbit_derivative import OrbitTimeDerivative, derivative_with_rates
from ..exact import ExactPolynomial, engine_symbols
from ..moments.canonical import canonical_quadrupole_correction
from ..moments.mass_reaction import reaction_mass_moment_circular
from ..orders import PNOrder
from ..pnseries import PNSeries
from .contributions import Contribution, check_mode, mode_kind
from .projection import mode_channel

__all__ = ["inspiral_radial_velocity", "inspiral_rates", "inspiral_derivative_channel",
           "reaction_instantaneous_channel", "reaction_instantaneous_general_channel", "canonical_correction_channel",
           "reaction_current_channel", "reaction_current_general_channel"]

_REACTION2 = REACTION_ORDER.twice


def _rotation(m: int) -> ExactPolynomial:
    return -ExactPolynomial("I") * m * ExactPolynomial("phidot")


@lru_cache(maxsize=None)
def inspiral_radial_velocity() -> ExactPolynomial:
    """The coefficient of 1/c^5 in rdot on the inspiralling circular orbit: ``2 r beta`` at rdot = 0.

    Returns
    -------
    ExactPolynomial
        In G, m, nu, r, phidot (Kepler's law not applied; the circular reduction applies it).

    Example
    -------
    >>> print(inspiral_radial_velocity())
    -16*nu*G**2*m**2*phidot**2/5 - 48*nu*G**3*m**3*r**(-3)/5

    References
    ----------
    Derived (module docstring) from the cited reaction acceleration (Blanchet, Living Rev.
    Relativ. 17, 2 (2014), sec. 7.3); with Kepler's law it is ``-(64/5) nu (G m)^3/(c^5 r^3)``,
    the rate the energy balance with the quadrupole flux gives (tested).
    """
    s = engine_symbols()
    beta = acceleration_reaction_v_factor(s)[REACTION_ORDER].substitute({"rdot": 0})
    return 2 * s.r * beta


@lru_cache(maxsize=None)
def inspiral_rates() -> tuple[dict[int, ExactPolynomial], dict[int, ExactPolynomial]]:
    """d(rdot)/dt and d(phidot)/dt, Newtonian plus the 2.5PN reaction, {doubled order: piece}
    (polar kinematics of :mod:`stfalgebra.binary.orbit_derivative`).

    Example
    -------
    >>> sorted(inspiral_rates()[1])
    [0, 5]
    """
    s = engine_symbols()
    pieces = {0: (acceleration_n_factor(s)[0], acceleration_v_factor(s).get(0, ExactPolynomial(0))),
              _REACTION2: (acceleration_reaction_n_factor(s)[REACTION_ORDER],
                           acceleration_reaction_v_factor(s)[REACTION_ORDER])}
    rdot_rate: dict[int, ExactPolynomial] = {}
    phidot_rate: dict[int, ExactPolynomial] = {}
    for k, (alpha, beta) in pieces.items():
        a_n = alpha + beta * s.rdot                      # a = alpha n + beta v
        a_lambda = beta * s.r * s.phidot
        rdot_rate[k] = a_n + (s.r * s.phidot**2 if k == 0 else 0)
        phidot_rate[k] = a_lambda / s.r + (-2 * s.rdot * s.phidot / s.r if k == 0 else 0)
    return rdot_rate, phidot_rate


def _channel_derivatives(value: dict[int, ExactPolynomial], rates: tuple, m: int, times: int
                         ) -> dict[int, ExactPolynomial]:
    """``times`` time derivatives of a channel {doubled order: coefficient} of azimuthal number m
    (the rotation of the channel and the chain rule with ``rates``), kept through relative 5/2:
    products of two reaction terms are O(c^-10)."""
    rotation = _rotation(m)
    for _ in range(times):
        out: dict[int, ExactPolynomial] = {}
        for k, coefficient in value.items():
            for offset, piece in [(0, coefficient * rotation)] + list(derivative_with_rates(coefficient, *rates)):
                if k + offset <= _REACTION2:
                    out[k + offset] = out[k + offset] + piece if k + offset in out else piece
        value = out
    return value


@lru_cache(maxsize=None)
def inspiral_derivative_channel(l: int, m: int) -> PNSeries:
    """The 2.5PN part of ``d^l I_L/dt^l`` (Newtonian I_L; for a current mode, l + m odd, the
    Newtonian J_L) on the channel of (l, m) along the inspiralling circular orbit: the reaction
    acceleration in the derivatives and rdot_RR.

    Returns
    -------
    PNSeries
        The single order 5/2, known through 5/2, at ``rdot = 0``.

    Example
    -------
    >>> inspiral_derivative_channel(2, 2).orders
    (PNOrder(5/2),)
    """
    from .radiative_moments import source_channel

    check_mode(l, m)
    value = _channel_derivatives({0: source_channel(l, m, 0).coefficient(0)}, inspiral_rates(), m, l)
    newtonian = value.get(0, ExactPolynomial(0))
    reaction = value.get(_REACTION2, ExactPolynomial(0)).substitute({"rdot": 0})
    along_inspiral = newtonian.derivative("rdot").substitute({"rdot": 0}) * inspiral_radial_velocity()
    return PNSeries._from_trusted({_REACTION2: reaction + along_inspiral}, _REACTION2)


def _check_quadrupole(l: int, m: int, orbit: str) -> None:
    check_mode(l, m)
    if l != 2 or mode_kind(l, m) != "mass":
        raise ValueError(f"the 2.5PN reaction terms are evaluated for the mass quadrupole only, got ({l},{m})")
    if orbit != "circular":
        raise ValueError(f"the 2.5PN reaction terms are evaluated on circular orbits only, got {orbit!r}")


@lru_cache(maxsize=None)
def _reaction_instantaneous(l: int, m: int) -> PNSeries:
    from .radiative_moments import instantaneous_2pn_circular

    p, q, c = mode_channel(l, m)
    odd = reaction_mass_moment_circular(l).channel(p, q, c, circular_frequency=True) * (_rotation(m) ** l)
    total = instantaneous_2pn_circular(l, m) + odd + inspiral_derivative_channel(l, m)
    return total.truncate(PNOrder(5, 2))


def reaction_instantaneous_channel(l: int, m: int, *, row: Contribution, orbit: str) -> PNSeries:
    """``d^l I_L/dt^l`` on the channel of a mass mode (l, m) through relative 2.5PN on the
    inspiralling circular orbit: the 2PN moment with the 2PN dynamics, plus the derived 2.5PN
    term of I_L and the reaction in the derivatives (module docstring).

    Example
    -------
    >>> from stfalgebra.radiative.contributions import CONTRIBUTIONS
    >>> row = next(row for row in CONTRIBUTIONS if row.evaluator and "reaction_instantaneous" in str(row.evaluator))
    >>> reaction_instantaneous_channel(2, 2, row=row, orbit="circular").orders[-1]
    PNOrder(5/2)
    """
    check_mode(l, m)
    if mode_kind(l, m) != "mass":
        raise ValueError(f"the 2.5PN reaction terms are evaluated for mass moments, got ({l},{m})")
    if orbit != "circular":
        raise ValueError(f"the 2.5PN reaction terms are evaluated on circular orbits only, got {orbit!r}")
    return _reaction_instantaneous(l, m)


@lru_cache(maxsize=None)
def _general_rates() -> tuple[dict[int, ExactPolynomial], dict[int, ExactPolynomial]]:
    """d(rdot)/dt and d(phidot)/dt of the 2PN dynamics plus the 2.5PN reaction, {doubled order: piece}."""
    from ..binary.orbit_derivative import _rates

    conservative = _rates(2)
    reaction = inspiral_rates()
    return tuple({**dict(base), _REACTION2: extra[_REACTION2]} for base, extra in zip(conservative, reaction))


@lru_cache(maxsize=None)
def _reaction_instantaneous_general(l: int, m: int) -> PNSeries:
    from ..moments.mass_reaction import reaction_mass_moment
    from .radiative_moments import source_channel

    p, q, c = mode_channel(l, m)
    moment = source_channel(l, m, 2) + reaction_mass_moment(l).channel(p, q, c)
    value = {k: moment.coefficient(PNOrder(k, 2)) for k in range(_REACTION2 + 1)}
    value = _channel_derivatives({k: v for k, v in value.items() if not v.is_zero()}, _general_rates(), m, l)
    return PNSeries._from_trusted({k: v for k, v in value.items() if not v.is_zero()}, _REACTION2)


def reaction_instantaneous_general_channel(l: int, m: int, *, row: Contribution, orbit: str) -> PNSeries:
    """``d^l I_L/dt^l`` on the channel of a mass mode (l, m) through relative 2.5PN on a general
    orbit: the 2PN moment plus its derived 2.5PN term (:func:`~stfalgebra.moments.mass_reaction.
    reaction_mass_moment`), differentiated along the 2PN + 2.5PN motion (the cited reaction
    acceleration in d(rdot)/dt and d(phidot)/dt). The instantaneous part only: the canonical
    corrections and the quadratic interactions at 2.5PN are other rows.

    Example
    -------
    >>> from stfalgebra.radiative.contributions import CONTRIBUTIONS
    >>> row = next(row for row in CONTRIBUTIONS if "reaction_instantaneous_general" in str(row.evaluator))
    >>> reaction_instantaneous_general_channel(2, 2, row=row, orbit="general").orders[-1]
    PNOrder(5/2)
    """
    check_mode(l, m)
    if mode_kind(l, m) != "mass":
        raise ValueError(f"the 2.5PN reaction terms are evaluated for mass moments, got ({l},{m})")
    if orbit != "general":
        raise ValueError(f"this evaluator is for general orbits, got {orbit!r}")
    return _reaction_instantaneous_general(l, m)


@lru_cache(maxsize=None)
def _canonical_correction(m: int) -> PNSeries:
    from .radiative_moments import source_channel

    derivative = OrbitTimeDerivative(0)
    rotation = _rotation(m)
    value = canonical_quadrupole_correction(source_channel(2, m, 0), derivative, rotation)
    for _ in range(2):
        value = derivative(value) + value * rotation
    value = value.truncate(PNOrder(5, 2))
    return value.map_coefficients(lambda v: v.substitute({"rdot": 0}))


def canonical_correction_channel(l: int, m: int, *, row: Contribution, orbit: str) -> PNSeries:
    """``d^2 (M_ij - I_ij)/dt^2`` on the channel of (2, m), circular orbit (``rdot = 0``); it
    vanishes there once Kepler's law is applied (W = nu m r rdot/3 and its derivatives vanish on
    a circle), which the circular reduction does.

    Example
    -------
    >>> from stfalgebra.binary.circular_frequency import on_circular_orbit
    >>> from stfalgebra.radiative.contributions import CONTRIBUTIONS
    >>> row = next(row for row in CONTRIBUTIONS if row.family == "canonical moments" and row.available)
    >>> on_circular_orbit(canonical_correction_channel(2, 2, row=row, orbit="circular"), 2).orders
    ()
    """
    _check_quadrupole(l, m, orbit)
    return _canonical_correction(m)


def _check_current(l: int, m: int, orbit: str, expected: str) -> None:
    check_mode(l, m)
    if mode_kind(l, m) != "current":
        raise ValueError(f"the 2.5PN reaction terms of J_L are evaluated for current modes (l + m odd), got ({l},{m})")
    if orbit != expected:
        raise ValueError(f"this evaluator is for {expected} orbits, got {orbit!r}")


@lru_cache(maxsize=None)
def _current_reaction_circular(l: int, m: int) -> PNSeries:
    from ..moments.current_reaction import reaction_current_moment

    p, q, c = mode_channel(l, m)
    odd = reaction_current_moment(l).on_circular_orbit().channel(p, q, c, circular_frequency=True)
    odd = odd * (_rotation(m) ** l)
    return (odd + inspiral_derivative_channel(l, m)).truncate(PNOrder(5, 2))


def reaction_current_channel(l: int, m: int, *, row: Contribution, orbit: str) -> PNSeries:
    """The 2.5PN (radiation-reaction) part of ``d^l J_L/dt^l`` on the channel of a current mode
    (l, m) on the inspiralling circular orbit: the derived 2.5PN term of J_L
    (:func:`~stfalgebra.moments.current_reaction.reaction_current_moment`, at ``rdot = 0``: the
    inspiral's rdot is O(c^-5)) differentiated l times, plus the l-th derivative of the Newtonian
    J_L along the inspiral (the cited reaction acceleration in the derivatives and rdot_RR,
    :func:`inspiral_derivative_channel`), as for I_L (module docstring).

    Returns
    -------
    PNSeries
        The single order 5/2 (the conservative terms through 2PN are the instantaneous rows'),
        known through 5/2; engine coefficients in G, m, nu, delta, r, phidot, I (Kepler's law
        is applied by the circular reduction).

    Example
    -------
    >>> from stfalgebra.radiative.contributions import CONTRIBUTIONS
    >>> row = next(row for row in CONTRIBUTIONS if "reaction_current_channel" in str(row.evaluator))
    >>> reaction_current_channel(2, 1, row=row, orbit="circular").orders
    (PNOrder(5/2),)
    """
    _check_current(l, m, orbit, "circular")
    return _current_reaction_circular(l, m)


@lru_cache(maxsize=None)
def _current_reaction_general(l: int, m: int) -> PNSeries:
    from ..moments.current_reaction import reaction_current_moment
    from .radiative_moments import source_channel

    p, q, c = mode_channel(l, m)
    rates = inspiral_rates()             # Newtonian + 2.5PN reaction pieces of d(rdot)/dt, d(phidot)/dt
    newtonian = _channel_derivatives({0: source_channel(l, m, 0).coefficient(0)}, rates, m, l)
    odd = reaction_current_moment(l).channel(p, q, c).coefficient(REACTION_ORDER)
    odd = _channel_derivatives({_REACTION2: odd}, rates, m, l)
    total = newtonian.get(_REACTION2, ExactPolynomial(0)) + odd.get(_REACTION2, ExactPolynomial(0))
    return PNSeries._from_trusted({} if total.is_zero() else {_REACTION2: total}, _REACTION2)


def reaction_current_general_channel(l: int, m: int, *, row: Contribution, orbit: str) -> PNSeries:
    """The 2.5PN (radiation-reaction) part of ``d^l J_L/dt^l`` on the channel of a current mode
    (l, m) on a general orbit: the Newtonian J_L differentiated along the Newtonian + 2.5PN motion
    (the cited reaction acceleration in d(rdot)/dt and d(phidot)/dt; its c^-5 part) plus the
    derived 2.5PN term of J_L differentiated along the Newtonian motion. The 1PN and 2PN terms of
    J_L meet the reaction only at c^-7; the conservative part is the instantaneous rows'.

    Example
    -------
    >>> from stfalgebra.radiative.contributions import CONTRIBUTIONS
    >>> row = next(row for row in CONTRIBUTIONS if "reaction_current_general" in str(row.evaluator))
    >>> reaction_current_general_channel(2, 1, row=row, orbit="general").orders
    (PNOrder(5/2),)
    """
    _check_current(l, m, orbit, "general")
    return _current_reaction_general(l, m)
