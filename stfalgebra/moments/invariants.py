"""Calculus on the scalar invariants of the two-body vectors, for finite-part integrals.

The non-compact terms of the 2PN source moments are finite-part integrals of products of
potentials of two point masses. Integrated against the STF polynomial xhat_L, each is a function
of five vectors only: the probe k (the contraction partner of the STF indices, so that
xhat_L k_L is the moment's probe polynomial), the body positions y1, y2 and the velocities
v1, v2. Such a function is held here as a polynomial, over the rationals, in

* the fifteen dot products of (k, y1, y2, v1, v2) (``kk`` = k.k, ``ky1`` = k.y1, ...,
  ``v2v2`` = v2.v2), and
* ``r12`` = |y1 - y2| and ``ir12`` = 1/r12 (kept as two generators: derivatives of r12 bring
  its inverse powers, and the pair is resolved when the result is put on an orbit),

in a sympy polynomial ring (fast exact arithmetic, no expression trees). The operators are the
derivatives the integrals need:

* the directional derivative (w.grad_A) along a base vector w, with respect to y1, y2 or k;
* the mixed Laplacian grad_A . grad_B f (A, B among y1, y2, k);
* contractions with the gradient in k of the *harmonic extension* H[f] of a probe polynomial
  (its STF part): an STF tensor is fixed by its polynomial on the null cone k.k = 0, but a
  free index of xhat_{iL} contracted with a vector or a body gradient needs H[f] off the cone.
  With f homogeneous of degree n in k, H[f] = f - k.k Delta_k f/(2(2n-1))
  + (k.k)^2 Delta_k^2 f/(8(2n-1)(2n-3)) - ... (Thorne 1980, Rev. Mod. Phys. 52, 299,
  eq. (2.2): the trace-removal series), so that on the null cone
  grad_k H = grad_k f - k Delta_k f/(2n-1) and
  d_i d_j H = d_ij f - (delta_ij Delta f + k_i d_j Delta f + k_j d_i Delta f)/(2n-1)
  + k_i k_j Delta^2 f/((2n-1)(2n-3)) (derived from the series; tested against the STF core).

**Conventions**: flat Euclidean 3-space; y_A the body positions (harmonic coordinates), v_A
their velocities; derivatives with respect to the body positions (a function of x - y_A has
d/dy_A = -d/dx).

Example
-------
>>> from stfalgebra.moments.invariants import dot, mixed_laplacian, R12
>>> mixed_laplacian(R12, "y1", "y1")   # Delta_{y1} r12 = 3/r12 - r12^2/r12^3 = 2/r12
-y1y1*ir12**3 + 2*y1y2*ir12**3 - y2y2*ir12**3 + 3*ir12
>>> mixed_laplacian(dot("k", "y1")**2, "y1", "y1")
2*kk

References
----------
K. S. Thorne, Rev. Mod. Phys. 52, 299 (1980), Sec. II (STF tensors, eq. (2.2)).
"""

from __future__ import annotations

from functools import lru_cache
from typing import Mapping

import sympy as sp

__all__ = [
    "VECTORS", "VARIABLES", "RING", "R12", "INV_R12", "dot", "gradient", "directional_derivative",
    "mixed_laplacian", "harmonic_gradient_along", "harmonic_divergence",
    "harmonic_double_divergence", "on_null_cone", "probe_curl", "evaluate",
]

#: The vectors the invariants are built from: probe, positions, velocities.
VECTORS = ("k", "y1", "y2", "v1", "v2")
#: The vectors one can differentiate with respect to.
VARIABLES = ("k", "y1", "y2")


def _pair_name(a: str, b: str) -> str:
    a, b = sorted((a, b), key=VECTORS.index)
    return a + b


_PAIRS = [(a, b) for i, a in enumerate(VECTORS) for b in VECTORS[i:]]
_NAMES = [_pair_name(a, b) for a, b in _PAIRS] + ["r12", "ir12"]
RING, *_GENERATORS = sp.ring(_NAMES, sp.QQ)
_DOT = {}
for (_a, _b), _g in zip(_PAIRS, _GENERATORS):
    _DOT[(_a, _b)] = _DOT[(_b, _a)] = _g
