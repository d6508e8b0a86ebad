"""The circular-orbit energy flux of a binary with aligned spins, by two independent routes.

The same two routes as :mod:`stfalgebra.radiative.fluxes`, with the leading spin-orbit terms:

- (a) the mode sum ``F/((32/5)(c^5/G) nu^2 x^5) = (1/8) sum_lm m^2 |Hhat_lm|^2`` over the modes
  of :func:`~stfalgebra.radiative.modes.derive_mode` with ``spins="aligned"``;
- (b) Thorne's STF formula with ``U_L = d^l I_L/dt^l`` and ``V_L = d^l J_L/dt^l`` of the
  aligned-spin source moments (:mod:`stfalgebra.moments.spin_moments`), differentiated along
  the aligned-spin orbit as tensors of ``x, v, ell, e_z, x cross e_z, v cross e_z`` and contracted
  with the STF core (no spherical harmonics), put on the circular orbit with the spinning
  ``gamma(x)`` (:func:`~stfalgebra.binary.spin_circular.spinning_gamma_over_x`); the tail of
  ``U_ij`` is the non-spinning one (spin corrections to tails enter the flux at 3PN).

The flux is known through x^(3/2) (the spin-orbit terms enter there; spin-spin terms at x^2).

**Conventions**: :mod:`stfalgebra.binary.spin_variables`; normalisation as in
:mod:`stfalgebra.radiative.fluxes`.
"""

from __future__ import annotations

from fractions import Fraction
from functools import lru_cache
from typing import Any

from ..binary.spin_circular import spinning_gamma_over_x
from ..lazy_sympy import sp
from ..moments.spin_moments import (
    aligned_spin_current_moment, aligned_spin_mass_moment, differentiate_along_aligned_orbit,
)
from ..orders import PNOrder, parse_pn_order
from ..pnseries import PNSeries
from .contributions import maximum_flux_order, plan_radiative_moment, table_for_spins
from .fluxes import _contributing_modes, multipole_flux_term
from .modes import derive_mode

__all__ = ["check_spinning_flux_order", "spinning_energy_flux_from_modes", "spinning_energy_flux_from_moments",
           "spinning_circular_x_rate"]

_SPINS = "aligned"


def check_spinning_flux_order(pn: Any) -> PNOrder:
    """A flux order for aligned spins, bounded by the table with the spin rows.

    Example
    -------
    >>> check_spinning_flux_order("3/2")
    PNOrder(3/2)
    """
    return parse_pn_order(pn, "pn", maximum=maximum_flux_order("circular", table_for_spins(_SPINS)))


@lru_cache(maxsize=None, typed=True)   # typed: pn=True or 1.0 must reach the validation, not 1's entry
def spinning_energy_flux_from_modes(pn: Any) -> PNSeries:
    """Circular-orbit energy flux with aligned spins / ((32/5)(c^5/G) nu^2 x^5), from the modes.

    Parameters
    ----------
    pn:
        Absolute order, at most 3/2.

    Returns
    -------
    PNSeries
        In ``eps = sqrt(x)``, engine coefficients in nu, delta, chi1, chi2, pi.

    Example
    -------
    >>> spinning_energy_flux_from_modes("3/2").coefficient(PNOrder(3, 2)).substitute({"nu": 0, "delta": 1})
    -11*chi1/4 + 4*pi

    References
    ----------
    ``../shared/conventions.md`` (fluxes from the modes).
    """
    order = check_spinning_flux_order(pn)
    total = PNSeries._from_trusted({}, order.twice)
    for l, m, n0 in _contributing_modes(order):
        result = derive_mode(l, m, pn=order - n0, spins=_SPINS)
        series = result.series
        square = series * series.map_coefficients(lambda v: v.conjugate())
        total = total + square * (result.constant.squared() * m * m / 8)
    return total.truncate(order)


def _reference_probes():
    """``V.k`` for the aligned-spin basis at phi = 0 on a circular orbit: x = (r, 0, 0),
    v = (0, r omega, 0), ell = (0, 0, r^2 omega), e_z, x cross e_z = (0, -r, 0), v cross e_z = (r omega, 0, 0)."""
    from .. import symbols as S
    from ..stf.cartesian import PROBE

    k1, k2, k3 = PROBE
    r, w = S.r, S.omega
    return (r * k1, r * w * k2, r**2 * w * k3, k3, -r * k2, r * w * k1)


