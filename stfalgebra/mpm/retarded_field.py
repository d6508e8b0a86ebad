"""Fields of retarded multipolar waves: sums of ``P(x) r^(-n) F(t - r/c)``.

A :class:`RetardedField` is a finite sum ``sum_n P_n(x) r^(-n)`` in which each ``P_n`` is a
polynomial of :data:`~stfalgebra.mpm.coefficient_ring.RING` in the coordinates ``x1, x2, x3``
and the derivative markers ``s1, s2``: the monomial ``s1^a s2^b`` stands for the product
``A^(a)(t - r) B^(b)(t - r)`` of the two moments of an interaction (one of them for a linear
field). Every function of time is evaluated at the retarded time ``t - r`` (c = 1), so

* ``d/dt`` multiplies by the field's *rate* (``s1``, ``s2`` or ``s1 + s2``);
* ``d/dx_k [P r^(-n) F(t - r)] = (dP/dx_k) r^(-n) - n x_k P r^(-n-2) - rate x_k P r^(-n-1)``.

The representation is not unique (``x.x = r^2``); :meth:`RetardedField.is_zero` decides
equality exactly by collecting the terms of each parity of ``n`` over a common power of r.

:func:`multipole_wave` builds the retarded homogeneous solution ``d_L [H_L G(t - r)/r]`` from
the closed form ``d_L[G(t - r)/r] = (-1)^l nhat_L sum_j (l+j)!/(2^j j!(l-j)!) G^(l-j)/r^(j+1)``
(Blanchet & Damour, Phil. Trans. R. Soc. A 320, 379 (1986); from memory: the tests check it
against repeated differentiation).

**Conventions**: c = 1, ``x^0 = t``, signature (-, +, +, +); a harmonic polynomial
``H(x) = H_L x_L`` stands for the STF tensor ``H_L``.
"""

from __future__ import annotations

from math import factorial

import flint

from .coefficient_ring import RING, gens

__all__ = ["RetardedField", "multipole_wave", "laplacian", "COORDINATES"]

COORDINATES = ("x1", "x2", "x3")
_ZERO = RING.from_dict({})


def laplacian(poly: flint.fmpq_mpoly) -> flint.fmpq_mpoly:
    """Return the flat Laplacian of ``poly`` in x1, x2, x3.

    Example
    -------
    >>> g = gens()
    >>> str(laplacian(g["x1"] ** 2 - g["x2"] ** 2))
    '0'
    """
    return sum((poly.derivative(name).derivative(name) for name in COORDINATES), _ZERO)


