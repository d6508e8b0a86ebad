"""How a PN result is written: a prefactor times a bracket of terms in increasing PN order.

Every result the toolkit prints (a mode amplitude, a flux, a source moment, the conserved
energy, the phase of a circular inspiral) is a constant times a PN series with exact engine
coefficients. :func:`present_series` writes it the way a theorist writes it on paper::

    Hhat_33 = -(3/56) sqrt(210) i delta x^(1/2) [1 + x (-4 + 2 nu) + x^(3/2) (3 pi - 21/5 i + 6 i ln(3/2))]

- the **prefactor** is the constant (its square root kept as a square root), times the
  monomial content common to every coefficient (``i``, ``delta``, powers of ``nu``, ``G``,
  ``m`` ...; never a logarithm, Euler's constant or zeta(3)), times the rational content and
  sign of the leading coefficient, times the leading power of the expansion variable and any
  dimensional factors the caller gives (``c^2``, ``1/G``);
- the **bracket** holds the terms in increasing PN order, the first one 1 whenever the leading
  coefficient is a monomial; each coefficient is collected in ``nu`` (and the spin variables
  ``chi1``, ``chi2``), with its imaginary part gathered behind one ``i`` when it has several
  terms;
- **logarithms** with the same cofactor are combined into one logarithm of a rational (and of
  ``x``, ``x0``, ``b``): ``10 ln 3 - 10 ln 2`` is written ``10 ln(3/2)``,
  ``6 i ln x - 6 i ln x0`` is ``6 i ln(x/x0)``, ``ln x + 4 ln 2`` is ``ln(16 x)``, as long as the
  argument stays legible (integers up to 10^6, powers of x up to 4: ``ln 2 + 16 ln 5`` stays
  as it is); the phase reference x0 keeps its own logarithm ``ln(x/x0)`` beside the others
  (``-2 ln 2 + 3 ln(x/x0)``); pi, Euler's constant and zeta(3) stay symbolic.

The same object gives sympy-parseable text (which sympy reads back as the same expression),
LaTeX (``\\ln``, ``\\pi``, ``\\gamma_E``, ``\\nu``, ``\\delta``) and the JSON fields
``"prefactor"`` and ``"terms"``. It is made without sympy, so that a command printing a cached
or engine-derived result never imports it.
"""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction
from math import gcd
from typing import Any, Mapping, Sequence

from .exact import GENERATORS, ExactPolynomial, SurdConstant
from .orders import PNOrder
from .pnseries import PNSeries

__all__ = ["PresentedSeries", "PresentedTerm", "present_series", "VARIABLES", "order_text"]

#: The expansion variables a series can be written in: ``x`` (order n multiplies x^n) or
#: ``1/c`` (order n multiplies c^(-2n)).
VARIABLES = ("x", "1/c")

_LOGS = tuple(name for name in GENERATORS if name.startswith("log"))
# never pulled out of a sum into the prefactor: these occur as separate terms of a coefficient
_NOT_CONTENT = frozenset(_LOGS) | {"EulerGamma", "zeta3"}
_COLLECTED = ("nu", "chi1", "chi2")
_SYMBOLIC_LOGS = ("log_x", "log_x0", "log_b")          # ln x, ln x0, ln b: arguments x, x0, b

# the order factors are written in (prefactor and terms alike); names outside the engine (c)
# and the expansion variable come last
_SPIN_COMPONENTS = tuple(f"chi{a}_{k}" for a in (1, 2) for k in ("n", "lambda", "ell"))
_FACTOR_ORDER = ("sqrt", "I", "delta", "G", "m", "M", "nu", "chi1", "chi2") + _SPIN_COMPONENTS + (
    "r", "rinv", "rdot", "phidot", "omega", "et", "pi", "EulerGamma", "zeta3") + _LOGS + ("collected", "c", "x")
