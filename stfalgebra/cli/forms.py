"""The printed forms of a result, shared by the commands: one JSON object per quantity, one
text line, one LaTeX equation.

Every expression a command prints goes through :mod:`stfalgebra.presentation` (prefactor *
[terms in increasing PN order]); this module only lays the pieces out. The JSON object of a
quantity holds ``"symbol"``, ``"words"``, ``"pn"`` (an exact string), ``"expression"`` (sympy
text), ``"latex"``, the form's ``"prefactor"``, ``"prefactor_latex"``, ``"leading_order"``,
``"variable"`` and ``"terms"`` (``{"order", "coefficient", "coefficient_latex"}``, in increasing
order), and ``"provenance"``.
"""

from __future__ import annotations

from typing import Any, Iterable, Sequence

__all__ = ["quantity_json", "series_form_json", "text_lines", "latex_lines", "check_quantity_json"]


def quantity_json(presented: Any, *, symbol: str, latex_symbol: str, words: str, pn: str,
                  provenance: Iterable[str] = ()) -> dict:
    """The JSON object of one presented quantity (module docstring)."""
    out = {"symbol": symbol, "latex_symbol": latex_symbol, "words": words, "pn": pn,
           "expression": presented.to_text(), "latex": presented.to_latex()}
    out.update(presented.to_json())
    out["provenance"] = list(provenance)
    return out


def series_form_json(terms: Sequence[tuple[str, str, str]], *, prefactor: str, prefactor_latex: str,
                     variable: str = "x") -> dict:
    """The form fields for a series whose coefficients sympy prints (the eccentric averages):
    ``terms`` as (order, text, LaTeX) in increasing order, the prefactor given."""
    return {"prefactor": prefactor, "prefactor_latex": prefactor_latex, "variable": variable,
            "leading_order": terms[0][0] if terms else None,
            "terms": [{"order": order, "coefficient": text, "coefficient_latex": latex}
                      for order, text, latex in terms]}


def text_lines(header: Sequence[str], quantities: Iterable[dict]) -> str:
    """``# header`` lines, then ``symbol = expression`` per quantity with its notes."""
    lines = [f"# {line}" for line in header]
    for quantity in quantities:
        lines.append(f"# {quantity['symbol']}: {quantity['words']} (through relative order {quantity['pn']})")
        lines.append(f"{quantity['symbol']} = {quantity['expression']}")
    return "\n".join(lines) + "\n"


def latex_lines(header: Sequence[str], quantities: Iterable[dict]) -> str:
    """``% header`` comments, then one ``equation`` environment per quantity."""
    lines = [f"% {line}" for line in header]
    for quantity in quantities:
        lines.append(f"% {quantity['symbol']}: {quantity['words']} (through relative order {quantity['pn']})")
        lines += [r"\begin{equation}", f"{quantity['latex_symbol']} = {quantity['latex']}", r"\end{equation}"]
    return "\n".join(lines) + "\n"


_QUANTITY_KEYS = {"symbol", "latex_symbol", "words", "pn", "expression", "latex", "prefactor", "prefactor_latex",
                  "variable", "leading_order", "terms", "provenance"}


def check_quantity_json(value: object, names: frozenset[str]) -> None:
    """Raise ValueError unless ``value`` is a quantity object with expressions in ``names``
    (a cache entry is data from disk)."""
    from .cache import looks_like_expression

    if not isinstance(value, dict) or not _QUANTITY_KEYS <= set(value):
        raise ValueError("a quantity lacks keys")
    if not looks_like_expression(value["expression"], names) or not isinstance(value["terms"], list):
        raise ValueError("a quantity is not an expression")
    for term in value["terms"]:
        if not isinstance(term, dict) or not looks_like_expression(term.get("coefficient"), names):
            raise ValueError("a term is not an expression")


def _power_text(order: Any) -> str:
    from fractions import Fraction

    order = Fraction(order)
    if order == 1:
        return "x"
    if order == Fraction(1, 2):
        return "sqrt(x)"
    return f"x**{order.numerator}" if order.denominator == 1 else f"x**({order})"


def _power_latex(order: Any) -> str:
    from fractions import Fraction

    order = Fraction(order)
    if order == 1:
        return "x"
    return f"x^{{{order.numerator}}}" if order.denominator == 1 else f"x^{{{order.numerator}/{order.denominator}}}"


def sympy_series_form(series: Any, *, prefactor: str, prefactor_latex: str) -> dict:
    """The form of a PN series in x whose coefficients are sympy expressions (the eccentric
    averages, rational in e_t): ``prefactor * [c_0 + c_1 x + ...]``, each coefficient printed by
    sympy (LaTeX with ``\\ln``), with the whole expression as ``"expression"`` and ``"latex"``."""
    import sympy as sp

    from .. import symbols as S

    rows = []
    text_parts, latex_parts = [], []
    for order, value in series.terms.items():
        value = sp.sympify(value)
        text, latex = sp.sstr(value), sp.latex(value, ln_notation=True, symbol_names={S.et: "e_t"})
        rows.append((str(order), text, latex))
        compound = isinstance(value, sp.Add)
        if order == 0:
            text_parts.append(text)
            latex_parts.append(latex)
        else:
            text_parts.append(f"{_power_text(order)}*({text})" if compound else f"{text}*{_power_text(order)}")
            latex_parts.append(rf"{_power_latex(order)} \left({latex}\right)" if compound
                               else f"{latex} {_power_latex(order)}")
    body = " + ".join(text_parts).replace("+ -", "- ") or "0"
    body_latex = " + ".join(latex_parts).replace("+ -", "- ") or "0"
    form = series_form_json(rows, prefactor=prefactor, prefactor_latex=prefactor_latex)
    form["expression"] = body if prefactor == "1" else f"{prefactor}*({body})"
    form["latex"] = body_latex if prefactor == "1" else rf"{prefactor_latex} \left[{body_latex}\right]"
    return form
