"""Towards the 2PN current moments J_L of two point masses: the reduction and its verified parts.

**General formula.** The source current moment of a post-Newtonian source (Blanchet, Living
Rev. Relativ. 17, 2 (2014), Sec. 3, the J_L of the general theorem with the z-integral of
delta_l; quoted from memory, equation number not checked) is

    J_L = FP int d^3x int dz eps_{ab<i_l} { delta_l xhat_{L-1>a} Sigma_b
          - (2l+1)/(c^2 (l+2)(2l+3)) delta_{l+1} xhat_{L-1>ac} d_t Sigma_bc },               (J1)

    int dz delta_l(z) F(t + z|x|/c) = F + |x|^2 d_t^2 F/(2 c^2 (2l+3))
                                      + |x|^4 d_t^4 F/(8 c^4 (2l+3)(2l+5)) + ...,

Sigma_b = tau^0b/c, Sigma_bc = tau^bc. At relative 2PN: Sigma_b through relative 2PN,
Sigma_bc through 1PN, the z-expansion through |x|^4/c^4.

**Probe form.** For a null probe k (k.k = 0) the STF projection is free and

    J_L k_L = FP int (k.x)^(l-1) k.(x cross Sigma) + (retardations) + (Sigma_bc term),         (J2)

because eps_{abc} k_c xhat_{aL-1} k_{L-1} = (1/l) eps_{abc} k_c d/dk_a (xhat_L k_L), and the
trace terms of xhat_L k_L differ from (k.x)^l by k.k times a polynomial whose k-gradient is
along k on the cone. Hence an integral FP int (k.x)^(l-1) x_a F_b with F_b = D_b[f] (D_b a
derivative operator in the body positions and velocities) is (1/l) eps_{abc} k_c d/dk_a D_b
P(k), P(k) = FP int (k.x)^l f on the cone with any off-cone extension:
:func:`stfalgebra.moments.invariants.probe_curl` turns it into triple products [p, w, k],
which on the centre-of-mass orbit are multiples of ell.k (ell = x cross v):
[y_A, v_B, k] = s_A s_B ell.k at Newtonian order (y_A = s_A x, v_A = s_A v).

**Sources at 2PN** (Sigma_i from (L2)-(L3) of :mod:`stfalgebra.moments.pseudo_tensor`,
|g| = 1 + 4V/c^2 + (8V^2 + 4W)/c^4):

    Sigma_b = |g| sigma_b + (1/(pi G c^2)) [d_k V (d_b V_k - d_k V_b) + (3/4) d_t V d_b V]
              + Lambda^0b|eps^7 / (16 pi G c^4),
    Sigma_bc = sigma_bc + (1/(4 pi G)) (d_b V d_c V - delta_bc dV.dV/2) + Lambda^bc|eps^6/(16 pi G c^2).

With the Poisson equations of V, V_i, R_i (N2) the 1PN part is a Laplacian plus a compact
term: Sigma_b = sigma_b - Delta(R_b + U U_b)/(2 pi G c^2) + O(c^-4) (derived here; the
Laplacian of U U_b has no r^(-l-1) n_<L> part at infinity). In the Sigma_bc term the delta_bc
parts drop out of eps_{ab<i_l} xhat_{L-1>ac}, and so does the Newtonian field stress
d_b U d_c U with 1PN weights (it is built from y1, y2, collinear in the centre-of-mass frame
through 1PN).

**Cubic part.** The G^3 terms of Lambda^0b|eps^7/(16 pi G) without W reduce, with the Poisson
equations (N2) (an identity checked in the tests), to

    (1/(pi G)) [ 2 d_k U (d_b R_k - d_k R_b) + 2 U d_k U (d_b U_k - d_k U_b) + 3 U d_t U d_b U
                 - (3/2) U_b dU.dU + U_k d_k U d_b U ]
    = (1/(pi G)) [ 2 d_k U d_b R_k - Delta(U R_b + U^2 U_b/2) + (3/2) U d_t U d_b U
                   - (1/2) U_b dU.dU + U_k d_k U d_b U ] - 6 U^2 sigma_b - 4 R_b sigma,        (J4)

with R = R^C + R^nc of (N5); the compact terms need the Hadamard value (R_b)_A of the
non-compact R^nc at the bodies, the Laplacian its surface term at infinity.

**What this module has today.** The reduction above ((J2), (J4)); the pair-operator route (J2)
for the quadratic (G^2 m1 m2) terms, which re-derives the 1PN field term of
:mod:`stfalgebra.moments.field_integrals` independently (:func:`one_pn_field_term`); the kernel
Z_l = FP int |x|^2 (k.x)^l/(r1 r2) of the |x|^2 d_t^2 Sigma_b^field term
(:func:`square_pair_kernel`). For the cubic terms: the integrals (P1) of
:mod:`stfalgebra.moments.polynomial_seeds` (polynomial weights, the regulator centred on the
origin, ln r0 kept, poles at the bodies cancelled in sums). In (J2) a vector Sigma_b =
sum_w C_w(x) w_b + (x_b part, which drops out of x cross Sigma) gives
J_L k_L = (1/l) curl {w: FP int (k.x)^l C_w}, each C_w a polynomial in the x.w times r1^a r2^b:
exactly the form (P1) integrates (n_A = (x - y_A)/r_A, n_A.v_B = (x.v_B - y_A.v_B)/r_A).
The poles at the bodies cancel only after the curl (dropping x_b moves a pole onto a
component along y_A, which meets [y_A, y_A, k] = 0): this route reproduces the 1PN field term
(tests of :mod:`stfalgebra.moments.polynomial_seeds`).

**The steps of J_L at 2PN**, all done (``current_moment(l, pn_order=2)`` is served and the table
row of the 2PN current moments is derived; the published circular (2,1) mode at relative 2PN
and J_ij at 2PN are checked in tests/radiative/test_current_modes_two_pn.py). Items 1 and 3 are done in
:mod:`stfalgebra.moments.current_two_pn_quadratic` (with the assembly
``current_moment_two_pn``; l = 1 checked through G^1 against the 2PN angular momentum):

1. the quadratic c^-4 terms, assembled and put on the orbit: the G^2 terms of
   Lambda^0b|eps^7 (with the compact W^C_ij), the 1PN weights and retardations (d_t^2 X,
   d_t^2 X_i: seeds r1/r2, r2/r1) of V and V_i inside the eps^5 term, the 1PN centre-of-mass
   relations and orbit inside the 1PN field term, the |x|^2 term (through Z_l), the
   Sigma_bc field terms at 1PN (Lambda^ij|eps^6 and the retardation of V in d_b V d_c V);
2. the cubic (G^3) terms, including the g = ln(r1 + r2 + r12) volume terms (the cross part of
   R^nc in 2 d_k U d_b R_k, and the cross part of W^nc in the pointwise W terms of
   Lambda^0b|eps^7, whose integrands keep powers of 1/(r1 + r2 + r12): integrated exactly in
   :mod:`stfalgebra.moments.current_two_pn_g_volume`). Done in
   :mod:`stfalgebra.moments.current_two_pn_cubic` (:func:`~stfalgebra.moments.
   current_two_pn_cubic.cubic_field_term`): the last three products of (J4), 2 d_k U d_b R_k
   with R^C and the self part of R^nc, the surface term at infinity (zero for every l), the
   W^nc self terms and the delta parts of the W^nc terms; the integrands singular beyond
   r_A^-3 with the Hadamard partie finie of :mod:`stfalgebra.moments.partie_finie` (no
   regularisation constant survives on the orbit);
3. the compact terms with the 2PN centre-of-mass relations and the 2PN weights of sigma_b;
4. the checks: l = 1 equals the 2PN angular momentum at every order in G, J_ij the published
   2PN current quadrupole, the circular (2,1) and (3,2) modes the published ones at relative
   2PN (tests of current_two_pn_g_volume and tests/radiative/test_current_modes_two_pn.py); the
   g-volume terms agree with numerical quadrature of the explicit potentials at l = 1, 2.

**Conventions**: null probe k; ell = x cross v; harmonic coordinates; centre-of-mass frame.

References
----------
L. Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 3 (source moments), Sec. 5 (potentials);
T. Damour & B. R. Iyer, Ann. Inst. H. Poincare 54, 115 (1991) (1PN current moment).
"""

