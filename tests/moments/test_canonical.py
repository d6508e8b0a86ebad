"""Tests of stfalgebra/moments/canonical.py: the two-body gauge moment W and M_ij - I_ij."""

from __future__ import annotations

import sympy as sp

from stfalgebra.binary.orbit_derivative import OrbitTimeDerivative
from stfalgebra.exact import engine_symbols
from stfalgebra.moments.canonical import canonical_quadrupole_correction, gauge_moment_w
from stfalgebra.pnseries import PNSeries


def test_gauge_moment_is_the_body_sum_with_newtonian_positions():
    # (1/3) sum_A m_A y_A.v_A with y_1 = X_2 x, y_2 = -X_1 x and m_1 m_2/m = nu m: nu m r rdot/3
    # (common practice: Newtonian centre-of-mass relations)
    s = engine_symbols()
    assert gauge_moment_w().coefficient(0) == s.nu * s.m * s.r * s.rdot / 3


def test_canonical_correction_vanishes_on_a_circle_and_not_on_an_ellipse():
    # W = nu m r rdot/3 and all its derivatives vanish along a circular Newtonian orbit
    s = engine_symbols()
    moment = PNSeries._from_trusted({0: s.nu * s.m * s.r**2 / 4}, 1)      # the (2,2) channel of I_ij
    correction = canonical_quadrupole_correction(moment, OrbitTimeDerivative(0), -2 * s.I * s.phidot)
    value = correction.coefficient(sp.Rational(5, 2))
    on_circle = value.substitute({"rdot": 0}).to_sympy()
    from stfalgebra.symbols import G, m, phidot, r

    assert sp.expand(on_circle.subs(G, phidot**2 * r**3 / m)) == 0            # Kepler's law
    assert not value.substitute({"rdot": 1}).is_zero()


def test_w_part_of_every_canonical_correction_vanishes_on_the_circle():
    # the W-terms W^(2) X_L - W^(1) X_L^(1) of M_L - I_L (and the J_ij^(1) W^(1) of S_ij) need only
    # W^(1), W^(2), at Newtonian order (the whole correction is already O(c^-5)): both vanish on
    # the circle (rdot = 0 and Kepler's law), so that part is zero for every l
    from stfalgebra.symbols import G, m, phidot, r

    derivative = OrbitTimeDerivative(0)
    w1 = derivative(gauge_moment_w())
    w2 = derivative(w1)
    for series in (w1, w2):
        value = series.coefficient(0)
        assert not value.is_zero()                                 # not zero off the circle
        on_circle = value.substitute({"rdot": 0}).to_sympy()
        assert sp.expand(on_circle.subs(G, phidot**2 * r**3 / m)) == 0


def test_dipole_gauge_moment_is_the_body_sum_and_survives_on_the_circle():
    # W_i = (3/10) sum_A m_A (y_A^i (y_A.v_A) - y_A^2 v_A^i/3), evaluated with numbers for two
    # bodies (m1 = 3, m2 = 1, Newtonian centre-of-mass positions): equal to the orbit tensor's
    # components; on a circle (x.v = 0) it is (1/10) nu m delta r^2 v, not zero
    import numpy as np

    from stfalgebra.moments.canonical import gauge_moment_w_dipole

    m1, m2 = 3.0, 1.0
    m = m1 + m2
    x, v = np.array([1.2, -0.4, 0.0]), np.array([0.3, 0.8, 0.0])
    bodies = [(m1, m2 / m * x, m2 / m * v), (m2, -m1 / m * x, -m1 / m * v)]
    expected = 0.3 * sum(mass * (y * (y @ u) - (y @ y) * u / 3) for mass, y, u in bodies)
    numbers = {"m": m, "nu": m1 * m2 / m**2, "delta": (m1 - m2) / m, "r": float(np.sqrt(x @ x)),
               "rdot": float(x @ v / np.sqrt(x @ x))}
    tensor = gauge_moment_w_dipole()

    def value(key):
        expr = tensor.terms[key].coefficient(0).to_sympy()
        return float(expr.subs({symbol: numbers[symbol.name] for symbol in expr.free_symbols}))

    got = value((1, 0, 0)) * x + value((0, 1, 0)) * v
    assert np.allclose(got, expected, rtol=1e-12, atol=0)
    assert not tensor.terms[(0, 1, 0)].coefficient(0).substitute({"rdot": 0}).is_zero()


# ----------------------------------------------------------------------------- W_L, Y_L of every l
def _coefficient(tensor, key):
    return tensor.terms[key].coefficient(0) if key in tensor.terms else None


def test_w_l_reproduces_w_at_l0_and_the_dipole_at_l1():
    # the general body sum (2l+1)/((l+1)(2l+3)) sum_A m_A y_A^<iL> v_A^i against the two
    # separately derived moments (l = 0: (1/3) sum m y.v; l = 1: (3/10) sum m y^<i y^a> v^a)
    from stfalgebra.moments.canonical import gauge_moment_w_dipole, gauge_moment_w_l

    assert _coefficient(gauge_moment_w_l(0), (0, 0, 0)) == gauge_moment_w().coefficient(0)
    assert dict(gauge_moment_w_l(1).terms) == dict(gauge_moment_w_dipole().terms)


