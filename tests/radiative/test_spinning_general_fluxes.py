"""Tests of stfalgebra.radiative.spinning_general_fluxes: the instantaneous fluxes of a general planar
orbit with aligned spins, against the non-spinning general-orbit fluxes (chi -> 0) and, on the
circular orbit of binary/spin_circular.py, against the circular aligned-spin flux of the project
(radiative/spinning_fluxes.py, the modes of the circular pipeline)."""

from __future__ import annotations

import pytest
import sympy as sp

from stfalgebra.binary.spin_circular import spinning_gamma_over_x
from stfalgebra.errors import OrderBeyondInputsError
from stfalgebra.exact import ExactPolynomial
from stfalgebra.pnseries import PNSeries
from stfalgebra.radiative.general_fluxes import general_orbit_angular_momentum_flux, general_orbit_energy_flux
from stfalgebra.radiative.spinning_fluxes import spinning_energy_flux_from_modes
from stfalgebra.radiative.spinning_general_fluxes import (
    spinning_general_angular_momentum_flux, spinning_general_energy_flux,
)
from stfalgebra.symbols import G, eps, m, nu, phidot, r, rdot

CHI1, CHI2 = ExactPolynomial("chi1").to_sympy(), ExactPolynomial("chi2").to_sympy()
SO = sp.Rational(3, 2)


@pytest.mark.parametrize("spinning, plain", [
    (spinning_general_energy_flux, general_orbit_energy_flux),
    (spinning_general_angular_momentum_flux, general_orbit_angular_momentum_flux),
])
def test_without_spins_it_is_the_instantaneous_non_spinning_flux(spinning, plain):
    ours, theirs = spinning(SO), plain(SO, instantaneous_only=True)
    for order in (0, sp.Rational(1, 2), 1, SO):
        assert sp.expand(ours.coefficient(order).subs({CHI1: 0, CHI2: 0}) - theirs.coefficient(order)) == 0
    assert ours.coefficient(SO).has(CHI1, CHI2)


@pytest.mark.parametrize("flux", [spinning_general_energy_flux, spinning_general_angular_momentum_flux])
def test_on_the_circular_orbit_it_is_the_circular_flux_without_its_tail(flux):
    # G = m = c = 1: r = 1/(x g(x)), rdot = 0, phidot = omega = x^(3/2); F = omega dJ/dt there, and
    # both are normalised to (32/5) nu^2 x^5 by F = (G/c^5) S; the circular flux has 4 pi at x^(3/2)
    radius = spinning_gamma_over_x().inverse().map_coefficients(lambda v: v.to_sympy())
    unit = flux(SO).map_coefficients(lambda v: sp.expand(v.subs({G: 1, m: 1, rdot: 0, phidot: 1})))
    on_circle = unit.substitute(r, radius, eps).truncate(SO)
    circular = spinning_energy_flux_from_modes(SO)
    for order in (0, 1, SO):
        expected = circular.coefficient(order).to_sympy() - (4 * sp.pi if order == SO else 0)
        assert sp.expand(on_circle.coefficient(order) / (sp.Rational(32, 5) * nu**2) - expected) == 0


def test_orders_beyond_the_spin_orbit_terms_are_refused():
    with pytest.raises(OrderBeyondInputsError):
        spinning_general_energy_flux(2)
