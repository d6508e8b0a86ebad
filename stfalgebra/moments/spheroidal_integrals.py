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

from functools import lru_cache

import flint
import sympy as sp

__all__ = ["SPHEROIDAL_SYMBOLS", "finite_part_integral", "axisymmetric_monomials", "counterterm_monomials"]

_S, _D = sp.symbols("s d", positive=True)
SPHEROIDAL_SYMBOLS = (_S, _D)
_T = sp.Symbol("t", positive=True)
_B = sp.Symbol("B")
_DELTA = sp.Symbol("delta_reg")
_C0 = sp.Symbol("c0")
_L = sp.Symbol("L")          # ln((s + 1)/(s - 1))


# ---------------------------------------------------------------- step 2: the d integral
@lru_cache(maxsize=None)
def _d_integral(k: int, alpha: int, beta: int) -> tuple:
    """int_-1^1 d^k (s + d)^-alpha (s - d)^-beta dd = (R0(s), R1(s)), the value R0 + R1 L."""
    integrand = sp.apart(_D**k * (_S + _D)**(-alpha) * (_S - _D)**(-beta), _D)
    r0, r1 = sp.Integer(0), sp.Integer(0)
    for term in sp.Add.make_args(integrand):
        coefficient, power, sign = _linear_power(term)
        if sign == 0:                                  # c(s) d^power
            r0 += coefficient * sp.Rational(1 - (-1)**(power + 1), power + 1)
        elif power == -1:                              # c/(s +- d)
            r1 += coefficient
        else:                                          # c (s + sign d)^power
            at_top, at_bottom = (_S + sign)**(power + 1), (_S - sign)**(power + 1)
            r0 += coefficient * (at_top - at_bottom) / ((power + 1) * sign)
    return sp.cancel(r0), sp.cancel(r1)


def _linear_power(term: sp.Expr) -> tuple:
    """term = c(s) d^n (sign 0) or c(s) (s + sign d)^n: (c, n, sign)."""
    coefficient, power, sign = sp.Integer(1), 0, 0
    for factor in sp.Mul.make_args(term):
        base, exponent = factor.as_base_exp()
        if base == _D:
            power = int(exponent)
        elif base.has(_D):
            expanded = sp.expand(base)
            sign = 1 if expanded.coeff(_D) == 1 else -1 if expanded.coeff(_D) == -1 else None
            if sign is None or sp.expand(expanded - sign * _D) != _S:
                raise ValueError(f"unexpected partial fraction {term}")
            power = int(exponent)
        else:
            coefficient *= factor
    return coefficient, power, sign


# ---------------------------------------------------------------- step 3: the s integral
@lru_cache(maxsize=None)
def _t_basis(kind: str, j: int, e: int) -> tuple:
    """FP int_0^1 basis (-ln t)^e dt as (finite, pole in delta, pole in B): kind 't' is t^j,
    'one' (1 - t)^-j with the regulator (1 - t)^-B, 'minus' (1 + t)^-j."""
    if kind == "t":
        if j == -1:
            return sp.Integer(0), (1 if e == 0 else None), 0
        return sp.Rational(1, (j + 1)**(e + 1)), 0, 0
    if kind == "one":
        if e == 0:
            if j == 1:
                return sp.Integer(0), 0, sp.Integer(-1)
            return sp.Rational(1, 1 - j), 0, 0
        if j == 1:
            return sp.pi**2 / 6, 0, 0
        # (psi(2 - j - B) - psi(1))/(1 - j - B), psi(-n - B) = 1/B - gamma + H_n + O(B)
        harmonic = sum((sp.Rational(1, q) for q in range(1, j - 1)), sp.Integer(0))
        return harmonic / (1 - j) + sp.Rational(1, (1 - j)**2), 0, sp.Rational(1, 1 - j)
    if e == 0:
        return (sp.log(2) if j == 1 else sp.Rational(1, j - 1) * (1 - sp.Rational(1, 2**(j - 1)))), 0, 0
    if j == 1:
        return sp.pi**2 / 12, 0, 0
    # by parts: (1/(j - 1)) sum_{i=0}^{j-2} int_0^1 (1 + t)^(i - j + 1) dt
    total = sp.Integer(0)
    for i in range(j - 1):
        q = i - j + 1
        total += sp.log(2) if q == -1 else sp.Rational(2**(q + 1) - 1, q + 1) if q >= 0 else \
            (sp.Rational(1, 2**(-q - 1)) - 1) / (q + 1)
    return total / (j - 1), 0, 0


def _t_integral(rational: sp.Expr, e: int) -> tuple:
    """FP int_0^1 Q(t) (-ln t)^e dt for Q rational with poles at t = 0, 1, -1 only."""
    finite, pole_delta, pole_b = sp.Integer(0), sp.Integer(0), sp.Integer(0)
    for term in sp.Add.make_args(sp.apart(sp.cancel(rational), _T)):
        coefficient, kind, j = _t_term(term)
        value, p_delta, p_b = _t_basis(kind, j, e)
        if p_delta is None:
            pole_delta += coefficient * sp.Symbol("double_pole")
        else:
            pole_delta += coefficient * p_delta
        finite += coefficient * value
        pole_b += coefficient * p_b
    return finite, pole_delta, pole_b


