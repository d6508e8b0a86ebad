"""Hold a hand calculation against the toolkit's derivation and find its wrong coefficient.

Run:  python worked/check_hand_result.py [OUTDIR]        (OUTDIR default: worked/_out/)

The published circular-orbit amplitude Hhat_32 through 1PN beyond its leading term (every term
through x^2) is typed in as text, exactly as one would copy it from the paper. An invented
colleague's "hand result" has one coefficient wrong: 37/18 instead of 73/18 in the nu^2 term, a
transposition of digits. The checker (``stfalgebra.checking.compare_with_derived``) expands both
as PN series, compares them order by order and power of nu by power of nu, and names the term
that differs; the corrected expression then agrees. Both reports are also written as JSON into
OUTDIR.

Exit code 0 when the planted error is found where it was planted and the published expression
agrees; 1 otherwise.
"""

from __future__ import annotations

import argparse
import json
from pathlib import Path

import sympy as sp

from stfalgebra.checking import compare_with_derived
from stfalgebra.radiative.modes import leading_order

L, M = 3, 2
PN = 2  # absolute order: every term through x^2, i.e. 1PN beyond the leading x^1 of (3,2)

# Blanchet, Living Rev. Relativ. 17, 2 (2014), the list of circular-orbit mode amplitudes
# Hhat_lm: Hhat_32 through 1PN relative, quoted from memory. Same conventions as the
# toolkit: h_lm = (2 G m nu x/(R c^2)) sqrt(16 pi/5) Hhat_lm exp(-i m psi).
PUBLISHED = "sqrt(5/7)/3 * (x*(1 - 3*nu) - x^2*(193/90 - 145*nu/18 + 73*nu^2/18))"

# The invented colleague's hand result: 73/18 -> 37/18 in the nu^2 term of the x^2 coefficient.
HAND_RESULT = "sqrt(5/7)/3 * (x*(1 - 3*nu) - x^2*(193/90 - 145*nu/18 + 37*nu^2/18))"


def order_words(order: sp.Rational) -> str:
    """'x^2 (1PN beyond the leading x^1)' for the (3,2) mode."""
    leading = leading_order(L, M)
    return f"x^{order} ({order - leading}PN beyond the leading x^{leading} of this mode)"


def diagnosis(report) -> list[str]:
    """One line per differing (PN order, power of nu)."""
    lines = []
    for order in report.orders:
        for term in order.terms:
            if term.status == "differ":
                power = "a part that is not a power of nu" if term.nu_power is None else f"nu^{term.nu_power}"
                lines.append(f"differs at PN order {order.order}, i.e. {order_words(order.order)}, "
                             f"in the {power} term: yours {sp.sstr(term.yours)}, derived "
                             f"{sp.sstr(term.derived)}, yours - derived = {sp.sstr(term.difference)}")
    return lines


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("outdir", nargs="?", default=str(Path(__file__).parent / "_out"),
                        help="directory for the JSON reports (default worked/_out/)")
    args = parser.parse_args(argv)
    outdir = Path(args.outdir)
    outdir.mkdir(parents=True, exist_ok=True)

    print(f"Hand result for Hhat_{L}{M} (an invented colleague's, through x^{PN}):")
    print(f"  {HAND_RESULT}")
    wrong = compare_with_derived(HAND_RESULT, L, M, pn=PN)
    print(wrong.to_text())
    found = diagnosis(wrong)
    print("Diagnosis:")
    for line in found or ["no differing term (unexpected: the planted error was not found)"]:
        print(f"  {line}")

    print()
    print(f"Published Hhat_{L}{M} (Blanchet, Living Rev. Relativ. 17, 2 (2014), circular-orbit modes):")
    print(f"  {PUBLISHED}")
    right = compare_with_derived(PUBLISHED, L, M, pn=PN)
    print(right.to_text())

    reports = {"hand_result": wrong.to_json(), "published": right.to_json()}
    target = outdir / "check_hand_result.json"
    target.write_text(json.dumps(reports, indent=2, sort_keys=True) + "\n", encoding="utf-8")
    print(f"reports written to {target}")

    planted_found = (not wrong.agree and len(found) == 1
                     and any(t.status == "differ" and t.nu_power == 2
                             for o in wrong.orders if o.order == 2 for t in o.terms))
    return 0 if planted_found and right.agree else 1


if __name__ == "__main__":
    raise SystemExit(main())
