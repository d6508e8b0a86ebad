"""The 2PN current moments J_L of two point masses without the cubic non-compact terms.

This module assembles, for every l, all the terms of J_L at relative 2PN that the formula (J1)
of :mod:`stfalgebra.moments.current_two_pn` gives, except the cubic (G^3 in Sigma_b)
non-compact field terms, which are :mod:`stfalgebra.moments.current_two_pn_cubic`'s (the split
is stated in :data:`SPLIT`). With a null probe k, J_L k_L = ell.k P_l(kx, kv), ell = x cross v,
and every function here returns the coefficient P_l as a ring element of
:mod:`stfalgebra.moments.orbit_polynomials` (eps = 1/c, kx = k.x, kv = k.v).

**The terms** ((J1) with the z-integrals expanded, Sigma_b through relative 2PN, Sigma_bc
through 1PN):

    J_L k_L = FP int (k.x)^(l-1) [x, Sigma, k] + d_t^2 FP int |x|^2 (k.x)^(l-1) [x, Sigma, k]/(2 c^2 (2l+3))
              + d_t^4 int |x|^4 (k.x)^(l-1) [x, sigma, k]/(8 c^4 (2l+3)(2l+5))
              - (2l+1)/(c^2 (l+2)(2l+3)) d_t FP int eps_{abe} k_e xhat_{aL-1c} k_{L-1} Sigma_bc
              - (2l+1)/(2 c^4 (l+2)(2l+3)(2l+5)) d_t^3 int |x|^2 eps_{abe} k_e xhat_{aL-1c} k_{L-1} sigma_bc,   (Q1)

[p, w, k] = p.(w cross k). The pieces:

* compact: Sigma_b = |g| sigma_b = m_A v_A sqrt(-g)_A / sqrt(-g_ab v^a v^b/c^2)_A at the bodies
  (regularised values (N4) of :mod:`stfalgebra.moments.near_zone`), plus the compact terms of
  the reduction (J4), -6 (U)_A^2 sigma_b - 4 (R_b)_A sigma ((N6)), plus the compact term of
  (1/(2 pi G)) W^C Delta V_b = -2 (W^C)_A sigma_b (the compact part of (W_kk)_A of (N4); the
  W^nc part, with every W^nc term, is the cubic module's);
  Sigma_bc = |g| m_A v_A^b v_A^c; on the 2PN centre-of-mass orbit y_A = s_A x + t_A v;
* quadratic field terms (products of two potentials of different bodies; self terms are
  dropped, as in :mod:`stfalgebra.moments.field_integrals`): the eps^5 term of Lambda^0b with
  V, V_i at 1PN (the weights of sigma, sigma_i and the retardations d_t^2 X/2, d_t^2 X_i/2,
  X = G sum m_A r_A, X_i = G sum m_A v_A^i r_A), the bilinear terms of Lambda^0b|eps^7 (with
  W^C_ij = G sum m_A (v_A^i v_A^j - delta_ij v_A^2)/r_A), the 1PN field term on the 1PN orbit, its
  |x|^2 retardation (kernel Z_l), and the Sigma_bc field terms at 1PN (Lambda^ij|eps^6 and the
  retardation of V in d_b V d_c V). Each is an operator in the body positions applied to a kernel
  FP int (k.x)^n f1 g2 (f, g among 1/r, r), the time derivatives of the potentials as body
  velocities and accelerations (Newtonian a_1 = -G m2 (y1 - y2)/r12^3).

Time derivatives of a result P ell.k along the orbit: d_t(ell) = x cross a = a_v ell
(a = a_x x + a_v v), so d_t (P ell.k) = (dP/dt + a_v P) ell.k.

Validation (tests): through eps^2 the terms reproduce the 1PN J_L of
:mod:`stfalgebra.moments.current` (and the product engine the independent 1PN field term of
:mod:`stfalgebra.moments.current_two_pn`); for l = 1 the G^0 and G^1 terms at 2PN equal those of
the cited 2PN angular momentum (the G^2 ones need the cubic terms: with
:func:`~stfalgebra.moments.current_two_pn_cubic.cubic_field_term` and the g-volume terms computed
by quadrature they agree too, tests of that module; at l = 2 and 3 the same sum gives the
published circular Hhat_21 and Hhat_32 at relative 2PN), and the retardation terms of
(Q1) cancel as the conservation law requires; the same Sigma_b integrated without weight (the
momentum) vanishes in the centre-of-mass frame through G^1; the accelerations of the engine obey
the product rule against the orbit derivative; exchange of the bodies leaves the moment unchanged.
No logarithm and no regularisation constant appears in these terms (the seeds used have a + b
even: no regulator-centre term).

**Conventions**: harmonic coordinates, centre-of-mass frame, x = y1 - y2, ell = x cross v;
J_L in the convention of :func:`stfalgebra.moments.current.current_moment`.

References
----------
L. Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 3 (source moments), Sec. 5 (potentials);
T. Damour & B. R. Iyer, Ann. Inst. H. Poincare 54, 115 (1991).
"""

from __future__ import annotations

from functools import lru_cache

import flint
import sympy as sp

from ..binary.centre_of_mass import centre_of_mass_relations, centre_of_mass_velocity_factors
from ..binary.dynamics import relative_acceleration_factors
from ..symbols import G, delta, m, phidot, r, rdot
from ..symbols import eps as EPS
from . import invariants as inv
from . import flint_rings as fr
from . import orbit_polynomials as op
from .current_two_pn import seed_in_invariants, square_pair_kernel
from .finite_part import RA, RB, two_centre_integral
from ..errors import OrderBeyondInputsError
from .mass_two_pn import KNOWN_THROUGH, _pair_kernel_raw
from .near_zone import regularised_values
from .orbit_tensor import PLANAR_BASIS, OrbitTensor

