"""Raw kernels for symmetric tensors as polynomials in u_i = k.a_i, w = k.k and Gram entries.

Layer 0 of the STF core: plain functions on plain data, no Vector objects. A *raw polynomial*
over n vectors is a dict mapping exponent tuples to Python ints. An exponent tuple has
n + 1 + n(n+1)/2 entries: the exponents of u_1..u_n, of w, then of the Gram placeholders
g_ij = a_i.a_j for i <= j in the order (0,0), (0,1), ..., (0,n-1), (1,1), ... The placeholders
make every kernel pure combinatorics with integer coefficients, independent of what the
vectors are, so results can be cached by exponent tuple alone; :func:`evaluate` then puts in
the actual Gram values (numbers or symbols) and the caller's coefficients.

Formulas (k the probe vector, f = f(u_1, ..., u_n, w)):

- Laplacian in k:
  Delta f = sum_ij g_ij f_{u_i u_j} + 4 sum_i u_i f_{u_i w} + 6 f_w + 4 w f_ww;
  on a monomial u^e w^m this gives the w-part 2m(2|e| + 2m + 1) u^e w^(m-1).
- Directional derivative a_i.d/dk: D_i f = sum_j g_ij f_{u_j} + 2 u_i f_w.
- STF part of a rank-l polynomial P (Thorne 1980, eq. (2.2), written with Delta):
  H = sum_{j>=0} (-1)^j (2l-2j-1)!! / ((2l-1)!! 2^j j!) w^j Delta^j P.
- Contraction: T_L S_L = (1/l!) T(d/dk) S(k), with u_i -> D_i and w -> Delta; partial
  contraction of rank l with rank p: ((l-p)!/l!) S(d/dk) T(k).

References
----------
K. S. Thorne, Rev. Mod. Phys. 52, 299 (1980), eqs. (2.2) and (2.5) (STF projection,
contractions as derivatives of polynomials).
"""

from __future__ import annotations

from fractions import Fraction
from functools import lru_cache
from math import factorial, gcd
from typing import Iterable, Sequence

import sympy as sp

from stfalgebra.stf import backend

__all__ = [
    "RawPolynomial",
    "double_factorial_int",
    "layout",
    "laplacian",
    "apply_direction",
    "apply_operator",
    "harmonic_projection",
    "laplacian_of_monomial",
    "stf_contraction",
    "plain_contraction",
    "partial_stf_contraction",
    "partial_plain_contraction",
    "evaluate",
    "clear_kernel_caches",
]

RawPolynomial = dict  # dict[tuple[int, ...], int]


def double_factorial_int(n: int) -> int:
    """n!! for n >= -1 as a Python int, with (-1)!! = 0!! = 1."""
    value = 1
    while n > 1:
        value *= n
        n -= 2
    return value


@lru_cache(maxsize=None)
def layout(n: int) -> tuple[int, tuple[tuple[int, ...], ...]]:
    """(tuple length, position of g_ij in the tuple for all i, j) for n vectors."""
    positions = [[0] * n for _ in range(n)]
    position = n + 1
    for i in range(n):
        for j in range(i, n):
            positions[i][j] = positions[j][i] = position
            position += 1
    return position, tuple(tuple(row) for row in positions)


def _add(target: dict, key: tuple, value: int) -> None:
    total = target.get(key, 0) + value
    if total:
        target[key] = total
    else:
        target.pop(key, None)


def laplacian(poly: RawPolynomial, n: int) -> RawPolynomial:
    """Delta_k of a raw polynomial over n vectors (see the module docstring)."""
    _, gpos = layout(n)
    result: dict = {}
    for key, c in poly.items():
        m = key[n]
        if m:
            degree_u = sum(key[:n])
            new = list(key)
            new[n] = m - 1
            _add(result, tuple(new), c * 2 * m * (2 * degree_u + 2 * m + 1))
        for i in range(n):
            ei = key[i]
            if not ei:
                continue
            if ei >= 2:
                new = list(key)
                new[i] -= 2
                new[gpos[i][i]] += 1
                _add(result, tuple(new), c * ei * (ei - 1))
            for j in range(i + 1, n):
                ej = key[j]
                if ej:
                    new = list(key)
                    new[i] -= 1
                    new[j] -= 1
                    new[gpos[i][j]] += 1
                    _add(result, tuple(new), c * 2 * ei * ej)
    return result


def apply_direction(poly: RawPolynomial, n: int, i: int) -> RawPolynomial:
    """D_i = a_i.d/dk of a raw polynomial: sum_j g_ij f_{u_j} + 2 u_i f_w."""
    _, gpos = layout(n)
    row = gpos[i]
    result: dict = {}
    for key, c in poly.items():
        for j in range(n):
            ej = key[j]
            if ej:
                new = list(key)
                new[j] -= 1
                new[row[j]] += 1
                _add(result, tuple(new), c * ej)
        m = key[n]
        if m:
            new = list(key)
            new[n] = m - 1
            new[i] += 1
            _add(result, tuple(new), 2 * m * c)
    return result


