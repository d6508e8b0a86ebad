"""Tests of stfalgebra/radiative/circular_reaction.py: the 2.5PN reaction terms of U_ij on the
inspiralling circular orbit, and the (2,2) mode through relative 2.5PN."""

from __future__ import annotations

from fractions import Fraction

import pytest
import sympy as sp

from stfalgebra.binary.circular_frequency import on_circular_orbit
from stfalgebra.exact import ExactPolynomial
from stfalgebra.moments.mass_reaction import reaction_mass_moment_circular
from stfalgebra.radiative.circular_reaction import (
    canonical_correction_channel, inspiral_derivative_channel, inspiral_radial_velocity,
    reaction_instantaneous_channel,
)
from stfalgebra.radiative.contributions import CONTRIBUTIONS
from stfalgebra.radiative.modes import derive_mode
from stfalgebra.radiative.radiative_moments import instantaneous_2pn_circular
from stfalgebra.symbols import G, m, nu, phidot, r, x

FIVE_HALVES = sp.Rational(5, 2)
I, NU = ExactPolynomial("I"), ExactPolynomial("nu")


def _row(evaluator_name: str):
    return next(row for row in CONTRIBUTIONS if row.available and evaluator_name in str(row.evaluator))


def _in_hhat_22(channel) -> ExactPolynomial:
    """The x^(5/2) coefficient a channel piece gives Hhat_22 (relative to the Newtonian channel)."""
    newtonian = on_circular_orbit(instantaneous_2pn_circular(2, 2).truncate(0), 2).coefficient(1)
    piece = on_circular_orbit(channel, 2, with_reaction=True)
    return piece.coefficient(piece.orders[-1]) / newtonian


def test_inspiral_radial_velocity_is_the_energy_balance_rate():
    # E = -G m mu/(2 r), F = (32/5) G^4 mu^2 m^3/(c^5 r^5) (quadrupole formula, Peters & Mathews,
    # Phys. Rev. 131, 435 (1963), from memory): rdot = -F/(dE/dr) = -(64/5) nu (G m)^3/(c^5 r^3)
    rate = inspiral_radial_velocity().to_sympy().subs(phidot, sp.sqrt(G * m / r**3))
    assert sp.simplify(rate + sp.Rational(64, 5) * nu * (G * m) ** 3 / r**3) == 0


def test_published_two_and_a_half_pn_term_of_the_22_mode():
    # Kidder, Phys. Rev. D 77, 044016 (2008), Hhat_22; Blanchet, Faye, Iyer & Sinha, Class.
    # Quantum Grav. 25, 165003 (2008), Hhat_22 (from memory): the x^(5/2) term
    # -107 pi/21 + (34 pi/21 - 24 i) nu. The 2.5PN term of I_ij is derived
    # (stfalgebra.moments.mass_reaction), so this checks that term too, not only the assembly.
    mode = derive_mode(2, 2, pn_relative=FIVE_HALVES)
    expected = -sp.Rational(107, 21) * sp.pi + (sp.Rational(34, 21) * sp.pi - 24 * sp.I) * nu
    value = mode.series.coefficient(FIVE_HALVES).to_sympy() * mode.constant.to_sympy()
    assert sp.expand(value - expected) == 0
    lower = derive_mode(2, 2, pn_relative=2)
    assert sp.expand(mode.hhat - lower.hhat - expected * x**FIVE_HALVES) == 0     # lower orders unchanged


def test_the_imaginary_part_splits_as_derived_by_hand():
    # by hand on the circle (b = e_x + i e_y harmonics): the derived term -(48/7) i nu; the reaction
    # in the derivatives 4 rdot r omega + 2 r a_lambda -> -16 i nu; the quadratic terms -(8/7) i nu
    # (checked in test_circular_quadratic); the canonical correction 0; total -24 i nu
    derived = reaction_mass_moment_circular(2).channel(2, 0, 0, circular_frequency=True) \
        * (-2 * I * ExactPolynomial("phidot")) ** 2
    assert _in_hhat_22(derived) == -I * NU * Fraction(48, 7)
    assert _in_hhat_22(inspiral_derivative_channel(2, 2)) == -16 * I * NU
    canonical = canonical_correction_channel(2, 2, row=_row("canonical_correction"), orbit="circular")
    assert on_circular_orbit(canonical, 2, with_reaction=True).orders == ()


