"""What the emitters consume: named complex expressions of declared real inputs.

An :class:`EmissionSet` is the language-neutral description of one generated function: its
name, its real inputs (in signature order), optional intermediate quantities computed from the
inputs (for instance nu and delta from the two masses), and the named complex outputs. The
function :func:`prepare_emission` splits every output into real and imaginary parts and
eliminates common subexpressions across all of them at once, so the C and numpy printers only
print assignments.
"""

from __future__ import annotations

import random
from dataclasses import dataclass, field
from typing import Callable

import sympy as sp

from .identifiers import function_identifier, sanitize_identifier, unique_identifiers

__all__ = [
    "CodeInput",
    "NamedExpression",
    "EmissionSet",
    "PreparedEmission",
    "split_real_imaginary",
    "prepare_emission",
    "OUTPUT_REAL",
    "OUTPUT_IMAG",
    "TEMPORARY_PREFIX",
]

OUTPUT_REAL = "re_out"
"""Name of the C output array of real parts."""
OUTPUT_IMAG = "im_out"
"""Name of the C output array of imaginary parts."""
TEMPORARY_PREFIX = "cse_"
"""Prefix of the temporaries introduced by common-subexpression elimination."""

Sampler = Callable[[random.Random], dict]


@dataclass(frozen=True)
class CodeInput:
    """One real input of a generated function.

    ``low``/``high`` bound the values the verifier draws when no sampler is given.
    """

    symbol: sp.Symbol
    description: str
    low: float = 0.1
    high: float = 1.0

    def __post_init__(self) -> None:
        if not isinstance(self.symbol, sp.Symbol):
            raise TypeError(f"input must be a sympy Symbol, got {self.symbol!r}")
        if not self.low < self.high:
            raise ValueError(f"input {self.symbol}: empty range [{self.low}, {self.high}]")


@dataclass(frozen=True)
class NamedExpression:
    """A named complex output ``expression`` with a one-line ``description``."""

    name: str
    expression: sp.Expr
    description: str = ""

    def __post_init__(self) -> None:
        if not isinstance(self.name, str) or not self.name.strip():
            raise ValueError(f"output name must be a non-empty str, got {self.name!r}")
        expression = self.expression
        if isinstance(expression, int) and not isinstance(expression, bool):
            expression = sp.Integer(expression)
        if not isinstance(expression, sp.Expr):
            raise TypeError(f"output {self.name!r}: expression must be a sympy Expr, got {self.expression!r}")
        object.__setattr__(self, "expression", expression)


@dataclass(frozen=True)
class EmissionSet:
    """A generated function: inputs, intermediate quantities and named complex outputs.

    ``intermediates`` are ``(symbol, expression)`` pairs evaluated in order before the outputs;
    each expression may use the inputs and earlier intermediates. ``sampler``, when given,
    draws one consistent point (a dict symbol -> float) for the numeric verification.
    """

    function_name: str
    inputs: tuple[CodeInput, ...]
    outputs: tuple[NamedExpression, ...]
    summary: str
    intermediates: tuple[tuple[sp.Symbol, sp.Expr], ...] = ()
    notes: tuple[str, ...] = ()
    sampler: Sampler | None = field(default=None, compare=False)

    def __post_init__(self) -> None:
        object.__setattr__(self, "inputs", tuple(self.inputs))
        object.__setattr__(self, "outputs", tuple(self.outputs))
        object.__setattr__(self, "intermediates", tuple(tuple(p) for p in self.intermediates))
        object.__setattr__(self, "notes", tuple(self.notes))
        if not self.outputs:
            raise ValueError("an emission needs at least one output expression, got none")
        if not isinstance(self.function_name, str):
            raise TypeError(f"function name must be a str, got {self.function_name!r}")
        function_identifier(self.function_name)  # refuses a name too long for C and for file names
        names = [i.symbol.name for i in self.inputs]
        if len(set(names)) != len(names):
            raise ValueError(f"input names repeat: {names}")
        known = {i.symbol for i in self.inputs}
        for symbol, expression in self.intermediates:
            stray = expression.free_symbols - known
            if stray:
                raise ValueError(f"intermediate {symbol} uses undeclared symbols {sorted(map(str, stray))}")
            known.add(symbol)
        for output in self.outputs:
            stray = output.expression.free_symbols - known
            if stray:
                raise ValueError(
                    f"output {output.name!r} uses symbols that are not inputs: {sorted(map(str, stray))}"
                )

    def input_symbols(self) -> tuple[sp.Symbol, ...]:
        """The input symbols in signature order."""
        return tuple(i.symbol for i in self.inputs)

    def substitute_intermediates(self, expression: sp.Expr) -> sp.Expr:
        """``expression`` written in the inputs only (intermediates substituted, last first)."""
        for symbol, definition in reversed(self.intermediates):
            expression = expression.xreplace({symbol: definition})
        return expression

    def draw_point(self, rng: random.Random) -> dict[sp.Symbol, float]:
        """One verification point: a float per input symbol."""
        if self.sampler is not None:
            point = self.sampler(rng)
            missing = [i.symbol.name for i in self.inputs if i.symbol not in point]
            if missing:
                raise ValueError(f"sampler gave no value for inputs {missing}")
            return {i.symbol: float(point[i.symbol]) for i in self.inputs}
        return {i.symbol: rng.uniform(i.low, i.high) for i in self.inputs}


