"""Exact finite-part volume integrals of two-centre densities in prolate spheroidal coordinates.

Some non-compact terms of the 2PN source moments contain the function g = ln(r1 + r2 + r12)
through its derivatives: powers of 1/(r1 + r2 + r12) that the Riesz-type seeds of
:mod:`stfalgebra.moments.finite_part` do not integrate. With the bodies on the z axis
(y1 above y2, r12 = 1) and the spheroidal coordinates

    r1 = (s + d)/2,  r2 = (s - d)/2,  s >= 1, -1 <= d <= 1,  azimuth phi,
    r1 + r2 + r12 = s + 1,   d^3x = (pi/4) (s^2 - d^2) ds dd (after the phi average),     (E1)
    z = c0 - s d/2 (c0 the height of the mid-point),  rho_cyl^2 = (s^2 - 1)(1 - d^2)/4,

an axisymmetric density becomes a sum of monomials s^n d^k (s + d)^-alpha (s - d)^-beta
(s + 1)^-p, integrated in closed form:

1. **Bodies.** Near y_A the density is sum_j r_A^-j Phi_j(n_A). The counterterm
   K_A = sum_{j >= 3} r_A^-j Phi_j(n_A) (its phi average a function of r_A and
   c_A = n_A.(y_A - y_B)/r12) leaves f - K_1 - K_2 absolutely integrable at the bodies, so its
   iterated integral (d first, then s) is the volume integral. The Hadamard partie finie of
   K_A, with the regulator (|x|/r0)^B at infinity centred on the origin, is
   4 pi <Phi_3> ln(r0/s_A) (the pure powers j != 3 have none, and K_A decays as r^-3 at infinity,
   so the centre of the regulator does not matter); s_A is the Hadamard scale of body A.
2. **d integral** of d^k (s + d)^-alpha (s - d)^-beta by partial fractions: rational functions
   of s (poles at s = 0, +-1) and L(s) = ln((s + 1)/(s - 1)).
3. **s integral** with t = (s - 1)/(s + 1) in [0, 1): ds = 2 dt/(1 - t)^2, L = -ln t, and
   partial fractions in t (poles at t = 0, 1, -1): int_0^1 t^(n+delta) (-ln t)^e dt,
   int_0^1 (1 - t)^(-j-B) (-ln t)^e dt = Gamma/digamma expressions, int_0^1 (1 + t)^-j (-ln t)^e
   dt; the regulator t^delta at the bodies (its poles cancel in the sum of step 1) and
   ((r1 + r2 + r12)/(2 r0))^B = r0^-B (1 - t)^-B at infinity.
4. **Centre of the regulator.** The moments use (|x|/r0)^B; with rho = (r1 + r2 + r12)/2,
   FP_|x| = FP_rho + [coefficient of 1/s in int dd F ln(rho/|x|)] (the residue of
   B int F rho^B ln(|x|/rho)), the large-s expansion taken monomial by monomial;
   |x|^2 = (s^2 + d^2 - 1 + 4 c0^2 - 4 c0 s d)/4.

Results are returned as {"finite": value, "ln r0": coefficient, "ln s1": ..., "ln s2": ...}
(values exact: rationals, pi, and the constants ln 2 and pi^2 of the partial fractions, which
cancel in the moments); the caller checks that the scale coefficients cancel.

**Conventions**: lengths in units of r12 (restore r12 by dimensional analysis); densities given
without the 1/pi of the probe form.

Example
-------
>>> s, d = SPHEROIDAL_SYMBOLS
>>> finite_part_integral({(0, 0, 2, 2, 0): 16})["finite"]          # FP int d^3x/(r1^2 r2^2) = pi^3
pi**3

References
----------
P. M. Morse & H. Feshbach, Methods of Theoretical Physics (1953), ch. 5 (prolate spheroidal
coordinates; common practice); J. Hadamard, Le probleme de Cauchy (1932) (the partie finie).
"""

from __future__ import annotations

from fractions import Fraction
from functools import lru_cache
from math import comb

import flint
import sympy as sp

__all__ = ["SPHEROIDAL_SYMBOLS", "finite_part_integral", "axisymmetric_monomials", "counterterm_monomials"]