__all__ = ["SPLIT", "compact_terms", "quadratic_field_terms", "non_cubic_terms", "normalise",
           "to_current_tensor", "current_moment_two_pn", "two_pn_probe_polynomial", "curl_on_orbit"]

#: Which terms of Sigma_b at c^-4 this module holds, and which the cubic module holds.
SPLIT = ("here: the compact terms (|g| sigma_b with 2PN weights and centre-of-mass relations; "
         "-6 U^2 sigma_b - 4 R_b sigma of (J4); -2 W^C sigma_b from W^C Delta V_b), "
         "all terms bilinear in the potentials (including the accelerations of their time "
         "derivatives), the 1PN field term on the 1PN orbit, the |x|^2 term and the Sigma_bc "
         "terms; current_two_pn_cubic: the bracket of (J4) and every W^nc term of Lambda^0b|eps^7 "
         "(with the delta parts of their second derivatives, W^nc Delta V_b included)")

_KX, _KV = sp.symbols("kx kv")
_X1 = (1 + delta) / 2
_X2 = (1 - delta) / 2
_M1, _M2 = sp.symbols("m1 m2", positive=True)
_MASS_VALUES = {_M1: m * _X1, _M2: m * _X2}
_V2 = rdot**2 + r**2 * phidot**2
_TOP = 4


def _ring(expression):
    return op.from_expression(sp.expand(sp.sympify(expression).xreplace(_MASS_VALUES)))


def _eps(power: int):
    return op.from_expression(EPS**power)


# ---------------------------------------------------------------- the orbit
@lru_cache(maxsize=None)
def _body_factors(order: int) -> tuple:
    """Per body (s, t, p, q): y_A = s x + t v, v_A = p v + q x, ring elements."""
    (s1, t1), (s2, t2) = centre_of_mass_relations(order)
    (p1, q1), (p2, q2) = centre_of_mass_velocity_factors(order)
    return tuple(tuple(op.from_series(x) for x in body) for body in ((s1, t1, p1, q1), (s2, t2, p2, q2)))


@lru_cache(maxsize=None)
def _orbit_images(order: int) -> tuple:
    """Images of the invariants' generators on the centre-of-mass orbit of PN order ``order``."""
    kx, kv = op.from_expression(_KX), op.from_expression(_KV)
    radius, rate, v2 = op.from_expression(r), op.from_expression(rdot), op.from_expression(_V2)
    (s1, t1, p1, q1), (s2, t2, p2, q2) = _body_factors(order)
    # vector -> (coefficient of x, coefficient of v)
    comps = {"y1": (s1, t1), "y2": (s2, t2), "v1": (q1, p1), "v2": (q2, p2)}
    images = {}
    for i, a in enumerate(inv.VECTORS):
        for b in inv.VECTORS[i:]:
            if a == "k" and b == "k":
                value = op.RING(0)
            elif a == "k":
                cx, cv = comps[b]
                value = cx * kx + cv * kv
            else:
                ax, av = comps[a]
                bx, bv = comps[b]
                value = ax * bx * radius**2 + (ax * bv + av * bx) * radius * rate + av * bv * v2
            images[str(inv.dot(a, b))] = op.truncate(value, _TOP)
    images["r12"] = radius
    images["ir12"] = op.from_expression(1 / r)
    return tuple(images[str(g)] for g in inv.RING.gens)


def _triple(p: str, w: str, order: int):
    """[p, w, k]/ell.k on the orbit: p = a x + b v, w = c x + d v give (a d - b c)."""
    (s1, t1, p1, q1), (s2, t2, p2, q2) = _body_factors(order)
    comps = {"y1": (s1, t1), "y2": (s2, t2), "v1": (q1, p1), "v2": (q2, p2)}
    (a, b), (c, d) = comps[p], comps[w]
    return op.truncate(a * d - b * c, _TOP)


def curl_on_orbit(curl: dict, order: int):
    """A :func:`~stfalgebra.moments.invariants.probe_curl` result on the centre-of-mass orbit of
    PN order ``order``, as the ring element multiplying ell.k (truncated at eps^4).

    Example
    -------
    >>> curl_on_orbit({("y1", "v1"): inv.RING(1)}, 0)      # [y1, v1, k] = X2^2 ell.k
    1/4*delta**2 - 1/2*delta + 1/4"""
    return fr.orbit_to_sympy(_curl_on_orbit_flint(curl, order))


@lru_cache(maxsize=None)
def _orbit_images_flint(order: int) -> tuple:
    """:func:`_orbit_images` in the flint orbit ring."""
    return tuple(fr.orbit_from_sympy(image) for image in _orbit_images(order))


@lru_cache(maxsize=None)
def _triple_flint(p: str, w: str, order: int):
    return fr.orbit_from_sympy(_triple(p, w, order))


def _curl_on_orbit_flint(curl: dict, order: int):
    """:func:`curl_on_orbit` computed in the flint rings of :mod:`stfalgebra.moments.flint_rings`
    (the coefficients of ``curl`` sympy or flint invariants-ring elements); a flint orbit-ring
    element."""
    images = _orbit_images_flint(order)
    total = fr.ORBIT.constant(0)
    for (p, w), coefficient in curl.items():
        factor = _triple_flint(p, w, order)
        if factor.is_zero():
            continue
        if not isinstance(coefficient, type(total)):
            coefficient = fr.invariant_from_sympy(coefficient)
        total += fr.truncate(factor * fr.truncate(fr.evaluate_at(coefficient, images), _TOP), _TOP)
    return total


