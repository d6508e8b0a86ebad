"""Tests of stfalgebra/radiative/tails.py: tail constants, TailIntegral, the harmonic factor."""

from __future__ import annotations

import math
from fractions import Fraction

import mpmath as mp
import pytest
import sympy as sp
from hypothesis import example, given, settings, strategies as st

from stfalgebra.radiative.tails import (
    TailIntegral,
    canonical_logs,
    tail_constant,
    tail_factor,
    tail_kernel,
    tail_term,
)
from stfalgebra.symbols import G, M_adm, c, r0, t

w = sp.Symbol("w", positive=True)
s_real = sp.Symbol("s", real=True)

degrees = st.integers(min_value=2, max_value=8)
kinds = st.sampled_from(["mass", "current"])
harmonics = st.integers(min_value=-6, max_value=6).filter(lambda k: k != 0)


# ----------------------------------------------------------------------------- constants
@pytest.mark.parametrize(
    ("l", "kappa", "pi_l"),
    [
        # kappa_l = (2l^2+5l+4)/(l(l+1)(l+2)) + H_{l-2}, pi_l = (l-1)/(l(l+1)) + H_{l-1}
        # (Blanchet & Damour 1992; Blanchet, Living Rev. Relativ. 17, 2 (2014), from memory),
        # evaluated by hand:
        (2, sp.Rational(11, 12), sp.Rational(7, 6)),
        (3, sp.Rational(97, 60), sp.Rational(5, 3)),
        (4, sp.Rational(59, 30), sp.Rational(119, 60)),
        (5, sp.Rational(232, 105), sp.Rational(133, 60)),
    ],
)
def test_tail_constants_low_degrees(l, kappa, pi_l):
    assert tail_constant(l, "mass") == kappa
    assert tail_constant(l, "current") == pi_l


@settings(max_examples=20, deadline=None)
@given(l=st.integers(min_value=2, max_value=40))
@example(l=2)
def test_tail_constants_match_closed_formulas(l):
    # Closed formulas of the brief (from memory, Blanchet 2014), recomputed with Fractions.
    harmonic = lambda k: sum((Fraction(1, j) for j in range(1, k + 1)), Fraction(0))  # noqa: E731
    kappa = Fraction(2 * l * l + 5 * l + 4, l * (l + 1) * (l + 2)) + harmonic(l - 2)
    pi_l = Fraction(l - 1, l * (l + 1)) + harmonic(l - 1)
    assert tail_constant(l, "mass") == sp.Rational(kappa.numerator, kappa.denominator)
    assert tail_constant(l, "current") == sp.Rational(pi_l.numerator, pi_l.denominator)
    assert isinstance(tail_constant(l, "mass"), sp.Rational)


def test_kappa_2_and_pi_2_are_the_values_psi_relies_on():
    # kappa_2 = 11/12 (the constant in omega_0 of the psi convention), pi_2 = 7/6
    # (from memory, Blanchet 2014).
    assert tail_constant(2, "mass") == sp.Rational(11, 12)
    assert tail_constant(2, "current") == sp.Rational(7, 6)


# ----------------------------------------------------------------------------- the factor
@pytest.mark.parametrize("kind", ["mass", "current"])
@pytest.mark.parametrize("l", [2, 3, 5])
def test_factor_for_positive_frequency_has_expected_shape(l, kind):
    # Expected shape for s > 0 (Blanchet, Living Rev. Relativ. 17, 2 (2014), tails of the
    # modes, from memory): 1 + (2GMs/c^3)[pi/2 + i(ln(2 s r0/c) + gamma_E - k_l)].
    s = 3 * w
    expected = 1 + 2 * G * M_adm * s / c**3 * (
        sp.pi / 2 + sp.I * (sp.log(2 * s * r0 / c) + sp.EulerGamma - tail_constant(l, kind)))
    assert canonical_logs(tail_factor(l, kind, s) - expected) == 0


