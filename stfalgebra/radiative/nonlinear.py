"""Quadratic interactions of the source moments in the radiative moments, at relative 1.5PN.

At order G/c^3 beyond the instantaneous d^l I_L/dt^l, the radiative moments carry the tail
(mass monopole M times I_L or J_L, :mod:`stfalgebra.radiative.tails`) and, for l >= 4 mass and
l >= 3 current moments, products of two source moments: instantaneous products and memory
integrals. Their coefficients are DERIVED by the MPM iteration (:mod:`stfalgebra.mpm`), read
here through :func:`~stfalgebra.radiative.interaction_table.radiative_terms`, for every l; for
example (the tests compare these with the published forms, Blanchet, Living Rev. Relativ. 17, 2
(2014), sec. 3; Blanchet, Faye, Iyer & Sinha, Class. Quantum Grav. 25, 165003 (2008))

    U_ijkl = I^(4)_ijkl + (G/c^3) { 2M tail
             + (2/5) int I^(3)_<ij I^(3)_kl> (memory)
             - (21/5) I_<ij I^(5)_kl> - (63/5) I^(1)_<ij I^(4)_kl> - (102/5) I^(2)_<ij I^(3)_kl> },
    V_ijk  = J^(3)_ijk + (G/c^3) { 2M tail
             + (1/10) eps_ab<i I^(5)_ja I_k>b - (1/2) eps_ab<i I^(4)_ja I^(1)_k>b
             - 2 J_<i I^(4)_jk> }.

The canonical moments M_L, S_L of the iteration equal the source moments I_L, J_L at this order
(they differ at relative 5/2); the products are formed in the toolkit's own moments and their
time derivatives along the Newtonian orbit.

How the products are formed (every tensor a :class:`~stfalgebra.moments.orbit_tensor.OrbitTensor`,
i.e. the STF part of a polynomial in X = x.k, V = v.k, L = ell.k):

* ``A_<L B_K>`` is the product of the two polynomials (trace parts of A or B carry a factor
  k^2 and drop out of the outer STF part);
* ``eps_ab<i A_(P-1)a B_(Q-1)>b`` is ``k . ((A_(P-1)a k_(P-1)) x (B_(Q-1)b k_(Q-1)))``; with
  ``A_(P-1)a k_(P-1) = (1/p) dA/dk = (1/p)(A_X x + A_V v)`` and ``x cross v = ell`` this is
  ``(A_X B_V - A_V B_X) L / (p q)`` (the terms along k vanish in k . (k x w)).

The hereditary (memory) integral is evaluated on a circular orbit only, harmonic by harmonic
(:func:`~stfalgebra.radiative.tails.hereditary_harmonic_integral`, ``i/s``); its
non-oscillating part, which feeds the even-l m = 0 modes, is out of scope and refused.

Which interactions U_L and V_L hold at relative 1.5PN (:func:`stfalgebra.mpm.interactions.allowed_pairs`)
follows from counting dimensions and parity: a product G/c^3 X_A Y_B of two source moments
fits in U_L when it is I_A I_B with |A| + |B| = l (|A|, |B| >= 2: the monopole term is the
tail, the dipole vanishes in the centre-of-mass frame) and in V_L when it is
eps I_A I_B with |A| + |B| = l + 1 or J_A I_B with |A| + |B| = l (|A| >= 1, |B| >= 2).
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache

from fractions import Fraction

from ..lazy_sympy import sp

from ..errors import RefusedModeError
from ..moments.current import current_moment
from ..moments.mass import mass_moment
from ..moments.orbit_tensor import OrbitTensor, differentiate_along_orbit
from ..pnseries import PNSeries
from .. import symbols as S
from .contributions import check_degree, check_mode
from .projection import mode_channel, mode_kind

__all__ = [
    "quadratic_terms",
    "InteractionTerm",
    "symmetric_product",
    "cross_product",
    "quadratic_instantaneous_tensor",
    "quadratic_channel_circular",
]

_KINDS = ("mass", "current")
_SYMBOL = {"mass": "I", "current": "J"}
_INDEX_NAMES = "ijklmnpqrs"


@dataclass(frozen=True)
class InteractionTerm:
    """One non-linear term ``coefficient * G^(n-1)/c^(...) * [F_1 (x) ... (x) F_n]`` of a
    radiative moment, a product of ``n >= 2`` source moments.

    ``factors`` are ``(kind, rank, derivatives)`` of source moments ("mass" I_L or "current"
    J_L); ``product`` is "symmetric" (``A_<L B_K ...>``, any number of factors) or "cross"
    (``eps_ab<i A_(P-1)a B_(Q-1)>b``, two mass-type factors); ``hereditary`` marks the memory
    integral ``int_0^oo dtau [...](t - tau)``. Quadratic terms have two factors, the cubic
    interactions of later orders (tails of tails, ``M x M x I_L``) three.
    """

    coefficient: Fraction
    product: str
    factors: tuple[tuple[str, int, int], ...]
    hereditary: bool = False

    def __post_init__(self) -> None:
        if len(self.factors) < 2:
            raise ValueError(f"an interaction has at least two factors, got {self.factors!r}")
        if self.product == "cross" and len(self.factors) != 2:
            raise ValueError("the cross product eps_ab<i A_a B_b> takes exactly two factors")
        if self.product not in ("symmetric", "cross"):
            raise ValueError(f"product must be 'symmetric' or 'cross', got {self.product!r}")

    @property
    def left(self) -> tuple[str, int, int]:
        return self.factors[0]

    @property
    def right(self) -> tuple[str, int, int]:
        return self.factors[-1]

    def describe(self) -> str:
        """The term in plain text, e.g. ``-(21/5) I_<ij I^(5)_kl>``.

        Example
        -------
        >>> factors = (("mass", 2, 1), ("current", 1, 0), ("mass", 2, 0))
        >>> InteractionTerm(Fraction(2, 7), "symmetric", factors).describe()
        '(2/7) I^(1)_<ij J_k I_lm>'
        """
        def factor(spec: tuple[str, int, int], indices: str) -> str:
            kind, rank, times = spec
            mark = f"^({times})" if times else ""
            return f"{_SYMBOL[kind]}{mark}_{indices}"

        ranks = [rank for _, rank, _ in self.factors]
        if self.product == "symmetric":
            names = _INDEX_NAMES[:sum(ranks)]
            pieces, start = [], 0
            for k, spec in enumerate(self.factors):
                indices = names[start:start + spec[1]]
                start += spec[1]
                if k == 0:
                    indices = "<" + indices
                if k == len(self.factors) - 1:
                    indices = indices + ">"
                pieces.append(factor(spec, indices))
            body = " ".join(pieces)
        else:
            p, q = ranks
            names = _INDEX_NAMES[:p + q - 1]
            body = (f"eps_ab<{names[0]} {factor(self.left, names[1:p] + 'a')} "
                    f"{factor(self.right, names[p:] + '>b')}")
        if self.hereditary:
            body = f"int_0^oo dtau {body}(t - tau)"
        return f"({self.coefficient}) {body}"


_KIND_OF = {"M": "mass", "S": "current"}


def quadratic_terms(l: int, kind: str) -> tuple[InteractionTerm, ...]:
    """The quadratic terms (inside ``(G/c^3){...}``) of U_L (``kind="mass"``) or V_L at 1.5PN.

    Derived by the MPM iteration (:mod:`stfalgebra.radiative.interaction_table`); the tail
    (M x I_L) is not among them (:mod:`stfalgebra.radiative.tails`), nor are pairs whose
    coefficient comes out zero.

    Example
    -------
    >>> [term.describe() for term in quadratic_terms(3, "current")][0]
    '(-2) J_<i I^(4)_jk>'
    """
    return _quadratic_terms(check_degree(l), _check_kind(kind))


@lru_cache(maxsize=None)
def _quadratic_terms(l: int, kind: str) -> tuple[InteractionTerm, ...]:
    from .interaction_table import radiative_terms

    out = []
    for term in radiative_terms("U" if kind == "mass" else "V", l, Fraction(3, 2)):
        if term.kind not in ("instantaneous", "memory") or term.order != Fraction(3, 2) or not term.coefficient:
            continue
        if term.contractions:
            raise AssertionError(f"a contracted pair at relative 3/2 in {kind} l = {l}: {term}")
        factors = tuple((_KIND_OF[name], rank, times) for name, rank, times in term.factors)
        out.append(InteractionTerm(term.coefficient, "cross" if term.epsilon else "symmetric", factors,
                                   hereditary=term.kind == "memory"))
    return tuple(out)


# ----------------------------------------------------------------------------- validation


def _check_kind(kind) -> str:
    if not isinstance(kind, str):
        raise TypeError(f"kind must be the string 'mass' or 'current', got {kind!r}")
    if kind not in _KINDS:
        raise ValueError(f"kind must be 'mass' or 'current', got {kind!r}")
    return kind


def _check_tensor(tensor, name: str) -> OrbitTensor:
    if not isinstance(tensor, OrbitTensor):
        raise TypeError(f"{name} must be a OrbitTensor, got {tensor!r}")
    return tensor


# ----------------------------------------------------------------------------- products
def symmetric_product(left: OrbitTensor, right: OrbitTensor) -> OrbitTensor:
    """Return ``A_<L B_K>``, the STF part of the tensor product, as a orbit tensor.

    Parameters
    ----------
    left, right:
        Orbit tensors A_L (rank p) and B_K (rank q), any number of ell factors.

    Returns
    -------
    OrbitTensor
        Rank p + q; monomials multiply (``x_<A v_B ell_C>`` exponents add), coefficients
        multiply as PN series.

    **Conventions**: the STF bracket over all p + q indices is implied, as everywhere in
    :class:`~stfalgebra.moments.orbit_tensor.OrbitTensor`; traces of A and B carry a
    factor k^2 in the probe polynomial and drop out of it.

    Example
    -------
    >>> from stfalgebra.moments.orbit_tensor import OrbitTensor
    >>> xx = OrbitTensor.monomial(2, (2, 0, 0))
    >>> sorted(symmetric_product(xx, OrbitTensor.monomial(1, (0, 1, 0))).terms)
    [(2, 1, 0)]

    References
    ----------
    Thorne, Rev. Mod. Phys. 52, 299 (1980), sec. II (STF tensors as harmonic polynomials).
    """
    left = _check_tensor(left, "left")
    right = _check_tensor(right, "right")
    out: dict[tuple[int, int, int], PNSeries] = {}
    for (a1, b1, c1), s1 in left.terms.items():
        for (a2, b2, c2), s2 in right.terms.items():
            key = (a1 + a2, b1 + b2, c1 + c2)
            piece = s1 * s2
            out[key] = out[key] + piece if key in out else piece
    return OrbitTensor(left.rank + right.rank, {k: v.expand() for k, v in out.items()})


def cross_product(left: OrbitTensor, right: OrbitTensor) -> OrbitTensor:
    """Return ``eps_ab<i A_(P-1)a B_(Q-1)>b`` for two planar mass-type tensors.

    Parameters
    ----------
    left, right:
        Orbit tensors A (rank p >= 1) and B (rank q >= 1) built from x and v only (no ell
        factor: mass-type moments of a planar orbit).

    Returns
    -------
    OrbitTensor
        Rank p + q - 1 with one ell factor in every term: with A = f(X, V), B = g(X, V)
        (X = x.k, V = v.k) the probe polynomial is ``(f_X g_V - f_V g_X) (ell.k)/(p q)``.

    **Conventions**: ``eps_ab<i A_(P-1)a B_(Q-1)>b`` means
    ``eps_abi A_(P-1)a B_(Q-1)b`` STF over its p + q - 1 free indices; ell = x cross v.

    Example
    -------
    >>> from stfalgebra.moments.orbit_tensor import OrbitTensor
    >>> x_ = OrbitTensor.monomial(1, (1, 0, 0))
    >>> v_ = OrbitTensor.monomial(1, (0, 1, 0))
    >>> cross_product(x_, v_).terms[(0, 0, 1)].coefficient(0)    # eps_abi x_a v_b = ell_i
    1

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 3 (the eps_ab<i products of V_ijk);
    common practice (vector identities).
    """
    left = _check_tensor(left, "left")
    right = _check_tensor(right, "right")
    if left.rank < 1 or right.rank < 1:
        raise ValueError(f"cross product needs ranks >= 1, got {left.rank} and {right.rank}")
    for name, tensor in (("left", left), ("right", right)):
        if any(c for (_, _, c) in tensor.terms):
            raise ValueError(f"cross product is defined here for tensors of x and v only; "
                             f"{name} has an ell factor: {tensor}")
    weight = Fraction(1, left.rank * right.rank)
    out: dict[tuple[int, int, int], PNSeries] = {}
    for (a1, b1, _), s1 in left.terms.items():
        for (a2, b2, _), s2 in right.terms.items():
            jacobian = a1 * b2 - b1 * a2
            if jacobian == 0:
                continue
            key = (a1 + a2 - 1, b1 + b2 - 1, 1)
            piece = s1 * s2 * (weight * jacobian)
            out[key] = out[key] + piece if key in out else piece
    return OrbitTensor(left.rank + right.rank - 1, {k: v.expand() for k, v in out.items()})


# ----------------------------------------------------------------------------- the terms
@lru_cache(maxsize=None)
def _source_derivative(kind: str, rank: int, times: int) -> OrbitTensor:
    moment = mass_moment(rank, 0) if kind == "mass" else current_moment(rank, 0)
    return differentiate_along_orbit(moment, 0, times=times)


@lru_cache(maxsize=None)
def _term_tensor(term: InteractionTerm) -> OrbitTensor:
    tensors = [_source_derivative(*spec) for spec in term.factors]
    if term.product == "cross":
        return cross_product(*tensors).scale(term.coefficient)
    product = tensors[0]
    for tensor in tensors[1:]:
        product = symmetric_product(product, tensor)
    return product.scale(term.coefficient)


def _interaction_terms(l: int, kind: str) -> tuple[InteractionTerm, ...]:
    return quadratic_terms(l, kind)


def _with_prefactor(series: PNSeries) -> PNSeries:
    """Multiply by G/c^3 (eps = 1/c: a shift by 3/2 orders)."""
    return (series * S.G).shift(sp.Rational(3, 2))


def quadratic_instantaneous_tensor(l: int, kind: str) -> OrbitTensor:
    """Return the instantaneous quadratic part of U_L or V_L (with its G/c^3), general orbit.

    Parameters
    ----------
    l:
        Multipole degree, ``>= 2``.
    kind:
        ``"mass"`` (U_L) or ``"current"`` (V_L).

    Returns
    -------
    OrbitTensor
        Sum of the instantaneous terms of :func:`quadratic_terms` for (kind, l) with
        the Newtonian source moments differentiated along the Newtonian orbit; coefficients
        PN series in eps = 1/c starting at order 3/2. Zero for l = 2 and l = 3 mass (no such
        terms at this order). The hereditary (memory) term is not included. Moments beyond
        the tabulated ones (l > 8) run the MPM iteration first (seconds to minutes).

    **Conventions**: x = y1 - y2, ell = x cross v (``../shared/conventions.md``); G, c explicit.

    Example
    -------
    >>> T = quadratic_instantaneous_tensor(3, "current")
    >>> T.rank, min(s.leading_order for s in T.terms.values())
    (3, PNOrder(3/2))

    References
    ----------
    The MPM iteration (:mod:`stfalgebra.mpm`), through :func:`quadratic_terms`.
    """
    l = check_degree(l)
    kind = _check_kind(kind)
    total = OrbitTensor.zero(l)
    for term in _interaction_terms(l, kind):
        if not term.hereditary:
            total = total + _term_tensor(term)
    kept = {key: _with_prefactor(value) for key, value in total.terms.items() if value.orders}
    return OrbitTensor(l, kept)


def _circular(expr: sp.Expr) -> sp.Expr:
    """A Newtonian coefficient on the circular orbit: rdot = 0, phidot = omega, G m = omega^2 r^3."""
    value = sp.sympify(expr).subs({S.rdot: 0, S.phidot: S.omega})
    return sp.expand(value.subs(S.G, S.omega**2 * S.r**3 / S.m))


@lru_cache(maxsize=None)
def quadratic_channel_circular(l: int, m: int) -> PNSeries:
    """Return the quadratic part of the radiative moment on the channel of mode (l, m), circular orbit.

    Parameters
    ----------
    l, m:
        The mode; its kind (mass for l + m even, current for l + m odd) picks U_L or V_L,
        and its channel (p, q, c) with p - q = m (:func:`~stfalgebra.radiative.projection.mode_channel`).

    Returns
    -------
    PNSeries
        In eps = 1/c, starting at order 3/2 (the G/c^3), coefficients in G, m, nu, delta, r,
        omega with the factor exp(-i m phi) implied: the instantaneous products and the
        oscillating part of the memory integral, ``int_0^oo dtau exp(i m omega tau) = i/(m
        omega)`` (derived, Abel-regulated). Exactly zero where the iteration gives no term
        (l = 2, l = 3 mass).

    Raises
    ------
    RefusedModeError
        m = 0 of a moment with a memory term (even l): the non-oscillating memory is out of scope.

    **Conventions**: Newtonian circular orbit (rdot = 0, phidot = omega, G m = omega^2 r^3
    inside the moments; enough at relative 1.5PN); harmonics exp(-i m omega t).

    Example
    -------
    >>> quadratic_channel_circular(2, 2).orders
    ()
    >>> quadratic_channel_circular(4, 4).leading_order
    PNOrder(3/2)

    References
    ----------
    :func:`quadratic_terms` (derived); Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 9 (the memory
    on circular orbits).
    """
    l, m = check_mode(l, m)
    kind = mode_kind(l, m)
    terms = _interaction_terms(l, kind)
    if m == 0 and any(term.hereditary for term in terms):
        raise RefusedModeError(
            f"mode ({l},0): the non-oscillating (m = 0) part of the non-linear memory is not "
            f"computed")
    p, q, c = mode_channel(l, m)
    total = PNSeries({}, sp.oo)
    for term in terms:
        channel = _term_tensor(term).channel(p, q, c).map_coefficients(_circular)
        if term.hereditary:
            from .tails import hereditary_harmonic_integral

            factor = hereditary_harmonic_integral(m * S.omega)
            channel = channel.map_coefficients(lambda e: sp.expand(e * factor))
        total = total + channel
    if not total.orders and total.is_exact:
        return PNSeries({}, sp.oo)
    return _with_prefactor(total)
