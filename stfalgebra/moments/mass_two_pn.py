"""The 2PN mass moments I_L of two point masses, for every l.

**General formula.** The source mass moment of a post-Newtonian source (Blanchet, Living Rev.
Relativ. 9, 4 (2006), Theorem 6, eqs. (85) and (87), with the z-integral expansion (91); the
same in Living Rev. Relativ. 17, 2 (2014), Sec. 3; formulas quoted from memory, equation numbers
read from the 2006 review's text) is

    I_L = FP int d^3x int_{-1}^{1} dz { delta_l xhat_L Sigma
          - 4(2l+1)/(c^2 (l+1)(2l+3)) delta_{l+1} xhat_{iL} d_t Sigma_i
          + 2(2l+1)/(c^4 (l+1)(l+2)(2l+5)) delta_{l+2} xhat_{ijL} d_t^2 Sigma_ij }(x, t + z|x|/c),   (I1)

    int dz delta_l(z) F(t + z|x|/c) = sum_k (2l+1)!!/((2k)!! (2l+2k+1)!!) (|x|/c)^(2k) d_t^(2k) F,

with Sigma = (tau^00 + tau^ii)/c^2, Sigma_i = tau^0i/c, Sigma_ij = tau^ij, tau = |g| T +
(c^4/(16 pi G)) Lambda. At 2PN Sigma is needed at relative 2PN, Sigma_i at 1PN, Sigma_ij at
Newtonian order.

**The pseudo-tensor at 2PN.** With the metric (N1) of :mod:`stfalgebra.moments.near_zone` in
Lambda^{ab} (:mod:`stfalgebra.moments.pseudo_tensor`, derived there with sympy and tested):

    Sigma = |g| sigma - d_k V d_k V/(pi G c^2) + (1/(pi G c^4)) [ -(7/2) V d_k V d_k V - V d_t^2 V
            - 2 V_i d_t d_i V - W_ij d_ij V + (1/2) W Delta V - d_k V d_k W
            + 2 d_i V_j d_j V_i - (1/2) (d_t V)^2 ],   |g| = 1 + 4V/c^2 + (8V^2 + 4W)/c^4,       (I2)
    Sigma_i = (1 + 4V/c^2) sigma_i + (1/(pi G c^2)) [d_k V (d_i V_k - d_k V_i) + (3/4) d_t V d_i V],
    Sigma_ij = sigma_ij + (1/(4 pi G)) (d_i V d_j V - delta_ij d_k V d_k V/2).

**Reduction** (derived here; every step is an identity between distributions, products with
the point-mass deltas being Hadamard partie-finie values). With Box V = -4 pi G sigma,
Delta W = 8 pi G sigma_kk - d_k U d_k U, and V = U + O(c^-2) inside the c^-4 bracket:
4 V sigma - d V d V/(pi G) = -Delta(V^2)/(2 pi G) + V d_t^2 V/(pi G c^2);
-d U.d W = -Delta(U W)/2 + 4 pi G U sigma_kk - U dU.dU/2 - 2 pi G W sigma;
U dU.dU = Delta(U^3)/6 + 2 pi G sigma U^2. The W sigma and U^2 sigma terms cancel, and

    Sigma = sigma + 4 sigma_kk U/c^4 - Delta(V^2)/(2 pi G c^2) - Delta((2/3) U^3 + U W/2)/(pi G c^4)
            + (1/(pi G c^4)) [ -W_ij d_ij U - 2 U_i d_t d_i U + 2 d_i U_j d_j U_i - (d_t U)^2/2 ].   (I3)

FP int xhat_L Delta F is the surface term at infinity, -(2l+1) times the projection on n_<L> of
the r^(-l-1) coefficient of F; for F = V^2, U^3, U W it vanishes (that coefficient has angular
degree < l, or the wrong parity). In the |x|^2 term, FP int |x|^2 xhat_L Delta(U^2) =
2(2l+3) FP int xhat_L U^2 (no pole: parity). Hence, with sigma, sigma_i, sigma_ij of the matter
only (point masses with the Hadamard-regularised metric at the particles),

    I_L = FP int d^3x { xhat_L [sigma + 4 sigma_kk U/c^4] + |x|^2 xhat_L d_t^2 sigma/(2 c^2 (2l+3))
          + |x|^4 xhat_L d_t^4 sigma/(8 c^4 (2l+3)(2l+5))
          - 4(2l+1)/(c^2 (l+1)(2l+3)) xhat_iL d_t Sigma_i - 2(2l+1)/(c^4 (l+1)(2l+3)(2l+5)) |x|^2 xhat_iL d_t^3 sigma_i
          + 2(2l+1)/(c^4 (l+1)(l+2)(2l+5)) xhat_ijL d_t^2 [sigma_ij + d_i U d_j U/(4 pi G)]
          + (1/(pi G c^4)) xhat_L [ -W_ij d_ij U - 2 U_i d_t d_i U + 2 d_i U_j d_j U_i
                                    - (1/2)(d_t U)^2 - (1/2) d_t^2 (U^2) ] }.             (I4)

(The same structure as Blanchet, Phys. Rev. D 51, 2559 (1995), 2PN mass moment; there W_ij is
split as P_ij plus a trace.) Second derivatives of U are distributional (d_ij(1/r) carries
-(4 pi/3) delta_ij delta), as Box V = -4 pi G sigma requires.

**Two point masses.** sigma = sum_A mu_A (1 + v_A^2/c^2) delta_A with
mu_A = m_A / [sqrt(-g) sqrt(-g_ab v^a v^b/c^2)]_A, sqrt(-g) = 1 + 2V/c^2 + 2(V^2 + W)/c^4,
-g_ab v^a v^b/c^2 = 1 - 2V/c^2 + 2V^2/c^4 + 8 V_i v^i/c^4 - v^2 (1 + 2V/c^2)/c^2 (the point-mass
T^ab; common practice), at the particles through the values (N4). The non-compact terms:

* quadratic (G^2 m1 m2): each is a derivative with respect to the body positions of
  1/(r1 r2) (d/dx of 1/r_A = -d/dy_A; d_t of 1/r_A = v_A.d_A), integrated with the kernel
  K_L = FP int xhat_L/(r1 r2) = -(2 pi/(l+1)) r12 sum_p y1^<L-P y2^P> (the (F2) of
  :mod:`stfalgebra.moments.field_integrals`); free indices on xhat_iL, xhat_ijL through the
  harmonic extension (:mod:`stfalgebra.moments.invariants`);
* cubic (G^3 m1^2 m2 and 1 <-> 2) from -W^nc_ij d_ij U: with the non-compact W (N3),
  d_ij(1/r1) d_{1i} d_{2j} g is a *rational* function of r1, r2, r12 (the g's cancel; derived
  in the tests):
      T_g = [3 r1^3 r2 - 3 r1^2 r2^2 - r1^2 r12^2 - 3 r1 r2^3 + 5 r1 r2 r12^2 - 2 r1 r12^3
             + 3 r2^4 - 6 r2^2 r12^2 + 3 r12^4] / (4 r1^5 r2 r12^3),                          (I5)
  and (delta_ij - n1_i n1_j)/(4 r1^2) d_ij(1/r2) = (1 - 3 (n1.n2)^2)/(4 r1^2 r2^3); so the cubic
  part is a sum of seeds FP int xhat_L r1^a r2^b (:mod:`stfalgebra.moments.finite_part`) plus
  the delta parts of d_ij U. The seeds' poles cancel and no regularisation constant remains.

Time derivatives are taken after integration, in the centre-of-mass frame, along the 1PN
orbit for the c^-2 terms and the Newtonian orbit for the c^-4 terms; the leading term uses the
2PN centre-of-mass relations y_A = s_A x + t_A v (:mod:`stfalgebra.binary.centre_of_mass`).

Arithmetic: the moments are computed in the python-flint rings of
:mod:`stfalgebra.moments.flint_rings` (the orbit ring and the invariants ring of
:mod:`~stfalgebra.moments.orbit_polynomials` and :mod:`~stfalgebra.moments.invariants`, same
generators) and the finite parts with the flint class sums of :mod:`stfalgebra.moments.finite_part`;
each l's moment is derived once (cached) and shared by every m.

Accuracy: through relative 2PN, known through relative order 5/2 in the convention of the
conservative inputs: the 2.5PN radiation-reaction terms (in the equations of motion, the
centre-of-mass relations and the moment) are apart: :mod:`stfalgebra.moments.mass_reaction`.

Validation (tests): l = 0 gives m + E/c^2 with E the 1PN conserved energy; l = 1 vanishes in the
centre-of-mass frame (2PN centre-of-mass relations); l = 2 and l = 3 reproduce the published
2PN quadrupole and octupole of circular binaries (Blanchet, Damour & Iyer 1995; Blanchet, Iyer
& Joguet 2002).

References
----------
L. Blanchet, Phys. Rev. D 51, 2559 (1995); L. Blanchet, T. Damour & B. R. Iyer, Phys. Rev. D 51,
5360 (1995); L. Blanchet, Living Rev. Relativ. 9, 4 (2006), eqs. (85), (87), (91).
"""

