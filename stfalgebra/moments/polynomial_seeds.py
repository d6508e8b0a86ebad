"""Finite-part integrals of two-centre powers with polynomial weights, for the cubic terms.

The cubic (G^3) terms of the 2PN current moments, written in the probe form (J2) of
:mod:`stfalgebra.moments.current_two_pn`, are sums of

    P(k; w_1 ... w_m; a, b) = FP int d^3x (k.x)^n (w_1.x) ... (w_m.x) r1^a r2^b,            (P1)

k null, w_i among the body vectors y1, y2, v1, v2, the finite part taken with the regulator
(|x|/r0)^B centred on the origin and the Hadamard partie finie at the bodies. This module
reduces (P1) to the seeds of :func:`stfalgebra.moments.finite_part.origin_regulated_seed`:

1. (k.x)^n prod_i (w_i.x) = n!/(n+m)! prod_i (w_i.d_k) (k.x)^(n+m) for every k (not only null
   ones), so (P1) = n!/(n+m)! prod_i (w_i.d_k) Q(k), Q(k) = FP int (k.x)^N F, N = n + m, off the
   null cone.
2. Off the cone, (k.x)^N = sum_s c_{N,s} (k.k)^s |x|^(2s) xhat_{N-2s} k_{N-2s},
   c_{N,s} = N! (2N-4s+1)!! / ((N-2s)! (2N-2s+1)!! (2s)!!) (the STF decomposition of x^N,
   Thorne 1980, eq. (2.2), quoted from memory and tested here), and each
   FP int |x|^(2s) xhat_{N'} k_{N'} F is the harmonic extension (in k) of its values on the cone.
3. On the cone, |x|^2 = (r1^2 + r2^2 - r12^2)/2 + x.(y1 + y2) - y1.y2 lowers the polynomial
   degree: the recursion ends at the seeds (k.x)^N r1^a' r2^b'.

After the m k-derivatives only s <= m survive on the cone (each derivative lowers the power of
k.k by at most one). Results are elements of the
invariants ring of :mod:`stfalgebra.moments.invariants` with, beside them, the powers of
ln r12 and ln r0 that the seeds carry: a dict {(power of ln r12, power of ln r0): element}.

**Caveat (found while testing the cubic self terms; to be settled before (P1) is used on the
cubic terms).** The seeds are the (r1 r2)^eps continuation. For an integrand singular at y_A
beyond r_A^-3, the factor r_B^eps of the other body, expanded at y_A (eps ln r_B), meets the
eps^-1 of the r_A^-3 coefficient and leaves finite terms that the Hadamard partie finie does not
have, even when that coefficient averages to zero: the continuation of int d^3x/r1^5 is
2 pi/(3 r12^2) where the partie finie is 0, and a body-1-only integrand such as
-(1/2) (x - y1).v1 (x - y1)_b/r1^7 - (1/2) v1_b/r1^5 comes out depending on y2.
:func:`polynomial_seed_integral` therefore refuses a < -3 or b < -3; the checks below
(quadrature, the 1PN field term) stay within that bound. A regulator r_A^eps at body A alone,
or a numerical Hadamard check, is needed before the stronger singularities of the cubic terms.
Settled in :mod:`stfalgebra.moments.partie_finie` (the difference (H1), checked by numerical
partie-finie quadrature): use its ``partie_finie_seed_integral`` beyond r_A^-3.

**Conventions**: k null; r0 the scale of the finite part at infinity; ln r12 and ln r0 kept as
two symbols (they cancel in a physical moment, or ln r0 is kept and documented).

Example
-------
>>> polynomial_seed_integral(0, (), 1, 0)[(0, 0)]          # FP int |x - y1| d^3x
-1/15*y1y1**2
"""

from __future__ import annotations

from functools import lru_cache
from math import comb, factorial

import flint
import sympy as sp

from . import flint_rings as fr
from . import invariants as inv
from . import finite_part
from .finite_part import R12

__all__ = ["polynomial_seed_integral", "finite_total", "stf_decomposition_coefficient"]