_S, _D = sp.symbols("s d", positive=True)
SPHEROIDAL_SYMBOLS = (_S, _D)


# ---------------------------------------------------------------- step 2: the d integral
# A function of s is a dict {(a, b, c, e): rational}: sum q s^a (s - 1)^b (s + 1)^c L^e.
def _accumulate(total: dict, part: dict, factor, shift=(0, 0, 0, 0)) -> None:
    for key, value in part.items():
        key = tuple(x + y for x, y in zip(key, shift))
        total[key] = total.get(key, 0) + factor * value


@lru_cache(maxsize=None)
def _one_sided(q: int) -> dict:
    """int_-1^1 (s + d)^-q dd (= int_-1^1 (s - d)^-q dd)."""
    if q == 1:
        return {(0, 0, 0, 1): Fraction(1)}
    return {(0, 0, 1 - q, 0): Fraction(1, 1 - q), (0, 1 - q, 0, 0): Fraction(-1, 1 - q)}


@lru_cache(maxsize=None)
def _d_integral(k: int, alpha: int, beta: int) -> dict:
    """int_-1^1 d^k (s + d)^-alpha (s - d)^-beta dd, by d = (s + d) - s and
    1/((s + d)(s - d)) = (1/(2 s)) (1/(s + d) + 1/(s - d))."""
    out: dict = {}
    if k > 0:
        _accumulate(out, _d_integral(k - 1, alpha - 1, beta), 1)
        _accumulate(out, _d_integral(k - 1, alpha, beta), -1, (1, 0, 0, 0))
    elif alpha > 0 and beta > 0:
        _accumulate(out, _d_integral(0, alpha - 1, beta), Fraction(1, 2), (-1, 0, 0, 0))
        _accumulate(out, _d_integral(0, alpha, beta - 1), Fraction(1, 2), (-1, 0, 0, 0))
    else:
        # one factor to a non-negative power: (s -+ d)^n = (2 s - (s +- d))^n
        singular, power = (alpha, -beta) if beta <= 0 else (beta, -alpha)
        for i in range(power + 1):
            factor = comb(power, i) * 2**(power - i) * (-1)**i
            _accumulate(out, _one_sided(singular - i), factor, (power - i, 0, 0, 0))
    return {key: value for key, value in out.items() if value}


# ---------------------------------------------------------------- step 3: the s integral
# Values are (rational, coefficient of ln 2, coefficient of pi^2); poles: (delta, double delta, B).
_ZERO = (Fraction(0), Fraction(0), Fraction(0))


def _add3(a: tuple, b: tuple, factor=1) -> tuple:
    return tuple(x + factor * y for x, y in zip(a, b))


@lru_cache(maxsize=None)
def _basis(kind: str, j: int, e: int) -> tuple:
    """FP int_0^1 basis (-ln t)^e dt as (value, poles): 't' is t^j, 'one' (1 - t)^-j with the
    regulator (1 - t)^-B, 'minus' (1 + t)^-j (j <= 0: the polynomials)."""
    value, poles = _ZERO, _ZERO
    if kind == "t":
        if j == -1:
            poles = (Fraction(1 if e == 0 else 0), Fraction(1 if e == 1 else 0), Fraction(0))
        else:
            value = (Fraction(1, (j + 1)**(e + 1)), Fraction(0), Fraction(0))
    elif kind == "one":
        if j <= 0:
            # int (1 - t)^q (-ln t)^e = 1/(q + 1) or H_(q+1)/(q + 1)
            q = -j
            value = (Fraction(1, q + 1) * (sum(Fraction(1, i) for i in range(1, q + 2)) if e else 1), Fraction(0),
                     Fraction(0))
        elif e == 0:
            if j == 1:
                poles = (Fraction(0), Fraction(0), Fraction(-1))
            else:
                value = (Fraction(1, 1 - j), Fraction(0), Fraction(0))
        elif j == 1:
            value = (Fraction(0), Fraction(0), Fraction(1, 6))
        else:
            # (psi(2 - j - B) - psi(1))/(1 - j - B), psi(-n - B) = 1/B - gamma + H_n + O(B)
            harmonic = sum((Fraction(1, q) for q in range(1, j - 1)), Fraction(0))
            value = (harmonic / (1 - j) + Fraction(1, (1 - j)**2), Fraction(0), Fraction(0))
            poles = (Fraction(0), Fraction(0), Fraction(1, 1 - j))
    else:
        if j <= 0:
            for r in range(-j + 1):
                value = _add3(value, _basis("t", r, e)[0], comb(-j, r))
        elif e == 0:
            value = (Fraction(0), Fraction(1), Fraction(0)) if j == 1 else \
                (Fraction(1, j - 1) * (1 - Fraction(1, 2**(j - 1))), Fraction(0), Fraction(0))
        elif j == 1:
            value = (Fraction(0), Fraction(0), Fraction(1, 12))
        else:
            # by parts: (1/(j - 1)) sum_{i=0}^{j-2} int_0^1 (1 + t)^(i - j + 1) dt
            for i in range(j - 1):
                value = _add3(value, _basis("minus", j - 1 - i, 0)[0], Fraction(1, j - 1))
    return value, poles