_RANK = {name: k for k, name in enumerate(_FACTOR_ORDER)}
_TEXT = {"I": "I", "zeta3": "zeta(3)", "rinv": "r"}
_LATEX = {"I": "i", "nu": r"\nu", "delta": r"\delta", "chi1": r"\chi_1", "chi2": r"\chi_2", "rdot": r"\dot{r}",
          "phidot": r"\dot{\phi}", "omega": r"\omega", "et": "e_t", "pi": r"\pi", "EulerGamma": r"\gamma_E",
          "zeta3": r"\zeta(3)", "rinv": "r", "x0": "x_0",
          **{f"chi{a}_{k}": rf"\chi_{{{a}{symbol}}}" for a in (1, 2)
             for k, symbol in (("n", "n"), ("lambda", r"\lambda"), ("ell", r"\ell"))}}


def order_text(order: Fraction) -> str:
    """An exact order as the JSON string of the project (``"3/2"``, ``"1"``, ``"-5/2"``).

    Example
    -------
    >>> order_text(Fraction(3, 2)), order_text(Fraction(2))
    ('3/2', '2')
    """
    order = Fraction(order)
    return str(order.numerator) if order.denominator == 1 else f"{order.numerator}/{order.denominator}"


# ----------------------------------------------------------------------------- factors
@dataclass(frozen=True)
class _Factor:
    """One factor ``base^power`` of a product; ``rank`` orders the factors of a product."""

    rank: tuple
    text: str          # sympy spelling of the base
    latex: str         # LaTeX of the base
    power: Fraction
    atomic: bool = True   # False: the base needs parentheses under a power (a logarithm)


def _generator_factor(name: str, power: int) -> _Factor:
    if name.startswith("log") and name not in _SYMBOLIC_LOGS:
        prime = name[3:]
        return _Factor((_RANK[name],), f"log({prime})", rf"\ln {prime}", Fraction(power), atomic=False)
    if name in _SYMBOLIC_LOGS:
        argument = name[4:]
        return _Factor((_RANK[name],), f"log({argument})", rf"\ln {_LATEX.get(argument, argument)}",
                       Fraction(power), atomic=False)
    if name == "rinv":
        return _Factor((_RANK["r"],), "r", "r", Fraction(-power))
    return _Factor((_RANK.get(name, len(_RANK)), name), _TEXT.get(name, name), _LATEX.get(name, name),
                   Fraction(power))


def _named_factor(name: str, power: Fraction) -> _Factor:
    """A factor by name: an engine generator or a dimensional symbol such as ``c``."""
    if name in GENERATORS:
        factor = _generator_factor(name, 1)
        return _Factor(factor.rank, factor.text, factor.latex, Fraction(power) * factor.power, factor.atomic)
    return _Factor((_RANK.get(name, len(_RANK)), name), name, _LATEX.get(name, name), Fraction(power))


def _power_text(factor: _Factor, power: Fraction) -> str:
    base = factor.text
    if power == 1:
        return base
    if power == Fraction(1, 2):
        return f"sqrt({base})"
    exponent = str(power.numerator) if power.denominator == 1 else f"({power.numerator}/{power.denominator})"
    return f"{base}**{exponent}"


def _power_latex(factor: _Factor, power: Fraction) -> str:
    base = factor.latex
    if power == 1:
        return base
    exponent = str(power.numerator) if power.denominator == 1 else f"{power.numerator}/{power.denominator}"
    if not factor.atomic:
        return rf"\left({base}\right)^{{{exponent}}}"
    return f"{base}^{{{exponent}}}"


def _merge(factors: Sequence[_Factor]) -> list[_Factor]:
    """Equal bases multiplied (r and 1/r, nu from the content and from a dimensional factor)."""
    merged: dict[tuple, _Factor] = {}
    for factor in factors:
        key = (factor.text, factor.latex)
        if key in merged:
            old = merged[key]
            merged[key] = _Factor(min(old.rank, factor.rank), old.text, old.latex, old.power + factor.power, old.atomic)
        else:
            merged[key] = factor
    return sorted((f for f in merged.values() if f.power != 0), key=lambda f: f.rank)


