"""Symmetric and symmetric trace-free (STF) tensors built from abstract or explicit vectors.

A symmetric rank-l tensor T_L is held as the homogeneous degree-l polynomial
P(k) = T_L k_L in an auxiliary (probe) vector k, written in the scalars u_a = k.a of a few
vectors a and w = k.k (one w per delta_ij pair). The coefficients are exact sympy expressions
(canonically expanded); the Gram entries a.b come from :func:`~stfalgebra.stf.vectors.dot`.

- the STF part is the harmonic part of P (Thorne 1980, eq. (2.2), traces as powers of the
  Laplacian in k); a monomial that carries w is pure trace and projects to zero;
- full contraction T_L S_L = (1/l!) T(d/dk) S(k), u_a -> a.d/dk, w -> Laplacian;
- a product carrying one epsilon, eps_{ab<i_l} x_{L-1>a} v_b, is the STF part of
  x_{L-1} (x cross v)_{i_l}, with the cross product as a derived vector.

The combinatorics run on integer polynomials in Gram placeholders
(:mod:`stfalgebra.stf._kernels`, cached by exponent tuple); the actual Gram values and the
caller's coefficients enter once at the end.

Conventions
-----------
Flat Euclidean 3-space, delta_ij, eps_123 = +1. T_<L> is the STF part of T_L. The polynomial
of the symmetric part of a_{i1} ... a_{il} is (k.a)^l; the tensor of the monomial
u_a1 ... u_ap w^m is the symmetrised product a_(i1 ... a_ip delta ... delta), normalised as an
average over index permutations.

References
----------
K. S. Thorne, Rev. Mod. Phys. 52, 299 (1980), Sec. II, eqs. (2.1)-(2.11).
L. Blanchet and T. Damour, Phil. Trans. R. Soc. A 320, 379 (1986), Sec. 2 (STF notation).
"""

from __future__ import annotations

import operator as _operator
from functools import lru_cache
from math import factorial
from typing import Iterable, Mapping

import sympy as sp

from stfalgebra.stf import _kernels as kernels
from stfalgebra.stf import backend
from stfalgebra.stf.cartesian import PROBE, contract_cartesian, monomial_coefficients
from stfalgebra.stf.vectors import (
    PROBE_NORM,
    Vector,
    cross,
    dot,
    probe_projection,
)

__all__ = [
    "PROBE",
    "CARTESIAN_BASIS",
    "SymmetricTensor",
    "stf_product",
    "stf_epsilon_product",
    "legendre_contraction",
    "double_factorial",
    "clear_caches",
]

#: Unit vectors e_x, e_y, e_z along the Cartesian axes: the vectors of tensors made from a
#: Cartesian polynomial (k.e_x = k1 and so on).
CARTESIAN_BASIS: tuple[Vector, Vector, Vector] = (
    Vector("e_x", unit=True, components=(1, 0, 0)),
    Vector("e_y", unit=True, components=(0, 1, 0)),
    Vector("e_z", unit=True, components=(0, 0, 1)),
)

_ZERO = sp.Integer(0)
_ONE = sp.Integer(1)


# --------------------------------------------------------------------------- validation


def _as_rank(rank: object, what: str = "rank") -> int:
    if isinstance(rank, bool) or not hasattr(type(rank), "__index__"):
        raise TypeError(f"{what} must be a non-negative integer, got {rank!r}")
    value = _operator.index(rank)
    if value < 0:
        raise ValueError(f"{what} must be a non-negative integer, got {rank!r}")
    return value


def _as_coefficient(value: object, what: str = "coefficient") -> sp.Expr:
    if isinstance(value, (SymmetricTensor, Vector)):
        raise TypeError(f"{what} must be a scalar expression, got {value!r}")
    try:
        expression = sp.sympify(value, strict=True)
    except sp.SympifyError as exc:
        raise TypeError(f"{what} must be a sympy expression or number, got {value!r}") from exc
    if not isinstance(expression, sp.Expr):
        raise TypeError(f"{what} must be a scalar expression, got {value!r}")
    if expression.has(sp.Float):
        raise ValueError(f"{what} must be exact (use sympy.Rational, not a float), got {value!r}")
    if any(symbol in expression.free_symbols for symbol in PROBE):
        raise ValueError(f"{what} must not contain the probe symbols k1, k2, k3, got {value!r}")
    return expression


def _require_vector(value: object, what: str) -> Vector:
    if not isinstance(value, Vector):
        raise TypeError(f"{what} must be a Vector, got {value!r}")
    return value


def _require_tensor(value: object, what: str) -> SymmetricTensor:
    if not isinstance(value, SymmetricTensor):
        raise TypeError(f"{what} must be a SymmetricTensor, got {value!r}")
    return value


def _canonical(expression: sp.Expr) -> sp.Expr:
    return expression if expression.is_Atom else backend.expand(expression)


def double_factorial(n: int) -> sp.Integer:
    """The double factorial n!! = n (n-2) (n-4) ..., with 0!! = (-1)!! = 1.

    Parameters
    ----------
    n : int
        An integer n >= -1.

    Returns
    -------
    sympy.Integer
        n!! (a sympy Integer, so that ratios stay exact).

    Raises
    ------
    TypeError
        If ``n`` is not an integer.
    ValueError
        If n < -1.

    Conventions
    -----------
    (-1)!! = 1, the value that makes (2l-1)!! = 1 at l = 0 in the STF normalisations.

    Examples
    --------
    >>> double_factorial(7), double_factorial(-1), double_factorial(8)
    (105, 1, 384)

    References
    ----------
    Thorne, Rev. Mod. Phys. 52, 299 (1980), eq. (2.2) (the (2l-1)!! normalisations).
    """
    if isinstance(n, bool) or not hasattr(type(n), "__index__"):
        raise TypeError(f"double_factorial needs an integer, got {n!r}")
    value = _operator.index(n)
    if value < -1:
        raise ValueError(f"double_factorial needs n >= -1, got {n!r}")
    return sp.Integer(kernels.double_factorial_int(value))


