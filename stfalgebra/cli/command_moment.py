"""``stfalgebra moment``: the source moments I_L and J_L of the binary.

    stfalgebra moment mass|current L --pn P [--orbit general|circular] [--format text|latex|json]

The mass moment I_L or the current moment J_L of two point masses in the centre-of-mass
frame (harmonic coordinates), 2 <= L <= 30, through relative order P (a multiple of 1/2, up to
the order the derived moments are known through). A moment is a sum of STF structures, each
with its coefficient written in the canonical form (prefactor * [terms in increasing order]):

- general orbits: structures STF(x^a v^b ell^c) of the relative position x, velocity v and
  ell = x cross v, coefficients PN series in 1/c in G, m, nu, delta, r, rdot, phidot;
- circular orbits: structures STF(n^a lambda^b ez^c) of the unit vectors n = x/r,
  lambda = ez cross n and ez (along the orbital angular momentum), coefficients PN series in
  x = (G m omega/c^3)^(2/3) with the units (G, m, c) in the prefactor.

JSON: ``{"moment": "mass"|"current", "symbol": "I_L"|"J_L", "l", "orbit", "pn" (exact string),
"variable", "structures": [{"vectors": {name: power}, "structure", "structure_latex",
"expression", "latex", "prefactor", "prefactor_latex", "leading_order", "terms"}],
"provenance"}``.
"""

from __future__ import annotations

import argparse
import json
import sys
from typing import Any

from . import register
from .options import add_format_option, argparse_type, output_format, parse_bounded_order, parse_l, parse_order_syntax

__all__ = ["moment_payload", "maximum_moment_order", "structure_names"]

_LETTERS = "ijkl"
_GENERAL = (("x", "x"), ("v", "v"), ("ell", r"\ell"))
_CIRCULAR = (("n", "n"), ("lambda", r"\lambda"), ("ez", "e_z"))


def maximum_moment_order() -> Any:
    """The largest relative order the derived source moments are known through (read from the
    moments' own table of orders)."""
    from ..moments.point_particles import MOMENT_PN_ORDERS

    return max(MOMENT_PN_ORDERS.values())


def _moment_order_for(pn: Any) -> int:
    from ..moments.point_particles import MOMENT_PN_ORDERS

    return min(k for k, known in MOMENT_PN_ORDERS.items() if known >= pn)


def structure_names(key: tuple[int, ...], l: int, orbit: str) -> tuple[str, str]:
    """Text and LaTeX of the STF structure with the exponents ``key`` (module docstring).

    Example
    -------
    >>> structure_names((1, 1, 0), 2, "general")
    ('STF(x v)', 'x^{\\\\langle i} v^{j\\\\rangle}')
    """
    vectors = _GENERAL if orbit == "general" else _CIRCULAR
    text = " ".join(name if e == 1 else f"{name}^{e}" for (name, _), e in zip(vectors, key) if e)
    indices = list(_LETTERS[:l]) if l <= len(_LETTERS) else [f"i_{{{k}}}" for k in range(1, l + 1)]
    factors = []
    position = 0
    for (_, tex), e in zip(vectors, key):
        block = indices[position:position + e]
        position += e
        if not block:
            continue
        if len(block) > 3:
            factors.append(f"{tex}^{{{block[0]}}} \\cdots {tex}^{{{block[-1]}}}")
        else:
            factors.extend(f"{tex}^{{{index}}}" for index in block)
    first, last = factors[0], factors[-1]
    factors[0] = first.replace("^{", "^{\\langle ", 1)
    if len(factors) == 1:
        factors[0] = factors[0][:-1] + "\\rangle}"
    else:
        factors[-1] = last[:-1] + "\\rangle}"
    return f"STF({text})", " ".join(factors)


def _symbol_latex(kind: str, l: int) -> str:
    letter = "I" if kind == "mass" else "J"
    return f"{letter}_{{{_LETTERS[:l]}}}" if l <= len(_LETTERS) else f"{letter}_{{L}}"


def _general_forms(tensor) -> list[tuple[tuple[int, ...], Any]]:
    from ..presentation import present_series

    return [(key, present_series(series, variable="1/c")) for key, series in tensor.terms.items()]


def _circular_forms(tensor, eom_order: int) -> list[tuple[tuple[int, ...], Any]]:
    """Each structure on the circular orbit: x = r n, v = r omega lambda, ell = r^2 omega ez,
    then r and omega = phidot in x (harmonic coordinates, G m omega = c^3 x^(3/2))."""
    from ..binary.circular_frequency import circular_reduction
    from ..exact import ExactPolynomial
    from ..presentation import present_series

    r, phidot = ExactPolynomial("r"), ExactPolynomial("phidot")
    out = []
    for key, series in tensor.terms.items():
        if not series.terms:       # a structure that vanishes on the circle (rdot = 0)
            continue
        a, b, c = key
        weight = r ** (a + b + 2 * c) * phidot ** (b + c)
        reduced, (g, m, light) = circular_reduction(series.map_coefficients(lambda v: v * weight), eom_order)
        out.append((key, present_series(reduced, variable="x", factors={"G": g, "m": m, "c": light})))
    return out