#: r12 = |y1 - y2| and its inverse, as ring generators.
R12, INV_R12 = _GENERATORS[-2], _GENERATORS[-1]
_INDEX = {g: i for i, g in enumerate(_GENERATORS)}

#: A vector-valued linear form: {base vector name: ring coefficient}.
VectorForm = Mapping[str, object]


def dot(a: str, b: str):
    """The ring generator a.b for two of :data:`VECTORS`."""
    if a not in VECTORS or b not in VECTORS:
        raise ValueError(f"vectors must be among {VECTORS}, got {a!r}, {b!r}")
    return _DOT[(a, b)]


def _check_variable(name: str) -> None:
    if name not in VARIABLES:
        raise ValueError(f"can differentiate with respect to {VARIABLES} only, got {name!r}")


@lru_cache(maxsize=None)
def _generator_gradient(index: int, variable: str) -> tuple[tuple[str, object], ...]:
    """grad_variable of one generator, as ((base vector, coefficient), ...)."""
    name = _NAMES[index]
    if name == "r12":
        if variable == "k":
            return ()
        sign = 1 if variable == "y1" else -1
        return (("y1", sign * INV_R12), ("y2", -sign * INV_R12))
    if name == "ir12":
        if variable == "k":
            return ()
        sign = 1 if variable == "y1" else -1
        return (("y1", -sign * INV_R12**3), ("y2", sign * INV_R12**3))
    a, b = _PAIRS[index]
    if a == variable and b == variable:
        return ((variable, RING(2)),)
    if a == variable:
        return ((b, RING(1)),)
    if b == variable:
        return ((a, RING(1)),)
    return ()


def gradient(f, variable: str) -> dict[str, object]:
    """grad_variable f as a vector form {base vector: coefficient} (chain rule over generators)."""
    _check_variable(variable)
    out: dict[str, object] = {}
    for index, generator in enumerate(_GENERATORS):
        parts = _generator_gradient(index, variable)
        if not parts:
            continue
        derivative = f.diff(generator)
        if not derivative:
            continue
        for vector, coefficient in parts:
            out[vector] = out.get(vector, RING(0)) + derivative * coefficient
    return out


def _contract(form: VectorForm, vector: str):
    return sum((coefficient * dot(base, vector) for base, coefficient in form.items()), RING(0))


def directional_derivative(f, direction: str, variable: str):
    """(direction . grad_variable) f, direction one of :data:`VECTORS`."""
    return _contract(gradient(f, variable), direction)


def _divergence(form: VectorForm, variable: str):
    """grad_variable . (sum_w c_w w) for a vector form (only w = variable has a divergence, 3)."""
    total = RING(0)
    for base, coefficient in form.items():
        total += _contract(gradient(coefficient, variable), base)
        if base == variable:
            total += 3 * coefficient
    return total


def mixed_laplacian(f, first: str, second: str):
    """grad_first . grad_second f (the Laplacian when first == second)."""
    _check_variable(first)
    return _divergence(gradient(f, second), first)


def on_null_cone(f):
    """Set k.k = 0."""
    return f.subs(dot("k", "k"), 0) if hasattr(f, "subs") else f


def _laplacian_k(f):
    return mixed_laplacian(f, "k", "k")


def harmonic_gradient_along(f, degree: int, direction: str):
    """(direction . grad_k) H[f] on the null cone, f homogeneous of degree ``degree`` in k.

    With H[f] = f - k.k Delta_k f/(2(2n-1)) + O((k.k)^2) (Thorne 1980, eq. (2.2)):
    (w.grad_k) H[f] = (w.grad_k) f - (k.w) Delta_k f/(2n - 1) on k.k = 0.
    """
    n = _check_degree(degree)
    correction = dot("k", direction) * _laplacian_k(f) * sp.Rational(1, 2 * n - 1)
    return on_null_cone(directional_derivative(f, direction, "k") - correction)