def test_w_l_contraction_identity_against_explicit_components():
    # xhat_(iL) v_i = (x.v) xhat_L - l/(2l+1) r^2 STF[x_(L-1) v]: check at l = 2 with explicit
    # Cartesian components (sympy), for a generic x, v
    x = sp.Matrix(sp.symbols("x1:4"))
    v = sp.Matrix(sp.symbols("v1:4"))
    r2 = (x.T * x)[0]
    delta = sp.eye(3)

    def stf3(a, b, c):   # x_<abc>
        return (x[a] * x[b] * x[c] - r2 / 5 * (delta[a, b] * x[c] + delta[a, c] * x[b] + delta[b, c] * x[a]))

    def stf2(t, a, b):
        sym = (t[a, b] + t[b, a]) / 2
        return sym - delta[a, b] * sum(t[k, k] for k in range(3)) / 3

    xx = x * x.T
    xv = x * v.T
    xdotv = (x.T * v)[0]
    for a in range(3):
        for b in range(3):
            left = sum(stf3(i, a, b) * v[i] for i in range(3))
            right = xdotv * stf2(xx, a, b) - sp.Rational(2, 5) * r2 * stf2(xv, a, b)
            assert sp.expand(left - right) == 0


def test_field_trace_integral_against_the_virial_theorem_at_l0():
    # FP int -(dU)^2/(8 pi G) = -G m1 m2/r: the Newtonian potential energy (the field energy of
    # the interaction, common practice), from the finite-part kernels
    from stfalgebra.moments.canonical import field_stress_trace_integral

    s = engine_symbols()
    assert field_stress_trace_integral(0) == -s.nu * s.G * s.m**2 / s.r


def test_field_cross_integral_every_l_is_the_sum_of_the_body_moments():
    # FP int xhat_L d(1/r1).d(1/r2) = 2 pi (y1^<L> + y2^<L>)/r12 (l >= 1): the kernel result,
    # checked against the exact statement at l = 1 that the integrand is even about the midpoint
    # (so the integral is 4 pi/r12 times the midpoint (y1 + y2)/2)
    from stfalgebra.moments.finite_part import R12, RA, RB, U1, U2, two_centre_integral

    integrand = (RA**2 + RB**2 - R12**2) / (2 * RA**3 * RB**3)
    assert sp.simplify(two_centre_integral(1, integrand) - 4 * sp.pi / R12 * (U1 + U2) / 2) == 0
    for l in (2, 3, 4):
        assert sp.simplify(two_centre_integral(l, integrand) - 2 * sp.pi * (U1**l + U2**l) / R12) == 0


def test_y_monopole_vanishes_by_the_virial_theorem():
    # Y = -int tau^jj + d/dt sum m y.v = -(2T + V) + (2T + V) = 0 at Newtonian order
    from stfalgebra.moments.canonical import gauge_moment_y

    assert all(series.coefficient(0).is_zero() for series in gauge_moment_y(0).terms.values())


def test_y_dipole_against_the_hand_reduction():
    # Y_i = (nu m delta/10)[(v^2 + G m/r) x_i - 3 r rdot v_i] (module docstring, reduced by hand
    # from (C2) with a = -G m x/r^3)
    from stfalgebra.moments.canonical import gauge_moment_y

    s = engine_symbols()
    y = gauge_moment_y(1)
    weight = s.nu * s.m * s.delta / 10
    assert _coefficient(y, (1, 0, 0)) == weight * (s.rdot**2 + s.r**2 * s.phidot**2 + s.G * s.m / s.r)
    assert _coefficient(y, (0, 1, 0)) == -3 * weight * s.r * s.rdot


def _field_stress_moment(G, bodies, nodes=48, panels=(0, .25, .5, 1, 2, 3, 4, 6, 8, 10, 12, 14)):
    """int x_j (d_iU1 d_jU2 + d_iU2 d_jU1 - delta_ij dU1.dU2)/(4 pi G) d^3x, i = 1, 2, by
    Gauss-Legendre quadrature in prolate spheroidal coordinates (mu, nu, phi) with the bodies at
    the foci on the first axis (the integrand times the volume element is bounded there); the
    far zone beyond mu = 14 contributes below 1e-6."""
    import numpy as np

    (y1, m1), (y2, m2) = bodies
    a = np.linalg.norm(y1 - y2) / 2
    centre = (y1 + y2) / 2
    gauss, weights = np.polynomial.legendre.leggauss(nodes)
    nu = (gauss + 1) * np.pi / 2
    phi = (np.arange(16) + 0.5) * 2 * np.pi / 16
    total = np.zeros(2)
    for lo, hi in zip(panels[:-1], panels[1:]):
        mu = lo + (gauss + 1) * (hi - lo) / 2
        M, N, P = np.meshgrid(mu, nu, phi, indexing="ij")
        weight = (weights[:, None, None] * (hi - lo) / 2) * (weights[None, :, None] * np.pi / 2) * (2 * np.pi / 16)
        sh = np.sinh(M)
        point = np.stack([centre[0] + a * np.cosh(M) * np.cos(N), a * sh * np.sin(N) * np.cos(P),
                          a * sh * np.sin(N) * np.sin(P)])
        volume = a**3 * (sh**2 + np.sin(N) ** 2) * sh * np.sin(N)

        def grad(y, mass):      # grad U, U = G mass/|x - y|
            d = point - y[:, None, None, None]
            return -G * mass * d / np.linalg.norm(d, axis=0) ** 3

        g1, g2 = grad(y1, m1), grad(y2, m2)
        along1, along2, dot = (point * g1).sum(0), (point * g2).sum(0), (g1 * g2).sum(0)
        for i in range(2):
            value = g1[i] * along2 + g2[i] * along1 - point[i] * dot
            total[i] += (value * volume * weight).sum() / (4 * np.pi * G)
    return total


