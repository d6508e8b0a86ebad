"""Instantaneous energy and angular-momentum fluxes of a general planar orbit with aligned spins.

The counterpart of :mod:`stfalgebra.radiative.general_fluxes` for spins along the orbital
angular momentum: the same mode sums

    F = (R^2 c^3/(16 pi G)) sum_lm |dh_lm/dt|^2,
    dJ_z/dt = (R^2 c^3/(16 pi G)) sum_lm m Im[h_lm conj(dh_lm/dt)]           (../shared/conventions.md)

over the radiative moments the table with the spin rows gives on general orbits
(:func:`~stfalgebra.radiative.contributions.table_for_spins`, instantaneous rows only: the
source moments with their leading spin parts, differentiated along the aligned-spin orbit), with
``d/dt`` on the channels along the 1PN plus leading spin-orbit equations of motion
(:class:`~stfalgebra.binary.spinning_dynamics.AlignedSpinOrbitDerivative`). The orbit stays
planar, so the modes and their normalisations are those of the non-spinning planar orbit.

Both fluxes are PN series ``S`` in ``eps = 1/c`` with ``F = (G/c^5) S`` and
``dJ_z/dt = (G/c^5) S_J``, sympy coefficients in r, rdot, phidot, G, m, nu, delta, chi1, chi2;
known through 3/2 (the instantaneous part: the tails enter at 1.5PN and are added on the
averages through the enhancement functions; spin-spin terms enter at 2PN and are refused by the
table).

**Conventions**: :mod:`stfalgebra.binary.spin_variables`; harmonic coordinates, covariant spin
supplementary condition.
"""

from __future__ import annotations

from functools import lru_cache
from typing import Any

from ..binary.spinning_dynamics import AlignedSpinOrbitDerivative
from ..exact import ExactPolynomial
from ..orders import PNOrder, parse_pn_order
from ..pnseries import PNSeries
from .contributions import maximum_flux_order, mode_kind, plan_radiative_moment, table_for_spins
from .general_fluxes import _as_sympy_series, _modes_for, _weight

__all__ = ["SPINNING_INSTANTANEOUS_TABLE", "spinning_general_energy_flux", "spinning_general_angular_momentum_flux"]

#: The aligned-spin table restricted to the instantaneous part (and the missing spin rows, so
#: that a refusal names them): the source moments with their spin parts along the orbit.
SPINNING_INSTANTANEOUS_TABLE = tuple(row for row in table_for_spins("aligned")
                                     if row.family in ("instantaneous", "next-to-leading spin-orbit", "spin-spin"))


def _check(pn: Any) -> PNOrder:
    return parse_pn_order(pn, "pn", maximum=maximum_flux_order("general", SPINNING_INSTANTANEOUS_TABLE))


@lru_cache(maxsize=None)
def _channel_pair(l: int, m: int, relative: PNOrder) -> tuple[PNSeries, PNSeries]:
    """(radiative channel, its time derivative along the aligned-spin orbit) through ``relative``."""
    plan = plan_radiative_moment(mode_kind(l, m), l, relative, "general", m=m, table=SPINNING_INSTANTANEOUS_TABLE)
    channel = None
    for row in plan.rows:
        piece = row.evaluate(l, m, orbit="general")
        channel = piece if channel is None else channel + piece
    derivative = AlignedSpinOrbitDerivative()(channel)
    derivative = derivative + channel * (-ExactPolynomial("I") * m * ExactPolynomial("phidot"))
    return channel.truncate(relative), derivative.truncate(relative)


@lru_cache(maxsize=None, typed=True)   # typed: pn=True or 1.0 must reach the validation, not 1's entry
def spinning_general_energy_flux(pn: Any) -> PNSeries:
    """``S`` with ``F = (G/c^5) S`` on a general planar orbit with aligned spins (instantaneous).

    Parameters
    ----------
    pn:
        Absolute order, at most 3/2.

    Returns
    -------
    PNSeries
        In ``eps = 1/c``; sympy coefficients in r, rdot, phidot, G, m, nu, delta, chi1, chi2.

    **Conventions**: module docstring.

    Example
    -------
    >>> from stfalgebra.radiative.general_fluxes import general_orbit_energy_flux
    >>> spinning_general_energy_flux(1) == general_orbit_energy_flux(1)     # no spin term below 3/2
    True

    References
    ----------
    ``../shared/conventions.md`` (fluxes from the modes); Kidder, Phys. Rev. D 52, 821 (1995),
    eq. (3.25) for the spin-orbit part (compared in the tests, from memory).
    """
    order = _check(pn)
    total = PNSeries._from_trusted({}, order.twice)
    for l, m, shift in _modes_for(order):
        _, derivative = _channel_pair(l, m, order - shift)
        total = total + (derivative * derivative.map_coefficients(lambda v: v.conjugate())).shift(shift) * _weight(l, m)
    return _as_sympy_series(total.truncate(order))


@lru_cache(maxsize=None, typed=True)   # typed: pn=True or 1.0 must reach the validation, not 1's entry
def spinning_general_angular_momentum_flux(pn: Any) -> PNSeries:
    """``S_J`` with ``dJ_z/dt = (G/c^5) S_J`` (loss counted positive), aligned spins, instantaneous.

    Parameters
    ----------
    pn:
        Absolute order, at most 3/2.

    Returns
    -------
    PNSeries
        As :func:`spinning_general_energy_flux`.

    Example
    -------
    >>> from stfalgebra.radiative.general_fluxes import general_orbit_angular_momentum_flux
    >>> spinning_general_angular_momentum_flux(0) == general_orbit_angular_momentum_flux(0)
    True
    """
    order = _check(pn)
    total = PNSeries._from_trusted({}, order.twice)
    for l, m, shift in _modes_for(order):
        if m == 0:
            continue
        channel, derivative = _channel_pair(l, m, order - shift)
        product = (channel * derivative.map_coefficients(lambda v: v.conjugate())).shift(shift) * (_weight(l, m) * m)
        total = total + product.map_coefficients(lambda v: v.imaginary_part())
    return _as_sympy_series(total.truncate(order))