def test_factor_for_negative_frequency_flips_the_imaginary_part():
    # Real moments: the s < 0 harmonic is the conjugate of the s > 0 one (common practice).
    s = 2 * w
    kernel_neg = tail_kernel(2, "mass", -s)
    assert sp.expand(sp.re(kernel_neg) - sp.pi * s / 2) == 0
    expected_im = -s * (sp.log(2 * s * r0 / c) + sp.EulerGamma - sp.Rational(11, 12))
    assert canonical_logs(sp.im(kernel_neg) - expected_im) == 0


@settings(max_examples=15, deadline=None)
@given(l=degrees, kind=kinds, k=harmonics)
@example(l=2, kind="mass", k=-1)
def test_factor_at_minus_s_is_conjugate(l, kind, k):
    plus = tail_factor(l, kind, k * w)
    minus = tail_factor(l, kind, -k * w)
    assert sp.expand(minus - sp.conjugate(plus)) == 0


@settings(max_examples=15, deadline=None)
@given(l=degrees, kind=kinds, k=harmonics)
def test_symbolic_frequency_specialises_to_numeric_harmonic(l, kind, k):
    general = tail_kernel(l, kind, s_real)
    specific = tail_kernel(l, kind, k * w)
    assert canonical_logs(general.subs(s_real, k * w) - specific) == 0


def test_factor_sign_pieces_with_symbolic_frequency():
    kernel = tail_kernel(2, "mass", s_real)
    assert kernel.has(sp.Abs(s_real))
    assert sp.expand(sp.re(kernel).subs(sp.Abs(s_real), 5)) == 5 * sp.pi / 2


def test_factor_is_first_order_in_G_and_uses_the_adm_mass():
    factor = tail_factor(3, "current", w)
    assert sp.Poly(factor, G).degree() == 1
    assert factor.has(M_adm)
    m = sp.Symbol("m", positive=True)
    assert sp.expand(tail_factor(3, "current", w, adm_mass=m) - factor.subs(M_adm, m)) == 0


# ----------------------------------------------------------------------------- numerics
def _numeric_tail(function, l, constant, at, period, c_value, r0_value):
    """int_0^oo dtau F^(l+2)(at - tau) [ln(c tau/(2 r0)) + k], Abel-regulated, by quadrature.

    The integral is split at tau = T (one orbital period). [0, T] is done directly (the log
    singularity at 0 is integrable). On [T, oo) one integration by parts, F^(l+2)(t - tau) =
    -d/dtau F^(l+1)(t - tau), gives F^(l+1)(t - T) L(T) + int_T^oo F^(l+1)(t - tau)/tau dtau:
    the boundary term at infinity is dropped, which is exactly the exp(-eps tau) (adiabatic
    switch-on) regularisation, and the remaining integral converges; mpmath's quadosc sums it
    period by period with series extrapolation. No extrapolation in eps is needed.
    """
    u = sp.Symbol("u", real=True)
    expr = function.subs(t, u)
    f_l2 = sp.lambdify(u, sp.diff(expr, u, l + 2), "mpmath")
    f_l1 = sp.lambdify(u, sp.diff(expr, u, l + 1), "mpmath")
    log_factor = lambda tau: mp.log(c_value * tau / (2 * r0_value)) + constant  # noqa: E731
    with mp.workdps(15):  # the checks ask for 1e-9
        T = mp.mpf(period)
        nodes = [T * j / 8 for j in range(9)]
        near = mp.quad(lambda tau: f_l2(at - tau) * log_factor(tau), nodes)
        boundary = f_l1(at - T) * log_factor(T)
        far = mp.quadosc(lambda tau: f_l1(at - tau) / tau, [T, mp.inf], period=T)
        return complex(near + boundary + far)


def _closed_value(tail: TailIntegral, values: dict) -> complex:
    closed = tail.evaluate_harmonics()
    return complex(sp.N(closed.subs(values), 30))


@pytest.mark.parametrize(
    ("l", "kind"), [(2, "mass"), (3, "mass"), (4, "mass"), (2, "current"), (3, "current")])
