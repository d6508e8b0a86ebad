"""Tests of Y_lm, sY_lm, solid (STF) harmonics and alpha_L^lm (stfalgebra/stf/harmonics.py)."""

from __future__ import annotations

import math
import random
from math import factorial

import numpy as np
import pytest
import sympy as sp
from hypothesis import example, given, settings
from hypothesis import strategies as st
from scipy.special import sph_harm_y

from stfalgebra.stf.cartesian import (
    PROBE,
    contract_cartesian,
    harmonic_part_cartesian,
    is_harmonic,
    monomial_coefficients,
)
from stfalgebra.stf.harmonics import (
    alpha_on_triad,
    alpha_polynomial,
    solid_harmonic,
    spherical_harmonic,
    spin_weighted_harmonic,
    stf_harmonic,
)

k1, k2, k3 = PROBE
theta, phi = sp.symbols("theta phi", real=True)
PROPERTY = settings(max_examples=12, deadline=None)
RANDOM_POINTS = [(0.3, 1.1), (1.2, -2.5), (2.0, 0.4), (2.9, 5.9)]  # (theta, phi), fixed


def numeric(expression, theta_value, phi_value) -> complex:
    return complex(expression.subs({theta: theta_value, phi: phi_value}).evalf(20))


def as_function(expression):
    function = sp.lambdify((theta, phi), expression, modules="numpy")
    return lambda t, p: np.broadcast_to(np.asarray(function(t, p), dtype=complex), np.shape(t))


@st.composite
def degree_and_order(draw, max_degree: int = 8):
    degree = draw(st.integers(min_value=0, max_value=max_degree))
    order = draw(st.integers(min_value=-degree, max_value=degree))
    return degree, order


def rational_unit_vector(u: sp.Rational, v: sp.Rational):
    """Inverse stereographic projection: an exact rational point on the unit sphere."""
    denominator = 1 + u**2 + v**2
    return (2 * u / denominator, 2 * v / denominator, (1 - u**2 - v**2) / denominator)


def power_of_dot(n, rank):
    return sp.expand((n[0] * k1 + n[1] * k2 + n[2] * k3) ** rank)


def evaluate_at(polynomial, n):
    return polynomial.subs({k1: n[0], k2: n[1], k3: n[2]}, simultaneous=True)


# ------------------------------------------------------------------ Y_lm


@pytest.mark.parametrize("degree", range(0, 9))
def test_spherical_harmonic_matches_sympy_ynm(degree):
    # reference: sympy's Ynm (Condon-Shortley, orthonormal), independent implementation
    for order in range(-degree, degree + 1):
        ours = spherical_harmonic(degree, order, theta, phi)
        theirs = sp.Ynm(degree, order, theta, phi).expand(func=True)
        for theta_value, phi_value in RANDOM_POINTS[:2]:
            assert abs(numeric(ours, theta_value, phi_value) - numeric(theirs, theta_value, phi_value)) < 1e-12


def test_spherical_harmonic_matches_scipy():
    # reference: scipy.special.sph_harm_y(n, m, theta, phi), theta polar, Condon-Shortley phase
    generator = np.random.default_rng(20240611)
    thetas = generator.uniform(0, np.pi, 6)
    phis = generator.uniform(0, 2 * np.pi, 6)
    for degree in range(0, 11):
        for order in range(-degree, degree + 1):
            ours = as_function(spherical_harmonic(degree, order, theta, phi))(thetas, phis)
            theirs = sph_harm_y(degree, order, thetas, phis)
            assert np.max(np.abs(ours - theirs)) < 1e-12, (degree, order)


def vanishes(expression) -> bool:
    return sp.simplify(sp.expand(expression)) == 0


