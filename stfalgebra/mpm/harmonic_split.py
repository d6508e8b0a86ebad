"""Splitting polynomials on the sphere into harmonic (STF) pieces.

A homogeneous polynomial ``P(x)`` of degree d splits uniquely as ``sum_j r^(2j) H_(d-2j)(x)``
with ``H`` harmonic: on the unit sphere ``P(n) = sum_j H_(d-2j)(n)``, i.e. the decomposition
of a product ``n_L n_P`` (or of any angular function) into ``nhat_Q`` pieces. The harmonic
part is Thorne's formula

    H_d = sum_k (-1)^k (2d-2k-1)!!/((2d-1)!! (2k)!!) r^(2k) Laplacian^k P

(Thorne, Rev. Mod. Phys. 52, 299 (1980), eq. (2.2)); the rest is divisible by r^2.

:func:`multipolar_pieces` applies it to a :class:`~.retarded_field.RetardedField`: a term
``P r^(-n)`` of x-degree d gives pieces ``nhat_L r^(-k)`` with ``l = d - 2j`` and ``k = n - d``,
stored as ``(l, k) -> H`` with ``nhat_L H_L = H(n)``.

:func:`vector_harmonic_split` splits a vector of harmonic polynomials of one degree d into
its gradient, curl and radial parts: ``h = grad Psi + x cross grad R + (x phi - r^2 grad phi/(2d-1))``.
"""

from __future__ import annotations

from collections import defaultdict

import flint

from .coefficient_ring import GENERATOR_NAMES, RING, gens
from .retarded_field import COORDINATES, RetardedField, laplacian

__all__ = [
    "harmonic_part", "harmonic_decomposition", "homogeneous_parts", "multipolar_pieces",
    "vector_harmonic_split", "radius_squared", "x_degree",
]

_ZERO = RING.from_dict({})
_X_POSITIONS = tuple(GENERATOR_NAMES.index(name) for name in COORDINATES)


def radius_squared() -> flint.fmpq_mpoly:
    """``x1^2 + x2^2 + x3^2``."""
    g = gens()
    return g["x1"] ** 2 + g["x2"] ** 2 + g["x3"] ** 2


def _double_factorial(n: int) -> int:
    out = 1
    while n > 1:
        out *= n
        n -= 2
    return out


def x_degree(exponents: tuple[int, ...]) -> int:
    return int(sum(int(exponents[i]) for i in _X_POSITIONS))


def homogeneous_parts(poly: flint.fmpq_mpoly) -> dict[int, flint.fmpq_mpoly]:
    """Split ``poly`` by total degree in x1, x2, x3."""
    parts: dict[int, dict] = defaultdict(dict)
    for exponents, value in poly.to_dict().items():
        parts[x_degree(exponents)][exponents] = value
    return {d: RING.from_dict(terms) for d, terms in parts.items()}


