"""The canonical corrections M_L - I_L and S_L - J_L at relative 2.5PN on the circular orbit.

The multipolar iteration runs with the canonical moments; at relative 2.5PN they differ from the
source moments through the gauge moments. The relations are derived by the quadratic iteration
with the linear gauge vector of W_L, X_L, Y_L, Z_L (:mod:`stfalgebra.mpm.gauge_interactions`; the
pairs source moment x gauge moment read at future null infinity), for every l, in the closed form
:func:`~stfalgebra.mpm.gauge_interactions.relation_closed_form`:

    M_L = I_L + (4 G/c^5) [W^(2) I_L - W^(1) I_L^(1) + l I_<L-1 Y_i_l>^(1)],                (K1_l)
    S_L = J_L + (G/c^5) [2 (l-1) E[I_ab^(3), W_(L-1)] - (4/l) E[I_L^(1), Y^(1)] + 4 E[I_L, Y^(2)]
                         + (4 (l^2 - 1)/l) J_<L-1 Y_i_l>^(1) - 4 J_L^(1) W^(1)],              (K2_l)

``E[A, B] = STF_L[eps_(i_l a b) A_(a ...) B_(b ...)]``, Y = Y_i the dipole, W = W_L at l = 0.
At l = 2, 3 they are the relations cited from memory before (Blanchet, Faye, Iyer & Sinha, Class.
Quantum Grav. 25, 165003 (2008), sec. 5; Faye, Blanchet & Iyer, Class. Quantum Grav. 32, 045016
(2015), sec. 2; Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 3.3):

    M_ijk = I_ijk + (4 G/c^5) [W^(2) I_ijk - W^(1) I_ijk^(1) + 3 I_<ij Y_k>^(1)],             (K1)
    S_ij  = J_ij  + (2 G/c^5) [eps_ab<i (-I_j>b^(3) W_a - 2 I_j>b Y_a^(2) + I_j>b^(1) Y_a^(1))
                               + 3 J_<i Y_j>^(1) - 2 J_ij^(1) W^(1)]                           (K2)

(``eps_ab<i A_j>b B_a = -E[A, B]``). **The sign of the Y term of (K1)** was recalled as -3; the
iteration gives +3, as the project had concluded from the constant canonical dipole (the derived
2.5PN source dipole is ``-(4 G/c^5) M Y_i^(1)``, the l = 1 member of (K1_l)) and from the
published (3,3), (3,1) modes (Blanchet, Faye, Iyer & Sinha 2008, from memory).

The two-body gauge moments W_L, Y_L are those of :mod:`stfalgebra.moments.canonical` (Newtonian
order, derived). On the circle W = nu m r rdot/3 and its derivatives vanish (rdot = 0, Kepler's
law), so the Y_i (and, in S_L, W_(L-1)) terms remain. The Y_i terms of (K1_l), (K2_l) are minus
the change of I_L, J_L when every body is moved by s(t), (4 G/c^5) Y_i^(1) = -s (tested for
generic point masses, tests/mpm/test_gauge_interactions.py), and on the circle (K1_l) is minus the
centre-of-mass-shift part of the derived 2.5PN I_L (tested, l = 3..8): the canonical moments undo
the 2.5PN shift of the centre of mass that the source moments carry.

The terms are evaluated as harmonic probe polynomials
(:mod:`stfalgebra.radiative.circular_interactions`): ``A_<P B_Q> k^L`` is the product
``A(k) B(k)`` on a null k, ``E[A, B] k^L = ((p-1)! (q-1)!/(p! q!)) eps_(iab) k_i d_a A(k) d_b B(k)``;
a time derivative multiplies the harmonic s by ``-i s omega``. U_L = M_L^(l), V_L = S_L^(l).

**Conventions**: channels of :mod:`stfalgebra.moments.orbit_tensor` (the factor exp(-i m phi)
implied), eps = 1/c, engine coefficients in G, m, nu, delta, r, phidot (= omega on the circle), I;
Kepler's law is applied by the circular reduction; harmonic coordinates.
"""

from __future__ import annotations

from fractions import Fraction
from functools import lru_cache
from math import factorial

from ..exact import ExactPolynomial
from ..moments.canonical import gauge_moment_w_l, gauge_moment_y
from ..mpm.gauge_interactions import relation_closed_form
from ..orders import PNOrder
from ..pnseries import PNSeries
from .circular_interactions import (
    _derivative, _null_reduced, _scaled, _sum, _times, _triple, orbit_tensor_probe, probe_polynomial,
)
from .contributions import Contribution, check_mode, mode_kind
from .projection import mode_channel