@dataclass(frozen=True)
class _Product:
    """``number * prod(factors)``: one term of a sum, or a prefactor."""

    number: Fraction
    factors: tuple[_Factor, ...] = ()
    surd: int = 1        # sqrt(surd), written right after the number

    def times(self, extra: Sequence[_Factor]) -> "_Product":
        return _Product(self.number, tuple(_merge(list(self.factors) + list(extra))), self.surd)

    def is_one(self) -> bool:
        return self.number == 1 and not self.factors and self.surd == 1

    def text(self) -> str:
        sign = "-" if self.number < 0 else ""
        magnitude = abs(self.number)
        numerator = [_power_text(f, f.power) for f in self.factors if f.power > 0]
        denominator = [_power_text(f, -f.power) for f in self.factors if f.power < 0]
        if self.surd != 1:
            numerator.insert(0, f"sqrt({self.surd})")
        if numerator:
            head = "" if magnitude == 1 else (
                f"{magnitude.numerator}*" if magnitude.denominator == 1 else f"{magnitude.numerator}/{magnitude.denominator}*")
            body = head + "*".join(numerator)
            if denominator:
                body += "/" + (denominator[0] if len(denominator) == 1 else "(" + "*".join(denominator) + ")")
            return sign + body
        if denominator:
            parts = ([str(magnitude.denominator)] if magnitude.denominator != 1 else []) + denominator
            under = parts[0] if len(parts) == 1 else "(" + "*".join(parts) + ")"
            return f"{sign}{magnitude.numerator}/{under}"
        return sign + (str(magnitude.numerator) if magnitude.denominator == 1
                       else f"{magnitude.numerator}/{magnitude.denominator}")

    def latex(self) -> str:
        sign = "-" if self.number < 0 else ""
        magnitude = abs(self.number)
        numerator = [_power_latex(f, f.power) for f in self.factors if f.power > 0]
        denominator = [_power_latex(f, -f.power) for f in self.factors if f.power < 0]
        if self.surd != 1:
            numerator.insert(0, rf"\sqrt{{{self.surd}}}")
        if denominator:
            top = " ".join(([str(magnitude.numerator)] if magnitude.numerator != 1 or not numerator else []) + numerator)
            bottom = " ".join(([str(magnitude.denominator)] if magnitude.denominator != 1 else []) + denominator)
            return rf"{sign}\frac{{{top}}}{{{bottom}}}"
        if magnitude.denominator != 1:
            number = rf"\frac{{{magnitude.numerator}}}{{{magnitude.denominator}}}"
        else:
            number = "" if magnitude == 1 and numerator else str(magnitude.numerator)
        return sign + " ".join(part for part in [number] + numerator if part)


@dataclass(frozen=True)
class _Gathered:
    """``factors_before * i * (sum) * factors_after``: the imaginary part of a coefficient
    gathered behind one ``i``."""

    body: tuple[Any, ...]          # parts (_Product) of the sum inside the parentheses
    extra: tuple[_Factor, ...] = ()

    def times(self, extra: Sequence[_Factor]) -> "_Gathered":
        return _Gathered(self.body, tuple(_merge(list(self.extra) + list(extra))))

    def text(self) -> str:
        out = "I*(" + _join_text([part.text() for part in self.body]) + ")"
        numerator = [_power_text(f, f.power) for f in self.extra if f.power > 0]
        denominator = [_power_text(f, -f.power) for f in self.extra if f.power < 0]
        out += "".join("*" + item for item in numerator)
        if denominator:
            out += "/" + (denominator[0] if len(denominator) == 1 else "(" + "*".join(denominator) + ")")
        return out

    def latex(self) -> str:
        inner = rf"i \left({_join_latex([part.latex() for part in self.body])}\right)"
        numerator = [_power_latex(f, f.power) for f in self.extra if f.power > 0]
        denominator = [_power_latex(f, -f.power) for f in self.extra if f.power < 0]
        if denominator:
            inner = rf"\frac{{1}}{{{' '.join(denominator)}}} " + inner
        return " ".join([inner] + numerator)


