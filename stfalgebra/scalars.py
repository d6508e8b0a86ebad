"""Turning user-supplied scalars into sympy expressions, with one error wording everywhere."""

from __future__ import annotations

from typing import Any

import sympy as sp

__all__ = ["as_scalar_expression"]


def as_scalar_expression(value: Any, name: str, *, exact: bool = False) -> sp.Expr:
    """Sympify ``value`` strictly (no string parsing), refusing booleans, non-expressions and,
    with ``exact=True``, floats.

    >>> as_scalar_expression(3, "m1")
    3
    >>> as_scalar_expression(0.5, "coefficient", exact=True)
    Traceback (most recent call last):
    ...
    TypeError: coefficient must be exact (no floats), got 0.5
    """
    if isinstance(value, bool) or (exact and isinstance(value, float)):
        kind = "exact (no floats)" if exact else "a number or sympy expression"
        raise TypeError(f"{name} must be {kind}, got {value!r}")
    try:
        expr = sp.sympify(value, strict=True)
    except (sp.SympifyError, TypeError) as exc:
        raise TypeError(f"{name} must be a number or sympy expression, got {value!r}") from exc
    if not isinstance(expr, sp.Expr):
        raise TypeError(f"{name} must be a number or sympy expression, got {value!r}")
    if exact and expr.has(sp.Float):
        raise TypeError(f"{name} must be exact (no floats), got {expr}")
    return expr