_LOG_R12 = sp.log(R12)
_DIRECTIONS = ("y1", "y2", "v1", "v2")


def _double_factorial(n: int) -> int:
    return 1 if n <= 0 else n * _double_factorial(n - 2)


def stf_decomposition_coefficient(N: int, s: int) -> sp.Rational:
    """c_{N,s} of (k.x)^N = sum_s c_{N,s} (k.k)^s |x|^(2s) xhat_{N-2s} k_{N-2s} (step 2).

    Example
    -------
    >>> stf_decomposition_coefficient(2, 1)      # (k.x)^2 = xhat_ij k_ij + k.k |x|^2/3
    1/3
    """
    if s < 0 or 2 * s > N:
        raise ValueError(f"need 0 <= 2 s <= N, got N = {N}, s = {s}")
    return sp.Rational(factorial(N) * _double_factorial(2 * N - 4 * s + 1),
                       factorial(N - 2 * s) * _double_factorial(2 * N - 2 * s + 1) * _double_factorial(2 * s))


def _add(total: dict, part: dict, factor=1) -> None:
    for key, value in part.items():
        total[key] = total.get(key, inv.RING(0)) + value * factor


#: Keys of the partial results: powers of (ln r12, ln r0, Euler's gamma, ln 2, zeta(3)) and a
#: last entry 1 for the eps^-1 pole left at the bodies (0 for the finite part).
_CONSTANTS = (_LOG_R12, sp.log(sp.Symbol("r0")), sp.EulerGamma, sp.log(2), sp.zeta(3))


