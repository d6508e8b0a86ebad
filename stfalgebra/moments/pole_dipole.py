"""The general source-moment formulas applied to one spinning point particle (pole-dipole source).

A spinning particle A at position ``y``, velocity ``v``, with spin ``S`` (spatial spin tensor
``S^{ij} = eps_{ijk} S^k``, covariant supplementary condition ``S^{i0} = S^{ij} v^j/c``) has, in
flat space at the order needed for the leading spin terms, the pole-dipole stress-energy tensor

    T^{mu nu} = m v^mu v^nu delta(x - y) - d_rho [ S^{rho (mu} v^{nu)} delta(x - y) ],      (PD)

``v^mu = (c, v)``, normalised so that the total angular momentum is ``L + S``
(``int (x^i T^{0j} - x^j T^{0i})/c = S^{ij}`` for a particle at rest). Its spin part gives the
source densities ``sigma = (T^00 + T^ii)/c^2`` and ``sigma_i = T^{0i}/c``:

    sigma^S   = -(2/c^2) d_k [ S^{kj} v^j delta ],
    sigma_i^S = -(1/2) d_k [ S^{ki} delta ] + O(c^-2).

Inserted into the general source moments (Blanchet, Living Rev. Relativ. 17, 2 (2014), the 1PN
truncation used in :mod:`stfalgebra.moments.mass`, (M1), and :mod:`stfalgebra.moments.current`,
(C1)), every integral ``int F(x) d_k[Q^k delta]`` becomes ``-Q^k d_k F(y)``. In the probe
language (``T_L k_L`` for a probe vector ``k``) with ``P_l(y, k) = yhat_L k_L``:

- current moment, leading order (from ``int eps_{ab<i_l} xhat_{L-1>a} sigma_b``, with
  ``xhat_{aL-1} k_{L-1} = (1/l) d P_l/d k_a``):

      J_L^S k_L = (1/(2l)) [ (S.k) (grad_y . grad_k) - (k . grad_y)(S . grad_k) ] P_l(y, k);

- mass moment (``1/c^2``), from ``int xhat_L sigma`` and from the term
  ``-4(2l+1)/(c^2 (l+1)(2l+3)) d/dt int xhat_{aL} sigma_a`` (``xhat_{aL} k_L = (1/(l+1)) d P_{l+1}/d k_a``):

      I_L^S k_L = (2/c^2) ((v x S) . grad_y) P_l
                  - (2(2l+1)/(c^2 (l+1)^2 (2l+3))) d/dt [ S . (grad_y x grad_k) P_{l+1} ].

``P_l`` is a polynomial in ``a = y.k``, ``b = y.y``, ``c = k.k`` (its coefficients come from the
harmonic projection of ``a^l``, Thorne, Rev. Mod. Phys. 52, 299 (1980), eq. (2.2), computed here
with the Laplacian in ``k``). The differential operators act on such polynomials by the chain rule
(the identities are in :class:`InvariantPolynomial`'s methods and tested against explicit
components); the results are checked harmonic in ``k`` (they are STF tensors) and read off at
``c = 0`` as STF products of the particle's vectors ``y, v, S, y x S, v x S``
(:class:`BodyTensor`). Nothing two-body is typed in.

**Conventions**: signature (-,+,+,+); ``S^{ij} = eps_{ijk} S^k``; the spin ``S`` is the physical
spin vector (the factor ``1/c`` of ``S = G m^2 chi/c`` is applied by the two-body layer).
"""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction
from functools import lru_cache
from math import factorial
from typing import Mapping

__all__ = [
    "InvariantPolynomial", "stf_kernel", "BodyTensor", "BODY_VECTORS", "BODY_SCALARS",
    "current_spin_part", "mass_spin_part",
]

# the linear factors a term may carry besides a^i b^j c^k (a = y.k, b = y.y, c = k.k)
_TAGS = (None, "S.k", "y.S", "k.(y x S)", "w.k", "y.w")