def _join_text(parts: Sequence[str]) -> str:
    out = ""
    for k, part in enumerate(parts):
        if k == 0:
            out = part
        elif part.startswith("-"):
            out += " - " + part[1:]
        else:
            out += " + " + part
    return out or "0"


def _join_latex(parts: Sequence[str]) -> str:
    out = ""
    for k, part in enumerate(parts):
        if k == 0:
            out = part
        elif part.startswith("-"):
            out += " - " + part[1:].lstrip()
        else:
            out += " + " + part
    return out or "0"


# ----------------------------------------------------------------------------- logarithms
def _rational_gcd(values: Sequence[Fraction]) -> Fraction:
    numerator, denominator = 0, 1
    for value in values:
        numerator = gcd(numerator, value.numerator)
        denominator = denominator * value.denominator // gcd(denominator, value.denominator)
    return Fraction(numerator, denominator)


#: A combined logarithm is written only while its argument stays legible: integers in it up to
#: this size and powers of x, x0, b up to _MAX_SYMBOLIC_POWER; otherwise the logarithms stay apart
#: (ln 2 + 16 ln 5, not ln 305175781250).
_MAX_LOG_INTEGER = 10**6
_MAX_SYMBOLIC_POWER = 4


def _legible(exponents: Mapping[str, int]) -> bool:
    top = bottom = 1
    for name, e in exponents.items():
        if name in _SYMBOLIC_LOGS:
            if abs(e) > _MAX_SYMBOLIC_POWER:
                return False
        elif e > 0:
            top *= int(name[3:]) ** e
        else:
            bottom *= int(name[3:]) ** (-e)
        if top > _MAX_LOG_INTEGER or bottom > _MAX_LOG_INTEGER:
            return False
    return True


def _log_products(rest: Sequence[tuple[str, int]], form: Mapping[str, Fraction]) -> list["_Product"]:
    """The terms ``cofactor * sum a_k ln g_k``: one combined logarithm when legible, else one
    term per logarithm. The phase reference x0 keeps its own logarithm ln(x/x0) (the
    logarithm the phi phase brings), apart from the mode's own logarithms: ``-2 ln 2 + 3
    ln(x/x0)``, not ``ln(x^3/(4 x0^3))``."""
    form = dict(form)
    reference: dict[str, Fraction] = {}
    if "log_x0" in form:
        reference = {"log_x0": form.pop("log_x0")}
        if "log_x" in form:
            reference["log_x"] = -reference["log_x0"]
            form["log_x"] -= reference["log_x"]
            if form["log_x"] == 0:
                del form["log_x"]
    pieces: list[dict[str, Fraction]] = []
    if form:
        g = _rational_gcd(list(form.values()))
        if len(form) > 1 and not _legible({name: int(value / g) for name, value in form.items()}):
            pieces = [{name: value} for name, value in form.items()]
        else:
            pieces = [form]
    if reference:
        pieces.append(reference)
    out = []
    for piece in pieces:
        coefficient, log = _log_factor(piece)
        out.append(_Product(coefficient, tuple(_merge([_generator_factor(k, v) for k, v in rest] + [log]))))
    return out


