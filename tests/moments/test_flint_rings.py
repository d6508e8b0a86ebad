"""The flint rings of the 2PN moments against their sympy twins (orbit_polynomials, invariants).

Each operator of :mod:`stfalgebra.moments.flint_rings` must give, term for term, what the sympy
module it mirrors gives on the same input: the sympy modules are the reference here (they are
tested against the STF core, the Poisson equations and published moments in their own tests).
"""

from __future__ import annotations

import pytest
import sympy as sp
from hypothesis import given, settings
from hypothesis import strategies as st

from stfalgebra.binary.centre_of_mass import centre_of_mass_relations
from stfalgebra.moments import flint_rings as fr
from stfalgebra.moments import invariants as inv
from stfalgebra.moments import orbit_polynomials as op
from stfalgebra.symbols import G, delta, eps, m, nu, phidot, r, rdot

KX, KV = op.KX, op.KV
_ATOMS = (eps, G, m, nu, delta, r, 1 / r, rdot, phidot, KX, KV)


def same_orbit(flint_value, sympy_value) -> bool:
    return fr.orbit_to_sympy(flint_value) == sympy_value


@st.composite
def orbit_elements(draw):
    """Small polynomials of the orbit ring (every generator may occur, 1/r included)."""
    total = sp.Integer(0)
    for _ in range(draw(st.integers(1, 4))):
        term = sp.Rational(draw(st.integers(-5, 5)), draw(st.integers(1, 4)))
        for atom in draw(st.lists(st.sampled_from(_ATOMS), max_size=5)):
            term *= atom
        total += term
    return op.from_expression(total)


@settings(max_examples=15, deadline=None)
@given(orbit_elements(), st.integers(0, 2))
def test_orbit_operators_match_the_sympy_ring(f, pn_order):
    g = fr.orbit_from_sympy(f)
    assert same_orbit(g, f)
    assert same_orbit(fr.time_derivative(g, pn_order), op.time_derivative(f, pn_order))
    assert same_orbit(fr.truncate(g, 1), op.truncate(f, 1))
    assert same_orbit(fr.truncated_power(g, 3, 2), op.truncated_power(f, 3, 2))
    assert same_orbit(fr.reduce_mass_difference(g * g), op.reduce_mass_difference(f * f))


def test_series_conversion_matches_the_sympy_ring():
    (s1, t1), _ = centre_of_mass_relations(2)
    for series in (s1, t1):
        assert same_orbit(fr.orbit_from_series(series), op.from_series(series))


def test_to_tensor_matches_the_sympy_ring():
    f = op.from_expression((1 + eps**2 * (nu * r * rdot + G * m / r) + eps**4 * delta**2 * phidot)
                           * (KX**2 - 3 * KX * KV) * (1 + delta))
    expected = op.to_tensor(2, f, 2)
    got = fr.to_tensor(2, fr.orbit_from_sympy(f), 2)
    assert got.terms == expected.terms


KERNEL = inv.R12 * inv.dot("k", "y1")**3 * inv.dot("k", "y2")**2 * inv.dot("v1", "y2")


@pytest.mark.parametrize("first, second", [("y1", "y2"), ("y2", "y2"), ("k", "y1"), ("k", "k")])
def test_invariant_calculus_matches_the_sympy_ring(first, second):
    f = fr.invariant_from_sympy(KERNEL)
    assert fr.mixed_laplacian(f, first, second) == fr.invariant_from_sympy(inv.mixed_laplacian(KERNEL, first, second))
    assert (fr.directional_derivative(f, "v2", second)
            == fr.invariant_from_sympy(inv.directional_derivative(KERNEL, "v2", second)))
    form = fr.gradient(f, second)
    expected = inv.gradient(KERNEL, second)
    assert {k: v for k, v in form.items() if v} == {k: fr.invariant_from_sympy(v) for k, v in expected.items() if v}


def test_harmonic_contractions_match_the_sympy_ring():
    f = fr.invariant_from_sympy(KERNEL)
    assert (fr.harmonic_gradient_along(f, 5, "v1")
            == fr.invariant_from_sympy(inv.harmonic_gradient_along(KERNEL, 5, "v1")))
    assert fr.harmonic_divergence(f, 5, "y2") == fr.invariant_from_sympy(inv.harmonic_divergence(KERNEL, 5, "y2"))
    assert (fr.harmonic_double_divergence(f, 5, "y1", "y2")
            == fr.invariant_from_sympy(inv.harmonic_double_divergence(KERNEL, 5, "y1", "y2")))
    assert fr.on_null_cone(f * fr.dot("k", "k") + f) == f


def test_evaluation_at_orbit_values_matches_substitution():
    images = [op.from_expression(sp.Integer(k + 1) * r + KX * (k % 3) + eps * KV) for k in range(len(inv.RING.gens))]
    expected = op.substitute(KERNEL, images)
    got = fr.evaluate_at(fr.invariant_from_sympy(KERNEL), [fr.orbit_from_sympy(i) for i in images])
    assert same_orbit(got, expected)