from __future__ import annotations

from functools import lru_cache

import sympy as sp

from ..symbols import G, delta
from . import invariants as inv
from . import orbit_polynomials as op
from .finite_part import RA, RB, R12, U1, U2, two_centre_integral
from . import flint_rings as fr
from .mass_two_pn import _on_newtonian_orbit_flint, _pair_kernel_raw

__all__ = ["curl_on_newtonian_orbit", "one_pn_field_term", "seed_in_invariants", "square_pair_kernel"]

_X1 = (1 + delta) / 2
_X2 = (1 - delta) / 2


def curl_on_newtonian_orbit(curl: dict) -> object:
    """A :func:`~stfalgebra.moments.invariants.probe_curl` result on the Newtonian
    centre-of-mass orbit, as the ring element (of :mod:`stfalgebra.moments.orbit_polynomials`)
    multiplying ell.k.

    [y_A, v_B, k] = s_A s_B ell.k with s_1 = X2, s_2 = -X1; [y1, y2, k] = [v1, v2, k] = 0
    (collinear vectors).

    Example
    -------
    >>> curl_on_newtonian_orbit({("y1", "v1"): inv.RING(1)})
    1/4*delta**2 - 1/2*delta + 1/4
    """
    total = fr.ORBIT.constant(0)
    for (p, w), coefficient in curl.items():
        weight = _triple_weight(p, w)
        if weight is None:
            continue
        total += weight * _on_newtonian_orbit_flint(fr.invariant_from_sympy(coefficient))
    return fr.orbit_to_sympy(total)


