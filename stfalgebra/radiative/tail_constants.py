"""The constants kappa_l and pi_l of the tail integrals: a cited input, exact.

The radiative moments carry, at relative 1.5PN, the hereditary tails

    U_L ~ (2 G M/c^3) int_0^oo dtau I_L^(l+2)(t - tau) [ln(c tau/(2 r0)) + kappa_l],
    V_L ~ (2 G M/c^3) int_0^oo dtau J_L^(l+2)(t - tau) [ln(c tau/(2 r0)) + pi_l],

with ``kappa_l = (2 l^2 + 5 l + 4)/(l (l+1) (l+2)) + H_(l-2)`` and
``pi_l = (l - 1)/(l (l+1)) + H_(l-1)``, ``H_k`` the k-th harmonic number. They are inputs (the
MPM iteration that produces them is a later issue), written once here with exact rationals so
that both the sympy derivations (:mod:`stfalgebra.radiative.tails`) and the exact engine's tail
evaluator use the same numbers.
"""

from __future__ import annotations

from fractions import Fraction

__all__ = ["TAIL_CONSTANTS_SOURCE", "tail_constant_exact"]

#: Where the tail constants come from.
TAIL_CONSTANTS_SOURCE = (
    "kappa_l = (2 l^2 + 5 l + 4)/(l (l+1) (l+2)) + H_(l-2), pi_l = (l - 1)/(l (l+1)) + H_(l-1): "
    "Blanchet & Damour, Phys. Rev. D 46, 4304 (1992); Blanchet, Living Rev. Relativ. 17, 2 "
    "(2014), sec. 3 (from memory)"
)


def _harmonic_number(k: int) -> Fraction:
    return sum((Fraction(1, j) for j in range(1, k + 1)), Fraction(0))


def tail_constant_exact(l: int, kind: str) -> Fraction:
    """kappa_l (``kind="mass"``) or pi_l (``kind="current"``) as an exact Fraction.

    Example
    -------
    >>> tail_constant_exact(2, "mass"), tail_constant_exact(2, "current")
    (Fraction(11, 12), Fraction(7, 6))

    References
    ----------
    :data:`TAIL_CONSTANTS_SOURCE`.
    """
    if kind == "mass":
        return Fraction(2 * l**2 + 5 * l + 4, l * (l + 1) * (l + 2)) + _harmonic_number(l - 2)
    if kind == "current":
        return Fraction(l - 1, l * (l + 1)) + _harmonic_number(l - 1)
    raise ValueError(f"kind must be 'mass' or 'current', got {kind!r}")
