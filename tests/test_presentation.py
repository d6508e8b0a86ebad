"""Tests of stfalgebra/presentation.py: the one canonical form of a PN result.

What is checked, and against what:

- the text is read back by sympy (a reference library) as the same expression as the series,
  for every circular mode l <= 6 (relative 1PN), every mode l <= 4 at relative 1.5PN in both
  phases, every general-orbit mode l <= 4, and random series (hypothesis);
- the LaTeX is read back by the project's safe parser (the checker's route) as the same
  expression, for the same random series and the modes l <= 4;
- the form: prefactor * [1 + ...] whenever the leading coefficient is a single term, terms in
  increasing order, coefficients collected in nu, logarithms combined into logarithms of
  rationals (and of x/x0), compared with the published forms of Hhat_33, Hhat_21 and Hhat_22
  (Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 9.5, the mode amplitudes; from memory);
- the module stays free of sympy (the cold `mode` path must not import it).
"""

from __future__ import annotations

import ast
import subprocess
import sys
from fractions import Fraction
from pathlib import Path

import pytest
import sympy as sp
from hypothesis import given, settings
from hypothesis import strategies as st

import stfalgebra
from stfalgebra import symbols as S
from stfalgebra.checking.safe_parser import parse_expression
from stfalgebra.exact import ExactPolynomial, SurdConstant
from stfalgebra.pnseries import PNSeries
from stfalgebra.presentation import present_series
from stfalgebra.radiative.modes import derive_mode, derive_modes

LOCALS = {"x": S.x, "x0": S.x0, "nu": S.nu, "delta": S.delta, "r": S.r, "rdot": S.rdot, "phidot": S.phidot,
          "m": S.m, "c": S.c, "G": S.G}


def _sympy_value(series: PNSeries, constant: SurdConstant | None, variable: str):
    v = sp.sqrt(S.x) if variable == "x" else 1 / S.c
    total = sp.Add(*[value.to_sympy() * v**order.twice for order, value in series.terms.items()])
    return (constant.to_sympy() if constant is not None else 1) * total


def _split_logs(expression):
    """log of a positive rational as a sum of logarithms of primes (sympy's factorint), so that
    logarithms written in different groupings compare equal."""
    replacements = {}
    for function in expression.atoms(sp.log):
        argument = function.args[0]
        if argument.is_Rational and argument > 0:
            replacements[function] = (sp.Add(*[e * sp.log(p) for p, e in sp.factorint(argument.p).items()])
                                      - sp.Add(*[e * sp.log(p) for p, e in sp.factorint(argument.q).items()]))
    return expression.xreplace(replacements)


def _same(a, b) -> bool:
    return sp.expand(_split_logs(sp.expand_log(sp.expand(a - b), force=True))) == 0


def _read_text(text: str):
    return sp.sympify(text, locals=LOCALS)


# ----------------------------------------------------------------------------- every mode
def _check_mode(result) -> None:
    if result.refused is not None:
        return
    assert _same(_read_text(result.hhat_text()), result.hhat), (result.l, result.m, result.hhat_text())


@pytest.mark.parametrize("l", range(2, 7))
def test_text_of_every_circular_mode_reads_back_as_the_same_expression(l):
    for result in derive_modes(l, pn_relative=1)[-(2 * l + 1):]:
        _check_mode(result)


@pytest.mark.parametrize("phase", ["psi", "phi"])
def test_text_and_latex_of_the_modes_with_tails_read_back(phase):
    for result in derive_modes(4, pn_relative="3/2", phase=phase):
        _check_mode(result)
        if result.refused is None and result.m > 0:     # m < 0: the same form, conjugated
            assert _same(parse_expression(result.hhat_latex()), result.hhat), (result.l, result.m)


def test_text_and_latex_of_general_orbit_modes_read_back():
    for result in derive_modes(4, orbit="general", pn_relative=1):
        _check_mode(result)
        if result.m >= 0 and result.l <= 3:
            assert _same(parse_expression(result.hhat_latex(), orbit="general"), result.hhat), (result.l, result.m)


