"""Mass-type source moments I_L of two point masses, Newtonian and 1PN, for every l.

The moments are obtained by applying the general 1PN mass-moment formula of Blanchet &
Damour (1989), Ann. Inst. H. Poincare 50, 377 (their 1PN source moment; the same expression
is the 1PN limit of the general source moment of Blanchet, Living Rev. Relativ. 17, 2 (2014)):

    I_L = int d^3x { xhat_L sigma + |x|^2 xhat_L d_t^2 sigma / (2 c^2 (2l+3))
                     - 4 (2l+1) xhat_{aL} d_t sigma_a / (c^2 (l+1) (2l+3)) } + O(c^-4),   (M1)

sigma = (T^00 + T^ii)/c^2, sigma_i = T^0i/c, to the point-particle densities

    sigma = sum_A m_A [1 + (3/2 v_A^2 - G m_B/r12)/c^2] delta(x - y_A),   sigma_i = sum_A m_A v_A^i delta(x - y_A)

(T^{mu nu} of point masses with the 1PN metric g_00 = -1 + 2U/c^2, g_ij = delta_ij (1 + 2U/c^2),
U regularised at each body by dropping its self part; common practice). The time derivatives
in (M1) are taken along the Newtonian orbit (they are already 1PN), the leading term uses the
1PN centre-of-mass positions, and the contraction xhat_{aL} v_a is reduced with the STF
identity x_<aL> v_a = x_<L> (x.v) - (l/(2l+1)) r^2 x_<L-1 v_il> (Thorne 1980, Rev. Mod.
Phys. 52, 299, from the trace-removal formula eq. (2.2); tested against the STF core).
No two-body result is typed in: the mass-ratio factors come out of the sums over bodies.
"""

from __future__ import annotations

from functools import lru_cache

from fractions import Fraction

from ..exact import ExactPolynomial, engine_symbols
from .point_particles import (
    check_moment_order, companion_weighted_sum, exact_series, first_derivative_term,
    one_pn_position_shift, position_factor_sum, retardation_term,
)
from .orbit_tensor import PLANAR_BASIS, OrbitTensor

__all__ = ["mass_moment"]


def _check_rank(l) -> None:
    if isinstance(l, bool) or not isinstance(l, int):
        raise TypeError(f"multipole order l must be an int, got {l!r}")
    if l < 0:
        raise ValueError(f"multipole order l must be >= 0, got {l}")


def mass_moment(l: int, pn_order: int = 0) -> OrbitTensor:
    """The mass moment I_L of two point masses in the centre-of-mass frame.

    Parameters
    ----------
    l:
        Multipole order (rank), l >= 0.
    pn_order:
        0 (Newtonian), 1 (1PN) or 2 (2PN, :mod:`stfalgebra.moments.mass_two_pn`), harmonic
        coordinates. Higher orders raise :class:`~stfalgebra.errors.OrderBeyondInputsError`.

    Returns
    -------
    OrbitTensor
        I_L = sum s_abc x_<A v_B> with coefficients PN series in eps = 1/c, in G, m, nu,
        delta, r, rdot, phidot (delta^2 reduced to 1 - 4 nu). Known through relative order
        1/2 (Newtonian), 3/2 (1PN) or 5/2 (2PN; the 2.5PN radiation-reaction terms are
        :func:`stfalgebra.moments.mass_reaction.reaction_mass_moment`).

    **Conventions**: x = y1 - y2, centre-of-mass frame, harmonic coordinates at 1PN.

    Example
    -------
    >>> from stfalgebra.moments.mass import mass_moment
    >>> mass_moment(2).terms[(2, 0, 0)].coefficient(0)      # I_ij = m nu x_<ij>
    nu*m
    >>> mass_moment(3).terms[(3, 0, 0)].coefficient(0)      # I_ijk = -m nu delta x_<ijk>
    -nu*delta*m

    References
    ----------
    Blanchet & Damour (1989), Ann. Inst. H. Poincare 50, 377 (1PN mass moments, (M1) above);
    Blanchet, Living Rev. Relativ. 17, 2 (2014).
    """
    _check_rank(l)
    if isinstance(pn_order, bool) or not isinstance(pn_order, int):
        raise TypeError(f"pn_order must be an int, got {pn_order!r}")
    if pn_order == 2:
        from .mass_two_pn import mass_moment_two_pn     # sympy rings: loaded only for 2PN

        return mass_moment_two_pn(l).with_provenance(
            f"I_L, l = {l}: 2PN, the general source-moment formula reduced at 2PN ((I4) of "
            "stfalgebra.moments.mass_two_pn): compact point-particle terms with the "
            "Hadamard-regularised metric, quadratic field terms through the kernel (F2), cubic "
            "terms through the two-centre finite-part seeds; 2PN centre-of-mass relations")
    tensor = _mass_moment(l, pn_order)
    if pn_order == 0:
        return tensor.with_provenance(f"I_L, l = {l}: Newtonian, sum_A m_A y_A^<L> of two point masses")
    return tensor.with_provenance(
        f"I_L, l = {l}: 1PN, Blanchet & Damour (1989) mass-moment formula (M1) applied to the "
        "point-particle sigma, sigma_i; 1PN centre-of-mass relations; time derivatives along "
        "the Newtonian orbit inside the 1PN terms")


@lru_cache(maxsize=None)
def _mass_moment(l: int, pn_order: int) -> OrbitTensor:
    _check_rank(l)
    known = check_moment_order(pn_order)
    if pn_order == 0:
        return OrbitTensor._trusted(l, {(l, 0, 0): exact_series({0: position_factor_sum(l)}, known)}, PLANAR_BASIS)

    s = engine_symbols()
    v2 = s.rdot**2 + s.r**2 * s.phidot**2
    # leading term: sum_A m_A [1 + (3/2 v_A^2 - G m_B/r)/c^2] (s_A + shift/c^2)^l, expanded to
    # first order in 1/c^2 with v_A = s_A v (Newtonian) inside the correction
    correction = (Fraction(3, 2) * v2 * position_factor_sum(l + 2)
                  - s.G * s.m * s.r**-1 * companion_weighted_sum(l))
    if l >= 1:
        correction = correction + l * one_pn_position_shift() * position_factor_sum(l - 1)
    moment = OrbitTensor._trusted(l, {(l, 0, 0): exact_series({0: position_factor_sum(l), 1: correction}, known)},
                                     PLANAR_BASIS)

    # |x|^2 xhat_L d_t^2 sigma term, then xhat_{aL} sigma_a with
    # x_<aL> v_a = x_<L> r rdot - (l/(2l+1)) r^2 x_<L-1 v>
    S = position_factor_sum(l + 2)
    moment = moment + retardation_term(l, (l, 0, 0), S)
    inner = {(l, 0, 0): S * s.r * s.rdot}
    if l >= 1:
        inner[(l - 1, 1, 0)] = -S * s.r**2 * Fraction(l, 2 * l + 1)
    moment = moment + first_derivative_term(l, inner, ExactPolynomial(-Fraction(4 * (2 * l + 1), (l + 1) * (2 * l + 3))))
    return moment.truncate(known)
