"""The two-body dynamics with the leading (2.5PN) radiation reaction, as sympy series.

The conservative 2PN inputs of :mod:`stfalgebra.binary.cited_inputs` (acceleration, energy,
angular momentum, centre-of-mass relations) are joined with the 2.5PN reaction inputs of the same
module into series in ``eps = 1/c`` known through relative order 5/2: the 2PN conservative and
2.5PN dissipative terms are known through 5/2 only in combination (the next terms, the 3PN
conservative ones, are not entered), so every result here is truncated there.

The reaction does not conserve the energy and angular momentum of the conservative dynamics;
with the 2.5PN terms ``E_2.5PN``, ``J_2.5PN`` of the harmonic-coordinate energy and angular
momentum,

    d(E + E_2.5PN)/dt = -F_N/mu,        d(J + J_2.5PN)/dt = -G_N/mu        (order 1/c^5),

``F_N`` and ``G_N`` the Newtonian energy and angular-momentum fluxes written in ``r, rdot,
phidot`` (``mu = m nu``): the reaction force balances the fluxes only up to the total time
derivatives of ``E_2.5PN`` and ``J_2.5PN``, which average to zero over closed orbits.
:func:`time_derivative_with_reaction` gives the derivative along this motion.

Polar kinematics as in :mod:`stfalgebra.binary.orbit_derivative`: ``a = alpha n + beta v``,
``a_n = alpha + beta rdot``, ``a_lambda = beta r phidot``.
"""

from __future__ import annotations

from functools import lru_cache
from typing import Any

import sympy as sp

from stfalgebra.binary import cited_inputs
from stfalgebra.binary.dynamics import cited_series
from stfalgebra.orders import PNOrder
from stfalgebra.pnseries import PNSeries

__all__ = [
    "KNOWN_THROUGH_WITH_REACTION",
    "reaction_acceleration",
    "acceleration_with_reaction",
    "acceleration_factors_with_reaction",
    "energy_with_reaction",
    "angular_momentum_with_reaction",
    "centre_of_mass_velocity_factor_with_reaction",
    "time_derivative_with_reaction",
]

#: The relative order through which the 2PN + 2.5PN dynamics is known.
KNOWN_THROUGH_WITH_REACTION = cited_inputs.REACTION_KNOWN_THROUGH[cited_inputs.REACTION_ORDER]

_REACTION = cited_inputs.REACTION_ORDER
_CONSERVATIVE_ORDER = 2


def _with_reaction(conservative, reaction) -> PNSeries:
    """The 2PN terms of a conservative input joined with its 2.5PN reaction term."""
    from stfalgebra.symbols import sympy_symbols

    base = cited_series(conservative, _CONSERVATIVE_ORDER, KNOWN_THROUGH_WITH_REACTION) \
        if conservative is not None else PNSeries({}, KNOWN_THROUGH_WITH_REACTION)
    terms = dict(base.terms)
    for order, value in reaction(sympy_symbols()).items():
        terms[PNOrder(order)] = sp.expand(value)
    return PNSeries(terms, KNOWN_THROUGH_WITH_REACTION)


@lru_cache(maxsize=None)
def reaction_acceleration() -> tuple[PNSeries, PNSeries]:
    """The 2.5PN radiation-reaction acceleration in polar components.

    Returns
    -------
    (a_n, a_lambda):
        PN series in ``eps = 1/c`` with the single order 5/2 (known through 5/2):
        ``a_RR = a_n n + a_lambda lambda``.

    **Conventions**: harmonic coordinates, centre-of-mass frame, ``n = x/r``,
    ``lambda = e_z x n``; ``a_RR = (8/5) nu (G m)^2/(c^5 r^3) [rdot n (3 v^2 + (17/3) G m/r) -
    v (v^2 + 3 G m/r)]`` (:func:`~stfalgebra.binary.cited_inputs.acceleration_reaction_n_factor`).

    Example
    -------
    >>> from stfalgebra.symbols import rdot
    >>> a_n, a_lambda = reaction_acceleration()
    >>> sp.factor(a_lambda.coefficient(sp.Rational(5, 2)).subs(rdot, 0))
    -8*G**2*m**2*nu*phidot*(3*G*m + phidot**2*r**3)/(5*r**3)

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 7.3 (from memory; see
    :mod:`stfalgebra.binary.cited_inputs`).
    """
    from stfalgebra.symbols import phidot, r, rdot, sympy_symbols

    s = sympy_symbols()
    alpha = cited_inputs.acceleration_reaction_n_factor(s)[_REACTION]
    beta = cited_inputs.acceleration_reaction_v_factor(s)[_REACTION]
    known = KNOWN_THROUGH_WITH_REACTION
    return (PNSeries({_REACTION: sp.expand(alpha + beta * rdot)}, known),
            PNSeries({_REACTION: sp.expand(beta * r * phidot)}, known))


