"""Centre-of-mass relations of a two-body system in harmonic coordinates (Newtonian, 1PN, 2PN).

The positions of the bodies in the centre-of-mass frame are linear in the relative position and
velocity, ``y_A = s_A x + t_A v``; this module gives the factors ``(s_A, t_A)`` and the velocity
factors ``v_A = p_A v + q_A x`` as PN series in ``eps = 1/c``.

Through 1PN the positions are along ``x`` (``t_A = 0``) and :func:`centre_of_mass_factors`
returns ``(s1, s2)``; from 2PN on they have a term along ``v``, and
:func:`centre_of_mass_relations` returns both factors per body. The cited formulas live in
:mod:`stfalgebra.binary.cited_inputs`.
"""

from __future__ import annotations

from functools import lru_cache

import sympy as sp

from stfalgebra.binary import cited_inputs
from stfalgebra.binary.dynamics import (
    OrbitTimeDerivative,
    check_pn_order,
    cited_series,
    relative_acceleration_factors,
)
from stfalgebra.binary.masses import mass_fractions
from stfalgebra.pnseries import PNSeries
from stfalgebra.symbols import delta, nu

__all__ = [
    "centre_of_mass_relations",
    "centre_of_mass_factors",
    "centre_of_mass_velocity_factors",
]

#: Highest PN order at which the positions are along x alone (the v term starts at 2PN).
_ALONG_X_ONLY = (0, 1)


@lru_cache(maxsize=None)
def centre_of_mass_relations(pn_order: int
                             ) -> tuple[tuple[PNSeries, PNSeries], tuple[PNSeries, PNSeries]]:
    """The factors of ``y_A = s_A x + t_A v`` in the centre-of-mass frame.

    Parameters
    ----------
    pn_order:
        0 (Newtonian), 1 (1PN) or 2 (2PN).

    Returns
    -------
    ((s1, t1), (s2, t2)):
        PN series in ``eps = 1/c`` with coefficients in delta, nu, G, m, r, rdot, phidot, known
        through ``pn_order + 1/2`` (no 0.5PN or 1.5PN terms; at 2PN without the 2.5PN
        radiation-reaction term of ``Q``, a later issue). ``t_A`` vanishes below 2PN.

    Raises
    ------
    OrderBeyondInputsError
        ``pn_order > 2``.

    **Conventions**: harmonic coordinates, ``x = y1 - y2``, ``v = dx/dt``, ``X1 = (1 + delta)/2``,
    ``X2 = (1 - delta)/2``: ``y1 = [X2 + nu delta P] x + nu delta Q v``,
    ``y2 = [-X1 + nu delta P] x + nu delta Q v`` with ``P = eps^2 (v^2 - G m/r)/2 + eps^4 P_2PN``
    and ``Q = -(7/4) eps^4 G m rdot`` (:func:`cited_inputs.centre_of_mass_shift`,
    :func:`cited_inputs.centre_of_mass_velocity_term`). So ``s1 - s2 = 1`` and ``t1 = t2``.

    Example
    -------
    >>> (s1, t1), (s2, t2) = centre_of_mass_relations(2)
    >>> t1.coefficient(2)
    -7*G*delta*m*nu*rdot/4
    >>> t1 == t2
    True

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 7.3, the centre-of-mass positions (from
    memory; see :mod:`stfalgebra.binary.cited_inputs`). The tests derive the 1PN term from the
    1PN mass dipole; the 2PN terms have no independent check yet.
    """
    known = check_pn_order(pn_order, "centre-of-mass relations")
    x1, x2 = mass_fractions()
    weight = nu * delta
    shift = cited_series(cited_inputs.centre_of_mass_shift, pn_order, known) * weight
    along_v = cited_series(cited_inputs.centre_of_mass_velocity_term, pn_order, known) * weight
    s1 = (shift + sp.expand(x2)).expand()
    s2 = (shift + sp.expand(-x1)).expand()
    along_v = along_v.expand()
    return (s1, along_v), (s2, along_v)