# ----------------------------------------------------------------------------- the form
def test_published_forms_of_hhat33_hhat21_hhat22():
    # Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 9.5 (from memory):
    # Hhat_33 = -(3/4) i sqrt(15/14) delta [x^(1/2) + x^(3/2)(-4 + 2 nu)
    #           + x^2 (3 pi + i(-21/5 + 6 ln(3/2)))], and (3/4) sqrt(15/14) = (3/56) sqrt(210)
    h33 = derive_mode(3, 3, pn_relative="3/2").presentation()
    assert h33.prefactor_text == "-3/56*sqrt(210)*I*delta*sqrt(x)"
    assert [term.text for term in h33.terms] == ["1", "-4 + 2*nu", "3*pi + I*(-21/5 + 6*log(3/2))"]
    assert h33.to_latex().startswith(r"-\frac{3}{56} \sqrt{210} i \delta x^{1/2} \left[1 + x \left(-4 + 2 \nu\right)")
    # Hhat_21 = (i/3) delta [x^(1/2) + x^(3/2)(-17/28 + 5 nu/7) + x^2 (pi + i(-1/2 - 2 ln 2))]
    h21 = derive_mode(2, 1, pn_relative="3/2").presentation()
    assert h21.prefactor_text == "1/3*I*delta*sqrt(x)"
    assert [term.text for term in h21.terms] == ["1", "-17/28 + 5/7*nu", "pi + I*(-1/2 - 2*log(2))"]
    # Hhat_22 = 1 + x(-107/42 + 55 nu/42) + 2 pi x^(3/2): prefactor 1, nothing to pull out
    assert derive_mode(2, 2, pn="3/2").hhat_text() == "1 + x*(-107/42 + 55/42*nu) + 2*pi*x**(3/2)"


def test_phi_phase_writes_the_tail_logarithm_as_one_logarithm_in_x():
    # conventions.md: Hhat_22(phi) = Hhat_22(psi) [1 + 6 i x^(3/2) ln(x/x0)]
    text = derive_mode(2, 2, pn="3/2", phase="phi").hhat_text()
    assert text == "1 + x*(-107/42 + 55/42*nu) + x**(3/2)*(2*pi + 6*I*log(x/x0))"


def test_phase_reference_logarithm_stays_apart_from_the_modes_own_logarithms():
    # regression: Hhat_21(phi) printed I*(-1/2 + log(x**3/(4*x0**3))); the tail's ln(x/x0) is
    # kept as one logarithm beside the mode's own -2 ln 2 (Hhat_21(psi) above, times
    # 1 + 3 i x^(3/2) ln(x/x0))
    h21 = derive_mode(2, 1, pn_relative="3/2", phase="phi").presentation()
    assert [term.text for term in h21.terms][-1] == "pi + I*(-1/2 - 2*log(2) + 3*log(x/x0))"
    assert r"3 \ln\left(\frac{x}{x_0}\right)" in h21.to_latex()
    # and without x0 the logarithms of x and of rationals still combine (ln x + 4 ln 2 = ln(16 x))
    from stfalgebra.exact import ExactPolynomial as E

    series = PNSeries({0: E("log_x") + 4 * E("log2")}, known_through=0)
    assert present_series(series).terms[0].text == "log(16*x)"


def test_bracket_starts_with_one_when_the_leading_coefficient_is_a_single_term():
    for result in derive_modes(5, pn_relative=1):
        if result.refused is not None or not result.series.terms:    # refused, or zero (odd l, m = 0)
            continue
        form = result.presentation()
        leading = result.series.terms[result.series.orders[0]]
        if len(leading) == 1:
            assert form.terms[0].text == "1", (result.l, result.m)
        orders = [term.order for term in form.terms]
        assert orders == sorted(orders) and orders[0] == 0


def test_logarithms_of_rationals_are_combined_with_the_argument_above_one():
    log2, log3, log5, nu = (ExactPolynomial(n) for n in ("log2", "log3", "log5", "nu"))
    series = PNSeries({0: ExactPolynomial(1), 1: 10 * log3 - 10 * log2 + nu * (4 * log2 + 2 * log5)}, known_through=1)
    assert present_series(series).to_text() == "1 + x*(10*log(3/2) + 2*log(20)*nu)"
    series = PNSeries({0: ExactPolynomial(1), 1: 7 * log2 - 7 * log3}, known_through=1)
    assert present_series(series).to_text() == "1 - 7*log(3/2)*x"
    # an argument that would not be legible is not formed: 5 ln 2 + 16 ln 5 + ln x stay apart
    series = PNSeries({0: log2 + 16 * log5 + 4 * log2 + ExactPolynomial("log_x")}, known_through=0)
    assert present_series(series).to_text() == "5*log(2) + 16*log(5) + log(x)"


def test_dimensional_factors_and_content_in_the_prefactor():
    nu = ExactPolynomial("nu")
    series = PNSeries({5: Fraction(32, 5) * nu**2,
                       6: Fraction(32, 5) * nu**2 * (Fraction(-1247, 336) - Fraction(35, 12) * nu)}, known_through=6)
    form = present_series(series, factors={"c": 5, "G": -1})
    assert form.to_text() == "32/5*nu**2*c**5*x**5/G*(1 + x*(-1247/336 - 35/12*nu))"
    assert form.prefactor_latex == r"\frac{32 \nu^{2} c^{5} x^{5}}{5 G}"
    inverse = present_series(PNSeries({Fraction(-5, 2): ExactPolynomial(Fraction(-1, 32))}, known_through=0),
                             factors={"nu": -1})
    assert inverse.to_text() == "-1/(32*nu*x**(5/2))"


