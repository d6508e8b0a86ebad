"""Benchmark of the exact coefficient engine against other exact-algebra libraries, on the
pipeline's own work.

The derivation pipeline does its exact algebra in :mod:`stfalgebra.exact`: polynomials over Q
on python-flint's ``fmpq_mpoly``, kept in the normal form I^2 = -1, delta^2 = 1 - 4 nu,
r (1/r) = 1. This script takes the real inputs of two stages of the pipeline from the package,
converts them to each candidate library (untimed) and replays the same sequence of operations
on each, then checks that all candidates give the same polynomials. The replay of the engine is
checked against the package's own output, so the replay is known to be the pipeline's work.

Workloads (for each l, every m = 1 ... l):

(a) circular modes through relative 1PN: the mass-ratio factors of the source moments (powers
    of X1 = (1 + delta)/2, X2 = (1 - delta)/2: the delta^2 rule), the channel of the 1PN source
    moment (multinomial expansion of the vectors' spinor components: the I^2 and r (1/r)
    rules), the product with (-i m phidot)^l, the map onto the circular orbit (G = m = 1,
    rdot = 0, phidot = x^(3/2), r = 1/(x g(x)) with the series g(x)^(-p)) and the division by
    nu. Checked against ``radiative.modes._direct_amplitude``.
(b) general orbits: the l-fold time derivative d/dt - i m phidot along the 1PN orbit of the
    channel of the 1PN source moment (the loop of ``binary.orbit_derivative``: partial
    derivatives in r, 1/r, rdot, phidot times the rates of the equations of motion). Checked
    against ``radiative.radiative_moments._instantaneous``.

Candidates, each doing what is idiomatic in its library:

- ``engine``: :class:`stfalgebra.exact.ExactPolynomial`, as the package runs it;
- ``flint``: bare python-flint ``fmpq_mpoly`` in the same ring, normal form by multivariate
  division after each product (the engine without its wrapper);
- ``symengine`` and ``sympy``: expressions, ``expand`` after each product, I^2 and r r^-1
  built in, delta^k replaced by ``xreplace`` with a table of delta^k -> delta^(k mod 2)
  (1 - 4 nu)^(k // 2);
- ``python``: a dictionary of monomials with ``fractions.Fraction`` coefficients (Laurent in r).

Each figure is the median CPU time (``time.process_time``) of ``--repeats`` runs in this
process, with the median wall time beside it (sympy's cache is emptied before each run, so
every run is cold); ratios are candidate / engine (above 1: the engine is faster). A candidate whose run exceeds ``--budget`` seconds is not run at larger l.
The row "package" times the package's own functions on the same modes (their caches cleared,
the source moments kept), for reference. Times are not asserted on.

Run:  python3 tests/benchmarks/bench_engine.py [--circular 4 8 12 16] [--general 4 8 12]
                                               [--repeats 3] [--budget 5] [--quick]
"""

from __future__ import annotations

import argparse
import gc
import math
import operator
import os
import statistics
import sys
import time
from fractions import Fraction
from typing import Any, Callable

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", ".."))

from _common import describe_machine, format_seconds, load_note  # noqa: E402

import flint  # noqa: E402

from stfalgebra.exact import ExactPolynomial  # noqa: E402
from stfalgebra.orders import PNOrder  # noqa: E402

#: The generators the two workloads use, in the order of the canonical form; "r" carries the
#: net power of r (negative for powers of 1/r), so every library can be compared on it.
CANONICAL = ("I", "delta", "r", "nu", "G", "m", "rdot", "phidot")
_POSITION = {name: k for k, name in enumerate(CANONICAL)}

Canonical = dict[tuple[int, ...], Fraction]


def engine_to_canonical(value: ExactPolynomial) -> Canonical:
    """{exponents over CANONICAL: rational} of an engine polynomial (r net of 1/r)."""
    out: Canonical = {}
    for monomial, coefficient in value.terms():
        stray = set(monomial) - set(CANONICAL) - {"rinv"}
        if stray:
            raise ValueError(f"generator(s) {sorted(stray)} outside the benchmark's ring in {value}")
        exponents = [monomial.get(name, 0) for name in CANONICAL]
        exponents[_POSITION["r"]] -= monomial.get("rinv", 0)
        out[tuple(exponents)] = coefficient
    return out


