"""Finite-part integrals of two-centre powers, FP int d^3x xhat_L r1^a r2^b, for every l.

The non-compact terms of the 2PN moments of two point masses reduce (see
:mod:`stfalgebra.moments.mass_two_pn`) to sums of the seeds

    Y_L^(a,b)(y1, y2) = FP Pf int d^3x  xhat_L r1^a r2^b,     r_A = |x - y_A|,       (S1)

with integer a, b: the finite part (FP) at infinity with the regulator (|x|/r0)^B, and the
Hadamard partie finie (Pf) at the bodies. This module gives Y_L for every l.

Derivation (with a null probe k, k.k = 0, so that xhat_L k_L = (k.x)^l; an STF tensor is fixed
by its polynomial on the null cone):

1. Centre the integral on body 1, x = y1 + u, d = y2 - y1:
   (k.x)^l = sum_j C(l, j) (k.y1)^(l-j) (k.u)^j.
2. For null k, (k.u)^j |u|^a = (k.grad_u)^j |u|^(a+2j) / prod_{i=1}^{j} (a + 2i); moving the
   derivatives onto |u - d|^b (they become d/dd) and using Riesz's formula
   int d^3u |u|^p |u - d|^b = R(p, b) |d|^(p+b+3),
   R(p, b) = pi^(3/2) G((p+3)/2) G((b+3)/2) G(-(p+b+3)/2) / [G(-p/2) G(-b/2) G((p+b+6)/2)]
   (G the Gamma function; Riesz, Acta Math. 81, 1 (1949), quoted from memory; checked in the
   tests by quadrature), gives

     int d^3u (k.u)^j |u|^a |u - d|^b = c_j(a, b) (k.d)^j r12^(a+b+3),                (S2)
     c_j(a, b) = R(a+2j, b) prod_{i=0}^{j-1} (a+b+2j+3-2i) / prod_{i=1}^{j} (a + 2i).

3. Regularisation. Riesz's formula is the analytic continuation in the exponents; here both are
   shifted, a -> a + eps, b -> b + eps (equivalently the integrand times (r1 r2)^eps), and the
   Laurent series in eps summed over the seeds of an integrand. Where the *whole* integrand has
   no logarithmic divergence at either body, the poles in eps cancel in the sum;
   :func:`two_centre_integral` checks the cancellation and raises otherwise. The finite part is
   then the Hadamard partie finie when the whole integrand is at most r_A^-3 singular at each
   body (the cubic integrands of the 2PN mass moments are; tested by quadrature). Beyond that,
   the factor r_B^eps expanded at y_A (eps ln r_B) meets the poles of the stronger terms and
   leaves finite terms the partie finie does not have: the continuation of int d^3x/r1^5 is
   2 pi/(3 r12^2), its partie finie 0 (see :mod:`stfalgebra.moments.polynomial_seeds`).
   :func:`two_centre_integral` refuses such integrands when the difference ((H1) of
   :mod:`stfalgebra.moments.partie_finie`, :func:`body_correction_expression`) is not zero;
   :func:`two_centre_partie_finie` subtracts it.
4. Centre of the regulator at infinity. The moments use (|x|/r0)^B, centred on the origin, not
   on y1. The two finite parts differ by D = Res_B int r1^B ln(r/r1) (k.x)^l r1^a r2^b, which
   needs the degree-j harmonic part of the t^(j+M) term of the far expansion
   |n - t d|^b ln|n + t y1| (t = 1/r1, M = a + b + 3). That term has angular parity j + M, so
   D = 0 when M is odd, and there is no such term when M < 0 (the series starts at t^0). Every
   seed used by the 2PN mass moments has a + b even or a + b + 3 < 0; :func:`seed_integral`
   and :func:`two_centre_integral` refuse the others. For those (the cubic terms of the 2PN
   current moments need a + b = -3), :func:`origin_regulated_seed` gives the finite part with
   the regulator (|x|/r0)^B centred on the origin and the coefficient of ln r0, from the
   continuation and the far-zone terms (S3) of :func:`regulator_centre_terms`.

No regularisation constant survives: the r0 of the finite part cancels by step 4, and the
Hadamard scales of the bodies by step 3 (no logarithmic divergence in the integrands used).

**Conventions**: k null (k.k = 0); u1 = k.y1, u2 = k.y2 (symbols :data:`U1`, :data:`U2`),
r12 = |y1 - y2| (symbol :data:`R12`); the returned polynomial P(u1, u2) is Y_L k_L, whose STF
tensor is obtained by replacing u1^p u2^q by y1^<P y2^Q>.

Example
-------
>>> from stfalgebra.moments.finite_part import seed_integral, U1, U2, R12
>>> seed_integral(1, -1, -1)            # FP int x_i/(r1 r2) = -pi r12 (y1 + y2)_i
-pi*R12*U1 - pi*R12*U2

References
----------
M. Riesz, Acta Math. 81, 1 (1949) (the two-centre formula); Blanchet, Damour & Iyer, Phys.
Rev. D 51, 5360 (1995) (finite-part integrals of point-mass binaries); K. S. Thorne, Rev.
Mod. Phys. 52, 299 (1980) (STF tensors).
"""

from __future__ import annotations

from functools import lru_cache
from math import comb, factorial
from typing import Mapping

import flint
import sympy as sp