@lru_cache(maxsize=None)
def centre_of_mass_factors(pn_order: int) -> tuple[PNSeries, PNSeries]:
    """The factors ``(s1, s2)`` with ``y_A = s_A x`` in the centre-of-mass frame, through 1PN.

    Parameters
    ----------
    pn_order:
        0 (Newtonian) or 1 (1PN).

    Returns
    -------
    (s1, s2):
        PN series in ``eps = 1/c`` with coefficients in delta, nu, G, m, r, rdot, phidot,
        known through ``pn_order + 1/2`` (the CM relations have no 0.5PN or 1.5PN terms).

    Raises
    ------
    ValueError
        ``pn_order = 2``: the positions then have a term along ``v`` that ``y_A = s_A x``
        cannot hold; :func:`centre_of_mass_relations` gives both factors.
    OrderBeyondInputsError
        ``pn_order > 2``.

    **Conventions**: harmonic coordinates, ``x = y1 - y2``, ``X1 = (1 + delta)/2``,
    ``X2 = (1 - delta)/2``, ``v^2 = rdot^2 + r^2 phidot^2``:
    ``s1 = X2 + nu delta (v^2 - G m/r)/(2 c^2)``, ``s2 = -X1 + nu delta (v^2 - G m/r)/(2 c^2)``.

    Example
    -------
    >>> s1, s2 = centre_of_mass_factors(0)
    >>> s1
    PNSeries(1/2 - delta/2 + O(eps**2))

    References
    ----------
    As :func:`centre_of_mass_relations` (the 1PN part is derived in the tests from the 1PN mass
    dipole).
    """
    check_pn_order(pn_order, "centre-of-mass relations")
    if int(pn_order) not in _ALONG_X_ONLY:
        raise ValueError(
            f"centre_of_mass_factors gives y_A = s_A x, which holds through 1PN only; at "
            f"pn_order {pn_order} the positions have a term along v: use "
            f"centre_of_mass_relations({pn_order})")
    (s1, _), (s2, _) = centre_of_mass_relations(pn_order)
    return s1, s2


@lru_cache(maxsize=None)
def centre_of_mass_velocity_factors(pn_order: int
                                    ) -> tuple[tuple[PNSeries, PNSeries],
                                               tuple[PNSeries, PNSeries]]:
    """Velocity factors ``v_A = p_A v + q_A x`` of the bodies in the centre-of-mass frame.

    Parameters
    ----------
    pn_order:
        0, 1 or 2.

    Returns
    -------
    ((p1, q1), (p2, q2)):
        PN series in ``eps = 1/c``, known through ``pn_order + 1/2``. With ``y_A = s_A x + t_A v``
        (:func:`centre_of_mass_relations`) and ``dv/dt = a_x x + a_v v``
        (:func:`~stfalgebra.binary.dynamics.relative_acceleration_factors`):
        ``p_A = s_A + dt_A/dt + t_A a_v`` and ``q_A = ds_A/dt + t_A a_x`` (through 1PN
        ``p_A = s_A``, ``q_A = ds_A/dt``; ``q_A`` vanishes at Newtonian order).

    **Conventions**: as :func:`centre_of_mass_relations`; ``v = dx/dt``, time derivatives along
    the orbit of the same PN order.

    Example
    -------
    >>> (p1, q1), (p2, q2) = centre_of_mass_velocity_factors(1)
    >>> q1.coefficient(0)
    0

    References
    ----------
    Follows from :func:`centre_of_mass_relations` by differentiation (common practice).
    """
    relations = centre_of_mass_relations(pn_order)
    derivative = OrbitTimeDerivative(pn_order)
    a_x, a_v = relative_acceleration_factors(pn_order)
    out = []
    for s_factor, t_factor in relations:
        p_factor = s_factor
        q_factor = derivative(s_factor)
        if t_factor.orders:
            p_factor = (p_factor + derivative(t_factor) + t_factor * a_v).expand()
            q_factor = (q_factor + t_factor * a_x).expand()
        out.append((p_factor, q_factor))
    return out[0], out[1]
