"""The rings of the 2PN moments on python-flint: the orbit ring and the invariants ring.

:mod:`stfalgebra.moments.orbit_polynomials` and :mod:`stfalgebra.moments.invariants` define
the two polynomial rings in which the 2PN source moments of two point masses are derived, and
their operators, on sympy's pure-Python polynomial rings. This module holds the same rings,
with the same generators in the same order, as python-flint ``fmpq_mpoly`` contexts (exact
rational arithmetic in C), and the operators the hot path of
:mod:`stfalgebra.moments.mass_two_pn` needs:

* orbit ring (eps, G, m, nu, delta, r, ir = 1/r, rdot, phidot, kx, kv): truncation in eps, the
  truncated power, the time derivative along the orbit (the same derivation as
  :func:`~stfalgebra.moments.orbit_polynomials.time_derivative`), delta^2 -> 1 - 4 nu, the
  conversion to an :class:`~stfalgebra.moments.orbit_tensor.OrbitTensor` with engine
  coefficients;
* invariants ring (the fifteen dot products of k, y1, y2, v1, v2, then r12, ir12): the
  gradient, directional derivative, mixed Laplacian and harmonic-extension contractions of
  :mod:`stfalgebra.moments.invariants` (same formulas, Thorne 1980 eq. (2.2)), and the
  evaluation of an invariant polynomial at orbit-ring values (``compose``).

An element converts to and from the sympy ring element with the same exponents
(:func:`orbit_from_sympy`, :func:`orbit_to_sympy`, :func:`invariant_from_sympy`); the tests
check every operator against its sympy twin.

**Conventions**: those of the two sympy modules (eps = 1/c; k a null probe where "on the null
cone" is said; derivatives with respect to the body positions).

Example
-------
>>> from stfalgebra.moments import flint_rings as fr
>>> fr.time_derivative(fr.ORBIT_GENS["r"]**2 * fr.ORBIT_GENS["kx"]**2, 0)
2*r^2*kx*kv + 2*r*rdot*kx^2

References
----------
K. S. Thorne, Rev. Mod. Phys. 52, 299 (1980), Sec. II (eq. (2.2), the trace-removal series).
"""

from __future__ import annotations

from functools import lru_cache

import flint

from .. import exact as engine
from ..exact import ExactPolynomial, exact
from ..orders import PNOrder
from ..pnseries import PNSeries
from . import invariants as inv
from . import orbit_polynomials as op
from .orbit_tensor import PLANAR_BASIS, OrbitTensor

__all__ = [
    "ORBIT", "ORBIT_GENS", "INVARIANTS", "R12", "INV_R12", "orbit_from_sympy", "orbit_from_series",
    "orbit_to_sympy", "invariant_from_sympy", "invariant_to_sympy",
    "truncate", "truncated_power", "time_derivative", "reduce_mass_difference", "to_tensor",
    "dot", "gradient", "directional_derivative", "mixed_laplacian", "on_null_cone",
    "harmonic_gradient_along", "harmonic_divergence", "harmonic_double_divergence", "evaluate_at",
]

# ---------------------------------------------------------------- the orbit ring
_ORBIT_NAMES = tuple(str(symbol) for symbol in op.RING.symbols)
#: The orbit ring (generators of :data:`stfalgebra.moments.orbit_polynomials.RING`, same order).
ORBIT = flint.fmpq_mpoly_ctx.get(_ORBIT_NAMES, "lex")
#: Its generators by name.
ORBIT_GENS = dict(zip(_ORBIT_NAMES, ORBIT.gens()))
_EPS_INDEX, _DELTA_INDEX, _KX_INDEX, _KV_INDEX = (_ORBIT_NAMES.index(name) for name in ("eps", "delta", "kx", "kv"))
_EPS = ORBIT_GENS["eps"]


def _fmpq(value) -> flint.fmpq:
    return flint.fmpq(int(value.numerator), int(value.denominator))


