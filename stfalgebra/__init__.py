"""stfalgebra: exact symbolic algebra of multipolar post-Newtonian expansions.

The curated API (loaded on first use, so that the command line starts without sympy when it
serves a cached result):

- STF core: ``Vector``, ``SymmetricTensor``, ``stf_product``, ``stf_epsilon_product``,
  ``spherical_harmonic``, ``spin_weighted_harmonic``, ``alpha_polynomial``
- PN bookkeeping: ``PNSeries``
- moments: ``mass_moment``, ``current_moment``
- modes and fluxes: ``derive_mode``, ``derive_modes``, ``polarisations_from_modes``,
  ``circular_energy_flux_from_modes``, ``circular_energy_flux_from_moments``,
  ``general_orbit_tail`` (the general-orbit tail as an unevaluated hereditary integral),
  ``quadratic_instantaneous_tensor`` (the quadratic interactions of U_L, V_L on a general orbit)
- the circular inspiral from the energy balance: ``circular_quantity`` (E, J, F, dx/dt, phase,
  time as exact PN series in x)
- how results are written: ``present_series`` (prefactor * [terms in increasing PN order]);
  the conventions: ``conventions_document``
- eccentric orbits: ``KeplerEllipse``, ``averaged_energy_flux``, ``averaged_angular_momentum_flux``
- checking: ``compare_with_derived``
- errors: ``StfAlgebraError``, ``OrderBeyondInputsError``, ``RefusedModeError``
"""

from __future__ import annotations

import importlib

__version__ = "0.1.0"

_EXPORTS = {
    "Vector": "stfalgebra.stf.vectors",
    "SymmetricTensor": "stfalgebra.stf.tensors",
    "stf_product": "stfalgebra.stf.tensors",
    "stf_epsilon_product": "stfalgebra.stf.tensors",
    "spherical_harmonic": "stfalgebra.stf.harmonics",
    "spin_weighted_harmonic": "stfalgebra.stf.harmonics",
    "alpha_polynomial": "stfalgebra.stf.harmonics",
    "PNSeries": "stfalgebra.pnseries",
    "mass_moment": "stfalgebra.moments.mass",
    "current_moment": "stfalgebra.moments.current",
    "derive_mode": "stfalgebra.radiative.modes",
    "derive_modes": "stfalgebra.radiative.modes",
    "circular_energy_flux_from_modes": "stfalgebra.radiative.fluxes",
    "circular_energy_flux_from_moments": "stfalgebra.radiative.fluxes",
    "polarisations_from_modes": "stfalgebra.radiative.polarisations",
    "general_orbit_tail": "stfalgebra.radiative.radiative_moments",
    "quadratic_instantaneous_tensor": "stfalgebra.radiative.nonlinear",
    "reaction_mass_moment": "stfalgebra.moments.mass_reaction",
    "circular_quantity": "stfalgebra.radiative.energy_balance",
    "present_series": "stfalgebra.presentation",
    "conventions_document": "stfalgebra.conventions",
    "averaged_energy_flux": "stfalgebra.radiative.eccentric_fluxes",
    "averaged_angular_momentum_flux": "stfalgebra.radiative.eccentric_fluxes",
    "KeplerEllipse": "stfalgebra.binary.keplerian",
    "compare_with_derived": "stfalgebra.checking.compare",
    "StfAlgebraError": "stfalgebra.errors",
    "OrderBeyondInputsError": "stfalgebra.errors",
    "RefusedModeError": "stfalgebra.errors",
}

__all__ = sorted(_EXPORTS)


def __getattr__(name: str):
    if name in _EXPORTS:
        value = getattr(importlib.import_module(_EXPORTS[name]), name)
        globals()[name] = value
        return value
    raise AttributeError(f"module 'stfalgebra' has no attribute {name!r}")


def __dir__():
    return sorted(list(globals()) + __all__)
