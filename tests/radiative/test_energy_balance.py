"""Tests of stfalgebra/radiative/energy_balance.py: the circular inspiral from the energy balance.

Checked against: the published circular E(x), J(x), F(x), dx/dt and phasing coefficients
(Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 7.4 and 9.3; from memory, equation numbers
not checked); the test-mass limit (exact Schwarzschild energy and angular momentum of circular
geodesics, common practice, with the test-mass flux of Poisson, Phys. Rev. D 47, 1497 (1993),
from memory); and a second route written with sympy (the sympy reduction of
:mod:`stfalgebra.binary.circular`, the STF-formula flux and sympy's own series and integrals).
"""

from __future__ import annotations

from fractions import Fraction

import pytest
import sympy as sp
from hypothesis import given, settings
from hypothesis import strategies as st

from stfalgebra import symbols as S
from stfalgebra.errors import OrderBeyondInputsError
from stfalgebra.exact import ExactPolynomial
from stfalgebra.orders import PNOrder
from stfalgebra.pnseries import PNSeries
from stfalgebra.radiative.energy_balance import (
    QUANTITIES, circular_quantity, integrate_in_x, maximum_quantity_order, relative_series,
)

x, nu, pi = S.x, S.nu, sp.pi
R = sp.Rational


def value(name: str, pn) -> sp.Expr:
    """The quantity as a sympy expression, its dimensional factors set to 1 except nu."""
    quantity = circular_quantity(name, pn)
    total = sp.Add(*[coeff.to_sympy() * x ** sp.Rational(order.numerator, order.denominator)
                     for order, coeff in quantity.series.terms.items()])
    return total * nu ** quantity.factors.get("nu", 0)


def same(a, b) -> bool:
    return sp.expand(a - b) == 0


PHASING_ORDER = maximum_quantity_order("phase")


# ----------------------------------------------------------------------------- published values
def test_energy_and_angular_momentum_through_2pn():
    # Blanchet 2014, sec. 7.4 (from memory): E = -(mu c^2 x/2)[1 + (-3/4 - nu/12) x
    # + (-27/8 + 19/8 nu - nu^2/24) x^2], J = (G m^2 nu/(c x^(1/2)))[1 + (3/2 + nu/6) x
    # + (27/8 - 19/8 nu + nu^2/24) x^2]
    assert same(value("energy", 2), -nu * x / 2 * (1 + (-R(3, 4) - nu / 12) * x
                                                    + (-R(27, 8) + R(19, 8) * nu - nu**2 / 24) * x**2))
    assert same(value("angular_momentum", 2), nu / sp.sqrt(x) * (1 + (R(3, 2) + nu / 6) * x
                                                                  + (R(27, 8) - R(19, 8) * nu + nu**2 / 24) * x**2))
    assert circular_quantity("energy", 2).factors == {"m": 1, "c": 2}
    assert circular_quantity("angular_momentum", 2).factors == {"G": 1, "m": 2, "c": -1}


def test_flux_rate_phase_and_time_through_one_and_a_half_pn():
    # Blanchet 2014, sec. 9.3 (from memory): F = (32/5)(c^5/G) nu^2 x^5 [1 + (-1247/336 - 35 nu/12) x
    # + 4 pi x^(3/2)]; dx/dt = (64/5)(c^3 nu/(G m)) x^5 [1 + (-743/336 - 11 nu/4) x + 4 pi x^(3/2)];
    # phi = -(x^(-5/2)/(32 nu))[1 + (3715/1008 + 55 nu/12) x - 10 pi x^(3/2)];
    # t = -(5 G m/(256 nu c^3)) x^(-4) [1 + (743/252 + 11 nu/3) x - (32/5) pi x^(3/2)]
    order = R(3, 2)
    assert same(value("energy_flux", order), R(32, 5) * nu**2 * x**5 * (1 + (-R(1247, 336) - R(35, 12) * nu) * x
                                                                        + 4 * pi * x**R(3, 2)))
    assert same(value("x_rate", order), R(64, 5) * nu * x**5 * (1 + (-R(743, 336) - R(11, 4) * nu) * x
                                                                 + 4 * pi * x**R(3, 2)))
    assert same(value("phase", order), -x**R(-5, 2) / (32 * nu) * (1 + (R(3715, 1008) + R(55, 12) * nu) * x
                                                                    - 10 * pi * x**R(3, 2)))
    assert same(value("time", order), -R(5, 256) * x**-4 / nu * (1 + (R(743, 252) + R(11, 3) * nu) * x
                                                                  - R(32, 5) * pi * x**R(3, 2)))
    assert circular_quantity("time", order).factors == {"G": 1, "m": 1, "c": -3, "nu": -1}


