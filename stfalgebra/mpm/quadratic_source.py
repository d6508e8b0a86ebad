"""The quadratic non-linearity of the vacuum Einstein equations in harmonic gauge.

In harmonic coordinates (``d_nu h^{mu nu} = 0``) the field equations are
``Box h^{ab} = (16 pi G/c^4) |g| T^{ab} + Lambda^{ab}(h)``; the quadratic part of Lambda is

    N^{ab}(h, h) = - h^{mn} d_m d_n h^{ab} + d_m h^{an} d_n h^{bm}
                   + (1/2) eta^{ab} eta_{mn} d_l h^{mt} d_t h^{nl}
                   - eta^{am} eta_{nt} d_l h^{bt} d_m h^{nl} - eta^{bm} eta_{nt} d_l h^{at} d_m h^{nl}
                   + eta_{mn} eta^{lt} d_l h^{am} d_t h^{bn}
                   + (1/8)(2 eta^{am} eta^{bn} - eta^{ab} eta^{mn})(2 eta_{lt} eta_{es} - eta_{te} eta_{ls})
                     d_m h^{ls} d_n h^{te}

(Blanchet, Living Rev. Relativ. 17, 2 (2014), eq. (24) with g -> eta; written from memory and
verified in the tests against the Einstein tensor computed directly with sympy:
``2 |g| G^{ab} = Box h^{ab} - N^{ab}(h, h) + O(h^3)`` for a harmonic-gauge h).

:func:`quadratic_source` takes two metrics and returns the bilinear form with the first
factor of every product from the first metric; the quadratic source of ``h = h_A + h_B`` has
the cross term ``N(h_A, h_B) + N(h_B, h_A)``. It works on any field type with ``+``,
``scale``, ``times`` and a derivative callback (the tests run it on sympy expressions).
"""

from __future__ import annotations

from typing import Callable, Mapping

import flint

__all__ = ["quadratic_source", "ETA"]

#: The Minkowski metric diag(-1, 1, 1, 1) (equal to its inverse).
ETA = (-1, 1, 1, 1)


def quadratic_source(first: Mapping[tuple[int, int], object], second: Mapping[tuple[int, int], object],
                     derivative: Callable[[object, int], object],
                     times: Callable[[object, object], object],
                     zero: object) -> dict[tuple[int, int], object]:
    """Return ``N^{ab}(first, second)`` for 0 <= a <= b <= 3.

    Parameters
    ----------
    first, second:
        ``{(mu, nu): field}`` for mu <= nu (symmetric metrics ``h^{mu nu}``).
    derivative:
        ``derivative(field, mu)`` = d field / dx^mu (x^0 = t).
    times:
        ``times(a, b)``, the product of a field of the first metric and one of the second.
    zero:
        The zero of the result's type (must support ``+`` and ``scale``).

    Returns
    -------
    dict
        ``{(a, b): N^{ab}}``.

    **Conventions**: c = 1, signature (-, +, +, +); eta is diagonal so every eta contraction
    is a sum over one index with the sign ETA[index].

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), eq. (24) (from memory; verified against the
    Einstein tensor in the tests).
    """
    def h(metric, mu, nu):
        return metric[(mu, nu)] if mu <= nu else metric[(nu, mu)]

    R = range(4)
    d1 = {(lam, mu, nu): derivative(h(first, mu, nu), lam) for lam in R for mu in R for nu in R if mu <= nu}
    d2 = {(lam, mu, nu): derivative(h(second, mu, nu), lam) for lam in R for mu in R for nu in R if mu <= nu}

    def D1(lam, mu, nu):
        return d1[(lam, mu, nu)] if mu <= nu else d1[(lam, nu, mu)]

    def D2(lam, mu, nu):
        return d2[(lam, mu, nu)] if mu <= nu else d2[(lam, nu, mu)]

    cache2: dict = {}

    def DD2(m, n, a, b):
        key = (min(m, n), max(m, n), min(a, b), max(a, b))
        if key not in cache2:
            cache2[key] = derivative(D2(key[0], key[2], key[3]), key[1])
        return cache2[key]

    # scalar invariants used by several components
    # S1 = eta_{mn} d_l h^{mt} d_t h^{nl}
    s1 = zero
    for m in R:
        for l in R:
            for t in R:
                s1 = s1 + times(D1(l, m, t), D2(t, m, l)).scale(ETA[m])
    # S2 = (2 eta_lt eta_es - eta_te eta_ls) d_m h^{ls} d_n h^{te} contracted later with eta^{mn}
    def quartic(m, n):
        total = zero
        for l in R:
            for s in R:
                total = total + times(D1(m, l, s), D2(n, l, s)).scale(2 * ETA[l] * ETA[s])
        trace1 = zero
        trace2 = zero
        for l in R:
            trace1 = trace1 + D1(m, l, l).scale(ETA[l])
            trace2 = trace2 + D2(n, l, l).scale(ETA[l])
        return total + times(trace1, trace2).scale(-1)

    quartic_cache = {}

    def Q(m, n):
        if (m, n) not in quartic_cache:
            quartic_cache[(m, n)] = quartic(m, n)
        return quartic_cache[(m, n)]

    trace_quartic = zero
    for m in R:
        trace_quartic = trace_quartic + Q(m, m).scale(ETA[m])

    out = {}
    for a in R:
        for b in R:
            if a > b:
                continue
            total = zero
            # - h^{mn} d_m d_n h^{ab}
            for m in R:
                for n in R:
                    total = total + times(h(first, m, n), DD2(m, n, a, b)).scale(-1)
            # + d_m h^{an} d_n h^{bm}
            for m in R:
                for n in R:
                    total = total + times(D1(m, a, n), D2(n, b, m))
            # + (1/2) eta^{ab} S1
            if a == b:
                total = total + _scaled(s1, ETA[a], 2)
            # - eta^{am} eta_{nt} d_l h^{bt} d_m h^{nl}   (m = a)
            for n in R:
                for l in R:
                    total = total + times(D1(l, b, n), D2(a, n, l)).scale(-ETA[a] * ETA[n])
                    total = total + times(D1(l, a, n), D2(b, n, l)).scale(-ETA[b] * ETA[n])
            # + eta_{mn} eta^{lt} d_l h^{am} d_t h^{bn}
            for m in R:
                for l in R:
                    total = total + times(D1(l, a, m), D2(l, b, m)).scale(ETA[m] * ETA[l])
            # + (1/8)(2 eta^{am} eta^{bn} - eta^{ab} eta^{mn}) Q(m, n)
            total = total + _scaled(Q(a, b), 2 * ETA[a] * ETA[b], 8)
            if a == b:
                total = total + _scaled(trace_quartic, -ETA[a], 8)
            out[(a, b)] = total
    return out


def _scaled(field, numerator: int, denominator: int):
    return field.scale(flint.fmpq(numerator, denominator))
