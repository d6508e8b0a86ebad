"""Circular orbits in the exact engine: omega(r), gamma(x), and the map of a general-orbit
series in 1/c onto the circular orbit as a series in x.

Nothing here is typed in: the orbital frequency follows from the cited relative acceleration
(:mod:`stfalgebra.binary.cited_inputs`) with ``rdot = 0``,
``phidot = omega`` constant, and ``gamma = G m/(r c^2)`` as a function of
``x = (G m omega/c^3)^(2/3)`` by series reversion. Every derivation runs with ``G = m = c = 1``
(the quantities are dimensionless), in :class:`~stfalgebra.pnseries.PNSeries` with engine
coefficients:

- ``y = omega^2 r^3/(G m)`` as a series in ``gamma`` (``eps = sqrt(gamma)``):
  the radial equation ``r omega^2 = -a_n(r, rdot = 0, phidot = omega)`` gives
  ``y = -r^2 a_n`` with ``r = 1/gamma``, ``omega^2 = y gamma^3``, solved by iteration;
- ``g = gamma/x`` as a series in ``x`` (``eps = sqrt(x)``): ``x = gamma y^(1/3)``, so
  ``g = Y(x g)`` with ``Y = y^(-1/3)``, solved by iteration.

**Conventions**: harmonic coordinates; ``x = (G m omega/c^3)^(2/3)``, ``gamma = G m/(r c^2)``
(``../shared/conventions.md``).
"""

from __future__ import annotations

from fractions import Fraction
from functools import lru_cache

from ..exact import ExactPolynomial, engine_symbols
from ..orders import PNOrder
from ..pnseries import PNSeries
from .cited_inputs import acceleration_n_factor, acceleration_v_factor, check_input_order, known_through

__all__ = ["reduction_with_gamma", "frequency_in_gamma", "gamma_over_x", "on_circular_orbit", "circular_reduction",
           "gamma_over_x_with_reaction"]

_ONE = ExactPolynomial(1)


def _dimensionless(value: ExactPolynomial) -> ExactPolynomial:
    return value.substitute({"G": 1, "m": 1})


