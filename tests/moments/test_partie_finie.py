"""Checks of stfalgebra/moments/partie_finie.py: the Hadamard partie finie at the bodies of
integrals singular beyond r_A^-3.

1. Direct numerical quadrature with the partie finie taken numerically (bodies and velocities on
   the z axis): in a ball around each body the angular-integrated integrand s^(a+2) h(s) has
   the Taylor coefficients of h read off by a Cauchy integral (FFT on a circle in the complex
   radius) and Pf int_0^D s^p ds = D^(p+1)/(p+1); outside the balls Gauss quadrature with the
   caps cut out; the far zone with the regulator |x|^B centred on the origin, as in the tests of
   polynomial_seeds.
2. One-body integrands (self terms): the partie finie with the origin-centred regulator is
   independent of the other body (the bare (r1 r2)^eps continuation is not), and for the
   integrands below it vanishes (every homogeneous piece of degree != -3 in x - y1 has zero
   partie finie, and the regulator-centre term needs a degree >= -2 piece).
3. The closed values: Pf int d^3x/r1^5 = 0 (pure power), C_1 = 2 pi/(3 r12^2).
4. A second implementation: the sympy guard of finite_part (body_correction_expression) on
   integrands without directions.
"""

from __future__ import annotations


import numpy as np
import pytest
import sympy as sp
from numpy.polynomial.legendre import leggauss
from scipy.special import eval_legendre

from stfalgebra.moments import invariants as inv
from stfalgebra.moments.partie_finie import body_correction, is_zero, partie_finie_seed_integral, sphere_average
from stfalgebra.moments.polynomial_seeds import _weighted


def _solid_legendre(n, z, r2):
    """r^n P_n(z/r) as a polynomial in z and r^2 (analytic for complex arguments)."""
    previous, current = np.ones_like(z), z
    if n == 0:
        return previous
    for k in range(1, n):
        previous, current = current, ((2 * k + 1) * z * current - k * r2 * previous) / (k + 1)
    return current


def _far_coefficients(p, z, order, mu):
    lam = -p / 2
    out = [np.ones_like(mu), 2 * lam * mu * z]
    for n in range(2, order + 1):
        out.append((2 * mu * z * (n + lam - 1) * out[-1] - (n + 2 * lam - 2) * z**2 * out[-2]) / n)
    return out[: order + 1]


