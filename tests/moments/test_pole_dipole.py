"""Tests of stfalgebra.moments.pole_dipole: the invariant calculus (chain-rule identities) against
explicit Cartesian components, the STF kernel against the STF core, and the one-particle spin
parts against an explicit-index evaluation of the same integrals (Levi-Civita symbols and the
STF core's harmonic projection, no invariant calculus)."""

from __future__ import annotations

from fractions import Fraction
from functools import lru_cache

import pytest
import sympy as sp

from stfalgebra.moments.pole_dipole import (
    BODY_SCALARS, BODY_VECTORS, InvariantPolynomial, current_spin_part, mass_spin_part, stf_kernel,
)
from stfalgebra.stf.cartesian import PROBE, harmonic_part_cartesian

K = sp.Matrix(PROBE)
Y = sp.Matrix(sp.symbols("y1:4", real=True))
V = sp.Matrix(sp.symbols("v1:4", real=True))
S = sp.Matrix(sp.symbols("s1:4", real=True))
W = V.cross(S)          # the vector w of the mass moment's density term is v x S


def _explicit(polynomial: InvariantPolynomial) -> sp.Expr:
    """The polynomial written with explicit components."""
    a, b, c = Y.dot(K), Y.dot(Y), K.dot(K)
    tags = {None: 1, "S.k": S.dot(K), "y.S": Y.dot(S), "k.(y x S)": K.dot(Y.cross(S)),
            "w.k": W.dot(K), "y.w": Y.dot(W)}
    return sp.expand(sum(sp.Rational(value.numerator, value.denominator) * a**i * b**j * c**k * tags[tag]
                         for (i, j, k, tag), value in polynomial.terms.items()) + sp.Integer(0))


# exact rational points for v and S (and y, where an STF part is compared)
_POINTS = tuple({**dict(zip(Y, point[0:3])), **dict(zip(V, point[3:6])), **dict(zip(S, point[6:9]))}
                for point in ((sp.Rational(1, 2), -2, 3, sp.Rational(2, 3), 1, sp.Rational(-1, 5), 3, sp.Rational(1, 7), -1),
                              (-1, sp.Rational(3, 4), 2, 1, sp.Rational(-2, 3), 2, sp.Rational(-1, 2), 2, sp.Rational(5, 3))))

_GENERATORS = (*Y, *K)


def _polynomial(expression) -> sp.Poly:
    return sp.Poly(expression, *_GENERATORS, domain="QQ")


def _explicit_poly(polynomial: InvariantPolynomial, point: dict) -> sp.Poly:
    """The polynomial in explicit components of y and k, with v and S set to ``point``'s values
    (the operators differentiate in y and k only; sympy's Poly keeps this fast)."""
    s_vec, w_vec = S.xreplace(point), W.xreplace(point)
    a, b, c = _polynomial(Y.dot(K)), _polynomial(Y.dot(Y)), _polynomial(K.dot(K))
    tags = {None: _polynomial(1), "S.k": _polynomial(s_vec.dot(K)), "y.S": _polynomial(Y.dot(s_vec)),
            "k.(y x S)": _polynomial(K.dot(Y.cross(s_vec))), "w.k": _polynomial(w_vec.dot(K)),
            "y.w": _polynomial(Y.dot(w_vec))}
    total = _polynomial(0)
    for (i, j, k, tag), value in polynomial.terms.items():
        total += a**i * b**j * c**k * tags[tag] * sp.Rational(value.numerator, value.denominator)
    return total


def _gradient(poly: sp.Poly, vector) -> list:
    return [poly.diff(component) for component in vector]


def _dot(numbers, polys) -> sp.Poly:
    return sum((p * n for n, p in zip(numbers, polys)), _polynomial(0))


# the identities are linear in f: checking them on every monomial a^i (b c)^j that P_l has for
# l <= 4 proves them on the kernels used below; two monomials with b, c apart check the rules
# for b and c separately
_MONOMIALS = [(i, j, j) for j in range(3) for i in range(5 - 2 * j)] + [(1, 1, 0), (1, 0, 1)]


