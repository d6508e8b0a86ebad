"""Tests of stfalgebra/radiative/radiative_moments.py: accuracy bookkeeping and refusals, the
circular channel with tails and quadratic interactions, the tail series in psi and phi, and the
unevaluated general-orbit tail."""

from __future__ import annotations

import pytest
import sympy as sp
from hypothesis import example, given, settings, strategies as st

from stfalgebra.errors import OrderBeyondInputsError, RefusedModeError
from stfalgebra.radiative.nonlinear import quadratic_channel_circular
from stfalgebra.radiative.phase import psi_minus_phi
from stfalgebra.radiative.projection import mode_kind
from stfalgebra.radiative.radiative_moments import (
    RADIATIVE_MAX_RELATIVE,
    circular_tail_series,
    general_orbit_tail,
    radiative_accuracy,
    radiative_channel_circular,
)
from stfalgebra.radiative.tails import TailIntegral, canonical_logs, tail_factor
from stfalgebra.symbols import G, M_adm, c, m, omega, r, r0, t

THREE_HALVES = sp.Rational(3, 2)


# ----------------------------------------------------------------------------- accuracy
def test_inputs_chosen_by_relative_order():
    newtonian = radiative_accuracy(2, 2, 0, "circular")
    assert (newtonian.moment_order, newtonian.tails, newtonian.relative_known) == (0, False, sp.Rational(1, 2))
    one = radiative_accuracy(3, 2, 1, "general")
    assert (one.moment_order, one.tails, one.relative_known) == (1, False, 1)
    tails = radiative_accuracy(4, 4, THREE_HALVES, "circular")
    assert (tails.moment_order, tails.tails, tails.relative_known) == (1, True, THREE_HALVES)
    assert RADIATIVE_MAX_RELATIVE == THREE_HALVES
    assert any("quadratic interactions" in line and "I^(3)_<ij I^(3)_kl>" in line
               for line in tails.provenance)
    assert any("tail" in line and "kappa_l" in line for line in tails.provenance)


@pytest.mark.parametrize(("l", "mm"), [(2, 2), (2, 1), (3, 3), (3, 1), (3, 2), (4, 4), (4, 2), (4, -2)])
def test_complete_modes_are_served_at_relative_three_halves(l, mm):
    # Issue 5: l = 2 (mass and current), l = 3 mass, l = 4 mass and l = 3 current
    assert radiative_accuracy(l, mm, THREE_HALVES, "circular").tails


@pytest.mark.parametrize(("l", "mm", "named"), [
    (5, 5, "I_ij x I_klm"), (5, 1, "I_ij x I_klm"), (4, 3, "J_i x I_jkl"),
    (4, 1, "J_ij x I_kl"), (6, 6, "I_ijk x I_lmn"), (5, 4, "J_ijk x I_lm"),
])
def test_incomplete_modes_are_refused_naming_the_missing_interaction(l, mm, named):
    with pytest.raises(OrderBeyondInputsError, match="quadratic interactions") as info:
        radiative_accuracy(l, mm, THREE_HALVES, "circular")
    assert named in str(info.value)
    assert "tail" in str(info.value)
    # one order lower they are served
    assert not radiative_accuracy(l, mm, 1, "circular").tails


def test_refusals_beyond_the_inputs():
    with pytest.raises(OrderBeyondInputsError, match="general_orbit_tail"):
        radiative_accuracy(2, 2, THREE_HALVES, "general")
    with pytest.raises(OrderBeyondInputsError, match="through relative 1.5PN"):
        radiative_accuracy(2, 2, 2, "circular")
    with pytest.raises(ValueError, match="'elliptic'"):
        radiative_accuracy(2, 2, 0, "elliptic")
    with pytest.raises(ValueError, match="m = 3"):
        radiative_accuracy(2, 3, 0, "circular")
    with pytest.raises(TypeError, match="'2'"):
        radiative_accuracy("2", 2, 0, "circular")


# ----------------------------------------------------------------------------- tail series
modes = st.integers(min_value=2, max_value=7).flatmap(
    lambda l: st.tuples(st.just(l), st.integers(min_value=-l, max_value=l).filter(lambda k: k != 0)))


@settings(max_examples=12, deadline=None)
@given(mode=modes)
@example(mode=(2, 2))
@example(mode=(3, -3))
def test_tail_series_in_psi_is_free_of_r0_and_of_ln_omega(mode):
    # ../shared/conventions.md: psi absorbs ln(omega/omega_0); r0 enters only through omega_0
    l, mm = mode
    coefficient = circular_tail_series(l, mm).coefficient(THREE_HALVES)
    assert not coefficient.has(r0)
    assert not coefficient.has(sp.log(omega)) and not coefficient.has(c)
    assert coefficient.has(G)


