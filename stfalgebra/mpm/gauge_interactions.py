"""The canonical moments M_L, S_L in terms of the source and gauge moments, derived at order G/c^5.

The linear metric of a source is given by its source moments I_L, J_L and its gauge moments
W_L, X_L, Y_L, Z_L (G = c = 1, every moment at the retarded time t - r):

    h_gen^{mu nu} = h_can^{mu nu}[I_L, J_L] + d^mu phi^nu + d^nu phi^mu - eta^{mu nu} d_rho phi^rho,
    phi^0 =  4 sum_l (-1)^l/l! d_L [W_L/r],
    phi^i = -4 sum_l (-1)^l/l! d_(iL) [X_L/r]
            - 4 sum_(l>=1) (-1)^l/l! { d_(L-1) [Y_(iL-1)/r] + l/(l+1) eps_iab d_(aL-1) [Z_(bL-1)/r] }

(h_can the linear metric of :mod:`.linear_metric` with M_L -> I_L, S_L -> J_L; Blanchet, Living
Rev. Relativ. 17, 2 (2014), sec. 2.2, from memory; the powers of c are 1/c^3 in phi^0 and 1/c^4 in
phi^i). The canonical moments M_L, S_L are those whose iterated metric is the same space-time as
the iterated metric of h_gen; at linear order M_L = I_L, S_L = J_L.

**How the relation is derived here.** Both iterated metrics are read at future null infinity in
radiative coordinates: the waveform, hence the radiative moments U_L, V_L, is the same (a
coordinate change ``x -> x + G phi + G^2 psi`` with phi, psi falling off as 1/r changes no
transverse-traceless 1/r term at order G^2). The iteration of h_gen has, beside the
quadratic terms of I_L x I_L (equal to those of M_L x M_L at this order), the quadratic terms of
every pair (source moment) x (gauge moment): the quadratic metric of such a pair, with the gauge
correction of the iteration (:mod:`.quadratic_metric`), read off as U_L, V_L
(:mod:`.radiative_readout`), is therefore ``d^l (M_L - I_L)/dt^l`` (resp. S_L - J_L). The pure
gauge part of the pair (the Lie derivative of the linear metric along phi) has no
transverse-traceless 1/r term; what remains are the homogeneous solutions that the finite-part
retarded integral produces. The result must be the l-th derivative of an instantaneous
function of the two moments (a polynomial in the derivative markers divisible by ``rate^l``,
no hereditary integral, no logarithm): :func:`canonical_shift` checks it and raises otherwise.

The power of 1/c of a pair follows from dimensions: a source moment of rank p and a gauge
moment of rank q give ``(G/c^n) A^(a) B^(b)`` with ``n = 3 + alpha + beta - gamma`` (alpha = p for
I_p, p + 1 for J_p; beta = q + 2 for W_q, Y_q, q + 3 for Z_q, q + 4 for X_q; gamma = l for M_L,
l + 1 for S_L). Relative 2.5PN is n = 5. The mass dipole is left out (centre-of-mass frame:
it vanishes at the order used; a constant dipole gives nothing, tested).

What the iteration gives at n = 5 (tests for l <= 5, :func:`compare_closed_form` through
l = 8): ``M_L - I_L = (4 G/c^5) [W^(2) I_L - W^(1) I_L^(1) + l I_<L-1 Y_i_l>^(1)]`` and nothing
else (no M x W_L, M x Y_L, I_P x W_Q or I_P x Y_Q with Q of rank >= 2, no X_L or Z_L); for S_L
the W, Y_i and W_(L-1) terms of :func:`relation_closed_form`.
At l = 2 and 3 these are the relations the radiative layer cited from memory (C1), (K1) with
``+3 I_<ij Y_k>^(1)``, (K2).

**Conventions**: c = G = 1 inside the ring (markers s1 for the source moment, s2 for the
gauge moment: ``s1^a s2^b`` is ``A^(a) B^(b)``); product structures as in
:mod:`.interactions`: ``STF[A_P B_Q]`` and ``STF[eps_iab A_aP-1 B_bQ-1]`` (no contraction at
this order), A the source moment, B the gauge moment.
"""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction
from functools import lru_cache
from math import factorial

import flint

