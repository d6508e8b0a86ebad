"""The time derivative along the PN relative orbit, acting on PN series in ``eps = 1/c``.

Coefficients are functions of ``r, rdot, phidot`` (and, for sympy coefficients, of ``phi``);
every other symbol is constant. Polar kinematics (common practice):

    dr/dt = rdot,   d rdot/dt = r phidot^2 + a_n,   d phidot/dt = (a_lambda - 2 rdot phidot)/r,
    d phi/dt = phidot,

with the relative acceleration ``a = alpha n + beta v`` of
:mod:`stfalgebra.binary.cited_inputs`, i.e. ``a_n = alpha + beta rdot``,
``a_lambda = beta r phidot``. An order-``k`` piece of the acceleration raises the order by ``k``.

Engine coefficients (:class:`~stfalgebra.exact.ExactPolynomial`) are differentiated in the
exact engine (``1/r`` is its own generator: ``d(1/r)/dt = -rdot/r^2``); sympy coefficients are
converted to the engine when they are polynomials in its generators and differentiated with
``sympy.diff`` otherwise (functions of ``phi``, roots).
"""

from __future__ import annotations

from functools import lru_cache
from typing import Any

from ..exact import ExactPolynomial, NotRepresentableError, engine_symbols
from ..lazy_sympy import sp
from ..pnseries import PNSeries
from .cited_inputs import acceleration_n_factor, acceleration_v_factor, check_input_order, known_through

__all__ = ["OrbitTimeDerivative", "clear_caches", "derivative_with_rates", "derivative_with_named_rates"]


@lru_cache(maxsize=None)
def _rates(pn_order: int) -> tuple[dict[int, ExactPolynomial], dict[int, ExactPolynomial]]:
    """``{doubled order: piece}`` of d rdot/dt and d phidot/dt in the engine."""
    s = engine_symbols()
    alpha, beta = acceleration_n_factor(s), acceleration_v_factor(s)
    a_n = {k: v for k, v in alpha.items() if k <= pn_order}
    a_lambda: dict[int, ExactPolynomial] = {}
    for k, v in beta.items():
        if k <= pn_order:
            a_n[k] = a_n.get(k, ExactPolynomial(0)) + v * s.rdot
            a_lambda[k] = v * s.r * s.phidot
    rdot_rate = {0: s.r * s.phidot**2}
    phidot_rate = {0: -2 * s.rdot * s.phidot * s.r**-1}
    for k, value in a_n.items():
        rdot_rate[2 * k] = rdot_rate.get(2 * k, ExactPolynomial(0)) + value
    for k, value in a_lambda.items():
        phidot_rate[2 * k] = phidot_rate.get(2 * k, ExactPolynomial(0)) + value * s.r**-1
    return ({k: v for k, v in rdot_rate.items() if not v.is_zero()},
            {k: v for k, v in phidot_rate.items() if not v.is_zero()})


def _exact_derivative(coefficient: ExactPolynomial, pn_order: int) -> tuple[tuple[int, ExactPolynomial], ...]:
    """d/dt of one engine coefficient: pieces (doubled order offset, value)."""
    return derivative_with_rates(coefficient, *_rates(pn_order))


def derivative_with_rates(coefficient: ExactPolynomial, rdot_rate: dict[int, ExactPolynomial],
                          phidot_rate: dict[int, ExactPolynomial]) -> tuple[tuple[int, ExactPolynomial], ...]:
    """d/dt of one engine coefficient in r, rdot, phidot of a planar orbit, given d(rdot)/dt and
    d(phidot)/dt as pieces {doubled order offset: value}: pieces (doubled order offset, value),
    dr/dt = rdot at offset 0 (the chain rule; the rates carry the dynamics)."""
    return derivative_with_named_rates(coefficient, {"rdot": rdot_rate, "phidot": phidot_rate})


def derivative_with_named_rates(coefficient: ExactPolynomial, rates: dict[str, dict[int, ExactPolynomial]]
                                ) -> tuple[tuple[int, ExactPolynomial], ...]:
    """The chain rule of :func:`derivative_with_rates` for any set of moving generators: ``rates``
    maps a generator's name to its time derivative as pieces {doubled order offset: value}; r
    moves with dr/dt = rdot (offset 0). Returns the pieces (doubled order offset, value) in
    increasing order, zero pieces dropped."""
    s = engine_symbols()
    pieces: dict[int, ExactPolynomial] = {}

    def add(k: int, value: ExactPolynomial) -> None:
        pieces[k] = pieces[k] + value if k in pieces else value

    if coefficient.has("r", "rinv"):
        add(0, coefficient.derivative_in_r() * s.rdot)
    for name, rate in rates.items():
        if coefficient.has(name):
            partial = coefficient.derivative(name)
            for k, value in rate.items():
                add(k, partial * value)
    return tuple((k, v) for k, v in sorted(pieces.items()) if not v.is_zero())