__all__ = [
    "U1", "U2", "R12", "RA", "RB", "Y11", "Y12", "Y22", "riesz_coefficient", "seed_laurent_series",
    "seed_integral", "two_centre_integral", "PoleError", "two_centre_partie_finie",
    "body_correction_expression", "regulator_centre_terms", "regulator_centre_rings", "origin_regulated_seed",
]

#: k.y1 and k.y2 for a null probe k.
U1, U2 = sp.symbols("U1 U2")
#: The distance between the bodies.
R12 = sp.Symbol("R12", positive=True)
#: r1 = |x - y1| and r2 = |x - y2| in integrands handed to :func:`two_centre_integral`.
RA, RB = sp.symbols("r_1 r_2", positive=True)
#: y1.y1, y1.y2, y2.y2 (the regulator-centre terms depend on the positions, not only on y1 - y2).
Y11, Y12, Y22 = sp.symbols("Y11 Y12 Y22")

# Exact arithmetic of the Laurent coefficients: one polynomial ring over the rationals in the
# constants of the Gamma expansions (Euler's gamma, ln 2, pi^2 for the even zeta values, the odd
# zeta values), in the probe scalars U1, U2, in ln R12, and in sqrt(pi) (every power of pi is held
# as a power of this one generator, so equal values have equal representations). The power of
# R12 is kept apart: it is fixed by dimension for a homogeneous integrand.
_NAMES = ("gamma_E", "log2", "zeta3", "zeta5", "zeta7", "U1", "U2", "logR12", "sqrtpi")
_RING, _GE, _L2, _Z3, _Z5, _Z7, _U1, _U2, _LOGR, _SQPI = sp.ring(_NAMES, sp.QQ)
_ODD_ZETA = {3: _Z3, 5: _Z5, 7: _Z7}
# The same ring on python-flint (same generators, same order) for the class sums of
# two_centre_integral: the hot path of the 2PN moments; conversions are term for term.
_FLINT_RING = flint.fmpq_mpoly_ctx.get(_NAMES, "lex")
_FLINT_ZERO = _FLINT_RING.constant(0)


def _to_flint(element) -> flint.fmpq_mpoly:
    return _FLINT_RING.from_dict({monomial: flint.fmpq(int(c.numerator), int(c.denominator))
                                  for monomial, c in _RING(element).terms()})


def _coefficient(value) -> flint.fmpq_mpoly:
    """A rational (int, sympy or flint) or a ring element (sympy or flint) in the flint ring."""
    if isinstance(value, flint.fmpq_mpoly):
        return value
    if isinstance(value, (int, flint.fmpq)):
        return _FLINT_RING.constant(value)
    if isinstance(value, sp.Rational):
        return _FLINT_RING.constant(flint.fmpq(int(value.p), int(value.q)))
    return _to_flint(value)


def _from_flint(element: flint.fmpq_mpoly):
    return _RING({tuple(int(e) for e in monomial): _RING.domain(int(c.p), int(c.q))
                  for monomial, c in element.to_dict().items()})


_MAX_DEPTH = 7


def _zeta(k: int):
    """zeta(k) in the ring: a rational times pi^k for even k, a generator for odd k."""
    if k % 2 == 0:
        return _SQPI ** (2 * k) * sp.Rational(sp.zeta(k) / sp.pi**k)
    return _ODD_ZETA[k]


class PoleError(ValueError):
    """An integrand whose eps-poles do not cancel: it would need a regularisation constant."""


class _Laurent:
    """Truncated Laurent series in eps, {power: ring coefficient}, valid through eps^top (the
    coefficients held in the flint ring)."""

    __slots__ = ("terms", "top")

    def __init__(self, terms: Mapping[int, object], top: int):
        self.top = top
        self.terms = {}
        for k, v in terms.items():
            if k <= top:
                v = _coefficient(v)
                if not v.is_zero():
                    self.terms[k] = v

    def __mul__(self, other: "_Laurent") -> "_Laurent":
        low_self = min(self.terms, default=0)
        low_other = min(other.terms, default=0)
        top = min(self.top + low_other, other.top + low_self)
        out: dict[int, object] = {}
        for i, a in self.terms.items():
            for j, b in other.terms.items():
                if i + j <= top:
                    out[i + j] = out.get(i + j, 0) + a * b
        return _Laurent(out, top)

    def __add__(self, other: "_Laurent") -> "_Laurent":
        keys = set(self.terms) | set(other.terms)
        return _Laurent({k: self.terms.get(k, 0) + other.terms.get(k, 0) for k in keys},
                        min(self.top, other.top))

    def scaled(self, factor) -> "_Laurent":
        factor = _coefficient(factor)
        return _Laurent({k: v * factor for k, v in self.terms.items()}, self.top)

    def inverse(self) -> "_Laurent":
        """1/self; the leading coefficient must be a nonzero rational."""
        low = min(self.terms)
        lead = self.terms[low]
        if not lead.is_constant():
            raise ArithmeticError("leading Laurent coefficient is not a number")
        lead = lead.leading_coefficient()
        span = self.top - low
        rest = _Laurent({k - low: -v * (1 / lead) for k, v in self.terms.items() if k != low}, span)
        result = _Laurent({0: 1}, span)
        power = _Laurent({0: 1}, span)
        for _ in range(span):
            power = power * rest
            result = result + power
        return _Laurent({k - low: v * (1 / lead) for k, v in result.terms.items()}, span - low)


