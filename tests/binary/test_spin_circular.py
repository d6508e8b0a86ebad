"""Tests of stfalgebra.binary.spin_circular: the circular-orbit relations with aligned spins,
derived from the cited accelerations and energy, against the published spin-orbit coefficients
(Kidder, Phys. Rev. D 52, 821 (1995); Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 11.3),
the first law dE = omega dL, the non-spinning relations of the project, and the exact circular
equatorial geodesic of the Kerr metric (derived here with sympy) in the test-mass limit."""

from __future__ import annotations

from fractions import Fraction
from functools import lru_cache

import pytest
import sympy as sp

from stfalgebra.binary.circular_frequency import frequency_in_gamma, gamma_over_x, on_circular_orbit
from stfalgebra.binary.cited_inputs import energy_per_reduced_mass
from stfalgebra.binary.spin_circular import (
    circular_angular_momentum, circular_energy, spinning_circular_reduction, spinning_frequency_in_gamma,
    spinning_gamma_over_x,
)
from stfalgebra.binary.spin_variables import aligned_spin_components
from stfalgebra.exact import ExactPolynomial, engine_symbols
from stfalgebra.pnseries import PNSeries

S_L, SIGMA_L = aligned_spin_components()
DELTA = ExactPolynomial("delta")
NO_SPINS = {"chi1": 0, "chi2": 0}
SO = Fraction(3, 2)


def test_frequency_spin_orbit_coefficient_is_the_published_one():
    # omega^2 = (G m/r^3)[1 + (-3 + nu) gamma - (5 s_l + 3 delta sigma_l) gamma^(3/2)]
    # (Blanchet 2014, Sec. 11.3; Kidder 1995, Sec. IV, as -sum_i chi_i (2 m_i^2/m^2 + 3 nu); from memory)
    y = spinning_frequency_in_gamma()
    assert y.coefficient(SO) == -5 * S_L - 3 * DELTA * SIGMA_L
    assert y.known_through == SO


def test_non_spinning_parts_agree_with_the_point_mass_derivation():
    # the project's non-spinning derivation (binary/circular_frequency.py) through 1PN
    for spinning, plain in ((spinning_frequency_in_gamma(), frequency_in_gamma(1)),
                            (spinning_gamma_over_x(), gamma_over_x(1))):
        for order in (0, 1):
            assert spinning.coefficient(order) == plain.coefficient(order)
    energy = PNSeries._from_trusted({2 * k: v for k, v in energy_per_reduced_mass(engine_symbols()).items() if k <= 1}, 3)
    plain_energy = on_circular_orbit(energy, 1)
    for order in (1, 2):
        assert circular_energy().coefficient(order).substitute(NO_SPINS) == plain_energy.coefficient(order)


def test_energy_spin_orbit_coefficient_is_the_published_one():
    # E = -(mu c^2 x/2){1 + x(-3/4 - nu/12) + x^(3/2) (14/3 S_l + 2 delta Sigma_l) c/(G m^2) + ...}
    # (Blanchet 2014, Sec. 11.3; Kidder 1995, Sec. IV, as (8/3 m_i^2/m^2 + 2 nu) chi_i; from memory,
    # and stated in the project's issue)
    energy = circular_energy()
    assert energy.coefficient(1) == Fraction(-1, 2)
    assert energy.coefficient(Fraction(5, 2)) == Fraction(-1, 2) * (Fraction(14, 3) * S_L + 2 * DELTA * SIGMA_L)
    assert energy.known_through == Fraction(5, 2)


def test_angular_momentum_obeys_the_first_law_and_the_published_coefficient():
    # circular orbits with constant spins: dE/dx = omega dL/dx with omega = x^(3/2) (G = m = c = 1)
    energy, momentum = circular_energy(), circular_angular_momentum()
    for half in range(0, 4):           # orders x^0 .. x^(3/2) of dE/dx
        order = Fraction(half, 2)
        lhs = energy.coefficient(order + 1) * (order + 1)
        rhs = momentum.coefficient(order - Fraction(1, 2)) * (order - Fraction(1, 2))
        assert lhs == rhs, order
    # L = (G mu m/(c x^(1/2))){1 + x (3/2 + nu/6) + x^(3/2)(-35/6 S_l - 5/2 delta Sigma_l) c/(G m^2)}
    # (Blanchet 2014, Sec. 11.3, from memory)
    assert momentum.coefficient(1) == Fraction(-35, 6) * S_L - Fraction(5, 2) * DELTA * SIGMA_L


