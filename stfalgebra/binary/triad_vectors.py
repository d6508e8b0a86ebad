"""Three-vectors on a right-handed orthonormal triad, with entries from any exact or numeric algebra.

The cited vector formulas of the spinning dynamics (:mod:`stfalgebra.binary.spin_orbit_inputs`)
are written once against a namespace that provides ``cross`` and ``dot``. This module provides
that vector algebra for entries that are exact-engine polynomials, sympy expressions or floats:
:class:`TriadVector` holds the three components on a triad ``(e_1, e_2, e_3)`` with
``e_1 x e_2 = e_3`` (cyclic), so the same code serves the moving polar triad
``(n, lambda, e_z)`` of a planar orbit (``lambda = e_z x n``) and a fixed Cartesian frame.

Example
-------
>>> from fractions import Fraction
>>> n, lam, ez = TriadVector.basis()
>>> cross(n, lam) == ez, cross(lam, ez) == n, dot(n + lam, n - lam)
(True, True, 0)
"""

from __future__ import annotations

from typing import Any

__all__ = ["TriadVector", "cross", "dot"]


class TriadVector:
    """A vector ``a_1 e_1 + a_2 e_2 + a_3 e_3`` on a right-handed orthonormal triad.

    Parameters
    ----------
    a1, a2, a3:
        Components; any objects closed under ``+``, ``-``, ``*`` (engine polynomials, sympy
        expressions, Fractions, floats).

    **Conventions**: ``e_1 x e_2 = e_3``, ``e_2 x e_3 = e_1``, ``e_3 x e_1 = e_2``.

    Example
    -------
    >>> v = TriadVector(1, 2, 3)
    >>> 2 * v - v
    TriadVector(1, 2, 3)
    """

    __slots__ = ("components",)

    def __init__(self, a1: Any, a2: Any, a3: Any) -> None:
        self.components = (a1, a2, a3)

    @classmethod
    def basis(cls) -> tuple["TriadVector", "TriadVector", "TriadVector"]:
        """``(e_1, e_2, e_3)`` with integer components."""
        return cls(1, 0, 0), cls(0, 1, 0), cls(0, 0, 1)

    def __add__(self, other: "TriadVector") -> "TriadVector":
        if not isinstance(other, TriadVector):
            return NotImplemented
        return TriadVector(*(a + b for a, b in zip(self.components, other.components)))

    def __sub__(self, other: "TriadVector") -> "TriadVector":
        if not isinstance(other, TriadVector):
            return NotImplemented
        return TriadVector(*(a - b for a, b in zip(self.components, other.components)))

    def __neg__(self) -> "TriadVector":
        return TriadVector(*(-a for a in self.components))

    def __mul__(self, scalar: Any) -> "TriadVector":
        if isinstance(scalar, TriadVector):
            return NotImplemented
        return TriadVector(*(a * scalar for a in self.components))

    def __rmul__(self, scalar: Any) -> "TriadVector":
        if isinstance(scalar, TriadVector):
            return NotImplemented
        return TriadVector(*(scalar * a for a in self.components))

    def __eq__(self, other: object) -> bool:
        return isinstance(other, TriadVector) and all(a == b for a, b in zip(self.components, other.components))

    def __hash__(self) -> int:
        return hash(self.components)

    def __repr__(self) -> str:
        return "TriadVector(" + ", ".join(map(str, self.components)) + ")"


def cross(a: TriadVector, b: TriadVector) -> TriadVector:
    """``a x b`` on the right-handed triad."""
    a1, a2, a3 = a.components
    b1, b2, b3 = b.components
    return TriadVector(a2 * b3 - a3 * b2, a3 * b1 - a1 * b3, a1 * b2 - a2 * b1)


def dot(a: TriadVector, b: TriadVector) -> Any:
    """``a . b`` (orthonormal triad)."""
    a1, a2, a3 = a.components
    b1, b2, b3 = b.components
    return a1 * b1 + a2 * b2 + a3 * b3