def test_printed_forms():
    assert str(circular_quantity("phase", 1).presentation()) == "-1/(32*nu*x**(5/2))*(1 + x*(3715/1008 + 55/12*nu))"
    assert circular_quantity("energy", 0)._repr_latex_() == r"$E = -\frac{1}{2} m \nu c^{2} x$"
    assert circular_quantity("x_rate", 0).presentation().to_latex() == r"\frac{64 \nu c^{3} x^{5}}{5 G m}"


# ----------------------------------------------------------------------------- test-mass limit
def test_test_mass_limit_against_schwarzschild_geodesics():
    # circular geodesics (common practice): E/(mu c^2) = (1 - 2x)/sqrt(1 - 3x) - 1,
    # J c/(G m mu) = 1/sqrt(x (1 - 3x)); at nu -> 0 the series divided by nu must expand them
    exact_energy = sp.series((1 - 2 * x) / sp.sqrt(1 - 3 * x) - 1, x, 0, 4).removeO()
    exact_momentum = sp.expand(sp.series(1 / sp.sqrt(1 - 3 * x), x, 0, 3).removeO() / sp.sqrt(x))
    assert same(sp.expand(value("energy", 2) / nu).subs(nu, 0), exact_energy)
    assert same(sp.expand(value("angular_momentum", 2) / nu).subs(nu, 0), exact_momentum)


def test_test_mass_phase_from_the_exact_energy_and_the_test_mass_flux():
    # nu (phi - phi_0) at nu -> 0 from the exact geodesic energy and the test-mass flux
    # F/((32/5) nu^2 x^5) = 1 - (1247/336) x + 4 pi x^(3/2) - (44711/9072) x^2 - (8191/672) pi x^(5/2) (Poisson 1993;
    # Tagoshi & Sasaki 1994; from memory), integrated by sympy through the phasing order
    energy = (1 - 2 * x) / sp.sqrt(1 - 3 * x) - 1            # E/(mu c^2)
    flux = 1 - R(1247, 336) * x + 4 * pi * x**R(3, 2) - R(44711, 9072) * x**2 - R(8191, 672) * pi * x**R(5, 2)
    # dphi/dx = x^(3/2)/(dx/dt) with dx/dt = F/(-dE/dx) in units G m = c = 1, mu = nu m
    integrand = x**R(3, 2) * (-sp.diff(energy, x)) / (R(32, 5) * x**5 * flux)
    expansion = _through(sp.series(integrand * x**R(7, 2), x, 0, 3).removeO(), PHASING_ORDER)
    phase = sp.integrate(sp.expand(expansion * x**R(-7, 2)), x)
    assert same(sp.expand(value("phase", PHASING_ORDER) * nu).subs(nu, 0), sp.expand(phase))


def _through(expr, top):
    """The terms of a sum of powers of x with exponent <= top."""
    y = sp.Symbol("y", positive=True)
    poly = sp.expand(sp.expand(expr).subs(x, y**2))
    kept = sum(term for term in sp.Add.make_args(poly) if sp.degree(term, y) <= 2 * top)
    return sp.expand(kept.subs(y, sp.sqrt(x)))


# ----------------------------------------------------------------------------- second route
def test_second_route_with_sympy_series_the_sympy_reduction_and_the_stf_flux():
    from stfalgebra.binary.circular import circular_energy
    from stfalgebra.radiative.fluxes import circular_energy_flux_from_moments

    order = PHASING_ORDER
    energy_series = circular_energy(2 if order >= 2 else 1)  # sympy route, E in m, nu, c, eps = sqrt(x)
    energy = sp.expand((energy_series.to_expression(S.eps)).subs(S.eps, sp.sqrt(x)) / (S.m * S.c**2))
    assert same(energy, value("energy", order))
    flux = (circular_energy_flux_from_moments(order).to_expression(S.eps)).subs(S.eps, sp.sqrt(x))
    rate = _through(sp.series(R(32, 5) * nu**2 * x**5 * flux / (-sp.diff(energy, x)), x, 0, 8).removeO(), 5 + order)
    assert same(rate, value("x_rate", order))
    # nu (phi - phi_0) and nu (t - t_0): the 1/nu of the integrands leaves with the factor nu
    for name, integrand, power in (("phase", x**R(3, 2) / rate, R(7, 2)), ("time", 1 / rate, 5)):
        regular = _through(sp.series(sp.expand(nu * integrand * x**power), x, 0, 3).removeO(), order)
        primitive = sp.integrate(sp.expand(regular * x**-power), x)
        assert same(primitive, sp.expand(value(name, order) * nu)), name


# ----------------------------------------------------------------------------- integration
_POWERS = st.sampled_from([Fraction(k, 2) for k in range(-10, 7)])


@settings(max_examples=25, deadline=None)
@given(st.dictionaries(_POWERS, st.tuples(st.fractions(-9, 9, max_denominator=5), st.integers(0, 2)),
                       min_size=1, max_size=4))