@dataclass(frozen=True)
class PreparedEmission:
    """An emission ready to print: every name sanitised, CSE done.

    ``parameters`` are the sanitised input names in order; ``assignments`` the intermediate and
    temporary assignments ``(name, expression)`` in evaluation order; ``real_parts`` and
    ``imaginary_parts`` the final expressions per output (in the sanitised symbols);
    ``output_names`` the sanitised output names.
    """

    source: EmissionSet
    function_name: str
    parameters: tuple[str, ...]
    parameter_descriptions: tuple[str, ...]
    assignments: tuple[tuple[str, sp.Expr], ...]
    output_names: tuple[str, ...]
    output_descriptions: tuple[str, ...]
    real_parts: tuple[sp.Expr, ...]
    imaginary_parts: tuple[sp.Expr, ...]
    constants: tuple[tuple[str, sp.Expr], ...]
    unused_parameters: tuple[str, ...]


def split_real_imaginary(expression: sp.Expr) -> tuple[sp.Expr, sp.Expr]:
    """Split ``expression`` into real and imaginary parts, assuming every symbol is real.

    Parameters
    ----------
    expression:
        A sympy expression in real symbols, with ``I`` appearing polynomially (as in
        ``A + I B`` or ``(A + I B)(cos t - I sin t)``), or inside functions that sympy can
        split (``exp(I t)``).

    Returns
    -------
    (real, imaginary)
        Two real sympy expressions with ``expression == real + I*imaginary``.

    Conventions
    -----------
    Every free symbol is treated as real and every logarithm or square root argument as
    positive in the ranges where the result is used (the generated code evaluates them with
    real arithmetic). Sums are split term by term and products factor by factor, without
    expanding, so the structure of the input (and its common factors) survives.

    Examples
    --------
    >>> import sympy as sp
    >>> a, b, t = sp.symbols("a b t", real=True)
    >>> split_real_imaginary((a + sp.I*b)*(sp.cos(t) - sp.I*sp.sin(t)))
    (a*cos(t) + b*sin(t), -a*sin(t) + b*cos(t))

    References
    ----------
    Common practice.
    """
    if not isinstance(expression, sp.Expr):
        raise TypeError(f"expected a sympy expression, got {expression!r}")
    return _split(expression)


def _split(expression: sp.Expr) -> tuple[sp.Expr, sp.Expr]:
    if not expression.has(sp.I):
        return expression, sp.S.Zero
    if expression is sp.I:
        return sp.S.Zero, sp.S.One
    if isinstance(expression, sp.Add):
        parts = [_split(term) for term in expression.args]
        return sp.Add(*[p[0] for p in parts]), sp.Add(*[p[1] for p in parts])
    if isinstance(expression, sp.Mul):
        real_factor = sp.Mul(*[f for f in expression.args if not f.has(sp.I)])
        real, imag = sp.S.One, sp.S.Zero
        for factor in expression.args:
            if factor.has(sp.I):
                a, b = _split(factor)
                real, imag = real * a - imag * b, real * b + imag * a
        return real_factor * real, real_factor * imag
    if isinstance(expression, sp.Pow) and expression.exp.is_Integer and 0 < expression.exp <= 16:
        return _split_expanded(expression)
    return _split_by_sympy(expression)


