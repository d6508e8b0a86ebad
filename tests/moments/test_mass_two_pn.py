"""The 2PN mass moments of two point masses (stfalgebra/moments/mass_two_pn.py) against
published moments, conserved quantities and the project's independent 1PN route.

Published values quoted here were recalled from memory (the project's search tool reaches only
the papers' abstracts); each is marked so.
"""

from __future__ import annotations

import pytest
import sympy as sp

from stfalgebra.binary.circular import circular_frequency_squared
from stfalgebra.binary.dynamics import conserved_energy
from stfalgebra.binary.masses import reduce_mass_difference
from stfalgebra.moments.mass import mass_moment
from stfalgebra.moments.mass_two_pn import mass_moment_two_pn
from stfalgebra.symbols import G, delta, m, nu, phidot, r, rdot

EPS = sp.Symbol("eps", positive=True)
GAMMA = sp.Symbol("gamma")
MU = m * nu
V2 = rdot**2 + r**2 * phidot**2


def _value(series, order):
    """A series coefficient as a sympy expression (the moments hold engine polynomials)."""
    value = series.coefficient(order)
    return value.to_sympy() if hasattr(value, "to_sympy") else sp.sympify(value)


def _coefficient(tensor, key, order):
    series = tensor.terms.get(key)
    return sp.expand(_value(series, order)) if series is not None and order in series.orders else 0


def _reduced(expression):
    return sp.expand(reduce_mass_difference(sp.expand(expression)))


def _circular_in_gamma(tensor, key):
    """The coefficient of ``key`` on a circular orbit, as a polynomial in gamma = G m/(r c^2)
    (phidot^2 the 2PN circular frequency, derived by the binary layer)."""
    series = tensor.terms[key]
    omega_squared = circular_frequency_squared(2).to_expression(EPS)
    expression = sum(_value(series, order) * EPS**(2 * order) for order in series.orders)
    # mass moments carry phidot in even powers only (through v^2)
    expression = sp.expand(sp.expand(expression.subs(rdot, 0)).subs(phidot**2, omega_squared))
    expression = sp.expand(expression.subs(EPS, sp.sqrt(GAMMA * r / (G * m))))
    return sum(expression.coeff(GAMMA, power) * GAMMA**power for power in range(3))


def test_mass_monopole_is_the_mass_energy():
    # M = m + E/c^2 with E the conserved 1PN energy of the binary (the ADM mass; common
    # practice); E is the binary layer's, itself checked by its conservation along the 1PN orbit
    monopole = mass_moment_two_pn(0)
    energy = conserved_energy(1)
    assert _coefficient(monopole, (0, 0, 0), 0) == m
    assert _reduced(_coefficient(monopole, (0, 0, 0), 1) - MU * energy.coefficient(0)) == 0
    assert _reduced(_coefficient(monopole, (0, 0, 0), 2) - MU * energy.coefficient(1)) == 0


def test_mass_dipole_vanishes_in_the_centre_of_mass_frame():
    # the centre-of-mass frame is where I_i = 0; this checks the 2PN moment together with the
    # 2PN centre-of-mass relations of the binary layer (which have no other check)
    dipole = mass_moment_two_pn(1)
    assert dipole.terms  # the structures are there ...
    for series in dipole.terms.values():  # ... and vanish at every order
        assert all(_reduced(_value(series, order)) == 0 for order in series.orders)


def test_quadrupole_on_circular_orbits():
    # Blanchet, Damour & Iyer, Phys. Rev. D 51, 5360 (1995) (also Blanchet, Living Rev. Relativ.
    # 17, 2 (2014)), 2PN circular quadrupole, from memory:
    # I_ij = mu x_<ij> [1 - gamma (1/42 + 13 nu/14) + gamma^2 (-461/1512 - 18395 nu/1512 - 241 nu^2/1512)]
    #      + mu (r^2/c^2) v_<ij> [11/21 - 11 nu/7 + gamma (1607/378 - 1681 nu/378 + 229 nu^2/378)]
    quadrupole = mass_moment_two_pn(2)
    x_part = _circular_in_gamma(quadrupole, (2, 0, 0)) / MU
    expected = (1 - GAMMA * (sp.Rational(1, 42) + sp.Rational(13, 14) * nu)
                + GAMMA**2 * (-sp.Rational(461, 1512) - sp.Rational(18395, 1512) * nu - sp.Rational(241, 1512) * nu**2))
    assert sp.expand(x_part - expected) == 0
    v_part = _circular_in_gamma(quadrupole, (0, 2, 0)) / (MU * r**2) * G * m / (GAMMA * r)
    expected = (sp.Rational(11, 21) - sp.Rational(11, 7) * nu
                + GAMMA * (sp.Rational(1607, 378) - sp.Rational(1681, 378) * nu + sp.Rational(229, 378) * nu**2))
    assert sp.expand(v_part - expected) == 0