def _exp_series(coefficients: Mapping[int, object], top: int) -> _Laurent:
    """exp(sum_k coefficients[k] eps^k), k >= 1, through eps^top."""
    argument = _Laurent(coefficients, top)
    result = _Laurent({0: 1}, top)
    power = _Laurent({0: 1}, top)
    for n in range(1, top + 1):
        power = power * argument
        result = result + power.scaled(sp.Rational(1, sp.factorial(n)))
    return result


@lru_cache(maxsize=None)
def _gamma(z0: sp.Rational, slope: sp.Rational, relative: int) -> tuple[int, _Laurent]:
    """Gamma(z0 + slope eps) for integer or half-integer z0, through relative order ``relative``,
    as (power of sqrt(pi), Laurent series of the rest).

    ln Gamma(1 + x) = -gamma_E x + sum_{k>=2} (-1)^k zeta(k) x^k/k and
    ln Gamma(1/2 + x) = ln sqrt(pi) - (gamma_E + 2 ln 2) x + sum_{k>=2} (-1)^k (2^k - 1) zeta(k) x^k/k
    (Taylor series of ln Gamma, common practice), then Gamma(z + 1) = z Gamma(z). Euler's
    constant, ln 2 and the odd zeta values are kept as generators: they cancel in the finite
    parts used (tested).
    """
    if relative > _MAX_DEPTH:
        raise ArithmeticError(f"Laurent depth {relative} beyond the zeta values kept")
    half = z0.q == 2
    x_series = {}
    for k in range(1, relative + 1):
        if k == 1:
            x_series[1] = (-(_GE + 2 * _L2) if half else -_GE) * slope
        else:
            weight = (2**k - 1) if half else 1
            x_series[k] = _zeta(k) * ((-1)**k * weight * slope**k / k)
    base = _exp_series(x_series, relative)
    z = sp.Rational(1, 2) if half else sp.Integer(1)
    while z < z0:
        base = base * _Laurent({0: z, 1: slope}, relative + 1)
        z += 1
    while z > z0:
        z -= 1
        base = base * _Laurent({0: z, 1: slope}, relative + 2).inverse()
    return (1 if half else 0), base


def _is_pole(z0: sp.Rational) -> int:
    return int(bool(z0.q == 1 and z0 <= 0))


def _check_exponent(value, name: str) -> int:
    if isinstance(value, bool) or not isinstance(value, int):
        raise TypeError(f"{name} must be an int, got {value!r}")
    return value


@lru_cache(maxsize=None)
def _riesz_laurent(j: int, a: int, b: int) -> dict[int, object]:
    """c_j(a + eps, b + eps) as {power <= 0: ring coefficient} (sqrt(pi) as a generator)."""
    return {k: _from_flint(v) for k, v in _riesz_flint(j, a, b).items()}


@lru_cache(maxsize=None)
def _riesz_flint(j: int, a: int, b: int) -> dict[int, flint.fmpq_mpoly]:
    """:func:`_riesz_laurent` in the flint ring."""
    sqrt_pi_power, (terms, _) = _riesz_series(j, a, b, 0)
    if sqrt_pi_power < 0:
        raise ArithmeticError(f"unexpected power of sqrt(pi) in c_{j}({a}, {b})")
    factor = _FLINT_RING.gen(_NAMES.index("sqrtpi")) ** sqrt_pi_power
    return {k: v * factor for k, v in sorted(terms.items()) if k <= 0 and not v.is_zero()}


@lru_cache(maxsize=None)
def _riesz_series(j: int, a: int, b: int, top: int) -> tuple[int, tuple[dict, int]]:
    """(power of sqrt(pi), (the rest of c_j(a + eps, b + eps) as {power: flint coefficient}, the
    order through which it is valid, at least ``top``)).

    From c_0 by the recurrence c_(j+1) = c_j (p + 3 + eps)/(p + b + 6 + 2 eps), p = a + 2j
    (Gamma(z + 1) = z Gamma(z) in R(p + 2, b)/R(p, b) and the two new linear factors of (S2):
    (p + b + 5 + 2 eps) and (p + 2 + eps) cancel against Gamma-function factors). A vanishing
    denominator (p + b + 6 = 0) divides by eps and costs one order of the previous series.
    """
    if j == 0:
        power, value = _riesz_direct(a, b, top)
        return power, (dict(value.terms), value.top)
    p = a + 2 * (j - 1)
    below = p + b + 6
    power, (terms, valid) = _riesz_series(j - 1, a, b, top + (below == 0))
    if not terms:
        return power, ({}, valid)
    # times (p + 3 + eps)
    if p + 3 == 0:
        terms, valid = {k + 1: v for k, v in terms.items()}, valid + 1
    else:
        low = min(terms)
        terms = {k: (p + 3) * terms.get(k, _FLINT_ZERO) + terms.get(k - 1, _FLINT_ZERO)
                 for k in range(low, valid + 1)}
    # divided by (below + 2 eps)
    if below == 0:
        terms, valid = {k - 1: v * flint.fmpq(1, 2) for k, v in terms.items()}, valid - 1
    else:
        quotient: dict = {}
        previous = _FLINT_ZERO
        for k in range(min(terms), valid + 1):
            previous = (terms.get(k, _FLINT_ZERO) - 2 * previous) * flint.fmpq(1, below)
            quotient[k] = previous
        terms = quotient
    if valid < top:
        raise ArithmeticError(f"Laurent truncation too short for c_{j}({a}, {b})")
    return power, ({k: v for k, v in terms.items() if k <= valid and not v.is_zero()}, valid)


