"""The 2.5PN (radiation-reaction, odd) terms of the two-body mass moments I_L, for every l: derived.

**Where the odd terms come from.** In the general source mass moment (Blanchet, Living Rev.
Relativ. 9, 4 (2006), eqs. (85), (87); formula (I1) of :mod:`stfalgebra.moments.mass_two_pn`)
the z-integrals expand in even powers of 1/c only, so the terms of relative order c^-5 come
from the odd parts of Sigma (needed at c^-5), Sigma_i (at c^-3), Sigma_ij (at c^-1) and from
the matter variables. The odd parts of the near-zone potentials (N2) of
:mod:`stfalgebra.moments.near_zone` are those of their retarded integrals,
P = G sum_n (-1)^n/(n! c^n) d_t^n int s(x') |x - x'|^(n-1) d^3x' for Box P = -4 pi G s
(common practice; the antisymmetric homogeneous solution the matching adds starts with the
tail-induced reaction, 1.5PN beyond the leading reaction, so it does not enter here):

* V: the n = 1 term -(G/c) d_t int sigma is O(c^-3), int sigma = m + M_1/c^2 being conserved at
  Newtonian order, with M_1 = sum_A m_A (3 v_A^2/2 - U_A) (the 1PN weights of sigma); the n = 3
  term is -(G/(6 c^3)) d_t^3 int sigma |x - x'|^2, spatially constant at that order (mass and
  mass dipole conserved). So V = U + ... + V_3(t)/c^3 + ... with

      V_3 = -G [dM_1/dt + (1/6) d^3 Q_kk/dt^3],   Q_ij = sum_A m_A y_A^i y_A^j;            (R1)

  its spatial dependence starts at c^-5 and enters Sigma at c^-7.
* V_i: the n = 1 term -(G/c) d_t int sigma_i vanishes at leading order (momentum); the rest is
  O(c^-3) relative and enters Sigma at c^-7.
* W_ij (Box W_ij = -4 pi G S_ij, S_ij = sigma_ij - delta_ij sigma_kk + d_i U d_j U/(4 pi G)):
  the n = 1 term is of relative order c^-1 and spatially constant,

      W_ij = W_ij^even + W1_ij(t)/c,   W1_ij = -G d_t int S_ij d^3x,                       (R2)

  int d_i U d_j U = 2 G^2 m1 m2 d_{1i} d_{2j} FP int 1/(r1 r2) = 4 pi G^2 m1 m2 (delta_ij - n_i n_j)/r12
  (the pair kernel (F2) of :mod:`stfalgebra.moments.field_integrals` at l = 0; the
  virial theorem int S_ij = (1/2) d_t^2 Q_ij - delta_ij (2 T + Omega) is a test).

Sigma_i and Sigma_ij have no odd parts at the orders needed (the odd V_3, V_i constants enter
them only differentiated in space, or at c^-5 relative). In Sigma, (I2) of
:mod:`stfalgebra.moments.mass_two_pn`, the odd parts at c^-5 are

    Sigma_odd c^5 = sigma_N [ -(V_3 + 2 W1) + (4 V_3 + 4 W1) ] - W1_ij d_ij U/(pi G) + W1 Delta U/(2 pi G),  (R3)

W1 = W1_kk: the first bracket is the odd part of the point-mass weight
mu_A = m_A/[sqrt(-g) sqrt(-g_ab v^a v^b/c^2)] (-g = 1 + 4V/c^2 + 4 W/c^4 + ...,
-g_00 = 1 - 2V/c^2 + ...), the second that of |g| sigma; the last two terms are the undifferentiated
h^ij in -h^ij d_ij h^00 of Lambda^00. With Delta U = -4 pi G sigma_N the last term is
-2 W1 sigma_N, so the W1 sigma_N terms cancel and Sigma_odd c^5 = 3 V_3 sigma_N - W1_ij d_ij U/(pi G).

**The finite-part integral.** FP int r^B xhat_L d_ij(1/|x - y|) d^3x is the y-derivative of
the convolution FP int r^B xhat_L/|x - y| = -4 pi |y|^(B+2) yhat_L/((B + 2)(B + 2l + 3)), analytic
at B = 0, so (no pole, no surface term left, the distributional delta part of d_ij(1/r)
included)

    FP int xhat_L d_ij U d^3x = -(2 pi G/(2l + 3)) sum_A m_A d_ij (y^2 yhat_L)|_{y_A}.          (R4)

**Result.** With k a null probe (k_L yhat_L = (k.y)^l),

    k_L I_L|_c^-5 = sum_A m_A { 3 V_3 (k.y_A)^l + (2/(2l + 3)) [ 2 W1 (k.y_A)^l
                    + 4 l (k.W1.y_A)(k.y_A)^(l-1) + l (l-1) y_A^2 (k.W1.k)(k.y_A)^(l-2) ] }
                    + l sum_A m_A (k.s)(k.y_A)^(l-1),                                        (R5)

the last term from the 2.5PN term of the centre-of-mass relations, y_A -> y_A + s with the
common shift s = nu delta Q_2.5 v (:func:`stfalgebra.binary.cited_inputs.
centre_of_mass_velocity_reaction_term`, cited). Every other term of I_L (the c^-2 and c^-4
ones) meets the 2.5PN dynamics only at c^-7. On the Newtonian orbit (y_1 = X_2 x,
y_2 = -X_1 x) the field part of (R5) is, by hand (a test compares it with the derivation),

    I_L|_2.5PN,field = (G^2 m^3 nu^2 s_l/c^5) [ -2 (3l - 2)(l + 1)/(2l + 3) (rdot/r^2) x_<L>
                       + 8 l (l + 1)/(2l + 3) (1/r) x_<L-1 v_l> ],   s_l = X_2^(l-1) - (-X_1)^(l-1),

which for l = 2 is the published -(24/7) and (48/7) (tests). For l = 0 it is the non-constant
(4/3) G^2 m^3 nu rdot/(c^5 r^2) = -(4 G m/c^5) W^(2), W = nu m r rdot/3 the gauge moment of
:mod:`stfalgebra.moments.canonical`: exactly what makes the canonical monopole
M = I + (4 G/c^5)(W^(2) I - W^(1) I^(1)) constant (a test). For l = 1 the source dipole is m s
(the field part is proportional to the Newtonian dipole); the canonical dipole
M_i = I_i + (4 G m/c^5) Y_i^(1) vanishes with the two-body gauge moment Y_i (a test): the same
term (4 G/c^5) l I_<L-1 Y_i_l>^(1) of M_L - I_L therefore removes the shift's part of I_L for
every l >= 3 (the canonical moments, not these source moments, carry no centre-of-mass shift;
the general-l form of the Y term is derived by the MPM iteration with the linear gauge vector,
stfalgebra.mpm.gauge_interactions; with it Hhat_33 and Hhat_31 at relative 2.5PN are the
published ones, a test in tests/radiative/test_circular_reaction.py). :func:`centre_of_mass_shift_part` gives that part.

**Conventions**: harmonic coordinates, centre-of-mass frame (the frame where the 2.5PN-accurate
centre-of-mass integral of the equations of motion vanishes), x = y1 - y2, v = dx/dt,
eps = 1/c; ``../shared/conventions.md``.

References
----------
L. Blanchet, Living Rev. Relativ. 9, 4 (2006), eqs. (85), (87), (91); L. Blanchet, G. Faye &
B. Ponsot, Phys. Rev. D 58, 124002 (1998) (the potentials, from memory); K. G. Arun, L. Blanchet,
B. R. Iyer & M. S. S. Qusailah, Phys. Rev. D 77, 064035 (2008), sec. III (the 2.5PN I_ij the
tests compare with, from memory).
"""

