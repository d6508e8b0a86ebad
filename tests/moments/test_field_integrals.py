"""Independent checks of stfalgebra/moments/field_integrals.py (field part of the 1PN J_L).

The module rests on two inputs and one piece of algebra:

 (F1) Sigma_b^field = (1/(pi G c^2)) [d_k V (d_b V_k - d_k V_b) + (3/4) d_t V d_b V],
      V = G (m1/r1 + m2/r2), V_k = G (m1 v1^k/r1 + m2 v2^k/r2);
 (F2) K_L = FP int d^3x xhat_L/(r1 r2) = -(2 pi/(l+1)) r12 sum_p y1_<L-P y2_P>;
 and an operator algebra (derivatives with respect to the body positions) that turns the
 cross terms of (F1) into C_l eps_{ab<i_l} x_{L-1>a} v_b in the centre-of-mass frame.

What is checked here, each by a method that does not share code with the module's algebra:

 1. (F2) symbolically: Laplacian of K_L in y1 and in y2 for l = 0..5 (the Poisson equation
    that the finite-part integral has to satisfy, from Delta_y (1/|x - y|) = -4 pi delta).
 2. (F2) numerically: direct quadrature of the finite part with the regulator (|x|/r0)^B,
    at several body configurations (fixed ones and hypothesis-drawn ones).
 3. The whole field term, brute force: Sigma_b^field built component by component from (F1),
    every cross term applied as d^2/(dy1_i dy2_j) to the closed form K_{L-1 a} (Leibniz rule
    on r12 times a polynomial; all derivatives taken by sympy), contracted with eps,
    projected STF, evaluated in the centre-of-mass frame; compared with the module for
    l = 1..3. Plus l = 1 against the published 1PN angular momentum.
 4. The self terms (m1^2) of (F1): pure powers of r1 whose logarithmic (r1^-3) part has zero
    angular integral, so they vanish in Hadamard + finite-part regularisation, and the switch
    to the origin-centred regulator |x|^B at infinity costs nothing.

Big polynomials are handled in a sympy polynomial ring over QQ (fast exact arithmetic); the
square root r12 only enters through small expressions that sympy differentiates.
"""

from __future__ import annotations

import itertools
import re
from functools import lru_cache

import numpy as np
import pytest
import sympy as sp
from hypothesis import example, given, settings
from hypothesis import strategies as st
from numpy.polynomial.legendre import leggauss
from scipy.special import eval_legendre

from stfalgebra.moments.field_integrals import (
    field_current_coefficient,
    kernel_coefficient_polynomial,
)
from stfalgebra.stf.cartesian import PROBE, contract_cartesian, harmonic_part_cartesian
from stfalgebra.symbols import G, c, delta, m, nu, r

k1, k2, k3 = PROBE
PROPERTY = settings(max_examples=8, deadline=None)

# Explicit components: y1 = (a1, a2, a3), y2 = (b1, b2, b3); centre-of-mass data x = (x1, x2, 0),
# v = (w1, w2, 0) (orbital plane z = 0, generic in-plane vectors).
Y1 = sp.symbols("a1:4", real=True)
Y2 = sp.symbols("b1:4", real=True)
x1, x2, w1, w2 = sp.symbols("x1 x2 w1 w2", real=True)
RING, *_GENERATORS = sp.ring([*Y1, *Y2, *PROBE, delta, x1, x2, w1, w2], sp.QQ)
RY1 = tuple(_GENERATORS[0:3])
RY2 = tuple(_GENERATORS[3:6])
RK = tuple(_GENERATORS[6:9])
RDELTA = _GENERATORS[9]
RX = (_GENERATORS[10], _GENERATORS[11], RING(0))
RV = (_GENERATORS[12], _GENERATORS[13], RING(0))
R12 = sp.sqrt(sum((p - q) ** 2 for p, q in zip(Y1, Y2)))


def dot(u, w):
    return sum((p * q for p, q in zip(u, w)), 0)


def levi_civita(i: int, j: int, k: int) -> int:
    return int(sp.LeviCivita(i, j, k))


# ------------------------------------------------------------------ the closed form (F2)