def test_reduction_refuses_inhomogeneous_series():
    s = engine_symbols()
    with pytest.raises(ValueError, match="homogeneous"):
        spinning_circular_reduction(PNSeries._from_trusted({0: s.r + s.G}, 1))
    with pytest.raises(ValueError, match="no known term"):
        spinning_circular_reduction(PNSeries._from_trusted({}, 1))


@lru_cache(maxsize=1)
def _kerr_circular_energy_series():
    """E/mu - 1 of the prograde circular equatorial geodesic of the Kerr metric, as a series in
    X = (M Omega)^(1/3), derived here from the metric (M = G = c = 1, a = q M).

    Boyer-Lindquist coordinates at theta = pi/2: g_tt = -(1 - 2/r), g_tphi = -2 q/r,
    g_phiphi = r^2 + q^2 + 2 q^2/r (Kerr 1963; Boyer & Lindquist 1967; common practice).
    Circular geodesics: d_r g_tt + 2 Omega d_r g_tphi + Omega^2 d_r g_phiphi = 0;
    E = -(g_tt + Omega g_tphi) u^t, u^t = [-(g_tt + 2 Omega g_tphi + Omega^2 g_phiphi)]^(-1/2).
    """
    q, r, omega, s, X = sp.symbols("q r Omega s X", positive=True)
    g_tt, g_tphi, g_phiphi = -(1 - 2 / r), -2 * q / r, r**2 + q**2 + 2 * q**2 / r
    condition = sp.diff(g_tt, r) + 2 * omega * sp.diff(g_tphi, r) + omega**2 * sp.diff(g_phiphi, r)
    roots = sp.solve(condition, omega)
    # prograde: the root that tends to +r^(-3/2) (Kepler) when q -> 0
    prograde = [root for root in roots if sp.simplify(root.subs(q, 0) - r**sp.Rational(-3, 2)) == 0]
    assert len(prograde) == 1
    frequency = sp.simplify(prograde[0])
    # the closed form Omega = 1/(r^(3/2) + q) (Bardeen, Press & Teukolsky 1972, from memory)
    assert sp.simplify(frequency - 1 / (r**sp.Rational(3, 2) + q)) == 0
    # in s = r^(-1/2) the inverse square of u^t and the numerator of E are rational functions
    inverse_square = sp.cancel((-(g_tt + 2 * frequency * g_tphi + frequency**2 * g_phiphi)).subs(r, s**-2))
    numerator = sp.cancel((-(g_tt + frequency * g_tphi)).subs(r, s**-2))
    order = 6                                   # through X^5, i.e. x^(5/2)

    def taylor(expression, variable):
        return sp.series(expression, variable, 0, order).removeO()

    energy_s = sp.expand(taylor(numerator, s) * taylor(inverse_square ** sp.Rational(-1, 2), s))
    # X^3 = M Omega = s^3/(1 + q s^3) inverts exactly: s = X (1 - q X^3)^(-1/3)
    s_of_x = taylor(X * (1 - q * X**3) ** sp.Rational(-1, 3), X)
    composed = sp.expand(energy_s.subs(s, s_of_x))
    return sum(composed.coeff(X, k) * X**k for k in range(1, order)), q, X


def test_test_mass_limit_is_the_kerr_circular_equatorial_geodesic():
    # nu -> 0 (delta -> 1), chi2 = 0: a test mass on a prograde circular orbit around a Kerr black
    # hole with chi1 = a/M = q. The PN energy E/mu = c^2 sum_k e_k x^k must equal the geodesic's
    # E/mu - 1 through x^(5/2) (relative 3/2), linear in q there (q^2 enters at x^3).
    kerr, q, X = _kerr_circular_energy_series()
    energy = circular_energy()
    limit = {"nu": 0, "delta": 1, "chi2": 0}
    for order in (Fraction(1), Fraction(2), Fraction(5, 2)):
        ours = energy.coefficient(order).substitute(limit).to_sympy().subs(sp.Symbol("chi1", real=True), q)
        assert sp.expand(kerr.coeff(X, int(2 * order)) - ours) == 0, order
    for power in (1, 3):                       # no odd powers of X below X^5
        assert kerr.coeff(X, power) == 0
    # the often-quoted form with v = (M Omega)^(1/3), (1 - 2v^2 + q v^3)/sqrt(1 - 3v^2 + 2q v^3), is the
    # energy with v = (M/r)^(1/2): written in (M Omega)^(1/3) it would miss -q x^(5/2)/3
    misquoted = sp.series((1 - 2 * X**2 + q * X**3) / sp.sqrt(1 - 3 * X**2 + 2 * q * X**3) - 1, X, 0, 6).removeO()
    assert sp.expand(kerr.coeff(X, 5) - misquoted.coeff(X, 5)) == -q / 3
