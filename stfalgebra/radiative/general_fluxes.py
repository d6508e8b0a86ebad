"""Instantaneous energy and angular-momentum fluxes of a general (eccentric) planar orbit,
summed from the modes.

    F = (R^2 c^3/(16 pi G)) sum_lm |dh_lm/dt|^2,
    dJ_z/dt = (R^2 c^3/(16 pi G)) sum_lm m Im[h_lm conj(dh_lm/dt)]           (../shared/conventions.md)

with h_lm exp(i m phi) = (G/(R c^(l+2))) K_lm U_lm^ch (mass modes) or (G/(R c^(l+3))) K_lm V_lm^ch
(current modes), where U^ch is the radiative moment on the mode's spinor channel
(:mod:`stfalgebra.radiative.radiative_moments`) and K_lm the projection/normalisation constant;
d/dt acts on the channel as d/dt - i m phidot along the PN orbit. Every mode whose
contribution starts at or below the requested order is summed, m = 0 included (on a general
orbit the instantaneous m = 0 modes radiate).

Both fluxes are returned as PN series S in eps = 1/c with F = (G/c^5) S and
dJ_z/dt = (G/c^5) S_J, coefficients in r, rdot, phidot, G, m, nu (instantaneous terms only:
no tails, which start at relative 1.5PN).
"""

from __future__ import annotations

from functools import lru_cache

import sympy as sp

from ..binary.dynamics import OrbitTimeDerivative
from ..binary.masses import reduce_mass_difference
from ..errors import OrderBeyondInputsError
from ..pnseries import PNSeries
from ..symbols import phidot
from .modes import _mass_current_prefactor, parse_order
from .projection import mode_kind
from .radiative_moments import radiative_channel

__all__ = ["general_orbit_energy_flux", "general_orbit_angular_momentum_flux", "GENERAL_FLUX_MAX_PN"]

#: Highest relative PN order of the instantaneous general-orbit fluxes.
GENERAL_FLUX_MAX_PN = sp.Integer(1)


def _modes_for(order: sp.Rational):
    """(l, m, shift) with shift the PN order at which |dh_lm/dt|^2 starts (2 x the mode's)."""
    for l in range(2, int(order) + 3):
        for m in range(-l, l + 1):
            shift = (l - 2) if mode_kind(l, m) == "mass" else (l - 1)
            if shift <= order:
                yield l, m, sp.Integer(shift)


def _channel_pair(l: int, m: int, relative: sp.Rational) -> tuple[PNSeries, PNSeries]:
    """(radiative channel, its time derivative) known through ``relative``."""
    moment_order = 0 if relative < 1 else 1
    if relative > 1:
        raise OrderBeyondInputsError(f"general-orbit fluxes are instantaneous through 1PN, asked {relative}")
    channel = radiative_channel(l, m, moment_order)
    derivative = (OrbitTimeDerivative(moment_order)(channel) + channel * (-sp.I * m * phidot)).expand()
    return channel.truncate(relative), derivative.truncate(relative)


def _conjugate(series: PNSeries) -> PNSeries:
    return series.map_coefficients(lambda e: sp.expand(sp.conjugate(e)))


def _check(pn) -> sp.Rational:
    order = parse_order(pn, "pn")
    if order > GENERAL_FLUX_MAX_PN:
        raise OrderBeyondInputsError(
            f"instantaneous general-orbit fluxes are derived through {GENERAL_FLUX_MAX_PN}PN, asked {order}")
    return order


@lru_cache(maxsize=None)
def general_orbit_energy_flux(pn) -> PNSeries:
    """S with F = (G/c^5) S, S a PN series in eps = 1/c (r, rdot, phidot, G, m, nu).

    Example
    -------
    >>> import sympy as sp
    >>> from stfalgebra.radiative.general_fluxes import general_orbit_energy_flux
    >>> from stfalgebra.symbols import G, m, nu, r, rdot, phidot
    >>> S0 = general_orbit_energy_flux(0).coefficient(0)
    >>> v2 = rdot**2 + r**2*phidot**2       # Newtonian quadrupole formula (textbook)
    >>> sp.expand(S0 - sp.Rational(8, 15)*G**2*m**4*nu**2*(12*v2 - 11*rdot**2)/r**4)
    0
    """
    order = _check(pn)
    total = PNSeries({}, order)
    for l, m, shift in _modes_for(order):
        _, W = _channel_pair(l, m, order - shift)
        K2 = sp.expand(_mass_current_prefactor(l, m) * sp.conjugate(_mass_current_prefactor(l, m)))
        # (c^3 G/(16 pi)) |K|^2 |W|^2 / c^(2(l+2+e)) = (G/c^5) * [K^2/(16 pi)] |W|^2 eps^(2 shift)
        total = total + (W * _conjugate(W)).shift(shift) * (K2 / (16 * sp.pi))
    return total.truncate(order).map_coefficients(lambda e: reduce_mass_difference(sp.expand(e)))


@lru_cache(maxsize=None)
def general_orbit_angular_momentum_flux(pn) -> PNSeries:
    """S_J with dJ_z/dt = (G/c^5) S_J (loss by the binary counted positive)."""
    order = _check(pn)
    total = PNSeries({}, order)
    for l, m, shift in _modes_for(order):
        if m == 0:
            continue
        U, W = _channel_pair(l, m, order - shift)
        K2 = sp.expand(_mass_current_prefactor(l, m) * sp.conjugate(_mass_current_prefactor(l, m)))
        product = (U * _conjugate(W)).shift(shift) * (K2 / (16 * sp.pi) * m)
        total = total + product.map_coefficients(lambda e: sp.im(sp.expand(e)))
    return total.truncate(order).map_coefficients(lambda e: reduce_mass_difference(sp.expand(e)))
