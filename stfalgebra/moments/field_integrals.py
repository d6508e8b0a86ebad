"""Non-compact (field) contributions to the 1PN current moments of two point masses.

The 1PN current moment is built from the momentum density of the gravitational source
Sigma_i = tau^{0i}/c, tau^{mu nu} = |g| T^{mu nu} + (c^4/(16 pi G)) Lambda^{mu nu}
(Blanchet, Living Rev. Relativ. 17, 2 (2014), definitions of the source densities). At the
order needed the field part of the Landau-Lifshitz-type pseudo-tensor in harmonic gauge is

    Lambda^{0i} = (16/c^5) [ d_k V (d_i V_k - d_k V_i) + (3/4) d_t V d_i V ],       (F1)

with h^{00} = -4 V/c^2, h^{0i} = -4 V_i/c^3, V = G sum_A m_A/r_A, V_i = G sum_A m_A v_A^i/r_A
(derived here from the quadratic part of Lambda^{mu nu} in harmonic gauge; the same form is in
the Living Review, quoted from memory). Hence the field part of Sigma_b is
(1/(pi G c^2)) [d_k V (d_b V_k - d_k V_b) + (3/4) d_t V d_b V]; only the cross terms
(m1 m2) survive (self terms are scale-free and vanish in Hadamard + finite-part
regularisation, common practice). Every cross term is a pair of derivatives of
1/(r1 r2) with respect to the body positions: d_i(1/r1) d_j(1/r2) = D1_i D2_j [1/(r1 r2)],
D_A = d/dy_A, and d_t(1/r_A) = (v_A . D_A)(1/r_A). The space integral then needs only

    K_L(y1, y2) = FP int d^3x  xhat_L / (r1 r2)
                = -(2 pi/(l + 1)) r12 sum_{p=0}^{l} y1_<L-P y2_P>,                 (F2)

the finite part (analytic continuation in (|x|/r0)^B at infinity) of a convergent-at-the-
bodies integral. (F2) is checked in the tests: it solves Delta_{y1} K_L = -4 pi y1_<L>/r12
(and the same in y2), and its value agrees with direct numerical finite-part quadrature.

The current moment needs eps_{ab<i_l} int xhat_{L-1>a} Sigma_b^field. Writing K_L as the
probe polynomial K(k) = -(2 pi/(l+1)) r12 G(u1, u2), u_A = y_A.k,
G = sum_p u1^(l-p) u2^p, and applying the derivative operators analytically, the result is
a multiple of the Newtonian structure eps_{ab<i_l} x_{L-1>a} v_b in the centre-of-mass frame,
with a coefficient computed here exactly for every l. Traces inside K_L are dropped: they
give delta_{i_j i_k} or eps_{i_j b i_l}, both removed by the final STF projection.
"""

from __future__ import annotations

from functools import lru_cache

from ..exact import ExactPolynomial, engine_symbols
from ..lazy_sympy import sp

__all__ = ["kernel_coefficient_polynomial", "field_current_coefficient", "field_current_term"]


def kernel_coefficient_polynomial(l: int):
    """G(u1, u2) = sum_{p=0}^{l} u1^(l-p) u2^p, the probe polynomial of (F2) without
    its prefactor -(2 pi/(l+1)) r12 (traces dropped); sympy, in the symbols u1, u2."""
    if not isinstance(l, int) or l < 0:
        raise ValueError(f"rank l must be a non-negative integer, got {l!r}")
    u1, u2 = sp.symbols("u1 u2")
    return sp.Add(*[u1**(l - p) * u2**p for p in range(l + 1)])


