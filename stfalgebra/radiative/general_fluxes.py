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
no tails, which start at relative 1.5PN). By default the order is bounded by the complete
radiative moments the table gives on general orbits (relative 1PN: the tail is not evaluated
there); with ``instantaneous_only=True`` the hereditary rows are left out and the fluxes run
through the order the instantaneous rows reach (2PN: the 2PN mass moments, the 1PN current
moments; the quadratic instantaneous interactions of U_L and V_L enter the flux at 2.5PN), the
flux then being its instantaneous part, F = F_inst + (hereditary terms from 1.5PN on).
"""

from __future__ import annotations

from functools import lru_cache
from typing import Any

from ..binary.orbit_derivative import OrbitTimeDerivative
from ..exact import ExactPolynomial
from ..lazy_sympy import sp
from ..orders import PNOrder, parse_pn_order
from ..pnseries import PNSeries
from .contributions import (
    CONTRIBUTIONS, instantaneous_part, leading_order, maximum_flux_order, mode_kind, plan_radiative_moment,
    table_for_spins,
)
from .modes import _normalisation_constant

__all__ = ["general_orbit_energy_flux", "general_orbit_angular_momentum_flux"]


def _modes_for(order: PNOrder):
    """(l, m, shift) with shift the PN order at which |dh_lm/dt|^2 starts (2 x the mode's)."""
    for l in range(2, int(order) + 3):
        for m in range(-l, l + 1):
            shift = 2 * leading_order(l, m)
            if shift <= order:
                yield l, m, shift


#: The rows of the instantaneous part (source moments differentiated along the orbit).
INSTANTANEOUS_ROWS = instantaneous_part(CONTRIBUTIONS)


def _table(instantaneous_only: bool, spins: str | None = None) -> tuple:
    """The table of the fluxes: without spins or with aligned spins, whole or its instantaneous
    part (the spinning flux is always instantaneous: its spin rows name what is refused)."""
    if spins is None:
        return INSTANTANEOUS_ROWS if instantaneous_only else CONTRIBUTIONS
    return instantaneous_part(table_for_spins(spins))


@lru_cache(maxsize=None)
def _channel_pair(l: int, m: int, relative: PNOrder, instantaneous_only: bool = False,
                  spins: str | None = None) -> tuple[PNSeries, PNSeries]:
    """(radiative channel, its time derivative along the orbit, with aligned spins along the
    spinning orbit) known through ``relative``, chosen by the table."""
    plan = plan_radiative_moment(mode_kind(l, m), l, relative, "general", m=m,
                                 table=_table(instantaneous_only, spins))
    channel = None
    for row in plan.rows:
        piece = row.evaluate(l, m, orbit="general")
        channel = piece if channel is None else channel + piece
    if spins is None:
        derivative = OrbitTimeDerivative(plan.input_order("equations of motion"))(channel)
    else:
        from ..binary.spinning_dynamics import AlignedSpinOrbitDerivative

        derivative = AlignedSpinOrbitDerivative()(channel)
    derivative = derivative + channel * (-ExactPolynomial("I") * m * ExactPolynomial("phidot"))
    return channel.truncate(relative), derivative.truncate(relative)


def _weight(l: int, m: int) -> Any:
    """|K_lm|^2/(16 pi) with K_lm the projection/normalisation constant of h_lm (its pi cancels)."""
    constant = _normalisation_constant(l, m, "general", "minus-phi-theta")
    # _normalisation_constant includes the output normalisation 1/(4 m nu sqrt(pi/5)): undo it
    return constant.squared() * 16 / 5 / 16


def _check(pn: Any, instantaneous_only: bool = False, spins: str | None = None) -> PNOrder:
    return parse_pn_order(pn, "pn", maximum=maximum_flux_order("general", _table(instantaneous_only, spins)))


def energy_flux_sum(order: PNOrder, instantaneous_only: bool = False, spins: str | None = None) -> PNSeries:
    """The mode sum of the energy flux S (``F = (G/c^5) S``) through ``order`` (already checked),
    engine coefficients; shared by :func:`general_orbit_energy_flux` and the aligned-spin flux of
    :mod:`stfalgebra.radiative.spinning_general_fluxes`."""
    total = PNSeries._from_trusted({}, order.twice)
    for l, m, shift in _modes_for(order):
        _, W = _channel_pair(l, m, order - shift, instantaneous_only, spins)
        # (c^3 G/(16 pi)) |K|^2 |W|^2 / c^(2(l+2+e)) = (G/c^5) * [K^2/(16 pi)] |W|^2 eps^(2 shift)
        total = total + (W * W.map_coefficients(lambda v: v.conjugate())).shift(shift) * _weight(l, m)
    return total.truncate(order)


def angular_momentum_flux_sum(order: PNOrder, instantaneous_only: bool = False,
                              spins: str | None = None) -> PNSeries:
    """The mode sum of S_J (``dJ_z/dt = (G/c^5) S_J``, loss positive) through ``order``, as
    :func:`energy_flux_sum`."""
    total = PNSeries._from_trusted({}, order.twice)
    for l, m, shift in _modes_for(order):
        if m == 0:
            continue
        U, W = _channel_pair(l, m, order - shift, instantaneous_only, spins)
        product = (U * W.map_coefficients(lambda v: v.conjugate())).shift(shift) * (_weight(l, m) * m)
        total = total + product.map_coefficients(lambda v: v.imaginary_part())
    return total.truncate(order)


def _as_sympy_series(series: PNSeries) -> PNSeries:
    return series.map_coefficients(lambda v: v.to_sympy() if isinstance(v, ExactPolynomial) else v)


@lru_cache(maxsize=None, typed=True)   # typed: pn=True or 1.0 must reach the validation, not 1's entry
def general_orbit_energy_flux(pn: Any, instantaneous_only: bool = False) -> PNSeries:
    """S with F = (G/c^5) S, S a PN series in eps = 1/c (r, rdot, phidot, G, m, nu), sympy.

    ``instantaneous_only``: leave out the hereditary rows (module docstring); the result is
    then the instantaneous flux, available through 2PN.

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
    return _as_sympy_series(energy_flux_sum(_check(pn, instantaneous_only), instantaneous_only))


@lru_cache(maxsize=None, typed=True)   # typed: pn=True or 1.0 must reach the validation, not 1's entry
def general_orbit_angular_momentum_flux(pn: Any, instantaneous_only: bool = False) -> PNSeries:
    """S_J with dJ_z/dt = (G/c^5) S_J (loss by the binary counted positive), sympy;
    ``instantaneous_only`` as in :func:`general_orbit_energy_flux`."""
    return _as_sympy_series(angular_momentum_flux_sum(_check(pn, instantaneous_only), instantaneous_only))
