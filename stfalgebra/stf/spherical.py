"""STF tensors <-> spherical components, exact.

A rank-l STF tensor T_<L> has 2l + 1 independent components; in the spherical basis they are
t_m = T_L alpha_L^lm (m = -l..l), so that

    T_L n_L = sum_m t_m Y_lm(n)   and   T_<L> = sum_m t_m Y^lm_L,

with the orthonormal, Condon-Shortley Y_lm and alpha_L^lm = (4 pi l!/(2l+1)!!) conj(Y^lm_L)
of :mod:`stfalgebra.stf.harmonics`. Tensors are Cartesian polynomials T_L k_L in ``PROBE``.

References
----------
Thorne, Rev. Mod. Phys. 52, 299 (1980), Sec. II; Kidder, Phys. Rev. D 77, 044016 (2008);
Blanchet, Living Rev. Relativ. 17, 2 (2014).
"""

from __future__ import annotations

from typing import Mapping

import sympy as sp

from stfalgebra.stf.cartesian import (
    _as_expression,
    _as_integer,
    _as_rank,
    _polynomial,
    monomial_coefficients,
)
from stfalgebra.stf.harmonics import _alpha_triad_table, _solid_coefficients

__all__ = ["stf_to_spherical", "spherical_to_stf"]


def stf_to_spherical(p: sp.Expr, rank: int) -> dict[int, sp.Expr]:
    """Spherical components t_m = T_L alpha_L^lm of a symmetric tensor given as a polynomial.

    Parameters
    ----------
    p : sympy.Expr
        P(k) = T_L k_L, homogeneous of degree ``rank`` in ``PROBE``. Only the STF part T_<L>
        contributes (alpha_L^lm is trace-free), so P need not be harmonic.
    rank : int
        The rank l >= 0.

    Returns
    -------
    dict[int, sympy.Expr]
        {m: t_m} for every m in -l..l (exact zeros included), each t_m expanded.

    Raises
    ------
    ValueError
        If ``p`` is not homogeneous of degree ``rank`` or ``rank`` is not a non-negative integer.

    Conventions
    -----------
    t_m = T_L alpha_L^lm, so T_L n_L = sum_m t_m Y_lm(n) (orthonormal Y_lm with the
    Condon-Shortley phase). For a real tensor t_{-m} = (-1)^m conj(t_m).

    Examples
    --------
    >>> from stfalgebra.stf.cartesian import PROBE
    >>> k1, k2, k3 = PROBE
    >>> stf_to_spherical(k3, 1)
    {-1: 0, 0: 2*sqrt(3)*sqrt(pi)/3, 1: 0}

    References
    ----------
    Thorne, Rev. Mod. Phys. 52, 299 (1980), eqs. (2.11)-(2.12); Blanchet, Living Rev. Relativ.
    17, 2 (2014) (the alpha_L^lm projection).
    """
    degree = _as_rank(rank)
    coefficients = monomial_coefficients(p, degree)
    components: dict[int, sp.Expr] = {}
    for order in range(-degree, degree + 1):
        # T_L alpha_L = sum_a t_a (a!/l!) alpha_a, the factor a!/l! already in the table
        table = _alpha_triad_table(degree, order)
        total = sp.Add(
            *(value * table[key] for key, value in coefficients.items() if key in table)
        )
        components[order] = sp.expand(total)
    return components


def spherical_to_stf(components: Mapping[int, sp.Expr], rank: int) -> sp.Expr:
    """The STF tensor sum_m t_m Y^lm_L, as the Cartesian polynomial T_<L> k_L.

    Parameters
    ----------
    components : Mapping[int, sympy.Expr]
        {m: t_m} with integer |m| <= rank; missing orders are zero.
    rank : int
        The rank l >= 0.

    Returns
    -------
    sympy.Expr
        T_<L> k_L = sum_m t_m |k|^l Y_lm(k/|k|), a harmonic polynomial with expanded
        coefficients. Inverse of :func:`stf_to_spherical` on STF tensors.

    Raises
    ------
    ValueError
        If an order is not an integer or |m| > rank, or ``rank`` is not a non-negative integer.
    TypeError
        If ``components`` is not a mapping or a value is not a sympy expression or number.

    Conventions
    -----------
    As :func:`stf_to_spherical`: Y^lm_L alpha_L^lm' = delta_mm', so the round trip is exact.

    Examples
    --------
    >>> spherical_to_stf({0: 2*sp.sqrt(3*sp.pi)/3}, 1)
    k3

    References
    ----------
    Thorne, Rev. Mod. Phys. 52, 299 (1980), eqs. (2.11)-(2.12).
    """
    degree = _as_rank(rank)
    if not isinstance(components, Mapping):
        raise TypeError(f"components must be a mapping {{m: t_m}}, got {components!r}")
    totals: dict[tuple[int, int, int], list[sp.Expr]] = {}
    for key, value in components.items():
        order = _as_integer(key, "m")
        if abs(order) > degree:
            raise ValueError(f"|m| must not exceed rank={degree}, got m={key!r}")
        amplitude = _as_expression(value)
        if amplitude == 0:
            continue
        for monomial, coefficient in _solid_coefficients(degree, order).items():
            totals.setdefault(monomial, []).append(amplitude * coefficient)
    expanded = {monomial: sp.expand(sp.Add(*terms)) for monomial, terms in totals.items()}
    return _polynomial({monomial: value for monomial, value in expanded.items() if value != 0})
