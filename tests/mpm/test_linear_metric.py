"""The linear multipolar metric: wave equation, harmonic gauge, Newtonian and Lense-Thirring limits."""

from __future__ import annotations

import pytest

from stfalgebra.mpm.coefficient_ring import RING, gens
from stfalgebra.mpm.harmonic_split import sample_harmonic
from stfalgebra.mpm.linear_metric import LinearMoment, linear_metric, metric_component
from stfalgebra.mpm.retarded_field import RetardedField, multipole_wave

ONE = RING.from_dict({(0,) * RING.nvars(): 1})


def _moments():
    yield LinearMoment("M", 0, ONE, "s1", constant=True)
    yield LinearMoment("S", 1, sample_harmonic(1), "s1", constant=True)
    for l in (2, 3, 4):
        yield LinearMoment("M", l, sample_harmonic(l, l), "s1")
        yield LinearMoment("S", l, sample_harmonic(l, l + 1), "s2")


@pytest.mark.parametrize("moment", list(_moments()), ids=lambda m: f"{m.kind}{m.rank}")
def test_linear_metric_solves_the_wave_equation_in_harmonic_gauge(moment):
    h = linear_metric(moment)
    for key, field in h.items():
        assert field.dalembertian().is_zero(), key
    for mu in range(4):
        divergence = RetardedField.zero(moment.rate)
        for nu in range(4):
            divergence = divergence + metric_component(h, mu, nu).derivative(nu)
        assert divergence.is_zero(), mu


def test_mass_monopole_gives_the_newtonian_potential():
    # g_00 = -1 + 2M/r at linear order; h^00 = -4M/r (common practice: gothic metric)
    h = linear_metric(LinearMoment("M", 0, ONE, "s1", constant=True))
    assert h[0, 0].terms == {1: ONE * -4}
    assert all(not field.terms for key, field in h.items() if key != (0, 0))


def test_current_dipole_gives_the_lense_thirring_field():
    # g_0i = -2 eps_ijk J_j x_k / r^3 (Misner, Thorne & Wheeler, Gravitation, eq. (19.5),
    # from memory); at linear order h^0i = g_0i (gothic metric, signature -+++)
    g = gens()
    spin = 2 * g["x1"] - g["x2"] + 3 * g["x3"]   # S_i = (2, -1, 3)
    h = linear_metric(LinearMoment("S", 1, spin, "s1", constant=True))
    J = (2, -1, 3)
    x = (g["x1"], g["x2"], g["x3"])
    for i in range(3):
        expected = sum(-2 * J[j] * x[k] * _epsilon(i, j, k) for j in range(3) for k in range(3))
        difference = h[0, i + 1] - RetardedField({3: expected + 0 * ONE}, h[0, i + 1].rate)
        assert difference.is_zero()


def _epsilon(i, j, k):
    return (i - j) * (j - k) * (k - i) // 2


@pytest.mark.parametrize("l", [0, 1, 2, 3, 4])
def test_multipole_wave_matches_repeated_differentiation(l):
    # d_L [F(t - r)/r] H_L = H(d) [F/r]: apply the derivatives one monomial at a time
    g = gens()
    H = sample_harmonic(l, 3)
    rate = g["s1"]
    base = RetardedField({1: ONE}, rate)
    total = RetardedField.zero(rate)
    for exponents, value in H.to_dict().items():
        field = base
        for name, times in zip(("x1", "x2", "x3"), exponents[3:6]):
            for _ in range(times):
                field = field.space_derivative(("x1", "x2", "x3").index(name) + 1)
        total = total + field.scale(value)
    assert (total - multipole_wave(H, l, ONE, rate)).is_zero()