def test_quadrupole_general_orbit_potential_terms():
    # general-orbit 2PN quadrupole (Gopakumar & Iyer, Phys. Rev. D 56, 7708 (1997); Blanchet,
    # Living Rev. Relativ. 17, 2 (2014)), x_<ij> part, from memory, the two terms recalled with
    # confidence: (G m/r)^2 (-355/252 - 953 nu/126 + 337 nu^2/252) and
    # v^2 (G m/r) (2021/756 - 5947 nu/756 - 4883 nu^2/756)
    coefficient = _coefficient(mass_moment_two_pn(2), (2, 0, 0), 2) / MU
    potential_squared = sp.expand(coefficient.subs({rdot: 0, phidot: 0}))
    assert _reduced(potential_squared - (G * m / r)**2 * (-sp.Rational(355, 252) - sp.Rational(953, 126) * nu
                                                           + sp.Rational(337, 252) * nu**2)) == 0
    # v^2 G m/r with rdot = 0: the phidot^2 r^2 (G m/r) part
    speed_term = sp.expand(coefficient.subs(rdot, 0)).coeff(phidot, 2).coeff(G, 1)
    assert _reduced(speed_term * phidot**2 - V2.subs(rdot, 0) * (m / r) * (
        sp.Rational(2021, 756) - sp.Rational(5947, 756) * nu - sp.Rational(4883, 756) * nu**2)) == 0


def test_octupole_on_circular_orbits():
    # Blanchet, Iyer & Joguet, Phys. Rev. D 65, 064005 (2002) (also the 2014 Living Review),
    # 2PN circular mass octupole, from memory:
    # I_ijk = -nu m delta { x_<ijk> [1 - gamma nu + gamma^2 (-139/330 - 11923 nu/660 - 29 nu^2/110)]
    #          + (r^2/c^2) x_<i v_jk> [1 - 2 nu + gamma (1066/165 - 1433 nu/330 + 21 nu^2/55)] }
    octupole = mass_moment_two_pn(3)
    prefactor = -nu * m * delta
    x_part = _circular_in_gamma(octupole, (3, 0, 0)) / prefactor
    expected = (1 - GAMMA * nu
                + GAMMA**2 * (-sp.Rational(139, 330) - sp.Rational(11923, 660) * nu - sp.Rational(29, 110) * nu**2))
    assert sp.expand(x_part - expected) == 0
    v_part = _circular_in_gamma(octupole, (1, 2, 0)) / (prefactor * r**2) * G * m / (GAMMA * r)
    expected = (1 - 2 * nu + GAMMA * (sp.Rational(1066, 165) - sp.Rational(1433, 330) * nu
                                      + sp.Rational(21, 55) * nu**2))
    assert sp.expand(v_part - expected) == 0


@pytest.mark.parametrize("l", [0, 2, 3])
def test_newtonian_and_one_pn_parts_agree_with_the_one_pn_route(l):
    # independent route: stfalgebra.moments.mass at pn_order = 1 (the 1PN formula (M1) with its
    # own point-particle algebra), published-checked at l = 2 in test_mass.py
    two_pn = mass_moment_two_pn(l)
    one_pn = mass_moment(l, 1)
    for key in set(two_pn.terms) | set(one_pn.terms):
        for order in (0, 1):
            assert _reduced(_coefficient(two_pn, key, order) - _coefficient(one_pn, key, order)) == 0, (key, order)


@pytest.mark.parametrize("l", [2, 3, 5, 8])
def test_exchange_of_the_bodies(l):
    # relabelling the bodies maps x -> -x, v -> -v, delta -> -delta: every coefficient of
    # x_<A v_B> (a + b = l) picks up (-1)^l under delta -> -delta (symmetry)
    for series in mass_moment_two_pn(l).terms.values():
        for order in series.orders:
            value = _value(series, order)
            assert _reduced(value.subs(delta, -delta) - (-1)**l * value) == 0


