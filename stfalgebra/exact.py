"""The exact coefficient engine: polynomials over the rationals in the symbols of PN algebra.

Every coefficient the derivation pipeline produces (of a source moment, a radiative moment, a
mode amplitude, a flux) is a polynomial with rational coefficients in

- the binary's symbols: ``nu``, ``delta`` and, on general orbits, ``r``, ``1/r``, ``rdot``,
  ``phidot`` (with ``G``, ``m`` and the ADM mass ``M``), on circular orbits ``omega``; later the
  spin variables ``chi1``, ``chi2``;
- the transcendental constants that occur, each an independent generator: ``pi``,
  ``EulerGamma``, ``zeta(3)``, the logarithms of the primes up to 97, ``log(x)``, ``log(x0)``
  (``x0 = (G m omega_0/c^3)^(2/3)``, the reference of the phase psi) and the logarithm of the
  tail constant ``log(b)``;
- the imaginary unit ``I``.

:class:`ExactPolynomial` holds such a polynomial in a python-flint ``fmpq_mpoly`` and keeps it
in a canonical normal form, so that equality and hashing are structural:

- ``I**2 = -1``, ``delta**2 = 1 - 4 nu`` and ``r * (1/r) = 1`` are applied on construction:
  the three relations form a Groebner basis (their leading monomials ``I^2``, ``delta^2`` and
  ``r rinv`` are coprime in the lexicographic order with ``I > delta > r > rinv > ...``), so the
  remainder of a multivariate division by them is unique;
- the transcendental generators are treated as algebraically independent (common practice:
  pi, Euler's constant and the logarithms of distinct primes are not known to satisfy any
  polynomial relation, and no PN result relies on one).

Square roots of rationals (the sqrt(15/14) of a mode amplitude) are never inside the
polynomial: a result carries one exact constant beside it (:class:`SurdConstant`).

sympy is imported only when a conversion to or from a sympy expression is asked for
(:meth:`ExactPolynomial.to_sympy`, :meth:`ExactPolynomial.from_sympy`): the derivation
pipeline runs and prints without it.
"""

from __future__ import annotations

from fractions import Fraction
from functools import lru_cache
from types import SimpleNamespace
from typing import Any, Iterable, Mapping

import flint

__all__ = [
    "ExactPolynomial", "SurdConstant", "GENERATORS", "PRIMES_WITH_LOGARITHMS", "exact",
    "log_of_rational", "NotRepresentableError", "engine_symbols",
]

#: Primes whose logarithms are generators (ln of any rational built from them is exact).
PRIMES_WITH_LOGARITHMS = (2, 3, 5, 7, 11, 13, 17, 19, 23, 29, 31, 37, 41, 43, 47, 53, 59, 61,
                          67, 71, 73, 79, 83, 89, 97)

# (generator name, sympy spelling). Lexicographic order: the three generators with a
# reduction rule come first (see the module docstring); the rest in the order results print.
_GENERATOR_TABLE: tuple[tuple[str, str], ...] = (
    ("I", "I"),
    ("delta", "delta"),
    ("r", "r"),
    ("rinv", "1/r"),
    ("nu", "nu"),
    ("chi1", "chi1"),
    ("chi2", "chi2"),
    # spins of any direction: components on the instantaneous (n, lambda, ell) triad
    *((f"chi{a}_{k}", f"chi{a}_{k}") for a in (1, 2) for k in ("n", "lambda", "ell")),
    ("G", "G"),
    ("m", "m"),
    ("M", "M"),
    ("rdot", "rdot"),
    ("phidot", "phidot"),
    ("omega", "omega"),
    ("x", "x"),
    ("et", "et"),
    ("pi", "pi"),
    ("EulerGamma", "EulerGamma"),
    ("zeta3", "zeta(3)"),
    *((f"log{p}", f"log({p})") for p in PRIMES_WITH_LOGARITHMS),
    ("log_x", "log(x)"),
    ("log_x0", "log(x0)"),
    ("log_b", "log(b)"),
)

#: Generator names in their lexicographic order.
GENERATORS: tuple[str, ...] = tuple(name for name, _ in _GENERATOR_TABLE)
_INDEX = {name: k for k, name in enumerate(GENERATORS)}
_SPELLING = dict(_GENERATOR_TABLE)
_CONTEXT = flint.fmpq_mpoly_ctx.get(GENERATORS, "lex")
_GENS = dict(zip(GENERATORS, _CONTEXT.gens()))
_ZERO = _CONTEXT.constant(0)
_ONE = _CONTEXT.constant(1)

