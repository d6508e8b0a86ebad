"""The canonical corrections M_ijk - I_ijk and S_ij - J_ij at relative 2.5PN on the circular orbit.

The multipolar iteration runs with the canonical moments; through relative 2.5PN they differ from
the source moments by (Blanchet, Faye, Iyer & Sinha, Class. Quantum Grav. 25, 165003 (2008),
sec. 5; Faye, Blanchet & Iyer, Class. Quantum Grav. 32, 045016 (2015), sec. 2; both from memory,
equation numbers not checked: cited inputs)

    M_ijk = I_ijk + (4 G/c^5) [W^(2) I_ijk - W^(1) I_ijk^(1) + 3 I_<ij Y_k>^(1)],             (K1)
    S_ij  = J_ij  + (2 G/c^5) [eps_ab<i (-I_j>b^(3) W_a - 2 I_j>b Y_a^(2) + I_j>b^(1) Y_a^(1))
                               + 3 J_<i Y_j>^(1) - 2 J_ij^(1) W^(1)],                         (K2)

(``Y_k^(1)`` the derivative of Y_k alone; W = W_L at l = 0, W_a and Y_a the dipoles, J_i the
angular momentum), with the
two-body gauge moments of :mod:`stfalgebra.moments.canonical`, derived at Newtonian order
(W, W_i from the body sums, Y_i with the field stress). The multipolar iteration of
:mod:`stfalgebra.mpm` starts from the canonical moments and has no gauge vector built from
W_L, ..., Z_L, so (K1), (K2) are not derived here, and the relations for the other l are missing.
:func:`canonical_mass_probe` evaluates the general-l form (K1_l) recalled from memory; on the circle
it is minus the centre-of-mass-shift part of I_L for every l (tested, l = 3..8), but no published
l >= 4 mode at relative 2.5PN (absolute 3.5PN) was at hand to check it against, so the table does
not serve it (a term I_<L-2 Y_i_l-1 i_l> or similar, invisible at l <= 3, is not excluded).

**The sign of the Y term of (K1)** was recalled as -3 (both by the lead and here); it is taken
as +3, with the derived Y_i, for three reasons: (i) the canonical dipole of the iteration is
constant, and the derived 2.5PN source dipole is exactly ``-(4 G/c^5) M Y_i^(1)`` (the cited,
project-checked 2.5PN centre-of-mass shift; tests/moments/test_canonical.py), so the mass-Y_i
interaction enters it as ``+(4 G/c^5) M Y_i^(1)``: the l = 1 member of ``+l I_<L-1 Y_i_l>^(1)``,
as ``+W^(2) I_L`` holds at l = 0 (the constant canonical monopole) and l = 2, 3; (ii) in (K2) the
W_a and Y_a terms cancel on the circle with the derived W_i, Y_i (a flipped Y_i would leave 2/5
of the W_a term), so the derived Y_i is not the suspect; (iii) with +3 the assembled (3,3), (3,1)
modes are the published ones (Blanchet, Faye, Iyer & Sinha 2008, from memory), with -3 their nu
parts at x^(5/2) miss by exactly twice this correction. (iii) is then a check of everything
else in those modes, and of the sign only together with (i).

On the circle W = nu m r rdot/3 and its derivatives vanish (rdot = 0, Kepler's law), so only the
Y_i (and, in S_ij, W_a) terms remain. They are evaluated as harmonic probe polynomials
(:mod:`stfalgebra.radiative.circular_interactions`): ``I_<ij Y_k> k^ijk`` is the product
``I(k) Y(k)`` on a null k, ``eps_ab<i A_j>b B_a k^ij = (1/2) eps_(iab) k_i d_a B(k) d_b A(k)``; a
time derivative multiplies the harmonic s by ``-i s omega``. U_ijk = M_ijk^(3), V_ij = S_ij^(2).

**Conventions**: channels of :mod:`stfalgebra.moments.orbit_tensor` (the factor exp(-i m phi)
implied), eps = 1/c, engine coefficients in G, m, nu, delta, r, phidot (= omega on the circle), I;
Kepler's law is applied by the circular reduction; harmonic coordinates.
"""

from __future__ import annotations

from fractions import Fraction
from functools import lru_cache

