"""``stfalgebra mode`` and ``stfalgebra modes``: derived mode amplitudes Hhat_lm.

Command-line contract (kept exactly; checks outside the repository use it):

    stfalgebra mode L M --orbit circular|general (--pn P | --pn-relative Q) [--json]
    stfalgebra modes --orbit circular|general (--pn P | --pn-relative Q) --lmax N [--json]

Without ``--json`` a table is printed (``--format latex`` for LaTeX rows). Results are served
from the on-disk cache when the same request was derived before by the same code
(``--no-cache`` to bypass). This module imports sympy only on a cache miss.
"""

from __future__ import annotations

import argparse
import json
import sys
from fractions import Fraction

from . import UsageError, register
from .cache import DerivationCache

__all__ = ["parse_order_argument", "mode_payloads"]

_SIGN_CHOICES = ("review", "theta-phi")


def parse_order_argument(text: str, flag: str) -> Fraction:
    """A PN order from the command line: a non-negative multiple of 1/2 ("1", "1.5", "3/2"),
    parsed with bounded effort (:func:`stfalgebra.orders.parse_pn_order`)."""
    from ..orders import parse_pn_order

    try:
        return parse_pn_order(text, flag)
    except ValueError as exc:
        raise UsageError(str(exc)) from None


def _order_text(value: Fraction) -> str:
    return str(value.numerator) if value.denominator == 1 else f"{value.numerator}/{value.denominator}"


def _add_common(parser: argparse.ArgumentParser) -> None:
    parser.add_argument("--orbit", choices=("circular", "general"), default="circular",
                        help="circular (Hhat in x, nu, delta) or general (in r, rdot, phidot, m, nu, delta, c)")
    order = parser.add_mutually_exclusive_group(required=True)
    order.add_argument("--pn", metavar="P",
                       help="absolute PN order: every term through x^P (circular) or (1/c)^(2P) beyond the Newtonian h_22")
    order.add_argument("--pn-relative", metavar="Q",
                       help="PN orders kept beyond each mode's own leading term")
    parser.add_argument("--json", action="store_true", help="machine-readable JSON output")
    parser.add_argument("--format", choices=("text", "latex"), default="text",
                        help="table format without --json")
    parser.add_argument("--sign-convention", choices=_SIGN_CHOICES, default="review",
                        help="review: triad P = -e_Phi, Q = e_Theta (Hhat_22 = +1, default); "
                             "theta-phi: P = e_Theta, Q = e_Phi (every h_lm flipped)")
    parser.add_argument("--phase", choices=("psi", "phi"), default="psi",
                        help="phase variable of circular modes (psi absorbs the tail logarithm)")
    parser.add_argument("--no-cache", action="store_true", help="derive afresh, do not read or write the cache")


def _order_request(args) -> dict:
    if args.pn is not None:
        return {"pn": _order_text(parse_order_argument(args.pn, "--pn"))}
    return {"pn_relative": _order_text(parse_order_argument(args.pn_relative, "--pn-relative"))}


def mode_payloads(modes: list[tuple[int, int]] | None, lmax: int | None, orbit: str, order: dict,
                  sign_convention: str, phase: str, use_cache: bool) -> list[dict]:
    """JSON objects of the requested modes (derived, or from the cache)."""
    cache = DerivationCache(enabled=use_cache)
    key = cache.key(command="modes", modes=modes, lmax=lmax, orbit=orbit, order=order,
                    sign_convention=sign_convention, phase=phase, schema=1)
    cached = cache.get(key)
    if cached is not None:
        return cached
    from ..radiative.modes import derive_mode, derive_modes

    kwargs = dict(orbit=orbit, sign_convention=sign_convention, phase=phase, **order)
    if modes is not None:
        results = [derive_mode(l, m, **kwargs) for l, m in modes]
    else:
        results = derive_modes(lmax, **kwargs)
    payload = []
    for res in results:
        obj = res.to_json()
        obj["hhat_latex"] = res.hhat_latex()
        payload.append(obj)
    cache.put(key, payload)
    return payload


def _print_table(payload: list[dict], fmt: str) -> None:
    if not payload:
        return
    first = payload[0]
    order = f"pn = {first['pn']}" if "pn" in first else f"pn_relative = {first['pn_relative']}"
    if fmt == "latex":
        print(r"% Hhat_lm, " + first["normalisation"]["words"] + f"; {order}; phase {first['phase']}")
        print(r"\begin{tabular}{rrl}")
        print(r"$\ell$ & $m$ & $\hat H_{\ell m}$ \\ \hline")
        for obj in payload:
            body = (r"\text{refused: " + obj["refused"] + "}") if obj["hhat"] is None else obj["hhat_latex"]
            print(f"{obj['l']} & {obj['m']} & ${body}$ \\\\")
        print(r"\end{tabular}")
        return
    print(f"# {first['normalisation']['words']}")
    print(f"# orbit {first['orbit']}, {order}, phase {first['phase']}, sign convention {first['sign_convention']}")
    for obj in payload:
        label = f"({obj['l']},{obj['m']})".ljust(8) + obj["kind"].ljust(8)
        body = f"refused: {obj['refused']}" if obj["hhat"] is None else obj["hhat"]
        print(f"{label}{body}")


def _emit(payload, args, single: bool) -> int:
    if args.json:
        document = payload[0] if single else {"modes": payload}
        sys.stdout.write(json.dumps(document, indent=1) + "\n")
    else:
        _print_table(payload, args.format)
    return 0


@register("mode", "derive one mode amplitude Hhat_lm (e.g. 'mode 2 2 --pn 1', 'mode 2 -2 --pn-relative 0')")
class ModeCommand:
    @staticmethod
    def configure(parser: argparse.ArgumentParser) -> None:
        parser.add_argument("l", type=int, help="multipole order l >= 2")
        parser.add_argument("m", type=int, help="azimuthal number, -l <= m <= l")
        _add_common(parser)

    @staticmethod
    def run(args) -> int:
        if args.l < 2:
            raise UsageError(f"l must be >= 2, got {args.l}")
        if abs(args.m) > args.l:
            raise UsageError(f"|m| must not exceed l, got l = {args.l}, m = {args.m}")
        payload = mode_payloads([(args.l, args.m)], None, args.orbit, _order_request(args),
                                args.sign_convention, args.phase, not args.no_cache)
        return _emit(payload, args, single=True)


@register("modes", "derive every mode 2 <= l <= lmax, -l <= m <= l (refused modes say why)")
class ModesCommand:
    @staticmethod
    def configure(parser: argparse.ArgumentParser) -> None:
        _add_common(parser)
        parser.add_argument("--lmax", type=int, required=True, help="highest l (>= 2)")

    @staticmethod
    def run(args) -> int:
        if args.lmax < 2:
            raise UsageError(f"--lmax must be >= 2, got {args.lmax}")
        payload = mode_payloads(None, args.lmax, args.orbit, _order_request(args),
                                args.sign_convention, args.phase, not args.no_cache)
        return _emit(payload, args, single=False)
