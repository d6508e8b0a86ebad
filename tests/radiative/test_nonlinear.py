"""Tests of stfalgebra/radiative/nonlinear.py: STF products, the eps-product, the quadratic
interactions of U_ijkl and V_ijk on circular orbits, the derived quadratic terms against their published forms,
and the derived memory integral of one harmonic (tails.hereditary_harmonic_integral)."""

from __future__ import annotations

import mpmath as mp
import pytest
import sympy as sp
from hypothesis import example, given, settings, strategies as st

from stfalgebra.orders import PNOrder
from stfalgebra.errors import OrderBeyondInputsError, RefusedModeError
from stfalgebra.moments.orbit_tensor import OrbitTensor
from stfalgebra.radiative.nonlinear import (
    cross_product,
    quadratic_channel_circular,
    quadratic_terms,
    quadratic_instantaneous_tensor,
    symmetric_product,
)
from stfalgebra.radiative.tails import hereditary_harmonic_integral
from stfalgebra.stf.cartesian import PROBE, harmonic_part_cartesian
from stfalgebra.symbols import G, c, m, nu, omega, r

K1, K2, K3 = PROBE
K = sp.Matrix(PROBE)


# ----------------------------------------------------------------------------- helpers
def _cartesian(tensor: OrbitTensor, xv, vv) -> sp.Expr:
    """Probe polynomial of a orbit tensor with exact coefficients for given x, v (3-vectors)."""
    ell = xv.cross(vv)
    X, V, L = (xv.dot(K), vv.dot(K), ell.dot(K))
    total = sp.Integer(0)
    for (a, b, cc), series in tensor.terms.items():
        total += series.coefficient(0) * X**a * V**b * L**cc
    return sp.expand(total)


small = st.integers(min_value=-3, max_value=3)
planar_vectors = st.tuples(small, small, small, small).filter(
    lambda q: q[0] * q[3] - q[1] * q[2] != 0)          # x, v not parallel
xv_monomials = st.tuples(st.integers(0, 3), st.integers(0, 3)).filter(lambda ab: sum(ab) >= 1)


def _vectors(q):
    return sp.Matrix([q[0], q[1], 0]), sp.Matrix([q[2], q[3], 0])


# ----------------------------------------------------------------------------- products
@settings(max_examples=15, deadline=None)
@given(first=xv_monomials, second=xv_monomials, vectors=planar_vectors)
@example(first=(1, 0), second=(1, 0), vectors=(1, 0, 0, 1))
def test_symmetric_product_is_the_stf_part_of_the_tensor_product(first, second, vectors):
    # A_<L B_K> k_LK is the harmonic part of A(k) B(k), with A and B replaced by their STF
    # parts or not (trace terms carry k^2): Thorne 1980 sec. II (common practice).
    xv, vv = _vectors(vectors)
    A = OrbitTensor.monomial(sum(first), (*first, 0), 2)
    B = OrbitTensor.monomial(sum(second), (*second, 0), -3)
    rank = A.rank + B.rank
    product = _cartesian(symmetric_product(A, B), xv, vv)
    stf_a = harmonic_part_cartesian(_cartesian(A, xv, vv), A.rank)
    stf_b = harmonic_part_cartesian(_cartesian(B, xv, vv), B.rank)
    expected = harmonic_part_cartesian(sp.expand(stf_a * stf_b), rank)
    assert sp.expand(harmonic_part_cartesian(product, rank) - expected) == 0


