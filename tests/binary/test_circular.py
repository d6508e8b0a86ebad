"""Tests of stfalgebra.binary.circular: relations derived from the 1PN acceleration against
published values, and internal consistency (first law, round trips)."""

from __future__ import annotations

import pytest
import sympy as sp
from hypothesis import given, settings
from hypothesis import strategies as st

from stfalgebra.binary.circular import (
    circular_angular_momentum,
    circular_energy,
    circular_frequency_squared,
    circular_gamma,
    circular_radius,
    to_circular_orbit,
)
from stfalgebra.errors import OrderBeyondInputsError
from stfalgebra.pnseries import PNSeries
from stfalgebra.symbols import G, c, m, nu, phidot, r, rdot, x

eps = sp.Symbol("eps", positive=True)
half = sp.Rational(1, 2)


def test_frequency_squared_1pn():
    # omega^2 = (G m/r^3)[1 + (-3 + nu) G m/(r c^2)] (from memory, Blanchet, Living Rev.
    # Relativ. 17, 2 (2014), circular orbits in harmonic coordinates)
    w2 = circular_frequency_squared(1)
    assert w2.coefficient(0) == G * m / r**3
    assert sp.expand(w2.coefficient(1) - G * m / r**3 * (-3 + nu) * G * m / r) == 0
    assert w2.known_through == sp.Rational(3, 2)


def test_frequency_squared_newtonian_is_kepler():
    # Kepler's third law (common practice)
    assert circular_frequency_squared(0) == PNSeries({0: G * m / r**3}, half)


def test_gamma_1pn():
    # gamma = x [1 + (1 - nu/3) x + O(x^2)] (from memory, Blanchet, Living Rev. Relativ. 17,
    # 2 (2014))
    g = circular_gamma(1)
    assert g.coefficient(1) == 1
    assert g.coefficient(sp.Rational(3, 2)) == 0
    assert sp.expand(g.coefficient(2) - (1 - nu / 3)) == 0
    assert g.known_through == sp.Rational(5, 2)
    with pytest.raises(OrderBeyondInputsError):
        g.coefficient(3)


def test_gamma_newtonian():
    assert circular_gamma(0) == PNSeries({1: 1}, sp.Rational(3, 2))


def test_radius():
    rad = circular_radius(1)
    assert rad.leading_order == -1 and rad.leading_coefficient == G * m / c**2
    assert sp.expand(rad.coefficient(0) + G * m / c**2 * (1 - nu / 3)) == 0


def test_energy_1pn():
    # E = -(mu c^2 x/2)[1 - (3/4 + nu/12) x] (from memory, Blanchet, Living Rev. Relativ. 17,
    # 2 (2014), circular-orbit energy)
    e = circular_energy(1)
    mu = m * nu
    assert sp.expand(e.coefficient(1) + mu * c**2 / 2) == 0
    assert sp.expand(e.coefficient(2) - mu * c**2 / 2 * (sp.Rational(3, 4) + nu / 12)) == 0
    assert e.known_through == sp.Rational(5, 2)


def test_angular_momentum_1pn():
    # J = (G m^2 nu/(c x^(1/2)))[1 + (3/2 + nu/6) x] (from memory, Blanchet, Living Rev.
    # Relativ. 17, 2 (2014))
    j = circular_angular_momentum(1)
    lead = G * m**2 * nu / c
    assert sp.expand(j.coefficient(-half) - lead) == 0
    assert sp.expand(j.coefficient(half) - lead * (sp.Rational(3, 2) + nu / 6)) == 0


@pytest.mark.parametrize("pn_order", [0, 1, 2])
def test_first_law(pn_order):
    # dE/dx = omega dJ/dx on circular orbits, omega = c^3 x^(3/2)/(G m) (common practice)
    e = circular_energy(pn_order).to_expression(eps)
    j = circular_angular_momentum(pn_order).to_expression(eps)
    xs = sp.Symbol("xs", positive=True)
    e_x, j_x = e.subs(eps, sp.sqrt(xs)), j.subs(eps, sp.sqrt(xs))
    lhs = sp.diff(e_x, xs)
    rhs = c**3 * xs ** sp.Rational(3, 2) / (G * m) * sp.diff(j_x, xs)
    diff = PNSeries.from_expression(sp.expand((lhs - rhs).subs(xs, eps**2)), eps,
                                    pn_order)
    assert diff.expand().orders == ()


