"""Relative two-body dynamics in harmonic coordinates: acceleration, time derivative along the
orbit, conserved energy and angular momentum (Newtonian, 1PN and 2PN).

Every result is a :class:`~stfalgebra.pnseries.PNSeries` in ``eps = 1/c`` with coefficients in
``G, m, nu, r, rdot, phidot`` (shared symbols of :mod:`stfalgebra.symbols`). Planar motion:
``n = x/r``, ``lambda = e_z x n``, ``v = rdot n + r phidot lambda``.

The typed-in formulas live once each in :mod:`stfalgebra.binary.cited_inputs` (plain functions
of a namespace of symbols, with their sources); this module evaluates them on the shared sympy
symbols (:data:`SYMBOL_NAMESPACE`) and attaches the order bookkeeping.

Known orders: the conservative dynamics of non-spinning point masses has no 0.5PN and no 1.5PN
terms, so a quantity given at PN order ``p`` in {0, 1, 2} is known through relative order
``p + 1/2`` (common practice). At ``p = 2`` this describes the *conservative* dynamics: the
2.5PN radiation reaction is not entered (a later issue).
"""

from __future__ import annotations

from collections.abc import Callable, Iterable
from functools import lru_cache
from types import SimpleNamespace
from typing import Any

import sympy as sp

from stfalgebra.binary import cited_inputs
from stfalgebra.errors import OrderBeyondInputsError
from stfalgebra.pnseries import PNSeries
from stfalgebra.symbols import G, delta, m, nu, phi, phidot, r, rdot

