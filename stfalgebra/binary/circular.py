"""Circular orbits: relations derived from the equations of motion, and the map from general
orbit variables (r, rdot, phidot, c) to the frequency parameter x.

Nothing here is typed in from a paper: the orbital frequency follows from the relative
acceleration of :mod:`stfalgebra.binary.dynamics` with ``rdot = 0``, ``phidot = omega``
constant; ``gamma = G m/(r c^2)`` as a function of ``x = (G m omega/c^3)^(2/3)`` follows by
series reversion. Series in ``x`` are :class:`~stfalgebra.pnseries.PNSeries` in
``eps = sqrt(x)`` (order ``n`` <-> ``x^n``), with absolute orders (``gamma`` starts at order 1).
Every relation is available through 2PN (``pn_order`` 0, 1, 2), from the conservative dynamics
(a circular orbit is a solution of the conservative equations only; the radiation reaction,
from 2.5PN on, is not included).
"""

from __future__ import annotations

from functools import lru_cache
from typing import Any

import sympy as sp

from stfalgebra.binary.dynamics import (
    check_pn_order,
    conserved_angular_momentum,
    conserved_energy,
    relative_acceleration,
)
from stfalgebra.binary.masses import validate_nu
from stfalgebra.pnseries import PNSeries
from stfalgebra.symbols import G, c, m, nu, phidot, r, rdot, x

__all__ = [
    "circular_frequency_squared",
    "circular_gamma",
    "circular_radius",
    "circular_substitution",
    "to_circular_orbit",
    "circular_energy",
    "circular_angular_momentum",
    "evaluate_circular",
]

#: Private expansion parameter used when calling PNSeries.substitute (never in results).
_EPS = sp.Dummy("eps")
_HALF = sp.Rational(1, 2)


@lru_cache(maxsize=None)
def circular_frequency_squared(pn_order: int) -> PNSeries:
    """``omega^2`` of a circular orbit as a function of ``r``, derived from the acceleration.

    The circular conditions ``rdot = 0 = d rdot/dt`` give ``r omega^2 + a_n = 0`` with
    ``a_n`` evaluated at ``rdot = 0``, ``phidot^2 = omega^2``; this is solved by iteration.

    Parameters
    ----------
    pn_order:
        0, 1 or 2 (PN order of the equations of motion).

    Returns
    -------
    PNSeries
        In ``eps = 1/c``, coefficients in G, m, nu, r; known through ``pn_order + 1/2``.

    **Conventions**: harmonic coordinates.

    Example
    -------
    >>> circular_frequency_squared(1)
    PNSeries(G*m/r**3 + (G**2*m**2*nu/r**4 - 3*G**2*m**2/r**4)*eps**2 + O(eps**4))

    References
    ----------
    Derived here; agrees with Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 7.4,
    ``omega^2 = (G m/r^3)[1 + (-3 + nu) gamma + (6 + 41 nu/4 + nu^2) gamma^2 + ...]``
    (from memory, tested).
    """
    known = check_pn_order(pn_order, "circular-orbit relations")
    a_n, a_lambda = relative_acceleration(pn_order)
    a_n = a_n.substitute(rdot, 0, _EPS)
    a_lambda = a_lambda.substitute(rdot, 0, _EPS).expand()
    if a_lambda.orders:
        raise ArithmeticError("the acceleration has a tangential part on a circular orbit")
    # the Newtonian term does not depend on phidot: it starts the iteration
    if a_n.coefficient(0).has(phidot):
        raise ArithmeticError("Newtonian radial acceleration depends on phidot")
    omega2 = (a_n.truncate(0) * (-1 / r)).expand()
    while omega2.known_through < known:
        omega_series = omega2 ** _HALF
        updated = (a_n.substitute(phidot, omega_series, _EPS) * (-1 / r)).expand()
        if updated.known_through <= omega2.known_through:
            raise ArithmeticError("iteration for the circular frequency does not converge")
        omega2 = updated
    return omega2