from __future__ import annotations

from functools import lru_cache

import flint
import sympy as sp

from ..binary.centre_of_mass import centre_of_mass_relations, centre_of_mass_velocity_factors
from ..orders import PNOrder
from ..symbols import G, delta, phidot, r, rdot
from . import flint_rings as fr
from . import invariants as inv
from . import orbit_polynomials as op
from . import finite_part
from .finite_part import RA, RB, R12, U1, U2, two_centre_integral
from .near_zone import regularised_values
from .orbit_tensor import OrbitTensor
from ..symbols import eps as EPS

__all__ = ["mass_moment_two_pn", "cubic_integral", "quadratic_integrals", "KNOWN_THROUGH"]

#: Relative order through which the 2PN moments are known (the 2.5PN terms: mass_reaction).
KNOWN_THROUGH = PNOrder(5, 2)

_KX, _KV = sp.symbols("kx kv")
_X1 = (1 + delta) / 2
_X2 = (1 - delta) / 2
_V2 = rdot**2 + r**2 * phidot**2


# ---------------------------------------------------------------- the body invariants on the orbit
@lru_cache(maxsize=None)
def _newtonian_images() -> tuple:
    """Images of the invariants' generators on the Newtonian orbit (ring of
    :mod:`stfalgebra.moments.orbit_polynomials`): y1 = X2 x, y2 = -X1 x, v_A likewise, k.x -> kx,
    k.v -> kv, k.k -> 0, r12 -> r."""
    x1, x2 = op.from_expression(_X1), op.from_expression(_X2)
    factors = {"y1": x2, "y2": -x1, "v1": x2, "v2": -x1}
    kind = {"y1": "x", "y2": "x", "v1": "v", "v2": "v"}
    kx, kv = op.from_expression(_KX), op.from_expression(_KV)
    radius, rate = op.from_expression(r), op.from_expression(rdot)
    table = {("k", "x"): kx, ("k", "v"): kv, ("x", "x"): radius**2, ("v", "x"): radius * rate,
             ("x", "v"): radius * rate, ("v", "v"): op.from_expression(_V2)}
    images = {}
    for i, a in enumerate(inv.VECTORS):
        for b in inv.VECTORS[i:]:
            if a == "k" and b == "k":
                value = op.RING(0)
            elif a == "k":
                value = factors[b] * table[("k", kind[b])]
            else:
                value = factors[a] * factors[b] * table[(kind[a], kind[b])]
            images[str(inv.dot(a, b))] = value
    images["r12"] = radius
    images["ir12"] = op.from_expression(1 / r)
    return tuple(images[str(generator)] for generator in inv.RING.gens)