from .coefficient_ring import RING, coefficient_items, gens, normal_form
from .harmonic_split import sample_harmonic
from .interactions import _structure
from .linear_metric import LinearMoment, cross_gradient, linear_metric
from .quadratic_metric import divergence_of_iterated_metric, far_zone_of_source, gauge_correction_far_zone
from .quadratic_source import ETA, quadratic_source
from .radiative_readout import fit_radiative_moments
from .retarded_field import COORDINATES, RetardedField, multipole_wave

__all__ = ["GaugeMoment", "gauge_vector", "gauge_metric", "gauge_pair_coefficients", "pair_order",
           "canonical_shift", "canonical_relation", "relation_closed_form", "compare_closed_form", "GAUGE_KINDS"]

#: The four families of gauge moments.
GAUGE_KINDS = ("W", "X", "Y", "Z")
_ZERO = RING.from_dict({})
_ONE = RING.from_dict({(0,) * RING.nvars(): 1})


@dataclass(frozen=True)
class GaugeMoment:
    """One gauge moment of a linear field.

    Attributes
    ----------
    kind:
        ``"W"``, ``"X"``, ``"Y"`` or ``"Z"``.
    rank:
        l; W_L and X_L from l = 0, Y_L and Z_L from l = 1.
    harmonic:
        Harmonic polynomial of degree l (the STF tensor).
    marker:
        Derivative marker, ``"s2"`` (the second factor of an interaction).
    """

    kind: str
    rank: int
    harmonic: flint.fmpq_mpoly
    marker: str = "s2"

    def __post_init__(self) -> None:
        if self.kind not in GAUGE_KINDS:
            raise ValueError(f"kind must be one of {GAUGE_KINDS}, got {self.kind!r}")
        if self.rank < (1 if self.kind in "YZ" else 0):
            raise ValueError(f"{self.kind}_L has rank >= {1 if self.kind in 'YZ' else 0}, got {self.rank}")

    @property
    def rate(self) -> flint.fmpq_mpoly:
        return gens()[self.marker]


def gauge_vector(moment: GaugeMoment) -> tuple[RetardedField, ...]:
    """The gauge vector ``phi^mu`` of one gauge moment (module docstring), mu = 0..3.

    Example
    -------
    >>> one = RING.from_dict({(0,) * 11: 1})
    >>> phi = gauge_vector(GaugeMoment("W", 0, one))
    >>> str(phi[0].terms[1])         # phi^0 = 4 W/r
    '4'
    """
    q, H, rate = moment.rank, moment.harmonic, moment.rate
    weight = flint.fmpq((-1) ** q, factorial(q))
    zero = RetardedField.zero(rate)
    if moment.kind == "W":
        return (multipole_wave(H, q, _ONE, rate).scale(4 * weight), zero, zero, zero)
    if moment.kind == "X":
        base = multipole_wave(H, q, _ONE, rate)
        return (zero,) + tuple(base.space_derivative(i).scale(-4 * weight) for i in (1, 2, 3))
    if moment.kind == "Y":
        # Y_(iQ-1) x_(Q-1) = d_i H/q
        return (zero,) + tuple(multipole_wave(H.derivative(name) * flint.fmpq(1, q), q - 1, _ONE, rate)
                               .scale(-4 * weight) for name in COORDINATES)
    # Z: (q/(q+1)) eps_iab x_a Z_(bQ-1) x_(Q-1) = (x cross grad H)_i/(q+1), harmonic of degree q
    rotated = cross_gradient(H)
    return (zero,) + tuple(multipole_wave(rotated[i] * flint.fmpq(1, q + 1), q, _ONE, rate).scale(-4 * weight)
                           for i in range(3))


def gauge_metric(moment: GaugeMoment) -> dict[tuple[int, int], RetardedField]:
    """``d^mu phi^nu + d^nu phi^mu - eta^{mu nu} d_rho phi^rho`` (mu <= nu) of one gauge moment.

    Harmonic (``d_nu h^{mu nu} = Box phi^mu = 0``) and a vacuum solution (tested).

    Example
    -------
    >>> one = RING.from_dict({(0,) * 11: 1})
    >>> h = gauge_metric(GaugeMoment("W", 0, one))
    >>> h[0, 0].dalembertian().is_zero()
    True
    """
    phi = gauge_vector(moment)
    divergence = phi[0].time_derivative()
    for i in (1, 2, 3):
        divergence = divergence + phi[i].space_derivative(i)
    out = {}
    for mu in range(4):
        for nu in range(mu, 4):
            field = phi[nu].derivative(mu).scale(ETA[mu]) + phi[mu].derivative(nu).scale(ETA[nu])
            if mu == nu:
                field = field - divergence.scale(ETA[mu])
            out[mu, nu] = field
    return out