@lru_cache(maxsize=None)
def _rotation_rate(order: int):
    """a_v: d ell/dt = a_v ell."""
    return op.from_series(relative_acceleration_factors(order)[1])


def _derivative(f, order: int, times: int, keep: int):
    """``times`` derivatives of f ell.k along the orbit of order ``order`` (f the coefficient of
    ell.k), truncated at eps^keep after each."""
    rate = _rotation_rate(order)
    for _ in range(times):
        f = op.truncate(op.time_derivative(f, order) + rate * f, keep)
    return f


# ---------------------------------------------------------------- compact terms
@lru_cache(maxsize=None)
def _body_values(body: int) -> dict:
    """Regularised values (N4) at body ``body`` (0 or 1) on the orbit, ring elements:
    V (through 1PN), W, Vv = (V_i)_A v_A^i, U, speed = v_A^2 (through 1PN)."""
    own, other = _body_factors(1)[body], _body_factors(1)[1 - body]
    regular = regularised_values(G=G, c=1 / EPS)
    m1s, m2s, r12s, v1v1, v2v2, v1v2, n12v2 = regular["symbols"]
    v2, radius, rate = op.from_expression(_V2), op.from_expression(r), op.from_expression(rdot)

    def speed(factors):
        _, _, p, q = factors
        return op.truncate(p**2 * v2 + 2 * p * q * radius * rate + q**2 * radius**2, 2)

    def sym(f):
        return f.as_expr().xreplace({sp.Symbol("ir", positive=True): 1 / r})

    masses = (_M1, _M2)
    own_speed0, other_speed0 = op.truncate(speed(own), 0), op.truncate(speed(other), 0)
    p_own, p_other = op.truncate(own[2], 0), op.truncate(other[2], 0)
    values = {m1s: masses[body], m2s: masses[1 - body], r12s: r, v1v1: sym(own_speed0),
              v2v2: sym(other_speed0), v1v2: sym(p_own * p_other * v2), n12v2: sym(p_other * rate)}

    def value(key):
        return op.truncate(_ring(regular[key].xreplace(values)), _TOP)

    return {"V": value("V"), "W": value("W"), "Vv": value("Vi_v1"), "U": value("U"), "speed": speed(own)}


def _mass(body: int):
    return _ring((_M1, _M2)[body])


def _weight_sigma_b(body: int):
    """m_A sqrt(-g)_A / sqrt(-g_ab v^a v^b/c^2)_A - (6 U^2 + 2 W^C)_A m_A/c^4 through eps^4
    (W^C the compact part of W_kk, -2 G m_B v_B^2/r12 at body A: the W^nc part of W Delta V_b
    is the cubic module's)."""
    values = _body_values(body)
    compact_w = -2 * values["U"] * op.truncate(_body_values(1 - body)["speed"], 0)
    V, W, Vv, speed, U = (values[key] for key in ("V", "W", "Vv", "speed", "U"))
    e2, e4 = _eps(2), _eps(4)
    V0, speed0 = op.truncate(V, 0), op.truncate(speed, 0)
    sqrt_g = 1 + 2 * e2 * V + 2 * e4 * (V0**2 + W)
    z = e2 * (-2 * V - speed) + e4 * (2 * V0**2 + 8 * Vv - 2 * V0 * speed0)
    inverse_sqrt_z = 1 - z / 2 + sp.Rational(3, 8) * z**2
    weight = op.truncate(sqrt_g * inverse_sqrt_z, _TOP) - e4 * (6 * U**2 + 2 * compact_w)
    return op.truncate(_mass(body) * weight, _TOP)


def _one_pn_weight(body: int):
    """|g| mu_A/m_A through 1PN: 1 + (v_A^2/2 + 3 (U)_A)/c^2."""
    values = _body_values(body)
    return 1 + _eps(2) * (values["speed"] / 2 + 3 * values["U"])


def _r_vector_triple(body: int):
    """[y_A, (R)_A, k]/ell.k, Newtonian orbit, from the Hadamard value (N6) (the n12 parts are
    along y_A and drop out)."""
    position, v_own, v_other = ("y1", "v1", "v2") if body == 0 else ("y2", "v2", "v1")
    m_own, m_other = (_M1, _M2) if body == 0 else (_M2, _M1)
    t = lambda w: op.truncate(_triple(position, w, 0), 0)  # noqa: E731
    bracket = (-_ring(m_own * m_other) * (t(v_own) - t(v_other))
               + _ring(m_own * m_other / 4) * (t(v_own) + t(v_other))
               - _ring(m_other**2 / 8) * t(v_other))
    return op.from_expression(G**2 / r**2) * bracket