# flags: which reduction rules a polynomial may need when multiplied (conservative)
_HAS_I, _HAS_DELTA, _HAS_R, _HAS_RINV = 1, 2, 4, 8
_FLAG_OF = {"I": _HAS_I, "delta": _HAS_DELTA, "r": _HAS_R, "rinv": _HAS_RINV}
_RULE_I = _GENS["I"] ** 2 + 1
_RULE_DELTA = _GENS["delta"] ** 2 - 1 + 4 * _GENS["nu"]
_RULE_R = _GENS["r"] * _GENS["rinv"] - 1


class NotRepresentableError(ValueError):
    """An expression lies outside the engine's polynomial ring (a function of a symbol, a
    square root inside a sum, a symbol that is not a generator)."""


def _flags_of(poly: flint.fmpq_mpoly) -> int:
    if poly.is_constant():
        return 0
    degrees = poly.degrees()
    flags = 0
    for name, flag in _FLAG_OF.items():
        if degrees[_INDEX[name]] > 0:
            flags |= flag
    return flags


def _reduce(poly: flint.fmpq_mpoly, flags: int) -> flint.fmpq_mpoly:
    """Normal form modulo I^2 + 1, delta^2 - (1 - 4 nu), r rinv - 1 (``flags`` says which
    rules can apply)."""
    if flags & _HAS_I:
        poly = divmod(poly, _RULE_I)[1]
    if flags & _HAS_DELTA:
        poly = divmod(poly, _RULE_DELTA)[1]
    if flags & _HAS_R and flags & _HAS_RINV:
        poly = divmod(poly, _RULE_R)[1]
    return poly


def _as_fmpq(value: Any) -> flint.fmpq | None:
    """An exact rational from an int, Fraction, fmpq or sympy Rational; None otherwise."""
    if isinstance(value, bool):
        return None
    if isinstance(value, int):
        return flint.fmpq(value)
    if isinstance(value, Fraction):
        return flint.fmpq(value.numerator, value.denominator)
    if isinstance(value, flint.fmpq):
        return value
    if isinstance(value, flint.fmpz):
        return flint.fmpq(value)
    if getattr(value, "is_Rational", False) and isinstance(getattr(value, "p", None), int):
        return flint.fmpq(value.p, value.q)
    return None


def _is_sympy(value: Any) -> bool:
    return type(value).__module__.startswith("sympy")


