"""Tests of stfalgebra.binary.anomaly_integrals: the orbit means against scipy quadrature, the
periodic antiderivatives against quadrature of their defining integrand, their zero mean, and
the Fourier closed forms (v - u, Re Li2) against independent evaluations (sympy/mpmath)."""

from __future__ import annotations

import math

import mpmath
import numpy as np
import pytest
import sympy as sp
from scipy.integrate import quad

from stfalgebra.binary.anomaly_integrals import (
    ANOMALY_DILOGARITHM,
    LOG_ONE_MINUS_E_COS_U,
    RATIONAL,
    TRUE_MINUS_ECCENTRIC_ANOMALY,
    AnomalyFunction,
    anomaly_ratio,
    zero_mean_integral,
)
from stfalgebra.binary.keplerian import e, true_anomaly, u

ECC = 0.6
W = 1 - e * sp.cos(u)
CASES = [
    # (rate, K): even, odd, mixed with sqrt(1 - e^2), and a (v - u) drive
    (1 / W**2, 0),
    ((3 + e * sp.cos(u) ** 3) / W**5, 0),
    (sp.sin(u) * sp.cos(u) ** 2 / W**3, 0),
    (sp.sqrt(1 - e**2) * sp.cos(u) / W**3 + sp.sin(u) ** 2, 1),
    (sp.sin(u) / W**4, sp.Rational(2, 3)),
]


def _v_minus_u(x: float, ecc: float = ECC) -> float:
    # an independent route: the true anomaly from the half-angle formula, continued in u
    value = float(true_anomaly(sp.Float(ecc), sp.Float(x)))
    return value - x


def _mean(function) -> float:
    return quad(lambda x: function(x) * (1 - ECC * math.cos(x)), -math.pi, math.pi, limit=200)[0] / (2 * math.pi)


@pytest.mark.parametrize("rate, drive", CASES)
def test_mean_and_periodic_part_against_quadrature(rate, drive):
    result = zero_mean_integral(rate, drive)
    f = sp.lambdify(u, rate.subs(e, ECC), "math")
    k = float(sp.sympify(drive).subs(e, ECC))
    mean = _mean(f)
    assert float(result.mean.subs(e, ECC)) == pytest.approx(mean, abs=1e-12)
    integrand = lambda x: (f(x) + k * _v_minus_u(x) - mean) * (1 - ECC * math.cos(x))  # noqa: E731
    for start, end in ((-2.0, 0.3), (0.3, 2.9)):
        expected = quad(integrand, start, end, epsabs=1e-13, epsrel=1e-13, limit=200)[0]
        p = result.periodic.numeric(np.array([start, end]), ECC)
        assert p[1] - p[0] == pytest.approx(expected, rel=1e-9, abs=1e-11)
    # zero mean over the orbit, exactly and numerically
    assert sp.simplify(result.periodic.orbit_mean()) == 0
    assert _mean(lambda x: float(result.periodic.numeric(x, ECC))) == pytest.approx(0, abs=1e-11)


def test_periodic_part_is_periodic_and_the_closed_form_matches_the_numbers():
    result = zero_mean_integral(*CASES[4])
    points = np.array([-1.0, 0.4, 2.2])
    assert np.allclose(result.periodic.numeric(points, ECC), result.periodic.numeric(points + 2 * np.pi, ECC),
                       rtol=0, atol=1e-12)
    closed = result.periodic.expression()
    for x in points:
        value = complex(sp.N(closed.subs({e: sp.Rational(3, 5), u: sp.Float(x, 30)}), 20))
        assert value.real == pytest.approx(float(result.periodic.numeric(x, ECC)), rel=1e-12)
        assert abs(value.imag) < 1e-15


def test_basis_functions_against_independent_evaluations():
    rho = float(anomaly_ratio(sp.Rational(3, 5)))
    assert rho == pytest.approx(1 / 3)
    for x in (-2.5, 0.7, 3.0):
        v_minus_u = AnomalyFunction.from_terms({TRUE_MINUS_ECCENTRIC_ANOMALY: 1}).numeric(x, ECC)
        assert float(v_minus_u) == pytest.approx(_v_minus_u(x), abs=1e-13)
        dilog = AnomalyFunction.from_terms({ANOMALY_DILOGARITHM: 1}).numeric(x, ECC)
        assert float(dilog) == pytest.approx(float(mpmath.re(mpmath.polylog(2, rho * mpmath.expj(x)))), abs=1e-14)
        log = AnomalyFunction.from_terms({LOG_ONE_MINUS_E_COS_U: 1}).numeric(x, ECC)
        assert float(log) == pytest.approx(math.log(1 - ECC * math.cos(x)), abs=1e-14)


def test_fourier_means_of_the_transcendental_functions():
    # <f> over l by quadrature against the exact Fourier-series means
    for name, numeric in ((TRUE_MINUS_ECCENTRIC_ANOMALY, None), (ANOMALY_DILOGARITHM, None),
                          (LOG_ONE_MINUS_E_COS_U, None)):
        function = AnomalyFunction.from_terms({name: sp.cos(u) + sp.sin(u) ** 3})
        exact = float(sp.N(function.orbit_mean().subs(e, sp.Rational(3, 5))))
        assert exact == pytest.approx(_mean(lambda x: float(function.numeric(x, ECC))), abs=1e-12)


def test_rational_coefficients_are_reduced():
    function = AnomalyFunction.from_terms({RATIONAL: sp.sin(u) ** 2 + sp.cos(u) ** 2 + (1 - e**2) / sp.sqrt(1 - e**2)})
    assert sp.simplify(function.coefficient(RATIONAL) - 1 - sp.sqrt(1 - e**2)) == 0


def test_bad_input():
    with pytest.raises(ValueError, match="not a power of 1 - e cos u"):
        zero_mean_integral(1 / (2 + sp.cos(u)))
    with pytest.raises(ValueError, match="free of u"):
        zero_mean_integral(sp.cos(u), sp.cos(u))
    with pytest.raises(ValueError, match="unknown basis"):
        AnomalyFunction.from_terms({"exp(u)": 1})
    with pytest.raises(ValueError, match="other than through cos and sin"):
        zero_mean_integral(u * sp.cos(u))
    with pytest.raises(ValueError, match="must lie in"):
        AnomalyFunction.from_terms({RATIONAL: 1}).numeric(0.1, 1.0)