@lru_cache(maxsize=None)
def _triple_weight(p: str, w: str):
    """[p, w, k]/ell.k on the Newtonian orbit as a flint orbit-ring element (None for
    collinear p, w)."""
    factors = {"y1": _X2, "y2": -_X1, "v1": _X2, "v2": -_X1}
    kinds = {"y1": "x", "y2": "x", "v1": "v", "v2": "v"}
    if kinds[p] == kinds[w]:
        return None
    sign = 1 if kinds[p] == "x" else -1
    return fr.orbit_from_sympy(op.from_expression(sp.expand(sign * factors[p] * factors[w])))


def _field_operator(f):
    """D_b f for the cross terms of (1/(pi G)) [d_k U (d_b U_k - d_k U_b) + (3/4) d_t U d_b U]
    divided by G^2 m1 m2/(pi G), f a function of the bodies (d_x = -d_{y_A} on 1/r_A,
    d_t(1/r_A) = (v_A . d_A)(1/r_A)):
    D_b = [(v2 - 3/4 v1).d_1] d_2b + [(v1 - 3/4 v2).d_2] d_1b - (v1 + v2)_b (d_1 . d_2)."""
    d = inv.directional_derivative
    along_one = d(f, "v2", "y1") - sp.Rational(3, 4) * d(f, "v1", "y1")
    along_two = d(f, "v1", "y2") - sp.Rational(3, 4) * d(f, "v2", "y2")
    form: dict = {}
    for part in (inv.gradient(along_one, "y2"), inv.gradient(along_two, "y1")):
        for vector, coefficient in part.items():
            form[vector] = form.get(vector, inv.RING(0)) + coefficient
    mixed = inv.mixed_laplacian(f, "y1", "y2")
    for velocity in ("v1", "v2"):
        form[velocity] = form.get(velocity, inv.RING(0)) - mixed
    return form


@lru_cache(maxsize=None)
def one_pn_field_term(l: int) -> object:
    """The field (non-compact) part of the 1PN J_L by the pair-operator route (J2).

    Returns the coefficient of (k.x)^(l-1) ell.k / c^2 (a ring element of
    :mod:`stfalgebra.moments.orbit_polynomials` times kx^(l-1)), Newtonian centre-of-mass
    orbit: (G m1 m2/pi) (1/l) curl D_b K_l, K_l = -(2 pi/(l+1)) r12 sum_p (k.y1)^(l-p) (k.y2)^p
    (the kernel (F2) of :mod:`stfalgebra.moments.field_integrals`).

    Example
    -------
    >>> from stfalgebra.symbols import r
    >>> sp.factor(one_pn_field_term(1).as_expr().subs(sp.Symbol("ir", positive=True), 1 / r))
    7*G*m**2*nu**2/r
    """
    if isinstance(l, bool) or not isinstance(l, int) or l < 1:
        raise ValueError(f"current moments need l >= 1, got {l!r}")
    kernel = _pair_kernel_raw(l)
    curl = inv.probe_curl(_field_operator(kernel))
    from ..symbols import m, nu
    prefactor = op.from_expression(G * nu * m**2) * sp.Rational(-2, l * (l + 1))
    return op.reduce_mass_difference(prefactor * curl_on_newtonian_orbit(curl))


