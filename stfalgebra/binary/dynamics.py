"""Relative two-body dynamics in harmonic coordinates as sympy series: acceleration, conserved
energy and angular momentum (Newtonian and 1PN), and the time derivative along the orbit.

The formulas are the cited inputs of :mod:`stfalgebra.binary.cited_dynamics` (one place each,
evaluated here with sympy symbols; the exact engine evaluates the same functions). Every result
is a :class:`~stfalgebra.pnseries.PNSeries` in ``eps = 1/c`` with coefficients in
``G, m, nu, r, rdot, phidot`` (shared symbols of :mod:`stfalgebra.symbols`). Planar motion:
``n = x/r``, ``lambda = e_z x n``, ``v = rdot n + r phidot lambda``.

Known orders: the conservative dynamics of non-spinning point masses has no 0.5PN and no 1.5PN
terms (the first odd order is radiation reaction at 2.5PN; common practice), so a quantity
given at PN order ``p`` is known through relative order ``p + 1/2``.
"""

from __future__ import annotations

from functools import lru_cache
from typing import Any

from stfalgebra.binary import orbit_derivative
from stfalgebra.binary.cited_dynamics import (
    DYNAMICS_INPUTS, dynamics_input, harmonic_acceleration, known_through, orbital_angular_momentum,
    orbital_energy,
)
from stfalgebra.binary.orbit_derivative import OrbitTimeDerivative
from stfalgebra.lazy_sympy import sp
from stfalgebra.orders import PNOrder
from stfalgebra.pnseries import PNSeries

__all__ = [
    "SUPPORTED_PN_ORDERS",
    "check_pn_order",
    "relative_acceleration",
    "OrbitTimeDerivative",
    "conserved_energy",
    "conserved_angular_momentum",
    "clear_caches",
]

#: PN orders of the equations of motion implemented (read off the table of inputs).
SUPPORTED_PN_ORDERS = DYNAMICS_INPUTS["equations of motion"].orders


def check_pn_order(pn_order: Any, what: str = "equations of motion") -> PNOrder:
    """Validate a PN order of the dynamics and return the relative order it is known through.

    Parameters
    ----------
    pn_order:
        An int among :data:`SUPPORTED_PN_ORDERS`.
    what:
        Name of the quantity, for the error message.

    Returns
    -------
    PNOrder
        ``pn_order + 1/2`` (no 0.5PN and 1.5PN conservative terms).

    Raises
    ------
    TypeError
        Not an int.
    ValueError
        Negative.
    OrderBeyondInputsError
        Beyond the cited equations of motion.

    **Conventions**: relative PN orders, ``eps = 1/c``.

    Example
    -------
    >>> check_pn_order(1)
    PNOrder(3/2)

    References
    ----------
    Common practice (absence of half-integer conservative orders below 2.5PN).
    """
    try:
        dynamics_input("equations of motion", pn_order)
    except ValueError as exc:
        if type(exc) is ValueError:
            raise
        raise type(exc)(str(exc).replace("the equations of motion", f"the {what}")) from None
    return known_through(int(pn_order))


def _series(formula_terms: dict[int, Any], known: PNOrder) -> PNSeries:
    return PNSeries({k: sp.expand(v) for k, v in formula_terms.items()}, known)


@lru_cache(maxsize=None)
def _acceleration(pn_order: int) -> tuple[PNSeries, PNSeries]:
    from stfalgebra.symbols import sympy_symbols

    known = check_pn_order(pn_order, "equations of motion")
    a_n, a_lambda = harmonic_acceleration(sympy_symbols(), pn_order)
    return _series(a_n, known), _series(a_lambda, known)


