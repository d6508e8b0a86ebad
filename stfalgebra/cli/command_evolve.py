"""``stfalgebra evolve``: secular evolution of an eccentric binary under radiation reaction.

Contract:

    stfalgebra evolve --pn P [--json]
        the orbit-averaged rates dx/dt and de_t/dt (flux balance on the quasi-Keplerian orbit),
        normalised by (c^3/(G m)) nu x^5 and (c^3/(G m)) nu x^4, as sympy strings in x, nu, et,
        and the closed Newtonian track a(e); P is 0, 1/2, 1 or 3/2 (from 3/2 with the tail
        enhancement functions phi(et), psi(et), left symbolic);
    stfalgebra evolve --pn P --x0 X0 --e0 E0 --x-final XF [--nu NU] [--points N] [--steps S] [--json]
        additionally integrates the rates from (X0, E0) to XF (scipy's adaptive solve_ivp,
        DOP853, rtol 1e-10, atol 1e-12, in ln x; at most S steps) and prints x, e_t and
        tau = c^3 (t - t_0)/(G m) at N points equally spaced in ln x.

JSON keys: "pn", "rates" {"dx_dt", "det_dt"}, "normalisation" {"dx_dt", "det_dt", "tau"},
"newtonian_track", from P = 3/2 "enhancement_functions" {"phi", "psi"}, and with a track "nu"
and "track" (a list of {"x", "et", "tau"}).
Bad input (eccentricity outside [0, 1), or above 0.95 from P = 3/2, x <= 0, nu outside
(0, 1/4], an order beyond 3/2, a step budget too small) is one line on stderr and exit code 2.
"""

from __future__ import annotations

import argparse
import json
import sys

from . import UsageError, register
from .arguments import parse_float, parse_int
from .cache import DerivationCache
from .command_modes import _order_text, parse_order_argument

__all__ = ["evolve_payload"]

_MAX_POINTS = 100_000
_MAX_STEPS = 10_000_000

_NORMALISATION = {
    "dx_dt": "(dx/dt) / ((c^3/(G m)) nu x^5)",
    "det_dt": "(de_t/dt) / ((c^3/(G m)) nu x^4)",
    "tau": "c^3 (t - t_0)/(G m)",
}


def _rates_payload(pn: str, use_cache: bool) -> dict:
    cache = DerivationCache(enabled=use_cache)
    key = cache.key(command="evolve", pn=pn, schema=1)
    cached = cache.get(key)
    if cached is not None:
        return cached
    import sympy as sp

    from ..radiative.secular_rates import secular_rates
    from ..radiative.secular_tracks import newtonian_semi_major_axis_track
    from ..symbols import x
    from .command_flux import ENHANCEMENT_DEFINITIONS

    def text(series) -> str:
        return sp.sstr(sp.Add(*[coeff * x**order for order, coeff in series.terms.items()]))

    x_rate, e_rate = secular_rates(sp.Rational(pn))
    payload = {
        "pn": pn,
        "rates": {"dx_dt": text(x_rate), "det_dt": text(e_rate)},
        "normalisation": dict(_NORMALISATION),
        "newtonian_track": "a = " + sp.sstr(newtonian_semi_major_axis_track()),
    }
    if sp.Rational(pn) >= sp.Rational(3, 2):
        payload["enhancement_functions"] = dict(ENHANCEMENT_DEFINITIONS)
    cache.put(key, payload)
    return payload


def evolve_payload(pn: str, track: dict | None = None, use_cache: bool = True) -> dict:
    """The JSON object of ``stfalgebra evolve``.

    ``track`` (optional): ``{"x0", "e0", "x_final", "nu", "points", "steps"}`` for a numerical
    integration of the secular equations.
    """
    payload = dict(_rates_payload(pn, use_cache))
    if track is not None:
        from ..radiative.secular_tracks import integrate_secular_evolution

        points = integrate_secular_evolution(track["x0"], track["e0"], track["x_final"], track["nu"],
                                             pn=pn, points=track["points"], steps=track["steps"])
        payload["nu"] = track["nu"]
        payload["track"] = [point.to_json() for point in points]
    return payload


@register("evolve", "secular evolution of an eccentric binary: averaged dx/dt, de_t/dt and an integrated track")
class EvolveCommand:
    @staticmethod
    def configure(parser: argparse.ArgumentParser) -> None:
        parser.add_argument("--pn", metavar="P", required=True,
                            help="PN order of the rates (0, 1/2, 1 or 3/2)")
        parser.add_argument("--x0", metavar="X0", help="initial frequency parameter x (> 0)")
        parser.add_argument("--e0", metavar="E0",
                            help="initial time eccentricity in [0, 1) ([0, 0.95] from --pn 3/2)")
        parser.add_argument("--x-final", metavar="XF", help="final x of the integration")
        parser.add_argument("--nu", metavar="NU", default="0.25",
                            help="symmetric mass ratio in (0, 1/4] (default 0.25, equal masses)")
        parser.add_argument("--points", metavar="N", default="11", help="output points (default 11)")
        parser.add_argument("--steps", metavar="S", default="2000",
                            help="step budget of the adaptive integrator: at most S steps in ln x "
                                 "(default 2000)")
        parser.add_argument("--json", action="store_true", help="machine-readable JSON output")
        parser.add_argument("--no-cache", action="store_true", help="derive the rates afresh")

    @staticmethod
    def run(args) -> int:
        pn = _order_text(parse_order_argument(args.pn, "--pn"))
        given = [flag for flag, value in (("--x0", args.x0), ("--e0", args.e0),
                                          ("--x-final", args.x_final)) if value is not None]
        track = None
        if given:
            if len(given) != 3:
                raise UsageError("a track needs all of --x0, --e0 and --x-final")
            track = {"x0": parse_float(args.x0, "--x0"), "e0": parse_float(args.e0, "--e0"),
                     "x_final": parse_float(args.x_final, "--x-final"),
                     "nu": parse_float(args.nu, "--nu"),
                     "points": parse_int(args.points, "--points", 2, _MAX_POINTS),
                     "steps": parse_int(args.steps, "--steps", 1, _MAX_STEPS)}
        payload = evolve_payload(pn, track, not args.no_cache)
        if args.json:
            sys.stdout.write(json.dumps(payload, indent=1) + "\n")
            return 0
        print(f"# secular evolution through {pn}PN (harmonic coordinates, time eccentricity et)")
        for name in ("dx_dt", "det_dt"):
            print(f"{name}: {payload['rates'][name]}")
            print(f"  ({payload['normalisation'][name]})")
        print(f"Newtonian track: {payload['newtonian_track']}")
        if "track" in payload:
            print(f"# nu = {payload['nu']}; tau = {_NORMALISATION['tau']}")
            print(f"{'x':>14} {'et':>14} {'tau':>16}")
            for point in payload["track"]:
                print(f"{point['x']:14.8g} {point['et']:14.8g} {point['tau']:16.8g}")
        return 0