@lru_cache(maxsize=1024)
def _gram(vectors: tuple[Vector, ...]) -> tuple[sp.Expr, ...]:
    """Gram values a_i.a_j for i <= j, in the kernels' placeholder order."""
    n = len(vectors)
    return tuple(dot(vectors[i], vectors[j]) for i in range(n) for j in range(i, n))


def _canonical_generator(vector: Vector) -> tuple[Vector, int]:
    """A tensor's generator in canonical form: cross products with sorted factors.

    Returns (vector, sign) with sign 0 when the vector vanishes (a x a).
    """
    factors = vector.factors
    if factors is None:
        return vector, 1
    first, second = factors
    if first == second:
        return vector, 0
    if second.sort_key < first.sort_key:
        return cross(second, first), -1
    return vector, 1


# --------------------------------------------------------------------------- the tensor


class SymmetricTensor:
    """A symmetric rank-l tensor T_L, held as the polynomial T_L k_L in u_a = k.a and w = k.k.

    Parameters
    ----------
    rank : int
        The rank l >= 0.
    terms : Mapping[tuple[tuple[Vector, ...], int], expression]
        Map from ``(vectors, delta_power)`` to a coefficient: the term
        ``coefficient * Sym(vectors[0] ... vectors[-1] delta^delta_power)``, i.e. the polynomial
        ``coefficient * prod(k.a for a in vectors) * (k.k)**delta_power``. Each key must have
        ``len(vectors) + 2*delta_power == rank``. Equal keys up to the order of the vectors add.

    Raises
    ------
    TypeError
        Bad types (a non-Vector in a key, a non-scalar coefficient, a non-integer rank).
    ValueError
        A negative rank, a key of the wrong rank, a float coefficient.

    Conventions
    -----------
    Immutable; coefficients are expanded at construction; equality and hashing are structural
    (same vectors, same expanded coefficients): equal tensors that are written differently
    (say through a Gram relation among four vectors) may compare unequal, which is a question
    for the checker, not for ``==``. Cross-product vectors are stored with their factors in
    sorted order, the sign moved into the coefficient.

    Examples
    --------
    >>> n = Vector("n", unit=True)
    >>> T = SymmetricTensor(2, {((n, n), 0): 1, ((), 1): -sp.Rational(1, 3)})
    >>> T == SymmetricTensor.from_vectors(n, n).stf()
    True
    >>> T.polynomial
    -k.k/3 + k.n**2

    References
    ----------
    Thorne, Rev. Mod. Phys. 52, 299 (1980), Sec. II.
    """

    __slots__ = ("_rank", "_vectors", "_terms", "_items", "_harmonic", "_source", "_hash", "_stf")

    def __init__(self, rank: int, terms: Mapping) -> None:
        degree = _as_rank(rank)
        if not isinstance(terms, Mapping):
            raise TypeError(f"terms must be a mapping {{(vectors, delta_power): coefficient}}, got {terms!r}")
        collected: list[tuple[dict[Vector, int], int, sp.Expr]] = []
        for key, value in terms.items():
            if not (isinstance(key, tuple) and len(key) == 2):
                raise TypeError(f"a term key must be a pair (vectors, delta_power), got {key!r}")
            vectors, power = key
            if not isinstance(vectors, tuple):
                raise TypeError(f"the vectors of a term key must be a tuple, got {vectors!r}")
            for vector in vectors:
                _require_vector(vector, "each vector of a term key")
            power = _as_rank(power, "delta_power")
            if len(vectors) + 2 * power != degree:
                raise ValueError(
                    f"term {key!r} has rank {len(vectors) + 2 * power}, expected rank={degree}"
                )
            exponents: dict[Vector, int] = {}
            for vector in vectors:
                exponents[vector] = exponents.get(vector, 0) + 1
            collected.append((exponents, power, _canonical(_as_coefficient(value))))
        built = _from_vector_terms(degree, collected)
        self._assign(built._rank, built._vectors, built._terms, False, None)

    # ----------------------------------------------------------------- construction

    def _assign(self, rank, vectors, terms, harmonic, source) -> None:
        setter = object.__setattr__
        items = tuple(sorted(terms.items(), key=lambda item: item[0]))
        setter(self, "_rank", rank)
        setter(self, "_vectors", vectors)
        setter(self, "_terms", terms)
        setter(self, "_items", items)
        setter(self, "_harmonic", harmonic or rank < 2)
        setter(self, "_source", source)
        setter(self, "_hash", hash((rank, vectors, items)))
        setter(self, "_stf", None)

    def __setattr__(self, key: str, value: object) -> None:
        raise AttributeError("SymmetricTensor is immutable")

    def __delattr__(self, key: str) -> None:
        raise AttributeError("SymmetricTensor is immutable")

    def __reduce__(self):
        return (SymmetricTensor, (self._rank, self.terms))

    @classmethod
    def _unchecked(
        cls,
        rank: int,
        vectors: tuple[Vector, ...],
        terms: dict[tuple[int, ...], sp.Expr],
        harmonic: bool = False,
        source: SymmetricTensor | None = None,
    ) -> SymmetricTensor:
        """Internal constructor: canonical generators, no unused vectors, non-zero expanded
        coefficients are assumed; only vectors are re-sorted when needed."""
        tensor = cls.__new__(cls)
        tensor._assign(rank, vectors, terms, harmonic, source)
        return tensor

    @classmethod
    def from_vectors(cls, *vectors: Vector, coefficient: object = 1) -> SymmetricTensor:
        """The symmetric part of the outer product ``coefficient * a_(i1 b_i2 ... )``.

        Parameters
        ----------
        *vectors : Vector
            The factors (repeats allowed); their number is the rank.
        coefficient : expression, keyword-only
            An exact scalar factor (default 1).

        Returns
        -------
        SymmetricTensor
            Rank ``len(vectors)``; polynomial ``coefficient * prod(k.a)``.

        Raises
        ------
        TypeError
            If a factor is not a Vector or the coefficient is not a scalar expression.
        ValueError
            If the coefficient is a float.

        Conventions
        -----------
        Sym normalised as the average over index permutations (so for a single repeated
        vector this is a_L itself).

        Examples
        --------
        >>> x, v = Vector("x"), Vector("v")
        >>> SymmetricTensor.from_vectors(x, x, v, coefficient=3).polynomial
        3*k.v*k.x**2

        References
        ----------
        Thorne, Rev. Mod. Phys. 52, 299 (1980), Sec. II.
        """
        for vector in vectors:
            _require_vector(vector, "each factor of from_vectors")
        value = _canonical(_as_coefficient(coefficient))
        exponents: dict[Vector, int] = {}
        for vector in vectors:
            exponents[vector] = exponents.get(vector, 0) + 1
        return _from_vector_terms(len(vectors), [(exponents, 0, value)])

    @classmethod
    def delta(cls) -> SymmetricTensor:
        """The Kronecker delta delta_ij, a rank-2 tensor with polynomial k.k.

        Returns
        -------
        SymmetricTensor
            delta_ij.

        Conventions
        -----------
        Euclidean metric; delta_ii = 3.

        Examples
        --------
        >>> SymmetricTensor.delta().polynomial
        k.k
        >>> SymmetricTensor.delta().trace().polynomial
        3

        References
        ----------
        Thorne, Rev. Mod. Phys. 52, 299 (1980), Sec. II.
        """
        return cls._unchecked(2, (), {(1,): _ONE})

    @classmethod
    def zero(cls, rank: int) -> SymmetricTensor:
        """The zero tensor of the given rank.

        Parameters
        ----------
        rank : int
            l >= 0.

        Returns
        -------
        SymmetricTensor
            The zero tensor (trace-free, no terms).

        Raises
        ------
        TypeError, ValueError
            For a non-integer or negative rank.

        Conventions
        -----------
        The additive identity; ``sum()`` of tensors may also start from the int 0.

        Examples
        --------
        >>> SymmetricTensor.zero(3).polynomial
        0

        References
        ----------
        None (bookkeeping).
        """
        return cls._unchecked(_as_rank(rank), (), {}, harmonic=True)

    @classmethod
    def from_cartesian(cls, poly: object, rank: int) -> SymmetricTensor:
        """The tensor whose polynomial T_L k_L is the Cartesian polynomial ``poly`` in k1, k2, k3.

        Parameters
        ----------
        poly : sympy.Expr
            A homogeneous polynomial of degree ``rank`` in ``PROBE = (k1, k2, k3)``.
        rank : int
            The rank l >= 0.

        Returns
        -------
        SymmetricTensor
            A tensor on the vectors ``CARTESIAN_BASIS`` (k.e_x = k1, ...).

        Raises
        ------
        ValueError
            If ``poly`` is not a homogeneous polynomial of degree ``rank`` in k, the rank is
            negative, or a coefficient is a float.
        TypeError
            If ``poly`` is not an expression or the rank not an integer.

        Conventions
        -----------
        The component with a1 x's, a2 y's and a3 z's is (a1! a2! a3!/l!) times the coefficient
        of k1^a1 k2^a2 k3^a3.

        Examples
        --------
        >>> k1, k2, k3 = PROBE
        >>> T = SymmetricTensor.from_cartesian(k1**2 - k2**2, 2)
        >>> T.is_trace_free(), T.cartesian()
        (True, k1**2 - k2**2)

        References
        ----------
        Thorne, Rev. Mod. Phys. 52, 299 (1980), Sec. II.
        """
        degree = _as_rank(rank)
        if isinstance(poly, (SymmetricTensor, Vector)):
            raise TypeError(f"poly must be a sympy expression in k1, k2, k3, got {poly!r}")
        coefficients = monomial_coefficients(poly, degree)
        terms = []
        for (a1, a2, a3), value in coefficients.items():
            exponents = {}
            for vector, power in zip(CARTESIAN_BASIS, (a1, a2, a3)):
                if power:
                    exponents[vector] = power
            terms.append((exponents, 0, _canonical(_as_coefficient(value, "polynomial coefficient"))))
        return _from_vector_terms(degree, terms)

    # ----------------------------------------------------------------- views

    @property
    def rank(self) -> int:
        """The rank l."""
        return self._rank

    @property
    def vectors(self) -> tuple[Vector, ...]:
        """The vectors a whose projections u_a = k.a the polynomial uses (sorted by name)."""
        return self._vectors

    @property
    def terms(self) -> dict[tuple[tuple[Vector, ...], int], sp.Expr]:
        """A fresh dict ``{(vectors, delta_power): coefficient}``, the input format of the
        constructor (so ``SymmetricTensor(T.rank, T.terms) == T``)."""
        n = len(self._vectors)
        result = {}
        for key, value in self._items:
            vectors = tuple(
                vector for vector, power in zip(self._vectors, key[:n]) for _ in range(power)
            )
            result[(vectors, key[n])] = value
        return result

    @property
    def polynomial(self) -> sp.Expr:
        """The polynomial T_L k_L in the display symbols ``k.a`` and ``k.k`` (for display)."""
        n = len(self._vectors)
        symbols = [probe_projection(vector) for vector in self._vectors]
        return sp.Add(
            *(
                value
                * sp.Mul(*(symbol**power for symbol, power in zip(symbols, key[:n])))
                * PROBE_NORM ** key[n]
                for key, value in self._items
            )
        )

    def is_zero(self) -> bool:
        """True if no term is left (structural test).

        Returns
        -------
        bool
            Whether every coefficient vanished on expansion.

        Conventions
        -----------
        Structural: a combination that vanishes only through a Gram relation is not detected.

        Examples
        --------
        >>> x = Vector("x")
        >>> (SymmetricTensor.from_vectors(x) - SymmetricTensor.from_vectors(x)).is_zero()
        True

        References
        ----------
        None (bookkeeping).
        """
        return not self._terms

    def __eq__(self, other: object) -> bool:
        if self is other:
            return True
        if not isinstance(other, SymmetricTensor):
            return NotImplemented
        return (
            self._hash == other._hash
            and self._rank == other._rank
            and self._vectors == other._vectors
            and self._items == other._items
        )

    def __hash__(self) -> int:
        return self._hash

    def __repr__(self) -> str:
        return f"SymmetricTensor(rank={self._rank}, polynomial={self.polynomial})"

    # ----------------------------------------------------------------- linear structure

    def _merged(self, other: SymmetricTensor, sign: int) -> SymmetricTensor:
        if self._rank != other._rank:
            raise ValueError(
                f"cannot add tensors of different ranks: rank={self._rank} and rank={other._rank}"
            )
        if not other._terms:
            return self
        if not self._terms:
            return other if sign > 0 else -other
        union = tuple(sorted(set(self._vectors) | set(other._vectors), key=lambda v: v.sort_key))
        first = _reindex(self, union)
        second = _reindex(other, union)
        terms = dict(first)
        for key, value in second.items():
            total = terms.get(key, _ZERO) + (value if sign > 0 else -value)
            if total == 0:
                terms.pop(key, None)
            else:
                terms[key] = total
        harmonic = self._harmonic and other._harmonic
        source = None
        if harmonic and self._rank >= 2:
            source = self._projection_source()._merged(other._projection_source(), sign)
        return _pruned(self._rank, union, terms, harmonic, source)

    def __add__(self, other: object) -> SymmetricTensor:
        if isinstance(other, SymmetricTensor):
            return self._merged(other, 1)
        if isinstance(other, int) and not isinstance(other, bool) and other == 0:
            return self
        return NotImplemented

    def __radd__(self, other: object) -> SymmetricTensor:
        return self.__add__(other)

    def __sub__(self, other: object) -> SymmetricTensor:
        if isinstance(other, SymmetricTensor):
            return self._merged(other, -1)
        if isinstance(other, int) and not isinstance(other, bool) and other == 0:
            return self
        return NotImplemented

    def __neg__(self) -> SymmetricTensor:
        source = -self._source if self._source is not None else None
        return SymmetricTensor._unchecked(
            self._rank,
            self._vectors,
            {key: -value for key, value in self._terms.items()},
            self._harmonic,
            source,
        )

    def _scaled(self, factor: sp.Expr) -> SymmetricTensor:
        if factor == 0:
            return SymmetricTensor.zero(self._rank)
        if factor == 1:
            return self
        terms = {}
        for key, value in self._terms.items():
            product = _canonical(value * factor)
            if product != 0:
                terms[key] = product
        source = self._source._scaled(factor) if self._source is not None else None
        return _pruned(self._rank, self._vectors, terms, self._harmonic, source)

    def __mul__(self, scalar: object) -> SymmetricTensor:
        if isinstance(scalar, (SymmetricTensor, Vector)):
            return NotImplemented
        return self._scaled(_as_coefficient(scalar, "scalar factor"))

    def __rmul__(self, scalar: object) -> SymmetricTensor:
        return self.__mul__(scalar)

    def __truediv__(self, scalar: object) -> SymmetricTensor:
        if isinstance(scalar, (SymmetricTensor, Vector)):
            return NotImplemented
        divisor = _as_coefficient(scalar, "divisor")
        if divisor == 0:
            raise ZeroDivisionError("division of a SymmetricTensor by zero")
        return self._scaled(1 / divisor)

    def subs(self, *args, **kwargs) -> SymmetricTensor:
        """Substitute in every coefficient (``sympy.Expr.subs`` arguments).

        Parameters
        ----------
        *args, **kwargs
            Passed to ``sympy.Expr.subs`` for each coefficient (e.g. ``{dot(x, x): r**2}``).

        Returns
        -------
        SymmetricTensor
            The tensor with substituted, re-expanded coefficients; a trace-free tensor stays
            marked trace-free (a substitution of scalars keeps an identity in them).

        Raises
        ------
        ValueError
            If a substitution brings in the probe symbols or a float.

        Conventions
        -----------
        Only scalars are substituted; the vectors stay.

        Examples
        --------
        >>> x = Vector("x"); r = sp.Symbol("r", positive=True)
        >>> SymmetricTensor.from_vectors(x, x).stf().subs({dot(x, x): r**2}).polynomial
        -k.k*r**2/3 + k.x**2

        References
        ----------
        None (bookkeeping).
        """
        terms = {}
        for key, value in self._terms.items():
            new = _canonical(_as_coefficient(value.subs(*args, **kwargs), "substituted coefficient"))
            if new != 0:
                terms[key] = new
        source = self._source.subs(*args, **kwargs) if self._source is not None else None
        return _pruned(self._rank, self._vectors, terms, self._harmonic, source)

    def outer(self, other: SymmetricTensor) -> SymmetricTensor:
        """The symmetrised outer product Sym(T_L S_P), of rank l + p.

        Parameters
        ----------
        other : SymmetricTensor
            S_P.

        Returns
        -------
        SymmetricTensor
            The tensor with polynomial P_T(k) P_S(k).

        Raises
        ------
        TypeError
            If ``other`` is not a SymmetricTensor.

        Conventions
        -----------
        Sym normalised as the average over index permutations.

        Examples
        --------
        >>> x, v = Vector("x"), Vector("v")
        >>> SymmetricTensor.from_vectors(x).outer(SymmetricTensor.delta()).polynomial
        k.k*k.x

        References
        ----------
        Thorne, Rev. Mod. Phys. 52, 299 (1980), Sec. II.
        """
        _require_tensor(other, "outer() argument")
        terms = []
        n, m = len(self._vectors), len(other._vectors)
        for key, value in self._terms.items():
            for other_key, other_value in other._terms.items():
                exponents: dict[Vector, int] = {}
                for vector, power in zip(self._vectors, key[:n]):
                    if power:
                        exponents[vector] = power
                for vector, power in zip(other._vectors, other_key[:m]):
                    if power:
                        exponents[vector] = exponents.get(vector, 0) + power
                terms.append((exponents, key[n] + other_key[m], _canonical(value * other_value)))
        return _from_vector_terms(self._rank + other._rank, terms)

    # ----------------------------------------------------------------- STF projection

    def _pure_part(self) -> SymmetricTensor:
        """The terms without w (the rest is pure trace)."""
        n = len(self._vectors)
        terms = {key: value for key, value in self._terms.items() if key[n] == 0}
        if len(terms) == len(self._terms):
            return self if not self._harmonic else SymmetricTensor._unchecked(
                self._rank, self._vectors, terms
            )
        return _pruned(self._rank, self._vectors, terms, False, None)

    def _projection_source(self) -> SymmetricTensor:
        """A tensor without w-terms whose STF part is the STF part of this one."""
        if self._source is not None:
            return self._source
        return self._pure_part()

    def stf(self) -> SymmetricTensor:
        """The symmetric trace-free part T_<L>.

        Returns
        -------
        SymmetricTensor
            T_<L>, marked trace-free (a trace-free input is returned as is).

        Conventions
        -----------
        T_<L> = sum_j (-1)^j (2l-2j-1)!!/((2l-1)!! 2^j j!) delta_(2j T_L-2j)a1a1..ajaj in
        polynomial form: sum_j ... (k.k)^j Delta^j P, Delta the Laplacian in k.

        Examples
        --------
        >>> x = Vector("x")
        >>> SymmetricTensor.from_vectors(x, x, x).stf().polynomial
        -3*k.k*k.x*x.x/5 + k.x**3

        References
        ----------
        Thorne, Rev. Mod. Phys. 52, 299 (1980), eq. (2.2).
        """
        if self._harmonic:
            return self
        if self._stf is not None:
            return self._stf
        source = self._pure_part()
        n = len(source._vectors)
        weighted = []
        for key, value in source._terms.items():
            numerators, denominator = kernels.harmonic_projection(key[:n])
            weighted.append((value, numerators, denominator))
        terms = kernels.evaluate(weighted, n, _gram(source._vectors))
        result = _pruned(self._rank, source._vectors, terms, True, source)
        object.__setattr__(self, "_stf", result)  # memo only: not part of the value
        return result

    def is_trace_free(self) -> bool:
        """Whether T_L is trace-free (its polynomial is harmonic).

        Returns
        -------
        bool
            True for tensors made by :meth:`stf` and for those whose trace expands to zero.

        Conventions
        -----------
        Structural: a trace that vanishes only through a Gram relation (four vectors in three
        dimensions, cross products) is not recognised; the checker decides such cases.

        Examples
        --------
        >>> n = Vector("n", unit=True)
        >>> SymmetricTensor.from_vectors(n, n).is_trace_free()
        False
        >>> SymmetricTensor.from_vectors(n, n).stf().is_trace_free()
        True

        References
        ----------
        Thorne, Rev. Mod. Phys. 52, 299 (1980), Sec. II.
        """
        if self._harmonic:
            return True
        return self._laplacian_terms() == {}

    def _laplacian_terms(self) -> dict:
        n = len(self._vectors)
        weighted = [
            (value, kernels.laplacian_of_monomial(key), 1) for key, value in self._terms.items()
        ]
        return kernels.evaluate(weighted, n, _gram(self._vectors))

    def trace(self) -> SymmetricTensor:
        """The single trace T_{L-2 aa}, of rank l - 2.

        Returns
        -------
        SymmetricTensor
            The trace (zero for a trace-free tensor).

        Raises
        ------
        ValueError
            If the rank is below 2.

        Conventions
        -----------
        Polynomial: Delta P / (l (l-1)).

        Examples
        --------
        >>> x = Vector("x")
        >>> SymmetricTensor.from_vectors(x, x).trace().polynomial
        x.x

        References
        ----------
        Thorne, Rev. Mod. Phys. 52, 299 (1980), Sec. II.
        """
        if self._rank < 2:
            raise ValueError(f"the trace needs rank >= 2, got rank={self._rank}")
        if self._harmonic:
            return SymmetricTensor.zero(self._rank - 2)
        n = len(self._vectors)
        scale = sp.Rational(1, self._rank * (self._rank - 1))
        weighted = [
            (value * scale, kernels.laplacian_of_monomial(key), 1)
            for key, value in self._terms.items()
        ]
        terms = kernels.evaluate(weighted, n, _gram(self._vectors))
        return _pruned(self._rank - 2, self._vectors, terms, False, None)

    # ----------------------------------------------------------------- contractions

    def contract(self, other: SymmetricTensor) -> sp.Expr:
        """The full contraction T_L S_L, a scalar.

        Parameters
        ----------
        other : SymmetricTensor
            S_L, of the same rank.

        Returns
        -------
        sympy.Expr
            T_L S_L, expanded.

        Raises
        ------
        TypeError
            If ``other`` is not a SymmetricTensor.
        ValueError
            If the ranks differ.

        Conventions
        -----------
        T_L S_L = (1/l!) T(d/dk) S(k); when one side is trace-free only the trace-free part
        of the other matters (T_L S_<L> = T_<L> S_<L>), which is used to keep it cheap.

        Examples
        --------
        >>> n, m = Vector("n", unit=True), Vector("m", unit=True)
        >>> SymmetricTensor.from_vectors(n, n).stf().contract(SymmetricTensor.from_vectors(m, m))
        m.n**2 - 1/3

        References
        ----------
        Thorne, Rev. Mod. Phys. 52, 299 (1980), eqs. (2.2), (2.5).
        """
        _require_tensor(other, "contract() argument")
        if self._rank != other._rank:
            raise ValueError(
                f"full contraction needs equal ranks, got rank={self._rank} and rank={other._rank}"
            )
        if not self._terms or not other._terms:
            return _ZERO
        if self._rank == 0:
            return _canonical(self._terms[(0,) * (len(self._vectors) + 1)] * other._terms[(0,) * (len(other._vectors) + 1)])
        if self._harmonic or other._harmonic:
            first = self._projection_source()
            second = other._projection_source()
            kernel = _stf_pair
        else:
            first, second = self, other
            kernel = _plain_pair
        if _cartesian_route_pays(first, second):
            return _canonical(contract_cartesian(self.cartesian(), other.cartesian(), self._rank))
        union, first_terms, second_terms = _common_terms(first, second)
        n = len(union)
        weighted = []
        for key, value in first_terms.items():
            for other_key, other_value in second_terms.items():
                numerators, denominator = kernel(key, other_key, n)
                if numerators:
                    weighted.append((_product(value, other_value), numerators, denominator))
        result = kernels.evaluate(weighted, n, _gram(union))
        return result.get((0,) * (n + 1), _ZERO)

    def contract_partial(self, other: SymmetricTensor) -> SymmetricTensor:
        """The partial contraction T_{P L-P} S_P, of rank l - p.

        Parameters
        ----------
        other : SymmetricTensor
            S_P with p <= l (this tensor has rank l).

        Returns
        -------
        SymmetricTensor
            R_{L-P} = T_{P L-P} S_P; trace-free if T is.

        Raises
        ------
        TypeError
            If ``other`` is not a SymmetricTensor.
        ValueError
            If p > l.

        Conventions
        -----------
        Polynomial: ((l-p)!/l!) S(d/dk) T(k).

        Examples
        --------
        >>> x, v = Vector("x"), Vector("v")
        >>> T = SymmetricTensor.from_vectors(x, x, v)
        >>> T.contract_partial(SymmetricTensor.from_vectors(x, x)).polynomial
        k.v*x.x**2/3 + 2*k.x*v.x*x.x/3

        References
        ----------
        Thorne, Rev. Mod. Phys. 52, 299 (1980), Sec. II.
        """
        _require_tensor(other, "contract_partial() argument")
        if other._rank > self._rank:
            raise ValueError(
                f"partial contraction needs the argument's rank <= this rank, got "
                f"rank={other._rank} against rank={self._rank}"
            )
        if other._rank == self._rank:
            value = self.contract(other)
            return SymmetricTensor._unchecked(0, (), {(0,): value} if value != 0 else {}, True)
        if not self._terms or not other._terms:
            return SymmetricTensor.zero(self._rank - other._rank)
        if self._harmonic:
            operators = other._projection_source()
            targets = self._projection_source()
            kernel = _partial_stf_pair
        else:
            operators, targets = other, self
            kernel = _partial_plain_pair
        union, operator_terms, target_terms = _common_terms(operators, targets)
        n = len(union)
        weighted = []
        for key, value in operator_terms.items():
            for other_key, other_value in target_terms.items():
                numerators, denominator = kernel(key, other_key, n)
                if numerators:
                    weighted.append((_product(value, other_value), numerators, denominator))
        terms = kernels.evaluate(weighted, n, _gram(union))
        return _pruned(self._rank - other._rank, union, terms, self._harmonic, None)

    def contract_vector(self, vector: Vector) -> SymmetricTensor:
        """The contraction T_{L-1 a} v_a, of rank l - 1.

        Parameters
        ----------
        vector : Vector
            v.

        Returns
        -------
        SymmetricTensor
            T_{L-1 a} v_a (trace-free if T is).

        Raises
        ------
        TypeError
            If ``vector`` is not a Vector.
        ValueError
            If the rank is 0.

        Conventions
        -----------
        Polynomial: (1/l) (v.d/dk) P.

        Examples
        --------
        >>> n = Vector("n", unit=True)
        >>> SymmetricTensor.from_vectors(n, n).stf().contract_vector(n).polynomial
        2*k.n/3

        References
        ----------
        Thorne, Rev. Mod. Phys. 52, 299 (1980), Sec. II.
        """
        _require_vector(vector, "contract_vector() argument")
        if self._rank == 0:
            raise ValueError("contract_vector needs rank >= 1, got rank=0")
        return self.contract_partial(SymmetricTensor.from_vectors(vector))

    def contract_epsilon(self, vector: Vector) -> SymmetricTensor:
        """The symmetrised contraction with epsilon and a vector, Sym[eps_{i_l a b} u_a T_{b L-1}].

        Parameters
        ----------
        vector : Vector
            u.

        Returns
        -------
        SymmetricTensor
            Rank l; trace-free if T is. Cross products of ``vector`` with the tensor's vectors
            appear as derived vectors (a cross product with a cross product is expanded with
            a x (b x c) = b (a.c) - c (a.b)).

        Raises
        ------
        TypeError
            If ``vector`` is not a Vector.
        ValueError
            If the rank is 0.

        Conventions
        -----------
        Polynomial: (1/l) ((k x u).d/dk) P, a rotation generator acting on P; with
        eps_123 = +1, and the symmetrisation an average over permutations of i_1 ... i_l.

        Examples
        --------
        >>> x, v = Vector("x"), Vector("v")
        >>> SymmetricTensor.from_vectors(x).contract_epsilon(v).polynomial
        k.(v x x)

        References
        ----------
        Thorne, Rev. Mod. Phys. 52, 299 (1980), Sec. II.
        """
        _require_vector(vector, "contract_epsilon() argument")
        if self._rank == 0:
            raise ValueError("contract_epsilon needs rank >= 1, got rank=0")
        n = len(self._vectors)
        rotated = [_cross_projection(vector, a) for a in self._vectors]
        scale = sp.Rational(1, self._rank)
        terms = []
        for key, value in self._terms.items():
            for j in range(n):
                power = key[j]
                if not power:
                    continue
                base: dict[Vector, int] = {}
                for vector_i, e in zip(self._vectors, key[:n]):
                    if e:
                        base[vector_i] = e
                base[self._vectors[j]] -= 1
                for generator, factor in rotated[j]:
                    exponents = dict(base)
                    exponents[generator] = exponents.get(generator, 0) + 1
                    terms.append((exponents, key[n], _canonical(value * factor * power * scale)))
        result = _from_vector_terms(self._rank, terms)
        if self._harmonic:
            source = self._source.contract_epsilon(vector) if self._source is not None else None
            result = SymmetricTensor._unchecked(
                result._rank, result._vectors, result._terms, True, source
            )
        return result

    # ----------------------------------------------------------------- explicit views

    def cartesian(self) -> sp.Expr:
        """The polynomial T_L k_L in the Cartesian probe symbols ``PROBE = (k1, k2, k3)``.

        Returns
        -------
        sympy.Expr
            The expanded Cartesian polynomial.

        Raises
        ------
        ValueError
            If a vector of the tensor has no explicit components (naming it).

        Conventions
        -----------
        k.a = a_1 k1 + a_2 k2 + a_3 k3 and k.k = k1^2 + k2^2 + k3^2.

        Examples
        --------
        >>> x = Vector("x", components=(1, 2, 0))
        >>> SymmetricTensor.from_vectors(x, x).stf().cartesian()
        -2*k1**2/3 + 4*k1*k2 + 7*k2**2/3 - 5*k3**2/3

        References
        ----------
        Thorne, Rev. Mod. Phys. 52, 299 (1980), Sec. II.
        """
        k1, k2, k3 = PROBE
        linear = []
        for vector in self._vectors:
            if vector.components is None:
                raise ValueError(
                    f"cartesian() needs explicit components for every vector; "
                    f"vector {vector.name!r} has none"
                )
            a1, a2, a3 = vector.components
            linear.append(a1 * k1 + a2 * k2 + a3 * k3)
        norm = k1**2 + k2**2 + k3**2
        n = len(self._vectors)
        total = sp.Add(
            *(
                value * sp.Mul(*(form**power for form, power in zip(linear, key[:n]))) * norm ** key[n]
                for key, value in self._items
            )
        )
        return backend.expand(total)


