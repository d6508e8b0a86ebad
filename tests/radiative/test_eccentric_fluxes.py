"""Tests of stfalgebra.radiative.eccentric_fluxes: orbit-averaged energy and angular-momentum
fluxes of eccentric binaries through 2PN."""

from __future__ import annotations

from fractions import Fraction

import pytest
import sympy as sp

from stfalgebra.errors import OrderBeyondInputsError
from stfalgebra.radiative.eccentric_fluxes import (
    ECCENTRIC_MAX_PN,
    averaged_angular_momentum_flux,
    averaged_energy_flux,
    check_eccentric_order,
)
from stfalgebra.radiative.fluxes import (
    circular_angular_momentum_flux_from_modes,
    circular_energy_flux_from_modes,
)
from stfalgebra.radiative.tail_enhancement import (
    AngularMomentumTailEnhancement,
    EnergyTailEnhancement,
)
from stfalgebra.symbols import et, nu

THREE_HALVES = sp.Rational(3, 2)


def test_newtonian_energy_flux_is_peters_mathews():
    # Peters & Mathews, Phys. Rev. 131, 435 (1963): f(e) = (1 + 73/24 e^2 + 37/96 e^4)/(1 - e^2)^(7/2)
    flux = averaged_energy_flux(0)
    expected = (1 + sp.Rational(73, 24) * et**2 + sp.Rational(37, 96) * et**4) / (1 - et**2) ** sp.Rational(7, 2)
    assert flux.known_through == 0
    assert sp.simplify(flux.coefficient(0) - expected) == 0


def test_newtonian_angular_momentum_flux_is_peters():
    # Peters, Phys. Rev. 136, B1224 (1964): (1 + 7/8 e^2)/(1 - e^2)^2
    flux = averaged_angular_momentum_flux(0)
    assert sp.simplify(flux.coefficient(0) - (1 + sp.Rational(7, 8) * et**2) / (1 - et**2) ** 2) == 0


def test_1pn_energy_flux_against_published_enhancement():
    # from memory: Blanchet & Schafer, MNRAS 239, 845 (1989), as restated in x and e_t
    # (harmonic coordinates) by Arun, Blanchet, Iyer & Qusailah, Phys. Rev. D 77, 064035 (2008)
    expected = (sp.Rational(-1247, 336) - sp.Rational(35, 12) * nu
                + et**2 * (sp.Rational(10475, 672) - sp.Rational(1081, 36) * nu)
                + et**4 * (sp.Rational(10043, 384) - sp.Rational(311, 12) * nu)
                + et**6 * (sp.Rational(2179, 1792) - sp.Rational(851, 576) * nu)) / (1 - et**2) ** sp.Rational(9, 2)
    flux = averaged_energy_flux(1)
    assert flux.known_through == 1
    assert flux.coefficient(sp.Rational(1, 2)) == 0
    assert sp.simplify(flux.coefficient(1) - expected) == 0


def test_1pn_angular_momentum_flux_against_published_enhancement():
    # from memory: Junker & Schafer, MNRAS 254, 146 (1992), in x and e_t (harmonic coordinates)
    # as restated by Arun, Blanchet, Iyer & Sinha, Phys. Rev. D 80, 124018 (2009)
    expected = (sp.Rational(-1247, 336) - sp.Rational(35, 12) * nu
                + et**2 * (sp.Rational(3019, 336) - sp.Rational(335, 24) * nu)
                + et**4 * (sp.Rational(8399, 2688) - sp.Rational(275, 96) * nu)) / (1 - et**2) ** 3
    assert sp.simplify(averaged_angular_momentum_flux(1).coefficient(1) - expected) == 0


def test_tail_terms_at_one_and_a_half_pn():
    energy = averaged_energy_flux(THREE_HALVES)
    momentum = averaged_angular_momentum_flux("3/2")
    assert energy.known_through == THREE_HALVES and momentum.known_through == THREE_HALVES
    assert energy.coefficient(THREE_HALVES) == 4 * sp.pi * EnergyTailEnhancement(et)
    assert momentum.coefficient(THREE_HALVES) == 4 * sp.pi * AngularMomentumTailEnhancement(et)
    # the lower orders are those of the 1PN result
    for order in (0, sp.Rational(1, 2), 1):
        assert energy.coefficient(order) == averaged_energy_flux(1).coefficient(order)
        assert momentum.coefficient(order) == averaged_angular_momentum_flux(1).coefficient(order)


def test_circular_limits_match_the_circular_fluxes():
    # circular results from the modes; published: 1 + (-1247/336 - 35 nu/12) x + 4 pi x^(3/2)
    # (Blanchet, Living Rev. Relativ. 17, 2 (2014), from memory), and F = omega dJ/dt
    circular = circular_energy_flux_from_modes(THREE_HALVES)
    assert sp.expand(circular.coefficient(1) - (sp.Rational(-1247, 336) - sp.Rational(35, 12) * nu)) == 0
    circular_j = circular_angular_momentum_flux_from_modes(THREE_HALVES)
    energy, momentum = averaged_energy_flux(THREE_HALVES), averaged_angular_momentum_flux(THREE_HALVES)
    for order in (0, sp.Rational(1, 2), 1, THREE_HALVES):
        assert sp.expand(energy.coefficient(order).subs(et, 0) - circular.coefficient(order)) == 0
        assert sp.expand(momentum.coefficient(order).subs(et, 0) - circular_j.coefficient(order)) == 0


