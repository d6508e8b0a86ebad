"""Tests of stfalgebra/radiative/circular_interactions.py: the quadratic interactions of U_L, V_L
on the circular orbit through relative 2.5PN, by probe polynomials."""

from __future__ import annotations

import itertools
from fractions import Fraction

import mpmath
import numpy as np
import pytest

from stfalgebra.binary.circular_frequency import on_circular_orbit
from stfalgebra.errors import RefusedModeError
from stfalgebra.exact import ExactPolynomial
from stfalgebra.radiative.circular_interactions import (
    _null_reduced, _term_polynomial, circular_interaction_channel, circular_quadratic_channel_through,
    harmonic_projection, laplacian, probe_polynomial, quadratic_terms_through,
)
from stfalgebra.radiative.circular_quadratic import circular_quadratic_channel
from stfalgebra.radiative.contributions import CONTRIBUTIONS
from stfalgebra.radiative.projection import alpha_on_spinor_basis, mode_channel
from stfalgebra.radiative.radiative_moments import quadratic_channel

U_IJ_ROW = next(row for row in CONTRIBUTIONS if row.family == "quadratic" and row.available and row.l_max == 2)
NEWTONIAN_ROW = next(row for row in CONTRIBUTIONS if row.family == "quadratic" and row.available)


def test_harmonic_projection_is_trace_free():
    # (x.k)^3 with x = e_x: k_x^3, its STF part has zero Laplacian and keeps the leading monomial
    cube = {(a, 3 - a, 0): ExactPolynomial(Fraction(1, 8) * (1 if a in (0, 3) else 3)) for a in range(4)}
    projected = harmonic_projection(cube, 3)
    assert laplacian(projected) == {}
    assert projected[(3, 0, 0)] == cube[(3, 0, 0)]


def test_u_ij_agrees_with_the_component_evaluation():
    # second route: circular_quadratic (explicit 3x3 components) for the (2,2) channel
    ours = circular_quadratic_channel_through(2, 2)
    theirs = circular_quadratic_channel(2, 2, row=U_IJ_ROW, orbit="circular")
    assert ours.truncate(Fraction(5, 2)) == theirs.truncate(Fraction(5, 2))


@pytest.mark.parametrize("l, m", [(4, 4), (4, 2), (5, 5), (5, 1), (3, 2), (4, 3), (6, 6)])
def test_relative_one_and_a_half_agrees_with_the_orbit_tensor_route(l, m):
    # second route: radiative_moments.quadratic_channel (orbit-tensor products of
    # stfalgebra.radiative.nonlinear); the 1.5PN terms with the Newtonian part of the moments
    ours = on_circular_orbit(circular_quadratic_channel_through(l, m).truncate(Fraction(3, 2)), 0)
    theirs = on_circular_orbit(quadratic_channel(l, m, row=NEWTONIAN_ROW, orbit="circular").truncate(Fraction(3, 2)), 0)
    assert ours.orders and ours == theirs


# ----------------------------------------------------------------------------- numeric route
# Explicit Cartesian components of the Newtonian moments of two point masses on a circle, the
# time derivatives as the rotation acting on every index, the STF products formed with numpy and
# projected on Y_lm by quadrature on the sphere (mpmath's spherical harmonics): independent of
# the probe polynomials.
M1, M2, RADIUS, OMEGA = 0.7, 0.3, 1.3, 0.37
GENERATOR = np.array([[0.0, -1.0, 0.0], [1.0, 0.0, 0.0], [0.0, 0.0, 0.0]])     # d n/dt = omega lambda


def _symmetrise(tensor):
    perms = list(itertools.permutations(range(tensor.ndim)))
    return sum(np.transpose(tensor, perm) for perm in perms) / len(perms)