from __future__ import annotations

from functools import lru_cache

import sympy as sp

from ..binary.cited_inputs import REACTION_ORDER, centre_of_mass_velocity_reaction_term
from ..orders import PNOrder
from ..symbols import G, delta, m, nu, phidot, r, rdot
from ..symbols import eps as EPS
from . import orbit_polynomials as op
from .orbit_tensor import OrbitTensor
from .reaction_provenance import REACTION_MOMENT_SOURCE

__all__ = ["REACTION_MOMENT_SOURCE", "reaction_mass_moment", "reaction_mass_moment_circular",
           "reaction_field_constants", "pair_tensor_derivative", "centre_of_mass_shift_part", "KNOWN_THROUGH"]

#: Relative order through which :func:`reaction_mass_moment` is known: its single order 5/2.
KNOWN_THROUGH = PNOrder(5, 2)

_X1 = (1 + delta) / 2
_X2 = (1 - delta) / 2
_V2 = rdot**2 + r**2 * phidot**2


def _ring(expression):
    return op.from_expression(expression)


def _normal(f):
    """The ring element with r (1/r) products cancelled and delta^2 reduced."""
    expression = f.as_expr().xreplace({sp.Symbol("ir", positive=True): 1 / r})
    return op.reduce_mass_difference(_ring(sp.expand(expression)))