# ----------------------------------------------------------------------------- candidates
class EngineAlgebra:
    """The package's engine, used as the pipeline uses it."""

    name = "engine"

    def __init__(self) -> None:
        self._generators = {name: ExactPolynomial(name) for name in (*CANONICAL, "rinv")}

    def reset(self) -> None:
        """Nothing to clear: the engine keeps no cache of products."""

    def from_engine(self, value: ExactPolynomial) -> ExactPolynomial:
        return value

    def to_canonical(self, value: ExactPolynomial) -> Canonical:
        return engine_to_canonical(value)

    def constant(self, value: Fraction) -> ExactPolynomial:
        return ExactPolynomial(value)

    def generator(self, name: str) -> ExactPolynomial:
        return self._generators[name]

    def add(self, a, b):
        return a + b

    def mul(self, a, b):
        return a * b

    def scale(self, a, number):
        return a * number

    def power(self, a, exponent: int):
        return a ** exponent

    def is_zero(self, a) -> bool:
        return a.is_zero()

    def has(self, a, name: str) -> bool:
        return a.has("r", "rinv") if name == "r" else a.has(name)

    def substitute(self, a, values: dict[str, int]):
        return a.substitute(values)

    def split(self, a, names: tuple[str, ...]) -> dict[tuple[int, ...], Any]:
        # as binary.circular_frequency.on_circular_orbit does it: each term rebuilt
        groups: dict[tuple[int, ...], ExactPolynomial] = {}
        for monomial, coefficient in a.terms():
            key = []
            for name in names:
                if name == "r":
                    key.append(monomial.pop("r", 0) - monomial.pop("rinv", 0))
                else:
                    key.append(monomial.pop(name, 0))
            rest = ExactPolynomial(coefficient)
            for name, power in monomial.items():
                rest = rest * ExactPolynomial(name) ** power
            key = tuple(key)
            groups[key] = groups[key] + rest if key in groups else rest
        return groups

    def d_dr(self, a):
        return a.derivative_in_r()

    def partial(self, a, name: str):
        return a.derivative(name)

    def divide_by(self, a, name: str):
        return a / self._generators[name]


class FlintAlgebra:
    """Bare python-flint fmpq_mpoly; normal form by multivariate division after products."""

    name = "flint"
    _NAMES = ("I", "delta", "r", "rinv", "nu", "G", "m", "rdot", "phidot")

    def __init__(self) -> None:
        self.context = flint.fmpq_mpoly_ctx.get(self._NAMES, "lex")
        self.gens = dict(zip(self._NAMES, self.context.gens()))
        g = self.gens
        self._rule_i = g["I"] ** 2 + 1
        self._rule_delta = g["delta"] ** 2 - 1 + 4 * g["nu"]
        self._rule_r = g["r"] * g["rinv"] - 1
        self._index = {name: k for k, name in enumerate(self._NAMES)}

    def reset(self) -> None:
        """Nothing to clear."""

    def _normal_form(self, p):
        if p.is_constant():
            return p
        degrees = p.degrees()
        if degrees[0] >= 2:
            p = divmod(p, self._rule_i)[1]
        if degrees[1] >= 2:
            p = divmod(p, self._rule_delta)[1]
        if degrees[2] and degrees[3]:
            p = divmod(p, self._rule_r)[1]
        return p

    def from_engine(self, value: ExactPolynomial):
        data = {}
        for exponents, coefficient in engine_to_canonical(value).items():
            e = list(exponents)
            r = e.pop(_POSITION["r"])
            e[2:2] = [max(r, 0), max(-r, 0)]
            data[tuple(e)] = flint.fmpq(coefficient.numerator, coefficient.denominator)
        return self.context.from_dict(data) if data else self.context.constant(0)

    def to_canonical(self, value) -> Canonical:
        out: Canonical = {}
        for exponents, coefficient in value.to_dict().items():
            e = [int(k) for k in exponents]
            r = e[2] - e[3]
            del e[3]
            e[2] = r
            out[tuple(e)] = Fraction(int(coefficient.p), int(coefficient.q))
        return out

    def constant(self, value: Fraction):
        return self.context.constant(flint.fmpq(value.numerator, value.denominator))

    def generator(self, name: str):
        return self.gens[name]

    def add(self, a, b):
        return a + b

    def mul(self, a, b):
        return self._normal_form(a * b)

    def scale(self, a, number):
        number = Fraction(number)
        return a * flint.fmpq(number.numerator, number.denominator)

    def power(self, a, exponent: int):
        return self._normal_form(a ** exponent)

    def is_zero(self, a) -> bool:
        return a.is_zero()

    def has(self, a, name: str) -> bool:
        if a.is_constant():
            return False
        degrees = a.degrees()
        if name == "r":
            return bool(degrees[2] or degrees[3])
        return bool(degrees[self._index[name]])

    def substitute(self, a, values: dict[str, int]):
        return a.subs({name: flint.fmpq(value) for name, value in values.items()})

    def split(self, a, names: tuple[str, ...]) -> dict[tuple[int, ...], Any]:
        positions = [self._index[name] for name in names]
        r_at = self._index["r"]
        groups: dict[tuple[int, ...], dict] = {}
        for exponents, coefficient in a.to_dict().items():
            key = tuple(int(exponents[k]) - int(exponents[r_at + 1]) if k == r_at else int(exponents[k])
                        for k in positions)
            rest = list(exponents)
            for k in positions:
                rest[k] = 0
                if k == r_at:
                    rest[k + 1] = 0
            groups.setdefault(key, {})[tuple(rest)] = coefficient
        return {key: self.context.from_dict(data) for key, data in groups.items()}

    def d_dr(self, a):
        result = a.derivative("r")
        if not a.is_constant() and a.degrees()[3]:
            result = result - self.gens["rinv"] ** 2 * a.derivative("rinv")
        return self._normal_form(result)

    def partial(self, a, name: str):
        return a.derivative(name)

    def divide_by(self, a, name: str):
        return a / self.gens[name]


