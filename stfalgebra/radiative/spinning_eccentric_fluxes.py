"""Orbit-averaged energy and angular-momentum fluxes of eccentric binaries with aligned spins.

The instantaneous general-orbit fluxes with the leading spin-orbit terms
(:mod:`stfalgebra.radiative.spinning_general_fluxes`) put on the quasi-Keplerian orbit with the
spin-orbit terms (:mod:`stfalgebra.binary.spin_keplerian`) and averaged exactly over the radial
period (:mod:`stfalgebra.binary.orbit_averages`), in ``x`` and the time eccentricity ``e_t``;
at 1.5PN the leading tail ``4 pi x^(3/2) phi(e_t)``, ``4 pi x^(3/2) psi(e_t)`` is added as for
the non-spinning binary (:mod:`stfalgebra.radiative.tail_enhancement`: spin corrections to the
tails enter the flux at 3PN). The spin-orbit terms enter at ``x^(3/2)``, linear in chi1, chi2;
below 3/2 the averages are those of :mod:`stfalgebra.radiative.eccentric_fluxes` (tested).

Normalisation (``../shared/conventions.md``): ``<F>/((32/5)(c^5/G) nu^2 x^5)`` and
``<dJ_z/dt>/((32/5) m c^2 nu^2 x^(7/2))``, ``x = (G m omega/c^3)^(2/3)``, ``omega = (1 + k) n``
the orbit-averaged azimuthal frequency (with the spin-orbit part of ``k``).

**Conventions**: :mod:`stfalgebra.binary.spin_variables` (``chi1, chi2`` along the orbital
angular momentum); harmonic coordinates, covariant spin supplementary condition; the
angular-momentum flux is the loss of the total ``J_z``, which is the loss of the orbital part
(the spins are constant in magnitude and direction for aligned spins).
"""

from __future__ import annotations

from functools import lru_cache
from typing import Any

import sympy as sp

from ..binary.keplerian import tidy_eccentricity, u
from ..binary.masses import reduce_mass_difference
from ..binary.orbit_averages import ONE_MINUS_E_COS_U, average_anomaly_polynomial, to_anomaly_variables
from ..binary.spin_keplerian import aligned_spin_quasi_keplerian
from ..orders import PNOrder, parse_pn_order
from ..pnseries import PNSeries
from ..symbols import G, c, delta, eps as eps_symbol, et, m, nu, phidot, r, rdot
from .contributions import maximum_eccentric_order, table_for_spins
from .eccentric_fluxes import _check_homogeneous, collect_in_nu
from .tail_enhancement import TAIL_FLUX_NORMALISATION, AngularMomentumTailEnhancement, EnergyTailEnhancement

__all__ = [
    "SPINNING_ECCENTRIC_MAX_PN",
    "check_spinning_eccentric_order",
    "spinning_averaged_energy_flux",
    "spinning_averaged_angular_momentum_flux",
]

#: Highest PN order of the averaged fluxes with aligned spins, read off the table with the spin
#: rows (the spin-spin terms, entering at 2PN, are missing there).
SPINNING_ECCENTRIC_MAX_PN = maximum_eccentric_order(table_for_spins("aligned"))

_TAIL_ORDER = PNOrder(3, 2)
_HALF = sp.Rational(1, 2)
_W = ONE_MINUS_E_COS_U


def check_spinning_eccentric_order(pn: Any) -> PNOrder:
    """A PN order of the aligned-spin eccentric averages, bounded by the table with the spin rows.

    Example
    -------
    >>> check_spinning_eccentric_order("3/2")
    PNOrder(3/2)
    """
    return parse_pn_order(pn, "pn", maximum=SPINNING_ECCENTRIC_MAX_PN)


@lru_cache(maxsize=1)
def _dimensionless_orbit() -> dict[sp.Symbol, PNSeries]:
    """r c^2 x/(G m), rdot/(c sqrt(x)), phidot G m/(c^3 x^(3/2)) on the aligned-spin
    quasi-Keplerian orbit, PN series in sqrt(x) from order 0, coefficients in w, zeta, e_t, nu,
    delta, chi1, chi2."""
    elements = aligned_spin_quasi_keplerian()
    scales = {r: (elements.radius(), -1, G * m / c**2),
              rdot: (elements.radial_velocity(), _HALF, c),
              phidot: (elements.angular_velocity(), sp.Rational(3, 2), c**3 / (G * m))}
    out = {}
    for symbol, (series, lead, scale) in scales.items():
        def to_w(value: sp.Expr, scale: sp.Expr = scale) -> sp.Expr:
            value = to_anomaly_variables(sp.expand(value / scale), et, u)
            value = sp.expand(sp.cancel(sp.together(value)))
            if value.has(c) or value.has(G) or value.has(m):
                raise ArithmeticError(f"orbit coefficient not reduced: {value}")
            return value
        out[symbol] = series.shift(-lead).map_coefficients(to_w)
    return out


