"""The gravitational source term Lambda^{ab} of the relaxed Einstein equations, and its 2PN form.

In harmonic coordinates, with the gothic metric deviation h^{ab} = sqrt(-g) g^{ab} - eta^{ab}
and d_b h^{ab} = 0, the Einstein equations read Box h^{ab} = (16 pi G/c^4) tau^{ab},
tau^{ab} = |g| T^{ab} + (c^4/(16 pi G)) Lambda^{ab}, with (Blanchet, Living Rev. Relativ. 17, 2
(2014), Sec. 2.1; quoted from memory and tested here against the identity
Lambda^{ab} = Box h^{ab} - 2 |g| G^{ab}, G^{ab} the Einstein tensor, for random harmonic h):

    Lambda^{ab} = - h^{mn} d_m d_n h^{ab} + d_m h^{an} d_n h^{bm}
                  + (1/2) g^{ab} g_{mn} d_l h^{mt} d_t h^{nl}
                  - g^{am} g_{nt} d_l h^{bt} d_m h^{nl} - g^{bm} g_{nt} d_l h^{at} d_m h^{nl}
                  + g_{mn} g^{lt} d_l h^{am} d_t h^{bn}
                  + (1/8)(2 g^{am} g^{bn} - g^{ab} g^{mn})(2 g_{lt} g_{ep} - g_{te} g_{lp})
                    d_m h^{lp} d_n h^{te}.                                                    (L1)

Inserted with the 2PN metric (N1) of :mod:`stfalgebra.moments.near_zone`, its expansion in
eps = 1/c (derived with sympy by :func:`expand_source`, the coefficients below checked by the
tests on explicit potentials) gives the source densities of the 2PN moments:

    Lambda^00 + Lambda^ii = -16 eps^4 d_k V d_k V + eps^6 [ -56 V dV.dV - 16 V d_t^2 V
        - 32 V_i d_t d_i V - 16 W_ij d_ij V + 8 W Delta V - 16 dV.dW + 32 d_i V_j d_j V_i
        - 8 (d_t V)^2 ] + O(eps^8),                                                           (L2)
    Lambda^0i = 16 eps^5 [ d_k V (d_i V_k - d_k V_i) + (3/4) d_t V d_i V ] + O(eps^7),
    Lambda^ij = 4 eps^4 [ d_i V d_j V - delta_ij dV.dV/2 ] + O(eps^6).

The next orders, needed by the 2PN current moments (Sigma_i at relative 2PN, Sigma_ij at 1PN;
derived the same way, without using the gauge condition):

    Lambda^0i|eps^7 = 32 d_k V (d_i R_k - d_k R_i) - 16 V d_t^2 V_i + 32 V d_k V (d_i V_k - d_k V_i)
        + 48 V d_t V d_i V - 32 V_k d_t d_k V_i - 24 V_i dV.dV + 16 V_k d_k V d_i V
        + 16 d_t V_i d_t V - 16 W_kl d_kl V_i + 8 W Delta V_i - 16 d_k V_i d_k W
        - 16 d_k V_l d_i W_kl + 16 d_k V_l d_k W_il + 16 d_k V_l d_l W_ik + 8 d_k V_k d_i W
        + 8 d_t V d_i W + 16 d_k V d_t W_ik,                                                 (L3)
    Lambda^ij|eps^6 = 16 (d_t V_i d_j V + d_t V_j d_i V) - 16 d_i V_k d_j V_k - 16 d_k V_i d_k V_j
        + 16 (d_i V_k d_k V_j + d_j V_k d_k V_i)
        + delta_ij [ -16 d_t V_k d_k V + 8 d_k V_l d_k V_l - 8 d_k V_l d_l V_k - 6 (d_t V)^2 ].

**Conventions**: signature (-+++), x^0 = c t (so d_0 = eps d_t), eta = diag(-1, 1, 1, 1); h^{ab}
the gothic deviation; W = W_kk.

Example
-------
>>> coefficients = LAMBDA_00_PLUS_II_EPS6
>>> coefficients["V dV.dV"]
-56

References
----------
L. Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 2.1 (relaxed Einstein equations and
Lambda^{ab}) and Sec. 5.2 (2PN metric); L. D. Landau & E. M. Lifshitz, The Classical Theory of
Fields (the pseudo-tensor t_LL of which Lambda is built).
"""

from __future__ import annotations

from typing import Callable, Sequence

import sympy as sp

__all__ = [
    "lambda_tensor", "gothic_metric_2pn", "expand_source", "LAMBDA_00_PLUS_II_EPS6",
    "LAMBDA_0I_EPS5", "LAMBDA_IJ_EPS4", "LAMBDA_0I_EPS7", "LAMBDA_IJ_EPS6",
]