@lru_cache(maxsize=None)
def kernel_stf_polynomial(l: int):
    """STF[sum_p y1_{L-P} y2_P] k_L as a ring element, from the module's G(u1, u2).

    K_L k_L = -(2 pi/(l+1)) r12 times this. The STF projection is the project's
    harmonic_part_cartesian (the module drops the traces; here they are kept).
    """
    polynomial = kernel_coefficient_polynomial(l)
    u1, u2 = sp.symbols("u1 u2")
    assert polynomial.free_symbols <= {u1, u2}
    on_bodies = polynomial.xreplace({u1: dot(Y1, PROBE), u2: dot(Y2, PROBE)})
    return RING.from_expr(harmonic_part_cartesian(sp.expand(on_bodies), l))


@lru_cache(maxsize=None)
def r12_factor(first, second=None):
    """r12 d_s r12 (one variable) or r12^3 d_s d_t r12 (two): polynomials, by sympy diff."""
    if second is None:
        expression = sp.diff(R12, first) * R12
    else:
        expression = sp.diff(R12, first, second) * R12**3
    expression = sp.expand(sp.cancel(expression))
    assert expression.is_polynomial(*Y1, *Y2), expression
    return RING.from_expr(expression)


def ring_generator(symbol):
    return {**dict(zip(Y1, RY1)), **dict(zip(Y2, RY2))}[symbol]


def r12_cubed_second_derivative(h, first, second):
    """r12^3 d_s d_t (r12 h) for a polynomial h (Leibniz rule; s, t body components)."""
    s, t = ring_generator(first), ring_generator(second)
    r12_squared = sum(((p - q) ** 2 for p, q in zip(RY1, RY2)), RING(0))
    return (
        r12_factor(first, second) * h
        + r12_squared * (r12_factor(first) * h.diff(t) + r12_factor(second) * h.diff(s))
        + r12_squared**2 * h.diff(s).diff(t)
    )


# ------------------------------------------------------------------ 1. Laplacian of K_L


@pytest.mark.parametrize("l", range(6))
@pytest.mark.parametrize("body", [1, 2])
def test_kernel_solves_poisson_equation_in_each_body_position(l, body):
    # Delta_{yA} K_L = -4 pi yhatA_L/r12: from Delta_y (1/|x - y|) = -4 pi delta(x - y) applied
    # under the integral (the finite part at infinity commutes with d/dy) (common practice).
    # In ring form: r12^3 Delta (r12 H) = 2 (l + 1) r12^2 STF[(yA.k)^l].
    position = Y1 if body == 1 else Y2
    h = kernel_stf_polynomial(l)
    laplacian = sum((r12_cubed_second_derivative(h, s, s) for s in position), RING(0))
    r12_squared = sum(((p - q) ** 2 for p, q in zip(RY1, RY2)), RING(0))
    source = RING.from_expr(harmonic_part_cartesian(sp.expand(dot(position, PROBE) ** l), l))
    assert laplacian == 2 * (l + 1) * r12_squared * source


def test_kernel_coefficient_polynomial_values():
    # sum_{p=0}^{l} u1^(l-p) u2^p written out (definition in (F2))
    u1, u2 = sp.symbols("u1 u2")
    assert sp.expand(kernel_coefficient_polynomial(2) - (u1**2 + u1 * u2 + u2**2)) == 0
    assert sp.expand(kernel_coefficient_polynomial(3) * (u1 - u2) - (u1**4 - u2**4)) == 0


# ------------------------------------------------------------------ 2. numerical finite part


def closed_form_contraction(l: int, y1, y2, probe: sp.Expr) -> float:
    """P_L K_L from (F2) at rational body positions, P_L the STF tensor of ``probe``."""
    h = kernel_stf_polynomial(l).as_expr().xreplace({**dict(zip(Y1, y1)), **dict(zip(Y2, y2))})
    r12 = sp.sqrt(sum((p - q) ** 2 for p, q in zip(y1, y2)))
    return float(contract_cartesian(probe, -2 * sp.pi / (l + 1) * r12 * h, l))


def sphere_rule(n_theta: int, n_phi: int):
    """Gauss-Legendre in cos(theta) times the trapezoid rule in phi: exact for polynomials in
    n of degree < min(2 n_theta, n_phi)."""
    cos_theta, w_theta = leggauss(n_theta)
    phi = 2 * np.pi * np.arange(n_phi) / n_phi
    sin_theta = np.sqrt(1 - cos_theta**2)
    directions = np.stack(
        [
            np.outer(sin_theta, np.cos(phi)),
            np.outer(sin_theta, np.sin(phi)),
            np.outer(cos_theta, np.ones(n_phi)),
        ],
        axis=-1,
    ).reshape(-1, 3)
    weights = np.outer(w_theta, np.full(n_phi, 2 * np.pi / n_phi)).reshape(-1)
    return directions, weights