@settings(max_examples=15, deadline=None)
@given(first=xv_monomials, second=xv_monomials, vectors=planar_vectors)
@example(first=(1, 0), second=(0, 1), vectors=(1, 0, 0, 1))
@example(first=(2, 0), second=(1, 1), vectors=(2, -1, 1, 3))
def test_cross_product_matches_explicit_levi_civita_contraction(first, second, vectors):
    # eps_abi A_(P-1)a B_(Q-1)b k_(P-1) k_(Q-1) k_i = k . (u x w), u_a = A_(P-1)a k_(P-1) =
    # (1/p) dA/dk_a: computed here by Cartesian differentiation of the STF polynomials and an
    # explicit cross product (common practice), then STF-projected.
    xv, vv = _vectors(vectors)
    A = OrbitTensor.monomial(sum(first), (*first, 0))
    B = OrbitTensor.monomial(sum(second), (*second, 0))
    rank = A.rank + B.rank - 1
    stf_a = harmonic_part_cartesian(_cartesian(A, xv, vv), A.rank)
    stf_b = harmonic_part_cartesian(_cartesian(B, xv, vv), B.rank)
    u = sp.Matrix([sp.diff(stf_a, k) for k in PROBE]) / A.rank
    w = sp.Matrix([sp.diff(stf_b, k) for k in PROBE]) / B.rank
    explicit = sp.expand(K.dot(u.cross(w)))
    derived = _cartesian(cross_product(A, B), xv, vv)
    assert sp.expand(harmonic_part_cartesian(derived, rank)
                     - harmonic_part_cartesian(explicit, rank)) == 0


def test_cross_product_is_antisymmetric_and_refuses_ell_factors():
    # eps_ab<i A_ja B_k>b = -eps_ab<i B_ja A_k>b for rank-2 A, B (common practice)
    A = OrbitTensor(2, {(2, 0, 0): 1, (1, 1, 0): 3})
    B = OrbitTensor(2, {(0, 2, 0): 5, (1, 1, 0): -1})
    left = cross_product(A, B)
    right = cross_product(B, A)
    assert (left + right).terms == {} or all(
        sp.expand(s.coefficient(0)) == 0 for s in (left + right).terms.values())
    with pytest.raises(ValueError, match="ell factor"):
        cross_product(OrbitTensor.monomial(1, (0, 0, 1)), A)
    with pytest.raises(ValueError, match="ranks >= 1"):
        cross_product(OrbitTensor.monomial(0, (0, 0, 0)), A)
    with pytest.raises(TypeError, match="OrbitTensor"):
        symmetric_product(A, "x_ij")


# ----------------------------------------------------------------------------- the derived terms
# Published forms of the two moments the literature writes out at relative 1.5PN (Blanchet,
# Living Rev. Relativ. 17, 2 (2014), sec. 3.3, the radiative hexadecapole U_ijkl and current
# octupole V_ijk; coefficients from memory). The toolkit derives them by the MPM iteration.
PUBLISHED_1_5PN = {
    (4, "mass"): {
        "(2/5) int_0^oo dtau I^(3)_<ij I^(3)_kl>(t - tau)",
        "(-21/5) I_<ij I^(5)_kl>",
        "(-63/5) I^(1)_<ij I^(4)_kl>",
        "(-102/5) I^(2)_<ij I^(3)_kl>",
    },
    (3, "current"): {
        "(1/10) eps_ab<i I^(5)_ja I_k>b",
        "(-1/2) eps_ab<i I^(4)_ja I^(1)_k>b",
        "(-2) J_<i I^(4)_jk>",
    },
}


@pytest.mark.parametrize("key", sorted(PUBLISHED_1_5PN))
def test_derived_quadratic_terms_equal_the_published_ones(key):
    derived = {term.describe() for term in quadratic_terms(*key)}
    assert derived == PUBLISHED_1_5PN[key]


@pytest.mark.parametrize(("l", "kind"), [(2, "mass"), (3, "mass"), (2, "current")])
def test_no_quadratic_terms_below_the_hexadecapole_and_the_current_octupole(l, kind):
    # dimensional counting: a product of two moments of ranks >= 2 has rank >= 4 (mass); the
    # current products need rank >= 3 (Blanchet 2014 sec. 3.3, common practice)
    assert quadratic_terms(l, kind) == ()


