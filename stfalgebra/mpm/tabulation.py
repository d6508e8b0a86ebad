"""Tabulate the radiative moments the MPM iteration derives, for the pipeline to read.

The iteration (:func:`~stfalgebra.mpm.interactions.radiative_moment_terms`) takes seconds to
minutes per moment at high rank; the mode pipeline and the command line need its results at
once. This module runs the iteration for every U_L and V_L with ``l <= lmax`` through a relative
order and writes the terms (in the JSON shape of :meth:`RadiativeTerm.to_json`) to one file,
with the command that made it; :mod:`stfalgebra.radiative.interaction_table` reads it, and the
tests re-derive part of it and compare. Nothing in the file is typed in: regenerate it with

    python3 -m stfalgebra.mpm.tabulation --lmax 8 --pn-relative 5/2 --tail-lmax 30 \\
        --output stfalgebra/radiative/data/radiative_moment_terms.json

(about 5 CPU minutes; a later run with other --lmin/--lmax extends the file: every moment
records the order it is complete through).
"""

from __future__ import annotations

import argparse
import json
import os
import sys
import tempfile
import time
from fractions import Fraction

from .interactions import radiative_moment_terms, tail_constant_from_iteration

__all__ = ["tabulate", "tabulate_tail_constants", "main"]

FORMAT = "stfalgebra radiative moment terms v1"


def tabulate(lmax: int, pn_relative: Fraction, progress=None, *, lmin: int = 2, into: dict | None = None) -> dict:
    """Every U_L, V_L for lmin <= l <= lmax through ``pn_relative``, as a JSON-ready dict.

    ``into`` is an earlier table to extend: a moment it holds through a higher order is kept.
    Each moment records the order it is complete through, and the command that made it.

    Example
    -------
    >>> table = tabulate(2, Fraction(3, 2))
    >>> sorted(table["moments"]), table["moments"]["U2"]["terms"][1]["kind"]
    (['U2', 'V2'], 'tail')
    """
    table = into if into is not None else {"format": FORMAT, "moments": {}}
    if table.get("format") != FORMAT:
        raise ValueError(f"not a table of radiative moment terms: format {table.get('format')!r}")
    command = f"python3 -m stfalgebra.mpm.tabulation --lmin {lmin} --lmax {lmax} --pn-relative {pn_relative}"
    for l in range(lmin, lmax + 1):
        for moment in ("U", "V"):
            key = f"{moment}{l}"
            held = table["moments"].get(key)
            if held is not None and Fraction(held["pn_relative"]) >= pn_relative:
                continue
            start = time.process_time()
            terms = radiative_moment_terms(moment, l, pn_relative)
            table["moments"][key] = {"pn_relative": str(pn_relative), "command": command,
                                     "terms": [term.to_json() for term in terms]}
            if progress is not None:
                progress(f"{key}: {len(terms)} terms, {time.process_time() - start:.1f} s")
    return table


def tabulate_tail_constants(lmax: int, table: dict, progress=None) -> dict:
    """Add kappa_l and pi_l, 2 <= l <= lmax, from the iteration's tail pair M x M_L (M x S_L) alone.

    Cheaper than the whole moment (no other pair is computed), so the modes of every degree the
    toolkit serves read derived tail constants.

    Example
    -------
    >>> tabulate_tail_constants(3, {"format": FORMAT, "moments": {}})["tail_constants"]["mass"]
    {'2': '11/12', '3': '97/60'}
    """
    constants = table.setdefault("tail_constants", {"mass": {}, "current": {}})
    for l in range(2, lmax + 1):
        for kind, letter in (("mass", "M"), ("current", "S")):
            if str(l) not in constants[kind]:
                start = time.process_time()
                constants[kind][str(l)] = str(tail_constant_from_iteration(l, letter))
                if progress is not None:
                    progress(f"tail constant {kind} {l}: {time.process_time() - start:.1f} s")
    return table


def main(argv=None) -> int:
    parser = argparse.ArgumentParser(description="tabulate the MPM radiative moment terms")
    parser.add_argument("--lmin", type=int, default=2)
    parser.add_argument("--lmax", type=int, required=True)
    parser.add_argument("--pn-relative", required=True)
    parser.add_argument("--tail-lmax", type=int, default=0, help="also the tail constants for l <= this")
    parser.add_argument("--output", required=True, help="the table to write (extended when it exists)")
    args = parser.parse_args(argv)
    existing = None
    if os.path.exists(args.output):
        with open(args.output, encoding="utf-8") as handle:
            existing = json.load(handle)
    table = tabulate(args.lmax, Fraction(args.pn_relative), progress=lambda line: print(line, flush=True),
                     lmin=args.lmin, into=existing)
    if args.tail_lmax:
        tabulate_tail_constants(args.tail_lmax, table, progress=lambda line: print(line, flush=True))
    directory = os.path.dirname(os.path.abspath(args.output))
    with tempfile.NamedTemporaryFile("w", dir=directory, delete=False, suffix=".part") as handle:
        json.dump(table, handle, indent=0, sort_keys=True)
        handle.write("\n")
    os.replace(handle.name, args.output)
    return 0


if __name__ == "__main__":
    sys.exit(main())