class ExactPolynomial:
    """An exact polynomial over Q in the PN generators, in canonical normal form.

    Build one from a generator name, a rational or a sympy expression; combine with ``+``,
    ``-``, ``*``, ``**`` (integer powers; negative powers of monomials in ``r``, ``1/r`` and of
    rational constants), and division by non-zero rationals or by exact divisors.

    Parameters
    ----------
    value:
        A generator name (``"nu"``), an int, a Fraction, or a sympy Rational. Use
        :meth:`from_sympy` for expressions.

    **Conventions**: ``I**2 = -1``, ``delta**2 = 1 - 4 nu`` (delta = (m1 - m2)/m, nu = m1 m2/m^2),
    ``r * rinv = 1``; every generator except ``I`` is real (used by :meth:`conjugate`).
    Equality is structural on the normal form; combining with a sympy object converts this
    polynomial to sympy first.

    Example
    -------
    >>> from stfalgebra.exact import exact
    >>> delta, nu = exact("delta"), exact("nu")
    >>> delta**2
    1 - 4*nu
    >>> (exact("I") * delta)**2 + 1 == 4*nu
    True
    >>> str((1 + exact("I"))**3)
    '-2 + 2*I'

    References
    ----------
    python-flint ``fmpq_mpoly`` (FLINT multivariate polynomials over Q); Groebner normal
    forms (common practice; Buchberger's first criterion for coprime leading monomials).
    """

    __slots__ = ("_poly", "_flags", "_hash")

    def __init__(self, value: Any = 0) -> None:
        if isinstance(value, str):
            if value not in _INDEX:
                raise ValueError(f"{value!r} is not a generator of the exact engine")
            self._set(_GENS[value], _FLAG_OF.get(value, 0))
            return
        number = _as_fmpq(value)
        if number is None:
            raise TypeError(f"ExactPolynomial() takes a generator name or an exact rational, got {value!r}")
        self._set(_CONTEXT.constant(number), 0)

    def _set(self, poly: flint.fmpq_mpoly, flags: int) -> None:
        self._poly = poly
        self._flags = flags
        self._hash = None

    @classmethod
    def _trusted(cls, poly: flint.fmpq_mpoly, flags: int) -> "ExactPolynomial":
        """Wrap a polynomial already in normal form (hot paths; nothing checked)."""
        obj = cls.__new__(cls)
        obj._poly = poly
        obj._flags = flags
        obj._hash = None
        return obj

    @classmethod
    def _normalised(cls, poly: flint.fmpq_mpoly, flags: int) -> "ExactPolynomial":
        return cls._trusted(_reduce(poly, flags), flags)

    # -- views ----------------------------------------------------------------------------
    @property
    def poly(self) -> flint.fmpq_mpoly:
        """The underlying ``fmpq_mpoly`` (normal form; do not mutate)."""
        return self._poly

    def is_zero(self) -> bool:
        """True for the zero polynomial (structural: the normal form is unique)."""
        return self._poly.is_zero()

    def is_constant(self) -> bool:
        """True when no generator occurs (a rational number)."""
        return self._poly.is_constant()

    def constant_value(self) -> Fraction:
        """The rational value of a constant polynomial (ValueError otherwise)."""
        if not self._poly.is_constant():
            raise ValueError(f"{self} is not a rational constant")
        value = self._poly.leading_coefficient() if not self._poly.is_zero() else flint.fmpq(0)
        return Fraction(int(value.p), int(value.q))

    def generators(self) -> tuple[str, ...]:
        """Names of the generators that occur, in the engine's order."""
        if self._poly.is_constant():
            return ()
        return tuple(name for name, degree in zip(GENERATORS, self._poly.degrees()) if degree)

    def has(self, *names: str) -> bool:
        """True when any of the named generators occurs."""
        if self._poly.is_constant():
            return False
        degrees = self._poly.degrees()
        return any(degrees[_INDEX[name]] for name in names)

    def degree(self, name: str) -> int:
        """Highest power of a generator (0 if absent)."""
        if self._poly.is_zero():
            return 0
        return self._poly.degrees()[_INDEX[name]]

    def __len__(self) -> int:
        return len(self._poly)

    def terms(self) -> Iterable[tuple[dict[str, int], Fraction]]:
        """The terms as ({generator: exponent}, rational), in the engine's order."""
        for exponents, coefficient in self._poly.to_dict().items():
            yield ({GENERATORS[k]: int(e) for k, e in enumerate(exponents) if e},
                   Fraction(int(coefficient.p), int(coefficient.q)))

    # -- conversions -------------------------------------------------------------------------
    @classmethod
    def from_sympy(cls, expr: Any) -> "ExactPolynomial":
        """Convert a sympy expression polynomial in the generators (NotRepresentableError if not).

        Accepted: sums and products of rationals, the engine's symbols (by name), ``I``,
        ``pi``, ``EulerGamma``, ``zeta(3)``, logarithms of positive rationals (split over the
        primes) and of ``x`` and ``b``, integer powers (negative ones of ``r`` and of
        rational constants only).
        """
        return _from_sympy(expr)

    def to_sympy(self) -> Any:
        """The same polynomial as an expanded sympy expression."""
        import sympy as sp

        symbols = _sympy_generators()
        return sp.Add(*[sp.Rational(coefficient.numerator, coefficient.denominator)
                        * sp.Mul(*[symbols[name] ** e for name, e in monomial.items()])
                        for monomial, coefficient in self.terms()])

    def _sympy_(self) -> Any:
        return self.to_sympy()

    def to_text(self) -> str:
        """sympy-parseable text of the normal form (no sympy needed to print it)."""
        return _format_polynomial(self)

    def to_latex(self) -> str:
        r"""LaTeX of the normal form (``\nu``, ``\delta``, ``\pi``, ``\gamma_E``, ``\ln 2``, ``i``),
        made without sympy.

        Example
        -------
        >>> print((exact("nu") * Fraction(-3, 4) + exact("I") * exact("log2")).to_latex())
        - \frac{3}{4} \nu + i \ln 2
        """
        return _latex_polynomial(self)

    __str__ = to_text

    def __repr__(self) -> str:
        return self.to_text()

    # -- arithmetic ---------------------------------------------------------------------------
    def _coerce(self, other: Any) -> "ExactPolynomial | None":
        if isinstance(other, ExactPolynomial):
            return other
        number = _as_fmpq(other)
        if number is not None:
            return ExactPolynomial._trusted(_CONTEXT.constant(number), 0)
        return None

    def __add__(self, other: Any) -> Any:
        operand = self._coerce(other)
        if operand is None:
            return self.to_sympy() + other if _is_sympy(other) else NotImplemented
        return ExactPolynomial._trusted(self._poly + operand._poly, self._flags | operand._flags)

    __radd__ = __add__

    def __sub__(self, other: Any) -> Any:
        operand = self._coerce(other)
        if operand is None:
            return self.to_sympy() - other if _is_sympy(other) else NotImplemented
        return ExactPolynomial._trusted(self._poly - operand._poly, self._flags | operand._flags)

    def __rsub__(self, other: Any) -> Any:
        operand = self._coerce(other)
        if operand is None:
            return other - self.to_sympy() if _is_sympy(other) else NotImplemented
        return ExactPolynomial._trusted(operand._poly - self._poly, self._flags | operand._flags)

    def __neg__(self) -> "ExactPolynomial":
        return ExactPolynomial._trusted(-self._poly, self._flags)

    def __pos__(self) -> "ExactPolynomial":
        return self

    def __mul__(self, other: Any) -> Any:
        if isinstance(other, ExactPolynomial):
            a, b = self._flags, other._flags
            need = (a & b & (_HAS_I | _HAS_DELTA)) | (
                (_HAS_R | _HAS_RINV) if (a & _HAS_R and b & _HAS_RINV) or (a & _HAS_RINV and b & _HAS_R) else 0)
            product = self._poly * other._poly
            return ExactPolynomial._trusted(_reduce(product, need) if need else product, a | b)
        number = _as_fmpq(other)
        if number is not None:
            return ExactPolynomial._trusted(self._poly * number, self._flags)
        return self.to_sympy() * other if _is_sympy(other) else NotImplemented

    __rmul__ = __mul__

    def __truediv__(self, other: Any) -> Any:
        number = _as_fmpq(other)
        if number is None and isinstance(other, ExactPolynomial) and other.is_constant():
            number = _as_fmpq(other.constant_value())
        if number is not None:
            if number == 0:
                raise ZeroDivisionError(f"division of {self} by zero")
            return ExactPolynomial._trusted(self._poly / number, self._flags)
        if isinstance(other, ExactPolynomial):
            inverse = other._monomial_inverse()
            if inverse is not None:
                return self * inverse
            try:
                quotient = self._poly / other._poly
            except Exception as exc:
                raise ValueError(f"{self} is not divisible by {other} in the engine's ring") from exc
            return ExactPolynomial._normalised(quotient, self._flags | other._flags)
        return self.to_sympy() / other if _is_sympy(other) else NotImplemented

    def __rtruediv__(self, other: Any) -> Any:
        operand = self._coerce(other)
        if operand is None:
            return other / self.to_sympy() if _is_sympy(other) else NotImplemented
        return operand / self

    def _monomial_inverse(self) -> "ExactPolynomial | None":
        """1/self for a rational multiple of a power of r or of 1/r (the only invertible
        non-constant elements the pipeline divides by); None otherwise."""
        if len(self._poly) != 1:
            return None
        (exponents, coefficient), = self._poly.to_dict().items()
        rest = [e for k, e in enumerate(exponents) if k not in (_INDEX["r"], _INDEX["rinv"])]
        if any(rest):
            return None
        power = exponents[_INDEX["r"]] - exponents[_INDEX["rinv"]]
        base = _GENS["rinv"] ** power if power > 0 else _GENS["r"] ** (-power)
        return ExactPolynomial._trusted(base / coefficient, _HAS_RINV if power > 0 else (_HAS_R if power else 0))

    def __pow__(self, exponent: Any) -> "ExactPolynomial":
        if isinstance(exponent, bool) or not isinstance(exponent, int):
            number = _as_fmpq(exponent)
            if number is None or number.q != 1:
                raise TypeError(f"ExactPolynomial powers must be integers, got {exponent!r}")
            exponent = int(number.p)
        if exponent < 0:
            inverse = self._monomial_inverse()
            if inverse is None:
                if self.is_constant():
                    inverse = ExactPolynomial(1) / self
                else:
                    raise ValueError(f"negative power of {self}: only monomials in r and rationals invert")
            return inverse ** (-exponent)
        if exponent == 0:
            return ExactPolynomial._trusted(_ONE, 0)
        result = self._poly ** exponent
        return ExactPolynomial._normalised(result, self._flags) if self._flags else ExactPolynomial._trusted(result, 0)

    # -- operations -------------------------------------------------------------------------
    def conjugate(self) -> "ExactPolynomial":
        """Complex conjugate: ``I -> -I`` (every other generator is real)."""
        if not self._flags & _HAS_I:
            return self
        real = self._poly.subs({"I": 0})
        return ExactPolynomial._trusted(2 * real - self._poly, self._flags)

    def real_part(self) -> "ExactPolynomial":
        """The part free of ``I``."""
        if not self._flags & _HAS_I:
            return self
        return ExactPolynomial._trusted(self._poly.subs({"I": 0}), self._flags & ~_HAS_I)

    def imaginary_part(self) -> "ExactPolynomial":
        """The coefficient of ``I``."""
        if not self._flags & _HAS_I:
            return ExactPolynomial._trusted(_ZERO, 0)
        real = self._poly.subs({"I": 0})
        return ExactPolynomial._trusted((self._poly - real) / _GENS["I"], self._flags & ~_HAS_I)

    def derivative(self, name: str) -> "ExactPolynomial":
        """Partial derivative with respect to a generator (``rinv`` counts as its own
        generator; the chain rule for ``r`` is :meth:`derivative_in_r`)."""
        return ExactPolynomial._trusted(self._poly.derivative(name), self._flags)

    def derivative_in_r(self) -> "ExactPolynomial":
        """d/dr with ``rinv = 1/r``: d/dr + (-rinv^2) d/drinv."""
        result = self._poly.derivative("r")
        if self._flags & _HAS_RINV:
            result = result - _GENS["rinv"] ** 2 * self._poly.derivative("rinv")
        return ExactPolynomial._normalised(result, self._flags)

    def substitute(self, values: Mapping[str, Any]) -> "ExactPolynomial":
        """Replace generators by rationals or ExactPolynomials (all at once)."""
        numbers = {}
        polys = {}
        for name, value in values.items():
            if name not in _INDEX:
                raise ValueError(f"{name!r} is not a generator of the exact engine")
            number = _as_fmpq(value)
            if number is not None:
                numbers[name] = number
            elif isinstance(value, ExactPolynomial):
                polys[name] = value
            else:
                raise TypeError(f"substituted value for {name} must be exact, got {value!r}")
        poly, flags = self._poly, self._flags
        if numbers:
            poly = poly.subs(numbers)
        if polys:
            args = [polys[name]._poly if name in polys else _GENS[name] for name in GENERATORS]
            poly = poly.compose(*args)
            for name, value in polys.items():
                flags |= value._flags
            return ExactPolynomial._normalised(poly, flags)
        return ExactPolynomial._trusted(poly, flags)

    def coefficients_in(self, name: str) -> dict[int, "ExactPolynomial"]:
        """{k: coefficient of name**k} (each free of the generator)."""
        index = _INDEX[name]
        pieces: dict[int, dict] = {}
        for exponents, coefficient in self._poly.to_dict().items():
            k = exponents[index]
            rest = exponents[:index] + (0,) + exponents[index + 1:]
            pieces.setdefault(k, {})[rest] = coefficient
        return {k: ExactPolynomial._trusted(_CONTEXT.from_dict(d), self._flags) for k, d in sorted(pieces.items())}

    # -- equality ------------------------------------------------------------------------------
    def __eq__(self, other: Any) -> bool:
        if isinstance(other, ExactPolynomial):
            return self._poly == other._poly
        number = _as_fmpq(other)
        if number is not None:
            return self._poly == _CONTEXT.constant(number)
        if _is_sympy(other):
            try:
                return self._poly == _from_sympy(other)._poly
            except NotRepresentableError:
                return False
        return NotImplemented

    def __ne__(self, other: Any) -> bool:
        result = self.__eq__(other)
        return result if result is NotImplemented else not result

    def __hash__(self) -> int:
        if self._hash is None:
            if self._poly.is_constant():
                self._hash = hash(self.constant_value())
            else:
                # FLINT prints the normal form in C; hashing its text is cheaper than hashing
                # the exponent vectors and rationals one by one from Python
                self._hash = hash(self._poly.str())
        return self._hash

    def __bool__(self) -> bool:
        return not self._poly.is_zero()

    def __reduce__(self):
        return (_rebuild, (self._poly.to_dict(), self._flags))