def test_spherical_harmonic_low_order_closed_forms():
    # from memory (any quantum-mechanics text, Condon-Shortley phase)
    assert spherical_harmonic(0, 0, theta, phi) == 1 / (2 * sp.sqrt(sp.pi))
    assert spherical_harmonic(1, 0, theta, phi) == sp.sqrt(3 / (4 * sp.pi)) * sp.cos(theta)
    assert vanishes(
        spherical_harmonic(1, -1, theta, phi) - sp.sqrt(3 / (8 * sp.pi)) * sp.sin(theta) * sp.exp(-sp.I * phi)
    )
    assert vanishes(spherical_harmonic(2, 0, theta, phi) - sp.sqrt(5 / (16 * sp.pi)) * (3 * sp.cos(theta) ** 2 - 1))
    assert vanishes(
        spherical_harmonic(2, 1, theta, phi)
        + sp.sqrt(15 / (8 * sp.pi)) * sp.sin(theta) * sp.cos(theta) * sp.exp(sp.I * phi)
    )


def test_spherical_harmonic_exact_numbers():
    # from memory: Y_20 at the equator is -sqrt(5/(16 pi)); Y_lm(0, phi) = sqrt((2l+1)/(4 pi)) delta_m0
    assert spherical_harmonic(2, 0, sp.pi / 2, 0) == -sp.sqrt(5 / (16 * sp.pi))
    for degree in range(6):
        for order in range(-degree, degree + 1):
            expected = sp.sqrt(sp.Rational(2 * degree + 1, 4) / sp.pi) if order == 0 else 0
            assert sp.simplify(spherical_harmonic(degree, order, 0, phi) - expected) == 0


@PROPERTY
@given(degree_and_order())
def test_spherical_harmonic_negative_order_symmetry(lm):
    # common practice: Y_{l,-m} = (-1)^m conj(Y_lm)
    degree, order = lm
    difference = spherical_harmonic(degree, -order, theta, phi) - (-1) ** order * sp.conjugate(
        spherical_harmonic(degree, order, theta, phi)
    )
    assert sp.expand(difference) == 0


# ------------------------------------------------------------------ quadrature


def sphere_quadrature(nodes: int = 24):
    cosines, weights = np.polynomial.legendre.leggauss(nodes)
    phis = 2 * np.pi * np.arange(2 * nodes) / (2 * nodes)
    theta_grid, phi_grid = np.meshgrid(np.arccos(cosines), phis, indexing="ij")
    weight_grid = np.outer(weights, np.full(2 * nodes, 2 * np.pi / (2 * nodes)))
    return theta_grid.ravel(), phi_grid.ravel(), weight_grid.ravel()


def gram_matrix(expressions):
    theta_grid, phi_grid, weights = sphere_quadrature()
    values = np.array([as_function(expression)(theta_grid, phi_grid) for expression in expressions])
    return (values * weights) @ values.conj().T


def test_spherical_harmonics_orthonormal_by_quadrature():
    # definition (orthonormality on the unit sphere), Gauss-Legendre x uniform-phi quadrature
    functions = [spherical_harmonic(l, m, theta, phi) for l in range(5) for m in range(-l, l + 1)]
    gram = gram_matrix(functions)
    assert np.max(np.abs(gram - np.eye(len(functions)))) < 1e-12


def test_spin_minus_two_harmonics_orthonormal_by_quadrature():
    # Goldberg et al. (1967): sY_lm orthonormal for fixed s
    functions = [spin_weighted_harmonic(-2, l, m, theta, phi) for l in range(2, 5) for m in range(-l, l + 1)]
    gram = gram_matrix(functions)
    assert np.max(np.abs(gram - np.eye(len(functions)))) < 1e-12


# ------------------------------------------------------------------ sY_lm