def test_reaction_rows_refuse_other_moments_and_orbits():
    row = _row("reaction_instantaneous")
    with pytest.raises(ValueError, match="mass moments"):
        reaction_instantaneous_channel(3, 2, row=row, orbit="circular")
    with pytest.raises(ValueError, match="circular"):
        reaction_instantaneous_channel(2, 2, row=row, orbit="general")


@pytest.mark.parametrize("l, m", [(3, 3), (3, 1), (4, 4)])
def test_higher_mass_modes_get_the_derived_reaction_term_of_their_moment(l, m):
    # the instantaneous row at relative 2.5PN for l >= 3: the 2PN part is unchanged and the order
    # 5/2 is the derived term of I_L plus the reaction in the l derivatives
    from stfalgebra.moments.mass_reaction import reaction_mass_moment_circular
    from stfalgebra.radiative.projection import mode_channel

    row = _row("reaction_instantaneous")
    value = reaction_instantaneous_channel(l, m, row=row, orbit="circular")
    two_pn = instantaneous_2pn_circular(l, m)
    assert value.truncate(2) == two_pn.truncate(2)
    p, q, c = mode_channel(l, m)
    odd = reaction_mass_moment_circular(l).channel(p, q, c, circular_frequency=True) \
        * (-m * I * ExactPolynomial("phidot")) ** l
    expected = odd.coefficient(FIVE_HALVES) + inspiral_derivative_channel(l, m).coefficient(FIVE_HALVES)
    assert value.coefficient(FIVE_HALVES) == expected
    assert not odd.coefficient(FIVE_HALVES).is_zero()


def _general_row():
    return _row("reaction_instantaneous_general")


@pytest.mark.parametrize("l, m", [(2, 2), (3, 3)])
def test_general_orbit_reaction_row_extends_the_two_pn_row(l, m):
    from stfalgebra.radiative.circular_reaction import reaction_instantaneous_general_channel
    from stfalgebra.radiative.radiative_moments import instantaneous_channel

    two_pn_row = next(row for row in CONTRIBUTIONS if row.available and row.family == "instantaneous"
                      and "general" in row.orbits and row.known_through == 2 and "mass" in row.kinds)
    value = reaction_instantaneous_general_channel(l, m, row=_general_row(), orbit="general")
    assert value.truncate(2) == instantaneous_channel(l, m, row=two_pn_row, orbit="general").truncate(2)
    assert value.orders[-1] == FIVE_HALVES


@pytest.mark.parametrize("l, m", [(2, 2), (3, 3), (4, 2)])
def test_general_orbit_reaction_row_on_the_inspiralling_circle_is_the_circular_row(l, m):
    # a second route to the circular row: the general-orbit d^l I_L/dt^l at rdot = rdot_RR/c^5,
    # P(r, rdot_RR, omega) = P(r, 0, omega) + rdot_RR dP/drdot(r, 0, omega) + O(c^-10), then Kepler
    from stfalgebra.pnseries import PNSeries
    from stfalgebra.radiative.circular_reaction import reaction_instantaneous_general_channel

    general = reaction_instantaneous_general_channel(l, m, row=_general_row(), orbit="general")
    pieces = {}
    for order in general.orders:
        pieces[int(2 * order)] = general.coefficient(order).substitute({"rdot": 0})
    drift = general.coefficient(0).derivative("rdot").substitute({"rdot": 0}) * inspiral_radial_velocity()
    pieces[5] = pieces.get(5, ExactPolynomial(0)) + drift
    along = PNSeries._from_trusted({k: v for k, v in pieces.items() if not v.is_zero()}, 5)
    circular = reaction_instantaneous_channel(l, m, row=_row("reaction_instantaneous"), orbit="circular")
    difference = on_circular_orbit(along - circular, 2, with_reaction=True)
    assert difference.orders == ()


