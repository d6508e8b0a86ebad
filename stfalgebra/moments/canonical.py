"""The gauge moment W of two point masses and the canonical mass quadrupole M_ij.

The multipolar iteration is run with the canonical moments M_L, S_L; they differ from the
source moments I_L, J_L at relative 2.5PN through the gauge moments W_L, X_L, Y_L, Z_L. For the
mass quadrupole (Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 3.3, from memory):

    M_ij = I_ij + (4 G/c^5) [W^(2) I_ij - W^(1) I_ij^(1)] + O(c^-7),                    (C1)

W = W_L at l = 0. At Newtonian order the gauge moment W_L is the integral
``(2l+1)/((l+1)(2l+3)) int d^3x x_<iL> sigma_i`` of the momentum density sigma_i = T^0i/c
(same reference, the general expressions of the gauge moments; only their leading term is
needed here), so for l = 0 ``W = (1/3) int x_i sigma_i = (1/3) sum_A m_A y_A.v_A``. With the
Newtonian centre-of-mass positions ``y_1 = X_2 x``, ``y_2 = -X_1 x`` this gives
``W = (m_1 X_2^2 + m_2 X_1^2) (x.v)/3 = (1/3) nu m r rdot``: derived here from the body sum,
not typed in.

**Conventions**: harmonic coordinates, centre-of-mass frame, ``x = y_1 - y_2``, ``r = |x|``,
``rdot = n.v`` (``../shared/conventions.md``).
"""

from __future__ import annotations

from fractions import Fraction
from functools import lru_cache

from ..exact import ExactPolynomial, engine_symbols
from ..orders import PNOrder
from ..pnseries import PNSeries

__all__ = ["gauge_moment_w", "gauge_moment_w_dipole", "canonical_quadrupole_correction"]


@lru_cache(maxsize=None)
def gauge_moment_w() -> PNSeries:
    """The gauge moment W of the binary at Newtonian order, a PN series in eps = 1/c.

    Returns
    -------
    PNSeries
        ``(1/3) sum_A m_A y_A.v_A`` with the Newtonian centre-of-mass positions:
        ``nu m r rdot/3``, known through relative 1/2 (its 1PN term is not needed: it enters
        M_ij at relative 3.5PN).

    Example
    -------
    >>> gauge_moment_w()
    PNSeries(nu*m*r*rdot/3 + O(eps**2))

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 3.3 (the gauge moments W_L; from memory).
    """
    s = engine_symbols()
    x1, x2 = (1 + s.delta) / 2, (1 - s.delta) / 2          # X_A = m_A/m
    # y_1 = X_2 x, y_2 = -X_1 x, v_A likewise: sum_A m_A y_A.v_A = m (X_1 X_2^2 + X_2 X_1^2) x.v
    body_sum = s.m * (x1 * x2**2 + x2 * x1**2) * s.r * s.rdot
    return PNSeries._from_trusted({0: body_sum / 3}, 1)


@lru_cache(maxsize=None)
def gauge_moment_w_dipole() -> "OrbitTensor":
    """The gauge moment W_i of the binary at Newtonian order, an orbit tensor of rank 1.

    Returns
    -------
    OrbitTensor
        ``(3/10) sum_A m_A y_A^<i y_A^a> v_A^a`` (W_L at l = 1, module docstring) with the
        Newtonian centre-of-mass positions: ``-(3/10) nu m delta r rdot x_i + (1/10) nu m delta r^2 v_i``,
        known through relative 1/2. Unlike W it does not vanish on a circular orbit (for
        unequal masses): it is one reason the canonical corrections of the other moments
        (M_ijk, S_ij, ..., whose relations hold W_i and Y_i) are not zero there.

    Example
    -------
    >>> sorted(gauge_moment_w_dipole().terms)
    [(0, 1, 0), (1, 0, 0)]

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 3.3 (the gauge moments W_L; from memory).
    """
    from .orbit_tensor import OrbitTensor

    s = engine_symbols()
    x1, x2 = (1 + s.delta) / 2, (1 - s.delta) / 2
    # sum_A m_A y_A (y_A.v_A) = m (X_1 X_2^3 - X_2 X_1^3) x (x.v) = -nu m delta r rdot x, and
    # sum_A m_A y_A^2 v_A = -nu m delta r^2 v likewise
    weight = s.m * (x1 * x2**3 - x2 * x1**3)
    along_x = weight * s.r * s.rdot * Fraction(3, 10)
    along_v = -weight * s.r**2 * Fraction(1, 10)
    return OrbitTensor(1, {(1, 0, 0): PNSeries._from_trusted({0: along_x}, 1),
                           (0, 1, 0): PNSeries._from_trusted({0: along_v}, 1)})


def canonical_quadrupole_correction(moment_channel: PNSeries, derivative, rotation: ExactPolynomial) -> PNSeries:
    """``M_ij - I_ij`` of (C1) on a channel: ``(4 G/c^5) [W^(2) I - W^(1) (d/dt I)]``.

    Parameters
    ----------
    moment_channel:
        The Newtonian I_ij on the channel of a mode (general orbit: a function of r, rdot, phidot).
    derivative:
        d/dt along the Newtonian orbit acting on scalar PN series
        (:class:`~stfalgebra.binary.orbit_derivative.OrbitTimeDerivative` of order 0).
    rotation:
        ``-i m phidot``, the derivative of the channel's phase factor ``exp(-i m phi)``.

    Returns
    -------
    PNSeries
        Starting at order 5/2 (the explicit 1/c^5).

    Example
    -------
    >>> from stfalgebra.binary.orbit_derivative import OrbitTimeDerivative
    >>> s = engine_symbols()
    >>> correction = canonical_quadrupole_correction(PNSeries._from_trusted({0: s.r**2}, 1),
    ...                                              OrbitTimeDerivative(0), -2 * s.I * s.phidot)
    >>> correction.leading_order
    PNOrder(5/2)
    """
    w = gauge_moment_w()
    w1 = derivative(w)
    w2 = derivative(w1)
    moment_rate = derivative(moment_channel) + moment_channel * rotation
    bracket = w2 * moment_channel - w1 * moment_rate
    s = engine_symbols()
    return (bracket * (4 * s.G)).shift(PNOrder(5, 2))