half_cos, half_sin = sp.cos(theta / 2), sp.sin(theta / 2)
cos_t, sin_t = sp.cos(theta), sp.sin(theta)
SPIN_MINUS_TWO_CLOSED_FORMS = {
    # l = 2 closed forms: as given in the PN-review convention (from memory; e.g. Blanchet,
    # Living Rev. Relativ. 17, 2 (2014), the (-2)Y_lm used with the h_lm decomposition)
    (2, 2): sp.sqrt(5 / (64 * sp.pi)) * (1 + cos_t) ** 2 * sp.exp(2 * sp.I * phi),
    (2, 1): sp.sqrt(5 / (16 * sp.pi)) * sin_t * (1 + cos_t) * sp.exp(sp.I * phi),
    (2, 0): sp.sqrt(15 / (32 * sp.pi)) * sin_t**2,
    (2, -1): sp.sqrt(5 / (16 * sp.pi)) * sin_t * (1 - cos_t) * sp.exp(-sp.I * phi),
    (2, -2): sp.sqrt(5 / (64 * sp.pi)) * (1 - cos_t) ** 2 * sp.exp(-2 * sp.I * phi),
    # l = 3, m = 0, +-2, +-3: from memory (same convention), in half angles
    (3, 3): -sp.sqrt(21 / (2 * sp.pi)) * half_cos**5 * half_sin * sp.exp(3 * sp.I * phi),
    (3, 2): sp.sqrt(7 / sp.pi) / 2 * half_cos**4 * (3 * cos_t - 2) * sp.exp(2 * sp.I * phi),
    (3, 0): sp.sqrt(105 / (2 * sp.pi)) / 4 * cos_t * sin_t**2,
    (3, -2): sp.sqrt(7 / sp.pi) / 2 * half_sin**4 * (3 * cos_t + 2) * sp.exp(-2 * sp.I * phi),
    (3, -3): sp.sqrt(21 / (2 * sp.pi)) * half_cos * half_sin**5 * sp.exp(-3 * sp.I * phi),
    # l = 3, m = +-1: worked by hand from the Goldberg et al. (1967) sum (the trigonometric
    # form recalled from memory had m = +-1 swapped, so it is not used); cross-checked
    # below by the spin-lowering test and by the small-angle behaviour theta^|m+s|
    (3, 1): sp.sqrt(35 / (2 * sp.pi)) / 32
    * (-sin_t + 4 * sp.sin(2 * theta) + 3 * sp.sin(3 * theta))
    * sp.exp(sp.I * phi),
    (3, -1): sp.sqrt(35 / (2 * sp.pi)) / 32
    * (sin_t + 4 * sp.sin(2 * theta) - 3 * sp.sin(3 * theta))
    * sp.exp(-sp.I * phi),
}


@pytest.mark.parametrize("lm", sorted(SPIN_MINUS_TWO_CLOSED_FORMS))
def test_spin_minus_two_closed_forms(lm):
    degree, order = lm
    ours = spin_weighted_harmonic(-2, degree, order, theta, phi)
    reference = SPIN_MINUS_TWO_CLOSED_FORMS[lm]
    for theta_value, phi_value in RANDOM_POINTS:
        assert abs(numeric(ours, theta_value, phi_value) - numeric(reference, theta_value, phi_value)) < 1e-13


def test_spin_minus_two_22_is_exact_closed_form():
    # the convention pinned in the brief, compared exactly
    ours = spin_weighted_harmonic(-2, 2, 2, theta, phi)
    assert sp.expand(ours - SPIN_MINUS_TWO_CLOSED_FORMS[(2, 2)]) == 0
    ours = spin_weighted_harmonic(-2, 2, -2, theta, phi)
    assert sp.expand(ours - SPIN_MINUS_TWO_CLOSED_FORMS[(2, -2)]) == 0


def test_small_angle_behaviour_of_spin_weighted_harmonics():
    # common practice: sY_lm ~ theta^|m+s| near theta = 0 and (pi - theta)^|m-s| near theta = pi
    epsilon = sp.Rational(1, 10**6)
    for degree in range(2, 6):
        for order in range(-degree, degree + 1):
            function = spin_weighted_harmonic(-2, degree, order, theta, phi)
            near_north = abs(numeric(function, epsilon, 0.0))
            near_south = abs(numeric(function, sp.pi - epsilon, 0.0))
            assert near_north < 1e-6 ** abs(order - 2) * 100 and near_north > 1e-6 ** abs(order - 2) / 100
            assert near_south < 1e-6 ** abs(order + 2) * 100 and near_south > 1e-6 ** abs(order + 2) / 100