__all__ = ["K1_Y_COEFFICIENT", "canonical_mass_probe", "canonical_current_probe", "canonical_octupole_probe",
           "y_coefficient", "canonical_current_quadrupole_probe", "circular_canonical_channel",
           "CANONICAL_LMAX"]

_G = ExactPolynomial("G")
#: The coefficient of I_<ij Y_k>^(1) in (K1): +3, not the recalled -3 (module docstring).
K1_Y_COEFFICIENT = 3
#: The largest l whose closed form (K1_l), (K2_l) was compared with the iteration (mass l <= 8,
#: current l <= 8; the tests repeat l <= 5 and l <= 4).
CANONICAL_LMAX = 8


def _newtonian(pieces: tuple[dict, int]):
    return pieces[0].get(0, {})


def _mass(rank: int):
    return _newtonian(probe_polynomial("M", rank, 0))


def _current(rank: int):
    return _newtonian(probe_polynomial("S", rank, 0))


def _gauge(tensor):
    return _newtonian(orbit_tensor_probe(tensor))


def _epsilon_pair(vector, tensor):
    """``eps_ab<i A_j>b B_a k^ij`` for B = ``vector`` (rank 1), A = ``tensor`` (rank 2)."""
    return _scaled(_triple(vector, tensor), Fraction(1, 2))


def _source_probe(spec: tuple[str, int]):
    kind, rank = spec
    return _mass(rank) if kind == "M" else _current(rank)


def _gauge_probe(spec: tuple[str, int]):
    kind, rank = spec
    if kind == "W":
        return _gauge(gauge_moment_w_l(rank))
    if kind == "Y":
        return _gauge(gauge_moment_y(rank))
    raise ValueError(f"the two-body gauge moment {kind}_L is not derived (W_L and Y_L are)")


def _relation_probe(target: str, l: int) -> dict:
    """``(M_L - I_L) k^L`` (target "M") or ``(S_L - J_L) k^L`` (target "S") on the circle, the 1/c^5
    apart, from the derived relation's terms (module docstring)."""
    pieces = []
    for source, gauge, epsilon, terms in relation_closed_form(target, l):
        left, right = _source_probe(source), _gauge_probe(gauge)
        p, q = source[1], gauge[1]
        weight = Fraction(factorial(p - epsilon) * factorial(q - epsilon), factorial(p) * factorial(q))
        for (a, b), value in terms.items():
            first, second = _derivative(left, a), _derivative(right, b)
            product = _triple(first, second) if epsilon else _times(first, second)
            pieces.append(_scaled(product, weight * value))
    return _null_reduced(_scaled(_sum(pieces), _G))


@lru_cache(maxsize=None)
def canonical_mass_probe(l: int) -> dict:
    """``(M_L - I_L) k^L`` on the circle for l >= 3, the bracket of (K1_l),

        M_L - I_L = (4 G/c^5) [W^(2) I_L - W^(1) I_L^(1) + l I_<L-1 Y_i_l>^(1)],          (K1_l)

    times 4 G (the 1/c^5 apart), as a probe polynomial in B, Bb, Z (harmonic after the null
    reduction). (K1_l) is derived by the quadratic iteration with the gauge vector
    (:mod:`stfalgebra.mpm.gauge_interactions`); its l = 3 member is (K1). ``I_<L-1 Y_i_l> k^L`` is
    the product ``I(k) Y(k)`` on a null k.

    Example
    -------
    >>> sorted(canonical_mass_probe(4))          # harmonics 4 and 2 (and their conjugates)
    [(0, 4, 0), (1, 3, 0), (3, 1, 0), (4, 0, 0)]
    """
    if isinstance(l, bool) or not isinstance(l, int):
        raise TypeError(f"multipole order l must be an int, got {l!r}")
    if l < 3:
        raise ValueError(f"the general-l canonical correction is entered for l >= 3, got {l}")
    return _relation_probe("M", l)


@lru_cache(maxsize=None)
def canonical_current_probe(l: int) -> dict:
    """``(S_L - J_L) k^L`` on the circle for l >= 2, the bracket of (K2_l) times G (the 1/c^5
    apart), as a probe polynomial; (K2_l) derived by the iteration (module docstring). At l = 2
    it is the cited (K2), :func:`canonical_current_quadrupole_probe` (tested).

    Example
    -------
    >>> canonical_current_probe(2) == canonical_current_quadrupole_probe()     # zero with Kepler's law
    True
    """
    if isinstance(l, bool) or not isinstance(l, int):
        raise TypeError(f"multipole order l must be an int, got {l!r}")
    if l < 2:
        raise ValueError(f"the canonical current correction is entered for l >= 2, got {l}")
    return _relation_probe("S", l)