def _on_newtonian_orbit(f):
    return op.substitute(f, _newtonian_images())


# ---------------------------------------------------------------- non-compact terms
def _pair_kernel_raw(l: int):
    """r12 sum_p (k.y1)^(l-p) (k.y2)^p: K_L = -(2 pi/(l+1)) times this (kernel (F2))."""
    u1, u2 = inv.dot("k", "y1"), inv.dot("k", "y2")
    return inv.R12 * sum((u1**(l - p) * u2**p for p in range(l + 1)), inv.RING(0))


@lru_cache(maxsize=None)
def _newtonian_images_flint() -> tuple:
    """:func:`_newtonian_images` in the flint orbit ring."""
    return tuple(fr.orbit_from_sympy(image) for image in _newtonian_images())


def _on_newtonian_orbit_flint(f):
    return fr.evaluate_at(f, _newtonian_images_flint())


def _pair_kernel_flint(l: int):
    """:func:`_pair_kernel_raw` in the flint invariants ring."""
    u1, u2 = fr.dot("k", "y1"), fr.dot("k", "y2")
    total = fr.INVARIANTS.constant(0)
    for p in range(l + 1):
        total += u1**(l - p) * u2**p
    return fr.R12 * total


@lru_cache(maxsize=None)
def quadratic_integrals(l: int) -> tuple:
    """The quadratic (G^2 m1 m2) non-compact integrals of (I4), on the Newtonian orbit.

    Returns
    -------
    (scalar, square, dipole_source, stress):
        Ring elements of :mod:`stfalgebra.moments.orbit_polynomials` (probe polynomials in
        kx = k.x, kv = k.v), each to be multiplied by pi:

        * ``scalar``: FP int xhat_L [-W^C_ij d_ij U - 2 U_i d_t d_i U + 2 d_i U_j d_j U_i
          - (d_t U)^2/2]_cross / (pi G^2 m1 m2) (W^C the compact part of W_ij);
        * ``square``: FP int xhat_L U^2 / (2 pi G^2 m1 m2) = K_L/pi;
        * ``dipole_source``: FP int xhat_iL [d_k U (d_i U_k - d_k U_i) + (3/4) d_t U d_i U]_cross
          / (pi G^2 m1 m2);
        * ``stress``: FP int xhat_ijL [d_i U d_j U]_cross / (pi G^2 m1 m2).

    Each cross term is an operator in the body positions on 1/(r1 r2), applied to the kernel;
    the body derivatives of the kernel are the distributional ones (the delta parts of d_ij U
    included). (Computed in the flint rings of :mod:`stfalgebra.moments.flint_rings`.)
    """
    return tuple(fr.orbit_to_sympy(value) for value in _quadratic_integrals_flint(l))


