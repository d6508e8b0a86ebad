"""Checks of stfalgebra/moments/polynomial_seeds.py: finite parts of (k.x)^n prod (w.x) r1^a r2^b
with the regulator centred on the origin.

1. The STF decomposition coefficients c_{N,s} against the project's STF core
   (harmonic_part_cartesian), in components.
2. Direct numerical quadrature (bodies on the z axis, directions w = y1, y2 along it): spherical
   coordinates about each body with a smooth cutoff, the remainder in a ball, and outside it the
   Gegenbauer series of r_A^p integrated term by term with FP int_R^oo r^(B+q) dr (the q = -1
   term giving -ln(R/r0) times its angular integral), r0 = 1.
3. A closed value: FP int |x - y1| d^3x = -pi |y1|^4/15 (sphere averages of |x - y|, by hand).
"""

from __future__ import annotations

import numpy as np
import pytest
import sympy as sp
from numpy.polynomial.legendre import leggauss
from scipy.special import eval_legendre

from stfalgebra.moments import invariants as inv
from stfalgebra.moments.polynomial_seeds import polynomial_seed_integral, stf_decomposition_coefficient
from stfalgebra.stf.cartesian import PROBE, harmonic_part_cartesian


@pytest.mark.parametrize("N", [2, 3, 4, 5])
def test_stf_decomposition_coefficients(N):
    # (k.x)^N = sum_s c_{N,s} (k.k)^s |x|^(2s) H[(k.x)^(N-2s)], H the harmonic part in k
    xs = sp.symbols("q1:4")
    kx = sum(p * q for p, q in zip(PROBE, xs))
    kk = sum(p * p for p in PROBE)
    xx = sum(q * q for q in xs)
    total = 0
    for s in range(N // 2 + 1):
        harmonic = harmonic_part_cartesian(sp.expand(kx**(N - 2 * s)), N - 2 * s)
        total += stf_decomposition_coefficient(N, s) * kk**s * xx**s * harmonic
    assert sp.expand(total - kx**N) == 0


def _far_coefficients(p, z, order, mu):
    lam = -p / 2
    out = [np.ones_like(mu), 2 * lam * mu * z]
    for n in range(2, order + 1):
        out.append((2 * mu * z * (n + lam - 1) * out[-1] - (n + 2 * lam - 2) * z**2 * out[-2]) / n)
    return out[: order + 1]


def _quadrature(n, m, a, b, z1, z2, radius=4.0, width=0.2, order=44):
    """FP int d^3x (|x|/r0)^B r^n P_n(cos theta) P(z) r1^a r2^b, r0 = 1, bodies on the z axis;
    P(z) = z^m, or sum_j c_j z^j for m a dict {j: c_j}."""
    powers = m if isinstance(m, dict) else {m: 1.0}

    def weight(z, rho2):
        r = np.sqrt(z**2 + rho2)
        legendre_part = r**n * eval_legendre(n, np.where(r > 0, z / np.where(r > 0, r, 1), 1.0))
        return legendre_part * sum(c * z**j for j, c in powers.items())

    def cutoff(s):
        return np.exp(-(s / width) ** 8)

    total = 0.0
    mu, w_mu = leggauss(48)
    for z_self, z_other in ((z1, z2), (z2, z1)):
        nodes, weights = leggauss(48)
        for lo, hi in ((0.0, width), (width, 2.5 * width)):
            s = lo + (hi - lo) * (nodes + 1) / 2
            S, M = np.meshgrid(s, mu, indexing="ij")
            z = z_self + S * M
            rho2 = S**2 * (1 - M**2)
            r_other = np.sqrt(rho2 + (z - z_other) ** 2)
            r1, r2 = (S, r_other) if z_self == z1 else (r_other, S)
            values = r1**a * r2**b * weight(z, rho2) * cutoff(S) * S**2
            total += 2 * np.pi * np.einsum("i,j,ij->", weights * (hi - lo) / 2, w_mu, values)
    breaks = sorted({0.0, radius, *[max(0.0, abs(zz) + k * width / 2) for zz in (z1, z2) for k in range(-5, 6)]})
    breaks = sorted(set(breaks) | {x + width / 4 for x in breaks if x + width / 4 < radius})
    breaks = [x for x in breaks if x <= radius]
    nodes, weights = leggauss(32)
    mu, w_mu = leggauss(256)
    for lo, hi in zip(breaks[:-1], breaks[1:]):
        r = lo + (hi - lo) * (nodes + 1) / 2
        Rr, M = np.meshgrid(r, mu, indexing="ij")
        z = Rr * M
        rho2 = Rr**2 * (1 - M**2)
        r1 = np.sqrt(rho2 + (z - z1) ** 2)
        r2 = np.sqrt(rho2 + (z - z2) ** 2)
        values = r1**a * r2**b * (1 - cutoff(r1) - cutoff(r2)) * weight(z, rho2) * Rr**2
        total += 2 * np.pi * np.einsum("i,j,ij->", weights * (hi - lo) / 2, w_mu, values)
    top = max(powers)
    mu, w_mu = leggauss(order + n + top + 8)
    first = _far_coefficients(a, z1, order, mu)
    second = _far_coefficients(b, z2, order, mu)
    for power, c in powers.items():
        angular_weight = eval_legendre(n, mu) * mu**power * c
        for j in range(order + 1):
            value = 2 * np.pi * np.sum(w_mu * angular_weight * sum(first[k] * second[j - k] for k in range(j + 1)))
            q = n + power + a + b - j
            total += -value * np.log(radius) if q + 3 == 0 else value * (-radius ** (q + 3) / (q + 3))
    return total


def _on_axis(result, z1, z2):
    values = {"ky1": z1, "ky2": z2, "y1y1": z1**2, "y1y2": z1 * z2, "y2y2": z2**2,
              "r12": abs(z1 - z2), "ir12": 1 / abs(z1 - z2)}
    values = {key: sp.Rational(str(value)) for key, value in values.items()}
    total = 0.0
    for (log_r12, log_r0), element in result.items():
        if log_r0:
            continue  # r0 = 1
        total += float(inv.evaluate(element, values)) * np.log(abs(z1 - z2))**log_r12
    return np.pi * total


@pytest.mark.parametrize("n, directions, a, b", [
    (0, ("y1",), -2, -1), (1, ("y1", "y2"), -2, -1), (2, ("y1",), -1, -2), (1, ("y1",), -1, -1),
])
def test_polynomial_seeds_equal_the_numerical_finite_part(n, directions, a, b):
    # reference: direct quadrature with |x|^B centred on the origin (helper above)
    z1, z2 = 1.3, 0.3
    result = polynomial_seed_integral(n, directions, a, b)
    scale = np.prod([z1 if w == "y1" else z2 for w in directions])
    numeric = scale * _quadrature(n, len(directions), a, b, z1, z2)
    assert numeric == pytest.approx(_on_axis(result, z1, z2), rel=1e-7, abs=1e-9)
    assert abs(numeric) > 1e-3


def test_distance_integral_closed_value():
    # reference: sphere averages of |x - y| (rho + y^2/(3 rho) outside, |y| + rho^2/(3|y|) inside),
    # integrated by hand: FP int |x - y| d^3x = -pi |y|^4/15
    result = polynomial_seed_integral(0, (), 1, 0)
    assert set(result) == {(0, 0)}
    assert result[(0, 0)] == -inv.dot("y1", "y1")**2 * sp.Rational(1, 15)


def test_bad_directions_are_refused():
    with pytest.raises(ValueError):
        polynomial_seed_integral(1, ("x",), -1, -1)
    with pytest.raises(ValueError):
        polynomial_seed_integral(-1, (), -1, -1)


@pytest.mark.parametrize("l", [0, 1, 2, 3])
def test_a_direction_along_the_bodies_by_the_square_kernel(l):
    # second route (current_two_pn, Z1): (y1.x)(k.x)^l = xhat_{aL} y1_a k_L
    # + (l/(2l+1)) (k.y1) |x|^2 (k.x)^(l-1), with the pair kernel and Z_{l-1}
    from stfalgebra.moments.current_two_pn import seed_in_invariants, square_pair_kernel
    from stfalgebra.moments.finite_part import RA, RB, two_centre_integral

    following = seed_in_invariants(two_centre_integral(l + 1, 1 / (RA * RB)))
    expected = inv.harmonic_gradient_along(following, l + 1, "y1") * sp.Rational(1, l + 1)
    if l:
        expected += inv.dot("k", "y1") * square_pair_kernel(l - 1) * sp.Rational(l, 2 * l + 1)
    result = polynomial_seed_integral(l, ("y1",), -1, -1)
    assert set(result) == {(0, 0)}
    squared = inv.dot("y1", "y1") - 2 * inv.dot("y1", "y2") + inv.dot("y2", "y2")
    difference = inv.on_null_cone(result[(0, 0)] - expected)
    # r12^2 -> y1.y1 - 2 y1.y2 + y2.y2 (r12 odd powers only here)
    reduced = inv.RING(0)
    for monomial, coefficient in difference.terms():
        exponents = list(monomial)
        power = exponents[-2]
        exponents[-2] = 0
        reduced += inv.RING({tuple(exponents): coefficient}) * squared**(power // 2) * inv.R12**(power % 2)
    assert reduced == 0


@pytest.mark.parametrize("l", [0, 1, 2])
def test_poles_at_the_bodies_cancel_in_a_sum_of_seeds(l):
    # reference: direct quadrature (helper above) of (k.x)^l (x - y1).v1/(r1^3 r2), finite at the
    # bodies, whose two seeds (x.v1) r1^-3 r2^-1 and (y1.v1) r1^-3 r2^-1 diverge one by one at y1;
    # bodies and v1 on the z axis (v1 = e_z)
    from stfalgebra.moments.polynomial_seeds import finite_total

    z1, z2 = 1.3, 0.3
    parts = [polynomial_seed_integral(l, ("v1",), -3, -1, strict=False),
             {key: -value * inv.dot("y1", "v1") for key, value in
              polynomial_seed_integral(l, (), -3, -1, strict=False).items()}]
    assert any(key[-1] == 1 for part in parts for key in part)  # single seeds do diverge
    total = finite_total(parts)
    values = {"ky1": z1, "ky2": z2, "kv1": 1, "y1y1": z1**2, "y1y2": z1 * z2, "y2y2": z2**2,
              "y1v1": z1, "y2v1": z2, "v1v1": 1, "r12": abs(z1 - z2), "ir12": 1 / abs(z1 - z2)}
    values = {key: sp.Rational(str(value)) for key, value in values.items()}
    closed = 0.0
    for (log_r12, log_r0), element in total.items():
        if not log_r0:
            closed += float(inv.evaluate(element, values)) * np.log(abs(z1 - z2))**log_r12
    numeric = _quadrature(l, {1: 1.0, 0: -z1}, -3, -1, z1, z2)
    assert numeric == pytest.approx(np.pi * closed, rel=1e-7, abs=1e-9)
    assert abs(numeric) > 1e-3


@pytest.mark.parametrize("l", [1, 2, 3])
def test_one_pn_field_term_by_polynomial_weights(l):
    # third route to the 1PN field term of J_L (reference: field_integrals.field_current_term):
    # the cross part of (1/(pi G)) [d_k U (d_b U_k - d_k U_b) + (3/4) d_t U d_b U] written out as
    # sum_w C_w(x) w_b + (x_b part), C_w polynomials in x.v_A over r1^3 r2^3, integrated by (P1)
    # (single seeds, and each component alone, diverge at the bodies), then (J2): (1/l) curl
    from stfalgebra.moments.current_two_pn import curl_on_newtonian_orbit
    from stfalgebra.moments.field_integrals import field_current_term
    from stfalgebra.moments import orbit_polynomials as op
    from stfalgebra.symbols import G, delta, m, nu, r

    def seed(directions, a, b, factor):
        return {key: value * factor for key, value in polynomial_seed_integral(l, directions, a, b, strict=False).items()}

    dot = inv.dot
    quarter = sp.Rational(3, 4)
    form = {
        # (x - y1).v2 (x - y2)_b -> -(x.v2 - y1.v2) y2_b; (3/4) (x - y1).v1 (x - y2)_b with a minus
        "y2": [seed(("v2",), -3, -3, inv.RING(-1)), seed((), -3, -3, dot("y1", "v2")),
               seed(("v1",), -3, -3, inv.RING(quarter)), seed((), -3, -3, -quarter * dot("y1", "v1"))],
        "y1": [seed(("v1",), -3, -3, inv.RING(-1)), seed((), -3, -3, dot("y2", "v1")),
               seed(("v2",), -3, -3, inv.RING(quarter)), seed((), -3, -3, -quarter * dot("y2", "v2"))],
    }
    # -(x - y1).(x - y2) (v1 + v2)_b = -(r1^2 + r2^2 - r12^2)/2 (v1 + v2)_b
    distances = [seed((), -1, -3, inv.RING(-sp.Rational(1, 2))), seed((), -3, -1, inv.RING(-sp.Rational(1, 2))),
                 seed((), -3, -3, inv.R12 * inv.R12 / 2)]
    form["v1"] = distances
    form["v2"] = distances
    # the poles at the bodies cancel only after the curl (a pole along y2 in the y2 component
    # meets [y2, y2, k] = 0): sum each component, curl key by key
    summed = {}
    for w, parts in form.items():
        total = {}
        for part in parts:
            for key, value in part.items():
                total[key] = total.get(key, inv.RING(0)) + value
        summed[w] = total
    keys = {key for total in summed.values() for key in total}
    on_orbit = {}
    for key in keys:
        curl_key = inv.probe_curl({w: total.get(key, inv.RING(0)) for w, total in summed.items()})
        on_orbit[key] = curl_on_newtonian_orbit(curl_key)
    finite_key = (0, 0, 0, 0, 0, 0)
    assert any(key[-1] == 1 for key in keys)          # single seeds diverge at the bodies
    for key, value in on_orbit.items():
        if key != finite_key:
            value = sp.expand(value.as_expr().subs(sp.Symbol("ir", positive=True), 1 / r))
            assert value == 0, key
    prefactor = op.from_expression(G * nu * m**2) * sp.Rational(1, l)
    mine = (prefactor * on_orbit[finite_key]).as_expr()
    mine = sp.expand(mine.subs(sp.Symbol("ir", positive=True), 1 / r))
    expected = field_current_term(l).to_sympy() * sp.Symbol("kx")**(l - 1)
    difference = sp.expand(mine - expected)
    for power in range(8, 1, -1):
        difference = sp.expand(difference.subs(delta**power, delta**(power - 2) * (1 - 4 * nu)))
    assert difference == 0


def test_strong_singularities_are_refused():
    # the (r1 r2)^eps continuation of int d^3x/r1^5 is 2 pi/(3 r12^2) (finite_part), while its
    # Hadamard partie finie is 0 (int_{r1 > s} d^3x/r1^5 = 2 pi/s^2, a pure power of s): beyond
    # r_A^-3 the continuation is not the partie finie, and (P1) refuses such seeds
    from stfalgebra.moments.finite_part import R12, seed_laurent_series

    assert seed_laurent_series(0, -5, 0) == {0: 2 * sp.pi / (3 * R12**2)}
    with pytest.raises(ValueError):
        polynomial_seed_integral(0, (), -5, 0)
    with pytest.raises(ValueError):
        polynomial_seed_integral(1, ("v1",), -1, -4)


def test_the_flint_harmonic_extension_is_the_sympy_one():
    # _weighted uses the flint twin of _harmonic_extension; both are Thorne's series (2.2)
    from stfalgebra.moments import flint_rings as fr
    from stfalgebra.moments import invariants as inv
    from stfalgebra.moments.polynomial_seeds import _harmonic_extension, _harmonic_extension_flint

    k1, k2, kk = inv.dot("k", "y1"), inv.dot("k", "v2"), inv.dot("k", "k")
    for f, degree in ((k1**4 * inv.R12, 4), (k1**2 * k2**3 * inv.dot("y1", "v2") + kk * k1**3, 5), (k2, 1)):
        expected = _harmonic_extension(f, degree)
        assert fr.invariant_to_sympy(_harmonic_extension_flint(fr.invariant_from_sympy(f), degree)) == expected
        assert inv.mixed_laplacian(expected, "k", "k") == 0          # harmonic in k