def _spin_orbit_average(flux: PNSeries, weight: int) -> sp.Expr:
    """The x^(3/2) coefficient of the average of an instantaneous flux ``S`` (``F = (G/c^5) S``,
    series in 1/c) over the aligned-spin orbit, normalised by ``(32/5) nu^2`` and the x-scaling.

    Neither the flux nor the orbit has a term at relative 1/2, so the x^(3/2) coefficient of
    ``S(orbit)`` is ``S_{3/2}(orbit_0) + sum dS_0/dq q_{3/2}``: the 1PN parts of both drop out of
    it (checked: only orders 0 and 3/2 are kept before the substitution).
    """
    orbit = _dimensionless_orbit()
    unit = flux.map_coefficients(lambda v: sp.expand(v.subs({G: 1, m: 1})))
    _check_homogeneous(unit, weight)
    if any(series.coefficient(_HALF) != 0 for series in (*orbit.values(), unit)):
        raise ArithmeticError("a flux or an orbit element has a term at relative 1/2")
    kept = lambda series: PNSeries({order: series.coefficient(order) for order in (0, _TAIL_ORDER)},  # noqa: E731
                                   _TAIL_ORDER)
    value = kept(unit)
    for symbol in (r, rdot, phidot):
        value = value.substitute(symbol, kept(orbit[symbol]), eps_symbol)
    coefficient = value.truncate(_TAIL_ORDER).coefficient(_TAIL_ORDER)
    averaged = average_anomaly_polynomial(coefficient * _W / (sp.Rational(32, 5) * nu**2), et)
    return collect_in_nu(tidy_eccentricity(reduce_mass_difference(averaged), et))


@lru_cache(maxsize=None)
def _averaged_instantaneous(kind: str, order: PNOrder) -> PNSeries:
    """Orders below 3/2 from the non-spinning averages (no spin term there), the spin-orbit
    term at 3/2 (the non-spinning instantaneous flux has none)."""
    from .eccentric_fluxes import averaged_angular_momentum_flux, averaged_energy_flux
    from .spinning_general_fluxes import spinning_general_angular_momentum_flux, spinning_general_energy_flux

    lower = min(order, PNOrder(1))
    if kind == "energy":
        base = averaged_energy_flux(sp.Rational(lower.numerator, lower.denominator))
    else:
        base = averaged_angular_momentum_flux(sp.Rational(lower.numerator, lower.denominator))
    if order < _TAIL_ORDER:
        return base
    flux = (spinning_general_energy_flux(order) if kind == "energy"
            else spinning_general_angular_momentum_flux(order))
    terms = {k: v for k, v in base.terms.items() if k < _TAIL_ORDER}
    terms[_TAIL_ORDER] = _spin_orbit_average(flux, 10 if kind == "energy" else 7)
    return PNSeries(terms, order)


def _with_tail(instantaneous: PNSeries, tail_function: type[sp.Function], order: PNOrder) -> PNSeries:
    if order < _TAIL_ORDER:
        return instantaneous
    terms = dict(instantaneous.terms)
    terms[_TAIL_ORDER] = terms.get(_TAIL_ORDER, 0) + TAIL_FLUX_NORMALISATION * tail_function(et)
    return PNSeries(terms, order)


@lru_cache(maxsize=None, typed=True)   # typed: pn=True or 1.0 must reach the validation, not 1's entry
def spinning_averaged_energy_flux(pn: Any = "3/2") -> PNSeries:
    """Orbit-averaged energy flux of an eccentric binary with aligned spins, exact in ``e_t``.

    Parameters
    ----------
    pn:
        PN order 0, 1/2, 1 or 3/2.

    Returns
    -------
    PNSeries
        ``<F>/((32/5)(c^5/G) nu^2 x^5)`` in ``eps = sqrt(x)``, coefficients in ``et``, nu, delta,
        chi1, chi2 (and ``phi(et)`` at 3/2); known through ``pn``.

    Raises
    ------
    OrderBeyondInputsError
        ``pn`` beyond the table with the spin rows (2PN needs the spin-spin terms).

    **Conventions**: module docstring.

    Example
    -------
    >>> from stfalgebra.exact import ExactPolynomial
    >>> chi1, chi2 = (ExactPolynomial(name).to_sympy() for name in ("chi1", "chi2"))
    >>> flux = spinning_averaged_energy_flux("3/2").coefficient(sp.Rational(3, 2))
    >>> sp.simplify(flux.subs(et, 0).subs({chi1: 1, chi2: 0, delta: 1, nu: 0}))    # test mass, circular
    -11/4 + 4*pi

    References
    ----------
    Derived here (module docstring). The circular limit is the x^(3/2) term
    ``4 pi - 4 s_l - (5/4) delta sigma_l`` (Kidder, Phys. Rev. D 52, 821 (1995); Blanchet,
    Living Rev. Relativ. 17, 2 (2014), Sec. 11.3; tested against the circular flux of the
    project).
    """
    order = check_spinning_eccentric_order(pn)
    return _with_tail(_averaged_instantaneous("energy", order), EnergyTailEnhancement, order)


@lru_cache(maxsize=None, typed=True)   # typed: pn=True or 1.0 must reach the validation, not 1's entry
def spinning_averaged_angular_momentum_flux(pn: Any = "3/2") -> PNSeries:
    """Orbit-averaged angular-momentum flux ``<dJ_z/dt>`` with aligned spins, exact in ``e_t``.

    Parameters
    ----------
    pn:
        PN order 0, 1/2, 1 or 3/2.

    Returns
    -------
    PNSeries
        ``<dJ_z/dt>/((32/5) m c^2 nu^2 x^(7/2))`` in ``eps = sqrt(x)`` (``psi(et)`` at 3/2).

    **Conventions**: module docstring; positive for loss by the binary.

    Example
    -------
    >>> flux = spinning_averaged_angular_momentum_flux("3/2").coefficient(sp.Rational(3, 2))
    >>> sorted(str(symbol) for symbol in flux.free_symbols)
    ['chi1', 'chi2', 'delta', 'et', 'nu']
    """
    order = check_spinning_eccentric_order(pn)
    return _with_tail(_averaged_instantaneous("angular_momentum", order), AngularMomentumTailEnhancement, order)