@lru_cache(maxsize=None)
def _quadratic_integrals_flint(l: int) -> tuple:
    """:func:`quadratic_integrals` as flint orbit-ring elements."""
    d = fr.directional_derivative
    lap = fr.mixed_laplacian
    kernel = _pair_kernel_flint(l)
    # -W^C_ij d_ij U, W^C_ij = G m_A (v_A^i v_A^j - delta_ij v_A^2)/r_A, d_ij(1/r_B) = d_B d_B
    scalar = -(d(d(kernel, "v1", "y2"), "v1", "y2") - fr.dot("v1", "v1") * lap(kernel, "y2", "y2"))
    scalar -= d(d(kernel, "v2", "y1"), "v2", "y1") - fr.dot("v2", "v2") * lap(kernel, "y1", "y1")
    # -2 U_i d_t d_i U: U_i from A, d_t d_i (1/r_B) = -(v_B.d_B) d_Bi
    scalar += 2 * d(d(kernel, "v1", "y2"), "v2", "y2") + 2 * d(d(kernel, "v2", "y1"), "v1", "y1")
    # 2 d_i U_j d_j U_i: both orderings of the bodies
    scalar += 4 * d(d(kernel, "v2", "y1"), "v1", "y2")
    # -(d_t U)^2/2, cross part
    scalar -= d(d(kernel, "v1", "y1"), "v2", "y2")
    scale = flint.fmpq(-2, l + 1)
    scalar = _on_newtonian_orbit_flint(fr.on_null_cone(scalar)) * scale
    square = _on_newtonian_orbit_flint(kernel) * scale

    n = l + 1
    kernel = _pair_kernel_flint(n)
    dipole = fr.INVARIANTS.constant(0)
    for body, other in (("y1", "y2"), ("y2", "y1")):
        own_velocity, other_velocity = "v" + body[1], "v" + other[1]
        # (v_B.d_A) d_Bi - (3/4)(v_A.d_A) d_Bi, index i on d_B; then -v_B^i (d_A.d_B)
        along_other = d(kernel, other_velocity, body) - flint.fmpq(3, 4) * d(kernel, own_velocity, body)
        dipole += fr.harmonic_divergence(along_other, n, other)
        dipole -= fr.harmonic_gradient_along(lap(kernel, body, other), n, other_velocity)
    dipole_source = _on_newtonian_orbit_flint(dipole) * flint.fmpq(-2, (n + 1) * n)

    n = l + 2
    kernel = _pair_kernel_flint(n)
    stress = 2 * fr.harmonic_double_divergence(kernel, n, "y1", "y2")
    stress = _on_newtonian_orbit_flint(stress) * flint.fmpq(-2, (n + 1) * (l + 1) * (l + 2))
    return scalar, square, dipole_source, stress


#: d_ij(1/r1) d_{1i} d_{2j} g, a rational function (I5) (checked in the tests).
CONTRACTED_G = (3 * RA**3 * RB - 3 * RA**2 * RB**2 - RA**2 * R12**2 - 3 * RA * RB**3
                + 5 * RA * RB * R12**2 - 2 * RA * R12**3 + 3 * RB**4 - 6 * RB**2 * R12**2
                + 3 * R12**4) / (4 * RA**5 * RB * R12**3)


@lru_cache(maxsize=None)
def _cubic_pointwise() -> sp.Expr:
    """The pointwise part of the m1^2 m2 terms of -W^nc_ij d_ij U (:func:`cubic_integral`)."""
    n1n2_squared = (RA**2 + RB**2 - R12**2)**2 / (4 * RA**2 * RB**2)
    return (1 - 3 * n1n2_squared) / (4 * RA**2 * RB**3) + 2 * CONTRACTED_G