def _rebuild(data: dict, flags: int) -> ExactPolynomial:
    return ExactPolynomial._trusted(_CONTEXT.from_dict(data), flags)


def exact(value: Any) -> ExactPolynomial:
    """Shorthand: a generator by name, a rational, or a sympy expression, as an ExactPolynomial.

    Example
    -------
    >>> exact("nu") * 3 + exact(1)
    1 + 3*nu
    """
    if isinstance(value, ExactPolynomial):
        return value
    if isinstance(value, str) or _as_fmpq(value) is not None:
        return ExactPolynomial(value)
    return ExactPolynomial.from_sympy(value)


@lru_cache(maxsize=1)
def engine_symbols() -> SimpleNamespace:
    """The binary's symbols as engine generators, for formulas written once for both algebras.

    A cited input (an equation of motion, a centre-of-mass relation) is a plain function of a
    namespace ``s`` with the attributes ``G, m, nu, delta, r, rdot, phidot, omega, x, I`` and
    ``s.q(p, q)`` for an exact rational; called with this namespace it yields exact
    polynomials, with :func:`stfalgebra.symbols.sympy_symbols` sympy expressions.

    Example
    -------
    >>> s = engine_symbols()
    >>> s.q(3, 2) * s.nu * s.r**-2
    3*nu*r**(-2)/2
    """
    names = ("G", "m", "nu", "delta", "r", "rdot", "phidot", "omega", "x", "I", "pi", "EulerGamma")
    return SimpleNamespace(q=Fraction, **{name: ExactPolynomial(name) for name in names})


