"""The one post-Newtonian series type: exact coefficients at half-integer relative orders.

A :class:`PNSeries` stands for ``sum_n c_n eps^(2n)`` over relative PN orders ``n`` (multiples
of 1/2, exact Rationals) together with the order ``known_through`` through which every
coefficient is known. The small parameter ``eps`` is chosen by the caller and is not stored:
``eps = 1/c`` for general orbits, ``eps = sqrt(x)`` for circular ones (order ``n`` <-> ``x^n``).

Truncation is never silent. Every operation computes the order through which its result is
determined by its inputs; asking for a coefficient beyond it raises
:class:`~stfalgebra.errors.OrderBeyondInputsError`.

Internally orders are doubled integers (``2n``), so that half-integer orders stay exact and
the convolutions run on plain ints; ``math.inf`` marks an exact (finite, fully known) series.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Mapping
from fractions import Fraction
from functools import reduce
from typing import Any, Union

from stfalgebra.errors import OrderBeyondInputsError
from stfalgebra.exact import ExactPolynomial
from stfalgebra.lazy_sympy import sp
from stfalgebra.orders import PNOrder

__all__ = ["PNSeries"]

_EXACT = math.inf

Order = Union[int, Fraction, PNOrder, Any]


# ----------------------------------------------------------------------------- raw helpers
def _doubled_order(value: Any, what: str) -> int:
    """Return ``2 * value`` as an int, checking that ``value`` is an exact multiple of 1/2."""
    if isinstance(value, PNOrder):
        return value.twice
    if isinstance(value, int) and not isinstance(value, bool):
        return 2 * value
    if isinstance(value, (bool, float)) or type(value).__name__ == "Float":
        raise TypeError(f"{what} must be an exact multiple of 1/2 (int or Rational), got {value!r}")
    try:
        return PNOrder(value).twice
    except ValueError:
        raise ValueError(f"{what} must be a multiple of 1/2, got {value}") from None
    except TypeError:
        raise TypeError(f"{what} must be an exact multiple of 1/2 (int or Rational), got {value!r}") from None


def _doubled_known(value: Any) -> float | int:
    """Doubled ``known_through``; ``math.inf`` or ``sympy.oo`` (exact series) map to ``math.inf``."""
    if value == math.inf:
        return _EXACT
    return _doubled_order(value, "known_through")


def _order_from_doubled(k2: int | float) -> PNOrder | float:
    if k2 == _EXACT:
        return _EXACT
    return PNOrder.from_twice(int(k2))


def _exact_scalar(value: Any, what: str = "coefficient") -> Any:
    """An exact coefficient: ExactPolynomial for rationals and engine values, a sympy
    expression otherwise (floats are refused: the core is exact)."""
    if isinstance(value, ExactPolynomial):
        return value
    if isinstance(value, PNSeries):
        raise TypeError(f"{what} must be a scalar expression, got a PNSeries {value!r}")
    if isinstance(value, (int, Fraction)) and not isinstance(value, bool):
        return ExactPolynomial(value)
    from stfalgebra.scalars import as_scalar_expression

    return as_scalar_expression(value, what, exact=True)


def _is_structural_zero(expr: Any) -> bool:
    if isinstance(expr, ExactPolynomial):
        return expr.is_zero()
    return expr is sp.S.Zero or expr == 0


def _is_zero_after_expand(expr: Any) -> bool:
    if _is_structural_zero(expr):
        return True
    if isinstance(expr, ExactPolynomial):
        return False
    if expr.is_zero is True:
        return True
    return sp.expand(expr) == 0


def _expand(value: Any) -> Any:
    """Canonical form of a coefficient: the engine's values are canonical already."""
    return value if isinstance(value, ExactPolynomial) else sp.expand(value)


def _total(values: list[Any]) -> Any:
    """Sum of coefficients; exact when every term is exact, sympy otherwise."""
    if all(isinstance(v, ExactPolynomial) for v in values):
        return reduce(lambda a, b: a + b, values) if values else ExactPolynomial(0)
    return sp.Add(*[v.to_sympy() if isinstance(v, ExactPolynomial) else v for v in values])


def _as_sympy(value: Any) -> Any:
    return value.to_sympy() if isinstance(value, ExactPolynomial) else value


def _divide(value: Any, divisor: Any) -> Any:
    """value/divisor, exactly in the engine when it can, through sympy otherwise."""
    if divisor == 1:
        return value
    if isinstance(value, ExactPolynomial) and isinstance(divisor, ExactPolynomial):
        try:
            return value / divisor
        except ValueError:
            pass
    return sp.expand(_as_sympy(value) / _as_sympy(divisor))