__all__ = [
    "SUPPORTED_PN_ORDERS",
    "SYMBOL_NAMESPACE",
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
SUPPORTED_PN_ORDERS = tuple(sorted(cited_inputs.KNOWN_THROUGH))

#: The shared sympy symbols as the namespace the cited inputs are written against.
SYMBOL_NAMESPACE = SimpleNamespace(G=G, m=m, nu=nu, delta=delta, r=r, rdot=rdot, phidot=phidot,
                                   q=sp.Rational)

_ORDER_NAMES = {0: "Newtonian (0)", 1: "1PN (1)", 2: "2PN (2)"}


def _order_words(orders: tuple[int, ...]) -> str:
    names = [_ORDER_NAMES.get(k, f"{k}PN ({k})") for k in orders]
    return names[0] if len(names) == 1 else ", ".join(names[:-1]) + " and " + names[-1]


def check_pn_order(pn_order: Any, what: str = "equations of motion",
                   available: Iterable[int] | None = None) -> sp.Rational:
    """Validate a PN order and return the relative order it is known through.

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
    sympy.Rational
        ``pn_order + 1/2`` (no 0.5PN and 1.5PN conservative terms; at 2PN the conservative
        dynamics, without the 2.5PN radiation reaction).

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
    3/2
    >>> check_pn_order(2)
    5/2

    References
    ----------
    Common practice (absence of half-integer conservative orders below 2.5PN);
    :data:`stfalgebra.binary.cited_inputs.KNOWN_THROUGH`.
    """
    orders = SUPPORTED_PN_ORDERS if available is None else tuple(sorted(available))
    if isinstance(pn_order, bool) or not isinstance(pn_order, (int, sp.Integer)):
        raise TypeError(f"pn_order must be an int ({', '.join(map(str, orders))}), "
                        f"got {pn_order!r}")
    if pn_order < 0:
        raise ValueError(f"pn_order must be one of {', '.join(map(str, orders))}, "
                         f"got {pn_order!r}")
    if int(pn_order) not in orders:
        raise OrderBeyondInputsError(
            f"the {what} are implemented at {_order_words(orders)} order; pn_order "
            f"{pn_order} is beyond the toolkit's inputs")
    return sp.Rational(cited_inputs.KNOWN_THROUGH[int(pn_order)])


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
    >>> cited_series(cited_inputs.angular_momentum_per_reduced_mass, 0, sp.Rational(1, 2))
    PNSeries(phidot*r**2 + O(eps**2))

    References
    ----------
    The sources are those of the function evaluated (:data:`cited_inputs.CITED_INPUTS`).
    """
    terms = function(SYMBOL_NAMESPACE)
    return PNSeries({k: sp.expand(v) for k, v in terms.items() if k <= pn_order}, known_through)


@lru_cache(maxsize=None)
def _acceleration_cited_form(pn_order: int) -> tuple[PNSeries, PNSeries]:
    """The factors ``(alpha, beta)`` of the cited form ``a = alpha n + beta v``."""
    known = check_pn_order(pn_order, "equations of motion")
    return (cited_series(cited_inputs.acceleration_n_factor, pn_order, known),
            cited_series(cited_inputs.acceleration_v_factor, pn_order, known))


@lru_cache(maxsize=None)
def _acceleration(pn_order: int) -> tuple[PNSeries, PNSeries]:
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
        through ``pn_order + 1/2``.

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
        PN series in ``eps = 1/c``: ``a_x = -(G m/r^3)(1 + A)``, ``a_v = -(G m/r^2) B``; known
        through ``pn_order + 1/2``.

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
    alpha, beta = _acceleration_cited_form(pn_order)
    return (alpha * (1 / r)).expand(), beta


# ----------------------------------------------------------------------------- time derivative
_ORBIT_GENS = (r, 1 / r, rdot, phidot)


@lru_cache(maxsize=None)
def _eom_polys(pn_order: int, gens: tuple[sp.Expr, ...]
               ) -> tuple[sp.Poly, sp.Poly, dict[int, sp.Poly], dict[int, sp.Poly]]:
    """The polar equations of motion as polynomials in ``gens`` = (r, 1/r, rdot, phidot, ...).

    Returns the polynomials of d r/dt and d (1/r)/dt and ``{doubled order: piece}`` of
    d rdot/dt and of d phidot/dt.
    """
    a_n, a_lambda = _acceleration(pn_order)
    rdot_rate: dict[int, sp.Expr] = {0: r * phidot**2}
    phidot_rate: dict[int, sp.Expr] = {0: -2 * rdot * phidot / r}
    for order, value in a_n.terms.items():
        rdot_rate[int(2 * order)] = rdot_rate.get(int(2 * order), 0) + value
    for order, value in a_lambda.terms.items():
        phidot_rate[int(2 * order)] = phidot_rate.get(int(2 * order), 0) + value / r

    def poly(expr: sp.Expr) -> sp.Poly:
        return sp.Poly(sp.expand(expr), *gens)

    return (poly(rdot), poly(-rdot / r**2),
            {k: poly(v) for k, v in rdot_rate.items()},
            {k: poly(v) for k, v in phidot_rate.items()})


def _poly_derivative(coeff: sp.Expr, pn_order: int) -> dict[int, sp.Expr] | None:
    """Fast path for ``coeff`` polynomial in (r, 1/r, rdot, phidot) and the constants.

    Every free symbol is a generator, so the results come out expanded. None when ``coeff``
    is not of that form (roots or functions of the orbital variables).
    """
    others = (coeff.free_symbols | {G, m, nu}) - {r, rdot, phidot}
    gens = _ORBIT_GENS + tuple(sorted(others, key=sp.default_sort_key))
    try:
        poly = sp.Poly(coeff, *gens)
    except sp.PolynomialError:
        return None
    if not poly.domain.is_Numerical:
        return None
    r_rate, s_rate, rdot_rate, phidot_rate = _eom_polys(pn_order, gens)
    gen_r, gen_s, gen_rdot, gen_phidot = gens[:4]
    pieces: dict[int, sp.Poly] = {0: poly.diff(gen_r) * r_rate + poly.diff(gen_s) * s_rate}
    for gen, rates in ((gen_rdot, rdot_rate), (gen_phidot, phidot_rate)):
        partial = poly.diff(gen)
        if partial.is_zero:
            continue
        for k, rate in rates.items():
            pieces[k] = pieces[k] + partial * rate if k in pieces else partial * rate
    return {k: v.as_expr() for k, v in pieces.items()}


def _generic_derivative(coeff: sp.Expr, pn_order: int) -> dict[int, sp.Expr]:
    """General path through ``sympy.diff`` (any dependence on r, rdot, phidot, phi)."""
    a_n, a_lambda = _acceleration(pn_order)
    d_r = sp.diff(coeff, r) if coeff.has(r) else sp.S.Zero
    d_rdot = sp.diff(coeff, rdot) if coeff.has(rdot) else sp.S.Zero
    d_phidot = sp.diff(coeff, phidot) if coeff.has(phidot) else sp.S.Zero
    d_phi = sp.diff(coeff, phi) if coeff.has(phi) else sp.S.Zero
    pieces: dict[int, list[sp.Expr]] = {}
    pieces[0] = [d_r * rdot, d_rdot * r * phidot**2, -d_phidot * 2 * rdot * phidot / r,
                 d_phi * phidot]
    for order, value in a_n.terms.items():
        pieces.setdefault(int(2 * order), []).append(d_rdot * value)
    for order, value in a_lambda.terms.items():
        pieces.setdefault(int(2 * order), []).append(d_phidot * value / r)
    return {k: sp.expand(sp.Add(*parts)) for k, parts in pieces.items()}


@lru_cache(maxsize=65536)
def _coefficient_derivative(coeff: sp.Expr, pn_order: int) -> tuple[tuple[int, sp.Expr], ...]:
    """d/dt of one coefficient along the orbit: pieces (doubled order offset, expression).

    Polar kinematics (common practice): dr/dt = rdot, drdot/dt = r phidot^2 + a_n,
    dphidot/dt = (a_lambda - 2 rdot phidot)/r, dphi/dt = phidot.
    """
    pieces = None if coeff.has(phi) else _poly_derivative(coeff, pn_order)
    if pieces is None:
        pieces = _generic_derivative(coeff, pn_order)
    return tuple((k, v) for k, v in sorted(pieces.items()) if v != 0)


class OrbitTimeDerivative:
    """Time derivative along the PN relative orbit, acting on PN series in ``eps = 1/c``.

    Parameters
    ----------
    pn_order:
        PN order of the equations of motion used (0, 1 or 2).

    **Conventions**: the coefficients are functions of ``r, rdot, phidot, phi`` (other symbols
    constant), differentiated with ``dr/dt = rdot``, ``drdot/dt = r phidot^2 + a_n``,
    ``dphidot/dt = (a_lambda - 2 rdot phidot)/r``, ``dphi/dt = phidot``. An order-``k`` piece
    of the acceleration raises the order by ``k``. The result is known through
    ``min(known_through, k0 + pn_order + 1/2)``, ``k0`` the lowest order of the input whose
    coefficient depends on ``rdot`` or ``phidot`` (only those feel the acceleration).

    Example
    -------
    >>> from stfalgebra.symbols import r, rdot
    >>> d = OrbitTimeDerivative(0)
    >>> d(PNSeries({0: r**2}, 1))
    PNSeries(2*r*rdot + O(eps**3))

    References
    ----------
    Common practice (chain rule along the equations of motion in polar coordinates).
    """

    __slots__ = ("pn_order", "known_through", "_cache")

    def __init__(self, pn_order: int) -> None:
        self.known_through = check_pn_order(pn_order, "equations of motion")
        self.pn_order = int(pn_order)
        self._cache: dict[PNSeries, PNSeries] = {}

    def __repr__(self) -> str:
        return f"OrbitTimeDerivative(pn_order={self.pn_order})"

    def __call__(self, series: PNSeries) -> PNSeries:
        """The time derivative of ``series`` along the orbit.

        Parameters
        ----------
        series:
            A PNSeries in ``eps = 1/c`` with coefficients in r, rdot, phidot, phi, constants.

        Returns
        -------
        PNSeries
            Expanded coefficients; cached per input series.

        **Conventions**: see the class docstring.

        Example
        -------
        >>> from stfalgebra.symbols import phi, phidot
        >>> OrbitTimeDerivative(1)(PNSeries({0: phi}, sp.oo))
        PNSeries(phidot)

        References
        ----------
        Common practice.
        """
        if not isinstance(series, PNSeries):
            raise TypeError(f"OrbitTimeDerivative acts on a PNSeries, got {series!r}")
        cached = self._cache.get(series)
        if cached is not None:
            return cached
        # the acceleration enters only through d/drdot and d/dphidot: its unknown terms
        # (beyond the EOM's known order) reach the result only from such coefficients
        known = series.known_through
        for order, coeff in series.terms.items():
            if coeff.has(rdot) or coeff.has(phidot):
                known = min(known, order + self.known_through)
                break  # terms are ascending: the first such order is the binding one
        pieces: dict[int, list[sp.Expr]] = {}
        for order, coeff in series.terms.items():
            k2 = int(2 * order)
            for offset, value in _coefficient_derivative(coeff, self.pn_order):
                if sp.Rational(k2 + offset, 2) <= known:
                    pieces.setdefault(k2 + offset, []).append(value)
        terms = {sp.Rational(k, 2): sp.Add(*v) for k, v in pieces.items()}
        result = PNSeries({k: v for k, v in terms.items() if v != 0}, known)
        self._cache[series] = result
        return result

    def repeated(self, series: PNSeries, times: int) -> PNSeries:
        """Apply the derivative ``times`` times.

        Parameters
        ----------
        series:
            As for :meth:`__call__`.
        times:
            A non-negative int (``ValueError`` otherwise).

        Returns
        -------
        PNSeries

        **Conventions**: see the class docstring.

        Example
        -------
        >>> from stfalgebra.symbols import r, rdot
        >>> OrbitTimeDerivative(0).repeated(PNSeries({0: r}, sp.oo), 2)
        PNSeries(-G*m/r**2 + phidot**2*r + O(eps**2))

        References
        ----------
        Common practice.
        """
        if isinstance(times, bool) or not isinstance(times, int) or times < 0:
            raise ValueError(f"times must be a non-negative int, got {times!r}")
        for _ in range(times):
            series = self(series)
        return series


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
        In ``eps = 1/c``; known through ``pn_order + 1/2``.

    **Conventions**: centre-of-mass frame, ``mu = m nu``, rest-mass energy excluded:
    ``E/mu = v^2/2 - G m/r + eps^2 [3/8 (1 - 3 nu) v^4 + (G m/(2 r))((3 + nu) v^2 + nu rdot^2
    + G m/r)] + eps^4 E_2PN`` (:func:`stfalgebra.binary.cited_inputs.energy_per_reduced_mass`).
    Conserved by the conservative dynamics; the 2.5PN radiation-reaction piece is not included.

    Example
    -------
    >>> conserved_energy(0)
    PNSeries(-G*m/r + phidot**2*r**2/2 + rdot**2/2 + O(eps**2))

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 7.3 (from memory; see
    :mod:`stfalgebra.binary.cited_inputs`). Checked in the tests by its vanishing time
    derivative along the equations of motion, the Schwarzschild geodesic at nu = 0 and the
    published circular-orbit energy.
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
        In ``eps = 1/c``; known through ``pn_order + 1/2``.

    **Conventions**: ``J/mu = r^2 phidot [1 + eps^2 ((1 - 3 nu) v^2/2 + (3 + nu) G m/r) +
    eps^4 J_2PN]`` (:func:`stfalgebra.binary.cited_inputs.angular_momentum_per_reduced_mass`),
    harmonic coordinates, centre-of-mass frame, positive for motion along +phi.

    Example
    -------
    >>> conserved_angular_momentum(0)
    PNSeries(phidot*r**2 + O(eps**2))

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 7.3 (from memory; see
    :mod:`stfalgebra.binary.cited_inputs`). Checked in the tests by its vanishing time
    derivative along the equations of motion, the Schwarzschild geodesic at nu = 0 and the
    published circular-orbit angular momentum.
    """
    known = check_pn_order(pn_order, "conserved quantities")
    return cited_series(cited_inputs.angular_momentum_per_reduced_mass, pn_order, known)


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
    _coefficient_derivative.cache_clear()
    _eom_polys.cache_clear()