# --------------------------------------------------------------------------- helpers


# Above this many monomial pairs, two tensors on rational-component vectors are contracted
# through their Cartesian polynomials (one dict lookup per monomial) instead of pairwise.
_CARTESIAN_ROUTE_MIN_PAIRS = 24


def _has_rational_components(vector: Vector) -> bool:
    components = vector.components
    return components is not None and all(isinstance(c, sp.Rational) for c in components)


def _cartesian_route_pays(first: SymmetricTensor, second: SymmetricTensor) -> bool:
    if len(first._terms) * len(second._terms) < _CARTESIAN_ROUTE_MIN_PAIRS:
        return False
    return all(_has_rational_components(v) for v in first._vectors) and all(
        _has_rational_components(v) for v in second._vectors
    )


def _product(first: sp.Expr, second: sp.Expr) -> sp.Expr:
    return _canonical(first * second)


def _reindex(tensor: SymmetricTensor, union: tuple[Vector, ...]) -> dict[tuple[int, ...], sp.Expr]:
    """The tensor's terms with exponent tuples over the vectors ``union`` (a superset)."""
    if tensor._vectors == union:
        return dict(tensor._terms)
    n = len(tensor._vectors)
    index = {vector: position for position, vector in enumerate(union)}
    positions = [index[vector] for vector in tensor._vectors]
    result = {}
    size = len(union)
    for key, value in tensor._terms.items():
        new = [0] * (size + 1)
        for position, power in zip(positions, key[:n]):
            new[position] = power
        new[size] = key[n]
        result[tuple(new)] = value
    return result


