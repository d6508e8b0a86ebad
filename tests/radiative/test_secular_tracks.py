"""Tests of stfalgebra.radiative.secular_tracks: the closed Newtonian track a(e) and the adaptive
integration of the secular equations."""

from __future__ import annotations

import pytest
import sympy as sp

from stfalgebra.binary.keplerian import a, e
from stfalgebra.errors import OrderBeyondInputsError
from stfalgebra.radiative.secular_rates import newtonian_secular_rates
from stfalgebra.radiative.secular_tracks import (
    integrate_secular_evolution,
    newtonian_semi_major_axis_track,
)

C0 = sp.Symbol("c0", positive=True)


def test_semi_major_axis_track_is_peters():
    # Peters, Phys. Rev. 136, B1224 (1964), eq. (5.11)-ish (from memory):
    # a(e) = c0 e^(12/19)/(1 - e^2) (1 + 121/304 e^2)^(870/2299)
    peters = C0 * e ** sp.Rational(12, 19) / (1 - e**2) * (1 + sp.Rational(121, 304) * e**2) ** sp.Rational(870, 2299)
    track = newtonian_semi_major_axis_track()
    assert sp.simplify(track / peters) == 1
    # and it solves da/de = (da/dt)/(de/dt)
    da, de = newtonian_secular_rates()
    assert sp.simplify(sp.diff(track, e) - (da / de).subs(a, track)) == 0


def test_eccentricity_drops_threefold_when_the_axis_halves():
    # common practice: at small e, e ~ a^(19/12), so halving a divides e by 2^(19/12) ~ 3
    track = integrate_secular_evolution(0.005, 0.01, 0.01, 0.25, pn=0, points=2, steps=400)
    ratio = track[0].et / track[-1].et
    assert 2.9 < ratio < 3.1
    assert ratio == pytest.approx(2 ** (19 / 12), rel=1e-3)


@pytest.mark.parametrize("e0", [0.1, 0.6])
def test_integrated_track_follows_the_closed_form(e0):
    track = integrate_secular_evolution(0.002, e0, 0.02, 0.1, pn=0, points=3, steps=3000)
    closed = sp.lambdify(e, newtonian_semi_major_axis_track().subs(C0, 1))
    for point in track[1:]:
        # Newtonian: a = G m/(c^2 x), so a(e)/a(e0) = x0/x (the tolerances rtol 1e-10, atol
        # 1e-12 of the integrator, accumulated)
        assert closed(point.et) / closed(e0) == pytest.approx(0.002 / point.x, rel=1e-8)
    assert track[-1].tau > track[1].tau > 0


def test_newtonian_time_to_coalescence_of_a_circular_orbit():
    # Peters (1964), circular: dx/dt = (64/5) nu x^5 in units c^3/(G m), so
    # tau(x) = (x0^-4 - x^-4)/((256/5) nu) (closed form, common practice)
    x0, x1, nu_value = 0.01, 0.1, 0.25
    track = integrate_secular_evolution(x0, 0.0, x1, nu_value, pn=0, points=4)
    for point in track:
        expected = (x0**-4 - point.x**-4) / (256 / 5 * nu_value)
        assert point.tau == pytest.approx(expected, rel=1e-9)
        assert point.et == 0


def test_1pn_track_is_close_to_newtonian_at_low_frequency():
    newtonian = integrate_secular_evolution(1e-4, 0.5, 2e-4, 0.25, pn=0, points=2, steps=200)
    first = integrate_secular_evolution(1e-4, 0.5, 2e-4, 0.25, pn=1, points=2, steps=200)
    assert abs(first[-1].et - newtonian[-1].et) < 1e-3 * newtonian[-1].et
    assert first[-1].et != newtonian[-1].et


def test_tails_shorten_the_inspiral():
    """The 1.5PN tail increases the flux (phi > 0), so the binary reaches x_final sooner than at
    1PN; the relative change is of order (64/5) 4 pi x^(3/2) / (64/5) ~ 4 pi x^(3/2)."""
    first = integrate_secular_evolution(0.01, 0.3, 0.05, 0.25, pn=1, points=3)
    tails = integrate_secular_evolution(0.01, 0.3, 0.05, 0.25, pn="3/2", points=3)
    assert tails[-1].tau < first[-1].tau
    assert 0.01 < 1 - tails[-1].tau / first[-1].tau < 4 * 3.1416 * 0.05**1.5 * 5
    assert all(b.et < a_.et for a_, b in zip(tails, tails[1:]))


def test_step_budget_is_enforced():
    with pytest.raises(ValueError, match="more than steps = 1"):
        integrate_secular_evolution(0.001, 0.6, 0.1, 0.25, pn=0, points=2, steps=1)


def test_secular_integration_refuses_bad_input():
    with pytest.raises(ValueError, match="x_initial must be positive"):
        integrate_secular_evolution(-0.01, 0.1, 0.02, 0.25)
    with pytest.raises(ValueError, match="e_initial must lie in"):
        integrate_secular_evolution(0.01, 1.0, 0.02, 0.25)
    with pytest.raises(ValueError, match="0.95"):
        integrate_secular_evolution(0.01, 0.96, 0.02, 0.25, pn="3/2")
    with pytest.raises(ValueError, match="nu"):
        integrate_secular_evolution(0.01, 0.1, 0.02, 0.3)
    with pytest.raises(ValueError, match="points"):
        integrate_secular_evolution(0.01, 0.1, 0.02, 0.25, points=1)
    with pytest.raises(ValueError, match="steps"):
        integrate_secular_evolution(0.01, 0.1, 0.02, 0.25, steps=0)
    with pytest.raises(OrderBeyondInputsError):
        integrate_secular_evolution(0.01, 0.1, 0.02, 0.25, pn="5/2")


def test_eccentricity_leaving_the_range_backwards_is_reported():
    # integrating backwards in x raises e, here beyond 0.95 where phi, psi are evaluated
    with pytest.raises(ValueError, match=r"left \[0, 0.95\]"):
        integrate_secular_evolution(0.05, 0.948, 0.03, 0.25, pn="3/2", points=2)