@lru_cache(maxsize=None)
def cubic_integral(l: int) -> sp.Expr:
    """FP int xhat_L (-W^nc_ij d_ij U) / G^3, m1^2 m2 part, as a polynomial in U1, U2, R12.

    The m1^2 m2 terms of -W^nc_ij d_ij U (W^nc of (N3)) are
    m1^2 m2 [(delta_ij - n1_i n1_j)/(4 r1^2) d_ij(1/r2) + 2 d_{1(i} d_{2j)} g d_ij(1/r1)] with
    distributional d_ij(1/r_B) = Pf(...) - (4 pi/3) delta_ij delta_B. Pointwise parts:
    (1 - 3 (n1.n2)^2)/(4 r1^2 r2^3) and 2 T_g (I5); delta parts: -(4 pi/3) (1/(2 r12^2)) at y2
    (trace of the m1^2 self part) and -(4 pi/3) 2 (d_1.d_2 g)_1 = +(4 pi/3)/r12^2 at y1
    ((2 d_1.d_2 g)_1 = -1/r12^2, Hadamard value). The m1 m2^2 part is this with 1 <-> 2.

    Example
    -------
    >>> cubic_integral(0)
    -pi/R12**2
    """
    integral = two_centre_integral(l, _cubic_pointwise())
    delta_parts = (sp.Rational(4, 3) * sp.pi * U1**l - sp.Rational(2, 3) * sp.pi * U2**l) / R12**2
    return sp.expand(integral + delta_parts)


# ---------------------------------------------------------------- compact terms
# (computed in the flint orbit ring of :mod:`stfalgebra.moments.flint_rings`)
@lru_cache(maxsize=None)
def _centre_of_mass_data(pn_order: int):
    """Per body: (s, t, p, q) as orbit-ring elements (y_A = s x + t v, v_A = p v + q x)."""
    (s1, t1), (s2, t2) = centre_of_mass_relations(pn_order)
    (p1, q1), (p2, q2) = centre_of_mass_velocity_factors(pn_order)
    return tuple(tuple(fr.orbit_from_series(series) for series in body)
                 for body in ((s1, t1, p1, q1), (s2, t2, p2, q2)))


@lru_cache(maxsize=None)
def _position_factors(pn_order: int):
    """Per body: (s, t) as orbit-ring elements (y_A = s x + t v); the velocity factors of
    :func:`_centre_of_mass_data` are not needed at 2PN."""
    return tuple(tuple(fr.orbit_from_series(series) for series in body)
                 for body in centre_of_mass_relations(pn_order))


_KXF, _KVF = fr.ORBIT_GENS["kx"], fr.ORBIT_GENS["kv"]
_RF, _RDOTF = fr.ORBIT_GENS["r"], fr.ORBIT_GENS["rdot"]
_V2F = _RDOTF**2 + _RF**2 * fr.ORBIT_GENS["phidot"]**2
_E2, _E4 = fr.ORBIT_GENS["eps"]**2, fr.ORBIT_GENS["eps"]**4
_MASSES_F = (fr.ORBIT_GENS["m"] * (1 + fr.ORBIT_GENS["delta"]) / 2,
             fr.ORBIT_GENS["m"] * (1 - fr.ORBIT_GENS["delta"]) / 2)


@lru_cache(maxsize=None)
def _near_zone_values() -> tuple:
    """The regularised values (N4) of :func:`stfalgebra.moments.near_zone.regularised_values`
    (keys V, W, Vi_v1, U) as polynomials in (eps, G, m1, m2, 1/r12, v1v1, v2v2, v1v2, n12v2)."""
    regular = regularised_values(G=G, c=1 / EPS)
    m1s, m2s, r12s, v1v1, v2v2, v1v2, n12v2 = regular["symbols"]
    inverse = sp.Dummy("inverse_r12")
    generators = (EPS, G, m1s, m2s, inverse, v1v1, v2v2, v1v2, n12v2)
    ring = flint.fmpq_mpoly_ctx.get(tuple(f"g{k}" for k in range(len(generators))), "lex")
    out = {}
    for name in ("V", "W", "Vi_v1", "U"):
        polynomial = sp.Poly(sp.expand(regular[name].xreplace({r12s: 1 / inverse})), *generators)
        out[name] = ring.from_dict({monomial: flint.fmpq(int(c.p), int(c.q)) for monomial, c in polynomial.terms()})
    return ring, out