def spin_lowering(function, spin):
    """Newman-Penrose ethbar on spin weight ``spin`` (from memory, Goldberg et al. 1967 sign):
    ethbar eta = -(sin theta)^(-s) (d/dtheta - (i/sin theta) d/dphi) [(sin theta)^s eta]."""
    weighted = sp.sin(theta) ** spin * function
    return -sp.sin(theta) ** (-spin) * (sp.diff(weighted, theta) - sp.I / sp.sin(theta) * sp.diff(weighted, phi))


@pytest.mark.parametrize("degree", range(2, 6))
def test_spin_minus_two_from_lowering_operator(degree):
    # Goldberg et al. (1967): ethbar sY_lm = -sqrt((l+s)(l-s+1)) (s-1)Y_lm, so
    # (-2)Y_lm = ethbar^2 Y_lm / sqrt((l-1) l (l+1) (l+2)), an independent route from Y_lm
    scale = sp.sqrt((degree - 1) * degree * (degree + 1) * (degree + 2))
    for order in range(-degree, degree + 1):
        lowered = spin_lowering(spin_lowering(spherical_harmonic(degree, order, theta, phi), 0), -1) / scale
        ours = spin_weighted_harmonic(-2, degree, order, theta, phi)
        for theta_value, phi_value in RANDOM_POINTS[:2]:
            assert abs(numeric(ours, theta_value, phi_value) - numeric(lowered, theta_value, phi_value)) < 1e-12


@pytest.mark.parametrize("degree", range(0, 7))
def test_spin_zero_is_scalar_harmonic(degree):
    # Goldberg et al. (1967): 0Y_lm = Y_lm
    for order in range(-degree, degree + 1):
        spin_zero = spin_weighted_harmonic(0, degree, order, theta, phi)
        scalar = spherical_harmonic(degree, order, theta, phi)
        for theta_value, phi_value in RANDOM_POINTS[:2]:
            assert abs(numeric(spin_zero, theta_value, phi_value) - numeric(scalar, theta_value, phi_value)) < 1e-13


@pytest.mark.parametrize("spin", [-2, -1, 1, 2, 3])
def test_spin_weighted_conjugation(spin):
    # Goldberg et al. (1967): conj(sY_lm) = (-1)^(s+m) (-s)Y_{l,-m}
    for degree in range(abs(spin), 5):
        for order in range(-degree, degree + 1):
            left = sp.conjugate(spin_weighted_harmonic(spin, degree, order, theta, phi))
            right = (-1) ** (spin + order) * spin_weighted_harmonic(-spin, degree, -order, theta, phi)
            assert sp.expand(left - right) == 0


def test_spin_weighted_below_spin_is_exact_zero():
    # selection rule: no spin-weight-s harmonic with l < |s|
    assert spin_weighted_harmonic(-2, 1, 0, theta, phi) == 0
    assert spin_weighted_harmonic(3, 2, -1, theta, phi) == 0


# ------------------------------------------------------------------ solid / STF harmonics


@PROPERTY
@given(degree_and_order())
@example((0, 0))
@example((1, -1))
@example((8, 8))
def test_solid_harmonic_is_harmonic_and_homogeneous(lm):
    # Thorne (1980) eq. (2.11): Y^lm_L is STF, so |k|^l Y_lm is a harmonic degree-l polynomial
    degree, order = lm
    polynomial = solid_harmonic(degree, order)
    assert is_harmonic(polynomial)
    assert {sum(key) for key in monomial_coefficients(polynomial, degree)} == {degree}
    assert sp.expand(harmonic_part_cartesian(polynomial, degree) - polynomial) == 0
    assert stf_harmonic(degree, order) == polynomial