def test_y_dipole_by_the_stress_route_on_a_numerical_configuration():
    # second route: Newtonian momentum conservation d_t sigma_i = -d_j tau^ij turns (C2) at l = 1
    # into Y_i = -(1/10) int x_i tau^jj + (3/10) int x_j tau^ij; the field part of the second
    # integral (not a kernel of the project) by quadrature, for one configuration, and the whole
    # compared with the derived Y_i at that phase-space point
    import numpy as np

    from stfalgebra.moments.canonical import gauge_moment_y

    G, m1, m2 = 1.0, 0.7, 0.3
    m = m1 + m2
    x = np.array([1.0, 0.0, 0.0])
    v = np.array([0.3, 0.9, 0.0])
    y1, y2 = m2 / m * x, -m1 / m * x
    v1, v2 = m2 / m * v, -m1 / m * v
    field_trace = -G * m1 * m2 * (y1 + y2) / (2 * np.linalg.norm(x))     # the kernel result, tested above
    matter_trace = m1 * (v1 @ v1) * y1 + m2 * (v2 @ v2) * y2
    matter_stress = m1 * v1 * (y1 @ v1) + m2 * v2 * (y2 @ v2)
    field_stress = np.append(_field_stress_moment(G, ((y1, m1), (y2, m2))), 0.0)
    stress_route = -(matter_trace + field_trace) / 10 + 3 * (matter_stress + field_stress) / 10

    values = {"G": G, "m": m, "nu": m1 * m2 / m**2, "delta": (m1 - m2) / m, "r": 1.0,
              "rdot": float(x @ v), "phidot": float(np.cross(x, v)[2])}
    y = gauge_moment_y(1)

    def number(key):
        expression = y.terms[key].coefficient(0).to_sympy()
        return float(expression.subs({symbol: values[symbol.name] for symbol in expression.free_symbols}))

    along_x, along_v = number((1, 0, 0)), number((0, 1, 0))
    assert np.allclose(stress_route, along_x * x + along_v * v, rtol=0, atol=1e-6)


def test_gauge_moments_refuse_bad_ranks():
    import pytest

    from stfalgebra.moments.canonical import field_stress_trace_integral, gauge_moment_w_l, gauge_moment_y

    with pytest.raises(ValueError, match="-1"):
        gauge_moment_w_l(-1)
    with pytest.raises(TypeError, match="True"):
        gauge_moment_y(True)
    with pytest.raises(ValueError, match="31"):
        field_stress_trace_integral(31)


def test_two_and_a_half_pn_source_dipole_is_minus_4g_m_y_dot():
    # the canonical dipole of the iteration is constant (its second derivative vanishes); the
    # derived 2.5PN source dipole (the cited centre-of-mass shift of stfalgebra.binary.cited_inputs,
    # Q = (4/5) G m (v^2 - 2 G m/r), checked there against the conserved centre-of-mass integral)
    # is exactly -(4 G m/c^5) Y_i^(1) with the derived Y_i, on every orbit: the interaction of the
    # mass with Y_i enters the canonical dipole as +(4 G/c^5) M Y_i^(1), as the mass with W enters
    # the canonical monopole as +(4 G/c^5) M W^(2) (tests/moments/test_mass_reaction.py)
    from stfalgebra.moments.canonical import gauge_moment_y
    from stfalgebra.moments.mass_reaction import reaction_mass_moment
    from stfalgebra.moments.orbit_tensor import differentiate_along_orbit
    from stfalgebra.orders import PNOrder

    s = engine_symbols()
    rate = differentiate_along_orbit(gauge_moment_y(1), 0)
    assert rate.terms[(1, 0, 0)].coefficient(0).is_zero()
    dipole = reaction_mass_moment(1)
    assert set(dipole.terms) == {(0, 1, 0)}
    assert dipole.terms[(0, 1, 0)].coefficient(PNOrder(5, 2)) == -4 * s.G * s.m * rate.terms[(0, 1, 0)].coefficient(0)