def test_general_orbit_reaction_row_refuses_other_orbits_and_current_modes():
    from stfalgebra.radiative.circular_reaction import reaction_instantaneous_general_channel

    with pytest.raises(ValueError, match="general orbits"):
        reaction_instantaneous_general_channel(2, 2, row=_general_row(), orbit="circular")
    with pytest.raises(ValueError, match="mass moments"):
        reaction_instantaneous_general_channel(2, 1, row=_general_row(), orbit="general")


def _relative_bracket(plan, l: int, m: int) -> dict:
    """The rows of a plan summed on the inspiralling circle: {relative order: bracket term}."""
    total = None
    for row in plan.rows:
        channel = row.evaluate(l, m, orbit="circular").truncate(FIVE_HALVES)
        if not channel.orders:
            continue
        part = on_circular_orbit(channel, 2, with_reaction=True).shift(-1).map_coefficients(lambda v: v / NU)
        total = part if total is None else total + part
    from stfalgebra.radiative.contributions import leading_order

    n0 = leading_order(l, m)
    lead = total.coefficient(n0).to_sympy()
    return {order - n0: sp.expand_log(sp.expand(total.coefficient(order).to_sympy() / lead), force=True)
            for order in total.orders}


def _assembled_with_canonical(l: int, m: int, canonical):
    """Hhat_lm / (its leading coefficient) through relative 2.5PN on the circle, assembled as
    stfalgebra.radiative.modes does (phase psi), with the missing canonical row of l >= 3 replaced
    by ``canonical`` (an evaluator)."""
    import dataclasses

    from stfalgebra.orders import PNOrder
    from stfalgebra.radiative.contributions import plan_radiative_moment

    table = tuple(dataclasses.replace(row, known_through=PNOrder(5, 2), orbits=("circular",),
                                      origin="test", evaluator=canonical,
                                      needs=(("source moments", 0), ("equations of motion", 0)))
                  if row.family == "canonical moments" and row.l_min == 3 else row for row in CONTRIBUTIONS)
    plan = plan_radiative_moment("mass", l, FIVE_HALVES, "circular", m=m, table=table)
    return _relative_bracket(plan, l, m)


def _minus_shift_part(l, m, *, row, orbit):
    # the Y term (4 G/c^5) l I_<L-1 Y_i_l>^(1) of M_L - I_L: minus the shift's part of I_L
    # (tests/moments/test_mass_reaction.py, the canonical dipole), the W part being zero on circles
    from stfalgebra.moments.mass_reaction import centre_of_mass_shift_part
    from stfalgebra.radiative.projection import mode_channel

    p, q, c = mode_channel(l, m)
    channel = centre_of_mass_shift_part(l).channel(p, q, c, circular_frequency=True)
    return (channel * (-m * I * ExactPolynomial("phidot")) ** l).map_coefficients(lambda v: -v)


def _zero(l, m, *, row, orbit):
    from stfalgebra.pnseries import PNSeries

    return PNSeries._from_trusted({}, 5)


