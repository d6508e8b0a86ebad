"""``stfalgebra radiative-moment``: a radiative moment in terms of the canonical moments.

Contract:

    stfalgebra radiative-moment U|V l --pn-relative Q [--json | --latex]

prints U_L (mass type) or V_L (current type) of rank l through relative order Q, as the MPM
iteration derives it (:mod:`stfalgebra.mpm`): the linear term, the tail, the instantaneous
products and the memory integrals of two canonical moments M_L, S_L. With ``--json``:

    {"moment": "U", "l": 4, "pn_relative": "3/2", "terms": [...]}

each term ``{"kind": "linear" | "tail" | "instantaneous" | "memory", "order": "3/2",
"coefficient": "-21/5", "factors": [["M", 2, 0], ["M", 2, 5]], "contractions": 0, "epsilon": 0}``
(a tail term adds ``"constant"``): the term is coefficient x G^(n-1) c^(-2 order) x the STF
part of the product of its n factors [type, rank, time derivatives]; see
:class:`~stfalgebra.mpm.radiative_terms.RadiativeTerm` for contractions, epsilon, the tail and
the memory. A pair allowed by rank, dimension and parity whose coefficient is zero is listed
with coefficient "0".

The moments come from the tabulated iteration (``stfalgebra/radiative/data``: every l <= 8
through relative 5/2); a request beyond the table is refused with the command that extends it
(the iteration takes minutes per moment there). Bad input (moment not U or V,
l outside 2..30, Q malformed or beyond 5/2) is one line on stderr and exit code 2.
"""

from __future__ import annotations

import argparse
import json
import sys
from fractions import Fraction

from . import UsageError, register
from .options import parse_l, parse_order_syntax

__all__ = ["radiative_moment_payload", "ITERATION_ORDER"]

#: The highest relative order the quadratic iteration reaches (cubic terms enter at 3).
ITERATION_ORDER = Fraction(5, 2)


def radiative_moment_payload(moment: str, l: int, pn_relative: Fraction) -> dict:
    """The JSON object of the command (module docstring) from the tabulated iteration.

    Example
    -------
    >>> payload = radiative_moment_payload("U", 2, Fraction(3, 2))
    >>> payload["moment"], payload["l"], payload["pn_relative"], [t["kind"] for t in payload["terms"]]
    ('U', 2, '3/2', ['linear', 'tail'])
    """
    from ..radiative.interaction_table import radiative_terms, tabulated_through

    held = tabulated_through(moment, l)
    if held is None or held < pn_relative:
        have = "nothing" if held is None else f"relative {held}"
        raise UsageError(
            f"{moment}_{l} through relative {pn_relative} is not tabulated (the table holds {have} for it); "
            f"derive it with: python3 -m stfalgebra.mpm.tabulation --lmin {l} --lmax {l} "
            f"--pn-relative {pn_relative} --output stfalgebra/radiative/data/radiative_moment_terms.json "
            f"(minutes per moment)")
    terms = radiative_terms(moment, l, pn_relative)
    return {"moment": moment, "l": l, "pn_relative": _order_text(pn_relative), "terms": [term.to_json() for term in terms]}


@register("radiative-moment", "a radiative moment U_L or V_L in terms of the canonical moments "
                              "(MPM iteration: tails, instantaneous products, memory)")
class RadiativeMomentCommand:
    @staticmethod
    def configure(parser: argparse.ArgumentParser) -> None:
        parser.add_argument("moment", help="U (mass type) or V (current type)")
        parser.add_argument("l", help="rank l, 2 <= l <= 30")
        parser.add_argument("--pn-relative", required=True, metavar="Q",
                            help="relative PN order, a multiple of 1/2 up to 5/2")
        output = parser.add_mutually_exclusive_group()
        output.add_argument("--json", action="store_true", help="machine-readable JSON output")
        output.add_argument("--latex", action="store_true", help="LaTeX, one term per line")

    @staticmethod
    def run(args) -> int:
        moment = args.moment.strip()
        if moment not in ("U", "V"):
            raise UsageError(f"moment must be U or V, got {args.moment!r}")
        l = parse_l(args.l)
        order = parse_order_syntax(args.pn_relative, "--pn-relative")
        pn_relative = Fraction(order.numerator, order.denominator)
        if pn_relative > ITERATION_ORDER:
            raise UsageError(f"--pn-relative must be at most {ITERATION_ORDER} (the quadratic iteration; "
                             f"cubic interactions enter at relative 3), got {args.pn_relative.strip()!r}")
        payload = radiative_moment_payload(moment, l, pn_relative)
        if args.json:
            sys.stdout.write(json.dumps(payload, indent=1) + "\n")
            return 0
        from ..radiative.interaction_table import radiative_terms

        terms = radiative_terms(moment, l, pn_relative)
        canonical = "M" if moment == "U" else "S"
        if args.latex:
            lines = [f"% {moment}_L, l = {l}, through relative {payload['pn_relative']} "
                     f"(canonical moments M_L, S_L; b the constant of the radiative coordinates)"]
            lines += [("  " if i == 0 else "+ ") + term.to_latex() for i, term in enumerate(terms)]
        else:
            lines = [f"# {moment}_L, l = {l}, through relative {payload['pn_relative']}, in the canonical "
                     f"moments ({canonical}_L is the leading one); indices i, j, k, ... free, a, b on eps, "
                     f"c, d, ... summed; F^(n) the n-th derivative in u"]
            lines += [f"[{term.kind}, relative {_order_text(term.order)}] {term.to_text()}" for term in terms]
        sys.stdout.write("\n".join(lines) + "\n")
        return 0


def _order_text(order: Fraction) -> str:
    """A relative order as text, "3/2" or "1"."""
    order = Fraction(order)
    return str(order.numerator) if order.denominator == 1 else f"{order.numerator}/{order.denominator}"
