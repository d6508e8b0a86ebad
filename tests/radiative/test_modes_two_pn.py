"""Circular mass modes through relative 2PN: the 2PN mass moments of every l wired into the modes
through the table of contributions, checked against the published amplitudes and the test-mass
limit of black-hole perturbation theory; refusals where a contribution is missing.

The search tool reaches only the papers' abstracts, so every published value here is recalled
from memory and marked so.
"""

from __future__ import annotations

import pytest
import sympy as sp

from stfalgebra.errors import OrderBeyondInputsError
from stfalgebra.radiative.contributions import leading_order, maximum_relative_order, plan_radiative_moment
from stfalgebra.radiative.modes import derive_mode
from stfalgebra.symbols import delta, nu, x

LN2 = sp.log(2)
R = sp.Rational

# Blanchet, Faye, Iyer & Sinha, Class. Quantum Grav. 25, 165003 (2008), Sec. 9 (the modes H^lm,
# eq. (9.4)), and Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 9.5; from memory (equation
# numbers too). Each entry: the leading factor and the bracket through relative 2PN, as a
# polynomial in x relative to the leading power.
PUBLISHED = {
    (2, 2): (sp.Integer(1), 0,
             1 + x * (-R(107, 42) + R(55, 42) * nu) + 2 * sp.pi * x**R(3, 2)
             + x**2 * (-R(2173, 1512) - R(1069, 216) * nu + R(2047, 1512) * nu**2)),
    (3, 3): (-R(3, 4) * sp.I * sp.sqrt(R(15, 14)) * delta, R(1, 2),
             1 + x * (-4 + 2 * nu) + x**R(3, 2) * (3 * sp.pi + sp.I * (-R(21, 5) + 6 * sp.log(R(3, 2))))
             + x**2 * (R(123, 110) - R(1838, 165) * nu + R(887, 330) * nu**2)),
    (3, 1): (sp.I * delta / (12 * sp.sqrt(14)), R(1, 2),
             1 + x * (-R(8, 3) - R(2, 3) * nu) + x**R(3, 2) * (sp.pi + sp.I * (-R(7, 5) - 2 * LN2))
             + x**2 * (R(607, 198) - R(136, 99) * nu - R(247, 198) * nu**2)),
    (4, 4): (-R(8, 9) * sp.sqrt(R(5, 7)) * (1 - 3 * nu), 1,
             1 + x * (-R(593, 110) + R(1273, 66) * nu - R(175, 22) * nu**2) / (1 - 3 * nu)
             + x**R(3, 2) * (4 * sp.pi + sp.I * (-R(42, 5) + R(1193, 40) * nu + 8 * LN2 * (1 - 3 * nu)) / (1 - 3 * nu))
             + x**2 * (R(1068671, 200200) - R(1088119, 28600) * nu + R(146879, 2340) * nu**2
                       - R(226097, 17160) * nu**3) / (1 - 3 * nu)),
    (4, 2): (sp.sqrt(5) / 63 * (1 - 3 * nu), 1,
             1 + x * (-R(437, 110) + R(805, 66) * nu - R(19, 22) * nu**2) / (1 - 3 * nu)
             + x**R(3, 2) * (2 * sp.pi + sp.I * (-R(21, 5) + R(84, 5) * nu) / (1 - 3 * nu))
             + x**2 * (R(1038039, 200200) - R(606751, 28600) * nu + R(400453, 25740) * nu**2
                       + R(25783, 17160) * nu**3) / (1 - 3 * nu)),
}


def _hhat(l: int, m: int) -> sp.Expr:
    return derive_mode(l, m, orbit="circular", pn_relative=2).hhat


@pytest.mark.parametrize("lm", sorted(PUBLISHED))
def test_mass_modes_through_relative_two_pn_match_the_published_amplitudes(lm):
    prefactor, lead, bracket = PUBLISHED[lm]
    expected = sp.expand(prefactor * x**lead * bracket)
    difference = sp.expand(sp.expand_log(_hhat(*lm) - expected, force=True))
    assert sp.simplify(difference) == 0


# Tagoshi & Sasaki, Prog. Theor. Phys. 92, 745 (1994), the test-mass luminosity of each (l, |m|)
# relative to the Newtonian quadrupole, eta_lm in v = x^(1/2), from memory:
TEST_MASS_POWER = {
    (2, 2): 1 - R(107, 21) * x + 4 * sp.pi * x**R(3, 2) + R(4784, 1323) * x**2,
    (3, 3): R(1215, 896) * x - R(1215, 112) * x**2 + R(3645, 448) * sp.pi * x**R(5, 2) + R(243729, 9856) * x**3,
    (3, 1): R(1, 8064) * x - R(1, 1512) * x**2 + sp.pi / 4032 * x**R(5, 2) + R(437, 266112) * x**3,
    (4, 4): R(1280, 567) * x**2 - R(151808, 6237) * x**3,
    (4, 2): R(5, 3969) * x**2 - R(437, 43659) * x**3,
    # current modes (served through relative 2PN once the 2PN J_L are complete)
    (2, 1): R(1, 36) * x - R(17, 504) * x**2,
    (3, 2): R(5, 63) * x**2 - R(193, 567) * x**3,
}


