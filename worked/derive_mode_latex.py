"""Derive a mode amplitude and print it in LaTeX, with where it came from.

Run:  python worked/derive_mode_latex.py [L M [PN_RELATIVE]]    (default: the (3,2) mode to 1PN)

The (3,2) mode is fed by the current quadrupole J_ij at leading order and, at its first
correction, by the 1PN current moment whose non-compact field terms the toolkit integrates.
"""

from __future__ import annotations

import sys

import sympy as sp

from stfalgebra.moments.current import current_moment
from stfalgebra.radiative.modes import derive_mode


def main(argv: list[str]) -> int:
    l, m = (int(argv[0]), int(argv[1])) if len(argv) >= 2 else (3, 2)
    relative = argv[2] if len(argv) >= 3 else "1"
    result = derive_mode(l, m, orbit="circular", pn_relative=relative)
    print(f"% {result.normalisation_words}")
    print(rf"\hat H_{{{l}{m}}} = {sp.latex(result.hhat)}")
    print("% derived from:")
    for line in result.provenance:
        print(f"%   {line}")
    if (l + m) % 2:
        print(f"% the source moment J_L (l = {l}) through 1PN, as STF products of x, v, ell = x cross v:")
        print(f"%   {current_moment(l, 1)}")
    return 0


if __name__ == "__main__":
    raise SystemExit(main(sys.argv[1:]))