def _sympy_derivative(coefficient: Any, pn_order: int) -> dict[int, Any]:
    """d/dt of a sympy coefficient: through the engine when it is a polynomial there."""
    from ..symbols import phi, phidot, r, rdot

    if not coefficient.has(phi):
        try:
            exact = ExactPolynomial.from_sympy(coefficient)
        except NotRepresentableError:
            exact = None
        if exact is not None:
            return {k: v.to_sympy() for k, v in _exact_derivative(exact, pn_order)}
    rdot_rate, phidot_rate = _rates(pn_order)
    d_rdot = sp.diff(coefficient, rdot) if coefficient.has(rdot) else sp.S.Zero
    d_phidot = sp.diff(coefficient, phidot) if coefficient.has(phidot) else sp.S.Zero
    pieces: dict[int, list[Any]] = {0: [sp.diff(coefficient, r) * rdot, sp.diff(coefficient, phi) * phidot]}
    for k, rate in rdot_rate.items():
        pieces.setdefault(k, []).append(d_rdot * rate.to_sympy())
    for k, rate in phidot_rate.items():
        pieces.setdefault(k, []).append(d_phidot * rate.to_sympy())
    return {k: sp.expand(sp.Add(*parts)) for k, parts in pieces.items()}


def _depends_on_velocity(coefficient: Any) -> bool:
    if isinstance(coefficient, ExactPolynomial):
        return coefficient.has("rdot", "phidot")
    from ..symbols import phidot, rdot

    return coefficient.has(rdot) or coefficient.has(phidot)


class OrbitTimeDerivative:
    """Time derivative along the PN relative orbit, acting on PN series in ``eps = 1/c``.

    Parameters
    ----------
    pn_order:
        PN order of the equations of motion used (an order the cited equations of motion
        have: :data:`~stfalgebra.binary.cited_inputs.INPUT_ORDERS`).

    **Conventions**: module docstring. The result is known through
    ``min(known_through, k0 + pn_order + 1/2)``, ``k0`` the lowest order of the input whose
    coefficient depends on ``rdot`` or ``phidot`` (only those feel the acceleration).

    Example
    -------
    >>> from stfalgebra.exact import engine_symbols
    >>> s = engine_symbols()
    >>> OrbitTimeDerivative(0)(PNSeries({0: s.r**2}, 1))
    PNSeries(2*r*rdot + O(eps**3))

    References
    ----------
    Common practice (chain rule along the equations of motion in polar coordinates).
    """

    __slots__ = ("pn_order", "known_through", "_cache")

    def __init__(self, pn_order: int) -> None:
        self.pn_order = check_input_order(pn_order, "equations of motion")
        self.known_through = known_through(self.pn_order)
        self._cache: dict[PNSeries, PNSeries] = {}

    def __repr__(self) -> str:
        return f"OrbitTimeDerivative(pn_order={self.pn_order})"

    def __call__(self, series: PNSeries) -> PNSeries:
        """The time derivative of ``series`` along the orbit (cached per input series).

        Example
        -------
        >>> import sympy as sp
        >>> from stfalgebra.symbols import phi, phidot
        >>> OrbitTimeDerivative(1)(PNSeries({0: phi}, sp.oo))
        PNSeries(phidot)
        """
        if not isinstance(series, PNSeries):
            raise TypeError(f"OrbitTimeDerivative acts on a PNSeries, got {series!r}")
        cached = self._cache.get(series)
        if cached is not None:
            return cached
        known2 = series._known2
        for k2, coefficient in series._terms:
            if _depends_on_velocity(coefficient):
                known2 = min(known2, k2 + self.known_through.twice)
                break  # terms are ascending: the first such order is the binding one
        pieces: dict[int, list[Any]] = {}
        for k2, coefficient in series._terms:
            if isinstance(coefficient, ExactPolynomial):
                derivative = _exact_derivative(coefficient, self.pn_order)
            else:
                derivative = _sympy_derivative(coefficient, self.pn_order).items()
            for offset, value in derivative:
                if k2 + offset <= known2:
                    pieces.setdefault(k2 + offset, []).append(value)
        result = PNSeries._from_trusted(
            {k: _sum(values) for k, values in pieces.items()}, known2)
        self._cache[series] = result
        return result

    def repeated(self, series: PNSeries, times: int) -> PNSeries:
        """Apply the derivative ``times`` times (``ValueError`` for a negative or non-int count).

        Example
        -------
        >>> import sympy as sp
        >>> from stfalgebra.symbols import r
        >>> OrbitTimeDerivative(0).repeated(PNSeries({0: r}, sp.oo), 2)
        PNSeries(-G*m/r**2 + phidot**2*r + O(eps**2))
        """
        if isinstance(times, bool) or not isinstance(times, int) or times < 0:
            raise ValueError(f"times must be a non-negative int, got {times!r}")
        for _ in range(times):
            series = self(series)
        return series


def _sum(values: list[Any]) -> Any:
    if all(isinstance(v, ExactPolynomial) for v in values):
        total = values[0]
        for v in values[1:]:
            total = total + v
        return total
    return sp.expand(sp.Add(*[v.to_sympy() if isinstance(v, ExactPolynomial) else v for v in values]))


def clear_caches() -> None:
    """Empty the module's caches (tests call this between cases; results do not depend on them).

    Example
    -------
    >>> clear_caches()
    """
    _rates.cache_clear()