@pytest.mark.parametrize("pn_order", [0, 1, 2])
def test_gamma_round_trip(pn_order):
    # gamma = G m/(r c^2) written as a 1/c series, mapped to the circular orbit, is gamma(x)
    series = PNSeries({1: G * m / r}, sp.oo)
    mapped = to_circular_orbit(series, pn_order)
    g = circular_gamma(pn_order)
    known = min(mapped.known_through, g.known_through)
    assert mapped.truncate(known) == g.truncate(known)


def test_newtonian_mode_amplitude_reduces():
    # general-orbit Hhat_22 leading part G m/r + r^2 phidot^2 + 2 i r rdot phidot - rdot^2
    # reduces to 2 x c^2 on a circular orbit (shared/conventions.md)
    hhat = G * m / r + r**2 * phidot**2 + 2 * sp.I * r * rdot * phidot - rdot**2
    mapped = to_circular_orbit(PNSeries({0: hhat}, half), 0)
    assert mapped.coefficient(1) == 2 * c**2
    assert mapped.known_through == sp.Rational(3, 2)


def test_reduction_agrees_with_direct_substitution():
    # a second route: substitute r = G m/(c^2 gamma(x)), phidot = c^3 x^(3/2)/(G m), rdot = 0
    # into the 1PN energy with sympy and expand in x; the engine's reduction must agree
    from stfalgebra.binary.dynamics import conserved_energy

    eps = sp.Symbol("e", positive=True)     # sqrt(x)
    gamma = circular_gamma(1).to_expression(eps)
    energy = conserved_energy(1).to_expression(eps).subs(eps, 1 / c)
    direct = energy.subs({rdot: 0, phidot: c**3 * eps**3 / (G * m), r: G * m / (c**2 * gamma)})
    direct = sp.series(sp.simplify(direct), eps, 0, 5).removeO()
    reduced = to_circular_orbit(conserved_energy(1), 1).to_expression(eps)
    assert sp.expand(direct - reduced) == 0


def test_to_circular_refuses_bad_series():
    with pytest.raises(ValueError, match="homogeneous"):
        to_circular_orbit(PNSeries({0: r + G * m / r}, 1), 0)
    with pytest.raises(ValueError, match="contains c"):
        to_circular_orbit(PNSeries({0: c * r}, 1), 0)
    with pytest.raises(ValueError, match="no known term"):
        to_circular_orbit(PNSeries({}, 1), 0)
    with pytest.raises(TypeError):
        to_circular_orbit(r, 0)


def test_to_circular_known_through_from_input():
    # v^2 known through 1/2 in 1/c: s = 1, so known through 3/2 in x
    mapped = to_circular_orbit(PNSeries({0: r**2 * phidot**2}, half), 1)
    assert mapped.known_through == sp.Rational(3, 2)


@pytest.mark.parametrize("func", [circular_gamma, circular_radius, circular_energy,
                                  circular_frequency_squared])
def test_beyond_order_refused(func):
    with pytest.raises(OrderBeyondInputsError):
        func(3)


# ----------------------------------------------------------------------------- 2PN
def test_frequency_squared_2pn():
    # omega^2 = (G m/r^3)[1 + (-3 + nu) gamma + (6 + 41 nu/4 + nu^2) gamma^2] (Blanchet, Living
    # Rev. Relativ. 17, 2 (2014), Sec. 7.4, harmonic coordinates; from memory)
    w2 = circular_frequency_squared(2)
    gamma_r = G * m / r
    expected = G * m / r**3 * (6 + sp.Rational(41, 4) * nu + nu**2) * gamma_r**2
    assert sp.expand(w2.coefficient(2) - expected) == 0
    assert w2.known_through == 2   # the 2.5PN radiation reaction is the next term


