"""Raw kernels on Cartesian polynomials P(k) = T_L k_L in the probe vector k = (k1, k2, k3).

A symmetric rank-l tensor T_L is stored as the homogeneous degree-l polynomial
P(k) = T_L k_L. Writing P = sum_a t_a k^a over multi-indices a = (a1, a2, a3) with
a1 + a2 + a3 = l, the Cartesian component with a1 indices equal to x, a2 equal to y and a3
equal to z is T_{x..y..z..} = (a1! a2! a3!/l!) t_a.

The kernels here work on the monomial coefficients directly (one ``expand`` of the input, no
``simplify``), so they stay exact and fast for any coefficients: rationals, Gaussian
rationals, square roots, pi, or symbols of the layers above.

Functions
---------
``monomial_coefficients``      the map a -> t_a, checking the polynomial is homogeneous.
``polynomial_from_coefficients`` the inverse map.
``contract_cartesian``         full contraction T_L S_L of two rank-l tensors.
``laplacian_cartesian``        the Laplacian in k (a trace of the tensor, times l(l-1)).
``harmonic_part_cartesian``    the STF part T_<L> k_L (closed trace-removal formula).
``is_harmonic``                whether the Laplacian vanishes (the tensor is trace-free).

References
----------
K. S. Thorne, Rev. Mod. Phys. 52, 299 (1980), Sec. II: eq. (2.2) for the STF projection as
powers of the Laplacian.
"""

from __future__ import annotations

import operator
from math import factorial
from typing import Mapping

import sympy as sp

from stfalgebra.stf._kernels import double_factorial_int

__all__ = [
    "PROBE",
    "monomial_coefficients",
    "polynomial_from_coefficients",
    "contract_cartesian",
    "laplacian_cartesian",
    "harmonic_part_cartesian",
    "is_harmonic",
]

#: The auxiliary (probe) vector k whose polynomials stand for symmetric tensors.
PROBE: tuple[sp.Symbol, sp.Symbol, sp.Symbol] = sp.symbols("k1 k2 k3", real=True)

MultiIndex = tuple[int, int, int]

_PROBE_INDEX = {symbol: position for position, symbol in enumerate(PROBE)}


# --------------------------------------------------------------------------- validation


def _as_integer(value: object, name: str) -> int:
    """Return ``value`` as a Python int (int, sympy Integer, numpy integer), else ValueError."""
    if isinstance(value, bool) or not hasattr(type(value), "__index__"):
        raise ValueError(f"{name} must be an integer, got {value!r}")
    return operator.index(value)  # type: ignore[arg-type]


def _as_rank(rank: object) -> int:
    """Return ``rank`` as a non-negative Python int, or raise naming the bad value."""
    value = _as_integer(rank, "rank")
    if value < 0:
        raise ValueError(f"rank must be a non-negative integer, got {rank!r}")
    return value


def _as_expression(p: object) -> sp.Expr:
    """Sympify without parsing strings (an untrusted string is never evaluated here)."""
    try:
        return sp.sympify(p, strict=True)
    except sp.SympifyError as exc:
        raise TypeError(f"expected a sympy expression in k1, k2, k3, got {p!r}") from exc


# --------------------------------------------------------------------------- dict kernels


def _coefficient_dict(p: object) -> dict[MultiIndex, sp.Expr]:
    """Monomial coefficients of ``p`` in the probe symbols, of any degrees."""
    expression = _as_expression(p)
    result: dict[MultiIndex, sp.Expr] = {}
    if not expression.has(*PROBE):
        if expression != 0:
            result[(0, 0, 0)] = expression
        return result
    # power_exp/log would only rewrite coefficients (exp(a+b) -> exp(a) exp(b)); not needed
    expanded = sp.expand(expression, power_exp=False, log=False)
    for term in sp.Add.make_args(expanded):
        coefficient, monomial = term.as_independent(*PROBE, as_Add=False)
        exponents = [0, 0, 0]
        for factor in sp.Mul.make_args(monomial):
            if factor == 1:
                continue
            base, exponent = factor.as_base_exp()
            position = _PROBE_INDEX.get(base)
            if position is None or not (exponent.is_Integer and exponent >= 0):
                raise ValueError(
                    f"not a polynomial in the probe vector (k1, k2, k3): {p!r} "
                    f"(offending factor {factor})"
                )
            exponents[position] += int(exponent)
        key = (exponents[0], exponents[1], exponents[2])
        result[key] = result[key] + coefficient if key in result else coefficient
    return {key: value for key, value in result.items() if value != 0}


