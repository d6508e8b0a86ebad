"""Tests of stfalgebra/radiative/psi_phase.py: the phase variable psi and the tails in psi."""

from __future__ import annotations

import pytest
import sympy as sp
from hypothesis import example, given, settings, strategies as st

from stfalgebra.errors import OrderBeyondInputsError
from stfalgebra.pnseries import PNSeries
from stfalgebra.radiative.psi_phase import (
    PSI_CONSTANT,
    absorb_tail_log_into_psi,
    express_in_x,
    phi_from_psi_factor,
    psi_minus_phi,
    psi_shift,
    relative_tail_factor,
    relative_tail_series,
    tail_reference_frequency,
)
from stfalgebra.radiative.tails import canonical_logs, tail_constant, tail_factor
from stfalgebra.symbols import G, M_adm, c, m as total_mass, omega, r0, x

X32 = x ** sp.Rational(3, 2)


def _mode_kind(l: int, m: int) -> str:
    # Planar orbits: mass moments feed l + m even, current moments l + m odd
    # (../shared/conventions.md).
    return "mass" if (l + m) % 2 == 0 else "current"


# ----------------------------------------------------------------------------- psi itself
def test_psi_constant_is_kappa_2():
    # omega_0 = exp(11/12 - gamma_E)/(4 tau_0) (../shared/conventions.md) relies on
    # kappa_2 = 11/12 (Blanchet 2014, from memory).
    assert PSI_CONSTANT == tail_constant(2, "mass") == sp.Rational(11, 12)


def test_reference_frequency_definition():
    # ../shared/conventions.md: omega_0 = exp(11/12 - gamma_E)/(4 tau_0), tau_0 = r0/c.
    tau_0 = r0 / c
    assert sp.simplify(tail_reference_frequency() - sp.exp(sp.Rational(11, 12) - sp.EulerGamma)
                       / (4 * tau_0)) == 0


def test_psi_minus_phi_in_x_is_three_x32_log_x_over_x0():
    # (2 G M omega/c^3) ln(omega/omega_0) = 3 x^(3/2) ln(x/x_0), x_0 = (G m omega_0/c^3)^(2/3)
    # (common practice: omega proportional to x^(3/2)).
    x0 = (G * total_mass * tail_reference_frequency() / c**3) ** sp.Rational(2, 3)
    expected = -3 * X32 * sp.log(x / x0)
    assert canonical_logs(express_in_x(psi_minus_phi()) - expected) == 0


def test_express_in_x_statements():
    # G M omega/c^3 = x^(3/2) with M = m; 2 omega r0/c = 2 c^2 r0 x^(3/2)/(G m) (common practice).
    assert express_in_x(G * M_adm * omega / c**3) == X32
    expected = 2 * c**2 * r0 * X32 / (G * total_mass)
    assert sp.simplify(express_in_x(2 * omega * r0 / c) - expected) == 0


@settings(max_examples=10, deadline=None)
@given(m=st.integers(min_value=-6, max_value=6))
@example(m=0)
def test_psi_shift_is_first_order_of_the_exact_exponential(m):
    # Taylor coefficients in G of the exact shift at G = 0: value 1, slope = the G term.
    exact = psi_shift(m, first_order=False)
    first = psi_shift(m)
    assert exact.subs(G, 0) == 1 == first.subs(G, 0)
    slope = sp.diff(exact, G).subs(G, 0)
    assert canonical_logs(slope - sp.diff(first, G)) == 0
    assert sp.diff(first, G, 2) == 0


def test_psi_shift_relation_exp_phi_equals_exp_psi_times_shift():
    # exp(-i m phi) = exp(-i m psi) S_m, psi = phi + (psi - phi) (../shared/conventions.md).
    phi_s = sp.Symbol("phi", real=True)
    psi_value = phi_s + psi_minus_phi()
    for m in (1, 2, -3):
        exact_shift = psi_shift(m, first_order=False)
        ratio = sp.exp(-sp.I * m * phi_s) / (sp.exp(-sp.I * m * psi_value) * exact_shift)
        assert sp.simplify(ratio) == 1