@pytest.mark.parametrize("i, j, k", _MONOMIALS)
def test_chain_rule_identities_match_explicit_components(i, j, k):
    f = InvariantPolynomial({(i, j, k, None): Fraction(1)})
    for point in _POINTS:
        s_vec, w_vec = list(S.xreplace(point)), list(W.xreplace(point))
        F = _explicit_poly(f, point)
        grad_k, grad_y = _gradient(F, K), _gradient(F, Y)
        assert _explicit_poly(f.mixed_divergence(), point) == sum(
            (grad_k[n].diff(Y[n]) for n in range(3)), _polynomial(0))
        assert _explicit_poly(f.direction_k("S"), point) == _dot(s_vec, grad_k)
        assert _explicit_poly(f.direction_y("w"), point) == _dot(w_vec, grad_y)
        k_dot_grad_y = _dot(s_vec, grad_k)
        assert _explicit_poly(f.direction_k("S").direction_y("k"), point) == sum(
            (k_dot_grad_y.diff(Y[n]) * _polynomial(K[n]) for n in range(3)), _polynomial(0))
        curl = sum((F.diff(Y[q]).diff(K[t]) * (sp.LeviCivita(p, q, t) * s_vec[p])
                    for p in range(3) for q in range(3) for t in range(3)), _polynomial(0))
        assert _explicit_poly(f.spin_curl(), point) == curl
        for tagged in (f.times(tag="S.k"), f.times(tag="k.(y x S)"), f.times(tag="w.k"), f.times(tag="y.S")):
            expression = _explicit_poly(tagged, point)
            assert _explicit_poly(tagged.laplacian_k(), point) == sum(
                (expression.diff(K[n]).diff(K[n]) for n in range(3)), _polynomial(0))


@pytest.mark.parametrize("l", range(0, 7))
def test_stf_kernel_is_the_stf_core_projection(l):
    # Thorne 1980 eq. (2.2) through the project's STF core
    assert sp.expand(_explicit(stf_kernel(l)) - harmonic_part_cartesian(sp.expand(Y.dot(K) ** l), l)) == 0


def _body_tensor_explicit(tensor, point) -> sp.Expr:
    vectors = {"y": Y, "v": V, "S": S, "y_cross_S": Y.cross(S), "v_cross_S": V.cross(S)}
    scalars = {"y.y": Y.dot(Y), "y.v": Y.dot(V), "y.S": Y.dot(S), "v.S": V.dot(S), "y.(v x S)": Y.dot(V.cross(S))}
    total = 0
    for (vector_powers, scalar_powers), value in tensor.terms.items():
        product = sp.Mul(*[vectors[n].dot(K) ** e for n, e in zip(BODY_VECTORS, vector_powers)])
        weight = sp.Mul(*[scalars[n] ** e for n, e in zip(BODY_SCALARS, scalar_powers)])
        total += (sp.Rational(value.numerator, value.denominator) * weight.xreplace(point)
                  * harmonic_part_cartesian(sp.expand(product.xreplace(point)), tensor.rank))
    return sp.expand(total)


def _matches(tensor, explicit) -> bool:
    """The body tensor equals the explicit polynomial's STF part at every test point."""
    return all(sp.expand(_body_tensor_explicit(tensor, point)
                         - harmonic_part_cartesian(sp.expand(explicit.xreplace(point)), tensor.rank)) == 0
               for point in _POINTS)


@lru_cache(maxsize=None)
def _kernel(l):
    return harmonic_part_cartesian(sp.expand(Y.dot(K) ** l), l)


def _spin_tensor(p, q):
    """S^{pq} = eps_{pqd} S_d."""
    return sum(sp.LeviCivita(p, q, d) * S[d] for d in range(3))