def _riesz_direct(a: int, b: int, top: int) -> tuple[int, _Laurent]:
    """c_0(a + eps, b + eps) = R(a + eps, b + eps) of (S2) from the Gamma-function series,
    as (power of sqrt(pi), the rest valid at least through eps^top)."""
    half = sp.Rational(1, 2)
    upper = [(sp.Rational(a + 3, 2), half), (sp.Rational(b + 3, 2), half),
             (sp.Rational(-(a + b + 3), 2), -sp.Integer(1))]
    lower = [(sp.Rational(-a, 2), -half), (sp.Rational(-b, 2), -half),
             (sp.Rational(a + b + 6, 2), sp.Integer(1))]
    order = sum(_is_pole(z) for z, _ in upper) - sum(_is_pole(z) for z, _ in lower)
    # each factor through relative order |order| + top (+ spare) fixes eps^top
    relative = abs(order) + top + 2
    value = _Laurent({0: 1}, relative)
    sqrt_pi_power = 3  # pi^(3/2)
    for z0, slope in upper:
        power, series = _gamma(z0, slope, relative)
        sqrt_pi_power += power
        value = value * series
    for z0, slope in lower:
        power, series = _gamma(z0, slope, relative)
        sqrt_pi_power -= power
        value = value * series.inverse()
    if value.top < top:
        raise ArithmeticError(f"Laurent truncation too short for c_0({a}, {b})")
    return sqrt_pi_power, value


def _to_sympy(element) -> sp.Expr:
    symbols = {"gamma_E": sp.EulerGamma, "log2": sp.log(2), "zeta3": sp.zeta(3),
               "zeta5": sp.zeta(5), "zeta7": sp.zeta(7), "U1": U1, "U2": U2,
               "logR12": sp.log(R12), "sqrtpi": sp.sqrt(sp.pi)}
    return sp.expand(element.as_expr().xreplace(
        {sp.Symbol(name): value for name, value in symbols.items()}))


def riesz_coefficient(j: int, a: int, b: int) -> dict[int, sp.Expr]:
    """Laurent coefficients in eps of c_j(a + eps, b + eps) of (S2), powers <= 0.

    Parameters
    ----------
    j:
        Harmonic degree, j >= 0.
    a, b:
        Integer exponents of r1 and r2.

    Returns
    -------
    dict
        {power: coefficient} for the non-positive powers of eps (empty if the coefficient
        vanishes at eps = 0 without poles). Pole terms may carry Euler's constant, ln 2 and
        odd zeta values; they cancel in the sums of :func:`two_centre_integral`.

    Example
    -------
    >>> riesz_coefficient(2, -1, -1)       # c_j(-1, -1) = -2 pi/(j + 1)
    {0: -2*pi/3}
    """
    j = _check_exponent(j, "j")
    a = _check_exponent(a, "a")
    b = _check_exponent(b, "b")
    if j < 0:
        raise ValueError(f"j must be >= 0, got {j}")
    return {k: _to_sympy(v) for k, v in _riesz_laurent(j, a, b).items()}


def _check_far_zone(a: int, b: int) -> None:
    if (a + b) % 2 and a + b + 3 >= 0:
        raise ValueError(
            f"the seed r1^{a} r2^{b} has a + b odd and a + b + 3 >= 0: its finite part depends on "
            "where the regulator at infinity is centred (step 4 of the module docstring)")


@lru_cache(maxsize=None)
def _seed_ring(l: int, a: int, b: int) -> dict[int, object]:
    """Laurent coefficients of Y_L^(a+eps, b+eps) k_L / R12^(a+b+3) as ring elements."""
    out: dict[int, object] = {}
    for j in range(l + 1):
        probe = comb(l, j) * _U1**(l - j) * (_U2 - _U1)**j
        # r12^(a+b+3+2 eps) = r12^(a+b+3) exp(2 eps ln r12)
        for power, value in _riesz_laurent(j, a, b).items():
            for k in range(0, -power + 1):
                term = value * probe * (2 * _LOGR)**k * sp.Rational(1, sp.factorial(k))
                out[power + k] = out.get(power + k, 0) + term
    return out


@lru_cache(maxsize=None)
def _probe_flint(l: int, j: int) -> flint.fmpq_mpoly:
    u1, u2 = _FLINT_RING.gen(_NAMES.index("U1")), _FLINT_RING.gen(_NAMES.index("U2"))
    return comb(l, j) * u1**(l - j) * (u2 - u1)**j


@lru_cache(maxsize=None)
def _seed_flint(l: int, a: int, b: int) -> dict[int, flint.fmpq_mpoly]:
    """:func:`_seed_ring` in the flint ring."""
    two_log = 2 * _FLINT_RING.gen(_NAMES.index("logR12"))
    out: dict[int, flint.fmpq_mpoly] = {}
    for j in range(l + 1):
        probe = _probe_flint(l, j)
        for power, value in _riesz_flint(j, a, b).items():
            value = value * probe
            for k in range(0, -power + 1):
                term = value * two_log**k * flint.fmpq(1, factorial(k)) if k else value
                out[power + k] = out[power + k] + term if power + k in out else term
    return out