def test_phi_factor_undoes_the_shift():
    for m in (1, 2, 5):
        product = canonical_logs(phi_from_psi_factor(m) * psi_shift(m))
        # exactly 1 through first order in G (the G^2 remainder is beyond the tail's order)
        assert product.coeff(G, 0) == 1 and product.coeff(G, 1) == 0
        exact = sp.simplify(phi_from_psi_factor(m, first_order=False)
                            * psi_shift(m, first_order=False))
        assert exact == 1


# ----------------------------------------------------------------------------- the tails in psi
def test_22_mode_tail_is_real_without_log_or_r0():
    # Hhat_22 = 1 + ... + 2 pi x^(3/2) + ... (Blanchet, Living Rev. Relativ. 17, 2 (2014),
    # the (2,2) mode at 1.5PN, from memory): no imaginary part, no ln x, no r0.
    assert relative_tail_factor(2, "mass", 2) == 1 + 2 * sp.pi * X32


def test_absorb_directly_on_the_phi_form_of_the_22_factor():
    # Same reference as above, written in omega: 1 + 2 pi G M omega/c^3.
    absorbed = absorb_tail_log_into_psi(tail_factor(2, "mass", 2 * omega), 2)
    assert absorbed == 1 + 2 * sp.pi * G * M_adm * omega / c**3


@pytest.mark.parametrize(
    ("l", "m", "relative_coefficient"),
    [
        # Coefficient of x^(3/2) relative to the leading term of Hhat_lm (Blanchet, Living Rev.
        # Relativ. 17, 2 (2014), circular-orbit modes, from memory):
        # Hhat_21: x^2 term pi + i(-1/2 - 2 ln 2) over leading x^(1/2)
        (2, 1, sp.pi + sp.I * (-sp.Rational(1, 2) - 2 * sp.log(2))),
        # Hhat_33: x^2 term 3 pi + i(-21/5 + 6 ln(3/2)) over leading x^(1/2)
        (3, 3, 3 * sp.pi + sp.I * (-sp.Rational(21, 5) + 6 * sp.log(sp.Rational(3, 2)))),
        # Hhat_31: x^2 term pi + i(-7/5 - 2 ln 2) over leading x^(1/2)
        (3, 1, sp.pi + sp.I * (-sp.Rational(7, 5) - 2 * sp.log(2))),
        # Hhat_44: x^(5/2) term 4 pi + i(-42/5 + 8 ln 2) over leading x
        (4, 4, 4 * sp.pi + sp.I * (-sp.Rational(42, 5) + 8 * sp.log(2))),
    ],
)
def test_published_tail_terms_of_other_modes(l, m, relative_coefficient):
    factor = relative_tail_factor(l, _mode_kind(l, m), m)
    assert canonical_logs(factor - 1 - relative_coefficient * X32) == 0


@pytest.mark.parametrize("l", [2, 3, 4, 5, 6])
def test_tail_in_psi_is_free_of_r0_and_logs_of_frequency(l):
    for m in range(-l, l + 1):
        if m == 0:
            continue
        for kind in ("mass", "current"):
            factor = relative_tail_factor(l, kind, m)
            assert not factor.has(r0), (l, m, kind)
            assert not factor.has(sp.log(x)) and not factor.has(omega), (l, m, kind)
            assert not factor.has(sp.EulerGamma) and not factor.has(sp.log(c)), (l, m, kind)
            assert not factor.has(sp.log(G)) and not factor.has(sp.log(total_mass)), (l, m, kind)


@settings(max_examples=15, deadline=None)
@given(l=st.integers(min_value=2, max_value=8), data=st.data())
def test_tail_in_psi_closed_form(l, data):
    # What the derivation gives (module docstring): 1 + m x^(3/2)[pi + 2 i (ln(m/2) + 11/12 - k_l)]
    # for m > 0. Checked here as a property at every (l, m).
    m = data.draw(st.integers(min_value=1, max_value=l))
    kind = data.draw(st.sampled_from(["mass", "current"]))
    expected = 1 + m * X32 * (sp.pi + 2 * sp.I * (sp.log(sp.Rational(m, 2)) + PSI_CONSTANT
                                                  - tail_constant(l, kind)))
    assert canonical_logs(relative_tail_factor(l, kind, m) - expected) == 0