# A symmetric tensor in the orbital span: a x x + b (x v + v x) + c v v + d delta, coefficients
# ring elements (relative orbit, Newtonian motion a = a_x x + a_v v).
def pair_tensor_derivative(tensor: tuple) -> tuple:
    """d/dt of ``(a, b, c, d)`` = a xx + b (xv + vx) + c vv + d delta along the Newtonian orbit.

    d(xx)/dt = xv + vx, d(xv + vx)/dt = 2 vv + 2 a_x xx + a_v (xv + vx),
    d(vv)/dt = a_x (xv + vx) + 2 a_v vv (a = a_x x + a_v v; a_v = 0 at Newtonian order).

    Example
    -------
    >>> from stfalgebra.moments.orbit_polynomials import RING
    >>> pair_tensor_derivative((RING(1), RING(0), RING(0), RING(0)))[1]
    1
    """
    from ..binary.dynamics import relative_acceleration_factors

    a_x, a_v = (op.truncate(op.from_series(f), 0) for f in relative_acceleration_factors(0))
    a, b, c, d = tensor
    dt = [op.time_derivative(f, 0) for f in tensor]
    return (dt[0] + 2 * a_x * b,
            dt[1] + a + a_v * b + a_x * c,
            dt[2] + 2 * b + 2 * a_v * c,
            dt[3])


def _times(tensor: tuple, n: int) -> tuple:
    for _ in range(n):
        tensor = pair_tensor_derivative(tensor)
    return tensor


def _trace(tensor: tuple):
    a, b, c, d = tensor
    return a * _ring(r**2) + 2 * b * _ring(r * rdot) + c * _ring(_V2) + 3 * d


@lru_cache(maxsize=None)
def _pair_field_integral() -> tuple:
    """int d_i U d_j U d^3x/(G^2 m1 m2) as a pair tensor: 2 d_{1i} d_{2j} K_0, K_0 = -2 pi r12
    (the kernel FP int 1/(r1 r2) of :mod:`stfalgebra.moments.field_integrals` at l = 0), by sympy
    on explicit vectors, read off at y1 - y2 = (r, 0, 0): a delta + b n n."""
    y1 = sp.Matrix(sp.symbols("y1_1:4", real=True))
    y2 = sp.Matrix(sp.symbols("y2_1:4", real=True))
    kernel = -2 * sp.pi * sp.sqrt(sum((y1[i] - y2[i])**2 for i in range(3)))
    at = {y1[0]: r, y1[1]: 0, y1[2]: 0, y2[0]: 0, y2[1]: 0, y2[2]: 0}
    along = sp.simplify(2 * sp.diff(kernel, y1[0], y2[0]).subs(at))          # (a + b)
    across = sp.simplify(2 * sp.diff(kernel, y1[1], y2[1]).subs(at))         # a
    if sp.simplify(2 * sp.diff(kernel, y1[0], y2[1]).subs(at)) != 0:
        raise AssertionError("the pair field integral is not of the form a delta + b n n")
    return across, along - across


