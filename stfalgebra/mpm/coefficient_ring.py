"""The exact ring in which the multipolar post-Minkowskian iteration computes.

One python-flint polynomial ring over Q holds every coefficient of the iteration:

* ``x1, x2, x3`` -- Cartesian coordinates of the field point (angular and radial structure;
  powers of r = |x| are kept beside the polynomial, see :mod:`.retarded_field`);
* ``s1, s2`` -- time derivatives acting on the first and the second moment of a quadratic
  interaction: a term ``s1^a s2^b`` stands for ``A^(a)(t - r/c) B^(b)(t - r/c)``. A time
  derivative of a product is a multiplication by the *rate* ``s1 + s2`` (``s2`` alone when the
  first moment is constant, as the mass monopole and the current dipole are);
* ``z`` -- the inverse of the rate, ``z * rate = 1``: ``z`` times a product is its integral
  over the past, ``int_0^oo dtau F(u - tau)`` (the non-linear memory); the normal form applies
  ``z * rate = 1`` (multivariate division, lexicographic order ``s1 > z > s2``, so the
  remainder is unique);
* ``lg`` -- the Fourier multiplier ``-(EulerGamma + ln(rate))``: ``lg * z * F`` is the
  hereditary logarithmic integral ``int_0^oo dtau ln(tau) F(u - tau)`` (the tails);
* ``logr``, ``logr0``, ``log2``, ``logb`` -- ln r, the logarithm of the finite-part scale r0
  of the iteration, ln 2, and the logarithm of the constant b of the radiative coordinates.

**Conventions**: G = c = 1 inside the ring (restored by dimensional analysis when the terms
are written out); the multipliers are those of a single harmonic ``exp(-i omega u)``, for which
d/du is ``-i omega`` and ``int_0^oo dtau exp(i omega tau) ln tau = (EulerGamma + ln(-i omega))/(i omega)``.

References
----------
Common practice (Fourier multipliers of hereditary integrals; Abel regularisation, as in
:mod:`stfalgebra.radiative.tails`).
"""

from __future__ import annotations

from fractions import Fraction
from functools import lru_cache

import flint

__all__ = [
    "GENERATOR_NAMES", "RING", "gens", "normal_form", "rate_polynomial", "harmonic_number",
    "substitute", "coefficient_items",
]

#: Generator names in lexicographic order (s1 > z > s2 makes s1*z the leading monomial of
#: the relation z*(s1 + s2) = 1).
GENERATOR_NAMES: tuple[str, ...] = (
    "s1", "z", "s2", "x1", "x2", "x3", "lg", "logr", "logr0", "log2", "logb",
)

RING = flint.fmpq_mpoly_ctx.get(GENERATOR_NAMES, "lex")

_INDEX = {name: position for position, name in enumerate(GENERATOR_NAMES)}


def gens() -> dict[str, flint.fmpq_mpoly]:
    """Return the generators of :data:`RING` by name.

    Example
    -------
    >>> g = gens()
    >>> str(g["s1"] * g["x1"])
    's1*x1'
    """
    return dict(zip(GENERATOR_NAMES, RING.gens()))


def rate_polynomial(first_constant: bool, second_constant: bool = False) -> flint.fmpq_mpoly:
    """Return the time derivative of a product as a polynomial: ``s1 + s2`` without constants.

    Parameters
    ----------
    first_constant, second_constant:
        Whether the first (second) moment is constant in time (mass monopole, current dipole).

    Example
    -------
    >>> str(rate_polynomial(True))
    's2'
    """
    g = gens()
    rate = RING.from_dict({})
    if not first_constant:
        rate += g["s1"]
    if not second_constant:
        rate += g["s2"]
    return rate


def normal_form(poly: flint.fmpq_mpoly, rate: flint.fmpq_mpoly) -> flint.fmpq_mpoly:
    """Reduce ``poly`` by ``z * rate = 1`` (unique remainder: one relation is a Groebner basis).

    Example
    -------
    >>> g = gens()
    >>> rate = g["s1"] + g["s2"]
    >>> str(normal_form(g["z"] * g["s1"] + g["z"] * g["s2"], rate))
    '1'
    """
    if rate.is_zero():
        if poly.degrees()[_INDEX["z"]] > 0:
            raise ValueError("a memory integral of a constant product does not converge")
        return poly
    relation = rate * gens()["z"] - 1
    if poly.degrees()[_INDEX["z"]] == 0:
        return poly
    return divmod(poly, relation)[1]


def substitute(poly: flint.fmpq_mpoly, values: dict[str, object]) -> flint.fmpq_mpoly:
    """Substitute rationals for generators (by name)."""
    return poly.subs({name: value for name, value in values.items()})


@lru_cache(maxsize=None)
def harmonic_number(n: int) -> Fraction:
    """Return H_n = 1 + 1/2 + ... + 1/n (H_0 = 0).

    Example
    -------
    >>> harmonic_number(3)
    Fraction(11, 6)
    """
    if n < 0:
        raise ValueError(f"harmonic number of a negative integer: {n}")
    return sum((Fraction(1, j) for j in range(1, n + 1)), Fraction(0))


def coefficient_items(poly: flint.fmpq_mpoly):
    """Yield ``(exponents by name, Fraction)`` for every term of ``poly``."""
    for exponents, value in poly.to_dict().items():
        named = {name: e for name, e in zip(GENERATOR_NAMES, exponents) if e}
        yield named, Fraction(int(value.p), int(value.q))
