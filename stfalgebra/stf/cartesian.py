"""Raw kernels on Cartesian polynomials P(k) = T_L k_L in the probe vector k = (k1, k2, k3)."""

from __future__ import annotations

import sympy as sp

__all__ = ["PROBE"]

#: The auxiliary (probe) vector k whose polynomials stand for symmetric tensors.
PROBE: tuple[sp.Symbol, sp.Symbol, sp.Symbol] = sp.symbols("k1 k2 k3", real=True)