def finite_part_by_quadrature(l, y1, y2, probe, sigma_c=1.5, radius=None, series_order=40):
    """FP_{B=0} int d^3x (|x|/r0)^B P(x)/(r1 r2), P(x) = P_L x_L harmonic of degree l.

    Three regions, every one with a smooth integrand:
    - the prolate spheroid r1 + r2 < 2 a sigma_c around the bodies (a = r12/2), in prolate
      spheroidal coordinates where d^3x/(r1 r2) = a dsigma dtau dphi (the 1/r_A singularities
      disappear; after the phi integral P is a polynomial in sigma, tau: Gauss is exact);
    - the shell between that spheroid and the ball |x| < R, rays from the origin with the
      spheroid boundary solved from its quadratic (origin inside the spheroid), Gauss in r;
    - outside the ball: 1/r_A = sum_j |y_A|^j P_j(n.yhat_A)/|x|^(j+1), each power integrated
      with FP int_R^oo r^(p+B) dr = -R^(p+1)/(p+1); the p = -1 terms (pole in B) must have
      zero angular integral, and their largest size is returned for the test to check.

    Returns (value, largest |angular integral| of a p = -1 term).
    """
    y1 = np.asarray(y1, dtype=float)
    y2 = np.asarray(y2, dtype=float)
    evaluate = sp.lambdify(PROBE, probe, "numpy")

    def p_of(x):
        return evaluate(x[..., 0], x[..., 1], x[..., 2]) * np.ones(x.shape[:-1])

    r12 = np.linalg.norm(y1 - y2)
    a = r12 / 2
    axis = (y1 - y2) / r12
    middle = (y1 + y2) / 2
    helper = np.array([1.0, 0.0, 0.0]) if abs(axis[0]) < 0.9 else np.array([0.0, 1.0, 0.0])
    e1 = np.cross(axis, helper)
    e1 /= np.linalg.norm(e1)
    e2 = np.cross(axis, e1)
    semi_major = a * sigma_c
    semi_minor_squared = semi_major**2 - a**2
    if np.linalg.norm(y1) + np.linalg.norm(y2) >= 2 * semi_major:
        raise ValueError(f"origin outside the spheroid for sigma_c={sigma_c}")
    if radius is None:
        radius = 2 * (np.linalg.norm(middle) + semi_major)
    if radius <= np.linalg.norm(middle) + semi_major:
        raise ValueError(f"ball radius {radius} does not contain the spheroid")

    # spheroid: x = middle + a sigma tau e + a sqrt((sigma^2-1)(1-tau^2)) (cos phi e1 + sin phi e2)
    nodes, weights = leggauss(12)
    sigma = 1 + (sigma_c - 1) * (nodes + 1) / 2
    w_sigma = weights * (sigma_c - 1) / 2
    n_phi = 2 * l + 4
    phi = 2 * np.pi * np.arange(n_phi) / n_phi
    S, T, F = np.meshgrid(sigma, nodes, phi, indexing="ij")
    perpendicular = a * np.sqrt((S**2 - 1) * (1 - T**2))
    x = (
        middle
        + (a * S * T)[..., None] * axis
        + (perpendicular * np.cos(F))[..., None] * e1
        + (perpendicular * np.sin(F))[..., None] * e2
    )
    w = np.einsum("i,j->ij", w_sigma, weights)[..., None] * (2 * np.pi / n_phi)
    spheroid = a * np.sum(w * p_of(x))

    # shell: ray t n meets the spheroid where q2 t^2 + q1 t + q0 = 0
    directions, w_directions = sphere_rule(40, 80)
    along = directions @ axis
    middle_along = middle @ axis
    difference = 1 / semi_major**2 - 1 / semi_minor_squared
    q2 = difference * along**2 + 1 / semi_minor_squared
    q1 = -2 * difference * along * middle_along - 2 * (directions @ middle) / semi_minor_squared
    q0 = difference * middle_along**2 + (middle @ middle) / semi_minor_squared - 1
    inner_radius = (-q1 + np.sqrt(q1**2 - 4 * q2 * q0)) / (2 * q2)
    nodes, weights = leggauss(40)
    rr = inner_radius[:, None] + (radius - inner_radius)[:, None] * (nodes[None, :] + 1) / 2
    w_r = (radius - inner_radius)[:, None] * weights[None, :] / 2
    x = rr[..., None] * directions[:, None, :]
    integrand = p_of(x) / (np.linalg.norm(x - y1, axis=-1) * np.linalg.norm(x - y2, axis=-1))
    shell = np.sum(w_directions[:, None] * w_r * rr**2 * integrand)

    # outside: multipole series, finite part of each radial power
    directions, w_directions = sphere_rule(series_order // 2 + l + 2, 2 * (series_order + l) + 4)
    p_on_sphere = p_of(directions)

    def legendre_series(y):
        size = np.linalg.norm(y)
        if size == 0.0:  # 1/|x - 0| = 1/|x|: only j = 0
            return [np.ones(len(directions))] + [np.zeros(len(directions))] * series_order, 1.0
        cosine = directions @ (y / size)
        return [eval_legendre(j, cosine) for j in range(series_order + 1)], size

    legendre1, size1 = legendre_series(y1)
    legendre2, size2 = legendre_series(y2)
    outside = 0.0
    largest_pole = 0.0
    for j1 in range(series_order + 1):
        for j2 in range(series_order + 1 - j1):
            angular = np.sum(w_directions * p_on_sphere * legendre1[j1] * legendre2[j2])
            angular *= size1**j1 * size2**j2
            power = l - j1 - j2
            if power == -1:
                largest_pole = max(largest_pole, abs(angular))
                continue
            outside += angular * (-(radius ** (power + 1)) / (power + 1))
    return spheroid + shell + outside, largest_pole


def stf(expression, rank):
    return harmonic_part_cartesian(sp.expand(expression), rank)


frac = sp.Rational
# (y1, y2): a general configuration, one collinear with the origin (centre-of-mass-like), and
# one with the origin far from the midpoint.
CONFIGURATIONS = [
    ((frac(3, 10), frac(1, 5), -frac(1, 10)), (-frac(1, 2), frac(1, 10), frac(1, 4))),
    ((frac(3, 5), frac(0), frac(0)), (-frac(2, 5), frac(0), frac(0))),
    ((frac(1, 2), frac(1, 2), frac(1, 5)), (frac(1, 10), -frac(3, 10), frac(0))),
]
PROBES = {
    0: [sp.Integer(1)],
    1: [k1 - 2 * k2 + 3 * k3, k2],
    2: [stf(k1 * k2 + 2 * k3**2 - k1 * k3, 2), stf(k1**2, 2)],
}


@pytest.mark.parametrize("configuration", CONFIGURATIONS)
@pytest.mark.parametrize(
    "l, probe", [(l, probe) for l, probes in PROBES.items() for probe in probes]
)
def test_kernel_equals_numerical_finite_part(configuration, l, probe):
    # reference: direct quadrature of the finite-part integral (method in the helper)
    y1, y2 = configuration
    numeric, pole = finite_part_by_quadrature(l, y1, y2, probe)
    assert pole < 1e-12  # the p = -1 (log) terms have zero angular integral
    expected = closed_form_contraction(l, y1, y2, probe)
    assert numeric == pytest.approx(expected, rel=1e-6, abs=1e-9)


@pytest.mark.parametrize("l", [0, 1, 2])
def test_numerical_finite_part_does_not_depend_on_the_split(l):
    # the finite part is one number: moving the ball radius R and the spheroid must not change
    # it (a check on the quadrature itself; common practice)
    y1, y2 = CONFIGURATIONS[0]
    probe = PROBES[l][0]
    first, _ = finite_part_by_quadrature(l, y1, y2, probe, sigma_c=1.5, radius=2.0)
    second, _ = finite_part_by_quadrature(l, y1, y2, probe, sigma_c=2.5, radius=5.0)
    assert first == pytest.approx(second, rel=1e-9, abs=1e-12)


coordinate = st.integers(min_value=-6, max_value=6).map(lambda n: sp.Rational(n, 10))
position = st.tuples(coordinate, coordinate, coordinate)


@PROPERTY
@given(
    l=st.integers(min_value=0, max_value=2),
    y1=position,
    y2=position,
    weights=st.lists(st.integers(min_value=-3, max_value=3), min_size=6, max_size=6),
)
# pins: a body at the origin (l = 0 and l = 2)
@example(l=0, y1=(frac(1, 2), 0, 0), y2=(0, 0, 0), weights=[1] * 6)
@example(l=2, y1=(0, 0, 0), y2=(0, frac(3, 5), 0), weights=[1, 0, 2, 0, -1, 1])
def test_kernel_equals_numerical_finite_part_at_any_configuration(l, y1, y2, weights):
    # reference: direct quadrature of the finite-part integral (helper above)
    separation = np.linalg.norm(np.array(y1, dtype=float) - np.array(y2, dtype=float))
    if separation < 0.3:
        return  # quadrature of the shell needs the bodies apart; not a property of (F2)
    monomials = {
        0: [sp.Integer(1)],
        1: [k1, k2, k3],
        2: [k1**2, k2**2, k1 * k2, k1 * k3, k2 * k3, k3**2],
    }[l]
    probe = stf(sum(w * monomial for w, monomial in zip(weights, monomials)), l)
    if probe == 0:
        return
    distances = sum(np.linalg.norm(np.array(y, dtype=float)) for y in (y1, y2))
    spread = distances / separation  # >= 1; the spheroid must contain the origin
    numeric, pole = finite_part_by_quadrature(l, y1, y2, probe, sigma_c=max(1.5, 1.2 * spread))
    assert pole < 1e-10
    expected = closed_form_contraction(l, y1, y2, probe)
    scale = 2 * np.pi * separation * max(1.0, np.abs(weights).max()) * 2.0**l
    assert abs(numeric - expected) < 1e-6 * scale


# ------------------------------------------------------------------ 3. brute-force field term


def symbolic_velocities():
    return sp.symbols("v1_1:4", real=True), sp.symbols("v2_1:4", real=True)


def field_cross_terms():
    """Sigma_b^field of (F1) over G m1 m2/(pi c^2), written out in components.

    The gradients d_i(1/r1), d_j(1/r2) are the placeholders p_i, q_j, and
    d_t(1/r_A) = -v_A.grad(1/r_A) (the field point is fixed, the body moves). Returns, for
    each b, the map (i, j) -> coefficient of p_i q_j (a polynomial in the velocities): the
    cross terms; p p and q q are the self terms (checked separately below).
    """
    v1, v2 = symbolic_velocities()
    p = sp.symbols("p1:4")
    q = sp.symbols("q1:4")
    m1, m2 = sp.symbols("m1 m2", positive=True)
    grad_v = [G * (m1 * p[i] + m2 * q[i]) for i in range(3)]
    grad_vk = [[G * (m1 * v1[k] * p[b] + m2 * v2[k] * q[b]) for b in range(3)] for k in range(3)]
    time_derivative = -G * (m1 * dot(v1, p) + m2 * dot(v2, q))
    result = []
    for b in range(3):
        sigma = sum(grad_v[k] * (grad_vk[k][b] - grad_vk[b][k]) for k in range(3))
        sigma += sp.Rational(3, 4) * time_derivative * grad_v[b]
        sigma = sp.expand(sigma / (sp.pi * G * c**2) / (G * m1 * m2 / (sp.pi * c**2)))
        cross = {}
        for monomial, coefficient in sp.Poly(sigma, *p, *q).terms():
            if sum(monomial[:3]) == 1 and sum(monomial[3:]) == 1:
                key = (monomial[:3].index(1), monomial[3:].index(1))
                assert not coefficient.has(m1, m2, G, c)
                cross[key] = coefficient
        result.append(cross)
    return result


def at_centre_of_mass(element):
    """y1 = X2 x, y2 = -X1 x with X1 = (1 + delta)/2, X2 = (1 - delta)/2."""
    x_1 = (1 + RDELTA) / 2
    x_2 = (1 - RDELTA) / 2
    return element.compose(
        [(RY1[i], x_2 * RX[i]) for i in range(3)] + [(RY2[i], -x_1 * RX[i]) for i in range(3)]
    )


def velocities_at_centre_of_mass(expression):
    """v1 = X2 v, v2 = -X1 v."""
    v1, v2 = symbolic_velocities()
    x_1 = (1 + RDELTA) / 2
    x_2 = (1 - RDELTA) / 2
    images = [x_2 * RV[i] for i in range(3)] + [-x_1 * RV[i] for i in range(3)]
    result = RING(0)
    for monomial, coefficient in sp.Poly(expression, *v1, *v2).terms():
        term = RING(coefficient)
        for image, power in zip(images, monomial):
            if power:  # the ring refuses 0**0 (v_z = 0)
                term *= image**power
        result += term
    return result


def rotate(h, b):
    """eps_{abc} k_c d/dk_a h: the open index a of xhat_{L-1 a} contracted with eps."""
    result = RING(0)
    for a, c_ in itertools.product(range(3), range(3)):
        sign = levi_civita(a, b, c_)
        if sign:
            result += sign * h.diff(RK[a]) * RK[c_]
    return result


def brute_force_field_term(l):
    """r^3 (c^2 l (l+1)/(-2 G nu m^2)) J_L^field k_L, STF over L, centre-of-mass frame.

    J_L^field = eps_{ab<i_l} int xhat_{L-1>a} Sigma_b^field
              = (G m1 m2/(pi c^2)) (-2 pi/(l+1)) (1/l) STF[eps_{abc} k_c d/dk_a (sum_ij M_bij
                 r12^-3 [r12^3 D1_i D2_j (r12 H)])], with d_i(1/r1) d_j(1/r2) = D1_i D2_j 1/(r1 r2).
    """
    h = kernel_stf_polynomial(l)
    total = RING(0)
    for b, cross in enumerate(field_cross_terms()):
        rotated = rotate(h, b)
        for (i, j), coefficient in cross.items():
            derivative = r12_cubed_second_derivative(rotated, Y1[i], Y2[j])
            total += velocities_at_centre_of_mass(coefficient) * at_centre_of_mass(derivative)
    return RING.from_expr(stf(total.as_expr(), l))


@pytest.mark.parametrize("l", [1, 2, 3])
def test_field_term_brute_force_matches_module(l):
    # reference: the brute-force component computation above (built from (F1) and (F2) only)
    brute = brute_force_field_term(l)
    # module: C_l STF[eps_{ab<i_l} x_{L-1>a} v_b], probe polynomial (x.k)^(l-1) (x cross v).k
    ell_z = RX[0] * RV[1] - RX[1] * RV[0]
    structure = RING.from_expr(stf((dot(RX, RK) ** (l - 1) * ell_z * RK[2]).as_expr(), l))
    reduced = sp.expand(field_current_coefficient(l) * c**2 * r / (G * m**2))
    reduced = sp.expand(reduced.subs(nu, (1 - delta**2) / 4))
    assert not reduced.has(G, m, c, r, nu)
    nu_of_delta = (1 - RDELTA**2) / 4
    r_squared = RX[0] ** 2 + RX[1] ** 2  # r12 = r in the CM frame: brute has r^-3, C_l has r^-1
    assert -2 * nu_of_delta * brute == l * (l + 1) * RING.from_expr(reduced) * r_squared * structure


def test_field_term_brute_force_is_not_trivially_zero():
    # guard: the comparison above would pass for a vanishing structure
    assert brute_force_field_term(2) != 0
    assert field_current_coefficient(2) != 0


def test_dipole_field_term_completes_the_1pn_angular_momentum():
    # 1PN angular momentum in harmonic coordinates, CM frame (from memory; e.g. Blanchet,
    # Living Rev. Relativ. 17, 2 (2014), the conserved J of the 1PN dynamics):
    #   J = m nu (x cross v) [1 + (1 - 3 nu) v^2/2 + (3 + nu) G m/r].
    # J_i is the l = 1 current moment (the d_t terms of the 1PN current moment cancel for
    # l = 1). Its G m/r part is the compact weight 3 G m_B/r of each body,
    # sum_A m_A s_A^2 (3 G m_B/r) with s1 = X2, s2 = -X1 (the 1PN shift of the CM positions
    # cancels at first order: sum_A m_A s_A = 0), plus the field term.
    X1 = (1 + delta) / 2
    X2 = (1 - delta) / 2
    compact = 3 * G * m**2 * (X1 * X2**2 * X2 + X2 * X1**2 * X1) / (r * c**2)
    field = field_current_coefficient(1)
    expected = m * nu * (3 + nu) * G * m / (r * c**2)
    difference = sp.expand((compact + field - expected).subs(nu, (1 - delta**2) / 4))
    assert difference == 0


# ------------------------------------------------------------------ 4. self terms

SELF_Y = sp.symbols("Y1:4", real=True)  # body 1
SELF_V = sp.symbols("V1:4", real=True)  # its velocity
SELF_N = sp.symbols("n1:4", real=True)  # unit vector (also the field point on the unit sphere)
RHO = sp.Symbol("rho", positive=True)
SELF_RING, *_SELF_GENERATORS = sp.ring([*SELF_Y, *SELF_V, *SELF_N, RHO, *PROBE], sp.QQ)
SELF_RY = tuple(_SELF_GENERATORS[0:3])
SELF_RN = tuple(_SELF_GENERATORS[6:9])
SELF_RRHO = _SELF_GENERATORS[9]
SELF_RK = tuple(_SELF_GENERATORS[10:13])


def self_term_density():
    """pi Sigma_b^self of (F1) for body 1 alone (its m1^2 terms, G = m1 = c = 1), by sympy diff
    in the field point x and in the body position y (d_t = v.d/dy). Returns (x, components)."""
    x = sp.symbols("X1:4", real=True)
    inverse_distance = 1 / sp.sqrt(sum((p - q) ** 2 for p, q in zip(x, SELF_Y)))
    potential = inverse_distance
    vector_potential = [SELF_V[k] * inverse_distance for k in range(3)]
    time_derivative = sum(SELF_V[i] * sp.diff(potential, SELF_Y[i]) for i in range(3))
    sigma = []
    for b in range(3):
        value = sum(
            sp.diff(potential, x[k])
            * (sp.diff(vector_potential[k], x[b]) - sp.diff(vector_potential[b], x[k]))
            for k in range(3)
        )
        sigma.append(value + sp.Rational(3, 4) * time_derivative * sp.diff(potential, x[b]))
    return x, sigma


def replace_powers(expression, base, image):
    """base**e -> image(e) everywhere (sympy keeps |x - y|^e as a power of the sum of squares)."""
    return expression.replace(lambda e: e.is_Pow and e.base == base, lambda e: image(e.exp))


def current_moment_integrand(l, position, density):
    """l STF-free integrand eps_{abc} k_c d/dk_a (xhat_L k_L) Sigma_b (ring elements)."""
    n_dot_k = sum((p * k for p, k in zip(SELF_RN, SELF_RK)), SELF_RING(0))
    xhat = SELF_RING.from_expr(stf(n_dot_k.as_expr() ** l, l))
    xhat = xhat.compose(list(zip(SELF_RN, position)))
    result = SELF_RING(0)
    for a, b, c_ in itertools.product(range(3), repeat=3):
        sign = levi_civita(a, b, c_)
        if sign:
            result += sign * SELF_RK[c_] * xhat.diff(SELF_RK[a]) * density[b]
    return result


def sphere_average(element):
    """(1/4 pi) int dOmega over n of a polynomial in n: n^a averages to
    (a1-1)!! (a2-1)!! (a3-1)!!/(a1+a2+a3+1)!! for a1, a2, a3 even, else 0 (common practice)."""
    slots = [SELF_RING.gens.index(g) for g in SELF_RN]
    terms = {}
    for monomial, coefficient in element.terms():
        powers = [monomial[i] for i in slots]
        if any(power % 2 for power in powers):
            continue
        weight = sp.Mul(*[sp.factorial2(power - 1) for power in powers])
        weight /= sp.factorial2(sum(powers) + 1)
        rest = tuple(0 if i in slots else e for i, e in enumerate(monomial))
        terms[rest] = terms.get(rest, 0) + coefficient * sp.QQ.convert(weight)
    return SELF_RING.from_dict(terms)


@pytest.mark.parametrize("l", [2, 3])
def test_self_terms_are_pure_powers_with_no_logarithmic_part(l):
    # claim of the module docstring: the m1^2 terms vanish in Hadamard + finite-part
    # regularisation. Around body 1, x = y + rho n: Sigma^self = rho^-4 F(n) exactly, so the
    # integrand of J_L times the volume factor rho^2 is sum_j rho^(j-2) A_j(n), j = 0..l.
    # Each int_0^oo rho^lambda drho with lambda != -1 is scale-free: the Hadamard part at 0 plus
    # the finite part at infinity, split at any s, give s^(lambda+1)/(lambda+1) minus the same,
    # = 0. The lambda = -1 term (j = 1) would leave a logarithm unless its angular integral
    # vanishes: it does (it is odd in n). Method: common practice for scale-free integrals.
    x, sigma = self_term_density()
    squared_distance = sum((p - q) ** 2 for p, q in zip(x, SELF_Y))
    density = []
    for component in sigma:
        component = replace_powers(component, squared_distance, lambda e: RHO ** (2 * e))
        component = component.xreplace({x[i]: SELF_Y[i] + RHO * SELF_N[i] for i in range(3)})
        component = sp.expand(component * RHO**4)
        assert RHO not in component.free_symbols  # exactly rho^-4 F(n)
        assert not component.free_symbols & set(SELF_Y)
        density.append(SELF_RING.from_expr(component))
    position = [SELF_RY[i] + SELF_RRHO * SELF_RN[i] for i in range(3)]
    integrand = current_moment_integrand(l, position, density)  # times rho^-2: powers rho^(j-2)
    rho_slot = SELF_RING.gens.index(SELF_RRHO)
    assert max(monomial[rho_slot] for monomial in integrand.itermonoms()) <= l
    logarithmic = SELF_RING.from_dict(
        {
            monomial: coefficient
            for monomial, coefficient in integrand.terms()
            if monomial[rho_slot] == 1
        }
    )
    assert logarithmic != 0  # a candidate logarithm ...
    assert sphere_average(logarithmic) == 0  # ... with zero angular integral


@pytest.mark.parametrize("l", [2, 3])
def test_self_terms_do_not_feel_where_the_infinity_regulator_is_centred(l):
    # The finite part at infinity uses (|x|/r0)^B (origin-centred), not (r1/r0)^B. Switching
    # costs nothing if no term of the large-|x| expansion about the origin decays like
    # |x|^-3 with a non-zero angular integral (only such a term makes a pole in B). The
    # integrand scales as F(s x; s y) = s^(l-4) F(x; y), so its Taylor term of order n in y is
    # homogeneous of degree l - 4 - n in x: degree -3 is n = l - 1. Method: common practice
    # (finite-part integrals), checked exactly on the unit sphere |x| = 1.
    x, sigma = self_term_density()
    eps = sp.Symbol("eps")
    unit = sum(p**2 for p in x)
    density = []
    for component in sigma:
        scaled = component.xreplace({y: eps * y for y in SELF_Y})
        taylor = sp.diff(scaled, eps, l - 1).xreplace({eps: 0}) / sp.factorial(l - 1)
        taylor = replace_powers(taylor, unit, lambda e: sp.Integer(1))
        taylor = sp.expand(taylor.xreplace(dict(zip(x, SELF_N))))
        density.append(SELF_RING.from_expr(taylor))
    integrand = current_moment_integrand(l, list(SELF_RN), density)
    assert integrand != 0
    assert sphere_average(integrand) == 0


# ------------------------------------------------------------------ input validation


@pytest.mark.parametrize("bad", [0, -1])
def test_field_current_coefficient_rejects_ranks_below_one(bad):
    with pytest.raises(ValueError, match=str(bad)):
        field_current_coefficient(bad)


@pytest.mark.parametrize("bad", [2.0, "2", sp.Rational(1, 2)])
def test_field_current_coefficient_rejects_non_integers(bad):
    with pytest.raises((TypeError, ValueError), match=re.escape(repr(bad))):
        field_current_coefficient(bad)


@pytest.mark.parametrize("bad", [-1, 1.5])
def test_kernel_coefficient_polynomial_rejects_bad_ranks(bad):
    with pytest.raises((TypeError, ValueError), match=str(bad)):
        kernel_coefficient_polynomial(bad)


def test_sphere_average_of_low_monomials():
    # <n1^2> = 1/3, <n1^4> = 1/5, <n1^2 n2^2> = 1/15, <n1> = 0 (common practice)
    n1, n2, _ = SELF_RN
    assert sphere_average(n1**2) == SELF_RING(sp.Rational(1, 3))
    assert sphere_average(n1**4) == SELF_RING(sp.Rational(1, 5))
    assert sphere_average(n1**2 * n2**2) == SELF_RING(sp.Rational(1, 15))
    assert sphere_average(n1 * SELF_RK[0]) == 0