@lru_cache(maxsize=None)
def compact_terms(l: int):
    """The compact (point-particle) terms of (Q1), coefficient of ell.k through eps^4.

    Example
    -------
    >>> op.truncate(compact_terms(1), 0)                  # J_i = m nu (x cross v)_i
    m*nu"""
    kx, kv = op.from_expression(_KX), op.from_expression(_KV)
    radius, rate = op.from_expression(r), op.from_expression(rdot)
    e2, e4 = _eps(2), _eps(4)
    total = op.RING(0)
    square = fourth = stress = stress_square = op.RING(0)
    for body in (0, 1):
        s, t, p, q = _body_factors(2)[body]
        probe = op.truncated_power(s * kx + t * kv, l - 1, _TOP)
        total += op.truncate(_weight_sigma_b(body) * op.truncate(probe * (s * p - t * q), _TOP), _TOP)
        s0 = op.truncate(s, 0)
        total -= 4 * e4 * _mass(body) * (s0 * kx)**(l - 1) * _r_vector_triple(body)
        # 1PN orbit: t = 0, [y_A, v_A, k] = s p ell.k
        s1, _, p1, q1 = _body_factors(1)[body]
        weight = _mass(body) * _one_pn_weight(body)
        power = op.truncated_power(s1 * kx, l - 1, 2)
        square += op.truncate(weight * s1**3 * p1 * radius**2 * power, 2)
        p0 = op.truncate(p1, 0)
        fourth += _mass(body) * s0**6 * radius**4 * (s0 * kx)**(l - 1)
        y_dot_v = s1 * (p1 * radius * rate + q1 * radius**2)
        inner = y_dot_v * power
        if l >= 2:
            inner -= sp.Rational(l - 1, 2 * l + 1) * s1**2 * radius**2 * op.truncated_power(s1 * kx, l - 2, 2) * (p1 * kv + q1 * kx)
        stress += op.truncate(weight * s1 * p1 * op.truncate(inner, 2), 2)
        inner0 = s0 * p0 * radius * rate * (s0 * kx)**(l - 1)
        if l >= 2:
            inner0 -= sp.Rational(l - 1, 2 * l + 1) * s0**2 * radius**2 * (s0 * kx)**(l - 2) * p0 * kv
        stress_square += _mass(body) * s0 * p0 * s0**2 * radius**2 * inner0
    total = op.truncate(total, _TOP)
    total += op.truncate(e2 * _derivative(square, 1, 2, 2), _TOP) * sp.Rational(1, 2 * (2 * l + 3))
    total += e4 * _derivative(fourth, 0, 4, 0) * sp.Rational(1, 8 * (2 * l + 3) * (2 * l + 5))
    total += op.truncate(e2 * _derivative(stress, 1, 1, 2), _TOP) * sp.Rational(-(2 * l + 1), (l + 2) * (2 * l + 3))
    total += e4 * _derivative(stress_square, 0, 3, 0) * sp.Rational(-(2 * l + 1), 2 * (l + 2) * (2 * l + 3) * (2 * l + 5))
    return op.reduce_mass_difference(total)


# ---------------------------------------------------------------- bilinear field terms
# A factor is the potential of one body, a list of monomials (coefficient, radial, derivatives,
# polarisations): radial "inv" (1/r_A) or "lin" (r_A); derivatives a tuple of directions with
# respect to y_A (an index letter, or a vector token "v", "a" (acceleration), "j" (its time
# derivative) of that body); polarisations a tuple of (index letter, vector token). An x
# derivative d_i is -d/dy_A^i; a time derivative of f(x - y_A) is +(v_A . d/dy_A) f.
_NEXT = {"v": "a", "a": "j"}


def _factor(radial: str, *polarisations, coefficient=1):
    return [(sp.Rational(coefficient), radial, (), tuple(polarisations))]


def _space(factor, index: str):
    return [(-c, radial, derivs + (index,), pols) for c, radial, derivs, pols in factor]


def _time(factor):
    out = []
    for c, radial, derivs, pols in factor:
        out.append((c, radial, derivs + ("v",), pols))
        for i, token in enumerate(derivs):
            if token in _NEXT:
                out.append((c, radial, derivs[:i] + (_NEXT[token],) + derivs[i + 1:], pols))
        for i, (index, token) in enumerate(pols):
            out.append((c, radial, derivs, pols[:i] + ((index, _NEXT[token]),) + pols[i + 1:]))
    return out


def _scaled(factor, coefficient):
    return [(c * coefficient, radial, derivs, pols) for c, radial, derivs, pols in factor]



def _spec(token: str, body: int):
    """The vector a_A or da_A/dt as (sympy mass factor, {base vector: invariants coefficient})."""
    ir = inv.INV_R12
    mass = G * (_M2 if body == 0 else -_M1)
    if token == "a":
        return mass, {"y1": -ir**3, "y2": ir**3}
    separation_rate = (inv.dot("y1", "v1") - inv.dot("y1", "v2") - inv.dot("y2", "v1") + inv.dot("y2", "v2"))
    return mass, {"v1": -ir**3, "v2": ir**3, "y1": 3 * separation_rate * ir**5, "y2": -3 * separation_rate * ir**5}


def _kernel(n: int, radial_1: str, radial_2: str):
    """FP int (k.x)^n f1 g2 / pi on the null cone, invariants ring ("sq": the weight |x|^2
    with 1/r_A, the kernel Z_n of :func:`~stfalgebra.moments.current_two_pn.square_pair_kernel`)."""
    if radial_1 == "sq" and radial_2 == "sq":
        return square_pair_kernel(n)
    if radial_1 == "inv" and radial_2 == "inv":
        return _pair_kernel_raw(n) * sp.Rational(-2, n + 1)
    integrand = (RA if radial_1 == "lin" else 1 / RA) * (RB if radial_2 == "lin" else 1 / RB)
    return _seed(n, integrand)


@lru_cache(maxsize=None)
def _seed(n: int, integrand):
    return seed_in_invariants(two_centre_integral(n, integrand))


_FZERO = fr.INVARIANTS.constant(0)


@lru_cache(maxsize=None)
def _kernel_flint(n: int, radial_1: str, radial_2: str):
    """:func:`_kernel` in the flint invariants ring."""
    return fr.invariant_from_sympy(_kernel(n, radial_1, radial_2))


@lru_cache(maxsize=None)
def _spec_flint(token: str, body: int):
    """:func:`_spec` with flint invariants coefficients."""
    mass, spec = _spec(token, body)
    return mass, {u: fr.invariant_from_sympy(c) for u, c in spec.items()}


_PROBE_INDEX = {p: fr.INVARIANTS.variable_to_index(str(inv.dot("k", p))) for p in inv.VECTORS[1:]}