class ExpressionAlgebra:
    """symengine or sympy expressions: expand after products, delta^k replaced by a table."""

    def __init__(self, module: Any, name: str, max_delta_power: int = 160) -> None:
        self.module = module
        self.name = name
        self.symbols = {n: (module.I if n == "I" else module.Symbol(n)) for n in CANONICAL}
        delta, nu = self.symbols["delta"], self.symbols["nu"]
        self._delta = delta
        # unexpanded right-hand sides: the expand that follows every replacement expands them
        self._delta_rules = {delta**k: delta ** (k % 2) * (1 - 4 * nu) ** (k // 2)
                             for k in range(2, max_delta_power + 1)}
        self._zero = module.Integer(0)

    def reset(self) -> None:
        """Empty sympy's global cache, so that every run is cold (symengine keeps none)."""
        if self.name == "sympy":
            from sympy.core.cache import clear_cache

            clear_cache()

    def _reduce(self, p):
        return self.module.expand(p.xreplace(self._delta_rules))

    def from_engine(self, value: ExactPolynomial):
        m = self.module
        s = self.symbols
        terms = []
        for exponents, coefficient in engine_to_canonical(value).items():
            factors = [m.Rational(coefficient.numerator, coefficient.denominator)]
            factors += [s[name] ** e for name, e in zip(CANONICAL, exponents) if e]
            terms.append(m.Mul(*factors))
        return m.expand(m.Add(*terms)) if terms else self._zero

    def _factors(self, term) -> tuple[Any, dict]:
        """(numeric coefficient, {base: exponent}) of a monomial."""
        m = self.module
        number = m.Integer(1)
        powers: dict = {}
        for factor in m.Mul.make_args(term):
            if factor.is_Number:
                number = number * factor
            elif factor == m.I:
                powers[factor] = powers.get(factor, 0) + 1
            elif factor.is_Pow:
                base, exponent = factor.args
                powers[base] = powers.get(base, 0) + int(exponent)
            else:
                powers[factor] = powers.get(factor, 0) + 1
        return number, powers

    def to_canonical(self, value) -> Canonical:
        out: Canonical = {}
        index = {symbol: k for k, symbol in enumerate(self.symbols[n] for n in CANONICAL)}
        for term, coefficient in value.as_coefficients_dict().items():
            number, powers = self._factors(term)
            exponents = [0] * len(CANONICAL)
            for base, e in powers.items():
                exponents[index[base]] = e
            real, imaginary = (coefficient * number).as_real_imag()
            for i_power, part in ((0, real), (1, imaginary)):
                if part != 0:
                    key = list(exponents)
                    # I^a (re + i im) with a in {0, 1} as the engine's normal form
                    total = key[0] + i_power
                    sign = -1 if total >= 2 else 1
                    key[0] = total % 2
                    q = Fraction(str(part)) * sign
                    out[tuple(key)] = out.get(tuple(key), Fraction(0)) + q
        return {k: v for k, v in out.items() if v}

    def constant(self, value: Fraction):
        return self.module.Rational(value.numerator, value.denominator)

    def generator(self, name: str):
        return self.symbols[name]

    def add(self, a, b):
        return a + b

    def mul(self, a, b):
        product = self.module.expand(a * b)
        if a.has(self._delta) and b.has(self._delta):
            product = self._reduce(product)
        return product

    def scale(self, a, number):
        number = Fraction(number)
        return self.module.expand(a * self.module.Rational(number.numerator, number.denominator))

    def power(self, a, exponent: int):
        result = self.module.expand(a ** exponent)
        if exponent >= 2 and a.has(self._delta):
            result = self._reduce(result)
        return result

    def is_zero(self, a) -> bool:
        return a == 0

    def has(self, a, name: str) -> bool:
        return a.has(self.symbols[name])

    def substitute(self, a, values: dict[str, int]):
        return a.xreplace({self.symbols[name]: self.module.Integer(v) for name, v in values.items()})

    def split(self, a, names: tuple[str, ...]) -> dict[tuple[int, ...], Any]:
        m = self.module
        wanted = [self.symbols[name] for name in names]
        groups: dict[tuple[int, ...], list] = {}
        for term, coefficient in a.as_coefficients_dict().items():
            if coefficient == 0:    # symengine lists a zero constant term
                continue
            number, powers = self._factors(term)
            key = tuple(powers.pop(symbol, 0) for symbol in wanted)
            rest = m.Mul(coefficient * number, *[base**e for base, e in powers.items()])
            groups.setdefault(key, []).append(rest)
        return {key: m.Add(*parts) for key, parts in groups.items()}

    def d_dr(self, a):
        return self.module.diff(a, self.symbols["r"])

    def partial(self, a, name: str):
        return self.module.diff(a, self.symbols[name])

    def divide_by(self, a, name: str):
        return self.module.expand(a / self.symbols[name])


class DictAlgebra:
    """Pure Python: {exponent tuple over CANONICAL: Fraction}, r Laurent, rules on products."""

    name = "python"
    _I, _DELTA, _R, _NU = (_POSITION[n] for n in ("I", "delta", "r", "nu"))

    def reset(self) -> None:
        """Nothing to clear."""

    def from_engine(self, value: ExactPolynomial) -> dict:
        return engine_to_canonical(value)

    def to_canonical(self, value: dict) -> Canonical:
        return dict(value)

    def constant(self, value: Fraction) -> dict:
        return {(0,) * len(CANONICAL): Fraction(value)} if value else {}

    def generator(self, name: str) -> dict:
        exponents = [0] * len(CANONICAL)
        exponents[_POSITION[name]] = 1
        return {tuple(exponents): Fraction(1)}

    def add(self, a: dict, b: dict) -> dict:
        out = dict(a)
        for e, c in b.items():
            total = out.get(e, 0) + c
            if total:
                out[e] = total
            else:
                out.pop(e, None)
        return out

    def _accumulate(self, out: dict, e: tuple, c: Fraction) -> None:
        if e[self._I] >= 2 or e[self._DELTA] >= 2:
            e = list(e)
            k = e[self._I]
            if k >= 2:
                e[self._I] = k % 2
                if (k // 2) % 2:
                    c = -c
            k = e[self._DELTA]
            if k >= 2:
                e[self._DELTA] = k % 2
                half = k // 2
                nu = e[self._NU]
                # delta^(2 half) = (1 - 4 nu)^half
                for j in range(half + 1):
                    e[self._NU] = nu + j
                    key = tuple(e)
                    out[key] = out.get(key, 0) + c * math.comb(half, j) * (-4) ** j
                return
            e = tuple(e)
        out[e] = out.get(e, 0) + c

    def mul(self, a: dict, b: dict) -> dict:
        out: dict = {}
        add = operator.add
        for ea, ca in a.items():
            for eb, cb in b.items():
                self._accumulate(out, tuple(map(add, ea, eb)), ca * cb)
        return {e: c for e, c in out.items() if c}

    def scale(self, a: dict, number) -> dict:
        number = Fraction(number)
        return {e: c * number for e, c in a.items()} if number else {}

    def power(self, a: dict, exponent: int) -> dict:
        result = self.constant(Fraction(1))
        base = a
        while exponent:
            if exponent & 1:
                result = self.mul(result, base)
            exponent >>= 1
            if exponent:
                base = self.mul(base, base)
        return result

    def is_zero(self, a: dict) -> bool:
        return not a

    def has(self, a: dict, name: str) -> bool:
        k = _POSITION[name]
        return any(e[k] for e in a)

    def substitute(self, a: dict, values: dict[str, int]) -> dict:
        out: dict = {}
        positions = [(_POSITION[name], value) for name, value in values.items()]
        for e, c in a.items():
            e = list(e)
            for k, value in positions:
                if e[k]:
                    if value == 0:
                        break
                    c = c * Fraction(value) ** e[k]
                    e[k] = 0
            else:
                key = tuple(e)
                out[key] = out.get(key, 0) + c
        return {e: c for e, c in out.items() if c}

    def split(self, a: dict, names: tuple[str, ...]) -> dict[tuple[int, ...], dict]:
        positions = [_POSITION[name] for name in names]
        groups: dict[tuple[int, ...], dict] = {}
        for e, c in a.items():
            key = tuple(e[k] for k in positions)
            rest = list(e)
            for k in positions:
                rest[k] = 0
            groups.setdefault(key, {})[tuple(rest)] = c
        return groups

    def _derivative(self, a: dict, k: int) -> dict:
        out = {}
        for e, c in a.items():
            if e[k]:
                d = list(e)
                d[k] -= 1
                out[tuple(d)] = c * e[k]
        return out

    def d_dr(self, a: dict) -> dict:
        return self._derivative(a, self._R)

    def partial(self, a: dict, name: str) -> dict:
        return self._derivative(a, _POSITION[name])

    def divide_by(self, a: dict, name: str) -> dict:
        k = _POSITION[name]
        out = {}
        for e, c in a.items():
            if not e[k]:
                raise ValueError(f"not divisible by {name}")
            d = list(e)
            d[k] -= 1
            out[tuple(d)] = c
        return out


def candidate_algebras(names: list[str]) -> list[Any]:
    """The candidates asked for (symengine and sympy only when importable)."""
    out = []
    for name in names:
        if name == "engine":
            out.append(EngineAlgebra())
        elif name == "flint":
            out.append(FlintAlgebra())
        elif name == "python":
            out.append(DictAlgebra())
        elif name in ("symengine", "sympy"):
            try:
                module = __import__(name)
            except ImportError:
                print(f"{name} is not installed: left out")
                continue
            out.append(ExpressionAlgebra(module, name))
        else:
            raise ValueError(f"unknown candidate {name!r}")
    return out


# ----------------------------------------------------------------------------- series
# A truncated series is (terms: {doubled order: element}, known2), the same bookkeeping as
# stfalgebra.pnseries.PNSeries (orders above known2 dropped, zeros dropped).
Series = tuple[dict[int, Any], float]


def _series(alg, terms: dict[int, Any], known2: float) -> Series:
    return {k: v for k, v in terms.items() if k <= known2 and not alg.is_zero(v)}, known2


def _sum(alg, values: list[Any]) -> Any:
    total = values[0]
    for value in values[1:]:
        total = alg.add(total, value)
    return total


def series_add(alg, a: Series, b: Series) -> Series:
    known2 = min(a[1], b[1])
    pieces: dict[int, list] = {}
    for k, v in list(a[0].items()) + list(b[0].items()):
        if k <= known2:
            pieces.setdefault(k, []).append(v)
    return _series(alg, {k: _sum(alg, v) for k, v in pieces.items()}, known2)


def series_scale(alg, a: Series, factor: Any) -> Series:
    if alg.is_zero(factor):
        return {}, math.inf
    return _series(alg, {k: alg.mul(factor, v) for k, v in a[0].items()}, a[1])


def _lead2(a: Series) -> float:
    return min(a[0]) if a[0] else a[1] + 1


def series_mul(alg, a: Series, b: Series) -> Series:
    known2 = min(_lead2(a) + b[1], _lead2(b) + a[1])
    pieces: dict[int, list] = {}
    for ka, va in sorted(a[0].items()):
        for kb, vb in sorted(b[0].items()):
            if ka + kb <= known2:
                pieces.setdefault(ka + kb, []).append(alg.mul(va, vb))
    return _series(alg, {k: _sum(alg, v) for k, v in pieces.items()}, known2)


def series_power(alg, a: Series, p: int) -> Series:
    """a^p for an integer p, leading coefficient 1 at order 0 (the series g(x) = gamma/x):
    repeated products for p > 0, J. C. P. Miller's recurrence for p < 0 (as PNSeries.power)."""
    if p == 0:
        return {0: alg.constant(Fraction(1))}, math.inf
    if p > 0:
        result = a
        for _ in range(p - 1):
            result = series_mul(alg, result, a)
        return result
    terms = sorted(a[0].items())
    if terms[0][0] != 0:
        raise ValueError("series_power expects a series starting at order 0 with coefficient 1")
    relative = dict(terms[1:])
    known2 = a[1]
    top = int(known2)
    g = [alg.constant(Fraction(1))] + [None] * top
    for n in range(1, top + 1):
        acc = [alg.scale(alg.mul(fk, g[n - k]), (p + 1) * k - n)
               for k, fk in relative.items() if k <= n and g[n - k] is not None]
        g[n] = alg.scale(_sum(alg, acc), Fraction(1, n)) if acc else None
    return _series(alg, {n: gn for n, gn in enumerate(g) if gn is not None}, known2)


def series_shift(a: Series, s2: int) -> Series:
    return {k + s2: v for k, v in a[0].items()}, a[1] + s2


def series_truncate(alg, a: Series, k2: float) -> Series:
    if k2 > a[1]:
        raise ValueError(f"truncation at doubled order {k2} beyond the known {a[1]}")
    return _series(alg, dict(a[0]), k2)


# ----------------------------------------------------------------------------- workload (a)
def mass_ratio_factors(alg, l: int) -> list[Any]:
    """sum_A m_A s_A^n for n = l - 1, l, l + 2 and sum_A m_A (m_B/m) s_A^l (s_1 = X2, s_2 = -X1),
    as ``moments.point_particles`` forms them for the 1PN moments of rank l."""
    half = Fraction(1, 2)
    delta, m = alg.generator("delta"), alg.generator("m")
    x1 = alg.add(alg.constant(half), alg.scale(delta, half))
    x2 = alg.add(alg.constant(half), alg.scale(delta, -half))
    minus_x1 = alg.scale(x1, -1)
    out = [alg.mul(m, alg.add(alg.mul(x1, alg.power(x2, n)), alg.mul(x2, alg.power(minus_x1, n))))
           for n in (l - 1, l, l + 2)]
    out.append(alg.mul(alg.mul(alg.mul(m, x1), x2), alg.add(alg.power(x2, l), alg.power(minus_x1, l))))
    return out


def _multinomial(alg, components: tuple, exponent: int) -> dict:
    """(A+ Z+ + A- Z- + Az uz)^e as {(p, q, c): coefficient} (moments.orbit_tensor)."""
    plus, minus, z = components
    out = {}
    for i in range(exponent + 1):
        if i and alg.is_zero(plus):
            break
        for j in range(exponent - i + 1):
            if j and alg.is_zero(minus):
                break
            k = exponent - i - j
            if k and alg.is_zero(z):
                continue
            weight = math.factorial(exponent) // (math.factorial(i) * math.factorial(j) * math.factorial(k))
            out[(i, j, k)] = alg.scale(alg.mul(alg.mul(alg.power(plus, i), alg.power(minus, j)),
                                               alg.power(z, k)), weight)
    return out


def _channel_factor(alg, components: list[tuple], key: tuple, p: int, q: int, c: int) -> Any:
    """Coefficient of Z+^p Z-^q u_z^c in prod_i (V_i.k)^(key_i) on the circular orbit."""
    partial = {(0, 0, 0): alg.constant(Fraction(1))}
    for vector, exponent in zip(components, key):
        if not exponent:
            continue
        vector = tuple(alg.substitute(v, {"rdot": 0}) for v in vector)
        expansion = _multinomial(alg, vector, exponent)
        updated: dict = {}
        for (a1, b1, c1), v1 in partial.items():
            for (a2, b2, c2), v2 in expansion.items():
                target = (a1 + a2, b1 + b2, c1 + c2)
                if target[0] > p or target[1] > q or target[2] > c:
                    continue
                product = alg.mul(v1, v2)
                updated[target] = alg.add(updated[target], product) if target in updated else product
        partial = updated
    return partial.get((p, q, c), alg.constant(Fraction(0)))


def _on_circular_orbit(alg, series: Series, g: Series) -> Series:
    """G = m = 1, rdot = 0, phidot = x^(3/2), r = 1/(x g(x)) (binary.circular_frequency)."""
    groups: dict[tuple[int, int], Any] = {}
    shifts = set()
    for k2, value in series[0].items():
        value = alg.substitute(alg.substitute(value, {"G": 1, "m": 1}), {"rdot": 0})
        for (j, p), rest in alg.split(value, ("phidot", "r")).items():
            order2 = 3 * j - 2 * p
            shifts.add(order2 - k2)
            key = (order2, p)
            groups[key] = alg.add(groups[key], rest) if key in groups else rest
    if len(shifts) != 1:
        raise ValueError(f"series is not dimensionally homogeneous: x-weights {sorted(shifts)}")
    (shift2,) = shifts
    total: Series = ({}, math.inf)
    powers: dict[int, Series] = {}
    for (order2, p), coefficient in groups.items():
        if alg.is_zero(coefficient):
            continue
        if p not in powers:
            powers[p] = series_power(alg, g, -p)
        total = series_add(alg, total, series_shift(series_scale(alg, powers[p], coefficient), order2))
    return series_truncate(alg, total, min(total[1], series[1] + shift2))


def circular_mode(alg, inputs: dict, m: int) -> Series:
    """Hhat_lm / (its surd constant) through relative 1PN, circular orbit, from the 1PN source
    moment (modes._direct_amplitude with the instantaneous row)."""
    l = inputs["l"]
    p, q, c = inputs["channels"][m]
    tensor = inputs["moments"][c]
    total = None
    for key, series in tensor:
        factor = _channel_factor(alg, inputs["components"], key, p, q, c)
        if alg.is_zero(factor):
            continue
        piece = series_scale(alg, series, factor)
        total = piece if total is None else series_add(alg, total, piece)
    if total is None:
        total = ({}, min(series[1] for _, series in tensor))
    rotation = alg.mul(alg.scale(alg.generator("I"), -m), alg.generator("phidot"))
    channel = series_truncate(alg, series_scale(alg, total, alg.power(rotation, l)), 2)
    if c:   # current modes: the factor i of -(i/c) V_lm
        channel = series_scale(alg, channel, alg.generator("I"))
    result = series_shift(_on_circular_orbit(alg, channel, inputs["g"]), -2)
    result = _series(alg, {k: alg.divide_by(v, "nu") for k, v in result[0].items()}, result[1])
    return series_truncate(alg, result, inputs["top2"][m])


def circular_workload(alg, inputs: dict) -> tuple[list, dict]:
    factors = mass_ratio_factors(alg, inputs["l"])
    return factors, {m: circular_mode(alg, inputs, m) for m in inputs["channels"]}


def circular_inputs(l: int) -> dict:
    """The engine inputs of workload (a) for rank l, and the package's results to check against."""
    from stfalgebra.binary.circular_frequency import gamma_over_x
    from stfalgebra.moments.orbit_tensor import PLANAR_BASIS
    from stfalgebra.radiative.contributions import leading_order
    from stfalgebra.radiative.projection import mode_channel
    from stfalgebra.radiative.radiative_moments import _source_moment

    channels = {m: mode_channel(l, m) for m in range(1, l + 1)}
    moments = {c: [(key, (dict(s._terms), s._known2)) for key, s in _source_moment(l, c, 1, True).terms.items()]
               for c in {c for _, _, c in channels.values()}}
    g = gamma_over_x(1)
    return {"l": l, "channels": channels, "moments": moments,
            "components": [tuple(v) for v in PLANAR_BASIS.components],
            "g": (dict(g._terms), g._known2),
            "top2": {m: 2 * leading_order(l, m) + 2 for m in channels}}


def convert_circular(alg, inputs: dict) -> dict:
    def series(s):
        return {k: alg.from_engine(v) for k, v in s[0].items()}, s[1]

    out = dict(inputs)
    out["moments"] = {c: [(key, series(s)) for key, s in tensor] for c, tensor in inputs["moments"].items()}
    out["components"] = [tuple(alg.from_engine(v) for v in vector) for vector in inputs["components"]]
    out["g"] = series(inputs["g"])
    return out


def circular_reference(l: int) -> tuple[list, dict]:
    """The package's own results for rank l: mass-ratio factors and the mode series."""
    from stfalgebra.moments.point_particles import companion_weighted_sum, position_factor_sum
    from stfalgebra.radiative.modes import _direct_amplitude

    factors = [position_factor_sum(n) for n in (l - 1, l, l + 2)] + [companion_weighted_sum(l)]
    modes = {}
    for m in range(1, l + 1):
        series = _direct_amplitude(l, m, "circular", PNOrder(1), "review", "psi")[1]
        modes[m] = (dict(series._terms), series._known2)
    return factors, modes


def package_circular(l: int) -> None:
    """The package's own path for the modes of rank l (caches of the stage cleared)."""
    from stfalgebra.moments import orbit_tensor
    from stfalgebra.radiative import modes, radiative_moments

    modes._direct_amplitude.cache_clear()
    radiative_moments._instantaneous.cache_clear()
    radiative_moments.source_channel.cache_clear()
    orbit_tensor._CHANNEL_CACHE.clear()
    for m in range(1, l + 1):
        modes._direct_amplitude(l, m, "circular", PNOrder(1), "review", "psi")


# ----------------------------------------------------------------------------- workload (b)
_VELOCITY_RATES = ("rdot", "phidot")


def _coefficient_derivative(alg, value: Any, rates: dict[str, dict[int, Any]]) -> list[tuple[int, Any]]:
    """d/dt of one coefficient: (doubled order offset, value) (binary.orbit_derivative)."""
    pieces: dict[int, Any] = {}

    def add(k: int, v: Any) -> None:
        pieces[k] = alg.add(pieces[k], v) if k in pieces else v

    if alg.has(value, "r"):
        add(0, alg.mul(alg.d_dr(value), alg.generator("rdot")))
    for name in _VELOCITY_RATES:
        if alg.has(value, name):
            partial = alg.partial(value, name)
            for k, rate in rates[name].items():
                add(k, alg.mul(partial, rate))
    return [(k, v) for k, v in sorted(pieces.items()) if not alg.is_zero(v)]


def orbit_derivative(alg, series: Series, rates: dict, known_through2: int) -> Series:
    known2 = series[1]
    for k2, value in sorted(series[0].items()):
        if alg.has(value, "rdot") or alg.has(value, "phidot"):
            known2 = min(known2, k2 + known_through2)
            break
    pieces: dict[int, list] = {}
    for k2, value in sorted(series[0].items()):
        for offset, piece in _coefficient_derivative(alg, value, rates):
            if k2 + offset <= known2:
                pieces.setdefault(k2 + offset, []).append(piece)
    return _series(alg, {k: _sum(alg, v) for k, v in pieces.items()}, known2)


def general_mode(alg, inputs: dict, m: int) -> Series:
    """The l-fold (d/dt - i m phidot) of the 1PN channel of mode (l, m) along the 1PN orbit."""
    value = inputs["channels"][m]
    rotation = alg.mul(alg.scale(alg.generator("I"), -m), alg.generator("phidot"))
    for _ in range(inputs["l"]):
        value = series_add(alg, orbit_derivative(alg, value, inputs["rates"], inputs["known_through2"]),
                           series_scale(alg, value, rotation))
    return value


def general_workload(alg, inputs: dict) -> dict:
    return {m: general_mode(alg, inputs, m) for m in inputs["channels"]}


def general_inputs(l: int) -> dict:
    from stfalgebra.binary.cited_inputs import known_through
    from stfalgebra.binary.orbit_derivative import _rates
    from stfalgebra.radiative.radiative_moments import source_channel

    rdot_rate, phidot_rate = _rates(1)
    channels = {}
    for m in range(1, l + 1):
        s = source_channel(l, m, 1)
        channels[m] = (dict(s._terms), s._known2)
    return {"l": l, "channels": channels, "rates": {"rdot": rdot_rate, "phidot": phidot_rate},
            "known_through2": known_through(1).twice}


def convert_general(alg, inputs: dict) -> dict:
    out = dict(inputs)
    out["channels"] = {m: ({k: alg.from_engine(v) for k, v in s[0].items()}, s[1])
                       for m, s in inputs["channels"].items()}
    out["rates"] = {name: {k: alg.from_engine(v) for k, v in rates.items()}
                    for name, rates in inputs["rates"].items()}
    return out


def general_reference(l: int) -> dict:
    from stfalgebra.radiative.radiative_moments import _instantaneous

    out = {}
    for m in range(1, l + 1):
        s = _instantaneous(l, m, 1, 1, "general")
        out[m] = (dict(s._terms), s._known2)
    return out


def package_general(l: int) -> None:
    from stfalgebra.binary import orbit_derivative
    from stfalgebra.radiative import radiative_moments

    radiative_moments._instantaneous.cache_clear()
    orbit_derivative.clear_caches()
    for m in range(1, l + 1):
        radiative_moments._instantaneous(l, m, 1, 1, "general")


# ----------------------------------------------------------------------------- comparison
def _canonical_series(alg, series: Series) -> tuple:
    return ({k: alg.to_canonical(v) for k, v in series[0].items()}, series[1])


def canonical_result(alg, result: Any) -> Any:
    """Results of a workload in the canonical form (comparable across libraries)."""
    if isinstance(result, tuple) and len(result) == 2 and isinstance(result[0], list):
        factors, modes = result
        return ([alg.to_canonical(f) for f in factors],
                {m: _canonical_series(alg, s) for m, s in modes.items()})
    return {m: _canonical_series(alg, s) for m, s in result.items()}


def _engine_series(series: tuple) -> tuple:
    return ({k: engine_to_canonical(v) for k, v in series[0].items()}, series[1])


def _timed(function: Callable[[], Any], repeats: int, budget: float = math.inf,
           prepare: Callable[[], Any] | None = None) -> tuple[float, float, Any]:
    """Median CPU and wall time of ``repeats`` calls (garbage collected before each when
    repeated; ``prepare`` runs untimed before each); a single call when the first one takes
    more than ``budget`` CPU seconds."""
    cpu_times, wall_times = [], []
    result = None
    for _ in range(max(1, repeats)):
        if prepare is not None:
            prepare()
        if repeats > 1:
            gc.collect()
        wall, cpu = time.perf_counter(), time.process_time()
        result = function()
        cpu_times.append(time.process_time() - cpu)
        wall_times.append(time.perf_counter() - wall)
        if cpu_times[0] > budget:
            break
    return statistics.median(cpu_times), statistics.median(wall_times), result


def _size(result: Any) -> int:
    """Total number of terms of a canonical result."""
    if isinstance(result, tuple) and isinstance(result[0], list):
        return sum(len(f) for f in result[0]) + _size(result[1])
    return sum(len(c) for series, _ in result.values() for c in series.values())


def run_workload(kind: str, l: int, algebras: list, repeats: int, budget: float, over: set[str]) -> dict:
    """Time workload ``kind`` ("circular" or "general") at rank l on every candidate."""
    if kind == "circular":
        inputs, convert, work = circular_inputs(l), convert_circular, circular_workload
        factors, modes = circular_reference(l)
        reference = ([engine_to_canonical(f) for f in factors], {m: _engine_series(s) for m, s in modes.items()})
        package = package_circular
    else:
        inputs, convert, work = general_inputs(l), convert_general, general_workload
        reference = {m: _engine_series(s) for m, s in general_reference(l).items()}
        package = package_general
    figures: dict = {"l": l, "modes": l, "candidates": {}}
    cpu, wall, _ = _timed(lambda: package(l), repeats)
    figures["package"] = {"cpu": cpu, "wall": wall}
    for alg in algebras:
        if alg.name in over:
            figures["candidates"][alg.name] = {"skipped": True}
            continue
        converted = convert(alg, inputs)
        cpu, wall, result = _timed(lambda: work(alg, converted), repeats, budget, prepare=alg.reset)
        canonical = canonical_result(alg, result)
        entry = {"cpu": cpu, "wall": wall, "identical": canonical == reference}
        if alg.name == "engine":
            figures["terms"] = _size(canonical)
        figures["candidates"][alg.name] = entry
        if cpu > budget:
            over.add(alg.name)
    return figures


def _print_case(kind: str, figures: dict, names: list[str]) -> None:
    engine = figures["candidates"].get("engine", {})
    parts = [f"{kind} l={figures['l']:2d} ({figures['modes']} modes, {figures.get('terms', '?')} result terms):"]
    parts.append(f"package {format_seconds(figures['package']['cpu'])}")
    for name in names:
        entry = figures["candidates"].get(name)
        if entry is None:
            continue
        if entry.get("skipped"):
            parts.append(f"{name} skipped (over budget at a smaller l)")
            continue
        ratio = (f" = {entry['cpu'] / engine['cpu']:.1f}x engine"
                 if name != "engine" and engine.get("cpu") else "")
        same = "" if entry["identical"] else " RESULT DIFFERS"
        parts.append(f"{name} {format_seconds(entry['cpu'])} (wall {format_seconds(entry['wall'])}){ratio}{same}")
    print(" | ".join(parts), flush=True)


def main(argv: list[str] | None = None) -> dict:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--circular", type=int, nargs="*", default=[4, 8, 12, 16], help="l of workload (a)")
    parser.add_argument("--general", type=int, nargs="*", default=[4, 8, 12], help="l of workload (b)")
    parser.add_argument("--candidates", nargs="*", default=["engine", "flint", "symengine", "python", "sympy"],
                        help="libraries to compare (engine, flint, symengine, sympy, python)")
    parser.add_argument("--repeats", type=int, default=3, help="median of this many runs")
    parser.add_argument("--budget", type=float, default=5.0,
                        help="a candidate slower than this (CPU seconds) at one l is not run at larger l")
    parser.add_argument("--quick", action="store_true",
                        help="smoke run: l = 2, 3 circular and l = 2 general, one run, sympy left out")
    args = parser.parse_args(argv)
    if args.quick:
        args.circular, args.general, args.repeats = [2, 3], [2], 1
        if "sympy" in args.candidates:   # its adapter is symengine's; its start-up is slow
            args.candidates.remove("sympy")
    for line in describe_machine():
        print(line)
    print(f"python-flint {flint.__version__}; figures: median CPU of {args.repeats} run(s), this process; "
          "ratio = candidate / engine")
    algebras = candidate_algebras(args.candidates)
    names = [alg.name for alg in algebras]
    out: dict = {"circular": [], "general": []}
    for kind, ls in (("circular", args.circular), ("general", args.general)):
        over: set[str] = set()
        for l in sorted(ls):
            figures = run_workload(kind, l, algebras, args.repeats, args.budget, over)
            out[kind].append(figures)
            _print_case(kind, figures, names)
        print(f"[{load_note()}]", flush=True)
    out["all_identical"] = all(entry.get("identical", True) for cases in (out["circular"], out["general"])
                               for case in cases for entry in case["candidates"].values())
    print(f"every candidate's result identical to the package's: {out['all_identical']}")
    return out


if __name__ == "__main__":
    main()
