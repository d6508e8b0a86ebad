"""The 2.5PN (radiation-reaction, odd) terms of the two-body current moments J_L, for every l.

**Formula.** The general source current moment (Blanchet, Living Rev. Relativ. 9, 4 (2006),
eq. (86); (C1) of :mod:`stfalgebra.moments.current` without truncation) is
J_L = FP int eps_{ab<i_l} int dz { delta_l xhat_{L-1>a} Sigma_b
- (2l+1)/(c^2 (l+2)(2l+3)) delta_{l+1} xhat_{L-1>ac} d_t Sigma_bc }; its z-expansion is even in
1/c, so the terms of relative order c^-5 come from the odd part of Sigma_b at c^-5 (Sigma_bc has
none at c^-3) and from the 2.5PN centre-of-mass shift. With the odd near-zone constants V_3 and
W1_ij of :mod:`stfalgebra.moments.mass_reaction` ((R1), (R2) there) in Sigma_b = tau^0b/c,
tau^0b = |g| T^0b + (c^4/(16 pi G)) Lambda^0b, Lambda^0b at c^-7 from (L3) of
:mod:`stfalgebra.moments.pseudo_tensor` (its W terms: -16 W_kl d_kl V_b + 8 W Delta V_b
+ 16 d_k V d_t W_bk; the others differentiate W in space), and the point-mass weight as for I_L:

    Sigma_b^odd c^5 = 3 V_3 sigma_b - W1_kl d_kl U_b/(pi G) + d_k U dW1_bk/dt/(pi G)            (Q1)

(the W1_kk sigma_b terms cancel as in Sigma; the odd V_3 enters d_t V d_b V of Lambda^0b at c^-5
only through a gradient, and V_i's c^-3 term through its curl, which vanishes: both drop out of
eps_{ab<i_l}). With the finite-part integrals (R4) of :mod:`stfalgebra.moments.mass_reaction`
(and FP int xhat_K d_k(1/|x - y|) = (2 pi/(2k+3)) d_k(y^2 yhat_K)), for a null probe k,
n = l - 1 and f = y^2 (k.y)^n y_a (the trace terms of yhat_{L-1 a} are along k_a and drop out):

    k_L J_L|_c^-5 = sum_A m_A eps_abc k_c { 3 V_3 (k.y)^n y_a v_b
                    + (2/(2l+3)) [ v_b W1_kl d_kl f_a + dW1_bk/dt d_k f_a ] }_A
                    + (l - 1) sum_A m_A (k.s)(k.y_A)^(l-2) k.(y_A x v_A),                       (Q2)

s = nu delta Q_2.5 v the cited common shift of the centre-of-mass relations (its rate ds/dt
adds nothing: y_A x ds/dt is along x x a = 0 and dQ_2.5/dt = 0 on the Newtonian orbit).

Checks (tests): (Q2) by a second route with explicit Cartesian vectors; l = 2 through the (2,1)
mode at relative 2.5PN (with the reaction in the derivatives, the tails and the quadratic terms of
V_ij, the x^3 term of Blanchet, Faye, Iyer & Sinha 2008, from memory, the 2PN J_ij stood in by the
1PN one: tests/radiative/test_circular_reaction.py); l = 1 by the balance law of the source
dipole. The l = 1 term, -(24/5) nu^2 m (G m)^2 rdot/r^2 ell, is the source current dipole: its rate
along the 2.5PN motion equals the finite-part surface flux at infinity of the exterior near-zone
field (d_t Sigma_b = -d_j Sigma_bj; the odd potentials in Lambda^ij), computed without any particle
integral. The 2.5PN angular momentum of the equations of motion (cited, -(8/5)) is another quantity,
the one whose rate is exactly minus the flux -(2 G/5) eps I^(2) I^(3); the two differ by
(8 G/(15 c^5)) eps_iab I^(1)_ac I^(3)_bc, a rate of a quadrupole-quadrupole product that the
source dipole's balance holds.

**Conventions**: harmonic coordinates, centre-of-mass frame; J_L = sum s_ab x_<A v_B ell>,
ell = x cross v (:func:`stfalgebra.moments.current.current_moment`); eps = 1/c.

References
----------
L. Blanchet, Living Rev. Relativ. 9, 4 (2006), eq. (86) (from memory); module docstrings of
:mod:`stfalgebra.moments.mass_reaction` and :mod:`stfalgebra.moments.pseudo_tensor`.
"""