@lru_cache(maxsize=None)
def _body_values(body: int) -> dict:
    """Regularised metric values (N4) at body ``body`` (0 or 1) on the 1PN orbit, orbit-ring
    elements.

    Keys: V (through 1PN), W, Vv = (V_i)_A v_A^i, U (Newtonian), speed = v_A^2 (through 1PN).
    """
    data = _centre_of_mass_data(1)
    own, other = data[body], data[1 - body]

    def speed_squared(factors):
        _, _, p, q = factors
        return fr.truncate(p**2 * _V2F + 2 * p * q * _RF * _RDOTF + q**2 * _RF**2, 2)

    own_speed, other_speed = speed_squared(own), speed_squared(other)
    own_p0, other_p0 = fr.truncate(own[2], 0), fr.truncate(other[2], 0)
    ring, regular = _near_zone_values()
    # images of (eps, G, m1, m2, 1/r12, v1v1, v2v2, v1v2, n12v2)
    common = (fr.ORBIT_GENS["eps"], fr.ORBIT_GENS["G"], _MASSES_F[body], _MASSES_F[1 - body],
              fr.ORBIT_GENS["ir"])
    pair = (own_p0 * other_p0 * _V2F, other_p0 * _RDOTF)

    def value(name, own_v2, other_v2):
        return fr.truncate(regular[name].compose(*common, own_v2, other_v2, *pair, ctx=fr.ORBIT), 4)

    newtonian = (fr.truncate(own_speed, 0), fr.truncate(other_speed, 0))
    return {
        "V": value("V", own_speed, other_speed),
        "W": value("W", *newtonian),
        "Vv": value("Vi_v1", *newtonian),
        "U": value("U", *newtonian),
        "speed": own_speed,
    }


def _stf_with_one_vector(l: int, position, vector, position_dot_vector, position_squared):
    """y^<iL> w_i k_L = (k.y)^l (y.w) - l/(2l+1) (k.w) y^2 (k.y)^(l-1) for null k
    (the harmonic extension of :mod:`stfalgebra.moments.invariants`); the powers of k.y are
    kept through eps^2, all the 1PN terms of (I4) need."""
    if l == 0:
        return position_dot_vector
    power = fr.truncated_power(position, l - 1, 2)
    out = fr.truncate(power * position, 2) * position_dot_vector
    return out - flint.fmpq(l, 2 * l + 1) * vector * position_squared * power


@lru_cache(maxsize=None)
def _stf_with_two_vectors(l: int):
    """y^<ijL> w_i w_j k_L on the null cone, in the invariants of (k, y1, v1) (y = y1, w = v1).

    Second k-derivatives of the harmonic extension (trace-removal series, Thorne 1980 eq. (2.2)):
    w_i w_j d_ij H = (w.d)^2 f - (w^2 Delta f + 2 (k.w)(w.d) Delta f)/(2n-1)
    + (k.w)^2 Delta^2 f/((2n-1)(2n-3)), f = (k.y)^n, n = l + 2.
    """
    n = l + 2
    f = fr.dot("k", "y1")**n
    lap = fr.mixed_laplacian(f, "k", "k")
    lap2 = fr.mixed_laplacian(lap, "k", "k")
    d = fr.directional_derivative
    main = d(d(f, "v1", "k"), "v1", "k")
    trace = fr.dot("v1", "v1") * lap + 2 * fr.dot("k", "v1") * d(lap, "v1", "k")
    double = fr.dot("k", "v1")**2 * lap2
    value = main - trace * flint.fmpq(1, 2 * n - 1) + double * flint.fmpq(1, (2 * n - 1) * (2 * n - 3))
    return fr.on_null_cone(value) * flint.fmpq(1, (l + 1) * (l + 2))


def _derivative(f, pn_order: int, times: int, keep: int):
    """``times`` time derivatives along the orbit, truncated at eps^keep after each."""
    for _ in range(times):
        f = fr.truncate(fr.time_derivative(f, pn_order), keep)
    return f


@lru_cache(maxsize=None)
def _weights() -> tuple:
    """mu_A (1 + v_A^2/c^2) for the two bodies, through eps^4 (module docstring)."""
    out = []
    for body in (0, 1):
        values = _body_values(body)
        V, W, Vv, speed = values["V"], values["W"], values["Vv"], values["speed"]
        V0 = fr.truncate(V, 0)
        speed0 = fr.truncate(speed, 0)
        inverse_sqrt_g = 1 - 2 * _E2 * V + _E4 * (2 * V0**2 - 2 * W)
        z = _E2 * (-2 * V - speed) + _E4 * (2 * V0**2 + 8 * Vv - 2 * V0 * speed0)
        inverse_sqrt_gvv = 1 - z / 2 + flint.fmpq(3, 8) * z**2
        weight = (1 + _E2 * speed) * fr.truncate(inverse_sqrt_g * inverse_sqrt_gvv, 4)
        out.append(fr.truncate(_MASSES_F[body] * weight, 4))
    return tuple(out)


