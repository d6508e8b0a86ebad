"""Derive a mode amplitude and print it in LaTeX, with where it came from.

Run:  python worked/derive_mode_latex.py [OUTDIR] [--mode L M] [--pn-relative Q]
      (defaults: the (3,2) mode at relative order 1; OUTDIR default: worked/_out/)

The (3,2) mode is fed by the current octupole J_ijk at leading order and, at its first
correction, by the 1PN current moment whose non-compact field terms the toolkit integrates.
The script prints Hhat_lm as a LaTeX equation, the normalisation it belongs to, the provenance
trail (which moments, which equation of motion, which tail) and the source moment of rank l
through 1PN; the same text is written to OUTDIR/hhat_L_M.tex. Every line but the equation is a
LaTeX comment, so the file can be pasted into a document as it is.
"""

from __future__ import annotations

import argparse
from pathlib import Path

import sympy as sp

from stfalgebra import StfAlgebraError, current_moment, derive_mode, mass_moment


def latex_comment(text: str) -> list[str]:
    """Every line of ``text`` as a LaTeX comment line."""
    return [f"%   {line}" for line in str(text).splitlines()]


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("outdir", nargs="?", default=str(Path(__file__).parent / "_out"),
                        help="directory for the .tex file (default worked/_out/)")
    parser.add_argument("--mode", nargs=2, type=int, default=(3, 2), metavar=("L", "M"),
                        help="the mode (default 3 2)")
    parser.add_argument("--pn-relative", default="1",
                        help="PN orders kept beyond the mode's leading term (default 1)")
    args = parser.parse_args(argv)
    l, m = args.mode
    try:
        result = derive_mode(l, m, orbit="circular", pn_relative=args.pn_relative)
    except StfAlgebraError as exc:  # an order beyond the inputs, a circular m = 0 mode
        print(f"refused: {exc}")
        return 2
    except (ValueError, TypeError) as exc:
        parser.error(str(exc))

    lines = [f"% {result.normalisation_words}",
             rf"\hat H_{{{l}{m if m >= 0 else f',{m}'}}} = {sp.latex(result.hhat)}",
             "% derived from:"]
    lines += latex_comment("\n".join(result.provenance))
    kind, moment = ("current", current_moment) if (l + m) % 2 else ("mass", mass_moment)
    symbol = "J_L" if kind == "current" else "I_L"
    lines.append(f"% the {kind} source moment {symbol} (l = {l}) through 1PN, as STF products of "
                 f"x, v, ell = x cross v:")
    lines += latex_comment(moment(l, 1))
    text = "\n".join(lines) + "\n"
    print(text, end="")

    outdir = Path(args.outdir)
    outdir.mkdir(parents=True, exist_ok=True)
    target = outdir / f"hhat_{l}_{m}.tex".replace("-", "m")
    target.write_text(text, encoding="utf-8")
    print(f"% written to {target}")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