def test_gamma_2pn():
    # gamma = x [1 + (1 - nu/3) x + (1 - 65 nu/12) x^2] (Blanchet, Living Rev. Relativ. 17, 2
    # (2014), Sec. 7.4; from memory)
    g = circular_gamma(2)
    assert g.truncate(sp.Rational(5, 2)) == circular_gamma(1)
    assert sp.expand(g.coefficient(3) - (1 - sp.Rational(65, 12) * nu)) == 0
    assert g.coefficient(sp.Rational(5, 2)) == 0
    assert g.known_through == 3       # relative order 2: the 2.5PN radiation reaction is not entered


def test_energy_2pn_published():
    # E = -(mu c^2 x/2)[1 + (-3/4 - nu/12) x + (-27/8 + 19 nu/8 - nu^2/24) x^2] (Blanchet, Living
    # Rev. Relativ. 17, 2 (2014), Sec. 7.4, the circular-orbit energy; from memory)
    e = circular_energy(2)
    mu = m * nu
    lead = -mu * c**2 / 2
    assert sp.expand(e.coefficient(2) - lead * (-sp.Rational(3, 4) - nu / 12)) == 0
    assert sp.expand(e.coefficient(3) - lead * (-sp.Rational(27, 8) + sp.Rational(19, 8) * nu
                                                - nu**2 / 24)) == 0
    assert e.known_through == 3
    with pytest.raises(OrderBeyondInputsError):
        e.coefficient(4)


def test_angular_momentum_2pn_published():
    # J = (G m^2 nu/(c x^(1/2)))[1 + (3/2 + nu/6) x + (27/8 - 19 nu/8 + nu^2/24) x^2] (Blanchet,
    # Living Rev. Relativ. 17, 2 (2014), Sec. 7.4; from memory; also follows from E(x) by the
    # first law, tested above)
    j = circular_angular_momentum(2)
    lead = G * m**2 * nu / c
    assert sp.expand(j.coefficient(sp.Rational(3, 2))
                     - lead * (sp.Rational(27, 8) - sp.Rational(19, 8) * nu + nu**2 / 24)) == 0


def _exact_schwarzschild(expression: sp.Expr, through: int) -> dict[sp.Rational, sp.Expr]:
    """Coefficients of x^k (k half-integer allowed) of a closed form, through x^through."""
    xs = sp.Symbol("xs", positive=True)
    expansion = sp.expand(sp.series(expression.subs(x, xs**2), xs, 0, 2 * through + 1).removeO())
    return {sp.Rational(k, 2): expansion.coeff(xs, k) for k in range(-1, 2 * through + 1)}


def test_energy_test_mass_limit_is_exact_schwarzschild():
    # test mass on a circular geodesic: E/mu = c^2 [(1 - 2x)/sqrt(1 - 3x) - 1] (common
    # practice; x = (G m omega/c^3)^(2/3) is gauge invariant)
    exact = _exact_schwarzschild(c**2 * ((1 - 2 * x) / sp.sqrt(1 - 3 * x) - 1), 3)
    e = circular_energy(2)
    for order in (1, 2, 3):
        ours = sp.expand(e.coefficient(order) / (m * nu)).subs(nu, 0)
        assert sp.expand(ours - exact[order]) == 0
    assert exact[3] != 0


def test_angular_momentum_test_mass_limit_is_exact_schwarzschild():
    # J/mu = G m/(c sqrt(x (1 - 3x))) on a circular geodesic (common practice; G = c = 1 form
    # J/(mu m) = 1/sqrt(x (1 - 3x)))
    exact = _exact_schwarzschild(G * m / (c * sp.sqrt(x * (1 - 3 * x))), 2)
    j = circular_angular_momentum(2)
    for order in (sp.Rational(-1, 2), sp.Rational(1, 2), sp.Rational(3, 2)):
        ours = sp.expand(j.coefficient(order) / (m * nu)).subs(nu, 0)
        assert sp.expand(ours - exact[order]) == 0
