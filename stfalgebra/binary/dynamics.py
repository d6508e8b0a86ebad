"""Relative two-body dynamics in harmonic coordinates: acceleration, time derivative along the
orbit, conserved energy and angular momentum (Newtonian and 1PN).

Every result is a :class:`~stfalgebra.pnseries.PNSeries` in ``eps = 1/c`` with coefficients in
``G, m, nu, r, rdot, phidot`` (shared symbols of :mod:`stfalgebra.symbols`). Planar motion:
``n = x/r``, ``lambda = e_z x n``, ``v = rdot n + r phidot lambda``.

Known orders: the conservative dynamics of non-spinning point masses has no 0.5PN and no 1.5PN
terms (the first odd order is radiation reaction at 2.5PN; common practice), so a quantity
given at PN order ``p`` in {0, 1} is known through relative order ``p + 1/2``.
"""

from __future__ import annotations

from functools import lru_cache
from typing import Any

import sympy as sp

from stfalgebra.errors import OrderBeyondInputsError
from stfalgebra.pnseries import PNSeries
from stfalgebra.symbols import G, m, nu, phi, phidot, r, rdot

__all__ = [
    "SUPPORTED_PN_ORDERS",
    "check_pn_order",
    "relative_acceleration",
    "OrbitTimeDerivative",
    "conserved_energy",
    "conserved_angular_momentum",
    "clear_caches",
]

#: PN orders of the equations of motion implemented here.
SUPPORTED_PN_ORDERS = (0, 1)

_HALF = sp.Rational(1, 2)


def check_pn_order(pn_order: Any, what: str = "equations of motion") -> sp.Rational:
    """Validate a PN order (0 or 1) and return the relative order it is known through.

    Parameters
    ----------
    pn_order:
        0 (Newtonian) or 1 (1PN).
    what:
        Name of the quantity, for the error message.

    Returns
    -------
    sympy.Rational
        ``pn_order + 1/2`` (no 0.5PN and 1.5PN conservative terms).

    Raises
    ------
    TypeError
        Not an int.
    OrderBeyondInputsError
        An int other than 0 or 1.

    **Conventions**: relative PN orders, ``eps = 1/c``.

    Example
    -------
    >>> check_pn_order(1)
    3/2

    References
    ----------
    Common practice (absence of half-integer conservative orders below 2.5PN).
    """
    if isinstance(pn_order, bool) or not isinstance(pn_order, (int, sp.Integer)):
        raise TypeError(f"pn_order must be an int (0 or 1), got {pn_order!r}")
    if pn_order < 0:
        raise ValueError(f"pn_order must be 0 or 1, got {pn_order!r}")
    if int(pn_order) not in SUPPORTED_PN_ORDERS:
        raise OrderBeyondInputsError(
            f"the {what} are implemented at Newtonian (0) and 1PN (1) order; pn_order "
            f"{pn_order} is beyond the toolkit's inputs")
    return int(pn_order) + _HALF


def _v_squared() -> sp.Expr:
    return rdot**2 + r**2 * phidot**2


@lru_cache(maxsize=None)
def _acceleration(pn_order: int) -> tuple[PNSeries, PNSeries]:
    known = check_pn_order(pn_order, "equations of motion")
    gm_r2 = G * m / r**2
    a_n = {0: -gm_r2}
    a_lambda: dict[int, sp.Expr] = {}
    if pn_order >= 1:
        v2 = _v_squared()
        # a = -(G m/r^2)[(1 + A) n + B v], v = rdot n + r phidot lambda (from memory:
        # Blanchet, Living Rev. Relativ. 17, 2 (2014), 1PN harmonic relative acceleration)
        big_a = -sp.Rational(3, 2) * nu * rdot**2 + (1 + 3 * nu) * v2 - 2 * (2 + nu) * G * m / r
        big_b = -2 * (2 - nu) * rdot
        a_n[1] = sp.expand(-gm_r2 * (big_a + big_b * rdot))
        a_lambda[1] = sp.expand(-gm_r2 * big_b * r * phidot)
    return PNSeries(a_n, known), PNSeries(a_lambda, known)


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
        PN order of the equations of motion used (0 or 1).

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
    known = check_pn_order(pn_order, "conserved quantities")
    v2 = _v_squared()
    terms = {0: sp.expand(v2 / 2 - G * m / r)}
    if pn_order >= 1:
        terms[1] = sp.expand(sp.Rational(3, 8) * (1 - 3 * nu) * v2**2
                             + G * m / (2 * r) * ((3 + nu) * v2 + nu * rdot**2 + G * m / r))
    return PNSeries(terms, known)


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
    known = check_pn_order(pn_order, "conserved quantities")
    terms = {0: r**2 * phidot}
    if pn_order >= 1:
        terms[1] = sp.expand(r**2 * phidot * ((1 - 3 * nu) * _v_squared() / 2
                                               + (3 + nu) * G * m / r))
    return PNSeries(terms, known)


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

