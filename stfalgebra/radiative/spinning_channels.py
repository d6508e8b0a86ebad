"""The instantaneous radiative moments of a binary with aligned spins, on the channel of a mode.

The evaluator of the table's spin-orbit rows
(:data:`~stfalgebra.radiative.contributions.SPIN_ORBIT_CONTRIBUTIONS`): ``d^l I_L/dt^l`` and
``d^l J_L/dt^l`` of the source moments with their leading spin parts
(:mod:`stfalgebra.moments.spin_moments`: the 1PN orbital moments plus the pole-dipole spin parts,
the centre-of-mass shift included), on the circular orbit of a binary with spins along the orbital
angular momentum. The orbit stays planar and circular; every vector of the aligned-spin basis but
``e_z`` rotates rigidly with the orbital frequency, so on the channel ``(p, q, c)`` of mode
``(l, m)`` the l time derivatives are ``(-i m omega)^l`` (the factor ``exp(-i m phi)`` is
implied), exactly as for the non-spinning binary. ``e_z . k = u_z``: a spin vector feeds the
same ``u_z`` channel as ``ell``, so the spin part of ``J_L`` feeds the current modes and that of
``I_L`` the mass modes, as for the orbital parts.

Put on the orbit with :func:`~stfalgebra.binary.spin_circular.spinning_circular_reduction`
(the circular ``r(x)`` with the spin-orbit term) by :mod:`stfalgebra.radiative.modes`.

On a general (planar) orbit the channel is differentiated l times as ``d/dt - i m phidot``, with
``d/dt`` acting on ``r, rdot, phidot`` along the aligned-spin orbit (1PN point-mass plus leading
spin-orbit acceleration, :class:`~stfalgebra.binary.spinning_dynamics.AlignedSpinOrbitDerivative`):
each channel ``Z+^p Z-^q u_z^c`` only turns with the orbital phase, since ``e_z`` is constant
and every other vector of the basis lies in the orbital plane.

**Conventions**: :mod:`stfalgebra.binary.spin_variables` (``chi1``, ``chi2`` the components of
the dimensionless spins along the orbital angular momentum).
"""

from __future__ import annotations

from functools import lru_cache

from ..binary.spinning_dynamics import AlignedSpinOrbitDerivative
from ..exact import ExactPolynomial
from ..moments.spin_moments import aligned_spin_current_moment, aligned_spin_mass_moment
from ..pnseries import PNSeries
from .contributions import Contribution, check_mode
from .projection import mode_channel

__all__ = ["spinning_source_channel", "spinning_instantaneous_channel"]


@lru_cache(maxsize=None)
def spinning_source_channel(l: int, m: int, circular: bool = True) -> PNSeries:
    """``I_L`` or ``J_L`` with the leading spin parts, on the channel of (l, m), circular orbit.

    Parameters
    ----------
    l, m:
        The mode (``l >= 2``).
    circular:
        True: on the circular orbit (``rdot = 0``); False: on a general planar orbit.

    Returns
    -------
    PNSeries
        In ``eps = 1/c``; engine coefficients in r, rdot, phidot, G, m, nu, delta, chi1, chi2.

    Example
    -------
    >>> from fractions import Fraction
    >>> spinning_source_channel(2, 1).coefficient(Fraction(1, 2))      # from J_ij^S = -(3/2) nu x Sigma
    3*nu*chi1*G*m**2*r/8 - 3*nu*chi2*G*m**2*r/8 + 3*nu*delta*chi1*G*m**2*r/8 + 3*nu*delta*chi2*G*m**2*r/8

    References
    ----------
    :func:`~stfalgebra.moments.spin_moments.aligned_spin_mass_moment`,
    :func:`~stfalgebra.moments.spin_moments.aligned_spin_current_moment`.
    """
    check_mode(l, m)
    p, q, c = mode_channel(l, m)
    moment = aligned_spin_mass_moment(l) if c == 0 else aligned_spin_current_moment(l)
    if not circular:
        return moment.channel(p, q, c)
    return moment.on_circular_orbit().channel(p, q, c, circular_frequency=True)


@lru_cache(maxsize=None)
def _general_orbit_channel(l: int, m: int) -> PNSeries:
    derivative = AlignedSpinOrbitDerivative()
    rotation = -ExactPolynomial("I") * m * ExactPolynomial("phidot")
    value = spinning_source_channel(l, m, circular=False)
    for _ in range(l):
        value = derivative(value) + value * rotation
    return value


def spinning_instantaneous_channel(l: int, m: int, *, row: Contribution, orbit: str) -> PNSeries:
    """``d^l I_L/dt^l`` (or ``d^l J_L/dt^l``) with the leading spin parts on the channel of (l, m).

    Parameters
    ----------
    l, m:
        The mode.
    row:
        The row of the table (unused beyond the dispatch: the spinning moments have one accuracy).
    orbit:
        "circular" or "general" (a planar orbit: aligned spins do not tilt it).

    Returns
    -------
    PNSeries
        Circular: ``spinning_source_channel(l, m) * (-i m phidot)^l``; general: the channel
        differentiated l times along the aligned-spin orbit (module docstring).

    Example
    -------
    >>> from stfalgebra.radiative.contributions import SPIN_ORBIT_CONTRIBUTIONS
    >>> row = SPIN_ORBIT_CONTRIBUTIONS[0]
    >>> spinning_instantaneous_channel(2, 2, row=row, orbit="circular").orders[:2]
    (PNOrder(0), PNOrder(1))

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 3 (``U_L = I_L^(l) + ...``).
    """
    if orbit == "general":
        return _general_orbit_channel(l, m)
    if orbit != "circular":
        raise ValueError(f"the aligned-spin radiative moments are evaluated on circular and general orbits, got {orbit!r}")
    rotation = -ExactPolynomial("I") * m * ExactPolynomial("phidot")
    return spinning_source_channel(l, m) * rotation**l