@pytest.mark.parametrize("l", [1, 2, 3])
def test_current_spin_part_matches_explicit_integration(l):
    # int eps_{abc} k_c (1/l) d P_l/d k_a sigma_b with sigma_b = -(1/2) d_p (S^{pb} delta):
    # by parts, (1/(2l)) S^{pb} d/dy_p [eps_{abc} k_c dP_l/dk_a] at the particle
    kernel = _kernel(l)
    integrand = [sum(sp.LeviCivita(a, b, c) * K[c] * sp.diff(kernel, K[a]) for a in range(3) for c in range(3))
                 for b in range(3)]
    explicit = sum(_spin_tensor(p, b) * sp.diff(integrand[b], Y[p]) for p in range(3) for b in range(3)) / (2 * l)
    assert _matches(current_spin_part(l), explicit)


@pytest.mark.parametrize("l", [1, 2])
def test_mass_spin_part_matches_explicit_integration(l):
    # (2/c^2) S^{pj} v^j d_p P_l - (4(2l+1)/(c^2 (l+1)(2l+3))) d/dt (1/(2(l+1))) S^{pa} d_{y_p} d_{k_a} P_{l+1},
    # d/dt = v . grad_y (the spin is constant at this order); coefficient of 1/c^2
    density = sum(_spin_tensor(p, j) * V[j] * sp.diff(_kernel(l), Y[p]) for p in range(3) for j in range(3)) * 2
    inner = sum(_spin_tensor(p, a) * sp.diff(_kernel(l + 1), Y[p], K[a]) for p in range(3) for a in range(3))
    inner = inner / (2 * (l + 1))
    rate = V.dot(_gradient(inner, Y))
    explicit = density - sp.Rational(4 * (2 * l + 1), (l + 1) * (2 * l + 3)) * rate
    part = mass_spin_part(l)
    assert part.inverse_c_power == 2
    assert _matches(part, explicit)


def test_closed_forms_for_every_l():
    # what the derivation gives at every l (the current part is the "(l+1)/2 y^<L-1} S^{i_l>}" of
    # Blanchet, Buonanno & Faye 2006 and Bohe et al. 2013, from memory):
    # J_L^S = ((l+1)/2) STF[y^(l-1) S], I_L^S = (2 l^2/(l+1)) STF[y^(l-1) (v x S)]
    #                                          - (2 l (l-1)/(l+1)) STF[y^(l-2) v (y x S)]
    for l in range(1, 9):
        assert current_spin_part(l).terms == {((l - 1, 0, 1, 0, 0), (0,) * 5): Fraction(l + 1, 2)}
        mass = mass_spin_part(l).terms
        expected = {((l - 1, 0, 0, 0, 1), (0,) * 5): Fraction(2 * l * l, l + 1)}
        if l >= 2:
            expected[((l - 2, 1, 0, 1, 0), (0,) * 5)] = Fraction(-2 * l * (l - 1), l + 1)
        assert mass == expected, l


def test_dipoles_are_the_spin_and_the_centre_of_energy_shift():
    # from (PD) directly: int (x^i T^{0j} - x^j T^{0i})/c = S^{ij} for a particle at rest, i.e.
    # J_i = S_i; and int x_i T^{00}/c^2 = m y_i + S^{ij} v^j/c^2 = m y_i + (v x S)_i/c^2
    assert current_spin_part(1).coefficient({"S": 1}) == 1
    assert mass_spin_part(1).terms == {((0, 0, 0, 0, 1), (0,) * 5): Fraction(1)}


def test_bad_input():
    with pytest.raises(ValueError):
        current_spin_part(0)
    with pytest.raises(ValueError):
        mass_spin_part(0)
    with pytest.raises(ValueError):
        stf_kernel(-1)
    with pytest.raises(ValueError):
        InvariantPolynomial({(0, 0, 0, "nonsense"): 1})
    with pytest.raises(ValueError):
        InvariantPolynomial({(1, 0, 0, "S.k"): 1}).spin_curl()
