"""Tests of stfalgebra.moments.spin_moments: the two-body spin parts of the source moments
against the published leading spin parts of the quadrupoles, against the limits where one body is
a Kerr black hole at rest (no spin part beyond J_i) or a test spin, and the aligned-spin views
against the general one."""

from __future__ import annotations

from fractions import Fraction

import pytest

from stfalgebra.exact import ExactPolynomial, engine_symbols, exact
from stfalgebra.moments.pole_dipole import current_spin_part, mass_spin_part
from stfalgebra.moments.spin_moments import (
    ALIGNED_SPIN_BASIS, aligned_spin_current_moment, aligned_spin_mass_moment, aligned_spin_part,
    centre_of_mass_spin_shift, differentiate_along_aligned_orbit, general_spin_part,
)
from stfalgebra.moments.orbit_tensor import OrbitTensor

NU, DELTA = ExactPolynomial("nu"), ExactPolynomial("delta")
X1, X2 = (1 + DELTA) / 2, (1 - DELTA) / 2


def _same(first, second) -> bool:
    return (exact(first) - exact(second)).is_zero()      # the engine reduces delta^2 = 1 - 4 nu


def _in_s_sigma(part, first: dict, second: dict) -> tuple[ExactPolynomial, ExactPolynomial]:
    """Write ``a STF[.. S_1] + b STF[.. S_2]`` as ``alpha STF[.. S] + beta STF[.. Sigma]`` (m = 1)."""
    a, b = part.coefficient(first), part.coefficient(second)
    # a S1 + b S2 = alpha (S1 + S2) + beta (S2/X2 - S1/X1)  =>  beta = nu (b - a), alpha = a + beta/X1
    beta = NU * (b - a)
    alpha = a + (b - a) * X2
    return alpha, beta


def test_current_quadrupole_is_the_published_leading_spin_part():
    # J_ij^S = -(3/2) nu x^<i Sigma^j>: Blanchet, Buonanno & Faye, PRD 74, 104034 (2006), leading
    # term of the current quadrupole's spin part (from memory); equivalently Kidder, PRD 52, 821
    # (1995), Sec. III (from memory)
    alpha, beta = _in_s_sigma(general_spin_part("current", 2), {"x": 1, "S1": 1}, {"x": 1, "S2": 1})
    assert _same(alpha, 0)
    assert _same(beta, -Fraction(3, 2) * NU)


def test_mass_quadrupole_is_the_published_leading_spin_part():
    # I_ij^S = (nu/c^2) [ (8/3) x^<i (v x xi)^j> - (4/3) v^<i (x x xi)^j> ], xi = S + delta Sigma
    # (Kidder 1995, Sec. III; Blanchet, Buonanno & Faye 2006; both from memory)
    part = general_spin_part("mass", 2)
    assert part.inverse_c_power == 2
    alpha, beta = _in_s_sigma(part, {"x": 1, "v_cross_S1": 1}, {"x": 1, "v_cross_S2": 1})
    assert _same(alpha, Fraction(8, 3) * NU) and _same(beta, Fraction(8, 3) * NU * DELTA)
    alpha, beta = _in_s_sigma(part, {"v": 1, "x_cross_S1": 1}, {"v": 1, "x_cross_S2": 1})
    assert _same(alpha, -Fraction(4, 3) * NU) and _same(beta, -Fraction(4, 3) * NU * DELTA)
    assert len(part.terms) == 4


def test_centre_of_mass_shift_and_vanishing_dipole():
    # y_1 = X2 x + (nu/(m c^2)) v x Sigma (Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 11.2,
    # from memory): delta_y = nu v x Sigma = -X2 v x S1 + X1 v x S2 (m = 1)
    shift = centre_of_mass_spin_shift()
    assert _same(shift["v_cross_S1"], -X2) and _same(shift["v_cross_S2"], X1)
    assert general_spin_part("mass", 1).terms == {}
    assert general_spin_part("current", 1).coefficient({"S1": 1}) == 1     # J_i^S = S_1 + S_2
    assert general_spin_part("current", 1).coefficient({"S2": 1}) == 1