def test_closed_form_matches_quadrature_for_a_circular_orbit_component(l, kind):
    # The x...x component of n_<L> for n = (cos w t, sin w t, 0) is (l!/(2l-1)!!) P_l(cos w t)
    # (n_<L> e_L = (l!/(2l-1)!!) P_l(n.e), Thorne 1980, in ../shared/conventions.md): a real
    # circular-orbit moment component with harmonics k = l, l-2, ... of w, both signs of s.
    w_value, c_value = sp.Rational(13, 10), 1
    r0_value, t_value = sp.Rational(7, 10), sp.Rational(37, 100)
    prefactor = sp.factorial(l) / sp.factorial2(2 * l - 1)
    component = prefactor * sp.legendre(l, sp.cos(w * t))
    tail = TailIntegral(l, kind, component)
    values = {w: w_value, c: c_value, r0: r0_value, t: t_value}
    closed = _closed_value(tail, values)
    numeric = _numeric_tail(component.subs(w, w_value), l, mp.mpf(tail_constant(l, kind)),
                            mp.mpf(t_value), 2 * mp.pi / w_value, c_value, mp.mpf(r0_value))
    assert abs(closed.imag) < 1e-12 * max(1.0, abs(closed.real))
    assert abs(complex(numeric) - closed) < 1e-9 * max(1.0, abs(closed))


@pytest.mark.parametrize(("l", "k"), [(2, 2), (2, -2), (3, 3), (3, -1), (5, 4)])
def test_tail_factor_matches_quadrature_for_one_complex_harmonic(l, k):
    # One harmonic exp(-i s t), s = k w, tested through the factor itself: the tail equals
    # (tail_factor - 1) c^3/(2 G M) (-i s)^l exp(-i s t).
    w_value, c_value = sp.Rational(9, 10), 2
    r0_value, t_value = sp.Rational(3, 2), sp.Rational(1, 5)
    s = k * w
    factor = tail_factor(l, "mass", s)
    closed_expr = (factor - 1) * c**3 / (2 * G * M_adm) * (-sp.I * s) ** l * sp.exp(-sp.I * s * t)
    values = {w: w_value, c: c_value, r0: r0_value, t: t_value}
    closed = complex(sp.N(sp.expand(closed_expr).subs(values), 30))
    numeric = _numeric_tail(sp.exp(-sp.I * s * t).subs(w, w_value), l,
                            mp.mpf(tail_constant(l, "mass")), mp.mpf(t_value),
                            2 * mp.pi / (abs(k) * w_value), c_value, mp.mpf(r0_value))
    assert abs(complex(numeric) - closed) < 1e-9 * max(1.0, abs(closed))


# ----------------------------------------------------------------------------- the object
def test_tail_integral_prints_its_formula():
    tail = TailIntegral(3, "current", "J_xyz")
    assert str(tail) == "TailIntegral(3, current, J_xyz(t))"
    assert tail.formula() == "int_0^oo dtau J_xyz^(5)(t - tau) [log(c*tau/(2*r0)) + 5/3]"
    latex = sp.latex(tail)
    assert r"\int_{0}^{\infty}" in latex and r"J_{xyz}^{(5)}" in latex and r"\frac{5}{3}" in latex
    assert r"\ln\left(\frac{c \tau}{2 r_{0}}\right)" in latex


def test_tail_integral_with_expression_integrand_prints_derivative():
    tail = TailIntegral(2, "mass", sp.cos(2 * w * t))
    assert "d^4/du^4" in tail.formula()
    assert r"\frac{d^{4}}{d u^{4}}" in sp.latex(tail)


def test_tail_term_carries_the_prefactor():
    term = tail_term(2, "mass", "I_xx")
    assert sp.simplify(term / TailIntegral(2, "mass", "I_xx") - 2 * G * M_adm / c**3) == 0
    assert str(term) == "2*G*M*TailIntegral(2, mass, I_xx(t))/c**3"


def test_time_independent_integrand_has_no_tail():
    # A constant moment has no time derivative: exact zero, not an error (house style).
    assert TailIntegral(2, "mass", 0) == 0
    assert TailIntegral(2, "mass", w**2) == 0


def test_tail_integral_is_canonical_and_hashable():
    a = TailIntegral(2, "mass", "I_xx")
    b = TailIntegral(2, "mass", sp.Function("I_xx", real=True)(t))
    assert a == b and hash(a) == hash(b)
    assert a.func(*a.args) == a
    assert a != TailIntegral(2, "current", "I_xx")