def moment_payload(kind: str, l: int, orbit: str, pn: str) -> dict:
    """The JSON document of ``stfalgebra moment`` (module docstring); ``pn`` is the order's text,
    bounded here by the orders the moments are known through."""
    order = parse_bounded_order(pn, "--pn", maximum_moment_order)
    from ..moments.current import current_moment
    from ..moments.mass import mass_moment

    k = _moment_order_for(order)
    tensor = (mass_moment if kind == "mass" else current_moment)(l, k)
    provenance = list(tensor.provenance)
    tensor = tensor.truncate(order)
    if orbit == "general":
        forms, variable = _general_forms(tensor), "1/c"
    else:
        tensor = tensor.on_circular_orbit()
        forms, variable = _circular_forms(tensor, k), "x"
        provenance.append(f"circular orbit: r and omega in x from the {k}PN equations of motion "
                          "(stfalgebra.binary.circular_frequency)")
    structures = []
    for key, form in sorted(forms, key=lambda item: (-item[0][0], item[0])):
        if form.is_zero:
            continue
        text, latex = structure_names(key, l, orbit)
        names = [name for name, _ in (_GENERAL if orbit == "general" else _CIRCULAR)]
        structures.append({"vectors": dict(zip(names, key)), "structure": text, "structure_latex": latex,
                           "expression": form.to_text(), "latex": form.to_latex(), **form.to_json()})
    return {"moment": kind, "symbol": "I_L" if kind == "mass" else "J_L", "symbol_latex": _symbol_latex(kind, l),
            "l": l, "orbit": orbit, "pn": str(order), "variable": variable, "structures": structures,
            "provenance": provenance}


def _header(payload: dict) -> list[str]:
    what = "mass" if payload["moment"] == "mass" else "current"
    vectors = ("x (relative position), v = dx/dt, ell = x cross v; coefficients in r, rdot, phidot, G, m, nu, "
               "delta, c" if payload["orbit"] == "general" else
               "n = x/r, lambda = ez cross n, ez along the orbital angular momentum; x = (G m omega/c^3)^(2/3)")
    return [f"{payload['symbol']}, l = {payload['l']}: {what} source moment of two point masses, centre-of-mass "
            f"frame, harmonic coordinates, {payload['orbit']} orbit, through relative order {payload['pn']}",
            f"{payload['symbol']} = sum over STF structures of STF(vectors) * coefficient; vectors: {vectors}"]


def _text(payload: dict) -> str:
    lines = [f"# {line}" for line in _header(payload)]
    width = max((len(s["structure"]) for s in payload["structures"]), default=0) + 2
    for structure in payload["structures"]:
        lines.append(f"{(structure['structure'] + ':').ljust(width)}{structure['expression']}")
    if not payload["structures"]:
        lines.append("0")
    return "\n".join(lines) + "\n"


def _latex(payload: dict) -> str:
    lines = [f"% {line}" for line in _header(payload)]
    pieces = []
    for structure in payload["structures"]:
        body = structure["latex"]
        if structure["prefactor"] == "1" and len(structure["terms"]) > 1:
            body = rf"\left({body}\right)"
        pieces.append(f"{body} \\, {structure['structure_latex']}")
    rhs = ""
    for k, piece in enumerate(pieces):
        if k == 0:
            rhs = piece
        else:
            sign, rest = ("-", piece[1:].lstrip()) if piece.startswith("-") else ("+", piece)
            rhs += f" \\\\\n  &{sign} {rest}"
    rhs = rhs or "0"
    if len(pieces) > 1:
        lines += [r"\begin{align}", f"{payload['symbol_latex']} &= {rhs}", r"\end{align}"]
    else:
        lines += [r"\begin{equation}", f"{payload['symbol_latex']} = {rhs}", r"\end{equation}"]
    return "\n".join(lines) + "\n"


@register("moment", "source moment I_L (mass) or J_L (current) of the binary, general or circular orbit")
class MomentCommand:
    @staticmethod
    def configure(parser: argparse.ArgumentParser) -> None:
        parser.add_argument("kind", choices=("mass", "current"), help="mass (I_L) or current (J_L)")
        parser.add_argument("l", type=argparse_type(parse_l), help="multipole order, 2 <= l <= 30")
        parser.add_argument("--pn", metavar="P", required=True,
                            help="relative PN order (a multiple of 1/2, up to the order the moments are known through)")
        parser.add_argument("--orbit", choices=("general", "circular"), default="general",
                            help="general (in r, rdot, phidot, 1/c) or circular (in x, with the units in front)")
        add_format_option(parser, json_flag=False)

    @staticmethod
    def run(args: argparse.Namespace) -> int:
        pn = str(parse_order_syntax(args.pn, "--pn"))
        payload = moment_payload(args.kind, args.l, args.orbit, pn)
        fmt = output_format(args)
        if fmt == "json":
            sys.stdout.write(json.dumps(payload, indent=1) + "\n")
        else:
            sys.stdout.write(_latex(payload) if fmt == "latex" else _text(payload))
        return 0