from __future__ import annotations

from functools import lru_cache

import sympy as sp

from ..orders import PNOrder
from ..symbols import delta, m, nu, phidot, r, rdot
from ..symbols import eps as EPS
from . import orbit_polynomials as op
from .mass_reaction import _cited_shift_factor, _normal, pair_tensor_derivative, reaction_field_constants
from .orbit_tensor import PLANAR_BASIS, OrbitTensor
from .reaction_provenance import REACTION_CURRENT_SOURCE

__all__ = ["REACTION_CURRENT_SOURCE", "reaction_current_moment"]


_X1 = (1 + delta) / 2
_X2 = (1 - delta) / 2


def _ring(expression):
    return op.from_expression(expression)


@lru_cache(maxsize=None)
def _generating_polynomial(l: int):
    """The coefficient of k.ell in (Q2), a ring element in kx, kv of degree l - 1, times eps^5."""
    constants = reaction_field_constants()
    v3 = constants["V3"]
    alpha, beta, gamma, d = constants["W1"]
    _, beta_dot, gamma_dot, _ = pair_tensor_derivative(constants["W1"])
    kx, kv = _ring(op.KX), _ring(op.KV)
    radius2, radial = _ring(r**2), _ring(r * rdot)
    v2 = _ring(rdot**2 + r**2 * phidot**2)
    trace = alpha * radius2 + 2 * beta * radial + gamma * v2 + 3 * d
    k_w_k = alpha * kx**2 + 2 * beta * kx * kv + gamma * kv**2
    k_w_x = alpha * kx * radius2 + beta * (kx * radial + kv * radius2) + gamma * kv * radial + d * kx
    along_x = alpha * radius2 + beta * radial + d            # W1.x = along_x x + (...) v
    k_w_along_x = alpha * kx + beta * kv                       # W1.k = k_w_along_x x + (...) v + d k
    dot_along_v = beta_dot * radius2 + gamma_dot * radial      # dW1/dt.x = (...) x + dot_along_v v
    dot_k_along_v = beta_dot * kx + gamma_dot * kv             # dW1/dt.k = (...) x + dot_k_along_v v + d' k
    shift_q = _cited_shift_factor()
    n = l - 1
    scale = sp.Rational(2, 2 * l + 3)
    total = op.RING(0)
    for mass, fraction in ((m * _X1, _X2), (m * _X2, -_X1)):
        f = _ring(fraction)
        ky = f * kx

        def power(k):
            return ky**k if k >= 0 else op.RING(0)

        f2 = f**2
        piece = 3 * v3 * f2 * power(n)
        field = f2 * (2 * trace * power(n) + 4 * n * f * k_w_x * power(n - 1)
                      + n * (n - 1) * f2 * radius2 * k_w_k * power(n - 2))
        field += 4 * power(n) * f2 * along_x + 2 * n * f2 * radius2 * power(n - 1) * f * k_w_along_x
        field += 2 * power(n) * f2 * dot_along_v + n * f2 * radius2 * power(n - 1) * f * dot_k_along_v
        piece += scale * field
        if l >= 2:
            piece += (l - 1) * _ring(nu * delta) * shift_q * kv * power(l - 2) * f2
        total += _ring(mass) * piece
    return _normal(total * _ring(EPS**5))


@lru_cache(maxsize=None)
def reaction_current_moment(l: int) -> OrbitTensor:
    """The 2.5PN term of J_L of two point masses on a general orbit (centre-of-mass frame).

    Parameters
    ----------
    l:
        Multipole order, l >= 1.

    Returns
    -------
    OrbitTensor
        Rank l, terms x_<A v_B ell> (c = 1), the single order 5/2 (eps = 1/c): (Q2) on the
        Newtonian orbit.

    **Conventions**: module docstring.

    Example
    -------
    >>> sorted(reaction_current_moment(2).terms)
    [(0, 1, 1), (1, 0, 1)]
    """
    if isinstance(l, bool) or not isinstance(l, int):
        raise TypeError(f"multipole order l must be an int, got {l!r}")
    if l < 1:
        raise ValueError(f"current moments start at l = 1, got {l}")
    flat = op.to_tensor(l - 1, _generating_polynomial(l), PNOrder(5, 2))
    terms = {(a, b, 1): series for (a, b, _), series in flat.terms.items()}
    return OrbitTensor._trusted(l, terms, PLANAR_BASIS).with_provenance(REACTION_CURRENT_SOURCE)