def test_zero_and_json_shape():
    empty = present_series(PNSeries({}, known_through=1))
    assert (empty.to_text(), empty.to_latex(), empty.to_json()["terms"]) == ("0", "0", [])
    form = derive_mode(3, 3, pn_relative=1).presentation().to_json()
    assert set(form) == {"prefactor", "prefactor_latex", "variable", "leading_order", "terms"}
    assert form["leading_order"] == "1/2" and [t["order"] for t in form["terms"]] == ["0", "1"]


# ----------------------------------------------------------------------------- random series
_CIRCULAR = ("I", "delta", "nu", "pi", "EulerGamma", "log2", "log3", "log5", "log_x", "log_x0")
_GENERAL = ("I", "delta", "nu", "m", "r", "rinv", "rdot", "phidot", "log2")
_NUMBERS = st.fractions(min_value=-20, max_value=20, max_denominator=12)


@st.composite
def _series(draw, names):
    orders = draw(st.lists(st.sampled_from([0, Fraction(1, 2), 1, Fraction(3, 2), 2]), min_size=1, max_size=4,
                           unique=True))
    common = ExactPolynomial(1)
    for name in draw(st.lists(st.sampled_from(["I", "delta", "nu"]), max_size=3)):
        common = common * ExactPolynomial(name)
    terms = {}
    for order in orders:
        value = ExactPolynomial(0)
        for _ in range(draw(st.integers(1, 4))):
            monomial = ExactPolynomial(draw(_NUMBERS))
            for name in draw(st.lists(st.sampled_from(names), max_size=3)):
                monomial = monomial * ExactPolynomial(name)
            value = value + monomial
        terms[order] = value * common
    constant = SurdConstant(draw(_NUMBERS.filter(bool)), draw(st.integers(1, 30)))
    return PNSeries(terms, known_through=2), constant


@settings(max_examples=40, deadline=None)
@given(_series(_CIRCULAR))
def test_random_circular_series_read_back_in_text_and_latex(drawn):
    series, constant = drawn
    form = present_series(series, constant=constant)
    expected = _sympy_value(series, constant, "x")
    assert _same(_read_text(form.to_text()), expected), form.to_text()
    assert _same(parse_expression(form.to_latex()), expected), form.to_latex()


@settings(max_examples=30, deadline=None)
@given(_series(_GENERAL))
def test_random_general_orbit_series_read_back_in_text_and_latex(drawn):
    series, constant = drawn
    form = present_series(series, constant=constant, variable="1/c")
    expected = _sympy_value(series, constant, "1/c")
    assert _same(_read_text(form.to_text()), expected), form.to_text()
    assert _same(parse_expression(form.to_latex(), orbit="general"), expected), form.to_latex()


# ----------------------------------------------------------------------------- layering
def test_presentation_imports_only_the_engine_orders_and_series():
    path = Path(stfalgebra.__file__).parent / "presentation.py"
    imported = {node.module for node in ast.walk(ast.parse(path.read_text())) if isinstance(node, ast.ImportFrom)}
    assert {name for name in imported if name and not name.startswith("__")} <= {
        "exact", "orders", "pnseries", "dataclasses", "fractions", "math", "typing"}


def test_a_mode_is_derived_and_printed_without_importing_sympy():
    code = ("import sys; from stfalgebra.radiative.modes import derive_modes; "
            "texts = [r.hhat_text() for r in derive_modes(4, pn_relative=1)] + "
            "[r.hhat_latex() for r in derive_modes(3, orbit='general', pn_relative=1)]; "
            "assert 'sympy' not in sys.modules, 'sympy imported'; print(len(texts))")
    done = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                          env={"PYTHONPATH": str(Path(stfalgebra.__file__).parent.parent), "PATH": ""})
    assert done.returncode == 0, done.stderr


def test_the_repl_shows_results_in_their_printed_form():
    from stfalgebra.radiative.energy_balance import circular_quantity

    assert repr(derive_mode(2, 2, pn=1)) == "Hhat_2,2 (circular orbit) = 1 + x*(-107/42 + 55/42*nu)"
    assert repr(circular_quantity("x_rate", 0)) == "dx/dt = 64/5*nu*c**3*x**5/(G*m)  (through relative order 0)"
