"""The quadratic radiative moments for every l, derived by the MPM iteration.

:func:`radiative_moment_terms` returns, for U_L or V_L of rank l through a relative PN order,
every term: the linear one, then every product of two canonical moments allowed by rank,
dimension and parity, each with the coefficient the iteration gives (zero reported as zero).

How a pair is computed: each moment is replaced by a generic test tensor (a harmonic
polynomial, :func:`~.harmonic_split.sample_harmonic`) times a function of time with its own
derivative marker; the quadratic metric at infinity (:mod:`.quadratic_metric`) is projected
TT and fitted (:mod:`.radiative_readout`) on the one STF structure that each rank l' admits
(rank l' of the product of ranks p and q: ``l' = p + q - 2k - epsilon``, one structure each).
For two copies of one moment the test gives the polarised (cross) term, which is symmetrised
back. Pairs:

* U_L: ``M_p x M_q`` (relative order (3 + p + q - l)/2), ``eps M_p S_q`` ((4 + p + q - l)/2),
  ``S_p x S_q`` ((5 + p + q - l)/2);
* V_L: ``eps M_p M_q`` ((2 + p + q - l)/2), ``S_p x M_q`` ((3 + p + q - l)/2), ``eps S_p S_q``
  ((4 + p + q - l)/2);

the moments are M (constant), M_L (l >= 2), S_i (constant) and S_L (l >= 2): centre-of-mass
frame, the mass dipole is zero. Factor order: the monopole first (tails), then the current
dipole; otherwise the lower rank first, and for a mass and a current moment the current one
first in a plain product, the mass one first with epsilon.

The split of memory and instantaneous parts follows issue 15, item 7: the memory integrand's
derivative orders are as equal as possible (the extra one on the factor of higher rank, or on
the second factor at equal rank). Relative orders count c^-2 per unit (G^(n-1) c^(-2 order)).

**Conventions**: harmonic coordinates for the iteration, finite-part scale r0; radiative
coordinates ``U = t - r/c - (2 G M/c^3) ln(r/(c b))`` with b the constant of the tails; the
two constants are different and r0 cancels from every quadratic coefficient (checked).
"""

from __future__ import annotations

from fractions import Fraction
from functools import lru_cache
from itertools import product as index_tuples
from math import factorial

import flint

from ..errors import OrderBeyondInputsError
from .coefficient_ring import GENERATOR_NAMES, RING, gens, normal_form
from .harmonic_split import harmonic_part, sample_harmonic
from .linear_metric import LinearMoment
from .quadratic_metric import quadratic_far_zone
from .radiative_readout import fit_radiative_moments
from .radiative_terms import RadiativeTerm
from .retarded_field import COORDINATES

__all__ = [
    "radiative_moment_terms", "allowed_pairs", "pair_coefficient", "tail_constant_from_iteration",
    "MomentSpec", "MAXIMUM_RELATIVE_ORDER",
]

#: The iteration here is quadratic: pairs through relative 2.5PN (cubic terms enter at 3PN).
MAXIMUM_RELATIVE_ORDER = Fraction(5, 2)

MomentSpec = tuple[str, int]          # ("M" | "S", rank)
_ZERO = RING.from_dict({})
_ONE = RING.from_dict({(0,) * RING.nvars(): 1})


def _constant_moment(spec: MomentSpec) -> bool:
    return spec in (("M", 0), ("S", 1))


def _exists(spec: MomentSpec) -> bool:
    kind, rank = spec
    return (kind == "M" and (rank == 0 or rank >= 2)) or (kind == "S" and rank >= 1)


def _kind_of_structure(first: MomentSpec, second: MomentSpec, epsilon: int) -> str:
    currents = (first[0] == "S") + (second[0] == "S")
    natural = (currents % 2 == 0) == (epsilon == 0)
    return "U" if natural else "V"


def _order(first: MomentSpec, second: MomentSpec, moment: str, l: int) -> Fraction:
    currents = (first[0] == "S") + (second[0] == "S")
    n = 3 + first[1] + second[1] - l + currents - (1 if moment == "V" else 0)
    return Fraction(n, 2)


def _ordered(a: MomentSpec, b: MomentSpec, epsilon: int) -> tuple[MomentSpec, MomentSpec]:
    for special in (("M", 0), ("S", 1)):
        if b == special and a != special:
            return b, a
        if a == special:
            return a, b
    if a[0] != b[0]:
        mass, current = (a, b) if a[0] == "M" else (b, a)
        return (mass, current) if epsilon else (current, mass)
    return (a, b) if a[1] <= b[1] else (b, a)


