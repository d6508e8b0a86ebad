"""Tests of the exact spheroidal finite-part integrals (stfalgebra.moments.spheroidal_integrals)."""

from __future__ import annotations

import numpy as np
import pytest
import sympy as sp
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy import integrate

from stfalgebra.moments import invariants as inv
from stfalgebra.moments.partie_finie import partie_finie_seed_integral
from stfalgebra.moments.spheroidal_integrals import axisymmetric_monomials, finite_part_integral

_X = sp.symbols("X1:4", real=True)
_R1, _R2, _P = sp.symbols("R1 R2 P", positive=True)


def _riesz(a: int, b: int) -> sp.Expr:
    """int d^3x r1^a r2^b = pi^(3/2) Gamma((a+3)/2) Gamma((b+3)/2) Gamma(-(a+b+3)/2) /
    (Gamma(-a/2) Gamma(-b/2) Gamma((a+b+6)/2)) r12^(a+b+3) (Riesz 1949; common practice), r12 = 1."""
    h = sp.Rational(1, 2)
    return sp.simplify(sp.pi**sp.Rational(3, 2) * sp.gamma((a + 3) * h) * sp.gamma((b + 3) * h)
                       * sp.gamma(-(a + b + 3) * h) / (sp.gamma(-a * h) * sp.gamma(-b * h) * sp.gamma((a + b + 6) * h)))


def _power_density(a: int, b: int) -> dict:
    return axisymmetric_monomials(_R1**a * _R2**b, _X, _R1, _R2, _P, 0)


@settings(max_examples=25, deadline=None)
@given(st.integers(-2, 3), st.integers(-2, 3), st.fractions(-2, 2, max_denominator=5))
def test_powers_of_the_two_distances_follow_the_riesz_formula(a, b, centre):
    # a + b even: no pole at infinity and no dependence on the centre of the regulator; a, b
    # > -3 and not both even >= 0 (then the Riesz value is zero or needs the continuation)
    if (a + b) % 2 or (a >= 0 and a % 2 == 0) or (b >= 0 and b % 2 == 0):
        return
    result = finite_part_integral(_power_density(a, b), sp.Rational(centre))
    assert sp.simplify(result["finite"] - _riesz(a, b)) == 0
    assert result["ln r0"] == 0


def test_inverse_square_product():
    assert finite_part_integral({(0, 0, 2, 2, 0): 16})["finite"] == sp.pi**3


def test_the_regulator_is_centred_on_the_origin():
    # FP int |x - y1| d^3x = -pi |y1|^4/15 (the regulator (|x|/r0)^B centred on the origin;
    # stfalgebra.moments.finite_part.origin_regulated_seed): y1 at height c0 + 1/2
    for c0 in (sp.Rational(1, 2), sp.Rational(-3, 7)):
        value = finite_part_integral({(0, 0, -1, 0, 0): sp.Rational(1, 2)}, c0)["finite"]
        assert value == -sp.pi * (c0 + sp.Rational(1, 2))**4 / 15


def _perimeter_quadrature(a: int, b: int, p: int) -> float:
    """int d^3x r1^a r2^b (r1 + r2 + 1)^-p in bipolar coordinates (2 pi r1 r2 dr1 dr2, r12 = 1),
    a coordinate system other than the spheroidal one of the module."""
    def inner(r1):
        lower = abs(r1 - 1)
        return integrate.quad(lambda r2: r1**(a + 1) * r2**(b + 1) * (r1 + r2 + 1)**(-p), lower, r1 + 1)[0]
    head = integrate.quad(inner, 0, 1, limit=200)[0]
    tail = integrate.quad(inner, 1, np.inf, limit=200)[0]
    return 2 * np.pi * (head + tail)


@pytest.mark.parametrize("a, b, p", [(-2, -2, 1), (-1, -2, 2), (-2, 0, 3), (-1, -1, 3), (1, -2, 4)])
def test_powers_of_the_perimeter_agree_with_bipolar_quadrature(a, b, p):
    monomials = axisymmetric_monomials(_R1**a * _R2**b * _P**(-p), _X, _R1, _R2, _P, 0)
    result = finite_part_integral(monomials, 0)
    assert result["ln r0"] == 0
    assert float(result["finite"]) == pytest.approx(_perimeter_quadrature(a, b, p), rel=1e-7)


def _invariant_values(vectors: dict) -> dict:
    values = {}
    for name in (str(g) for g in inv.RING.gens):
        if name in ("r12", "ir12"):
            values[name] = 1
            continue
        for first in ("k", "y1", "y2", "v1", "v2"):
            rest = name[len(first):]
            if name.startswith(first) and rest in vectors:
                values[name] = sum(p * q for p, q in zip(vectors[first], vectors[rest]))
    return values


@pytest.mark.parametrize("n, directions, a, b", [
    (2, ("v1",), -3, -1), (3, (), -2, 0), (0, ("v1", "v2"), -3, -2), (2, (), -5, 1), (1, ("v1",), -4, -1),
    (3, (), -3, -3), (2, (), -7, 2)])
def test_polynomial_weights_reproduce_the_riesz_seeds(n, directions, a, b):
    # a second route inside the tool: the seeds of partie_finie (Riesz continuation, Hadamard
    # correction at the bodies, regulator centred on the origin); the pole flags of the seeds
    # are the Hadamard scales here
    c0 = sp.Rational(1, 3)
    k = (3, 5 * sp.I, 4)
    vectors = {"y1": (0, 0, c0 + sp.Rational(1, 2)), "y2": (0, 0, c0 - sp.Rational(1, 2)), "k": k,
               "v1": (sp.Rational(2, 7), 1, -1), "v2": (1, sp.Rational(-1, 2), sp.Rational(3, 5))}
    density = sum(p * q for p, q in zip(k, _X))**n * _R1**a * _R2**b
    for w in directions:
        density *= sum(p * q for p, q in zip(vectors[w], _X))
    mine = finite_part_integral(axisymmetric_monomials(density, _X, _R1, _R2, _P, c0), c0)
    values = {sp.Symbol(name): value for name, value in _invariant_values(vectors).items()}
    seeds = {key: sp.expand(v.as_expr().subs(values)) * sp.pi for key, v in partie_finie_seed_integral(n, directions, a, b).items()}
    assert sp.expand(mine["finite"] - seeds.get((0, 0, 0, 0, 0, 0), 0)) == 0
    assert sp.expand(mine["ln r0"] - seeds.get((0, 1, 0, 0, 0, 0), 0)) == 0
    assert sp.expand(mine["ln s1"] + mine["ln s2"] + seeds.get((0, 0, 0, 0, 0, 1), 0)) == 0


def test_a_pole_left_at_a_body_is_refused_not_dropped():
    # without its counterterms the logarithmic divergence of r1^-3 at body 1 is a pole
    import stfalgebra.moments.spheroidal_integrals as module
    original = module.counterterm_monomials
    module.counterterm_monomials = lambda monomials: ({}, 0, 0)
    try:
        with pytest.raises(ArithmeticError, match="pole at a body"):
            finite_part_integral(_power_density(-3, 0), 0)
    finally:
        module.counterterm_monomials = original
