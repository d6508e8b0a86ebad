"""``stfalgebra phasing``: the circular inspiral from the energy balance.

    stfalgebra phasing --pn P [--quantity NAME ...] [--format text|latex|json] [--no-cache]

Prints, as exact PN series in x = (G m omega/c^3)^(2/3), each through relative order P beyond
its own leading term: the conserved energy E(x) and angular momentum J(x), the energy flux
F(x), the rate dx/dt = -F/(dE/dx), and the orbital phase phi(x) - phi_0 and time t(x) - t_0
from dphi/dx = omega/(dx/dt), dt/dx = 1/(dx/dt) (:mod:`stfalgebra.radiative.energy_balance`).
``--quantity`` (repeatable; names ``energy``, ``angular_momentum``, ``energy_flux``,
``x_rate``, ``phase``, ``time``) selects some of them; P is bounded by the lowest limit among
those asked for, and the refusal names the input that limits it.

JSON: ``{"orbit": "circular", "pn": "3/2", "variable": "x", "quantities": {NAME: {...}}}``, each
quantity with the keys of :mod:`stfalgebra.cli.forms`.
"""

from __future__ import annotations

import argparse
import json
import sys

from . import register
from .cache import DerivationCache
from .forms import check_quantity_json, latex_lines, quantity_json, text_lines
from .options import add_format_option, output_format, parse_bounded_order, parse_order_syntax

__all__ = ["phasing_payload", "QUANTITY_NAMES"]

#: The quantities in the order they are printed (the same names as the engine's).
QUANTITY_NAMES = ("energy", "angular_momentum", "energy_flux", "x_rate", "phase", "time")
_NAMES = frozenset({"x", "nu", "m", "G", "c", "pi", "EulerGamma", "log", "sqrt"})
_HEADER = ("circular orbits, energy balance dE/dt = -F; x = (G m omega/c^3)^(2/3); harmonic coordinates, "
           "centre-of-mass frame",)


def _check_payload(value: object, pn: str, names: tuple[str, ...]) -> None:
    if not isinstance(value, dict) or value.get("pn") != pn or not isinstance(value.get("quantities"), dict):
        raise ValueError("not a phasing document")
    if tuple(value["quantities"]) != names:
        raise ValueError("other quantities")
    for quantity in value["quantities"].values():
        check_quantity_json(quantity, _NAMES)


def phasing_payload(pn: str, names: tuple[str, ...], use_cache: bool = True) -> dict:
    """The JSON document of ``stfalgebra phasing`` (derived, or from the cache after a shape
    check); ``pn`` is the order's text, bounded here before a derivation."""
    cache = DerivationCache(enabled=use_cache)
    key = cache.key(command="phasing", pn=pn, quantities=list(names), schema=1)
    cached = cache.get(key, validate=lambda value: _check_payload(value, pn, names))
    if cached is not None:
        return cached
    from ..radiative.energy_balance import circular_quantity, maximum_quantity_order

    limits = {name: maximum_quantity_order(name) for name in names}
    lowest = min(limits.values())
    order = parse_bounded_order(pn, "--pn", lowest, reason=lambda order: "limited by " + ", ".join(
        f"{name} (through {limit})" for name, limit in limits.items() if limit < order))
    quantities = {}
    for name in names:
        quantity = circular_quantity(name, order)
        quantities[name] = quantity_json(quantity.presentation(), symbol=quantity.symbol,
                                         latex_symbol=quantity.latex_symbol, words=quantity.words,
                                         pn=str(quantity.pn), provenance=quantity.provenance)
    payload = {"orbit": "circular", "pn": pn, "variable": "x", "quantities": quantities}
    cache.put(key, payload)
    return payload


@register("phasing", "circular inspiral from the energy balance: E(x), J(x), flux, dx/dt, phase and time as PN series")
class PhasingCommand:
    @staticmethod
    def configure(parser: argparse.ArgumentParser) -> None:
        parser.add_argument("--pn", metavar="P", required=True,
                            help="relative PN order kept beyond each quantity's leading term (a multiple of 1/2, "
                                 "up to what the inputs of the quantities asked for give)")
        parser.add_argument("--quantity", action="append", choices=QUANTITY_NAMES, metavar="NAME",
                            help="one of " + ", ".join(QUANTITY_NAMES) + " (repeatable; default: all)")
        add_format_option(parser, json_flag=False)
        parser.add_argument("--no-cache", action="store_true", help="derive afresh, do not read or write the cache")

    @staticmethod
    def run(args: argparse.Namespace) -> int:
        pn = str(parse_order_syntax(args.pn, "--pn"))
        names = tuple(name for name in QUANTITY_NAMES if name in (args.quantity or QUANTITY_NAMES))
        payload = phasing_payload(pn, names, not args.no_cache)
        fmt = output_format(args)
        if fmt == "json":
            sys.stdout.write(json.dumps(payload, indent=1) + "\n")
        elif fmt == "latex":
            sys.stdout.write(latex_lines(_HEADER, payload["quantities"].values()))
        else:
            sys.stdout.write(text_lines(_HEADER, payload["quantities"].values()))
        return 0