def allowed_pairs(moment: str, l: int, order: Fraction) -> list[tuple[MomentSpec, MomentSpec, int, int, Fraction]]:
    """Every pair ``(first, second, contractions, epsilon, relative order)`` entering U_L or V_L.

    Example
    -------
    >>> [(a, b, k, e) for a, b, k, e, _ in allowed_pairs("V", 3, Fraction(3, 2))]
    [(('M', 0), ('S', 3), 0, 0), (('S', 1), ('M', 2), 0, 0), (('M', 2), ('M', 2), 0, 1)]
    """
    out = []
    seen = set()
    for epsilon in (0, 1):
        for contractions in range(0, 3):
            total = l + 2 * contractions + epsilon
            for p in range(0, total + 1):
                q = total - p
                for kind_a in ("M", "S"):
                    for kind_b in ("M", "S"):
                        a, b = (kind_a, p), (kind_b, q)
                        if not (_exists(a) and _exists(b)):
                            continue
                        if _constant_moment(a) and _constant_moment(b):
                            continue
                        if contractions > min(p, q) - epsilon:
                            continue
                        if _kind_of_structure(a, b, epsilon) != moment:
                            continue
                        first, second = _ordered(a, b, epsilon)
                        key = (first, second, contractions, epsilon)
                        if key in seen:
                            continue
                        pn = _order(first, second, moment, l)
                        if pn <= order:
                            seen.add(key)
                            out.append((first, second, contractions, epsilon, pn))
    out.sort(key=lambda item: (item[4], item[3], item[0][1], item[0][0] != "M", item[1][1]))
    return out


def _structure(first_tensor, second_tensor, p: int, q: int, contractions: int, epsilon: int):
    """Harmonic polynomial of ``STF[A_(KP) B_(KQ)]`` or ``STF[eps_iab A_(aKP) B_(bKQ)]``."""
    g = gens()
    x = [g[name] for name in COORDINATES]
    k = contractions
    total = _ZERO
    for indices in index_tuples(range(3), repeat=k):
        da, db = first_tensor, second_tensor
        for i in indices:
            da = da.derivative(COORDINATES[i])
            db = db.derivative(COORDINATES[i])
        if epsilon:
            ga = [da.derivative(name) for name in COORDINATES]
            gb = [db.derivative(name) for name in COORDINATES]
            total += sum((x[i] * (ga[(i + 1) % 3] * gb[(i + 2) % 3] - ga[(i + 2) % 3] * gb[(i + 1) % 3])
                          for i in range(3)), _ZERO)
        else:
            total += da * db
    if epsilon:
        weight = Fraction(factorial(p - 1 - k) * factorial(q - 1 - k), factorial(p) * factorial(q))
    else:
        weight = Fraction(factorial(p - k) * factorial(q - k), factorial(p) * factorial(q))
    degree = p + q - 2 * k - epsilon
    return harmonic_part(total * flint.fmpq(weight.numerator, weight.denominator), degree), degree


@lru_cache(maxsize=None)
def _pair_fit(first: MomentSpec, second: MomentSpec) -> dict[tuple[str, int], flint.fmpq_mpoly]:
    """Fit every radiative structure of one pair: ``{(U|V, l'): coefficient}`` (cross term)."""
    tensor_a = sample_harmonic(first[1], 1)
    tensor_b = sample_harmonic(second[1], 2)
    moment_a = LinearMoment(first[0], first[1], tensor_a, "s1", constant=_constant_moment(first))
    moment_b = LinearMoment(second[0], second[1], tensor_b, "s2", constant=_constant_moment(second))
    far = quadratic_far_zone(moment_a, moment_b)
    spatial = {(i, j): far.spatial(i, j) for i in range(1, 4) for j in range(i, 4)}
    structures = []
    keys = []
    p, q = first[1], second[1]
    for epsilon in (0, 1):
        for k in range(0, min(p, q) - epsilon + 1):
            tensor, degree = _structure(tensor_a, tensor_b, p, q, k, epsilon)
            if degree < 2:
                continue
            if tensor.is_zero():
                raise ArithmeticError(f"test tensors degenerate for {first} x {second}, k = {k}, eps = {epsilon}")
            kind = _kind_of_structure(first, second, epsilon)
            structures.append((kind, degree, tensor))
            keys.append((kind, degree))
    if not structures:
        return {}
    coefficients = fit_radiative_moments(spatial, structures)
    return {key: normal_form(value, far.rate) for key, value in zip(keys, coefficients)}


