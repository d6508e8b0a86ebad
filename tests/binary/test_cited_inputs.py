"""Tests of stfalgebra.binary.cited_inputs: every input is a plain function that evaluates on any
exact arithmetic using only +, -, * and integer powers (negative powers of r only), and the
table lists each of them with its source. The physics of the inputs is tested where they are
used (tests/binary/test_dynamics.py, test_circular.py, test_centre_of_mass.py)."""

from __future__ import annotations

import inspect
from fractions import Fraction
from types import SimpleNamespace

import pytest
import sympy as sp
from hypothesis import given, settings
from hypothesis import strategies as st

from stfalgebra.binary import cited_inputs
from stfalgebra.binary.dynamics import SYMBOL_NAMESPACE
from stfalgebra.symbols import G, delta, m, nu, phidot, r, rdot


class _Restricted:
    """An exact number that allows only the operations the cited inputs may use: +, -, *, and
    ** with an int exponent, negative only on the separation r. Anything else (division, a
    square root, a float) raises, so a formula written outside the rules fails here."""

    __slots__ = ("value", "is_separation")

    def __init__(self, value: Fraction, is_separation: bool = False) -> None:
        self.value = Fraction(value)
        self.is_separation = is_separation

    @staticmethod
    def _of(other):
        if isinstance(other, _Restricted):
            return other.value
        if isinstance(other, int) and not isinstance(other, bool):
            return Fraction(other)
        raise TypeError(f"cited inputs may combine only exact numbers, got {other!r}")

    def __add__(self, other):
        return _Restricted(self.value + self._of(other))

    __radd__ = __add__

    def __sub__(self, other):
        return _Restricted(self.value - self._of(other))

    def __rsub__(self, other):
        return _Restricted(self._of(other) - self.value)

    def __mul__(self, other):
        return _Restricted(self.value * self._of(other))

    __rmul__ = __mul__

    def __neg__(self):
        return _Restricted(-self.value)

    def __pow__(self, exponent):
        if isinstance(exponent, bool) or not isinstance(exponent, int):
            raise TypeError(f"only integer exponents are allowed, got {exponent!r}")
        if exponent < 0 and not self.is_separation:
            raise TypeError("negative powers are allowed only of r")
        return _Restricted(self.value**exponent)


_FUNCTIONS = [row.function for row in cited_inputs.CITED_INPUTS + cited_inputs.REACTION_INPUTS]

_fractions = st.fractions(min_value=Fraction(-3), max_value=Fraction(3), max_denominator=50)


def _restricted_namespace(point: dict[str, Fraction]) -> SimpleNamespace:
    values = {name: _Restricted(value, is_separation=(name == "r")) for name, value in point.items()}
    return SimpleNamespace(**values, q=lambda a, b: _Restricted(Fraction(a, b)))


@settings(max_examples=15, deadline=None)
@given(G_value=_fractions.filter(bool), m_value=_fractions.filter(bool),
       nu_value=st.fractions(min_value=0, max_value=Fraction(1, 4), max_denominator=40),
       r_value=st.fractions(min_value=Fraction(1, 10), max_value=Fraction(50), max_denominator=30),
       rdot_value=_fractions, phidot_value=_fractions, delta_value=_fractions)
def test_inputs_evaluate_with_restricted_exact_arithmetic(G_value, m_value, nu_value, r_value,
                                                          rdot_value, phidot_value, delta_value):
    # the lead engine evaluates the inputs without sympy: the same formulas evaluated on
    # restricted exact numbers agree with their sympy evaluation at the same point
    point = {"G": G_value, "m": m_value, "nu": nu_value, "delta": delta_value, "r": r_value,
             "rdot": rdot_value, "phidot": phidot_value}
    restricted = _restricted_namespace(point)
    symbols = {G: G_value, m: m_value, nu: nu_value, delta: delta_value, r: r_value,
               rdot: rdot_value, phidot: phidot_value}
    for function in _FUNCTIONS:
        numeric = function(restricted)
        symbolic = function(SYMBOL_NAMESPACE)
        assert set(numeric) == set(symbolic)
        for order, value in numeric.items():
            assert isinstance(value, _Restricted)
            assert sp.Rational(value.value) == sp.sympify(symbolic[order]).subs(symbols)


def test_restricted_arithmetic_rejects_what_the_rules_forbid():
    # the checker above can fail: division, non-integer or negative powers of other symbols
    s = _restricted_namespace({"G": Fraction(1), "m": Fraction(1), "nu": Fraction(1, 5),
                               "delta": Fraction(0), "r": Fraction(2), "rdot": Fraction(1, 3),
                               "phidot": Fraction(1, 7)})
    with pytest.raises(TypeError):
        s.G / s.r
    with pytest.raises(TypeError):
        s.rdot**-1
    with pytest.raises(TypeError):
        s.r**0.5
    with pytest.raises(TypeError):
        s.nu * 0.5
    assert (s.r**-2).value == Fraction(1, 4)


def test_table_lists_every_input_once_with_its_source():
    public = {name for name in cited_inputs.__all__
              if inspect.isfunction(getattr(cited_inputs, name))} - {"check_input_order", "known_through"}
    rows = cited_inputs.CITED_INPUTS + cited_inputs.REACTION_INPUTS
    listed = [row.name for row in rows]
    assert sorted(listed) == sorted(public)
    for row in rows:
        assert getattr(cited_inputs, row.name) is row.function
        assert "Living Rev. Relativ. 17, 2 (2014)" in row.source
        assert "from memory" in row.source
        assert row.quantity and row.checked_by


def test_orders_are_within_the_implemented_ones():
    for row in cited_inputs.CITED_INPUTS:
        orders = set(row.function(SYMBOL_NAMESPACE))
        assert orders <= set(cited_inputs.KNOWN_THROUGH)
    for row in cited_inputs.REACTION_INPUTS:
        assert set(row.function(SYMBOL_NAMESPACE)) == set(cited_inputs.REACTION_KNOWN_THROUGH)


def test_reaction_is_known_through_five_halves_only_with_the_2pn_inputs():
    # the 2.5PN reaction is the first odd order; with the 2PN conservative inputs the
    # dynamics is known through relative 5/2 (the 3PN conservative terms are not entered)
    assert cited_inputs.REACTION_KNOWN_THROUGH == {Fraction(5, 2): Fraction(5, 2)}
    assert max(cited_inputs.KNOWN_THROUGH) == 2
    assert cited_inputs.REACTION_INPUT_ORDERS == {"radiation reaction": (Fraction(5, 2),)}


def test_known_through_table():
    # no 0.5PN or 1.5PN conservative terms; the 2.5PN radiation reaction, not entered, is the
    # next term of the 2PN inputs
    assert cited_inputs.KNOWN_THROUGH == {0: Fraction(1, 2), 1: Fraction(3, 2), 2: 2}