def _common_terms(first: SymmetricTensor, second: SymmetricTensor):
    union = tuple(sorted(set(first._vectors) | set(second._vectors), key=lambda v: v.sort_key))
    return union, _reindex(first, union), _reindex(second, union)


def _stf_pair(key: tuple[int, ...], other: tuple[int, ...], n: int):
    # both pure (no w): the projection sources of trace-free tensors
    a, b = key[:n], other[:n]
    if b < a:
        a, b = b, a
    return kernels.stf_contraction(a, b)


def _plain_pair(key: tuple[int, ...], other: tuple[int, ...], n: int):
    # the contraction is symmetric; let the monomial with fewer w's be the operator
    if (other[n], other) < (key[n], key):
        key, other = other, key
    return kernels.plain_contraction(key, other)


def _partial_stf_pair(key: tuple[int, ...], other: tuple[int, ...], n: int):
    return kernels.partial_stf_contraction(key[:n], other[:n])


def _partial_plain_pair(key: tuple[int, ...], other: tuple[int, ...], n: int):
    return kernels.partial_plain_contraction(key, other)


def _cross_projection(rotator: Vector, vector: Vector) -> list[tuple[Vector, sp.Expr]]:
    """k.(rotator x vector) as sum of coefficient * k.generator (canonical generators)."""
    if rotator == vector:
        return []
    if vector.factors is not None:
        p, q = vector.factors
        # u x (p x q) = p (u.q) - q (u.p)
        return [(p, dot(rotator, q)), (q, -dot(rotator, p))]
    if rotator.factors is not None:
        p, q = rotator.factors
        # (p x q) x a = q (p.a) - p (q.a)
        return [(q, dot(p, vector)), (p, -dot(q, vector))]
    generator, sign = _canonical_generator(cross(rotator, vector))
    if sign == 0:
        return []
    return [(generator, sp.Integer(sign))]