@pytest.mark.parametrize("l, m, published", [
    # Blanchet, Faye, Iyer & Sinha, Class. Quantum Grav. 25, 165003 (2008), Hhat_33 and Hhat_31,
    # the x^3 term of the bracket (relative 2.5PN; from memory)
    (3, 3, -12 * sp.pi + 9 * sp.pi * nu / 2 + sp.I * (sp.Rational(84, 5) - 24 * sp.log(sp.Rational(3, 2))
                                                      + nu * (-sp.Rational(48103, 1215) + 9 * sp.log(sp.Rational(3, 2))))),
    (3, 1, -8 * sp.pi / 3 - 7 * sp.pi * nu / 6 + sp.I * (sp.Rational(56, 15) + 16 * sp.log(2) / 3
                                                         + nu * (-sp.Rational(1, 15) + 7 * sp.log(2) / 3))),
])
def test_octupole_modes_at_two_and_a_half_pn_with_the_canonical_y_term(l, m, published):
    # with the canonical Y term (minus the centre-of-mass shift's part of I_ijk) the derived 2.5PN
    # I_ijk, the reaction in the derivatives, the tails and the quadratic interactions give the
    # published modes; without it the difference is exactly the shift's part
    from stfalgebra.orders import PNOrder

    with_y = _assembled_with_canonical(l, m, _minus_shift_part)[PNOrder(5, 2)]
    assert sp.expand(sp.expand_log(published, force=True) - with_y) == 0
    without = _assembled_with_canonical(l, m, _zero)[PNOrder(5, 2)]
    shift = {3: -sp.Rational(12, 5), 1: -sp.Rational(4, 5)}[m] * sp.I * nu
    assert sp.expand(without - with_y - shift) == 0


# --- the 2.5PN radiation-reaction part of d^l J_L/dt^l (rows of family "radiation reaction") ---

def _current_row(orbit: str):
    return next(row for row in CONTRIBUTIONS if row.available and row.family == "radiation reaction"
                and orbit in row.orbits)


def _two_pn_current_stand_in(l, m, *, row, orbit):
    # the missing 2PN J_L replaced by the 1PN one (even terms: it changes the relative 2PN term of
    # a current mode, not the relative 2.5PN one), declared known through 5/2
    from stfalgebra.pnseries import PNSeries
    from stfalgebra.radiative.radiative_moments import _instantaneous

    value = _instantaneous(l, m, 1, 2, orbit)
    return PNSeries._from_trusted({int(2 * order): value.coefficient(order) for order in value.orders}, 5)


def _assembled_current(l: int, m: int, reaction=None):
    """Hhat_lm / (its leading coefficient) through relative 2.5PN on the circle for a current
    mode, the missing 2PN J_L replaced by :func:`_two_pn_current_stand_in` and, if given, the
    radiation-reaction row's evaluator by ``reaction``."""
    import dataclasses

    from stfalgebra.orders import PNOrder
    from stfalgebra.radiative.contributions import plan_radiative_moment

    def replace(row):
        if row.family == "instantaneous" and row.kinds == ("current",) and not row.available \
                and "2PN current" in row.description:
            return dataclasses.replace(row, known_through=PNOrder(5, 2), orbits=("circular",), origin="test",
                                       evaluator=_two_pn_current_stand_in,
                                       needs=(("source moments", 1), ("equations of motion", 2)))
        if reaction is not None and row.family == "radiation reaction" and row.available:
            return dataclasses.replace(row, evaluator=reaction)
        return row

    table = tuple(replace(row) for row in CONTRIBUTIONS)
    plan = plan_radiative_moment("current", l, FIVE_HALVES, "circular", m=m, table=table)
    assert "radiation reaction" in {row.family for row in plan.rows}
    return _relative_bracket(plan, l, m)


