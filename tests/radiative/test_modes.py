"""Mode amplitudes Hhat_lm: leading order for every l, 1PN corrections, symmetries, refusals.

Reference values and their sources are named beside each check.
"""

from __future__ import annotations

import random
from math import factorial

import pytest
import sympy as sp

from stfalgebra.errors import OrderBeyondInputsError, RefusedModeError
from stfalgebra.radiative.modes import derive_mode, derive_modes, leading_order
from stfalgebra.stf.harmonics import spin_weighted_harmonic
from stfalgebra.symbols import G, Phi, R, Theta, c, delta, m, nu, phi, phidot, r, rdot, x

omega = sp.Symbol("omega", positive=True)


def _same(a, b) -> bool:
    return sp.simplify(sp.expand(a - b)) == 0


# --------------------------------------------------------------------------- leading order
def _ylm_equator(l: int, m: int) -> sp.Expr:
    """Y_lm(pi/2, 0) for l + m even, Condon-Shortley phase (closed form, from memory):
    (-1)^((l+m)/2) sqrt((2l+1)/(4 pi) (l-m)! (l+m)!) / (2^l ((l-m)/2)! ((l+m)/2)!)."""
    if (l + m) % 2:
        return sp.Integer(0)
    return ((-1)**((l + m) // 2) * sp.sqrt(sp.Rational(2 * l + 1) / (4 * sp.pi)
            * factorial(l - m) * factorial(l + m))
            / (2**l * factorial((l - m) // 2) * factorial((l + m) // 2)))


def _double_factorial(n: int) -> int:
    out = 1
    while n > 1:
        out, n = out * n, n - 2
    return out


def _leading_reference(l: int, m: int) -> sp.Expr:
    """Leading Hhat_lm of a circular orbit, in the closed all-l form of Kidder (2008), Phys.
    Rev. D 77, 044016, Sec. IV (his mass-type and current-type expressions, rebuilt from
    memory in terms of Y_lm(pi/2, 0)). His polarisation triad (e_Theta, e_Phi) gives every
    h_lm the opposite overall sign; the sign below is that of ../shared/conventions.md
    (P = -e_Phi, Q = e_Theta), i.e. minus Kidder's.

    Mass modes: I_L = mu s_l x_<L>, s_l = X2^(l-1) + (-1)^l X1^(l-1), U_L -> (-i m omega)^l,
    alpha_L^lm n_L = (4 pi l!/(2l+1)!!) conj(Y_lm(n)).
    Current modes: J_L = mu s_(l+1) eps x_(L-1) v, and d_z (r^l Y_lm) =
    sqrt((2l+1)(l^2-m^2)/(2l-1)) r^(l-1) Y_(l-1,m) (ladder identity, from memory).
    """
    X1, X2 = (1 + delta) / 2, (1 - delta) / 2
    mu = m * nu
    v = r * omega
    if (l + m) % 2 == 0:
        s = X2**(l - 1) + (-1)**l * X1**(l - 1)
        alpha_n = 4 * sp.pi * factorial(l) / _double_factorial(2 * l + 1) * _ylm_equator(l, m)
        U = mu * s * r**l * alpha_n * (-sp.I * m * omega)**l
        norm = sp.Rational(4, factorial(l)) * sp.sqrt(sp.Rational((l + 1) * (l + 2), 2 * l * (l - 1)))
        h = -G / (sp.sqrt(2) * R * c**(l + 2)) * norm * U
    else:
        s = X2**l + (-1)**(l + 1) * X1**l
        ladder = sp.sqrt(sp.Rational((2 * l + 1) * (l * l - m * m), 2 * l - 1))
        alpha_nz = 4 * sp.pi * factorial(l) / _double_factorial(2 * l + 1) / l * ladder * _ylm_equator(l - 1, m)
        V = mu * s * r**(l - 1) * r * v * alpha_nz * (-sp.I * m * omega)**l
        norm = -sp.Rational(8, factorial(l)) * sp.sqrt(sp.Rational(l * (l + 2), 2 * (l + 1) * (l - 1)))
        h = -G / (sp.sqrt(2) * R * c**(l + 2)) * (-sp.I / c) * norm * V
    hhat = h / (2 * G * m * nu * x / (R * c**2) * sp.sqrt(16 * sp.pi / 5))
    hhat = hhat.subs(omega, c**3 * x**sp.Rational(3, 2) / (G * m)).subs(r, G * m / (c**2 * x))
    from stfalgebra.binary.masses import reduce_mass_difference
    return reduce_mass_difference(sp.expand(sp.powsimp(sp.expand(hhat), force=True)))


@pytest.mark.parametrize("l", range(2, 9))
def test_leading_term_of_every_mode_against_the_closed_all_l_form(l):
    for mm in range(-l, l + 1):
        if mm == 0:
            continue
        derived = derive_mode(l, mm, pn_relative=0).hhat
        assert _same(derived, _leading_reference(l, mm)), (l, mm)


def test_leading_orders_of_published_low_modes():
    # Blanchet, Living Rev. Relativ. 17, 2 (2014), eq. (9.4): leading terms (from memory)
    assert derive_mode(2, 2, pn_relative=0).hhat == 1
    assert _same(derive_mode(2, 1, pn_relative=0).hhat, sp.I * delta * sp.sqrt(x) / 3)
    assert _same(derive_mode(3, 3, pn_relative=0).hhat,
                 -sp.Rational(3, 4) * sp.I * sp.sqrt(sp.Rational(15, 14)) * delta * sp.sqrt(x))
    assert _same(derive_mode(3, 2, pn_relative=0).hhat, sp.sqrt(sp.Rational(5, 7)) * (1 - 3 * nu) * x / 3)
    assert _same(derive_mode(4, 4, pn_relative=0).hhat,
                 -sp.Rational(8, 9) * sp.sqrt(sp.Rational(5, 7)) * (1 - 3 * nu) * x)


# --------------------------------------------------------------------------------- 1PN
ONE_PN = {
    # Blanchet, Living Rev. Relativ. 17, 2 (2014), eq. (9.4); Kidder (2008) (from memory)
    (2, 2): 1 + x * (-sp.Rational(107, 42) + sp.Rational(55, 42) * nu),
    (2, 1): sp.I * delta / 3 * (sp.sqrt(x) + x**sp.Rational(3, 2) * (-sp.Rational(17, 28) + sp.Rational(5, 7) * nu)),
    (3, 3): -sp.Rational(3, 4) * sp.I * sp.sqrt(sp.Rational(15, 14)) * delta
    * (sp.sqrt(x) + x**sp.Rational(3, 2) * (-4 + 2 * nu)),
    (3, 1): sp.I * delta / (12 * sp.sqrt(14)) * (sp.sqrt(x) - x**sp.Rational(3, 2) * (sp.Rational(8, 3) + sp.Rational(2, 3) * nu)),
    # issue statement: Blanchet 2014, from memory
    (3, 2): sp.sqrt(sp.Rational(5, 7)) / 3 * (x * (1 - 3 * nu)
            + x**2 * (-sp.Rational(193, 90) + sp.Rational(145, 18) * nu - sp.Rational(73, 18) * nu**2)),
    (4, 4): -sp.Rational(8, 9) * sp.sqrt(sp.Rational(5, 7)) * (x * (1 - 3 * nu)
            + x**2 * (-sp.Rational(593, 110) + sp.Rational(1273, 66) * nu - sp.Rational(175, 22) * nu**2)),
}


@pytest.mark.parametrize("lm", sorted(ONE_PN))
def test_first_correction_against_published_modes(lm):
    l, mm = lm
    assert _same(derive_mode(l, mm, pn_relative=1).hhat, ONE_PN[lm])


def test_absolute_order_counts_powers_of_x():
    # --pn 1: the (2,2) mode through x, (2,1) through x^(1/2), (4,4) leading only, (5,5) ...
    assert _same(derive_mode(2, 1, pn=1).hhat, sp.I * delta * sp.sqrt(x) / 3)
    assert _same(derive_mode(4, 4, pn=1).hhat, -sp.Rational(8, 9) * sp.sqrt(sp.Rational(5, 7)) * (1 - 3 * nu) * x)
    assert derive_mode(6, 6, pn=1).hhat == 0


def test_exchange_of_the_bodies_maps_every_mode_onto_itself():
    # delta -> -delta, phi -> phi + pi: Hhat_lm(-delta) = (-1)^m Hhat_lm(delta) (common practice)
    for l in range(2, 6):
        for mm in range(1, l + 1):
            h = derive_mode(l, mm, pn_relative=1).hhat
            assert _same(h.subs(delta, -delta), (-1)**mm * h), (l, mm)


def test_planar_symmetry_between_m_and_minus_m():
    # h_{l,-m} = (-1)^l conj(h_lm) for planar orbits (../shared/conventions.md)
    for l in range(2, 6):
        for mm in range(1, l + 1):
            plus = derive_mode(l, mm, pn_relative=1).hhat
            minus = derive_mode(l, -mm, pn_relative=1).hhat
            assert _same(minus, (-1)**l * sp.conjugate(plus)), (l, mm)
    gen_plus = derive_mode(3, 1, orbit="general", pn_relative=1).hhat
    gen_minus = derive_mode(3, -1, orbit="general", pn_relative=1).hhat
    # exp(-i m phi) carries the rest of the conjugation: Hhat_{l,-m} = (-1)^l conj(Hhat_lm)
    assert _same(gen_minus, -sp.conjugate(gen_plus))


# ---------------------------------------------------------------------- general orbits
def test_general_orbit_h22_published_form():
    # ../shared/conventions.md: Hhat_22 = G m/r + r^2 phidot^2 + 2 i r rdot phidot - rdot^2 (G = 1)
    assert _same(derive_mode(2, 2, orbit="general", pn=0).hhat,
                 m / r + r**2 * phidot**2 + 2 * sp.I * r * rdot * phidot - rdot**2)


@pytest.mark.parametrize("lm", [(2, 2), (2, 1), (3, 3), (3, 2), (4, 4), (4, 3)])
def test_general_orbit_modes_reduce_to_circular_ones(lm):
    # rdot = 0, phidot = omega: Hhat_general = 2 x c^2 Hhat_circular (../shared/conventions.md)
    l, mm = lm
    from stfalgebra.binary.circular import circular_gamma
    gen = derive_mode(l, mm, orbit="general", pn_relative=1).hhat
    circ = derive_mode(l, mm, pn_relative=1).hhat
    e = sp.Symbol("e", positive=True)
    gamma = circular_gamma(1).to_expression(e).subs(e, sp.sqrt(x))   # gamma(x) through 1PN
    reduced = gen.subs({rdot: 0}).subs({phidot: c**3 * x**sp.Rational(3, 2) / m}).subs({r: m / (c**2 * gamma)})
    reduced = reduced / (2 * x * c**2)
    n0 = leading_order(l, mm)
    series = sp.series(sp.expand(reduced).subs(x, sp.Symbol("s")**2), sp.Symbol("s"), 0, int(2 * (n0 + 1)) + 1).removeO()
    assert _same(series.subs(sp.Symbol("s"), sp.sqrt(x)), circ)


# ------------------------------------------------------------------------ polarisations
def test_polarisations_from_modes_match_the_quadrupole_formula():
    # Newtonian quadrupole formula h_ij = (2G/(R c^4)) d^2 I_ij/dt^2 (any GR textbook;
    # Blanchet 2014 Sec. 2), projected on the triad P = -e_Phi, Q = e_Theta.
    t = sp.Symbol("t", real=True)
    ph = omega * t
    mu = m * nu
    pos = sp.Matrix([r * sp.cos(ph), r * sp.sin(ph), 0])
    Iddot = (mu * pos * pos.T).diff(t, 2)
    N_theta = sp.Matrix([sp.cos(Theta) * sp.cos(Phi), sp.cos(Theta) * sp.sin(Phi), -sp.sin(Theta)])
    e_phi = sp.Matrix([-sp.sin(Phi), sp.cos(Phi), 0])
    P, Q = -e_phi, N_theta
    hij = 2 * G / (R * c**4) * Iddot
    hplus = ((P.T * hij * P)[0] - (Q.T * hij * Q)[0]) / 2
    hcross = ((P.T * hij * Q)[0] + (Q.T * hij * P)[0]) / 2
    h22 = derive_mode(2, 2, pn=0).hhat * 2 * G * m * nu * x / (R * c**2) * sp.sqrt(16 * sp.pi / 5) * sp.exp(-2 * sp.I * ph)
    h2m2 = sp.conjugate(h22)
    from_modes = (h22 * spin_weighted_harmonic(-2, 2, 2, Theta, Phi)
                  + h2m2 * spin_weighted_harmonic(-2, 2, -2, Theta, Phi))
    rng = random.Random(7)
    for _ in range(5):
        vals = {Theta: rng.uniform(0.1, 3.0), Phi: rng.uniform(0, 6.2), t: rng.uniform(0, 10),
                G: 1, m: 1, nu: 0.2, R: 1, c: 1, omega: 0.05}
        vals[x] = (vals[omega]) ** (2 / 3)
        vals[r] = 1 / vals[x]                       # Newtonian: G m = r^3 omega^2
        expected = complex(sp.N((hplus - sp.I * hcross).subs(vals)))
        got = complex(sp.N(from_modes.subs(vals)))
        assert abs(got - expected) < 1e-10 * max(1.0, abs(expected))


# ------------------------------------------------------------------------ bad input
def test_refusals_and_errors():
    # the DC memory is served through relative 2 beyond its own leading order (x^0 for l = 4)
    with pytest.raises(OrderBeyondInputsError, match="memory row"):
        derive_mode(4, 0, pn=sp.Rational(5, 2))
    general_m0 = derive_mode(2, 0, orbit="general", pn=0)
    assert general_m0.hhat is not None
    with pytest.raises(ValueError, match="l = 1"):
        derive_mode(1, 1, pn=0)
    with pytest.raises(ValueError, match="m"):
        derive_mode(2, 3, pn=0)
    with pytest.raises(ValueError, match="multiple of 1/2"):
        derive_mode(2, 2, pn="0.3")
    with pytest.raises(ValueError, match="exactly one"):
        derive_mode(2, 2, pn=1, pn_relative=1)
    with pytest.raises(OrderBeyondInputsError):
        derive_mode(2, 2, orbit="general", pn_relative=2)


def test_mode_set_keeps_refused_modes_with_their_reason():
    results = derive_modes(3, pn_relative=0)
    assert len(results) == 5 + 7
    refused = [res for res in results if res.hhat is None]
    # even l: the DC memory, served; odd l: served, Hhat_30 starts at relative 3/2 (an
    # instantaneous quadratic interaction), so it is exactly 0 at relative 0
    assert refused == []
    assert next(res for res in results if (res.l, res.m) == (2, 0)).kind == "memory"
    zero = next(res for res in results if (res.l, res.m) == (3, 0))
    assert zero.hhat == 0 and zero.series.known_through == 1


def test_spin_and_no_spin_results_are_cached_apart():
    # the row cache is keyed by spins: whichever is derived first, the other is not served from it
    with_spins = derive_mode(3, 2, pn_relative=1, spins="aligned")
    without = derive_mode(3, 2, pn_relative=1)
    assert "chi1" in with_spins.hhat_text() and "chi1" not in without.hhat_text()
    assert "spins" not in without.to_json() and with_spins.to_json()["spins"] == "aligned"
    # the term the spins add is at relative 1/2 and its provenance names the spin row; the
    # other terms are those of the non-spinning mode (the spin row keeps the 1PN moments)
    spin_rows = dict(with_spins.term_provenance)
    half = with_spins.series.terms.keys() - without.series.terms.keys()
    assert len(half) == 1 and all("spin parts" in row for order in half for row in spin_rows[order])
    for order, value in without.series.terms.items():
        assert with_spins.series.coefficient(order) == value


def test_odd_l_circular_zero_mode_with_spins_says_what_is_not_derived():
    result = derive_mode(3, 0, pn_relative=1, spins="aligned")
    assert result.refused is None and not result.series.terms and result.note is None
    assert "spin-orbit terms at that order are not derived" in result.notes()[0]
    with pytest.raises(OrderBeyondInputsError, match="next-to-leading spin-orbit"):
        derive_mode(3, 0, pn_relative="3/2", spins="aligned")