def y_coefficient(l: int) -> int:
    """The coefficient of ``I_<L-1 Y_i_l>^(1)`` in (K1_l): l, derived by the iteration (the
    coefficient of the pair I_(l-1) x Y_i over 4).

    Example
    -------
    >>> y_coefficient(3) == K1_Y_COEFFICIENT
    True
    """
    (_, _, _, terms), _ = relation_closed_form("M", l)
    return int(terms[(0, 1)] / 4)


def canonical_octupole_probe() -> dict:
    """``(M_ijk - I_ijk) k^ijk`` on the circle, the bracket of (K1) times 4 G (the 1/c^5 apart),
    as a probe polynomial in B, Bb, Z (harmonic after the null reduction): the l = 3 member of
    :func:`canonical_mass_probe`.

    Example
    -------
    >>> sorted(canonical_octupole_probe())          # harmonics 3 and 1 (and their conjugates)
    [(0, 3, 0), (1, 2, 0), (2, 1, 0), (3, 0, 0)]
    """
    return canonical_mass_probe(3)


@lru_cache(maxsize=None)
def canonical_current_quadrupole_probe() -> dict:
    """``(S_ij - J_ij) k^ij`` on the circle, the bracket of the cited (K2) times 2 G (the 1/c^5
    apart), written term by term as recalled (a second route to ``canonical_current_probe(2)``).

    Example
    -------
    >>> sorted(canonical_current_quadrupole_probe())     # harmonic 1 (and its conjugate)
    [(0, 1, 1), (1, 0, 1)]
    """
    quadrupole, angular, current = _mass(2), _current(1), _current(2)
    w, w_dipole, y = _gauge(gauge_moment_w_l(0)), _gauge(gauge_moment_w_l(1)), _gauge(gauge_moment_y(1))
    bracket = _sum((_scaled(_epsilon_pair(w_dipole, _derivative(quadrupole, 3)), -1),
                    _scaled(_epsilon_pair(_derivative(y, 2), quadrupole), -2),
                    _epsilon_pair(_derivative(y, 1), _derivative(quadrupole, 1)),
                    _scaled(_times(angular, _derivative(y, 1)), 3),
                    _scaled(_times(_derivative(current, 1), _derivative(w, 1)), -2)))
    return _null_reduced(_scaled(bracket, 2 * _G))


def _probe(kind: str, l: int) -> dict:
    return canonical_mass_probe(l) if kind == "mass" else canonical_current_probe(l)


def _covered(kind: str, l: int) -> bool:
    return (l >= 3 if kind == "mass" else l >= 2) and l <= CANONICAL_LMAX


@lru_cache(maxsize=None)
def _channel(l: int, m: int) -> PNSeries:
    probe = _probe(mode_kind(l, m), l)
    p, q, c = mode_channel(l, m)
    # the radiative moment is the l-th derivative: on the channel of harmonic m, (-i m omega)^l
    value = _derivative(probe, l).get((p, q, c), ExactPolynomial(0))
    five = PNOrder(5, 2).twice
    return PNSeries._from_trusted({five: value} if not value.is_zero() else {}, five)


def circular_canonical_channel(l: int, m: int, *, row: Contribution, orbit: str) -> PNSeries:
    """Evaluator of the table's rows for (K1_l), (K2_l): ``d^l (M_L - I_L)/dt^l`` (mass, l >= 3)
    or ``d^l (S_L - J_L)/dt^l`` (current, l >= 2) on the channel of (l, m), circular orbit.

    Returns
    -------
    PNSeries
        The single order 5/2 (zero for the channels the correction does not reach), known
        through 5/2.

    Example
    -------
    >>> from stfalgebra.radiative.contributions import CONTRIBUTIONS
    >>> row = next(r for r in CONTRIBUTIONS if r.evaluator and "circular_canonical" in str(r.evaluator))
    >>> circular_canonical_channel(3, 3, row=row, orbit="circular").orders
    (PNOrder(5/2),)

    References
    ----------
    Module docstring: (K1_l), (K2_l) derived by the iteration; the gauge moments derived.
    """
    l, m = check_mode(l, m)
    if orbit != "circular":
        raise ValueError(f"the canonical corrections M_L - I_L, S_L - J_L are evaluated on circular orbits "
                         f"only, got {orbit!r}")
    if not _covered(mode_kind(l, m), l):
        raise ValueError(f"the canonical corrections are entered for M_L (3 <= l <= {CANONICAL_LMAX}) and S_L "
                         f"(2 <= l <= {CANONICAL_LMAX}), got ({l},{m})")
    return _channel(l, m)
