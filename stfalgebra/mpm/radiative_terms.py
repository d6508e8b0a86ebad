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

_FREE = "ijklmnpqrstuvw"
_DUMMY = "abcdefgh"


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
    >>> term.to_json()["coefficient"], term.to_json()["order"], term.to_json()["factors"]
    ('-21/5', '3/2', [['M', 2, 0], ['M', 2, 5]])
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

    @property
    def rank(self) -> int:
        """The rank l of the radiative moment the term belongs to: p + q - 2 k - epsilon."""
        if self.kind in ("linear",):
            return self.factors[0][1]
        if self.kind == "tail":
            return self.factors[1][1]
        (_, p, _), (_, q, _) = self.factors
        return p + q - 2 * self.contractions - self.epsilon

    def _indices(self) -> tuple[list[str], list[str], list[str]] | None:
        """Index names of the free set and of each factor (None when l exceeds the letters)."""
        l = self.rank
        if l > len(_FREE):
            return None
        free = list(_FREE[:l])
        if self.kind in ("linear", "tail"):
            return free, free, free
        (_, p, _), (_, q, _) = self.factors
        k = self.contractions
        dummies = list(_DUMMY[2:2 + k])
        if self.epsilon:
            rest = free[1:]
            first = ["a"] + dummies + rest[:p - 1 - k]
            second = ["b"] + dummies + rest[p - 1 - k:]
        else:
            first = dummies + free[:p - k]
            second = dummies + free[p - k:]
        return free, first, second

    def to_text(self) -> str:
        """The term as one line of plain text, e.g. ``-21/5 G/c^3 STF[M_ij M^(5)_kl]``.

        Indices: i, j, k, ... free (the STF part is taken over them), a, b on the Levi-Civita
        symbol, c, d, ... summed between the factors; ``F^(d)`` is the d-th time derivative.

        Example
        -------
        >>> RadiativeTerm("instantaneous", Fraction(3, 2), Fraction(-21, 5),
        ...               (("M", 2, 0), ("M", 2, 5)), 0, 0).to_text()
        '-21/5 G/c^3 STF[M_ij M^(5)_kl]'
        """
        names = self._indices()

        def factor(spec, idx):
            kind, rank, times = spec
            derivative = f"^({times})" if times else ""
            index = "".join(idx) if names is not None else f"<{rank}>"
            return f"{kind}{derivative}_{index}" if rank else f"{kind}{derivative}"

        scale = _scale_text(len(self.factors), self.order)
        if self.kind == "linear":
            return factor(self.factors[0], names[0] if names else None)
        if self.kind == "tail":
            (_, _, _), second = self.factors
            inner = factor(second, names[0] if names else None)
            return (f"{_text(self.coefficient)} (G M/c^3) int_0^oo dtau {inner}(u - tau) "
                    f"[ln(c tau/(2 b)) + {_text(self.constant)}]")
        first = factor(self.factors[0], names[1] if names else None)
        second = factor(self.factors[1], names[2] if names else None)
        body = f"eps_iab {first} {second}" if self.epsilon else f"{first} {second}"
        product = f"STF[{body}]"
        if self.kind == "memory":
            product = f"int_-oo^u dv {product}(v)"
        return f"{_text(self.coefficient)} {scale} {product}"

    def to_latex(self) -> str:
        r"""The term in LaTeX (the same index convention as :meth:`to_text`).

        Example
        -------
        >>> RadiativeTerm("instantaneous", Fraction(3, 2), Fraction(-21, 5),
        ...               (("M", 2, 0), ("M", 2, 5)), 0, 0).to_latex()
        '-\\frac{21}{5}\\frac{G}{c^{3}}\\,\\mathrm{STF}\\left[M_{ij} M^{(5)}_{kl}\\right]'
        """
        names = self._indices()

        def factor(spec, idx):
            kind, rank, times = spec
            derivative = f"^{{({times})}}" if times else ""
            index = "".join(idx) if names is not None else rf"\langle {rank} \rangle"
            return f"{kind}{derivative}_{{{index}}}" if rank else f"{kind}{derivative}"

        coefficient = _latex_number(self.coefficient)
        if self.kind == "linear":
            return factor(self.factors[0], names[0] if names else None)
        if self.kind == "tail":
            inner = factor(self.factors[1], names[0] if names else None)
            return (rf"{coefficient}\frac{{G M}}{{c^{{3}}}}\int_0^\infty d\tau\, {inner}(u-\tau)"
                    rf"\left[\ln\frac{{c\tau}}{{2b}} + {_latex_number(self.constant)}\right]")
        first = factor(self.factors[0], names[1] if names else None)
        second = factor(self.factors[1], names[2] if names else None)
        body = rf"\varepsilon_{{iab}} {first} {second}" if self.epsilon else f"{first} {second}"
        product = rf"\mathrm{{STF}}\left[{body}\right]"
        if self.kind == "memory":
            product = rf"\int_{{-\infty}}^{{u}} dv\, {product}(v)"
        return rf"{coefficient}{_scale_latex(len(self.factors), self.order)}\,{product}"


def _scale_text(factors: int, order: Fraction) -> str:
    power = 2 * Fraction(order)
    g = "G" if factors == 2 else f"G^{factors - 1}"
    return f"{g}/c^{_text(power)}"


def _scale_latex(factors: int, order: Fraction) -> str:
    power = 2 * Fraction(order)
    g = "G" if factors == 2 else f"G^{{{factors - 1}}}"
    return rf"\frac{{{g}}}{{c^{{{_text(power)}}}}}"


def _latex_number(value: Fraction) -> str:
    value = Fraction(value)
    sign = "-" if value < 0 else ""
    value = abs(value)
    if value.denominator == 1:
        return f"{sign}{value.numerator}"
    return rf"{sign}\frac{{{value.numerator}}}{{{value.denominator}}}"
