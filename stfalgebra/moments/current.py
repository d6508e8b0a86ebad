"""Current-type source moments J_L of two point masses, Newtonian and 1PN, for every l.

General formula (the 1PN current moment of Damour & Iyer (1991), Ann. Inst. H. Poincare 54,
115, written with the source densities of Blanchet, Living Rev. Relativ. 17, 2 (2014)):

    J_L = int d^3x eps_{ab<i_l} { xhat_{L-1>a} Sigma_b + |x|^2 xhat_{L-1>a} d_t^2 Sigma_b / (2 c^2 (2l+3))
                                  - (2l+1) xhat_{L-1>ac} d_t Sigma_bc / (c^2 (l+2)(2l+3)) } + O(c^-4),  (C1)

with Sigma_i = tau^{0i}/c and Sigma_ij = tau^{ij}, tau^{mu nu} = |g| T^{mu nu} +
(c^4/(16 pi G)) Lambda^{mu nu}. For point masses the compact part of Sigma_b is
sum_A m_A v_A^b [1 + (v_A^2/2 + 3 G m_B/r12)/c^2] delta(x - y_A) (the metric weight
|g| = 1 + 4U/c^2 times the particle's u^0 factor; common practice); the non-compact part is
integrated in :mod:`stfalgebra.moments.field_integrals`. In Sigma_bc only the matter part
m_A v_A^b v_A^c contributes: the Newtonian field stress d_b U d_c U of two bodies is built
from y1, y2 (collinear with n) and drops out of eps_{ab<i_l} (stated in the module
docstring of field_integrals and tested through the published J_ij).
"""

from __future__ import annotations

from functools import lru_cache

from fractions import Fraction

from ..exact import ExactPolynomial, engine_symbols
from .field_integrals import field_current_term
from .mass import _check_rank
from .point_particles import (
    check_moment_order, companion_weighted_sum, exact_series, first_derivative_term,
    one_pn_position_shift, position_factor_sum, retardation_term,
)
from .orbit_tensor import PLANAR_BASIS, OrbitTensor

__all__ = ["current_moment"]


def current_moment(l: int, pn_order: int = 0) -> OrbitTensor:
    """The current moment J_L of two point masses in the centre-of-mass frame.

    Parameters
    ----------
    l:
        Multipole order, l >= 1.
    pn_order:
        0 (Newtonian), 1 (1PN, harmonic coordinates) or 2 (2PN:
        :func:`stfalgebra.moments.current_two_pn_quadratic.current_moment_two_pn`, which needs
        the cubic non-compact terms).

    Returns
    -------
    OrbitTensor
        J_L = sum s_abc x_<A v_B ell_C> with c = 1 in every term (ell = x cross v), so that
        eps_{ab<i_l} x_{L-1>a} v_b is the term (l-1, 0, 1).

    Example
    -------
    >>> from stfalgebra.moments.current import current_moment
    >>> current_moment(2).terms[(1, 0, 1)].coefficient(0)   # J_ij = -m nu delta eps_{ab<i} x_{j>a} v_b
    -nu*delta*m

    References
    ----------
    Damour & Iyer (1991), Ann. Inst. H. Poincare 54, 115; Blanchet, Living Rev. Relativ. 17, 2
    (2014) (source densities Sigma_i, Sigma_ij and the pseudo-tensor).
    """
    _check_rank(l)
    if isinstance(pn_order, bool) or not isinstance(pn_order, int):
        raise TypeError(f"pn_order must be an int, got {pn_order!r}")
    if pn_order == 2:
        from .current_two_pn_quadratic import current_moment_two_pn   # sympy rings: loaded only for 2PN

        return current_moment_two_pn(l).with_provenance(
            f"J_L, l = {l}: 2PN, the general current-moment formula (J1) of "
            "stfalgebra.moments.current_two_pn applied to point masses: compact terms with the "
            "Hadamard-regularised metric, bilinear field terms through two-centre kernels, cubic "
            "non-compact terms (current_two_pn_cubic); 2PN centre-of-mass relations")
    tensor = _current_moment(l, pn_order)
    if pn_order == 0:
        return tensor.with_provenance(f"J_L, l = {l}: Newtonian, sum_A m_A eps_ab<i_l y_A^L-1>a v_A^b")
    return tensor.with_provenance(
        f"J_L, l = {l}: 1PN current-moment formula (C1) with Sigma_i = tau^0i/c: compact "
        "point-particle part with its metric weight, and the non-compact field part "
        "integrated by the finite-part kernel (F2); 1PN centre-of-mass relations")


@lru_cache(maxsize=None)
def _current_moment(l: int, pn_order: int) -> OrbitTensor:
    _check_rank(l)
    if l < 1:
        raise ValueError(f"current moments start at l = 1, got l = {l}")
    known = check_moment_order(pn_order)
    structure = (l - 1, 0, 1)  # eps_{ab<i_l} x_{L-1>a} v_b
    if pn_order == 0:
        return OrbitTensor._trusted(l, {structure: exact_series({0: position_factor_sum(l + 1)}, known)}, PLANAR_BASIS)

    s = engine_symbols()
    v2 = s.rdot**2 + s.r**2 * s.phidot**2
    # eps y_A^{L-1} y_A^a v_A^b = s_A^(l+1) eps x^{L-1} x^a v^b (the d s_A/dt x part drops out);
    # weight 1 + (v_A^2/2 + 3 G m_B/r)/c^2, positions to 1PN, expanded to first order in 1/c^2
    correction = (v2 / 2 * position_factor_sum(l + 3)
                  + 3 * s.G * s.m * s.r**-1 * companion_weighted_sum(l + 1)
                  + (l + 1) * one_pn_position_shift() * position_factor_sum(l)
                  + field_current_term(l))
    moment = OrbitTensor._trusted(
        l, {structure: exact_series({0: position_factor_sum(l + 1), 1: correction}, known)}, PLANAR_BASIS)

    S = position_factor_sum(l + 3)  # |y_A|^2 y_A^{L-1} y_A^a v_A^b, y_A^{L-1 a c} v_A^b v_A^c
    moment = moment + retardation_term(l, structure, S)
    # eps_{ab<i_l} xhat_{L-1>ac} v_b v_c, with x_<Lc> v_c = x_<L>(x.v) - (l/(2l+1)) r^2 x_<L-1 v>
    # over the l indices (L-1, a); a carrying v gives eps v_a v_b = 0, hence the (l-1)/l.
    inner = {structure: S * s.r * s.rdot}
    if l >= 2:
        inner[(l - 2, 1, 1)] = -S * s.r**2 * Fraction(l - 1, 2 * l + 1)
    moment = moment + first_derivative_term(l, inner, ExactPolynomial(-Fraction(2 * l + 1, (l + 2) * (2 * l + 3))))
    return moment.truncate(known)