def _check_degree(coefficients: Mapping[MultiIndex, sp.Expr], rank: int, p: object) -> None:
    for key in coefficients:
        if sum(key) != rank:
            raise ValueError(
                f"polynomial {p!r} is not homogeneous of degree rank={rank} "
                f"(it has a monomial of degree {sum(key)})"
            )


def _polynomial(coefficients: Mapping[MultiIndex, sp.Expr]) -> sp.Expr:
    k1, k2, k3 = PROBE
    return sp.Add(
        *(value * k1**a1 * k2**a2 * k3**a3 for (a1, a2, a3), value in coefficients.items())
    )


def _laplacian_dict(coefficients: Mapping[MultiIndex, sp.Expr]) -> dict[MultiIndex, sp.Expr]:
    result: dict[MultiIndex, sp.Expr] = {}
    for (a1, a2, a3), value in coefficients.items():
        for key, weight in (
            ((a1 - 2, a2, a3), a1 * (a1 - 1)),
            ((a1, a2 - 2, a3), a2 * (a2 - 1)),
            ((a1, a2, a3 - 2), a3 * (a3 - 1)),
        ):
            if weight:
                term = weight * value
                result[key] = result[key] + term if key in result else term
    return {key: value for key, value in result.items() if value != 0}


def _squared_norm_power(power: int) -> dict[MultiIndex, int]:
    """Coefficients of |k|^(2 power) = (k1^2 + k2^2 + k3^2)^power (multinomial theorem)."""
    result: dict[MultiIndex, int] = {}
    for j1 in range(power + 1):
        for j2 in range(power - j1 + 1):
            j3 = power - j1 - j2
            result[(2 * j1, 2 * j2, 2 * j3)] = factorial(power) // (
                factorial(j1) * factorial(j2) * factorial(j3)
            )
    return result