def _detrace(sym):
    rank = sym.ndim
    delta = np.eye(3)
    if rank == 2:
        return sym - delta * np.trace(sym) / 3
    if rank == 3:
        trace = np.einsum("iaa->i", sym)
        return sym - (np.einsum("ij,k->ijk", delta, trace) + np.einsum("ik,j->ijk", delta, trace)
                      + np.einsum("jk,i->ijk", delta, trace)) / 5
    if rank == 4:
        # T_ijkl - (1/7) sum_6 delta_ij T_klaa + (1/35) sum_3 delta_ij delta_kl T_aabb
        trace = np.einsum("ijaa->ij", sym)
        double = np.trace(trace)
        pairs = ("ij,kl->ijkl", "ik,jl->ijkl", "il,jk->ijkl", "jk,il->ijkl", "jl,ik->ijkl", "kl,ij->ijkl")
        out = sym - sum(np.einsum(p, delta, trace) for p in pairs) / 7 \
            + double * sum(np.einsum(p, delta, delta) for p in pairs[:3]) / 35
        assert abs(np.einsum("ijaa->ij", out)).max() < 1e-12
        return out
    raise ValueError(rank)


def _bodies():
    n = np.array([1.0, 0.0, 0.0])
    total = M1 + M2
    y1, y2 = (M2 / total) * RADIUS * n, -(M1 / total) * RADIUS * n
    return [(M1, y1, OMEGA * GENERATOR @ y1), (M2, y2, OMEGA * GENERATOR @ y2)]


def _moment(kind, rank):
    total = np.zeros((3,) * rank)
    for mass, y, v in _bodies():
        if kind == "M":
            piece = y
            for _ in range(rank - 1):
                piece = np.multiply.outer(piece, y)
        else:
            piece = np.cross(y, v)
            for _ in range(rank - 1):
                piece = np.multiply.outer(y, piece)
        total = total + mass * piece
    return _detrace(_symmetrise(total)) if rank > 1 else total


def _derivative(tensor, times):
    for _ in range(times):
        tensor = sum(np.moveaxis(np.tensordot(OMEGA * GENERATOR, tensor, axes=([1], [s])), 0, s)
                     for s in range(tensor.ndim))
    return tensor


LEVI = np.zeros((3, 3, 3))
for _i, _j, _k in itertools.permutations(range(3)):
    LEVI[_i, _j, _k] = np.linalg.det(np.eye(3)[[_i, _j, _k]])


def _contract_with(tensor, k, count):
    for _ in range(count):
        tensor = tensor @ k
    return tensor


def _term_on_direction(term, k):
    """T_L k^L of eps_(iab) A_(aKP) B_(bKQ) (or A_(KP) B_(KQ)) for a real unit vector k."""
    (ka, p, ta), (kb, q, tb) = term.factors
    a = _derivative(_moment(ka, p), ta)
    b = _derivative(_moment(kb, q), tb)
    taken = term.contractions + term.epsilon
    a = _contract_with(a, k, p - taken)         # free indices P on k; remaining: [a] K
    b = _contract_with(b, k, q - taken)
    if term.epsilon:
        if term.contractions:
            return term.coefficient * np.einsum("i,iab,ac,bc->", k, LEVI, a, b)
        return term.coefficient * np.einsum("i,iab,a,b->", k, LEVI, a, b)
    if term.contractions:
        return term.coefficient * float(a @ b)
    return term.coefficient * float(a * b)


def _projected(term, l, m):
    nodes, weights = np.polynomial.legendre.leggauss(l + 3)
    azimuths = 2 * np.pi * np.arange(2 * l + 3) / (2 * l + 3)
    total = 0j
    for x, w in zip(nodes, weights):
        theta = float(np.arccos(x))
        for phi in azimuths:
            k = np.array([np.sin(theta) * np.cos(phi), np.sin(theta) * np.sin(phi), np.cos(theta)])
            harmonic = complex(mpmath.spherharm(l, m, theta, phi)).conjugate()
            total += w * (2 * np.pi / len(azimuths)) * harmonic * _term_on_direction(term, k)
    return total


