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

from ..orders import PNOrder, parse_pn_order
from ..pnseries import PNSeries
from .contributions import instantaneous_part, maximum_flux_order, table_for_spins
from .general_fluxes import _as_sympy_series, angular_momentum_flux_sum, energy_flux_sum

__all__ = ["SPINNING_INSTANTANEOUS_TABLE", "spinning_general_energy_flux", "spinning_general_angular_momentum_flux"]

#: The aligned-spin table restricted to the instantaneous part (and the missing spin rows, so
#: that a refusal names them): the source moments with their spin parts along the orbit.
_SPINS = "aligned"
SPINNING_INSTANTANEOUS_TABLE = instantaneous_part(table_for_spins(_SPINS))


def _check(pn: Any) -> PNOrder:
    return parse_pn_order(pn, "pn", maximum=maximum_flux_order("general", SPINNING_INSTANTANEOUS_TABLE))


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
    return _as_sympy_series(energy_flux_sum(_check(pn), instantaneous_only=True, spins=_SPINS))


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
    return _as_sympy_series(angular_momentum_flux_sum(_check(pn), instantaneous_only=True, spins=_SPINS))