@lru_cache(maxsize=None)
def acceleration_factors_with_reaction() -> tuple[PNSeries, PNSeries]:
    """The relative acceleration through 2.5PN as ``dv/dt = a_x x + a_v v``.

    Returns
    -------
    (a_x, a_v):
        PN series in ``eps = 1/c`` known through 5/2: ``a_x = alpha/r``, ``a_v = beta``.

    **Conventions**: as :func:`reaction_acceleration`; the conservative part is that of
    :func:`stfalgebra.binary.dynamics.relative_acceleration_factors` at 2PN.

    Example
    -------
    >>> a_x, a_v = acceleration_factors_with_reaction()
    >>> a_x.orders
    (PNOrder(0), PNOrder(1), PNOrder(2), PNOrder(5/2))

    References
    ----------
    As :func:`reaction_acceleration`.
    """
    from stfalgebra.symbols import r

    alpha = _with_reaction(cited_inputs.acceleration_n_factor, cited_inputs.acceleration_reaction_n_factor)
    beta = _with_reaction(cited_inputs.acceleration_v_factor, cited_inputs.acceleration_reaction_v_factor)
    return (alpha * (1 / r)).expand(), beta


@lru_cache(maxsize=None)
def acceleration_with_reaction() -> tuple[PNSeries, PNSeries]:
    """The relative acceleration through 2.5PN in polar components ``(a_n, a_lambda)``.

    Returns
    -------
    (a_n, a_lambda):
        PN series in ``eps = 1/c`` (orders 0, 1, 2, 5/2) known through 5/2.

    **Conventions**: harmonic coordinates, centre-of-mass frame, as
    :func:`stfalgebra.binary.dynamics.relative_acceleration`.

    Example
    -------
    >>> a_n, a_lambda = acceleration_with_reaction()
    >>> a_n.known_through
    PNOrder(5/2)

    References
    ----------
    As :func:`reaction_acceleration`; the conservative terms as
    :func:`stfalgebra.binary.dynamics.relative_acceleration`.
    """
    from stfalgebra.symbols import phidot, r, rdot

    alpha = _with_reaction(cited_inputs.acceleration_n_factor, cited_inputs.acceleration_reaction_n_factor)
    beta = _with_reaction(cited_inputs.acceleration_v_factor, cited_inputs.acceleration_reaction_v_factor)
    return (alpha + beta * rdot).expand(), (beta * (r * phidot)).expand()


@lru_cache(maxsize=None)
def energy_with_reaction() -> PNSeries:
    """The harmonic-coordinate energy per reduced mass through 2.5PN.

    Returns
    -------
    PNSeries
        ``E/mu`` (rest mass excluded) in ``eps = 1/c``, known through 5/2; the 2.5PN term is
        :func:`~stfalgebra.binary.cited_inputs.energy_reaction_term`.

    **Conventions**: decreases along the 2.5PN motion as ``-F_N/mu`` (module docstring).

    Example
    -------
    >>> energy_with_reaction().orders
    (PNOrder(0), PNOrder(1), PNOrder(2), PNOrder(5/2))

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 7.3 (from memory).
    """
    return _with_reaction(cited_inputs.energy_per_reduced_mass, cited_inputs.energy_reaction_term)


