"""The near-zone potentials of two point masses (stfalgebra/moments/near_zone.py) against their
Poisson equations (N2), and their Hadamard-regularised values (N4) against direct extraction.

Poisson equations hold away from the bodies. Symbolic where the Laplacian of a function of
(r1, r2) can be written in bipolar form,
Delta f = f_11 + 2 f_1/r1 + f_22 + 2 f_2/r2 + 2 (n1.n2) f_12, n1.n2 = (r1^2 + r2^2 - r12^2)/(2 r1 r2)
(chain rule, common practice), or for the small self part; numerically at random field points
otherwise (the potentials evaluated to 40 digits, the Laplacian by a fourth-order central
difference with step 1e-6, truncation ~1e-24).
"""

from __future__ import annotations

import random

import mpmath as mp
import numpy as np
import pytest
import sympy as sp

from stfalgebra.moments.near_zone import (
    PointMass, auxiliary_g, newtonian_potential, potential_v, r_noncompact, r_potential,
    r_regularised_value, regularised_values, superpotential, vector_potential, w_noncompact, w_potential,
)

X = sp.symbols("x1:4", real=True)
T = sp.Symbol("t", real=True)
G = sp.Symbol("G", positive=True)
E = sp.Symbol("eps", positive=True)  # 1/c
RNG = random.Random(7)


def _rational_vector(scale=10):
    return [sp.Rational(RNG.randint(-9, 9), scale) for _ in range(3)]


def _laplacian(expression):
    return sum(sp.diff(expression, xi, 2) for xi in X)


def _numeric_laplacian(function, point, step=mp.mpf("1e-6")):
    """Fourth-order central-difference Laplacian of a function of three mpf arguments."""
    total = mp.mpf(0)
    centre = function(*point)
    for axis in range(3):
        def shifted(k):
            moved = list(point)
            moved[axis] += k * step
            return function(*moved)
        total += (-shifted(2) + 16 * shifted(1) - 30 * centre + 16 * shifted(-1) - shifted(-2)) / (12 * step**2)
    return total


def _mp_point(scale=6):
    return [mp.mpf(RNG.randint(-9, 9)) / scale for _ in range(3)]


def test_g_solves_its_poisson_equation_symbolically():
    # Delta g = 1/(r1 r2) for g = ln(r1 + r2 + r12), in bipolar form (module docstring above)
    r1, r2, r12 = sp.symbols("r1 r2 r12", positive=True)
    g = sp.log(r1 + r2 + r12)
    n1n2 = (r1**2 + r2**2 - r12**2) / (2 * r1 * r2)
    laplacian = (sp.diff(g, r1, 2) + 2 * sp.diff(g, r1) / r1 + sp.diff(g, r2, 2) + 2 * sp.diff(g, r2) / r2
                 + 2 * n1n2 * sp.diff(g, r1, r2))
    assert sp.simplify(laplacian - 1 / (r1 * r2)) == 0


def test_g_solves_its_poisson_equation_in_components_and_is_symmetric():
    mp.mp.dps = 40
    y1, y2 = _rational_vector(), _rational_vector()
    g = sp.lambdify(X, auxiliary_g(X, y1, y2), "mpmath")
    r1 = sp.lambdify(X, sp.sqrt(sum((a - b) ** 2 for a, b in zip(X, y1))), "mpmath")
    r2 = sp.lambdify(X, sp.sqrt(sum((a - b) ** 2 for a, b in zip(X, y2))), "mpmath")
    for _ in range(3):
        point = _mp_point()
        assert abs(_numeric_laplacian(g, point) - 1 / (r1(*point) * r2(*point))) < 1e-20
    # symmetric in its three points: g(x, y1, y2) = g(y1, x, y2)
    point = _rational_vector(7)
    assert auxiliary_g(point, y1, y2) == auxiliary_g(y1, point, y2)


def test_self_part_of_w_solves_its_poisson_equation_symbolically():
    # Delta[(delta_ij - n_i n_j)/(4 r^2)] = n_i n_j / r^4 (derivation in the module docstring)
    r = sp.sqrt(sum(xi**2 for xi in X))
    for i, j in ((0, 0), (0, 1), (2, 2)):
        f = ((1 if i == j else 0) - X[i] * X[j] / r**2) / (4 * r**2)
        assert sp.simplify(_laplacian(f) - X[i] * X[j] / r**6) == 0


def _bodies():
    m1, m2 = sp.Rational(3, 5), sp.Rational(2, 5)
    return [PointMass(m1, _rational_vector(), _rational_vector(3)),
            PointMass(m2, _rational_vector(), _rational_vector(3))]


