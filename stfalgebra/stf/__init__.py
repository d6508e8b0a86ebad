"""Layer 1: exact STF tensor algebra in flat 3-space.

Symmetric tensors are polynomials in a probe vector k (T_L k_L); the STF part is the
harmonic part; contractions are polynomial operations. See DEVELOPERS.md.
"""

from .cartesian import PROBE, contract_cartesian, harmonic_part_cartesian, is_harmonic
from .harmonics import (
    alpha_on_triad, alpha_polynomial, solid_harmonic, spherical_harmonic, spin_weighted_harmonic,
    stf_harmonic,
)
from .spherical import spherical_to_stf, stf_to_spherical
from .tensors import SymmetricTensor, double_factorial, legendre_contraction, stf_epsilon_product, stf_product
from .vectors import Vector, cross, dot, triple_product

__all__ = [
    "PROBE", "Vector", "dot", "cross", "triple_product",
    "SymmetricTensor", "stf_product", "stf_epsilon_product", "legendre_contraction", "double_factorial",
    "contract_cartesian", "harmonic_part_cartesian", "is_harmonic",
    "spherical_harmonic", "spin_weighted_harmonic", "solid_harmonic", "stf_harmonic",
    "alpha_polynomial", "alpha_on_triad", "stf_to_spherical", "spherical_to_stf",
]