def _raise_coefficient(value: Any, exponent: Fraction) -> Any:
    """value**exponent for the leading coefficient of a power series."""
    if value == 1:
        return ExactPolynomial(1)
    if isinstance(value, ExactPolynomial) and exponent.denominator == 1:
        try:
            return value ** int(exponent)
        except ValueError:
            pass
    return _as_sympy(value) ** sp.Rational(exponent.numerator, exponent.denominator)


def _check_rational_in(expr: Any, eps: Any) -> None:
    """Raise ValueError unless ``expr`` is built rationally (integer powers) out of ``eps``."""
    if not expr.has(eps):
        return
    if expr == eps:
        return
    if isinstance(expr, sp.Pow):
        base, expo = expr.args
        if expo.has(eps):
            raise ValueError(f"exponent {expo} contains the expansion parameter {eps}")
        if base.has(eps) and not expo.is_Integer:
            raise ValueError(
                f"non-integer power {expr} of an expression in {eps}: a PN series in {eps} "
                f"has integer powers of {eps} only")
        _check_rational_in(base, eps)
        return
    if isinstance(expr, (sp.Add, sp.Mul)):
        for arg in expr.args:
            _check_rational_in(arg, eps)
        return
    raise ValueError(f"{expr} is not rational in the expansion parameter {eps}")


def _laurent_terms(expr: Any, eps: Any) -> dict[int, list[Any]] | None:
    """Split an expression into powers of ``eps`` if it is a Laurent polynomial, else None."""
    expanded = sp.expand(expr, power_base=False, power_exp=False, log=False)
    out: dict[int, list[Any]] = {}
    for term in sp.Add.make_args(expanded):
        coeff, power = term.as_coeff_exponent(eps)
        if coeff.has(eps) or not power.is_Integer:
            return None
        out.setdefault(int(power), []).append(coeff)
    return out


def _collect(parts: dict[int, list[Any]]) -> dict[int, Any]:
    out = {}
    for k, terms in parts.items():
        value = _total(terms)
        if not _is_structural_zero(value):
            out[k] = value
    return out


def _scalar_pieces(value: Any) -> dict[int, Any]:
    expr = _exact_scalar(value, "scalar operand")
    return {} if _is_structural_zero(expr) else {0: expr}