def _log_factor(form: Mapping[str, Fraction]) -> tuple[Fraction, _Factor]:
    """``sum a_k ln g_k = g ln(prod g_k^(a_k/g))``: the coefficient g and the one logarithm.

    The sign of g makes the first symbolic argument (x, then x0, then b) appear with a positive
    power, or, for a rational argument, makes the argument larger than 1.
    """
    g = _rational_gcd(list(form.values()))
    exponents = {name: int(value / g) for name, value in form.items()}
    symbolic = [name for name in _SYMBOLIC_LOGS if exponents.get(name)]
    if symbolic:
        flip = exponents[symbolic[0]] < 0
    else:
        top = 1
        bottom = 1
        for name, e in exponents.items():
            if e > 0:
                top *= int(name[3:]) ** e
            else:
                bottom *= int(name[3:]) ** (-e)
        flip = top < bottom
    if flip:
        g = -g
        exponents = {name: -e for name, e in exponents.items()}
    top_number, bottom_number = 1, 1
    top_symbols: list[tuple[str, str, int]] = []
    bottom_symbols: list[tuple[str, str, int]] = []
    for name in sorted(exponents, key=lambda n: _RANK[n]):
        e = exponents[name]
        if name in _SYMBOLIC_LOGS:
            symbol = name[4:]
            (top_symbols if e > 0 else bottom_symbols).append((symbol, _LATEX.get(symbol, symbol), abs(e)))
        elif e > 0:
            top_number *= int(name[3:]) ** e
        else:
            bottom_number *= int(name[3:]) ** (-e)

    def side(number: int, symbols: list[tuple[str, str, int]], latex: bool) -> list[str]:
        items = [str(number)] if number != 1 else []
        for text, tex, e in symbols:
            base = tex if latex else text
            items.append(base if e == 1 else (f"{base}^{{{e}}}" if latex else f"{base}**{e}"))
        return items

    top_text, bottom_text = side(top_number, top_symbols, False), side(bottom_number, bottom_symbols, False)
    top_tex, bottom_tex = side(top_number, top_symbols, True), side(bottom_number, bottom_symbols, True)
    numerator = "*".join(top_text) or "1"
    if bottom_text:
        under = bottom_text[0] if len(bottom_text) == 1 else "(" + "*".join(bottom_text) + ")"
        text = f"log({numerator}/{under})"
        latex = rf"\ln\left(\frac{{{' '.join(top_tex) or '1'}}}{{{' '.join(bottom_tex)}}}\right)"
    else:
        text = f"log({numerator})"
        latex = rf"\ln {top_tex[0]}" if len(top_tex) == 1 else rf"\ln\left({' '.join(top_tex)}\right)"
    rank = (_RANK[min(exponents, key=lambda n: _RANK[n])], text)
    return g, _Factor(rank, text, latex, Fraction(1), atomic=False)


def _products(terms: Sequence[tuple[dict[str, int], Fraction]]) -> list[_Product]:
    """Terms as products, logarithms with the same cofactor combined, in display order:
    rationals first, then by degree; terms with a logarithm last."""
    plain: list[_Product] = []
    forms: dict[tuple, dict[str, Fraction]] = {}
    for monomial, coefficient in terms:
        logs = {name: e for name, e in monomial.items() if name in _LOGS}
        if sum(logs.values()) == 1:
            (name,) = logs
            rest = tuple(sorted((k, v) for k, v in monomial.items() if k != name))
            form = forms.setdefault(rest, {})
            form[name] = form.get(name, Fraction(0)) + coefficient
            continue
        plain.append(_Product(coefficient, tuple(_merge([_generator_factor(k, v) for k, v in monomial.items()]))))
    for rest, form in forms.items():
        form = {k: v for k, v in form.items() if v != 0}
        if not form:
            continue
        plain.extend(_log_products(rest, form))

    def key(product: _Product) -> tuple:
        has_log = any(not f.atomic for f in product.factors)
        degree = sum(abs(f.power) for f in product.factors)
        return (has_log, degree, tuple((f.rank, -f.power) for f in product.factors))

    return sorted(plain, key=key)


