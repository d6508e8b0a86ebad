"""Relative two-body dynamics in harmonic coordinates as sympy series: acceleration, conserved
energy and angular momentum (Newtonian, 1PN and 2PN), and the time derivative along the orbit.

Every result is a :class:`~stfalgebra.pnseries.PNSeries` in ``eps = 1/c`` with coefficients in
``G, m, nu, r, rdot, phidot`` (shared symbols of :mod:`stfalgebra.symbols`). Planar motion:
``n = x/r``, ``lambda = e_z x n``, ``v = rdot n + r phidot lambda``.

The typed-in formulas live once each in :mod:`stfalgebra.binary.cited_inputs` (plain functions
of a namespace of symbols, with their sources); this module evaluates them on the shared sympy
symbols (:data:`SYMBOL_NAMESPACE`) and attaches the order bookkeeping; the exact engine
evaluates the same functions (:mod:`stfalgebra.binary.orbit_derivative`,
:mod:`stfalgebra.binary.circular_frequency`).

Known orders: the conservative dynamics of non-spinning point masses has no 0.5PN and no 1.5PN
terms, so a quantity given at PN order ``p`` is known through relative order ``p + 1/2``
(common practice); at ``p = 2`` through 2, the 2.5PN radiation reaction not being entered
(a later issue).
"""

from __future__ import annotations

from collections.abc import Callable, Iterable
from functools import lru_cache
from typing import Any

from stfalgebra.binary import cited_inputs, orbit_derivative
from stfalgebra.binary.orbit_derivative import OrbitTimeDerivative
from stfalgebra.lazy_sympy import sp
from stfalgebra.orders import PNOrder
from stfalgebra.pnseries import PNSeries

__all__ = [
    "SUPPORTED_PN_ORDERS",
    "check_pn_order",
    "cited_series",
    "relative_acceleration",
    "relative_acceleration_factors",
    "OrbitTimeDerivative",
    "conserved_energy",
    "conserved_angular_momentum",
    "clear_caches",
]

#: PN orders of the equations of motion implemented here (read off the cited inputs).
SUPPORTED_PN_ORDERS = cited_inputs.INPUT_ORDERS["equations of motion"]


def __getattr__(name: str) -> Any:
    if name == "SYMBOL_NAMESPACE":      # the shared sympy symbols, made on first use
        from stfalgebra.symbols import sympy_symbols

        return sympy_symbols()
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")


def check_pn_order(pn_order: Any, what: str = "equations of motion",
                   available: Iterable[int] | None = None) -> PNOrder:
    """Validate a PN order of the dynamics and return the relative order it is known through.

    Parameters
    ----------
    pn_order:
        0 (Newtonian), 1 (1PN) or 2 (2PN).
    what:
        Name of the quantity, for the error message.
    available:
        The orders the caller implements (a subset of :data:`SUPPORTED_PN_ORDERS`); all of them
        by default.

    Returns
    -------
    PNOrder
        ``pn_order + 1/2`` below 2PN (no 0.5PN and 1.5PN conservative terms); 2 at 2PN (the
        2.5PN radiation reaction is not entered).

    Raises
    ------
    TypeError
        Not an int.
    ValueError
        A negative int.
    OrderBeyondInputsError
        An int the caller does not implement.

    **Conventions**: relative PN orders, ``eps = 1/c``.

    Example
    -------
    >>> check_pn_order(1)
    PNOrder(3/2)
    >>> check_pn_order(2)
    PNOrder(2)

    References
    ----------
    Common practice (absence of half-integer conservative orders below 2.5PN);
    :data:`stfalgebra.binary.cited_inputs.KNOWN_THROUGH`.
    """
    orders = SUPPORTED_PN_ORDERS if available is None else tuple(sorted(available))
    order = cited_inputs.check_input_order(pn_order, what, orders)
    return cited_inputs.known_through(order)


def cited_series(function: Callable[[Any], dict[int, Any]], pn_order: int,
                 known_through: Any) -> PNSeries:
    """Evaluate a cited input on the shared sympy symbols, as a series in ``eps = 1/c``.

    Parameters
    ----------
    function:
        One of the functions of :mod:`stfalgebra.binary.cited_inputs` (``{k: coefficient of
        1/c^(2k)}``).
    pn_order:
        Keep the orders ``k <= pn_order``.
    known_through:
        The order through which the result is known (from :func:`check_pn_order`).

    Returns
    -------
    PNSeries
        Expanded coefficients.

    **Conventions**: order ``k`` multiplies ``eps^(2k)``, ``eps = 1/c``.

    Example
    -------
    >>> cited_series(cited_inputs.angular_momentum_per_reduced_mass, 0, PNOrder(1, 2))
    PNSeries(phidot*r**2 + O(eps**2))

    References
    ----------
    The sources are those of the function evaluated (:data:`cited_inputs.CITED_INPUTS`).
    """
    from stfalgebra.symbols import sympy_symbols

    terms = function(sympy_symbols())
    return PNSeries({k: sp.expand(v) for k, v in terms.items() if k <= pn_order}, known_through)


@lru_cache(maxsize=None)
def _acceleration_cited_form(pn_order: int) -> tuple[PNSeries, PNSeries]:
    """The factors ``(alpha, beta)`` of the cited form ``a = alpha n + beta v``."""
    known = check_pn_order(pn_order, "equations of motion")
    return (cited_series(cited_inputs.acceleration_n_factor, pn_order, known),
            cited_series(cited_inputs.acceleration_v_factor, pn_order, known))


@lru_cache(maxsize=None)
def _acceleration(pn_order: int) -> tuple[PNSeries, PNSeries]:
    from stfalgebra.symbols import phidot, r, rdot

    alpha, beta = _acceleration_cited_form(pn_order)
    # v = rdot n + r phidot lambda
    return (alpha + beta * rdot).expand(), (beta * (r * phidot)).expand()


