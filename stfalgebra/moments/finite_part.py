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
   no logarithmic divergence at either body, the poles in eps cancel in the sum and the finite
   part is the Hadamard partie finie (for such an integrand both are its analytic continuation);
   :func:`two_centre_integral` checks the cancellation and raises otherwise.
4. Centre of the regulator at infinity. The moments use (|x|/r0)^B, centred on the origin, not
   on y1. The two finite parts differ by D = Res_B int r1^B ln(r/r1) (k.x)^l r1^a r2^b, which
   needs the degree-j harmonic part of the t^(j+M) term of the far expansion
   |n - t d|^b ln|n + t y1| (t = 1/r1, M = a + b + 3). That term has angular parity j + M, so
   D = 0 when M is odd, and there is no such term when M < 0 (the series starts at t^0). Every
   seed used by the 2PN moments has a + b even or a + b + 3 < 0; :func:`seed_integral` refuses
   the others (they would need D, and a constant ln r0).

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
from math import comb
from typing import Mapping

import sympy as sp

__all__ = [
    "U1", "U2", "R12", "RA", "RB", "riesz_coefficient", "seed_integral", "two_centre_integral",
    "PoleError",
]

#: k.y1 and k.y2 for a null probe k.
U1, U2 = sp.symbols("U1 U2")
#: The distance between the bodies.
R12 = sp.Symbol("R12", positive=True)
#: r1 = |x - y1| and r2 = |x - y2| in integrands handed to :func:`two_centre_integral`.
RA, RB = sp.symbols("r_1 r_2", positive=True)

_GAMMA_E, _LOG2 = sp.symbols("gamma_E log2")


def _zeta(k: int) -> sp.Expr:
    """zeta(k): exact for even k (a rational times pi^k), a symbol for odd k."""
    return sp.zeta(k) if k % 2 == 0 else sp.Symbol(f"zeta{k}")


class PoleError(ValueError):
    """An integrand whose eps-poles do not cancel: it would need a regularisation constant."""


class _Laurent:
    """Truncated Laurent series in eps, {power: exact sympy coefficient}, powers <= top."""

    __slots__ = ("terms", "top")

    def __init__(self, terms: Mapping[int, sp.Expr], top: int):
        self.top = top
        self.terms = {k: v for k, v in terms.items() if v != 0 and k <= top}

    def __mul__(self, other: "_Laurent") -> "_Laurent":
        # valid through the smaller of the two tops shifted by the other's leading power
        low_self = min(self.terms, default=0)
        low_other = min(other.terms, default=0)
        top = min(self.top + low_other, other.top + low_self)
        out: dict[int, sp.Expr] = {}
        for i, a in self.terms.items():
            for j, b in other.terms.items():
                if i + j <= top:
                    out[i + j] = out.get(i + j, 0) + a * b
        return _Laurent({k: sp.expand(v) for k, v in out.items()}, top)

    def __add__(self, other: "_Laurent") -> "_Laurent":
        keys = set(self.terms) | set(other.terms)
        return _Laurent({k: self.terms.get(k, 0) + other.terms.get(k, 0) for k in keys},
                        min(self.top, other.top))

    def scaled(self, factor: sp.Expr) -> "_Laurent":
        return _Laurent({k: sp.expand(v * factor) for k, v in self.terms.items()}, self.top)

    def inverse(self) -> "_Laurent":
        """1/self, valid through eps^(top - 2 low) (low the leading power)."""
        low = min(self.terms)
        lead = self.terms[low]
        span = self.top - low  # relative orders known
        rest = _Laurent({k - low: -v / lead for k, v in self.terms.items() if k != low}, span)
        result = _Laurent({0: sp.Integer(1)}, span)
        power = _Laurent({0: sp.Integer(1)}, span)
        for _ in range(span):
            power = power * rest
            result = result + power
        return _Laurent({k - low: sp.expand(v / lead) for k, v in result.terms.items()},
                        span - low)


