"""The project's shared sympy symbols, one place for every layer.

Conventions (``../shared/conventions.md``): m = m1 + m2, nu = m1 m2/m^2, delta = (m1 - m2)/m,
x = (G m omega/c^3)^(2/3), gamma = G m/(r c^2); r, rdot, phi, phidot describe the relative
orbit; R is the distance to the observer, (Theta, Phi) the direction of propagation.

The symbols are made the first time one is asked for (``from stfalgebra.symbols import nu``
or ``symbols.nu``), so that importing this module does not import sympy: the exact engine's
pipeline runs without it.
"""

from __future__ import annotations

from typing import Any

__all__ = [
    "G", "c", "m", "m1", "m2", "nu", "delta", "x", "gamma", "omega",
    "r", "rdot", "phi", "phidot", "R", "Theta", "Phi", "t", "M_adm", "r0", "et", "eps", "x0",
]

# name -> (sympy name, assumptions)
_SPECIFICATIONS = {
    "G": ("G", "positive"), "c": ("c", "positive"), "m": ("m", "positive"),
    "m1": ("m1", "positive"), "m2": ("m2", "positive"), "nu": ("nu", "positive"),
    "delta": ("delta", "real"), "x": ("x", "positive"), "gamma": ("gamma", "positive"),
    "omega": ("omega", "positive"), "r": ("r", "positive"), "rdot": ("rdot", "real"),
    "phi": ("phi", "real"), "phidot": ("phidot", "real"), "R": ("R", "positive"),
    "Theta": ("Theta", "real"), "Phi": ("Phi", "real"), "t": ("t", "real"),
    "M_adm": ("M", "positive"), "r0": ("r0", "positive"), "et": ("et", "nonnegative"),
    # the reference of the phase psi = phi - 3 x^(3/2) ln(x/x0): x0 = (G m omega_0/c^3)^(2/3)
    "x0": ("x0", "positive"),
    # the expansion parameter of a PN series written as an expression: 1/c (general orbits)
    # or sqrt(x) (circular orbits)
    "eps": ("eps", "positive"),
}


def __getattr__(name: str) -> Any:
    if name not in _SPECIFICATIONS:
        raise AttributeError(f"module {__name__!r} has no attribute {name!r}")
    import sympy as sp

    sympy_name, assumption = _SPECIFICATIONS[name]
    value = sp.Symbol(sympy_name, **{assumption: True})
    globals()[name] = value
    return value


def sympy_symbols():
    """The binary's symbols as sympy objects, for formulas written once for both algebras.

    The counterpart of :func:`stfalgebra.exact.engine_symbols`: attributes ``G, m, nu,
    delta, r, rdot, phidot, omega, x, I, pi, EulerGamma`` and ``q(p, q)`` (an exact
    ``sympy.Rational``).

    Example
    -------
    >>> s = sympy_symbols()
    >>> s.q(3, 2) * s.nu / s.r**2
    3*nu/(2*r**2)
    """
    from types import SimpleNamespace

    import sympy as sp

    names = ("G", "m", "nu", "delta", "r", "rdot", "phidot", "omega", "x")
    return SimpleNamespace(I=sp.I, pi=sp.pi, EulerGamma=sp.EulerGamma, q=sp.Rational,
                           **{name: __getattr__(name) for name in names})