@settings(max_examples=10, deadline=None)
@given(l=st.integers(min_value=4, max_value=8), kind=st.sampled_from(["mass", "current"]))
def test_quadratic_terms_respect_dimension_and_parity(l, kind):
    # every product G/c^3 X_A^(a) Y_B^(b) of U_L (V_L) has the dimension of d^l I_L/dt^l times
    # G M/c^3: a + b = l + 1 derivatives on I x I of ranks |A| + |B| = l (mass); for V_L,
    # eps I_A I_B with |A| + |B| = l + 1 and a + b = l + 1, or J_A I_B with |A| + |B| = l and
    # a + b = l (J carries one power of 1/c less); the memory integral int_0^oo dtau counts as
    # one derivative less: common practice
    terms = quadratic_terms(l, kind)
    assert terms, (l, kind)
    for term in terms:
        (kind_a, rank_a, times_a), (kind_b, rank_b, times_b) = term.factors
        times_b -= term.hereditary
        assert min(rank_a, rank_b) >= 1 and term.coefficient != 0
        if kind == "mass":
            assert term.product == "symmetric" and kind_a == kind_b == "mass"
            assert rank_a + rank_b == l and times_a + times_b == l + 1 and min(rank_a, rank_b) >= 2
        elif term.product == "cross":
            assert kind_a == kind_b == "mass" and rank_a + rank_b == l + 1
            assert times_a + times_b == l + 2
        else:
            assert {kind_a, kind_b} == {"mass", "current"}
            assert rank_a + rank_b == l and times_a + times_b == l + 1


def test_hexadecapole_channel_44_by_hand():
    # Hand computation on the circular channel Z+^4 (common practice): I_ij^(n) has the
    # channel Z+^2 with m nu r^2/4 (-2 i omega)^n; products of channels multiply; the
    # memory of exp(-4 i omega t) gives i/(4 omega).
    base = m * nu * r**2 / 4
    instantaneous = sum(coeff * base**2 * (-2 * sp.I * omega)**5
                        for coeff in (-sp.Rational(21, 5), -sp.Rational(63, 5), -sp.Rational(102, 5)))
    memory = sp.Rational(2, 5) * base**2 * (-2 * sp.I * omega)**6 * sp.I / (4 * omega)
    expected = sp.expand(G * (instantaneous + memory))
    derived = quadratic_channel_circular(4, 4)
    assert derived.orders == (sp.Rational(3, 2),)
    assert sp.expand(derived.coefficient(sp.Rational(3, 2)) - expected) == 0
    assert sp.expand(expected - 74 * sp.I * G * m**2 * nu**2 * omega**5 * r**4) == 0


def test_hexadecapole_channel_42_by_hand():
    # Channel Z+^3 Z-: the Z+ Z- channel of I_ij (m nu r^2/2) is constant, so only the
    # undifferentiated I_<ij I^(5)_kl> term contributes (common practice).
    expected = G * (-sp.Rational(21, 5)) * (m * nu * r**2 / 2) * (m * nu * r**2 / 4) * (-2 * sp.I * omega)**5
    derived = quadratic_channel_circular(4, 2).coefficient(sp.Rational(3, 2))
    assert sp.expand(derived - expected) == 0


def test_conjugate_channels_for_negative_m():
    # real tensors: the channel of -m is the complex conjugate of the channel of m
    for l, mm in ((4, 4), (4, 2), (3, 2)):
        plus = quadratic_channel_circular(l, mm).coefficient(sp.Rational(3, 2))
        minus = quadratic_channel_circular(l, -mm).coefficient(sp.Rational(3, 2))
        assert sp.expand(minus - sp.conjugate(plus)) == 0


def test_moments_without_quadratic_terms_give_exact_zero():
    for l, mm in ((2, 2), (2, 1), (3, 3), (3, 1), (2, -1)):
        value = quadratic_channel_circular(l, mm)
        assert value.orders == () and value.is_exact
    assert quadratic_instantaneous_tensor(3, "mass").terms == {}