def seed_laurent_series(l: int, a: int, b: int) -> dict[int, sp.Expr]:
    """Laurent coefficients in eps of Y_L^(a+eps, b+eps) k_L (S1)-(S2), non-positive powers.

    Returns {power: polynomial in U1, U2, R12 and log(R12)}: the seed regularised by
    (r1 r2)^eps, before the sum over the seeds of an integrand (where the poles cancel).

    Example
    -------
    >>> seed_laurent_series(0, -1, -1)
    {0: -2*pi*R12}
    """
    l = _check_exponent(l, "l")
    if l < 0:
        raise ValueError(f"l must be >= 0, got {l}")
    a, b = _check_exponent(a, "a"), _check_exponent(b, "b")
    radial = R12 ** (a + b + 3)
    return {k: sp.expand(radial * _to_sympy(v)) for k, v in sorted(_seed_ring(l, a, b).items())}


def seed_integral(l: int, a: int, b: int) -> sp.Expr:
    """Y_L^(a,b) k_L of (S1) for a seed without divergences: a polynomial in U1, U2 times R12 powers.

    Raises :class:`PoleError` if the seed alone needs regularisation (use
    :func:`two_centre_integral` on the whole integrand), ValueError if its finite part would
    depend on the centre of the regulator at infinity.
    """
    l = _check_exponent(l, "l")
    if l < 0:
        raise ValueError(f"l must be >= 0, got {l}")
    a, b = _check_exponent(a, "a"), _check_exponent(b, "b")
    _check_far_zone(a, b)
    laurent = _seed_ring(l, a, b)
    if any(v for k, v in laurent.items() if k < 0):
        raise PoleError(f"the seed r1^{a} r2^{b} diverges at l = {l}; integrate the whole integrand")
    return sp.expand(R12 ** (a + b + 3) * _to_sympy(laurent.get(0, _RING(0))))


def _ring_coefficient(expression: sp.Expr):
    """A number (rational, may contain pi) as a ring element."""
    expression = sp.expand(sp.sympify(expression))
    if expression.has(sp.pi):
        expression = sp.expand(expression.subs(sp.pi, sp.Symbol("sqrtpi")**2))
    return _RING(expression)


def two_centre_integral(l: int, integrand: sp.Expr) -> sp.Expr:
    """FP Pf int d^3x (k.x)^l F for F a Laurent polynomial in r1, r2 (:data:`RA`, :data:`RB`).

    Parameters
    ----------
    l:
        Rank, l >= 0.
    integrand:
        sympy expression, a sum of terms number * RA^a * RB^b * R12^k (numbers rational, may
        contain pi).

    Returns
    -------
    sympy.Expr
        The null-probe polynomial in U1, U2 (with R12). The eps-poles of the seeds must cancel
        in the sum (no logarithmic divergence at the bodies), else :class:`PoleError`.

    Example
    -------
    >>> two_centre_integral(0, 1 / (RA * RB) + RA / RB)
    -pi*R12**3/3 - 2*pi*R12

    An integrand singular beyond r_A^-3 whose continuation is not the Hadamard partie finie
    (step 3) is refused (ValueError); :func:`two_centre_partie_finie` gives its partie finie.
    """
    value = _continuation(l, integrand)
    if _beyond_inverse_cube(integrand) and body_correction_expression(l, integrand) != 0:
        raise ValueError("the integrand is singular beyond r_A^-3 at a body and its (r1 r2)^eps "
                         "continuation is not the Hadamard partie finie: use two_centre_partie_finie")
    return value


def two_centre_partie_finie(l: int, integrand: sp.Expr) -> sp.Expr:
    """:func:`two_centre_integral` with the Hadamard partie finie at the bodies for any
    singularity: the continuation minus :func:`body_correction_expression` ((H2) of
    :mod:`stfalgebra.moments.partie_finie`).

    Example
    -------
    >>> two_centre_partie_finie(0, RA**-5 * RB**-1)
    -2*pi/(3*R12**3)
    """
    return sp.expand(_continuation(l, integrand) - body_correction_expression(l, integrand))


@lru_cache(maxsize=256)
def _beyond_inverse_cube(integrand: sp.Expr) -> bool:
    """Whether the integrand (without the weight) is more singular than r_A^-3 at a body: the
    coefficients of rho^p, p <= -4, of its expansion at y1 (y2) in rho = r_A and c = n_A.n_AB,
    r_B^2 = R12^2 + 2 rho R12 c + rho^2. When it is not, the correction (H1) vanishes for every
    weight (the weight is smooth), and two_centre_integral needs no further check."""
    terms = []
    for term in sp.Add.make_args(sp.expand(integrand)):
        powers = term.as_powers_dict()
        terms.append((int(powers.get(RA, 0)), int(powers.get(RB, 0)), term / (RA**powers.get(RA, 0) * RB**powers.get(RB, 0))))
    for own_index in (0, 1):
        lowest = min(t[own_index] for t in terms)
        if lowest > -4:
            continue
        order = -4 - lowest
        local = sp.Integer(0)
        for a, b, coefficient in terms:
            own, other = (a, b) if own_index == 0 else (b, a)
            needed = -4 - own
            if needed < 0:
                continue
            s = (2 * _RHO * R12 * _COSINE + _RHO**2) / R12**2
            series = sum((sp.binomial(sp.Rational(other, 2), j) * s**j for j in range(needed + 1)), sp.Integer(0))
            local += coefficient * R12**other * _RHO**(own - lowest) * _truncated(series, needed)
        local = _truncated(local, order)
        if sp.expand(local) != 0:
            return True
    return False