def _from_vector_terms(
    rank: int, terms: Iterable[tuple[dict[Vector, int], int, sp.Expr]]
) -> SymmetricTensor:
    """Build a tensor from (exponents by vector, w power, expanded coefficient) triples,
    putting generators in canonical form and adding equal monomials."""
    combined: dict[tuple, sp.Expr] = {}
    for exponents, power, value in terms:
        if value == 0:
            continue
        canonical: dict[Vector, int] = {}
        for vector, e in exponents.items():
            if not e:
                continue
            generator, sign = _canonical_generator(vector)
            if sign == 0:
                value = _ZERO
                break
            if sign < 0 and e % 2:
                value = -value
            canonical[generator] = canonical.get(generator, 0) + e
        if value == 0:
            continue
        key = (tuple(sorted(canonical.items(), key=lambda item: item[0].sort_key)), power)
        total = combined.get(key, _ZERO) + value
        if total == 0:
            combined.pop(key, None)
        else:
            combined[key] = total
    vectors = tuple(
        sorted({vector for key in combined for vector, _ in key[0]}, key=lambda v: v.sort_key)
    )
    index = {vector: position for position, vector in enumerate(vectors)}
    n = len(vectors)
    result: dict[tuple[int, ...], sp.Expr] = {}
    for (pairs, power), value in combined.items():
        key = [0] * (n + 1)
        for vector, e in pairs:
            key[index[vector]] = e
        key[n] = power
        result[tuple(key)] = value
    return SymmetricTensor._unchecked(rank, vectors, result)


