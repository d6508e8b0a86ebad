"""Tests of stfalgebra/radiative/contributions.py: the table of contributions decides every
order limit and every refusal; a row added to the table takes effect everywhere."""

from __future__ import annotations

from fractions import Fraction

import pytest
import sympy as sp

from stfalgebra.errors import OrderBeyondInputsError
from stfalgebra.orders import PNOrder
from stfalgebra.pnseries import PNSeries
from stfalgebra.radiative.contributions import (
    CONTRIBUTIONS, Contribution, maximum_eccentric_order, maximum_flux_order, maximum_mode_order,
    maximum_order_any_mode, maximum_relative_order, plan_radiative_moment,
)

THREE_HALVES = PNOrder(3, 2)


def test_inputs_chosen_by_relative_order():
    newtonian = plan_radiative_moment("mass", 2, 0, "circular")
    assert [row.family for row in newtonian.rows] == ["instantaneous"]
    assert newtonian.input_order("source moments") == 0
    one = plan_radiative_moment("current", 3, 1, "general")
    assert one.input_order("source moments") == 1 and one.input_order("equations of motion") == 1
    tails = plan_radiative_moment("mass", 4, THREE_HALVES, "circular")
    assert [row.family for row in tails.rows] == ["instantaneous", "tail", "quadratic"]
    assert any("kappa_l" in line for line in tails.provenance)
    assert any("I^(3)_<ij I^(3)_kl>" in line for line in tails.provenance)


@pytest.mark.parametrize(("kind", "l", "limit"), [("mass", 2, 2), ("current", 2, THREE_HALVES), ("mass", 3, 2),
                                                   ("mass", 4, 2), ("current", 3, THREE_HALVES)])
def test_complete_moments_are_served_at_relative_three_halves(kind, l, limit):
    # l = 2 (mass and current), l = 3 mass, l = 4 mass and l = 3 current have every 1.5PN term;
    # the mass moments with the 2PN source moments go on to relative 2PN (no new interaction
    # enters there), the current ones stop before the 2PN current moments
    assert maximum_relative_order(kind, l, "circular") == limit


@pytest.mark.parametrize(("kind", "l", "named"), [
    ("mass", 5, "I_ij x I_klm"), ("current", 4, "J_i x I_jkl"), ("current", 4, "J_ij x I_kl"),
    ("mass", 6, "I_ijk x I_lmn"), ("current", 5, "J_ijk x I_lm"),
])
def test_incomplete_moments_are_refused_naming_the_missing_interaction(kind, l, named):
    with pytest.raises(OrderBeyondInputsError, match="quadratic interactions") as info:
        plan_radiative_moment(kind, l, THREE_HALVES, "circular")
    assert named in str(info.value) and "through relative 1PN" in str(info.value)
    assert maximum_relative_order(kind, l, "circular") == 1


def test_refusals_beyond_the_inputs_name_the_missing_row():
    with pytest.raises(OrderBeyondInputsError, match="general_orbit_tail"):
        plan_radiative_moment("mass", 2, THREE_HALVES, "general")
    with pytest.raises(OrderBeyondInputsError, match="2PN current moments"):
        plan_radiative_moment("current", 2, 2, "circular")


def test_limits_are_read_off_the_table():
    # the 2PN flux needs the (2,2) mode through relative 2PN and (2,1) only through relative 1PN
    assert maximum_flux_order("circular") == 2
    assert maximum_flux_order("general") == 1
    assert maximum_eccentric_order() == THREE_HALVES     # with the tail enhancement functions
    assert maximum_mode_order(2, 2, "circular") == 2
    assert maximum_mode_order(2, 1, "circular") == 2          # leading order 1/2 + relative 3/2
    assert maximum_order_any_mode("circular", relative=True) == 2


def _fake_instantaneous(l, m, *, row, orbit):
    from stfalgebra.radiative.radiative_moments import instantaneous_channel

    one_pn = [r for r in CONTRIBUTIONS if r.family == "instantaneous" and r.need("source moments") == 1][0]
    value = instantaneous_channel(l, m, row=one_pn, orbit=orbit)
    return PNSeries._from_trusted(dict(value._terms), PNOrder(5, 2).twice)


def test_a_fake_row_appears_in_limits_and_refusals():
    # pretend the 2PN source moments exist (evaluated by the 1PN ones: the number is irrelevant,
    # only the bookkeeping is tested) and that the 2.5PN rows are absent: every limit moves.
    fake = Contribution("instantaneous", "fake 2PN source moments", ("mass", "current"), PNOrder(0),
                        PNOrder(5, 2), ("circular", "general"), "test only",
                        needs=(("source moments", 1), ("equations of motion", 1)), evaluator=_fake_instantaneous)
    table = tuple(row for row in CONTRIBUTIONS
                  if not (row.family == "instantaneous" and row.need("source moments") == 2)) + (fake,)
    assert maximum_relative_order("current", 2, "circular") == THREE_HALVES
    assert maximum_relative_order("current", 2, "circular", table) == 2
    assert maximum_relative_order("current", 2, "general", table) == 1      # the tail still refuses
    plan = plan_radiative_moment("current", 2, 2, "circular", table=table)
    assert "fake 2PN source moments" in plan.provenance[0]
    assert maximum_flux_order("circular", table) == 2
    # a missing row added to the table is named by the refusals and lowers the limits
    missing = Contribution("spin-orbit", "an invented missing contribution", ("current",), PNOrder(1, 2), None,
                           ("circular", "general"), "test only")
    table2 = CONTRIBUTIONS + (missing,)
    with pytest.raises(OrderBeyondInputsError, match="an invented missing contribution"):
        plan_radiative_moment("current", 2, 1, "circular", table=table2)
    assert maximum_relative_order("current", 2, "circular", table2) == 0
    # |Hhat_21|^2 starts at x^1: at flux order 3/2 the (2,1) mode is needed through relative 1/2
    assert maximum_flux_order("circular", table2) == Fraction(1)


def test_every_available_row_names_its_origin_and_evaluator():
    for row in CONTRIBUTIONS:
        assert row.origin.startswith(("derived", "cited")) or not row.available
        if row.available:
            assert row.known_through >= row.enters
            assert row.evaluator is not None