class RetardedField:
    """A sum ``sum_n P_n(x) r^(-n)`` of retarded multipolar terms with a common rate.

    Parameters
    ----------
    terms:
        Map ``n -> P_n`` (ring polynomials); zero polynomials are dropped.
    rate:
        The polynomial by which ``d/dt`` multiplies (``s1``, ``s2``, ``s1 + s2`` or 0).

    Example
    -------
    >>> g = gens()
    >>> wave = RetardedField({1: RING.from_dict({(0,) * 11: 1})}, g["s1"])    # F(t - r)/r
    >>> RetardedField.dalembertian(wave).is_zero()
    True
    """

    __slots__ = ("terms", "rate")

    def __init__(self, terms: dict[int, flint.fmpq_mpoly], rate: flint.fmpq_mpoly) -> None:
        self.terms = {n: p for n, p in terms.items() if not p.is_zero()}
        self.rate = rate

    # -- construction -----------------------------------------------------------------
    @classmethod
    def zero(cls, rate: flint.fmpq_mpoly) -> "RetardedField":
        return cls({}, rate)

    # -- algebra ------------------------------------------------------------------------
    def __add__(self, other: "RetardedField") -> "RetardedField":
        out = dict(self.terms)
        for n, p in other.terms.items():
            out[n] = out[n] + p if n in out else p
        return RetardedField(out, self.rate if not self.rate.is_zero() else other.rate)

    def __sub__(self, other: "RetardedField") -> "RetardedField":
        return self + other.scale(-1)

    def __neg__(self) -> "RetardedField":
        return self.scale(-1)

    def scale(self, factor) -> "RetardedField":
        """Multiply by a rational or a ring polynomial free of x."""
        return RetardedField({n: p * factor for n, p in self.terms.items()}, self.rate)

    def times(self, other: "RetardedField") -> "RetardedField":
        """The product of two fields of different moments: the rates add."""
        out: dict[int, flint.fmpq_mpoly] = {}
        for n1, p1 in self.terms.items():
            for n2, p2 in other.terms.items():
                n = n1 + n2
                product = p1 * p2
                out[n] = out[n] + product if n in out else product
        return RetardedField(out, self.rate + other.rate)

    def shift_radius(self, power: int) -> "RetardedField":
        """Multiply by ``r^(-power)``."""
        return RetardedField({n + power: p for n, p in self.terms.items()}, self.rate)

    def times_polynomial(self, poly: flint.fmpq_mpoly) -> "RetardedField":
        """Multiply every term by a polynomial (in x or in the markers)."""
        return RetardedField({n: p * poly for n, p in self.terms.items()}, self.rate)

    # -- derivatives --------------------------------------------------------------------
    def time_derivative(self) -> "RetardedField":
        return RetardedField({n: p * self.rate for n, p in self.terms.items()}, self.rate)

    def space_derivative(self, k: int) -> "RetardedField":
        """``d/dx_k``, k in 1..3."""
        name = COORDINATES[k - 1]
        coordinate = gens()[name]
        out: dict[int, flint.fmpq_mpoly] = {}

        def add(n: int, p: flint.fmpq_mpoly) -> None:
            out[n] = out[n] + p if n in out else p

        for n, p in self.terms.items():
            add(n, p.derivative(name))
            if n:
                add(n + 2, -n * coordinate * p)
            if not self.rate.is_zero():
                add(n + 1, -(coordinate * p * self.rate))
        return RetardedField(out, self.rate)

    def derivative(self, mu: int) -> "RetardedField":
        """``d/dx^mu`` with ``x^0 = t``."""
        return self.time_derivative() if mu == 0 else self.space_derivative(mu)

    def dalembertian(self) -> "RetardedField":
        """``Box = -d_t^2 + Laplacian``."""
        total = self.time_derivative().time_derivative().scale(-1)
        for k in (1, 2, 3):
            total = total + self.space_derivative(k).space_derivative(k)
        return total

    # -- tests --------------------------------------------------------------------------
    def is_zero(self) -> bool:
        """Exact test: the terms of each parity of n over a common power of r^2 cancel."""
        radius_squared = sum((gens()[name] ** 2 for name in COORDINATES), _ZERO)
        for parity in (0, 1):
            powers = [n for n in self.terms if n % 2 == parity]
            if not powers:
                continue
            top = max(powers)
            total = sum((self.terms[n] * radius_squared ** ((top - n) // 2) for n in powers), _ZERO)
            if not total.is_zero():
                return False
        return True

    def __repr__(self) -> str:
        body = " + ".join(f"({p}) r^-{n}" for n, p in sorted(self.terms.items()))
        return f"RetardedField({body or '0'})"


def multipole_wave(harmonic: flint.fmpq_mpoly, l: int, time_factor: flint.fmpq_mpoly,
                   rate: flint.fmpq_mpoly) -> RetardedField:
    """Return ``d_L [H_L G(t - r)/r]`` for a harmonic polynomial ``H(x) = H_L x_L`` of degree l.

    Parameters
    ----------
    harmonic:
        Harmonic homogeneous polynomial of degree ``l`` in x1, x2, x3 (its STF tensor H_L).
    l:
        The degree.
    time_factor:
        The marker polynomial of G (e.g. ``s1**2`` for ``A^(2)``).
    rate:
        The rate of the field.

    Returns
    -------
    RetardedField
        ``(-1)^l H(x) r^(-l) sum_j (l+j)!/(2^j j!(l-j)!) rate^(l-j) G r^(-j-1)``.

    Example
    -------
    >>> g = gens()
    >>> wave = multipole_wave(g["x3"], 1, g["s1"] ** 0, g["s1"])       # d_3 [F/r]
    >>> wave.dalembertian().is_zero()
    True

    References
    ----------
    Blanchet & Damour, Phil. Trans. R. Soc. A 320, 379 (1986) (from memory; tested against
    direct differentiation).
    """
    sign = -1 if l % 2 else 1
    out = {}
    for j in range(l + 1):
        weight = factorial(l + j) // (2 ** j * factorial(j) * factorial(l - j))
        out[l + j + 1] = harmonic * time_factor * rate ** (l - j) * (sign * weight)
    return RetardedField(out, rate)