from ..exact import ExactPolynomial
from ..moments.canonical import gauge_moment_w_l, gauge_moment_y
from ..orders import PNOrder
from ..pnseries import PNSeries
from .circular_interactions import (
    _derivative, _null_reduced, _scaled, _sum, _times, _triple, orbit_tensor_probe, probe_polynomial,
)
from .contributions import Contribution, check_mode, mode_kind
from .projection import mode_channel

__all__ = ["K1_Y_COEFFICIENT", "canonical_mass_probe", "canonical_octupole_probe", "y_coefficient", "canonical_current_quadrupole_probe",
           "circular_canonical_channel"]

_G = ExactPolynomial("G")
#: The coefficient of I_<ij Y_k>^(1) in (K1): +3, not the recalled -3 (module docstring).
K1_Y_COEFFICIENT = 3


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


@lru_cache(maxsize=None)
def canonical_mass_probe(l: int) -> dict:
    """``(M_L - I_L) k^L`` on the circle for l >= 3, the bracket of the general-l form of (K1),

        M_L - I_L = (4 G/c^5) [W^(2) I_L - W^(1) I_L^(1) + l I_<L-1 Y_i_l>^(1)],          (K1_l)

    times 4 G (the 1/c^5 apart), as a probe polynomial in B, Bb, Z (harmonic after the null
    reduction). (K1_l) is recalled from memory (module docstring); its l = 1 member is the derived
    constancy of the canonical dipole, its l = 3 member is (K1). ``I_<L-1 Y_i_l> k^L`` is the
    product ``I(k) Y(k)`` on a null k.

    Example
    -------
    >>> sorted(canonical_mass_probe(4))          # harmonics 4 and 2 (and their conjugates)
    [(0, 4, 0), (1, 3, 0), (3, 1, 0), (4, 0, 0)]
    """
    if isinstance(l, bool) or not isinstance(l, int):
        raise TypeError(f"multipole order l must be an int, got {l!r}")
    if l < 3:
        raise ValueError(f"the general-l canonical correction is entered for l >= 3, got {l}")
    lower, moment = _mass(l - 1), _mass(l)
    w, y = _gauge(gauge_moment_w_l(0)), _gauge(gauge_moment_y(1))
    bracket = _sum((_times(_derivative(w, 2), moment),
                    _scaled(_times(_derivative(w, 1), _derivative(moment, 1)), -1),
                    _scaled(_times(lower, _derivative(y, 1)), y_coefficient(l))))
    return _null_reduced(_scaled(bracket, 4 * _G))


def y_coefficient(l: int) -> int:
    """The coefficient of ``I_<L-1 Y_i_l>^(1)`` in (K1_l): l (from memory; +3 at l = 3, see the
    module docstring for its sign).

    Example
    -------
    >>> y_coefficient(3) == K1_Y_COEFFICIENT
    True
    """
    return l


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
    """``(S_ij - J_ij) k^ij`` on the circle, the bracket of (K2) times 2 G (the 1/c^5 apart).

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


_RELATIONS = {("mass", 3): canonical_octupole_probe, ("current", 2): canonical_current_quadrupole_probe}


@lru_cache(maxsize=None)
def _channel(l: int, m: int) -> PNSeries:
    probe = _RELATIONS[(mode_kind(l, m), l)]()
    p, q, c = mode_channel(l, m)
    # the radiative moment is the l-th derivative: on the channel of harmonic m, (-i m omega)^l
    value = _derivative(probe, l).get((p, q, c), ExactPolynomial(0))
    five = PNOrder(5, 2).twice
    return PNSeries._from_trusted({five: value} if not value.is_zero() else {}, five)


def circular_canonical_channel(l: int, m: int, *, row: Contribution, orbit: str) -> PNSeries:
    """Evaluator of the table's rows for (K1), (K2): ``d^l (M_L - I_L)/dt^l`` (mass, l = 3) or
    ``d^l (S_L - J_L)/dt^l`` (current, l = 2) on the channel of (l, m), circular orbit.

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
    Module docstring: (K1), (K2) cited; the gauge moments derived.
    """
    l, m = check_mode(l, m)
    if orbit != "circular":
        raise ValueError(f"the canonical corrections M_ijk - I_ijk, S_ij - J_ij are evaluated on circular orbits "
                         f"only, got {orbit!r}")
    if (mode_kind(l, m), l) not in _RELATIONS:
        raise ValueError(f"the canonical corrections are entered for M_ijk and S_ij only, got ({l},{m})")
    return _channel(l, m)