_ENGINE_CONTEXT = ExactPolynomial("G").poly.context()
# orbit-ring index -> engine generator index, for the coefficient generators (eps and probes apart)
_ENGINE_NAME = {"ir": "rinv"}
_TO_ENGINE = tuple((index, _ENGINE_CONTEXT.variable_to_index(_ENGINE_NAME.get(name, name)))
                   for index, name in enumerate(_ORBIT_NAMES) if name not in ("eps", "kx", "kv"))
_ENGINE_WIDTH = _ENGINE_CONTEXT.nvars()


def orbit_from_sympy(f) -> flint.fmpq_mpoly:
    """A sympy orbit-ring element (:mod:`stfalgebra.moments.orbit_polynomials`) as a flint one."""
    return ORBIT.from_dict({monomial: _fmpq(c) for monomial, c in f.terms()})


def orbit_from_series(series: PNSeries) -> flint.fmpq_mpoly:
    """A PN series in eps = 1/c (its known terms, coefficients in G, m, nu, delta, r, 1/r, rdot,
    phidot) as an orbit-ring element: :func:`stfalgebra.moments.orbit_polynomials.from_series`
    in the flint ring, up to the engine's normal form (delta^2 = 1 - 4 nu, r (1/r) = 1), which
    :func:`reduce_mass_difference` applies to the moments anyway."""
    terms: dict = {}
    for order, coefficient in series.terms.items():
        power = order.twice
        coefficient = exact(coefficient)
        for exponents, value in coefficient.poly.to_dict().items():
            monomial = [0] * len(_ORBIT_NAMES)
            monomial[_EPS_INDEX] = power
            for source, target in _TO_ENGINE:
                monomial[source] = int(exponents[target])
            if sum(int(e) for e in exponents) != sum(monomial) - power:
                raise ValueError(f"coefficient {coefficient} is not in the orbit ring")
            terms[tuple(monomial)] = value
    return ORBIT.from_dict(terms)


def orbit_to_sympy(f: flint.fmpq_mpoly):
    """The sympy orbit-ring element with the same terms."""
    return op.RING({tuple(int(e) for e in monomial): op.RING.domain(int(c.p), int(c.q))
                    for monomial, c in f.to_dict().items()})


def truncate(f: flint.fmpq_mpoly, order: int) -> flint.fmpq_mpoly:
    """Drop the monomials with more than ``order`` powers of eps (the remainder of the division
    by the monomial eps^(order+1))."""
    return divmod(f, _EPS ** (order + 1))[1]


def truncated_power(f: flint.fmpq_mpoly, exponent: int, order: int) -> flint.fmpq_mpoly:
    """``f**exponent`` through eps^order, truncating after each product."""
    return op.power_by_squaring(ORBIT.constant(1), f, exponent, lambda g: truncate(g, order))


@lru_cache(maxsize=None)
def _derivation(pn_order: int) -> tuple:
    """(generator index, image of d/dt) pairs of the orbit derivation of PN order ``pn_order``."""
    images = op._images(pn_order)
    return tuple((_ORBIT_NAMES.index(str(generator)), orbit_from_sympy(image))
                 for generator, image in images.items())


def time_derivative(f: flint.fmpq_mpoly, pn_order: int) -> flint.fmpq_mpoly:
    """d f/dt along the relative orbit of PN order ``pn_order`` (0, 1 or 2); not truncated."""
    total = ORBIT.constant(0)
    degrees = f.degrees() if not f.is_constant() else None
    if degrees is None:
        return total
    for index, image in _derivation(pn_order):
        if degrees[index]:
            total += f.derivative(index) * image
    return total