_RHO, _COSINE, _NK = sp.symbols("rho c nk")


def _truncated(expression: sp.Expr, order: int) -> sp.Expr:
    poly = sp.Poly(sp.expand(expression), _RHO)
    return sum((coefficient * _RHO**power for (power,), coefficient in poly.terms() if power <= order),
               sp.Integer(0))


def _average_probe_axis(p: int, q: int, k_e: sp.Expr) -> sp.Expr:
    """4 pi <(n.k)^p (n.e)^q>, k null, e a unit vector, k.e given (pairings: every k meets an e)."""
    if (q - p) % 2 or q < p:
        return sp.Integer(0)
    ways = sp.factorial(q) / sp.factorial(q - p) * _double_factorial(q - p - 1)
    return 4 * sp.pi * ways * k_e**p / _double_factorial(p + q + 1)


def body_correction_expression(l: int, integrand: sp.Expr) -> sp.Expr:
    """C_1 + C_2 of (H1) in :mod:`stfalgebra.moments.partie_finie` for FP int (k.x)^l F, F a
    Laurent polynomial in r1, r2, r12 as in :func:`two_centre_integral`: the continuation minus
    the Hadamard partie finie at the bodies (zero when F is at most r_A^-3 singular).

    Near y1 (y2 by exchange), x = y1 + rho n, c = n.n12, k.x = U1 + rho n.k, k.n12 =
    (U1 - U2)/R12, r2^2 = R12^2 + 2 rho R12 c + rho^2; C_1 is the angular integral of the
    rho^-3 coefficient of F (k.x)^l ln(r2/R12).

    Example
    -------
    >>> body_correction_expression(0, RA**-5)
    2*pi/(3*R12**2)
    """
    l = _check_exponent(l, "l")
    total = sp.Integer(0)
    for term in sp.Add.make_args(sp.expand(integrand)):
        powers = term.as_powers_dict()
        a, b = int(powers.get(RA, 0)), int(powers.get(RB, 0))
        coefficient = term / (RA**a * RB**b)
        for own, other, u_own, u_other in ((a, b, U1, U2), (b, a, U2, U1)):
            order = -3 - own
            if order < 1:
                continue
            s = (2 * _RHO * R12 * _COSINE + _RHO**2) / R12**2
            binomial = sum((sp.binomial(sp.Rational(other, 2), j) * s**j for j in range(order + 1)), sp.Integer(0))
            logarithm = sum((sp.Rational((-1)**(j + 1), 2 * j) * s**j for j in range(1, order + 1)), sp.Integer(0))
            weight = sp.expand((u_own + _RHO * _NK)**l)
            product = _truncated(_truncated(weight * binomial, order) * _truncated(logarithm, order), order)
            wanted = sp.Poly(sp.expand(product).coeff(_RHO, order), _NK, _COSINE)
            k_e = (u_own - u_other) / R12
            for (p, q), value in wanted.terms():
                total += coefficient * R12**other * value * _average_probe_axis(p, q, k_e)
    return sp.expand(total)


def _continuation(l: int, integrand: sp.Expr) -> sp.Expr:
    l = _check_exponent(l, "l")
    if l < 0:
        raise ValueError(f"l must be >= 0, got {l}")
    result = sp.Integer(0)
    for exponent, finite in _finite_classes(l, integrand).items():
        result += R12**exponent * _to_sympy(_from_flint(finite))
    return sp.expand(result)


@lru_cache(maxsize=None)
def _integrand_terms(integrand: sp.Expr) -> tuple:
    """((a, b, k), weight): the terms number * RA^a * RB^b * R12^k of an integrand, the number
    as a flint ring element (pi as sqrtpi^2)."""
    terms: dict[tuple[int, int, int], sp.Expr] = {}
    for term in sp.Add.make_args(sp.expand(integrand)):
        powers = term.as_powers_dict()
        a, b, k = powers.get(RA, 0), powers.get(RB, 0), powers.get(R12, 0)
        if not all(sp.sympify(e).is_Integer for e in (a, b, k)):
            raise ValueError(f"non-integer power of r1, r2 or r12 in {term}")
        coefficient = sp.expand(term / (RA**a * RB**b * R12**k))
        if coefficient.free_symbols:
            raise ValueError(f"the integrand must be a Laurent polynomial in r1, r2, r12 with number "
                             f"coefficients, got term {term}")
        key = (int(a), int(b), int(k))
        terms[key] = terms.get(key, 0) + coefficient
    return tuple((key, _to_flint(_ring_coefficient(coefficient))) for key, coefficient in terms.items())


