"""The gauge moments W_L, Y_L of two point masses and the canonical mass quadrupole M_ij.

The multipolar iteration is run with the canonical moments M_L, S_L; they differ from the
source moments I_L, J_L at relative 2.5PN through the gauge moments W_L, X_L, Y_L, Z_L. For the
mass quadrupole (Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 3.3, from memory):

    M_ij = I_ij + (4 G/c^5) [W^(2) I_ij - W^(1) I_ij^(1)] + O(c^-7),                    (C1)

(the relation is also what the quadratic iteration with the linear gauge vector gives,
:mod:`stfalgebra.mpm.gauge_interactions`, with the relations of every other l).

W = W_L at l = 0. At Newtonian order the gauge moment W_L is the integral
``(2l+1)/((l+1)(2l+3)) int d^3x x_<iL> sigma_i`` of the momentum density sigma_i = T^0i/c
(same reference, the general expressions of the gauge moments; only their leading term is
needed here), so for l = 0 ``W = (1/3) int x_i sigma_i = (1/3) sum_A m_A y_A.v_A``. With the
Newtonian centre-of-mass positions ``y_1 = X_2 x``, ``y_2 = -X_1 x`` this gives
``W = (m_1 X_2^2 + m_2 X_1^2) (x.v)/3 = (1/3) nu m r rdot``: derived here from the body sum,
not typed in.

The gauge moment Y_L at Newtonian order (same reference, from memory; its delta_l weights are 1
at this order and its Sigma_ij^(2) term is of relative order 1/c^2) is

    Y_L = - int d^3x xhat_L tau^jj + 3 (2l+1)/((l+1)(2l+3)) d/dt int d^3x xhat_(iL) sigma_i
        = - int d^3x xhat_L tau^jj + 3 W_L^(1),                                             (C2)

with the Newtonian stress ``tau^ij = sum_A m_A v_A^i v_A^j delta_A + (d_iU d_jU - delta_ij
dU.dU/2)/(4 pi G)``, whose trace has the field part ``-(dU)^2/(8 pi G)``. Its integral is taken
by the project's finite-part kernels (:func:`~stfalgebra.moments.finite_part.two_centre_integral`):
the self terms ``FP int xhat_L/r_A^4`` vanish and the cross term gives
``FP int xhat_L d(1/r_1).d(1/r_2) = 2 pi (y_1^<L> + y_2^<L>)/r_12`` (l >= 1; 4 pi/r_12 at l = 0).
At l = 0 the virial theorem makes (C2) vanish (tested). For the dipole, with the Newtonian
equations of motion,

    Y_i = (nu m delta/10) [(v^2 + G m/r) x_i - 3 r rdot v_i],

derived here (:func:`gauge_moment_y`), not typed in; on a circular orbit it is
``(nu m delta/5)(G m/r) x_i``.

**Conventions**: harmonic coordinates, centre-of-mass frame, ``x = y_1 - y_2``, ``r = |x|``,
``rdot = n.v``, ``delta = (m_1 - m_2)/m`` (``../shared/conventions.md``); Newtonian
centre-of-mass positions ``y_1 = X_2 x``, ``y_2 = -X_1 x``.
"""

from __future__ import annotations

from fractions import Fraction
from functools import lru_cache

from ..exact import ExactPolynomial, engine_symbols
from ..orders import PNOrder
from ..pnseries import PNSeries

__all__ = ["gauge_moment_w", "gauge_moment_w_dipole", "gauge_moment_w_l", "gauge_moment_y",
           "field_stress_trace_integral", "canonical_quadrupole_correction"]


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


def _body_weight(n: int) -> ExactPolynomial:
    """``sum_A m_A s_A^n`` with ``y_A = s_A x``, ``v_A = s_A v`` (``s_1 = X_2``, ``s_2 = -X_1``):
    the weight of a body sum holding n position or velocity factors."""
    s = engine_symbols()
    x1, x2 = (1 + s.delta) / 2, (1 - s.delta) / 2
    return s.m * (x1 * x2**n + x2 * (-x1) ** n)


def _check_rank(l) -> int:
    if isinstance(l, bool) or not isinstance(l, int):
        raise TypeError(f"l must be an int, got {l!r}")
    if not 0 <= l <= 30:
        raise ValueError(f"l must be between 0 and 30, got {l}")
    return l


