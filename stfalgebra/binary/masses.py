"""Mass parameters of a two-body system: m, nu, delta and the canonical delta^2 -> 1 - 4 nu form.

Conventions (``../shared/conventions.md``): m = m1 + m2, nu = m1 m2/m^2,
delta = (m1 - m2)/m, so that delta^2 = 1 - 4 nu and X_A = m_A/m = (1 +- delta)/2.
"""

from __future__ import annotations

from typing import Any

import sympy as sp

from ..scalars import as_scalar_expression

from stfalgebra.symbols import delta, m, nu

__all__ = [
    "individual_masses",
    "mass_fractions",
    "symmetric_mass_ratio",
    "mass_difference_ratio",
    "validate_nu",
    "reduce_mass_difference",
]


def _exact_mass(value: Any, name: str) -> sp.Expr:
    expr = as_scalar_expression(value, name)
    if expr.is_number and expr.is_real is not False and not expr.is_positive:
        raise ValueError(f"{name} must be positive, got {value!r}")
    if expr.is_number and expr.is_real is False:
        raise ValueError(f"{name} must be real and positive, got {value!r}")
    return expr


def individual_masses() -> tuple[sp.Expr, sp.Expr]:
    """The component masses in terms of the total mass and the mass difference ratio.

    Returns
    -------
    tuple of sympy.Expr
        ``(m1, m2) = (m (1 + delta)/2, m (1 - delta)/2)``.

    **Conventions**: ``delta = (m1 - m2)/m``, body 1 the heavier for ``delta > 0``.

    Example
    -------
    >>> individual_masses()
    (m*(delta + 1)/2, m*(1 - delta)/2)

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), mass parameters (common practice).
    """
    return m * (1 + delta) / 2, m * (1 - delta) / 2


def mass_fractions() -> tuple[sp.Expr, sp.Expr]:
    """The mass fractions ``(X1, X2) = (m1/m, m2/m) = ((1 + delta)/2, (1 - delta)/2)``.

    Returns
    -------
    tuple of sympy.Expr

    **Conventions**: as :func:`individual_masses`.

    Example
    -------
    >>> mass_fractions()
    (delta/2 + 1/2, 1/2 - delta/2)

    References
    ----------
    Common practice.
    """
    return (1 + delta) / 2, (1 - delta) / 2


def symmetric_mass_ratio(m1: Any, m2: Any) -> sp.Expr:
    """The symmetric mass ratio ``nu = m1 m2/(m1 + m2)^2``.

    Parameters
    ----------
    m1, m2:
        Component masses (positive numbers or sympy expressions).

    Returns
    -------
    sympy.Expr
        ``m1 m2/(m1 + m2)^2``, in (0, 1/4] for positive masses.

    **Conventions**: ``nu = 1/4`` for equal masses, ``nu -> 0`` in the test-mass limit.

    Example
    -------
    >>> symmetric_mass_ratio(1, 3)
    3/16

    References
    ----------
    Common practice.
    """
    a, b = _exact_mass(m1, "m1"), _exact_mass(m2, "m2")
    return a * b / (a + b) ** 2


def mass_difference_ratio(m1: Any, m2: Any) -> sp.Expr:
    """The mass difference ratio ``delta = (m1 - m2)/(m1 + m2)``.

    Parameters
    ----------
    m1, m2:
        Component masses (positive numbers or sympy expressions).

    Returns
    -------
    sympy.Expr

    **Conventions**: ``delta^2 = 1 - 4 nu``; the sign follows the labelling of the bodies.

    Example
    -------
    >>> mass_difference_ratio(3, 1)
    1/2

    References
    ----------
    Common practice.
    """
    a, b = _exact_mass(m1, "m1"), _exact_mass(m2, "m2")
    return (a - b) / (a + b)


