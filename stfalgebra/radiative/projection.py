"""Projection of planar-orbit tensors onto the mode basis alpha_L^lm.

For a tensor written in the spinor channels of
:mod:`stfalgebra.moments.orbit_tensor` (Z+ = k.(n + i lambda) = exp(-i phi) k.e_+,
Z- = exp(+i phi) k.e_-, u_z = k.e_z, e_+- = e_x +- i e_y), the contraction with alpha_L^lm
keeps only the channel p - q = m and gives

    alpha_L^lm T_L = exp(-i m phi) sum_{p-q=m} C_pqc  alpha_L^lm e_+^(p) e_-^(q) e_z^(c).

This module computes the constant alpha_L^lm e_+^(p) e_-^(q) e_z^(c) from the harmonics of
:mod:`stfalgebra.stf.harmonics` and selects the channel of a mode.
"""

from __future__ import annotations

from fractions import Fraction
from functools import lru_cache
from math import comb, factorial, prod

from ..exact import SurdConstant
from ..lazy_sympy import sp

__all__ = ["mode_channel", "alpha_on_spinor_basis", "alpha_on_spinor_basis_exact", "mode_kind"]


def mode_kind(l: int, m: int) -> str:
    """"mass" for l + m even, "current" for l + m odd (planar orbits)."""
    return "mass" if (l + m) % 2 == 0 else "current"


def mode_channel(l: int, m: int) -> tuple[int, int, int]:
    """The channel (p, q, c) that feeds mode (l, m) for a planar orbit.

    Mass moments (c = 0): p + q = l, p - q = m. Current moments carry one ell = r^2 phidot e_z
    (c = 1): p + q = l - 1, p - q = m.

    >>> mode_channel(2, 2), mode_channel(2, 1), mode_channel(3, -2)
    ((2, 0, 0), (1, 0, 1), (0, 2, 1))
    """
    c = 0 if (l + m) % 2 == 0 else 1
    p = (l - c + m) // 2
    return p, l - c - p, c


@lru_cache(maxsize=None)
def alpha_on_spinor_basis(l: int, m: int, p: int, q: int, c: int) -> sp.Expr:
    """alpha_L^lm contracted with p copies of e_+ = e_x + i e_y, q of e_- = e_x - i e_y and
    c of e_z (exact).

    >>> alpha_on_spinor_basis(2, 2, 2, 0, 0)
    4*sqrt(30)*sqrt(pi)/15
    """
    from ..stf.harmonics import alpha_on_triad

    total = sp.Integer(0)
    for j in range(p + 1):          # e_x from the e_+ factors
        for k in range(q + 1):      # e_x from the e_- factors
            weight = comb(p, j) * comb(q, k) * sp.I**(p - j) * (-sp.I)**(q - k)
            total += weight * alpha_on_triad(l, m, j + k, p - j + q - k, c)
    return sp.expand(total)


@lru_cache(maxsize=None)
def alpha_on_spinor_basis_exact(l: int, m: int, p: int, q: int, c: int) -> SurdConstant:
    """:func:`alpha_on_spinor_basis` divided by sqrt(pi), as an exact surd (no sympy).

    The solid harmonic in ``k_+- = k_x +- i k_y``, ``k_z`` (Condon-Shortley phase, Goldberg et
    al. 1967 normalisation; common practice) is, for m >= 0,

        |k|^l Y_lm = N_lm (-1)^m k_+^m sum_j c_j k_z^(l-m-2j) (k_+ k_- + k_z^2)^j,
        c_j = (-1)^j (2l-2j)!/(2^l j! (l-j)! (l-m-2j)!),  N_lm = sqrt((2l+1)(l-m)!/(4 pi (l+m)!)),

    and ``Y_l,-m = (-1)^m conj(Y_lm)``. With ``alpha_L^lm k_L = (4 pi l!/(2l+1)!!) conj(|k|^l Y_lm)``
    the contraction with ``e_+^p e_-^q e_z^c`` is ``(1/l!) (e_+.d)^p (e_-.d)^q (e_z.d)^c`` of that
    polynomial, ``e_+.d = 2 d/dk_-``, ``e_-.d = 2 d/dk_+``: a rational multiple of
    ``4 pi N_lm``.

    Example
    -------
    >>> alpha_on_spinor_basis_exact(2, 2, 2, 0, 0)          # alpha/sqrt(pi) = 4 sqrt(30)/15
    SurdConstant(4/15*sqrt(30))
    """
    if p + q + c != l or p - q != m or min(p, q, c) < 0:
        return SurdConstant(0)
    a = abs(m)
    # the power of (k_+ k_-) taken from (k_+ k_- + k_z^2)^j: the rest of k_- (m >= 0) or k_+
    # (m < 0) comes from the prefactor k_-^m (conjugated) or k_+^|m|
    i = q if m >= 0 else p
    if l - a - 2 * i != c:
        return SurdConstant(0)
    total = Fraction(0)
    for j in range(i, (l - a) // 2 + 1):
        c_j = Fraction((-1) ** j * factorial(2 * l - 2 * j),
                       2**l * factorial(j) * factorial(l - j) * factorial(l - a - 2 * j))
        total += c_j * comb(j, i)
    sign = (-1) ** a if m >= 0 else 1
    derivative = sign * total * factorial(p) * factorial(q) * factorial(c) * 2 ** (p + q)
    # 4 pi N_lm / (2l+1)!! = sqrt(pi) * 2 sqrt((2l+1)(l-|m|)!/(l+|m|)!)/(2l+1)!!
    return SurdConstant(2 * derivative / prod(range(2 * l + 1, 0, -2)),
                        Fraction((2 * l + 1) * factorial(l - a), factorial(l + a)))