@lru_cache(maxsize=None)
def angular_momentum_with_reaction() -> PNSeries:
    """The harmonic-coordinate angular momentum (z component) per reduced mass through 2.5PN.

    Returns
    -------
    PNSeries
        ``J/mu`` in ``eps = 1/c``, known through 5/2; the 2.5PN term is
        :func:`~stfalgebra.binary.cited_inputs.angular_momentum_reaction_term`.

    **Conventions**: decreases along the 2.5PN motion as ``-G_N/mu`` (module docstring).

    Example
    -------
    >>> angular_momentum_with_reaction().orders
    (PNOrder(0), PNOrder(1), PNOrder(2), PNOrder(5/2))

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 7.3 (from memory).
    """
    return _with_reaction(cited_inputs.angular_momentum_per_reduced_mass,
                          cited_inputs.angular_momentum_reaction_term)


@lru_cache(maxsize=None)
def centre_of_mass_velocity_factor_with_reaction() -> PNSeries:
    """The factor ``Q`` of ``y_A = [...] x + nu delta Q v`` through 2.5PN.

    Returns
    -------
    PNSeries
        ``Q = -(7/4) eps^4 G m rdot + (4/5) eps^5 G m (v^2 - 2 G m/r)``, known through 5/2.

    **Conventions**: harmonic coordinates; as
    :func:`stfalgebra.binary.centre_of_mass.centre_of_mass_relations`.

    Example
    -------
    >>> centre_of_mass_velocity_factor_with_reaction().orders
    (PNOrder(2), PNOrder(5/2))

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 7.3 (from memory; see
    :func:`~stfalgebra.binary.cited_inputs.centre_of_mass_velocity_reaction_term`).
    """
    return _with_reaction(cited_inputs.centre_of_mass_velocity_term,
                          cited_inputs.centre_of_mass_velocity_reaction_term)


def time_derivative_with_reaction(series: PNSeries) -> PNSeries:
    """The time derivative of a PN series along the 2PN + 2.5PN relative motion.

    Parameters
    ----------
    series:
        A :class:`~stfalgebra.pnseries.PNSeries` in ``eps = 1/c`` with sympy coefficients in
        ``r, rdot, phidot, phi`` (other symbols constant).

    Returns
    -------
    PNSeries
        ``d/dt`` with ``dr/dt = rdot``, ``d rdot/dt = r phidot^2 + a_n``,
        ``d phidot/dt = (a_lambda - 2 rdot phidot)/r``, ``d phi/dt = phidot`` and the
        acceleration of :func:`acceleration_with_reaction`; known through
        ``min(known_through, k0 + 5/2)``, ``k0`` the lowest order whose coefficient depends on
        ``rdot`` or ``phidot``.

    Raises
    ------
    TypeError
        Not a PNSeries.

    **Conventions**: polar kinematics (common practice), module docstring.

    Example
    -------
    >>> from stfalgebra.symbols import r
    >>> time_derivative_with_reaction(PNSeries({0: r}, sp.oo))
    PNSeries(rdot)

    References
    ----------
    Common practice (chain rule along the equations of motion).
    """
    from stfalgebra.symbols import phi, phidot, r, rdot

    if not isinstance(series, PNSeries):
        raise TypeError(f"time_derivative_with_reaction acts on a PNSeries, got {series!r}")
    a_n, a_lambda = acceleration_with_reaction()
    rdot_rate = (a_n + r * phidot**2).expand()
    phidot_rate = ((a_lambda + PNSeries({0: -2 * rdot * phidot}, sp.oo)) * (1 / r)).expand()
    total = PNSeries({}, series.known_through)
    for order, coefficient in series.terms.items():
        exact = PNSeries({0: sp.expand(sp.diff(coefficient, r) * rdot + sp.diff(coefficient, phi) * phidot)},
                         sp.oo)
        piece = exact
        d_rdot, d_phidot = sp.diff(coefficient, rdot), sp.diff(coefficient, phidot)
        if d_rdot != 0:
            piece = piece + rdot_rate * d_rdot
        if d_phidot != 0:
            piece = piece + phidot_rate * d_phidot
        total = total + piece.shift(order)
    return total.expand()