def test_tail_integral_survives_pickling_in_another_process():
    # Regression guard: the bound variable must not depend on the process's Dummy counter.
    import pickle
    import subprocess
    import sys

    code = ("import pickle, sys; from stfalgebra.radiative.tails import TailIntegral; "
            "sys.stdout.buffer.write(pickle.dumps(TailIntegral(2, 'mass', 'I_xx')))")
    payload = subprocess.run([sys.executable, "-c", code], capture_output=True, check=True).stdout
    assert pickle.loads(payload) == TailIntegral(2, "mass", "I_xx")


def test_time_derivative_acts_on_the_integrand():
    function = sp.Function("I_xx", real=True)(t)
    tail = TailIntegral(2, "mass", function)
    assert sp.diff(tail, t) == TailIntegral(2, "mass", sp.diff(function, t))
    assert sp.diff(tail, w) == 0


def test_substitution_of_time_keeps_the_integral():
    tail = TailIntegral(2, "mass", sp.cos(2 * w * t))
    at_zero = tail.subs(t, 0)
    assert isinstance(at_zero, TailIntegral) and at_zero.at == 0
    assert "Lambda" in str(at_zero)
    assert sp.expand(at_zero.evaluate_harmonics() - tail.evaluate_harmonics().subs(t, 0)) == 0


@pytest.mark.parametrize("symbol", [c, r0, t])
def test_derivatives_agree_with_the_closed_form(symbol):
    # d/dc and d/dr0 use the past-stationary identity; they must agree with the
    # Abel-regulated closed form.
    tail = TailIntegral(3, "mass", sp.sin(w * t) + sp.cos(3 * w * t) / 5)
    via_object = sp.diff(tail, symbol)
    if isinstance(via_object, sp.Expr) and via_object.has(TailIntegral):
        via_object = via_object.replace(lambda e: isinstance(e, TailIntegral),
                                        lambda e: e.evaluate_harmonics())
    direct = sp.diff(tail.evaluate_harmonics(), symbol)
    assert sp.expand((via_object - direct).rewrite(sp.exp)) == 0


def test_evaluated_tail_of_real_signal_is_real():
    tail = TailIntegral(2, "current", 3 * sp.sin(2 * w * t + 1))
    value = tail.evaluate_harmonics()
    assert sp.simplify(sp.im(sp.expand(value))) == 0
    assert tail.is_extended_real


def test_as_integral_structure():
    integral = TailIntegral(2, "mass", "I_xx").as_integral()
    assert isinstance(integral, sp.Integral)
    (tau, lower, upper), = integral.limits
    assert (lower, upper) == (0, sp.oo)
    assert integral.has(sp.log) and integral.has(sp.Rational(11, 12))


def test_free_symbols_include_tail_constants():
    tail = TailIntegral(2, "mass", sp.cos(w * t))
    assert {c, r0, w, t} <= tail.free_symbols


# ----------------------------------------------------------------------------- bad input
@pytest.mark.parametrize("l", [0, 1, -3])
def test_degree_below_two_is_refused(l):
    with pytest.raises(ValueError, match=str(l)):
        tail_constant(l, "mass")
    with pytest.raises(ValueError, match=str(l)):
        tail_factor(l, "mass", w)
    with pytest.raises(ValueError, match=str(l)):
        TailIntegral(l, "mass", "I")


@pytest.mark.parametrize("l", [2.0, "2", True, sp.Rational(5, 2)])
def test_degree_of_wrong_type_is_refused(l):
    with pytest.raises(TypeError):
        tail_constant(l, "mass")


@pytest.mark.parametrize("kind", ["electric", "Mass", ""])
def test_unknown_kind_is_refused(kind):
    with pytest.raises(ValueError, match=repr(kind)):
        tail_constant(2, kind)
    with pytest.raises(ValueError, match=repr(kind)):
        TailIntegral(2, kind, "I")


def test_kind_of_wrong_type_is_refused():
    with pytest.raises(TypeError):
        tail_constant(2, 0)


