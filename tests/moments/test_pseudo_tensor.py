"""Checks of stfalgebra/moments/pseudo_tensor.py: the source term Lambda^{ab} (L1) and its 2PN
form (L2).

1. (L1) against general relativity: for any metric in harmonic gauge (d_b h^{ab} = 0),
   Lambda^{ab} = Box h^{ab} - 2 |g| G^{ab} (the relaxed Einstein equations with
   G^{ab} = (8 pi G/c^4) T^{ab}; common practice). Checked exactly at a point for a random
   polynomial h built to satisfy the gauge condition identically (h^{ab} = d_n d_r H^{anbr}
   with H antisymmetric in (a n) and in (b r) and symmetric under the exchange of the pairs),
   the Einstein tensor computed from the metric's second-order Taylor polynomial.
2. (L2) and (L3) against (L1): the coefficients of the eps^4 ... eps^7 parts, on explicit
   polynomial potentials (the monomials of (L2), (L3) evaluated independently).
"""

from __future__ import annotations

import itertools
import random

import numpy as np
import sympy as sp

from stfalgebra.moments.pseudo_tensor import (
    LAMBDA_00_PLUS_II_EPS6, LAMBDA_0I_EPS5, LAMBDA_0I_EPS7, LAMBDA_IJ_EPS4, LAMBDA_IJ_EPS6,
    expand_source, lambda_tensor,
)

R4 = range(4)
X = sp.symbols("x0:4")


def _random_harmonic_gothic_metric(seed=3):
    rng = random.Random(seed)
    ring, *gens = sp.ring(X, sp.QQ)

    def polynomial():
        return sum((sp.Rational(rng.randint(-3, 3), 11) * gens[i] * gens[j]
                    for i, j in itertools.combinations_with_replacement(range(4), 2) if rng.random() < 0.5),
                   ring(0))

    def antisymmetric():
        M = [[ring(0)] * 4 for _ in R4]
        for i in range(4):
            for j in range(i + 1, 4):
                p = polynomial()
                M[i][j], M[j][i] = p, -p
        return M

    A, B = antisymmetric(), antisymmetric()
    h = sp.zeros(4)
    for a in R4:
        for b in R4:
            total = ring(0)
            for n in R4:
                for s_ in R4:
                    total += (A[a][n] * B[b][s_] + B[a][n] * A[b][s_]).diff(gens[n]).diff(gens[s_])
            h[a, b] = (total * sp.Rational(1, 7)).as_expr()
    return h