def _compact_part(l: int):
    """The compact (point-particle) terms of (I4), an orbit-ring element through eps^4."""
    data2, data1 = _position_factors(2), _centre_of_mass_data(1)
    radius, rate, v2 = _RF, _RDOTF, _V2F
    weights = _weights()
    masses = _MASSES_F
    zero = fr.ORBIT.constant(0)
    total = second = fourth = first = third = stress = zero
    pattern = _stf_with_two_vectors(l)
    for body in (0, 1):
        values = _body_values(body)
        s, t = data2[body][0], data2[body][1]
        total += fr.truncate(weights[body] * fr.truncated_power(s * _KXF + t * _KVF, l, 4), 4)
        s1, _, p1, q1 = data1[body]
        s0, p0 = fr.truncate(s1, 0), fr.truncate(p1, 0)
        speed0 = fr.truncate(values["speed"], 0)
        # 4 sigma_kk U/c^4
        total += 4 * _E4 * masses[body] * speed0 * values["U"] * (s0 * _KXF)**l
        # sigma at 1PN in the |x|^2 term: m_A [1 + (3/2 v_A^2 - (U)_A)/c^2]
        weight_1pn = 1 + _E2 * (flint.fmpq(3, 2) * values["speed"] - values["U"])
        second += fr.truncate(masses[body] * weight_1pn * s1**2 * radius**2
                              * fr.truncated_power(s1 * _KXF, l, 2), 2)
        fourth += masses[body] * s0**4 * radius**4 * (s0 * _KXF)**l
        # Sigma_i compact part at 1PN: m_A [1 + (v_A^2/2 + 3 (U)_A)/c^2] v_A
        contracted = _stf_with_one_vector(l, s1 * _KXF, p1 * _KVF + q1 * _KXF,
                                          s1 * (p1 * radius * rate + q1 * radius**2), s1**2 * radius**2)
        weight_i = 1 + _E2 * (values["speed"] / 2 + 3 * values["U"])
        first += fr.truncate(masses[body] * weight_i * contracted, 2)
        third += masses[body] * s0**2 * radius**2 * _stf_with_one_vector(
            l, s0 * _KXF, p0 * _KVF, s0 * p0 * radius * rate, s0**2 * radius**2)
        images = _body_one_images(s0 * _KXF, p0 * _KVF, s0**2 * radius**2, s0 * p0 * radius * rate,
                                  p0**2 * v2)
        stress += masses[body] * fr.evaluate_at(pattern, images)
    total = fr.truncate(total, 4)
    total += fr.truncate(_E2 * _derivative(second, 1, 2, 2), 4) * flint.fmpq(1, 2 * (2 * l + 3))
    total += _E4 * _derivative(fourth, 0, 4, 0) * flint.fmpq(1, 8 * (2 * l + 3) * (2 * l + 5))
    total += (fr.truncate(_E2 * _derivative(first, 1, 1, 2), 4)
              * flint.fmpq(-4 * (2 * l + 1), (l + 1) * (2 * l + 3)))
    total += _E4 * _derivative(third, 0, 3, 0) * flint.fmpq(-2 * (2 * l + 1), (l + 1) * (2 * l + 3) * (2 * l + 5))
    total += _E4 * _derivative(stress, 0, 2, 0) * flint.fmpq(2 * (2 * l + 1), (l + 1) * (l + 2) * (2 * l + 5))
    return total


def _body_one_images(k_y, k_v, y_y, y_v, v_v) -> tuple:
    """Images of the invariants' generators with (y1, v1) -> given values, others unused (0)."""
    images = {"ky1": k_y, "kv1": k_v, "y1y1": y_y, "y1v1": y_v, "v1v1": v_v}
    zero = fr.ORBIT.constant(0)
    return tuple(images.get(str(generator), zero) for generator in inv.RING.gens)