MomentSpec = tuple[str, int]


def _is_constant(source: MomentSpec) -> bool:
    return source in (("M", 0), ("S", 1))


def _check_specs(source: MomentSpec, gauge: MomentSpec) -> None:
    kind, p = source
    if kind not in ("M", "S") or (kind == "S" and p < 1) or p < 0:
        raise ValueError(f"source moment must be ('M', p >= 0) or ('S', p >= 1), got {source!r}")
    GaugeMoment(gauge[0], gauge[1], _ONE)          # validates


@lru_cache(maxsize=None)
def gauge_pair_coefficients(source: MomentSpec, gauge: MomentSpec) -> dict[tuple[str, int, int, int], flint.fmpq_mpoly]:
    """The change of U_L, V_L from the quadratic metric of one source moment and one gauge moment.

    Parameters
    ----------
    source:
        ``("M", p)`` (I_p) or ``("S", p)`` (J_p).
    gauge:
        ``(kind, q)`` with kind in W, X, Y, Z.

    Returns
    -------
    dict
        ``{(U|V, l, contractions, epsilon): coefficient}``: the Fourier-multiplier coefficient (in
        s1, s2, and z, lg, logs if they did not cancel) of each product structure of rank l >= 2.

    Example
    -------
    >>> c = gauge_pair_coefficients(("M", 2), ("W", 0))[("U", 2, 0, 0)]
    >>> str(c)
    '-4*s1^3*s2 - 4*s1^2*s2^2 + 4*s1*s2^3 + 4*s2^4'

    References
    ----------
    Module docstring (the MPM iteration of :mod:`.quadratic_metric` with one gauge factor).
    """
    _check_specs(source, gauge)
    kind, p = source
    gauge_kind, q = gauge
    tensor_a, tensor_b = sample_harmonic(p, 1), sample_harmonic(q, 2)
    moment = LinearMoment(kind, p, tensor_a, "s1", constant=_is_constant(source))
    rate = moment.rate + gens()["s2"]
    h1, h2 = linear_metric(moment), gauge_metric(GaugeMoment(gauge_kind, q, tensor_b))
    zero = RetardedField.zero(rate)
    forward = quadratic_source(h1, h2, lambda f, mu: f.derivative(mu), lambda a, b: a.times(b), zero)
    backward = quadratic_source(h2, h1, lambda f, mu: f.derivative(mu), lambda a, b: a.times(b), zero)
    source_field = {key: RetardedField((forward[key] + backward[key]).terms, rate) for key in forward}
    u = {key: far_zone_of_source(field) for key, field in source_field.items()}
    w = [divergence_of_iterated_metric(source_field, mu) for mu in range(4)]
    v = gauge_correction_far_zone(w, rate)
    # the shift to radiative coordinates (a monopole source factor) moves the gauge metric only,
    # whose transverse-traceless part at 1/r is zero
    spatial = {(i, j): u[(i, j)] + v[(i, j)] for i in range(1, 4) for j in range(i, 4)}
    polar = (kind == "M") == (gauge_kind != "Z")
    structures, keys = [], []
    for epsilon in (0, 1):
        for contractions in range(0, min(p, q) - epsilon + 1):
            tensor, degree = _structure(tensor_a, tensor_b, p, q, contractions, epsilon)
            if degree < 2 or tensor.is_zero():
                continue
            moment_kind = "U" if polar == (epsilon == 0) else "V"
            structures.append((moment_kind, degree, tensor))
            keys.append((moment_kind, degree, contractions, epsilon))
    if not structures:
        return {}
    coefficients = fit_radiative_moments(spatial, structures)
    return {key: normal_form(value, rate) for key, value in zip(keys, coefficients)}