def test_lambda_equals_box_h_minus_einstein_tensor_for_a_harmonic_metric():
    # reference: the relaxed Einstein equations, Lambda = Box h - 2|g| G^{ab} (common practice);
    # the metric's derivatives from matrix calculus (d M^-1 = -M^-1 dM M^-1,
    # d ln(-g) = tr(M^-1 dM)), the Einstein tensor from the Christoffel symbols, 40 digits
    h = _random_harmonic_gothic_metric()
    for a in R4:  # the gauge condition holds identically
        assert sp.expand(sum(sp.diff(h[a, b], X[b]) for b in R4)) == 0
    point = dict(zip(X, [sp.Rational(1, 5), -sp.Rational(1, 3), sp.Rational(1, 4), sp.Rational(1, 7)]))
    values = sp.lambdify(X, h, "numpy")
    first = sp.lambdify(X, [[[sp.diff(h[a, b], X[c]) for b in R4] for a in R4] for c in R4], "numpy")
    second = sp.lambdify(X, [[[[sp.diff(h[a, b], X[c], X[e]) for b in R4] for a in R4] for e in R4] for c in R4],
                         "numpy")
    p = [float(v) for v in point.values()]
    gothic = np.diag([-1.0, 1, 1, 1]) + np.array(values(*p), dtype=float)
    d_gothic = np.array(first(*p), dtype=float)          # [c, a, b]
    dd_gothic = np.array(second(*p), dtype=float)        # [c, e, a, b]
    M = np.linalg.inv(gothic)
    dM = np.array([-M @ d_gothic[c] @ M for c in R4])
    ddM = np.array([[M @ (d_gothic[c] @ M @ d_gothic[e] + d_gothic[e] @ M @ d_gothic[c] - dd_gothic[c, e]) @ M
                     for e in R4] for c in R4])
    minus_g = -np.linalg.det(gothic)
    root = np.sqrt(minus_g)
    dlog = np.array([np.trace(M @ d_gothic[c]) for c in R4])
    ddlog = np.array([[np.trace(dM[e] @ d_gothic[c] + M @ dd_gothic[c, e]) for e in R4] for c in R4])
    droot = root * dlog / 2
    ddroot = root / 2 * (ddlog + np.outer(dlog, dlog) / 2)
    g = root * M                                           # g_ab = sqrt(-g) gothic^-1
    dg = np.array([droot[c] * M + root * dM[c] for c in R4])                      # [c, a, b]
    ddg = np.array([[ddroot[c, e] * M + droot[c] * dM[e] + droot[e] * dM[c] + root * ddM[c, e]
                     for e in R4] for c in R4])                                  # [c, e, a, b]
    g_inv = gothic / root                                  # g^ab = gothic/sqrt(-g)
    lower = np.einsum("bdc->dbc", dg) + np.einsum("cdb->dbc", dg) - np.einsum("dbc->dbc", dg)
    gamma = 0.5 * np.einsum("ad,dbc->abc", g_inv, lower)                   # Gamma^a_bc
    dg_inv = np.array([-g_inv @ dg[c] @ g_inv for c in R4])                 # [e, a, d]
    d_lower = (np.einsum("ebdc->edbc", ddg) + np.einsum("ecdb->edbc", ddg) - np.einsum("edbc->edbc", ddg))
    dgamma = 0.5 * (np.einsum("ead,dbc->eabc", dg_inv, lower) + np.einsum("ad,edbc->eabc", g_inv, d_lower))
    ricci = np.zeros((4, 4))
    for b in R4:
        for d in R4:
            ricci[b, d] = sum(dgamma[a, a, b, d] - dgamma[d, a, b, a]
                              + sum(gamma[a, a, e] * gamma[e, b, d] - gamma[a, d, e] * gamma[e, b, a] for e in R4)
                              for a in R4)
    scalar = np.sum(g_inv * ricci)
    einstein = g_inv @ (ricci - scalar * g / 2) @ g_inv
    h_at = gothic - np.diag([-1.0, 1, 1, 1])
    dh = np.einsum("mab->abm", d_gothic)
    ddh = np.einsum("mnab->abmn", dd_gothic)
    lam = np.array(lambda_tensor(h_at.tolist(), dh.tolist(), ddh.tolist(), g_inv.tolist(), g.tolist()), dtype=float)
    box = -ddh[:, :, 0, 0] + ddh[:, :, 1, 1] + ddh[:, :, 2, 2] + ddh[:, :, 3, 3]
    assert np.max(np.abs(lam - (box - 2 * minus_g * einstein))) < 1e-9
    assert np.max(np.abs(lam)) > 1e-3  # not a trivially vanishing check


T, XS = sp.Symbol("t"), sp.symbols("x y z")
COORDINATES = (T, *XS)
EPS = sp.Symbol("eps")


def _random_potentials(seed=5):
    rng = random.Random(seed)

    def poly():
        monomials = [T, *XS, T**2, T * XS[0], XS[0] * XS[1], XS[2]**2, T * XS[1] * XS[2], XS[0]**3, T**2 * XS[1]]
        return sum(sp.Rational(rng.randint(-4, 4), rng.randint(1, 5)) * mono for mono in monomials) + 1

    V = poly()
    Vi = [poly() for _ in range(3)]
    W = [[None] * 3 for _ in range(3)]
    for i in range(3):
        for j in range(i, 3):
            W[i][j] = W[j][i] = poly()
    R = [poly() for _ in range(3)]
    return V, Vi, W, R