#: Coefficients of the eps^6 part of Lambda^00 + Lambda^ii in (L2), by monomial.
LAMBDA_00_PLUS_II_EPS6 = {
    "V dV.dV": -56, "V dt^2 V": -16, "V_i dt d_i V": -32, "W_ij d_ij V": -16,
    "W Delta V": 8, "dV.dW": -16, "d_i V_j d_j V_i": 32, "(dt V)^2": -8,
}
#: Lambda^0i at eps^5: coefficients of d_k V d_i V_k, d_k V d_k V_i, d_t V d_i V.
LAMBDA_0I_EPS5 = {"d_k V d_i V_k": 16, "d_k V d_k V_i": -16, "d_t V d_i V": 12}
#: Lambda^ij at eps^4: coefficients of d_i V d_j V and delta_ij dV.dV.
LAMBDA_IJ_EPS4 = {"d_i V d_j V": 4, "delta_ij dV.dV": -2}
#: Lambda^0i at eps^7 (L3), by monomial (free index i; W = W_kk).
LAMBDA_0I_EPS7 = {
    "d_k V d_i R_k": 32, "d_k V d_k R_i": -32, "V dt^2 V_i": -16, "V d_k V d_i V_k": 32,
    "V d_k V d_k V_i": -32, "V dt V d_i V": 48, "V_k dt d_k V_i": -32, "V_i dV.dV": -24,
    "V_k d_k V d_i V": 16, "dt V_i dt V": 16, "W_kl d_kl V_i": -16, "W Delta V_i": 8,
    "d_k V_i d_k W": -16, "d_k V_l d_i W_kl": -16, "d_k V_l d_k W_il": 16, "d_k V_l d_l W_ik": 16,
    "d_k V_k d_i W": 8, "dt V d_i W": 8, "d_k V dt W_ik": 16,
}
#: Lambda^ij at eps^6 (L3), by monomial (symmetrised pairs written once with "+ (ij)").
LAMBDA_IJ_EPS6 = {
    "dt V_i d_j V + (ij)": 16, "d_i V_k d_j V_k": -16, "d_k V_i d_k V_j": -16,
    "d_i V_k d_k V_j + (ij)": 16, "delta_ij dt V_k d_k V": -16, "delta_ij d_k V_l d_k V_l": 8,
    "delta_ij d_k V_l d_l V_k": -8, "delta_ij (dt V)^2": -6,
}

_R4 = range(4)
_HALF = sp.Rational(1, 2)
_EIGHTH = sp.Rational(1, 8)


def lambda_tensor(h, dh, ddh, g_up, g_down) -> list[list[object]]:
    """Lambda^{ab} of (L1) from h^{ab}, its derivatives and the metric.

    Parameters
    ----------
    h:
        4x4 nested sequence, h[a][b].
    dh:
        dh[a][b][m] = d_m h^{ab}.
    ddh:
        ddh[a][b][m][n] = d_m d_n h^{ab}.
    g_up, g_down:
        g^{ab} and g_{ab} (4x4 nested sequences).

    Returns
    -------
    list of lists
        Lambda^{ab}; entries of whatever type the inputs are (numbers, sympy expressions).

    Example
    -------
    >>> zero = [[0] * 4 for _ in range(4)]
    >>> eta = [[-1, 0, 0, 0], [0, 1, 0, 0], [0, 0, 1, 0], [0, 0, 0, 1]]
    >>> d1 = [[[0] * 4 for _ in range(4)] for _ in range(4)]
    >>> d2 = [[[[0] * 4 for _ in range(4)] for _ in range(4)] for _ in range(4)]
    >>> lambda_tensor(zero, d1, d2, eta, eta)[0][0]
    0
    """
    out = [[0] * 4 for _ in _R4]
    for a in _R4:
        for b in _R4:
            if b < a:
                out[a][b] = out[b][a]
                continue
            value = 0
            for m in _R4:
                for n in _R4:
                    value += -h[m][n] * ddh[a][b][m][n] + dh[a][n][m] * dh[b][m][n]
            quadratic = 0
            for m in _R4:
                for n in _R4:
                    if g_down[m][n] == 0:
                        continue
                    for l in _R4:
                        for t in _R4:
                            quadratic += g_down[m][n] * dh[m][t][l] * dh[n][l][t]
            value += g_up[a][b] * quadratic * _HALF
            for m in _R4:
                for n in _R4:
                    for t in _R4:
                        if g_down[n][t] == 0:
                            continue
                        for l in _R4:
                            value -= g_up[a][m] * g_down[n][t] * dh[b][t][l] * dh[n][l][m]
                            value -= g_up[b][m] * g_down[n][t] * dh[a][t][l] * dh[n][l][m]
            for m in _R4:
                for n in _R4:
                    if g_down[m][n] == 0:
                        continue
                    for l in _R4:
                        for t in _R4:
                            value += g_down[m][n] * g_up[l][t] * dh[a][m][l] * dh[b][n][t]
            for m in _R4:
                for n in _R4:
                    prefactor = 2 * g_up[a][m] * g_up[b][n] - g_up[a][b] * g_up[m][n]
                    if prefactor == 0:
                        continue
                    inner = 0
                    for l in _R4:
                        for p in _R4:
                            for t in _R4:
                                for e in _R4:
                                    weight = 2 * g_down[l][t] * g_down[e][p] - g_down[t][e] * g_down[l][p]
                                    if weight != 0:
                                        inner += weight * dh[l][p][m] * dh[t][e][n]
                    value += prefactor * inner * _EIGHTH
            out[a][b] = value
    return out


