"""The finite-part retarded integral: Box applied to the closed forms, the far-zone multipliers
against the radial Green function (quadrature) and against the Laurent expansion of the Gamma
functions (sympy)."""

from __future__ import annotations

from fractions import Fraction

import mpmath
import pytest
import sympy as sp

from stfalgebra.mpm.coefficient_ring import RING, gens, harmonic_number
from stfalgebra.mpm.harmonic_split import sample_harmonic
from stfalgebra.mpm.retarded_field import RetardedField
from stfalgebra.mpm.retarded_integral import (
    far_zone_multiplier, instantaneous_solution, pole_residue, pole_residue_wave,
)

ONE = RING.from_dict({(0,) * RING.nvars(): 1})


@pytest.mark.parametrize("l,k", [(1, 3), (2, 3), (2, 4), (3, 5), (4, 4), (5, 7)])
def test_box_of_the_instantaneous_solution_is_the_piece(l, k):
    g = gens()
    H = sample_harmonic(l, l + k)
    u = instantaneous_solution(H, l, k, g["s1"] ** 2, g["s1"])
    piece = RetardedField({l + k: H * g["s1"] ** 2}, g["s1"])
    assert (u.dalembertian() - piece).is_zero()


@pytest.mark.parametrize("l,k", [(1, 3), (2, 4), (4, 5)])
def test_far_zone_of_the_closed_form_is_the_multiplier(l, k):
    g = gens()
    u = instantaneous_solution(ONE, l, k, ONE, g["s1"])
    # leading 1/r term of u (the polynomial multiplying H(x) r^-l r^-1)
    assert u.terms[l + 1] == far_zone_multiplier(l, k, g["s1"])


def _mellin(l, s):
    """I_l(s) = 2^(-s) i^(l+s) Gamma(l+s) Gamma(1-s)/Gamma(l+2-s) (mpmath, complex powers principal)."""
    return mpmath.power(2, -s) * mpmath.exp(mpmath.mpc(0, 1) * mpmath.pi * (l + s) / 2) * mpmath.gamma(l + s) \
        * mpmath.gamma(1 - s) / mpmath.gamma(l + 2 - s)


# the non-pole cases (2, 3), (3, 4) tie the Gamma-function formula to the Box-checked closed form
@pytest.mark.parametrize("l,k", [(2, 3), (3, 4), (0, 3), (0, 4), (1, 5), (2, 6), (2, 7)])
@mpmath.workdps(80)
def test_finite_part_multiplier_is_the_laurent_expansion(l, k):
    # FP_(B=0) of (-i)^(l+2) omega^(k-3-B) r0^(-B) I_l(3 + B - k): the symmetric average
    # (f(eps) + f(-eps))/2 removes the pole and leaves FP + O(eps^2) (mpmath, 80 digits)
    omega, r0 = mpmath.mpf("1.7"), mpmath.mpf("2.3")
    eps = mpmath.mpf("1e-30")

    def f(B):
        return mpmath.mpc(0, -1) ** (l + 2) * omega ** (k - 3 - B) * r0 ** (-B) * _mellin(l, 3 + B - k)

    finite = (f(eps) + f(-eps)) / 2
    # ours, with rate = -i omega and lg = -(EulerGamma + ln(-i omega))
    values = {"s1": mpmath.mpc(0, -1) * omega,
              "lg": -(mpmath.euler + mpmath.log(omega)) + mpmath.mpc(0, 1) * mpmath.pi / 2,
              "log2": mpmath.log(2), "logr0": mpmath.log(r0)}
    ours = mpmath.mpc(0)
    for exponents, value in far_zone_multiplier(l, k, gens()["s1"]).to_dict().items():
        term = mpmath.mpf(int(value.p)) / int(value.q)
        for name, e in zip(RING.names(), exponents):
            if e:
                term *= values[name] ** int(e)
        ours += term
    assert abs(ours - finite) < mpmath.mpf("1e-40") * (1 + abs(finite))


@mpmath.workdps(8)
def test_k2_far_zone_against_the_radial_green_function():
    # r exp(-i omega r) R(r) at large r against the k = 2 multiplier (omega = 1, l = 2), with
    # R(r) = -i omega [h_l(wr) int_0^r e^(iwr') j_l dr' + j_l(wr) int_r^oo e^(iwr') h_l dr']
    # (outgoing radial Green function, quadrature by mpmath); the error falls like ln(r)/r
    l = 2

    def j(x):
        return mpmath.sqrt(mpmath.pi / (2 * x)) * mpmath.besselj(l + mpmath.mpf(1) / 2, x)

    def h(x):
        return j(x) + 1j * mpmath.sqrt(mpmath.pi / (2 * x)) * mpmath.bessely(l + mpmath.mpf(1) / 2, x)

    lg = -mpmath.euler + 1j * mpmath.pi / 2     # -(EulerGamma + ln(-i omega))
    errors = []
    for radius in (mpmath.mpf(16), mpmath.mpf(64)):
        inner = mpmath.quad(lambda x: mpmath.exp(1j * x) * j(x), mpmath.linspace(0, radius, int(radius) // 4))
        outer = mpmath.quadosc(lambda x: mpmath.exp(1j * x) * h(x), [radius, mpmath.inf], omega=2)
        value = -1j * (h(radius) * inner + j(radius) * outer) * radius * mpmath.exp(-1j * radius)
        # multiplier z [lg/2 + H_l - log2/2 - logr/2], z = 1/rate = 1/(-i omega)
        predicted = (lg / 2 + float(harmonic_number(l)) - mpmath.log(2) / 2 - mpmath.log(radius) / 2) / (-1j)
        errors.append(abs(value - predicted))
    assert errors[1] < 0.1 and errors[1] < 0.6 * errors[0]


def test_pole_residue_is_the_residue_of_the_multiplier():
    # the 1/r part of C d_L[F^(j)/r] is (-1)^l C rate^(l+j) nhat_L; the multiplier's pole is
    # its coefficient of -logr0 (the factor r0^-B = 1 - B ln r0)
    g = gens()
    for l, k in [(0, 3), (1, 5), (2, 7), (3, 6)]:
        value, order = pole_residue(l, k)
        wave = pole_residue_wave(sample_harmonic(l, k), l, k, ONE, g["s1"])
        assert wave.dalembertian().is_zero()
        assert order == k - l - 3 and value != 0
        pole = -far_zone_multiplier(l, k, g["s1"]).derivative("logr0")
        assert wave.terms[l + 1] == sample_harmonic(l, k) * pole
