"""The radiative moments in terms of canonical moments, as the MPM iteration derives them.

The non-linear terms of U_L and V_L (tails, quadratic instantaneous and memory terms) are
derived by :mod:`stfalgebra.mpm` (the vacuum iteration of the Einstein equations outside the
source). The iteration takes seconds to minutes per moment at high rank, so its results for
``l <= 8`` through relative 5/2 are tabulated once, by the iteration itself
(:mod:`stfalgebra.mpm.tabulation`; the command is recorded in the file), in
``data/radiative_moment_terms.json``; requests beyond the file run the iteration. The tests
re-derive part of the file and compare term by term.

A term is ``coefficient x G^(n-1) c^(-2 order) x (product)``; factors are ``(type, rank,
derivatives)`` with type "M" (mass-type canonical moment M_L) or "S" (current-type S_L); kinds
"linear", "tail", "instantaneous" (the STF product at time u), "memory" (integrated over the
past). At the orders the toolkit uses the canonical moments equal the source moments
(M_L = I_L, S_L = J_L up to terms of relative order 5/2).
"""

from __future__ import annotations

import json
from fractions import Fraction
from functools import lru_cache
from pathlib import Path

from ..mpm.radiative_terms import RadiativeTerm

__all__ = ["radiative_terms", "derived_tail_constant", "TABLE_PATH", "tabulated_through"]

#: The tabulated terms (written by :mod:`stfalgebra.mpm.tabulation`).
TABLE_PATH = Path(__file__).parent / "data" / "radiative_moment_terms.json"


@lru_cache(maxsize=1)
def _table() -> dict:
    try:
        return json.loads(TABLE_PATH.read_text(encoding="utf-8"))
    except FileNotFoundError:
        return {"moments": {}}


def tabulated_through(moment: str, l: int) -> Fraction | None:
    """The relative order through which the file holds U_L (``moment="U"``) or V_L; None if absent.

    Example
    -------
    >>> tabulated_through("U", 2) >= Fraction(3, 2)
    True
    """
    held = _table()["moments"].get(f"{moment}{l}")
    return None if held is None else Fraction(held["pn_relative"])


def _term(data: dict) -> RadiativeTerm:
    return RadiativeTerm(
        data["kind"], Fraction(data["order"]), Fraction(data["coefficient"]),
        tuple((kind, int(rank), int(times)) for kind, rank, times in data["factors"]),
        int(data["contractions"]), int(data["epsilon"]),
        Fraction(data["constant"]) if "constant" in data else None)


@lru_cache(maxsize=None)
def radiative_terms(moment: str, l: int, pn_relative: Fraction) -> tuple[RadiativeTerm, ...]:
    """The terms of U_L (``moment="U"``) or V_L (``"V"``) through ``pn_relative``.

    Read from the tabulated file when it holds them, derived by the iteration otherwise.

    Example
    -------
    >>> [term.kind for term in radiative_terms("U", 2, Fraction(3, 2))]
    ['linear', 'tail']

    References
    ----------
    :func:`stfalgebra.mpm.interactions.radiative_moment_terms` (the derivation).
    """
    pn_relative = Fraction(pn_relative)
    held = tabulated_through(moment, l)
    if held is not None and pn_relative <= held:
        terms = _table()["moments"][f"{moment}{l}"]["terms"]
        return tuple(term for term in map(_term, terms) if term.order <= pn_relative)
    from ..mpm.interactions import radiative_moment_terms

    return tuple(radiative_moment_terms(moment, l, pn_relative))


def derived_tail_constant(l: int, kind: str) -> Fraction:
    """kappa_l (``kind="mass"``) or pi_l (``"current"``) as the iteration gives it.

    The constant of the tail term ``2 (G M/c^3) int M^(l+2)_L(u - tau) [ln(c tau/(2 b)) +
    kappa_l] dtau`` of U_L (pi_l for V_L): read from the file (tabulated by the iteration for
    l <= 30), derived from the tail pair alone otherwise.

    Example
    -------
    >>> derived_tail_constant(2, "mass"), derived_tail_constant(2, "current")
    (Fraction(11, 12), Fraction(7, 6))
    """
    if kind not in ("mass", "current"):
        raise ValueError(f"kind must be 'mass' or 'current', got {kind!r}")
    held = _table().get("tail_constants", {}).get(kind, {}).get(str(l))
    if held is not None:
        return Fraction(held)
    from ..mpm.interactions import tail_constant_from_iteration

    return tail_constant_from_iteration(l, "M" if kind == "mass" else "S")