def harmonic_part(poly: flint.fmpq_mpoly, degree: int) -> flint.fmpq_mpoly:
    """Return the harmonic (STF) part of a homogeneous polynomial of x-degree ``degree``.

    Example
    -------
    >>> g = gens()
    >>> str(harmonic_part(g["x1"] ** 2, 2))
    '2/3*x1^2 - 1/3*x2^2 - 1/3*x3^2'

    References
    ----------
    Thorne, Rev. Mod. Phys. 52, 299 (1980), eq. (2.2).
    """
    total = _ZERO
    term = poly
    r2 = radius_squared()
    denominator = _double_factorial(2 * degree - 1)
    for k in range(degree // 2 + 1):
        if term.is_zero():
            break
        weight = flint.fmpq((-1) ** k * _double_factorial(2 * degree - 2 * k - 1),
                            denominator * _double_factorial(2 * k))
        total += term * r2 ** k * weight
        term = laplacian(term)
    return total


def harmonic_decomposition(poly: flint.fmpq_mpoly, degree: int) -> dict[int, flint.fmpq_mpoly]:
    """Return ``{l: H_l}`` with ``poly = sum r^(degree - l) H_l``, each H_l harmonic.

    Example
    -------
    >>> g = gens()
    >>> parts = harmonic_decomposition(g["x1"] ** 2, 2)
    >>> str(parts[0]), str(parts[2])
    ('1/3', '2/3*x1^2 - 1/3*x2^2 - 1/3*x3^2')
    """
    out = {}
    r2 = radius_squared()
    rest = poly
    current = degree
    while not rest.is_zero():
        if current < 0:
            raise ArithmeticError("polynomial is not homogeneous of the stated degree")
        top = harmonic_part(rest, current)
        if not top.is_zero():
            out[current] = top
        quotient, remainder = divmod(rest - top, r2)
        if not remainder.is_zero():
            raise ArithmeticError("harmonic split failed: remainder not divisible by r^2")
        rest = quotient
        current -= 2
    return out


def multipolar_pieces(field: RetardedField) -> dict[tuple[int, int], flint.fmpq_mpoly]:
    """Split a field into pieces ``nhat_L r^(-k) F``: ``{(l, k): H}`` with ``H(n) = nhat_L H_L``.

    Example
    -------
    >>> g = gens()
    >>> one = RING.from_dict({(0,) * 11: 1})
    >>> field = RetardedField({4: g["x1"] ** 2}, g["s1"])      # n_1 n_1 r^-2
    >>> sorted(multipolar_pieces(field))
    [(0, 2), (2, 2)]
    """
    out: dict[tuple[int, int], flint.fmpq_mpoly] = {}
    for n, poly in field.terms.items():
        for d, part in homogeneous_parts(poly).items():
            for l, harmonic in harmonic_decomposition(part, d).items():
                key = (l, n - d)
                out[key] = out[key] + harmonic if key in out else harmonic
    return {key: value for key, value in out.items() if not value.is_zero()}


def vector_harmonic_split(vector: tuple[flint.fmpq_mpoly, ...], degree: int):
    """Split a vector of harmonic polynomials of degree d into (Psi, R, phi).

    ``h_i = d_i Psi + eps_iab x_a d_b R + (x_i phi - r^2 d_i phi/(2d - 1))`` with Psi, R, phi
    harmonic of degrees d + 1, d, d - 1:

    * ``phi = (2d - 1)/(d (2d + 1)) div h``;
    * ``R = -x.(curl h)/(d (d + 1))``;
    * ``Psi = (x.h - r^2 d phi/(2d - 1))/(d + 1)``.

    Returns
    -------
    tuple
        ``(Psi, R, phi)`` (ring polynomials; zero where a part is absent).

    References
    ----------
    Common practice (vector spherical harmonics as harmonic polynomials; the coefficients
    follow from Euler's identity x.grad H = l H and are checked by reconstruction in the tests).
    """
    g = gens()
    x = tuple(g[name] for name in COORDINATES)
    d = degree
    divergence = sum((vector[i].derivative(COORDINATES[i]) for i in range(3)), _ZERO)
    phi = divergence * flint.fmpq(2 * d - 1, d * (2 * d + 1)) if d > 0 else _ZERO
    curl = tuple(vector[(i + 2) % 3].derivative(COORDINATES[(i + 1) % 3])
                 - vector[(i + 1) % 3].derivative(COORDINATES[(i + 2) % 3]) for i in range(3))
    radial_curl = sum((x[i] * curl[i] for i in range(3)), _ZERO)
    rotation = radial_curl * flint.fmpq(-1, d * (d + 1)) if d > 0 else _ZERO
    radial = sum((x[i] * vector[i] for i in range(3)), _ZERO)
    gradient = (radial - radius_squared() * phi * flint.fmpq(d, 2 * d - 1)) * flint.fmpq(1, d + 1)
    return gradient, rotation, phi


def sample_harmonic(degree: int, seed: int = 0) -> flint.fmpq_mpoly:
    """Return a fixed generic harmonic polynomial of the given degree (a test tensor).

    The harmonic part of ``(a.x)^d + (b.x)^d + (c.x)^(d-1) x_3`` for fixed small integer
    vectors depending on ``seed``: generic enough that no STF contraction with another sample
    vanishes by accident (the callers check the structures they use are non-zero).

    Example
    -------
    >>> from stfalgebra.mpm.retarded_field import laplacian
    >>> laplacian(sample_harmonic(3)).is_zero()
    True
    """
    g = gens()
    x1, x2, x3 = g["x1"], g["x2"], g["x3"]
    one = RING.from_dict({(0,) * RING.nvars(): 1})
    if degree == 0:
        return one
    vectors = [(1, 2, 3), (2, -1, 1), (3, 1, -2), (-1, 3, 2), (1, -2, 4)]
    a = vectors[seed % 5]
    b = vectors[(seed + 2) % 5]
    c = vectors[(seed + 3) % 5]
    lin = [a[0] * x1 + a[1] * x2 + a[2] * x3, b[0] * x1 + b[1] * x2 + b[2] * x3,
           c[0] * x1 + c[1] * x2 + c[2] * x3]
    poly = lin[0] ** degree + 2 * lin[1] ** degree + lin[2] ** (degree - 1) * x3
    return harmonic_part(poly, degree)