def seed_in_invariants(polynomial: sp.Expr) -> object:
    """A :mod:`stfalgebra.moments.finite_part` result (pi times a polynomial in U1, U2 and
    powers of R12) divided by pi, as an element of the invariants ring (U_A -> k.y_A).

    Example
    -------
    >>> seed_in_invariants(-sp.pi * R12 * (U1 + U2))
    -ky1*r12 - ky2*r12
    """
    reduced = sp.expand(polynomial / sp.pi)
    if reduced.has(sp.pi):
        raise ValueError(f"not pi times a polynomial: {polynomial}")
    total = inv.RING(0)
    for term in sp.Add.make_args(reduced):
        powers = term.as_powers_dict()
        a, b, n = (int(powers.get(symbol, 0)) for symbol in (U1, U2, R12))
        coefficient = sp.Rational(term / (U1**a * U2**b * R12**n))
        radial = inv.R12**n if n >= 0 else inv.INV_R12**(-n)
        total += inv.RING(coefficient) * inv.dot("k", "y1")**a * inv.dot("k", "y2")**b * radial
    return total


@lru_cache(maxsize=None)
def square_pair_kernel(l: int) -> object:
    """Z_l = FP int d^3x |x|^2 (k.x)^l/(r1 r2) / pi for a null k, an invariants-ring element.

    Derivation (exact identities under the integral): |x|^2 = (r1^2 + r2^2 - r12^2)/2
    + x.(y1 + y2) - y1.y2, and for any vector w
    (w.x)(k.x)^l = xhat_{aL} w_a k_L + (l/(2l+1)) (k.w) |x|^2 (k.x)^(l-1) (its harmonic part:
    the Laplacian of the difference vanishes), with xhat_{aL} w_a k_L = (w.d_k) xhat_{L+1}
    k_{L+1}/(l+1). Hence the recursion

        Z_l = FP int [(r1^2 + r2^2 - r12^2)/2 - y1.y2] (k.x)^l/(r1 r2)
              + (w.d_k) H[K_{l+1}]/(l+1) + (l/(2l+1)) (k.w) Z_{l-1},   w = y1 + y2,          (Z1)

    with the seeds of :mod:`stfalgebra.moments.finite_part` (a + b even: no regulator-centre
    term) and the pair kernel K (F2) (H the harmonic extension, see
    :func:`stfalgebra.moments.invariants.harmonic_gradient_along`). Tested against its Poisson
    equation Delta_{y1} Z_l = -4 pi |y1|^2 (k.y1)^l/r12, numerical finite-part quadrature and a
    second split of |x|^2.

    Example
    -------
    >>> square_pair_kernel(0)
    -y1y1*r12 - y2y2*r12 + 2/3*r12**3
    """
    if isinstance(l, bool) or not isinstance(l, int) or l < 0:
        raise ValueError(f"rank l must be a non-negative integer, got {l!r}")
    distances = seed_in_invariants(two_centre_integral(l, (RA**2 + RB**2 - R12**2) / (2 * RA * RB)))
    pair = seed_in_invariants(two_centre_integral(l, 1 / (RA * RB)))
    following = seed_in_invariants(two_centre_integral(l + 1, 1 / (RA * RB)))
    total = distances - inv.dot("y1", "y2") * pair
    for body in ("y1", "y2"):
        total += inv.harmonic_gradient_along(following, l + 1, body) * sp.Rational(1, l + 1)
    if l:
        total += (inv.dot("k", "y1") + inv.dot("k", "y2")) * square_pair_kernel(l - 1) * sp.Rational(l, 2 * l + 1)
    return inv.on_null_cone(total)