def _ours(term, l, m):
    p, q, c = mode_channel(l, m)
    (ka, ra, _), (kb, rb, _) = term.factors
    left, right = probe_polynomial(ka, ra, 0)[0].get(0, {}), probe_polynomial(kb, rb, 0)[0].get(0, {})
    value = _null_reduced(_term_polynomial(term, left, right)).get((p, q, c), ExactPolynomial(0))
    numbers = {"nu": M1 * M2 / (M1 + M2) ** 2, "delta": (M1 - M2) / (M1 + M2), "m": M1 + M2,
               "r": RADIUS, "phidot": OMEGA, "I": 1j}
    if value.is_zero():
        return 0j
    expr = value.to_sympy()
    number = complex(expr.subs({s: numbers[s.name] for s in expr.free_symbols}))
    return number * complex(alpha_on_spinor_basis(l, m, p, q, c))


@pytest.mark.parametrize("moment, l, m", [("U", 3, 3), ("U", 3, 1), ("V", 2, 1), ("V", 3, 2)])
def test_each_term_against_explicit_components(moment, l, m):
    # every term at relative 2.5PN of U_ijk, V_ij (and V_ijk), one by one (a memory term: its
    # integrand; the factor i/(m omega) of the integral is checked with U_ijkl above)
    terms = [t for t in quadratic_terms_through(moment, l) if t.order == Fraction(5, 2)]
    assert terms
    checked = 0
    for term in terms:
        expected = _projected(term, l, m)
        got = _ours(term, l, m)
        assert abs(got - expected) <= 1e-10 * max(1.0, abs(expected)), (term, got, expected)
        checked += abs(expected) > 1e-8
    assert checked >= len(terms) // 2


def test_memory_dc_part_is_refused_by_name():
    # U_ijkl: int M^(3)_<ij M^(3)_kl> has a constant (m = 0) part on the circle
    with pytest.raises(RefusedModeError, match=r"\(4,0\).*whole past"):
        circular_quadratic_channel_through(4, 0)


def test_odd_l_m_zero_comes_from_instantaneous_products():
    # V_ijk has no memory term through relative 2.5PN: its m = 0 channel is instantaneous
    assert all(term.kind == "instantaneous" for term in quadratic_terms_through("V", 3))
    assert circular_quadratic_channel_through(3, 0).orders == (Fraction(3, 2), Fraction(5, 2))


def test_general_orbit_is_refused():
    with pytest.raises(ValueError, match="circular"):
        circular_interaction_channel(3, 3, row=NEWTONIAN_ROW, orbit="general")


def test_the_table_chooses_these_rows_at_relative_two_and_a_half():
    # with the rows other helpers supply taken as present (the missing instantaneous and
    # canonical rows dropped, a stand-in instantaneous row added), the plan of U_ijk, V_ij, U_L, V_L at 5/2 uses this evaluator;
    # at relative 2 the Newtonian 1.5PN row is still the one chosen
    from stfalgebra.orders import PNOrder
    from stfalgebra.radiative.contributions import Contribution, plan_radiative_moment

    stand_in = Contribution("instantaneous", "stand-in for the source moments through 2.5PN", ("mass", "current"),
                            PNOrder(0), PNOrder(5, 2), ("circular",), "test stand-in", evaluator="none:none")
    table = tuple(row for row in CONTRIBUTIONS if row.available or row.family not in ("instantaneous",
                                                                                      "canonical moments"))
    table = table + (stand_in,)
    for kind, l in (("mass", 3), ("current", 2), ("mass", 4), ("current", 3), ("mass", 8), ("current", 8)):
        plan = plan_radiative_moment(kind, l, PNOrder(5, 2), "circular", table=table)
        quadratic = [row for row in plan.rows if row.family == "quadratic"]
        assert len(quadratic) == 1 and "circular_interactions" in quadratic[0].evaluator, (kind, l)
    plan = plan_radiative_moment("mass", 4, PNOrder(2), "circular", table=table)
    assert [row.known_through for row in plan.rows if row.family == "quadratic"] == [PNOrder(2)]