def _exp_series(coefficients: Mapping[int, sp.Expr], top: int) -> _Laurent:
    """exp(sum_k coefficients[k] eps^k), k >= 1, through eps^top."""
    argument = _Laurent(coefficients, top)
    result = _Laurent({0: sp.Integer(1)}, top)
    power = _Laurent({0: sp.Integer(1)}, top)
    for n in range(1, top + 1):
        power = power * argument
        result = result + power.scaled(sp.Rational(1, sp.factorial(n)))
    return result


@lru_cache(maxsize=None)
def _gamma(z0: sp.Rational, slope: sp.Rational, relative: int) -> _Laurent:
    """Gamma(z0 + slope eps) for integer or half-integer z0, through relative order ``relative``.

    ln Gamma(1 + x) = -gamma_E x + sum_{k>=2} (-1)^k zeta(k) x^k/k and
    ln Gamma(1/2 + x) = ln sqrt(pi) - (gamma_E + 2 ln 2) x + sum_{k>=2} (-1)^k (2^k - 1) zeta(k) x^k/k
    (Taylor series of ln Gamma, common practice), then Gamma(z + 1) = z Gamma(z). Euler's
    constant, ln 2 and the odd zeta values are kept as symbols: they cancel in the finite parts
    used (tested).
    """
    half = z0.q == 2
    x_series = {}
    for k in range(1, relative + 1):
        if k == 1:
            x_series[1] = (-(_GAMMA_E + 2 * _LOG2) if half else -_GAMMA_E) * slope
        else:
            weight = (2**k - 1) if half else 1
            x_series[k] = (-1)**k * weight * _zeta(k) * slope**k / k
    base = _exp_series(x_series, relative)
    if half:
        base = base.scaled(sp.sqrt(sp.pi))
    z = sp.Rational(1, 2) if half else sp.Integer(1)
    while z < z0:
        base = base * _Laurent({0: z, 1: slope}, relative + 1)
        z += 1
    while z > z0:
        z -= 1
        base = base * _Laurent({0: z, 1: slope}, relative + 2).inverse()
    return base


def _is_pole(z0: sp.Rational) -> int:
    return int(bool(z0.q == 1 and z0 <= 0))


def _check_exponent(value, name: str) -> int:
    if isinstance(value, bool) or not isinstance(value, int):
        raise TypeError(f"{name} must be an int, got {value!r}")
    return value


@lru_cache(maxsize=None)
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
        vanishes at eps = 0 without poles). Pole terms may carry Euler's constant, ln 2,
        zeta(3), zeta(4) (as the symbols gamma_E, log2, zeta3, zeta4); they cancel in the
        sums of :func:`two_centre_integral`.

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
    half = sp.Rational(1, 2)
    p = a + 2 * j
    upper = [(sp.Rational(p + 3, 2), half), (sp.Rational(b + 3, 2), half),
             (sp.Rational(-(p + b + 3), 2), -sp.Integer(1))]
    lower = [(sp.Rational(-p, 2), -half), (sp.Rational(-b, 2), -half),
             (sp.Rational(p + b + 6, 2), sp.Integer(1))]
    upper_linear = [a + b + 2 * j + 3 - 2 * i for i in range(j)]
    lower_linear = [a + 2 * i for i in range(1, j + 1)]
    order = (sum(_is_pole(z) for z, _ in upper) - sum(_is_pole(z) for z, _ in lower)
             - upper_linear.count(0) + lower_linear.count(0))
    if order < 0:
        return {}
    relative = order + 2  # each factor through relative order `order` (+ spare) fixes eps^0
    value = _Laurent({0: sp.pi**sp.Rational(3, 2)}, relative)
    for z0, slope in upper:
        value = value * _gamma(z0, slope, relative)
    for z0, slope in lower:
        value = value * _gamma(z0, slope, relative).inverse()
    for factor in upper_linear:
        value = value * _Laurent({0: sp.Integer(factor), 1: sp.Integer(2)}, relative + 1)
    for factor in lower_linear:
        value = value * _Laurent({0: sp.Integer(factor), 1: sp.Integer(1)}, relative + 2).inverse()
    if value.top < 0:
        raise ArithmeticError(f"Laurent truncation too short for c_{j}({a}, {b})")
    return {k: sp.expand(v) for k, v in sorted(value.terms.items()) if k <= 0}


