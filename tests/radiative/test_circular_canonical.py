"""Tests of stfalgebra/radiative/circular_canonical.py: M_ijk - I_ijk and S_ij - J_ij on the circle."""

from __future__ import annotations

import dataclasses
from fractions import Fraction
import itertools

import mpmath
import numpy as np
import pytest
import sympy as sp

from stfalgebra.binary.circular_frequency import on_circular_orbit
from stfalgebra.exact import ExactPolynomial
from stfalgebra.moments.canonical import gauge_moment_w_l, gauge_moment_y
from stfalgebra.orders import PNOrder
from stfalgebra.radiative.circular_canonical import (
    K1_Y_COEFFICIENT, canonical_current_probe, canonical_current_quadrupole_probe, circular_canonical_channel,
)
from stfalgebra.radiative.contributions import CONTRIBUTIONS, plan_radiative_moment
from stfalgebra.radiative.projection import alpha_on_spinor_basis, mode_channel

# one circular configuration; G is fixed by Kepler's law G m = omega^2 r^3
M1, M2, RADIUS, OMEGA = 0.7, 0.3, 1.3, 0.37
MASS = M1 + M2
G_KEPLER = OMEGA**2 * RADIUS**3 / MASS
GENERATOR = np.array([[0.0, -1.0, 0.0], [1.0, 0.0, 0.0], [0.0, 0.0, 0.0]])     # d/dt of a co-rotating vector
LEVI = np.zeros((3, 3, 3))
for _i, _j, _k in itertools.permutations(range(3)):
    LEVI[_i, _j, _k] = np.linalg.det(np.eye(3)[[_i, _j, _k]])
NUMBERS = {"nu": M1 * M2 / MASS**2, "delta": (M1 - M2) / MASS, "m": MASS, "r": RADIUS, "phidot": OMEGA,
           "G": G_KEPLER, "rdot": 0.0, "I": 1j}


def _number(value: ExactPolynomial) -> complex:
    expression = value.to_sympy()
    return complex(expression.subs({s: NUMBERS[s.name] for s in expression.free_symbols}))


def _stf(tensor):
    perms = list(itertools.permutations(range(tensor.ndim)))
    sym = sum(np.transpose(tensor, p) for p in perms) / len(perms)
    delta = np.eye(3)
    if sym.ndim == 2:
        return sym - delta * np.trace(sym) / 3
    trace = np.einsum("iaa->i", sym)
    return sym - (np.einsum("ij,k->ijk", delta, trace) + np.einsum("ik,j->ijk", delta, trace)
                  + np.einsum("jk,i->ijk", delta, trace)) / 5


def _derivative(tensor, times):
    for _ in range(times):
        tensor = sum(np.moveaxis(np.tensordot(OMEGA * GENERATOR, tensor, axes=([1], [s])), 0, s)
                     for s in range(tensor.ndim))
    return tensor


def _bodies():
    n = np.array([1.0, 0.0, 0.0])
    y1, y2 = (M2 / MASS) * RADIUS * n, -(M1 / MASS) * RADIUS * n
    return [(M1, y1, OMEGA * GENERATOR @ y1), (M2, y2, OMEGA * GENERATOR @ y2)]


def _quadrupole():
    return _stf(sum(mass * np.multiply.outer(y, y) for mass, y, _ in _bodies()))


def _angular_momentum():
    return sum(mass * np.cross(y, v) for mass, y, v in _bodies())


def _orbit_vector(tensor):
    """A rank-1 orbit tensor (x, v terms) as a Cartesian vector at phase 0."""
    x = np.array([RADIUS, 0.0, 0.0])
    v = np.array([0.0, RADIUS * OMEGA, 0.0])
    out = np.zeros(3)
    for key, vector in (((1, 0, 0), x), ((0, 1, 0), v)):
        if key in tensor.terms:
            out = out + _number(tensor.terms[key].coefficient(0)).real * vector
    return out


def _projected(tensor, l, m):
    """int dOmega conj(Y_lm) T_L n^L, by Gauss-Legendre times uniform azimuths (exact here)."""
    nodes, weights = np.polynomial.legendre.leggauss(l + 3)
    azimuths = 2 * np.pi * np.arange(2 * l + 3) / (2 * l + 3)
    total = 0j
    for x, w in zip(nodes, weights):
        theta = float(np.arccos(x))
        for phi in azimuths:
            k = np.array([np.sin(theta) * np.cos(phi), np.sin(theta) * np.sin(phi), np.cos(theta)])
            value = tensor
            for _ in range(l):
                value = value @ k
            total += w * (2 * np.pi / len(azimuths)) * complex(mpmath.spherharm(l, m, theta, phi)).conjugate() * value
    return total


