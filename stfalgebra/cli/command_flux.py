"""``stfalgebra flux``: orbit-averaged / circular energy and angular-momentum fluxes.

Contract:

    stfalgebra flux --orbit circular --pn P [--json]     JSON key "energy": F / ((32/5)(c^5/G) nu^2 x^5)
    stfalgebra flux --orbit eccentric --pn P [--json]    JSON keys "energy", "angular_momentum"
                                                          (the latter / ((32/5) m c^2 nu^2 x^(7/2)))

For circular orbits both routes (mode sum and STF multipole formula) are computed and must
agree; the output says so.
"""

from __future__ import annotations

import argparse
import json
import sys

from . import UsageError, register
from .cache import DerivationCache
from .command_modes import _order_text, parse_order_argument

__all__ = ["flux_payload"]


def flux_payload(orbit: str, pn: str, use_cache: bool = True) -> dict:
    cache = DerivationCache(enabled=use_cache)
    key = cache.key(command="flux", orbit=orbit, pn=pn, schema=1)
    cached = cache.get(key)
    if cached is not None:
        return cached
    import sympy as sp

    if orbit == "circular":
        from ..radiative.fluxes import (
            circular_angular_momentum_flux_from_modes, circular_energy_flux_from_modes,
            circular_energy_flux_from_moments,
        )
        from ..radiative.modes import format_amplitude

        order = sp.Rational(pn)
        by_modes = circular_energy_flux_from_modes(order)
        by_moments = circular_energy_flux_from_moments(order)
        agree = all(sp.expand(sp.sympify(by_modes.coefficient(n)) - sp.sympify(by_moments.coefficient(n))) == 0
                    for n in sorted(set(by_modes.orders) | set(by_moments.orders)))
        if not agree:
            raise RuntimeError("the two flux routes disagree: this is a bug, please report it")
        energy = format_amplitude(None, by_modes, "circular")
        angular = format_amplitude(None, circular_angular_momentum_flux_from_modes(order), "circular")
        payload = {
            "orbit": orbit, "pn": pn,
            "energy": energy,
            "angular_momentum": angular,
            "normalisation": {
                "energy": "F / ((32/5) (c^5/G) nu^2 x^5)",
                "angular_momentum": "(dJ_z/dt) / ((32/5) m c^2 nu^2 x^(7/2))",
            },
            "routes": {"mode_sum": energy,
                       "stf_multipole_formula": format_amplitude(None, by_moments, "circular")},
            "routes_agree": agree,
        }
    else:
        from ..radiative.eccentric import eccentric_flux_payload

        payload = {"orbit": orbit, "pn": pn, **eccentric_flux_payload(sp.Rational(pn))}
    cache.put(key, payload)
    return payload


@register("flux", "energy and angular-momentum fluxes (circular: two independent routes; eccentric: orbit averages)")
class FluxCommand:
    @staticmethod
    def configure(parser: argparse.ArgumentParser) -> None:
        parser.add_argument("--orbit", choices=("circular", "eccentric"), default="circular")
        parser.add_argument("--pn", metavar="P", required=True, help="absolute PN order of the flux")
        parser.add_argument("--json", action="store_true")
        parser.add_argument("--no-cache", action="store_true")

    @staticmethod
    def run(args) -> int:
        pn = _order_text(parse_order_argument(args.pn, "--pn"))
        payload = flux_payload(args.orbit, pn, not args.no_cache)
        if args.json:
            sys.stdout.write(json.dumps(payload, indent=1) + "\n")
            return 0
        print(f"# {args.orbit} orbit, through {pn}PN")
        for name in ("energy", "angular_momentum"):
            if name in payload:
                print(f"{name}: {payload[name]}")
                norm = payload.get("normalisation", {}).get(name)
                if norm:
                    print(f"  ({norm})")
        if "routes_agree" in payload:
            print(f"mode sum and STF multipole formula agree: {payload['routes_agree']}")
        return 0