@lru_cache(maxsize=None)
def _relative_frequency_in_gamma(pn_order: int) -> PNSeries:
    """``omega^2 r^3/(G m)`` as a series in ``eps = sqrt(gamma)``, coefficients in nu."""
    omega2 = circular_frequency_squared(pn_order)
    pieces = {}
    for order, coeff in omega2.terms.items():
        # the 1/c^(2k) term of omega^2 r^3/(G m) is h_k (G m/r)^k = h_k gamma^k c^(2k)
        h = sp.expand(coeff * r**3 / (G * m) / (G * m / r) ** order)
        if h.has(G) or h.has(m) or h.has(r):
            raise ArithmeticError(f"circular frequency not a series in gamma: {h}")
        pieces[order] = h
    return PNSeries(pieces, omega2.known_through)


def _compose(outer: PNSeries, inner: PNSeries) -> PNSeries:
    """``outer(inner)`` for ``outer`` a series in ``sqrt(y)`` and ``inner`` a series for ``y``
    (in ``sqrt(x)``) starting at order 1 with coefficient 1."""
    total = PNSeries({}, sp.oo)
    for order, coeff in outer.terms.items():
        total = total + (inner ** order) * coeff
    if not outer.is_exact:
        # outer's unknown terms O(y^(K + 1/2)) = O(x^(K + 1/2)) since y = x (1 + ...)
        total = total.truncate(min(total.known_through, outer.known_through))
    return total


@lru_cache(maxsize=None)
def circular_gamma(pn_order: int) -> PNSeries:
    """``gamma = G m/(r c^2)`` on a circular orbit as a series in ``x``.

    Reverts ``x^3 = gamma^3 F(gamma)``, ``F = omega^2 r^3/(G m)`` from
    :func:`circular_frequency_squared`, by iteration ``gamma = x F(gamma)^(-1/3)``.

    Parameters
    ----------
    pn_order:
        0, 1 or 2.

    Returns
    -------
    PNSeries
        In ``eps = sqrt(x)`` (order n <-> ``x^n``), absolute orders: ``gamma = x [1 + (1 -
        nu/3) x + O(x^2)]`` is ``{1: 1, 2: 1 - nu/3}``; known through ``pn_order + 3/2``.

    **Conventions**: ``x = (G m omega/c^3)^(2/3)``, harmonic coordinates.

    Example
    -------
    >>> circular_gamma(1)
    PNSeries(eps**2 + (1 - nu/3)*eps**4 + O(eps**6))

    References
    ----------
    Derived here; agrees with Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 7.4,
    ``gamma = x [1 + (1 - nu/3) x + (1 - 65 nu/12) x^2 + ...]`` (from memory, tested).
    """
    check_pn_order(pn_order, "circular-orbit relations")
    inverse_cube_root = _relative_frequency_in_gamma(pn_order) ** sp.Rational(-1, 3)
    gamma_series = inverse_cube_root.truncate(0).shift(1)
    target = inverse_cube_root.known_through + 1
    while gamma_series.known_through < target:
        updated = _compose(inverse_cube_root, gamma_series).shift(1).expand()
        if updated.known_through <= gamma_series.known_through:
            raise ArithmeticError("series reversion for gamma(x) does not converge")
        gamma_series = updated
    return gamma_series


@lru_cache(maxsize=None)
def circular_radius(pn_order: int) -> PNSeries:
    """Orbital separation ``r = G m/(c^2 gamma(x))`` of a circular orbit, a series in ``x``.

    Parameters
    ----------
    pn_order:
        0, 1 or 2.

    Returns
    -------
    PNSeries
        In ``eps = sqrt(x)``, leading order -1 with coefficient ``G m/c^2``; known through
        ``pn_order - 1/2`` (relative order ``pn_order + 1/2``).

    **Conventions**: harmonic coordinates, ``x = (G m omega/c^3)^(2/3)``.

    Example
    -------
    >>> circular_radius(1)
    PNSeries(G*m/c**2*eps**-2 + G*m*nu/(3*c**2) - G*m/c**2 + O(eps**2))

    References
    ----------
    Follows from :func:`circular_gamma` (common practice).
    """
    return (circular_gamma(pn_order).inverse() * (G * m / c**2)).expand()