def test_instantaneous_tensor_starts_at_relative_three_halves():
    for l, kind in ((4, "mass"), (3, "current")):
        tensor = quadratic_instantaneous_tensor(l, kind)
        assert tensor.rank == l
        assert {s.leading_order for s in tensor.terms.values()} == {PNOrder(3, 2)}
        for s in tensor.terms.values():
            assert s.coefficient(sp.Rational(3, 2)).has(G)
            assert not s.coefficient(sp.Rational(3, 2)).has(c)


def test_zero_frequency_memory_is_refused():
    with pytest.raises(RefusedModeError, match="non-oscillating"):
        quadratic_channel_circular(4, 0)


def test_bad_arguments():
    with pytest.raises(ValueError, match="got l = 1"):
        quadratic_terms(1, "mass")
    with pytest.raises(TypeError, match="2.0"):
        quadratic_terms(2.0, "mass")
    with pytest.raises(ValueError, match="'spin'"):
        quadratic_terms(3, "spin")
    with pytest.raises(TypeError, match="None"):
        quadratic_instantaneous_tensor(3, None)
    with pytest.raises(ValueError, match="m = 5"):
        quadratic_channel_circular(4, 5)
    with pytest.raises(TypeError, match="1.0"):
        quadratic_channel_circular(4, 1.0)


# ----------------------------------------------------------------------------- memory kernel
@pytest.mark.parametrize("k", [1, 2, -3, 4])
def test_memory_integral_of_a_harmonic_against_quadrature(k):
    # int_0^oo dtau exp(i s tau - eps tau) by mpmath quadrature (period-by-period sums) at a
    # small regulator eps; the closed limit differs from it by O(eps/s^2) (common practice).
    s_value = mp.mpf(k) * mp.mpf("0.7")
    eps = mp.mpf("1e-4")
    with mp.workdps(20):
        numeric = mp.quadosc(lambda tau: mp.exp((1j * s_value - eps) * tau), [0, mp.inf],
                             omega=abs(s_value))
    closed = complex(sp.N(hereditary_harmonic_integral(k * sp.Rational(7, 10))))
    assert abs(complex(numeric) - closed) < 1e-3 * abs(closed)


def test_memory_integral_symbolic_and_refusals():
    w = sp.Symbol("w", positive=True)
    assert hereditary_harmonic_integral(3 * w) == sp.I / (3 * w)
    assert hereditary_harmonic_integral(-w) == -sp.I / w
    with pytest.raises(ValueError, match="zero-frequency"):
        hereditary_harmonic_integral(0)
    with pytest.raises(TypeError, match="0.5"):
        hereditary_harmonic_integral(0.5)


def test_interactions_take_any_number_of_factors():
    # toy case for the cubic interactions to come (tails of tails): a three-factor symmetric
    # term is the STF part of the product of the three polynomials, i.e. the two-factor
    # products nested; its description lists the three factors
    from stfalgebra.radiative.nonlinear import InteractionTerm, _source_derivative, _term_tensor

    factors = (("mass", 2, 1), ("current", 1, 0), ("mass", 2, 0))
    triple = InteractionTerm(sp.Rational(2, 7), "symmetric", factors)
    first, second, third = (_source_derivative(*spec) for spec in factors)
    nested = symmetric_product(symmetric_product(first, second), third).scale(sp.Rational(2, 7))
    direct = _term_tensor(triple)
    assert direct.rank == 5 and set(direct.terms) == set(nested.terms)
    for key in direct.terms:
        assert not (direct.terms[key] - nested.terms[key]).expand().orders
    assert triple.describe() == "(2/7) I^(1)_<ij J_k I_lm>"
    with pytest.raises(ValueError, match="exactly two"):
        InteractionTerm(sp.Integer(1), "cross", (("mass", 2, 0),) * 3)
    with pytest.raises(ValueError, match="at least two"):
        InteractionTerm(sp.Integer(1), "symmetric", (("mass", 2, 0),))
