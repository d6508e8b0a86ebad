"""A safe parser for untrusted expression text (plain syntax and a LaTeX subset).

Nothing here evaluates text as code: the input is tokenised and parsed by hand (recursive
descent with an explicit depth bound) and the sympy expression is built from the pieces. No
``eval``, no ``exec``, no ``sympify`` of strings, no attribute lookup by name.

Accepted
--------
* numbers: ``3``, ``0.25`` (exact: 1/4), ``1e-3`` (exact: 1/1000); a number written with a
  decimal point or an exponent is a *decimal*: :func:`parse_with_decimals` also reports each
  one with the number of significant digits it was given, so that the checker compares it at
  that precision;
* the orbit's symbols: circular ``x``, ``nu``, ``delta`` and ``x0`` (the reference of the phase
  psi, in results given in the orbital phase phi: ``ln(x/x0)``); general ``r``, ``rdot``,
  ``phidot``, ``m``, ``c``, ``nu``, ``delta``: every symbol the toolkit's own outputs use, so
  that any output can be fed back;
* constants ``pi``, ``I`` (also ``i``), ``EulerGamma`` (also ``gamma_E``);
* functions ``sqrt``, ``log`` (also ``ln``), ``exp``, written ``f(...)``;
* ``+ - * /``, powers ``^`` or ``**`` (right-associative, the exponent a rational number of
  modulus at most 64), parentheses and square brackets as grouping (``x[1 + (a + b) x]``), and
  juxtaposition as a product (``2 x nu``, ``3(1 + x)``);
* LaTeX: ``\\frac{a}{b}``, ``\\sqrt{a}``, ``\\sqrt[n]{a}``, ``\\pi``, ``\\nu``, ``\\delta``,
  ``\\ln``, ``\\log``, ``\\exp``, ``\\gamma_E``, ``\\mathrm{i}``, ``\\dot{r}``, ``\\dot{\\phi}``,
  ``\\cdot``, ``\\times``, ``\\left``/``\\right`` (also before ``[`` and ``]``), braces as grouping,
  ``x_0``, ``\\,`` and friends as spaces; the Unicode letters ν, δ, π and the signs −, ·, ×.

Everything else is refused with :class:`~stfalgebra.errors.ExpressionRefusedError` naming what
was refused and where: other names and functions, strings, attribute access, subscripts
(other than ``\\gamma_E`` and ``x_0``), commas, more than 20000 characters, nesting deeper than 100, exponents beyond the bound,
numbers that would grow beyond 4096 bits, undefined results (division by zero).
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from fractions import Fraction

import sympy as sp

from .. import symbols as S
from ..errors import ExpressionRefusedError

__all__ = [
    "MAX_LENGTH",
    "MAX_DEPTH",
    "MAX_EXPONENT",
    "MAX_NUMBER_BITS",
    "ORBIT_SYMBOLS",
    "parse_expression",
    "parse_with_decimals",
    "DecimalLiteral",
    "ParsedExpression",
    "allowed_symbols",
]

MAX_LENGTH = 20000
"""Longest accepted input, in characters."""
MAX_DEPTH = 100
"""Deepest accepted nesting of groups, signs, powers and function calls."""
MAX_EXPONENT = 64
"""Largest accepted modulus of an exponent (and of an exponent's denominator)."""
MAX_NUMBER_BITS = 4096
"""Largest accepted size of an exact number built by powers, in bits."""
_MAX_LITERAL_DIGITS = 400
_MAX_DECIMAL_EXPONENT = 400
_MAX_NAME = 64
_MAX_EXP_NESTING = 3

ORBIT_SYMBOLS: dict[str, dict[str, sp.Symbol]] = {
    "circular": {"x": S.x, "nu": S.nu, "delta": S.delta, "x0": S.x0},
    "general": {"r": S.r, "rdot": S.rdot, "phidot": S.phidot, "m": S.m, "c": S.c, "nu": S.nu, "delta": S.delta},
}
"""The symbols an expression may use, per orbit type (the project's own symbols)."""

#: With aligned spins (``spins="aligned"``), also the dimensionless spin components (the
#: engine's real symbols).
SPIN_SYMBOLS: dict[str, sp.Symbol] = {name: sp.Symbol(name, real=True) for name in ("chi1", "chi2")}

_CONSTANTS = {"pi": sp.pi, "I": sp.I, "i": sp.I, "EulerGamma": sp.EulerGamma, "gamma_E": sp.EulerGamma}
_FUNCTIONS = {"sqrt": sp.sqrt, "log": sp.log, "ln": sp.log, "exp": sp.exp}
_UNICODE = {"ν": "nu", "δ": "delta", "π": "pi", "−": "-", "·": "*", "×": "*"}
_LATEX_SPACES = {",", ";", ":", "!", " "}
_LATEX_SYMBOLS = {"nu": "nu", "delta": "delta", "pi": "pi"}
_LATEX_FUNCTIONS = {"ln": "log", "log": "log", "exp": "exp"}
_LATEX_IGNORED = {"left", "right", "big", "Big", "bigg", "Bigg", "displaystyle"}
_LATEX_TIMES = {"cdot", "times"}
_LATEX_FRACTIONS = {"frac", "dfrac", "tfrac"}

_NUMBER = re.compile(r"([0-9]+\.?[0-9]*|\.[0-9]+)([eE][+-]?[0-9]+)?")
_NAME = re.compile(r"[A-Za-z_][A-Za-z0-9_]*")
_COMMAND = re.compile(r"\\([A-Za-z]+)")
_GROUP_CLOSE = {"(": ")", "{": "}", "[": "]"}
# x_0 and x_{0} (LaTeX) are the name x0
_SUBSCRIPT = re.compile(r"x_(?:0|\{0\})(?![A-Za-z0-9_])")
_DIGITS = frozenset("0123456789")


def allowed_symbols(orbit: str, spins: str | None = None) -> dict[str, sp.Symbol]:
    """The names an expression for ``orbit`` may use, mapped to the project's symbols.

    Parameters
    ----------
    orbit:
        ``"circular"`` or ``"general"``.
    spins:
        None, or ``"aligned"`` to allow ``chi1``, ``chi2`` (:data:`SPIN_SYMBOLS`).

    Returns
    -------
    dict
        Name -> sympy Symbol (from :mod:`stfalgebra.symbols`).

    Conventions
    -----------
    Circular orbits: x = (G m omega/c^3)^(2/3), nu, delta, and x0 = (G m omega_0/c^3)^(2/3),
    the reference of the phase psi that modes written in the phase phi carry in ln(x/x0).
    General orbits: r, rdot, phidot, m, c, nu, delta with G = 1.

    Examples
    --------
    >>> sorted(allowed_symbols("circular"))
    ['delta', 'nu', 'x', 'x0']

    References
    ----------
    The project's conventions (``conventions.md``).
    """
    if orbit not in ORBIT_SYMBOLS:
        raise ValueError(f"orbit must be 'circular' or 'general', got {orbit!r}")
    if spins not in (None, "aligned"):
        raise ValueError(f"spins must be None or 'aligned', got {spins!r}")
    return dict(ORBIT_SYMBOLS[orbit], **(SPIN_SYMBOLS if spins else {}))


@dataclass(frozen=True)
class _Token:
    kind: str      # number, name, command, op, open, close, space_command
    text: str
    position: int


def _show(text: str) -> str:
    return repr(text if len(text) <= 30 else text[:27] + "...")


def _refuse(what: str, position: int | None = None) -> ExpressionRefusedError:
    where = "" if position is None else f" at position {position}"
    return ExpressionRefusedError(f"expression refused: {what}{where}")


def _tokenise(text: str, known_names: frozenset[str] = frozenset()) -> list[_Token]:
    tokens: list[_Token] = []
    i, n = 0, len(text)
    optional_open = False
    while i < n:
        ch = text[i]
        if ch in " \t\r\n":
            i += 1
            continue
        if ch in _UNICODE:
            mapped = _UNICODE[ch]
            tokens.append(_Token("name" if mapped.isalpha() else "op", mapped, i))
            i += 1
            continue
        if ch in _DIGITS or (ch == "." and i + 1 < n and text[i + 1] in _DIGITS):
            match = _NUMBER.match(text, i)
            literal = match.group(0)
            if len(literal) > _MAX_LITERAL_DIGITS:
                raise _refuse(f"number literal longer than {_MAX_LITERAL_DIGITS} characters", i)
            tokens.append(_Token("number", literal, i))
            i = match.end()
            continue
        if ch == "x" and (subscript := _SUBSCRIPT.match(text, i)):
            tokens.append(_Token("name", "x0", i))
            i = subscript.end()
            continue
        if ch.isascii() and (ch.isalpha() or ch == "_"):
            match = _NAME.match(text, i)
            name = match.group(0)
            if len(name) > _MAX_NAME:
                raise _refuse(f"name longer than {_MAX_NAME} characters", i)
            tokens.append(_Token("name", name, i))
            i = match.end()
            continue
        if ch == "\\":
            match = _COMMAND.match(text, i)
            if match:
                tokens.append(_Token("command", match.group(1), i))
                i = match.end()
                continue
            if i + 1 < n and text[i + 1] in _LATEX_SPACES:
                i += 2
                continue
            raise _refuse(f"backslash sequence {_show(text[i:i + 2])}", i)
        if ch == "*" and text.startswith("**", i):
            tokens.append(_Token("op", "^", i))
            i += 2
            continue
        if ch in "+-*/^":
            tokens.append(_Token("op", ch, i))
            i += 1
            continue
        if ch == "[" and tokens and tokens[-1].kind == "command" and tokens[-1].text == "sqrt":
            tokens.append(_Token("optional_open", ch, i))
            optional_open = True
            i += 1
            continue
        if ch == "]" and optional_open:
            tokens.append(_Token("optional_close", ch, i))
            optional_open = False
            i += 1
            continue
        if ch in "({[":
            tokens.append(_Token("open", ch, i))
            i += 1
            continue
        if ch in ")}]":
            tokens.append(_Token("close", ch, i))
            i += 1
            continue
        # An unknown name before the bad character is the more telling reason, as in
        # __import__('os') or lambda: 0.
        unknown = next((t for t in tokens if t.kind == "name" and t.text not in known_names), None)
        if unknown is not None:
            kind = "dunder name" if unknown.text.startswith("__") else "name"
            raise _refuse(f"{kind} {_show(unknown.text)}", unknown.position)
        raise _refuse(_describe_character(ch), i)
    return tokens


def _describe_character(ch: str) -> str:
    if ch in "'\"":
        return f"string quote {ch!r} (strings are not expressions)"
    if ch == ".":
        return "'.' outside a number (attribute access is not allowed)"
    if ch == ",":
        return "',' (functions take one argument; tuples are not expressions)"
    if ch == "_":
        return "'_' (subscripts are not allowed)"
    if ch.isprintable():
        return f"character {ch!r}"
    return f"character {ascii(ch)}"


@dataclass(frozen=True)
class DecimalLiteral:
    """A number written with a decimal point or an exponent (``1.7724538509``, ``2.5e-3``).

    ``symbol`` stands for it in :attr:`ParsedExpression.with_decimals`; ``value`` is its exact
    value, ``digits`` the number of significant digits it was given, ``unit`` the value of one
    unit in its last digit (so that the written number stands for a value within about
    ``unit`` of ``value``)."""

    symbol: sp.Symbol
    text: str
    value: sp.Rational
    digits: int
    unit: sp.Rational

    def display(self) -> sp.Float:
        """The literal as a sympy Float with the digits it was given (for reports)."""
        return sp.Float(self.value, max(self.digits, 1))


@dataclass(frozen=True)
class ParsedExpression:
    """An expression and its decimals: ``expression`` reads every decimal as the exact
    fraction it spells; ``with_decimals`` has the symbol of each :class:`DecimalLiteral` in its
    place (equal to ``expression`` when there is no decimal)."""

    expression: sp.Expr
    with_decimals: sp.Expr
    decimals: tuple[DecimalLiteral, ...]

    def exact(self, expression: sp.Expr | None = None) -> sp.Expr:
        """``expression`` (default :attr:`with_decimals`) with every decimal read exactly."""
        target = self.with_decimals if expression is None else expression
        return target.xreplace({d.symbol: d.value for d in self.decimals}) if self.decimals else target

    def display(self, expression: sp.Expr | None = None) -> sp.Expr:
        """``expression`` (default :attr:`with_decimals`) with every decimal as a Float of the
        digits it was given: what the user wrote, for reports."""
        target = self.with_decimals if expression is None else expression
        return target.xreplace({d.symbol: d.display() for d in self.decimals}) if self.decimals else target


class _Parser:
    def __init__(self, tokens: list[_Token], symbols: dict[str, sp.Symbol], orbit: str, length: int,
                 decimals: list[DecimalLiteral] | None = None):
        # with ``decimals`` a list, decimal literals become symbols recorded there (except in
        # exponents and root indices, which stay exact numbers)
        self.decimals = decimals
        self.exact_context = 0
        self.tokens = tokens
        self.index = 0
        self.symbols = symbols
        self.orbit = orbit
        self.depth = 0
        self.exp_nesting = 0
        self.length = length
        self.last_was_number = False

    # -- token helpers
    def peek(self) -> _Token | None:
        return self.tokens[self.index] if self.index < len(self.tokens) else None

    def take(self) -> _Token:
        token = self.peek()
        if token is None:
            raise _refuse("unexpected end of expression", self.length)
        self.index += 1
        return token

    def expect_close(self, opener: _Token) -> None:
        wanted = _GROUP_CLOSE[opener.text]
        self.skip_ignored()
        token = self.peek()
        if token is None:
            raise _refuse(f"unclosed {opener.text!r} opened", opener.position)
        if token.kind != "close" or token.text != wanted:
            raise _refuse(f"expected {wanted!r} but found {_show(token.text)}", token.position)
        self.index += 1

    def skip_ignored(self) -> None:
        while True:
            token = self.peek()
            if token is not None and token.kind == "command" and token.text in _LATEX_IGNORED:
                self.index += 1
                continue
            return

    def enter(self, position: int) -> None:
        self.depth += 1
        if self.depth > MAX_DEPTH:
            raise _refuse(f"nesting deeper than {MAX_DEPTH} levels", position)

    def leave(self) -> None:
        self.depth -= 1

    # -- grammar
    def parse(self) -> sp.Expr:
        if not self.tokens:
            raise _refuse("empty expression")
        value = self.expression()
        self.skip_ignored()
        token = self.peek()
        if token is not None:
            if token.kind == "close":
                raise _refuse(f"unmatched {token.text!r}", token.position)
            raise _refuse(f"unexpected {_show(token.text)}", token.position)
        return value

    def expression(self) -> sp.Expr:
        """sum := product (('+'|'-') product)*"""
        terms = [self.product()]
        while True:
            token = self.peek()
            if token is not None and token.kind == "op" and token.text in "+-":
                self.index += 1
                value = self.product()
                terms.append(value if token.text == "+" else -value)
            else:
                return sp.Add(*terms)

    def product(self) -> sp.Expr:
        """product := signed (('*'|'/'|juxtaposition) signed)*"""
        factors = [self.signed()]
        previous_number = self.last_was_number
        while True:
            self.skip_ignored()
            token = self.peek()
            if token is None:
                break
            if token.kind == "op" and token.text in "*/":
                self.index += 1
                value = self.signed()
                factors.append(value if token.text == "*" else _reciprocal(value, token.position))
            elif token.kind == "command" and token.text in _LATEX_TIMES:
                self.index += 1
                factors.append(self.signed())
            elif self.starts_factor(token):
                if token.kind == "number" and previous_number:
                    raise _refuse("two numbers side by side (write '*' between them)", token.position)
                factors.append(self.power())
            else:
                break
            previous_number = self.last_was_number
        return sp.Mul(*factors)

    def starts_factor(self, token: _Token) -> bool:
        if token.kind in ("number", "name"):
            return True
        if token.kind == "open":
            return True
        return token.kind == "command" and token.text not in _LATEX_TIMES

    def signed(self) -> sp.Expr:
        """signed := ('+'|'-') signed | power"""
        token = self.peek()
        if token is not None and token.kind == "op" and token.text in "+-":
            self.index += 1
            self.enter(token.position)
            value = self.signed()
            self.leave()
            return value if token.text == "+" else -value
        return self.power()

    def power(self) -> sp.Expr:
        """power := atom ('^' signed-exponent)?   (right-associative)"""
        base = self.atom()
        token = self.peek()
        if token is not None and token.kind == "op" and token.text == "^":
            self.index += 1
            self.enter(token.position)
            self.exact_context += 1
            exponent = self.signed()
            self.exact_context -= 1
            self.leave()
            self.last_was_number = False
            return _checked_power(base, exponent, token.position)
        return base

    def atom(self) -> sp.Expr:
        self.skip_ignored()
        token = self.take()
        self.last_was_number = token.kind == "number"
        if token.kind == "number":
            if self.decimals is not None and not self.exact_context and _is_decimal(token.text):
                return self.decimal_symbol(token)
            return _number(token)
        if token.kind == "open":
            self.enter(token.position)
            value = self.expression()
            self.expect_close(token)
            self.leave()
            self.last_was_number = False
            return value
        if token.kind == "name":
            return self.named(token)
        if token.kind == "command":
            return self.command(token)
        if token.kind == "close":
            raise _refuse(f"unexpected {token.text!r} (empty group or missing operand)", token.position)
        raise _refuse(f"missing operand before {_show(token.text)}", token.position)

    def decimal_symbol(self, token: _Token) -> sp.Symbol:
        value = _number(token)
        mantissa, _, exponent = token.text.lower().partition("e")
        whole, _, fraction = mantissa.partition(".")
        significant = (whole + fraction).lstrip("0")
        unit = sp.Rational(10) ** (int(exponent or 0) - len(fraction))
        symbol = sp.Symbol(f"_decimal_{len(self.decimals) + 1}", nonnegative=True)
        self.decimals.append(DecimalLiteral(symbol, token.text, value, max(len(significant), 1), unit))
        return symbol

    def named(self, token: _Token) -> sp.Expr:
        name = token.text
        if name in self.symbols:
            return self.symbols[name]
        if name in _CONSTANTS:
            return _CONSTANTS[name]
        if name in _FUNCTIONS:
            following = self.peek()
            if following is None or following.kind != "open":
                raise _refuse(f"function {name!r} must be followed by '('", token.position)
            return self.call(name, token)
        if name.startswith("__") or name.endswith("__"):
            raise _refuse(f"dunder name {_show(name)}", token.position)
        following = self.peek()
        if following is not None and following.kind == "open" and following.text == "(":
            raise _refuse(f"call of {_show(name)} (allowed functions: sqrt, log, exp)", token.position)
        allowed = ", ".join(sorted(self.symbols))
        raise _refuse(f"name {_show(name)} (allowed for {self.orbit} orbits: {allowed}, pi, I, EulerGamma)",
                      token.position)

    def call(self, name: str, token: _Token) -> sp.Expr:
        function = _FUNCTIONS[name]
        self.enter(token.position)
        if function is sp.exp:
            self.exp_nesting += 1
            if self.exp_nesting > _MAX_EXP_NESTING:
                raise _refuse(f"exp nested more than {_MAX_EXP_NESTING} deep", token.position)
        following = self.peek()
        if following is not None and following.kind == "open":
            opener = self.take()
            argument = self.expression()
            self.expect_close(opener)
        else:
            argument = self.power()
        if function is sp.exp:
            self.exp_nesting -= 1
        self.leave()
        self.last_was_number = False
        return _checked_function(function, argument, name, token.position)

    def group_argument(self, what: str, position: int) -> sp.Expr:
        """A LaTeX argument: a {...} group or a single atom."""
        self.skip_ignored()
        token = self.peek()
        if token is None:
            raise _refuse(f"missing argument of {what}", position)
        if token.kind == "open":
            return self.atom()
        if token.kind == "number" and len(token.text) > 1:
            # LaTeX reads one character as an argument: \frac12 is 1/2, \frac123 is (1/2)*3.
            if not token.text.isdigit():
                raise _refuse(f"write the arguments of {what} in braces", token.position)
            self.tokens[self.index] = _Token("number", token.text[1:], token.position + 1)
            self.last_was_number = False
            return sp.Integer(int(token.text[0]))
        return self.atom()

    def command(self, token: _Token) -> sp.Expr:
        name = token.text
        if name in _LATEX_FRACTIONS:
            self.enter(token.position)
            numerator = self.group_argument("\\" + name, token.position)
            denominator = self.group_argument("\\" + name, token.position)
            self.leave()
            self.last_was_number = False
            return sp.Mul(numerator, _reciprocal(denominator, token.position))
        if name == "sqrt":
            self.enter(token.position)
            root = sp.Integer(2)
            following = self.peek()
            if following is not None and following.kind == "optional_open":
                self.index += 1
                self.exact_context += 1
                root = self.expression()
                self.exact_context -= 1
                closer = self.take()
                if closer.kind != "optional_close":
                    raise _refuse(f"expected ']' but found {_show(closer.text)}", closer.position)
                if not (root.is_Integer and 2 <= root <= MAX_EXPONENT):
                    raise _refuse(f"root index {_show(sp.sstr(root))} (an integer from 2 to {MAX_EXPONENT})",
                                  following.position)
            argument = self.group_argument("\\sqrt", token.position)
            self.leave()
            self.last_was_number = False
            return _checked_power(argument, 1 / root, token.position)
        if name in _LATEX_FUNCTIONS:
            return self.call(_LATEX_FUNCTIONS[name], token)
        if name in _LATEX_SYMBOLS:
            return self.named(_Token("name", _LATEX_SYMBOLS[name], token.position))
        if name == "gamma":
            if self.subscript_is("E"):
                return sp.EulerGamma
            raise _refuse("\\gamma (only \\gamma_E, Euler's constant, is allowed)", token.position)
        if name == "mathrm" or name == "operatorname":
            inner = self.braced_name(token)
            if inner == "i":
                return sp.I
            if inner in ("ln", "log", "exp", "sqrt"):
                return self.call({"ln": "log"}.get(inner, inner), token)
            return self.named(_Token("name", inner, token.position))
        if name == "dot":
            return self.dotted(token)
        raise _refuse(f"LaTeX command {_show(chr(92) + name)}", token.position)

    def subscript_is(self, letter: str) -> bool:
        # \gamma_E arrives as command 'gamma' followed by the name token '_E' or '_' '{E}'.
        token = self.peek()
        if token is not None and token.kind == "name" and token.text == "_" + letter:
            self.index += 1
            return True
        if token is not None and token.kind == "name" and token.text == "_":
            self.index += 1
            opener = self.take()
            inner = self.take()
            if opener.kind == "open" and opener.text == "{" and inner.kind == "name" and inner.text == letter:
                self.expect_close(opener)
                return True
            raise _refuse("subscript other than \\gamma_E", opener.position)
        return False

    def braced_name(self, token: _Token) -> str:
        opener = self.take()
        if opener.kind != "open" or opener.text != "{":
            raise _refuse(f"\\{token.text} must be followed by '{{'", opener.position)
        inner = self.take()
        if inner.kind != "name":
            raise _refuse(f"\\{token.text}{{...}} must contain a name", inner.position)
        self.expect_close(opener)
        return inner.text

    def dotted(self, token: _Token) -> sp.Expr:
        opener = self.peek()
        braced = opener is not None and opener.kind == "open" and opener.text == "{"
        if braced:
            self.index += 1
        inner = self.take()
        if braced:
            self.expect_close(opener)
        base = inner.text if inner.kind in ("name", "command") else None
        target = {"r": "rdot", "phi": "phidot", "varphi": "phidot"}.get(base)
        if target is None or target not in self.symbols:
            raise _refuse(f"\\dot{{{inner.text}}} (allowed for {self.orbit} orbits: "
                          f"{', '.join(n for n in ('rdot', 'phidot') if n in self.symbols) or 'none'})",
                          token.position)
        self.last_was_number = False
        return self.symbols[target]


def _is_decimal(literal: str) -> bool:
    return "." in literal or "e" in literal or "E" in literal


def _number(token: _Token) -> sp.Expr:
    literal = token.text
    mantissa, _, exponent = literal.lower().partition("e")
    if exponent and abs(int(exponent)) > _MAX_DECIMAL_EXPONENT:
        raise _refuse(f"decimal exponent beyond {_MAX_DECIMAL_EXPONENT} in {_show(literal)}", token.position)
    value = Fraction(mantissa) * Fraction(10) ** int(exponent or 0)
    return sp.Rational(value.numerator, value.denominator)


def _bits(value: sp.Rational) -> int:
    return max(int(value.p).bit_length(), int(value.q).bit_length())


def _checked_power(base: sp.Expr, exponent: sp.Expr, position: int) -> sp.Expr:
    if not exponent.is_Rational:
        raise _refuse(f"exponent {_show(sp.sstr(exponent))} (exponents must be rational numbers)", position)
    if abs(exponent) > MAX_EXPONENT or exponent.q > MAX_EXPONENT:
        raise _refuse(f"exponent {_show(sp.sstr(exponent))} beyond the bound |exponent| <= {MAX_EXPONENT}", position)
    numbers = base.atoms(sp.Rational)
    if numbers and max(map(_bits, numbers)) * (abs(int(exponent.p)) // int(exponent.q) + 1) > MAX_NUMBER_BITS:
        raise _refuse(f"power of a number that would exceed {MAX_NUMBER_BITS} bits", position)
    if base.is_zero and exponent < 0:
        raise _refuse("division by zero", position)
    return sp.Pow(base, exponent)


def _reciprocal(value: sp.Expr, position: int) -> sp.Expr:
    if value.is_zero:
        raise _refuse("division by zero", position)
    return sp.Pow(value, -1)


def _checked_function(function, argument: sp.Expr, name: str, position: int) -> sp.Expr:
    if function is sp.log and argument.is_zero:
        raise _refuse("log(0)", position)
    if function is sp.exp and argument.is_number and argument.is_real and abs(argument) > 1000:
        raise _refuse(f"exp of a number beyond 1000 in modulus: {_show(sp.sstr(argument))}", position)
    return function(argument)


def _check_result(expression: sp.Expr, symbols: dict[str, sp.Symbol]) -> sp.Expr:
    if expression.has(sp.zoo, sp.nan, sp.oo, -sp.oo):
        raise _refuse("the expression is undefined (division by zero or log(0))")
    stray = expression.free_symbols - set(symbols.values())
    if stray:  # cannot happen with the grammar above; kept as a guard
        raise _refuse(f"symbols {sorted(map(str, stray))}")
    for power in expression.atoms(sp.Pow):
        exponent = power.exp
        if exponent.is_Rational and abs(exponent) > MAX_EXPONENT:
            raise _refuse(f"power with exponent {exponent} beyond the bound |exponent| <= {MAX_EXPONENT} "
                          f"(after combining equal factors)")
    for number in expression.atoms(sp.Rational):
        if _bits(number) > MAX_NUMBER_BITS:
            raise _refuse(f"number larger than {MAX_NUMBER_BITS} bits")
    return expression


def parse_expression(text: str, *, orbit: str = "circular", spins: str | None = None) -> sp.Expr:
    """Parse untrusted ``text`` into a sympy expression in the orbit's symbols, or refuse it.

    Parameters
    ----------
    text:
        The expression, plain (``1 + x*(-107/42 + 55*nu/42)``) or LaTeX
        (``1 + x\\left(-\\frac{107}{42} + \\frac{55}{42}\\nu\\right)``).
    orbit:
        ``"circular"`` (symbols x, nu, delta) or ``"general"`` (r, rdot, phidot, m, c, nu,
        delta).
    spins:
        None, or ``"aligned"``: ``chi1``, ``chi2`` are allowed too.

    Returns
    -------
    sympy.Expr
        Built from the project's symbols (:mod:`stfalgebra.symbols`), exact numbers, pi, I,
        EulerGamma, sqrt, log and exp only.

    Conventions
    -----------
    Juxtaposition is a product with the precedence of ``*`` (so ``1/2 x`` is x/2); ``-x^2``
    is ``-(x^2)``; powers are right-associative; decimals are exact (0.1 is 1/10); ``i`` and
    ``I`` are the imaginary unit. The text is never evaluated as code. Refusals raise
    :class:`~stfalgebra.errors.ExpressionRefusedError` (a ValueError) naming what was refused.

    Examples
    --------
    >>> parse_expression("1 + x*(-107/42 + 55*nu/42)")
    x*(55*nu/42 - 107/42) + 1
    >>> parse_expression(r"\\frac{1}{3} i \\delta x^{1/2}")
    I*delta*sqrt(x)/3
    >>> parse_expression("__import__('os')")
    Traceback (most recent call last):
    ...
    stfalgebra.errors.ExpressionRefusedError: expression refused: dunder name '__import__' at position 0

    References
    ----------
    Common practice (recursive-descent parsing with operator precedence).
    """
    return parse_with_decimals(text, orbit=orbit, spins=spins).expression


def parse_with_decimals(text: str, *, orbit: str = "circular", spins: str | None = None) -> ParsedExpression:
    """Parse untrusted ``text`` like :func:`parse_expression`, keeping track of its decimals.

    Parameters
    ----------
    text, orbit, spins:
        As :func:`parse_expression`.

    Returns
    -------
    ParsedExpression
        The exact expression, the same expression with one symbol per decimal literal, and
        the literals (value, significant digits, unit in the last digit).

    Conventions
    -----------
    A decimal is a number written with a point or an exponent; exponents and root indices are
    always read exactly (``x^0.5`` is ``sqrt(x)``). Every refusal of :func:`parse_expression`
    applies, checked on the exact reading.

    Examples
    --------
    >>> parsed = parse_with_decimals("1.50 x + 1/2")
    >>> parsed.expression, [(d.text, d.digits, d.unit) for d in parsed.decimals]
    (3*x/2 + 1/2, [('1.50', 3, 1/100)])

    References
    ----------
    Common practice (significant digits of a decimal number).
    """
    if not isinstance(text, str):
        raise TypeError(f"expression must be a str, got {type(text).__name__}")
    symbols = allowed_symbols(orbit, spins)
    if len(text) > MAX_LENGTH:
        raise _refuse(f"expression of {len(text)} characters (at most {MAX_LENGTH})")
    tokens = _tokenise(text, frozenset(symbols) | frozenset(_CONSTANTS) | frozenset(_FUNCTIONS))
    exact = _check_result(_Parser(list(tokens), symbols, orbit, len(text)).parse(), symbols)
    if not any(t.kind == "number" and _is_decimal(t.text) for t in tokens):
        return ParsedExpression(exact, exact, ())
    # the same grammar a second time, decimals as symbols: every guard already held above
    decimals: list[DecimalLiteral] = []
    with_decimals = _Parser(list(tokens), symbols, orbit, len(text), decimals).parse()
    return ParsedExpression(exact, with_decimals, tuple(decimals))