def _probe_curl_flint(form: dict) -> dict:
    """:func:`stfalgebra.moments.invariants.probe_curl` for a form with flint coefficients."""
    out: dict = {}
    order = inv.VECTORS
    for w, coefficient in form.items():
        if w == "k":
            continue
        for p in order[1:]:
            if p == w:
                continue
            derivative = coefficient.derivative(_PROBE_INDEX[p])
            if derivative.is_zero():
                continue
            key, sign = ((p, w), 1) if order.index(p) < order.index(w) else ((w, p), -1)
            out[key] = out[key] + sign * derivative if key in out else sign * derivative
    return out


def _form_directional(form: dict, spec: dict, body: str) -> dict:
    """(s . grad_body) of a vector field sum_w C_w w_b, s = sum_u c_u u held fixed."""
    out: dict = {}
    for w, coefficient in form.items():
        value = sum((c * fr.directional_derivative(coefficient, u, body) for u, c in spec.items()), _FZERO)
        out[w] = out.get(w, _FZERO) + value
    if body in form:
        for u, c in spec.items():
            out[u] = out.get(u, _FZERO) + c * form[body]
    return out


def _pair_flint(x_monomial, y_monomial, n: int, free: tuple):
    """A product of a body-1 monomial and a body-2 monomial integrated against (k.x)^n: returns
    (sympy factor, vector form over the free index b) or, with two free indices (b, c), the
    c-index contracted with the harmonic k-gradient (degree n) first; the form's coefficients
    are elements of the flint invariants ring (:mod:`stfalgebra.moments.flint_rings`). Derivatives act on the
    kernel; the one acceleration-type vector allowed is contracted last."""
    (c1, radial1, derivs1, pols1), (c2, radial2, derivs2, pols2) = x_monomial, y_monomial
    f = _kernel_flint(n, radial1, radial2)
    factor = c1 * c2
    occurrences: dict = {}
    specs = []
    directions = []  # (body variable, pure vector)
    for body, derivs, pols in ((0, derivs1, pols1), (1, derivs2, pols2)):
        variable = ("y1", "y2")[body]
        for token in derivs:
            if token == "v":
                directions.append((variable, ("v1", "v2")[body]))
            elif token in ("a", "j"):
                specs.append(("dir", variable, token, body))
            else:
                occurrences.setdefault(token, []).append(("d", variable, body))
        for index, token in pols:
            occurrences.setdefault(index, []).append(("p", token, body))
    scalar_dots = []
    laplacians = []
    free_ops = {}
    for index, places in occurrences.items():
        if index in free:
            if len(places) != 1:
                raise AssertionError(f"free index {index} repeated")
            free_ops[index] = places[0]
            continue
        if len(places) != 2:
            raise AssertionError(f"index {index} occurs {len(places)} times")
        (kind_a, what_a, body_a), (kind_b, what_b, body_b) = places
        if kind_a == "d" and kind_b == "d":
            laplacians.append((what_a, what_b))
        elif kind_a == "p" and kind_b == "p":
            scalar_dots.append(((what_a, body_a), (what_b, body_b)))
        else:
            (variable, _), (token, owner) = ((what_a, body_a), (what_b, body_b)) if kind_a == "d" else ((what_b, body_b), (what_a, body_a))
            if token == "v":
                directions.append((variable, ("v1", "v2")[owner]))
            else:
                specs.append(("dir", variable, token, owner))
    for variable, vector in directions:
        f = fr.directional_derivative(f, vector, variable)
    for first, second in laplacians:
        f = fr.mixed_laplacian(f, first, second)
    for (token_a, owner_a), (token_b, owner_b) in scalar_dots:
        if token_a == "v" and token_b == "v":
            f = f * fr.dot(("v1", "v2")[owner_a], ("v1", "v2")[owner_b])
        else:
            if token_b == "v":
                token_a, owner_a, token_b, owner_b = token_b, owner_b, token_a, owner_a
            if token_a != "v":
                raise AssertionError("two accelerations")
            specs.append(("dot", ("v1", "v2")[owner_a], token_b, owner_b))
    if len(specs) + sum(1 for place in free_ops.values() if place[0] == "p" and place[1] != "v") > 1:
        raise AssertionError("more than one acceleration in a monomial")
    degree = n
    if len(free) == 2:
        kind, what, owner = free_ops[free[1]]
        if kind == "d":
            f = fr.harmonic_divergence(f, degree, what)
        elif what == "v":
            f = fr.harmonic_gradient_along(f, degree, ("v1", "v2")[owner])
        else:
            mass, spec = _spec_flint(what, owner)
            factor *= mass
            if specs:
                raise AssertionError("acceleration in a tensor term twice")
            kind_b, what_b, owner_b = free_ops[free[0]]
            if kind_b == "d":
                # d_b of (u . d_k) H[f] with u fixed: subtract the derivative of u itself
                form: dict = {}
                for u, c in spec.items():
                    g = fr.harmonic_gradient_along(f, degree, u)
                    for w, value in fr.gradient(g, what_b).items():
                        form[w] = form.get(w, _FZERO) + c * value
                    if u == what_b:
                        for w, value in fr.gradient(f, "k").items():
                            form[w] = form.get(w, _FZERO) - c * value
                return factor, form
            f = sum((c * fr.harmonic_gradient_along(f, degree, u) for u, c in spec.items()), _FZERO)
            free = free[:1]
    kind, what, owner = free_ops[free[0]]
    if kind == "d":
        form = fr.gradient(f, what)
    elif what == "v":
        form = {("v1", "v2")[owner]: f}
    else:
        mass, spec = _spec_flint(what, owner)
        factor *= mass
        form = {u: c * f for u, c in spec.items()}
    for spec_entry in specs:
        if spec_entry[0] == "dir":
            _, variable, token, owner = spec_entry
            mass, spec = _spec_flint(token, owner)
            factor *= mass
            form = _form_directional(form, spec, variable)
        else:
            _, vector, token, owner = spec_entry
            mass, spec = _spec_flint(token, owner)
            factor *= mass
            value = sum((c * fr.dot(u, vector) for u, c in spec.items()), _FZERO)
            form = {w: coefficient * value for w, coefficient in form.items()}
    return factor, form


