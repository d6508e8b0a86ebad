"""Tests of stfalgebra/radiative/fluxes.py: circular fluxes through 1.5PN by two routes, and
the time-domain tail of the STF route."""

from __future__ import annotations

import pytest
import sympy as sp

from stfalgebra.errors import OrderBeyondInputsError
from stfalgebra.moments.current import current_moment
from stfalgebra.moments.mass import mass_moment
from stfalgebra.radiative.contributions import maximum_flux_order
from stfalgebra.radiative.fluxes import (
    _circular_tail_polynomial,
    _rotation_back,
    circular_angular_momentum_flux_from_modes,
    circular_energy_flux_from_modes,
    circular_energy_flux_from_moments,
)
from stfalgebra.radiative.tails import TailIntegral, canonical_logs
from stfalgebra.stf.cartesian import PROBE
from stfalgebra.symbols import c, m, nu, omega, r, t

THREE_HALVES = sp.Rational(3, 2)

# Poisson, Phys. Rev. D 47, 1497 (1993) (the 1.5PN tail, 4 pi); Blanchet, Living Rev. Relativ.
# 17, 2 (2014), the circular flux (1PN: Wagoner & Will 1976); from memory
FLUX = {0: sp.Integer(1), sp.Rational(1, 2): sp.Integer(0),
        1: -sp.Rational(1247, 336) - sp.Rational(35, 12) * nu, THREE_HALVES: 4 * sp.pi}


@pytest.mark.parametrize("route", [circular_energy_flux_from_modes, circular_energy_flux_from_moments])
def test_energy_flux_through_one_and_a_half_pn(route):
    flux = route(THREE_HALVES)
    assert flux.known_through == THREE_HALVES
    for order, expected in FLUX.items():
        assert sp.expand(flux.coefficient(order) - expected) == 0, order


# Blanchet, Damour, Iyer, Will & Wiseman, Phys. Rev. Lett. 74, 3515 (1995) (also Blanchet, Living
# Rev. Relativ. 17, 2 (2014), the circular flux), the 2PN coefficient, from memory; its nu -> 0
# limit -44711/9072 is the black-hole-perturbation value of Tagoshi & Sasaki, Prog. Theor. Phys.
# 92, 745 (1994) (from memory)
FLUX_TWO_PN = -sp.Rational(44711, 9072) + sp.Rational(9271, 504) * nu + sp.Rational(65, 18) * nu**2


def test_energy_flux_through_two_pn_by_both_routes():
    # the mode sum uses (2,2) through relative 2PN (the 2PN mass moments), the STF formula
    # I_ij at 2PN, I_ijk and J_ij at 1PN, I_ijkl and J_ijk Newtonian: two independent routes
    by_modes = circular_energy_flux_from_modes(2)
    by_moments = circular_energy_flux_from_moments(2)
    assert by_modes == by_moments
    assert by_modes.known_through == 2
    for order, expected in {**FLUX, 2: FLUX_TWO_PN}.items():
        assert sp.expand(by_modes.coefficient(order) - expected) == 0, order
    assert circular_angular_momentum_flux_from_modes(2) == by_modes     # F = omega dJ_z/dt


def test_routes_agree_at_every_order_and_angular_momentum_flux_matches():
    # F = omega dJ_z/dt on circular orbits (../shared/conventions.md)
    for order in (0, sp.Rational(1, 2), 1, THREE_HALVES):
        a = circular_energy_flux_from_modes(order)
        b = circular_energy_flux_from_moments(order)
        assert a == b, order
    assert circular_angular_momentum_flux_from_modes(THREE_HALVES) == circular_energy_flux_from_modes(THREE_HALVES)


def test_flux_order_limit():
    assert maximum_flux_order("circular") == sp.Rational(5, 2)
    with pytest.raises(OrderBeyondInputsError, match="5/2 at most"):
        circular_energy_flux_from_moments(3)
    with pytest.raises(ValueError, match="multiple of 1/2"):
        circular_energy_flux_from_modes("1.25")


# ----------------------------------------------------------------------------- time domain
def test_rotation_back_of_the_position():
    # x(t - tau) = cos(omega tau) x - sin(omega tau) v/omega on a circular orbit, i.e. the
    # k1-component r cos(omega tau) = (r/2)(e^{i omega tau} + e^{-i omega tau}) at phi = 0
    # (common practice)
    k1, k2, _ = PROBE
    parts = _rotation_back({(1, 0, 0): 1})
    assert set(parts) == {-1, 1}
    assert sp.expand(parts[1] - (r * k1 + sp.I * r * k2) / 2) == 0
    assert sp.expand(parts[-1] - (r * k1 - sp.I * r * k2) / 2) == 0


