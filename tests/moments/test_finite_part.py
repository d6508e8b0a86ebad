"""Checks of stfalgebra/moments/finite_part.py: the seeds FP Pf int xhat_L r1^a r2^b and the
two-centre integrals of the 2PN cubic terms, three ways.

1. Poisson equations in the body positions (the seeds' defining property, from
   Delta_y r^p = p(p+1) r^(p-2) and Delta_y (1/r) = -4 pi delta):
   Delta_{y1} Y^(a,b) = a(a+1) Y^(a-2,b) - 4 pi [a = -1] (k.y1)^l r12^b, likewise in y2; checked
   symbolically on the null-probe polynomials, including the eps-Laurent series of seeds that
   diverge at a body (the relation then holds order by order in eps with a -> a + eps).
2. Direct numerical finite-part quadrature (small l): bodies on an axis through the origin,
   a partition of unity around the bodies (spherical coordinates about each body, where a
   zero-average r^-3 singularity cancels in the angular integral), Gauss quadrature of the
   smooth remainder inside a ball, and the finite part outside from the exact far-zone
   expansion (Gegenbauer series of r_A^p) integrated term by term.
3. Components: the rational forms of the cubic integrand (the g-terms included) against the
   near-zone potential W^nc_ij of stfalgebra/moments/near_zone.py (built from g = ln(r1 + r2 +
   r12) by sympy differentiation) contracted with d_ij(1/r_B) in components.
"""

from __future__ import annotations

import random
from functools import lru_cache

import numpy as np
import pytest
import sympy as sp
from numpy.polynomial.legendre import leggauss
from scipy.special import eval_legendre

from stfalgebra.moments.finite_part import (
    R12, RA, RB, U1, U2, Y11, Y12, Y22, PoleError, origin_regulated_seed, regulator_centre_terms,
    riesz_coefficient, seed_integral, seed_laurent_series, two_centre_integral,
)
from stfalgebra.moments.field_integrals import kernel_coefficient_polynomial
from stfalgebra.moments.mass_two_pn import CONTRACTED_G, cubic_integral
from stfalgebra.moments.near_zone import PointMass, w_noncompact

PIECE_A = (1 - 3 * (RA**2 + RB**2 - R12**2)**2 / (4 * RA**2 * RB**2)) / (4 * RA**2 * RB**3)


# ------------------------------------------------------------------ 1. Poisson equations
def _laplacian_body(f, body):
    """Delta_{y_body} of f(U1, U2, R12) (null k): with U_A = k.y_A, R12 = |y1 - y2|,
    Delta_1 f = 2 (U1 - U2)/R12 f_{U1 R12} + f_{R12 R12} + 2 f_{R12}/R12 (k.k = 0)."""
    u, other = (U1, U2) if body == 1 else (U2, U1)
    return sp.expand(2 * (u - other) / R12 * sp.diff(f, u, R12) + sp.diff(f, R12, 2) + 2 * sp.diff(f, R12) / R12)


@pytest.mark.parametrize("l", range(5))
def test_pair_kernel_is_the_seed_minus_one_minus_one(l):
    # the closed form (F2) of field_integrals.py (tested there three ways) is the seed (-1, -1)
    expected = -2 * sp.pi / (l + 1) * R12 * kernel_coefficient_polynomial(l).subs(
        {sp.Symbol("u1"): U1, sp.Symbol("u2"): U2})
    assert sp.expand(seed_integral(l, -1, -1) - expected) == 0


@pytest.mark.parametrize("l", [0, 1, 3])
@pytest.mark.parametrize("a, b", [(1, -1), (-1, 1), (1, 1), (3, -1)])
def test_seeds_solve_their_poisson_equations(l, a, b):
    # reference: Delta_y r^p = p (p+1) r^(p-2), Delta_y (1/r) = -4 pi delta (common practice)
    seed = seed_integral(l, a, b)
    for body, (p, q) in ((1, (a, b)), (2, (b, a))):
        expected = 0
        if p * (p + 1):
            lower = seed_integral(l, a - 2, b) if body == 1 else seed_integral(l, a, b - 2)
            expected = p * (p + 1) * lower
        if p == -1:
            expected += -4 * sp.pi * (U1 if body == 1 else U2)**l * R12**q
        assert sp.expand(_laplacian_body(seed, body) - expected) == 0


