"""Harmonic splitting against the STF core (Thorne 1980 eq. (2.2)) and by reconstruction."""

from __future__ import annotations

import flint
import sympy as sp
from hypothesis import given, settings, strategies as st

from stfalgebra.mpm.coefficient_ring import RING, gens
from stfalgebra.mpm.harmonic_split import (
    harmonic_decomposition, harmonic_part, multipolar_pieces, radius_squared, sample_harmonic,
    vector_harmonic_split,
)
from stfalgebra.mpm.linear_metric import cross_gradient
from stfalgebra.mpm.retarded_field import RetardedField, laplacian
from stfalgebra.stf.cartesian import PROBE, harmonic_part_cartesian


def _to_sympy(poly):
    k1, k2, k3 = PROBE
    total = sp.Integer(0)
    for exponents, value in poly.to_dict().items():
        total += sp.Rational(int(value.p), int(value.q)) * k1 ** exponents[3] * k2 ** exponents[4] * k3 ** exponents[5]
    return sp.expand(total)


def _monomial(a, b, c):
    g = gens()
    return g["x1"] ** a * g["x2"] ** b * g["x3"] ** c


@settings(max_examples=15, deadline=None)
@given(st.lists(st.tuples(st.integers(0, 4), st.integers(0, 4), st.integers(-3, 3)), min_size=1, max_size=4),
       st.integers(0, 3))
def test_harmonic_part_agrees_with_the_stf_core(monomials, extra):
    # a homogeneous polynomial of degree 4 + extra, its STF part from the STF core
    degree = 4 + extra
    poly = RING.from_dict({})
    for a, b, coefficient in monomials:
        if a + b <= degree:
            poly += coefficient * _monomial(a, b, degree - a - b)
    ours = _to_sympy(harmonic_part(poly, degree))
    theirs = sp.expand(harmonic_part_cartesian(_to_sympy(poly), degree))
    assert sp.expand(ours - theirs) == 0


def test_products_of_nhat_decompose_back_exactly():
    # n_<ij> n_<kl> pieces recombine to the product (decomposition of nhat_L nhat_P into nhat_Q)
    A, B = sample_harmonic(2, 1), sample_harmonic(3, 2)
    product = A * B
    parts = harmonic_decomposition(product, 5)
    assert sorted(parts) == [1, 3, 5]
    rebuilt = sum((radius_squared() ** ((5 - l) // 2) * H for l, H in parts.items()), RING.from_dict({}))
    assert rebuilt == product
    assert all(laplacian(H).is_zero() for H in parts.values())


def test_multipolar_pieces_rebuild_the_field():
    g = gens()
    field = RetardedField({3: g["x1"] * g["x2"] * g["s1"], 5: g["x3"] ** 3 + g["x1"]}, g["s1"])
    pieces = multipolar_pieces(field)
    rebuilt = RetardedField({}, g["s1"])
    for (l, k), H in pieces.items():
        rebuilt = rebuilt + RetardedField({l + k: H}, g["s1"])
    assert (rebuilt - field).is_zero()


def test_vector_harmonic_split_reconstructs():
    g = gens()
    x = (g["x1"], g["x2"], g["x3"])
    d = 3
    psi, rot, phi = sample_harmonic(d + 1, 1), sample_harmonic(d, 2), sample_harmonic(d - 1, 3)
    curl = cross_gradient(rot)
    vector = tuple(psi.derivative(f"x{i + 1}") + curl[i]
                   + x[i] * phi - radius_squared() * phi.derivative(f"x{i + 1}") * flint.fmpq(1, 2 * d - 1)
                   for i in range(3))
    gradient, rotation, radial = vector_harmonic_split(vector, d)
    assert gradient == psi and rotation == rot and radial == phi