def _binomial_shift(power: int, constant, sign: int) -> list:
    """Coefficients of (constant + sign w)^power in powers of w (power >= 0)."""
    return [comb(power, i) * Fraction(constant)**(power - i) * sign**i for i in range(power + 1)]


@lru_cache(maxsize=None)
def _t_monomial(beta: int, a: int, m: int, e: int) -> tuple:
    """FP int_0^1 t^beta (1 + t)^a (1 - t)^m (-ln t)^e dt: (value, poles), by the partial
    fractions 1 = t + (1 - t), 1 = (1 + t) - t, 2 = (1 + t) + (1 - t)."""
    if beta < 0 and m < 0:
        v1, p1 = _t_monomial(beta + 1, a, m, e)
        v2, p2 = _t_monomial(beta, a, m + 1, e)
        return _add3(v1, v2), _add3(p1, p2)
    if beta < 0 and a < 0:
        v1, p1 = _t_monomial(beta, a + 1, m, e)
        v2, p2 = _t_monomial(beta + 1, a, m, e)
        return _add3(v1, v2, -1), _add3(p1, p2, -1)
    if a < 0 and m < 0:
        v1, p1 = _t_monomial(beta, a + 1, m, e)
        v2, p2 = _t_monomial(beta, a, m + 1, e)
        half = Fraction(1, 2)
        return _add3(_ZERO, _add3(v1, v2), half), _add3(_ZERO, _add3(p1, p2), half)
    value, poles = _ZERO, _ZERO
    if m < 0:          # powers of w = 1 - t: t = 1 - w, 1 + t = 2 - w
        coefficients = _poly_product(_binomial_shift(beta, 1, -1), _binomial_shift(a, 2, -1))
        terms = [("one", -(m + i), c) for i, c in enumerate(coefficients)]
    elif a < 0:        # powers of w = 1 + t: t = w - 1, 1 - t = 2 - w
        coefficients = _poly_product(_binomial_shift(beta, -1, -1), _binomial_shift(m, 2, -1))
        terms = [("minus", -(a + i), c * (-1)**beta) for i, c in enumerate(coefficients)]
    else:              # powers of t
        coefficients = _poly_product(_binomial_shift(a, 1, 1), _binomial_shift(m, 1, -1))
        terms = [("t", beta + i, c) for i, c in enumerate(coefficients)]
    for kind, j, c in terms:
        if c:
            v, p = _basis(kind, j, e)
            value, poles = _add3(value, v, c), _add3(poles, p, c)
    return value, poles


def _poly_product(a: list, b: list) -> list:
    out = [Fraction(0)] * (len(a) + len(b) - 1)
    for i, x in enumerate(a):
        for j, y in enumerate(b):
            out[i + j] += x * y
    return out


@lru_cache(maxsize=None)
def _s_monomial(a: int, b: int, c: int, e: int) -> tuple:
    """FP int_1^oo s^a (s - 1)^b (s + 1)^c L^e ds = 2^(b + c + 1) int_0^1 t^b (1 + t)^a
    (1 - t)^-(a + b + c + 2) (-ln t)^e dt (t = (s - 1)/(s + 1))."""
    value, poles = _t_monomial(b, a, -(a + b + c + 2), e)
    scale = Fraction(2)**(b + c + 1)
    return _add3(_ZERO, value, scale), _add3(_ZERO, poles, scale)


