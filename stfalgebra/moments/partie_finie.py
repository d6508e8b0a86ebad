"""The Hadamard partie finie at the bodies of two-centre integrals with polynomial weights.

The seeds of :mod:`stfalgebra.moments.finite_part` and :mod:`stfalgebra.moments.polynomial_seeds`
are analytic continuations with the factor (r1 r2)^eps. Where an integrand is singular at y1
beyond r1^-3 this is not the Hadamard partie finie (Pf) the moments need: near y1 the factor
r2^eps = r12^eps exp(eps ln(r2/r12)) brings eps L_j(n1) r1^j (j >= 1), and with the pole
1/eps of the angular-radial integral of the r1^-3 part of the product it leaves the finite term

    C_1 = int dOmega_1 sum_{j >= 1} L_j(n1) F_{-3-j}(n1),
    ln(r2/r12) = sum_{j >= 1} L_j(n1) r1^j,   F = sum_p F_p(n1) r1^p  near y1,            (H1)

(the r1^eps regulator alone gives the partie finie: for a pure power int_0 r^(p+2+eps) dr the
continuation and the partie finie agree when p != -3, and the p = -3 poles cancel in the sums
used). Hence

    Pf = [continuation with (r1 r2)^eps, eps^0 part] - C_1 - C_2                               (H2)

(C_2 the same at y2). Example: for F = r1^-5, ln(r2/r12) = (1/2) ln(1 + 2 (r1/r12) n1.n12
+ r1^2/r12^2) has L_2 = (1 - 2 (n1.n12)^2)/(2 r12^2), so C_1 = 2 pi/(3 r12^2), the whole
continuation of int d^3x/r1^5, whose partie finie is 0 (a pure power of the radius).

Here F is a sum of terms (k.x)^n prod_i (w_i.x) r1^a r2^b (the integrands (P1) of
:mod:`stfalgebra.moments.polynomial_seeds`, k null); near y_A, x = y_A + rho n,
k.x = k.y_A + rho n.k, r_B^2 = r12^2 + 2 rho n.(y_A - y_B) + rho^2, and the angular integrals
use <n_i1 ... n_i2N> = (sum over pairings of deltas)/(2N+1)!! (common practice) through the
recursion <(n.a) M> = sum_b (a.b) <M/(n.b)>/(deg + 1), deg the total degree of (n.a) M.

**Conventions**: k null; results divided by pi, elements of the invariants ring of
:mod:`stfalgebra.moments.invariants`; r12 written with the generators r12 and 1/r12.

Example
-------
>>> is_zero(body_correction(0, (), -5, 0) - inv.INV_R12**2 * sp.Rational(2, 3))
True

References
----------
J. Hadamard, Le probleme de Cauchy (1932) (the partie finie); L. Blanchet & G. Faye, J. Math.
Phys. 41, 7675 (2000) (Hadamard regularisation of point-particle integrals; quoted from memory).
"""

from __future__ import annotations

from functools import lru_cache

import sympy as sp

from . import invariants as inv
from .polynomial_seeds import _reduced, _weighted

__all__ = ["body_correction", "partie_finie_seed_integral", "sphere_average", "is_zero"]

_INV_NAMES = [str(generator) for generator in inv.RING.gens]
_N_VECTORS = ("k", "y1", "y2", "v1", "v2")
_LOCAL, *_LOCAL_GENERATORS = sp.ring(_INV_NAMES + ["rho"] + ["n" + w for w in _N_VECTORS], sp.QQ)
_SIZE = len(_INV_NAMES)
_RHO = _LOCAL_GENERATORS[_SIZE]
_N = dict(zip(_N_VECTORS, _LOCAL_GENERATORS[_SIZE + 1:]))


def _lift(f):
    """An invariants-ring element in the local ring."""
    return _LOCAL({monomial + (0,) * 6: coefficient for monomial, coefficient in f.terms()})


def _truncate(f, order: int):
    return _LOCAL({monomial: c for monomial, c in f.terms() if monomial[_SIZE] <= order})


@lru_cache(maxsize=None)
def sphere_average(exponents: tuple) -> object:
    """<prod_w (n.w)^(e_w)> over the unit sphere, w over (k, y1, y2, v1, v2), an invariants
    element (k.k kept: set it to zero on the null cone).

    Example
    -------
    >>> sphere_average((0, 2, 0, 0, 0))
    1/3*y1y1
    """
    degree = sum(exponents)
    if degree % 2:
        return inv.RING(0)
    if degree == 0:
        return inv.RING(1)
    first = next(i for i, e in enumerate(exponents) if e)
    rest = list(exponents)
    rest[first] -= 1
    total = inv.RING(0)
    for other, e in enumerate(rest):
        if e:
            lowered = list(rest)
            lowered[other] -= 1
            total += e * inv.dot(_N_VECTORS[first], _N_VECTORS[other]) * sphere_average(tuple(lowered))
    return total * sp.Rational(1, degree + 1)