def test_antiderivative_differentiates_back_to_the_integrand(terms):
    log_x = ExactPolynomial("log_x")
    series = PNSeries({order: ExactPolynomial(c) * log_x**j for order, (c, j) in terms.items() if c},
                      known_through=4)
    primitive = integrate_in_x(series)
    as_expression = (lambda s: sp.Add(*[v.to_sympy() * x ** sp.Rational(o.numerator, o.denominator)
                                        for o, v in s.terms.items()]))
    assert sp.expand(sp.diff(as_expression(primitive), x) - as_expression(series)) == 0
    assert primitive.known_through == series.known_through + 1


def test_a_term_in_one_over_x_integrates_to_a_logarithm():
    series = PNSeries({-1: ExactPolynomial(3), Fraction(-7, 2): ExactPolynomial(1)}, known_through=0)
    primitive = integrate_in_x(series)
    assert primitive.terms[0] == 3 * ExactPolynomial("log_x")


# ----------------------------------------------------------------------------- orders
def test_orders_are_read_from_the_inputs_and_refusals_name_them():
    from stfalgebra.binary.cited_inputs import INPUT_ORDERS, known_through
    from stfalgebra.radiative.contributions import maximum_flux_order

    from stfalgebra.binary.cited_inputs import REACTION_KNOWN_THROUGH, REACTION_ORDER

    # the 2PN conserved quantities with their 2.5PN terms (zero on the circle): through 5/2
    conserved = max(max(known_through(k) for k in INPUT_ORDERS["conserved quantities"]),
                    REACTION_KNOWN_THROUGH[REACTION_ORDER])
    assert maximum_quantity_order("energy") == conserved
    assert maximum_quantity_order("energy_flux") == maximum_flux_order("circular")
    assert maximum_quantity_order("phase") == min(conserved, maximum_flux_order("circular"))
    with pytest.raises(OrderBeyondInputsError, match="energy flux is derived through"):
        circular_quantity("time", maximum_quantity_order("time") + R(1, 2))
    with pytest.raises(ValueError, match="quantity must be one of"):
        maximum_quantity_order("luminosity")
    for name in QUANTITIES:
        quantity = circular_quantity(name, 0)
        assert quantity.presentation().terms[0].text == "1" and quantity.provenance


# ----------------------------------------------------------------------------- through 2PN
# Blanchet, Living Rev. Relativ. 17, 2 (2014), from memory (equation numbers not checked: the
# search tool's excerpts of the review did not reach them): the circular E(x) of eq. (233), the
# flux of eq. (314) and the rate of x of sec. 9.3, each divided by its leading term.
PUBLISHED_ENERGY = 1 + (-R(3, 4) - nu / 12) * x + (-R(27, 8) + R(19, 8) * nu - nu**2 / 24) * x**2
PUBLISHED_FLUX = (1 + (-R(1247, 336) - R(35, 12) * nu) * x + 4 * pi * x**R(3, 2)
                  + (-R(44711, 9072) + R(9271, 504) * nu + R(65, 18) * nu**2) * x**2
                  - (R(8191, 672) + R(583, 24) * nu) * pi * x**R(5, 2))     # Blanchet 2014 (from memory)
PUBLISHED_X_RATE = (1 + (-R(743, 336) - R(11, 4) * nu) * x + 4 * pi * x**R(3, 2)
                    + (R(34103, 18144) + R(13661, 2016) * nu + R(59, 18) * nu**2) * x**2
                    # Blanchet, Living Rev. Relativ. 17, 2 (2014), dx/dt of the circular inspiral, the
                    # 2.5PN term (from memory)
                    - (R(4159, 672) + R(189, 8) * nu) * pi * x**R(5, 2))


def _through(expression, order):
    """The terms of a sum in powers of x up to x^order."""
    return sp.Add(*[term for term in sp.Add.make_args(sp.expand(expression))
                    if sp.degree(term.subs(x, x**2), x) <= 2 * order])


def _as_expression(series) -> sp.Expr:
    return sp.Add(*[value.to_sympy() * x ** sp.Rational(order.numerator, order.denominator)
                    for order, value in series.terms.items()])


def test_the_three_recalled_series_are_consistent():
    # dx/dt = -F/(dE/dx): the recalled rate follows from the recalled energy and flux
    rate = sp.series(PUBLISHED_FLUX / sp.diff(x * PUBLISHED_ENERGY, x), x, 0, 3).removeO()
    assert same(_through(rate, R(5, 2)), PUBLISHED_X_RATE)


def test_binding_energy_through_2pn_is_the_published_one():
    # derived from the cited 2PN conserved energy, gamma(x) from the cited omega(r)
    assert same(_as_expression(relative_series("energy", 2)), PUBLISHED_ENERGY)