def reduce_mass_difference(f: flint.fmpq_mpoly) -> flint.fmpq_mpoly:
    """delta^2 -> 1 - 4 nu in every monomial (delta = (m1 - m2)/m, nu = m1 m2/m^2)."""
    by_power: dict[int, dict] = {}
    for monomial, coefficient in f.to_dict().items():
        k = int(monomial[_DELTA_INDEX])
        reduced = list(monomial)
        reduced[_DELTA_INDEX] = k % 2
        by_power.setdefault(k // 2, {})[tuple(reduced)] = coefficient
    base = 1 - 4 * ORBIT_GENS["nu"]
    total = ORBIT.constant(0)
    for half, terms in by_power.items():
        total += ORBIT.from_dict(terms) * base**half
    return total


def _engine_polynomial(terms: dict) -> ExactPolynomial:
    poly = _ENGINE_CONTEXT.from_dict(terms)
    # normal form modulo r rinv = 1, delta^2 = 1 - 4 nu: the engine's own reduction and flags
    return ExactPolynomial._normalised(poly, engine._flags_of(poly))


def to_tensor(l: int, f: flint.fmpq_mpoly, known) -> OrbitTensor:
    """The element as a rank-l OrbitTensor (kx^a kv^b -> x_<A v_B>), series in eps, as
    :func:`stfalgebra.moments.orbit_polynomials.to_tensor` (exact engine coefficients)."""
    grouped: dict[tuple[int, int], dict[int, dict]] = {}
    for monomial, coefficient in f.to_dict().items():
        a, b, power = int(monomial[_KX_INDEX]), int(monomial[_KV_INDEX]), int(monomial[_EPS_INDEX])
        if a + b != l:
            raise AssertionError(f"probe polynomial of degree {a + b}, expected {l}")
        exponents = [0] * _ENGINE_WIDTH
        for source, target in _TO_ENGINE:
            exponents[target] = int(monomial[source])
        grouped.setdefault((a, b), {}).setdefault(power, {})[tuple(exponents)] = coefficient
    known2 = PNOrder(known).twice
    terms = {}
    for (a, b), by_power in sorted(grouped.items(), reverse=True):
        pieces = {power: _engine_polynomial(by_power[power]) for power in by_power if power <= known2}
        terms[(a, b, 0)] = PNSeries._from_trusted(pieces, known2)
    return OrbitTensor._trusted(l, terms, PLANAR_BASIS)


# ---------------------------------------------------------------- the invariants ring
_INVARIANT_NAMES = tuple(str(symbol) for symbol in inv.RING.symbols)
#: The invariants ring (generators of :data:`stfalgebra.moments.invariants.RING`, same order).
INVARIANTS = flint.fmpq_mpoly_ctx.get(_INVARIANT_NAMES, "lex")
_IGENS = INVARIANTS.gens()
_PAIRS = [(a, b) for i, a in enumerate(inv.VECTORS) for b in inv.VECTORS[i:]]
_DOT = {}
for _index, (_a, _b) in enumerate(_PAIRS):
    _DOT[(_a, _b)] = _DOT[(_b, _a)] = _IGENS[_index]
#: r12 = |y1 - y2| and its inverse, as generators.
R12, INV_R12 = _IGENS[-2], _IGENS[-1]
_KK_INDEX = _PAIRS.index(("k", "k"))
_ZERO = INVARIANTS.constant(0)


def invariant_from_sympy(f) -> flint.fmpq_mpoly:
    """A sympy invariants-ring element (:mod:`stfalgebra.moments.invariants`) as a flint one."""
    return INVARIANTS.from_dict({monomial: _fmpq(c) for monomial, c in f.terms()})


def invariant_to_sympy(f: flint.fmpq_mpoly):
    """The sympy invariants-ring element with the same terms.

    Example
    -------
    >>> invariant_to_sympy(dot("k", "y1")**2 * R12 / 3)
    1/3*ky1**2*r12
    """
    return inv.RING({tuple(int(e) for e in monomial): inv.RING.domain(int(c.p), int(c.q))
                     for monomial, c in f.to_dict().items()})


def dot(a: str, b: str) -> flint.fmpq_mpoly:
    """The generator a.b for two of :data:`stfalgebra.moments.invariants.VECTORS`."""
    return _DOT[(a, b)]


@lru_cache(maxsize=None)
def _generator_gradients(variable: str) -> tuple:
    """((generator index, ((base vector, coefficient), ...)), ...): grad_variable of each
    generator that depends on ``variable`` (as :func:`stfalgebra.moments.invariants.gradient`)."""
    out = []
    for index in range(len(_IGENS)):
        parts = inv._generator_gradient(index, variable)
        if parts:
            out.append((index, tuple((vector, invariant_from_sympy(inv.RING(c))) for vector, c in parts)))
    return tuple(out)


def gradient(f: flint.fmpq_mpoly, variable: str) -> dict:
    """grad_variable f as {base vector: coefficient} (chain rule over the generators)."""
    out: dict = {}
    if f.is_constant():
        return out
    degrees = f.degrees()
    for index, parts in _generator_gradients(variable):
        if not degrees[index]:
            continue
        derivative = f.derivative(index)
        for vector, coefficient in parts:
            term = derivative * coefficient
            out[vector] = out[vector] + term if vector in out else term
    return out


def _contract(form: dict, vector: str) -> flint.fmpq_mpoly:
    total = _ZERO
    for base, coefficient in form.items():
        total += coefficient * _DOT[(base, vector)]
    return total


def directional_derivative(f: flint.fmpq_mpoly, direction: str, variable: str) -> flint.fmpq_mpoly:
    """(direction . grad_variable) f."""
    return _contract(gradient(f, variable), direction)


def mixed_laplacian(f: flint.fmpq_mpoly, first: str, second: str) -> flint.fmpq_mpoly:
    """grad_first . grad_second f (the Laplacian when first == second)."""
    total = _ZERO
    for base, coefficient in gradient(f, second).items():
        total += _contract(gradient(coefficient, first), base)
        if base == first:
            total += 3 * coefficient
    return total


def on_null_cone(f: flint.fmpq_mpoly) -> flint.fmpq_mpoly:
    """Set k.k = 0."""
    return f.subs({_KK_INDEX: 0})


def harmonic_gradient_along(f: flint.fmpq_mpoly, degree: int, direction: str) -> flint.fmpq_mpoly:
    """(direction . grad_k) H[f] on the null cone (:func:`stfalgebra.moments.invariants.
    harmonic_gradient_along`)."""
    correction = dot("k", direction) * mixed_laplacian(f, "k", "k") * flint.fmpq(1, 2 * degree - 1)
    return on_null_cone(directional_derivative(f, direction, "k") - correction)


def harmonic_divergence(f: flint.fmpq_mpoly, degree: int, body: str) -> flint.fmpq_mpoly:
    """(grad_body . grad_k) H[f] on the null cone (:func:`stfalgebra.moments.invariants.
    harmonic_divergence`)."""
    correction = directional_derivative(mixed_laplacian(f, "k", "k"), "k", body) * flint.fmpq(1, 2 * degree - 1)
    return on_null_cone(mixed_laplacian(f, body, "k") - correction)


def harmonic_double_divergence(f: flint.fmpq_mpoly, degree: int, first: str, second: str) -> flint.fmpq_mpoly:
    """(grad_first . grad_k)(grad_second . grad_k) H[f] on the null cone
    (:func:`stfalgebra.moments.invariants.harmonic_double_divergence`)."""
    n = degree
    lap = mixed_laplacian(f, "k", "k")
    lap2 = mixed_laplacian(lap, "k", "k")
    main = mixed_laplacian(mixed_laplacian(f, second, "k"), first, "k")
    trace = (mixed_laplacian(lap, first, second)
             + directional_derivative(mixed_laplacian(lap, second, "k"), "k", first)
             + directional_derivative(mixed_laplacian(lap, first, "k"), "k", second))
    double = directional_derivative(directional_derivative(lap2, "k", first), "k", second)
    result = main - trace * flint.fmpq(1, 2 * n - 1)
    if n >= 2:
        result += double * flint.fmpq(1, (2 * n - 1) * (2 * n - 3))
    return on_null_cone(result)


def evaluate_at(f: flint.fmpq_mpoly, images) -> flint.fmpq_mpoly:
    """The invariant polynomial with every generator replaced by an orbit-ring element
    (``images``: one per generator, in the ring's order)."""
    return f.compose(*images, ctx=ORBIT)