#: The particle's vectors in a :class:`BodyTensor` key (w = v x S for the mass moment).
BODY_VECTORS = ("y", "v", "S", "y_cross_S", "v_cross_S")
#: The particle's scalars a :class:`BodyTensor` coefficient may carry.
BODY_SCALARS = ("y.y", "y.v", "y.S", "v.S", "y.(v x S)")


class InvariantPolynomial:
    """A polynomial in ``a = y.k``, ``b = y.y``, ``c = k.k``, each term carrying at most one linear
    factor among ``S.k``, ``y.S``, ``k.(y x S)``, ``w.k``, ``y.w`` (``w`` a constant vector).

    Parameters
    ----------
    terms:
        ``{(i, j, k, tag): Fraction}`` for ``a^i b^j c^k * tag`` (``tag`` None or a factor name).

    Example
    -------
    >>> P = stf_kernel(2)                       # yhat_ij k_ij = a^2 - b c/3
    >>> sorted(P.terms.items())[0]
    ((0, 1, 1, None), Fraction(-1, 3))
    >>> P.laplacian_k().is_zero()
    True
    """

    __slots__ = ("terms",)

    def __init__(self, terms: Mapping[tuple, Fraction] | None = None) -> None:
        clean: dict[tuple, Fraction] = {}
        for key, value in (terms or {}).items():
            if key[3] not in _TAGS:
                raise ValueError(f"unknown linear factor {key[3]!r}")
            if value:
                clean[key] = clean.get(key, Fraction(0)) + Fraction(value)
        self.terms = {k: v for k, v in clean.items() if v}

    def __add__(self, other: "InvariantPolynomial") -> "InvariantPolynomial":
        out = dict(self.terms)
        for key, value in other.terms.items():
            out[key] = out.get(key, Fraction(0)) + value
        return InvariantPolynomial(out)

    def __sub__(self, other: "InvariantPolynomial") -> "InvariantPolynomial":
        return self + other.scale(-1)

    def scale(self, factor: Fraction | int) -> "InvariantPolynomial":
        return InvariantPolynomial({k: v * factor for k, v in self.terms.items()})

    def is_zero(self) -> bool:
        return not self.terms

    def times(self, a: int = 0, b: int = 0, c: int = 0, tag: str | None = None) -> "InvariantPolynomial":
        """Multiply by ``a^a b^b c^c`` and by a linear factor (only on tag-free polynomials)."""
        out = {}
        for (i, j, k, old), value in self.terms.items():
            if tag is not None and old is not None:
                raise ValueError("a term carries at most one linear factor")
            out[(i + a, j + b, k + c, tag if tag is not None else old)] = value
        return InvariantPolynomial(out)

    def partial(self, variable: str) -> "InvariantPolynomial":
        """Partial derivative in ``a``, ``b`` or ``c`` (the linear factors held fixed)."""
        index = "abc".index(variable)
        out = {}
        for key, value in self.terms.items():
            power = key[index]
            if power:
                new = list(key)
                new[index] -= 1
                out[tuple(new)] = value * power
        return InvariantPolynomial(out)

    def _require_tag_free(self, what: str) -> None:
        if any(key[3] is not None for key in self.terms):
            raise ValueError(f"{what} acts here on polynomials in a, b, c only")

    # -- first-order operators (chain rule: grad_k a = y, grad_k c = 2k, grad_y a = k, grad_y b = 2y)
    def direction_k(self, along: str) -> "InvariantPolynomial":
        """``(S . grad_k) f = f_a (y.S) + 2 f_c (S.k)`` (``along = "S"``)."""
        self._require_tag_free("S . grad_k")
        if along != "S":
            raise ValueError(f"only S . grad_k is implemented, got {along!r}")
        return self.partial("a").times(tag="y.S") + self.partial("c").times(tag="S.k").scale(2)

    def direction_y(self, along: str) -> "InvariantPolynomial":
        """``(w . grad_y) f = f_a (w.k) + 2 f_b (y.w)`` (``along = "w"``) and
        ``(k . grad_y)``: on ``h(a, b, c)`` ``c h_a + 2 a h_b``, with ``(k . grad_y)(y.S) = S.k``
        and ``(k . grad_y)`` of ``S.k`` zero (``along = "k"``)."""
        if along == "w":
            self._require_tag_free("w . grad_y")
            return self.partial("a").times(tag="w.k") + self.partial("b").times(tag="y.w").scale(2)
        if along != "k":
            raise ValueError(f"direction must be 'w' or 'k', got {along!r}")
        out = InvariantPolynomial()
        for tag in _TAGS:
            part = InvariantPolynomial({(i, j, k, None): v for (i, j, k, t), v in self.terms.items() if t == tag})
            if part.is_zero():
                continue
            derived = part.partial("a").times(c=1) + part.partial("b").times(a=1).scale(2)
            if tag is not None:
                derived = derived.times(tag=tag)
            if tag == "y.S":
                derived = derived + part.times(tag="S.k")
            elif tag not in (None, "S.k"):
                raise ValueError(f"k . grad_y of a term with {tag} is not needed here")
            out = out + derived
        return out

    # -- second-order operators
    def mixed_divergence(self) -> "InvariantPolynomial":
        """``(grad_y . grad_k) f = 3 f_a + a f_aa + 2 b f_ab + 2 c f_ac + 4 a f_bc``."""
        self._require_tag_free("grad_y . grad_k")
        fa = self.partial("a")
        return (fa.scale(3) + fa.partial("a").times(a=1) + fa.partial("b").times(b=1).scale(2)
                + fa.partial("c").times(c=1).scale(2) + self.partial("b").partial("c").times(a=1).scale(4))

    def spin_curl(self) -> "InvariantPolynomial":
        """``S . (grad_y x grad_k) f = (f_aa - 4 f_bc) k.(y x S)``."""
        self._require_tag_free("S . (grad_y x grad_k)")
        return (self.partial("a").partial("a") - self.partial("b").partial("c").scale(4)).times(tag="k.(y x S)")

    def laplacian_k(self) -> "InvariantPolynomial":
        """``Delta_k`` of the polynomial (to check that a result is harmonic in k, i.e. STF):
        on ``h(a, b, c)`` ``b h_aa + 4 a h_ac + 6 h_c + 4 c h_cc``; a linear factor ``T`` adds
        ``2 grad_k h . grad_k T`` with ``grad_k h = h_a y + 2 h_c k``."""
        out = InvariantPolynomial()
        # what 2 grad_k h . grad_k T contributes: tag -> [(derivative, new tag, factor)]
        cross_terms = {"S.k": (("a", "y.S", 2), ("c", "S.k", 4)),
                       "k.(y x S)": (("c", "k.(y x S)", 4),),
                       "w.k": (("a", "y.w", 2), ("c", "w.k", 4))}
        for tag in _TAGS:
            h = InvariantPolynomial({(i, j, k, None): v for (i, j, k, t), v in self.terms.items() if t == tag})
            if h.is_zero():
                continue
            part = (h.partial("a").partial("a").times(b=1) + h.partial("a").partial("c").times(a=1).scale(4)
                    + h.partial("c").scale(6) + h.partial("c").partial("c").times(c=1).scale(4))
            if tag is not None:
                part = part.times(tag=tag)
            for variable, new_tag, factor in cross_terms.get(tag, ()):
                part = part + h.partial(variable).times(tag=new_tag).scale(factor)
            out = out + part
        return out

    def without_traces(self) -> "InvariantPolynomial":
        """The terms free of ``c = k.k``: for a harmonic polynomial, the STF tensor they stand for
        (the dropped terms are traces, removed by the implied STF bracket)."""
        return InvariantPolynomial({k: v for k, v in self.terms.items() if k[2] == 0})


