"""Tests of stfalgebra/moments/mass_reaction.py: the derived 2.5PN terms of I_L for every l."""

from __future__ import annotations

import pytest
import sympy as sp

from stfalgebra.moments import orbit_polynomials as op
from stfalgebra.moments.mass_reaction import (
    REACTION_MOMENT_SOURCE, centre_of_mass_shift_part, pair_tensor_derivative, reaction_field_constants, reaction_mass_moment,
    reaction_mass_moment_circular,
)
from stfalgebra.symbols import G, delta, m, nu, phidot, r, rdot

FIVE_HALVES = sp.Rational(5, 2)
X1, X2 = (1 + delta) / 2, (1 - delta) / 2
V2 = rdot**2 + r**2 * phidot**2


def _sympy(f) -> sp.Expr:
    return sp.expand(f.as_expr().xreplace({sp.Symbol("ir", positive=True): 1 / r}))


def _reduce(expression) -> sp.Expr:
    """delta^2 -> 1 - 4 nu in every power of delta."""
    expanded = sp.expand(expression)
    return sp.expand(expanded.replace(
        lambda e: e.is_Pow and e.base == delta and e.exp.is_Integer and e.exp >= 2,
        lambda e: (1 - 4 * nu)**(e.exp // 2) * delta**(e.exp % 2)))


def _coefficients(tensor) -> dict:
    return {key: _reduce(series.coefficient(FIVE_HALVES).to_sympy()) for key, series in tensor.terms.items()}


def test_quadrupole_on_circles_is_the_published_forty_eight_sevenths():
    # Blanchet, Faye, Iyer & Sinha, Class. Quantum Grav. 25, 165003 (2008), sec. V, the
    # circular-orbit I_ij (from memory): the 2.5PN term (48/7) nu^2 m (G m)^2/(c^5 r) x_<i v_j>,
    # the value the toolkit used to enter as a cited input
    assert _coefficients(reaction_mass_moment_circular(2)) == {(1, 1, 0): sp.Rational(48, 7) * nu**2 * m * (G * m)**2 / r}
    assert "derived" in REACTION_MOMENT_SOURCE
    assert any("derived" in line for line in reaction_mass_moment_circular(2).provenance)


def test_quadrupole_on_general_orbits_is_the_published_one():
    # Arun, Blanchet, Iyer & Qusailah, Phys. Rev. D 77, 064035 (2008), sec. III, the 2.5PN terms
    # of I_ij on a general orbit (from memory): nu m [-(24/7) nu (G m)^2 rdot/(c^5 r^2) x_<ij>
    # + (48/7) nu (G m)^2/(c^5 r) x_<i v_j>], no v_<ij> term. The x_<ij> term tests V_3 and W1_kk
    assert _coefficients(reaction_mass_moment(2)) == {
        (2, 0, 0): -sp.Rational(24, 7) * nu**2 * m * (G * m)**2 * rdot / r**2,
        (1, 1, 0): sp.Rational(48, 7) * nu**2 * m * (G * m)**2 / r}


def _closed_form(l: int) -> dict:
    """The field part of (R5) on the Newtonian orbit, by hand (module docstring), plus the cited
    centre-of-mass shift l sum_A m_A s^<i y_A^L-1>, s = nu delta (4/5) G m (v^2 - 2 G m/r) v."""
    def s(k):
        return X2**(k - 1) - (-X1)**(k - 1) if k >= 1 else 0
    scale = G**2 * m**3 * nu**2
    out = {}
    if l >= 0:
        out[(l, 0, 0)] = -2 * sp.Rational((3 * l - 2) * (l + 1), 2 * l + 3) * scale * s(l) * rdot / r**2 if l else \
            sp.Rational(4, 3) * G**2 * m**3 * nu * rdot / r**2
    if l >= 1:
        # sum_A m_A y_A^(l-1) = (m X1 X2^(l-1) + m X2 (-X1)^(l-1)) x^(l-1)
        lower = m * X1 * X2**(l - 1) + m * X2 * (-X1)**(l - 1)
        shift = l * lower * nu * delta * sp.Rational(4, 5) * G * m * (V2 - 2 * G * m / r)
        out[(l - 1, 1, 0)] = sp.Rational(8 * l * (l + 1), 2 * l + 3) * scale * s(l) / r + shift
    return {key: _reduce(value) for key, value in out.items() if _reduce(value) != 0}


@pytest.mark.parametrize("l", range(0, 7))
def test_every_l_agrees_with_the_closed_form_by_hand(l):
    assert _coefficients(reaction_mass_moment(l)) == _closed_form(l)


def test_the_octupole_carries_the_centre_of_mass_shift():
    # the common 2.5PN shift s of both bodies moves sum_A m_A y_A^<ijk> by
    # 3 s^<i (sum_A m_A y_A^jk>) = 3 nu m s^<i x^j x^k>: without it the x_<ij v_k> coefficient
    # would be the field part -(32/3) nu^2 delta (G m)^2 m/r alone
    coefficient = _coefficients(reaction_mass_moment(3))[(2, 1, 0)]
    field = -sp.Rational(32, 3) * nu**2 * delta * G**2 * m**3 / r
    assert _reduce(coefficient - field) == _reduce(3 * m * nu**2 * delta * sp.Rational(4, 5) * G * m
                                                   * (V2 - 2 * G * m / r))


@pytest.mark.parametrize("l", [1, 2, 3, 4])
def test_the_shift_part_is_the_shift_of_the_newtonian_moment(l):
    # l sum_A m_A s^<i y_A^L-1>, s = nu delta (4/5) G m (v^2 - 2 G m/r) v: the x_<L-1 v> term
    lower = m * X1 * X2**(l - 1) + m * X2 * (-X1)**(l - 1)
    expected = _reduce(l * lower * nu * delta * sp.Rational(4, 5) * G * m * (V2 - 2 * G * m / r))
    got = _coefficients(centre_of_mass_shift_part(l))
    assert got == ({(l - 1, 1, 0): expected} if expected != 0 else {})


def test_the_near_zone_constants_satisfy_the_harmonic_gauge_condition():
    # d_t h^00/c + d_i h^0i = 0 at c^-6 with (N1): -4 (V_3' + d_i V_i|_3) - 2 W1_kk' = 0, an
    # independent check of the signs and factors of (R1), (R2) and the c^-3 term of V_i
    constants = reaction_field_constants()
    v3, w1, divergence = constants["V3"], constants["W1"], constants["divergence_Vi3"]
    trace = w1[0] * op.from_expression(r**2) + 2 * w1[1] * op.from_expression(r * rdot) \
        + w1[2] * op.from_expression(V2) + 3 * w1[3]
    total = op.time_derivative(v3, 0) + divergence + op.time_derivative(trace, 0) / 2
    assert sp.simplify(_sympy(total)) == 0
    # and the trace is W1_kk = G Q_kk''' = 2 G dT/dt, not zero on eccentric orbits
    assert sp.simplify(_sympy(trace) + 2 * G**2 * m**2 * nu * rdot / r**2) == 0


def test_the_source_integral_of_w_ij_obeys_the_virial_theorem():
    # int S_ij = (1/2) d^2 Q_ij/dt^2 - delta_ij (2 T + Omega), T = nu m v^2/2, Omega = -G m^2 nu/r
    # (the Newtonian virial theorem): checks the non-compact integral int d_i U d_j U
    constants = reaction_field_constants()
    source, second = constants["S"], pair_tensor_derivative(pair_tensor_derivative(constants["Q"]))
    expected = tuple(f / 2 for f in second[:3]) + (
        second[3] / 2 - op.from_expression(nu * m * V2 - G * m**2 * nu / r),)
    for got, want in zip(source, expected):
        assert sp.simplify(_sympy(got) - _sympy(want)) == 0


def test_v3_is_minus_four_thirds_g_times_the_rate_of_kinetic_energy():
    # V_3 = -G [dM_1/dt + Q_kk'''/6] with M_1 = 3T + 2 Omega and Q_kk'' = 2 (2T + Omega), so
    # V_3 = -(4/3) G dT/dt; dT/dt = nu m v.a = -G m^2 nu rdot/r^2
    assert sp.simplify(_sympy(reaction_field_constants()["V3"]) - sp.Rational(4, 3) * G**2 * m**2 * nu * rdot / r**2) == 0


@pytest.mark.parametrize("l", range(0, 3))
def test_the_convolution_behind_the_finite_part_integral(l):
    # (R4) rests on FP int r^B xhat_L/|x - y| d^3x = -4 pi |y|^(B+2) yhat_L/((B+2)(B+2l+3)); an
    # independent route: the Legendre expansion of 1/|x - y| keeps only p = l
    # (int dOmega n_<L> P_p(n.n') = delta_pl 4 pi/(2l+1) n'_<L>), then the radial integrals
    # inside and outside |y| (the outer one by analytic continuation in B)
    B = sp.Symbol("B", positive=True)      # the inner integral converges there; continued to B = 0
    s, y = sp.symbols("s y", positive=True)
    inner = sp.integrate(s**(B + 2) * s**l * s**l / y**(l + 1), (s, 0, y), conds="none")
    outer = -y**(B + l + 2) * y**l / y**l / (B + 2)            # int_y^oo s^(B+1) ds continued
    radial = sp.Rational(4, 1) * sp.pi / (2 * l + 1) * (inner + outer)
    expected = -4 * sp.pi * y**(B + 2) * y**l / ((B + 2) * (B + 2 * l + 3))
    assert sp.simplify(radial - expected) == 0
    # analytic at B = 0: no pole, hence no finite-part remainder in its derivatives
    assert expected.subs(B, 0) == -2 * sp.pi * y**(l + 2) / (2 * l + 3)


def test_the_canonical_monopole_is_constant():
    # M_L = I_L + (4 G/c^5)[W^(2) I_L - W^(1) I_L^(1)] (Blanchet, Living Rev. Relativ. 17, 2 (2014),
    # sec. 3.3, from memory; relation (C1) of stfalgebra.moments.canonical, here at l = 0 with
    # I = m + ...): the canonical monopole (the ADM mass) is constant, so the source monopole must
    # carry -(4 G m/c^5) W^(2) at 2.5PN, W = nu m r rdot/3 from the gauge-moment integral (derived
    # in stfalgebra.moments.canonical, independently of the near-zone field used here)
    from stfalgebra.binary.orbit_derivative import OrbitTimeDerivative
    from stfalgebra.moments.canonical import gauge_moment_w

    derivative = OrbitTimeDerivative(0)
    w2 = derivative(derivative(gauge_moment_w())).coefficient(0).to_sympy()
    assert _coefficients(reaction_mass_moment(0)) == {(0, 0, 0): _reduce(-4 * G * m * w2)}


def test_monopole_and_dipole_of_the_formula_at_two_and_a_half_pn():
    # the monopole's c^-5 term -(4/3)(G m) dT/dt is not constant on eccentric orbits (the canonical
    # monopole is: test above) and vanishes on circles; the dipole is m s, the cited
    # centre-of-mass shift times m (the field part is proportional to the Newtonian dipole, zero):
    # a record, not a validation: whether a canonical dipole correction absorbs it is not checked
    assert _coefficients(reaction_mass_moment(0)) == {(0, 0, 0): sp.Rational(4, 3) * G**2 * m**3 * nu * rdot / r**2}
    assert _coefficients(reaction_mass_moment_circular(0)) == {}
    dipole = _coefficients(reaction_mass_moment(1))
    assert dipole == {(0, 1, 0): _reduce(m * nu * delta * sp.Rational(4, 5) * G * m * (V2 - 2 * G * m / r))}


def test_bad_multipole_orders_are_refused():
    with pytest.raises(ValueError, match="-1"):
        reaction_mass_moment(-1)
    with pytest.raises(TypeError, match="2.0"):
        reaction_mass_moment_circular(2.0)


def test_the_canonical_dipole_vanishes_with_the_cited_centre_of_mass_shift():
    # The source dipole at 2.5PN is m s (test above). The canonical one is
    # M_i = I_i + (4 G m/c^5) Y_i^(1): the l = 1 case of the term (4 G/c^5) l I_<L-1 Y_i_l>^(1) of
    # M_L - I_L (written 3 I_<ij Y_k>^(1) for M_ijk in Faye, Blanchet & Iyer, Class. Quantum Grav. 32,
    # 045016 (2015), from memory). Y_i at Newtonian order from the gauge-moment formula (Blanchet,
    # Living Rev. Relativ. 17, 2 (2014), sec. 3.1, from memory):
    # Y_i = -int x_i tau^kk + (9/10) d/dt int xhat_ij sigma_j, tau^kk = sigma_kk - dU.dU/(8 pi G),
    # int x_i dU.dU = 2 G^2 m1 m2 d_1k d_2k K_i, K_i = -pi r12 (y1 + y2)_i (the kernel (F2) of
    # stfalgebra.moments.field_integrals at l = 1; the self terms have no finite part).
    # M_i = 0 ties three independent inputs: the derived I_i, the cited 2.5PN term of the
    # centre-of-mass relations (without a factor nu) and the two-body Y_i.
    Y1, Y2 = sp.Matrix(sp.symbols("a1:4", real=True)), sp.Matrix(sp.symbols("b1:4", real=True))
    separation = sp.sqrt((Y1 - Y2).dot(Y1 - Y2))
    kernel = -sp.pi * separation * (Y1 + Y2)
    pair = sp.Matrix([sum(sp.diff(kernel[i], Y1[k], Y2[k]) for k in range(3)) for i in range(3)])
    X = sp.Matrix(sp.symbols("X1:4", real=True))
    Vv = sp.Matrix(sp.symbols("V1:4", real=True))
    radius = sp.sqrt(X.dot(X))
    acc = -G * m * X / radius**3

    def d_t(expr):
        return sum(sp.diff(expr, X[i]) * Vv[i] + sp.diff(expr, Vv[i]) * acc[i] for i in range(3))

    x1, x2 = (1 + delta) / 2, (1 - delta) / 2
    bodies = ((m * x1, x2), (m * x2, -x1))
    m1m2 = bodies[0][0] * bodies[1][0]
    at = dict(zip(list(Y1) + list(Y2), list(x2 * X) + list(-x1 * X)))
    field = 2 * G**2 * m1m2 * pair.subs(at)
    compact = sum((mb * f**2 * Vv.dot(Vv) * f * X for mb, f in bodies), sp.zeros(3, 1))
    moment = sum((mb * (f * X * (f * X).dot(f * Vv) - (f * X).dot(f * X) * f * Vv / 3) for mb, f in bodies),
                 sp.zeros(3, 1))
    y_dipole = -(compact - field / (8 * sp.pi * G)) + sp.Rational(9, 10) * moment.applyfunc(d_t)
    correction = 4 * G * m * y_dipole.applyfunc(d_t)
    # the derived source dipole m s, along v (the (0, 1, 0) term), at exact configurations
    source = _coefficients(reaction_mass_moment(1))[(0, 1, 0)]
    for position, velocity in (((1, 2, 2), (1, sp.Rational(-1, 3), 2)),):
        numbers = {G: sp.Rational(7, 5), m: 2, delta: sp.Rational(1, 5), **dict(zip(X, position)),
                   **dict(zip(Vv, velocity))}
        xv = sp.Matrix(position).dot(sp.Matrix(velocity))
        size = sp.sqrt(sp.Matrix(position).dot(sp.Matrix(position)))
        speed2 = sp.Matrix(velocity).dot(sp.Matrix(velocity))
        orbit = {r: size, rdot: xv / size, phidot: sp.sqrt(speed2 - (xv / size)**2) / size,
                 nu: (1 - numbers[delta]**2) / 4}
        value = sp.expand(source.subs(orbit).subs(numbers)) * sp.Matrix(velocity) + correction.subs(numbers)
        assert correction.subs(numbers) != sp.zeros(3, 1)
        assert value.applyfunc(sp.nsimplify) == sp.zeros(3, 1)
