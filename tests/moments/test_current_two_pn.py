"""Checks of stfalgebra/moments/current_two_pn.py: the probe form (J2) of the current moment
and the pair-operator route, against independent references.

1. (J2) at the integrand level: eps_{ab<i_l} xhat_{L-1>a} S_b k_L = (k.x)^(l-1) k.(x cross S)
   for a null k, with xhat_L from the project's STF core (harmonic_part_cartesian) and the
   eps contraction done in components.
2. probe_curl against components: eps_{abc} k_c d/dk_a F_b by sympy for explicit vectors.
3. The pair-operator route reproduces the 1PN field term of field_integrals (derived there by a
   hand-written operator algebra and checked by brute-force components) for l = 1..8.
"""

from __future__ import annotations

import random

import pytest
import sympy as sp

from stfalgebra.moments import invariants as inv
from stfalgebra.moments.current_two_pn import curl_on_newtonian_orbit, one_pn_field_term
from stfalgebra.moments.field_integrals import field_current_term
from stfalgebra.stf.cartesian import PROBE, harmonic_part_cartesian

IR = sp.Symbol("ir", positive=True)


def _cross(a, b):
    return [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]]


@pytest.mark.parametrize("l", [1, 2, 3, 4])
def test_probe_form_of_the_current_integrand(l):
    rng = random.Random(l)
    x = [sp.Rational(rng.randint(-9, 9), 7) for _ in range(3)]
    s = [sp.Rational(rng.randint(-9, 9), 5) for _ in range(3)]
    xs = sp.symbols("q1:4")
    stf = harmonic_part_cartesian(sp.expand(sum(p * q for p, q in zip(PROBE, xs))**l), l)  # xhat_L k'_L
    null = [sp.Integer(3), sp.Integer(4), 5 * sp.I]          # 9 + 16 - 25 = 0
    assert sum(p**2 for p in null) == 0
    at_x = dict(zip(xs, x))
    # eps_{abc} k_c xhat_{aL-1} k_{L-1} S_b, with xhat_{aL-1} k_{L-1} = (1/l) d/dk'_a (xhat_L k'_L)
    gradient = [sp.diff(stf, PROBE[a]).subs(at_x) / l for a in range(3)]
    at_k = dict(zip(PROBE, null))
    total = 0
    for a in range(3):
        for b in range(3):
            for c in range(3):
                total += sp.LeviCivita(a, b, c) * null[c] * gradient[a].subs(at_k) * s[b]
    expected = sum(p * q for p, q in zip(null, x))**(l - 1) * sum(p * q for p, q in zip(null, _cross(x, s)))
    assert sp.expand(total - expected) == 0
    assert expected != 0


def test_probe_curl_matches_components():
    rng = random.Random(3)
    vectors = {name: [sp.Rational(rng.randint(-9, 9), 4) for _ in range(3)] for name in inv.VECTORS[1:]}
    k = sp.symbols("k1:4")
    dots = {name: sum(p * q for p, q in zip(k, vectors[name])) for name in vectors}
    form = {"v2": inv.dot("k", "y1")**2 * inv.dot("k", "v1"), "y1": inv.dot("k", "y2") * inv.dot("y1", "v2"),
            "k": inv.dot("k", "y1")}
    # components: F_b = sum_w C_w(k) w_b, C_w through the explicit dot products
    values = {str(inv.dot("k", name)): dots[name] for name in vectors}
    values[str(inv.dot("y1", "v2"))] = sum(p * q for p, q in zip(vectors["y1"], vectors["v2"]))
    values["ky1"] = dots["y1"]

    def component(b):
        out = 0
        for w, coefficient in form.items():
            direction = k if w == "k" else vectors[w]
            out += inv.evaluate(coefficient, values) * direction[b]
        return out

    brute = sum(sp.LeviCivita(a, b, c) * k[c] * sp.diff(component(b), k[a])
                for a in range(3) for b in range(3) for c in range(3))
    triple = 0
    for (p, w), coefficient in inv.probe_curl(form).items():
        triple += inv.evaluate(coefficient, values) * sum(
            q * s for q, s in zip(vectors[p], _cross(vectors[w], k)))
    assert sp.expand(brute - triple) == 0
    assert sp.expand(brute) != 0


@pytest.mark.parametrize("l", range(1, 9))
def test_pair_operator_route_reproduces_the_one_pn_field_term(l):
    # reference: field_integrals.field_current_term (hand-derived operator algebra, checked there
    # against brute-force components and the 1PN angular momentum)
    mine = one_pn_field_term(l).as_expr().subs(IR, 1 / sp.Symbol("r", positive=True))
    kx = sp.Symbol("kx")
    assert sp.expand(mine / kx**(l - 1) - field_current_term(l).to_sympy()) == 0