def _pruned(
    rank: int,
    vectors: tuple[Vector, ...],
    terms: dict[tuple[int, ...], sp.Expr],
    harmonic: bool,
    source: SymmetricTensor | None,
) -> SymmetricTensor:
    """Drop vectors that no longer appear (after cancellations) and build the tensor."""
    n = len(vectors)
    used = [False] * n
    for key in terms:
        for i in range(n):
            if key[i]:
                used[i] = True
    if not all(used):
        kept = [i for i in range(n) if used[i]]
        vectors = tuple(vectors[i] for i in kept)
        terms = {tuple(key[i] for i in kept) + (key[n],): value for key, value in terms.items()}
    return SymmetricTensor._unchecked(rank, vectors, terms, harmonic, source)


# --------------------------------------------------------------------------- module functions


def stf_product(*vectors: Vector) -> SymmetricTensor:
    """The STF product a_<i1 b_i2 ... c_il> of the given vectors.

    Parameters
    ----------
    *vectors : Vector
        The l factors (repeats allowed).

    Returns
    -------
    SymmetricTensor
        The STF part of the symmetrised outer product.

    Raises
    ------
    TypeError
        If a factor is not a Vector.

    Conventions
    -----------
    Same as ``SymmetricTensor.from_vectors(*vectors).stf()``.

    Examples
    --------
    >>> n = Vector("n", unit=True)
    >>> stf_product(n, n).polynomial
    -k.k/3 + k.n**2

    References
    ----------
    Thorne, Rev. Mod. Phys. 52, 299 (1980), eq. (2.2).
    """
    return SymmetricTensor.from_vectors(*vectors).stf()


