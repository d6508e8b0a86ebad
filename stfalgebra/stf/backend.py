"""The heavy-expansion backend switch: sympy everywhere, symengine where expansion pays.

This is the only module of the toolkit that imports symengine. Everything else calls
:func:`expand`, which returns a sympy expression in the toolkit's canonical expanded form
whichever backend did the work.

Conventions
-----------
The canonical expanded form of a coefficient is ``sympy.expand(e, power_exp=False, log=False)``:
products and integer powers of sums are multiplied out, ``exp(a + b)`` and ``log(a b)`` are left
alone (rewriting them would change coefficients, not expand them). symengine is used only for
expressions built from symbols, rational numbers, the constants ``pi`` and ``E`` and integer or
rational powers: there the two backends give the same structure (checked in the tests). For
anything else (functions such as ``sin`` or ``log``) sympy does the work.

symengine drops sympy's assumptions on symbols (``real=True`` and so on); the results are
mapped back to the caller's own symbols by name, so an expanded result contains exactly the
symbols of the input.
"""

from __future__ import annotations

import contextlib
from typing import Iterator

import sympy as sp

try:  # symengine is optional (extra "stf-speed"); the sympy path is the reference
    import symengine as _symengine
except ImportError:  # pragma: no cover - exercised only on machines without symengine
    _symengine = None

__all__ = ["expand", "available_backends", "get_backend", "set_backend", "using_backend"]

_BACKENDS = ("sympy", "symengine")
_state = {"backend": "symengine" if _symengine is not None else "sympy"}

# Below this many expression nodes the conversion round trip costs more than sympy's expand.
_SYMENGINE_MIN_NODES = 12


def available_backends() -> tuple[str, ...]:
    """Names of the expansion backends usable on this machine.

    Returns
    -------
    tuple[str, ...]
        ``("sympy", "symengine")`` or ``("sympy",)`` when symengine is not installed.

    Conventions
    -----------
    "sympy" is always available and is the reference.

    Examples
    --------
    >>> "sympy" in available_backends()
    True

    References
    ----------
    None (software switch).
    """
    return _BACKENDS if _symengine is not None else ("sympy",)


def get_backend() -> str:
    """Name of the backend :func:`expand` uses for large polynomial expressions.

    Returns
    -------
    str
        ``"symengine"`` (default when installed) or ``"sympy"``.

    Conventions
    -----------
    The choice never changes results, only the time taken.

    Examples
    --------
    >>> get_backend() in available_backends()
    True

    References
    ----------
    None (software switch).
    """
    return _state["backend"]


def set_backend(name: str) -> None:
    """Choose the expansion backend.

    Parameters
    ----------
    name : str
        ``"sympy"`` or ``"symengine"``.

    Raises
    ------
    TypeError
        If ``name`` is not a string.
    ValueError
        If ``name`` is not a backend available on this machine.

    Conventions
    -----------
    Process-wide; prefer :func:`using_backend` for a temporary switch.

    Examples
    --------
    >>> previous = get_backend()
    >>> set_backend("sympy"); get_backend()
    'sympy'
    >>> set_backend(previous)

    References
    ----------
    None (software switch).
    """
    if not isinstance(name, str):
        raise TypeError(f"backend name must be a string, got {name!r}")
    if name not in available_backends():
        raise ValueError(f"unknown or unavailable backend {name!r}; available: {available_backends()}")
    _state["backend"] = name


@contextlib.contextmanager
def using_backend(name: str) -> Iterator[None]:
    """Context manager running its body with backend ``name``, then restoring the previous one.

    Parameters
    ----------
    name : str
        ``"sympy"`` or ``"symengine"``.

    Conventions
    -----------
    Restores the previous backend even if the body raises.

    Examples
    --------
    >>> with using_backend("sympy"):
    ...     get_backend()
    'sympy'

    References
    ----------
    None (software switch).
    """
    previous = get_backend()
    set_backend(name)
    try:
        yield
    finally:
        _state["backend"] = previous


_POLYNOMIAL_ATOMS = (sp.Symbol, sp.Rational, sp.core.numbers.Pi, sp.core.numbers.Exp1)


def _plain_polynomial_size(expression: sp.Expr) -> int:
    """Node count if ``expression`` is built from symbols, rationals, pi, E, +, * and rational
    powers only; -1 otherwise."""
    count = 0
    for node in sp.preorder_traversal(expression):
        count += 1
        if isinstance(node, (sp.Add, sp.Mul)) or isinstance(node, _POLYNOMIAL_ATOMS):
            continue
        if isinstance(node, sp.Pow) and node.exp.is_Rational:
            continue
        return -1
    return count


def _sympy_expand(expression: sp.Expr) -> sp.Expr:
    return sp.expand(expression, power_exp=False, log=False)


def expand(expression: object) -> sp.Expr:
    """Expand products and integer powers of sums, in the toolkit's canonical form.

    Parameters
    ----------
    expression : sympy.Expr or number
        The expression to expand.

    Returns
    -------
    sympy.Expr
        ``sympy.expand(expression, power_exp=False, log=False)``, computed by the active
        backend when that pays (large polynomial expressions) and by sympy otherwise.

    Raises
    ------
    TypeError
        If ``expression`` is not a sympy expression or number (strings are refused).

    Conventions
    -----------
    Symbols in the result are the caller's own (assumptions kept), whatever the backend.

    Examples
    --------
    >>> a, b = sp.symbols("a b", real=True)
    >>> expand((a + b)**2)
    a**2 + 2*a*b + b**2

    References
    ----------
    None (sympy and symengine expansion).
    """
    try:
        value = sp.sympify(expression, strict=True)
    except sp.SympifyError as exc:
        raise TypeError(f"expected a sympy expression, got {expression!r}") from exc
    if value.is_Atom:
        return value
    if _state["backend"] == "symengine" and _plain_polynomial_size(value) >= _SYMENGINE_MIN_NODES:
        return _symengine_expand(value)
    return _sympy_expand(value)


def _symengine_expand(value: sp.Expr) -> sp.Expr:
    by_name = {symbol.name: symbol for symbol in value.free_symbols}
    if len(by_name) != len(value.free_symbols):
        # two distinct symbols share a name (different assumptions): mapping back by name
        # would merge them, so stay with sympy
        return _sympy_expand(value)
    try:
        result = sp.sympify(_symengine.expand(_symengine.sympify(value)))
    except Exception:  # pragma: no cover - any conversion gap falls back to the reference
        return _sympy_expand(value)
    replacements = {
        symbol: by_name[symbol.name]
        for symbol in result.free_symbols
        if symbol.name in by_name and symbol is not by_name[symbol.name]
    }
    return result.xreplace(replacements) if replacements else result
