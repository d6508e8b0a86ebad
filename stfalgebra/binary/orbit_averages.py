"""Exact averages over one radial period of an eccentric orbit, through the eccentric anomaly.

A time average over the radial period becomes an average over the eccentric anomaly ``u``:
``n dt = (1 - e cos u) du`` (``e = e_t`` at 1PN), so

    <F> = (1/2 pi) int_0^(2 pi) F(u) (1 - e cos u) du.

Every integrand that is polynomial in ``cos u, sin u`` with powers of ``1 - e cos u`` in the
denominators is rewritten in the two variables

    w = 1 - e cos u,        zeta = e sin u,

(``zeta^2 = e^2 - (1 - w)^2``; odd powers of ``zeta`` average to zero), which leaves a Laurent
polynomial in ``w``. The mean of ``w^(-N)`` is derived once by residues (``N = 1``) and a
recurrence in ``e`` (:func:`mean_inverse_power`); non-negative powers by the binomial theorem.
"""

from __future__ import annotations

from functools import lru_cache
from typing import Any

import sympy as sp

from .keplerian import e as kepler_eccentricity
from .keplerian import tidy_eccentricity, u, validate_eccentricity

__all__ = [
    "ONE_MINUS_E_COS_U",
    "E_SIN_U",
    "mean_inverse_power",
    "mean_power",
    "to_anomaly_variables",
    "average_anomaly_polynomial",
    "orbit_average",
]

#: ``w = 1 - e cos u``, the variable in which every average is a Laurent polynomial.
ONE_MINUS_E_COS_U = sp.Dummy("w", positive=True)
#: ``zeta = e sin u``.
E_SIN_U = sp.Dummy("zeta", real=True)

_W, _ZETA = ONE_MINUS_E_COS_U, E_SIN_U


@lru_cache(maxsize=None)
def _inverse_power_numerator(power: int) -> sp.Expr:
    """A_N(e) with (1/2 pi) int_0^(2 pi) (1 - e cos u)^(-N) du = A_N(e)/sqrt(1 - e^2).

    N = 1 by residues: with z = exp(i u) the integral is (1/2 pi i) contour integral of
    (-2/e) dz/((z - z_-)(z - z_+)), z_+- = (1 +- s)/e, s = sqrt(1 - e^2); only z_- lies inside
    the unit circle, residue (-2/e)/(z_- - z_+) = 1/s. Higher N from
    d/de (1 - e cos u)^(-N) = N cos u (1 - e cos u)^(-N-1) and e cos u = 1 - (1 - e cos u):
    I_(N+1) = I_N + (e/N) dI_N/de.
    """
    ecc = kepler_eccentricity
    if power == 1:
        s = sp.Symbol("s", positive=True)      # sqrt(1 - e^2)
        z_minus, z_plus = (1 - s) / ecc, (1 + s) / ecc
        residue = sp.cancel(sp.together((-2 / ecc) / (z_minus - z_plus)))
        return sp.cancel(residue * s)
    prev = _inverse_power_numerator(power - 1)
    # I = A (1 - e^2)^(-1/2): dI/de = (A' + e A/(1 - e^2)) (1 - e^2)^(-1/2)
    n = power - 1
    return sp.factor(sp.cancel(prev + ecc / n * (sp.diff(prev, ecc) + ecc * prev / (1 - ecc**2))))


