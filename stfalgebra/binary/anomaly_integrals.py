"""Zero-mean antiderivatives over the mean anomaly of functions of the eccentric anomaly.

The method of variation of constants on a Keplerian ellipse needs, for a rate ``F(u)`` of an
orbital element (``u`` the eccentric anomaly, ``l = u - e sin u`` the mean anomaly,
``dl = (1 - e cos u) du``), its orbit average and the periodic function

    P(u) = int (F - <F>) dl,        normalised by <P> = 0,

where ``<f> = (1/2 pi) int_0^(2 pi) f dl`` is the average over one radial period. For ``F``
rational in ``cos u, sin u`` with powers of ``w = 1 - e cos u`` in the denominators (every rate of
the Newtonian orbit perturbed by a force polynomial in ``1/r, rdot, phidot``), ``P`` is elementary:

* the part of ``F w`` even in ``u``, ``N(cos u)/w^k``, integrates to ``alpha u + gamma v +
  sin u Q(cos u)/w^(k-1)`` (``v`` the true anomaly, ``dv/du = sqrt(1 - e^2)/w``), the unknowns
  found by matching polynomials in ``cos u`` (Hermite reduction); ``alpha + gamma = <F>``, so
  ``P`` holds ``gamma (v - u)``;
* the odd part ``sin u N(cos u)/w^k`` integrates, with ``cos u`` as the variable, to a rational
  function of ``cos u`` plus a multiple of ``log w``.

A second integration (a periodic part fed by another one, as the mean anomaly is fed by the
periodic part of the mean motion) meets ``int (v - u) dl``, which is not elementary: with
``rho = e/(1 + sqrt(1 - e^2))``,

    v - u = 2 sum_k rho^k sin(k u)/k = 2 atan(rho sin u/(1 - rho cos u)),
    1/w   = (1 + 2 sum_k rho^k cos(k u))/sqrt(1 - e^2),
    log w = log((1 + sqrt(1 - e^2))/2) - 2 sum_k rho^k cos(k u)/k,

so ``int (v - u) du = -2 Re Li_2(rho e^(i u))`` and, by parts,
``int (v - u) w du = -2 Re Li_2(rho e^(i u)) - e (v - u) sin u + sqrt(1 - e^2) log w + e cos u``.
The periodic functions are therefore kept as :class:`AnomalyFunction`: rational coefficients of
the four functions ``1``, ``v - u``, ``Re Li_2(rho e^(i u))`` and ``log w``, each periodic in
``u`` (``1 - rho cos u > 0``). Their averages use the Fourier series above (exact).
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache
from typing import Any, Mapping

import numpy as np
import sympy as sp

from .keplerian import e as kepler_eccentricity
from .keplerian import tidy_eccentricity, u
from .orbit_averages import mean_power

__all__ = [
    "RATIONAL",
    "TRUE_MINUS_ECCENTRIC_ANOMALY",
    "ANOMALY_DILOGARITHM",
    "LOG_ONE_MINUS_E_COS_U",
    "AnomalyFunction",
    "AnomalyIntegral",
    "anomaly_ratio",
    "zero_mean_integral",
]

#: Names of the four periodic functions an :class:`AnomalyFunction` combines.
RATIONAL = "rational"
TRUE_MINUS_ECCENTRIC_ANOMALY = "v - u"
ANOMALY_DILOGARITHM = "Re Li2(rho exp(i u))"
LOG_ONE_MINUS_E_COS_U = "log(1 - e cos u)"
_BASIS = (RATIONAL, TRUE_MINUS_ECCENTRIC_ANOMALY, ANOMALY_DILOGARITHM, LOG_ONE_MINUS_E_COS_U)

# the working variables: cos u, sin u, sqrt(1 - e^2); e is the Keplerian symbol
_C = sp.Symbol("cos_u", real=True)
_S = sp.Symbol("sin_u", real=True)
_B = sp.Symbol("root_1_minus_e2", positive=True)
_E = kepler_eccentricity


def anomaly_ratio(eccentricity: Any = _E) -> sp.Expr:
    """``rho = e/(1 + sqrt(1 - e^2)) = (1 - sqrt(1 - e^2))/e``, the ratio of the Fourier series.

    Example
    -------
    >>> anomaly_ratio(sp.Rational(3, 5))
    1/3

    References
    ----------
    Common practice (the Poisson kernel: ``(1 - rho^2)/(1 - 2 rho cos u + rho^2) =
    1 + 2 sum_k rho^k cos(k u)``, with ``2 rho/(1 + rho^2) = e``).
    """
    ecc = sp.sympify(eccentricity)
    return ecc / (1 + sp.sqrt(1 - ecc**2))


def _to_working(expr: Any, anomaly: sp.Symbol) -> sp.Expr:
    value = sp.sympify(expr).subs({sp.cos(anomaly): _C, sp.sin(anomaly): _S})
    value = value.subs(sp.sqrt(1 - _E) * sp.sqrt(1 + _E), _B).subs(sp.sqrt(1 - _E**2), _B)
    if value.has(sp.sqrt(1 - _E)) or value.has(sp.sqrt(1 + _E)):
        raise ValueError(f"unpaired sqrt(1 -+ e) in {expr}")
    if value.has(anomaly):
        raise ValueError(f"{expr} depends on {anomaly} other than through cos and sin")
    return value


@lru_cache(maxsize=1)
def _field():
    """The field Q(cos u, sin u, e, root) in which the algebra runs (sympy's sparse fields:
    no expression trees in the inner loops)."""
    from sympy.polys.fields import field

    return field([_C, _S, _E, _B], sp.QQ)


def _reduce_poly(poly):
    """Reduce sin^2 u = 1 - cos^2 u and root^2 = 1 - e^2 in a polynomial of the field's ring."""
    ring = poly.ring
    c, s, e, b = ring.gens
    total = ring.zero
    for (i, j, k, l), coefficient in poly.terms():
        total += (coefficient * c**i * e**k * (1 - c**2) ** (j // 2) * s ** (j % 2)
                  * (1 - e**2) ** (l // 2) * b ** (l % 2))
    return total


def _canonical_element(value):
    """A field element with sin^2 u, root^2 reduced and a denominator free of root and sin u."""
    ring = value.numer.ring
    c, s, e, b = ring.gens
    num, den = _reduce_poly(value.numer), _reduce_poly(value.denom)
    for index, square in ((3, 1 - e**2), (1, 1 - c**2)):
        if den.degree(index) > 0:
            d1 = den.coeff_wrt(ring.gens[index], 1)
            d0 = den.coeff_wrt(ring.gens[index], 0)
            num = _reduce_poly(num * (d0 - d1 * ring.gens[index]))
            den = _reduce_poly(d0**2 - d1**2 * square)
    field = _field()[0]
    return field(num) / field(den)


def _reduce(poly_expr: sp.Expr) -> sp.Expr:
    """Reduce sin^2 u = 1 - cos^2 u and root^2 = 1 - e^2 (a polynomial in sin u, root)."""
    field = _field()[0]
    return _reduce_poly(field.from_expr(sp.expand(poly_expr)).numer).as_expr()


def _split_rate(expr: sp.Expr) -> tuple[sp.Expr, sp.Expr, int, sp.Expr]:
    """(N0(C), N1(C), k, K) with expr = K (N0 + S N1)/w^k, N0, N1 polynomial in C."""
    field, c, s, e, b = _field()
    value = _canonical_element(field.from_expr(expr))
    num, den = value.numer, value.denom
    w = (1 - e * c).numer
    power = 0
    while den.degree(0) > 0:
        quotient, remainder = den.div([w])
        if remainder != 0:
            raise ValueError(f"denominator {den.as_expr()} is not a power of 1 - e cos u")
        den, power = quotient[0], power + 1
    constant = 1 / den.as_expr()
    n0 = num.coeff_wrt(s.numer, 0).as_expr()
    n1 = num.coeff_wrt(s.numer, 1).as_expr()
    return sp.expand(n0), sp.expand(n1), power, constant


def _even_antiderivative(numerator: sp.Expr, power: int) -> tuple[sp.Expr, sp.Expr, sp.Expr]:
    """(alpha, gamma, R) with int N(C)/w^k du = alpha u + gamma v + R, R = S Q(C)/w^(k-1)."""
    w = 1 - _E * _C
    if power <= 0:
        numerator, power = sp.expand(numerator * w ** (1 - power)), 1
    degree = max(sp.degree(numerator, _C), power) - 2 if numerator != 0 else power - 2
    degree = max(degree, -1)
    alpha, gamma = sp.symbols("alpha_ gamma_")
    q = sp.symbols(f"q_0:{degree + 1}") if degree >= 0 else ()
    big_q = sum((coefficient * _C**i for i, coefficient in enumerate(q)), sp.S.Zero)
    image = (alpha * w**power + gamma * _B * w ** (power - 1)
             + _C * big_q * w - (1 - _C**2) * sp.diff(big_q, _C) * w
             - (power - 1) * _E * (1 - _C**2) * big_q)
    equations = sp.Poly(sp.expand(image - numerator), _C).all_coeffs()
    unknowns = (alpha, gamma) + tuple(q)
    solutions = sp.linsolve(equations, unknowns)
    if not solutions:
        raise ArithmeticError(f"no antiderivative of the form alpha u + gamma v + S Q/w^(k-1) "
                              f"for {numerator}/w^{power}")
    values = dict(zip(unknowns, next(iter(solutions))))
    if any(value.free_symbols & set(unknowns) for value in values.values()):
        raise ArithmeticError("the antiderivative is not unique")
    rest = _S * big_q.subs(values) / w ** (power - 1)
    return sp.cancel(values[alpha]), sp.cancel(values[gamma]), rest


def _odd_antiderivative(numerator: sp.Expr, power: int) -> tuple[sp.Expr, sp.Expr]:
    """(R(C), c) with int S N(C)/w^k du = R(C) + c log w.

    With ``w = 1 - e C`` as the variable (``dw = e S du``): ``(1/e) int N((1 - w)/e) w^(-k) dw``,
    a Laurent polynomial in ``w`` integrated term by term.
    """
    if numerator == 0:
        return sp.S.Zero, sp.S.Zero
    w = sp.Dummy("w")
    laurent = sp.expand(numerator.subs(_C, (1 - w) / _E) * w ** (-power) / _E)
    rational, log_coefficient = sp.S.Zero, sp.S.Zero
    for exponent, coefficient in sp.collect(laurent, w, evaluate=False).items():
        factor, j = (exponent.as_coeff_exponent(w) if exponent != 1 else (1, 0))
        if factor != 1 or not sp.sympify(j).is_Integer:
            raise ArithmeticError(f"not a Laurent polynomial in 1 - e cos u: {laurent}")
        if j == -1:
            log_coefficient += coefficient
        else:
            rational += coefficient * (1 - _E * _C) ** (j + 1) / (j + 1)
    return sp.cancel(sp.together(rational)), sp.cancel(log_coefficient)


def _tidy(expr: sp.Expr) -> sp.Expr:
    """A constant rational in e, sqrt(1 - e^2): reduced in the field, the root written out."""
    value = _canonical(sp.sympify(expr).subs(sp.sqrt(1 - _E**2), _B))
    return value.subs(_B, sp.sqrt(1 - _E**2))


def _fourier_mean(coefficient: sp.Expr, basis: str) -> sp.Expr:
    """Mean over ``u`` of ``coefficient(cos u, sin u) * f(u)`` for a non-rational basis ``f``."""
    z = sp.Dummy("z")
    rho = _E / (1 + _B)
    poly = sp.expand(sp.sympify(coefficient).subs({_C: (z + 1 / z) / 2, _S: (z - 1 / z) / (2 * sp.I)}))
    total = sp.S.Zero
    for term in sp.Add.make_args(poly):
        factor, exponent = term.as_coeff_exponent(z)
        if factor.has(z) or not exponent.is_Integer:
            raise ValueError(f"the coefficient of {basis} is not a trigonometric polynomial: {coefficient}")
        j = abs(int(exponent))
        # mean of z^s f = coefficient of z^(-s) in f; f = a_0 + sum (a_k -+ i b_k)/2 z^(+-k)
        if basis == TRUE_MINUS_ECCENTRIC_ANOMALY:
            a_j, b_j = sp.S.Zero, (2 * rho**j / j if j else sp.S.Zero)
        elif basis == ANOMALY_DILOGARITHM:
            a_j, b_j = (rho**j / j**2 if j else sp.S.Zero), sp.S.Zero
        else:
            a_j = -2 * rho**j / j if j else sp.log((1 + _B) / 2)
            b_j = sp.S.Zero
        if j == 0:
            total += factor * a_j
        else:
            sign = 1 if exponent > 0 else -1
            total += factor * (a_j + sign * sp.I * b_j) / 2
    return sp.expand(total)


def _canonical(expr: Any) -> sp.Expr:
    """A rational function of cos u, sin u, e, root in a canonical form: sin^2 u and root^2
    reduced, the denominator free of root and sin u, common factors cancelled."""
    field = _field()[0]
    value = _canonical_element(field.from_expr(sp.sympify(expr)))
    return value.numer.as_expr() / sp.factor(value.denom.as_expr())


@dataclass(frozen=True)
class AnomalyFunction:
    """A periodic function of the eccentric anomaly: rational coefficients of four functions.

    ``f(u) = constant + sum_b c_b(cos u, sin u) f_b(u)`` with ``f_b`` in ``1``, ``v - u``,
    ``Re Li_2(rho e^(i u))``, ``log(1 - e cos u)`` (the keys :data:`RATIONAL`,
    :data:`TRUE_MINUS_ECCENTRIC_ANOMALY`, :data:`ANOMALY_DILOGARITHM`,
    :data:`LOG_ONE_MINUS_E_COS_U`), the coefficients rational in ``cos u, sin u`` and
    ``sqrt(1 - e^2)``, the constant free of ``u`` (it may hold ``log((1 + sqrt(1 - e^2))/2)``).

    **Conventions**: ``v - u = 2 atan(rho sin u/(1 - rho cos u))`` (continuous and periodic),
    ``rho = e/(1 + sqrt(1 - e^2))``; ``v`` the true anomaly, equal to ``u`` at periastron.

    Example
    -------
    >>> from stfalgebra.binary.keplerian import e
    >>> f = AnomalyFunction.from_terms({TRUE_MINUS_ECCENTRIC_ANOMALY: 1})
    >>> f.expression().subs(e, 0)
    0

    References
    ----------
    Module docstring (Fourier series derived there).
    """

    terms: tuple[tuple[str, sp.Expr], ...]
    constant: sp.Expr = sp.S.Zero

    @classmethod
    def from_terms(cls, terms: Mapping[str, Any], constant: Any = 0,
                   anomaly: sp.Symbol = u) -> AnomalyFunction:
        """Build from ``{basis name: coefficient in cos(u), sin(u), e}`` (zeros dropped)."""
        unknown = set(terms) - set(_BASIS)
        if unknown:
            raise ValueError(f"unknown basis function(s) {sorted(unknown)}; use {_BASIS}")
        offset = _to_working(constant, anomaly)
        if offset.has(_C) or offset.has(_S):
            raise ValueError(f"the constant must be free of {anomaly}, got {constant!r}")
        return cls._build({name: _to_working(value, anomaly) for name, value in terms.items()}, offset)

    @classmethod
    def _build(cls, terms: Mapping[str, sp.Expr], constant: sp.Expr) -> AnomalyFunction:
        out = []
        for name in _BASIS:
            if name in terms:
                value = _canonical(terms[name])
                if value != 0:
                    out.append((name, value))
        return cls(tuple(out), _tidy_transcendental(constant) if constant != 0 else sp.S.Zero)

    def coefficient(self, name: str) -> sp.Expr:
        """The coefficient of one basis function, in ``cos(u)``, ``sin(u)``, ``e``."""
        if name not in _BASIS:
            raise ValueError(f"unknown basis function {name!r}; use {_BASIS}")
        value = dict(self.terms).get(name, sp.S.Zero)
        return sp.sympify(value).subs({_C: sp.cos(u), _S: sp.sin(u), _B: sp.sqrt(1 - _E**2)})

    def __add__(self, other: AnomalyFunction) -> AnomalyFunction:
        total = dict(self.terms)
        for name, value in other.terms:
            total[name] = total.get(name, 0) + value
        return AnomalyFunction._build(total, self.constant + other.constant)

    def scaled(self, factor: Any) -> AnomalyFunction:
        """The function times a constant (free of ``u``)."""
        value = _to_working(factor, u)
        return AnomalyFunction._build({name: value * c for name, c in self.terms}, value * self.constant)

    def expression(self, anomaly: sp.Symbol = u, eccentricity: Any = _E) -> sp.Expr:
        """The closed form as one sympy expression in ``anomaly`` (see the class conventions)."""
        ecc = sp.sympify(eccentricity)
        rho = anomaly_ratio(ecc)
        functions = {
            RATIONAL: sp.S.One,
            TRUE_MINUS_ECCENTRIC_ANOMALY: 2 * sp.atan(rho * sp.sin(anomaly) / (1 - rho * sp.cos(anomaly))),
            ANOMALY_DILOGARITHM: sp.re(sp.polylog(2, rho * sp.exp(sp.I * anomaly))),
            LOG_ONE_MINUS_E_COS_U: sp.log(1 - ecc * sp.cos(anomaly)),
        }
        subs = {_C: sp.cos(anomaly), _S: sp.sin(anomaly), _B: sp.sqrt(1 - ecc**2), _E: ecc}
        return (sp.sympify(self.constant).subs(_E, ecc)
                + sp.Add(*(sp.sympify(c).subs(subs, simultaneous=True) * functions[name]
                           for name, c in self.terms)))

    def numeric(self, anomaly: Any, eccentricity: Any, constants: Mapping[Any, float] | None = None
                ) -> np.ndarray:
        """Evaluate in floating point (numpy broadcasting over ``anomaly`` and ``eccentricity``).

        Parameters
        ----------
        anomaly:
            Eccentric anomalies (array or float).
        eccentricity:
            ``e`` in (0, 1) (array or float).
        constants:
            Values of the other symbols of the coefficients (e.g. ``{nu: 0.25}``).

        ``Re Li_2`` is scipy's ``spence`` (``Li_2(z) = spence(1 - z)``).
        """
        from scipy.special import spence

        ecc = np.asarray(eccentricity, dtype=float)
        if np.any(~((ecc > 0) & (ecc < 1))):
            raise ValueError(f"eccentricity must lie in (0, 1) for numeric evaluation, got {eccentricity!r}")
        angle = np.asarray(anomaly, dtype=float)
        rho = ecc / (1 + np.sqrt(1 - ecc**2))
        values = {
            RATIONAL: 1.0,
            TRUE_MINUS_ECCENTRIC_ANOMALY: 2 * np.arctan2(rho * np.sin(angle), 1 - rho * np.cos(angle)),
            ANOMALY_DILOGARITHM: np.real(spence(1 - rho * np.exp(1j * angle))),
            LOG_ONE_MINUS_E_COS_U: np.log(1 - ecc * np.cos(angle)),
        }
        names = tuple(sorted((constants or {}).items(), key=lambda item: str(item[0])))
        extra = tuple(key for key, _ in names)
        arguments = (np.cos(angle), np.sin(angle), ecc, np.sqrt(1 - ecc**2)) + tuple(float(v) for _, v in names)
        total = _numeric_function(self.constant, extra)(*arguments)
        for name, coefficient in self.terms:
            total = total + _numeric_function(coefficient, extra)(*arguments) * values[name]
        return np.asarray(total + 0 * angle + 0 * ecc, dtype=float)

    def orbit_mean(self) -> sp.Expr:
        """The average over one radial period, ``(1/2 pi) int f dl`` (exact)."""
        total = self.constant
        for name, coefficient in self.terms:
            if name == RATIONAL:
                total += _rational_mean(coefficient)
                continue
            num, den = sp.fraction(sp.cancel(coefficient))
            if den.has(_C) or den.has(_S):
                raise ValueError(f"the coefficient of {name} must be a trigonometric polynomial")
            total += _fourier_mean(sp.expand(num * (1 - _E * _C)), name) / den
        return _tidy_transcendental(total)


@lru_cache(maxsize=None)
def _numeric_function(expr: sp.Expr, extra: tuple[sp.Symbol, ...]):
    """numpy function of (cos u, sin u, e, root, *extra) (cached: lambdify is slow)."""
    value = sp.sympify(expr).subs(sp.sqrt(1 - _E**2), _B)
    unknown = value.free_symbols - {_C, _S, _E, _B} - set(extra)
    if unknown:
        raise ValueError(f"no value given for {sorted(map(str, unknown))}")
    return sp.lambdify((_C, _S, _E, _B) + extra, value, "numpy")


def _rational_mean(coefficient: sp.Expr) -> sp.Expr:
    """Mean over ``l`` of a rational function of cos u, sin u: the part odd in ``u`` drops; the
    even part ``N(C)/w^k`` (times ``w``) becomes a Laurent polynomial in ``w`` (``C = (1 - w)/e``)
    whose powers have the exact means of :func:`~stfalgebra.binary.orbit_averages.mean_power`."""
    n0, _, power, constant = _split_rate(sp.sympify(coefficient) * (1 - _E * _C))
    if n0 == 0:
        return sp.S.Zero
    w = sp.Dummy("w")
    laurent = sp.expand(sp.sympify(n0).subs(_C, (1 - w) / _E) * w ** (-power))
    total = sp.S.Zero
    for exponent, value in sp.collect(laurent, w, evaluate=False).items():
        factor, j = (exponent.as_coeff_exponent(w) if exponent != 1 else (1, 0))
        total += value * mean_power(int(j), _E).subs(sp.sqrt(1 - _E**2), _B)
    return sp.cancel(constant * total)


def _tidy_transcendental(expr: sp.Expr) -> sp.Expr:
    """Tidy an exact constant that may hold ``log((1 + sqrt(1 - e^2))/2)`` linearly."""
    value = sp.expand(sp.sympify(expr).subs(_B, sp.sqrt(1 - _E**2)))
    logs = [atom for atom in value.atoms(sp.log)]
    if not logs:
        return _tidy(value)
    out = sp.S.Zero
    rest = value
    for atom in logs:
        coefficient = sp.expand(value).coeff(atom)
        out += _tidy(coefficient) * atom
        rest = sp.expand(rest - coefficient * atom)
    return out + _tidy(rest)


@dataclass(frozen=True)
class AnomalyIntegral:
    """The orbit average of a rate and its zero-mean antiderivative over the mean anomaly.

    Attributes
    ----------
    mean:
        ``<F> = (1/2 pi) int_0^(2 pi) F dl`` (exact in ``e``).
    periodic:
        ``P`` with ``dP/dl = F - <F>`` and ``<P> = 0``, an :class:`AnomalyFunction`.
    """

    mean: sp.Expr
    periodic: AnomalyFunction


@lru_cache(maxsize=None)
def _zero_mean_integral_cached(rate: sp.Expr, v_coefficient: sp.Expr) -> AnomalyIntegral:
    w = 1 - _E * _C
    n0, n1, power, constant = _split_rate(sp.together(rate * w)) if rate != 0 else (0, 0, 0, 1)
    alpha, gamma, even_rest = _even_antiderivative(n0, power) if n0 != 0 else (0, 0, sp.S.Zero)
    mean = sp.cancel(constant * (alpha + gamma))
    odd_rational, log_coefficient = _odd_antiderivative(n1, power)
    # the even part: alpha u + gamma v - <F>(u - e sin u) = gamma (v - u) + <F> e sin u
    terms = {
        RATIONAL: constant * (even_rest + odd_rational) + mean * _E * _S,
        TRUE_MINUS_ECCENTRIC_ANOMALY: constant * gamma,
        LOG_ONE_MINUS_E_COS_U: constant * log_coefficient,
    }
    if v_coefficient != 0:
        # int (v - u) w du = -2 Re Li2 - e (v - u) sin u + root log w + e cos u
        terms[ANOMALY_DILOGARITHM] = -2 * v_coefficient
        terms[TRUE_MINUS_ECCENTRIC_ANOMALY] += -_E * _S * v_coefficient
        terms[LOG_ONE_MINUS_E_COS_U] += _B * v_coefficient
        terms[RATIONAL] += _E * _C * v_coefficient
    function = AnomalyFunction._build(terms, sp.S.Zero)
    offset = function.orbit_mean()
    function = AnomalyFunction(function.terms, _tidy_transcendental(-offset) if offset != 0 else sp.S.Zero)
    mean = tidy_eccentricity(sp.sympify(mean).subs(_B, sp.sqrt(1 - _E**2)), _E) if mean != 0 else sp.S.Zero
    return AnomalyIntegral(mean, function)


def zero_mean_integral(rate: Any, v_minus_u_coefficient: Any = 0, anomaly: sp.Symbol = u) -> AnomalyIntegral:
    """The orbit average of a rate and its zero-mean periodic antiderivative over ``l``.

    Parameters
    ----------
    rate:
        ``F(u)``: rational in ``cos(anomaly)``, ``sin(anomaly)`` with powers of ``1 - e cos u`` in
        the denominator, exact in the Keplerian ``e`` (``sqrt(1 - e^2)`` allowed) and other
        constants.
    v_minus_u_coefficient:
        A constant ``K``: ``K (v - u)`` is added to the rate (its average is zero).
    anomaly:
        The eccentric-anomaly symbol.

    Returns
    -------
    AnomalyIntegral
        ``mean = <F>`` and ``periodic = P``, ``dP/dl = F + K (v - u) - <F>``, ``<P> = 0``.

    Raises
    ------
    ValueError
        A rate of another form (a denominator that is not a power of ``1 - e cos u``).

    **Conventions**: ``l = u - e sin u`` (periastron at ``u = l = 0``); averages over one radial
    period (module docstring). The zero-mean normalisation makes the periodic part of an element
    average to zero, so that the secular part is its orbit mean.

    Example
    -------
    >>> from stfalgebra.binary.keplerian import e
    >>> result = zero_mean_integral(1 / (1 - e * sp.cos(u)))
    >>> result.mean
    1
    >>> sp.simplify(result.periodic.coefficient(TRUE_MINUS_ECCENTRIC_ANOMALY))
    0

    References
    ----------
    Derived here (module docstring); the decomposition is that of the method of variation of
    constants (e.g. Damour, Gopakumar & Iyer, Phys. Rev. D 70, 064028 (2004), Sec. III).
    """
    value = sp.cancel(sp.together(_to_working(rate, anomaly)))
    coefficient = _to_working(v_minus_u_coefficient, anomaly)
    if coefficient.has(_C) or coefficient.has(_S):
        raise ValueError(f"v_minus_u_coefficient must be free of {anomaly}, got {v_minus_u_coefficient!r}")
    return _zero_mean_integral_cached(value, sp.cancel(coefficient))
