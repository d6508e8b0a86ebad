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
    instantaneous_part,
    CONTRIBUTIONS, Contribution, maximum_eccentric_order, maximum_flux_order, maximum_mode_order,
    maximum_order_any_mode, maximum_relative_order, plan_radiative_moment, QUADRATIC_TABULATED_LMAX,
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
    assert any(line.startswith("quadratic:") and "MPM iteration" in line for line in tails.provenance)


@pytest.mark.parametrize("kind", ["mass", "current"])
@pytest.mark.parametrize("l", range(2, QUADRATIC_TABULATED_LMAX + 1))
def test_tabulated_moments_are_served_through_their_source_moments(kind, l):
    # the MPM iteration's table holds every U_L, V_L with l <= QUADRATIC_TABULATED_LMAX, so
    # the quadratic row is complete through relative 2PN there (no new interaction enters at
    # relative 2PN); the mass moments go on to 2.5PN with the 2PN source moments and their
    # reaction, canonical (derived by the iteration with the gauge vector) and quadratic rows, the
    # current ones with the 2PN current moments and the radiation-reaction rows of J_L
    assert maximum_relative_order(kind, l, "circular") == Fraction(5, 2)


@pytest.mark.parametrize("kind", ["mass", "current"])
def test_moments_beyond_the_table_are_refused_naming_the_tabulation(kind):
    l = QUADRATIC_TABULATED_LMAX + 1
    with pytest.raises(OrderBeyondInputsError, match="quadratic interactions") as info:
        plan_radiative_moment(kind, l, THREE_HALVES, "circular")
    assert "stfalgebra.mpm.tabulation" in str(info.value) and "through relative 1PN" in str(info.value)
    assert maximum_relative_order(kind, l, "circular") == 1


def test_refusals_beyond_the_inputs_name_the_missing_row():
    with pytest.raises(OrderBeyondInputsError, match="general_orbit_tail"):
        plan_radiative_moment("mass", 2, THREE_HALVES, "general")
    with pytest.raises(OrderBeyondInputsError, match="instantaneous contribution beyond relative 5/2"):
        plan_radiative_moment("current", 2, 3, "circular")


def test_limits_are_read_off_the_table():
    # the 2.5PN flux needs the (2,2) mode through relative 2.5PN and (2,1), (3,3), (3,1) only
    # through relative 1.5PN
    assert maximum_flux_order("circular") == Fraction(5, 2)
    assert maximum_flux_order("general") == 1
    # the 2PN quasi-Keplerian orbit and the 2PN mass row on eccentric orbits, with the tail
    # enhancement functions at 1.5PN
    assert maximum_eccentric_order() == 2
    assert maximum_mode_order(2, 2, "circular") == Fraction(5, 2)
    assert maximum_mode_order(2, 2, "general") == 1
    assert maximum_mode_order(2, 1, "circular") == 3   # leading order 1/2 + relative 5/2
    assert maximum_order_any_mode("circular", relative=True) == Fraction(5, 2)


def test_two_and_a_half_pn_refusals_name_the_missing_rows():
    # the instantaneous row holds I_L at 2.5PN; the canonical correction of l = 4 is derived, so
    # its plan holds every family
    hexadecapole = plan_radiative_moment("mass", 4, Fraction(5, 2), "circular")
    assert [row.family for row in hexadecapole.rows] == ["instantaneous", "tail", "quadratic", "canonical moments"]
    assert "gauge_interactions" in hexadecapole.rows[-1].origin
    octupole = plan_radiative_moment("mass", 3, Fraction(5, 2), "circular")
    assert [row.family for row in octupole.rows] == ["instantaneous", "tail", "quadratic", "canonical moments"]
    # on a general orbit the instantaneous part reaches 2.5PN (derived 2.5PN terms of I_L, the
    # reaction in the derivatives); the tail stays the missing piece
    with pytest.raises(OrderBeyondInputsError, match="unevaluated hereditary integral"):
        plan_radiative_moment("mass", 2, Fraction(5, 2), "general")
    instantaneous = plan_radiative_moment("mass", 3, Fraction(5, 2), "general",
                                          table=instantaneous_part(CONTRIBUTIONS))
    assert [row.family for row in instantaneous.rows] == ["instantaneous"]
    assert "mass_reaction" in instantaneous.provenance[0]
    plan = plan_radiative_moment("mass", 2, Fraction(5, 2), "circular")
    assert [row.family for row in plan.rows] == ["instantaneous", "tail", "quadratic", "canonical moments"]
    assert any("derived" in line and "165003" in line and "mass_reaction" in line for line in plan.provenance)


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
    assert maximum_relative_order("current", 2, "circular") == Fraction(5, 2)
    # (through 5/2: the fake row reaches it, and V_ij has its quadratic and canonical 2.5PN rows)
    assert maximum_relative_order("current", 2, "circular", table) == Fraction(5, 2)
    assert maximum_relative_order("current", 2, "general", table) == 1      # the tail still refuses
    plan = plan_radiative_moment("current", 2, 2, "circular", table=table)
    assert "fake 2PN source moments" in plan.provenance[0]
    assert maximum_flux_order("circular", table) == Fraction(5, 2)
    # without the 2.5PN rows of the mass quadrupole the flux stops at 2PN
    table3 = tuple(row for row in table if not (row.available and row.l_max == 2 and row.known_through == Fraction(5, 2)
                                                and row.family in ("quadratic", "canonical moments")))
    assert maximum_flux_order("circular", table3) == 2
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


def test_eccentric_limit_follows_the_eccentric_rows():
    """Without the 2PN mass row on eccentric orbits the averages stop at 1.5PN (the limit is read
    off the table, not written anywhere else)."""
    import dataclasses

    table = tuple(dataclasses.replace(row, orbits=("circular", "general"))
                  if row.family == "instantaneous" and row.known_through == 2 and row.available else row
                  for row in CONTRIBUTIONS)
    assert maximum_eccentric_order(table) == THREE_HALVES