def _pair(x_monomial, y_monomial, n: int, free: tuple):
    """:func:`_pair_flint` with the form's coefficients in the sympy invariants ring."""
    factor, form = _pair_flint(x_monomial, y_monomial, n, free)
    return factor, {w: _invariant_to_sympy(c) for w, c in form.items()}


def _invariant_to_sympy(f):
    return inv.RING({tuple(int(e) for e in monomial): inv.RING.domain(int(c.p), int(c.q))
                     for monomial, c in f.to_dict().items()})


def _product_integral(first, second, n: int, free: tuple, order: int = 0):
    """Cross terms (body 1 x body 2 and body 2 x body 1) of first * second, potentials of unit
    amplitude G m_A, times 1/(pi G) (the factor G m1 m2 included; kernels are divided by pi), integrated against (k.x)^n with the free
    index b (and c) -> the curl on the orbit: sum of (1/n) [x, ., k]-type curls with the
    tensor case contracted as in (Q1). Returns the ring element (coefficient of ell.k), without
    the factor 1/n (n = l) or 1/(n(n-1)) (tensor case, n = l + 1)."""
    return _sum_products([(first, second, 1)], n, free, order)


def _collect_curls(first, second, n: int, free: tuple, weight, buckets: dict) -> None:
    """Add weight times the curls of the cross terms of first * second (as
    :func:`_product_integral`) to ``buckets``: {sympy mass factor: {(p, w): invariants element}}.
    The curl is linear, so the curls of every product with the same mass factor are summed
    before they are put on the orbit (once per factor)."""
    weight = sp.Rational(weight)
    scale = flint.fmpq(int(weight.p), int(weight.q))
    for bodies in ((0, 1), (1, 0)):
        for x_monomial in first:
            for y_monomial in second:
                ordered = (x_monomial, y_monomial) if bodies == (0, 1) else (y_monomial, x_monomial)
                factor, form = _pair_flint(*ordered, n, free)
                if not form:
                    continue
                bucket = buckets.setdefault(sp.expand(G * _M1 * _M2 * factor), {})
                for key, coefficient in _probe_curl_flint(form).items():
                    value = coefficient * scale
                    bucket[key] = bucket[key] + value if key in bucket else value


def _buckets_on_orbit(buckets: dict, order: int):
    """The collected curls on the orbit of PN order ``order``, summed with their mass factors."""
    total = fr.ORBIT.constant(0)
    for factor, curl in buckets.items():
        total += fr.orbit_from_sympy(_ring(factor)) * _curl_on_orbit_flint(curl, order)
    return fr.orbit_to_sympy(fr.truncate(total, _TOP))


# ---------------------------------------------------------------- the terms
def _V(radial: str = "inv"):
    return _factor(radial)


def _Vi(index: str, radial: str = "inv"):
    return _factor(radial, (index, "v"))


def _W_vv(i: str, j: str):
    """The v_A^i v_A^j/r_A part of W^C_ij (the -delta_ij v_A^2/r_A part is written out)."""
    return _factor("inv", (i, "v"), (j, "v"))


def _W_2(dummy: str):
    """v_A^2/r_A."""
    return _factor("inv", (dummy, "v"), (dummy, "v"))


def _d(factor, *indices):
    for index in indices:
        factor = _space(factor, index)
    return factor


def _t(factor, times: int = 1):
    for _ in range(times):
        factor = _time(factor)
    return factor


def _one_pn_products(radial: str = "inv"):
    """The eps^5 bracket d_k V d_b V_k - d_k V d_k V_b + (3/4) d_t V d_b V (unit amplitudes)."""
    return [
        (_d(_V(radial), "k"), _d(_Vi("k", radial), "b"), 1),
        (_d(_V(radial), "k"), _d(_Vi("b", radial), "k"), -1),
        (_t(_V(radial)), _d(_V(radial), "b"), sp.Rational(3, 4)),
    ]


def _corrected_v():
    """The 1PN part of V of one body (unit amplitude): weight (3/2) v_A^2 and d_t^2 X/2."""
    return (_factor("inv", ("p", "v"), ("p", "v"), coefficient=sp.Rational(3, 2))
            + _scaled(_t(_factor("lin"), 2), sp.Rational(1, 2)))


def _corrected_vi(index: str):
    """The 1PN part of V_i of one body (unit amplitude): weight v_A^2/2 and d_t^2 X_i/2."""
    return (_scaled(_factor("inv", ("p", "v"), ("p", "v"), (index, "v")), sp.Rational(1, 2))
            + _scaled(_t(_factor("lin", (index, "v")), 2), sp.Rational(1, 2)))