def log_of_rational(value: Any) -> ExactPolynomial:
    """ln of a positive rational as a combination of the prime-logarithm generators.

    Example
    -------
    >>> log_of_rational(Fraction(3, 2))
    -log(2) + log(3)
    """
    number = _as_fmpq(value)
    if number is None or number <= 0:
        raise ValueError(f"log_of_rational needs a positive rational, got {value!r}")
    result = ExactPolynomial(0)
    for prime, power in _factor(int(number.p)).items():
        result = result + _prime_log(prime) * power
    for prime, power in _factor(int(number.q)).items():
        result = result - _prime_log(prime) * power
    return result


def _prime_log(prime: int) -> ExactPolynomial:
    name = f"log{prime}"
    if name not in _INDEX:
        raise NotRepresentableError(f"log({prime}): the engine has logarithms of primes up to "
                                    f"{PRIMES_WITH_LOGARITHMS[-1]} only")
    return ExactPolynomial(name)


def _factor(n: int) -> dict[int, int]:
    """Prime factorisation of a positive integer (FLINT's integer factoring).

    The integers met here (radicands of the alpha projections, ratios of factorials) are
    smooth: FLINT strips the primes below 2^32 first, and a cofactor without small primes is
    factored fully only while it is small, so that no input runs without bound.
    """
    if n < 1:
        raise ValueError(f"_factor needs a positive integer, got {n}")
    if n.bit_length() > 20000:
        raise NotRepresentableError(f"integer of {n.bit_length()} bits: too large to factor here")
    factors: dict[int, int] = {}
    for p, e in flint.fmpz(n).factor_smooth(32):
        pieces = [(p, 1)]
        if not p.is_prime():
            if int(p).bit_length() > 512:
                raise NotRepresentableError(f"integer with a {int(p).bit_length()}-bit cofactor free of small "
                                            f"primes: too hard to factor here")
            pieces = list(p.factor())
        for q, f in pieces:
            factors[int(q)] = factors.get(int(q), 0) + int(f) * int(e)
    return factors


