"""Circular orbits: relations derived from the equations of motion, and the map from general
orbit variables (r, rdot, phidot, c) to the frequency parameter x.

Nothing here is typed in from a paper: the orbital frequency follows from the relative
acceleration with ``rdot = 0``, ``phidot = omega`` constant; ``gamma = G m/(r c^2)`` as a
function of ``x = (G m omega/c^3)^(2/3)`` follows by series reversion. The derivations run in
the exact engine (:mod:`stfalgebra.binary.circular_frequency`); this module gives them as
sympy-facing series with the units restored. Series in ``x`` are :class:`~stfalgebra.pnseries.PNSeries` in
``eps = sqrt(x)`` (order ``n`` <-> ``x^n``), with absolute orders (``gamma`` starts at order 1).
Every relation is available through 2PN (``pn_order`` 0, 1, 2), from the conservative dynamics
(a circular orbit is a solution of the conservative equations only; the radiation reaction,
from 2.5PN on, is not included).
"""

from __future__ import annotations

from functools import lru_cache

import sympy as sp

from stfalgebra.binary.dynamics import (
    check_pn_order,
    conserved_angular_momentum,
    conserved_energy,
)
from stfalgebra.binary.circular_frequency import circular_reduction, frequency_in_gamma, gamma_over_x
from stfalgebra.exact import ExactPolynomial, NotRepresentableError
from stfalgebra.pnseries import PNSeries
from stfalgebra.symbols import G, c, m, nu, phidot, r, rdot, x

__all__ = [
    "circular_frequency_squared",
    "circular_gamma",
    "circular_radius",
    "to_circular_orbit",
    "circular_energy",
    "circular_angular_momentum",
]



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
    check_pn_order(pn_order, "circular-orbit relations")
    # omega^2 = (G m/r^3) sum_k y_k gamma^k with gamma = G m/(r c^2): the engine's y(gamma)
    y = frequency_in_gamma(pn_order)
    return PNSeries({order: sp.expand(sp.sympify(value) * G * m / r**3 * (G * m / r) ** int(order))
                     for order, value in y.terms.items()}, y.known_through)


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
    return gamma_over_x(pn_order).shift(1)


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


def to_circular_orbit(series: PNSeries, pn_order: int) -> PNSeries:
    """Turn a general-orbit series in ``eps = 1/c`` into a circular-orbit series in ``x``.

    Puts the series on the circular orbit (``rdot = 0``, ``phidot = c^3 x^(3/2)/(G m)``,
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

    **Conventions**: harmonic coordinates, ``x = (G m omega/c^3)^(2/3)``.

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
    exact = {}
    for order, coeff in series.terms.items():
        value = sp.sympify(coeff)
        if value.has(c) or value.has(x):
            raise ValueError(f"coefficient {coeff} at order {order} contains c or x")
        try:
            exact[order.twice] = ExactPolynomial.from_sympy(value)
        except NotRepresentableError as exc:
            raise ValueError(f"coefficient at order {order} is not a polynomial in the orbit variables: {exc}") from None
    reduced, (g_power, m_power, c_power) = circular_reduction(PNSeries._from_trusted(exact, series._known2), pn_order)
    scale = G**g_power * m**m_power * c**c_power
    return reduced.map_coefficients(lambda value: sp.expand(value.to_sympy() * scale))


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