def _vector_products():
    """Every bilinear product in Sigma_b at c^-4 (times 1/(pi G)), as (first, second, coefficient)."""
    V, Vi, Wvv, W2 = _V, _Vi, _W_vv, _W_2
    terms = [
        # eps^5 bracket with one potential at 1PN (weights and retardations)
        (_d(_corrected_v(), "k"), _d(Vi("k"), "b"), 1),
        (_d(_corrected_v(), "k"), _d(Vi("b"), "k"), -1),
        (_d(V(), "k"), _d(_corrected_vi("k"), "b"), 1),
        (_d(V(), "k"), _d(_corrected_vi("b"), "k"), -1),
        (_t(_corrected_v()), _d(V(), "b"), sp.Rational(3, 4)),
        (_t(V()), _d(_corrected_v(), "b"), sp.Rational(3, 4)),
        # Lambda^0b|eps^7/16, bilinear terms (W = W^C; W^C Delta V_b is a compact term, above)
        (V(), _t(Vi("b"), 2), -1),
        (Vi("k"), _t(_d(Vi("b"), "k")), -2),
        (_t(Vi("b")), _t(V()), 1),
        (Wvv("k", "l"), _d(Vi("b"), "k", "l"), -1),
        (W2("q"), _d(Vi("b"), "k", "k"), 1),
        (_d(Vi("b"), "k"), _d(W2("q"), "k"), 2),
        (_d(Vi("l"), "k"), _d(Wvv("k", "l"), "b"), -1),
        (_d(Vi("k"), "k"), _d(W2("q"), "b"), 1),
        (_d(Vi("l"), "k"), _d(Wvv("b", "l"), "k"), 1),
        (_d(Vi("b"), "k"), _d(W2("q"), "k"), -1),
        (_d(Vi("l"), "k"), _d(Wvv("b", "k"), "l"), 1),
        (_d(Vi("l"), "b"), _d(W2("q"), "l"), -1),
        (_d(Vi("k"), "k"), _d(W2("q"), "b"), -1),
        (_t(V()), _d(W2("q"), "b"), -1),
        (_d(V(), "k"), _t(Wvv("b", "k")), 1),
        (_d(V(), "b"), _t(W2("q")), -1),
    ]
    return terms


def _tensor_products():
    """Every product in Sigma_bc at c^-2 that survives eps_{ab..} xhat_{..c} (times 1/(pi G)):
    Lambda^bc|eps^6/16 without its delta_bc part, and (1/4)(d_b dV d_c V + d_b V d_c dV) with
    dV = d_t^2 X/2."""
    V, Vi = _V, _Vi
    half_retarded = _scaled(_t(_factor("lin"), 2), sp.Rational(1, 2))
    return [
        (_t(Vi("b")), _d(V(), "c"), 1),
        (_t(Vi("c")), _d(V(), "b"), 1),
        (_d(Vi("k"), "b"), _d(Vi("k"), "c"), -1),
        (_d(Vi("b"), "k"), _d(Vi("c"), "k"), -1),
        (_d(Vi("k"), "b"), _d(Vi("c"), "k"), 1),
        (_d(Vi("k"), "c"), _d(Vi("b"), "k"), 1),
        (_d(half_retarded, "b"), _d(V(), "c"), sp.Rational(1, 4)),
        (_d(V(), "b"), _d(half_retarded, "c"), sp.Rational(1, 4)),
    ]


def _sum_products(products, n: int, free: tuple, order: int = 0):
    """sum of coefficient * :func:`_product_integral` over (first, second, coefficient)."""
    buckets: dict = {}
    for first, second, coefficient in products:
        _collect_curls(first, second, n, free, sp.Rational(coefficient), buckets)
    return _buckets_on_orbit(buckets, order)


def normalise(f):
    """delta^2 -> 1 - 4 nu and r ir -> 1 (ring of :mod:`stfalgebra.moments.orbit_polynomials`).

    Example
    -------
    >>> from stfalgebra.symbols import delta
    >>> normalise(op.from_expression(delta**2 * r) * op.from_expression(1 / r))
    -4*nu + 1"""
    out = {}
    for monomial, coefficient in op.reduce_mass_difference(f).terms():
        base = list(monomial)
        common = min(base[5], base[6])
        base[5] -= common
        base[6] -= common
        key = tuple(base)
        out[key] = out.get(key, 0) + coefficient
    return op.RING({key: value for key, value in out.items() if value})


def _mass_weight_terms(l: int, n: int):
    """The -G m_B/r12 parts of the 1PN weights of V_A and V_i^A in the eps^5 bracket: every cross
    product carries -(G m_B + G m_A)/r12 = -G m/r12, and in (3/4) d_t V_A d_b V_B the time
    derivative of V_A's weight gives G m_B (dr12/dt)/r12^2 (dr12/dt = rdot on the orbit)."""
    total = -_ring(G * m / r) * _sum_products(_one_pn_products(), n, ("b",), 0)
    rate = _ring(G * rdot / r**2)
    buckets: dict = {}
    for bodies, partner in (((0, 1), _M2), ((1, 0), _M1)):
        for x_monomial in _V():
            for y_monomial in _d(_V(), "b"):
                ordered = (x_monomial, y_monomial) if bodies == (0, 1) else (y_monomial, x_monomial)
                factor, form = _pair_flint(*ordered, n, ("b",))
                bucket = buckets.setdefault(sp.expand(G * partner * _M1 * _M2 * factor), {})
                for key, coefficient in _probe_curl_flint(form).items():
                    bucket[key] = bucket[key] + coefficient if key in bucket else coefficient
    total += sp.Rational(3, 4) * rate * _buckets_on_orbit(buckets, 0)
    return op.truncate(total, _TOP)


