"""The quadratic source against the Einstein tensor computed directly (sympy), and its
divergence-free property on a linear multipolar field."""

from __future__ import annotations

from functools import lru_cache

import flint
import sympy as sp

from stfalgebra.mpm.coefficient_ring import RING, gens, rate_polynomial
from stfalgebra.mpm.harmonic_split import sample_harmonic
from stfalgebra.mpm.linear_metric import LinearMoment, linear_metric
from stfalgebra.mpm.quadratic_source import quadratic_source
from stfalgebra.mpm.retarded_field import RetardedField

# sympy's sparse polynomial ring: exact and fast enough for the Einstein tensor to O(eps^2)
POLY_RING, T, X, Y, Z = sp.ring("t x y z", sp.QQ)
COORDS = (T, X, Y, Z)
ETA_DIAGONAL = (-1, 1, 1, 1)
ETA = sp.diag(*ETA_DIAGONAL)


class _Sym:
    """A sympy expression with the field interface quadratic_source needs."""

    def __init__(self, expr):
        self.expr = expr

    def __add__(self, other):
        return _Sym(self.expr + other.expr)

    def scale(self, factor):
        if isinstance(factor, flint.fmpq):
            factor = sp.QQ(int(factor.p), int(factor.q))
        return _Sym(self.expr * factor)


def _series_mul(a, b):
    """Product of two truncated series [c0, c1, c2] in eps."""
    return [sum((a[i] * b[k - i] for i in range(k + 1)), POLY_RING.zero) for k in range(3)]


def _matmul(a, b):
    return [[sum((a[i][k] * b[k][j] for k in range(4)), POLY_RING.zero) for j in range(4)] for i in range(4)]


def _matadd(*terms):
    return [[sum((t[i][j] for t in terms), POLY_RING.zero) for j in range(4)] for i in range(4)]


def _matscale(a, f):
    return [[a[i][j] * f for j in range(4)] for i in range(4)]


def _trace(a):
    return sum((a[i][i] for i in range(4)), POLY_RING.zero)


ETA_MATRIX = [[POLY_RING(ETA_DIAGONAL[i]) if i == j else POLY_RING.zero for j in range(4)] for i in range(4)]


def _harmonic_gauge_perturbation():
    """h^{ab} = d_m d_n H^{ambn}, H with the symmetries of the Riemann tensor: d_b h^{ab} = 0."""
    monomials = [T**2 * X**2, X * Y**3, T * Z**3, Y**2 * Z**2, T**3 * Y, X**2 * Y * Z, T * X * Y * Z,
                 Z**4, T**2 * Y * Z, X**3 * T]
    Xs = [[POLY_RING.zero] * 4 for _ in range(4)]
    k = 0
    for a in range(4):
        for b in range(a, 4):
            value = monomials[k % len(monomials)] * sp.QQ((k % 5) - 2, 1 + k % 3) \
                + monomials[(3 * k + 1) % len(monomials)] * sp.QQ(1, 2 + k)
            Xs[a][b] = Xs[b][a] = value
            k += 1

    def H(a, m, b, n):
        eta = lambda i, j: ETA_DIAGONAL[i] if i == j else 0
        return Xs[a][b] * eta(m, n) - Xs[m][b] * eta(a, n) - Xs[a][n] * eta(m, b) + Xs[m][n] * eta(a, b)

    return [[sum((H(a, m, b, n).diff(COORDS[m]).diff(COORDS[n]) for m in range(4) for n in range(4)),
                 POLY_RING.zero) for b in range(4)] for a in range(4)]