@lru_cache(maxsize=None)
def frequency_in_gamma(pn_order: int) -> PNSeries:
    """``y = omega^2 r^3/(G m)`` of a circular orbit as a series in ``gamma`` (``eps = sqrt(gamma)``).

    Parameters
    ----------
    pn_order:
        PN order of the equations of motion.

    Returns
    -------
    PNSeries
        Coefficients in nu; known through ``pn_order + 1/2``.

    **Conventions**: module docstring.

    Example
    -------
    >>> frequency_in_gamma(1)
    PNSeries(1 + (-3 + nu)*eps**2 + O(eps**4))

    References
    ----------
    Derived here from the equations of motion; agrees with Blanchet, Living Rev. Relativ. 17,
    2 (2014), ``omega^2 = (G m/r^3)[1 + (-3 + nu) gamma + ...]`` (from memory, tested).
    """
    check_input_order(pn_order, "equations of motion")
    known = known_through(pn_order)
    s = engine_symbols()
    # a = alpha n + beta v: on a circular orbit v = r phidot lambda, so a_n = alpha there and
    # beta must vanish (no tangential acceleration)
    a_n = {k: v for k, v in acceleration_n_factor(s).items() if k <= pn_order}
    if any(k <= pn_order and not _dimensionless(v).substitute({"rdot": 0}).is_zero()
           for k, v in acceleration_v_factor(s).items()):
        raise ArithmeticError("the acceleration has a tangential part on a circular orbit")
    # y = -r^2 a_n: each monomial rinv^b r^a phidot^(2j) -> gamma^(b - a + 3j - 2) y^j
    pieces: list[tuple[int, int, ExactPolynomial]] = []   # (gamma power, y power, coefficient)
    for value in a_n.values():
        for monomial, coefficient in _dimensionless(value).substitute({"rdot": 0}).terms():
            phidot_power = monomial.pop("phidot", 0)
            if phidot_power % 2:
                raise ArithmeticError("the radial acceleration is odd in phidot")
            b, a = monomial.pop("rinv", 0), monomial.pop("r", 0)
            rest = ExactPolynomial(1)
            for name, power in monomial.items():
                rest = rest * ExactPolynomial(name) ** power
            pieces.append((b - a + 3 * phidot_power // 2 - 2, phidot_power // 2, -rest * coefficient))
    y = PNSeries._from_trusted({0: _ONE}, 0)
    while y.known_through < known:
        updated = PNSeries._from_trusted({}, float("inf"))
        for power, y_power, coefficient in pieces:
            updated = updated + (y.power(y_power) if y_power else PNSeries._from_trusted({0: _ONE}, float("inf"))).shift(power) * coefficient
        updated = updated.truncate(min(updated.known_through, known))
        if updated.known_through <= y.known_through:
            raise ArithmeticError("iteration for the circular frequency does not converge")
        y = updated
    return y


@lru_cache(maxsize=None)
def gamma_over_x(pn_order: int) -> PNSeries:
    """``g = gamma/x`` of a circular orbit as a series in ``x`` (``eps = sqrt(x)``).

    Parameters
    ----------
    pn_order:
        PN order of the equations of motion.

    Returns
    -------
    PNSeries
        ``1 + (1 - nu/3) x + ...``; known through ``pn_order + 1/2``.

    **Conventions**: module docstring.

    Example
    -------
    >>> gamma_over_x(1)
    PNSeries(1 + (1 - nu/3)*eps**2 + O(eps**4))

    References
    ----------
    Derived here by series reversion; agrees with Blanchet, Living Rev. Relativ. 17, 2 (2014),
    ``gamma = x [1 + (1 - nu/3) x + ...]`` (from memory, tested).
    """
    inverse_cube_root = frequency_in_gamma(pn_order).power(Fraction(-1, 3))
    known = inverse_cube_root.known_through
    g = PNSeries._from_trusted({0: _ONE}, 0)
    while g.known_through < known:
        updated = PNSeries._from_trusted({}, float("inf"))
        for order, coefficient in inverse_cube_root.terms.items():
            # Y_k (x g)^k: orders of Y are integers (no half-integer conservative terms)
            updated = updated + (g.power(order) if order else PNSeries._from_trusted({0: _ONE}, float("inf"))).shift(order) * coefficient
        updated = updated.truncate(min(updated.known_through, known))
        if updated.known_through <= g.known_through:
            raise ArithmeticError("series reversion for gamma(x) does not converge")
        g = updated
    return g


@lru_cache(maxsize=None)
def gamma_over_x_with_reaction() -> PNSeries:
    """``g = gamma/x`` of the 2PN dynamics with the 2.5PN radiation reaction, known through 5/2.

    The reaction acceleration ``a_RR = alpha n + beta v`` has the radial part
    ``alpha + beta rdot``, proportional to rdot (checked here on the cited input), so on the
    quasi-circular inspiral (rdot of order 1/c^5) the radial equation gets no 2.5PN term: g is
    the 2PN one, now known through relative 5/2 (the next term is the 3PN one).

    Example
    -------
    >>> gamma_over_x_with_reaction().known_through
    PNOrder(5/2)
    """
    from .cited_inputs import REACTION_KNOWN_THROUGH, REACTION_ORDER, acceleration_reaction_n_factor, \
        acceleration_reaction_v_factor

    s = engine_symbols()
    radial = (acceleration_reaction_n_factor(s)[REACTION_ORDER]
              + acceleration_reaction_v_factor(s)[REACTION_ORDER] * s.rdot).substitute({"rdot": 0})
    if not radial.is_zero():
        raise AssertionError(f"the radial reaction acceleration does not vanish at rdot = 0: {radial}")
    g = gamma_over_x(2)
    return PNSeries._from_trusted(dict(g._terms), REACTION_KNOWN_THROUGH[REACTION_ORDER].twice)


def circular_reduction(series: PNSeries, pn_order: int) -> tuple[PNSeries, tuple[int, int, int]]:
    """A general-orbit series in ``1/c`` put on the circular orbit, with its dimensional scale.

    Parameters
    ----------
    series:
        Engine coefficients polynomial in ``r``, ``1/r``, ``rdot``, ``phidot`` (or ``omega``),
        ``G``, ``m`` and constants, dimensionally homogeneous.
    pn_order:
        PN order of the orbit relation ``gamma(x)`` used.

    Returns
    -------
    (PNSeries, (a, b, d))
        The series in ``eps = sqrt(x)`` computed with ``G = m = c = 1`` (``rdot = 0``,
        ``phidot = omega = x^(3/2)``, ``r = 1/(x g(x))``; a term ``r^p phidot^j`` lands at order
        ``3j/2 - p`` times ``g^(-p)``), and the scale ``G^a m^b c^d`` that restores the units
        (``r = G m/(c^2 x g)``, ``phidot = c^3 x^(3/2)/(G m)``). Known through the lower of the
        input's known order moved by the (common) shift, and what ``g`` supports.

    Raises
    ------
    ValueError
        A series that is not dimensionally homogeneous, or has no known term.

    **Conventions**: module docstring.

    Example
    -------
    >>> from stfalgebra.binary.cited_inputs import angular_momentum_per_reduced_mass
    >>> from stfalgebra.exact import engine_symbols
    >>> j = PNSeries._from_trusted({2 * k: v for k, v in angular_momentum_per_reduced_mass(engine_symbols()).items() if k <= 1}, 3)
    >>> circular_reduction(j, 1)                  # J/mu = (G m/c) x^(-1/2) [1 + (3/2 + nu/6) x]
    (PNSeries(eps**-1 + (3/2 + nu/6)*eps + O(eps**3)), (1, 1, -1))

    References
    ----------
    Common practice (dimensional bookkeeping of PN orders).
    """
    return reduction_with_gamma(series, gamma_over_x(pn_order))


def reduction_with_gamma(series: PNSeries, g: PNSeries) -> tuple[PNSeries, tuple[int, int, int]]:
    """:func:`circular_reduction` with the circular orbit's ``g(x) = gamma/x`` given (the
    non-spinning one, or that of aligned spins): ``rdot = 0``, ``phidot = x^(3/2)``,
    ``r = 1/(x g(x))`` in units ``G = m = c = 1``; returns the series and the unit scale."""
    groups: dict[tuple[int, int], ExactPolynomial] = {}    # (doubled x order, r power) -> coefficient
    shifts = set()
    scales = set()
    for k2, value in series._terms:
        value = value.substitute({"rdot": 0})
        for monomial, coefficient in value.terms():
            j = monomial.pop("phidot", 0) + monomial.pop("omega", 0)
            p = monomial.pop("r", 0) - monomial.pop("rinv", 0)
            g_power, m_power = monomial.pop("G", 0), monomial.pop("m", 0)
            rest = ExactPolynomial(coefficient)
            for name, power in monomial.items():
                rest = rest * ExactPolynomial(name) ** power
            order2 = 3 * j - 2 * p
            shifts.add(order2 - k2)
            scales.add((g_power + p - j, m_power + p - j, 3 * j - 2 * p - k2))
            key = (order2, p)
            groups[key] = groups[key] + rest if key in groups else rest
    if not groups:
        raise ValueError("the series has no known term: its orders in x cannot be placed")
    if len(shifts) > 1 or len(scales) > 1:
        raise ValueError(f"series is not dimensionally homogeneous (x-weights {sorted(shifts)}, "
                         f"scales {sorted(scales)})")
    (shift2,) = shifts
    (scale,) = scales
    known2 = series._known2 + shift2
    total = PNSeries._from_trusted({}, float("inf"))
    powers: dict[int, PNSeries] = {}
    for (order2, p), coefficient in groups.items():
        if coefficient.is_zero():
            continue
        if p not in powers:
            powers[p] = g.power(-p) if p else PNSeries._from_trusted({0: _ONE}, float("inf"))
        total = total + (powers[p] * coefficient).shift(PNOrder.from_twice(order2))
    if known2 != float("inf") or total.known_through != float("inf"):
        total = total.truncate(min(total.known_through, PNOrder.from_twice(int(known2)) if known2 != float("inf")
                                   else total.known_through))
    return total, scale


def on_circular_orbit(series: PNSeries, pn_order: int, *, with_reaction: bool = False) -> PNSeries:
    """:func:`circular_reduction` without the scale (for dimensionless results such as Hhat_lm);
    ``with_reaction`` (``pn_order`` 2) uses :func:`gamma_over_x_with_reaction`, known through 5/2.

    Example
    -------
    >>> from stfalgebra.binary.cited_inputs import energy_per_reduced_mass
    >>> from stfalgebra.exact import engine_symbols
    >>> energy = PNSeries._from_trusted({2 * k: v for k, v in energy_per_reduced_mass(engine_symbols()).items() if k <= 1}, 3)
    >>> on_circular_orbit(energy, 1)             # E/(mu c^2) = -(x/2)[1 - (3/4 + nu/12) x]
    PNSeries(-1/2*eps**2 + (3/8 + nu/24)*eps**4 + O(eps**6))
    """
    if with_reaction:
        if pn_order != 2:
            raise ValueError(f"the 2.5PN reaction joins the 2PN dynamics, got pn_order {pn_order!r}")
        return reduction_with_gamma(series, gamma_over_x_with_reaction())[0]
    return circular_reduction(series, pn_order)[0]