def _ours(l, m):
    row = next(r for r in CONTRIBUTIONS if r.evaluator and "circular_canonical" in str(r.evaluator))
    series = circular_canonical_channel(l, m, row=row, orbit="circular")
    if not series.orders:
        return 0j
    p, q, c = mode_channel(l, m)
    return _number(series.coefficient(PNOrder(5, 2))) * complex(alpha_on_spinor_basis(l, m, p, q, c))


@pytest.mark.parametrize("m", [3, 1])
def test_octupole_correction_against_explicit_components(m):
    # (K1) on the circle, term by term with Cartesian components: the W terms are zero (W = 0 and
    # its derivatives vanish with rdot = 0 and Kepler's law), 3 STF(I_ij Y_k^(1)) times 4 G; U_ijk
    # its third derivative; projected on Y_3m and compared with the probe-polynomial channel
    y = _orbit_vector(gauge_moment_y(1))
    assert K1_Y_COEFFICIENT == 3
    bracket = 3 * _stf(np.multiply.outer(_quadrupole(), _derivative(y, 1)))
    radiative = _derivative(4 * G_KEPLER * bracket, 3)
    expected = _projected(radiative, 3, m)
    assert abs(expected) > 1e-6
    assert abs(_ours(3, m) - expected) <= 1e-10 * abs(expected)


def test_current_quadrupole_correction_against_explicit_components_and_zero_on_the_circle():
    # (K2) with Cartesian components: eps_ab<i (-I_j>b^(3) W_a - 2 I_j>b Y_a^(2) + I_j>b^(1) Y_a^(1))
    # + 3 J_<i Y_j>^(1) (the W terms vanish on the circle); the W_a and Y_a parts cancel: zero
    quadrupole, angular = _quadrupole(), _angular_momentum()
    w_dipole, y = _orbit_vector(gauge_moment_w_l(1)), _orbit_vector(gauge_moment_y(1))

    def epsilon_pair(tensor, vector):           # eps_abi A_jb B_a, symmetrised and trace-free in ij
        return _stf(np.einsum("abi,jb,a->ij", LEVI, tensor, vector))

    parts = [-epsilon_pair(_derivative(quadrupole, 3), w_dipole),
             -2 * epsilon_pair(quadrupole, _derivative(y, 2)),
             epsilon_pair(_derivative(quadrupole, 1), _derivative(y, 1)),
             3 * _stf(np.multiply.outer(angular, _derivative(y, 1)))]
    assert all(abs(_projected(_derivative(part, 2), 2, 1)) > 1e-8 for part in (parts[0], parts[3]))
    total = _projected(_derivative(2 * G_KEPLER * sum(parts), 2), 2, 1)
    assert abs(total) < 1e-12
    assert abs(_ours(2, 1)) < 1e-12
    row = next(r for r in CONTRIBUTIONS if r.evaluator and "circular_canonical" in str(r.evaluator))
    assert on_circular_orbit(circular_canonical_channel(2, 1, row=row, orbit="circular"), 0).orders == ()


def test_general_orbits_and_other_moments_are_refused():
    row = next(r for r in CONTRIBUTIONS if r.evaluator and "circular_canonical" in str(r.evaluator))
    with pytest.raises(ValueError, match="circular"):
        circular_canonical_channel(2, 1, row=row, orbit="general")
    with pytest.raises(ValueError, match="M_L"):
        circular_canonical_channel(9, 9, row=row, orbit="circular")
    with pytest.raises(ValueError, match="S_L"):
        circular_canonical_channel(9, 8, row=row, orbit="circular")


def _relative_part(row, l, m, relative):
    """A row's part of Hhat_lm / (its leading coefficient), coefficient of x^(relative) beyond the leading term."""
    channel = row.evaluate(l, m, orbit="circular").truncate(relative)
    series = on_circular_orbit(channel, 2, with_reaction=True).shift(-1)
    return series