def validate_nu(value: Any) -> sp.Expr:
    """Check a symmetric mass ratio: numeric values must lie in (0, 1/4]; symbols pass.

    Parameters
    ----------
    value:
        A number (exact or float) or a sympy expression.

    Returns
    -------
    sympy.Expr
        The value, sympified.

    Raises
    ------
    ValueError
        A numeric value outside (0, 1/4] (the message names it).
    TypeError
        Not a number or expression.

    **Conventions**: ``nu = m1 m2/m^2``.

    Example
    -------
    >>> validate_nu(sp.Rational(1, 4))
    1/4
    >>> validate_nu(0.3)
    Traceback (most recent call last):
    ...
    ValueError: nu must lie in (0, 1/4], got 0.3

    References
    ----------
    Common practice.
    """
    if isinstance(value, bool):
        raise TypeError(f"nu must be a number or sympy expression, got {value!r}")
    try:
        expr = sp.sympify(value, strict=True)
    except (sp.SympifyError, TypeError) as exc:
        raise TypeError(f"nu must be a number or sympy expression, got {value!r}") from exc
    if not isinstance(expr, sp.Expr):
        raise TypeError(f"nu must be a number or sympy expression, got {value!r}")
    if expr.is_number:
        if expr.is_real is not True or not (expr > 0 and expr <= sp.Rational(1, 4)):
            raise ValueError(f"nu must lie in (0, 1/4], got {value!r}")
    return expr


def reduce_mass_difference(expr: Any) -> sp.Expr:
    """Canonical form: every ``delta^2`` replaced by ``1 - 4 nu``, the result expanded.

    ``delta^(2k) -> (1 - 4 nu)^k`` and ``delta^(2k+1) -> delta (1 - 4 nu)^k``, so the output is
    at most linear in ``delta``. Expressions rational in ``delta`` are reduced in numerator and
    denominator separately.

    Parameters
    ----------
    expr:
        A sympy expression polynomial (or rational) in the shared symbol ``delta``.

    Returns
    -------
    sympy.Expr
        The expanded canonical form (linear in ``delta``).

    Raises
    ------
    ValueError
        ``delta`` inside a function (``log(delta)``, ``sqrt(delta)``).

    **Conventions**: ``delta^2 = 1 - 4 nu`` (``delta = (m1 - m2)/m``); the CLI's JSON output
    promises this form.

    Example
    -------
    >>> from stfalgebra.symbols import delta, nu
    >>> reduce_mass_difference(delta**3 + delta**2)
    -4*delta*nu + delta - 4*nu + 1

    References
    ----------
    Common practice (the identity follows from the definitions of nu and delta).
    """
    expr = sp.sympify(expr)
    if not isinstance(expr, sp.Expr):
        raise TypeError(f"expected a sympy expression, got {expr!r}")
    if not expr.has(delta):
        return sp.expand(expr)
    reduced = _reduce_by_division(expr)
    if reduced is not None:
        return reduced
    reduced = _reduce_polynomial(expr)
    if reduced is not None:
        return reduced
    num, den = sp.fraction(sp.together(expr))
    rnum, rden = _reduce_polynomial(num), _reduce_polynomial(den)
    if rnum is None or rden is None:
        raise ValueError(f"delta must occur polynomially or rationally, got {expr}")
    return rnum / rden


def _reduce_by_division(expr: sp.Expr) -> sp.Expr | None:
    """Fast path: remainder of the division by delta^2 - (1 - 4 nu) as polynomials in every
    free symbol; None if ``expr`` is not such a polynomial."""
    others = sorted(expr.free_symbols - {delta, nu}, key=sp.default_sort_key)
    gens = (delta, nu, *others)
    try:
        poly = sp.Poly(expr, *gens)
    except sp.PolynomialError:
        return None
    remainder = poly.rem(sp.Poly(delta**2 + 4 * nu - 1, *gens)).as_expr()
    return remainder if poly.domain.is_Numerical else sp.expand(remainder)


def _reduce_polynomial(expr: sp.Expr) -> sp.Expr | None:
    """Reduce an expression polynomial in delta; None if delta is not polynomial in it."""
    expanded = sp.expand(expr)
    even: dict[int, list[sp.Expr]] = {}
    odd: dict[int, list[sp.Expr]] = {}
    for term in sp.Add.make_args(expanded):
        coeff, power = term.as_coeff_exponent(delta)
        if coeff.has(delta) or not power.is_Integer or power < 0:
            return None
        k, parity = divmod(int(power), 2)
        (odd if parity else even).setdefault(k, []).append(coeff)
    base = 1 - 4 * nu
    pieces = []
    for table, factor in ((even, sp.S.One), (odd, delta)):
        for k, coeffs in table.items():
            pieces.append(factor * sp.Add(*coeffs) * sp.expand(base**k))
    return sp.expand(sp.Add(*pieces))