@lru_cache(maxsize=None)
def gauge_moment_w_l(l: int) -> "OrbitTensor":
    """The gauge moment W_L of the binary at Newtonian order, an orbit tensor of rank l.

    ``W_L = (2l+1)/((l+1)(2l+3)) sum_A m_A y_A^<iL> v_A^i`` (module docstring); with
    ``xhat_(iL) v_i = (x.v) xhat_L - l/(2l+1) r^2 STF[x_(L-1) v_(i_l)]`` (the harmonic part of
    ``v.d_k (k.x)^(l+1)/(l+1)``) it is a combination of ``x_<L>`` and ``x_<L-1 v_i_l>``.

    Returns
    -------
    OrbitTensor
        Rank l over (x, v, ell), known through relative 1/2; l = 0 is :func:`gauge_moment_w`,
        l = 1 :func:`gauge_moment_w_dipole` (tested).

    Example
    -------
    >>> sorted(gauge_moment_w_l(3).terms)
    [(2, 1, 0), (3, 0, 0)]

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 3.3 (the gauge moments W_L; from memory).
    """
    from .orbit_tensor import OrbitTensor

    l = _check_rank(l)
    s = engine_symbols()
    weight = _body_weight(l + 2) * Fraction(2 * l + 1, (l + 1) * (2 * l + 3))
    terms = {(l, 0, 0): PNSeries._from_trusted({0: weight * s.r * s.rdot}, 1)}
    if l:
        terms[(l - 1, 1, 0)] = PNSeries._from_trusted({0: -weight * s.r**2 * Fraction(l, 2 * l + 1)}, 1)
    return OrbitTensor(l, terms)


@lru_cache(maxsize=None)
def field_stress_trace_integral(l: int) -> ExactPolynomial:
    """``FP int d^3x xhat_L (-(dU)^2/(8 pi G))``, the field part of ``int xhat_L tau^jj``, as the
    coefficient of ``x_<L>`` (Newtonian potential of two point masses, centre-of-mass frame).

    Computed with :func:`~stfalgebra.moments.finite_part.two_centre_integral`:
    ``(dU)^2 = G^2 [m_1^2/r_1^4 + m_2^2/r_2^4 + m_1 m_2 (r_1^2 + r_2^2 - r_12^2)/(r_1^3 r_2^3)]``.

    Example
    -------
    >>> print(field_stress_trace_integral(0))
    -nu*G*m**2*r**(-1)

    References
    ----------
    Blanchet, Damour & Iyer, Phys. Rev. D 51, 5360 (1995) (finite parts of point-mass integrals).
    """
    import sympy as sp

    from .finite_part import R12, RA, RB, U1, U2, two_centre_integral

    l = _check_rank(l)
    G, m, nu, delta, r, t = sp.symbols("G m nu delta r t")
    m1, m2 = m * (1 + delta) / 2, m * (1 - delta) / 2
    pieces = ((m1**2, RA**-4), (m2**2, RB**-4),
              (m1 * m2, (RA**2 + RB**2 - R12**2) / (RA**3 * RB**3)))
    total = sum(weight * two_centre_integral(l, integrand) for weight, integrand in pieces)
    # y_1 = X_2 x, y_2 = -X_1 x: k.y_A -> s_A (k.x), and (k.x)^l stands for x_<L>
    total = total.subs({U1: (1 - delta) / 2 * t, U2: -(1 + delta) / 2 * t, R12: r}, simultaneous=True)
    coefficient = sp.expand(-G * total / (8 * sp.pi)).coeff(t, l) if l else sp.expand(-G * total / (8 * sp.pi))
    coefficient = sp.expand(coefficient.subs(m**2 * (1 - delta**2), 4 * m**2 * nu))
    coefficient = sp.expand(coefficient.subs(delta**2, 1 - 4 * nu))
    return ExactPolynomial.from_sympy(coefficient)


@lru_cache(maxsize=None)
def gauge_moment_y(l: int) -> "OrbitTensor":
    """The gauge moment Y_L of the binary at Newtonian order (C2), an orbit tensor of rank l.

    The matter trace ``sum_A m_A v_A^2 y_A^<L>``, the field trace
    (:func:`field_stress_trace_integral`) and ``3 W_L^(1)`` along the Newtonian orbit.

    Returns
    -------
    OrbitTensor
        Rank l, known through relative 1/2 (its 1PN terms are not needed: they enter the
        canonical moments at relative 3.5PN). l = 0 vanishes (virial theorem; tested).

    Example
    -------
    >>> y = gauge_moment_y(1)
    >>> print(y.terms[(0, 1, 0)].coefficient(0))
    -3*nu*delta*m*r*rdot/10

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 3.3 (the gauge moments Y_L; from memory).
    """
    from .orbit_tensor import OrbitTensor, differentiate_along_orbit

    l = _check_rank(l)
    s = engine_symbols()
    speed2 = s.rdot**2 + s.r**2 * s.phidot**2
    trace = _body_weight(l + 2) * speed2 + field_stress_trace_integral(l)
    stress = OrbitTensor(l, {(l, 0, 0): PNSeries._from_trusted({0: -trace}, 1)})
    rate = differentiate_along_orbit(gauge_moment_w_l(l), 0).scale(3)
    return (stress + rate).truncate(PNOrder(1, 2))


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