def stf_epsilon_product(vectors_Lminus1: Iterable[Vector], x: Vector, v: Vector) -> SymmetricTensor:
    """The STF tensor eps_{ab<i_l} X_{L-1>a} v_b, the shape of a current-type moment.

    Parameters
    ----------
    vectors_Lminus1 : iterable of Vector
        The l - 1 vectors of X_{L-1} = a1_{i1} ... a(l-1)_{i(l-1)} (e.g. l - 1 copies of x).
    x : Vector
        The vector carrying the index a.
    v : Vector
        The vector carrying the index b.

    Returns
    -------
    SymmetricTensor
        STF part of X_{L-1} (x cross v)_{i_l}, rank l = len(vectors_Lminus1) + 1.

    Raises
    ------
    TypeError
        If an entry is not a Vector or ``vectors_Lminus1`` is not iterable.

    Conventions
    -----------
    eps_{ab i} x_a v_b = (x cross v)_i, eps_123 = +1.

    Examples
    --------
    >>> x, v = Vector("x"), Vector("v")
    >>> stf_epsilon_product([x], x, v).polynomial
    -k.(v x x)*k.x
    >>> stf_epsilon_product([v], x, v).polynomial
    -k.(v x x)*k.v

    References
    ----------
    Thorne, Rev. Mod. Phys. 52, 299 (1980), Sec. II; Blanchet and Damour, Phil. Trans. R.
    Soc. A 320, 379 (1986) (current moments of this shape).
    """
    if isinstance(vectors_Lminus1, Vector) or not isinstance(vectors_Lminus1, Iterable):
        raise TypeError(f"vectors_Lminus1 must be an iterable of Vectors, got {vectors_Lminus1!r}")
    factors = tuple(vectors_Lminus1)
    for vector in factors:
        _require_vector(vector, "each entry of vectors_Lminus1")
    _require_vector(x, "x")
    _require_vector(v, "v")
    return SymmetricTensor.from_vectors(*factors, cross(x, v)).stf()