def _t_term(term: sp.Expr) -> tuple:
    coefficient, kind, j = sp.Integer(1), "t", 0
    for factor in sp.Mul.make_args(term):
        base, exponent = factor.as_base_exp()
        if base == _T:
            j = int(exponent)
        elif base.has(_T):
            expanded = sp.expand(base)
            if expanded == _T - 1:
                kind, j = "one", -int(exponent)
                coefficient *= (-1)**j
            elif expanded == 1 - _T:
                kind, j = "one", -int(exponent)
            elif expanded == _T + 1:
                kind, j = "minus", -int(exponent)
            else:
                raise ValueError(f"unexpected partial fraction {term}")
        else:
            coefficient *= factor
    return coefficient, kind, j


@lru_cache(maxsize=None)
def _monomial_integral(n: int, k: int, alpha: int, beta: int, p: int) -> tuple:
    """FP int_1^oo ds int_-1^1 dd s^n d^k (s + d)^-alpha (s - d)^-beta (s + 1)^-p with the
    regulators of step 3: (finite, pole in delta, pole in B)."""
    r0, r1 = _d_integral(k, alpha, beta)
    weight = _S**n * (_S + 1)**(-p)
    to_t = {_S: (1 + _T) / (1 - _T)}
    jacobian = 2 / (1 - _T)**2
    total = [sp.Integer(0)] * 3
    for rational, e in ((r0, 0), (r1, 1)):
        if rational == 0:
            continue
        part = _t_integral(sp.cancel((weight * rational).subs(to_t) * jacobian), e)
        total = [a + b for a, b in zip(total, part)]
    return tuple(sp.expand(v) for v in total)


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
def _centre_correction(n: int, k: int, alpha: int, beta: int, p: int) -> sp.Expr:
    """Coefficient of 1/s in int dd s^n d^k (s+d)^-alpha (s-d)^-beta (s+1)^-p ln(rho/|x|)
    (a polynomial in c0): the large-s expansion in u = 1/s."""
    leading = n - alpha - beta - p                    # the monomial is s^leading (1 + O(u))
    order = leading + 1                               # the power of u wanted
    if order < 1:
        return sp.Integer(0)
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
    total = sp.Integer(0)
    c0_symbol = _C0
    for exponents, value in zip(coefficient.monoms(), coefficient.coeffs()):
        a, b = exponents
        if a % 2 == 0:
            total += sp.Rational(int(value.p), int(value.q)) * sp.Rational(2, a + 1) * c0_symbol**b
    return total


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
    averages = [sp.Integer(0), sp.Integer(0)]
    for (n, k, alpha, beta, p), coefficient in monomials.items():
        for body, key, sign in ((0, (n, k, alpha, beta, p), 1), (1, (n, k, beta, alpha, p), (-1)**k)):
            for j, phi in _local_expansion(*key):
                values = [sp.Rational(int(q.p), int(q.q)) for q in phi.coeffs()]
                if j == 3:
                    averages[body] += sign * coefficient * sum(v / (m + 1) for m, v in enumerate(values) if m % 2 == 0)
                # r_A^-j c_A^m = 2^j (s -+ d)^-(j + m) (-+ s d - 1)^m
                for m, value in enumerate(values):
                    if value == 0:
                        continue
                    for i in range(m + 1):
                        w = sp.binomial(m, i) * ((-1)**m if body == 0 else (-1)**(m - i))
                        shape = (i, i, j + m, 0, 0) if body == 0 else (i, i, 0, j + m, 0)
                        out[shape] = out.get(shape, 0) + sign * coefficient * value * w * 2**j
    return out, averages[0], averages[1]


def finite_part_integral(monomials: dict, c0=sp.Integer(0)) -> dict:
    """FP Pf int d^3x f for a density f = sum coefficient s^n d^k (s+d)^-alpha (s-d)^-beta
    (s+1)^-p, given as {(n, k, alpha, beta, p): coefficient} (r12 = 1, without the measure),
    c0 the height of the mid-point above the origin (module docstring, steps 1-4).

    Returns {"finite", "ln r0", "ln s1", "ln s2"} (exact); raises ArithmeticError if a pole
    at a body survives the counterterms (then the density is not what the caller thinks).
    """
    counter, average1, average2 = counterterm_monomials(monomials)
    remainder = dict(monomials)
    for key, value in counter.items():
        remainder[key] = remainder.get(key, 0) - value
    finite, pole_delta, pole_b, centre = sp.Integer(0), sp.Integer(0), sp.Integer(0), sp.Integer(0)
    for (n, k, alpha, beta, p), coefficient in remainder.items():
        coefficient = sp.expand(coefficient)
        if coefficient == 0:
            continue
        # the measure (pi/4)(s + d)(s - d)
        shape = (n, k, alpha - 1, beta - 1, p)
        value, p_delta, p_b = _monomial_integral(*shape)
        finite += coefficient * value
        pole_delta += coefficient * p_delta
        pole_b += coefficient * p_b
        centre += coefficient * _centre_correction(*shape)
    pole_delta = sp.expand(pole_delta)
    if pole_delta != 0:
        raise ArithmeticError(f"a pole at a body survives the counterterms: {pole_delta}")
    quarter_pi = sp.pi / 4
    return {"finite": sp.expand(quarter_pi * (finite + centre.subs(_C0, c0))),
            "ln r0": sp.expand(-quarter_pi * pole_b + 4 * sp.pi * (average1 + average2)),
            "ln s1": sp.expand(-4 * sp.pi * average1), "ln s2": sp.expand(-4 * sp.pi * average2)}


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