def _finite_classes(l: int, integrand: sp.Expr) -> dict[int, flint.fmpq_mpoly]:
    """{power of R12: finite part} of FP Pf int (k.x)^l F, each a flint ring element (in U1, U2
    and sqrtpi once the checks pass): :func:`two_centre_integral` before the conversion."""
    # the power of r12 of Y^(a,b) r12^k is a + b + 3 + k: terms of one power form one class
    classes: dict[int, dict[int, flint.fmpq_mpoly]] = {}
    for (a, b, k), weight in _integrand_terms(integrand):
        _check_far_zone(a, b)
        total = classes.setdefault(a + b + 3 + k, {})
        for power, value in _seed_flint(l, a, b).items():
            total[power] = total[power] + weight * value if power in total else weight * value
    out = {}
    for exponent, total in classes.items():
        for power, value in total.items():
            if power < 0 and not value.is_zero():
                raise PoleError(f"the eps^{power} pole does not cancel at l = {l}: the integrand "
                                "diverges logarithmically at a body")
        finite = total.get(0, _FLINT_ZERO)
        degrees = finite.degrees() if not finite.is_constant() else (0,) * len(_NAMES)
        if any(degrees[_NAMES.index(name)] > 0 for name in _NAMES if name not in ("U1", "U2", "sqrtpi")):
            raise PoleError(f"a logarithm or a Gamma-function constant survives at l = {l}")
        out[exponent] = finite
    return out


# ---------------------------------------------------------------- regulator centred on the origin
def _double_factorial(n: int) -> int:
    return 1 if n <= 0 else n * _double_factorial(n - 2)