def _radiative_polynomial(kind: str, l: int, relative: PNOrder) -> Any:
    """Cartesian polynomial (phi = 0) of d^(l+1)/dt^(l+1) of the aligned-spin moment, circular orbit."""
    from .. import symbols as S

    moment = aligned_spin_mass_moment(l) if kind == "mass" else aligned_spin_current_moment(l)
    derived = differentiate_along_aligned_orbit(moment, l + 1)
    probes = _reference_probes()
    total = sp.Integer(0)
    for key, series in derived.terms.items():
        expr = series.truncate(min(series.known_through, relative)).to_expression(S.eps).subs(S.eps, 1 / S.c)
        expr = expr.subs({S.rdot: 0, S.phidot: S.omega})
        total += expr * sp.Mul(*[p**e for p, e in zip(probes, key)])
    return sp.expand(total)


@lru_cache(maxsize=None, typed=True)   # typed: pn=True or 1.0 must reach the validation, not 1's entry
def spinning_energy_flux_from_moments(pn: Any) -> PNSeries:
    """Circular-orbit energy flux with aligned spins / ((32/5)(c^5/G) nu^2 x^5), STF formula.

    Parameters
    ----------
    pn:
        Absolute order, at most 3/2.

    Returns
    -------
    PNSeries
        In ``eps = sqrt(x)``; equal to :func:`spinning_energy_flux_from_modes` (tested).

    Example
    -------
    >>> spinning_energy_flux_from_moments(0).coefficient(0)
    1

    References
    ----------
    Thorne, Rev. Mod. Phys. 52, 299 (1980), eq. (4.16'); Blanchet, Living Rev. Relativ. 17, 2
    (2014), eq. (68a).
    """
    from .. import symbols as S
    from ..binary.masses import reduce_mass_difference

    order = check_spinning_flux_order(pn)
    table = table_for_spins(_SPINS)
    total = sp.Integer(0)
    for l in range(2, int(order) + 3):
        for kind, n0 in (("mass", l - 2), ("current", l - 1)):
            relative = order - n0
            if relative < 0:
                continue
            plan = plan_radiative_moment(kind, l, relative, "circular", table=table)
            families = {row.family for row in plan.rows}
            if families - {"instantaneous", "tail", "quadratic"}:
                raise AssertionError(f"the STF route does not evaluate {sorted(families)}")
            total += multipole_flux_term(kind, l, _radiative_polynomial(kind, l, relative), "tail" in families)
    g_rel = sp.Symbol("g_rel", positive=True)       # gamma/x
    normalised = total / (sp.Rational(32, 5) * S.c**5 / S.G * S.nu**2 * S.x**5)
    normalised = normalised.subs({S.omega: S.c**3 * S.x**sp.Rational(3, 2) / (S.G * S.m)})
    normalised = normalised.subs({S.r: S.G * S.m / (S.c**2 * S.x * g_rel)})
    normalised = sp.expand(sp.powsimp(sp.expand(normalised), force=True))
    if normalised.has(S.c) or normalised.has(S.G):
        raise AssertionError(f"flux still depends on c or G: {normalised}")
    series = PNSeries.from_expression(normalised.subs(S.x, S.eps**2), S.eps, order)
    series = series.substitute(g_rel, spinning_gamma_over_x(), S.eps)
    return series.truncate(order).map_coefficients(lambda e: reduce_mass_difference(sp.expand(e)))


@lru_cache(maxsize=None, typed=True)   # typed: pn=True or 1.0 must reach the validation, not 1's entry
def spinning_circular_x_rate(pn: Any) -> PNSeries:
    """Secular ``dx/dt`` of a circular orbit with aligned spins, from the energy balance.

    ``d(E)/dt = -F`` with the derived circular binding energy
    (:func:`~stfalgebra.binary.spin_circular.circular_energy`, ``E/(mu c^2)``) and the energy
    flux (:func:`spinning_energy_flux_from_modes`):

        dx/dt = (64/5) (c^3/(G m)) nu x^5 * Fhat(x) / (-2 dEhat/dx).

    Parameters
    ----------
    pn:
        Absolute order, at most 3/2.

    Returns
    -------
    PNSeries
        ``(dx/dt)/((64/5)(c^3/(G m)) nu x^5)`` in ``eps = sqrt(x)``: ``1 + ... + x^(3/2) (4 pi
        - 47/3 s_l - 25/4 delta sigma_l)`` (tested).

    Example
    -------
    >>> spinning_circular_x_rate(1).coefficient(1)
    -743/336 - 11*nu/4

    References
    ----------
    Energy balance (common practice); compare Kidder, PRD 52, 821 (1995) and Blanchet, Living
    Rev. Relativ. 17, 2 (2014), Sec. 11.3 (in the tests).
    """
    from ..binary.spin_circular import circular_energy

    order = check_spinning_flux_order(pn)
    energy = circular_energy()
    slope = PNSeries._from_trusted({k2 - 2: value * (Fraction(k2, 2) * -2) for k2, value in energy._terms if k2},
                                   energy._known2 - 2)
    flux = spinning_energy_flux_from_modes(order)
    return (flux * slope.inverse(order)).truncate(order)
