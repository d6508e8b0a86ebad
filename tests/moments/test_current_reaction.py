"""Tests of stfalgebra/moments/current_reaction.py: the derived 2.5PN terms of J_L."""

from __future__ import annotations

import pytest
import sympy as sp

from stfalgebra.moments.current_reaction import REACTION_CURRENT_SOURCE, reaction_current_moment
from stfalgebra.symbols import G, delta, m, nu, phidot, r, rdot

FIVE_HALVES = sp.Rational(5, 2)


def _cross(a, b):
    return sp.Matrix([a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]])


def _direct(l: int, values: dict, k: sp.Matrix) -> sp.Expr:
    """k_L J_L|_c^-5 from (Q1), (Q2) with explicit Cartesian vectors: Newtonian time derivatives
    by the chain rule in (x, v), the odd constants from their definitions, the full STF yhat_{L-1 a}
    (its trace terms kept), the cited centre-of-mass shift."""
    X = sp.Matrix(sp.symbols("X1:4", real=True))
    Vv = sp.Matrix(sp.symbols("V1:4", real=True))
    gm, mass = G * m, m
    dd = values[delta]
    nuv = (1 - dd**2) / 4
    x1, x2 = (1 + dd) / 2, (1 - dd) / 2
    radius = sp.sqrt(X.dot(X))
    acc = -gm * X / radius**3

    def d_t(expr):
        return sum(sp.diff(expr, X[i]) * Vv[i] + sp.diff(expr, Vv[i]) * acc[i] for i in range(3))

    bodies = ((mass * x1, x2), (mass * x2, -x1))
    Q = sum((mb * f**2 * X * X.T for mb, f in bodies), sp.zeros(3, 3))
    speed2 = Vv.dot(Vv)
    S = sum((mb * f**2 * Vv * Vv.T for mb, f in bodies), sp.zeros(3, 3)) \
        - sp.eye(3) * sum(mb * f**2 * speed2 for mb, f in bodies) \
        + G * bodies[0][0] * bodies[1][0] * (sp.eye(3) - X * X.T / radius**2) / radius
    W1 = -G * S.applyfunc(d_t)
    W1dot = W1.applyfunc(d_t)
    M1 = sum(mb * (sp.Rational(3, 2) * f**2 * speed2 - G * other / radius)
             for (mb, f), (other, _) in zip(bodies, bodies[::-1]))
    trace = Q.trace()
    for _ in range(3):
        trace = d_t(trace)
    V3 = -G * (d_t(M1) + trace / 6)
    Y = sp.Matrix(sp.symbols("Y1:4", real=True))
    n = l - 1
    ky = k.dot(Y)
    y2 = Y.dot(Y)
    # k_{L-1} yhat_{L-1 a}, the harmonic extension with its trace term along k_a
    stf = (ky**n * Y - sp.Rational(n, 2 * n + 1) * k * y2 * ky**(n - 1)) if n else Y
    f = y2 * stf
    total = 0
    q_shift = sp.Rational(4, 5) * gm * (speed2 - 2 * gm / radius)
    for mb, fr in bodies:
        y, v = fr * X, fr * Vv
        at = dict(zip(Y, y))
        grad = sp.Matrix(3, 3, lambda a, kk: sp.diff(f[a], Y[kk]).subs(at))
        hess = [sp.Matrix(3, 3, lambda kk, ll: sp.diff(f[a], Y[kk], Y[ll]).subs(at)) for a in range(3)]
        field_a = sp.Matrix([sum(W1[kk, ll] * hess[a][kk, ll] for kk in range(3) for ll in range(3)) for a in range(3)])
        vector = 3 * V3 * stf.subs(at)
        term = _cross(vector, v).dot(k)
        term += sp.Rational(2, 2 * l + 3) * _cross(field_a, v).dot(k)
        # eps_abc k_c dW1_bk d_k f_a
        rate = sum(sp.LeviCivita(a, b, c) * k[c] * W1dot[b, kk] * grad[a, kk]
                   for a in range(3) for b in range(3) for c in range(3) for kk in range(3))
        term += sp.Rational(2, 2 * l + 3) * rate
        if l >= 2:
            s = nuv * dd * q_shift * Vv
            term += (l - 1) * k.dot(s) * k.dot(y)**(l - 2) * _cross(y, v).dot(k)
        total += mb * term
    point = {X[0]: values[r], X[1]: 0, X[2]: 0, Vv[0]: values[rdot], Vv[1]: values[r] * values[phidot], Vv[2]: 0}
    return sp.nsimplify(sp.expand(total.subs({G: values[G], m: values[m]}).subs(point)))


@pytest.mark.parametrize("l", [1, 2, 3])
def test_current_reaction_terms_by_a_cartesian_route(l):
    values = {G: 1, m: 1, delta: sp.Rational(1, 3), r: 2, rdot: sp.Rational(3, 10), phidot: sp.Rational(1, 3)}
    values[nu] = (1 - values[delta]**2) / 4
    k = sp.Matrix([1, sp.I * sp.Rational(3, 5), sp.I * sp.Rational(4, 5)])     # null
    x = sp.Matrix([values[r], 0, 0])
    v = sp.Matrix([values[rdot], values[r] * values[phidot], 0])
    ell = _cross(x, v)
    tensor = reaction_current_moment(l)
    from_tensor = 0
    for (a, b, c), series in tensor.terms.items():
        coefficient = series.coefficient(FIVE_HALVES).to_sympy().subs(values)
        from_tensor += coefficient * k.dot(x)**a * k.dot(v)**b * k.dot(ell)**c
    assert sp.simplify(sp.expand(from_tensor) - _direct(l, values, k)) == 0


def test_current_dipole_is_not_the_angular_momentum_of_the_equations_of_motion():
    # a record, not a validation: the formula's l = 1 moment at 2.5PN is
    # -(24/5) nu^2 m (G m)^2 rdot/r^2 ell, the 2.5PN term of the harmonic angular momentum that
    # balances the flux (cited, stfalgebra.binary.cited_inputs.angular_momentum_reaction_term) is
    # -(8/5) nu^2 m (G m)^2 rdot/r^2 ell. They need not agree: the angular momentum radiated is of
    # relative order 2.5PN, so no conservation law fixes the source dipole at this order (unlike
    # the mass dipole, whose loss starts at 3.5PN: tests/moments/test_mass_reaction.py)
    from types import SimpleNamespace

    from stfalgebra.binary.cited_inputs import REACTION_ORDER, angular_momentum_reaction_term

    value = reaction_current_moment(1).terms[(0, 0, 1)].coefficient(FIVE_HALVES).to_sympy()
    assert sp.expand(value + sp.Rational(24, 5) * nu**2 * G**2 * m**3 * rdot / r**2) == 0
    names = SimpleNamespace(G=G, m=m, nu=nu, delta=delta, r=r, rdot=rdot, phidot=phidot, q=sp.Rational)
    per_mass = angular_momentum_reaction_term(names)[REACTION_ORDER] / (r**2 * phidot)
    assert sp.expand(m * nu * per_mass + sp.Rational(8, 5) * nu**2 * G**2 * m**3 * rdot / r**2) == 0


def test_current_reaction_provenance_and_bad_orders():
    assert "derived" in REACTION_CURRENT_SOURCE and "no published value" in REACTION_CURRENT_SOURCE
    with pytest.raises(ValueError, match="0"):
        reaction_current_moment(0)
    with pytest.raises(TypeError, match="'2'"):
        reaction_current_moment("2")