@pytest.mark.parametrize("l", [0, 2])
@pytest.mark.parametrize("a, b", [(-3, 1), (-5, 3), (-2, -1)])
def test_regularised_seeds_solve_their_poisson_equations_order_by_order(l, a, b):
    # with a -> a + eps, b -> b + eps: Delta_{y2} Y^(a+eps, b+eps) = (b+eps)(b+1+eps) Y^(a+eps, b-2+eps)
    # (body 2 is regular in these seeds, so no delta term), checked in each power of eps
    eps = sp.Symbol("eps")
    upper = seed_laurent_series(l, a, b)
    lower = seed_laurent_series(l, a, b - 2)
    low = min(list(upper) + list(lower) + [0])
    weight = {0: b * (b + 1), 1: 2 * b + 1, 2: 1}  # (b + eps)(b + 1 + eps)
    for power in range(low, 1):
        left = _laplacian_body(upper.get(power, 0), 2)
        right = sum(w * lower.get(power - k, 0) for k, w in weight.items())
        assert sp.expand(left - right) == 0, power


def test_riesz_coefficients_of_the_pair_kernel():
    # c_j(-1, -1) = -2 pi/(j + 1) (the (F2) sum rewritten on body 1)
    for j in range(6):
        assert riesz_coefficient(j, -1, -1) == {0: -2 * sp.pi / (j + 1)}


def test_seed_refusals():
    with pytest.raises(PoleError):
        seed_integral(0, -5, 3)          # diverges at body 1 on its own
    with pytest.raises(ValueError, match="centred"):
        seed_integral(2, -2, 1)          # a + b odd, a + b + 3 >= 0: depends on the regulator's centre
    with pytest.raises(PoleError):
        two_centre_integral(0, 1 / (RA**3 * RB))   # a logarithmic divergence at body 1
    with pytest.raises(ValueError):
        two_centre_integral(1, sp.sqrt(RA) / RB)


# ------------------------------------------------------------------ 2. numerical finite part
def _far_coefficients(p, z, order, mu):
    """Coefficients C_n(mu) z^n, n = 0..order, of (1 - 2 t z mu + t^2 z^2)^(p/2) in t
    (Gegenbauer recursion with lambda = -p/2, valid for any lambda)."""
    lam = -p / 2
    out = [np.ones_like(mu), 2 * lam * mu * z]
    for n in range(2, order + 1):
        out.append((2 * mu * z * (n + lam - 1) * out[-1] - (n + 2 * lam - 2) * z**2 * out[-2]) / n)
    return out[: order + 1]