def pair_order(source: MomentSpec, gauge: MomentSpec, target: str, l: int) -> int:
    """The power n of 1/c of the pair's terms in M_L (target "M") or S_L (target "S").

    Example
    -------
    >>> pair_order(("M", 2), ("W", 0), "M", 2), pair_order(("M", 2), ("X", 0), "M", 2)
    (5, 7)
    """
    alpha = source[1] + (1 if source[0] == "S" else 0)
    beta = gauge[1] + {"W": 2, "Y": 2, "Z": 3, "X": 4}[gauge[0]]
    gamma = l + (1 if target == "S" else 0)
    return 3 + alpha + beta - gamma


@lru_cache(maxsize=None)
def canonical_shift(source: MomentSpec, gauge: MomentSpec, target: str, l: int, epsilon: int) -> dict[tuple[int, int], Fraction]:
    """The coefficients of one pair in M_L - I_L (target "M") or S_L - J_L (target "S").

    Returns
    -------
    dict
        ``{(a, b): c}``: the pair contributes ``(G/c^n) sum c A^(a) B^(b)`` in the structure
        ``STF[A_P B_Q]`` (epsilon 0) or ``STF[eps_iab A_aP-1 B_bQ-1]`` (epsilon 1), n of
        :func:`pair_order`. Empty when the iteration gives zero.

    Raises
    ------
    ArithmeticError
        If the change of U_L, V_L is not the l-th derivative of an instantaneous product
        (a hereditary or logarithmic remainder): then it would not be a relation between moments.

    Example
    -------
    >>> canonical_shift(("M", 2), ("Y", 1), "M", 3, 0)        # 12 I_<ij Y_k>^(1)
    {(0, 1): Fraction(12, 1)}
    """
    moment_kind = "U" if target == "M" else "V"
    coefficient = gauge_pair_coefficients(source, gauge).get((moment_kind, l, 0, epsilon), _ZERO)
    if coefficient.is_zero():
        return {}
    g = gens()
    rate = (_ZERO if _is_constant(source) else g["s1"]) + g["s2"]
    quotient, remainder = divmod(coefficient, rate ** l)
    if not remainder.is_zero():
        raise ArithmeticError(f"{source} x {gauge} in {moment_kind}_{l} is not an l-th derivative: {coefficient}")
    out = {}
    for exponents, value in coefficient_items(quotient):
        if set(exponents) - {"s1", "s2"}:
            raise ArithmeticError(f"{source} x {gauge}: non-instantaneous term {quotient}")
        out[(exponents.get("s1", 0), exponents.get("s2", 0))] = value
    return out


@lru_cache(maxsize=None)
def canonical_relation(target: str, l: int, order: int = 5) -> tuple[tuple[MomentSpec, MomentSpec, int, dict], ...]:
    """Every pair of M_L - I_L (target "M") or S_L - J_L (target "S") at order ``G/c^order``.

    Pairs (source moment, gauge moment) without contraction, allowed by rank and parity, the
    mass dipole left out (centre-of-mass frame), with a non-zero coefficient.

    Returns
    -------
    tuple
        ``(source, gauge, epsilon, {(a, b): c})`` (see :func:`canonical_shift`).

    Example
    -------
    >>> for source, gauge, epsilon, terms in canonical_relation("M", 4):
    ...     print(source, gauge, epsilon, terms)
    ('M', 3) ('Y', 1) 0 {(0, 1): Fraction(16, 1)}
    ('M', 4) ('W', 0) 0 {(1, 1): Fraction(-4, 1), (0, 2): Fraction(4, 1)}

    References
    ----------
    Module docstring: derived by the quadratic iteration; at l = 2, 3 it reproduces the
    relations of Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 3.3 and Faye, Blanchet & Iyer,
    Class. Quantum Grav. 32, 045016 (2015), sec. 2 (from memory; tests).
    """
    if target not in ("M", "S"):
        raise ValueError(f"target must be 'M' or 'S', got {target!r}")
    if isinstance(l, bool) or not isinstance(l, int) or l < 2:
        raise ValueError(f"l must be an integer >= 2 (the waveform defines U_L, V_L), got {l!r}")
    out = []
    for kind in ("M", "S"):
        for p in range(0 if kind == "M" else 1, l + 2):
            if (kind, p) == ("M", 1):
                continue
            for gauge_kind in GAUGE_KINDS:
                for q in range(1 if gauge_kind in "YZ" else 0, l + 2):
                    source, gauge = (kind, p), (gauge_kind, q)
                    if pair_order(source, gauge, target, l) != order:
                        continue
                    polar = (kind == "M") == (gauge_kind != "Z")
                    for epsilon in (0, 1):
                        natural = polar == (epsilon == 0)
                        if natural != (target == "M") or p + q - epsilon != l:
                            continue
                        terms = canonical_shift(source, gauge, target, l, epsilon)
                        if terms:
                            out.append((source, gauge, epsilon, terms))
    return tuple(out)