@lru_cache(maxsize=None)
def _cubic_on_orbit(l: int):
    """(G^2/pi) [m1^2 m2 C(u1, u2) + m1 m2^2 C(u2, u1)] on the orbit (C = :func:`cubic_integral`,
    u1 = X2 kx, u2 = -X1 kx, R12 = r), an orbit-ring element; from the finite parts of the
    seeds (:mod:`stfalgebra.moments.finite_part`) without the sympy expression between."""
    x1, x2 = (1 + fr.ORBIT_GENS["delta"]) / 2, (1 - fr.ORBIT_GENS["delta"]) / 2
    u1, u2 = x2 * _KXF, -x1 * _KXF
    ring = finite_part._FLINT_RING
    sqrt_pi = ring.gen(finite_part._NAMES.index("sqrtpi"))
    classes = dict(finite_part._finite_classes(l, _cubic_pointwise()))
    # the delta parts of cubic_integral, (4 pi/3) U1^l - (2 pi/3) U2^l at R12^-2
    first, second = (ring.gen(finite_part._NAMES.index(name)) for name in ("U1", "U2"))
    delta_parts = sqrt_pi**2 * (flint.fmpq(4, 3) * first**l - flint.fmpq(2, 3) * second**l)
    classes[-2] = classes[-2] + delta_parts if -2 in classes else delta_parts
    zero = fr.ORBIT.constant(0)
    direct = exchanged = zero
    for exponent, finite in classes.items():
        over_pi, remainder = divmod(finite, sqrt_pi**2)
        if not remainder.is_zero() or (not over_pi.is_constant() and over_pi.degrees()[-1]):
            raise ArithmeticError(f"the cubic integral at l = {l} is not pi times a rational polynomial")
        radial = _RF**exponent if exponent >= 0 else fr.ORBIT_GENS["ir"]**(-exponent)
        images = {"U1": u1, "U2": u2}
        direct += radial * over_pi.compose(*(images.get(name, zero) for name in finite_part._NAMES), ctx=fr.ORBIT)
        images = {"U1": u2, "U2": u1}
        exchanged += radial * over_pi.compose(*(images.get(name, zero) for name in finite_part._NAMES),
                                              ctx=fr.ORBIT)
    m1, m2 = _MASSES_F
    return fr.ORBIT_GENS["G"]**2 * m1 * m2 * (m1 * direct + m2 * exchanged)


def _noncompact_part(l: int):
    """The quadratic and cubic non-compact terms of (I4), an orbit-ring element at eps^4."""
    scalar, square, dipole_source, stress = _quadratic_integrals_flint(l)
    m1, m2 = _MASSES_F
    prefactor = fr.ORBIT_GENS["G"] * m1 * m2  # G m1 m2/pi times the pi of the integrals
    total = scalar - _derivative(square, 0, 2, 0)
    total += _derivative(dipole_source, 0, 1, 0) * flint.fmpq(-4 * (2 * l + 1), (l + 1) * (2 * l + 3))
    total += _derivative(stress, 0, 2, 0) * flint.fmpq(2 * (2 * l + 1), 4 * (l + 1) * (l + 2) * (2 * l + 5))
    # cubic: (1/(pi G c^4)) int xhat_L (-W^nc d U) = (G^2/(pi c^4)) [m1^2 m2 C(u1, u2) + m1 m2^2 C(u2, u1)]
    return _E4 * (prefactor * total + _cubic_on_orbit(l))


@lru_cache(maxsize=None)
def mass_moment_two_pn(l: int) -> OrbitTensor:
    """I_L of two point masses through 2PN in the centre-of-mass frame (harmonic coordinates).

    Parameters
    ----------
    l:
        Multipole order, l >= 0.

    Returns
    -------
    OrbitTensor
        I_L = sum s_ab x_<A v_B> with PN-series coefficients in eps = 1/c (G, m, nu, delta, r,
        rdot, phidot; delta^2 reduced to 1 - 4 nu), known through relative order 5/2 (the
        2.5PN radiation-reaction terms are :func:`stfalgebra.moments.mass_reaction.reaction_mass_moment`).

    **Conventions**: x = y1 - y2, v = dx/dt, centre-of-mass frame, harmonic coordinates.

    Example
    -------
    >>> I = mass_moment_two_pn(0)
    >>> I.terms[(0, 0, 0)].coefficient(1)      # m + E/c^2: the Newtonian energy
    nu*m*rdot**2/2 - nu*G*m**2*r**(-1) + nu*m*r**2*phidot**2/2

    References
    ----------
    Module docstring: (I1)-(I5).
    """
    if isinstance(l, bool) or not isinstance(l, int):
        raise TypeError(f"multipole order l must be an int, got {l!r}")
    if l < 0:
        raise ValueError(f"multipole order l must be >= 0, got {l}")
    total = fr.reduce_mass_difference(_compact_part(l) + _noncompact_part(l))
    return fr.to_tensor(l, total, KNOWN_THROUGH)