def apply_operator(operator_key: tuple[int, ...], poly: RawPolynomial, n: int) -> RawPolynomial:
    """Apply u^e w^m -> D^e Delta^m (operator_key = e + (m,)) to a raw polynomial."""
    current = poly
    for _ in range(operator_key[n]):
        if not current:
            return current
        current = laplacian(current, n)
    for i in range(n):
        for _ in range(operator_key[i]):
            if not current:
                return current
            current = apply_direction(current, n, i)
    return current


def _monomial(exponents: tuple[int, ...], w_power: int, n: int) -> RawPolynomial:
    size, _ = layout(n)
    key = list(exponents) + [w_power] + [0] * (size - n - 1)
    return {tuple(key): 1}


def _reduce(poly: RawPolynomial, denominator: int) -> tuple[RawPolynomial, int]:
    common = denominator
    for value in poly.values():
        common = gcd(common, value)
        if common == 1:
            return poly, denominator
    if common > 1:
        poly = {key: value // common for key, value in poly.items()}
        denominator //= common
    return poly, denominator


@lru_cache(maxsize=4096)
def harmonic_projection(exponents: tuple[int, ...]) -> tuple[RawPolynomial, int]:
    """STF part of the monomial u^e (e = ``exponents`` over n = len(e) vectors).

    Returns ``(numerators, denominator)``: the raw polynomial H with integer coefficients and
    the common denominator. Thorne (1980) eq. (2.2) with the trace terms as w^j Delta^j P.
    The returned dict is shared by the cache: do not mutate it.
    """
    n = len(exponents)
    rank = sum(exponents)
    half = rank // 2
    # common denominator of (2l-2j-1)!!/((2l-1)!! 2^j j!) for j <= l/2
    denominator = double_factorial_int(2 * rank - 1) * 2**half * factorial(half)
    current = _monomial(exponents, 0, n)
    result: dict = {key: denominator for key in current}
    for j in range(1, half + 1):
        current = laplacian(current, n)
        if not current:
            break
        # (-1)^j (2l-2j-1)!!/((2l-1)!! 2^j j!) times the common denominator
        weight = (-1) ** j * double_factorial_int(2 * rank - 2 * j - 1) * 2 ** (half - j) * (
            factorial(half) // factorial(j)
        )
        for key, c in current.items():
            new = list(key)
            new[n] += j
            _add(result, tuple(new), weight * c)
    return _reduce(result, denominator)


@lru_cache(maxsize=4096)
def laplacian_of_monomial(key: tuple[int, ...]) -> RawPolynomial:
    """Delta of u^e w^m, key = e + (m,) (n = len(key) - 1)."""
    n = len(key) - 1
    return laplacian(_monomial(key[:n], key[n], n), n)


@lru_cache(maxsize=4096)
def stf_contraction(operator: tuple[int, ...], target: tuple[int, ...]) -> tuple[RawPolynomial, int]:
    """(1/l!) u^a . (u^b)_<L> over the same n vectors: a scalar in the g_ij.

    Symmetric in its two arguments (both sides may be projected); the monomial with fewer
    vectors is projected and the other applied as a derivative operator.
    """
    n = len(operator)
    if sum(1 for e in operator if e) < sum(1 for e in target if e):
        operator, target = target, operator
    projected, denominator = harmonic_projection(target)
    result = apply_operator(operator + (0,), projected, n)
    return _reduce(result, denominator * factorial(sum(operator)))


@lru_cache(maxsize=4096)
def plain_contraction(operator: tuple[int, ...], target: tuple[int, ...]) -> tuple[RawPolynomial, int]:
    """(1/l!) T(d/dk) S(k) for the monomials T = u^e w^m (operator = e + (m,)) and S (target)."""
    n = len(operator) - 1
    rank = sum(operator[:n]) + 2 * operator[n]
    result = apply_operator(operator, _monomial(target[:n], target[n], n), n)
    return _reduce(result, factorial(rank))


@lru_cache(maxsize=4096)
def partial_stf_contraction(
    operator: tuple[int, ...], target: tuple[int, ...]
) -> tuple[RawPolynomial, int]:
    """((l-p)!/l!) S(d/dk) (u^b)_<L>: S = u^a (operator, rank p), target b of rank l."""
    n = len(target)
    rank = sum(target)
    p = sum(operator)
    projected, denominator = harmonic_projection(target)
    result = apply_operator(operator + (0,), projected, n)
    return _reduce(
        {key: value * factorial(rank - p) for key, value in result.items()},
        denominator * factorial(rank),
    )


@lru_cache(maxsize=4096)
def partial_plain_contraction(
    operator: tuple[int, ...], target: tuple[int, ...]
) -> tuple[RawPolynomial, int]:
    """((l-p)!/l!) S(d/dk) T(k) for monomials S = u^a w^m (operator) and T (target)."""
    n = len(operator) - 1
    p = sum(operator[:n]) + 2 * operator[n]
    rank = sum(target[:n]) + 2 * target[n]
    result = apply_operator(operator, _monomial(target[:n], target[n], n), n)
    return _reduce(
        {key: value * factorial(rank - p) for key, value in result.items()}, factorial(rank)
    )


def clear_kernel_caches() -> None:
    """Empty every kernel cache (tests and benchmarks call this for cold timings)."""
    for cached in (
        layout,
        harmonic_projection,
        laplacian_of_monomial,
        stf_contraction,
        plain_contraction,
        partial_stf_contraction,
        partial_plain_contraction,
    ):
        cached.cache_clear()


def _needs_distribution(expression: sp.Expr) -> bool:
    """True if multiplying ``expression`` into a monomial could leave a product of sums."""
    return any(isinstance(node, sp.Add) for node in sp.preorder_traversal(expression))


def evaluate(
    weighted: Iterable[tuple[sp.Expr, RawPolynomial, int]],
    n: int,
    gram: Sequence[sp.Expr],
) -> dict[tuple[int, ...], sp.Expr]:
    """Sum coefficient * (raw polynomial / denominator) with the g_ij replaced by Gram values.

    Parameters
    ----------
    weighted : iterable of (coefficient, raw polynomial, denominator)
        The terms to add; coefficients are sympy expressions.
    n : int
        Number of vectors of the raw polynomials.
    gram : sequence of sympy expressions
        Value of g_ij at each placeholder slot, in layout order ((0,0), (0,1), ...).

    Returns
    -------
    dict
        ``{u/w exponent tuple (length n + 1): non-zero expanded coefficient}``.
    """
    size, _ = layout(n)
    slots = range(n + 1, size)
    numeric: dict[int, Fraction] = {}
    symbolic: list[int] = []
    expand_needed = False
    for slot, value in zip(slots, gram):
        if isinstance(value, sp.Rational):
            numeric[slot] = Fraction(int(value.p), int(value.q))
        else:
            symbolic.append(slot)
            if _needs_distribution(value):
                expand_needed = True
    symbolic_values = {slot: gram[slot - n - 1] for slot in symbolic}

    # group by the caller's coefficient: rational coefficients fold into the numbers
    groups: dict[object, dict[tuple, Fraction]] = {}
    for coefficient, poly, denominator in weighted:
        if isinstance(coefficient, sp.Rational):
            group_key: object = None
            scale = Fraction(int(coefficient.p), int(coefficient.q) * denominator)
        else:
            group_key = coefficient
            scale = Fraction(1, denominator)
        if scale == 0:
            continue
        accumulator = groups.setdefault(group_key, {})
        for key, c in poly.items():
            value = scale * c
            for slot, number in numeric.items():
                power = key[slot]
                if power:
                    value *= number**power
                    if not value:
                        break
            if not value:
                continue
            reduced = (key[: n + 1], tuple(key[slot] for slot in symbolic))
            total = accumulator.get(reduced, 0) + value
            if total:
                accumulator[reduced] = total
            else:
                accumulator.pop(reduced, None)

    power_cache: dict[tuple[int, int], sp.Expr] = {}

    def symbolic_factor(exponents: tuple[int, ...]) -> list[sp.Expr]:
        factors = []
        for slot, power in zip(symbolic, exponents):
            if power:
                cached = power_cache.get((slot, power))
                if cached is None:
                    cached = symbolic_values[slot] ** power
                    power_cache[(slot, power)] = cached
                factors.append(cached)
        return factors

    collected: dict[tuple[int, ...], list[sp.Expr]] = {}
    needs_expand: dict[tuple[int, ...], bool] = {}
    for group_key, accumulator in groups.items():
        distribute = group_key is not None and _needs_distribution(group_key)
        for (uw, exponents), value in accumulator.items():
            factors = symbolic_factor(exponents)
            number = sp.Rational(value.numerator, value.denominator)
            if group_key is not None:
                factors.append(group_key)
            term = sp.Mul(number, *factors) if factors else number
            collected.setdefault(uw, []).append(term)
            if expand_needed or distribute:
                needs_expand[uw] = True

    result: dict[tuple[int, ...], sp.Expr] = {}
    for uw, terms in collected.items():
        total = sp.Add(*terms)
        if needs_expand.get(uw):
            total = backend.expand(total)
        if total != 0:
            result[uw] = total
    return result