@lru_cache(maxsize=None)
def stf_kernel(l: int) -> InvariantPolynomial:
    """``P_l(y, k) = yhat_L k_L`` as a polynomial in ``a = y.k``, ``b = y.y``, ``c = k.k``.

    Computed as the harmonic part of ``a^l``:
    ``sum_j (-1)^j (2l-2j-1)!!/((2l-1)!! 2^j j!) c^j Delta_k^j a^l`` (Thorne 1980, eq. (2.2),
    written with the Laplacian).

    Example
    -------
    >>> sorted(stf_kernel(3).terms.items())
    [((1, 1, 1, None), Fraction(-3, 5)), ((3, 0, 0, None), Fraction(1, 1))]
    """
    if isinstance(l, bool) or not isinstance(l, int) or l < 0:
        raise ValueError(f"l must be a non-negative int, got {l!r}")
    power = InvariantPolynomial({(l, 0, 0, None): Fraction(1)})
    total = InvariantPolynomial()
    current = power
    for j in range(l // 2 + 1):
        weight = Fraction((-1) ** j * _double_factorial(2 * l - 2 * j - 1),
                          _double_factorial(2 * l - 1) * 2**j * factorial(j))
        total = total + current.times(c=j).scale(weight)
        current = current.laplacian_k()
    return total


def _double_factorial(n: int) -> int:
    out = 1
    while n > 1:
        out *= n
        n -= 2
    return out


@dataclass(frozen=True)
class BodyTensor:
    """An STF tensor built from one particle's vectors: ``sum coefficient * scalars * STF[vectors]``.

    ``terms`` maps ``(vector exponents over BODY_VECTORS, scalar exponents over BODY_SCALARS)`` to
    a Fraction; ``inverse_c_power`` is the common power of ``1/c`` (physical spin ``S``).

    Example
    -------
    >>> current_spin_part(2).terms
    {((1, 0, 1, 0, 0), (0, 0, 0, 0, 0)): Fraction(3, 2)}
    """

    rank: int
    terms: Mapping[tuple, Fraction]
    inverse_c_power: int

    def coefficient(self, vectors: Mapping[str, int], scalars: Mapping[str, int] | None = None) -> Fraction:
        """The coefficient of ``STF[prod vectors]`` times ``prod scalars`` (0 if absent)."""
        key = (tuple(vectors.get(name, 0) for name in BODY_VECTORS),
               tuple((scalars or {}).get(name, 0) for name in BODY_SCALARS))
        return self.terms.get(key, Fraction(0))


_TAG_READING = {  # tag -> (vector carried, scalar carried)
    None: (None, None), "S.k": ("S", None), "y.S": (None, "y.S"), "k.(y x S)": ("y_cross_S", None),
    "w.k": ("v_cross_S", None), "y.w": (None, "y.(v x S)"),
}


def _read_off(polynomial: InvariantPolynomial, rank: int, inverse_c_power: int) -> BodyTensor:
    if not polynomial.laplacian_k().is_zero():
        raise ArithmeticError("the spin part is not harmonic in k: not an STF tensor")
    terms: dict[tuple, Fraction] = {}
    for (i, j, k, tag), value in polynomial.without_traces().terms.items():
        vector, scalar = _TAG_READING[tag]
        vectors = [0] * len(BODY_VECTORS)
        vectors[0] = i
        if vector is not None:
            vectors[BODY_VECTORS.index(vector)] += 1
        scalars = [0] * len(BODY_SCALARS)
        scalars[0] = j
        if scalar is not None:
            scalars[BODY_SCALARS.index(scalar)] += 1
        if sum(vectors) != rank:
            raise ArithmeticError(f"term of rank {sum(vectors)} in a rank-{rank} tensor")
        key = (tuple(vectors), tuple(scalars))
        terms[key] = terms.get(key, Fraction(0)) + value
    return BodyTensor(rank, {k: v for k, v in terms.items() if v}, inverse_c_power)


def _time_derivative(tensor: BodyTensor) -> BodyTensor:
    """d/dt along the particle's motion at the order needed: ``dy/dt = v``, ``dS/dt = 0`` (the spin
    precesses at relative 1PN); a term holding ``v`` would need the acceleration (refused)."""
    rules = {"y": {"v": 1}, "y_cross_S": {"v_cross_S": 1}}
    scalar_rules = {"y.y": {"y.v": 2}, "y.S": {"v.S": 1}}
    out: dict[tuple, Fraction] = {}
    for (vectors, scalars), value in tensor.terms.items():
        for names, exponents, table, index in ((BODY_VECTORS, vectors, rules, 0), (BODY_SCALARS, scalars, scalar_rules, 1)):
            for position, power in enumerate(exponents):
                if not power:
                    continue
                name = names[position]
                if name not in table:
                    raise ValueError(f"d/dt of {name} needs the acceleration: not needed at leading spin order")
                for target, weight in table[name].items():
                    new = list(exponents)
                    new[position] -= 1
                    new[names.index(target)] += 1
                    key = (tuple(new), scalars) if index == 0 else (vectors, tuple(new))
                    out[key] = out.get(key, Fraction(0)) + value * power * weight
    return BodyTensor(tensor.rank, {k: v for k, v in out.items() if v}, tensor.inverse_c_power)


@lru_cache(maxsize=None)
def current_spin_part(l: int) -> BodyTensor:
    """Spin part of the current moment ``J_L`` of one particle, leading order (no power of 1/c).

    Parameters
    ----------
    l:
        Multipole order, ``l >= 1``.

    Returns
    -------
    BodyTensor
        ``(1/(2l)) [(S.k)(grad_y . grad_k) - (k.grad_y)(S.grad_k)] P_l(y, k)`` read off as STF
        products (module docstring); for every l it comes out as ``((l+1)/2) STF[y^(l-1) S]``.

    Example
    -------
    >>> current_spin_part(1).coefficient({"S": 1})      # J_i = S_i for a particle at the origin
    Fraction(1, 1)

    References
    ----------
    Pole-dipole source (PD) in the current-moment formula (C1) of Damour & Iyer (1991), Ann.
    Inst. H. Poincare 54, 115 (as used in :mod:`stfalgebra.moments.current`).
    """
    if isinstance(l, bool) or not isinstance(l, int) or l < 1:
        raise ValueError(f"current moments start at l = 1, got {l!r}")
    kernel = stf_kernel(l)
    first = kernel.mixed_divergence().times(tag="S.k")
    second = kernel.direction_k("S").direction_y("k")
    return _read_off((first - second).scale(Fraction(1, 2 * l)), l, 0)


@lru_cache(maxsize=None)
def mass_spin_part(l: int) -> BodyTensor:
    """Spin part of the mass moment ``I_L`` of one particle, leading order (a factor ``1/c^2``).

    Parameters
    ----------
    l:
        Multipole order, ``l >= 1`` (the monopole has no spin part).

    Returns
    -------
    BodyTensor
        ``2 ((v x S).grad_y) P_l - (2(2l+1)/((l+1)^2 (2l+3))) d/dt[S.(grad_y x grad_k) P_{l+1}]``
        read off as STF products; ``inverse_c_power = 2``.

    Example
    -------
    >>> tensor = mass_spin_part(2)
    >>> tensor.coefficient({"y": 1, "v_cross_S": 1}), tensor.coefficient({"v": 1, "y_cross_S": 1})
    (Fraction(8, 3), Fraction(-4, 3))

    References
    ----------
    Pole-dipole source (PD) in the mass-moment formula (M1) of Blanchet & Damour (1989), Ann.
    Inst. H. Poincare 50, 377 (as used in :mod:`stfalgebra.moments.mass`).
    """
    if isinstance(l, bool) or not isinstance(l, int) or l < 1:
        raise ValueError(f"the mass moments' spin part starts at l = 1, got {l!r}")
    density = _read_off(stf_kernel(l).direction_y("w").scale(2), l, 2)
    inner = _read_off(stf_kernel(l + 1).spin_curl(), l, 2)
    weight = Fraction(-2 * (2 * l + 1), (l + 1) ** 2 * (2 * l + 3))
    retarded = _time_derivative(inner)
    terms = dict(density.terms)
    for key, value in retarded.terms.items():
        terms[key] = terms.get(key, Fraction(0)) + weight * value
    return BodyTensor(l, {k: v for k, v in terms.items() if v}, 2)
