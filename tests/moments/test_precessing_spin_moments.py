"""Moments with spins of any direction over a vector basis (stfalgebra/moments/precessing_spin_moments.py)."""

from fractions import Fraction

import pytest

from stfalgebra.binary.precessing_dynamics import SPIN_COMPONENTS, PrecessingOrbitDerivative, general_spin_acceleration
from stfalgebra.exact import ExactPolynomial, engine_symbols
from stfalgebra.moments.orbit_tensor import OrbitTensor
from stfalgebra.moments.precessing_spin_moments import (
    PRECESSING_BASIS, VectorCombination, _cross, _dot, differentiate_along_precessing_orbit,
    precessing_derivative_rules, precessing_spin_part,
)
from stfalgebra.moments.spin_moments import aligned_spin_part
from stfalgebra.pnseries import PNSeries

S = engine_symbols()
NAMES = PRECESSING_BASIS.names
HALF, THREE_HALVES = Fraction(1, 2), Fraction(3, 2)


def _key(**vectors):
    return tuple(vectors.get(name, 0) for name in NAMES)


def _linear_in_spins(value: ExactPolynomial) -> ExactPolynomial:
    """The part of degree <= 1 in the spin components."""
    total = ExactPolynomial(0)
    for monomial, rational in value.terms():
        if sum(e for name, e in monomial.items() if name in SPIN_COMPONENTS) <= 1:
            term = ExactPolynomial(rational)
            for name, e in monomial.items():
                term = term * ExactPolynomial(name) ** e
            total = total + term
    return total


def test_quadrupoles_are_the_published_leading_spin_parts():
    # Kidder, Phys. Rev. D 52, 821 (1995), Sec. III (equation numbers from memory):
    # J_ij^S = -(3/2) nu x^<i Sigma^j>, I_ij^S = (nu/c^2)[(8/3) x^<i (v x xi)^j> - (4/3) v^<i (x x xi)^j>],
    # xi = S + delta Sigma. With S_A = (G m^2 X_A^2/c) chi_A: Sigma = (G m^2/c)(X2 chi2 - X1 chi1) and
    # xi = (G m^2/c) nu (chi1 + chi2).
    x1, x2 = (1 + S.delta) / 2, (1 - S.delta) / 2
    gm2 = S.G * S.m**2
    current, mass = precessing_spin_part("current", 2), precessing_spin_part("mass", 2)
    assert len(current.terms) == 2 and len(mass.terms) == 4
    checks = [
        (current.terms[_key(x=1, chi1=1)].coefficient(HALF), Fraction(3, 2) * S.nu * x1 * gm2),
        (current.terms[_key(x=1, chi2=1)].coefficient(HALF), -Fraction(3, 2) * S.nu * x2 * gm2),
    ]
    for a in (1, 2):
        checks += [
            (mass.terms[_key(x=1, **{f"v_cross_chi{a}": 1})].coefficient(THREE_HALVES),
             Fraction(8, 3) * S.nu**2 * gm2),
            (mass.terms[_key(v=1, **{f"x_cross_chi{a}": 1})].coefficient(THREE_HALVES),
             -Fraction(4, 3) * S.nu**2 * gm2),
        ]
    for derived, published in checks:
        assert (derived - published).is_zero(), (derived, published)


@pytest.mark.parametrize("kind", ["mass", "current"])
@pytest.mark.parametrize("l", [2, 3, 4])
def test_aligned_spins_give_the_aligned_spin_part(kind, l):
    # chi_A = chi_A e_z on the aligned basis: the two views have the same channels
    general = precessing_spin_part(kind, l)
    aligned = aligned_spin_part(kind, l)
    values = {"chi1_n": 0, "chi1_lambda": 0, "chi2_n": 0, "chi2_lambda": 0,
              "chi1_ell": ExactPolynomial("chi1"), "chi2_ell": ExactPolynomial("chi2")}
    for p in range(l + 1):
        for c in range(l + 1 - p):
            q = l - p - c
            mine = general.channel(p, q, c).map_coefficients(lambda v: v.substitute(values))
            assert (mine - aligned.channel(p, q, c)).orders == ()


def test_vector_rules_agree_with_the_components_on_the_turning_triad():
    # d(V.k)/dt from the rules over the basis equals the derivative of V's components on
    # (Z+, Z-, u_z) plus the turning of the triad: phidot about ell, and (a.ell)/(r phidot)
    # about n (the tilt, which enters V = v and V = ell through their components r phidot, r^2 phidot);
    # compared through the spin-linear terms (the rules leave spin-spin terms out)
    derivative = PrecessingOrbitDerivative()
    rules = precessing_derivative_rules()
    components = dict(zip(NAMES, PRECESSING_BASIS.components))
    a_ell = general_spin_acceleration()[2]
    for name in NAMES:
        via_rules = [PNSeries._from_trusted({}, 3)] * 3
        for target, weight in rules[name].items():
            via_rules = [via_rules[i] + weight * components[target][i] for i in range(3)]
        plus, minus, along = components[name]
        turning = [{0: -S.I * S.phidot * plus}, {0: S.I * S.phidot * minus}, {}]
        if name == "v":
            turning[2] = {3: a_ell}
        if name == "ell":
            turning[0][3] = S.I * S.r * a_ell / 2
            turning[1][3] = -S.I * S.r * a_ell / 2
        for i, value in enumerate((plus, minus, along)):
            direct = derivative(PNSeries._from_trusted({0: value}, 10)) + PNSeries._from_trusted(turning[i], 10)
            difference = (via_rules[i] - direct).truncate(THREE_HALVES)
            for order in difference.orders:
                assert _linear_in_spins(difference.coefficient(order)).is_zero(), (name, i, order)


def test_precession_rule_keeps_the_spin_magnitude():
    # d(chi.chi)/dt = 2 chi.(Omega x chi) = 0 with the derived rule (scalar products on the triad)
    rules = precessing_derivative_rules()
    for a in (1, 2):
        chi = VectorCombination({f"chi{a}": 1})
        rate = VectorCombination({name: series.coefficient(1) for name, series in rules[f"chi{a}"].items()})
        assert rate.terms and _dot(chi, rate).is_zero()


def test_x_cross_v_is_ell_and_the_triple_product_rule():
    x, v, chi = VectorCombination({"x": 1}), VectorCombination({"v": 1}), VectorCombination({"chi1": 1})
    assert _cross(x, v).terms.keys() == {"ell"}
    # x cross (x cross chi) = x (x.chi) - r^2 chi
    nested = _cross(x, _cross(x, chi))
    assert (nested.terms["chi1"] + S.r**2).is_zero()
    with pytest.raises(ArithmeticError, match="quadratic in the spins"):
        _cross(chi, VectorCombination({"chi2": 1}))


def test_bad_input():
    tensor = OrbitTensor.monomial(1, _key(x=1), basis=PRECESSING_BASIS)
    with pytest.raises(ValueError, match="non-negative int"):
        differentiate_along_precessing_orbit(tensor, -1)
    with pytest.raises(ValueError, match="precessing basis"):
        differentiate_along_precessing_orbit(OrbitTensor.monomial(1, (1, 0, 0)), 1)