@lru_cache(maxsize=1)
def _sympy_generators() -> dict[str, Any]:
    import sympy as sp

    from .symbols import G, M_adm, delta, et, m, nu, omega, phidot, r, rdot, x

    table = {"I": sp.I, "delta": delta, "r": r, "rinv": 1 / r, "nu": nu,
             "chi1": sp.Symbol("chi1", real=True), "chi2": sp.Symbol("chi2", real=True),
             **{name: sp.Symbol(name, real=True) for name in _SPIN_COMPONENTS},
             "G": G, "m": m, "M": M_adm, "rdot": rdot, "phidot": phidot, "omega": omega, "x": x,
             "et": et, "pi": sp.pi, "EulerGamma": sp.EulerGamma, "zeta3": sp.zeta(3),
             "log_x": sp.log(x), "log_x0": sp.log(sp.Symbol("x0", positive=True)),
             "log_b": sp.log(sp.Symbol("b", positive=True))}
    for p in PRIMES_WITH_LOGARITHMS:
        table[f"log{p}"] = sp.log(p)
    return table


def _from_sympy(expr: Any) -> ExactPolynomial:
    import sympy as sp

    expr = sp.sympify(expr)
    if expr.is_Rational:
        return ExactPolynomial(expr)
    if isinstance(expr, sp.Add):
        total = ExactPolynomial(0)
        for arg in expr.args:
            total = total + _from_sympy(arg)
        return total
    if isinstance(expr, sp.Mul):
        total = ExactPolynomial(1)
        for arg in expr.args:
            total = total * _from_sympy(arg)
        return total
    if isinstance(expr, sp.Pow):
        base, power = expr.args
        if not power.is_Integer:
            raise NotRepresentableError(f"{expr}: non-integer power is outside the engine's ring")
        return _from_sympy(base) ** int(power)
    if expr is sp.I:
        return ExactPolynomial("I")
    if expr is sp.pi:
        return ExactPolynomial("pi")
    if expr is sp.EulerGamma:
        return ExactPolynomial("EulerGamma")
    if expr == sp.zeta(3):
        return ExactPolynomial("zeta3")
    if isinstance(expr, sp.log):
        argument = expr.args[0]
        if argument.is_Rational and argument > 0:
            return log_of_rational(argument)
        if isinstance(argument, sp.Symbol) and argument.name in ("x", "x0", "b"):
            return ExactPolynomial(f"log_{argument.name}")
        if isinstance(argument, (sp.Mul, sp.Pow)):
            return _from_sympy(sp.expand_log(expr, force=True)) if sp.expand_log(expr, force=True) != expr else _refuse(expr)
        return _refuse(expr)
    if isinstance(expr, sp.Symbol):
        name = {"M": "M"}.get(expr.name, expr.name)
        if name in _INDEX and name not in ("I", "rinv") and not name.startswith("log"):
            return ExactPolynomial(name)
        return _refuse(expr)
    return _refuse(expr)