@lru_cache(maxsize=None)
def quadratic_field_terms(l: int):
    """The field terms of (Q1) bilinear in the potentials, coefficient of ell.k through eps^4:
    the 1PN field term on the 1PN orbit (eps^2 and eps^4) and the eps^4 terms of the module
    docstring.

    Example
    -------
    >>> op.truncate(quadratic_field_terms(1), 2)          # the 1PN field angular momentum
    7*eps**2*G*m**2*nu**2*ir"""
    e2, e4 = _eps(2), _eps(4)
    one_pn = op.truncate(_sum_products(_one_pn_products(), l, ("b",), 1), 2) * sp.Rational(1, l)
    total = op.truncate(e2 * one_pn, _TOP)
    total += e4 * _sum_products(_vector_products(), l, ("b",), 0) * sp.Rational(1, l)
    total += e4 * _mass_weight_terms(l, l) * sp.Rational(1, l)
    square = _sum_products(_one_pn_products("sq"), l, ("b",), 0) * sp.Rational(1, l)
    total += e4 * _derivative(square, 0, 2, 0) * sp.Rational(1, 2 * (2 * l + 3))
    stress = _sum_products(_tensor_products(), l + 1, ("b", "c"), 0) * sp.Rational(1, l * (l + 1))
    total += e4 * _derivative(stress, 0, 1, 0) * sp.Rational(-(2 * l + 1), (l + 2) * (2 * l + 3))
    return normalise(total)


@lru_cache(maxsize=None)
def non_cubic_terms(l: int):
    """All terms of J_L k_L/ell.k through eps^4 except the cubic non-compact ones.

    Example
    -------
    >>> op.truncate(non_cubic_terms(2), 0)                # J_ij = -m nu delta eps_ab<i x_j>a v_b
    -m*nu*delta*kx"""
    if isinstance(l, bool) or not isinstance(l, int) or l < 1:
        raise ValueError(f"current moments need l >= 1, got {l!r}")
    return normalise(compact_terms(l) + quadratic_field_terms(l))


def to_current_tensor(l: int, f, known) -> OrbitTensor:
    """The coefficient of ell.k (a ring element, probe polynomial of degree l - 1) as the rank-l
    current-type OrbitTensor sum s_ab1 x_<A v_B ell> (kx^a kv^b ell.k -> x_<A v_B ell>).

    Example
    -------
    >>> to_current_tensor(1, non_cubic_terms(1), KNOWN_THROUGH).terms[(0, 0, 1)].coefficient(0)
    nu*m"""
    shifted = op.RING({monomial[:9] + (monomial[9], monomial[10]): c for monomial, c in f.terms()})
    tensor = op.to_tensor(l - 1, shifted, known)
    terms = {(a, b, 1): series for (a, b, _), series in tensor.terms.items()}
    return OrbitTensor._trusted(l, terms, PLANAR_BASIS)


@lru_cache(maxsize=None)
def current_moment_two_pn(l: int) -> OrbitTensor:
    """J_L of two point masses through 2PN in the centre-of-mass frame (harmonic coordinates).

    The terms of this module plus the cubic non-compact terms
    (:func:`stfalgebra.moments.current_two_pn_cubic.cubic_field_term`, with the g-volume terms:
    :func:`two_pn_probe_polynomial`; for the l the stored table of
    :mod:`stfalgebra.moments.current_two_pn_table` holds, its derived-once result).

    Parameters
    ----------
    l:
        Multipole order, l >= 1.

    Returns
    -------
    OrbitTensor
        J_L = sum s_ab1 x_<A v_B ell>, PN-series coefficients in eps = 1/c, known through
        relative order 5/2 in the convention of the conservative inputs (as
        :func:`stfalgebra.moments.mass_two_pn.mass_moment_two_pn`; the 2.5PN radiation-reaction
        terms are :func:`stfalgebra.moments.current_reaction.reaction_current_moment`).

    Raises
    ------
    OrderBeyondInputsError
        The cubic non-compact terms are not available, or some of them are not derived yet
        (``current_two_pn_status.MISSING_TERMS``, named in the message).

    **Conventions**: x = y1 - y2, v = dx/dt, ell = x cross v, centre-of-mass frame.

    References
    ----------
    Module docstring, (Q1).
    """
    if isinstance(l, bool) or not isinstance(l, int) or l < 1:
        raise ValueError(f"current moments need l >= 1, got {l!r}")
    from . import current_two_pn_status as status

    if status.MISSING_TERMS:
        raise OrderBeyondInputsError(
            "2PN current moments need the cubic non-compact field terms, of which these are not "
            "derived yet: " + "; ".join(status.MISSING_TERMS))
    from .current_two_pn_table import stored_probe_polynomial

    polynomial = stored_probe_polynomial(l)      # derived once by this function, when tabulated
    if polynomial is None:
        try:
            from . import current_two_pn_cubic as cubic
        except ImportError:
            raise OrderBeyondInputsError(
                "2PN current moments need the cubic non-compact field terms "
                "(stfalgebra.moments.current_two_pn_cubic), which are not available") from None
        polynomial = two_pn_probe_polynomial(l, cubic.cubic_field_term)
    return to_current_tensor(l, polynomial, KNOWN_THROUGH)


def two_pn_probe_polynomial(l: int, cubic_field_term):
    """The coefficient of ell.k in J_L k_L through eps^4: :func:`non_cubic_terms` plus eps^4 times
    the cubic non-compact terms, given as the function of l that holds them
    (:func:`~stfalgebra.moments.current_two_pn_cubic.cubic_field_term`, the g-volume terms
    included; it returns the coefficient of ell.k/c^4, (k.x)^(l-1) and G^2 included).

    Example
    -------
    >>> op.truncate(two_pn_probe_polynomial(1, lambda l: op.RING(0)), 0)
    m*nu"""
    if isinstance(l, bool) or not isinstance(l, int) or l < 1:
        raise ValueError(f"current moments need l >= 1, got {l!r}")
    total = non_cubic_terms(l) + _eps(4) * cubic_field_term(l)
    return normalise(total)
