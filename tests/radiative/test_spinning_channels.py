"""Tests of stfalgebra.radiative.spinning_channels through the modes with aligned spins
(derive_mode(..., spins="aligned")): published spin-orbit mode terms, the test-mass limit, the
non-spinning limit, the planar symmetry, and the table's refusals."""

from __future__ import annotations

from fractions import Fraction

import pytest

import sympy as sp

from stfalgebra.errors import OrderBeyondInputsError
from stfalgebra.exact import ExactPolynomial
from stfalgebra.orders import PNOrder
from stfalgebra.radiative.contributions import SPIN_ORBIT_CONTRIBUTIONS
from stfalgebra.radiative.modes import derive_mode
from stfalgebra.radiative.spinning_channels import spinning_instantaneous_channel

I, NU, DELTA = ExactPolynomial("I"), ExactPolynomial("nu"), ExactPolynomial("delta")
CHI1, CHI2 = ExactPolynomial("chi1"), ExactPolynomial("chi2")
CHI_S, CHI_A = (CHI1 + CHI2) / 2, (CHI1 - CHI2) / 2
X1, X2 = (1 + DELTA) / 2, (1 - DELTA) / 2
SIGMA = X2 * CHI2 - X1 * CHI1                      # c Sigma_l/(G m^2)
NO_SPIN = {"chi1": 0, "chi2": 0}


def _term(l, m, pn, order):
    """The coefficient of x^order in Hhat_lm, the surd constant multiplied in (sympy)."""
    result = derive_mode(l, m, pn=pn, spins="aligned")
    return sp.expand(result.constant.to_sympy() * result.series.coefficient(PNOrder(order)).to_sympy())


def _same(value, expected: ExactPolynomial) -> bool:
    """Equal in the engine (which reduces delta^2 = 1 - 4 nu)."""
    return (exact_from(value) - expected).is_zero()


def exact_from(value) -> ExactPolynomial:
    return ExactPolynomial.from_sympy(value)


def test_h21_spin_term_is_published():
    # Hhat_21 = (i/3) [delta x^(1/2) - (3/2) x (chi_a + delta chi_s)] (Arun, Buonanno, Faye &
    # Ochsner, PRD 79, 104023 (2009), the (2,1) mode; from memory); chi_a + delta chi_s = -sigma
    value = _term(2, 1, 1, Fraction(1))
    assert _same(value, I / 3 * (-Fraction(3, 2)) * (CHI_A + DELTA * CHI_S))
    assert _same(value, I * SIGMA / 2)


def test_h22_spin_term_is_published_and_has_the_kerr_test_mass_limit():
    # Hhat_22 at x^(3/2): 2 pi - (4/3) [(1 - nu) chi_s + delta chi_a] (Arun et al. 2009, (2,2) mode;
    # from memory); test-mass limit 2 pi - 4 q/3 (black-hole perturbation theory, Tagoshi & Sasaki
    # 1994 / Tagoshi, Shibata, Tanaka & Sasaki 1996, from memory)
    value = _term(2, 2, Fraction(3, 2), Fraction(3, 2))
    pi = ExactPolynomial("pi")
    assert _same(value, 2 * pi - Fraction(4, 3) * ((1 - NU) * CHI_S + DELTA * CHI_A))
    assert exact_from(value).substitute({"nu": 0, "delta": 1}) == 2 * pi - Fraction(4, 3) * CHI1


def test_h32_spin_term_is_published():
    # Hhat_32 = (1/3) sqrt(5/7) [(1 - 3 nu) x + 4 nu chi_s x^(3/2)] (Arun et al. 2009; from memory)
    value, lead = _term(3, 2, Fraction(3, 2), Fraction(3, 2)), _term(3, 2, Fraction(3, 2), 1)
    norm = sp.sqrt(sp.Rational(5, 7)) / 3
    assert sp.expand(lead - norm * (1 - 3 * NU).to_sympy()) == 0
    assert sp.expand(value - norm * (4 * NU * CHI_S).to_sympy()) == 0


@pytest.mark.parametrize("l", range(2, 9))
def test_without_spins_every_mode_is_the_non_spinning_one(l):
    # each mode to the highest relative order the table serves with spins: current modes 1,
    # mass modes 3/2 (l <= 4; from l = 5 the quadratic interactions at 3/2 are not available)
    for m in range(1, l + 1):
        current = (l + m) % 2 == 1
        relative = Fraction(1) if current or l > 4 else Fraction(3, 2)
        pn = Fraction(l - 1 if current else l - 2, 2) + relative
        spinning = derive_mode(l, m, pn=pn, spins="aligned")
        plain = derive_mode(l, m, pn=pn)
        difference = spinning.series - plain.series
        assert spinning.constant == plain.constant
        for order in difference.orders:
            assert difference.coefficient(order).substitute(NO_SPIN).is_zero(), (l, m, order)