def _numerical_partie_finie(n, m, a, b, z1, z2, radius=4.0, order=44):
    """Pf FP int d^3x (|x|/r0)^B r^n P_n(cos theta) z^m r1^a r2^b, r0 = 1, bodies at z1, z2 > 0
    on the z axis; returns (value, largest |r_A^-3 coefficient| left at a body).

    Balls |x - y_A| < D = r12/4: the angular-integrated integrand s^(a+2) h(s), h analytic for
    |s| < r12, has Taylor coefficients read off by a Cauchy integral (FFT on |s| = r12/4), and
    Pf int_0^D s^p ds = D^(p+1)/(p+1) (p != -1). Outside the balls, inside |x| < R: Gauss
    quadrature in (|x|, cos theta) with the caps cut out (piecewise analytic in |x|, breaks at
    z_A +- D). Outside R: the far-zone series, FP int_R^oo r^(B+q) dr."""
    r12 = abs(z1 - z2)
    ball = r12 / 4

    def weight(z, rho2):
        return _solid_legendre(n, z, z**2 + rho2) * z**m

    total, log_left = 0.0, 0.0
    mu, w_mu = leggauss(64)
    for z_self, z_other, own, other in ((z1, z2, a, b), (z2, z1, b, a)):
        separation = z_self - z_other

        def regular(s):  # h(s) = 2 pi int dmu W r_B^b, analytic in s for |s| < r12
            S, M = np.meshgrid(s, mu, indexing="ij")
            z = z_self + S * M
            rho2 = S**2 * (1 - M**2)
            r_other = (separation**2 + 2 * S * M * separation + S**2) ** (other / 2)
            return 2 * np.pi * (weight(z, rho2) * r_other) @ w_mu

        points = 128
        circle = r12 / 4 * np.exp(2j * np.pi * np.arange(points) / points)
        taylor = np.fft.fft(regular(circle)) / points / (r12 / 4) ** np.arange(points)
        for j in range(points // 2):
            p = j + own + 2
            if p == -1:
                log_left = max(log_left, abs(taylor[j]))
                continue
            total += taylor[j].real * ball ** (p + 1) / (p + 1)
    breaks = sorted({0.0, radius, *(zz + k * ball for zz in (z1, z2) for k in (-1, 1))})
    breaks = [lo + (hi - lo) * t for lo, hi in zip(breaks[:-1], breaks[1:]) for t in np.linspace(0, 1, 9)[:-1]]
    breaks.append(radius)
    nodes, weights = leggauss(32)
    # composite rule in cos theta, graded towards the cut-out caps (the singularity at a body
    # lies D^2/(2 |x| z_A) beyond the end of the interval)
    grading = np.array([1.0, 0.3, 0.1, 0.03, 0.01, 0.003, 0.0])
    for lo, hi in zip(breaks[:-1], breaks[1:]):
        r = lo + (hi - lo) * (nodes + 1) / 2
        top = np.ones_like(r)
        for zz in (z1, z2):
            top = np.minimum(top, np.clip((r**2 + zz**2 - ball**2) / (2 * r * zz), -1, 1))
        Rr = r[:, None]
        for g_lo, g_hi in zip(grading[:-1], grading[1:]):
            start = top - (top + 1) * g_lo
            stop = top - (top + 1) * g_hi
            M = start[:, None] + (stop - start)[:, None] * (nodes[None, :] + 1) / 2
            w_m = (stop - start)[:, None] * weights[None, :] / 2
            z = Rr * M
            rho2 = Rr**2 * (1 - M**2)
            r1 = np.sqrt(rho2 + (z - z1) ** 2)
            r2 = np.sqrt(rho2 + (z - z2) ** 2)
            values = r1**a * r2**b * weight(z, rho2) * Rr**2 * w_m
            total += 2 * np.pi * np.sum(weights * (hi - lo) / 2 * values.sum(axis=1))
    mu, w_mu = leggauss(order + n + m + 8)
    first = _far_coefficients(a, z1, order, mu)
    second = _far_coefficients(b, z2, order, mu)
    angular_weight = eval_legendre(n, mu) * mu**m
    for j in range(order + 1):
        value = 2 * np.pi * np.sum(w_mu * angular_weight * sum(first[k] * second[j - k] for k in range(j + 1)))
        q = n + m + a + b - j
        total += -value * np.log(radius) if q + 3 == 0 else value * (-radius ** (q + 3) / (q + 3))
    return total, log_left


def _on_axis(result, z1, z2):
    """pi sum element (ln r12)^p at r0 = 1 (ln r0 terms dropped), bodies and velocities on the
    z axis, k.z -> 1 (the STF tensor is a multiple of z^<N>)."""
    values = {"ky1": z1, "ky2": z2, "kv1": 1, "kv2": 1, "y1y1": z1**2, "y1y2": z1 * z2, "y2y2": z2**2,
              "y1v1": z1, "y1v2": z1, "y2v1": z2, "y2v2": z2, "v1v1": 1, "v1v2": 1, "v2v2": 1,
              "r12": abs(z1 - z2), "ir12": 1 / abs(z1 - z2)}
    values = {key: sp.Rational(str(value)) for key, value in values.items()}
    total = 0.0
    for key, element in result.items():
        log_r12, log_r0 = key[:2]
        assert key[2:] == (0, 0, 0, 0), key
        if log_r0:
            continue
        total += float(inv.evaluate(element, values)) * np.log(abs(z1 - z2))**log_r12
    return np.pi * total


# Pole-free at the bodies. An even a <= -4 gives r1^-3 and correction (H1) coefficients of odd
# parity in n1 (no pole, no correction: the continuation is already the partie finie); an odd
# a with n = 0 and b = -1 has the r1^-3 coefficient P_2(n1.n12)/r12^3 (zero average) and a
# nonzero correction.
STRONG_CASES = [(0, (), -4, -1), (2, (), -4, -1), (3, (), -6, -1), (1, ("v1",), -6, -1),
                (1, ("v1", "v2"), -4, -1), (0, ("v2",), -4, 0),
                (0, (), -5, -1), (0, (), -7, -1), (0, (), -1, -5), (0, (), -9, -1)]


@pytest.mark.parametrize("n, directions, a, b", STRONG_CASES)
def test_partie_finie_equals_the_numerical_partie_finie(n, directions, a, b):
    # reference: numerical quadrature with the partie finie taken numerically (helper above)
    z1, z2 = 1.3, 0.3
    result = partie_finie_seed_integral(n, directions, a, b)
    assert all(key[-1] == 0 for key in result)
    numeric, log_left = _numerical_partie_finie(n, len(directions), a, b, z1, z2)
    assert log_left < 1e-9
    closed = _on_axis(result, z1, z2)
    assert numeric == pytest.approx(closed, rel=1e-7, abs=1e-8)
    correction = float(inv.evaluate(body_correction(n, directions, a, b), _values(z1, z2)))
    if a % 2 and b % 2 == 0 or b % 2 and a % 2 == 0 and min(a, b) % 2:
        # odd strong exponent: the bare continuation differs from the partie finie
        assert abs(correction) > 1e-3


def _values(z1, z2):
    values = {"ky1": z1, "ky2": z2, "kv1": 1, "kv2": 1, "y1y1": z1**2, "y1y2": z1 * z2, "y2y2": z2**2,
              "y1v1": z1, "y1v2": z1, "y2v1": z2, "y2v2": z2, "v1v1": 1, "v1v2": 1, "v2v2": 1,
              "r12": abs(z1 - z2), "ir12": 1 / abs(z1 - z2)}
    return {key: sp.Rational(str(value)) for key, value in values.items()}


def test_closed_values():
    # Pf int d^3x/r1^5 = 0 (int_{r1 > s} d^3x/r1^5 = 2 pi/s^2, a pure power of s), while the
    # (r1 r2)^eps continuation is 2 pi/(3 r12^2): the correction C_1 of (H1)
    assert partie_finie_seed_integral(0, (), -5, 0) == {}
    assert is_zero(body_correction(0, (), -5, 0) - inv.INV_R12**2 * sp.Rational(2, 3))
    # <(n.y1)^2> = y1^2/3, <(n.k)^2 (n.y1)^2> = (2 (k.y1)^2 + k.k y1^2)/15
    assert sphere_average((0, 2, 0, 0, 0)) == inv.dot("y1", "y1") / 3
    expected = (2 * inv.dot("k", "y1")**2 + inv.dot("k", "k") * inv.dot("y1", "y1")) * sp.Rational(1, 15)
    assert sphere_average((2, 2, 0, 0, 0)) == expected


@pytest.mark.parametrize("n", [0, 1])
def test_self_terms_do_not_depend_on_the_other_body(n):
    # (k.x)^n ((x - y1).v1)^2/r1^7: homogeneous pieces of degree -5 + j (j <= n < 2) in x - y1,
    # none of degree -3 or >= -2: the partie finie with the origin-centred regulator is 0
    def integral(function):
        parts = [function(n, ("v1", "v1"), -7, 0),
                 {key: -2 * value * inv.dot("y1", "v1") for key, value in function(n, ("v1",), -7, 0).items()},
                 {key: value * inv.dot("y1", "v1")**2 for key, value in function(n, (), -7, 0).items()}]
        total = {}
        for part in parts:
            for key, value in part.items():
                total[key] = total.get(key, inv.RING(0)) + value
        return {key: value for key, value in total.items() if not is_zero(value)}

    assert integral(partie_finie_seed_integral) == {}
    # the bare continuation depends on y2 (the caveat of polynomial_seeds)
    bare = integral(lambda *args: _weighted(*args, 0))
    assert bare


@pytest.mark.parametrize("l", [0, 1, 3])
@pytest.mark.parametrize("a, b", [(-5, -1), (-4, -1), (-1, -6), (-7, 0), (-3, -3)])
def test_two_implementations_of_the_correction_agree(l, a, b):
    # reference: finite_part.body_correction_expression (sympy, Gegenbauer-free binomial series
    # in (r1, n1.n12), written separately) on integrands (k.x)^l r1^a r2^b
    from stfalgebra.moments.current_two_pn import seed_in_invariants
    from stfalgebra.moments.finite_part import RA, RB, body_correction_expression

    expression = body_correction_expression(l, RA**a * RB**b)
    mine = body_correction(l, (), a, b)
    assert is_zero(seed_in_invariants(expression) - mine)
    if min(a, b) <= -5 and min(a, b) % 2:
        assert not is_zero(mine)


@pytest.mark.parametrize("n, a, b", [(0, -4, -1), (1, -4, -1), (2, -4, -1), (0, -5, -1), (0, -7, -1)])
def test_laplace_equation_in_the_body_position(n, a, b):
    # reference: d/dy1 commutes with the partie finie (the continuation in the exponent of r1 and
    # the regulator |x|^B do not depend on y1), and Delta_{y1} r1^a = a (a + 1) r1^(a-2): on
    # pole-free seeds Delta_{y1} Pf int (k.x)^n r1^a r2^b = a (a + 1) Pf int (k.x)^n r1^(a-2) r2^b
    # ((k.x)^n r1^odd r2^-1 diverges logarithmically at y1 for n >= 1: not used)
    left = partie_finie_seed_integral(n, (), a, b)
    right = partie_finie_seed_integral(n, (), a - 2, b)
    assert all(key[2:] == (0, 0, 0, 0) for key in (*left, *right))
    assert set(left) <= {(0, 0, 0, 0, 0, 0), (0, 1, 0, 0, 0, 0)} and set(right) <= set(left) | {(0, 0, 0, 0, 0, 0)}
    for key in set(left) | set(right):
        laplacian = inv.on_null_cone(inv.mixed_laplacian(left.get(key, inv.RING(0)), "y1", "y1"))
        assert is_zero(laplacian - a * (a + 1) * right.get(key, inv.RING(0)))
    assert not is_zero(right[(0, 0, 0, 0, 0, 0)])


def test_two_centre_integral_refuses_what_is_not_the_partie_finie():
    # the guard added to finite_part: r1^-5/r2 is singular beyond r1^-3 with a nonzero
    # correction; the mass-moment integrands (tests of mass_two_pn) pass it unchanged
    from stfalgebra.moments.finite_part import RA, RB, R12, two_centre_integral, two_centre_partie_finie

    with pytest.raises(ValueError):
        two_centre_integral(0, 1 / (RA**5 * RB))
    assert two_centre_partie_finie(0, 1 / (RA**5 * RB)) == -2 * sp.pi / (3 * R12**3)
    assert two_centre_integral(0, 1 / (RA**4 * RB)) == two_centre_partie_finie(0, 1 / (RA**4 * RB))


def test_the_guard_is_cheap_where_the_integrand_is_at_most_inverse_cube():
    # the mass-moment cubic integrand (I5) is at most r_A^-3 singular at each body although its
    # seeds reach r1^-5: the guard of two_centre_integral recognises it from the local expansion
    # and does not compute the correction (regression: the correction for every l cost seconds)
    from stfalgebra.moments.finite_part import RA, RB, R12, _beyond_inverse_cube
    from stfalgebra.moments.mass_two_pn import CONTRACTED_G

    assert not _beyond_inverse_cube(sp.expand(CONTRACTED_G))
    assert _beyond_inverse_cube(1 / (RA**5 * RB)) and _beyond_inverse_cube(1 / (RA * RB**4))
    assert not _beyond_inverse_cube(1 / (RA**3 * RB**3) + R12 / (RA**2 * RB**3))