def _d(expression, *axes):
    """Derivatives: axis 0 is t, 1..3 space."""
    for axis in axes:
        expression = sp.diff(expression, COORDINATES[axis])
    return expression


def test_two_pn_expansion_of_lambda_matches_the_table():
    # reference: (L1) itself, expanded by expand_source on explicit potentials; the monomials
    # of (L2) are evaluated here independently
    V, Vi, W, R = _random_potentials()
    point = {T: sp.Rational(1, 3), XS[0]: -sp.Rational(2, 7), XS[1]: sp.Rational(1, 2), XS[2]: sp.Rational(3, 5)}
    lam = expand_source(V, Vi, W, R, COORDINATES, EPS, 7, at=point)
    at = lambda e: e.subs(point)  # noqa: E731
    space = (1, 2, 3)
    trace = W[0][0] + W[1][1] + W[2][2]
    grad_squared = sum(_d(V, i)**2 for i in space)
    monomials = {
        "V dV.dV": V * grad_squared,
        "V dt^2 V": V * _d(V, 0, 0),
        "V_i dt d_i V": sum(Vi[i - 1] * _d(V, 0, i) for i in space),
        "W_ij d_ij V": sum(W[i - 1][j - 1] * _d(V, i, j) for i in space for j in space),
        "W Delta V": trace * sum(_d(V, i, i) for i in space),
        "dV.dW": sum(_d(V, i) * _d(trace, i) for i in space),
        "d_i V_j d_j V_i": sum(_d(Vi[j - 1], i) * _d(Vi[i - 1], j) for i in space for j in space),
        "(dt V)^2": _d(V, 0)**2,
    }
    expected6 = sum(LAMBDA_00_PLUS_II_EPS6[name] * at(value) for name, value in monomials.items())
    mass_source = sp.expand(lam[0][0] + lam[1][1] + lam[2][2] + lam[3][3])
    assert mass_source.coeff(EPS, 6) == expected6
    assert mass_source.coeff(EPS, 4) == -16 * at(grad_squared)
    assert lam[0][0].coeff(EPS, 4) == -14 * at(grad_squared)
    for i in space:
        expected5 = (LAMBDA_0I_EPS5["d_k V d_i V_k"] * sum(_d(V, k) * _d(Vi[k - 1], i) for k in space)
                     + LAMBDA_0I_EPS5["d_k V d_k V_i"] * sum(_d(V, k) * _d(Vi[i - 1], k) for k in space)
                     + LAMBDA_0I_EPS5["d_t V d_i V"] * _d(V, 0) * _d(V, i))
        assert sp.expand(lam[0][i]).coeff(EPS, 5) == at(expected5)
        for j in space:
            expected4 = (LAMBDA_IJ_EPS4["d_i V d_j V"] * _d(V, i) * _d(V, j)
                         + (LAMBDA_IJ_EPS4["delta_ij dV.dV"] * grad_squared if i == j else 0))
            assert sp.expand(lam[i][j]).coeff(EPS, 4) == at(expected4)


