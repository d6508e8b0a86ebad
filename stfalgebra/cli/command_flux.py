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

from . import register
from .cache import DerivationCache, looks_like_expression
from .options import maximum_pn_order, parse_bounded_order, parse_order_syntax

__all__ = ["flux_payload", "check_flux_payload"]

_FLUX_NAMES = frozenset({"x", "nu", "et", "pi", "EulerGamma", "log", "sqrt"})


def check_flux_payload(value: object, orbit: str, pn: str) -> None:
    """Raise ValueError unless ``value`` has the shape :func:`flux_payload` stores (a cache
    entry is data from disk)."""
    keys = {"orbit", "pn", "energy", "angular_momentum"}
    if orbit == "circular":
        keys |= {"normalisation", "routes", "routes_agree"}
    if not isinstance(value, dict) or set(value) != keys:
        raise ValueError("unexpected keys")
    if (value["orbit"], value["pn"]) != (orbit, pn):
        raise ValueError("another orbit or order")
    if not all(looks_like_expression(value[name], _FLUX_NAMES) for name in ("energy", "angular_momentum")):
        raise ValueError("a flux is not an expression")
    if orbit == "circular" and (value["routes_agree"] is not True or not isinstance(value["routes"], dict)
                                or not isinstance(value["normalisation"], dict)):
        raise ValueError("bad routes or normalisation")


def flux_payload(orbit: str, pn: str, use_cache: bool = True) -> dict:
    """The JSON object of ``stfalgebra flux`` (derived, or from the cache after a shape check);
    ``pn`` is the order's text ("3/2"), bounded here before a derivation."""
    cache = DerivationCache(enabled=use_cache)
    key = cache.key(command="flux", orbit=orbit, pn=pn, schema=1)
    cached = cache.get(key, validate=lambda value: check_flux_payload(value, orbit, pn))
    if cached is not None:
        return cached
    parse_bounded_order(pn, "--pn", maximum_pn_order("flux", orbit=orbit))
    import sympy as sp

    if orbit == "circular":
        from ..radiative.fluxes import (
            circular_angular_momentum_flux_from_modes, circular_energy_flux_from_modes,
            circular_energy_flux_from_moments,
        )
        from ..radiative.modes import _series_expression

        order = sp.Rational(pn)
        by_modes = circular_energy_flux_from_modes(order)
        by_moments = circular_energy_flux_from_moments(order)
        agree = all(sp.expand(by_modes.coefficient(n) - by_moments.coefficient(n)) == 0
                    for n in sorted(set(by_modes.orders) | set(by_moments.orders)))
        if not agree:
            raise RuntimeError("the two flux routes disagree: this is a bug, please report it")
        energy = _series_expression(by_modes, "circular")
        angular = _series_expression(circular_angular_momentum_flux_from_modes(order), "circular")
        payload = {
            "orbit": orbit, "pn": pn,
            "energy": sp.sstr(energy),
            "angular_momentum": sp.sstr(angular),
            "normalisation": {
                "energy": "F / ((32/5) (c^5/G) nu^2 x^5)",
                "angular_momentum": "(dJ_z/dt) / ((32/5) m c^2 nu^2 x^(7/2))",
            },
            "routes": {"mode_sum": sp.sstr(energy),
                       "stf_multipole_formula": sp.sstr(_series_expression(by_moments, "circular"))},
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
        parser.add_argument("--pn", metavar="P", required=True,
                            help="absolute PN order of the flux (a multiple of 1/2: at most 3/2 circular, 1 eccentric)")
        parser.add_argument("--json", action="store_true")
        parser.add_argument("--no-cache", action="store_true")

    @staticmethod
    def run(args) -> int:
        pn = str(parse_order_syntax(args.pn, "--pn"))
        payload = flux_payload(args.orbit, pn, not args.no_cache)
        if args.json:
            sys.stdout.write(json.dumps(payload, indent=1) + "\n")
            return 0
        lines = [f"# {args.orbit} orbit, through {pn}PN"]
        for name in ("energy", "angular_momentum"):
            if name in payload:
                lines.append(f"{name}: {payload[name]}")
                norm = payload.get("normalisation", {}).get(name)
                if norm:
                    lines.append(f"  ({norm})")
        if "routes_agree" in payload:
            lines.append(f"mode sum and STF multipole formula agree: {payload['routes_agree']}")
        sys.stdout.write("\n".join(lines) + "\n")
        return 0
