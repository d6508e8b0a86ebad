"""Tests of stfalgebra.stf.components: the explicit-component view and the naive reference
routines, checked against the polynomial tensors for ranks up to 6."""

from __future__ import annotations

import itertools

import pytest
import sympy as sp
from hypothesis import example, given, settings
from hypothesis import strategies as st

from stfalgebra.stf.components import (
    contract_components,
    delta_components,
    epsilon_components,
    explicit_components,
    naive_stf_components,
    outer_components,
    symmetrize_components,
    trace_components,
    vector_components,
)
from stfalgebra.stf.tensors import SymmetricTensor, clear_caches, stf_product
from stfalgebra.stf.vectors import Vector

PROPERTY = settings(max_examples=8, deadline=None)

rationals = st.fractions(min_value=-3, max_value=3, max_denominator=3).map(
    lambda f: sp.Rational(f.numerator, f.denominator)
)
component_triples = st.tuples(rationals, rationals, rationals)


@pytest.fixture(autouse=True)
def _fresh_caches():
    clear_caches()
    yield
    clear_caches()


def _entries(array) -> dict:
    rank = array.rank()
    if rank == 0:
        return {(): array[()]}
    return dict(zip(itertools.product(range(3), repeat=rank), array.reshape(3**rank)))


def _is_symmetric(array) -> bool:
    entries = _entries(array)
    for index, value in entries.items():
        for perm in itertools.permutations(index):
            if entries[perm] != value:
                return False
    return True


def _all_traces_vanish(array) -> bool:
    rank = array.rank()
    if rank < 2:
        return True
    array = _entries(array)
    for i, j in itertools.combinations(range(rank), 2):
        for rest in itertools.product(range(3), repeat=rank - 2):
            total = 0
            for a in range(3):
                index = list(rest)
                index.insert(i, a)
                index.insert(j, a)
                total += array[tuple(index)]
            if sp.expand(total) != 0:
                return False
    return True


@PROPERTY
@given(st.integers(min_value=0, max_value=5), component_triples, component_triples)
@example(0, (1, 0, 0), (0, 1, 0))
@example(1, (1, 2, 3), (0, 0, 0))
@example(5, (1, -1, 2), (sp.Rational(1, 2), 0, 1))
def test_stf_part_matches_the_naive_component_algorithm(l, p, r):
    x, v = Vector("x", components=p), Vector("v", components=r)
    q = l // 2
    tensor = SymmetricTensor.from_vectors(*([x] * (l - q) + [v] * q))
    expected = naive_stf_components(outer_components(*([x] * (l - q) + [v] * q)))
    got = explicit_components(tensor.stf())
    assert got == expected
    assert _is_symmetric(got)
    assert _all_traces_vanish(got)


def test_rank_six_stf_against_naive_components():
    # the largest rank compared component by component (brief: ranks up to 6)
    x = Vector("x", components=(1, -2, sp.Rational(1, 2)))
    v = Vector("v", components=(0, 1, 3))
    factors = [x, x, x, v, v, x]
    got = explicit_components(SymmetricTensor.from_vectors(*factors).stf())
    assert got == naive_stf_components(outer_components(*factors))


@pytest.mark.parametrize("l", range(0, 5))
def test_stf_part_is_the_unique_trace_free_remainder(l):
    """F = F_<L> + Sym(delta A_{L-2}) with F_<L> trace-free (independent linear algebra)."""
    x = Vector("x", components=(1, 2, -1))
    v = Vector("v", components=(sp.Rational(1, 3), -1, 2))
    q = l // 2
    factors = [x] * (l - q) + [v] * q
    full_array = explicit_components(SymmetricTensor.from_vectors(*factors))
    projected_array = explicit_components(stf_product(*factors))
    assert _all_traces_vanish(projected_array)
    if l < 2:
        assert projected_array == full_array
        return
    full, projected = _entries(full_array), _entries(projected_array)
    # unknown symmetric A of rank l-2, one symbol per sorted index
    unknowns = {
        index: sp.Symbol("A_" + "".join(map(str, index)))
        for index in itertools.combinations_with_replacement(range(3), l - 2)
    }
    equations = []
    for index in itertools.product(range(3), repeat=l):
        # Sym(delta A)_I = average over permutations of delta_{i1 i2} A_{i3..il}
        terms = []
        for perm in itertools.permutations(index):
            if perm[0] == perm[1]:
                terms.append(unknowns[tuple(sorted(perm[2:]))])
        sym = sp.Add(*terms) / sp.factorial(l)
        equations.append(full[index] - projected[index] - sym)
    solution = sp.solve(equations, list(unknowns.values()), dict=True)
    assert solution, "F - F_<L> is not of the form Sym(delta A)"


def test_explicit_components_of_simple_tensors():
    x = Vector("x", components=(1, 2, 0))
    assert explicit_components(SymmetricTensor.from_vectors(x, x)).tolist() == [
        [1, 2, 0],
        [2, 4, 0],
        [0, 0, 0],
    ]
    assert explicit_components(SymmetricTensor.from_vectors(coefficient=7))[()] == 7
    assert explicit_components(SymmetricTensor.delta()) == delta_components()
    # x_<ij> = x_i x_j - delta_ij x^2/3 (Thorne 1980, eq. (2.2))
    stf = explicit_components(stf_product(x, x))
    assert stf[0, 0] == 1 - sp.Rational(5, 3)
    assert stf[2, 2] == -sp.Rational(5, 3)


def test_naive_helpers():
    eps = epsilon_components()
    # eps_ijk eps_ijk = 6 (common practice)
    assert contract_components(eps, eps) == 6
    assert trace_components(delta_components())[()] == 3
    a = Vector("a", components=(1, 0, 0))
    b = Vector("b", components=(0, 1, 0))
    outer = outer_components(a, b)
    assert symmetrize_components(outer)[0, 1] == sp.Rational(1, 2)
    assert symmetrize_components(symmetrize_components(outer)) == symmetrize_components(outer)
    assert naive_stf_components(delta_components()) == sp.ImmutableDenseNDimArray([0] * 9, (3, 3))
    assert vector_components(a).tolist() == [1, 0, 0]


@pytest.mark.parametrize(
    "build, error, fragment",
    [
        (lambda: explicit_components(SymmetricTensor.from_vectors(Vector("y"))), ValueError, "'y'"),
        (lambda: explicit_components("T"), TypeError, "'T'"),
        (lambda: vector_components(Vector("y")), ValueError, "'y'"),
        (lambda: symmetrize_components([1, 2, 3]), TypeError, "[1, 2, 3]"),
        (lambda: symmetrize_components(sp.Array([1, 2])), ValueError, "(2,)"),
        (lambda: trace_components(sp.Array([1, 2, 3]), 1), ValueError, "rank-1"),
        (lambda: contract_components(delta_components(), epsilon_components()), ValueError, "2 and 3"),
    ],
)
def test_bad_input_is_refused(build, error, fragment):
    with pytest.raises(error) as caught:
        build()
    assert fragment in str(caught.value)