# Blanchet, Faye, Iyer & Sinha, Class. Quantum Grav. 25, 165003 (2008), the modes H_33, H_31
# (from memory): the nu-dependent part of the coefficient of x^(5/2) beyond the leading term
PUBLISHED_NU_PART = {
    3: sp.Rational(9, 2) * sp.pi + sp.I * (sp.Rational(-48103, 1215) + 9 * sp.log(sp.Rational(3, 2))),
    1: sp.Rational(-7, 6) * sp.pi + sp.I * (sp.Rational(-1, 15) + sp.Rational(7, 3) * sp.log(2)),
}


@pytest.mark.parametrize("m", [3, 1])
def test_published_nu_parts_and_the_sign_of_k1(m):
    # with every row of the plan (the derived 2.5PN I_ijk, the tails with the ADM mass, the
    # quadratic interactions of U_ijk, (K1)) the nu part of x^(5/2) is the published one; with the
    # recalled sign of the Y term of (K1) it would miss by exactly twice the correction's part
    # (the sign is fixed independently by the canonical dipole: tests/moments/test_canonical.py)
    relative = PNOrder(5, 2)
    plan = plan_radiative_moment("mass", 3, relative, "circular", m=m)
    assert any("circular_canonical" in str(row.evaluator) for row in plan.rows)
    parts = {row.family + ":" + row.description: _relative_part(row, 3, m, relative) for row in plan.rows}
    leading = next(p for p in parts.values() if p.orders).coefficient(PNOrder(1, 2)).to_sympy()

    def nu_part(series):
        if PNOrder(3) not in series.orders:
            return sp.Integer(0)
        value = sp.expand(series.coefficient(PNOrder(3)).to_sympy() / leading)
        nu = next((s for s in value.free_symbols if s.name == "nu"), None)
        return sp.expand(value.coeff(nu, 1)) if nu is not None else sp.Integer(0)

    total = sp.Integer(0)
    canonical = sp.Integer(0)
    for name, series in parts.items():
        value = nu_part(series)
        total += value
        if name.startswith("canonical moments"):
            canonical = value
    published = sp.expand(sp.expand_log(PUBLISHED_NU_PART[m], force=True))
    total = sp.expand(sp.expand_log(total, force=True))
    assert canonical != 0
    assert sp.simplify(total - published) == 0
    assert sp.simplify(total - 2 * canonical - published) != 0


def test_hhat_33_and_31_through_relative_two_and_a_half_are_the_published_ones():
    # Blanchet, Faye, Iyer & Sinha, Class. Quantum Grav. 25, 165003 (2008), H_33 and H_31 through
    # x^(5/2) beyond the leading term (from memory)
    from stfalgebra.radiative.modes import derive_mode

    x, nu, delta = sp.symbols("x nu delta")
    published = {
        3: -sp.Rational(3, 56) * sp.sqrt(210) * sp.I * delta * sp.sqrt(x) * (
            1 + x * (-4 + 2 * nu) + x**sp.Rational(3, 2) * (3 * sp.pi + sp.I * (sp.Rational(-21, 5) + 6 * sp.log(sp.Rational(3, 2))))
            + x**2 * (sp.Rational(123, 110) - sp.Rational(1838, 165) * nu + sp.Rational(887, 330) * nu**2)
            + x**sp.Rational(5, 2) * (-12 * sp.pi + sp.I * (sp.Rational(84, 5) - 24 * sp.log(sp.Rational(3, 2)))
                                      + nu * (sp.Rational(9, 2) * sp.pi + sp.I * (sp.Rational(-48103, 1215) + 9 * sp.log(sp.Rational(3, 2)))))),
        1: sp.Rational(1, 168) * sp.sqrt(14) * sp.I * delta * sp.sqrt(x) * (
            1 + x * (sp.Rational(-8, 3) - sp.Rational(2, 3) * nu) + x**sp.Rational(3, 2) * (sp.pi + sp.I * (sp.Rational(-7, 5) - 2 * sp.log(2)))
            + x**2 * (sp.Rational(607, 198) - sp.Rational(136, 99) * nu - sp.Rational(247, 198) * nu**2)
            + x**sp.Rational(5, 2) * (-sp.Rational(8, 3) * sp.pi + sp.I * (sp.Rational(56, 15) + sp.Rational(16, 3) * sp.log(2))
                                      + nu * (-sp.Rational(7, 6) * sp.pi + sp.I * (sp.Rational(-1, 15) + sp.Rational(7, 3) * sp.log(2))))),
    }
    for m, expected in published.items():
        derived = derive_mode(3, m, pn_relative="5/2").hhat
        names = {s.name: s for s in derived.free_symbols}
        expected = expected.subs({s: names[s.name] for s in expected.free_symbols if s.name in names})
        difference = sp.expand(sp.expand_log(derived - expected, force=True))
        assert sp.simplify(difference) == 0, (m, difference)