def relative_acceleration(pn_order: int) -> tuple[PNSeries, PNSeries]:
    """Relative acceleration ``dv/dt = a_n n + a_lambda lambda`` in harmonic coordinates.

    Parameters
    ----------
    pn_order:
        0 (Newtonian), 1 (1PN) or 2 (2PN).

    Returns
    -------
    (a_n, a_lambda):
        PN series in ``eps = 1/c`` (coefficients in G, m, nu, r, rdot, phidot), known
        through :func:`check_pn_order`.

    Raises
    ------
    OrderBeyondInputsError
        ``pn_order > 2``.

    **Conventions**: harmonic coordinates, centre-of-mass frame; ``n = x/r`` from body 2 to
    body 1, ``lambda = e_z x n``. ``a = -(G m/r^2)[(1 + A) n + B v]`` with
    ``A = eps^2 [-(3/2) nu rdot^2 + (1 + 3 nu) v^2 - 2 (2 + nu) G m/r] + eps^4 A_2PN``,
    ``B = eps^2 (-2 (2 - nu) rdot) + eps^4 B_2PN`` (:mod:`stfalgebra.binary.cited_inputs`);
    ``a_n = -(G m/r^2)(1 + A + B rdot)``, ``a_lambda = -(G m/r^2) B r phidot``. At 2PN the
    conservative dynamics: the 2.5PN radiation reaction is not included (a later issue).

    Example
    -------
    >>> a_n, a_lambda = relative_acceleration(0)
    >>> a_n
    PNSeries(-G*m/r**2 + O(eps**2))
    >>> relative_acceleration(1)[1].coefficient(1)
    -2*G*m*nu*phidot*rdot/r + 4*G*m*phidot*rdot/r
    >>> from stfalgebra.symbols import rdot, phidot
    >>> relative_acceleration(2)[0].coefficient(2).subs({rdot: 0, phidot: 0})
    -87*G**3*m**3*nu/(4*r**4) - 9*G**3*m**3/r**4

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 7.3 (coefficients A and B, from memory;
    see :mod:`stfalgebra.binary.cited_inputs`).
    """
    return _acceleration(pn_order)


@lru_cache(maxsize=None)
def relative_acceleration_factors(pn_order: int) -> tuple[PNSeries, PNSeries]:
    """The relative acceleration as ``dv/dt = a_x x + a_v v`` (factors of position and velocity).

    Parameters
    ----------
    pn_order:
        0, 1 or 2.

    Returns
    -------
    (a_x, a_v):
        PN series in ``eps = 1/c``: ``a_x = -(G m/r^3)(1 + A)``, ``a_v = -(G m/r^2) B``.

    **Conventions**: as :func:`relative_acceleration` (the cited form, without dividing by
    ``phidot``).

    Example
    -------
    >>> a_x, a_v = relative_acceleration_factors(1)
    >>> a_x.coefficient(0)
    -G*m/r**3
    >>> a_v.coefficient(1)
    -2*G*m*nu*rdot/r**2 + 4*G*m*rdot/r**2

    References
    ----------
    As :func:`relative_acceleration`.
    """
    from stfalgebra.symbols import r

    alpha, beta = _acceleration_cited_form(pn_order)
    return (alpha * (1 / r)).expand(), beta


# ----------------------------------------------------------------------------- conserved quantities
@lru_cache(maxsize=None)
def conserved_energy(pn_order: int) -> PNSeries:
    """Conserved orbital energy per unit reduced mass, ``E/mu``, harmonic coordinates.

    Parameters
    ----------
    pn_order:
        0, 1 or 2.

    Returns
    -------
    PNSeries
        In ``eps = 1/c``; known through :func:`check_pn_order`.

    **Conventions**: ``mu = m nu``, rest-mass energy excluded; the formula is
    :func:`stfalgebra.binary.cited_inputs.energy_per_reduced_mass`.

    Example
    -------
    >>> conserved_energy(0)
    PNSeries(-G*m/r + phidot**2*r**2/2 + rdot**2/2 + O(eps**2))

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 7.3 (from memory). Checked in the tests by
    its vanishing time derivative along the equations of motion.
    """
    known = check_pn_order(pn_order, "conserved quantities")
    return cited_series(cited_inputs.energy_per_reduced_mass, pn_order, known)


@lru_cache(maxsize=None)
def conserved_angular_momentum(pn_order: int) -> PNSeries:
    """Conserved orbital angular momentum (z component) per unit reduced mass, ``J/mu``.

    Parameters
    ----------
    pn_order:
        0, 1 or 2.

    Returns
    -------
    PNSeries
        In ``eps = 1/c``; known through :func:`check_pn_order`.

    **Conventions**: harmonic coordinates, positive for motion along +phi; the formula is
    :func:`stfalgebra.binary.cited_inputs.angular_momentum_per_reduced_mass`.

    Example
    -------
    >>> conserved_angular_momentum(0)
    PNSeries(phidot*r**2 + O(eps**2))

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 7.3 (from memory). Checked in the tests by
    its vanishing time derivative along the equations of motion.
    """
    known = check_pn_order(pn_order, "conserved quantities")
    return cited_series(cited_inputs.angular_momentum_per_reduced_mass, pn_order, known)


def clear_caches() -> None:
    """Empty the module's caches (tests call this between cases).

    Example
    -------
    >>> clear_caches()
    """
    orbit_derivative.clear_caches()
    for cached in (_acceleration, _acceleration_cited_form, relative_acceleration_factors,
                   conserved_energy, conserved_angular_momentum):
        cached.cache_clear()