def _seed(N: int, a: int, b: int) -> dict:
    """origin_regulated_seed / pi as {key: invariants element}, keys as in :data:`_CONSTANTS`.

    Built from the ring forms of the seed (the Laurent coefficients of
    :func:`stfalgebra.moments.finite_part.seed_laurent_series` before they become sympy
    expressions, and :func:`~stfalgebra.moments.finite_part.regulator_centre_rings`), term by
    term as :func:`~stfalgebra.moments.finite_part.origin_regulated_seed` with
    ``strict=False`` assembles them: value = eps^0 + A1/2, ln r0 coefficient A0, body pole
    eps^-1 + A0/2; R12^n written through y1.y1, y1.y2, y2.y2 (n >= 2)."""
    laurent = finite_part._seed_ring(N, a, b)
    if any(k < -1 for k in laurent):
        raise finite_part.PoleError(f"the seed r1^{a} r2^{b} has a double pole at l = {N}")
    shift, log_r0 = finite_part.regulator_centre_rings(N, a, b)
    n = a + b + 3
    if n >= 2:
        squared = inv.dot("y1", "y1") - 2 * inv.dot("y1", "y2") + inv.dot("y2", "y2")
        radial = squared**(n // 2) * inv.R12**(n % 2)
    else:
        radial = inv.R12**n if n >= 0 else inv.INV_R12**(-n)
    out: dict = {}

    def add(key, element):
        out[key] = out[key] + element if key in out else element

    for power, pole_flag in ((0, 0), (-1, 1)):
        if power not in laurent:
            continue
        for (euler, log_two, zeta_three, zeta_five, zeta_seven, u1, u2, log_r12, root_pi), value in laurent[power].terms():
            if root_pi != 2:
                raise ValueError(f"unexpected power of pi in the seed ({N}, {a}, {b})")
            if zeta_five or zeta_seven:
                raise ValueError(f"unexpected zeta(5) or zeta(7) in the seed ({N}, {a}, {b})")
            monomial = [0] * len(inv.RING.gens)
            monomial[_KY1], monomial[_KY2] = u1, u2
            element = inv.RING({tuple(monomial): value}) * radial
            add((log_r12, 0, euler, log_two, zeta_three, pole_flag), element)
    add((0, 0, 0, 0, 0, 0), 2 * _probe_scalars(shift))
    add((0, 0, 0, 0, 0, 1), 2 * _probe_scalars(log_r0))
    add((0, 1, 0, 0, 0, 0), 4 * _probe_scalars(log_r0))
    return {key: value for key, value in out.items() if value}


_KY1, _KY2 = (inv.RING.gens.index(inv.dot("k", body)) for body in ("y1", "y2"))
#: the generators U1, U2, Y11, Y12, Y22 of the probe-scalar ring of finite_part, in the invariants ring
_PROBE_SCALAR_INDEX = tuple(inv.RING.gens.index(inv.dot(p, q))
                            for p, q in (("k", "y1"), ("k", "y2"), ("y1", "y1"), ("y1", "y2"), ("y2", "y2")))


def _probe_scalars(f):
    """An element of the probe-scalar ring of :mod:`stfalgebra.moments.finite_part` (U1, U2,
    Y11, Y12, Y22) in the invariants ring (k.y1, k.y2, y1.y1, y1.y2, y2.y2)."""
    terms = {}
    for exponents, value in f.terms():
        monomial = [0] * len(inv.RING.gens)
        for index, exponent in zip(_PROBE_SCALAR_INDEX, exponents):
            monomial[index] = exponent
        terms[tuple(monomial)] = value
    return inv.RING(terms)


def finite_total(parts) -> dict:
    """Sum partial results (:func:`polynomial_seed_integral` with ``strict=False``) and check
    that the poles at the bodies and the Gamma-function constants cancel.

    For the components of a vector integrand in the probe form (J2) of
    :mod:`stfalgebra.moments.current_two_pn` the poles cancel only after the curl: curl the
    partial results key by key first.

    Returns {(power of ln r12, power of ln r0): element}; raises
    :class:`~stfalgebra.moments.finite_part.PoleError` otherwise (the integrand diverges
    logarithmically at a body).
    """
    from .finite_part import PoleError

    total: dict = {}
    for part in parts:
        _add(total, part)
    out: dict = {}
    for key, value in total.items():
        if not value:
            continue
        if _reduced(value) == 0:
            continue
        if key[2:] != (0, 0, 0, 0):
            raise PoleError(f"a pole at a body or a Gamma-function constant survives: {key}")
        out[key[:2]] = out.get(key[:2], inv.RING(0)) + value
    return out


def _reduced(f, clearing: int = 12):
    """f r12^clearing with r12 ir12 = 1 and r12^2 = |y1 - y2|^2 (zero iff f is zero)."""
    squared = inv.dot("y1", "y1") - 2 * inv.dot("y1", "y2") + inv.dot("y2", "y2")
    out = inv.RING(0)
    for monomial, coefficient in f.terms():
        exponents = list(monomial)
        n = exponents[-2] - exponents[-1] + clearing
        if n < 0:
            raise ValueError("raise the clearing power")
        exponents[-2] = exponents[-1] = 0
        out += inv.RING({tuple(exponents): coefficient}) * squared**(n // 2) * inv.R12**(n % 2)
    return out


def _harmonic_extension(f, degree: int):
    """H[f] = sum_j (-1)^j (k.k)^j Delta_k^j f / (2^j j! (2n-1)(2n-3)...(2n-2j+1))
    (Thorne 1980, eq. (2.2)), f homogeneous of degree n in k."""
    out = inv.RING(0)
    term = f
    denominator = 1
    j = 0
    while term and 2 * j <= degree:
        out += (-1)**j * inv.dot("k", "k")**j * term * sp.Rational(1, 2**j * factorial(j) * denominator)
        term = inv.mixed_laplacian(term, "k", "k")
        denominator *= 2 * degree - 2 * j - 1
        j += 1
    return out


@lru_cache(maxsize=None)
def _on_cone_with_squares(N: int, s: int, a: int, b: int) -> tuple:
    """FP int |x|^(2s) (k.x)^N r1^a r2^b on the cone (step 3), as sorted items of the dict."""
    if s == 0:
        return tuple(sorted(_seed(N, a, b).items()))
    total: dict = {}
    # |x|^2 = (r1^2 + r2^2 - r12^2)/2 + x.y1 + x.y2 - y1.y2, one factor at a time
    _add(total, dict(_on_cone_with_squares(N, s - 1, a + 2, b)), sp.Rational(1, 2))
    _add(total, dict(_on_cone_with_squares(N, s - 1, a, b + 2)), sp.Rational(1, 2))
    rest = dict(_on_cone_with_squares(N, s - 1, a, b))
    constant = -(inv.R12 * inv.R12) / 2 - inv.dot("y1", "y2")
    _add(total, rest, constant)
    for body in ("y1", "y2"):
        _add(total, _weighted(N, (body,), a, b, s - 1))
    return tuple(sorted(total.items()))


def _weighted(n: int, directions: tuple, a: int, b: int, squares: int) -> dict:
    """FP int |x|^(2 squares) (k.x)^n prod (w.x) r1^a r2^b on the cone (steps 1-2)."""
    if not directions:
        return dict(_on_cone_with_squares(n, squares, a, b))
    m = len(directions)
    N = n + m
    total: dict = {}
    for s in range(min(m, N // 2) + 1):
        inner = dict(_on_cone_with_squares(N - 2 * s, squares + s, a, b))
        coefficient = stf_decomposition_coefficient(N, s) * sp.Rational(factorial(n), factorial(N))
        for key, value in inner.items():
            # in the flint invariants ring (same operators as invariants: tested there)
            f = fr.dot("k", "k")**s * _harmonic_extension_flint(fr.invariant_from_sympy(value), N - 2 * s)
            for w in directions:
                f = fr.directional_derivative(f, w, "k")
            _add(total, {key: fr.invariant_to_sympy(fr.on_null_cone(f))}, coefficient)
    return total


def _harmonic_extension_flint(f, degree: int):
    """:func:`_harmonic_extension` in the flint invariants ring."""
    out = fr.INVARIANTS.constant(0)
    term = f
    denominator = 1
    j = 0
    kk = fr.dot("k", "k")
    while not term.is_zero() and 2 * j <= degree:
        out += (-1)**j * kk**j * term * flint.fmpq(1, 2**j * factorial(j) * denominator)
        term = fr.mixed_laplacian(term, "k", "k")
        denominator *= 2 * degree - 2 * j - 1
        j += 1
    return out


def polynomial_seed_integral(n: int, directions: tuple, a: int, b: int, strict: bool = True) -> dict:
    """(P1) divided by pi: FP int d^3x (k.x)^n prod_i (w_i.x) r1^a r2^b for a null k.

    Parameters
    ----------
    n:
        Power of k.x, n >= 0.
    directions:
        The vectors w_i (names among y1, y2, v1, v2), repetitions allowed.
    a, b:
        Integer powers of r1 and r2, each >= -3 (module caveat).
    strict:
        If true (default) the integrand must have no pole at a body
        (:class:`~stfalgebra.moments.finite_part.PoleError` otherwise) and the result is keyed by
        (power of ln r12, power of ln r0). If false, the partial result of one term of a larger
        integrand, to be summed by :func:`finite_total` (keys with the Gamma-function constants
        and the pole flag).

    Returns
    -------
    dict
        {(power of ln r12, power of ln r0): invariants-ring element}; the integral is pi times
        sum element * (ln r12)^p (ln r0)^q. r12^2 appears written through y1.y1, y1.y2, y2.y2.

    Example
    -------
    >>> sorted(polynomial_seed_integral(0, ("y1",), -2, -1))
    [(0, 0), (0, 1), (1, 0)]
    """
    if isinstance(n, bool) or not isinstance(n, int) or n < 0:
        raise ValueError(f"n must be a non-negative integer, got {n!r}")
    for w in directions:
        if w not in _DIRECTIONS:
            raise ValueError(f"directions must be among {_DIRECTIONS}, got {w!r}")
    if a < -3 or b < -3:
        raise ValueError(f"r1^{a} r2^{b}: singularities beyond r_A^-3 are refused (module caveat: the "
                         "continuation differs there from the Hadamard partie finie)")
    partial = {key: value for key, value in _weighted(n, tuple(directions), a, b, 0).items() if value}
    return finite_total([partial]) if strict else partial