def test_memory_integral_by_quadrature_along_the_inspiral():
    # second route for the memory factor i/(m omega): the (4,4) channel of the memory integrand
    # (2/5) M^(3)_<ij M^(3)_kl> integrated numerically along the Newtonian inspiral driven by the
    # quadrupole flux (G = m = 1: dx/dt = (64/5) nu x^5, phi = -x^(-5/2)/(32 nu); common practice),
    # from x0/10 (the earlier past as its own leading adiabatic term) to x0 = 0.1. The ratio to the
    # adiabatic value is 1 - i (d ln(A/omega)/dt)/(m omega) + O(x^5) = 1 - (7/2)(64/5)(nu/4) i x^(5/2):
    # the drift is 2.5PN beyond the term, i.e. relative 4PN for the memory of U_L, l >= 4
    nu, m, x0 = 0.25, 4, 0.1
    term = next(t for t in quadratic_terms_through("U", 4) if t.kind == "memory" and t.order == Fraction(3, 2))
    (ka, ra, _), (kb, rb, _) = term.factors
    value = _null_reduced(_term_polynomial(term, probe_polynomial(ka, ra, 0)[0][0],
                                           probe_polynomial(kb, rb, 0)[0][0]))[mode_channel(4, m)]
    pieces = [(float(c) * nu ** e.get("nu", 0) * 1j ** e.get("I", 0), 1.5 * e.get("phidot", 0) - e.get("r", 0))
              for e, c in value.terms()]

    def amplitude(x):
        return sum(c * x**p for c, p in pieces)

    def x_of(phi):
        return (-32 * nu * phi) ** -0.4

    phi0, x1 = -x0**-2.5 / (32 * nu), x0 / 10
    phi1 = -x1**-2.5 / (32 * nu)
    period = 2 * np.pi / m
    count = int(np.ceil((phi0 - phi1) / period))
    lower = phi0 - period * np.arange(count, 0, -1)
    nodes, weights = np.polynomial.legendre.leggauss(12)
    phases = lower[:, None] + period / 2 * (1 + nodes[None, :])
    xs = x_of(phases)
    total = np.sum(amplitude(xs) * np.exp(-1j * m * phases) / xs**1.5 * weights) * period / 2
    start = lower[0]
    total += 1j / (m * x_of(start) ** 1.5) * amplitude(x_of(start)) * np.exp(-1j * m * start)
    ratio = total / (1j / (m * x0**1.5) * amplitude(x0) * np.exp(-1j * m * phi0))
    expected = 1 - 3.5 * (64 / 5) * nu / m * 1j * x0**2.5
    assert abs(ratio - expected) < 2e-4 and abs(ratio - 1) > 5e-3


@pytest.mark.parametrize("l, m", [(4, 4), (4, 2), (3, 2), (3, 0), (5, 2)])
def test_one_and_a_half_terms_with_1pn_moments_against_the_orbit_tensor_route(l, m):
    # second route for the 1PN moments inside the 1.5PN terms: the project's 1PN moments as orbit
    # tensors, differentiated along the general 1PN orbit, multiplied with the orbit-tensor
    # products of stfalgebra.radiative.nonlinear, then put on the circle (rdot = 0, the 1PN
    # circular relation) -- against the probe polynomials with harmonic derivatives
    from stfalgebra.moments.current import current_moment
    from stfalgebra.moments.mass import mass_moment
    from stfalgebra.moments.orbit_tensor import differentiate_along_orbit
    from stfalgebra.pnseries import PNSeries
    from stfalgebra.radiative.circular_interactions import _channel_values
    from stfalgebra.radiative.contributions import mode_kind
    from stfalgebra.radiative.nonlinear import cross_product, symmetric_product

    kind = mode_kind(l, m)
    p, q, c = mode_channel(l, m)
    total = None
    for term in quadratic_terms_through("U" if kind == "mass" else "V", l):
        if term.order != Fraction(3, 2):
            continue
        tensors = [differentiate_along_orbit((mass_moment if name == "M" else current_moment)(rank, 1), 1, times=times)
                   for name, rank, times in term.factors]
        product = (cross_product if term.epsilon else symmetric_product)(*tensors).scale(term.coefficient)
        channel = product.on_circular_orbit().channel(p, q, c, circular_frequency=True)
        if term.kind == "memory":
            channel = channel.map_coefficients(lambda v: v * ExactPolynomial("I") / (m * ExactPolynomial("phidot")))
        total = channel if total is None else total + channel
    theirs = on_circular_orbit((total * ExactPolynomial("G")).shift(Fraction(3, 2)).truncate(Fraction(5, 2)), 1)
    ours = PNSeries._from_trusted(_channel_values(kind, l, m, (Fraction(3, 2),)), 5)
    assert on_circular_orbit(ours, 1) == theirs and len(theirs.orders) == 2