@lru_cache(maxsize=None)
def _monomial_integral(n: int, k: int, alpha: int, beta: int, p: int) -> tuple:
    """FP int_1^oo ds int_-1^1 dd s^n d^k (s + d)^-alpha (s - d)^-beta (s + 1)^-p with the
    regulators of step 3: (value, poles) as in :func:`_t_monomial`."""
    value, poles = _ZERO, _ZERO
    for (a, b, c, e), q in _d_integral(k, alpha, beta).items():
        v, pl = _s_monomial(a + n, b, c - p, e)
        value, poles = _add3(value, v, q), _add3(poles, pl, q)
    return value, poles


# ---------------------------------------------------------------- truncated power series
def _series_mul(a: list, b: list, order: int) -> list:
    out = [a[0] * 0 for _ in range(order + 1)]
    for i, x in enumerate(a[:order + 1]):
        if x == 0:
            continue
        for j, y in enumerate(b[:order + 1 - i]):
            out[i + j] += x * y
    return out


def _series_binomial(u: list, exponent, order: int) -> list:
    """(1 + u)^exponent, u without constant term."""
    one = u[0] * 0 + 1
    total, power = [one] + [one * 0] * order, [one] + [one * 0] * order
    coefficient = sp.Integer(1)
    for j in range(1, order + 1):
        coefficient = coefficient * (exponent - j + 1) / j
        power = _series_mul(power, u, order)
        factor = flint.fmpq(int(coefficient.p), int(coefficient.q))
        total = [x + factor * y for x, y in zip(total, power)]
    return total


def _series_power(a: list, n: int, order: int) -> list:
    out = [a[0] * 0 + 1] + [a[0] * 0] * order
    for _ in range(n):
        out = _series_mul(out, a, order)
    return out


def _pad(a: list, order: int) -> list:
    return (list(a) + [a[0] * 0] * (order + 1))[:order + 1]


# ---------------------------------------------------------------- step 4: centre of the regulator
_CENTRE_RING = flint.fmpq_mpoly_ctx.get(("d", "c0"), "lex")


@lru_cache(maxsize=None)
def _centre_correction(n: int, k: int, alpha: int, beta: int, p: int) -> tuple:
    """Coefficient of 1/s in int dd s^n d^k (s+d)^-alpha (s-d)^-beta (s+1)^-p ln(rho/|x|),
    a polynomial in c0 as ((power, rational), ...): the large-s expansion in u = 1/s."""
    leading = n - alpha - beta - p                    # the monomial is s^leading (1 + O(u))
    order = leading + 1                               # the power of u wanted
    if order < 1:
        return ()
    d, c0 = _CENTRE_RING.gens()
    zero = d * 0
    monomial = _series_mul(_series_binomial(_pad([zero, d], order), -alpha, order),
                           _series_binomial(_pad([zero, -d], order), -beta, order), order)
    monomial = _series_mul(monomial, _series_binomial(_pad([zero, zero + 1], order), -p, order), order)
    logarithm = [zero] + [zero + flint.fmpq((-1)**(j + 1), j) for j in range(1, order + 1)]
    inner = _pad([zero, -4 * c0 * d, d * d - 1 + 4 * c0 * c0], order)
    power = [zero + 1] + [zero] * order
    for j in range(1, order + 1):
        power = _series_mul(power, inner, order)
        logarithm = [x - flint.fmpq((-1)**(j + 1), 2 * j) * y for x, y in zip(logarithm, power)]
    coefficient = _series_mul(monomial, logarithm, order)[order] * d**k
    by_power: dict = {}
    for exponents, value in zip(coefficient.monoms(), coefficient.coeffs()):
        a, b = int(exponents[0]), int(exponents[1])
        if a % 2 == 0:
            by_power[b] = by_power.get(b, Fraction(0)) + Fraction(int(value.p), int(value.q)) * Fraction(2, a + 1)
    return tuple(sorted(by_power.items()))


