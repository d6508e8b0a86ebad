"""The 2PN current moments J_L of two point masses derived once and stored, for the modes.

:func:`stfalgebra.moments.current_two_pn_quadratic.current_moment_two_pn` derives J_L from the
general formula (compact terms, bilinear field terms, cubic non-compact terms): seconds per l,
most of it in the finite-part seeds of the cubic terms. Its result, the probe polynomial
P_l (J_L k_L = ell.k P_l, a polynomial in eps = 1/c, G, m, nu, delta, r, 1/r, rdot, phidot and
the probes kx = k.x, kv = k.v; :func:`~stfalgebra.moments.current_two_pn_quadratic.
two_pn_probe_polynomial`), is small (about a hundred terms per l). This module writes it for
l <= lmax to ``data/current_two_pn_probe_polynomials.json`` with the derivation itself (the
command is recorded in the file) and reads it back; l beyond the file are derived. The tests
re-derive part of the file and compare.

A table is written only when no term of J_L is missing
(:data:`stfalgebra.moments.current_two_pn_status.MISSING_TERMS` empty): the generator refuses
otherwise, and the moments are refused before the file is read.

Command::

    python3 -m stfalgebra.moments.current_two_pn_table --lmax 8 \\
        --output stfalgebra/moments/data/current_two_pn_probe_polynomials.json

**Conventions**: those of :mod:`stfalgebra.moments.current_two_pn_quadratic` (harmonic
coordinates, centre-of-mass frame, x = y1 - y2, ell = x cross v; exact rationals as "p/q").
"""

from __future__ import annotations

import argparse
import json
from fractions import Fraction
from functools import lru_cache
from pathlib import Path
from typing import Callable

from ..errors import OrderBeyondInputsError
from . import current_two_pn_status as status

__all__ = ["TABLE_PATH", "GENERATORS", "tabulate", "write_table", "read_table", "stored_probe_polynomial",
           "stored_degrees", "main"]

#: The stored probe polynomials (written by :func:`main`).
TABLE_PATH = Path(__file__).parent / "data" / "current_two_pn_probe_polynomials.json"

#: The generators of the probe polynomials, in the order of the stored exponents (those of
#: :data:`stfalgebra.moments.orbit_polynomials.RING`; a test checks them).
GENERATORS = ("eps", "G", "m", "nu", "delta", "r", "ir", "rdot", "phidot", "kx", "kv")

_FORMAT = 1


def tabulate(lmax: int, derive: Callable[[int], object], *, lmin: int = 1) -> dict:
    """The table of the probe polynomials ``derive(l)`` for lmin <= l <= lmax (ring elements of
    :mod:`stfalgebra.moments.orbit_polynomials`), as a JSON-ready dict.

    Example
    -------
    >>> from stfalgebra.moments.orbit_polynomials import RING
    >>> tabulate(1, lambda l: RING(3))["moments"]["1"]
    [[[0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0], '3']]
    """
    moments = {}
    for l in range(lmin, lmax + 1):
        polynomial = derive(l)
        if tuple(str(symbol) for symbol in polynomial.ring.symbols) != GENERATORS:
            raise ValueError(f"l = {l}: not an element of the orbit ring {GENERATORS}")
        moments[str(l)] = sorted([list(map(int, monomial)), str(Fraction(int(c.numerator), int(c.denominator)))]
                                 for monomial, c in polynomial.terms())
    return {"format": _FORMAT, "generators": list(GENERATORS), "moments": moments}


def write_table(table: dict, path: Path, command: str) -> None:
    """Write a :func:`tabulate` result with the command that made it (the folder is created).

    Example
    -------
    >>> import tempfile
    >>> from stfalgebra.moments.orbit_polynomials import RING
    >>> path = Path(tempfile.mkdtemp()) / "table.json"
    >>> write_table(tabulate(2, lambda l: RING(l)), path, "example")
    >>> read_table(path)
    {1: 1, 2: 2}
    """
    data = {"command": command, **table}
    Path(path).parent.mkdir(parents=True, exist_ok=True)
    Path(path).write_text(json.dumps(data, separators=(",", ":")) + "\n", encoding="utf-8")


def read_table(path: Path) -> dict:
    """{l: ring element of :mod:`stfalgebra.moments.orbit_polynomials`} from a written table
    ({} if the file does not exist; ValueError for a file of another format).

    Example
    -------
    >>> read_table(Path("no/such/table.json"))
    {}
    """
    try:
        data = json.loads(Path(path).read_text(encoding="utf-8"))
    except FileNotFoundError:
        return {}
    if data.get("format") != _FORMAT or tuple(data.get("generators", ())) != GENERATORS:
        raise ValueError(f"{path}: not a table of format {_FORMAT} over {GENERATORS}")
    from . import orbit_polynomials as op

    domain = op.RING.domain
    out = {}
    for l, terms in data["moments"].items():
        out[int(l)] = op.RING({tuple(monomial): domain(Fraction(value).numerator, Fraction(value).denominator)
                               for monomial, value in terms})
    return out


@lru_cache(maxsize=1)
def _stored() -> dict:
    return read_table(TABLE_PATH)


def stored_degrees() -> tuple[int, ...]:
    """The l held by the stored table (empty without it).

    Example
    -------
    >>> all(l >= 1 for l in stored_degrees())
    True
    """
    return tuple(sorted(_stored()))


def stored_probe_polynomial(l: int):
    """The stored probe polynomial of J_L (None if the table does not hold l). Refuses, naming
    them, while terms of J_L are missing (a stored table is then never read).

    Example
    -------
    >>> try:                                # refused while terms are missing, else absent
    ...     value = stored_probe_polynomial(10**6)
    ... except OrderBeyondInputsError:
    ...     value = None
    >>> value is None
    True
    """
    if not status.current_two_pn_complete():
        raise OrderBeyondInputsError("2PN current moments need the cubic non-compact field terms, of which these "
                                     "are not derived yet: " + "; ".join(status.MISSING_TERMS))
    return _stored().get(l)


def main(argv=None) -> int:
    """Derive the probe polynomials of J_L for l <= --lmax and write them (module docstring)."""
    parser = argparse.ArgumentParser(prog="python3 -m stfalgebra.moments.current_two_pn_table",
                                     description="Derive the 2PN current moments J_L once and store them.")
    parser.add_argument("--lmax", type=int, required=True)
    parser.add_argument("--output", type=Path, default=TABLE_PATH)
    arguments = parser.parse_args(argv)
    if not status.current_two_pn_complete():
        parser.exit(2, "refused: the 2PN current moments are not complete; missing: "
                    + "; ".join(status.MISSING_TERMS) + "\n")
    from . import current_two_pn_cubic as cubic
    from .current_two_pn_quadratic import two_pn_probe_polynomial

    table = tabulate(arguments.lmax, lambda l: two_pn_probe_polynomial(l, cubic.cubic_field_term))
    write_table(table, arguments.output, f"python3 -m stfalgebra.moments.current_two_pn_table --lmax {arguments.lmax} "
                                         f"--output {arguments.output}")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