def _refuse(expr: Any) -> ExactPolynomial:
    raise NotRepresentableError(f"{expr} is outside the exact engine's polynomial ring")


# ----------------------------------------------------------------------------- printing
def _format_number(value: Fraction) -> str:
    return str(value.numerator) if value.denominator == 1 else f"{value.numerator}/{value.denominator}"


# the order factors print in: I, then the binary's parameters, then the orbit, then constants
_SPIN_COMPONENTS = tuple(f"chi{a}_{k}" for a in (1, 2) for k in ("n", "lambda", "ell"))
_DISPLAY_ORDER = ("I", "nu", "delta", "chi1", "chi2", *_SPIN_COMPONENTS, "G", "m", "M", "r", "rinv", "rdot",
                  "phidot", "omega", "x", "et") + tuple(name for name in GENERATORS if name not in (
                      "I", "nu", "delta", "chi1", "chi2", *_SPIN_COMPONENTS, "G", "m", "M", "r", "rinv", "rdot",
                      "phidot", "omega", "x", "et"))


def _format_monomial(monomial: Mapping[str, int]) -> list[str]:
    factors = []
    r_power = monomial.get("r", 0) - monomial.get("rinv", 0)
    for name in _DISPLAY_ORDER:
        if name in ("r", "rinv"):
            if name == "r" and r_power:
                factors.append("r" if r_power == 1 else f"r**{r_power}" if r_power > 0 else f"r**({r_power})")
            continue
        power = monomial.get(name, 0)
        if power:
            spelling = _SPELLING[name]
            factors.append(spelling if power == 1 else f"{spelling}**{power}")
    return factors


def _format_term(monomial: Mapping[str, int], coefficient: Fraction, first: bool) -> str:
    sign = "-" if coefficient < 0 else ("" if first else "+")
    magnitude = abs(coefficient)
    factors = _format_monomial(monomial)
    if not factors:
        body = _format_number(magnitude)
    else:
        numerator = "" if magnitude.numerator == 1 else f"{magnitude.numerator}*"
        body = numerator + "*".join(factors)
        if magnitude.denominator != 1:
            body += f"/{magnitude.denominator}"
    if first:
        return sign + body
    return f" {sign} {body}"


def _display_key(item: tuple[dict[str, int], Fraction]) -> tuple:
    monomial = item[0]
    # constants first, then by increasing total degree, in the engine's generator order
    return (sum(monomial.values()), tuple(-monomial.get(name, 0) for name in _DISPLAY_ORDER))


def _format_polynomial(value: ExactPolynomial) -> str:
    items = sorted(value.terms(), key=_display_key)
    if not items:
        return "0"
    return "".join(_format_term(monomial, coefficient, k == 0) for k, (monomial, coefficient) in enumerate(items))


_LATEX_NAMES = {"I": "i", "nu": r"\nu", "delta": r"\delta", "chi1": r"\chi_1", "chi2": r"\chi_2",
                **{f"chi{a}_{k}": rf"\chi_{{{a}{symbol}}}" for a in (1, 2)
                   for k, symbol in (("n", "n"), ("lambda", r"\lambda"), ("ell", r"\ell"))},
                "rdot": r"\dot{r}", "phidot": r"\dot{\phi}", "omega": r"\omega", "et": "e_t",
                "pi": r"\pi", "EulerGamma": r"\gamma_E", "zeta3": r"\zeta(3)", "log_x": r"\ln x",
                "log_x0": r"\ln x_0", "log_b": r"\ln b"}


def _latex_factor(name: str, power: int) -> str:
    if name.startswith("log") and name[3:].isdigit():
        base = rf"\ln {name[3:]}"
        return base if power == 1 else rf"(\ln {name[3:]})^{{{power}}}"
    base = _LATEX_NAMES.get(name, name)
    if power == 1:
        return base
    if name in ("log_x", "log_x0", "log_b", "zeta3"):
        return f"({base})^{{{power}}}"
    return f"{base}^{{{power}}}"