def harmonic_divergence(f, degree: int, body: str):
    """(grad_body . grad_k) H[f] on the null cone (body y1 or y2; f of degree n in k)."""
    n = _check_degree(degree)
    correction = directional_derivative(_laplacian_k(f), "k", body) * sp.Rational(1, 2 * n - 1)
    return on_null_cone(mixed_laplacian(f, body, "k") - correction)


def harmonic_double_divergence(f, degree: int, first: str, second: str):
    """(grad_first . grad_k)(grad_second . grad_k) H[f] on the null cone.

    Uses d_i d_j H = d_ij f - (delta_ij Delta f + k_i d_j Delta f + k_j d_i Delta f)/(2n-1)
    + k_i k_j Delta^2 f/((2n-1)(2n-3)) on k.k = 0 (second derivatives of the trace-removal
    series, Thorne 1980 eq. (2.2)); ``first``, ``second`` are among y1, y2.
    """
    n = _check_degree(degree)
    lap = _laplacian_k(f)
    lap2 = _laplacian_k(lap)
    main = mixed_laplacian(mixed_laplacian(f, second, "k"), first, "k")
    trace = (mixed_laplacian(lap, first, second)
             + directional_derivative(mixed_laplacian(lap, second, "k"), "k", first)
             + directional_derivative(mixed_laplacian(lap, first, "k"), "k", second))
    double = directional_derivative(directional_derivative(lap2, "k", first), "k", second)
    result = main - trace * sp.Rational(1, 2 * n - 1)
    if n >= 2:
        result += double * sp.Rational(1, (2 * n - 1) * (2 * n - 3))
    return on_null_cone(result)


def probe_curl(form: VectorForm) -> dict[tuple[str, str], object]:
    """eps_{abc} k_c d/dk_a F_b for a vector field F_b = sum_w C_w w_b, as triple products.

    This is the contraction the current moments need: with F_b the probe polynomial of an
    integral FP int (k.x)^(l-1) x_a(...) F_b written as (1/l) d/dk_a of a scalar kernel, the
    current moment's probe polynomial is J_L k_L = FP int (k.x)^(l-1) k.(x cross Sigma) (see
    :mod:`stfalgebra.moments.current_two_pn`). Each C_w depends on k through the dot products
    k.p, and eps_{abc} k_c p_a w_b = [p, w, k] = p.(w cross k); terms along k (from k.k or
    from w = k) drop out, so the off-cone extension of the C_w does not matter.

    Returns
    -------
    dict
        {(p, w): coefficient of [p, w, k]}, p before w in :data:`VECTORS` (antisymmetry used),
        p, w among y1, y2, v1, v2.

    Example
    -------
    >>> probe_curl({"v2": dot("k", "y1")**2})
    {('y1', 'v2'): 2*ky1}
    """
    out: dict[tuple[str, str], object] = {}
    for w, coefficient in form.items():
        if w == "k":
            continue
        for p in VECTORS[1:]:
            if p == w:
                continue
            derivative = coefficient.diff(dot("k", p))
            if not derivative:
                continue
            key, sign = ((p, w), 1) if VECTORS.index(p) < VECTORS.index(w) else ((w, p), -1)
            out[key] = out.get(key, RING(0)) + sign * derivative
    return out


def _check_degree(degree) -> int:
    if isinstance(degree, bool) or not isinstance(degree, int) or degree < 1:
        raise ValueError(f"degree in k must be a positive integer, got {degree!r}")
    return degree


def evaluate(f, values: Mapping[str, object]) -> sp.Expr:
    """Substitute values for the generators (names as in the ring: 'ky1', 'r12', 'ir12', ...).

    Returns a sympy expression; every generator that occurs must have a value.
    """
    symbols = [sp.Symbol(name) for name in _NAMES]
    lookup = {}
    for name, symbol in zip(_NAMES, symbols):
        if name in values:
            lookup[name] = sp.sympify(values[name])
    total = sp.Integer(0)
    for monomial, coefficient in f.terms():
        term = sp.Rational(coefficient.numerator, coefficient.denominator)
        for name, power in zip(_NAMES, monomial):
            if power:
                if name not in lookup:
                    raise ValueError(f"no value given for the invariant {name!r}")
                term *= lookup[name] ** power
        total += term
    return total