def relative_acceleration(pn_order: int) -> tuple[PNSeries, PNSeries]:
    """Relative acceleration ``dv/dt = a_n n + a_lambda lambda`` in harmonic coordinates.

    Parameters
    ----------
    pn_order:
        0 (Newtonian) or 1 (1PN).

    Returns
    -------
    (a_n, a_lambda):
        PN series in ``eps = 1/c`` (coefficients in G, m, nu, r, rdot, phidot), known
        through ``pn_order + 1/2``.

    Raises
    ------
    OrderBeyondInputsError
        ``pn_order > 1``.

    **Conventions**: harmonic coordinates; ``n = x/r`` from body 2 to body 1,
    ``lambda = e_z x n``. Newtonian ``a = -(G m/r^2) n``; at 1PN
    ``a = -(G m/r^2)[(1 + A) n + B v]`` with
    ``A = eps^2 [-(3/2) nu rdot^2 + (1 + 3 nu) v^2 - 2 (2 + nu) G m/r]``,
    ``B = eps^2 (-2 (2 - nu) rdot)``.

    Example
    -------
    >>> a_n, a_lambda = relative_acceleration(0)
    >>> a_n
    PNSeries(-G*m/r**2 + O(eps**2))
    >>> relative_acceleration(1)[1].coefficient(1)
    -2*G*m*nu*phidot*rdot/r + 4*G*m*phidot*rdot/r

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), the 1PN relative acceleration in harmonic
    coordinates (entered from memory; equation number not recalled).
    """
    return _acceleration(pn_order)


# ----------------------------------------------------------------------------- conserved quantities
@lru_cache(maxsize=None)
def conserved_energy(pn_order: int) -> PNSeries:
    """Conserved orbital energy per unit reduced mass, ``E/mu``, harmonic coordinates.

    Parameters
    ----------
    pn_order:
        0 or 1.

    Returns
    -------
    PNSeries
        In ``eps = 1/c``; known through ``pn_order + 1/2``.

    **Conventions**: ``E/mu = v^2/2 - G m/r + eps^2 [3/8 (1 - 3 nu) v^4 +
    (G m/(2 r))((3 + nu) v^2 + nu rdot^2 + G m/r)]``, ``mu = m nu``, rest-mass energy excluded.

    Example
    -------
    >>> conserved_energy(0)
    PNSeries(-G*m/r + phidot**2*r**2/2 + rdot**2/2 + O(eps**2))

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), 1PN energy in harmonic coordinates
    (from memory). Checked in the tests by its vanishing time derivative along the 1PN
    equations of motion.
    """
    from stfalgebra.symbols import sympy_symbols

    known = check_pn_order(pn_order, "conserved quantities")
    return _series(orbital_energy(sympy_symbols(), pn_order), known)


@lru_cache(maxsize=None)
def conserved_angular_momentum(pn_order: int) -> PNSeries:
    """Conserved orbital angular momentum (z component) per unit reduced mass, ``J/mu``.

    Parameters
    ----------
    pn_order:
        0 or 1.

    Returns
    -------
    PNSeries
        In ``eps = 1/c``; known through ``pn_order + 1/2``.

    **Conventions**: ``J/mu = r^2 phidot [1 + eps^2 ((1 - 3 nu) v^2/2 + (3 + nu) G m/r)]``,
    harmonic coordinates, positive for motion along +phi.

    Example
    -------
    >>> conserved_angular_momentum(0)
    PNSeries(phidot*r**2 + O(eps**2))

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), 1PN angular momentum (from memory).
    Checked in the tests by its vanishing time derivative along the 1PN equations of motion.
    """
    from stfalgebra.symbols import sympy_symbols

    known = check_pn_order(pn_order, "conserved quantities")
    return _series(orbital_angular_momentum(sympy_symbols(), pn_order), known)


def clear_caches() -> None:
    """Empty the module's caches (tests call this between cases).

    Returns
    -------
    None

    **Conventions**: the caches hold derivatives of coefficients and the equations of motion
    as polynomials; results do not depend on them.

    Example
    -------
    >>> clear_caches()

    References
    ----------
    Common practice.
    """
    orbit_derivative.clear_caches()
    _acceleration.cache_clear()

