"""Polarisations summed from the modes against the quadrupole formula (general orbit)."""

from __future__ import annotations

import random

import sympy as sp

from stfalgebra.radiative.polarisations import polarisations_from_modes
from stfalgebra.symbols import G, Phi, R, Theta, c, m, nu, phi, phidot, r, rdot


def test_general_orbit_polarisations_match_the_quadrupole_formula():
    # h_ij = (2G/(R c^4)) d^2 I_ij/dt^2 with I_ij = mu x_i x_j (any GR textbook; Blanchet,
    # Living Rev. Relativ. 17, 2 (2014), Sec. 2), d^2(x_i x_j)/dt^2 = 2 v_i v_j + a_i x_j + x_i a_j,
    # a = -G m x/r^3; projected on P = -e_Phi, Q = e_Theta (../shared/conventions.md).
    n = sp.Matrix([sp.cos(phi), sp.sin(phi), 0])
    lam = sp.Matrix([-sp.sin(phi), sp.cos(phi), 0])
    pos = r * n
    vel = rdot * n + r * phidot * lam
    acc = -G * m * pos / r**3
    Iddot = m * nu * (2 * vel * vel.T + acc * pos.T + pos * acc.T)
    e_theta = sp.Matrix([sp.cos(Theta) * sp.cos(Phi), sp.cos(Theta) * sp.sin(Phi), -sp.sin(Theta)])
    e_phi = sp.Matrix([-sp.sin(Phi), sp.cos(Phi), 0])
    P, Q = -e_phi, e_theta
    hij = 2 * G / (R * c**4) * Iddot
    h_plus = ((P.T * hij * P)[0] - (Q.T * hij * Q)[0]) / 2
    h_cross = ((P.T * hij * Q)[0] + (Q.T * hij * P)[0]) / 2
    hp, hc = polarisations_from_modes(2, orbit="general", pn=0)
    rng = random.Random(11)
    for _ in range(6):
        point = {Theta: rng.uniform(0.1, 3.0), Phi: rng.uniform(0, 6.2), phi: rng.uniform(0, 6.2),
                 r: rng.uniform(5, 20), rdot: rng.uniform(-0.2, 0.2), phidot: rng.uniform(0.01, 0.1),
                 G: 1, m: 1, nu: rng.uniform(0.05, 0.25), R: 1, c: 1}
        for mine, reference in ((hp, h_plus), (hc, h_cross)):
            a, b = float(mine.subs(point)), float(reference.subs(point))
            assert abs(a - b) < 1e-12 * max(1.0, abs(b))