def relation_closed_form(target: str, l: int) -> tuple[tuple[MomentSpec, MomentSpec, int, dict], ...]:
    """The iteration's relation at G/c^5 (:func:`canonical_relation`) in closed form, any l >= 2.

    Mass (target "M"):

        M_L - I_L = (4 G/c^5) [W^(2) I_L - W^(1) I_L^(1) + l I_<L-1 Y_i_l>^(1)];

    current (target "S"), with ``E[A, B] = STF_L[eps_(i_l a b) A_(a ...) B_(b ...)]`` (first
    factor the source moment):

        S_L - J_L = (G/c^5) [2 (l-1) E[I_ab^(3), W_(L-1)] - (4/l) E[I_L^(1), Y^(1)] + 4 E[I_L, Y^(2)]
                             + (4 (l^2 - 1)/l) J_<L-1 Y_i_l>^(1) - 4 J_L^(1) W^(1)]

    (Y the dipole Y_i, W = W_L at l = 0; at l = 2 the mass Y term holds the mass dipole and is left
    out, as in :func:`canonical_relation`). Read off the iteration, which the tests compare with it
    for l <= 5 (mass) and l <= 4 (current); it was also compared for mass l = 6, 7, 8 and current
    l = 5, 6, 7, 8 when written (up to about a minute each: the zero pairs are the slow ones;
    ``python3 -m stfalgebra.mpm.gauge_interactions 8`` repeats it, :func:`compare_closed_form`).

    Example
    -------
    >>> relation_closed_form("M", 4) == canonical_relation("M", 4)
    True
    """
    if target not in ("M", "S"):
        raise ValueError(f"target must be 'M' or 'S', got {target!r}")
    if isinstance(l, bool) or not isinstance(l, int) or l < 2:
        raise ValueError(f"l must be an integer >= 2, got {l!r}")
    if target == "M":
        w_term = (("M", l), ("W", 0), 0, {(1, 1): Fraction(-4), (0, 2): Fraction(4)})
        if l == 2:          # the Y term holds the mass dipole, left out (centre-of-mass frame)
            return (w_term,)
        return ((("M", l - 1), ("Y", 1), 0, {(0, 1): Fraction(4 * l)}), w_term)
    return ((("M", 2), ("W", l - 1), 1, {(3, 0): Fraction(2 * (l - 1))}),
            (("M", l), ("Y", 1), 1, {(1, 1): Fraction(-4, l), (0, 2): Fraction(4)}),
            (("S", l - 1), ("Y", 1), 0, {(0, 1): Fraction(4 * (l * l - 1), l)}),
            (("S", l), ("W", 0), 0, {(1, 1): Fraction(-4)}))


def compare_closed_form(lmax: int) -> list[tuple[str, int, bool]]:
    """Compare :func:`relation_closed_form` with :func:`canonical_relation` for 2 <= l <= lmax
    (minutes at lmax = 8; ``python3 -m stfalgebra.mpm.gauge_interactions 8`` prints the result).

    Example
    -------
    >>> compare_closed_form(2)
    [('M', 2, True), ('S', 2, True)]
    """
    return [(target, l, relation_closed_form(target, l) == canonical_relation(target, l))
            for l in range(2, lmax + 1) for target in ("M", "S")]


if __name__ == "__main__":          # pragma: no cover - an on-demand check
    import sys

    results = compare_closed_form(int(sys.argv[1]) if len(sys.argv) > 1 else 8)
    for target, l, same in results:
        print(f"{target}_L - {'I' if target == 'M' else 'J'}_L, l = {l}: {'closed form = iteration' if same else 'DIFFERENT'}")
    sys.exit(0 if all(same for _, _, same in results) else 1)
