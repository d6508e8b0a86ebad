"""Tests of stfalgebra/radiative/interaction_table.py and its data file: the file covers what
the table of contributions promises, and what it holds is what the MPM iteration derives
(re-derived here for a few moments and compared term by term)."""

from __future__ import annotations

import json
from fractions import Fraction

import pytest

from stfalgebra.mpm.interactions import radiative_moment_terms, tail_constant_from_iteration
from stfalgebra.radiative import interaction_table
from stfalgebra.radiative.contributions import QUADRATIC_TABULATED_LMAX
from stfalgebra.radiative.interaction_table import (
    TABLE_PATH, derived_tail_constant, radiative_terms, tabulated_through,
)

THREE_HALVES = Fraction(3, 2)


def test_the_file_holds_every_moment_the_contributions_table_serves():
    data = json.loads(TABLE_PATH.read_text(encoding="utf-8"))
    assert data["format"] == "stfalgebra radiative moment terms v1"
    for l in range(2, QUADRATIC_TABULATED_LMAX + 1):
        for moment in ("U", "V"):
            # the command line's contract: every U_L, V_L with l <= 8 through relative 5/2
            assert tabulated_through(moment, l) >= Fraction(5, 2), (moment, l)
            assert data["moments"][f"{moment}{l}"]["command"].startswith("python3 -m stfalgebra.mpm.tabulation")
    for kind in ("mass", "current"):
        assert sorted(map(int, data["tail_constants"][kind])) == list(range(2, 31))


@pytest.mark.parametrize(("moment", "l"), [("U", 4), ("V", 3), ("U", 5), ("V", 2)])
def test_the_file_is_what_the_iteration_derives(moment, l):
    # the second route: run the iteration now and compare every term with the file
    derived = radiative_moment_terms(moment, l, THREE_HALVES)
    assert radiative_terms(moment, l, THREE_HALVES) == tuple(derived)


@pytest.mark.parametrize(("moment", "l"), [("U", 2), ("V", 2), ("U", 3)])
def test_the_file_is_what_the_iteration_derives_at_relative_five_halves(moment, l):
    assert radiative_terms(moment, l, Fraction(5, 2)) == tuple(radiative_moment_terms(moment, l, Fraction(5, 2)))


@pytest.mark.parametrize("l", [2, 3, 7, 11])
def test_tabulated_tail_constants_are_what_the_iteration_derives(l):
    for kind, letter in (("mass", "M"), ("current", "S")):
        assert derived_tail_constant(l, kind) == tail_constant_from_iteration(l, letter)


def test_requests_beyond_the_file_run_the_iteration(monkeypatch):
    monkeypatch.setattr(interaction_table, "_table", lambda: {"moments": {}})
    interaction_table.radiative_terms.cache_clear()
    try:
        assert tabulated_through("U", 2) is None
        kinds = [term.kind for term in radiative_terms("U", 2, THREE_HALVES)]
        assert kinds == ["linear", "tail"]
        assert derived_tail_constant(4, "mass") == Fraction(59, 30)    # kappa_4, closed form
    finally:
        interaction_table.radiative_terms.cache_clear()


def test_lower_orders_are_cut_from_a_moment_held_further():
    held = radiative_terms("U", 4, THREE_HALVES)
    newtonian = radiative_terms("U", 4, Fraction(0))
    assert [term.kind for term in newtonian] == ["linear"] and newtonian[0] == held[0]


def test_bad_kind():
    with pytest.raises(ValueError, match="'spin'"):
        derived_tail_constant(2, "spin")
