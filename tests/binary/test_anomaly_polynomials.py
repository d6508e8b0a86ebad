"""Tests of stfalgebra.binary.anomaly_polynomials: the normal form (the relations cos^2 + sin^2 = 1,
beta^2 = 1 - e^2, I^2 = -1 give structurally equal results), the canonical denominators, and the
orbit variables against the quasi-Keplerian PN series of keplerian.py evaluated by sympy (a
second route: sympy expressions, not the polynomial ring)."""

from __future__ import annotations

import pytest
import sympy as sp
from hypothesis import given, settings
from hypothesis import strategies as st

from stfalgebra.binary.anomaly_polynomials import OrbitFunction, from_eccentricity_expression, orbit_variables
from stfalgebra.binary.keplerian import quasi_keplerian_from_frequency, u
from stfalgebra.orders import PNOrder
from stfalgebra.symbols import G, c, et, m, nu, phidot, r, rdot, x

cos_u, sin_u, beta, ecc, imaginary = (OrbitFunction.generator(name) for name in ("cos_u", "sin_u", "beta", "et", "I"))


def test_relations_of_the_normal_form():
    assert cos_u * cos_u + sin_u * sin_u == OrbitFunction.constant(1)
    assert beta * beta + ecc * ecc == OrbitFunction.constant(1)
    assert imaginary * imaginary == OrbitFunction.constant(-1)
    # (1 - e cos u)/(1 - e cos u) and (1 - e^2)/beta^2 tidy to 1
    one = (1 - ecc * cos_u).over(radial=1).tidy()
    assert (one.numerator, one.radial, one.eccentric) == (OrbitFunction.constant(1).numerator, 0, 0)
    assert (beta * beta).over(eccentric=1).tidy().eccentric == 0


@settings(max_examples=15, deadline=None)
@given(st.integers(0, 3), st.integers(0, 3), st.integers(0, 2), st.integers(0, 2))
def test_products_agree_with_sympy(i, j, k, radial):
    # (cos^i sin^j beta^k)/(1 - e cos u)^radial against sympy at a point (common practice)
    value = (cos_u**i * sin_u**j * beta**k).over(radial=radial)
    expected = sp.cos(u) ** i * sp.sin(u) ** j * sp.sqrt(1 - et**2) ** k / (1 - et * sp.cos(u)) ** radial
    point = {u: sp.Rational(7, 5), et: sp.Rational(2, 7)}
    assert sp.N((value.to_sympy() - expected).subs(point), 30) == pytest.approx(0, abs=1e-25)


def test_from_eccentricity_expression_refuses_other_denominators():
    with pytest.raises(ValueError, match="not a power"):
        from_eccentricity_expression(1 / (2 - et))
    assert from_eccentricity_expression(sp.sqrt(1 - et**2) / (3 - 3 * et**2)).eccentric == 1


def test_series_needs_a_small_argument():
    with pytest.raises(ValueError, match="O\\(sqrt\\(x\\)\\)"):
        cos_u.series([1, 1])


def test_orbit_variables_against_the_quasi_keplerian_series():
    # r = (m/(c^2 x)) R, rdot = c sqrt(x) V_r, phidot = (c^3 x^(3/2)/m) V_phi (G = 1), through x^1
    elements = quasi_keplerian_from_frequency(1)
    orbit = orbit_variables(PNOrder(1))
    eps = sp.Symbol("eps", positive=True)
    point = {u: sp.Rational(9, 7), et: sp.Rational(3, 5), nu: sp.Rational(1, 7), G: 1, m: 1, c: 1}
    checks = ((elements.radius(), orbit.radius, -2), (elements.radial_velocity(), orbit.radial_velocity, 1),
              (elements.angular_velocity(), orbit.angular_velocity, 3))
    for series, ours, lead in checks:
        for power in (0, 2):
            reference = series.coefficient(sp.Rational(lead + power, 2)).subs(point)
            assert sp.N(ours.coefficient(power).to_sympy().subs(point) - reference, 30) == pytest.approx(0, abs=1e-25)
    product = (orbit.radius * orbit.inverse_radius).truncated(2)
    assert product == OrbitFunction.constant(1)
    with pytest.raises(ValueError, match="1PN"):
        orbit_variables(PNOrder(sp.Rational(3, 2)))