def finite_part_numeric(l, integrand, z1, z2, width=None, radius=None, order=40, nodes_body=48, nodes_mu=256):
    """FP Pf int d^3x r^l P_l(cos theta) F(r1, r2), bodies at z1, z2 on the z axis.

    F a sympy expression in RA, RB, R12 (a sum of powers); its body singularities at most
    r_A^-3 with zero angular average. Returns a float.
    """
    separation = abs(z1 - z2)
    width = width or separation / 5
    radius = radius or max(abs(z1), abs(z2)) + 2 * separation
    function = sp.lambdify((RA, RB), integrand.subs(R12, separation), "numpy")

    def weight(z, rho2):
        r = np.sqrt(z**2 + rho2)
        return r**l * eval_legendre(l, np.where(r > 0, z / np.where(r > 0, r, 1), 1.0))

    def cutoff(s):
        return np.exp(-(s / width) ** 8)

    total = 0.0
    mu, w_mu = leggauss(nodes_body)
    # pieces around each body: spherical coordinates (s, mu) centred on the body
    for z_self, z_other in ((z1, z2), (z2, z1)):
        nodes, weights = leggauss(nodes_body)
        for lo, hi in ((0.0, width), (width, 2.5 * width)):
            s = lo + (hi - lo) * (nodes + 1) / 2
            w_s = weights * (hi - lo) / 2
            S, M = np.meshgrid(s, mu, indexing="ij")
            z = z_self + S * M
            rho2 = S**2 * (1 - M**2)
            r_other = np.sqrt(rho2 + (z - z_other) ** 2)
            r1, r2 = (S, r_other) if z_self == z1 else (r_other, S)
            values = function(r1, r2) * weight(z, rho2) * cutoff(S) * S**2
            total += 2 * np.pi * np.einsum("i,j,ij->", w_s, w_mu, values)
    # the smooth remainder inside the ball |x| < radius, spherical coordinates about the origin
    breaks = sorted({0.0, radius, *[max(0.0, abs(zz) + k * width / 2) for zz in (z1, z2) for k in range(-5, 6)]})
    breaks = sorted(set(breaks) | {b + width / 4 for b in breaks if b + width / 4 < radius})
    breaks = [b for b in breaks if b <= radius]
    nodes, weights = leggauss(32)
    mu, w_mu = leggauss(nodes_mu)
    for lo, hi in zip(breaks[:-1], breaks[1:]):
        r = lo + (hi - lo) * (nodes + 1) / 2
        w_r = weights * (hi - lo) / 2
        Rr, M = np.meshgrid(r, mu, indexing="ij")
        z = Rr * M
        rho2 = Rr**2 * (1 - M**2)
        r1 = np.sqrt(rho2 + (z - z1) ** 2)
        r2 = np.sqrt(rho2 + (z - z2) ** 2)
        values = function(r1, r2) * (1 - cutoff(r1) - cutoff(r2)) * weight(z, rho2) * Rr**2
        total += 2 * np.pi * np.einsum("i,j,ij->", w_r, w_mu, values)
    # outside: F = sum c r1^a r2^b, r_A^p = r^p sum_n C_n(mu) (z_A/r)^n; FP of each radial power
    mu, w_mu = leggauss(order + l + 8)
    legendre = eval_legendre(l, mu)
    for term in sp.Add.make_args(sp.expand(integrand.subs(R12, separation))):
        powers = term.as_powers_dict()
        a, b = int(powers.get(RA, 0)), int(powers.get(RB, 0))
        coefficient = float(term / (RA**a * RB**b))
        first = _far_coefficients(a, z1, order, mu)
        second = _far_coefficients(b, z2, order, mu)
        for n in range(order + 1):
            angular = sum(first[k] * second[n - k] for k in range(n + 1))
            value = 2 * np.pi * np.sum(w_mu * legendre * angular)
            q = l + a + b - n  # integrand r^q times r^2 dr
            if q + 3 == 0:
                assert abs(value) < 1e-9  # no logarithmic divergence at infinity
                continue
            total += coefficient * value * (-radius ** (q + 3) / (q + 3))
    return total


def _at_axis(polynomial, z1, z2, separation):
    """The null-probe polynomial at y_A = z_A e: with k.e factored out, U_A -> z_A."""
    return float(polynomial.subs({U1: z1, U2: z2, R12: separation}))


# bodies around the origin (as in the centre-of-mass frame) and both on one side of it
CONFIGURATIONS = [(0.6, -0.4), (1.3, 0.3)]
PIECES = (PIECE_A, 2 * CONTRACTED_G)


@lru_cache(maxsize=None)
def _piece_integral(l, index):
    return two_centre_integral(l, PIECES[index])


@pytest.mark.parametrize("l, z1, z2", [(0, *CONFIGURATIONS[1]), (2, *CONFIGURATIONS[0]), (1, *CONFIGURATIONS[1])])
def test_cubic_pieces_equal_the_numerical_finite_part(l, z1, z2):
    # reference: direct quadrature (helper above) of the two pointwise pieces of the m1^2 m2
    # cubic integrand, each free of logarithmic divergences
    separation = abs(z1 - z2)
    for index, piece in enumerate(PIECES):
        exact = _at_axis(_piece_integral(l, index), z1, z2, separation)
        numeric = finite_part_numeric(l, piece, z1, z2)
        assert numeric == pytest.approx(exact, rel=1e-7, abs=1e-9)


@pytest.mark.parametrize("l", [1])
def test_growing_seeds_equal_the_numerical_finite_part(l):
    # seeds growing at infinity: the finite part at infinity does the work
    z1, z2 = CONFIGURATIONS[0]
    for a, b in ((1, -1), (-1, 1), (1, 1)):
        integrand = RA**a * RB**b
        exact = _at_axis(seed_integral(l, a, b), z1, z2, abs(z1 - z2))
        assert finite_part_numeric(l, integrand, z1, z2) == pytest.approx(exact, rel=1e-7, abs=1e-9)


def test_numerical_finite_part_does_not_depend_on_the_split():
    # a check on the quadrature itself: moving the ball and the partition changes nothing
    z1, z2 = CONFIGURATIONS[1]
    first = finite_part_numeric(2, PIECE_A, z1, z2, width=0.2, radius=6.0)
    second = finite_part_numeric(2, PIECE_A, z1, z2, width=0.3, radius=12.0)
    assert first == pytest.approx(second, rel=1e-8)