def _latex_polynomial(value: ExactPolynomial) -> str:
    items = sorted(value.terms(), key=_display_key)
    if not items:
        return "0"
    out = []
    for k, (monomial, coefficient) in enumerate(items):
        sign = "-" if coefficient < 0 else ("" if k == 0 else "+")
        magnitude = abs(coefficient)
        r_power = monomial.get("r", 0) - monomial.get("rinv", 0)
        factors = []
        for name in _DISPLAY_ORDER:
            if name in ("r", "rinv"):
                if name == "r" and r_power:
                    factors.append("r" if r_power == 1 else f"r^{{{r_power}}}")
                continue
            if monomial.get(name, 0):
                factors.append(_latex_factor(name, monomial[name]))
        body = " ".join(factors)
        if magnitude.denominator != 1:
            number = rf"\frac{{{magnitude.numerator}}}{{{magnitude.denominator}}}"
        else:
            number = "" if (magnitude == 1 and body) else str(magnitude.numerator)
        term = " ".join(part for part in (number, body) if part)
        out.append(f"{sign} {term}".strip() if k == 0 else f"{sign} {term}")
    return " ".join(out)


# ----------------------------------------------------------------------------- surds
class SurdConstant:
    """An exact constant ``rational * sqrt(radicand)`` with a square-free integer radicand.

    The mode amplitudes carry one such constant beside their polynomial part (for example
    ``-(3/4) sqrt(15/14) = -(3/56) sqrt(210)``); products stay in this form.

    Example
    -------
    >>> SurdConstant(Fraction(-3, 4), Fraction(15, 14))
    SurdConstant(-3/56*sqrt(210))
    >>> SurdConstant(1, 2) * SurdConstant(1, 8)
    SurdConstant(4)
    """

    __slots__ = ("rational", "radicand")

    def __init__(self, rational: Any = 1, radicand: Any = 1) -> None:
        rational = Fraction(rational)
        radicand = Fraction(radicand)
        if radicand < 0:
            raise ValueError(f"SurdConstant takes a non-negative radicand, got {radicand}")
        if radicand == 0:
            rational, radicand = Fraction(0), Fraction(1)
        # sqrt(p/q) = sqrt(p q)/q; then pull square factors out of p q
        whole = radicand.numerator * radicand.denominator
        rational = rational / radicand.denominator
        square, free = _split_square(whole)
        self.rational = rational * square
        self.radicand = free

    def __mul__(self, other: Any) -> "SurdConstant":
        if isinstance(other, SurdConstant):
            return SurdConstant(self.rational * other.rational, self.radicand * other.radicand)
        return SurdConstant(self.rational * Fraction(other), self.radicand)

    __rmul__ = __mul__

    def __truediv__(self, other: Any) -> "SurdConstant":
        if isinstance(other, SurdConstant):
            if other.rational == 0:
                raise ZeroDivisionError("division by a zero SurdConstant")
            return SurdConstant(self.rational / (other.rational * other.radicand), self.radicand * other.radicand)
        return SurdConstant(self.rational / Fraction(other), self.radicand)

    def __neg__(self) -> "SurdConstant":
        return SurdConstant(-self.rational, self.radicand)

    def __eq__(self, other: Any) -> bool:
        return (isinstance(other, SurdConstant) and self.rational == other.rational
                and self.radicand == other.radicand)

    def __hash__(self) -> int:
        return hash((self.rational, self.radicand))

    def to_text(self) -> str:
        """sympy-parseable text, e.g. ``-3*sqrt(210)/56``."""
        if self.radicand == 1:
            return _format_number(self.rational)
        sign = "-" if self.rational < 0 else ""
        magnitude = abs(self.rational)
        head = "" if magnitude.numerator == 1 else f"{magnitude.numerator}*"
        tail = "" if magnitude.denominator == 1 else f"/{magnitude.denominator}"
        return f"{sign}{head}sqrt({self.radicand}){tail}"

    def __repr__(self) -> str:
        return f"SurdConstant({_format_number(self.rational) + ('' if self.radicand == 1 else f'*sqrt({self.radicand})')})"

    def to_sympy(self) -> Any:
        import sympy as sp

        return sp.Rational(self.rational.numerator, self.rational.denominator) * sp.sqrt(self.radicand)

    def to_latex(self) -> str:
        """LaTeX, e.g. ``-\\frac{3}{56} \\sqrt{210}``."""
        sign = "-" if self.rational < 0 else ""
        magnitude = abs(self.rational)
        number = (rf"\frac{{{magnitude.numerator}}}{{{magnitude.denominator}}}" if magnitude.denominator != 1
                  else ("" if magnitude == 1 and self.radicand != 1 else str(magnitude.numerator)))
        root = rf"\sqrt{{{self.radicand}}}" if self.radicand != 1 else ""
        return (sign + " ".join(part for part in (number, root) if part)).strip() or "1"

    def squared(self) -> Fraction:
        """The rational square of the constant."""
        return self.rational ** 2 * self.radicand


def _split_square(n: int) -> tuple[int, int]:
    """n = square^2 * free with free square-free."""
    square, free = 1, 1
    for prime, power in _factor(n).items():
        square *= prime ** (power // 2)
        free *= prime ** (power % 2)
    return square, free