def test_w_solves_its_poisson_equation_numerically():
    # Delta W_ij = -d_i U d_j U away from the bodies (N2), G = 1; the compact part is harmonic there
    mp.mp.dps = 40
    bodies = _bodies()
    W = w_potential(X, bodies, G=1)
    U = newtonian_potential(X, bodies, G=1)
    gradient = [sp.lambdify(X, sp.diff(U, xi), "mpmath") for xi in X]
    for i, j in ((0, 0), (1, 2)):
        component = sp.lambdify(X, W[i, j], "mpmath")
        for _ in range(1):
            point = _mp_point()
            source = -gradient[i](*point) * gradient[j](*point)
            assert abs(_numeric_laplacian(component, point) - source) < 1e-18
            assert abs(source) > 1e-6  # not a vanishing check
    # and it decays at infinity (a Poisson integral): |W^nc| r bounded
    far = [sp.Integer(400), sp.Integer(300), sp.Integer(-500)]
    assert abs(sp.N(w_noncompact(X, bodies, G=1)[0, 1].subs(dict(zip(X, far))))) * 700 < 5


def test_self_part_of_r_solves_its_poisson_equation_symbolically():
    # Delta[-(v_i - (n.v) n_i)/(8 r^2)] = -(1/2) (n.v) n_i/r^4, the self source of (N5)
    r = sp.sqrt(sum(xi**2 for xi in X))
    v = [sp.Rational(2, 3), -sp.Rational(1, 2), sp.Rational(1, 5)]
    n_dot_v = sum(xi * vi for xi, vi in zip(X, v)) / r
    for i in range(3):
        f = -(v[i] - n_dot_v * X[i] / r) / (8 * r**2)
        assert sp.simplify(_laplacian(f) + n_dot_v * X[i] / (2 * r**5)) == 0


def test_r_solves_its_poisson_equation_numerically():
    # Delta R_i = -2 d_k U d_i U_k - (3/2) d_t U d_i U away from the bodies (N2 at Newtonian
    # order: V sigma_i - V_i sigma is compact, the compact part R^C is harmonic there), G = 1;
    # d_t U at fixed x along the bodies' velocities
    mp.mp.dps = 40
    local = random.Random(23)  # its own draws: the shared RNG feeds the other tests' configurations

    def vector(scale):
        return [sp.Rational(local.randint(-9, 9), scale) for _ in range(3)]

    bodies = [PointMass(sp.Rational(3, 5), vector(10), vector(3)), PointMass(sp.Rational(2, 5), vector(10), vector(3))]
    R = r_potential(X, bodies, G=1)
    U = newtonian_potential(X, bodies, G=1)
    Ui = vector_potential(X, bodies, G=1)
    moving = [PointMass(m, [y + v * T for y, v in zip(p, vel)], vel) for m, p, vel in bodies]
    dtU = sp.diff(newtonian_potential(X, moving, G=1), T).subs(T, 0)
    source = sum(-2 * sp.diff(U, X[k]) * sp.diff(Ui[k], X[0]) for k in range(3)) \
        - sp.Rational(3, 2) * dtU * sp.diff(U, X[0])
    point = [mp.mpf(local.randint(-9, 9)) / 6 for _ in range(3)]
    value = sp.lambdify(X, source, "mpmath")(*point)
    assert abs(_numeric_laplacian(sp.lambdify(X, R[0], "mpmath"), point) - value) < 1e-18
    assert abs(value) > 1e-6  # not a vanishing check
    # a Poisson integral: R^nc decays at infinity
    far = [sp.Integer(400), sp.Integer(300), sp.Integer(-500)]
    assert abs(sp.N(r_noncompact(X, bodies, G=1)[1].subs(dict(zip(X, far))))) * 700 < 5


def test_vector_potential_is_harmonic_away_from_the_bodies():
    bodies = _bodies()
    Vi = vector_potential(X, bodies, G=1)
    mp.mp.dps = 40
    point = _mp_point()
    assert all(abs(_numeric_laplacian(sp.lambdify(X, component, "mpmath"), point)) < 1e-18 for component in Vi)


def _moving(bodies):
    """Bodies on the Newtonian motion y_A(t) = y_A + v_A t + a_A t^2/2 (G = 1), for d_t at fixed x."""
    (m1, y1, v1), (m2, y2, v2) = bodies
    r12 = sp.sqrt(sum((a - b) ** 2 for a, b in zip(y1, y2)))
    a1 = [-m2 * (a - b) / r12**3 for a, b in zip(y1, y2)]
    a2 = [-m1 * (b - a) / r12**3 for a, b in zip(y1, y2)]
    return [PointMass(m1, [y + v * T + a * T**2 / 2 for y, v, a in zip(y1, v1, a1)], v1),
            PointMass(m2, [y + v * T + a * T**2 / 2 for y, v, a in zip(y2, v2, a2)], v2)]