# ------------------------------------------------------------------ 3. components
def test_rational_cubic_integrand_from_the_near_zone_potential():
    # reference: W^nc_ij of near_zone.py (sympy derivatives of g in components) contracted with
    # the pointwise d_ij(1/r_B), m1^2 m2 part, at random field points; G = 1. The m1^2 self part
    # and cross parts are the m1^2 and m1 m2 coefficients of W^nc.
    x = sp.symbols("x1:4", real=True)
    rng = random.Random(11)
    y1 = [sp.Rational(rng.randint(-9, 9), 10) for _ in range(3)]
    y2 = [sp.Rational(rng.randint(-9, 9), 10) for _ in range(3)]
    at_rest = (0, 0, 0)

    def w(mass1, mass2):
        return w_noncompact(x, [PointMass(mass1, y1, at_rest), PointMass(mass2, y2, at_rest)], G=1)

    m1, m2 = sp.symbols("m1 m2")
    both = w(m1, m2)
    self_one = both.applyfunc(lambda e: sp.diff(e, m1, 2) / 2)
    cross = both.applyfunc(lambda e: sp.diff(e, m1, m2))
    r1, r2 = (sp.sqrt(sum((xi - yi) ** 2 for xi, yi in zip(x, y))) for y in (y1, y2))
    hessian = lambda f: [[sp.diff(f, x[i], x[j]) for j in range(3)] for i in range(3)]  # noqa: E731
    h1, h2 = hessian(1 / r1), hessian(1 / r2)
    # -W_ij d_ij U, m1^2 m2 part: m1^2 self part with U's m2 term, cross part with U's m1 term
    contraction = -sum(self_one[i, j] * h2[i][j] + cross[i, j] * h1[i][j] for i in range(3) for j in range(3))
    separation = sp.sqrt(sum((a - b) ** 2 for a, b in zip(y1, y2)))
    rational = (PIECE_A + 2 * CONTRACTED_G).subs({RA: r1, RB: r2, R12: separation})
    difference = sp.lambdify(x, contraction - rational, "mpmath")
    for _ in range(4):
        point = [sp.Rational(rng.randint(-9, 9), 7) for _ in range(3)]
        assert abs(difference(*point)) < 1e-12
    assert abs(sp.lambdify(x, rational, "mpmath")(*point)) > 1e-3  # not a vanishing check


def test_cubic_integral_delta_parts_and_closed_values():
    # the l = 0 value, from the seeds and the delta parts: -pi/r12^2 (the m1^2 m2 part of
    # FP int -W^nc_ij d_ij U at G = 1; the quadrature of test 2 checks the pointwise part)
    assert cubic_integral(0) == -sp.pi / R12**2