@lru_cache(maxsize=None)
def reaction_field_constants() -> dict:
    """The odd near-zone constants (R1), (R2) on the Newtonian relative orbit, ring elements.

    Returns
    -------
    dict
        ``"V3"``: V_3 of (R1); ``"W1"``: W1_ij of (R2) as a pair tensor (a, b, c, d)
        (a xx + b (xv + vx) + c vv + d delta); ``"S"``: int S_ij d^3x as a pair tensor;
        ``"Q"``: Q_ij; ``"divergence_Vi3"``: the divergence of the c^-3 term of V_i,
        d_i V_i|_3 = -(G/6) d_t^3 int sigma_i d_i|x - x'|^2 = (G/3) d_t^3 sum_A m_A v_A.y_A
        (spatially constant), for the harmonic-gauge test.

    Example
    -------
    >>> print(reaction_field_constants()["V3"])
    4/3*G**2*m**2*nu*ir**2*rdot
    """
    masses = (m * _X1, m * _X2)
    fractions = (_X2, -_X1)                          # y_A = f_A x, v_A = f_A v (Newtonian)
    zero = op.RING(0)
    q_xx = _ring(sp.expand(sum(mass * f**2 for mass, f in zip(masses, fractions))))
    q_xx = op.reduce_mass_difference(q_xx)
    pair = (q_xx, zero, zero, zero)                   # Q_ij = (sum m_A f_A^2) x x
    # int S_ij = sum m_A v_A v_A - delta sum m_A v_A^2 + (G m1 m2/(4 pi)) (a delta + b n n)
    a, b = _pair_field_integral()
    gm1m2 = G * masses[0] * masses[1]
    field = (_ring(sp.expand(gm1m2 * b / (4 * sp.pi) / r**2)), zero, zero,
             _ring(sp.expand(gm1m2 * a / (4 * sp.pi))))
    source = (field[0], zero, q_xx, field[3] - q_xx * _ring(_V2))
    source = tuple(op.reduce_mass_difference(f) for f in source)
    w1 = tuple(-_ring(G) * f for f in pair_tensor_derivative(source))
    # V_3 = -G [dM_1/dt + (1/6) Q_kk''']; M_1 = sum m_A (3/2 v_A^2 - G m_B/r)
    m1_weight = sum(mass * (sp.Rational(3, 2) * f**2 * _V2 - G * other / r)
                    for mass, f, other in zip(masses, fractions, masses[::-1]))
    m1_weight = op.reduce_mass_difference(_ring(sp.expand(m1_weight)))
    v3 = -_ring(G) * (op.time_derivative(m1_weight, 0) + _trace(_times(pair, 3)) * sp.Rational(1, 6))
    # sum_A m_A v_A.y_A = (1/2) dQ_kk/dt
    divergence = _ring(G) * sp.Rational(1, 3) * _trace(_times(pair, 4)) * sp.Rational(1, 2)
    return {"V3": _normal(v3), "W1": tuple(_normal(f) for f in w1), "S": tuple(_normal(f) for f in source),
            "Q": pair, "divergence_Vi3": _normal(divergence)}


@lru_cache(maxsize=None)
def _generating_polynomial(l: int, with_shift: bool = True, with_field: bool = True):
    """(R5) as a ring element in kx, kv times eps^5: the field part, the shift part or both."""
    constants = reaction_field_constants()
    v3, (a, b, c, d) = constants["V3"], constants["W1"]
    kx, kv = _ring(op.KX), _ring(op.KV)
    radius2, radial = _ring(r**2), _ring(r * rdot)
    w_trace = _trace((a, b, c, d))
    w_kk = a * kx**2 + 2 * b * kx * kv + c * kv**2              # k.W1.k (k null)
    w_kx = a * kx * radius2 + b * (kx * radial + kv * radius2) + c * kv * radial + d * kx   # k.W1.x
    masses = (m * _X1, m * _X2)
    fractions = (_X2, -_X1)
    # common 2.5PN shift s = nu delta Q v of both bodies (cited)
    shift_q = _cited_shift_factor()
    total = op.RING(0)
    for mass, f in zip(masses, fractions):
        weight, fr = _ring(mass), _ring(f)
        ky = fr * kx
        power = (lambda n: ky**n if n >= 0 else op.RING(0))
        field = 3 * v3 * power(l)
        bracket = 2 * w_trace * power(l) + 4 * l * fr * w_kx * power(l - 1) \
            + l * (l - 1) * fr**2 * radius2 * w_kk * power(l - 2)
        field += bracket * sp.Rational(2, 2 * l + 3)
        shift = l * _ring(nu * delta) * shift_q * kv * power(l - 1)
        total += weight * ((field if with_field else 0) + (shift if with_shift else 0))
    return _normal(total * _ring(EPS**5))