@settings(max_examples=15, deadline=None)
@given(l=st.integers(min_value=2, max_value=8), data=st.data())
def test_negative_m_gives_the_conjugate(l, data):
    # h_{l,-m} = (-1)^l conj(h_lm) for planar orbits (../shared/conventions.md): the relative
    # factors of m and -m are conjugate.
    m = data.draw(st.integers(min_value=1, max_value=l))
    kind = data.draw(st.sampled_from(["mass", "current"]))
    plus = relative_tail_factor(l, kind, m)
    minus = relative_tail_factor(l, kind, -m)
    assert sp.expand(minus - sp.conjugate(plus)) == 0


def test_phi_variable_keeps_log_and_r0():
    factor_phi = relative_tail_factor(2, "mass", 2, phase_variable="phi")
    assert factor_phi.has(r0) and factor_phi.has(sp.log(x))
    # Going back: psi form = phi form times S_m, in x, to first order in x^(3/2).
    shift = express_in_x(psi_shift(2))
    product = canonical_logs(factor_phi * shift)
    # keep terms through x^(3/2) (the product of two x^(3/2) corrections is x^3)
    log_x = sp.Symbol("log_x")
    kept = sp.Add(*[term for term in sp.Add.make_args(product.subs(sp.log(x), log_x))
                    if term.as_coeff_exponent(x)[1] <= sp.Rational(3, 2)]).subs(log_x, sp.log(x))
    assert canonical_logs(kept - relative_tail_factor(2, "mass", 2)) == 0


def test_relative_tail_series():
    series = relative_tail_series(3, "mass", 3)
    assert isinstance(series, PNSeries)
    assert series.known_through == sp.Rational(3, 2)
    assert series.coefficient(0) == 1
    assert series.coefficient(sp.Rational(1, 2)) == 0 and series.coefficient(1) == 0
    # Hhat_33 tail term, relative (Blanchet 2014, from memory)
    expected = 3 * sp.pi + sp.I * (-sp.Rational(21, 5) + 6 * sp.log(sp.Rational(3, 2)))
    assert canonical_logs(series.coefficient(sp.Rational(3, 2)) - expected) == 0
    with pytest.raises(OrderBeyondInputsError):
        series.coefficient(2)
    phi_series = relative_tail_series(2, "mass", 2, phase_variable="phi")
    assert phi_series.coefficient(sp.Rational(3, 2)).has(sp.log(x))


# ----------------------------------------------------------------------------- bad input
def test_bad_azimuthal_numbers():
    with pytest.raises(ValueError, match="m = 0"):
        relative_tail_factor(2, "mass", 0)
    with pytest.raises(ValueError, match="3"):
        relative_tail_factor(2, "current", 3)
    with pytest.raises(TypeError, match="1.5"):
        relative_tail_factor(2, "mass", 1.5)
    with pytest.raises(TypeError):
        psi_shift(True)


def test_bad_degree_and_kind_in_relative_factor():
    with pytest.raises(ValueError, match="1"):
        relative_tail_factor(1, "mass", 1)
    with pytest.raises(ValueError, match="'spin'"):
        relative_tail_factor(2, "spin", 2)


def test_bad_phase_variable():
    with pytest.raises(ValueError, match="'chi'"):
        relative_tail_factor(2, "mass", 2, phase_variable="chi")


def test_float_factor_refused():
    with pytest.raises(TypeError, match="0.5"):
        absorb_tail_log_into_psi(0.5, 2)
    with pytest.raises(TypeError):
        absorb_tail_log_into_psi(sp.Float(0.5) * G, 2)


def test_phi_from_psi_carries_the_adm_mass_at_two_and_a_half_pn():
    # psi - phi = -(2 G M omega/c^3) ln(omega/omega_0) with M = m (1 - nu x/2) (the binding energy
    # E = -mu c^2 x/2, common practice): the factor 1 + 3 i m (M/m) x^(3/2) ln(x/x0) has the
    # x^(5/2) term -(3/2) i m nu ln(x/x0), and nothing at x^2
    from stfalgebra.exact import ExactPolynomial as E
    from stfalgebra.radiative.psi_phase import phi_from_psi_in_x

    log_ratio = E("log_x") - E("log_x0")
    for m in (1, 2, 3):
        factor = phi_from_psi_in_x(m)
        assert factor.known_through == sp.Rational(5, 2)
        assert factor.orders == (0, sp.Rational(3, 2), sp.Rational(5, 2))
        assert factor.coefficient(sp.Rational(5, 2)) == -E("I") * E("nu") * log_ratio * sp.Rational(3 * m, 2)