@pytest.mark.parametrize("m", [3, 1])
def test_octupole_correction_is_minus_the_centre_of_mass_shift_part_of_i_ijk(m):
    # second route: the Y term of (K1) with l = 3 is 3 I_<ij Y_k>^(1) and (4 G/c^5) Y_i^(1) = -s
    # (the cited 2.5PN centre-of-mass shift s; tests/moments/test_canonical.py), so on the circle
    # M_ijk - I_ijk = -3 I_<ij s_k>, minus the shift's part of the derived 2.5PN I_ijk
    # (stfalgebra.moments.mass_reaction.centre_of_mass_shift_part)
    from stfalgebra.moments.mass_reaction import centre_of_mass_shift_part

    p, q, c = mode_channel(3, m)
    shift_part = centre_of_mass_shift_part(3).channel(p, q, c, circular_frequency=True)
    rotation = (-m * ExactPolynomial("I") * ExactPolynomial("phidot")) ** 3
    expected = shift_part.map_coefficients(lambda v: -v * rotation)
    row = next(r for r in CONTRIBUTIONS if r.evaluator and "circular_canonical" in str(r.evaluator))
    ours = circular_canonical_channel(3, m, row=row, orbit="circular")
    assert on_circular_orbit(ours - expected, 0).orders == ()
    assert on_circular_orbit(ours, 0).orders


@pytest.mark.parametrize("l", range(3, 9))
def test_general_l_correction_is_minus_the_centre_of_mass_shift_part_of_i_l(l):
    # second route for the general-l form (K1_l): on the circle the W terms vanish and the Y term
    # l I_<L-1 Y_i_l>^(1), with (4 G/c^5) Y_i^(1) = -s (the cited 2.5PN centre-of-mass shift;
    # tests/moments/test_canonical.py), is minus the shift's part l sum_A m_A s^<i_l y_A^L-1> of the
    # derived 2.5PN I_L (stfalgebra.moments.mass_reaction.centre_of_mass_shift_part): the
    # Y_i part of the gauge transformation acts on every I_L as the translation by -s
    from stfalgebra.moments.mass_reaction import centre_of_mass_shift_part
    from stfalgebra.pnseries import PNSeries
    from stfalgebra.radiative.circular_canonical import canonical_mass_probe

    probe = canonical_mass_probe(l)
    five = PNOrder(5, 2).twice
    for m in range(l, 0, -2):
        p, q, c = mode_channel(l, m)
        value = probe.get((p, q, c), ExactPolynomial(0))
        ours = PNSeries._from_trusted({five: value} if not value.is_zero() else {}, five)
        shift_part = centre_of_mass_shift_part(l).channel(p, q, c, circular_frequency=True)
        assert on_circular_orbit(ours, 0).orders, (l, m)
        assert on_circular_orbit(ours + shift_part, 0).orders == (), (l, m)


def test_general_l_coefficients_and_bad_l_is_refused():
    # l = 3 of the general form is the served (K1): the served row is now evaluated by
    # canonical_mass_probe(3), and the Cartesian and published tests above check it
    from stfalgebra.radiative.circular_canonical import canonical_mass_probe, y_coefficient

    assert [y_coefficient(l) for l in (3, 4, 8)] == [K1_Y_COEFFICIENT, 4, 8]
    with pytest.raises(ValueError, match="l >= 2"):
        canonical_current_probe(1)
    with pytest.raises(ValueError, match="l >= 3"):
        canonical_mass_probe(2)
    with pytest.raises(TypeError, match="int"):
        canonical_mass_probe(True)


def test_the_current_relation_at_l_two_is_the_cited_k2_term_by_term():
    # (K2_l) at l = 2 from the iteration's closed form, evaluated generically, against (K2) as
    # recalled and written term by term (both zero on the circle with Kepler's law)
    assert canonical_current_probe(2) == canonical_current_quadrupole_probe()
    assert canonical_current_probe(2)