@pytest.mark.parametrize("l", range(2, 9))
def test_heavy_body_at_rest_has_no_spin_part_beyond_the_dipole(l):
    # m2 -> 0 (delta = 1, nu = 0): body 1 is a Kerr black hole at rest at the origin, whose
    # linearised field has J_i = S and no other spin moment (common practice)
    for kind in ("mass", "current"):
        part = general_spin_part(kind, l)
        for key, value in part.terms.items():
            if key[2] or key[4] or key[6]:          # S1, x_cross_S1, v_cross_S1
                assert value.substitute({"delta": 1, "nu": 0}).is_zero(), (kind, l, key)


@pytest.mark.parametrize("l", range(2, 9))
def test_test_spin_is_one_particle_at_minus_x(l):
    # m2 -> 0: body 2's spin terms are the one-particle pole-dipole tensor at y = -x, v_2 = -v
    # (every y and v flips sign; the scalars y.y, y.v do not)
    limit = {"delta": 1, "nu": 0}
    for kind, one in (("current", current_spin_part(l)), ("mass", mass_spin_part(l))):
        part = general_spin_part(kind, l)
        for (vectors, scalars), value in one.terms.items():
            assert not any(scalars)
            y, v, spin, y_cross, v_cross = vectors
            key = {"x": y, "v": v, "S2": spin, "x_cross_S2": y_cross, "v_cross_S2": v_cross}
            sign = (-1) ** (y + v + y_cross + v_cross)
            assert part.coefficient(key).substitute(limit) == ExactPolynomial(value * sign), (kind, l, key)


def test_aligned_view_matches_the_general_one():
    # J_ij^S for aligned spins: -(3/2) nu x^<i Sigma^j> with Sigma = (G m^2/c) sigma_l e_z
    s = engine_symbols()
    part = aligned_spin_part("current", 2)
    value = part.terms[(1, 0, 0, 1, 0, 0)].coefficient(Fraction(1, 2))
    sigma = X2 * ExactPolynomial("chi2") - X1 * ExactPolynomial("chi1")
    assert _same(value, -Fraction(3, 2) * NU * s.G * s.m**2 * sigma)
    assert set(aligned_spin_mass_moment(2).terms) == {(2, 0, 0, 0, 0, 0), (0, 2, 0, 0, 0, 0), (1, 1, 0, 0, 0, 0),
                                                     (1, 0, 0, 0, 0, 1), (0, 1, 0, 0, 1, 0)}
    assert str(aligned_spin_current_moment(3).terms[(2, 0, 0, 1, 0, 0)].orders[0]) == "1/2"


def test_aligned_orbit_derivative_of_x_is_the_cited_acceleration():
    # d^2 x/dt^2 = a; on a circle (rdot = 0) the x cross e_z part (tangential) vanishes and the
    # radial part gives r phidot^2 = G m/r^2 (1 + ...): check the Newtonian piece and that the
    # tangential spin-orbit part is proportional to rdot (Kidder 1995, eq. (2.2c), from memory)
    s = engine_symbols()
    x = OrbitTensor.monomial(1, (1, 0, 0, 0, 0, 0), basis=ALIGNED_SPIN_BASIS)
    second = differentiate_along_aligned_orbit(x, 2).terms
    assert second[(1, 0, 0, 0, 0, 0)].coefficient(0) == -s.G * s.m * s.r**-3
    tangential = second[(0, 0, 0, 0, 1, 0)].coefficient(Fraction(3, 2))
    assert tangential.substitute({"rdot": 0}).is_zero() and not tangential.is_zero()


def test_bad_input():
    with pytest.raises(ValueError):
        general_spin_part("charge", 2)
    with pytest.raises(ValueError):
        general_spin_part("mass", 0)
    with pytest.raises(ValueError):
        differentiate_along_aligned_orbit(OrbitTensor.monomial(1, (1, 0, 0, 0, 0, 0), basis=ALIGNED_SPIN_BASIS), -1)