@settings(max_examples=8, deadline=None)
@given(mode=modes)
@example(mode=(2, 1))
def test_tail_series_phi_and_psi_differ_by_the_phase_shift(mode):
    # exp(-i m phi) F_phi = exp(-i m psi) F_psi with phi = psi - (psi - phi): to first order
    # in G, F_psi = F_phi (1 + i m (psi - phi)) (../shared/conventions.md, common practice)
    l, mm = mode
    psi = circular_tail_series(l, mm, "psi").coefficient(THREE_HALVES) / c**3
    phi = circular_tail_series(l, mm, "phi").coefficient(THREE_HALVES) / c**3
    shift = psi_minus_phi(adm_mass=m)
    assert canonical_logs(psi - phi - sp.I * mm * shift) == 0
    assert canonical_logs(phi - (tail_factor(l, mode_kind(l, mm), mm * omega, adm_mass=m) - 1)) == 0


def test_tail_series_22_in_psi():
    # Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 9.4: Hhat_22 tail = 2 pi x^(3/2)
    # (G m omega/c^3 = x^(3/2)); from memory
    assert circular_tail_series(2, 2).coefficient(THREE_HALVES) == 2 * sp.pi * G * m * omega


def test_tail_series_refusals():
    with pytest.raises(RefusedModeError, match="memory"):
        circular_tail_series(2, 0)
    with pytest.raises(ValueError, match="'chi'"):
        circular_tail_series(2, 2, "chi")


# ----------------------------------------------------------------------------- channel
@pytest.mark.parametrize(("l", "mm"), [(2, 2), (2, 1), (3, 2), (4, 4)])
def test_channel_with_tails_is_instantaneous_times_tail_plus_quadratic(l, mm):
    one = radiative_accuracy(l, mm, 1, "circular")
    full = radiative_accuracy(l, mm, THREE_HALVES, "circular")
    plain = radiative_channel_circular(l, mm, one)
    with_tails = radiative_channel_circular(l, mm, full)
    for order in (0, sp.Rational(1, 2), 1):
        assert sp.expand(with_tails.coefficient(order) - plain.coefficient(order)) == 0
    tail = circular_tail_series(l, mm).coefficient(THREE_HALVES)
    quadratic = quadratic_channel_circular(l, mm)
    extra = quadratic.coefficient(THREE_HALVES) if quadratic.orders else 0
    expected = plain.coefficient(0) * tail + extra
    assert sp.expand(with_tails.coefficient(THREE_HALVES) - expected) == 0
    assert with_tails.known_through == THREE_HALVES


def test_channel_phi_keeps_r0():
    acc = radiative_accuracy(2, 2, THREE_HALVES, "circular")
    assert radiative_channel_circular(2, 2, acc, "phi").coefficient(THREE_HALVES).has(r0)
    assert not radiative_channel_circular(2, 2, acc, "psi").coefficient(THREE_HALVES).has(r0)
    with pytest.raises(ValueError, match="'tau'"):
        radiative_channel_circular(2, 2, acc, "tau")


# ----------------------------------------------------------------------------- general orbits
@pytest.mark.parametrize(("l", "mm"), [(2, 2), (2, 1), (3, 3), (3, -2)])
def test_general_orbit_tail_reduces_to_the_circular_tail(l, mm):
    # On r(t) = r, phi(t) = omega t the unevaluated tail, evaluated harmonic by harmonic, is the
    # circular channel's tail in phi (exp(-i m omega t) taken out), M = m (common practice).
    expr = general_orbit_tail(l, mm)
    tails = list(expr.atoms(TailIntegral))
    assert len(tails) == 1 and tails[0].degree == l and tails[0].kind == mode_kind(l, mm)
    radius, angle = sp.Function("r", positive=True)(t), sp.Function("phi", real=True)(t)
    body = tails[0].integrand.expr
    u = tails[0].integrand.variables[0]
    body = body.subs({radius.subs(t, u): r, angle.subs(t, u): omega * u}).doit()
    circular = TailIntegral(l, tails[0].kind, sp.Lambda(u, body), t).evaluate_harmonics()
    general = sp.expand((expr / tails[0]) * circular * sp.exp(sp.I * mm * omega * t))
    general = canonical_logs(sp.powsimp(general).subs(M_adm, m))
    acc = radiative_accuracy(l, mm, 0, "circular")
    newtonian = radiative_channel_circular(l, mm, acc).coefficient(0)
    from stfalgebra.radiative.projection import alpha_on_spinor_basis, mode_channel
    alpha = alpha_on_spinor_basis(l, mm, *mode_channel(l, mm))
    tail = circular_tail_series(l, mm, "phi").coefficient(THREE_HALVES) / c**3
    assert canonical_logs(general - alpha * newtonian * tail) == 0


def test_general_orbit_tail_prints_and_refuses_bad_modes():
    text = str(general_orbit_tail(3, 2))
    assert "TailIntegral(3, current" in text and "Derivative(phi(t), t)" in text
    with pytest.raises(ValueError, match="l = 1"):
        general_orbit_tail(1, 1)
    with pytest.raises(TypeError, match="None"):
        general_orbit_tail(2, None)