# ---------------------------------------------------------------- step 1: counterterms at the bodies
@lru_cache(maxsize=None)
def _local_expansion(n: int, k: int, alpha: int, beta: int, p: int) -> tuple:
    """Near body 1 (r1 -> 0 at fixed c = n1.(y1 - y2), r12 = 1): s^n d^k (s+d)^-alpha
    (s-d)^-beta (s+1)^-p = sum_j r1^-j Phi_j(c); returns ((j, Phi_j), ...) for j >= 3, Phi_j
    as a flint polynomial in c (s = r1 + r2, d = r1 - r2, r2 = (1 + 2 r1 c + r1^2)^(1/2))."""
    if alpha < 3:
        return ()
    order = alpha - 3                                 # powers of r1 beyond r1^-alpha
    c = flint.fmpq_poly([0, 1])
    zero = c * 0
    u = _pad([zero, 2 * c, zero + 1], order)
    r2 = _series_binomial(u, sp.Rational(1, 2), order)
    s_series = [x + (1 if i == 1 else 0) for i, x in enumerate(r2)]
    d_series = [(1 if i == 1 else 0) - x for i, x in enumerate(r2)]
    w = [x * flint.fmpq(1, 2) for x in s_series]
    w[0] = w[0] - flint.fmpq(1, 2)                    # (1 + s)/2 = 1 + (s - 1)/2, (s - 1)/2 = O(r1)
    total = _series_mul(_series_power(s_series, n, order), _series_power(d_series, k, order), order)
    total = _series_mul(total, _series_binomial(u, sp.Rational(-beta, 2), order), order)
    total = _series_mul(total, _series_binomial(w, -p, order), order)
    scale = flint.fmpq(1, 2**(alpha + beta + p)) if alpha + beta + p >= 0 else flint.fmpq(2**(-alpha - beta - p))
    return tuple((alpha - i, x * scale) for i, x in enumerate(total) if x != 0)


def counterterm_monomials(monomials: dict) -> tuple:
    """(K monomials, <Phi_3> at body 1, <Phi_3> at body 2) for a density given as monomials
    {(n, k, alpha, beta, p): coefficient} (without the measure)."""
    out: dict = {}
    averages = [0, 0]
    for (n, k, alpha, beta, p), coefficient in monomials.items():
        for body, key, sign in ((0, (n, k, alpha, beta, p), 1), (1, (n, k, beta, alpha, p), (-1)**k)):
            for j, phi in _local_expansion(*key):
                values = [Fraction(int(q.p), int(q.q)) for q in phi.coeffs()]
                if j == 3:
                    mean = sum((v / (m + 1) for m, v in enumerate(values) if m % 2 == 0), Fraction(0))
                    averages[body] += _times(coefficient, mean * sign)
                # r_A^-j c_A^m = 2^j (s -+ d)^-(j + m) (-+ s d - 1)^m
                for m, value in enumerate(values):
                    if value == 0:
                        continue
                    for i in range(m + 1):
                        w = comb(m, i) * ((-1)**m if body == 0 else (-1)**(m - i))
                        shape = (i, i, j + m, 0, 0) if body == 0 else (i, i, 0, j + m, 0)
                        out[shape] = out.get(shape, 0) + _times(coefficient, value * w * sign * 2**j)
    return out, averages[0], averages[1]


def _times(coefficient, q: Fraction):
    """coefficient (an int, a sympy number or expression, or a flint element) times a rational."""
    if isinstance(coefficient, sp.Basic):
        return coefficient * sp.Rational(q.numerator, q.denominator)
    return coefficient * flint.fmpq(q.numerator, q.denominator)


def _to_sympy(value) -> sp.Expr:
    """A coefficient as a sympy expression (flint polynomials: symbols named as the generators,
    the generator "I" the imaginary unit)."""
    if isinstance(value, sp.Basic):
        return value
    if isinstance(value, int):
        return sp.Integer(value)
    if isinstance(value, flint.fmpq):
        return sp.Rational(int(value.p), int(value.q))
    names = value.context().names()
    symbols = [sp.I if name == "I" else sp.Symbol(name) for name in names]
    total = sp.Integer(0)
    for exponents, q in zip(value.monoms(), value.coeffs()):
        term = sp.Rational(int(q.p), int(q.q))
        for symbol, e in zip(symbols, exponents):
            term *= symbol**e
        total += term
    return sp.expand(total)