def test_next_orders_of_lambda_for_the_current_moments_match_the_table():
    # reference: (L1) expanded by expand_source on explicit (non-harmonic) potentials; the
    # monomials of (L3) are evaluated here independently, component by component
    V, Vi, W, R = _random_potentials(seed=11)
    point = {T: sp.Rational(2, 5), XS[0]: sp.Rational(1, 3), XS[1]: -sp.Rational(3, 4), XS[2]: sp.Rational(1, 6)}
    lam = expand_source(V, Vi, W, R, COORDINATES, EPS, 7, at=point)
    at = lambda e: sp.expand(e).subs(point)  # noqa: E731
    space = (1, 2, 3)
    trace = W[0][0] + W[1][1] + W[2][2]
    Wc = lambda i, j: W[i - 1][j - 1]  # noqa: E731
    Vc = lambda i: Vi[i - 1]  # noqa: E731
    grad_squared = sum(_d(V, k)**2 for k in space)
    for i in space:
        monomials = {
            "d_k V d_i R_k": sum(_d(V, k) * _d(R[k - 1], i) for k in space),
            "d_k V d_k R_i": sum(_d(V, k) * _d(R[i - 1], k) for k in space),
            "V dt^2 V_i": V * _d(Vc(i), 0, 0),
            "V d_k V d_i V_k": V * sum(_d(V, k) * _d(Vc(k), i) for k in space),
            "V d_k V d_k V_i": V * sum(_d(V, k) * _d(Vc(i), k) for k in space),
            "V dt V d_i V": V * _d(V, 0) * _d(V, i),
            "V_k dt d_k V_i": sum(Vc(k) * _d(Vc(i), 0, k) for k in space),
            "V_i dV.dV": Vc(i) * grad_squared,
            "V_k d_k V d_i V": sum(Vc(k) * _d(V, k) for k in space) * _d(V, i),
            "dt V_i dt V": _d(Vc(i), 0) * _d(V, 0),
            "W_kl d_kl V_i": sum(Wc(k, n) * _d(Vc(i), k, n) for k in space for n in space),
            "W Delta V_i": trace * sum(_d(Vc(i), k, k) for k in space),
            "d_k V_i d_k W": sum(_d(Vc(i), k) * _d(trace, k) for k in space),
            "d_k V_l d_i W_kl": sum(_d(Vc(n), k) * _d(Wc(k, n), i) for k in space for n in space),
            "d_k V_l d_k W_il": sum(_d(Vc(n), k) * _d(Wc(i, n), k) for k in space for n in space),
            "d_k V_l d_l W_ik": sum(_d(Vc(n), k) * _d(Wc(i, k), n) for k in space for n in space),
            "d_k V_k d_i W": sum(_d(Vc(k), k) for k in space) * _d(trace, i),
            "dt V d_i W": _d(V, 0) * _d(trace, i),
            "d_k V dt W_ik": sum(_d(V, k) * _d(Wc(i, k), 0) for k in space),
        }
        assert set(monomials) == set(LAMBDA_0I_EPS7)
        expected7 = sum(LAMBDA_0I_EPS7[name] * at(value) for name, value in monomials.items())
        assert sp.expand(lam[0][i]).coeff(EPS, 7) == expected7
        assert expected7 != 0
        for j in space:
            delta = 1 if i == j else 0
            pairs = {
                "dt V_i d_j V + (ij)": _d(Vc(i), 0) * _d(V, j) + _d(Vc(j), 0) * _d(V, i),
                "d_i V_k d_j V_k": sum(_d(Vc(k), i) * _d(Vc(k), j) for k in space),
                "d_k V_i d_k V_j": sum(_d(Vc(i), k) * _d(Vc(j), k) for k in space),
                "d_i V_k d_k V_j + (ij)": sum(_d(Vc(k), i) * _d(Vc(j), k) + _d(Vc(k), j) * _d(Vc(i), k)
                                              for k in space),
                "delta_ij dt V_k d_k V": delta * sum(_d(Vc(k), 0) * _d(V, k) for k in space),
                "delta_ij d_k V_l d_k V_l": delta * sum(_d(Vc(n), k)**2 for k in space for n in space),
                "delta_ij d_k V_l d_l V_k": delta * sum(_d(Vc(n), k) * _d(Vc(k), n) for k in space for n in space),
                "delta_ij (dt V)^2": delta * _d(V, 0)**2,
            }
            assert set(pairs) == set(LAMBDA_IJ_EPS6)
            expected6 = sum(LAMBDA_IJ_EPS6[name] * at(value) for name, value in pairs.items())
            assert sp.expand(lam[i][j]).coeff(EPS, 6) == expected6