def _tail_by_components(kind: str, l: int) -> sp.Expr:
    """int_0^oo dtau M^(l+3)_L(t - tau)[...] at t = 0 component by component, each component a
    trigonometric function of omega t closed by TailIntegral.evaluate_harmonics (a route that
    shares only the derived kernel with the rotation used by the flux)."""
    x_vec = sp.Matrix([r * sp.cos(omega * t), r * sp.sin(omega * t), 0])
    v_vec = x_vec.diff(t)
    ell = x_vec.cross(v_vec)
    k = sp.Matrix(PROBE)
    moment = mass_moment(l, 0) if kind == "mass" else current_moment(l, 0)
    X, V, L = x_vec.dot(k), v_vec.dot(k), sp.simplify(ell.dot(k))
    poly = sp.expand(sum(s.coefficient(0) * X**a * V**b * L**cc for (a, b, cc), s in moment.terms.items()))
    total = sp.Integer(0)
    for monomial, coefficient in sp.Poly(poly, *PROBE).terms():
        # TailIntegral(l, F) integrates F^(l+2); F = d/dt of the component gives M^(l+3)
        tail = TailIntegral(l, kind, sp.diff(coefficient, t), t)
        value = tail.evaluate_harmonics().subs(t, 0) if tail != 0 else 0
        total += value * sp.Mul(*[p**e for p, e in zip(PROBE, monomial)])
    return canonical_logs(sp.expand(total))


@pytest.mark.parametrize(("kind", "l"), [("mass", 2), ("current", 2), ("mass", 3)])
def test_time_domain_tail_matches_component_by_component_evaluation(kind, l):
    derived = canonical_logs(_circular_tail_polynomial(kind, l))
    assert canonical_logs(derived - _tail_by_components(kind, l)) == 0


def test_tail_term_of_the_flux_is_four_pi():
    # F_tail/F_N = 4 pi x^(3/2): the quadrupole formula with U^(1)_ij = I^(3)_ij + tail
    # (Poisson 1993, from memory); here through the STF route at its lowest order where
    # the 1PN moments drop: coefficient of x^(3/2) only.
    flux = circular_energy_flux_from_moments(THREE_HALVES)
    assert flux.coefficient(THREE_HALVES) == 4 * sp.pi
    assert not flux.coefficient(THREE_HALVES).has(c)


def test_flux_term_provenance_names_the_tail_only_where_it_enters():
    from stfalgebra.orders import PNOrder
    from stfalgebra.radiative.fluxes import circular_flux_term_provenance

    rows = dict(circular_flux_term_provenance("3/2"))
    # every order at which the flux has a term has its provenance
    assert set(circular_energy_flux_from_modes(sp.Rational(3, 2)).terms) <= set(rows)
    # the 4 pi x^(3/2) of the flux is the tail of the modes (times their leading terms)
    assert any(name.startswith("tail") for name in rows[PNOrder(3, 2)])
    assert not any(name.startswith("tail") for order in (0, 1) for name in rows[PNOrder(order)])
    assert all(name.startswith("instantaneous") for name in rows[PNOrder(0)])


# Blanchet, Living Rev. Relativ. 17, 2 (2014), the circular energy flux, the x^(5/2) coefficient
# -(8191/672 + 583 nu/24) pi (Blanchet, Phys. Rev. D 54, 1417 (1996)); from memory (the stored
# arXiv texts hold only the papers' openings); its nu -> 0 limit -8191 pi/672 is Tagoshi & Sasaki,
# Prog. Theor. Phys. 92, 745 (1994) (from memory)
FLUX_FIVE_HALVES = -(sp.Rational(8191, 672) + sp.Rational(583, 24) * nu) * sp.pi


def test_energy_flux_through_two_and_a_half_pn_by_both_routes():
    # the mode sum takes (2,2) through relative 2.5PN (tail with the 1PN moment and the ADM mass,
    # radiation reaction, canonical moment, quadratic interactions); the STF route evaluates the
    # same contributions as time-domain tensors (stf_flux_terms)
    by_modes = circular_energy_flux_from_modes(sp.Rational(5, 2))
    by_moments = circular_energy_flux_from_moments(sp.Rational(5, 2))
    assert by_modes == by_moments
    assert by_modes.known_through == sp.Rational(5, 2)
    assert sp.expand(sp.sympify(by_modes.coefficient(sp.Rational(5, 2))) - FLUX_FIVE_HALVES) == 0
    assert sp.expand(sp.sympify(by_modes.coefficient(2)) - FLUX_TWO_PN) == 0
    # F = omega dJ_z/dt holds through 2.5PN: the slow drift of the amplitudes (x-dot ~ x^5)
    # enters m Im[h conj(dh/dt)] only beyond it
    assert circular_angular_momentum_flux_from_modes(sp.Rational(5, 2)) == by_modes