def test_21_mode_at_two_and_a_half_pn_with_the_derived_reaction_terms_of_j_ij():
    # Blanchet, Faye, Iyer & Sinha, Class. Quantum Grav. 25, 165003 (2008), Hhat_21, the x^3 term
    # of the bracket (relative 2.5PN; from memory). Its nu part holds the derived 2.5PN J_ij and
    # the reaction in the derivatives of J_ij (the row tested here), with the tail (1PN J_ij, ADM
    # mass), the quadratic terms of V_ij and the canonical S_ij - J_ij (zero on circles)
    from stfalgebra.orders import PNOrder

    published = (-17 * sp.pi / 28 + 3 * sp.pi * nu / 14
                 + sp.I * (sp.Rational(17, 56) + nu * (-sp.Rational(353, 28) - 3 * sp.log(2) / 7)
                           + 17 * sp.log(2) / 14))
    bracket = _assembled_current(2, 1)
    assert sp.expand(bracket[PNOrder(1)] - (-sp.Rational(17, 28) + 5 * nu / 7)) == 0   # the normalisation
    assert sp.expand(sp.expand_log(published, force=True) - bracket[PNOrder(5, 2)]) == 0
    # without the radiation-reaction row the nu part is off: the row is what the check tests
    without = _assembled_current(2, 1, reaction=_zero)[PNOrder(5, 2)]
    difference = sp.expand(bracket[PNOrder(5, 2)] - without)
    assert difference != 0 and sp.expand(difference.subs(nu, 0)) == 0


def test_current_modes_at_relative_two_and_a_half_pn_use_the_reaction_row():
    # with the 2PN J_L complete, the current modes reach relative 2.5PN on circles, and the
    # radiation-reaction row of J_L is among the rows used
    from stfalgebra.radiative.contributions import maximum_relative_order, plan_radiative_moment

    result = derive_mode(2, 1, orbit="circular", pn_relative=FIVE_HALVES)
    assert result.refused is None
    assert maximum_relative_order("current", 2, "circular") == FIVE_HALVES
    plan = plan_radiative_moment("current", 2, FIVE_HALVES, "circular")
    assert "radiation reaction" in [row.family for row in plan.rows]


@pytest.mark.parametrize("l, m", [(2, 1), (3, 2), (4, 3)])
def test_current_reaction_rows_circular_is_general_on_the_inspiralling_circle(l, m):
    # the circular row against the general-orbit one at rdot = rdot_RR/c^5 (second route, as for
    # I_L above): the Newtonian d^l J_L/dt^l drifts with rdot_RR, the reaction part at rdot = 0
    from stfalgebra.pnseries import PNSeries
    from stfalgebra.radiative.circular_reaction import reaction_current_channel, reaction_current_general_channel
    from stfalgebra.radiative.radiative_moments import instantaneous_channel

    newtonian_row = next(row for row in CONTRIBUTIONS if row.available and row.family == "instantaneous"
                         and row.known_through == Fraction(1, 2))
    newtonian = instantaneous_channel(l, m, row=newtonian_row, orbit="general").coefficient(0)
    general = reaction_current_general_channel(l, m, row=_current_row("general"), orbit="general")
    assert general.orders == (FIVE_HALVES,)
    along = general.coefficient(FIVE_HALVES).substitute({"rdot": 0}) \
        + newtonian.derivative("rdot").substitute({"rdot": 0}) * inspiral_radial_velocity()
    circular = reaction_current_channel(l, m, row=_current_row("circular"), orbit="circular")
    assert not circular.coefficient(FIVE_HALVES).is_zero()
    difference = on_circular_orbit(PNSeries._from_trusted({5: along}, 5) - circular, 2, with_reaction=True)
    assert difference.orders == ()


def test_current_reaction_row_of_the_30_mode_is_zero_on_the_circle():
    from stfalgebra.radiative.circular_reaction import reaction_current_channel

    value = reaction_current_channel(3, 0, row=_current_row("circular"), orbit="circular")
    assert on_circular_orbit(value, 2, with_reaction=True).orders == ()


def test_current_reaction_rows_refuse_mass_modes_and_other_orbits():
    from stfalgebra.radiative.circular_reaction import reaction_current_channel, reaction_current_general_channel

    with pytest.raises(ValueError, match="current modes"):
        reaction_current_channel(2, 2, row=_current_row("circular"), orbit="circular")
    with pytest.raises(ValueError, match="circular"):
        reaction_current_channel(2, 1, row=_current_row("circular"), orbit="general")
    with pytest.raises(ValueError, match="general"):
        reaction_current_general_channel(2, 1, row=_current_row("general"), orbit="circular")