@lru_cache(maxsize=None)
def field_current_coefficient(l: int):
    """Coefficient C_l of eps_{ab<i_l} x_{L-1>a} v_b in the field part of the 1PN J_L (sympy).

    Parameters
    ----------
    l:
        Multipole order, l >= 1.

    Returns
    -------
    sympy.Expr
        C_l in terms of G, m, nu, delta, r, c: the field (non-compact) contribution to J_L is
        C_l eps_{ab<i_l} x_{L-1>a} v_b (centre-of-mass frame, Newtonian positions
        y1 = X2 x, y2 = -X1 x inside this already-1PN term). The engine form (the coefficient of
        1/c^2) is :func:`field_current_term`.

    **Conventions**: X1 = m1/m = (1 + delta)/2, X2 = (1 - delta)/2, x = y1 - y2.

    Example
    -------
    >>> from stfalgebra.moments.field_integrals import field_current_coefficient
    >>> field_current_coefficient(2)
    -G*delta*m**2*nu*(7*nu - 2)/(2*c**2*r)

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014): the current source moment and the pseudo-tensor
    tau^{mu nu}; the finite-part integral (F2) (derived and tested here).
    """
    import sympy as sp

    from ..symbols import c

    return sp.factor(field_current_term(l).to_sympy() / c**2)


@lru_cache(maxsize=None)
def field_current_term(l: int) -> ExactPolynomial:
    """The coefficient of 1/c^2 of :func:`field_current_coefficient`, an engine polynomial.

    Example
    -------
    >>> field_current_term(2)
    nu*delta*G*m**2*r**(-1) - 7*nu**2*delta*G*m**2*r**(-1)/2
    """
    if isinstance(l, bool) or not isinstance(l, int) or l < 1:
        raise ValueError(f"current moments need l >= 1, got {l!r}")
    delta = ExactPolynomial("delta")
    X1, X2 = (1 + delta) / 2, (1 - delta) / 2

    def derivative_at_cm(i: int, j: int) -> ExactPolynomial:
        """d^(i+j) G/du1^i du2^j at (u1, u2) = (X2, -X1), i.e. at the centre-of-mass
        positions with x.k = 1 (G is homogeneous: the U-dependence is U^(l-i-j))."""
        total = ExactPolynomial(0)
        for p in range(l + 1):
            a, b = l - p, p
            if a < i or b < j:
                continue
            total = total + X2 ** (a - i) * (-X1) ** (b - j) * (_falling(a, i) * _falling(b, j))
        return total

    d1, d2 = derivative_at_cm(1, 0), derivative_at_cm(0, 1)
    d11, d12, d22 = derivative_at_cm(2, 0), derivative_at_cm(1, 1), derivative_at_cm(0, 2)
    # W_b = (v1 + v2)_b A + n_b B with (see the module docstring for the operator algebra)
    #   A = (7/4) G/r12 + (n.k)(G_1 - G_2),
    #   B = (1/4)((v1 + v2).n) G/r12 + (v1.k)(G_2 + 3/4 G_1) - (v2.k)(G_1 + 3/4 G_2);
    # then eps_{abi} k_i d/dk_a W_b = ((v1+v2) x k).grad A + (n x k).grad B, evaluated with
    # (v x k).x = ell.k, (v x k).n = ell.k/r, (n x k).v = -ell.k/r, y1 = X2 x, y2 = -X1 x,
    # n.k = x.k/r; with x.k = 1 every term is (1/r) times a polynomial in delta.
    # Term from A (v1 + v2 = -delta v):
    seven_quarters = ExactPolynomial(7) / 4
    A_u1 = seven_quarters * d1 + (d11 - d12)
    A_u2 = seven_quarters * d2 + (d12 - d22)
    A_nk = d1 - d2
    term_a = -delta * (X2 * A_u1 - X1 * A_u2 + A_nk)
    # Term from B (v1 = X2 v, v2 = -X1 v; (n x k).v1 = -X2 ell.k/r, (n x k).v2 = X1 ell.k/r):
    B_v1 = d2 + d1 * 3 / 4
    B_v2 = -(d1 + d2 * 3 / 4)
    term_b = -X2 * B_v1 + X1 * B_v2
    # prefactor: (G m1 m2/(pi c^2)) * (-2 pi/(l+1)) * (1/l), with m1 m2 = nu m^2, r12 = r
    # (the r12 of (F2) is inside the operator algebra above).
    s = engine_symbols()
    return -2 * s.G * s.nu * s.m**2 * s.r**-1 * (term_a + term_b) / (l * (l + 1))


def _falling(n: int, k: int) -> int:
    """Falling factorial n (n - 1) ... (n - k + 1)."""
    result = 1
    for j in range(k):
        result *= n - j
    return result