def finite_part_integral(monomials: dict, c0=0) -> dict:
    """FP Pf int d^3x f for a density f = sum coefficient s^n d^k (s+d)^-alpha (s-d)^-beta
    (s+1)^-p, given as {(n, k, alpha, beta, p): coefficient} (r12 = 1, without the measure),
    c0 the height of the mid-point above the origin (module docstring, steps 1-4). The
    coefficients (and c0) may be integers, sympy expressions or elements of one flint ring.

    Returns {"finite", "ln r0", "ln s1", "ln s2"} as sympy expressions; raises ArithmeticError
    if a pole at a body survives the counterterms (then the density is not what the caller
    thinks).
    """
    counter, average1, average2 = counterterm_monomials(monomials)
    remainder = dict(monomials)
    for key, value in counter.items():
        remainder[key] = remainder.get(key, 0) - value
    finite, pole_delta, pole_b = [0, 0, 0], [0, 0], 0
    centre_by_power: dict = {}
    for (n, k, alpha, beta, p), coefficient in remainder.items():
        if coefficient == 0:
            continue
        # the measure (pi/4)(s + d)(s - d)
        shape = (n, k, alpha - 1, beta - 1, p)
        value, poles = _monomial_integral(*shape)
        for i in range(3):
            if value[i]:
                finite[i] += _times(coefficient, value[i])
        for i in range(2):
            if poles[i]:
                pole_delta[i] += _times(coefficient, poles[i])
        if poles[2]:
            pole_b += _times(coefficient, poles[2])
        for power, q in _centre_correction(*shape):
            centre_by_power[power] = centre_by_power.get(power, 0) + _times(coefficient, q)
    if any(_to_sympy(x) != 0 for x in pole_delta):
        raise ArithmeticError(f"a pole at a body survives the counterterms: {[_to_sympy(x) for x in pole_delta]}")
    centre = sum((value * c0**power for power, value in centre_by_power.items()), 0)
    quarter_pi = sp.pi / 4
    constants = (1, sp.log(2), sp.pi**2)
    value = sum((_to_sympy(x) * c for x, c in zip(finite, constants)), sp.Integer(0)) + _to_sympy(centre)
    return {"finite": sp.expand(quarter_pi * value),
            "ln r0": sp.expand(-quarter_pi * _to_sympy(pole_b) + 4 * sp.pi * _to_sympy(average1 + average2)),
            "ln s1": sp.expand(-4 * sp.pi * _to_sympy(average1)), "ln s2": sp.expand(-4 * sp.pi * _to_sympy(average2))}


def axisymmetric_monomials(density: sp.Expr, x, r1, r2, perimeter, c0) -> dict:
    """The phi average of a density polynomial in the Cartesian components x = (X, Y, Z) and
    Laurent in r1, r2 and perimeter = r1 + r2 + r12 (symbols), bodies on the z axis at
    c0 +- 1/2, as monomials {(n, k, alpha, beta, p): coefficient} of (E1)."""
    out: dict = {}
    rho2 = (_S**2 - 1) * (1 - _D**2) / 4
    z = c0 - _S * _D / 2
    for term in sp.Add.make_args(sp.expand(density)):
        powers = term.as_powers_dict()
        a, b, cz = (int(powers.get(q, 0)) for q in x)
        e1, e2, ep = int(powers.get(r1, 0)), int(powers.get(r2, 0)), int(powers.get(perimeter, 0))
        coefficient = term / (x[0]**a * x[1]**b * x[2]**cz * r1**e1 * r2**e2 * perimeter**ep)
        if a % 2 or b % 2:
            continue
        angular = sp.Rational(sp.factorial2(a - 1) * sp.factorial2(b - 1), sp.factorial2(a + b))
        polynomial = sp.Poly(sp.expand(rho2**((a + b) // 2) * z**cz * angular), _S, _D)
        for (n, k), w in polynomial.terms():
            shape = (n, k, -e1, -e2, -ep)
            out[shape] = out.get(shape, 0) + coefficient * w * sp.Rational(2)**(-e1 - e2)
    return out