# ----------------------------------------------------------------------------- coefficients
def _coefficient_parts(value: ExactPolynomial) -> list[Any]:
    """The top-level parts of a coefficient: grouped by powers of nu (and chi1, chi2), each
    group's imaginary part gathered behind one i when it has several terms."""
    groups: dict[tuple[int, ...], list[tuple[dict[str, int], Fraction]]] = {}
    for monomial, coefficient in value.terms():
        key = tuple(monomial.pop(name, 0) for name in _COLLECTED)
        groups.setdefault(key, []).append((monomial, coefficient))
    parts: list[Any] = []
    for key in sorted(groups, key=lambda k: (sum(k), tuple(-e for e in k))):
        # nu^k written after its coefficient: "55/42*nu", "2*log(20)*nu"
        collected = [_Factor((_RANK["collected"], k), factor.text, factor.latex, factor.power)
                     for k, factor in enumerate(_generator_factor(name, e) for name, e in zip(_COLLECTED, key) if e)]
        real = _products([(mono, c) for mono, c in groups[key] if "I" not in mono])
        imaginary = _products([({k: v for k, v in mono.items() if k != "I"}, c)
                               for mono, c in groups[key] if "I" in mono])
        group: list[Any] = list(real)
        if len(imaginary) == 1:
            group.append(imaginary[0].times([_generator_factor("I", 1)]))
        elif imaginary:
            group.append(_Gathered(tuple(imaginary)))
        if not collected:
            parts.extend(group)
        elif len(group) == 1:
            parts.append(group[0].times(collected))
        else:
            parts.append(_Sum(tuple(group), tuple(collected)))
    return parts


@dataclass(frozen=True)
class _Sum:
    """``(sum of parts) * factors``: a coefficient of a power of nu with several terms."""

    body: tuple[Any, ...]
    extra: tuple[_Factor, ...] = ()

    def times(self, extra: Sequence[_Factor]) -> "_Sum":
        return _Sum(self.body, tuple(_merge(list(self.extra) + list(extra))))

    def text(self) -> str:
        return _scaled_text("(" + _join_text([p.text() for p in self.body]) + ")", self.extra)

    def latex(self) -> str:
        return _scaled_latex(r"\left(" + _join_latex([p.latex() for p in self.body]) + r"\right)", self.extra)


def _scaled_text(head: str, extra: Sequence[_Factor]) -> str:
    numerator = [_power_text(f, f.power) for f in extra if f.power > 0]
    denominator = [_power_text(f, -f.power) for f in extra if f.power < 0]
    out = "*".join(numerator + [head]) if numerator else head
    if denominator:
        out += "/" + (denominator[0] if len(denominator) == 1 else "(" + "*".join(denominator) + ")")
    return out


def _scaled_latex(head: str, extra: Sequence[_Factor]) -> str:
    numerator = [_power_latex(f, f.power) for f in extra if f.power > 0]
    denominator = [_power_latex(f, -f.power) for f in extra if f.power < 0]
    out = " ".join(numerator + [head])
    if denominator:
        out = rf"\frac{{1}}{{{' '.join(denominator)}}} " + out
    return out


# ----------------------------------------------------------------------------- the result
@dataclass(frozen=True)
class PresentedTerm:
    """One term of the bracket: ``coefficient * v^order`` (v = x: x^order; v = 1/c: c^(-2 order))."""

    order: PNOrder
    coefficient: ExactPolynomial
    text: str
    latex: str

    def to_json(self) -> dict:
        return {"order": order_text(self.order), "coefficient": self.text, "coefficient_latex": self.latex}