def circular_substitution(pn_order: int) -> dict[sp.Symbol, PNSeries]:
    """What turns an expression in ``r, rdot, phidot, c`` into one in ``x`` on a circular orbit.

    Parameters
    ----------
    pn_order:
        0, 1 or 2 (for the radius).

    Returns
    -------
    dict
        ``{rdot: 0, phidot: x^(3/2) c^3/(G m), r: G m/(c^2 gamma(x))}``, each a PNSeries in
        ``eps = sqrt(x)`` (the first two exact). :func:`to_circular_orbit` applies them to a
        series in ``1/c`` with the order bookkeeping.

    **Conventions**: ``phidot = omega = c^3 x^(3/2)/(G m)`` (definition of ``x``).

    Example
    -------
    >>> sorted(str(k) for k in circular_substitution(0))
    ['phidot', 'r', 'rdot']

    References
    ----------
    Common practice.
    """
    return {
        rdot: PNSeries({}, sp.oo),
        phidot: PNSeries({sp.Rational(3, 2): c**3 / (G * m)}, sp.oo),
        r: circular_radius(pn_order),
    }


def _orbit_weight(term: sp.Expr) -> sp.Rational:
    """x-power of a monomial in r, rdot, phidot once r ~ 1/x, phidot ~ x^(3/2), rdot ~ x^(1/2)."""
    weight = sp.S.Zero
    for symbol, w in ((r, -1), (phidot, sp.Rational(3, 2)), (rdot, _HALF)):
        _, power = term.as_coeff_exponent(symbol)
        weight += w * power
    return weight


def to_circular_orbit(series: PNSeries, pn_order: int) -> PNSeries:
    """Turn a general-orbit series in ``eps = 1/c`` into a circular-orbit series in ``x``.

    Applies :func:`circular_substitution` (``rdot = 0``, ``phidot = c^3 x^(3/2)/(G m)``,
    ``r = G m/(c^2 gamma(x))``) to every coefficient and tracks the orders: a term
    ``c^(-2k) f_k(r, phidot)`` of a dimensionally homogeneous series becomes
    ``c^(2s) x^(k + s) (...)`` with the same ``s`` for every term.

    Parameters
    ----------
    series:
        PN series in ``1/c`` whose coefficients are polynomial in ``r, 1/r, rdot, phidot`` (any
        other constants allowed, no ``c``), dimensionally homogeneous.
    pn_order:
        PN order of the orbit relations used (0, 1 or 2).

    Returns
    -------
    PNSeries
        In ``eps = sqrt(x)``; the coefficients carry ``c^(2s)``; known through the lower of
        ``series.known_through + s`` and what the radius relation supports.

    Raises
    ------
    ValueError
        Coefficients containing ``c`` or ``x``, an inhomogeneous series, or an empty one
        (whose orders in ``x`` cannot be placed).

    **Conventions**: as :func:`circular_substitution`.

    Example
    -------
    >>> from stfalgebra.symbols import G, m, r, phidot
    >>> to_circular_orbit(PNSeries({0: r**2 * phidot**2}, 1), 0)
    PNSeries(c**2*eps**2 + O(eps**4))

    References
    ----------
    Common practice (dimensional bookkeeping of PN orders).
    """
    if not isinstance(series, PNSeries):
        raise TypeError(f"expected a PNSeries in 1/c, got {series!r}")
    subs = circular_substitution(pn_order)
    weights = set()
    for order, coeff in series.terms.items():
        if coeff.has(c) or coeff.has(x):
            raise ValueError(f"coefficient {coeff} at order {order} contains c or x")
        for term in sp.Add.make_args(sp.expand(coeff)):
            weights.add(_orbit_weight(term) - order)
    if not weights:
        raise ValueError("the series has no known term: its orders in x cannot be placed")
    if len(weights) > 1:
        raise ValueError(f"series is not dimensionally homogeneous (x-weights {sorted(weights)})")
    (shift,) = weights
    total = PNSeries({}, sp.oo)
    for order, coeff in series.terms.items():
        piece = PNSeries({0: coeff.subs(rdot, 0) * c ** (-2 * order)}, sp.oo)
        if piece.orders == ():
            continue
        piece = piece.substitute(phidot, subs[phidot], _EPS)
        piece = piece.substitute(r, subs[r], _EPS)
        total = total + piece
    if not series.is_exact:
        limit = series.known_through + shift
        total = total.truncate(min(limit, total.known_through))
    return total.expand()