@PROPERTY
@given(degree_and_order(), st.integers(-6, 6), st.integers(-6, 6))
def test_solid_harmonic_restricts_to_spherical_harmonic(lm, u, v):
    # definition: Y^lm_L n_L = Y_lm(n) on the unit sphere
    degree, order = lm
    n = rational_unit_vector(sp.Rational(u, 3), sp.Rational(v, 5))
    exact = evaluate_at(solid_harmonic(degree, order), n)
    polar = math.acos(float(n[2]))
    azimuth = math.atan2(float(n[1]), float(n[0]))
    angular = numeric(spherical_harmonic(degree, order, theta, phi), polar, azimuth)
    assert abs(complex(exact.evalf(20)) - angular) < 1e-12


@PROPERTY
@given(degree_and_order())
def test_solid_harmonic_conjugation(lm):
    # common practice: Y^{l,-m}_L = (-1)^m conj(Y^lm_L) (real probe vector)
    degree, order = lm
    difference = solid_harmonic(degree, -order) - (-1) ** order * sp.conjugate(solid_harmonic(degree, order))
    assert sp.expand(difference) == 0


def test_solid_harmonic_closed_forms():
    # from memory (common practice, Condon-Shortley): r Y_11 = -sqrt(3/(8 pi)) (x + i y),
    # r^2 Y_22 = sqrt(15/(32 pi)) (x + i y)^2, r^2 Y_20 = sqrt(5/(16 pi)) (2 z^2 - x^2 - y^2)
    assert sp.expand(solid_harmonic(1, 1) + sp.sqrt(3 / (8 * sp.pi)) * (k1 + sp.I * k2)) == 0
    assert sp.expand(solid_harmonic(2, 2) - sp.sqrt(15 / (32 * sp.pi)) * (k1 + sp.I * k2) ** 2) == 0
    assert sp.expand(solid_harmonic(2, 0) - sp.sqrt(5 / (16 * sp.pi)) * (2 * k3**2 - k1**2 - k2**2)) == 0


# ------------------------------------------------------------------ alpha_L^lm


@pytest.mark.parametrize("degree", range(0, 7))
def test_alpha_is_dual_to_stf_harmonics(degree):
    # derived: alpha_L^lm Y^lm'_L = int Y_lm' conj(Y_lm) dOmega = delta_mm'
    for order in range(-degree, degree + 1):
        for other in range(-degree, degree + 1):
            value = sp.expand(contract_cartesian(alpha_polynomial(degree, order), solid_harmonic(degree, other), degree))
            assert value == (1 if order == other else 0)


@pytest.mark.parametrize("degree", range(0, 7))
def test_alpha_equals_conjugate_stf_harmonic_times_normalisation(degree):
    # the stated identity alpha_L^lm = (4 pi l!/(2l+1)!!) conj(Y^lm_L), checked as polynomials
    double_factorial = int(sp.factorial2(2 * degree + 1))
    for order in range(-degree, degree + 1):
        expected = 4 * sp.pi * sp.Rational(factorial(degree), double_factorial) * sp.conjugate(solid_harmonic(degree, order))
        assert sp.expand(alpha_polynomial(degree, order) - expected) == 0


@settings(max_examples=10, deadline=None)
@given(st.integers(0, 6), st.integers(-7, 7), st.integers(-7, 7))
@example(0, 0, 0)
@example(1, 2, -1)
def test_alpha_expansion_of_stf_unit_vector_exact(degree, u, v):
    # Kidder (2008) / Blanchet (2014) definition: n_<L> = sum_m alpha_L^lm Y_lm(n); n_<L> from the
    # independent trace removal of (n.k)^l, Y_lm(n) exact at a rational point of the sphere
    n = rational_unit_vector(sp.Rational(u, 4), sp.Rational(v, 3))
    stf_part = harmonic_part_cartesian(power_of_dot(n, degree), degree)
    expansion = sum(
        evaluate_at(solid_harmonic(degree, order), n) * alpha_polynomial(degree, order)
        for order in range(-degree, degree + 1)
    )
    assert sp.expand(stf_part - expansion) == 0


