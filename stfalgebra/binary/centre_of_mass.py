"""Centre-of-mass relations of a two-body system in harmonic coordinates (Newtonian, 1PN).

The positions of the bodies in the centre-of-mass frame are proportional to the relative
separation, ``y_A = s_A x``; this module gives the scalar factors ``s_A`` and the velocity
factors ``v_A = p_A v + q_A x`` as PN series in ``eps = 1/c``.
"""

from __future__ import annotations

from functools import lru_cache

from stfalgebra.binary.cited_dynamics import centre_of_mass_position
from stfalgebra.binary.dynamics import OrbitTimeDerivative, check_pn_order
from stfalgebra.lazy_sympy import sp
from stfalgebra.pnseries import PNSeries

__all__ = ["centre_of_mass_factors", "centre_of_mass_velocity_factors"]


@lru_cache(maxsize=None)
def centre_of_mass_factors(pn_order: int) -> tuple[PNSeries, PNSeries]:
    """The factors ``(s1, s2)`` with ``y_A = s_A x`` in the centre-of-mass frame.

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
    OrderBeyondInputsError
        ``pn_order > 1``.

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
    Blanchet, Living Rev. Relativ. 17, 2 (2014), centre-of-mass relations in harmonic
    coordinates (the 1PN part from memory; equation number not recalled). The tests derive
    them from the 1PN mass dipole.
    """
    from stfalgebra.symbols import sympy_symbols

    known = check_pn_order(pn_order, "centre-of-mass relations")
    s1, s2 = centre_of_mass_position(sympy_symbols(), pn_order)
    return (PNSeries({k: sp.expand(v) for k, v in s1.items()}, known),
            PNSeries({k: sp.expand(v) for k, v in s2.items()}, known))


@lru_cache(maxsize=None)
def centre_of_mass_velocity_factors(pn_order: int
                                    ) -> tuple[tuple[PNSeries, PNSeries],
                                               tuple[PNSeries, PNSeries]]:
    """Velocity factors ``v_A = p_A v + q_A x`` with ``p_A = s_A`` and ``q_A = ds_A/dt``.

    Parameters
    ----------
    pn_order:
        0 or 1.

    Returns
    -------
    ((p1, q1), (p2, q2)):
        PN series in ``eps = 1/c``; ``q_A`` is the time derivative of ``s_A`` along the orbit
        (zero at Newtonian order), known through ``pn_order + 1/2``.

    **Conventions**: as :func:`centre_of_mass_factors`; ``v = dx/dt``.

    Example
    -------
    >>> (p1, q1), (p2, q2) = centre_of_mass_velocity_factors(1)
    >>> q1.coefficient(0)
    0

    References
    ----------
    Follows from :func:`centre_of_mass_factors` by differentiation (common practice).
    """
    s1, s2 = centre_of_mass_factors(pn_order)
    derivative = OrbitTimeDerivative(pn_order)
    return (s1, derivative(s1)), (s2, derivative(s2))
