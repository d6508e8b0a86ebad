"""Projection of planar-orbit tensors onto the mode basis alpha_L^lm.

For a tensor written in the spinor channels of
:mod:`stfalgebra.moments.relative_tensor` (Z+ = k.(n + i lambda) = exp(-i phi) k.e_+,
Z- = exp(+i phi) k.e_-, u_z = k.e_z, e_+- = e_x +- i e_y), the contraction with alpha_L^lm
keeps only the channel p - q = m and gives

    alpha_L^lm T_L = exp(-i m phi) sum_{p-q=m} C_pqc  alpha_L^lm e_+^(p) e_-^(q) e_z^(c).

This module computes the constant alpha_L^lm e_+^(p) e_-^(q) e_z^(c) from the harmonics of
:mod:`stfalgebra.stf.harmonics` and selects the channel of a mode.
"""

from __future__ import annotations

from functools import lru_cache
from math import comb

import sympy as sp

from ..stf.harmonics import alpha_on_triad

__all__ = ["mode_channel", "alpha_on_spinor_basis", "mode_kind"]


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
    total = sp.Integer(0)
    for j in range(p + 1):          # e_x from the e_+ factors
        for k in range(q + 1):      # e_x from the e_- factors
            weight = comb(p, j) * comb(q, k) * sp.I**(p - j) * (-sp.I)**(q - k)
            total += weight * alpha_on_triad(l, m, j + k, p - j + q - k, c)
    return sp.expand(total)