def legendre_contraction(l: int, cos_angle: object) -> sp.Expr:
    """n_<L> n'_L = (l!/(2l-1)!!) P_l(n.n') in closed form, for unit vectors n, n'.

    Parameters
    ----------
    l : int
        The rank, l >= 0.
    cos_angle : expression
        n.n', the cosine of the angle between the unit vectors.

    Returns
    -------
    sympy.Expr
        sum_j (-1)^j l! (2l-2j-1)!! / ((2l-1)!! 2^j j! (l-2j)!) cos_angle^(l-2j), expanded.

    Raises
    ------
    TypeError
        If ``l`` is not an integer or ``cos_angle`` not an expression.
    ValueError
        If l < 0.

    Conventions
    -----------
    P_l the Legendre polynomial, P_l(1) = 1.

    Examples
    --------
    >>> mu = sp.Symbol("mu")
    >>> legendre_contraction(2, mu)
    mu**2 - 1/3
    >>> legendre_contraction(3, 1) == sp.factorial(3) / double_factorial(5)
    True

    References
    ----------
    Thorne, Rev. Mod. Phys. 52, 299 (1980), eqs. (2.5) and (2.11).
    """
    degree = _as_rank(l, "l")
    mu = _as_coefficient(cos_angle, "cos_angle")
    base = kernels.double_factorial_int(2 * degree - 1)
    terms = []
    for j in range(degree // 2 + 1):
        weight = sp.Rational(
            (-1) ** j * factorial(degree) * kernels.double_factorial_int(2 * degree - 2 * j - 1),
            base * 2**j * factorial(j) * factorial(degree - 2 * j),
        )
        terms.append(weight * mu ** (degree - 2 * j))
    return _canonical(sp.Add(*terms))


def clear_caches() -> None:
    """Empty the STF core's caches (kernel results, Gram tables).

    Conventions
    -----------
    Results never depend on the caches; tests clear them between cases and benchmarks before
    each cold timing.

    Examples
    --------
    >>> clear_caches()

    References
    ----------
    None (bookkeeping).
    """
    kernels.clear_kernel_caches()
    _gram.cache_clear()
