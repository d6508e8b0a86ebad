"""Checks of stfalgebra/moments/invariants.py against explicit components.

The invariant calculus (gradients through the dot products, r12 and 1/r12) is compared with
sympy derivatives of the same function written in components; the harmonic-extension
contractions with the STF core (stf/cartesian.py, the trace-removal formula) on a null probe.
"""

from __future__ import annotations

import random

import sympy as sp

from stfalgebra.moments import invariants as inv
from stfalgebra.stf.cartesian import PROBE, harmonic_part_cartesian

COMPONENTS = {name: sp.symbols(f"{name}_1:4", real=True) for name in inv.VECTORS}
RNG = random.Random(5)


def _components(f):
    """The ring element as an explicit function of the vectors' components."""
    values = {}
    for i, a in enumerate(inv.VECTORS):
        for b in inv.VECTORS[i:]:
            values[str(inv.dot(a, b))] = sum(p * q for p, q in zip(COMPONENTS[a], COMPONENTS[b]))
    separation = sp.sqrt(sum((p - q) ** 2 for p, q in zip(COMPONENTS["y1"], COMPONENTS["y2"])))
    values["r12"], values["ir12"] = separation, 1 / separation
    return inv.evaluate(f, values)


def _point():
    point = {}
    for name, symbols in COMPONENTS.items():
        for symbol in symbols:
            point[symbol] = sp.Rational(RNG.randint(-9, 9), 7)
    return point


def _random_function():
    d = inv.dot
    return (d("k", "y1") ** 2 * inv.R12 + 3 * d("y1", "v2") * d("k", "v1") * inv.INV_R12
            - d("y1", "y2") * d("k", "y2") * d("v1", "v2") + 2 * d("k", "k") * d("y2", "y2") * inv.R12**3)


def test_directional_derivatives_and_laplacians_match_components():
    f = _random_function()
    explicit = _components(f)
    point = _point()
    symbols = sorted(point, key=str)
    values = [point[x] for x in symbols]

    def at_point(expression):
        return sp.lambdify(symbols, expression, "mpmath")(*values)

    for direction, variable in (("k", "y1"), ("v2", "y1"), ("y1", "y2"), ("v1", "k"), ("y2", "k")):
        expected = sum(c * sp.diff(explicit, x) for c, x in zip(COMPONENTS[direction], COMPONENTS[variable]))
        got = _components(inv.directional_derivative(f, direction, variable))
        assert abs(at_point(got - expected)) < 1e-12, (direction, variable)
    for first, second in (("y1", "y1"), ("y1", "y2"), ("k", "y2")):
        expected = sum(sp.diff(explicit, x, y) for x, y in zip(COMPONENTS[first], COMPONENTS[second]))
        got = _components(inv.mixed_laplacian(f, first, second))
        assert abs(at_point(got - expected)) < 1e-12, (first, second)


def _harmonic_extension(f, degree):
    """H[f] through the STF core: the harmonic part of the explicit polynomial in k, monomial by
    monomial (the projection is linear; coefficients depend on the other vectors)."""
    explicit = sp.expand(_components(f))
    probe = PROBE  # the core's probe symbols
    total = sp.Integer(0)
    for monomial, coefficient in sp.Poly(explicit, *COMPONENTS["k"]).terms():
        term = sp.Mul(*[k**e for k, e in zip(probe, monomial)])
        total += coefficient * harmonic_part_cartesian(term, degree)
    return sp.expand(total), probe


def test_harmonic_contractions_match_the_stf_core():
    # f = (k.y1)(k.y2)(y1.y2) + (k.y2)(k.v1)(y1.v1): degree 2 in k, y-dependent weights
    d = inv.dot
    f = d("k", "y1") * d("k", "y2") * d("y1", "y2") + d("k", "y2") * d("k", "v1") * d("y1", "v1")
    harmonic, probe = _harmonic_extension(f, 2)
    null_k = {probe[0]: 1, probe[1]: sp.I, probe[2]: 0}  # k.k = 0
    to_null = {COMPONENTS["k"][0]: 1, COMPONENTS["k"][1]: sp.I, COMPONENTS["k"][2]: 0}
    point = {s: v for s, v in _point().items() if s not in COMPONENTS["k"]}
    # (v1 . grad_k) H
    expected = sum(v * sp.diff(harmonic, k) for v, k in zip(COMPONENTS["v1"], probe))
    got = _components(inv.harmonic_gradient_along(f, 2, "v1"))
    assert sp.simplify((got.subs(to_null) - expected.subs(null_k)).subs(point)) == 0
    # (grad_y2 . grad_k) H
    expected = sum(sp.diff(harmonic, k, y) for k, y in zip(probe, COMPONENTS["y2"]))
    got = _components(inv.harmonic_divergence(f, 2, "y2"))
    assert sp.simplify((got.subs(to_null) - expected.subs(null_k)).subs(point)) == 0
    # (grad_y1 . grad_k)(grad_y2 . grad_k) H
    expected = sum(sp.diff(harmonic, k, y, kk, yy) for k, y in zip(probe, COMPONENTS["y1"])
                   for kk, yy in zip(probe, COMPONENTS["y2"]))
    got = _components(inv.harmonic_double_divergence(f, 2, "y1", "y2"))
    assert sp.simplify((got.subs(to_null) - expected.subs(null_k)).subs(point)) == 0