def test_curl_on_orbit_drops_collinear_pairs():
    assert curl_on_newtonian_orbit({("y1", "y2"): inv.RING(1), ("v1", "v2"): inv.RING(1)}) == 0


# ------------------------------------------------------------------ the kernel Z_l (Z1)

from numpy.polynomial.legendre import leggauss  # noqa: E402
from scipy.special import eval_legendre  # noqa: E402
import numpy as np  # noqa: E402

from stfalgebra.moments.current_two_pn import seed_in_invariants, square_pair_kernel  # noqa: E402
from stfalgebra.moments.finite_part import RA, RB, R12, two_centre_integral  # noqa: E402
from stfalgebra.stf.cartesian import contract_cartesian  # noqa: E402


@pytest.mark.parametrize("l", range(6))
@pytest.mark.parametrize("body", ["y1", "y2"])
def test_square_kernel_solves_its_poisson_equation(l, body):
    # reference: Delta_{y1} (1/r1) = -4 pi delta(x - y1), so
    # Delta_{y1} FP int |x|^2 (k.x)^l/(r1 r2) = -4 pi |y1|^2 (k.y1)^l/r12 (null k)
    laplacian = inv.on_null_cone(inv.mixed_laplacian(square_pair_kernel(l), body, body))
    expected = -4 * inv.dot(body, body) * inv.dot("k", body)**l * inv.INV_R12
    difference = laplacian - expected
    # r12 and 1/r12 are two generators: reduce r12 * ir12 = 1 and r12^2 = |y1 - y2|^2
    assert _reduce_distance(difference) == 0