@lru_cache(maxsize=1)
def _einstein_density_series():
    """[order 1, eps, eps^2] of 2 |g| G^{ab} for the gothic metric eta + eps h."""
    h = _harmonic_gauge_perturbation()
    eta = ETA_MATRIX
    eta_h = _matmul(eta, h)
    a = _trace(eta_h)
    b = (a**2 - _trace(_matmul(eta_h, eta_h))) * sp.QQ(1, 2)
    # -det(gothic) = 1 + eps a + eps^2 b ; g^{ab} = gothic / sqrt(-det)
    upper = [eta, _matadd(h, _matscale(eta, -a * sp.QQ(1, 2))),
             _matadd(_matscale(h, -a * sp.QQ(1, 2)), _matscale(eta, a**2 * sp.QQ(3, 8) - b * sp.QQ(1, 2)))]
    first = _matmul(_matmul(eta, upper[1]), eta)
    lower = [eta, _matscale(first, -1),
             _matadd(_matmul(first, _matmul(upper[1], eta)),
                     _matscale(_matmul(_matmul(eta, upper[2]), eta), -1))]
    density = [POLY_RING.one, a, b]   # |g| = -det(gothic)

    def comp(series, i, j):
        return [series[k][i][j] for k in range(3)]

    def d(entry, mu):
        return [c.diff(COORDS[mu]) for c in entry]

    def add(*terms):
        return [sum((t[k] for t in terms), POLY_RING.zero) for k in range(3)]

    def scale(series, f):
        return [c * f for c in series]

    R4 = range(4)
    dg = {(l, m, n): d(comp(lower, m, n), l) for l in R4 for m in R4 for n in R4}
    gamma = {}
    for l in R4:
        for m in R4:
            for n in R4:
                total = [POLY_RING.zero] * 3
                for r in R4:
                    inner = add(dg[(m, r, n)], dg[(n, r, m)], scale(dg[(r, m, n)], -1))
                    total = add(total, _series_mul(comp(upper, l, r), inner))
                gamma[(l, m, n)] = scale(total, sp.QQ(1, 2))
    ricci = {}
    for m in R4:
        for n in R4:
            total = [POLY_RING.zero] * 3
            for l in R4:
                total = add(total, d(gamma[(l, m, n)], l), scale(d(gamma[(l, m, l)], n), -1))
                for s_ in R4:
                    total = add(total, _series_mul(gamma[(l, l, s_)], gamma[(s_, m, n)]),
                                scale(_series_mul(gamma[(l, n, s_)], gamma[(s_, m, l)]), -1))
            ricci[(m, n)] = total
    scalar = [POLY_RING.zero] * 3
    for m in R4:
        for n in R4:
            scalar = add(scalar, _series_mul(comp(upper, m, n), ricci[(m, n)]))
    einstein_lower = {(m, n): add(ricci[(m, n)], scale(_series_mul(comp(lower, m, n), scalar), sp.QQ(-1, 2)))
                      for m in R4 for n in R4}
    out = {}
    for a_ in R4:
        for b_ in range(a_, 4):
            total = [POLY_RING.zero] * 3
            for m in R4:
                for n in R4:
                    total = add(total, _series_mul(_series_mul(comp(upper, a_, m), comp(upper, b_, n)),
                                                   einstein_lower[(m, n)]))
            out[(a_, b_)] = scale(_series_mul(density, total), 2)
    return h, out


def test_perturbation_is_in_harmonic_gauge():
    h, _ = _einstein_density_series()
    for a in range(4):
        assert sum((h[a][b].diff(COORDS[b]) for b in range(4)), POLY_RING.zero) == 0


def test_quadratic_source_matches_the_einstein_tensor():
    # 2 |g| G^{ab} = Box h^{ab} - Lambda^{ab}(h) in harmonic gauge (Blanchet, Living Rev.
    # Relativ. 17, 2 (2014), eqs. (23)-(24), from memory): order eps is Box h, order eps^2 is -N(h, h)
    h, series = _einstein_density_series()
    metric = {(a, b): _Sym(h[a][b]) for a in range(4) for b in range(a, 4)}
    source = quadratic_source(metric, metric, lambda f, mu: _Sym(f.expr.diff(COORDS[mu])),
                              lambda u, v: _Sym(u.expr * v.expr), _Sym(POLY_RING.zero))
    assert any(value[2] != 0 for value in series.values())    # the check is not vacuous
    for (a, b), value in series.items():
        box = -h[a][b].diff(T).diff(T) + sum((h[a][b].diff(q).diff(q) for q in (X, Y, Z)), POLY_RING.zero)
        assert value[0] == 0, (a, b)
        assert value[1] - box == 0, (a, b)
        assert value[2] + source[(a, b)].expr == 0, (a, b)


def _cross_source(first, second):
    rate = first.rate + second.rate
    h1, h2 = linear_metric(first), linear_metric(second)
    zero = RetardedField.zero(rate)
    forward = quadratic_source(h1, h2, lambda f, mu: f.derivative(mu), lambda u, v: u.times(v), zero)
    backward = quadratic_source(h2, h1, lambda f, mu: f.derivative(mu), lambda u, v: u.times(v), zero)
    return {key: forward[key] + backward[key] for key in forward}


def test_quadratic_source_of_two_linear_waves_is_divergence_free():
    # d_nu N^{mu nu} = 0 when h_1 solves Box h_1 = 0 in harmonic gauge (Bianchi identity at
    # quadratic order; Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 2.2)
    one = RING.from_dict({(0,) * RING.nvars(): 1})
    pairs = [
        (LinearMoment("M", 0, one, "s1", constant=True), LinearMoment("M", 2, sample_harmonic(2), "s2")),
        (LinearMoment("M", 2, sample_harmonic(2, 1), "s1"), LinearMoment("S", 2, sample_harmonic(2, 2), "s2")),
    ]
    for first, second in pairs:
        source = _cross_source(first, second)
        for mu in range(4):
            total = RetardedField.zero(first.rate + second.rate)
            for nu in range(4):
                total = total + source[(min(mu, nu), max(mu, nu))].derivative(nu)
            assert total.is_zero(), (first, mu)