def test_alpha_expansion_against_scipy_harmonics():
    # same identity with Y_lm(n) from scipy (independent of this module), at random float n
    generator = random.Random(7)
    for degree in range(0, 7):
        polar, azimuth = generator.uniform(0, np.pi), generator.uniform(0, 2 * np.pi)
        n = (np.sin(polar) * np.cos(azimuth), np.sin(polar) * np.sin(azimuth), np.cos(polar))
        stf_part = monomial_coefficients(
            harmonic_part_cartesian(power_of_dot([sp.Float(x, 30) for x in n], degree), degree), degree
        )
        expansion: dict = {}
        for order in range(-degree, degree + 1):
            value = complex(sph_harm_y(degree, order, polar, azimuth))
            for key, coefficient in monomial_coefficients(alpha_polynomial(degree, order), degree).items():
                expansion[key] = expansion.get(key, 0) + value * complex(coefficient)
        for key in set(stf_part) | set(expansion):
            assert abs(complex(stf_part.get(key, 0)) - expansion.get(key, 0)) < 1e-10, (degree, key)


@pytest.mark.parametrize("degree", range(0, 7))
def test_alpha_on_triad_consistent_with_polynomial(degree):
    # definition: (a! b! c!/l!) times the k1^a k2^b k3^c coefficient; zero by the selection rule
    for order in range(-degree, degree + 1):
        coefficients = monomial_coefficients(alpha_polynomial(degree, order), degree)
        for a in range(degree + 1):
            for b in range(degree - a + 1):
                c = degree - a - b
                value = alpha_on_triad(degree, order, a, b, c)
                expected = sp.Rational(factorial(a) * factorial(b) * factorial(c), factorial(degree)) * coefficients.get(
                    (a, b, c), 0
                )
                assert sp.expand(value - expected) == 0
                if a + b < abs(order) or (a + b - order) % 2:
                    assert value is sp.S.Zero


def test_alpha_on_triad_reference_values():
    # worked by hand from alpha_L^lm = (4 pi l!/(2l+1)!!) conj(Y^lm_L) and r^2 Y_22 =
    # sqrt(15/(32 pi)) (x + i y)^2 (from memory): alpha_xx^22 = sqrt(2 pi/15), alpha_xy^22 =
    # -i sqrt(2 pi/15), alpha_yy^22 = -sqrt(2 pi/15); alpha_zz^20 worked by hand from the definition
    # at n = e_z, where only m = 0 survives: n_<zz> = 2/3 = alpha_zz^20 Y_20(0) = alpha_zz^20 sqrt(5/(4 pi))
    root = sp.sqrt(2 * sp.pi / 15)
    assert alpha_on_triad(2, 2, 2, 0, 0) == root
    assert alpha_on_triad(2, 2, 1, 1, 0) == -sp.I * root
    assert alpha_on_triad(2, 2, 0, 2, 0) == -root
    assert alpha_on_triad(2, 0, 0, 0, 2) == sp.Rational(2, 3) / sp.sqrt(5 / (4 * sp.pi))
    assert alpha_on_triad(0, 0, 0, 0, 0) == 2 * sp.sqrt(sp.pi)  # n_<> = 1 = sqrt(4 pi) Y_00