def _reduce_distance(f, clearing=8):
    """f times r12^clearing in normal form: r12 ir12 = 1, r12^2 = y1.y1 - 2 y1.y2 + y2.y2 (zero
    iff f is zero, r12 != 0)."""
    squared = inv.dot("y1", "y1") - 2 * inv.dot("y1", "y2") + inv.dot("y2", "y2")
    out = inv.RING(0)
    for monomial, coefficient in f.terms():
        exponents = list(monomial)
        n = exponents[-2] - exponents[-1] + clearing
        assert n >= 0, "raise the clearing power"
        exponents[-2] = exponents[-1] = 0
        out += inv.RING({tuple(exponents): coefficient}) * squared**(n // 2) * inv.R12**(n % 2)
    return out


@pytest.mark.parametrize("l", range(5))
def test_square_kernel_by_a_second_split(l):
    # |x|^2 = r1^2 + 2 x.y1 - y1.y1 (one body instead of both): another decomposition of the
    # same integral, through the seeds r1/r2 and 1/(r1 r2) and the recursion on x.y1
    def second(n):
        total = seed_in_invariants(two_centre_integral(n, RA / RB)) - inv.dot("y1", "y1") * seed_in_invariants(
            two_centre_integral(n, 1 / (RA * RB)))
        following = seed_in_invariants(two_centre_integral(n + 1, 1 / (RA * RB)))
        total += 2 * inv.harmonic_gradient_along(following, n + 1, "y1") * sp.Rational(1, n + 1)
        if n:
            total += 2 * inv.dot("k", "y1") * second(n - 1) * sp.Rational(n, 2 * n + 1)
        return inv.on_null_cone(total)

    assert _reduce_distance(second(l) - square_pair_kernel(l)) == 0


def _sphere_rule(n_theta, n_phi):
    cos_theta, w_theta = leggauss(n_theta)
    phi = 2 * np.pi * np.arange(n_phi) / n_phi
    sin_theta = np.sqrt(1 - cos_theta**2)
    directions = np.stack([np.outer(sin_theta, np.cos(phi)), np.outer(sin_theta, np.sin(phi)),
                           np.outer(cos_theta, np.ones(n_phi))], axis=-1).reshape(-1, 3)
    return directions, np.outer(w_theta, np.full(n_phi, 2 * np.pi / n_phi)).reshape(-1)


def _finite_part_with_square(l, y1, y2, probe, radius=3.0, series_order=40):
    """FP_{B=0} int d^3x (|x|/r0)^B |x|^2 P(x)/(r1 r2), P harmonic of degree l: ball |x| < R by
    prolate spheroidal coordinates (d^3x/(r1 r2) = a dsigma dtau dphi, polynomial integrand)
    for the spheroid through... here the whole ball: the spheroid r1 + r2 < 2 a sigma_c plus rays
    outside it; outside the ball the Legendre series of 1/r_A, each radial power finite-parted
    (FP int_R^oo r^p dr = -R^(p+1)/(p+1)); returns (value, largest p = -1 angular term)."""
    y1, y2 = np.asarray(y1, float), np.asarray(y2, float)
    evaluate = sp.lambdify(PROBE, probe, "numpy")

    def weight(x):
        return evaluate(x[..., 0], x[..., 1], x[..., 2]) * np.ones(x.shape[:-1]) * np.sum(x * x, axis=-1)

    r12 = np.linalg.norm(y1 - y2)
    a = r12 / 2
    axis = (y1 - y2) / r12
    middle = (y1 + y2) / 2
    helper = np.array([1.0, 0, 0]) if abs(axis[0]) < 0.9 else np.array([0, 1.0, 0])
    e1 = np.cross(axis, helper)
    e1 /= np.linalg.norm(e1)
    e2 = np.cross(axis, e1)
    sigma_c = 1.5
    semi_major = a * sigma_c
    semi_minor_squared = semi_major**2 - a**2
    nodes, weights = leggauss(14)
    sigma = 1 + (sigma_c - 1) * (nodes + 1) / 2
    n_phi = 2 * l + 8
    phi = 2 * np.pi * np.arange(n_phi) / n_phi
    S, T, F = np.meshgrid(sigma, nodes, phi, indexing="ij")
    perpendicular = a * np.sqrt((S**2 - 1) * (1 - T**2))
    x = (middle + (a * S * T)[..., None] * axis + (perpendicular * np.cos(F))[..., None] * e1
         + (perpendicular * np.sin(F))[..., None] * e2)
    w = np.einsum("i,j->ij", weights * (sigma_c - 1) / 2, weights)[..., None] * (2 * np.pi / n_phi)
    spheroid = a * np.sum(w * weight(x))
    directions, w_directions = _sphere_rule(40, 80)
    along = directions @ axis
    difference = 1 / semi_major**2 - 1 / semi_minor_squared
    q2 = difference * along**2 + 1 / semi_minor_squared
    q1 = -2 * difference * along * (middle @ axis) - 2 * (directions @ middle) / semi_minor_squared
    q0 = difference * (middle @ axis)**2 + (middle @ middle) / semi_minor_squared - 1
    inner = (-q1 + np.sqrt(q1**2 - 4 * q2 * q0)) / (2 * q2)
    nodes, weights = leggauss(40)
    rr = inner[:, None] + (radius - inner)[:, None] * (nodes[None, :] + 1) / 2
    w_r = (radius - inner)[:, None] * weights[None, :] / 2
    x = rr[..., None] * directions[:, None, :]
    shell = np.sum(w_directions[:, None] * w_r * rr**2 * weight(x)
                   / (np.linalg.norm(x - y1, axis=-1) * np.linalg.norm(x - y2, axis=-1)))
    directions, w_directions = _sphere_rule(series_order // 2 + l + 2, 2 * (series_order + l) + 4)
    on_sphere = weight(directions)
    series = []
    for y in (y1, y2):
        size = np.linalg.norm(y)
        series.append(([eval_legendre(j, directions @ (y / size)) for j in range(series_order + 1)], size))
    outside, pole = 0.0, 0.0
    for j1 in range(series_order + 1):
        for j2 in range(series_order + 1 - j1):
            angular = np.sum(w_directions * on_sphere * series[0][0][j1] * series[1][0][j2])
            angular *= series[0][1]**j1 * series[1][1]**j2
            power = l + 2 - j1 - j2
            if power == -1:
                pole = max(pole, abs(angular))
                continue
            outside += angular * (-(radius**(power + 1)) / (power + 1))
    return spheroid + shell + outside, pole


SQUARE_CASES = [
    (0, sp.Integer(1)),
    (1, PROBE[0] - 2 * PROBE[1] + 3 * PROBE[2]),
    (2, harmonic_part_cartesian(PROBE[0] * PROBE[1] + 2 * PROBE[2]**2 - PROBE[0] * PROBE[2], 2)),
]


@pytest.mark.parametrize("l, probe", SQUARE_CASES)
def test_square_kernel_equals_numerical_finite_part(l, probe):
    # reference: direct quadrature of the finite-part integral (helper above)
    y1 = (sp.Rational(3, 10), sp.Rational(1, 5), -sp.Rational(1, 10))
    y2 = (-sp.Rational(1, 2), sp.Rational(1, 10), sp.Rational(1, 4))
    numeric, pole = _finite_part_with_square(l, y1, y2, probe)
    assert pole < 1e-12
    values = {"ky1": sum(p * q for p, q in zip(PROBE, y1)), "ky2": sum(p * q for p, q in zip(PROBE, y2)),
              "y1y1": sum(p * p for p in y1), "y2y2": sum(p * p for p in y2),
              "y1y2": sum(p * q for p, q in zip(y1, y2)),
              "r12": sp.sqrt(sum((p - q)**2 for p, q in zip(y1, y2)))}
    values["ir12"] = 1 / values["r12"]
    on_cone = sp.expand(inv.evaluate(square_pair_kernel(l), values))
    closed = float(sp.pi * contract_cartesian(probe, harmonic_part_cartesian(on_cone, l), l))
    assert numeric == pytest.approx(closed, rel=1e-6, abs=1e-9)
    assert abs(closed) > 1e-3


def test_poisson_reduction_of_the_cubic_source_terms():
    # the reduction (J4) of the module docstring is an identity once Delta U = -4 pi G sigma,
    # Delta U_b = -4 pi G sigma_b and the Poisson equation of R_b (N2) hold: checked with generic
    # functions, the difference being U times the residual of the R_b equation
    t, G = sp.symbols("t G")
    X = sp.symbols("x y z")
    U = sp.Function("U")(t, *X)
    Ub = [sp.Function(f"U{i}")(t, *X) for i in range(3)]
    R = [sp.Function(f"R{i}")(t, *X) for i in range(3)]
    d = sp.diff

    def lap(f):
        return sum(d(f, a, 2) for a in X)

    sigma, sigma_b = -lap(U) / (4 * sp.pi * G), [-lap(u) / (4 * sp.pi * G) for u in Ub]
    grad_squared = sum(d(U, a)**2 for a in X)
    b = 1
    along = sum(Ub[k] * d(U, X[k]) for k in range(3)) * d(U, X[b])
    original = (2 * sum(d(U, X[k]) * (d(R[k], X[b]) - d(R[b], X[k])) for k in range(3))
                + 2 * U * sum(d(U, X[k]) * (d(Ub[k], X[b]) - d(Ub[b], X[k])) for k in range(3))
                + 3 * U * d(U, t) * d(U, X[b]) - sp.Rational(3, 2) * Ub[b] * grad_squared + along)
    reduced = (2 * sum(d(U, X[k]) * d(R[k], X[b]) for k in range(3))
               - lap(U * R[b] + U**2 * Ub[b] / 2)
               - 6 * sp.pi * G * U**2 * sigma_b[b] - 4 * sp.pi * G * R[b] * sigma
               + sp.Rational(3, 2) * U * d(U, t) * d(U, X[b]) - Ub[b] * grad_squared / 2 + along)
    residual = lap(R[b]) - (-4 * sp.pi * G * (U * sigma_b[b] - Ub[b] * sigma)
                            - 2 * sum(d(U, X[k]) * d(Ub[k], X[b]) for k in range(3))
                            - sp.Rational(3, 2) * d(U, t) * d(U, X[b]))
    assert sp.expand(original - reduced - U * residual) == 0
    assert sp.expand(original - reduced) != 0


def test_one_pn_momentum_density_is_a_laplacian_plus_the_matter_term():
    # Sigma_b at 1PN: (1 + 4U/c^2) sigma_b + (1/(pi G c^2)) [d_k U (d_b U_k - d_k U_b)
    # + (3/4) d_t U d_b U] = sigma_b - Delta(R_b + U U_b)/(2 pi G c^2) when the Poisson equations
    # (N2) hold (module docstring); generic functions, the difference is the R_b residual
    t, G = sp.symbols("t G")
    X = sp.symbols("x y z")
    U = sp.Function("U")(t, *X)
    Ub = [sp.Function(f"U{i}")(t, *X) for i in range(3)]
    R = [sp.Function(f"R{i}")(t, *X) for i in range(3)]
    d = sp.diff

    def lap(f):
        return sum(d(f, a, 2) for a in X)

    sigma, sigma_b = -lap(U) / (4 * sp.pi * G), [-lap(u) / (4 * sp.pi * G) for u in Ub]
    b = 2
    field = (sum(d(U, X[k]) * (d(Ub[k], X[b]) - d(Ub[b], X[k])) for k in range(3))
             + sp.Rational(3, 4) * d(U, t) * d(U, X[b])) / (sp.pi * G)
    density = 4 * U * sigma_b[b] + field
    laplacian_form = -lap(R[b] + U * Ub[b]) / (2 * sp.pi * G)
    residual = lap(R[b]) - (-4 * sp.pi * G * (U * sigma_b[b] - Ub[b] * sigma)
                            - 2 * sum(d(U, X[k]) * d(Ub[k], X[b]) for k in range(3))
                            - sp.Rational(3, 2) * d(U, t) * d(U, X[b]))
    assert sp.expand(density - laplacian_form - residual / (2 * sp.pi * G)) == 0
