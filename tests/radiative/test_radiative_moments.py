"""Tests of stfalgebra/radiative/radiative_moments.py: the evaluators of the table of
contributions (instantaneous channel against sympy's own differentiation, the circular channel
with tails and quadratic interactions), the tail series in psi and phi, and the unevaluated
general-orbit tail. The choice of rows and the refusals are tested in test_contributions.py."""

from __future__ import annotations

import pytest
import sympy as sp
from hypothesis import example, given, settings, strategies as st

from stfalgebra.errors import OrderBeyondInputsError, RefusedModeError
from stfalgebra.radiative.nonlinear import quadratic_channel_circular
from stfalgebra.radiative.psi_phase import psi_minus_phi
from stfalgebra.radiative.contributions import plan_radiative_moment
from stfalgebra.radiative.projection import mode_kind
from stfalgebra.radiative.radiative_moments import circular_tail_series, general_orbit_tail
from stfalgebra.radiative.tails import TailIntegral, canonical_logs, tail_factor
from stfalgebra.symbols import G, M_adm, c, m, nu, omega, phidot, r, r0, rdot, t

THREE_HALVES = sp.Rational(3, 2)


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
def _channel(l, mm, relative, orbit="circular"):
    plan = plan_radiative_moment(mode_kind(l, mm), l, relative, orbit)
    total = None
    for row in plan.rows:
        piece = row.evaluate(l, mm, orbit=orbit)
        total = piece if total is None else total + piece
    return total.truncate(relative)


@pytest.mark.parametrize(("l", "mm"), [(2, 2), (2, 1), (3, 2), (4, 4)])
def test_channel_with_tails_is_instantaneous_times_tail_plus_quadratic(l, mm):
    plain = _channel(l, mm, 1)
    with_tails = _channel(l, mm, THREE_HALVES)
    for order in (0, sp.Rational(1, 2), 1):
        assert sp.expand(sp.sympify(with_tails.coefficient(order) - plain.coefficient(order))) == 0
    tail = circular_tail_series(l, mm).coefficient(THREE_HALVES).subs(omega, phidot)
    quadratic = quadratic_channel_circular(l, mm)
    extra = quadratic.coefficient(THREE_HALVES).subs(omega, phidot) if quadratic.orders else 0
    expected = sp.sympify(plain.coefficient(0)) * tail + extra
    got = sp.sympify(with_tails.coefficient(THREE_HALVES)).subs(omega, phidot)
    # the two forms of the quadratic terms agree on the Newtonian circular orbit, G m = omega^2 r^3
    # (the difference is of relative order 1PN beyond the term, past what is known)
    kepler = {G: phidot**2 * r**3 / m}
    assert sp.expand((got - expected).subs(kepler)) == 0
    assert with_tails.known_through == THREE_HALVES


def test_general_orbit_instantaneous_channel_is_the_l_th_derivative():
    # U_L = d^l I_L/dt^l: on a general orbit the channel is (d/dt - i m phidot)^l of the source
    # channel; the Newtonian (2,2) channel is -2 nu m (rdot - i r phidot)^2 - ... checked against
    # d^2/dt^2 of nu m r^2 exp(-2 i phi)/4 differentiated by sympy along the Newtonian orbit
    channel = _channel(2, 2, 0, "general").coefficient(0)
    t = sp.Symbol("t")
    radius, angle = sp.Function("R")(t), sp.Function("Phi")(t)
    value = nu * m * radius**2 * sp.exp(-2 * sp.I * angle) / 4
    second = sp.diff(value, t, 2)
    accel = {sp.Derivative(radius, (t, 2)): radius * sp.Derivative(angle, t)**2 - G * m / radius**2,
             sp.Derivative(angle, (t, 2)): -2 * sp.Derivative(radius, t) * sp.Derivative(angle, t) / radius}
    second = second.subs(accel).subs({sp.Derivative(radius, t): rdot, sp.Derivative(angle, t): phidot})
    second = sp.expand((second * sp.exp(2 * sp.I * angle)).subs(radius, r))
    assert sp.expand(sp.sympify(channel) - second) == 0


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
    newtonian = sp.sympify(_channel(l, mm, 0).coefficient(0)).subs(phidot, omega)
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


@pytest.mark.parametrize("l", range(2, 7))
def test_engine_tail_equals_the_tail_derived_with_sympy(l):
    # the evaluator's closed form against the tail factor derived here by sympy's Laplace
    # integrals, continued and absorbed into psi (both signs of m, mass and current modes)
    from stfalgebra.radiative.radiative_moments import tail_correction_in_psi

    for mm in range(-l, l + 1):
        if mm == 0:
            continue
        derived = circular_tail_series(l, mm).coefficient(THREE_HALVES)
        engine = sp.sympify(tail_correction_in_psi(l, mm)).subs(phidot, omega)
        assert canonical_logs(sp.expand(engine - derived)) == 0, (l, mm)


# --------------------------------------------------------------- the tail with the ADM mass (2.5PN)
def _adm_tail_row():
    from stfalgebra.radiative.contributions import CONTRIBUTIONS

    return next(row for row in CONTRIBUTIONS if row.family == "tail" and row.known_through == sp.Rational(5, 2))


@pytest.mark.parametrize("l, m", [(2, 2), (2, 1), (3, 3), (4, 2)])
def test_adm_mass_changes_the_tail_by_exactly_e_over_c_squared(l, m):
    # two evaluations, M = m + E/c^2 and M = m: their difference is the leading tail times
    # E/(m c^2) = nu (E/mu)/c^2, E the binding energy, at relative 2.5PN
    from stfalgebra.exact import engine_symbols
    from stfalgebra.radiative.radiative_moments import _rotation, adm_tail_channel, source_channel, tail_correction_in_psi
    from stfalgebra.binary.cited_inputs import energy_per_reduced_mass

    row = _adm_tail_row()
    with_adm = adm_tail_channel(l, m, row=row, orbit="circular")
    with_m = adm_tail_channel(l, m, row=row, orbit="circular", adm_mass=False)
    s = engine_symbols()
    binding = (s.nu * energy_per_reduced_mass(s)[0]).substitute({"rdot": 0})
    newtonian = source_channel(l, m, 0, circular=True).coefficient(0) * _rotation(m) ** l
    expected = newtonian * tail_correction_in_psi(l, m) * binding
    difference = with_adm - with_m
    assert difference.orders == (sp.Rational(5, 2),)
    assert difference.coefficient(sp.Rational(5, 2)) == expected


def test_adm_mass_in_the_22_mode_is_minus_pi_nu():
    # M = m (1 - nu x/2) on the circular orbit (E = -mu c^2 x/2, Landau & Lifshitz; common
    # practice): the 1.5PN tail 2 pi x^(3/2) of Hhat_22 changes by -pi nu x^(5/2)
    from stfalgebra.binary.circular_frequency import on_circular_orbit
    from stfalgebra.radiative.radiative_moments import adm_tail_channel, instantaneous_2pn_circular

    row = _adm_tail_row()
    difference = (adm_tail_channel(2, 2, row=row, orbit="circular")
                  - adm_tail_channel(2, 2, row=row, orbit="circular", adm_mass=False))
    newtonian = on_circular_orbit(instantaneous_2pn_circular(2, 2).truncate(0), 2).coefficient(1)
    reduced = on_circular_orbit(difference, 2)
    ratio = (reduced.coefficient(reduced.orders[0]) / newtonian).to_sympy()
    assert sp.expand(ratio + sp.pi * nu) == 0