def test_hhat_30_through_relative_two_and_a_half():
    # the circular odd-l m = 0 modes come from the quadratic interactions alone (the l-th
    # derivative of the constant part of the moments, and its tail, vanish): served through
    # relative 5/2; leading term BFIS 2008 sec. 5
    # (from memory): -(2/5) i sqrt(6/7) nu x^(5/2); imaginary and proportional to nu (products
    # of two moments), as the planar symmetry Hhat_l0 = (-1)^l conj(Hhat_l0) requires
    import sympy as sp

    from stfalgebra.radiative.modes import derive_mode

    nu, x = sp.symbols("nu x", positive=True)
    result = derive_mode(3, 0, pn_relative="5/2")
    hhat = sp.expand(result.hhat.subs({s: {"nu": nu, "x": x}.get(s.name, s) for s in result.hhat.free_symbols}))
    y = sp.Symbol("y", positive=True)                                        # y = sqrt(x)
    powers = sp.Poly(sp.expand(hhat.subs(x, y**2)), y)
    assert sorted(powers.monoms()) == [(5,), (7,)]
    assert sp.expand(powers.coeff_monomial(y**5) + sp.Rational(2, 5) * sp.I * sp.sqrt(sp.Rational(6, 7)) * nu) == 0
    assert hhat.coeff(sp.I, 0) == 0 and hhat.subs(nu, 0) == 0
    # the rows whose part of it is zero (contributions._ZERO_FOR_CIRCULAR_ODD_M0) are used where
    # available (the 2PN current row and the radiation-reaction row now are) and add nothing:
    # the two powers above come from the quadratic interactions
    assert any(row.startswith("quadratic") for row in result.provenance)
    with pytest.raises(Exception, match=r"\(3,0\).*through relative 2\.5PN"):
        derive_mode(3, 0, pn_relative=3)


@pytest.mark.parametrize("kind, rank", [("M", 2), ("M", 5), ("S", 2), ("S", 4)])
def test_probe_polynomial_channels_are_the_orbit_tensor_channels(kind, rank):
    # the 1PN moment as a harmonic probe polynomial, null-reduced, gives the same channel
    # coefficients as OrbitTensor.channel (the representation the rest of the toolkit uses);
    # harmonic: its Laplacian in k vanishes, and projecting it again changes nothing
    from stfalgebra.radiative.radiative_moments import source_channel

    pieces, _ = probe_polynomial(kind, rank, 1)
    for order2, poly in pieces.items():
        assert laplacian(poly) == {}
        assert harmonic_projection(poly, rank) == poly
    l = rank
    for m in range(1, l + 1):
        if (m + l) % 2 != (0 if kind == "M" else 1):
            continue
        p, q, c = mode_channel(l, m)
        expected = source_channel(l, m, 1, circular=True)
        for order in expected.orders:
            got = _null_reduced(pieces.get(order.twice, {})).get((p, q, c), ExactPolynomial(0))
            assert got == expected.coefficient(order), (kind, rank, m, order)