def test_the_served_mass_relation_is_the_one_the_iteration_gives():
    # the probes are built from relation_closed_form; the iteration itself for l = 3, 4
    from stfalgebra.mpm.gauge_interactions import canonical_relation, relation_closed_form

    for l in (3, 4):
        assert relation_closed_form("M", l) == canonical_relation("M", l)


@pytest.mark.parametrize("l, m", [(4, 4), (4, 2), (5, 3)])
def test_higher_mass_correction_against_explicit_components(l, m):
    # (K1_l) on the circle with Cartesian components: 4 G l STF(I_L-1 Y^(1)), its l-th derivative
    # projected on Y_lm (the projection removes the traces: no STF needed), against the served channel
    y = _orbit_vector(gauge_moment_y(1))
    radiative = _derivative(4 * G_KEPLER * l * np.multiply.outer(_moment(l - 1), _derivative(y, 1)), l)
    expected = _projected(radiative, l, m)
    assert abs(expected) > 1e-8
    assert abs(_ours(l, m) - expected) <= 1e-10 * abs(expected)


def _moment(rank):
    total = 0
    for mass, y, _ in _bodies():
        tensor = np.array(mass)
        for _ in range(rank):
            tensor = np.multiply.outer(tensor, y)
        total = total + tensor
    return total


def _symmetrised(tensor):
    perms = list(itertools.permutations(range(tensor.ndim)))
    return sum(np.transpose(tensor, p) for p in perms) / len(perms)


def _orbit_tensor_cartesian(tensor, rank):
    """An orbit tensor with terms x^a v^b (a + b = rank) as a symmetric Cartesian tensor at phase 0
    (its trace parts are left: the projections below do not see them)."""
    x = np.array([RADIUS, 0.0, 0.0])
    v = np.array([0.0, RADIUS * OMEGA, 0.0])
    out = np.zeros((3,) * rank)
    for (a, b, c), series in tensor.terms.items():
        assert c == 0 and a + b == rank
        product = np.array(1.0)
        for vector in [x] * a + [v] * b:
            product = np.multiply.outer(product, vector)
        out = out + _number(series.coefficient(0)).real * _symmetrised(product)
    return out


def _epsilon_product(first, second):
    """``eps_iab A_(a P-1) B_(b Q-1)`` with the free indices i, P-1, Q-1 in this order."""
    letters = "cdefghjklmnopq"
    p, q = first.ndim, second.ndim
    rest_a, rest_b = letters[:p - 1], letters[p - 1:p + q - 2]
    return np.einsum(f"iab,a{rest_a},b{rest_b}->i{rest_a}{rest_b}", LEVI, first, second)


def _current_moment(rank):
    total = 0
    for mass, y, v in _bodies():
        tensor = np.array(mass)
        for _ in range(rank - 1):
            tensor = np.multiply.outer(tensor, y)
        total = total + np.multiply.outer(tensor, np.cross(y, v))
    return total


@pytest.mark.parametrize("l, m", [(3, 2), (4, 3), (4, 1)])
def test_higher_current_correction_against_explicit_components(l, m):
    # (K2_l) on the circle with Cartesian components (W = 0 there): 2 (l-1) E[I_ab^(3), W_(L-1)]
    # - (4/l) E[I_L^(1), Y^(1)] + 4 E[I_L, Y^(2)] + (4 (l^2-1)/l) J_L-1 Y^(1), times G; V_L its
    # l-th derivative, projected on Y_lm, against the served channel (the evaluator's eps products)
    y = _orbit_vector(gauge_moment_y(1))
    w_lower = _orbit_tensor_cartesian(gauge_moment_w_l(l - 1), l - 1)
    quadrupole, moment = _moment(2), _moment(l)
    bracket = (2 * (l - 1) * _epsilon_product(_derivative(quadrupole, 3), w_lower)
               - Fraction(4, l) * _epsilon_product(_derivative(moment, 1), _derivative(y, 1))
               + 4 * _epsilon_product(moment, _derivative(y, 2))
               + Fraction(4 * (l * l - 1), l) * np.multiply.outer(_current_moment(l - 1), _derivative(y, 1)))
    radiative = _derivative(G_KEPLER * bracket.astype(float), l)
    expected = _projected(radiative, l, m)
    assert abs(expected) > 1e-8
    assert abs(_ours(l, m) - expected) <= 1e-10 * abs(expected)