def pair_coefficient(first: MomentSpec, second: MomentSpec, moment: str, l: int) -> flint.fmpq_mpoly:
    """The Fourier-multiplier coefficient of the pair's structure in U_L or V_L (cross term).

    A ring polynomial in s1, s2 (derivatives of the first and second moment), z (memory),
    lg (hereditary logarithm), log2, logb; exactly zero when the pair does not contribute.
    """
    return _pair_fit(first, second).get((moment, l), _ZERO)


def _exponents(poly: flint.fmpq_mpoly):
    for exponents, value in poly.to_dict().items():
        yield {name: int(e) for name, e in zip(GENERATOR_NAMES, exponents) if int(e)}, \
            Fraction(int(value.p), int(value.q))


def _split_orders(total: int, first: MomentSpec, second: MomentSpec) -> tuple[int, int]:
    low = total // 2
    if total % 2 == 0:
        return low, low
    if first[1] > second[1]:
        return low + 1, low
    return low, low + 1


def _terms_of_pair(first: MomentSpec, second: MomentSpec, contractions: int, epsilon: int,
                   moment: str, l: int, order: Fraction) -> list[RadiativeTerm]:
    coefficient = pair_coefficient(first, second, moment, l)
    names = {name for exponents, _ in _exponents(coefficient) for name in exponents}
    for forbidden in ("logr", "logr0"):
        if forbidden in names:
            raise ArithmeticError(f"{forbidden} did not cancel in {first} x {second} of {moment}_{l}")
    derivative_total = 1 + first[1] + second[1]

    def make(kind, value, a, b, constant=None):
        return RadiativeTerm(kind, order, value, ((first[0], first[1], a), (second[0], second[1], b)),
                             contractions, epsilon, constant)

    if first == ("M", 0):
        # tail: A s2^j (lg - log2 - logb + kappa) = A int ln(tau/(2b)) F^(j+1) + A kappa F^(j)
        weights = {}
        for exponents, value in _exponents(coefficient):
            key = tuple(sorted((n, e) for n, e in exponents.items() if n not in ("s2",)))
            weights[key] = weights.get(key, Fraction(0)) + value
            power = exponents.get("s2", 0)
        amplitude = weights.get((("lg", 1),), Fraction(0))
        if amplitude == 0:
            return [RadiativeTerm("tail", order, Fraction(0), ((first[0], 0, 0), (second[0], second[1], l + 2)),
                                  0, 0, Fraction(0))]
        if weights.get((("log2", 1),)) != -amplitude or weights.get((("logb", 1),)) != -amplitude:
            raise ArithmeticError(f"tail of {second} is not of the form ln(tau/(2b)): {coefficient}")
        constant = weights.get((), Fraction(0)) / amplitude
        return [RadiativeTerm("tail", order, amplitude, ((first[0], 0, 0), (second[0], second[1], power + 1)),
                              0, 0, constant)]
    for forbidden in ("lg", "log2", "logb"):
        if forbidden in names:
            raise ArithmeticError(f"hereditary logarithm in the non-tail pair {first} x {second}: {coefficient}")
    identical = first == second
    g = gens()
    rate = (_ZERO if _constant_moment(first) else g["s1"]) + g["s2"]
    terms: list[RadiativeTerm] = []
    memory_part = sum((RING.from_dict({tuple(exponents.get(n, 0) for n in GENERATOR_NAMES):
                                       flint.fmpq(v.numerator, v.denominator)})
                       for exponents, v in _exponents(coefficient) if "z" in exponents), _ZERO)
    instantaneous = coefficient - memory_part
    if not memory_part.is_zero():
        items = list(_exponents(memory_part))
        if len(items) != 1 or items[0][0].get("z") != 1 or set(items[0][0]) - {"z", "s2"}:
            raise ArithmeticError(f"unexpected hereditary structure {memory_part}")
        d = items[0][0].get("s2", 0)
        q_value = items[0][1]
        a, b = _split_orders(d, first, second)
        if identical:
            if d % 2:
                raise ArithmeticError(f"odd memory of one moment: {memory_part}")
            value = q_value * (-1) ** a / 2
            cross = 2 * value
        else:
            value = q_value * (-1) ** a
            cross = value
        representative = g["z"] * g["s1"] ** a * g["s2"] ** b * flint.fmpq(cross.numerator, cross.denominator)
        instantaneous = normal_form(coefficient - representative, rate)
        if any("z" in exponents for exponents, _ in _exponents(instantaneous)):
            raise ArithmeticError("memory split left a hereditary remainder")
        terms.append(make("memory", value, a, b))
    table = {}
    for exponents, value in _exponents(instantaneous):
        if set(exponents) - {"s1", "s2"}:
            raise ArithmeticError(f"unexpected generators in {instantaneous}")
        a, b = exponents.get("s1", 0), exponents.get("s2", 0)
        if a + b != derivative_total:
            raise ArithmeticError(f"dimension check failed: {first} x {second}, orders {a}, {b}")
        table[(a, b)] = value
    if identical:
        for (a, b), value in sorted(table.items()):
            partner = table.get((b, a), Fraction(0))
            if epsilon:
                if value != -partner:
                    raise ArithmeticError("the eps product of one moment is not antisymmetric")
                if a > b:
                    terms.append(make("instantaneous", value, a, b))
            else:
                if value != partner:
                    raise ArithmeticError("the product of one moment is not symmetric")
                if a < b:
                    terms.append(make("instantaneous", value, a, b))
                elif a == b:
                    terms.append(make("instantaneous", value / 2, a, b))
    else:
        for (a, b), value in sorted(table.items()):
            terms.append(make("instantaneous", value, a, b))
    if not terms:
        a, b = _split_orders(derivative_total, first, second)
        if _constant_moment(first):
            a, b = 0, derivative_total
        terms.append(make("instantaneous", Fraction(0), a, b))
    return terms