@dataclass(frozen=True)
class PresentedSeries:
    """A PN result written as prefactor * [terms in increasing PN order] (module docstring).

    ``prefactor_text``/``prefactor_latex`` include the leading power of the variable
    (``leading_order``); ``terms`` are the bracket's terms with orders relative to it. The whole
    expression is :meth:`to_text` (sympy-parseable) and :meth:`to_latex`.
    """

    variable: str
    leading_order: PNOrder | None
    prefactor_text: str
    prefactor_latex: str
    terms: tuple[PresentedTerm, ...]
    _bracket_text: str
    _bracket_latex: str

    @property
    def is_zero(self) -> bool:
        return not self.terms

    def to_text(self) -> str:
        """The whole expression as sympy-parseable text (``prefactor*(bracket)``)."""
        if self.is_zero:
            return "0"
        if self._bracket_text == "1":
            return self.prefactor_text
        if self.prefactor_text == "1":
            return self._bracket_text
        if self.prefactor_text == "-1":
            return f"-({self._bracket_text})"
        return f"{self.prefactor_text}*({self._bracket_text})"

    def to_latex(self) -> str:
        r"""The whole expression in LaTeX (``prefactor \left[bracket\right]``)."""
        if self.is_zero:
            return "0"
        if self._bracket_latex == "1":
            return self.prefactor_latex
        if self.prefactor_latex == "1":
            return self._bracket_latex
        prefactor = "-" if self.prefactor_latex == "-1" else self.prefactor_latex + " "
        return rf"{prefactor}\left[{self._bracket_latex}\right]"

    def to_json(self) -> dict:
        """``{"prefactor", "prefactor_latex", "variable", "leading_order", "terms"}``; each term
        ``{"order", "coefficient", "coefficient_latex"}``, orders exact strings relative to the
        prefactor's power of the variable."""
        return {"prefactor": "0" if self.is_zero else self.prefactor_text,
                "prefactor_latex": "0" if self.is_zero else self.prefactor_latex,
                "variable": self.variable,
                "leading_order": None if self.leading_order is None else order_text(self.leading_order),
                "terms": [term.to_json() for term in self.terms]}

    __str__ = to_text

    def _repr_latex_(self) -> str:
        return f"${self.to_latex()}$"


def _variable_factor(variable: str, order: Fraction) -> list[_Factor]:
    if order == 0:
        return []
    if variable == "x":
        return [_Factor((_RANK["x"], "x"), "x", "x", Fraction(order))]
    return [_Factor((_RANK["c"], "c"), "c", "c", -2 * Fraction(order))]


def _monomial_content(coefficients: Sequence[ExactPolynomial]) -> dict[str, int]:
    content: dict[str, int] | None = None
    for value in coefficients:
        for monomial, _ in value.terms():
            if content is None:
                content = {k: v for k, v in monomial.items() if k not in _NOT_CONTENT}
            else:
                content = {k: min(v, monomial.get(k, 0)) for k, v in content.items() if monomial.get(k, 0)}
            if not content:
                return {}
    return content or {}


def _leading_sign(value: ExactPolynomial) -> int:
    """The sign of the term written first (the constant term if there is one)."""
    parts = _coefficient_parts(value)
    first = parts[0]
    while not isinstance(first, _Product):
        first = first.body[0]
    return -1 if first.number < 0 else 1