def test_alpha_sign_gives_positive_leading_22_mode():
    # conventions.md: U_22 = (4/2!) sqrt(3*4/(2*2*1)) alpha_L^22 U_L, h_22 = -(G/(sqrt 2 R c^4)) U_22,
    # Newtonian circular orbit I_ij = mu r^2 n_<ij>, so d^2 I_ij/dt^2 = 2 mu r^2 omega^2 (lambda_i lambda_j
    # - n_i n_j); with r^2 omega^2 = c^2 x this must give h_22 = 8 sqrt(pi/5) (G mu x/(R c^2)) exp(-2 i phi),
    # i.e. Hhat_22 = +1 (the PN-review sign, conventions.md)
    orbital_phase = sp.Symbol("phi_orb", real=True)
    n = (sp.cos(orbital_phase), sp.sin(orbital_phase), 0)
    lam = (-sp.sin(orbital_phase), sp.cos(orbital_phase), 0)

    def contract_with_triad_power(vector):
        # alpha_L^22 v_L = sum over (a, b) of l!/(a! b!) alpha_on_triad(2, 2, a, b, 0) v_x^a v_y^b
        return sum(
            sp.Rational(2, factorial(a) * factorial(2 - a)) * alpha_on_triad(2, 2, a, 2 - a, 0) * vector[0] ** a * vector[1] ** (2 - a)
            for a in range(3)
        )

    G, mu, x, R, c = sp.symbols("G mu x R c", positive=True)
    second_derivative = 2 * mu * c**2 * x * (contract_with_triad_power(lam) - contract_with_triad_power(n))
    u_22 = 2 * sp.sqrt(3) * second_derivative
    h_22 = -G / (sp.sqrt(2) * R * c**4) * u_22
    expected = 8 * sp.sqrt(sp.pi / 5) * G * mu * x / (R * c**2) * sp.exp(-2 * sp.I * orbital_phase)
    assert sp.simplify((h_22 - expected).rewrite(sp.exp)) == 0


def test_alpha_on_triad_accepts_sympy_integers_and_caches():
    first = alpha_on_triad(4, 2, 2, 2, 0)
    assert alpha_on_triad(sp.Integer(4), sp.Integer(2), 2, 2, np.int64(0)) == first
    assert alpha_on_triad.cache_info().hits >= 1


# ------------------------------------------------------------------ bad input


@pytest.mark.parametrize(
    "call",
    [
        lambda bad: spherical_harmonic(bad, 0, theta, phi),
        lambda bad: spin_weighted_harmonic(-2, bad, 0, theta, phi),
        lambda bad: solid_harmonic(bad, 0),
        lambda bad: alpha_polynomial(bad, 0),
        lambda bad: alpha_on_triad(bad, 0, 0, 0, 0),
    ],
)
@pytest.mark.parametrize("bad", [-1, 2.5, sp.Rational(1, 2), "2", None, True])
def test_bad_degree_names_the_value(call, bad):
    with pytest.raises(ValueError, match=r"\bl\b.*" + re_escape(bad)):
        call(bad)


def re_escape(value) -> str:
    import re

    return re.escape(repr(value))


@pytest.mark.parametrize(
    "call",
    [
        lambda bad: spherical_harmonic(2, bad, theta, phi),
        lambda bad: spin_weighted_harmonic(-2, 2, bad, theta, phi),
        lambda bad: solid_harmonic(2, bad),
        lambda bad: alpha_polynomial(2, bad),
    ],
)
@pytest.mark.parametrize("bad", [3, -3, 1.0, sp.Rational(3, 2)])
def test_bad_order_names_the_value(call, bad):
    with pytest.raises(ValueError, match=r"\bm\b.*" + re_escape(bad)):
        call(bad)


def test_bad_spin_and_triad_counts():
    with pytest.raises(ValueError, match="s must be an integer, got 0.5"):
        spin_weighted_harmonic(0.5, 2, 0, theta, phi)
    with pytest.raises(ValueError, match=r"a \+ b \+ c must equal l=3"):
        alpha_on_triad(3, 1, 1, 1, 0)
    with pytest.raises(ValueError, match="non-negative"):
        alpha_on_triad(2, 0, 3, -1, 0)
    with pytest.raises(ValueError, match="m=3"):
        alpha_on_triad(2, 3, 2, 0, 0)
    with pytest.raises(TypeError):
        spherical_harmonic(2, 0, "theta", phi)
