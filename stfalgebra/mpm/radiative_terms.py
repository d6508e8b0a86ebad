"""One term of a radiative moment in the data shape of the command line (issue 15, item 7).

A term is ``coefficient x G^(n-1) c^(-2 order) x (product of n factors)``; a factor is
``[type "M" | "S", rank, number of time derivatives]``; "contractions" counts the index pairs
summed between the two factors; "epsilon" = 1 when one Levi-Civita symbol carries one free
index and is contracted with one index of each factor (first factor first):
``coefficient x STF_l[eps_(i a b) A_(a K P) B_(b K Q)]``. Kinds:

* ``linear``: the factor's l-th derivative itself;
* ``tail``: ``coefficient (G M/c^3) int_0^oo dtau F^(d)(u - tau) [ln(c tau/(2 b)) + constant]``;
* ``instantaneous``: the STF product at time u;
* ``memory``: the STF product integrated over the past, ``int_-oo^u``.
"""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction

__all__ = ["RadiativeTerm"]


def _text(value: Fraction) -> str:
    value = Fraction(value)
    return str(value.numerator) if value.denominator == 1 else f"{value.numerator}/{value.denominator}"


@dataclass(frozen=True)
class RadiativeTerm:
    """One term of U_L or V_L.

    Example
    -------
    >>> term = RadiativeTerm("instantaneous", Fraction(3, 2), Fraction(-21, 5),
    ...                      (("M", 2, 0), ("M", 2, 5)), 0, 0)
    >>> term.to_json()["coefficient"], term.to_json()["order"]
    ('-21/5', '3/2')
    """

    kind: str
    order: Fraction
    coefficient: Fraction
    factors: tuple[tuple[str, int, int], ...]
    contractions: int
    epsilon: int
    constant: Fraction | None = None

    def __post_init__(self) -> None:
        if self.kind not in ("linear", "tail", "instantaneous", "memory"):
            raise ValueError(f"kind must be linear, tail, instantaneous or memory, got {self.kind!r}")
        if (self.kind == "tail") != (self.constant is not None):
            raise ValueError("a tail term carries its constant, and only a tail term does")

    def to_json(self) -> dict:
        """The term as the JSON object of issue 15, item 7."""
        out = {
            "kind": self.kind,
            "order": _text(self.order),
            "coefficient": _text(self.coefficient),
        }
        if self.constant is not None:
            out["constant"] = _text(self.constant)
        out["factors"] = [[kind, rank, times] for kind, rank, times in self.factors]
        out["contractions"] = self.contractions
        out["epsilon"] = self.epsilon
        return out