@lru_cache(maxsize=None)
def _mean_power_raw(power: int) -> sp.Expr:
    """Mean of ``w^power`` over ``u`` in the Keplerian symbol ``e`` (any integer power)."""
    ecc = kepler_eccentricity
    if power < 0:
        return _inverse_power_numerator(-power) / sp.sqrt(1 - ecc**2)
    return sp.expand(sum(sp.binomial(power, 2 * j) * sp.binomial(2 * j, j) * (ecc / 2) ** (2 * j)
                         for j in range(power // 2 + 1)))


def _numeric_content_first(expr: sp.Expr) -> sp.Expr:
    """``P/(Q (1 - e^2)^k)`` term by term with the numeric content of ``P`` pulled out front."""
    out = []
    for term in sp.Add.make_args(expr):
        num, den = sp.fraction(term)
        content, prim = sp.factor_terms(sp.expand(num)).as_coeff_Mul()
        out.append(content * prim / den if content != 1 else term)
    return sp.Add(*out)


def mean_inverse_power(power: int, eccentricity: Any = kepler_eccentricity) -> sp.Expr:
    """Mean of ``(1 - e cos u)^(-N)`` over the eccentric anomaly, exact in ``e``.

    Parameters
    ----------
    power:
        ``N >= 1``.
    eccentricity:
        ``e`` in [0, 1) or a symbol (default the Keplerian ``e``).

    Returns
    -------
    sympy.Expr
        ``(1/2 pi) int_0^(2 pi) (1 - e cos u)^(-N) du``, a rational function of ``e`` divided
        by ``(1 - e^2)^(N - 1/2)``.

    **Conventions**: uniform measure in ``u`` (not in time: the time average of ``f`` is the
    ``u``-average of ``f (1 - e cos u)``).

    Example
    -------
    >>> mean_inverse_power(3)
    (e**2/2 + 1)/(1 - e**2)**(5/2)

    References
    ----------
    Derived here (residues for N = 1, recurrence in ``e``); equals
    ``(1 - e^2)^(-N/2) P_(N-1)(1/sqrt(1 - e^2))`` by Laplace's integral for the Legendre
    polynomials (from memory, tested).
    """
    if isinstance(power, bool) or not isinstance(power, int) or power < 1:
        raise ValueError(f"power must be an int >= 1, got {power!r}")
    ecc = validate_eccentricity(eccentricity)
    value = tidy_eccentricity(_mean_power_raw(-power), kepler_eccentricity)
    return _numeric_content_first(value).subs(kepler_eccentricity, ecc)


def mean_power(power: int, eccentricity: Any = kepler_eccentricity) -> sp.Expr:
    """Mean of ``(1 - e cos u)^p`` over the eccentric anomaly for any integer ``p``.

    Parameters
    ----------
    power:
        An integer ``p`` (negative powers through :func:`mean_inverse_power`).
    eccentricity:
        ``e`` in [0, 1) or a symbol.

    Returns
    -------
    sympy.Expr
        For ``p >= 0`` the polynomial ``sum_j binom(p, 2j) binom(2j, j) (e/2)^(2j)``.

    **Conventions**: uniform measure in ``u``.

    Example
    -------
    >>> mean_power(2)
    e**2/2 + 1

    References
    ----------
    Common practice (binomial expansion; the mean of cos^(2j) u is binom(2j, j)/4^j).
    """
    if isinstance(power, bool) or not isinstance(power, int):
        raise TypeError(f"power must be an int, got {power!r}")
    ecc = validate_eccentricity(eccentricity)
    if power < 0:
        return mean_inverse_power(-power, ecc)
    return _mean_power_raw(power).subs(kepler_eccentricity, ecc)


def to_anomaly_variables(expr: Any, eccentricity: sp.Expr, anomaly: sp.Symbol = u) -> sp.Expr:
    """Rewrite a function of ``cos u, sin u`` in ``w = 1 - e cos u`` and ``zeta = e sin u``.

    Parameters
    ----------
    expr:
        A sympy expression in ``cos(anomaly)``, ``sin(anomaly)``.
    eccentricity:
        The ``e`` of ``w`` and ``zeta`` (a symbol or a non-zero number).
    anomaly:
        The eccentric-anomaly symbol.

    Returns
    -------
    sympy.Expr
        The expression in :data:`ONE_MINUS_E_COS_U` and :data:`E_SIN_U`.

    Raises
    ------
    ValueError
        The expression depends on ``anomaly`` other than through ``cos`` and ``sin``.

    **Conventions**: ``cos u = (1 - w)/e``, ``sin u = zeta/e`` (``e != 0``).

    Example
    -------
    >>> from stfalgebra.binary.keplerian import e
    >>> to_anomaly_variables(1 - e * sp.cos(u), e) == ONE_MINUS_E_COS_U
    True

    References
    ----------
    Common practice.
    """
    value = sp.sympify(expr).subs({sp.cos(anomaly): (1 - _W) / eccentricity,
                                   sp.sin(anomaly): _ZETA / eccentricity})
    if value.has(anomaly):
        raise ValueError(f"{expr} depends on {anomaly} other than through cos and sin")
    return value


def average_anomaly_polynomial(expr: Any, eccentricity: sp.Expr) -> sp.Expr:
    """Uniform ``u``-average of a polynomial in ``zeta`` and Laurent polynomial in ``w``.

    Parameters
    ----------
    expr:
        An expression in :data:`ONE_MINUS_E_COS_U` (integer powers) and :data:`E_SIN_U`
        (non-negative integer powers) with coefficients free of both.
    eccentricity:
        The ``e`` of ``w`` and ``zeta``: a symbol, or a non-zero number.

    Returns
    -------
    sympy.Expr
        ``(1/2 pi) int_0^(2 pi) expr du`` (uniform in ``u``; multiply the integrand by ``w``
        for a time average), in the canonical form of
        :func:`~stfalgebra.binary.keplerian.tidy_eccentricity` for a symbolic ``e``.

    Raises
    ------
    ValueError
        A term that is not of that form.

    **Conventions**: ``zeta^2 = e^2 - (1 - w)^2``; odd powers of ``zeta`` are odd in ``u``.

    Example
    -------
    >>> from stfalgebra.binary.keplerian import e
    >>> average_anomaly_polynomial(E_SIN_U**2, e)
    e**2/2

    References
    ----------
    Common practice; the inverse powers from :func:`mean_inverse_power`.
    """
    ecc = eccentricity
    expr = sp.expand(expr)
    if expr.has(_ZETA):
        reduced = []
        for term in sp.Add.make_args(expr):
            coeff, power = term.as_coeff_exponent(_ZETA)
            if coeff.has(_ZETA) or not power.is_Integer or power < 0:
                raise ValueError(f"integrand is not polynomial in e sin u: {term}")
            if power % 2:
                continue   # odd in u: averages to zero
            reduced.append(coeff * (ecc**2 - (1 - _W) ** 2) ** (int(power) // 2))
        expr = sp.expand(sp.Add(*reduced))
    by_power: dict[int, list[sp.Expr]] = {}
    for term in sp.Add.make_args(expr):
        coeff, power = term.as_coeff_exponent(_W)
        if coeff.has(_W) or not power.is_Integer:
            raise ValueError(f"integrand is not a Laurent polynomial in 1 - e cos u: {term}")
        by_power.setdefault(int(power), []).append(coeff)
    total = sp.S.Zero
    for power, coeffs in by_power.items():
        total += sp.Add(*coeffs) * _mean_power_raw(power).subs(kepler_eccentricity, ecc)
    if not isinstance(ecc, sp.Symbol):
        return sp.radsimp(sp.expand(total))
    return tidy_eccentricity(total, ecc)


def orbit_average(expr: Any, eccentricity: Any = kepler_eccentricity,
                  anomaly: sp.Symbol = u) -> sp.Expr:
    """Time average over one radial period of a function of the eccentric anomaly.

    Parameters
    ----------
    expr:
        A sympy expression in ``cos(u)``, ``sin(u)`` (polynomially) and powers of
        ``(1 - e cos u)`` in denominators, with ``e`` the ``eccentricity`` symbol.
    eccentricity:
        The eccentricity entering ``n dt = (1 - e cos u) du`` (``e_t`` at 1PN); a symbol,
        or a number in [0, 1).
    anomaly:
        The eccentric-anomaly symbol (default :data:`stfalgebra.binary.keplerian.u`).

    Returns
    -------
    sympy.Expr
        ``(1/2 pi) int_0^(2 pi) expr (1 - e cos u) du``, exact, as
        ``A(e) + B(e) sqrt(1 - e^2)`` with ``A, B`` rational (see
        :func:`~stfalgebra.binary.keplerian.tidy_eccentricity`).

    Raises
    ------
    ValueError
        An integrand that is not of that form, or an eccentricity outside [0, 1).

    **Conventions**: the time average over the radial period ``P = 2 pi/n``; the mean anomaly
    ``l = u - e sin u = n (t - t_0)``.

    Example
    -------
    >>> from stfalgebra.binary.keplerian import e, u
    >>> orbit_average(sp.cos(u))
    -e/2
    >>> orbit_average(1 / (1 - e * sp.cos(u))**2)
    1/sqrt(1 - e**2)

    References
    ----------
    Common practice (averages over the Keplerian orbit; the mean of ``(1 - e cos u)^(-N)``
    from :func:`mean_inverse_power`).
    """
    ecc_value = validate_eccentricity(eccentricity)
    integrand = sp.sympify(expr)
    if isinstance(ecc_value, sp.Symbol):
        ecc = sp.Dummy("e", positive=True)
        integrand = integrand.subs(ecc_value, ecc)
    elif ecc_value.is_number:
        ecc = ecc_value
        if ecc == 0:
            # circular: the time average is the plain average of a trigonometric polynomial
            return sp.simplify(sp.integrate(sp.expand(integrand), (anomaly, 0, 2 * sp.pi)) / (2 * sp.pi))
    else:
        raise ValueError(f"eccentricity must be a symbol or a number, got {eccentricity!r}")
    result = average_anomaly_polynomial(to_anomaly_variables(integrand, ecc, anomaly) * _W, ecc)
    return result.subs(ecc, ecc_value) if isinstance(ecc_value, sp.Symbol) else result