@pytest.mark.parametrize("l", range(2, 9))
def test_current_modes_get_a_spin_term_at_relative_half(l):
    # the spin part of J_L ((l+1)/2 sum_A y_A^<L-1} S_A^{i_l>}) feeds the current modes at
    # relative 0.5PN, with both spins
    m = l - 1
    n0 = Fraction(l - 1, 2)
    result = derive_mode(l, m, pn=n0 + Fraction(1, 2), spins="aligned")
    term = result.series.coefficient(PNOrder(n0 + Fraction(1, 2)))
    assert term.has("chi1") and term.has("chi2")


def test_negative_m_is_the_planar_symmetry():
    for l, m in ((2, 1), (2, 2), (3, 2)):
        plus = derive_mode(l, m, pn=Fraction(3, 2), spins="aligned")
        minus = derive_mode(l, -m, pn=Fraction(3, 2), spins="aligned")
        assert minus.constant == plus.constant * (-1) ** l
        for order in plus.series.orders:
            assert minus.series.coefficient(order) == plus.series.coefficient(order).conjugate()


def test_refusals_name_the_missing_spin_terms():
    with pytest.raises(OrderBeyondInputsError, match="next-to-leading spin-orbit terms of the current"):
        derive_mode(2, 1, pn=2, spins="aligned")
    with pytest.raises(OrderBeyondInputsError, match="spin-spin terms"):
        derive_mode(2, 2, pn=2, spins="aligned")
    with pytest.raises(OrderBeyondInputsError, match="tail"):
        derive_mode(2, 2, pn=Fraction(3, 2), spins="aligned", orbit="general")
    with pytest.raises(ValueError, match="spins must be"):
        derive_mode(2, 2, pn=1, spins="precessing")
    with pytest.raises(ValueError):
        spinning_instantaneous_channel(2, 2, row=SPIN_ORBIT_CONTRIBUTIONS[0], orbit="eccentric")


def test_json_names_the_spins_only_when_asked():
    assert derive_mode(2, 2, pn=1, spins="aligned").to_json()["spins"] == "aligned"
    assert "spins" not in derive_mode(2, 2, pn=1).to_json()


@pytest.mark.parametrize("l, m", [(2, 1), (2, 2), (3, 2), (3, 3), (4, 3)])
def test_general_orbit_channel_has_the_circular_limit(l, m):
    # the general-orbit channel (l derivatives along the aligned-spin orbit) put on the circular
    # orbit (rdot = 0 and the spinning r(x), phidot = omega) is the circular channel (-i m omega)^l
    from stfalgebra.binary.spin_circular import spinning_circular_reduction

    row = SPIN_ORBIT_CONTRIBUTIONS[0]
    general, scale_g = spinning_circular_reduction(spinning_instantaneous_channel(l, m, row=row, orbit="general"))
    circular, scale_c = spinning_circular_reduction(spinning_instantaneous_channel(l, m, row=row, orbit="circular"))
    assert scale_g == scale_c
    through = min(general.known_through, circular.known_through)
    assert through >= circular.leading_order + Fraction(1, 2)
    difference = (general - circular).truncate(through)
    assert all(difference.coefficient(order).is_zero() for order in difference.orders)
    assert any(circular.coefficient(order).has("chi1") for order in circular.truncate(through).orders) \
        or (l + m) % 2 == 0


def test_general_orbit_h21_reduces_to_the_circular_mode():
    # Hhat_lm(general) = 2 x c^2 Hhat_lm(circular) on the circle (conventions), G = m = 1: the spin
    # term (c^-2 in the general series) is Newtonian in r, so r = 1/(x c^2) suffices there
    general = derive_mode(2, 1, pn=1, orbit="general", spins="aligned")
    circular = derive_mode(2, 1, pn=1, spins="aligned")
    assert general.constant == circular.constant * 2
    c, x = sp.symbols("c x", positive=True)
    value = general.series.coefficient(PNOrder(1)).substitute({"m": 1}).to_sympy() / c**2
    radius = [symbol for symbol in value.free_symbols if symbol.name == "r"]
    on_circle = value.subs(radius[0], 1 / (x * c**2))
    expected = x * c**2 * x * circular.series.coefficient(PNOrder(1)).to_sympy()
    assert sp.expand(on_circle - expected) == 0


def test_general_orbit_negative_m_is_the_direct_derivation():
    # aligned spins keep the orbit planar: the symmetry Hhat_{l,-m} = (-1)^l conj(Hhat_lm) that
    # derive_mode uses must match the direct derivation of the m < 0 channel
    from stfalgebra.radiative.modes import _direct_mode

    for l, m in ((2, -1), (3, -2)):
        pn = Fraction(l - 1, 2) + Fraction(1, 2)
        by_symmetry = derive_mode(l, m, pn=pn, orbit="general", spins="aligned")
        direct = _direct_mode(l, m, pn=pn, orbit="general", spins="aligned")
        assert direct.hhat.has(sp.Symbol("chi1", real=True))
        assert sp.expand(by_symmetry.hhat - direct.hhat) == 0, (l, m)
