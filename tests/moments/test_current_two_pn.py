"""Checks of stfalgebra/moments/current_two_pn.py: the probe form (J2) of the current moment
and the pair-operator route, against independent references.

1. (J2) at the integrand level: eps_{ab<i_l} xhat_{L-1>a} S_b k_L = (k.x)^(l-1) k.(x cross S)
   for a null k, with xhat_L from the project's STF core (harmonic_part_cartesian) and the
   eps contraction done in components.
2. probe_curl against components: eps_{abc} k_c d/dk_a F_b by sympy for explicit vectors.
3. The pair-operator route reproduces the 1PN field term of field_integrals (derived there by a
   hand-written operator algebra and checked by brute-force components) for l = 1..8.
"""

from __future__ import annotations

import random

import pytest
import sympy as sp

from stfalgebra.moments import invariants as inv
from stfalgebra.moments.current_two_pn import curl_on_newtonian_orbit, one_pn_field_term
from stfalgebra.moments.field_integrals import field_current_term
from stfalgebra.stf.cartesian import PROBE, harmonic_part_cartesian

IR = sp.Symbol("ir", positive=True)


def _cross(a, b):
    return [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]]


@pytest.mark.parametrize("l", [1, 2, 3, 4])
def test_probe_form_of_the_current_integrand(l):
    rng = random.Random(l)
    x = [sp.Rational(rng.randint(-9, 9), 7) for _ in range(3)]
    s = [sp.Rational(rng.randint(-9, 9), 5) for _ in range(3)]
    xs = sp.symbols("q1:4")
    stf = harmonic_part_cartesian(sp.expand(sum(p * q for p, q in zip(PROBE, xs))**l), l)  # xhat_L k'_L
    null = [sp.Integer(3), sp.Integer(4), 5 * sp.I]          # 9 + 16 - 25 = 0
    assert sum(p**2 for p in null) == 0
    at_x = dict(zip(xs, x))
    # eps_{abc} k_c xhat_{aL-1} k_{L-1} S_b, with xhat_{aL-1} k_{L-1} = (1/l) d/dk'_a (xhat_L k'_L)
    gradient = [sp.diff(stf, PROBE[a]).subs(at_x) / l for a in range(3)]
    at_k = dict(zip(PROBE, null))
    total = 0
    for a in range(3):
        for b in range(3):
            for c in range(3):
                total += sp.LeviCivita(a, b, c) * null[c] * gradient[a].subs(at_k) * s[b]
    expected = sum(p * q for p, q in zip(null, x))**(l - 1) * sum(p * q for p, q in zip(null, _cross(x, s)))
    assert sp.expand(total - expected) == 0
    assert expected != 0


def test_probe_curl_matches_components():
    rng = random.Random(3)
    vectors = {name: [sp.Rational(rng.randint(-9, 9), 4) for _ in range(3)] for name in inv.VECTORS[1:]}
    k = sp.symbols("k1:4")
    dots = {name: sum(p * q for p, q in zip(k, vectors[name])) for name in vectors}
    form = {"v2": inv.dot("k", "y1")**2 * inv.dot("k", "v1"), "y1": inv.dot("k", "y2") * inv.dot("y1", "v2"),
            "k": inv.dot("k", "y1")}
    # components: F_b = sum_w C_w(k) w_b, C_w through the explicit dot products
    values = {str(inv.dot("k", name)): dots[name] for name in vectors}
    values[str(inv.dot("y1", "v2"))] = sum(p * q for p, q in zip(vectors["y1"], vectors["v2"]))
    values["ky1"] = dots["y1"]

    def component(b):
        out = 0
        for w, coefficient in form.items():
            direction = k if w == "k" else vectors[w]
            out += inv.evaluate(coefficient, values) * direction[b]
        return out

    brute = sum(sp.LeviCivita(a, b, c) * k[c] * sp.diff(component(b), k[a])
                for a in range(3) for b in range(3) for c in range(3))
    triple = 0
    for (p, w), coefficient in inv.probe_curl(form).items():
        triple += inv.evaluate(coefficient, values) * sum(
            q * s for q, s in zip(vectors[p], _cross(vectors[w], k)))
    assert sp.expand(brute - triple) == 0
    assert sp.expand(brute) != 0


@pytest.mark.parametrize("l", range(1, 9))
def test_pair_operator_route_reproduces_the_one_pn_field_term(l):
    # reference: field_integrals.field_current_term (hand-derived operator algebra, checked there
    # against brute-force components and the 1PN angular momentum)
    mine = one_pn_field_term(l).as_expr().subs(IR, 1 / sp.Symbol("r", positive=True))
    kx = sp.Symbol("kx")
    assert sp.expand(mine / kx**(l - 1) - field_current_term(l).to_sympy()) == 0


def test_curl_on_orbit_drops_collinear_pairs():
    assert curl_on_newtonian_orbit({("y1", "y2"): inv.RING(1), ("v1", "v2"): inv.RING(1)}) == 0