def _harmonic_part_dict(
    coefficients: Mapping[MultiIndex, sp.Expr], rank: int
) -> dict[MultiIndex, sp.Expr]:
    # Thorne (1980) eq. (2.2): P_<L> = sum_j (-1)^j (2l-2j-1)!!/((2l-1)!! 2^j j!) |k|^{2j} Lap^j P
    result: dict[MultiIndex, sp.Expr] = dict(coefficients)
    current = dict(coefficients)
    denominator_base = double_factorial_int(2 * rank - 1)
    for j in range(1, rank // 2 + 1):
        current = _laplacian_dict(current)
        if not current:
            break
        weight = sp.Rational(
            (-1) ** j * double_factorial_int(2 * rank - 2 * j - 1),
            denominator_base * 2**j * factorial(j),
        )
        norm_power = _squared_norm_power(j)
        for (b1, b2, b3), value in current.items():
            scaled = weight * value
            for (c1, c2, c3), multiplicity in norm_power.items():
                key = (b1 + c1, b2 + c2, b3 + c3)
                term = multiplicity * scaled
                result[key] = result[key] + term if key in result else term
    return {key: value for key, value in result.items() if value != 0}


def _contract_dicts(
    first: Mapping[MultiIndex, sp.Expr], second: Mapping[MultiIndex, sp.Expr], rank: int
) -> sp.Expr:
    smaller, larger = (first, second) if len(first) <= len(second) else (second, first)
    terms = []
    for key, value in smaller.items():
        other = larger.get(key)
        if other is None:
            continue
        a1, a2, a3 = key
        weight = sp.Rational(factorial(a1) * factorial(a2) * factorial(a3), factorial(rank))
        terms.append(weight * value * other)
    return sp.Add(*terms)


# --------------------------------------------------------------------------- public API


def monomial_coefficients(p: sp.Expr, rank: int) -> dict[MultiIndex, sp.Expr]:
    """Monomial coefficients t_a of a homogeneous polynomial P(k) = sum_a t_a k^a.

    Parameters
    ----------
    p : sympy.Expr
        A polynomial in the probe symbols ``PROBE = (k1, k2, k3)``; any other symbols are
        treated as coefficients.
    rank : int
        The expected degree l (the tensor rank), l >= 0.

    Returns
    -------
    dict[tuple[int, int, int], sympy.Expr]
        Map from the exponent triple (a1, a2, a3), a1 + a2 + a3 = l, to the (expanded, non-zero)
        coefficient of k1^a1 k2^a2 k3^a3. The zero polynomial gives ``{}``.

    Raises
    ------
    ValueError
        If ``p`` is not a polynomial in k, is not homogeneous of degree ``rank``, or ``rank`` is
        not a non-negative integer.
    TypeError
        If ``p`` is not a sympy expression or number.

    Conventions
    -----------
    The tensor component with a1 x's, a2 y's and a3 z's is (a1! a2! a3!/l!) t_a.

    Examples
    --------
    >>> k1, k2, k3 = PROBE
    >>> monomial_coefficients(3*k1**2 + k2*k3, 2)
    {(2, 0, 0): 3, (0, 1, 1): 1}

    References
    ----------
    Thorne, Rev. Mod. Phys. 52, 299 (1980), Sec. II (tensors as polynomials in a unit vector).
    """
    degree = _as_rank(rank)
    coefficients = _coefficient_dict(p)
    _check_degree(coefficients, degree, p)
    return coefficients


def polynomial_from_coefficients(coefficients: Mapping[MultiIndex, sp.Expr]) -> sp.Expr:
    """Rebuild sum_a t_a k^a from a map of exponent triples to coefficients.

    Parameters
    ----------
    coefficients : Mapping[tuple[int, int, int], sympy.Expr]
        Exponent triples (non-negative integers) to coefficients.

    Returns
    -------
    sympy.Expr
        The polynomial in ``PROBE``.

    Raises
    ------
    ValueError
        If a key is not a triple of non-negative integers.

    Conventions
    -----------
    Inverse of :func:`monomial_coefficients`; degrees are not checked to agree.

    Examples
    --------
    >>> polynomial_from_coefficients({(2, 0, 0): 3, (0, 1, 1): 1})
    3*k1**2 + k2*k3

    References
    ----------
    Thorne, Rev. Mod. Phys. 52, 299 (1980), Sec. II.
    """
    if not isinstance(coefficients, Mapping):
        raise TypeError(f"coefficients must be a mapping, got {coefficients!r}")
    for key in coefficients:
        if not (
            isinstance(key, tuple)
            and len(key) == 3
            and all(isinstance(a, int) and not isinstance(a, bool) and a >= 0 for a in key)
        ):
            raise ValueError(f"exponent key must be a triple of non-negative ints, got {key!r}")
    return _polynomial({key: _as_expression(value) for key, value in coefficients.items()})


def contract_cartesian(p: sp.Expr, q: sp.Expr, rank: int) -> sp.Expr:
    """Full contraction T_L S_L of two symmetric rank-l tensors given as polynomials.

    Parameters
    ----------
    p, q : sympy.Expr
        P(k) = T_L k_L and Q(k) = S_L k_L, homogeneous of degree ``rank`` in ``PROBE``.
    rank : int
        The rank l >= 0.

    Returns
    -------
    sympy.Expr
        T_L S_L = (1/l!) sum_a a1! a2! a3! t_a s_a, exact and not simplified (a sum of products
        of the expanded coefficients; apply ``sympy.expand`` for a canonical form).

    Raises
    ------
    ValueError
        If either polynomial is not homogeneous of degree ``rank``.

    Conventions
    -----------
    No complex conjugation: the contraction is bilinear. T_L S_L equals (1/l!) T(d/dk) S(k).

    Examples
    --------
    >>> k1, k2, k3 = PROBE
    >>> contract_cartesian((k1 + k2)**2, k1**2, 2)    # (n.e_x)^2 with n = (1, 1, 0)
    1
    >>> contract_cartesian(k1*k2, k1*k2, 2)          # T_xy T_xy + T_yx T_yx = 2 (1/2)^2
    1/2

    References
    ----------
    Thorne, Rev. Mod. Phys. 52, 299 (1980), Sec. II.
    """
    degree = _as_rank(rank)
    first = monomial_coefficients(p, degree)
    second = monomial_coefficients(q, degree)
    return _contract_dicts(first, second, degree)


def laplacian_cartesian(p: sp.Expr) -> sp.Expr:
    """Laplacian of P(k) in the probe vector, d^2 P/dk_i dk_i.

    Parameters
    ----------
    p : sympy.Expr
        A polynomial in ``PROBE`` (not necessarily homogeneous).

    Returns
    -------
    sympy.Expr
        The Laplacian, a polynomial in ``PROBE`` of degree two less. For P = T_L k_L,
        it is l (l - 1) T_{L-2 ii} k_{L-2}.

    Raises
    ------
    ValueError
        If ``p`` is not a polynomial in k.

    Conventions
    -----------
    Flat Euclidean metric delta_ij.

    Examples
    --------
    >>> k1, k2, k3 = PROBE
    >>> laplacian_cartesian(k1**2 * k3 + k2**2)
    2*k3 + 2

    References
    ----------
    Thorne, Rev. Mod. Phys. 52, 299 (1980), eq. (2.2).
    """
    return _polynomial(_laplacian_dict(_coefficient_dict(p)))


def harmonic_part_cartesian(p: sp.Expr, rank: int) -> sp.Expr:
    """STF part of a symmetric tensor: the harmonic part T_<L> k_L of P(k) = T_L k_L.

    Parameters
    ----------
    p : sympy.Expr
        P(k) = T_L k_L, homogeneous of degree ``rank`` in ``PROBE``.
    rank : int
        The rank l >= 0.

    Returns
    -------
    sympy.Expr
        H(k) = sum_{j=0}^{[l/2]} (-1)^j (2l-2j-1)!! / ((2l-1)!! 2^j j!) |k|^{2j} Laplacian^j P,
        a harmonic homogeneous polynomial of degree l, expanded.

    Raises
    ------
    ValueError
        If ``p`` is not homogeneous of degree ``rank``.

    Conventions
    -----------
    T_<L> is the symmetric trace-free part; P - H is |k|^2 times a polynomial (the traces).

    Examples
    --------
    >>> k1, k2, k3 = PROBE
    >>> harmonic_part_cartesian(k3**2, 2)
    -k1**2/3 - k2**2/3 + 2*k3**2/3

    References
    ----------
    Thorne, Rev. Mod. Phys. 52, 299 (1980), eq. (2.2).
    """
    degree = _as_rank(rank)
    coefficients = monomial_coefficients(p, degree)
    return _polynomial(_harmonic_part_dict(coefficients, degree))


def is_harmonic(p: sp.Expr) -> bool:
    """Whether the Laplacian of P(k) vanishes identically (T_L trace-free).

    Parameters
    ----------
    p : sympy.Expr
        A polynomial in ``PROBE``.

    Returns
    -------
    bool
        True when every coefficient of Laplacian(P) expands to zero.

    Raises
    ------
    ValueError
        If ``p`` is not a polynomial in k.

    Conventions
    -----------
    Coefficients are compared after ``sympy.expand`` only (no ``simplify``): a coefficient
    that is zero only after trigonometric or other simplification is not recognised.

    Examples
    --------
    >>> k1, k2, k3 = PROBE
    >>> is_harmonic(k1*k2), is_harmonic(k3**2)
    (True, False)

    References
    ----------
    Thorne, Rev. Mod. Phys. 52, 299 (1980), Sec. II.
    """
    laplacian = _laplacian_dict(_coefficient_dict(p))
    return all(sp.expand(value) == 0 for value in laplacian.values())