def gothic_metric_2pn(V, Vi: Sequence, W, R: Sequence, eps) -> list[list[object]]:
    """h^{ab} of (N1) in :mod:`stfalgebra.moments.near_zone` from the potentials.

    ``W`` is the 3x3 nested sequence W_ij; returns h[a][b] (a, b = 0..3).
    """
    trace = W[0][0] + W[1][1] + W[2][2]
    h = [[0] * 4 for _ in _R4]
    h[0][0] = -4 * eps**2 * V - 2 * eps**4 * (trace + 4 * V**2)
    for i in range(3):
        h[0][i + 1] = h[i + 1][0] = -4 * eps**3 * Vi[i] - 8 * eps**5 * (R[i] + V * Vi[i])
        for j in range(3):
            h[i + 1][j + 1] = -4 * eps**4 * (W[i][j] - (trace / 2 if i == j else 0))
    return h


def expand_source(V, Vi: Sequence, W, R: Sequence, coordinates: Sequence[sp.Symbol],
                  eps: sp.Symbol, order: int, at: dict | None = None,
                  simplify: Callable = sp.expand) -> list[list[sp.Expr]]:
    """Lambda^{ab} of the 2PN metric (N1) as polynomials in eps through eps^order.

    Parameters
    ----------
    V, Vi, W, R:
        The potentials as sympy expressions in ``coordinates`` = (t, x, y, z).
    eps:
        The symbol 1/c.
    order:
        Highest power of eps kept (at most 7: the metric (N1) is complete through
        h^00 ~ eps^4, h^0i ~ eps^5, h^ij ~ eps^4).
    at:
        Optional point {coordinate: value}: derivatives are evaluated there (fast numerical
        checks with explicit potentials).

    Returns
    -------
    list of lists
        Lambda^{ab}, each entry a polynomial in eps (derivatives d_0 = eps d_t).
    """
    if order > 7:
        raise ValueError(f"the metric (N1) fixes Lambda through eps^7 only, asked eps^{order}")
    h = gothic_metric_2pn(V, Vi, W, R, eps)

    def derivative(expression, mu):
        if mu == 0:
            return eps * sp.diff(expression, coordinates[0])
        return sp.diff(expression, coordinates[mu])

    ring = sp.ring([eps], sp.QQ)[0] if at else None

    def value(expression):
        if at:  # a polynomial in eps with rational coefficients: exact ring arithmetic
            return ring(sp.expand(expression.subs(at)))
        return simplify(expression)

    dh = [[[value(derivative(h[a][b], m)) for m in _R4] for b in _R4] for a in _R4]
    ddh = [[[[value(derivative(derivative(h[a][b], m), n)) for n in _R4] for m in _R4]
            for b in _R4] for a in _R4]
    h_at = [[value(h[a][b]) for b in _R4] for a in _R4]
    V_at = value(V)
    Vi_at = [value(component) for component in Vi]
    # metric through eps^3 (enough for Lambda through eps^7: h enters at eps^2 or higher)
    e = ring.gens[0] if at else eps
    g_up = [[0] * 4 for _ in _R4]
    g_down = [[0] * 4 for _ in _R4]
    g_up[0][0], g_down[0][0] = -1 - 2 * e**2 * V_at, -1 + 2 * e**2 * V_at
    for i in range(1, 4):
        g_up[i][i], g_down[i][i] = 1 - 2 * e**2 * V_at, 1 + 2 * e**2 * V_at
        g_up[0][i] = g_up[i][0] = -4 * e**3 * Vi_at[i - 1]
        g_down[0][i] = g_down[i][0] = -4 * e**3 * Vi_at[i - 1]
    result = lambda_tensor(h_at, dh, ddh, g_up, g_down)
    out = []
    for row in result:
        truncated = []
        for entry in row:
            entry = sp.expand(entry.as_expr() if hasattr(entry, "as_expr") and at else entry)
            truncated.append(sp.Add(*[entry.coeff(eps, k) * eps**k for k in range(order + 1)]))
        out.append(truncated)
    return out
