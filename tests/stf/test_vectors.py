"""Tests of stfalgebra.stf.vectors: dot, cross and triple products of abstract vectors."""

from __future__ import annotations

import pickle

import pytest
import sympy as sp
from hypothesis import example, given, settings
from hypothesis import strategies as st

from stfalgebra.stf.tensors import clear_caches
from stfalgebra.stf.vectors import PROBE_NORM, Vector, cross, dot, probe_projection, triple_product

PROPERTY = settings(max_examples=15, deadline=None)

rationals = st.fractions(min_value=-4, max_value=4, max_denominator=5).map(
    lambda f: sp.Rational(f.numerator, f.denominator)
)
component_triples = st.tuples(rationals, rationals, rationals)


@pytest.fixture(autouse=True)
def _fresh_caches():
    clear_caches()
    yield
    clear_caches()


def _explicit_cross(a, b):
    # eps_123 = +1 (common practice)
    return (
        a[1] * b[2] - a[2] * b[1],
        a[2] * b[0] - a[0] * b[2],
        a[0] * b[1] - a[1] * b[0],
    )


def test_dot_of_abstract_vectors_is_a_sorted_real_symbol():
    a, b = Vector("a"), Vector("b")
    assert dot(a, b) == dot(b, a)
    assert str(dot(b, a)) == "a.b"
    assert dot(a, b).is_real
    assert dot(a, a).is_positive


def test_unit_vector_squares_to_one():
    n = Vector("n", unit=True)
    assert dot(n, n) == 1
    # a unit vector with components (common practice: cos^2 + sin^2 = 1)
    phi = sp.Symbol("phi", real=True)
    m = Vector("m", unit=True, components=(sp.cos(phi), sp.sin(phi), 0))
    assert dot(m, m) == 1


def test_dot_with_components_evaluates():
    a = Vector("a", components=(1, 2, 3))
    b = Vector("b", components=(sp.Rational(1, 2), 0, -1))
    assert dot(a, b) == sp.Rational(1, 2) - 3
    # mixed: one abstract vector keeps the product symbolic
    c = Vector("c")
    assert dot(a, c) == sp.Symbol("a.c", real=True)


def test_cross_product_identities_abstract():
    a, b, c, d = (Vector(name) for name in "abcd")
    assert dot(cross(a, b), a) == 0
    assert dot(cross(a, b), b) == 0
    assert dot(cross(a, b), c) == triple_product(a, b, c)
    # Binet-Cauchy identity (from memory)
    assert sp.expand(
        dot(cross(a, b), cross(c, d)) - (dot(a, c) * dot(b, d) - dot(a, d) * dot(b, c))
    ) == 0
    assert sp.expand(dot(cross(a, b), cross(a, b)) - (dot(a, a) * dot(b, b) - dot(a, b) ** 2)) == 0


def test_triple_product_is_totally_antisymmetric():
    a, b, c = Vector("a"), Vector("b"), Vector("c")
    base = triple_product(a, b, c)
    assert str(base) == "[a,b,c]"
    assert triple_product(b, c, a) == base
    assert triple_product(c, a, b) == base
    assert triple_product(b, a, c) == -base
    assert triple_product(a, c, b) == -base
    assert triple_product(c, b, a) == -base
    assert triple_product(a, a, b) == 0


def test_cartesian_basis_is_right_handed():
    # eps_xyz = +1 (conventions.md: right-handed Levi-Civita)
    ex = Vector("ex", components=(1, 0, 0))
    ey = Vector("ey", components=(0, 1, 0))
    ez = Vector("ez", components=(0, 0, 1))
    assert triple_product(ex, ey, ez) == 1
    assert cross(ex, ey).components == (0, 0, 1)


@PROPERTY
@given(component_triples, component_triples, component_triples)
@example((1, 0, 0), (0, 1, 0), (0, 0, 1))
@example((0, 0, 0), (1, 2, 3), (4, 5, 6))
def test_triple_product_matches_determinant(p, q, r):
    a, b, c = (Vector(name, components=comps) for name, comps in zip("abc", (p, q, r)))
    expected = sp.Matrix([p, q, r]).det()  # determinant (common practice)
    assert triple_product(a, b, c) == sp.expand(expected)
    assert dot(cross(a, b), c) == sp.expand(expected)


@PROPERTY
@given(component_triples, component_triples, component_triples, component_triples)
def test_abstract_identities_agree_with_components(p, q, r, s):
    """Reduce a product of crosses abstractly, then substitute components."""
    names = "abcd"
    explicit = [Vector(name, components=comps) for name, comps in zip(names, (p, q, r, s))]
    abstract = [Vector(name) for name in names]
    substitution = {}
    for i in range(4):
        for j in range(i, 4):
            substitution[dot(abstract[i], abstract[j])] = dot(explicit[i], explicit[j])
    for i, j, k in ((0, 1, 2), (0, 1, 3), (0, 2, 3), (1, 2, 3)):
        substitution[triple_product(abstract[i], abstract[j], abstract[k])] = triple_product(
            explicit[i], explicit[j], explicit[k]
        )
    a, b, c, d = abstract
    for expression, value in (
        (dot(cross(a, b), cross(c, d)), sum(
            x * y for x, y in zip(_explicit_cross(p, q), _explicit_cross(r, s))
        )),
        (dot(cross(cross(a, b), c), d), sum(
            x * y for x, y in zip(_explicit_cross(_explicit_cross(p, q), r), s)
        )),
        (triple_product(cross(a, b), c, d), sp.Matrix([_explicit_cross(p, q), r, s]).det()),
    ):
        assert sp.expand(expression.xreplace(substitution) - value) == 0


def test_vectors_are_frozen_hashable_and_structural():
    a1 = Vector("a", unit=True)
    a2 = Vector("a", unit=True)
    assert a1 == a2 and hash(a1) == hash(a2)
    assert Vector("a") != a1
    assert len({a1, a2, Vector("b")}) == 2
    with pytest.raises(AttributeError):
        a1.name = "b"  # type: ignore[misc]
    assert cross(a1, Vector("b")) == cross(a2, Vector("b"))
    assert cross(a1, Vector("b")) != cross(Vector("b"), a1)
    assert pickle.loads(pickle.dumps(cross(a1, Vector("b")))) == cross(a1, Vector("b"))


def test_probe_display_symbols():
    assert str(probe_projection(Vector("n"))) == "k.n"
    assert str(PROBE_NORM) == "k.k"


@pytest.mark.parametrize(
    "build, error, fragment",
    [
        (lambda: Vector(3), TypeError, "3"),
        (lambda: Vector("not a name"), ValueError, "not a name"),
        (lambda: Vector("a", unit="yes"), TypeError, "yes"),
        (lambda: Vector("a", components=(1, 2)), ValueError, "three components"),
        (lambda: Vector("a", components=(1.5, 0, 0)), ValueError, "1.5"),
        (lambda: Vector("a", components=("x", 0, 0)), TypeError, "'x'"),
        (lambda: Vector("a", components=(sp.Symbol("k1"), 0, 0)), ValueError, "probe"),
        (lambda: Vector("a", unit=True, components=(1, 1, 0)), ValueError, "squared norm 2"),
        (lambda: dot(Vector("a"), (1, 0, 0)), TypeError, "(1, 0, 0)"),
        (lambda: cross("a", Vector("b")), TypeError, "'a'"),
        (lambda: triple_product(Vector("a"), Vector("b"), None), TypeError, "None"),
    ],
)
def test_bad_input_is_refused_with_the_value_named(build, error, fragment):
    with pytest.raises(error) as caught:
        build()
    assert fragment in str(caught.value)