def _parse_moment(moment) -> str:
    if moment not in ("U", "V"):
        raise ValueError(f"moment must be 'U' or 'V', got {moment!r}")
    return moment


def radiative_moment_terms(moment: str, l: int, pn_relative) -> list[RadiativeTerm]:
    """Return every term of U_L or V_L through a relative PN order, derived by the iteration.

    Parameters
    ----------
    moment:
        ``"U"`` (mass-type) or ``"V"`` (current-type).
    l:
        Rank, ``l >= 2``.
    pn_relative:
        Relative order (a multiple of 1/2, at most 5/2: the quadratic iteration).

    Returns
    -------
    list of RadiativeTerm
        The linear term, then the quadratic terms by increasing order; each term's ``to_json``
        is the object of issue 15, item 7. A pair allowed by rank, dimension and parity whose
        coefficient is zero is listed with coefficient 0.

    Raises
    ------
    ValueError
        A bad moment, rank or order.
    OrderBeyondInputsError
        Beyond relative 2.5PN (cubic interactions are not derived).

    Example
    -------
    >>> [t.to_json()["coefficient"] for t in radiative_moment_terms("U", 2, Fraction(3, 2))]
    ['1', '2']

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 2-3 (the algorithm); Blanchet & Damour,
    Phys. Rev. D 46, 4304 (1992) (tails).
    """
    moment = _parse_moment(moment)
    if isinstance(l, bool) or not isinstance(l, int) or l < 2:
        raise ValueError(f"l must be an integer >= 2, got {l!r}")
    order = Fraction(pn_relative)
    if order < 0 or (2 * order).denominator != 1:
        raise ValueError(f"pn_relative must be a non-negative multiple of 1/2, got {pn_relative!r}")
    if order > MAXIMUM_RELATIVE_ORDER:
        raise OrderBeyondInputsError(
            f"relative order {order} of {moment}_L needs cubic interactions; the iteration here "
            f"is quadratic (through relative 5/2)")
    kind = "M" if moment == "U" else "S"
    terms = [RadiativeTerm("linear", Fraction(0), Fraction(1), ((kind, l, l),), 0, 0)]
    for first, second, contractions, epsilon, pn in allowed_pairs(moment, l, order):
        terms.extend(_terms_of_pair(first, second, contractions, epsilon, moment, l, pn))
    return terms


def tail_constant_from_iteration(l: int, kind: str) -> Fraction:
    """kappa_l (kind "M") or pi_l (kind "S") as the iteration gives it.

    Example
    -------
    >>> tail_constant_from_iteration(2, "M")
    Fraction(11, 12)
    """
    moment = "U" if kind == "M" else "V"
    (term,) = _terms_of_pair(("M", 0), (kind, l), 0, 0, moment, l, Fraction(3, 2))
    return term.constant