def circular_energy(pn_order: int) -> PNSeries:
    """Conserved energy ``E`` of a circular orbit as a series in ``x`` (rest mass excluded).

    Parameters
    ----------
    pn_order:
        0, 1 or 2.

    Returns
    -------
    PNSeries
        In ``eps = sqrt(x)``, coefficients in ``m, nu, c``; from
        :func:`~stfalgebra.binary.dynamics.conserved_energy` times ``mu = m nu``.

    **Conventions**: harmonic coordinates, ``x = (G m omega/c^3)^(2/3)``.

    Example
    -------
    >>> circular_energy(0)
    PNSeries(-c**2*m*nu/2*eps**2 + O(eps**4))

    References
    ----------
    Derived here; agrees with Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 7.4,
    ``E = -(mu c^2 x/2)[1 - (3/4 + nu/12) x - (27/8 - 19 nu/8 + nu^2/24) x^2]`` (from
    memory, tested), and at ``nu = 0`` with the expansion of the exact Schwarzschild value
    ``mu c^2 [(1 - 2x)/sqrt(1 - 3x) - 1]``.
    """
    return (to_circular_orbit(conserved_energy(pn_order), pn_order) * (m * nu)).expand()


def circular_angular_momentum(pn_order: int) -> PNSeries:
    """Conserved angular momentum ``J`` of a circular orbit as a series in ``x``.

    Parameters
    ----------
    pn_order:
        0, 1 or 2.

    Returns
    -------
    PNSeries
        In ``eps = sqrt(x)``, coefficients in ``G, m, nu, c``.

    **Conventions**: as :func:`circular_energy`; ``J`` along +z.

    Example
    -------
    >>> circular_angular_momentum(0)
    PNSeries(G*m**2*nu/c*eps**-1 + O(eps))

    References
    ----------
    Derived here from :func:`~stfalgebra.binary.dynamics.conserved_angular_momentum`; agrees
    with ``J = (G m^2 nu/(c x^(1/2)))[1 + (3/2 + nu/6) x + (27/8 - 19 nu/8 + nu^2/24) x^2]``
    (Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 7.4; from memory, tested) and at
    ``nu = 0`` with the exact Schwarzschild value ``G m mu/(c sqrt(x (1 - 3x)))``.
    """
    return (to_circular_orbit(conserved_angular_momentum(pn_order), pn_order)
            * (m * nu)).expand()


def evaluate_circular(series: PNSeries, x_value: Any, nu_value: Any = None) -> sp.Expr:
    """The known part of a circular-orbit series at a given ``x`` (and optionally ``nu``).

    Parameters
    ----------
    series:
        A PNSeries in ``eps = sqrt(x)``.
    x_value:
        ``x > 0`` (number or symbol); negative or zero numbers are refused.
    nu_value:
        Optional symmetric mass ratio in (0, 1/4] substituted for ``nu``.

    Returns
    -------
    sympy.Expr
        ``sum_n c_n x^n`` (the truncated sum; the O() remainder is not included).

    Raises
    ------
    ValueError
        ``x_value <= 0`` or ``nu_value`` outside (0, 1/4] (the message names the value).

    **Conventions**: ``x = (G m omega/c^3)^(2/3)``.

    Example
    -------
    >>> evaluate_circular(circular_gamma(1), sp.Rational(1, 10), sp.Rational(1, 4))
    131/1200

    References
    ----------
    Common practice.
    """
    if not isinstance(series, PNSeries):
        raise TypeError(f"expected a PNSeries in sqrt(x), got {series!r}")
    if isinstance(x_value, bool):
        raise TypeError(f"x must be a number or expression, got {x_value!r}")
    xv = sp.sympify(x_value)
    if xv.is_number and (xv.is_real is not True or not xv > 0):
        raise ValueError(f"x must be positive, got {x_value!r}")
    value = sp.Add(*[v * xv**k for k, v in series.terms.items()])
    if nu_value is not None:
        value = value.subs(nu, validate_nu(nu_value))
    return value