def test_order_parsing_and_refusals():
    assert ECCENTRIC_MAX_PN == 2
    assert check_eccentric_order("1.5") == THREE_HALVES
    assert check_eccentric_order(Fraction(1, 2)) == sp.Rational(1, 2)
    assert check_eccentric_order(sp.Integer(1)) == 1
    assert check_eccentric_order("2") == 2
    with pytest.raises(OrderBeyondInputsError, match="through 2PN"):
        averaged_energy_flux("5/2")
    with pytest.raises(OrderBeyondInputsError):
        averaged_angular_momentum_flux(3)
    with pytest.raises(ValueError, match="pn"):
        averaged_energy_flux(-1)
    with pytest.raises(ValueError, match="pn"):
        check_eccentric_order("1e100000000")
    with pytest.raises(TypeError):
        averaged_energy_flux(1.0)
    with pytest.raises(TypeError):
        averaged_energy_flux(True)



@pytest.mark.parametrize("function", [averaged_energy_flux, averaged_angular_momentum_flux,
                                      circular_energy_flux_from_modes])
def test_a_cached_exact_order_does_not_let_a_bool_or_float_through(function):
    # the caches once keyed False like a cached sympy Integer(0) or Fraction(0) (equal and of
    # equal hash), so that the refusal of a bool depended on what an earlier test had asked for
    for exact in (sp.Integer(0), Fraction(0), 0):
        function(exact)
    refused = 0
    for other in (False, 0.0):
        try:
            expected = function.__wrapped__(other)
        except (TypeError, ValueError) as exc:
            refused += 1
            with pytest.raises(type(exc)):
                function(other)
        else:      # a float that is an exact multiple of 1/2 may be accepted, with the same result
            assert function(other) == expected
    assert refused >= 1          # a bool is refused by every one of them


def test_two_pn_energy_flux_against_published_average():
    """The 2PN coefficient of the averaged energy flux in x and e_t, harmonic coordinates (the
    modified harmonic coordinates coincide with them through 2PN): Arun, Blanchet, Iyer &
    Qusailah, Phys. Rev. D 77, 064035 (2008), the 2PN instantaneous term of the averaged flux
    (from memory: the paper's equations could not be read through the search tool; the same
    coefficient in ADM coordinates differs, e_t being gauge dependent at 2PN)."""
    q = sp.Rational
    rational_part = (q(-203471, 9072) - q(3807197, 18144) * et**2 - q(268447, 24192) * et**4
                     + q(1307105, 16128) * et**6 + q(86567, 64512) * et**8
                     + nu * (q(12799, 504) + q(116789, 2016) * et**2 - q(2465027, 8064) * et**4
                             - q(416945, 2688) * et**6 - q(9769, 4608) * et**8)
                     + nu**2 * (q(65, 18) + q(5935, 54) * et**2 + q(247805, 864) * et**4
                                + q(185305, 1728) * et**6 + q(21275, 6912) * et**8))
    root_part = (5 - 2 * nu) * (q(7, 2) + q(1285, 48) * et**2 + q(1013, 64) * et**4 + q(37, 96) * et**6)
    expected = rational_part / (1 - et**2) ** q(11, 2) + root_part / (1 - et**2) ** 5
    flux = averaged_energy_flux(2)
    assert flux.known_through == 2
    assert sp.simplify(flux.coefficient(2) - expected) == 0
    # the circular 2PN flux, -44711/9072 + 9271/504 nu + 65/18 nu^2 (Blanchet, Living Rev.
    # Relativ. 17, 2 (2014), from memory)
    circular = q(-44711, 9072) + q(9271, 504) * nu + q(65, 18) * nu**2
    assert sp.expand(flux.coefficient(2).subs(et, 0) - circular) == 0
    # with the tail at 1.5PN as before, and the lower orders those of the 1.5PN average
    lower = averaged_energy_flux(THREE_HALVES)
    assert flux.coefficient(THREE_HALVES) == 4 * sp.pi * EnergyTailEnhancement(et)
    for order in lower.orders:
        assert sp.simplify(lower.coefficient(order) - flux.coefficient(order)) == 0


def test_two_pn_angular_momentum_flux_circular_limit_and_structure():
    """At e_t = 0 the averaged dJ/dt equals F/omega (circular 2PN coefficient); its sqrt(1 - e_t^2)
    part carries the factor 5 - 2 nu of the 2PN elements, as the energy flux's does."""
    flux = averaged_angular_momentum_flux(2)
    circular = sp.Rational(-44711, 9072) + sp.Rational(9271, 504) * nu + sp.Rational(65, 18) * nu**2
    assert sp.expand(flux.coefficient(2).subs(et, 0) - circular) == 0
    assert flux.coefficient(THREE_HALVES) == 4 * sp.pi * AngularMomentumTailEnhancement(et)
    root_part = sum(term for term in sp.Add.make_args(flux.coefficient(2))
                    if any(p.is_Pow and p.base == 1 - et**2 and not p.exp.is_Integer
                           for p in sp.preorder_traversal(term)))
    assert root_part != 0 and sp.simplify(root_part.subs(nu, sp.Rational(5, 2))) == 0