@lru_cache(maxsize=None)
def _sphere_average(l: int, alpha: int, beta: int) -> sp.Expr:
    """<(k.n)^l (y1.n)^alpha (y2.n)^beta> over the unit sphere, k null.

    <n_i1 ... n_i2N> = (sum over pairings of products of deltas)/(2N+1)!! (common practice);
    k.k = 0 leaves the pairings where every k meets a y: q of them a y1, l - q a y2, the rest
    of the y's paired among themselves.
    """
    total_degree = l + alpha + beta
    if total_degree % 2:
        return sp.Integer(0)
    out = sp.Integer(0)
    for q in range(max(0, l - beta), min(l, alpha) + 1):
        ways = comb(l, q) * sp.factorial(alpha) / sp.factorial(alpha - q) \
            * sp.factorial(beta) / sp.factorial(beta - l + q)
        a_left, b_left = alpha - q, beta - l + q
        among = sp.Integer(0)
        for p in range(min(a_left, b_left) + 1):
            if (a_left - p) % 2 or (b_left - p) % 2:
                continue
            among += (comb(a_left, p) * comb(b_left, p) * sp.factorial(p) * _double_factorial(a_left - p - 1)
                      * _double_factorial(b_left - p - 1) * Y12**p * Y11**((a_left - p) // 2)
                      * Y22**((b_left - p) // 2))
        out += ways * U1**q * U2**(l - q) * among
    return sp.expand(out / _double_factorial(total_degree + 1))


def _angular_integral(l: int, polynomial: sp.Expr, c1: sp.Symbol, c2: sp.Symbol) -> sp.Expr:
    """4 pi <(k.n)^l P(n.y1, n.y2)> for P a polynomial in c1 = n.y1, c2 = n.y2 (and Y11, Y22)."""
    total = sp.Integer(0)
    for (alpha, beta), coefficient in sp.Poly(polynomial, c1, c2).terms():
        total += coefficient * _sphere_average(l, alpha, beta)
    return sp.expand(4 * sp.pi * total)


@lru_cache(maxsize=None)
def regulator_centre_terms(l: int, a: int, b: int) -> tuple[sp.Expr, sp.Expr]:
    """The difference between the regulator (|x|/r0)^B of the moments and the (r1 r2)^eps
    continuation of :func:`seed_laurent_series`, for the seed (k.x)^l r1^a r2^b.

    Derivation: split at a large radius R. Inside, both regularisations agree. Outside, with
    x = r n, t = 1/r, F = (k.x)^l r1^a r2^b = r^(l+a+b) (k.n)^l S1(t) S2(t),
    S_A = (1 - 2 t n.y_A + t^2 y_A^2)^(a_A/2), and (r1 r2)^eps = r^(2 eps) exp(eps L),
    L = ln(r1 r2/r^2) = O(t). The r^-3 part of F, of angular integral A0, gives -A0/(2 eps)
    - A0 ln R in the continuation and -A0 ln(R/r0) with (|x|/r0)^B; the eps L term gives
    eps (-1/(2 eps)) A1, A1 the angular integral of the r^-3 part of F L (higher powers of eps L
    vanish at eps = 0). Hence

        FP_B int F (|x|/r0)^B = [eps^0 of the continuation] + A1/2 + A0 ln r0,             (S3)

    and the eps^-1 coefficient of the continuation is -A0/2 plus the poles at the bodies.

    Returns
    -------
    (A1/2, A0):
        polynomials in U1 = k.y1, U2 = k.y2 and Y11 = y1.y1, Y12 = y1.y2, Y22 = y2.y2 (null k).

    Example
    -------
    >>> regulator_centre_terms(0, -2, -1)        # FP int d^3x/(r1^2 r2): an ln r0 term
    (0, 4*pi)
    """
    shift, log_r0 = regulator_centre_rings(l, a, b)
    return sp.expand(2 * sp.pi * shift.as_expr()), sp.expand(4 * sp.pi * log_r0.as_expr())


@lru_cache(maxsize=None)
def regulator_centre_rings(l: int, a: int, b: int) -> tuple:
    """:func:`regulator_centre_terms` as (A1/(4 pi), A0/(4 pi)), elements of the polynomial ring
    over the rationals in U1, U2, Y11, Y12, Y22 (no pi: the angular integrals are 4 pi times
    sphere averages).

    Example
    -------
    >>> regulator_centre_rings(0, -2, -1)
    (0, 1)
    """
    for value, name in ((l, "l"), (a, "a"), (b, "b")):
        _check_exponent(value, name)
    if l < 0:
        raise ValueError(f"l must be >= 0, got {l}")
    order = l + a + b + 3
    if order < 0 or (a + b) % 2 == 0:
        # M = a + b + 3 odd: the t^(l+M) coefficients have parity (-1)^(l+M) in n (each t comes
        # with n.y, each t^2 with y^2), times (k.n)^l: odd, zero angular integral
        return _PROBE_RING(0), _PROBE_RING(0)
    ring, t, c1, c2, y11, y22 = sp.ring("t c1 c2 Y11 Y22", sp.QQ)

    def truncated(f):
        return ring({m: v for m, v in f.terms() if m[0] <= order})

    def power_series(coefficients, u):
        total, power = ring(0), ring(1)
        for coefficient in coefficients:
            total += power * coefficient
            power = truncated(power * u)
        return total

    u1 = -2 * t * c1 + t**2 * y11
    u2 = -2 * t * c2 + t**2 * y22
    binomial = [[sp.Rational(sp.binomial(sp.Rational(e, 2), m)) for m in range(order + 1)] for e in (a, b)]
    logarithm = [sp.Integer(0)] + [sp.Rational((-1)**(m + 1), 2 * m) for m in range(1, order + 1)]
    s_product = truncated(power_series(binomial[0], u1) * power_series(binomial[1], u2))
    with_log = truncated(s_product * (power_series(logarithm, u1) + power_series(logarithm, u2)))

    def angular(f):
        """<(k.n)^l P> over the unit sphere for the t^order part P of f (c1 = n.y1, c2 = n.y2),
        in the ring of the probe scalars (:func:`_angular_integral` without its 4 pi)."""
        total = _PROBE_RING(0)
        for (power, alpha, beta, i, j), value in f.terms():
            if power == order:
                total += _sphere_average_ring(l, alpha, beta) * _PROBE_Y11**i * _PROBE_Y22**j * value
        return total

    return angular(with_log), angular(s_product)


_PROBE_RING, _PROBE_U1, _PROBE_U2, _PROBE_Y11, _PROBE_Y12, _PROBE_Y22 = sp.ring([U1, U2, Y11, Y12, Y22], sp.QQ)


@lru_cache(maxsize=None)
def _sphere_average_ring(l: int, alpha: int, beta: int):
    """:func:`_sphere_average` as an element of the ring of the probe scalars."""
    value = _sphere_average(l, alpha, beta)
    return _PROBE_RING.from_expr(value) if value else _PROBE_RING(0)


def origin_regulated_seed(l: int, a: int, b: int, strict: bool = True) -> tuple:
    """FP int d^3x (|x|/r0)^B (k.x)^l r1^a r2^b, the regulator centred on the origin, any a + b.

    Returns (value at r0 = 1, coefficient of ln r0), by (S3) of :func:`regulator_centre_terms`.
    With ``strict`` (default) the seed must have no pole at a body: the eps^-1 coefficient of
    the continuation must be the far-zone one, -A0/2, else :class:`PoleError`. With
    ``strict=False`` it returns (value, ln r0 coefficient, body pole): the eps^-1 coefficient
    left at the bodies, to be cancelled in a sum of seeds (the value may then carry Euler's
    constant, ln 2 and odd zeta values, which cancel with it).

    R12^2 is written as Y11 - 2 Y12 + Y22 (odd powers and ln R12 are kept).

    Example
    -------
    >>> origin_regulated_seed(0, 1, 0)      # FP int |x - y1| d^3x = -pi |y1|^4/15
    (-pi*Y11**2/15, 0)
    """
    shift, log_r0 = regulator_centre_terms(l, a, b)
    laurent = seed_laurent_series(l, a, b)
    if any(k < -1 for k in laurent):
        raise PoleError(f"the seed r1^{a} r2^{b} has a double pole at l = {l}")
    body_pole = _positions_form(laurent.get(-1, 0) + log_r0 / 2)
    finite = laurent.get(0, sp.Integer(0))
    if not strict:
        return _positions_form(finite + shift), log_r0, body_pole
    if body_pole != 0:
        raise PoleError(f"the seed r1^{a} r2^{b} diverges at a body at l = {l}")
    if finite.has(sp.EulerGamma) or finite.has(sp.log(2)) or finite.has(sp.zeta(3)):
        raise PoleError(f"a Gamma-function constant survives at l = {l}")
    return _positions_form(finite + shift), log_r0


def _positions_form(expression: sp.Expr) -> sp.Expr:
    """R12^n -> (Y11 - 2 Y12 + Y22)^(n//2) R12^(n % 2) (n >= 0), ln R12 kept."""
    squared = Y11 - 2 * Y12 + Y22
    out = sp.Integer(0)
    for term in sp.Add.make_args(sp.expand(expression)):
        n = term.as_powers_dict().get(R12, 0)
        if n and sp.sympify(n).is_Integer and n >= 2:
            term = term / R12**n * squared**(n // 2) * R12**(n % 2)
        out += term
    return sp.expand(out)
