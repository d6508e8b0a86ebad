"""Orbit tensors: the STF identity used by the moment formulas, channels, time derivative."""

from __future__ import annotations

import random

import pytest
import sympy as sp

from stfalgebra.moments.orbit_tensor import OrbitTensor, channel_of_monomial
from stfalgebra.stf.tensors import SymmetricTensor
from stfalgebra.stf.vectors import Vector, dot
from stfalgebra.symbols import phidot, r, rdot


@pytest.mark.parametrize("l", range(1, 6))
def test_contraction_identity_of_the_moment_formulas_against_the_stf_core(l):
    # x_<aL> v_a = x_<L> (x.v) - (l/(2l+1)) x^2 x_<L-1 v_il>  (from Thorne 1980, Rev. Mod.
    # Phys. 52, 299, eq. (2.2)); checked here with the abstract STF core.
    xv, vv = Vector("x"), Vector("v")
    left = SymmetricTensor.from_vectors(*([xv] * (l + 1))).stf().contract_vector(vv)
    right = (SymmetricTensor.from_vectors(*([xv] * l), coefficient=dot(xv, vv))
             - SymmetricTensor.from_vectors(*([xv] * (l - 1) + [vv]),
                                            coefficient=sp.Rational(l, 2 * l + 1) * dot(xv, xv)))
    difference = (left.stf() - right.stf())
    assert difference.is_zero()


def test_channels_reproduce_the_probe_polynomial():
    # (x.k)^a (v.k)^b (ell.k)^c = sum_pq C_pqc Z+^p Z-^q u_z^c with Z+- = k.(n +- i lambda),
    # n = (cos phi, sin phi, 0), lambda = (-sin phi, cos phi, 0): checked at random numbers.
    rng = random.Random(3)
    for a, b, c in [(2, 0, 0), (1, 1, 0), (0, 3, 0), (2, 1, 1), (0, 2, 1)]:
        values = {r: rng.uniform(1, 3), rdot: rng.uniform(-1, 1), phidot: rng.uniform(0.1, 1)}
        ph = rng.uniform(0, 6)
        k = [rng.uniform(-1, 1) for _ in range(3)]
        n = (sp.cos(ph), sp.sin(ph), 0)
        lam = (-sp.sin(ph), sp.cos(ph), 0)
        dot3 = lambda u, w: sum(ui * wi for ui, wi in zip(u, w))
        xk = values[r] * dot3(n, k)
        vk = values[rdot] * dot3(n, k) + values[r] * values[phidot] * dot3(lam, k)
        lk = values[r]**2 * values[phidot] * k[2]
        direct = complex(sp.N(xk**a * vk**b * lk**c))
        zp = dot3(n, k) + sp.I * dot3(lam, k)
        zm = dot3(n, k) - sp.I * dot3(lam, k)
        total = 0
        for p in range(a + b + 1):
            coeff = channel_of_monomial(a, b, c, p, a + b - p).subs(values)
            total += coeff * zp**p * zm**(a + b - p) * k[2]**c
        assert abs(complex(sp.N(total)) - direct) < 1e-12


def test_errors():
    with pytest.raises(ValueError):
        OrbitTensor(2, {(1, 0, 0): 1})
    with pytest.raises(ValueError):
        OrbitTensor(-1, {})