@lru_cache(maxsize=None)
def _cited_shift_factor():
    from types import SimpleNamespace

    # the cited input takes a namespace of symbols
    names = SimpleNamespace(G=G, m=m, nu=nu, delta=delta, r=r, rdot=rdot, phidot=phidot, q=sp.Rational)
    return _ring(sp.expand(centre_of_mass_velocity_reaction_term(names)[REACTION_ORDER]))


@lru_cache(maxsize=None)
def reaction_mass_moment(l: int) -> OrbitTensor:
    """The 2.5PN term of I_L of two point masses on a general orbit (centre-of-mass frame).

    Parameters
    ----------
    l:
        Multipole order, l >= 0.

    Returns
    -------
    OrbitTensor
        Rank l, the single order 5/2 (eps = 1/c), known through 5/2: formula (R5) of the module
        docstring on the Newtonian orbit.

    **Conventions**: harmonic coordinates, x = y1 - y2, v = dx/dt; module docstring.

    Example
    -------
    >>> T = reaction_mass_moment(2)
    >>> print(T.terms[(1, 1, 0)].coefficient(sp.Rational(5, 2)))
    48*nu**2*G**2*m**3*r**(-1)/7
    """
    if isinstance(l, bool) or not isinstance(l, int):
        raise TypeError(f"multipole order l must be an int, got {l!r}")
    if l < 0:
        raise ValueError(f"multipole order l must be >= 0, got {l}")
    return op.to_tensor(l, _generating_polynomial(l), KNOWN_THROUGH).with_provenance(REACTION_MOMENT_SOURCE)


@lru_cache(maxsize=None)
def centre_of_mass_shift_part(l: int) -> OrbitTensor:
    """The part of :func:`reaction_mass_moment` that comes from the 2.5PN centre-of-mass shift s:
    l sum_A m_A s^<i_l y_A^L-1> (general orbit).

    The canonical moments remove it: (4 G/c^5) Y_i^(1) = -s for two bodies (tested), so the term
    (4 G/c^5) l I_<L-1 Y_i_l>^(1) of M_L - I_L is minus this part (the relation derived by the
    iteration with the gauge vector, stfalgebra.mpm.gauge_interactions; module docstring).

    Example
    -------
    >>> centre_of_mass_shift_part(2).terms
    {}
    """
    if isinstance(l, bool) or not isinstance(l, int):
        raise TypeError(f"multipole order l must be an int, got {l!r}")
    if l < 0:
        raise ValueError(f"multipole order l must be >= 0, got {l}")
    part = _generating_polynomial(l, with_field=False)
    return op.to_tensor(l, part, KNOWN_THROUGH).with_provenance(REACTION_MOMENT_SOURCE)


@lru_cache(maxsize=None)
def reaction_mass_moment_circular(l: int) -> OrbitTensor:
    """:func:`reaction_mass_moment` at ``rdot = 0`` (the rdot of the inspiral is O(c^-5), so its
    terms here are O(c^-10)).

    Example
    -------
    >>> T = reaction_mass_moment_circular(2)
    >>> T.channel(2, 0, 0, circular_frequency=True)
    PNSeries(-12*I*nu**2*G**2*m**3*r*phidot/7*eps**5 + O(eps**6))
    """
    if isinstance(l, bool) or not isinstance(l, int):
        raise TypeError(f"multipole order l must be an int, got {l!r}")
    if l < 0:
        raise ValueError(f"multipole order l must be >= 0, got {l}")
    f = _generating_polynomial(l)
    circular = op.RING({monomial: coefficient for monomial, coefficient in f.terms() if monomial[7] == 0})
    return op.to_tensor(l, circular, KNOWN_THROUGH).with_provenance(REACTION_MOMENT_SOURCE)