def test_potential_v_solves_the_wave_equation_through_one_pn():
    # Box V = 0 away from the bodies: Delta V = d_t^2 U/c^2 + O(c^-4), with V = U + d_t^2 X/(2 c^2)
    # and Delta X = 2 U (retarded-integral expansion); d_t^2 along the Newtonian motion. The c^-2
    # coefficients are compared (the c^0 part, U, is harmonic).
    mp.mp.dps = 40
    bodies = _bodies()
    V = sp.expand(potential_v(X, bodies, c=1 / E, G=1))
    one_pn = sp.lambdify(X, V.coeff(E, 2), "mpmath")
    moving = _moving(bodies)
    d2U = sp.lambdify(X, sp.diff(newtonian_potential(X, moving, G=1), T, 2).subs(T, 0), "mpmath")
    newtonian = sp.lambdify(X, V.coeff(E, 0), "mpmath")
    for _ in range(2):
        point = _mp_point()
        assert abs(_numeric_laplacian(one_pn, point) - d2U(*point)) < 1e-18
        assert abs(_numeric_laplacian(newtonian, point)) < 1e-18
    # the superpotential: Delta X = 2 U
    potential = sp.lambdify(X, superpotential(X, bodies, G=1), "mpmath")
    u = sp.lambdify(X, newtonian_potential(X, bodies, G=1), "mpmath")
    point = _mp_point()
    assert abs(_numeric_laplacian(potential, point) - 2 * u(*point)) < 1e-18


def _hadamard_value(function, centre, radii=(0.01, 0.02, 0.03, 0.04, 0.05, 0.06, 0.07),
                    powers=range(-2, 5)):
    """The Hadamard partie finie at ``centre``: angular averages on spheres of several radii
    (Gauss in cos(theta), trapezoid in phi: exact for the low harmonics of the expansion), fitted
    by a Laurent polynomial in the radius; returns the r^0 coefficient (common practice). Double
    precision: the fit is good to ~1e-6."""
    mu, w_mu = np.polynomial.legendre.leggauss(12)
    phis = 2 * np.pi * np.arange(16) / 16
    M, P = np.meshgrid(mu, phis, indexing="ij")
    weights = np.outer(w_mu, np.full(len(phis), 1 / (2 * len(phis))))
    directions = np.stack([np.sqrt(1 - M**2) * np.cos(P), np.sqrt(1 - M**2) * np.sin(P), M])
    averages = [np.sum(weights * function(*(np.array(centre, dtype=float)[:, None, None] + s * directions)))
                for s in radii]
    matrix = np.array([[s**p for p in powers] for s in radii])
    return np.linalg.solve(matrix, np.array(averages))[list(powers).index(0)]


def test_regularised_values_at_body_one():
    # (N4) against direct Hadamard extraction from the explicit potentials (G = 1)
    bodies = _bodies()
    (m1, y1, v1), (m2, y2, v2) = bodies
    values = regularised_values(G=1, c=1 / E)
    m1s, m2s, r12s, v1v1, v2v2, v1v2, n12v2 = values["symbols"]
    r12 = sp.sqrt(sum((a - b) ** 2 for a, b in zip(y1, y2)))
    n12 = [(a - b) / r12 for a, b in zip(y1, y2)]
    substitution = {m1s: m1, m2s: m2, r12s: r12, v1v1: sum(v**2 for v in v1), v2v2: sum(v**2 for v in v2),
                    v1v2: sum(a * b for a, b in zip(v1, v2)), n12v2: sum(a * b for a, b in zip(n12, v2))}
    centre = [float(y) for y in y1]
    W = w_potential(X, bodies, G=1)
    checks = [(W[0, 0] + W[1, 1] + W[2, 2], values["W"].subs(substitution)),
              (sum(a * b for a, b in zip(vector_potential(X, bodies, G=1), v1)), values["Vi_v1"].subs(substitution))]
    V = sp.expand(potential_v(X, bodies, c=1 / E, G=1))
    expected = sp.expand(values["V"].subs(substitution))
    checks += [(V.coeff(E, power), expected.coeff(E, power)) for power in (0, 2)]
    for expression, value in checks:
        extracted = _hadamard_value(sp.lambdify(X, expression, "numpy"), centre)
        assert extracted == pytest.approx(float(value), rel=1e-5)  # a wrong term would be O(1)


def test_r_regularised_value_at_body_one():
    # (N6) against direct Hadamard extraction from the explicit R_i of (N5) plus R^C (G = 1)
    local = random.Random(31)

    def vector(scale):
        return [sp.Rational(local.randint(-9, 9), scale) for _ in range(3)]

    bodies = [PointMass(sp.Rational(3, 5), vector(10), vector(3)), PointMass(sp.Rational(2, 5), vector(10), vector(3))]
    R = r_potential(X, bodies, G=1)
    expected = r_regularised_value(bodies, G=1)
    centre = [float(y) for y in bodies[0].position]
    for component, value in zip(R, expected):
        extracted = _hadamard_value(sp.lambdify(X, component, "numpy"), centre)
        assert extracted == pytest.approx(float(value), rel=1e-5, abs=1e-7)
    assert max(abs(float(value)) for value in expected) > 1e-2