def _numerical_average_gap(speed_of_light, nu_value=0.2, kind="energy"):
    """(<F> along an integrated orbit - the averaged series through 2PN, - through 1PN), both
    divided by (32/5)(c^5/G) nu^2 x^5: the instantaneous 2PN flux of general orbits evaluated along
    one radial period of the 2PN equations of motion (scipy DOP853, G = m = 1), averaged in time
    by the trapezoidal rule (spectrally accurate on a period); x from the measured azimuthal
    frequency omega = Delta phi/P, e_t from the E and J of the orbit through the 2PN
    representation (its definition of e_t)."""
    import math

    import numpy as np

    from stfalgebra.binary.dynamics import conserved_angular_momentum, conserved_energy
    from stfalgebra.binary.keplerian import E_orbit, J_orbit, quasi_keplerian_from_energy
    from stfalgebra.binary.orbit_integration import RelativeOrbitModel, cartesian_state, polar_coordinates
    from stfalgebra.radiative.general_fluxes import general_orbit_angular_momentum_flux, general_orbit_energy_flux
    from stfalgebra.symbols import G, m

    eps = 1.0 / speed_of_light
    model = RelativeOrbitModel(2, nu_value, speed_of_light)
    start = cartesian_state(0.7, 0.0, 0.0, 2.2)          # a periastron (phidot above circular)

    def periastron(_t, y):
        return y[0] * y[2] + y[1] * y[3]                   # r rdot, rising through zero at periastron
    periastron.direction = 1.0
    solution = model.integrate(start, 30.0, rtol=1e-13, atol=1e-15, events=periastron)   # P ~ 18
    period = next(t for t in solution.t_events[0] if t > 1.0)
    times = np.linspace(0.0, period, 3001)
    states = solution.sol(times)
    phases = np.unwrap(np.asarray(polar_coordinates(states)[2], dtype=float))
    omega = (phases[-1] - phases[0]) / period
    x_value = omega ** (2 / 3) * eps**2
    if kind == "energy":      # F = (G/c^5) S, normalised by (32/5)(c^5/G) nu^2 x^5
        flux = model.evaluate(general_orbit_energy_flux(2, instantaneous_only=True), states) * eps**5
        scale, series = 32 / 5 * nu_value**2 * x_value**5 / eps**5, averaged_energy_flux(2)
    else:                     # dJ/dt = (G/c^5) S_J, normalised by (32/5) m c^2 nu^2 x^(7/2)
        flux = model.evaluate(general_orbit_angular_momentum_flux(2, instantaneous_only=True), states) * eps**5
        scale, series = 32 / 5 * nu_value**2 * x_value**3.5 / eps**2, averaged_angular_momentum_flux(2)
    mean_flux = float(np.sum(flux[:-1]) / (len(times) - 1))      # trapezoid on a period
    normalised = mean_flux / scale
    energy = float(model.evaluate(conserved_energy(2), start))
    momentum = float(model.evaluate(conserved_angular_momentum(2), start))
    values = {E_orbit: sp.Float(energy, 30), J_orbit: sp.Float(momentum, 30), nu: sp.Float(nu_value, 30), G: 1, m: 1}
    ecc = float(sum(sp.N(coeff.subs(values), 30) * sp.Float(eps, 30) ** (2 * order)
                    for order, coeff in quasi_keplerian_from_energy(2).time_eccentricity.terms.items()))
    at = {et: ecc, nu: nu_value}
    through_one = sum(float(series.coefficient(k).subs(at)) * x_value**k for k in (0, 1))
    through_two = through_one + float(series.coefficient(2).subs(at)) * x_value**2
    return normalised - through_two, normalised - through_one, ecc


@pytest.mark.parametrize("kind", ["energy", "angular_momentum"])
def test_two_pn_average_matches_the_flux_averaged_along_an_integrated_orbit(kind):
    """Independent of the exact averaging: the numerical time average of the 2PN instantaneous
    flux along the integrated orbit agrees with the series through x^2 up to O(x^3) (doubling c
    divides the gap by ~64), while the series through x alone misses by O(x^2) (~16)."""
    two_slow, one_slow, ecc = _numerical_average_gap(32.0, kind=kind)        # x ~ 0.0011, e_t ~ 0.67
    two_fast, one_fast, _ = _numerical_average_gap(64.0, kind=kind)
    assert 0.5 < ecc < 0.8
    assert 13 < one_slow / one_fast < 20
    assert 50 < two_slow / two_fast < 85
    assert abs(two_fast) < 0.02 * abs(one_fast)