def _check_far_zone(a: int, b: int) -> None:
    if (a + b) % 2 and a + b + 3 >= 0:
        raise ValueError(
            f"the seed r1^{a} r2^{b} has a + b odd and a + b + 3 >= 0: its finite part depends on "
            "where the regulator at infinity is centred (step 4 of the module docstring)")


def _laurent_seed(l: int, a: int, b: int) -> dict[int, sp.Expr]:
    """Laurent coefficients of Y_L^(a+eps, b+eps) k_L: {power: polynomial in U1, U2, R12, log R12}."""
    out: dict[int, sp.Expr] = {}
    log_r = sp.log(R12)
    for j in range(l + 1):
        coefficients = riesz_coefficient(j, a, b)
        probe = comb(l, j) * U1**(l - j) * (U2 - U1)**j * R12**(a + b + 3)
        # r12^(a+b+3+2 eps) = r12^(a+b+3) exp(2 eps ln r12)
        for power, value in coefficients.items():
            for k in range(0, -power + 1):
                out[power + k] = out.get(power + k, 0) + value * probe * (2 * log_r)**k / sp.factorial(k)
    return out


def seed_integral(l: int, a: int, b: int) -> sp.Expr:
    """Y_L^(a,b) k_L of (S1) for a seed without divergences: a polynomial in U1, U2 times R12 powers.

    Raises :class:`PoleError` if the seed alone needs regularisation (use
    :func:`two_centre_integral` on the whole integrand), ValueError if its finite part would
    depend on the centre of the regulator at infinity.
    """
    l = _check_exponent(l, "l")
    if l < 0:
        raise ValueError(f"l must be >= 0, got {l}")
    _check_far_zone(a, b)
    laurent = _laurent_seed(l, a, b)
    if any(sp.expand(v) != 0 for k, v in laurent.items() if k < 0):
        raise PoleError(f"the seed r1^{a} r2^{b} diverges at l = {l}; integrate the whole integrand")
    return sp.expand(laurent.get(0, 0))


def two_centre_integral(l: int, integrand: sp.Expr) -> sp.Expr:
    """FP Pf int d^3x (k.x)^l F for F a Laurent polynomial in r1, r2 (:data:`RA`, :data:`RB`).

    Parameters
    ----------
    l:
        Rank, l >= 0.
    integrand:
        sympy expression, a sum of terms coefficient * RA^a * RB^b (coefficients may contain
        R12 and other symbols, not RA, RB).

    Returns
    -------
    sympy.Expr
        The null-probe polynomial in U1, U2 (with R12). The eps-poles of the seeds must cancel
        in the sum (no logarithmic divergence at the bodies), else :class:`PoleError`.
    """
    l = _check_exponent(l, "l")
    if l < 0:
        raise ValueError(f"l must be >= 0, got {l}")
    expression = sp.expand(integrand)
    terms: dict[tuple[int, int], sp.Expr] = {}
    for term in sp.Add.make_args(expression):
        powers = term.as_powers_dict()
        a = powers.get(RA, 0)
        b = powers.get(RB, 0)
        if not (sp.Integer(a).is_integer and sp.Integer(b).is_integer):
            raise ValueError(f"non-integer power of r1 or r2 in {term}")
        coefficient = sp.expand(term / (RA**a * RB**b))
        if coefficient.has(RA, RB):
            raise ValueError(f"the integrand must be a Laurent polynomial in r1, r2, got term {term}")
        key = (int(a), int(b))
        terms[key] = terms.get(key, 0) + coefficient
    total: dict[int, sp.Expr] = {}
    for (a, b), coefficient in terms.items():
        _check_far_zone(a, b)
        for power, value in _laurent_seed(l, a, b).items():
            total[power] = total.get(power, 0) + coefficient * value
    for power, value in total.items():
        if power < 0 and sp.expand(value) != 0:
            raise PoleError(f"the eps^{power} pole does not cancel at l = {l}: the integrand "
                            "diverges logarithmically at a body")
    result = sp.expand(total.get(0, 0))
    if result.has(sp.log(R12)) or result.has(sp.EulerGamma):
        raise PoleError(f"a logarithm or Euler's constant survives at l = {l}")
    return result
