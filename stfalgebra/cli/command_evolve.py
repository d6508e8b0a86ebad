"""``stfalgebra evolve``: secular evolution of an eccentric binary under radiation reaction.

Contract:

    stfalgebra evolve --pn P [--json]
        the orbit-averaged rates dx/dt and de_t/dt (flux balance on the quasi-Keplerian orbit),
        normalised by (c^3/(G m)) nu x^5 and (c^3/(G m)) nu x^4, as sympy strings in x, nu, et,
        and the closed Newtonian track a(e);
    stfalgebra evolve --pn P --x0 X0 --e0 E0 --x-final XF [--nu NU] [--points N] [--steps S] [--json]
        additionally integrates the rates from (X0, E0) to XF (fourth-order Runge-Kutta in ln x)
        and prints x, e_t and tau = c^3 (t - t_0)/(G m) at N points.

JSON keys: "pn", "rates" {"dx_dt", "det_dt"}, "normalisation" {"dx_dt", "det_dt", "tau"},
"newtonian_track", and with a track "nu" and "track" (a list of {"x", "et", "tau"}).
Bad input (eccentricity outside [0, 1), x <= 0, nu outside (0, 1/4], an order beyond 1PN) is
one line on stderr and exit code 2.
"""

from __future__ import annotations

import argparse
import json
import sys

from . import UsageError, register
from .cache import DerivationCache
from .command_modes import _order_text, parse_order_argument

__all__ = ["evolve_payload"]

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

    from ..radiative.eccentric import newtonian_semi_major_axis_track, secular_rates
    from ..symbols import x

    def text(series) -> str:
        return sp.sstr(sp.Add(*[coeff * x**order for order, coeff in series.terms.items()]))

    x_rate, e_rate = secular_rates(sp.Rational(pn))
    payload = {
        "pn": pn,
        "rates": {"dx_dt": text(x_rate), "det_dt": text(e_rate)},
        "normalisation": dict(_NORMALISATION),
        "newtonian_track": "a = " + sp.sstr(newtonian_semi_major_axis_track()),
    }
    cache.put(key, payload)
    return payload


def evolve_payload(pn: str, track: dict | None = None, use_cache: bool = True) -> dict:
    """The JSON object of ``stfalgebra evolve``.

    ``track`` (optional): ``{"x0", "e0", "x_final", "nu", "points", "steps"}`` for a numerical
    integration of the secular equations.
    """
    payload = dict(_rates_payload(pn, use_cache))
    if track is not None:
        from ..radiative.eccentric import integrate_secular_evolution

        points = integrate_secular_evolution(track["x0"], track["e0"], track["x_final"], track["nu"],
                                             pn=pn, points=track["points"], steps=track["steps"])
        payload["nu"] = track["nu"]
        payload["track"] = [point.to_json() for point in points]
    return payload


def _number(text: str, flag: str) -> float:
    try:
        return float(text)
    except ValueError:
        raise UsageError(f"{flag} must be a number, got {text!r}") from None


def _positive_int(text: str, flag: str) -> int:
    try:
        value = int(text)
    except ValueError:
        raise UsageError(f"{flag} must be an integer, got {text!r}") from None
    if value < 1:
        raise UsageError(f"{flag} must be positive, got {text!r}")
    return value


@register("evolve", "secular evolution of an eccentric binary: averaged dx/dt, de_t/dt and an integrated track")
class EvolveCommand:
    @staticmethod
    def configure(parser: argparse.ArgumentParser) -> None:
        parser.add_argument("--pn", metavar="P", required=True,
                            help="PN order of the rates (0, 1/2 or 1)")
        parser.add_argument("--x0", metavar="X0", help="initial frequency parameter x (> 0)")
        parser.add_argument("--e0", metavar="E0", help="initial time eccentricity in [0, 1)")
        parser.add_argument("--x-final", metavar="XF", help="final x of the integration")
        parser.add_argument("--nu", metavar="NU", default="0.25",
                            help="symmetric mass ratio in (0, 1/4] (default 0.25, equal masses)")
        parser.add_argument("--points", metavar="N", default="11", help="output points (default 11)")
        parser.add_argument("--steps", metavar="S", default="2000",
                            help="Runge-Kutta steps in ln x (default 2000)")
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
            points = _positive_int(args.points, "--points")
            if points < 2:
                raise UsageError(f"--points must be at least 2, got {args.points!r}")
            track = {"x0": _number(args.x0, "--x0"), "e0": _number(args.e0, "--e0"),
                     "x_final": _number(args.x_final, "--x-final"), "nu": _number(args.nu, "--nu"),
                     "points": points, "steps": _positive_int(args.steps, "--steps")}
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
