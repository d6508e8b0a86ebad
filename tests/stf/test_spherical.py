"""Tests of the STF <-> spherical-component conversion (stfalgebra/stf/spherical.py)."""

from __future__ import annotations

import math

import pytest
import sympy as sp
from hypothesis import example, given, settings
from hypothesis import strategies as st
from scipy.special import sph_harm_y

from stfalgebra.stf.cartesian import PROBE, harmonic_part_cartesian, polynomial_from_coefficients
from stfalgebra.stf.harmonics import solid_harmonic
from stfalgebra.stf.spherical import spherical_to_stf, stf_to_spherical

k1, k2, k3 = PROBE
PROPERTY = settings(max_examples=12, deadline=None)


def multi_indices(rank: int):
    return [(a, b, rank - a - b) for a in range(rank + 1) for b in range(rank - a + 1)]


small_rationals = st.builds(sp.Rational, st.integers(-6, 6), st.integers(1, 5))
gaussian_rationals = st.builds(lambda re, im: re + sp.I * im, small_rationals, small_rationals)


@st.composite
def stf_tensors(draw, max_rank: int = 6, complex_values: bool = False):
    """A random STF tensor: the harmonic projection of a random polynomial."""
    rank = draw(st.integers(0, max_rank))
    values = gaussian_rationals if complex_values else small_rationals
    polynomial = polynomial_from_coefficients({key: draw(values) for key in multi_indices(rank)})
    return harmonic_part_cartesian(polynomial, rank), rank


@st.composite
def component_sets(draw, max_rank: int = 6):
    rank = draw(st.integers(0, max_rank))
    orders = draw(st.sets(st.integers(-rank, rank)))
    return {order: draw(gaussian_rationals) for order in orders}, rank


@PROPERTY
@given(stf_tensors(complex_values=True))
@example((sp.Integer(5), 0))
@example((k1 - 2 * k3, 1))
def test_round_trip_from_tensor(data):
    # T_<L> = sum_m (T_L alpha_L^lm) Y^lm_L exactly
    tensor, rank = data
    assert sp.expand(spherical_to_stf(stf_to_spherical(tensor, rank), rank) - tensor) == 0


@PROPERTY
@given(component_sets())
@example(({}, 3))
@example(({0: sp.Integer(1)}, 0))
def test_round_trip_from_components(data):
    # alpha_L^lm Y^lm'_L = delta_mm'
    components, rank = data
    recovered = stf_to_spherical(spherical_to_stf(components, rank), rank)
    assert set(recovered) == set(range(-rank, rank + 1))
    for order, value in recovered.items():
        assert sp.expand(value - components.get(order, 0)) == 0


@PROPERTY
@given(stf_tensors(max_rank=5), st.integers(-5, 5), st.integers(-5, 5))
def test_contraction_with_unit_vector_is_harmonic_sum(data, u, v):
    # convention: T_L n_L = sum_m t_m Y_lm(n); Y_lm(n) from scipy (independent), n on the sphere
    tensor, rank = data
    denominator = 1 + (u / 3) ** 2 + (v / 2) ** 2
    n = (2 * (u / 3) / denominator, 2 * (v / 2) / denominator, (1 - (u / 3) ** 2 - (v / 2) ** 2) / denominator)
    polar, azimuth = math.acos(n[2]), math.atan2(n[1], n[0])
    components = stf_to_spherical(tensor, rank)
    left = complex(tensor.subs({k1: n[0], k2: n[1], k3: n[2]}))
    right = sum(complex(value) * complex(sph_harm_y(rank, order, polar, azimuth)) for order, value in components.items())
    assert abs(left - right) < 1e-10 * max(1.0, abs(left))


@PROPERTY
@given(stf_tensors(max_rank=6))
def test_real_tensor_components_are_conjugate_symmetric(data):
    # common practice: for a real tensor t_{-m} = (-1)^m conj(t_m)
    tensor, rank = data
    components = stf_to_spherical(tensor, rank)
    for order in range(rank + 1):
        assert sp.expand(components[-order] - (-1) ** order * sp.conjugate(components[order])) == 0


def test_only_stf_part_matters():
    # alpha_L^lm is trace-free: adding |k|^2 times anything changes nothing
    tensor = 3 * k1**3 - k1 * k2 * k3 + k3**3
    trace = (k1**2 + k2**2 + k3**2) * (k1 - 7 * k2)
    assert stf_to_spherical(tensor + trace, 3) == stf_to_spherical(tensor, 3)
    assert sp.expand(spherical_to_stf(stf_to_spherical(tensor, 3), 3) - harmonic_part_cartesian(tensor, 3)) == 0


def test_solid_harmonic_has_unit_component():
    # definition: Y^lm_L has t_m' = delta_mm'
    for rank in range(0, 5):
        for order in range(-rank, rank + 1):
            components = stf_to_spherical(solid_harmonic(rank, order), rank)
            assert components == {m: (1 if m == order else 0) for m in range(-rank, rank + 1)}


def test_symbolic_components():
    # a symbolic tensor of the kind the moments layer passes in
    mu, r = sp.symbols("mu r", positive=True)
    tensor = harmonic_part_cartesian(mu * r**2 * (k1**2 + 2 * k1 * k2), 2)
    components = stf_to_spherical(tensor, 2)
    assert all(sp.expand(value / (mu * r**2)).free_symbols == set() for value in components.values())
    assert sp.expand(spherical_to_stf(components, 2) - tensor) == 0
    # worked by hand: t_2 = alpha_L^22 (e_x e_x + e_x e_y + e_y e_x) mu r^2 = (1 - 2 i) sqrt(2 pi/15) mu r^2
    assert sp.expand(components[2] - (1 - 2 * sp.I) * sp.sqrt(2 * sp.pi / 15) * mu * r**2) == 0


def test_vector_components():
    # worked by hand from r Y_1m (from memory): T = e_z gives t_0 = sqrt(4 pi/3), others 0
    assert stf_to_spherical(k3, 1) == {-1: 0, 0: sp.sqrt(4 * sp.pi / 3), 1: 0}


# ------------------------------------------------------------------ bad input


def test_bad_orders_and_ranks():
    with pytest.raises(ValueError, match="m=3"):
        spherical_to_stf({3: 1}, 2)
    with pytest.raises(ValueError, match="0.5"):
        spherical_to_stf({0.5: 1}, 2)
    with pytest.raises(ValueError, match="-1"):
        spherical_to_stf({}, -1)
    with pytest.raises(TypeError, match="mapping"):
        spherical_to_stf([1, 2, 3], 1)
    with pytest.raises(ValueError, match="degree"):
        stf_to_spherical(k1**2, 3)
    with pytest.raises(ValueError, match="2.5"):
        stf_to_spherical(k1**2, 2.5)