def test_x_rate_through_every_order_the_table_serves():
    # extends by itself: when the table of contributions serves the 2PN flux, this checks 2PN
    top = maximum_quantity_order("x_rate")
    for order in sorted({R(0), R(1), R(top.numerator, top.denominator)}):
        got = relative_series("x_rate", order)
        assert got.known_through >= order
        assert same(_as_expression(got), _through(PUBLISHED_X_RATE, order)), order


@pytest.fixture
def published_2pn_flux(monkeypatch):
    """The energy balance with the published 2PN flux in place of the served one (an input,
    so that the balance itself is checked through 2PN before the 2PN flux is derived)."""
    import stfalgebra.radiative.energy_balance as balance
    from stfalgebra.exact import ExactPolynomial as E

    pi_ = E("pi")
    terms = {0: E(1), 1: E(-R(1247, 336)) - E(R(35, 12)) * E("nu"), R(3, 2): 4 * pi_,
             2: E(-R(44711, 9072)) + E(R(9271, 504)) * E("nu") + E(R(65, 18)) * E("nu") ** 2}

    def flux(pn):
        return PNSeries({k: v for k, v in terms.items() if k <= pn}, known_through=pn + R(1, 2))

    cached = (balance._rate_relative, balance._balance_ratio, balance.circular_quantity)
    for function in cached:
        function.cache_clear()
    monkeypatch.setattr(balance, "_flux_relative", flux)
    monkeypatch.setattr(balance, "maximum_flux_order", lambda orbit: PNOrder(2))
    yield
    for function in cached:
        function.cache_clear()


def test_x_rate_through_2pn_from_the_published_flux(published_2pn_flux):
    assert same(_as_expression(relative_series("x_rate", 2)), _through(PUBLISHED_X_RATE, 2))
    assert same(value("x_rate", 2), R(64, 5) * nu * x**5 * _through(PUBLISHED_X_RATE, 2))
    # the phase at 2PN (Blanchet 2014, sec. 9.3, from memory): the x^2 coefficient of
    # -x^(-5/2)/(32 nu) [...] is 15293365/1016064 + 27145/1008 nu + 3085/144 nu^2
    phase = sp.expand(value("phase", 2) * (-32 * nu) * x**R(5, 2))
    assert same(phase.coeff(x, 2), R(15293365, 1016064) + R(27145, 1008) * nu + R(3085, 144) * nu**2)
    # second route: sympy integrates dphi/dx = x^(3/2)/(dx/dt) of the published rate
    integrand = sp.series(x**R(3, 2) * x**R(7, 2) / (R(64, 5) * x**5 * PUBLISHED_X_RATE), x, 0, 3).removeO()
    by_sympy = sp.integrate(sp.expand(_through(integrand, 2) * x**R(-7, 2)), x)
    assert same(by_sympy, sp.expand(value("phase", 2) * nu))


def test_relative_series_refuses_other_names_and_orders():
    with pytest.raises(ValueError, match="relative series exist for"):
        relative_series("phase", 0)
    with pytest.raises(OrderBeyondInputsError, match="x_rate at relative order"):
        relative_series("x_rate", maximum_quantity_order("x_rate") + R(1, 2))


def test_binding_energy_and_angular_momentum_have_no_two_and_a_half_pn_term():
    # the 2.5PN terms of the harmonic E and J are proportional to rdot (cited inputs): on the
    # inspiralling circular orbit rdot = O(c^-5), so they are O(c^-10); E(x), J(x) through 5/2
    # are the 2PN ones (Blanchet 2014, sec. 7.4: no 2.5PN term in the circular E(x), from memory)
    energy = relative_series("energy", R(5, 2))
    assert energy.known_through == R(5, 2)
    assert R(5, 2) not in energy.terms and R(1, 2) not in energy.terms and R(3, 2) not in energy.terms
    assert same(value("energy", R(5, 2)), value("energy", 2))
    assert same(value("angular_momentum", R(5, 2)), value("angular_momentum", 2))


def test_phase_and_time_at_two_and_a_half_pn():
    # Blanchet, Living Rev. Relativ. 17, 2 (2014), the circular phase and time (from memory): the
    # x^(5/2) terms (38645/1344 - 65 nu/16) pi ln x (the constant absorbed in phi_0) and
    # (-7729/252 + 13 nu/3) pi
    phase = sp.expand(value("phase", R(5, 2)) * (-32 * nu) * x**R(5, 2))
    assert same(phase.coeff(x**R(5, 2)), (R(38645, 1344) - R(65, 16) * nu) * pi * sp.log(x))
    time = sp.expand(value("time", R(5, 2)) * (-R(256, 5)) * nu * x**4)
    assert same(time.coeff(x**R(5, 2)), (-R(7729, 252) + R(13, 3) * nu) * pi)