@pytest.mark.parametrize("lm", sorted(TEST_MASS_POWER))
def test_test_mass_limit_of_the_mode_power(lm):
    # the power of the modes (l, m) and (l, -m) relative to (32/5) nu^2 x^5 (c^5/G) is
    # (m^2/4) |Hhat_lm|^2 (from F = (R^2 c^3/(16 pi G)) sum |dh_lm/dt|^2, conventions.md);
    # at nu -> 0 (delta -> 1) it is the black-hole-perturbation eta_lm
    l, m = lm
    hhat = _hhat(l, m).subs({nu: 0, delta: 1})
    power = sp.expand(sp.Rational(m * m, 4) * hhat * sp.conjugate(hhat))
    root = sp.Symbol("root", positive=True)                   # sqrt(x)
    in_root = sp.expand(power.subs(x, root**2))
    expected = sp.expand(TEST_MASS_POWER[lm].subs(x, root**2))
    # every power through the last recalled one (relative 2PN for l = 2, 3; relative 1PN for
    # l = 4, whose 2PN terms are checked against the published modes above), except the
    # tail's odd power for l = 4, whose eta_lm coefficient is not recalled
    through = sp.Poly(expected, root).degree()
    compared = [k for k in range(through + 1) if k % 2 == 0 or expected.coeff(root, k) != 0]
    for k in compared:
        assert sp.simplify(sp.expand_log(in_root.coeff(root, k) - expected.coeff(root, k), force=True)) == 0, k


def test_minus_m_from_the_symmetry_at_two_pn():
    # planar orbits: h_{l,-m} = (-1)^l conj(h_lm) (conventions.md)
    for l, m in ((2, 2), (3, 1)):
        assert sp.expand(derive_mode(l, -m, pn_relative=2).hhat - (-1)**l * sp.conjugate(_hhat(l, m))) == 0


@pytest.mark.parametrize("lm", [(2, 2), (3, 3), (3, 1), (4, 4), (4, 2)])
def test_the_two_pn_mass_moment_row_is_used(lm):
    plan = plan_radiative_moment("mass", lm[0], 2, "circular")
    assert plan.input_order("source moments") == 2 and plan.input_order("equations of motion") == 2
    # the mass moments go on to 2.5PN (their reaction, canonical and quadratic rows; the canonical
    # M_L - I_L for l >= 4 derived by the iteration with the gauge vector)
    assert maximum_relative_order("mass", lm[0], "circular") == R(5, 2)


def test_current_modes_are_served_through_two_and_a_half_pn_and_refused_beyond():
    # the 2PN J_L are complete (tests/radiative/test_current_modes_two_pn.py compares them with the
    # published values) and their 2.5PN radiation-reaction terms are rows of the table
    assert derive_mode(2, 1, pn_relative=2).refused is None
    assert derive_mode(2, 1, pn_relative=R(5, 2)).refused is None
    with pytest.raises(OrderBeyondInputsError, match="instantaneous contribution beyond relative 5/2") as info:
        derive_mode(2, 1, pn_relative=3)
    assert "through relative 2.5PN" in str(info.value)


@pytest.mark.parametrize("l", [5, 6, 7, 8])
def test_higher_mass_modes_are_served_with_the_derived_quadratic_interactions(l):
    # the 2PN moment is there for every l, and the quadratic interactions entering at relative
    # 1.5PN are derived by the MPM iteration for l <= 8 (no new interaction at relative 2PN)
    result = derive_mode(l, l, pn_relative=2)
    assert result.refused is None and result.series.known_through == leading_order(l, l) + 2
    assert any(line.startswith("quadratic terms of U_L") for line in result.provenance)


def test_mass_modes_beyond_two_and_a_half_pn_are_refused():
    # the 2.5PN term of I_L is derived (stfalgebra.moments.mass_reaction), and so is the canonical
    # M_L - I_L (stfalgebra.mpm.gauge_interactions): (4,4) is served through relative 2.5PN and
    # refused beyond
    assert derive_mode(4, 4, pn_relative=R(5, 2)).refused is None
    with pytest.raises(OrderBeyondInputsError, match="2.5PN") as info:
        derive_mode(4, 4, pn_relative=3)
    assert "through relative 2.5PN" in str(info.value)
    with pytest.raises(OrderBeyondInputsError, match="2.5PN") as info:
        derive_mode(2, 2, pn_relative=3)
    assert "through relative 2.5PN" in str(info.value)