def present_series(series: PNSeries, *, constant: SurdConstant | None = None, variable: str = "x",
                   factors: Mapping[str, Any] | None = None) -> PresentedSeries:
    """Write ``constant * factors * sum_n c_n v^(2n)`` as prefactor * [terms] (module docstring).

    Parameters
    ----------
    series:
        A PN series with :class:`~stfalgebra.exact.ExactPolynomial` coefficients (order ``n``
        multiplies ``x^n`` or ``c^(-2n)``).
    constant:
        An exact constant in front (a rational times the square root of an integer).
    variable:
        ``"x"`` or ``"1/c"`` (:data:`VARIABLES`).
    factors:
        Dimensional factors in front, name -> integer or rational power, e.g. ``{"c": 2}`` or
        ``{"G": -1, "c": 5}``; an engine generator (``nu``) merges with the content.

    Returns
    -------
    PresentedSeries

    **Conventions**: the prefactor carries the leading power of the variable, so the bracket's
    orders are relative to it; the bracket's first term is 1 when the leading coefficient is a
    monomial; logarithms of rationals are combined as ``g ln(prod p^(a_p/g))`` with g the
    rational gcd of the coefficients.

    Example
    -------
    >>> from stfalgebra.exact import exact
    >>> I, delta, nu, log2, log3, pi = (exact(n) for n in ("I", "delta", "nu", "log2", "log3", "pi"))
    >>> h33 = PNSeries({Fraction(1, 2): -Fraction(3, 56) * I * delta,
    ...                 Fraction(3, 2): I * delta * (Fraction(3, 14) - Fraction(3, 28) * nu),
    ...                 2: delta * (-Fraction(9, 40) - Fraction(9, 28) * log2 + Fraction(9, 28) * log3)
    ...                    - Fraction(9, 56) * I * delta * pi}, known_through=2)
    >>> print(present_series(h33, constant=SurdConstant(1, 210)).to_text())
    -3/56*sqrt(210)*I*delta*sqrt(x)*(1 + x*(-4 + 2*nu) + x**(3/2)*(3*pi + I*(-21/5 + 6*log(3/2))))

    References
    ----------
    Common practice (the form of the published mode amplitudes, e.g. Blanchet, Living Rev.
    Relativ. 17, 2 (2014), sec. 9.5).
    """
    if variable not in VARIABLES:
        raise ValueError(f"variable must be one of {', '.join(VARIABLES)}, got {variable!r}")
    items = [(order, value) for order, value in series.terms.items()]
    for order, value in items:
        if not isinstance(value, ExactPolynomial):
            raise TypeError(f"present_series needs engine coefficients, got {type(value).__name__} at order {order}")
    if not items:
        return PresentedSeries(variable, None, "0", "0", (), "0", "0")
    surd = constant if constant is not None else SurdConstant(1)
    if surd.rational == 0:
        return PresentedSeries(variable, None, "0", "0", (), "0", "0")
    content = _monomial_content([value for _, value in items])
    content.pop("I", None)
    divisor = ExactPolynomial(1)
    for name, power in content.items():
        divisor = divisor * ExactPolynomial(name) ** power
    if content:
        items = [(order, value / divisor) for order, value in items]
    # i is a unit: it leaves the bracket whenever the leading coefficient is imaginary, so that
    # the bracket starts with 1 (1/i = -i)
    if all(monomial.get("I") for monomial, _ in items[0][1].terms()):
        content["I"] = 1
        minus_i = -ExactPolynomial("I")
        items = [(order, value * minus_i) for order, value in items]
    leading_order, leading = items[0]
    scale = _rational_gcd([c for _, c in leading.terms()]) * _leading_sign(leading)
    items = [(order, value / scale) for order, value in items]
    extra = [_named_factor(name, Fraction(power)) for name, power in (factors or {}).items()]
    prefactor = _Product(surd.rational * scale, (), surd.radicand).times(
        [_generator_factor(name, power) for name, power in content.items()] + extra
        + _variable_factor(variable, leading_order))
    terms = []
    text_parts, latex_parts = [], []
    for order, value in items:
        relative = PNOrder(order - leading_order)
        parts = _coefficient_parts(value)
        power = _variable_factor(variable, relative)
        terms.append(PresentedTerm(relative, value, _join_text([p.text() for p in parts]),
                                   _join_latex([p.latex() for p in parts])))
        if not power:
            text_parts += [p.text() for p in parts]
            latex_parts += [p.latex() for p in parts]
        elif len(parts) == 1:
            single = parts[0].times(power)
            text_parts.append(single.text())
            latex_parts.append(single.latex())
        else:
            whole = _Sum(tuple(parts))
            if variable == "x":
                head = _Product(Fraction(1), tuple(power))
                text_parts.append(f"{head.text()}*{whole.text()}")
                latex_parts.append(f"{head.latex()} {whole.latex()}")
            else:
                scaled = whole.times(power)
                text_parts.append(scaled.text())
                latex_parts.append(scaled.latex())
    return PresentedSeries(variable, PNOrder(leading_order), prefactor.text(), prefactor.latex(), tuple(terms),
                           _join_text(text_parts), _join_latex(latex_parts))