def _solid_angle_integral(f):
    """int dOmega f / pi for f in the local ring without rho: an invariants element."""
    total = inv.RING(0)
    for monomial, coefficient in f.terms():
        if monomial[_SIZE]:
            raise AssertionError("a power of rho left in an angular integral")
        base = inv.RING({monomial[:_SIZE]: coefficient})
        total += 4 * base * sphere_average(tuple(monomial[_SIZE + 1:]))
    return total


def _series(coefficients, argument, order: int):
    """sum_m coefficients[m] argument^m, truncated at rho^order."""
    total, power = _LOCAL(0), _LOCAL(1)
    for coefficient in coefficients:
        total += power * coefficient
        power = _truncate(power * argument, order)
        if not power:
            break
    return total


@lru_cache(maxsize=None)
def _at_body(n: int, directions: tuple, a: int, b: int, body: str) -> object:
    """C_A of (H1) at body ``body`` for (k.x)^n prod (w.x) r_A^a r_B^b (a the own exponent)."""
    order = -3 - a
    if order < 1:
        return inv.RING(0)
    other = "y2" if body == "y1" else "y1"
    position = _lift(inv.dot("k", body)) + _RHO * _N["k"]
    weight = _LOCAL(1)
    for _ in range(n):
        weight = _truncate(weight * position, order)
    for w in directions:
        weight = _truncate(weight * (_lift(inv.dot(w, body)) + _RHO * _N[w]), order)
    ir12 = _lift(inv.INV_R12)
    s = (2 * _RHO * (_N[body] - _N[other]) + _RHO**2) * ir12**2
    half = sp.Rational(b, 2)
    binomial = [sp.binomial(half, m) for m in range(order + 1)]
    radial = _lift(inv.R12**b if b >= 0 else inv.INV_R12**(-b))
    other_power = radial * _series(binomial, s, order)
    logarithm = [sp.Integer(0)] + [sp.Rational((-1)**(m + 1), 2 * m) for m in range(1, order + 1)]
    log_ratio = _series(logarithm, s, order)
    product = _truncate(_truncate(weight * other_power, order) * log_ratio, order)
    wanted = _LOCAL({monomial[:_SIZE] + (0,) + monomial[_SIZE + 1:]: c
                     for monomial, c in product.terms() if monomial[_SIZE] == order})
    return _solid_angle_integral(wanted)


def body_correction(n: int, directions: tuple, a: int, b: int) -> object:
    """C_1 + C_2 of (H1)-(H2) for the seed (k.x)^n prod_i (w_i.x) r1^a r2^b, divided by pi.

    The continuation with (r1 r2)^eps minus this is the Hadamard partie finie at the bodies.
    Zero when a > -4 and b > -4.

    Example
    -------
    >>> body_correction(0, (), -3, -1)
    0
    """
    directions = tuple(directions)
    total = _at_body(n, directions, a, b, "y1") + _at_body(n, directions, b, a, "y2")
    return inv.on_null_cone(total)


def partie_finie_seed_integral(n: int, directions: tuple, a: int, b: int) -> dict:
    """FP int d^3x (k.x)^n prod_i (w_i.x) r1^a r2^b / pi with the Hadamard partie finie at the
    bodies and the regulator (|x|/r0)^B centred on the origin at infinity, any a, b.

    A partial result, to be summed with
    :func:`stfalgebra.moments.polynomial_seeds.finite_total` (keys: powers of ln r12, ln r0,
    Euler's gamma, ln 2, zeta(3), and the flag of an eps^-1 pole left at a body, which must
    cancel in the sum): the continuation of :mod:`stfalgebra.moments.polynomial_seeds` minus
    :func:`body_correction` (H2).

    Example
    -------
    >>> partie_finie_seed_integral(0, (), -5, 0)    # Pf int d^3x/r1^5 = 0
    {}
    """
    return dict(_partie_finie_seed(n, tuple(sorted(directions)), a, b))


@lru_cache(maxsize=4096)
def _partie_finie_seed(n: int, directions: tuple, a: int, b: int) -> tuple:
    """The cached partial result (directions sorted: the factors w.x commute)."""
    for w in directions:
        if w not in _N_VECTORS[1:]:
            raise ValueError(f"directions must be among {_N_VECTORS[1:]}, got {w!r}")
    if isinstance(n, bool) or not isinstance(n, int) or n < 0:
        raise ValueError(f"n must be a non-negative integer, got {n!r}")
    out = {key: value for key, value in _weighted(n, tuple(directions), a, b, 0).items() if value}
    correction = body_correction(n, directions, a, b)
    if correction:
        key = (0, 0, 0, 0, 0, 0)
        out[key] = out.get(key, inv.RING(0)) - correction
    return tuple((key, value) for key, value in out.items() if _nonzero(value))


def is_zero(f) -> bool:
    """Whether an invariants element vanishes (r12 ir12 = 1, r12^2 = |y1 - y2|^2)."""
    return not _nonzero(f)


def _nonzero(f) -> bool:
    """f != 0 once r12 ir12 = 1 and r12^2 = |y1 - y2|^2 (r12 and 1/r12 are two generators)."""
    if not f:
        return False
    clearing = max(monomial[-1] - monomial[-2] for monomial, _ in f.terms())
    return _reduced(f, max(0, clearing + clearing % 2)) != 0