# ----------------------------------------------------------------------------- the type
class PNSeries:
    """A post-Newtonian series ``sum_n c_n eps^(2n)`` known through a given relative order.

    Parameters
    ----------
    terms:
        Mapping from relative PN order ``n`` (int or Rational, a multiple of 1/2) to an exact
        sympy coefficient free of ``eps``. Zero coefficients are dropped; the others are stored
        as given (no simplification).
    known_through:
        The relative order through which every coefficient is known (a multiple of 1/2), or
        ``sympy.oo`` for an exact finite expression. Orders above it are refused.

    Returns
    -------
    PNSeries
        An immutable series; equality and hashing are structural (no simplification).

    **Conventions**: order ``n`` multiplies ``eps^(2n)``: with ``eps = 1/c`` order 1 is 1PN,
    with ``eps = sqrt(x)`` order ``n`` is ``x^n``. Orders are relative (the caller factors out
    the leading physical scaling, or keeps it as a shifted leading order, e.g. ``c^2`` at -1).

    Example
    -------
    >>> import sympy as sp
    >>> from stfalgebra.pnseries import PNSeries
    >>> nu = sp.Symbol("nu")
    >>> s = PNSeries({0: 1, 1: 1 - nu/3}, known_through=1)
    >>> s
    PNSeries(1 + (1 - nu/3)*eps**2 + O(eps**3))
    >>> (s * s).coefficient(1)
    2 - 2*nu/3

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 1 (relative PN orders, the ``O(1/c^n)``
    bookkeeping this type makes explicit).
    """

    __slots__ = ("_terms", "_known2", "_hash")

    # -- construction -------------------------------------------------------------------
    def __init__(self, terms: Mapping[Order, Any], known_through: Order | Any) -> None:
        if not isinstance(terms, Mapping):
            raise TypeError(f"terms must be a mapping order -> coefficient, got {terms!r}")
        known2 = _doubled_known(known_through)
        pieces: dict[int, sp.Expr] = {}
        for order, coeff in terms.items():
            k2 = _doubled_order(order, "order")
            if k2 > known2:
                raise ValueError(
                    f"order {order} lies beyond known_through = {known_through}: a series "
                    f"cannot carry coefficients it does not fully know")
            if k2 in pieces:
                raise ValueError(f"order {order} given twice")
            expr = _exact_scalar(coeff, f"coefficient at order {order}")
            if not _is_structural_zero(expr):
                pieces[k2] = expr
        self._set(pieces, known2)

    def _set(self, pieces: Mapping[int, sp.Expr], known2: int | float) -> None:
        self._terms = tuple(sorted(pieces.items(), key=lambda kv: kv[0]))
        self._known2 = known2
        self._hash = None

    @classmethod
    def _from_trusted(cls, pieces: Mapping[int, sp.Expr], known2: int | float) -> PNSeries:
        """Unchecked constructor for hot paths: doubled-int orders, coefficients already sympy.

        Orders beyond ``known2`` and exact zeros are dropped here (cheaply), nothing else is
        checked.
        """
        obj = cls.__new__(cls)
        obj._set({k: v for k, v in pieces.items() if k <= known2 and not _is_structural_zero(v)},
                 known2)
        return obj

    @classmethod
    def from_expression(cls, expr: Any, eps: sp.Symbol, known_through: Order | Any) -> PNSeries:
        """Expand an expression rational in ``eps`` as a PN series in ``eps``.

        Parameters
        ----------
        expr:
            A sympy expression built rationally (integer powers, possibly negative) out of
            ``eps``; it may contain ``sqrt``, ``pi``, ``log`` of other symbols.
        eps:
            The expansion parameter, a sympy Symbol (``1/c`` or ``sqrt(x)`` for the caller).
        known_through:
            Relative order (multiple of 1/2) through which to expand, or ``sympy.oo`` when the
            expression is a finite Laurent polynomial in ``eps`` (kept exactly).

        Returns
        -------
        PNSeries
            Coefficient of ``eps^j`` at order ``j/2``; odd powers give half-integer orders,
            negative powers negative orders.

        **Conventions**: the expression is treated as exact: its Taylor (Laurent) coefficients
        through ``eps^(2 known_through)`` are all determined, so the result is known through
        ``known_through``.

        Example
        -------
        >>> import sympy as sp
        >>> e, a = sp.symbols("e a")
        >>> PNSeries.from_expression(1/(1 - a*e**2) + e/2, e, known_through=2)
        PNSeries(1 + 1/2*eps + a*eps**2 + a**2*eps**4 + O(eps**5))
        >>> PNSeries.from_expression(e**-2 + 3, e, known_through=sp.oo).orders
        (PNOrder(-1), PNOrder(0))

        References
        ----------
        Common practice (Laurent expansion of a rational function by series division).
        """
        if not isinstance(eps, sp.Symbol):
            raise TypeError(f"eps must be a sympy Symbol, got {eps!r}")
        expr = _as_sympy(_exact_scalar(expr, "expression"))
        known2 = _doubled_known(known_through)
        _check_rational_in(expr, eps)
        laurent = _laurent_terms(expr, eps)
        if laurent is not None:
            return cls._from_trusted(_collect(laurent), known2)
        num, den = sp.fraction(sp.together(expr))
        num_terms = _laurent_terms(num, eps)
        den_terms = _laurent_terms(den, eps)
        if num_terms is None or den_terms is None:
            raise ValueError(f"could not write {expr} as a ratio of polynomials in {eps}")
        n_coeffs = _collect(num_terms)
        d_coeffs = _collect(den_terms)
        if not d_coeffs:
            raise ZeroDivisionError(f"denominator of {expr} vanishes")
        if known2 == _EXACT:
            if len(d_coeffs) == 1:
                (kd, dd), = d_coeffs.items()
                return cls._from_trusted({k - kd: _divide(v, dd) for k, v in n_coeffs.items()},
                                         _EXACT)
            quotient, remainder = sp.div(num, den, eps)
            if remainder != 0:
                raise ValueError(
                    f"{expr} is not a finite Laurent polynomial in {eps}; give a finite "
                    f"known_through instead of oo")
            return cls.from_expression(quotient, eps, sp.oo)
        return cls._from_trusted(_divide_coefficients(n_coeffs, d_coeffs, known2), known2)

    # -- views ---------------------------------------------------------------------------
    @property
    def known_through(self) -> PNOrder | float:
        """Relative order through which every coefficient is known (``math.inf``: exact)."""
        return _order_from_doubled(self._known2)

    @property
    def is_exact(self) -> bool:
        """True for an exact finite expression (``known_through`` is ``oo``)."""
        return self._known2 == _EXACT

    @property
    def orders(self) -> tuple[PNOrder, ...]:
        """Orders carrying a non-zero coefficient, ascending."""
        return tuple(PNOrder.from_twice(k) for k, _ in self._terms)

    @property
    def terms(self) -> dict[PNOrder, Any]:
        """A fresh dict order -> coefficient of the non-zero terms."""
        return {PNOrder.from_twice(k): v for k, v in self._terms}

    @property
    def leading_order(self) -> PNOrder:
        """Lowest order with a non-zero coefficient.

        Raises OrderBeyondInputsError for a series that vanishes through ``known_through``
        (its leading order is not determined) and ValueError for the exact zero.
        """
        if not self._terms:
            if self.is_exact:
                raise ValueError("the exact zero series has no leading order")
            raise OrderBeyondInputsError(
                f"series vanishes through order {self.known_through}: leading order unknown")
        return PNOrder.from_twice(self._terms[0][0])

    @property
    def leading_coefficient(self) -> sp.Expr:
        """Coefficient at :attr:`leading_order`."""
        self.leading_order  # noqa: B018 - raises for a series with no known term
        return self._terms[0][1]

    def _lead2_effective(self) -> int | float:
        """Doubled order where the series could start (first unknown order if all known vanish)."""
        if self._terms:
            return self._terms[0][0]
        return self._known2 + 1

    def coefficient(self, order: Order) -> sp.Expr:
        """The coefficient at ``order``; 0 for a missing known order.

        Parameters
        ----------
        order:
            A multiple of 1/2 (int or Rational).

        Returns
        -------
        sympy.Expr
            The stored coefficient, or ``0`` if that known order vanishes.

        Raises
        ------
        OrderBeyondInputsError
            ``order`` exceeds ``known_through``.

        **Conventions**: the coefficient of ``eps^(2 order)``.

        Example
        -------
        >>> PNSeries({0: 1}, 1).coefficient(sp.Rational(1, 2))
        0

        References
        ----------
        Common practice.
        """
        k2 = _doubled_order(order, "order")
        if k2 > self._known2:
            raise OrderBeyondInputsError(
                f"coefficient at order {order} requested, but the series is known only through "
                f"order {self.known_through}")
        for k, v in self._terms:
            if k == k2:
                return v
        # the zero of the series' own algebra (sympy's when any coefficient is a sympy object)
        if any(not isinstance(v, ExactPolynomial) for _, v in self._terms):
            return sp.S.Zero
        return ExactPolynomial(0)

    def to_expression(self, eps: sp.Symbol) -> sp.Expr:
        """The known part ``sum_n c_n eps^(2n)`` as a sympy expression (no O() term).

        Parameters
        ----------
        eps:
            The expansion parameter to write the series in (a Symbol; substitute ``1/c`` or
            ``sqrt(x)`` afterwards as needed).

        Returns
        -------
        sympy.Expr

        **Conventions**: the truncation error is dropped; read ``known_through`` for it.

        Example
        -------
        >>> e = sp.Symbol("e")
        >>> PNSeries({-1: 2, sp.Rational(1, 2): 3}, 1).to_expression(e)
        3*e + 2/e**2

        References
        ----------
        Common practice.
        """
        if not isinstance(eps, sp.Symbol):
            raise TypeError(f"eps must be a sympy Symbol, got {eps!r}")
        return sp.Add(*[v * eps**k for k, v in self._terms])

    # -- order operations ----------------------------------------------------------------
    def truncate(self, order: Order) -> PNSeries:
        """Keep the terms through ``order`` (explicitly; the result is known through ``order``).

        Parameters
        ----------
        order:
            A multiple of 1/2, at most ``known_through``.

        Returns
        -------
        PNSeries

        Raises
        ------
        OrderBeyondInputsError
            ``order`` exceeds ``known_through``.

        **Conventions**: the only way to shorten a series; nothing truncates implicitly.

        Example
        -------
        >>> PNSeries({0: 1, 1: 2}, sp.oo).truncate(0)
        PNSeries(1 + O(eps))

        References
        ----------
        Common practice.
        """
        k2 = _doubled_order(order, "order")
        if k2 > self._known2:
            raise OrderBeyondInputsError(
                f"cannot truncate at order {order}: the series is known only through order "
                f"{self.known_through}")
        return PNSeries._from_trusted(dict(self._terms), k2)

    def shift(self, k: Order) -> PNSeries:
        """Multiply by ``eps^(2k)``: every order and ``known_through`` move up by ``k``.

        Parameters
        ----------
        k:
            A multiple of 1/2 (may be negative).

        Returns
        -------
        PNSeries

        **Conventions**: with ``eps = 1/c``, ``shift(-1)`` multiplies by ``c^2``.

        Example
        -------
        >>> PNSeries({0: 1}, 1).shift(-1)
        PNSeries(eps**-2 + O(eps))

        References
        ----------
        Common practice.
        """
        s2 = _doubled_order(k, "shift")
        return PNSeries._from_trusted({o + s2: v for o, v in self._terms}, self._known2 + s2)

    def map_coefficients(self, func: Callable[[sp.Expr], Any]) -> PNSeries:
        """Apply ``func`` to every coefficient (it must not introduce ``eps``); zeros dropped.

        Parameters
        ----------
        func:
            Maps a sympy expression to an exact sympy expression (floats are refused).

        Returns
        -------
        PNSeries
            Same ``known_through``.

        **Conventions**: ``func`` must act order by order (e.g. a substitution of constants).

        Example
        -------
        >>> a = sp.Symbol("a")
        >>> PNSeries({0: a, 1: a**2}, 1).map_coefficients(lambda v: v.subs(a, 0))
        PNSeries(O(eps**3))

        References
        ----------
        Common practice.
        """
        return PNSeries._from_trusted(
            {k: _exact_scalar(func(v), f"mapped coefficient at order {PNOrder.from_twice(k)}")
             for k, v in self._terms}, self._known2)

    def expand(self, **hints: Any) -> PNSeries:
        """Expand every coefficient with ``sympy.expand`` (hints passed on); zeros dropped.

        Parameters
        ----------
        **hints:
            Passed to ``sympy.expand``.

        Returns
        -------
        PNSeries
            Same ``known_through``; coefficients that expand to zero disappear.

        **Conventions**: structural equality after ``expand`` is a canonical comparison for
        polynomial coefficients.

        Example
        -------
        >>> a = sp.Symbol("a")
        >>> PNSeries({0: a * (1 - a) + a**2}, 1).expand()
        PNSeries(a + O(eps**3))

        References
        ----------
        Common practice.
        """
        return PNSeries._from_trusted(
            {k: v if isinstance(v, ExactPolynomial) else sp.expand(v, **hints) for k, v in self._terms},
            self._known2)

    # -- arithmetic ----------------------------------------------------------------------
    def _coerce(self, other: Any) -> PNSeries:
        if isinstance(other, PNSeries):
            return other
        return PNSeries._from_trusted(_scalar_pieces(other), _EXACT)

    def __add__(self, other: Any) -> PNSeries:
        other = self._coerce(other)
        known2 = min(self._known2, other._known2)
        pieces: dict[int, list[sp.Expr]] = {}
        for k, v in self._terms + other._terms:
            if k <= known2:
                pieces.setdefault(k, []).append(v)
        return PNSeries._from_trusted(_collect(pieces), known2)

    __radd__ = __add__

    def __neg__(self) -> PNSeries:
        return PNSeries._from_trusted({k: -v for k, v in self._terms}, self._known2)

    def __pos__(self) -> PNSeries:
        return self

    def __sub__(self, other: Any) -> PNSeries:
        return self + (-self._coerce(other))

    def __rsub__(self, other: Any) -> PNSeries:
        return self._coerce(other) + (-self)

    def __mul__(self, other: Any) -> PNSeries:
        if not isinstance(other, PNSeries):
            scalar = _exact_scalar(other, "scalar operand")
            if _is_structural_zero(scalar):
                return PNSeries._from_trusted({}, _EXACT)
            return PNSeries._from_trusted({k: _expand(scalar * v) for k, v in self._terms},
                                          self._known2)
        known2 = min(self._lead2_effective() + other._known2,
                     other._lead2_effective() + self._known2)
        pieces: dict[int, list[sp.Expr]] = {}
        for ka, va in self._terms:
            for kb, vb in other._terms:
                k = ka + kb
                if k <= known2:
                    pieces.setdefault(k, []).append(va * vb)
        return PNSeries._from_trusted(
            {k: _expand(_total(v)) for k, v in pieces.items()}, known2)

    __rmul__ = __mul__

    def __truediv__(self, other: Any) -> PNSeries:
        if not isinstance(other, PNSeries):
            scalar = _exact_scalar(other, "divisor")
            if _is_zero_after_expand(scalar):
                raise ZeroDivisionError(f"division of a PNSeries by zero ({scalar})")
            return PNSeries._from_trusted({k: _divide(v, scalar) for k, v in self._terms},
                                          self._known2)
        if other.is_exact and len(other._terms) > 1:
            if self.is_exact:
                raise ValueError(
                    "quotient of two exact series with a multi-term divisor is an infinite "
                    "series; truncate one of them or call inverse(through=...)")
            # only the orders self can support are needed from the inverse
            through2 = self._known2 - self._lead2_effective() - other._terms[0][0]
            inv = other.inverse(through=PNOrder.from_twice(int(through2)))
        else:
            inv = other.inverse()
        return self * inv

    def __rtruediv__(self, other: Any) -> PNSeries:
        return self._coerce(other) / self

    def _relative_part(self, what: str) -> tuple[int, sp.Expr, dict[int, sp.Expr]]:
        """Leading doubled order, leading coefficient and ``{j: c_j/c_0}`` for j > 0."""
        if not self._terms:
            raise ZeroDivisionError(f"{what} of a series whose known part vanishes: {self!r}")
        lead2, c0 = self._terms[0]
        if _is_zero_after_expand(c0):
            raise ZeroDivisionError(f"{what}: the leading coefficient {c0} vanishes")
        rel = {k - lead2: _divide(v, c0) for k, v in self._terms[1:]}
        return lead2, c0, rel

    def inverse(self, through: Order | None = None) -> PNSeries:
        """The reciprocal ``1/self`` (needs a non-zero leading coefficient).

        Parameters
        ----------
        through:
            Optional order at which to stop. Needed when the reciprocal is an infinite series
            of an exact input; otherwise the result is known through
            ``known_through - 2 * leading_order`` (or ``through`` if lower).

        Returns
        -------
        PNSeries

        **Conventions**: ``(c0 eps^(2l) (1 + u))^-1 = eps^(-2l) c0^-1 (1 + u)^-1``.

        Example
        -------
        >>> PNSeries({0: 1, 1: 2}, 1).inverse()
        PNSeries(1 - 2*eps**2 + O(eps**3))

        References
        ----------
        Common practice (reciprocal of a power series by recurrence).
        """
        return self._power(-1, through)

    def __pow__(self, p: Any) -> PNSeries:
        return self.power(p)

    def power(self, p: Any, through: Order | None = None) -> PNSeries:
        """``self ** p`` for integer or rational ``p``.

        Parameters
        ----------
        p:
            Integer or Rational exponent. For non-integer ``p`` the leading order times ``p``
            must remain a multiple of 1/2.
        through:
            Optional order at which to stop; required when the result of an exact input is an
            infinite series (negative or fractional ``p`` of a multi-term exact series).

        Returns
        -------
        PNSeries
            ``c0^p eps^(2lp) (1 + u)^p`` with the binomial series of the relative part; known
            through ``l p + (known_through - l)``.

        **Conventions**: the leading coefficient is raised symbolically (``c0**p`` as sympy
        evaluates it, so a branch is chosen by sympy's assumptions on the symbols).

        Example
        -------
        >>> import sympy as sp
        >>> (PNSeries({0: 1, 1: 1}, 1) ** sp.Rational(1, 2))
        PNSeries(1 + 1/2*eps**2 + O(eps**3))

        References
        ----------
        J. C. P. Miller's recurrence for powers of a power series (Knuth, TAOCP vol. 2,
        sec. 4.7), common practice.
        """
        return self._power(p, through)

    def _power(self, p: Any, through: Order | None) -> PNSeries:
        p = _exact_exponent(p)
        through2 = None if through is None else _doubled_order(through, "through")
        if p == 0:
            return PNSeries._from_trusted({0: ExactPolynomial(1)}, _EXACT if through2 is None else through2)
        if p.denominator == 1 and p > 0 and through2 is None:
            result = self
            for _ in range(int(p) - 1):
                result = result * self
            return result
        lead2, c0, rel = self._relative_part(f"power {p}")
        new_lead2 = lead2 * p
        if new_lead2.denominator != 1:
            raise ValueError(
                f"power {p} of a series with leading order {PNOrder.from_twice(lead2)} gives order "
                f"{new_lead2 / 2}, not a multiple of 1/2")
        new_lead2 = int(new_lead2)
        known2 = new_lead2 + (self._known2 - lead2)
        finite = (p.denominator == 1 and p > 0) or not rel
        if through2 is not None:
            known2 = min(known2, through2)
        elif known2 == _EXACT and not finite:
            raise ValueError(
                f"power {p} of an exact multi-term series is an infinite series; pass through=")
        c0p = _raise_coefficient(c0, p)
        if known2 == _EXACT:
            # finite result: a monomial raised to p, or a polynomial to a positive integer power
            if not rel:
                return PNSeries._from_trusted({new_lead2: c0p}, _EXACT)
            max_rel = max(rel) * int(p)
        else:
            max_rel = int(known2 - new_lead2)
        if max_rel < 0:
            return PNSeries._from_trusted({}, known2)
        zero = ExactPolynomial(0)
        g = [ExactPolynomial(1)] + [zero] * max_rel
        for n in range(1, max_rel + 1):
            acc = []
            for k, fk in rel.items():
                if k <= n and not _is_structural_zero(g[n - k]):
                    acc.append(fk * g[n - k] * ((p + 1) * k - n))
            g[n] = _expand(_total(acc) * Fraction(1, n)) if acc else zero
        return PNSeries._from_trusted(
            {new_lead2 + n: _expand(c0p * gn) for n, gn in enumerate(g)}, known2)

    # -- substitution --------------------------------------------------------------------
    def substitute(self, symbol: sp.Symbol, series: PNSeries | Any, eps: sp.Symbol,
                   remainder_powers: tuple[Order, Order] | None = None) -> PNSeries:
        """Replace ``symbol`` in the coefficients by a PN series and re-expand.

        Parameters
        ----------
        symbol:
            A symbol occurring in the coefficients as monomial powers (integer, negative or
            rational), e.g. ``r``, ``r**-3``, ``sqrt(r)``; inside other functions it is refused.
        series:
            The PN series (same ``eps``) to put in its place (or a scalar, substituted exactly).
        eps:
            The expansion parameter of both series; checked to be absent from the coefficients.
        remainder_powers:
            ``(pmin, pmax)``: powers of ``symbol`` the unknown higher-order coefficients of
            ``self`` may contain. Needed only when ``series`` has a non-zero leading order
            and ``self`` is not exact: the unknown remainder then moves to order
            ``known_through + min(pmin l, pmax l)`` (``l`` the leading order of ``series``).

        Returns
        -------
        PNSeries
            Known through the lowest order any known term or the unknown remainder supports.

        **Conventions**: ``symbol^p`` becomes ``series ** p`` (leading coefficient raised
        symbolically).

        Example
        -------
        >>> import sympy as sp
        >>> e, y = sp.symbols("e y")
        >>> s = PNSeries({0: 1, 1: y}, 1)
        >>> s.substitute(y, PNSeries({0: 2, 1: 3}, 1), e)
        PNSeries(1 + 2*eps**2 + O(eps**3))

        References
        ----------
        Common practice (composition of power series).
        """
        if not isinstance(symbol, sp.Symbol):
            raise TypeError(f"symbol must be a sympy Symbol, got {symbol!r}")
        if not isinstance(eps, sp.Symbol):
            raise TypeError(f"eps must be a sympy Symbol, got {eps!r}")
        if symbol == eps:
            raise ValueError(f"cannot substitute the expansion parameter {eps} itself")
        if any(isinstance(v, ExactPolynomial) for _, v in self._terms):
            self = self.map_coefficients(_as_sympy)
        if not isinstance(series, PNSeries):
            value = _as_sympy(_exact_scalar(series, "substituted value"))
            if value.has(eps):
                raise ValueError(f"substituted value {value} contains {eps}; pass a PNSeries")
            return self.map_coefficients(lambda v: v.subs(symbol, value))
        if any(isinstance(v, ExactPolynomial) for _, v in series._terms):
            series = series.map_coefficients(_as_sympy)
        for _, v in self._terms + series._terms:
            if v.has(eps):
                raise ValueError(f"coefficient {v} contains the expansion parameter {eps}")
        for _, v in series._terms:
            if v.has(symbol):
                raise ValueError(f"substituted series contains {symbol} itself: {v}")

        # split every coefficient into sum_p rest_p symbol^p
        split: list[tuple[int, dict[sp.Expr, list[sp.Expr]]]] = []
        powers: set[sp.Expr] = set()
        for k, v in self._terms:
            by_power: dict[sp.Expr, list[sp.Expr]] = {}
            if not v.has(symbol):
                by_power[sp.S.Zero] = [v]
            else:
                for term in sp.Add.make_args(sp.expand(v, power_base=False, log=False)):
                    rest, p = term.as_coeff_exponent(symbol)
                    if rest.has(symbol) or not p.is_Rational:
                        raise ValueError(
                            f"{symbol} occurs in {term} other than as a monomial power; "
                            f"substitute() handles monomial powers only")
                    by_power.setdefault(p, []).append(rest)
            powers.update(by_power)
            split.append((k, by_power))

        series_lead2 = series._lead2_effective()
        if series_lead2 != 0 and not self.is_exact:
            if not series._terms:
                raise OrderBeyondInputsError(
                    f"substituted series vanishes through order {series.known_through}")
            if remainder_powers is None:
                raise ValueError(
                    f"the substituted series starts at order {series.leading_order}, so the "
                    f"unknown terms of this series (beyond order {self.known_through}) move by "
                    f"an amount set by their powers of {symbol}; pass remainder_powers=(pmin, "
                    f"pmax)")
        if remainder_powers is not None:
            pmin, pmax = (sp.sympify(q) for q in remainder_powers)
            if not (pmin.is_Rational and pmax.is_Rational) or pmin > pmax:
                raise ValueError(f"remainder_powers must be Rationals (pmin, pmax), got "
                                 f"{remainder_powers!r}")
            shifts = [pmin * series_lead2, pmax * series_lead2]
            if not all(s.is_Integer for s in shifts):
                raise ValueError(f"remainder_powers {remainder_powers!r} give orders that are "
                                 f"not multiples of 1/2")
            known2 = self._known2 + min(int(s) for s in shifts)
        else:
            known2 = self._known2

        lowest2 = self._terms[0][0] if self._terms else 0
        power_series: dict[sp.Expr, PNSeries] = {}
        for p in powers:
            infinite = (series.is_exact and len(series._terms) > 1
                        and not (p.is_Integer and p >= 0))
            if p == 1:
                power_series[p] = series
            elif not infinite:
                power_series[p] = series._power(p, None)
            elif known2 == _EXACT:
                raise ValueError(
                    f"{symbol}**{p} of an exact multi-term series is an infinite series; "
                    f"truncate the substituted series first")
            else:
                # only orders up to known2 - (lowest order of self) can reach the result
                power_series[p] = series._power(p, sp.Rational(int(known2 - lowest2), 2))

        for k, by_power in split:
            for p in by_power:
                known2 = min(known2, k + power_series[p]._known2)
        pieces: dict[int, list[sp.Expr]] = {}
        for k, by_power in split:
            for p, rests in by_power.items():
                rest = sp.Add(*rests)
                for kp, vp in power_series[p]._terms:
                    if k + kp <= known2:
                        pieces.setdefault(k + kp, []).append(rest * vp)
        return PNSeries._from_trusted(
            {k: sp.expand(sp.Add(*v)) for k, v in pieces.items()}, known2)

    # -- equality and display ------------------------------------------------------------
    def __eq__(self, other: object) -> bool:
        if not isinstance(other, PNSeries):
            return NotImplemented
        return self._known2 == other._known2 and self._terms == other._terms

    def __hash__(self) -> int:
        if self._hash is None:
            # orders only: coefficients of the two domains (engine, sympy) may compare equal
            self._hash = hash((PNSeries, tuple(k for k, _ in self._terms), self._known2))
        return self._hash

    def _display_pieces(self, latex: bool, power: Callable[[int], str]) -> list[str]:
        def fmt(v: Any) -> str:
            if latex:
                return sp.latex(_as_sympy(v))
            return v.to_text() if isinstance(v, ExactPolynomial) else sp.sstr(v)

        parts = []
        for k, v in self._terms:
            if k == 0:
                parts.append(fmt(v))
            elif v == 1:
                parts.append(power(k))
            elif v == -1:
                parts.append("-" + power(k))
            else:
                text = fmt(v)
                if (len(v) > 1) if isinstance(v, ExactPolynomial) else isinstance(v, sp.Add):
                    text = f"({text})"
                parts.append(f"{text} {power(k)}" if latex else f"{text}*{power(k)}")
        return parts

    def __repr__(self) -> str:
        parts = self._display_pieces(False, lambda k: "eps" if k == 1 else f"eps**{k}")
        if not self.is_exact:
            k = int(self._known2) + 1
            parts.append("O(eps)" if k == 1 else f"O(eps**{k})")
        body = " + ".join(parts) if parts else "0"
        return f"PNSeries({body.replace('+ -', '- ')})"

    def _repr_latex_(self) -> str:
        parts = self._display_pieces(
            True, lambda k: r"\epsilon" if k == 1 else rf"\epsilon^{{{k}}}")
        if not self.is_exact:
            k = int(self._known2) + 1
            parts.append(r"O(\epsilon)" if k == 1 else rf"O(\epsilon^{{{k}}})")
        body = " + ".join(parts) if parts else "0"
        return "$" + body.replace("+ -", "- ") + "$"