# ------------------------------------------------------------------ 4. regulator centred on the origin
def _finite_part_origin(l, a, b, z1, z2, radius, width, order=44, nodes_body=48, nodes_mu=256):
    """FP_{B=0} int d^3x (|x|/r0)^B r^l P_l(cos theta) r1^a r2^b at r0 = 1, bodies on the z axis
    (the quadrature of finite_part_numeric above, with the r^-3 term at infinity kept: its
    finite part is -ln(R/r0) times its angular integral). Returns (value, that angular integral)."""
    function = lambda r1, r2: r1**a * r2**b  # noqa: E731

    def weight(z, rho2):
        r = np.sqrt(z**2 + rho2)
        return r**l * eval_legendre(l, np.where(r > 0, z / np.where(r > 0, r, 1), 1.0))

    def cutoff(s):
        return np.exp(-(s / width) ** 8)

    total = 0.0
    mu, w_mu = leggauss(nodes_body)
    for z_self, z_other in ((z1, z2), (z2, z1)):
        nodes, weights = leggauss(nodes_body)
        for lo, hi in ((0.0, width), (width, 2.5 * width)):
            s = lo + (hi - lo) * (nodes + 1) / 2
            w_s = weights * (hi - lo) / 2
            S, M = np.meshgrid(s, mu, indexing="ij")
            z = z_self + S * M
            rho2 = S**2 * (1 - M**2)
            r_other = np.sqrt(rho2 + (z - z_other) ** 2)
            r1, r2 = (S, r_other) if z_self == z1 else (r_other, S)
            total += 2 * np.pi * np.einsum("i,j,ij->", w_s, w_mu, function(r1, r2) * weight(z, rho2) * cutoff(S) * S**2)
    breaks = sorted({0.0, radius, *[max(0.0, abs(zz) + k * width / 2) for zz in (z1, z2) for k in range(-5, 6)]})
    breaks = sorted(set(breaks) | {x + width / 4 for x in breaks if x + width / 4 < radius})
    breaks = [x for x in breaks if x <= radius]
    nodes, weights = leggauss(32)
    mu, w_mu = leggauss(nodes_mu)
    for lo, hi in zip(breaks[:-1], breaks[1:]):
        r = lo + (hi - lo) * (nodes + 1) / 2
        w_r = weights * (hi - lo) / 2
        Rr, M = np.meshgrid(r, mu, indexing="ij")
        z = Rr * M
        rho2 = Rr**2 * (1 - M**2)
        r1 = np.sqrt(rho2 + (z - z1) ** 2)
        r2 = np.sqrt(rho2 + (z - z2) ** 2)
        values = function(r1, r2) * (1 - cutoff(r1) - cutoff(r2)) * weight(z, rho2) * Rr**2
        total += 2 * np.pi * np.einsum("i,j,ij->", w_r, w_mu, values)
    mu, w_mu = leggauss(order + l + 8)
    legendre = eval_legendre(l, mu)
    first = _far_coefficients(a, z1, order, mu)
    second = _far_coefficients(b, z2, order, mu)
    logarithmic = 0.0
    for n in range(order + 1):
        angular = sum(first[k] * second[n - k] for k in range(n + 1))
        value = 2 * np.pi * np.sum(w_mu * legendre * angular)
        q = l + a + b - n
        if q + 3 == 0:
            logarithmic = value
            total += -value * np.log(radius)
            continue
        total += value * (-radius ** (q + 3) / (q + 3))
    return total, logarithmic


def _on_axis_with_positions(expression, z1, z2):
    return float(expression.subs({U1: z1, U2: z2, Y11: z1**2, Y12: z1 * z2, Y22: z2**2,
                                  R12: abs(z1 - z2)}))


@pytest.mark.parametrize("l, a, b", [(0, 1, 0), (0, -2, 1), (2, -2, 1), (1, -1, -2), (3, -2, -1)])
def test_origin_regulated_seeds_equal_the_numerical_finite_part(l, a, b):
    # reference: direct quadrature with the regulator |x|^B centred on the origin (a + b odd:
    # the continuation alone would be wrong, step 4 of the module docstring and (S3))
    z1, z2 = CONFIGURATIONS[1]
    value, log_r0 = origin_regulated_seed(l, a, b)
    numeric, logarithmic = _finite_part_origin(l, a, b, z1, z2, radius=4.0, width=0.2)
    assert numeric == pytest.approx(_on_axis_with_positions(value, z1, z2), rel=1e-7, abs=1e-9)
    assert logarithmic == pytest.approx(_on_axis_with_positions(log_r0, z1, z2), rel=1e-9, abs=1e-11)
    # the continuation alone differs (not a vacuous check)
    continuation = seed_laurent_series(l, a, b).get(0, 0)
    assert abs(_on_axis_with_positions(continuation, z1, z2) - numeric) > 1e-3


def test_numerical_origin_finite_part_does_not_depend_on_the_split():
    z1, z2 = CONFIGURATIONS[0]
    first, _ = _finite_part_origin(2, -2, 1, z1, z2, radius=4.0, width=0.2)
    second, _ = _finite_part_origin(2, -2, 1, z1, z2, radius=7.0, width=0.3)
    assert first == pytest.approx(second, rel=1e-8)


def test_ln_r_zero_coefficient_is_the_far_zone_pole_of_the_continuation():
    # (S3): the eps^-1 coefficient of the (r1 r2)^eps continuation is -A0/2 for a seed finite at
    # the bodies
    for l, a, b in ((0, -2, -1), (2, -2, -1), (1, -2, 1), (3, -1, -2)):
        _, log_r0 = regulator_centre_terms(l, a, b)
        pole = seed_laurent_series(l, a, b)[-1]
        difference = sp.expand(pole + log_r0 / 2).subs(Y12, (Y11 + Y22 - R12**2) / 2)
        assert sp.expand(difference) == 0
        assert log_r0 != 0