def test_zero_frequency_is_refused():
    with pytest.raises(ValueError, match="s = 0"):
        tail_factor(2, "mass", 0)
    with pytest.raises(ValueError, match="s = 0"):
        tail_kernel(2, "mass", 0 * w)


def test_float_and_complex_frequencies_are_refused():
    with pytest.raises(TypeError, match="0.5"):
        tail_factor(2, "mass", 0.5)
    with pytest.raises(ValueError, match="real"):
        tail_factor(2, "mass", sp.I * w)
    with pytest.raises(ValueError, match="real"):
        tail_factor(2, "mass", sp.Symbol("s"))


def test_bad_integrands_are_refused():
    with pytest.raises(TypeError):
        TailIntegral(2, "mass", 1.5 * t)
    with pytest.raises(ValueError, match="must be an identifier"):
        TailIntegral(2, "mass", "I xx")
    with pytest.raises(TypeError):
        TailIntegral(2, "mass", [t])
    with pytest.raises(TypeError):
        TailIntegral(2, "mass", "I_xx", time=0)


def test_non_harmonic_integrand_cannot_be_evaluated():
    with pytest.raises(ValueError, match="harmonic"):
        TailIntegral(2, "mass", t**3).evaluate_harmonics()
    with pytest.raises(ValueError, match="real"):
        TailIntegral(2, "mass", sp.exp(t)).evaluate_harmonics()


def test_rational_logs_are_split_into_primes():
    # Regression: log(6) - log(2) - log(3) did not cancel after expand_log.
    assert canonical_logs(sp.log(6) - sp.log(2) - sp.log(3)) == 0
    assert canonical_logs(sp.log(sp.Rational(3, 4) * w)) == sp.log(3) - 2 * sp.log(2) + sp.log(w)


def test_float_free_reference_values():
    # Regression guard: the derivation must stay exact (no Float from the limit step).
    assert not tail_factor(4, "current", -3 * w).has(sp.Float)
    assert math.isclose(float(sp.re(tail_kernel(2, "mass", 2 * w)).subs(w, 1)), math.pi)


# ----------------------------------------------------------------------------- any power of ln
def test_log_integrals_of_power_zero_and_one_are_the_derived_tail_transforms():
    # the general kernel reproduces the transforms the leading tail was derived from (sympy's
    # own Laplace integrals, continued)
    from stfalgebra.radiative.tails import _fourier_transforms_from_laplace, hereditary_log_integral

    branches = _fourier_transforms_from_laplace()
    for sgn, (log_part, one_part, sigma) in branches.items():
        assert sp.simplify(hereditary_log_integral(0, sgn * sigma) - one_part) == 0
        assert sp.simplify(hereditary_log_integral(1, sgn * sigma) - log_part) == 0


@pytest.mark.parametrize("power", [2, 3])
def test_log_squared_and_cubed_kernels_against_quadrature(power):
    # toy case for the tails of tails: the Gamma-function moment behind the kernel,
    # int_0^oo exp(-p tau) ln(tau)^k dtau, against mpmath quadrature at a complex p with
    # Re p > 0 (before the continuation to the imaginary axis)
    import mpmath

    from stfalgebra.radiative.tails import _log_moment_of_gamma

    value, big_l = _log_moment_of_gamma(power)
    for p_value in (mpmath.mpc(0.5, -1.3), mpmath.mpc(1.2, 0.7)):
        closed = complex(sp.N(value.subs(big_l, sp.log(sp.Float(p_value.real, 30) + sp.I * sp.Float(p_value.imag, 30))), 30)) / complex(p_value)
        numeric = mpmath.quad(lambda tau: mpmath.exp(-p_value * tau) * mpmath.log(tau) ** power, [0, 1, mpmath.inf])
        assert abs(closed - complex(numeric)) < 1e-10 * max(1.0, abs(closed))


def test_log_kernel_refuses_bad_powers():
    from stfalgebra.radiative.tails import hereditary_log_integral

    with pytest.raises(ValueError, match="power"):
        hereditary_log_integral(-1, 1)