def _exact_exponent(p: Any) -> Fraction:
    """An exponent as a Fraction (ints, Fractions, sympy Rationals); floats are refused."""
    if isinstance(p, bool) or isinstance(p, float) or type(p).__name__ == "Float":
        raise TypeError(f"exponent must be an exact integer or Rational, got {p!r}")
    if isinstance(p, (int, Fraction)):
        return Fraction(p)
    if getattr(p, "is_Rational", False):
        return Fraction(int(p.p), int(p.q))
    raise TypeError(f"exponent must be an exact integer or Rational, got {p!r}")


def _divide_coefficients(num: dict[int, sp.Expr], den: dict[int, sp.Expr], known2: int
                         ) -> dict[int, sp.Expr]:
    """Laurent coefficients (powers of eps) of num/den through eps^known2 by series division."""
    if not num:
        return {}
    a, b = min(num), min(den)
    d0 = den[b]
    shift = a - b
    steps = known2 - shift
    q: list[sp.Expr] = []
    for k in range(steps + 1):
        acc = [num.get(a + k, sp.S.Zero)]
        for j in range(1, k + 1):
            dj = den.get(b + j)
            if dj is not None and not _is_structural_zero(q[k - j]):
                acc.append(-dj * q[k - j])
        q.append(sp.expand(sp.Add(*acc) / d0))
    return {shift + k: v for k, v in enumerate(q)}