def test_no_regularisation_constant_survives():
    # the finite part's r0 and Hadamard's scales cancel (finite_part module docstring, steps 3-4);
    # the seeds' poles and logarithms are different at every l, so several l are checked
    for l in (2, 3, 5, 8):
        for series in mass_moment_two_pn(l).terms.values():
            for order in series.orders:
                value = _value(series, order)
                assert not value.has(sp.log) and not value.has(sp.pi) and not value.has(sp.EulerGamma)


def test_through_the_mass_moment_api():
    tensor = mass_moment(2, 2)
    assert tensor.terms[(2, 0, 0)].known_through == sp.Rational(5, 2)
    assert "2PN" in tensor.provenance[-1]


def test_hexadecapole_gives_the_published_two_pn_h44():
    # Blanchet, Faye, Iyer & Sinha, Class. Quantum Grav. 25, 165003 (2008) (also the 2014 Living
    # Review), circular h_44 through 2PN, from memory:
    # Hhat_44 = -(8/9) sqrt(5/7) [(1 - 3 nu) x + x^2 (-593/110 + 1273 nu/66 - 175 nu^2/22)
    #           + 4 pi (1 - 3 nu) x^(5/2) + x^3 (1068671/200200 - 1088119 nu/28600
    #           + 146879 nu^2/2340 - 226097 nu^3/17160) + ...].
    # At relative 2PN the l = 4 radiative moment is d^4 I_ijkl/dt^4 (tails start at 1.5PN, other
    # non-linear terms and the source/canonical difference at 2.5PN; common practice), so the
    # real x^2 and x^3 terms come from I_ijkl alone. On the circular orbit the m = 4 part of
    # x_<A v_B> (a + b = 4) is (r/2)^4 (-i omega)^b Z+^4 (channel algebra of orbit_tensor.py),
    # and d^4/dt^4 gives (-4 i omega)^4; relative to the Newtonian value the bracket is
    # (x/gamma)^4 sum_b c_b (-i omega)^b/(nu m (1 - 3 nu)), gamma = G m/(r c^2).
    hexadecapole = mass_moment_two_pn(4)
    omega_squared = circular_frequency_squared(2).to_expression(EPS)
    total = sum(_value(series, order) * EPS**(2 * order) * (-sp.I * phidot)**b
                for (a, b, c), series in hexadecapole.terms.items() for order in series.orders)
    total = sp.expand(sp.expand(total.subs(rdot, 0)).subs(phidot**2, omega_squared))
    assert sp.expand(total.coeff(EPS, 0) - nu * m * (1 - 3 * nu)) == 0  # the Newtonian normalisation
    to_gamma = {EPS: sp.sqrt(GAMMA * r / (G * m))}
    total = sp.expand(total.subs(to_gamma))                     # a polynomial in gamma
    frequency = sp.expand((omega_squared * r**3 / (G * m)).subs(to_gamma))   # 1 + f1 gamma + f2 gamma^2
    f1, f2 = frequency.coeff(GAMMA, 1), frequency.coeff(GAMMA, 2)
    # (x/gamma)^4 = frequency^(4/3) through gamma^2
    x_over_gamma_4 = 1 + sp.Rational(4, 3) * f1 * GAMMA + (sp.Rational(4, 3) * f2 + sp.Rational(2, 9) * f1**2) * GAMMA**2
    bracket = sp.expand(total * x_over_gamma_4)
    first = sp.cancel(bracket.coeff(GAMMA, 1) / (nu * m * (1 - 3 * nu)))
    second = sp.cancel(bracket.coeff(GAMMA, 2) / (nu * m * (1 - 3 * nu)))
    # gamma = x [1 + (1 - nu/3) x + ...] (binary layer, circular_gamma)
    in_x = {1: first, 2: sp.expand(first * (1 - nu / 3) + second)}
    published = {
        1: -sp.Rational(593, 110) + sp.Rational(1273, 66) * nu - sp.Rational(175, 22) * nu**2,
        2: (sp.Rational(1068671, 200200) - sp.Rational(1088119, 28600) * nu
            + sp.Rational(146879, 2340) * nu**2 - sp.Rational(226097, 17160) * nu**3),
    }
    for power in (1, 2):
        assert sp.cancel(in_x[power] * (1 - 3 * nu) - published[power]) == 0, power