def _split_expanded(expression: sp.Expr) -> tuple[sp.Expr, sp.Expr]:
    unit = sp.Dummy("imaginary_unit")
    replaced = sp.expand(expression.xreplace({sp.I: unit}), power_base=False, power_exp=False, log=False)
    real_terms: list[sp.Expr] = []
    imag_terms: list[sp.Expr] = []
    for term in sp.Add.make_args(replaced):
        coefficient, power = term.as_coeff_exponent(unit)
        if coefficient.has(unit) or not (power.is_Integer and power >= 0):
            return _split_by_sympy(expression)
        k = int(power)
        sign = -1 if (k // 2) % 2 else 1
        (real_terms if k % 2 == 0 else imag_terms).append(sign * coefficient)
    real, imag = sp.Add(*real_terms), sp.Add(*imag_terms)
    if real.has(sp.I) or imag.has(sp.I):
        return _split_by_sympy(expression)
    return real, imag


def _split_by_sympy(expression: sp.Expr) -> tuple[sp.Expr, sp.Expr]:
    real_symbols = {s: sp.Dummy(s.name, real=True) for s in expression.free_symbols if not s.is_real}
    back = {v: k for k, v in real_symbols.items()}
    real, imag = sp.expand_complex(expression.xreplace(real_symbols)).as_real_imag()
    real, imag = real.xreplace(back), imag.xreplace(back)
    if real.has(sp.I) or imag.has(sp.I) or real.has(sp.re, sp.im) or imag.has(sp.re, sp.im):
        raise ValueError(f"cannot split into real and imaginary parts: {expression}")
    return real, imag


# Constants printed as named double constants in generated code (C99 has no M_PI).
_CONSTANTS = ((sp.pi, "k_pi"), (sp.EulerGamma, "k_euler_gamma"), (sp.E, "k_e"))


def prepare_emission(emission: EmissionSet) -> PreparedEmission:
    """Sanitise names, split outputs into real and imaginary parts and eliminate subexpressions.

    Parameters
    ----------
    emission:
        The function to generate.

    Returns
    -------
    PreparedEmission
        Everything a printer needs, deterministic for a given ``emission``.

    Conventions
    -----------
    Common subexpressions are eliminated across all real and imaginary parts together (one
    ``sympy.cse`` call, canonical ordering). Intermediates no output needs are dropped.
    The constants pi, Euler's gamma and e become named constants ``k_pi``, ``k_euler_gamma``,
    ``k_e``.

    Examples
    --------
    >>> import sympy as sp
    >>> t = sp.Symbol("t", real=True)
    >>> e = EmissionSet("f", (CodeInput(t, "time"),), (NamedExpression("z", sp.exp(sp.I*t)),), "demo")
    >>> p = prepare_emission(e)
    >>> p.real_parts, p.imaginary_parts
    ((cos(t),), (sin(t),))

    References
    ----------
    sympy documentation of ``sympy.simplify.cse_main.cse``.
    """
    if not isinstance(emission, EmissionSet):
        raise TypeError(f"expected an EmissionSet, got {type(emission).__name__}")
    reserved = {OUTPUT_REAL, OUTPUT_IMAG} | {name for _, name in _CONSTANTS}
    function_name = sanitize_identifier(emission.function_name, reserved=reserved)
    reserved.add(function_name)
    parameter_names = unique_identifiers([i.symbol.name for i in emission.inputs], reserved=reserved)
    reserved.update(parameter_names)
    intermediate_names = unique_identifiers([s.name for s, _ in emission.intermediates], reserved=reserved)
    reserved.update(intermediate_names)
    if any(n.startswith(TEMPORARY_PREFIX) for n in reserved):
        clash = sorted(n for n in reserved if n.startswith(TEMPORARY_PREFIX))
        raise ValueError(f"names may not start with {TEMPORARY_PREFIX!r}: {clash}")
    output_names = unique_identifiers([o.name for o in emission.outputs], reserved=reserved)

    rename: dict[sp.Symbol, sp.Symbol] = {}
    for item, name in zip(emission.inputs, parameter_names):
        rename[item.symbol] = sp.Symbol(name, real=True)
    for (symbol, _), name in zip(emission.intermediates, intermediate_names):
        rename[symbol] = sp.Symbol(name, real=True)
    constant_symbols = {value: sp.Symbol(name, real=True) for value, name in _CONSTANTS}

    def to_code_symbols(expression: sp.Expr) -> sp.Expr:
        return expression.xreplace(rename).xreplace(constant_symbols)

    parts: list[sp.Expr] = []
    for output in emission.outputs:
        real, imag = split_real_imaginary(output.expression)
        parts.extend((to_code_symbols(real), to_code_symbols(imag)))

    # Keep only the intermediates the outputs need (transitively), in their given order.
    needed = set().union(*(p.free_symbols for p in parts))
    kept: list[tuple[str, sp.Expr]] = []
    for (symbol, definition), name in reversed(list(zip(emission.intermediates, intermediate_names))):
        code_symbol = rename[symbol]
        if code_symbol in needed:
            code_definition = to_code_symbols(definition)
            needed |= code_definition.free_symbols
            kept.append((name, code_definition))
    kept.reverse()

    temporaries = sp.numbered_symbols(TEMPORARY_PREFIX, real=True)
    replacements, reduced = sp.cse(parts, symbols=temporaries, order="canonical")
    assignments = tuple(kept) + tuple((symbol.name, expression) for symbol, expression in replacements)

    used = set()
    for _, expression in assignments:
        used |= {s.name for s in expression.free_symbols}
    for expression in reduced:
        used |= {s.name for s in expression.free_symbols}
    constants = tuple((name, value) for value, name in _CONSTANTS if name in used)
    unused = tuple(name for name in parameter_names if name not in used)
    return PreparedEmission(
        source=emission,
        function_name=function_name,
        parameters=parameter_names,
        parameter_descriptions=tuple(i.description for i in emission.inputs),
        assignments=assignments,
        output_names=output_names,
        output_descriptions=tuple(o.description for o in emission.outputs),
        real_parts=tuple(reduced[0::2]),
        imaginary_parts=tuple(reduced[1::2]),
        constants=constants,
        unused_parameters=unused,
    )
