"""Comparing a user's expression with the toolkit's derivation, PN order by PN order.

Both sides are expanded as :class:`~stfalgebra.pnseries.PNSeries` in the orbit's expansion
parameter (eps = sqrt(x) for circular orbits, eps = 1/c for general ones), put in canonical
form, and compared coefficient by coefficient and, inside each coefficient, power of nu by
power of nu. The user's terms beyond the requested order are listed, not compared.

**How a verdict is reached** (one per compared term, then for the whole expression):

1. *Exact comparison first.* Canonical form: logarithms expanded, the logarithm of every
   rational number written as a sum of logarithms of primes (log 6 = log 2 + log 3),
   delta^2 = 1 - 4 nu, everything expanded. A difference that is then zero is an exact
   agreement ("agree"); a difference that is a non-zero polynomial with rational (or Gaussian
   rational) coefficients is an exact disagreement ("differ").
2. *Numbers otherwise*, at :data:`WORKING_DIGITS` significant digits, at
   :data:`SPOT_POINTS` random points: every term of both sides is evaluated, and the
   difference is measured against the *size of the terms compared* (the sum of their moduli),
   never against a fixed absolute threshold. A difference above :data:`SEPARATION` of that
   size cannot come from rounding: "differ".
3. Below it the numbers cannot separate the two sides; an exact proof is attempted
   (``sympy.simplify`` within the time left) and, failing that, the verdict is
   **"cannot decide"**: never "agree" on numerical evidence alone.
4. *Decimals.* A number the user wrote with a decimal point or an exponent stands for a value
   known to within one unit in its last digit. Terms containing decimals are compared at that
   precision: within the uncertainty the decimals carry (propagated through the term) the
   verdict is **"agrees to N digits"** (N the fewest significant digits among them), beyond
   it "differ". Such input is never reported as plain "agree".

The whole truncated series is also compared numerically at random points (the same
precision and relative threshold) as a second route; if it contradicts an agreement of the
term-by-term comparison, the verdict is "cannot decide", with a note.
"""

from __future__ import annotations

import contextlib
import math
import random
import signal
import threading
import time
from dataclasses import dataclass
from typing import Any, Iterator, Sequence

import mpmath
import sympy as sp

from .. import symbols as S
from ..binary.masses import reduce_mass_difference
from ..errors import ExpressionRefusedError
from ..orders import parse_pn_order as _parse_order_text
from ..pnseries import PNSeries
from .safe_parser import DecimalLiteral, parse_with_decimals

__all__ = [
    "TermComparison",
    "OrderComparison",
    "SpotCheck",
    "ComparisonReport",
    "VERDICTS",
    "WORKING_DIGITS",
    "SEPARATION",
    "SPOT_POINTS",
    "compare_expressions",
    "compare_with_derived",
    "canonical_logarithms",
    "time_limit",
    "parse_pn_order",
    "MAX_EXPANDED_TERMS",
]

MAX_EXPANDED_TERMS = 5000
"""Largest accepted estimate of the number of terms an expression expands to."""
WORKING_DIGITS = 100
"""Significant digits of every numeric evaluation of the checker."""
SEPARATION = 1e-80
"""A difference larger than this fraction of the size of the terms compared is a true
difference: evaluation at :data:`WORKING_DIGITS` digits is accurate to about 1e-100 of it."""
SPOT_POINTS = 5
"""Random points of every numeric comparison (fixed seed: reports are reproducible)."""
VERDICTS = ("agree", "differ", "cannot decide", "agrees to digits")
"""The verdicts of a comparison, in the JSON spelling; "agrees to digits" comes with a number
of digits (text: "agrees to N digits")."""

_BEYOND = 1  # for non-polynomial user expressions: orders reported beyond pn
_SPOT_SEED = 1729
_SIMPLIFY_SECONDS = 10.0
_FACTOR_BITS = 256
_SEVERITY = {"agree": 0, "agrees to digits": 1, "cannot decide": 2, "differ": 3}

_EPS = S.eps
_LOG_X = sp.Symbol("log_x_placeholder", real=True)
_LOG_C = sp.Symbol("log_c_placeholder", real=True)


@dataclass(frozen=True)
class TermComparison:
    """One power of nu inside one PN coefficient.

    ``nu_power`` None marks the part that is not a monomial in nu (e.g. sqrt(1 - 4 nu));
    ``status`` is one of :data:`VERDICTS` (``digits`` set for "agrees to digits");
    ``numeric_only`` marks a status established by the numeric comparison rather than
    exactly; ``relative_difference`` is the largest |yours - derived| over the size of the
    terms compared at the numeric points (None when the status is exact)."""

    nu_power: sp.Rational | None
    status: str
    yours: sp.Expr
    derived: sp.Expr
    difference: sp.Expr
    numeric_only: bool = False
    digits: int | None = None
    relative_difference: float | None = None

    def words(self) -> str:
        """The status as the text report prints it."""
        return f"agrees to {self.digits} digits" if self.status == "agrees to digits" else self.status


@dataclass(frozen=True)
class OrderComparison:
    """One PN order: ``status`` the least favourable status of its terms."""

    order: sp.Rational
    label: str
    status: str
    terms: tuple[TermComparison, ...]


@dataclass(frozen=True)
class SpotCheck:
    """Numeric comparison of the whole truncated series at random points, at ``digits``
    significant digits; ``max_relative_difference`` is measured against the size of the
    terms, and ``passed`` means it stayed within ``threshold`` (or, for decimal input, within
    the decimals' uncertainty)."""

    points: int
    max_relative_difference: float
    passed: bool
    digits: int = WORKING_DIGITS
    threshold: float = SEPARATION


@dataclass(frozen=True)
class ComparisonReport:
    """The outcome of a comparison: ``verdict`` one of :data:`VERDICTS` (``digits`` set for
    "agrees to digits"); ``agree`` is True exactly for an exact agreement."""

    label: str
    orbit: str
    pn: sp.Rational
    orders: tuple[OrderComparison, ...]
    beyond: tuple[tuple[sp.Rational, str, sp.Expr], ...]
    beyond_known_through: sp.Expr
    spot_check: SpotCheck
    agree: bool
    notes: tuple[str, ...] = ()
    verdict: str = ""
    digits: int | None = None

    def __post_init__(self) -> None:
        if not self.verdict:
            object.__setattr__(self, "verdict", "agree" if self.agree else "differ")
        if self.verdict not in VERDICTS:
            raise ValueError(f"verdict must be one of {VERDICTS}, got {self.verdict!r}")
        if self.agree != (self.verdict == "agree"):
            raise ValueError("agree must be True exactly when the verdict is 'agree'")

    def verdict_words(self) -> str:
        """"agree", "differ", "cannot decide" or "agrees to N digits"."""
        return f"agrees to {self.digits} digits" if self.verdict == "agrees to digits" else self.verdict

    def to_text(self) -> str:
        """A human-readable report (deterministic)."""
        through = _order_label(self.pn, self.orbit)
        lines = [f"{self.label} ({self.orbit} orbit), compared through {through} (PN order {self.pn}):"]
        width = max((len(o.label) for o in self.orders), default=0)
        for order in self.orders:
            if order.status == "agree" and not order.terms:
                lines.append(f"  {order.label.ljust(width)}  agree (both zero)")
                continue
            status = _worst_words(order.terms) if order.terms else order.status
            lines.append(f"  {order.label.ljust(width)}  {status}")
            for term in order.terms:
                head = f"    {_nu_label(term.nu_power)}: {term.words()}"
                if term.status != "agree":
                    head += (f": yours {sp.sstr(term.yours)}, derived {sp.sstr(term.derived)}, "
                             f"yours - derived = {sp.sstr(term.difference)}")
                if term.relative_difference is not None and term.status != "differ":
                    head += (f" (numerically |yours - derived| = {term.relative_difference:.1e} of the terms "
                             f"at {WORKING_DIGITS} digits)")
                lines.append(head)
        if self.beyond:
            known = "" if self.beyond_known_through == sp.oo else f", expanded through {_order_label(self.beyond_known_through, self.orbit)}"
            lines.append(f"  beyond {through} in your expression (not compared{known}):")
            for _, label, coefficient in self.beyond:
                lines.append(f"    {label}: {sp.sstr(coefficient)}")
        check = self.spot_check
        lines.append(f"  numeric spot check at {check.points} points ({check.digits} digits): max relative difference "
                     f"{check.max_relative_difference:.1e} of the size of the terms")
        for note in self.notes:
            lines.append(f"  note: {note}")
        lines.append("result: " + self._result_words())
        return "\n".join(lines)

    def _result_words(self) -> str:
        at = [o.label for o in self.orders if o.status == self.verdict]
        if self.verdict == "agree":
            return "AGREE"
        if self.verdict == "differ":
            return f"DIFFER at {', '.join(at)}" if at else "DIFFER (numeric spot check)"
        if self.verdict == "cannot decide":
            where = f" at {', '.join(at)}" if at else ""
            return (f"CANNOT DECIDE{where} (not equal as written, and equal to {WORKING_DIGITS} digits at "
                    f"{SPOT_POINTS} points: the numbers cannot separate them)")
        return (f"AGREES TO {self.digits} DIGITS (your decimals are compared at the precision they were "
                f"given)")

    def to_json(self) -> dict:
        """A JSON-serialisable dict (strings in sympy syntax, orders as strings)."""
        return {
            "label": self.label,
            "orbit": self.orbit,
            "pn": str(self.pn),
            "verdict": self.verdict,
            "digits": self.digits,
            "orders": [
                {"order": str(o.order), "label": o.label, "status": o.status,
                 "terms": [{"nu_power": None if t.nu_power is None else str(t.nu_power), "status": t.status,
                            "digits": t.digits, "yours": sp.sstr(t.yours), "derived": sp.sstr(t.derived),
                            "difference": sp.sstr(t.difference), "numeric_only": t.numeric_only,
                            "relative_difference": None if t.relative_difference is None
                            else float(f"{t.relative_difference:.3e}")}
                           for t in o.terms]}
                for o in self.orders],
            "beyond": [{"order": str(order), "label": label, "yours": sp.sstr(coefficient)}
                       for order, label, coefficient in self.beyond],
            "beyond_known_through": str(self.beyond_known_through),
            "spot_check": {"points": self.spot_check.points,
                           "max_relative_difference": float(f"{self.spot_check.max_relative_difference:.3e}"),
                           "passed": self.spot_check.passed, "digits": self.spot_check.digits,
                           "threshold": self.spot_check.threshold},
            "notes": list(self.notes),
        }


# ----------------------------------------------------------------------------- helpers
def _order_label(order: sp.Expr, orbit: str) -> str:
    if order == sp.oo:
        return "all orders"
    if orbit == "circular":
        return f"x^{order}" if order.q == 1 else f"x^({order})"
    power = 2 * order
    return "c^0" if power == 0 else (f"1/c^{power}" if power > 0 else f"c^{-power}")


def _nu_label(power: sp.Rational | None) -> str:
    if power is None:
        return "not a power of nu"
    return f"nu^{power}" if power.q == 1 else f"nu^({power})"


def _worst(statuses: Sequence[str]) -> str:
    return max(statuses, key=_SEVERITY.__getitem__, default="agree")


def _worst_words(terms: Sequence[TermComparison]) -> str:
    status = _worst([t.status for t in terms])
    if status != "agrees to digits":
        return status
    return f"agrees to {min(t.digits for t in terms if t.status == status)} digits"


# ----------------------------------------------------------------------------- time limits
# Active limits, innermost last: (deadline on the monotonic clock, token). One interval timer
# serves them all, armed for the earliest deadline.
_DEADLINES: list[tuple[float, object]] = []
_OUTER_HANDLER: list[Any] = []


class _Timeout(BaseException):
    """Raised by the alarm handler of :func:`time_limit` for the limit that ran out (a
    BaseException: ``except Exception`` in sympy does not swallow it)."""

    def __init__(self, token: object) -> None:
        super().__init__("time limit")
        self.token = token


def _arm() -> None:
    if not _DEADLINES:
        signal.setitimer(signal.ITIMER_REAL, 0)
        return
    left = min(deadline for deadline, _ in _DEADLINES) - time.monotonic()
    # re-arm every second after an expiry: one alarm swallowed by a broad except must not
    # end the limit
    signal.setitimer(signal.ITIMER_REAL, max(left, 1e-3), 1.0)


def _expired(signum, frame) -> None:
    now = time.monotonic()
    for deadline, token in _DEADLINES:  # outermost first: a spent run budget ends everything
        if now >= deadline:
            raise _Timeout(token)


@contextlib.contextmanager
def time_limit(seconds: float | None, what: str = "the comparison") -> Iterator[None]:
    """Raise :class:`ExpressionRefusedError` if the block runs longer than ``seconds``.

    Parameters
    ----------
    seconds:
        Wall-clock budget; None or 0 switches the limit off.
    what:
        Named in the error message.

    Returns
    -------
    A context manager. Limits nest: an inner block ends at its own deadline or the outer
    one, whichever comes first, and each limit reports only its own expiry.

    Conventions
    -----------
    Uses ``SIGALRM`` (POSIX, main thread only); elsewhere the block runs without a limit. The
    previous ``SIGALRM`` handler and a cleared interval timer come back after the outermost
    block.

    Examples
    --------
    >>> with time_limit(5):
    ...     1 + 1
    2

    References
    ----------
    Python documentation of :func:`signal.setitimer`.
    """
    usable = (seconds and hasattr(signal, "setitimer")
              and threading.current_thread() is threading.main_thread())
    if not usable:
        yield
        return
    token = object()
    entry = (time.monotonic() + seconds, token)
    if not _DEADLINES:
        _OUTER_HANDLER.append(signal.signal(signal.SIGALRM, _expired))
    _DEADLINES.append(entry)
    _arm()
    try:
        yield
    except _Timeout as exc:
        if exc.token is not token:
            raise
        raise ExpressionRefusedError(f"{what} took longer than {seconds:g} s (expression too expensive)") from None
    finally:
        _DEADLINES.remove(entry)
        _arm()
        if not _DEADLINES:
            signal.signal(signal.SIGALRM, _OUTER_HANDLER.pop())


# ----------------------------------------------------------------------------- canonical form
def _estimate_terms(expression: sp.Expr, cap: int = 10**9) -> tuple[int, int]:
    """Upper estimate of the numbers of terms of numerator and denominator after
    ``together`` and ``expand``."""
    if expression.is_Atom or isinstance(expression, sp.Function):
        return 1, 1
    if isinstance(expression, sp.Add):
        parts = [_estimate_terms(a, cap) for a in expression.args]
        den = 1
        for _, d in parts:
            den = min(cap, den * d)
        num = min(cap, sum(n for n, _ in parts) * den)
        return num, den
    if isinstance(expression, sp.Mul):
        num = den = 1
        for a in expression.args:
            n, d = _estimate_terms(a, cap)
            num, den = min(cap, num * n), min(cap, den * d)
        return num, den
    if isinstance(expression, sp.Pow):
        n, d = _estimate_terms(expression.base, cap)
        k = expression.exp
        if k.is_Integer:
            k = int(k)
            grow = lambda t: min(cap, math.comb(min(t, cap) + abs(k) - 1, abs(k)))  # noqa: E731
            return (grow(n), grow(d)) if k > 0 else (grow(d), grow(n))
        return n, d
    return 1, 1


def _guard_size(expression: sp.Expr, who: str) -> None:
    num, den = _estimate_terms(expression)
    if max(num, den) > MAX_EXPANDED_TERMS:
        raise ExpressionRefusedError(
            f"expression refused: {who} would expand to more than {MAX_EXPANDED_TERMS} terms")


def _log_of_primes(value: sp.Rational) -> sp.Expr | None:
    """log(value) as a sum of logarithms of primes, or None when the factorisation is not
    cheap (numbers beyond 256 bits, or a cofactor that is not proven prime quickly)."""
    parts = []
    for number, sign in ((int(value.p), 1), (int(value.q), -1)):
        if number == 1:
            continue
        if number.bit_length() > _FACTOR_BITS:
            return None
        factors = sp.factorint(number, limit=10**5)
        if not all(sp.isprime(p) for p in factors):
            return None
        parts += [sign * exponent * sp.log(sp.Integer(p)) for p, exponent in factors.items()]
    return sp.Add(*parts)


def canonical_logarithms(expression: sp.Expr) -> sp.Expr:
    """Write the logarithm of every positive rational number in ``expression`` as a sum of
    logarithms of primes.

    Parameters
    ----------
    expression:
        A sympy expression (sympy has already turned ``log(-q)`` into ``log(q) + I pi``).

    Returns
    -------
    sympy.Expr
        ``log(6)`` -> ``log(2) + log(3)``, ``log(3/2)`` -> ``log(3) - log(2)``; a number too
        large to factor cheaply keeps its logarithm.

    Conventions
    -----------
    Unique factorisation makes this a canonical form: logarithms of distinct primes are
    linearly independent over the rationals, so two sums of them are equal only term by term.

    Examples
    --------
    >>> canonical_logarithms(sp.log(6) - sp.log(2) - sp.log(3))
    0
    >>> canonical_logarithms(10*sp.log(15) - 10*sp.log(10))
    -10*log(2) + 10*log(3)

    References
    ----------
    Common practice (fundamental theorem of arithmetic).
    """
    replacements = {}
    for function in expression.atoms(sp.log):
        argument = function.args[0]
        if argument.is_Rational and argument.is_positive:
            split = _log_of_primes(argument)
            if split is not None:
                replacements[function] = split
    return expression.xreplace(replacements) if replacements else expression


def _canonical(expression: sp.Expr) -> sp.Expr:
    expression = sp.expand(canonical_logarithms(sp.expand(sp.expand_log(expression, force=True))))
    try:
        return reduce_mass_difference(expression)
    except ValueError:  # delta inside a function: leave it as written
        return expression


def _to_eps(expression: sp.Expr, orbit: str) -> sp.Expr:
    """Write an expression in the expansion parameter, logarithms of it set aside."""
    expression = sp.expand_log(expression, force=True)
    if orbit == "circular":
        expression = expression.xreplace({sp.log(S.x): _LOG_X})
        return expression.xreplace({S.x: _EPS**2})
    expression = expression.xreplace({sp.log(S.c): _LOG_C})
    return expression.xreplace({S.c: 1 / _EPS})


def _from_eps(expression: sp.Expr) -> sp.Expr:
    return expression.xreplace({_LOG_X: sp.log(S.x), _LOG_C: sp.log(S.c)})


def _series(expression: sp.Expr, orbit: str, known_through: Any) -> PNSeries:
    in_eps = _to_eps(expression, orbit)
    try:
        return PNSeries.from_expression(in_eps, _EPS, known_through)
    except ValueError:
        if known_through == sp.oo:
            raise
    # Not rational in eps (e.g. sqrt(1 + x), exp(x)): Taylor-expand with sympy first.
    count = int(2 * known_through) + 1
    try:
        polynomial = sp.series(in_eps, _EPS, 0, count).removeO()
    except Exception as exc:  # sympy raises a variety of errors on series it cannot do
        raise ExpressionRefusedError(f"cannot expand {sp.sstr(expression)[:60]} as a PN series: {exc}") from None
    if polynomial.has(sp.log(_EPS)) or polynomial.has(sp.Order):
        raise ExpressionRefusedError(f"cannot expand {sp.sstr(expression)[:60]} as a PN series")
    return PNSeries.from_expression(polynomial, _EPS, known_through)


def parse_pn_order(value: Any) -> sp.Rational:
    """A PN order: a non-negative multiple of 1/2 (at most 100) given as int, Rational or text.

    Parameters
    ----------
    value:
        ``2``, ``sp.Rational(3, 2)``, ``"1.5"``, ``"3/2"``.

    Returns
    -------
    sympy.Rational

    Conventions
    -----------
    Text is bounded before it is converted (:func:`stfalgebra.orders.parse_pn_order`);
    anything that is not a non-negative multiple of 1/2 is a ValueError naming it.

    Examples
    --------
    >>> parse_pn_order("3/2"), parse_pn_order(2)
    (3/2, 2)

    References
    ----------
    Common practice.
    """
    try:
        order = _parse_order_text(value, "PN order")
    except ValueError as exc:
        raise ValueError(str(exc).replace("multiple of 1/2", "non-negative multiple of 1/2", 1)) from None
    if order > 100:
        raise ValueError(f"PN order must be a non-negative multiple of 1/2 (at most 100), got {value!r}")
    return sp.Rational(order.numerator, order.denominator)


def _by_nu_power(expression: sp.Expr) -> dict[sp.Rational | None, sp.Expr]:
    groups: dict[sp.Rational | None, list[sp.Expr]] = {}
    for term in sp.Add.make_args(expression):
        if term == 0:
            continue
        coefficient, power = term.as_coeff_exponent(S.nu)
        key = power if (not coefficient.has(S.nu) and power.is_Rational) else None
        if key is None:
            coefficient = term
        groups.setdefault(key, []).append(coefficient)
    return {k: sp.Add(*v) for k, v in groups.items() if sp.Add(*v) != 0}


# ----------------------------------------------------------------------------- numbers
def _random_values(symbols: set[sp.Symbol], rng: random.Random) -> dict[sp.Symbol, sp.Rational]:
    values = {}
    # m1/m2 on both sides of 1: delta takes both signs (only delta^2 = 1 - 4 nu is fixed).
    q = sp.Rational(10 ** rng.uniform(-1.0, 1.0))
    nu, delta = q / (1 + q) ** 2, (q - 1) / (q + 1)
    for symbol in sorted(symbols, key=lambda s: s.name):
        if symbol == S.nu:
            values[symbol] = nu
        elif symbol == S.delta:
            values[symbol] = delta
        else:
            values[symbol] = sp.Rational(rng.uniform(-1.5, 1.5) if not symbol.is_positive else rng.uniform(0.5, 1.5))
    return values


def _spot_values(orbit: str, rng: random.Random) -> dict[sp.Symbol, sp.Rational]:
    # nu and delta from an exact mass ratio, so that delta^2 = 1 - 4 nu holds exactly.
    q = sp.Rational(10 ** rng.uniform(-1.0, 1.0))
    exact = {S.nu: q / (1 + q) ** 2, S.delta: (q - 1) / (q + 1)}
    point = {}
    if orbit == "circular":
        point[S.x] = rng.uniform(0.01, 0.2)
    else:
        m = rng.uniform(0.5, 2.0)
        r = m * rng.uniform(8.0, 40.0)
        point.update({S.m: m, S.r: r, S.rdot: math.sqrt(m / r) * rng.uniform(-0.3, 0.3),
                      S.phidot: math.sqrt(m / r**3) * rng.uniform(0.7, 1.3), S.c: rng.uniform(0.8, 1.5)})
    return {**{k: sp.Rational(v) for k, v in point.items()}, **exact}


def _value(term: sp.Expr, point: dict[sp.Symbol, sp.Rational]) -> mpmath.mpc:
    """``term`` at ``point`` as an mpmath number accurate to the working precision."""
    number = term.xreplace(point)
    if number.free_symbols:
        raise ExpressionRefusedError(f"cannot evaluate {sp.sstr(term)[:60]} numerically")
    number = number.evalf(WORKING_DIGITS + 15)
    real, imaginary = number.as_real_imag()
    if not (real.is_Number and imaginary.is_Number) or real.has(sp.nan, sp.zoo, sp.oo) \
            or imaginary.has(sp.nan, sp.zoo, sp.oo):
        raise ExpressionRefusedError(f"{sp.sstr(term)[:60]} has no finite value at a numeric point")
    return mpmath.mpc(mpmath.mpf(sp.Float(real, WORKING_DIGITS + 15)), mpmath.mpf(sp.Float(imaginary, WORKING_DIGITS + 15)))


@dataclass(frozen=True)
class _Numbers:
    """The numeric comparison of one difference: the largest |difference|/size of the terms
    over the points, and whether every point stayed within the decimals' uncertainty."""

    relative: float
    within_decimals: bool


def _compare_numerically(yours_with_decimals: sp.Expr, yours: sp.Expr, derived: sp.Expr, difference: sp.Expr,
                         decimals: Sequence[DecimalLiteral], points: Sequence[dict]) -> _Numbers:
    """|yours - derived| against the size of the terms compared, at each point.

    ``difference`` is the canonical exact difference (its terms are the terms of ``yours``
    and ``derived`` combined, so the rounding error of its value stays far below
    ``SEPARATION`` times the size). With ``decimals``, the allowed difference at a point is
    sum_k |d yours/d decimal_k| unit_k (each decimal known to within one unit in its last digit,
    rounded or truncated) plus the rounding allowance.
    """
    worst = 0.0
    within = True
    gradients = [(d, sp.diff(yours_with_decimals, d.symbol)) for d in decimals
                 if yours_with_decimals.has(d.symbol)]
    exact_values = {d.symbol: d.value for d in decimals}
    with mpmath.workdps(WORKING_DIGITS + 15):
        for point in points:
            size = mpmath.mpf(0)
            for term in (*sp.Add.make_args(yours), *sp.Add.make_args(derived)):
                size += abs(_value(term, point))
            gap = abs(mpmath.fsum(_value(term, point) for term in sp.Add.make_args(difference)))
            if size == 0:
                relative = 0.0 if gap == 0 else math.inf
            else:
                relative = float(gap / size)
            worst = max(worst, relative)
            if gradients:
                allowance = mpmath.fsum(abs(_value(g.xreplace(exact_values), point)) * mpmath.mpf(d.unit.p) / d.unit.q
                                            for d, g in gradients)
                if gap > allowance + SEPARATION * size:
                    within = False
    return _Numbers(worst, within)


def _is_rational_polynomial(difference: sp.Expr) -> bool:
    """A polynomial in the symbols with rational or Gaussian-rational coefficients (no pi, no
    logarithm, no root): structurally non-zero then means non-zero."""
    if not all(atom.is_Symbol or atom.is_Rational or atom is sp.I for atom in difference.atoms()):
        return False
    return difference.is_polynomial(*difference.free_symbols)


def _simplifies_to_zero(difference: sp.Expr) -> bool:
    """An exact proof that ``difference`` vanishes, within a few seconds; False otherwise."""
    try:
        with time_limit(_SIMPLIFY_SECONDS, "simplification"):
            return sp.simplify(difference) == 0
    except ExpressionRefusedError:
        return False
    except Exception:  # sympy raises many error types on expressions it cannot simplify
        return False


def _judge(yours: sp.Expr, derived: sp.Expr, decimals: Sequence[DecimalLiteral], nu_power,
           points_for) -> TermComparison:
    """The status of one compared term (module docstring, steps 1-4)."""
    exact_values = {d.symbol: d.value for d in decimals}
    involved = [d for d in decimals if yours.has(d.symbol)]
    exact_yours = _canonical(yours.xreplace(exact_values)) if involved else _canonical(yours)
    canonical_derived = _canonical(derived)
    difference = _canonical(exact_yours - canonical_derived)
    display = {d.symbol: d.display() for d in decimals}
    shown_yours = _from_eps(yours.xreplace(display) if involved else exact_yours)
    shown_derived = _from_eps(canonical_derived)
    if not involved:
        shown_difference = _from_eps(difference)
    elif difference.free_symbols:
        shown_difference = _from_eps(_canonical(yours.xreplace(display) - canonical_derived))
    else:  # a number: five digits of the exact difference (Float arithmetic at the decimals' precision is noise)
        shown_difference = sp.N(difference, 5)

    def result(status, numeric=False, digits=None, relative=None):
        return TermComparison(nu_power, status, shown_yours, shown_derived, shown_difference, numeric, digits,
                              relative)

    if difference == 0 and not involved:
        return result("agree")
    if not involved and _is_rational_polynomial(difference):
        return result("differ")
    numbers = _compare_numerically(yours, exact_yours, canonical_derived, difference, involved,
                                   points_for(difference.free_symbols | exact_yours.free_symbols
                                              | canonical_derived.free_symbols))
    if involved:
        if numbers.within_decimals:
            return result("agrees to digits", True, min(d.digits for d in involved), numbers.relative)
        return result("differ", True, None, numbers.relative)
    if numbers.relative > SEPARATION:
        return result("differ", True, None, numbers.relative)
    if _simplifies_to_zero(difference):
        return result("agree")
    return result("cannot decide", True, None, numbers.relative)


def _compare_coefficients(yours: sp.Expr, derived: sp.Expr, decimals: Sequence[DecimalLiteral],
                          points_for) -> tuple[TermComparison, ...]:
    mine = _by_nu_power(_canonical(yours))
    theirs = _by_nu_power(_canonical(derived))
    if None in mine or None in theirs:
        # One side is not polynomial in nu: compare the coefficient as a whole.
        return (_judge(yours, derived, decimals, None, points_for),)
    keys = sorted(set(mine) | set(theirs))
    return tuple(_judge(mine.get(key, sp.S.Zero), theirs.get(key, sp.S.Zero), decimals, key, points_for)
                 for key in keys)


def _points_factory():
    """Random numeric points for a set of symbols, the same for every term (fixed seed)."""
    cache: dict[frozenset, list] = {}

    def points_for(symbols: set[sp.Symbol]) -> list[dict]:
        key = frozenset(s for s in symbols if not s.name.startswith("_decimal_"))
        if key not in cache:
            rng = random.Random(_SPOT_SEED)
            cache[key] = [_random_values(set(key), rng) for _ in range(SPOT_POINTS)]
        return cache[key]

    return points_for


# ----------------------------------------------------------------------------- public
def compare_expressions(yours: sp.Expr, derived: sp.Expr, *, orbit: str = "circular", pn: Any,
                        label: str = "expression", decimals: Sequence[DecimalLiteral] = ()) -> ComparisonReport:
    """Compare two expressions as PN series through absolute order ``pn``.

    Parameters
    ----------
    yours:
        The expression under test (a sympy expression in the orbit's symbols); with
        ``decimals``, the symbols of those literals stand for them (as
        :attr:`~stfalgebra.checking.safe_parser.ParsedExpression.with_decimals`).
    derived:
        The reference (trusted; terms beyond ``pn`` are ignored).
    orbit:
        ``"circular"`` (expansion in sqrt(x)) or ``"general"`` (expansion in 1/c).
    pn:
        Absolute PN order through which to compare (multiple of 1/2; circular: x^pn).
    label:
        Name used in the report.
    decimals:
        The decimal literals of ``yours`` (from
        :func:`~stfalgebra.checking.safe_parser.parse_with_decimals`), compared at the
        precision they were given.

    Returns
    -------
    ComparisonReport
        Per order and power of nu: a status of :data:`VERDICTS` with both values and the
        difference; the user's terms beyond ``pn``; a numeric spot check; the verdict: the
        least favourable status (differ, then cannot decide, then agrees to N digits, then
        agree).

    Conventions
    -----------
    Canonical form before comparing: logarithms expanded and those of rationals written with
    primes, delta^2 = 1 - 4 nu, expanded. Circular order n is the coefficient of x^n (log x
    kept inside the coefficient); general order n the coefficient of (1/c)^(2n). "agree" is
    only ever an exact agreement (module docstring).

    Examples
    --------
    >>> from stfalgebra.symbols import x, nu
    >>> derived = 1 + x*(-sp.Rational(107, 42) + 55*nu/42)
    >>> compare_expressions(1 + x*(-sp.Rational(107, 42) + 55*nu/43), derived, pn=1).orders[2].terms[1].status
    'differ'
    >>> compare_expressions(derived + x*sp.exp(-100), derived, pn=1).verdict
    'differ'

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014) (PN orders of Hhat_lm).
    """
    if orbit not in ("circular", "general"):
        raise ValueError(f"orbit must be 'circular' or 'general', got {orbit!r}")
    for name, value in (("your expression", yours), ("derived expression", derived)):
        if not isinstance(value, sp.Expr):
            raise TypeError(f"{name} must be a sympy expression, got {type(value).__name__}")
    pn = parse_pn_order(pn)
    decimals = tuple(decimals)
    _guard_size(yours, "your expression")
    try:
        user_series = _series(yours, orbit, sp.oo)
        beyond_known = sp.oo
    except ValueError:
        beyond_known = pn + _BEYOND
        user_series = _series(yours, orbit, beyond_known)
    derived_series = _series(derived, orbit, pn)
    points_for = _points_factory()

    lowest = min([sp.Integer(0), *map(sp.Rational, user_series.orders), *map(sp.Rational, derived_series.orders)])
    orders = []
    order = lowest
    while order <= pn:
        mine, theirs = (sp.sympify(series.coefficient(order)) for series in (user_series, derived_series))
        terms = () if (mine == 0 and theirs == 0) else _compare_coefficients(mine, theirs, decimals, points_for)
        orders.append(OrderComparison(order, _order_label(order, orbit), _worst([t.status for t in terms]), terms))
        order += sp.Rational(1, 2)
    display = {d.symbol: d.display() for d in decimals}
    beyond = tuple((o, _order_label(o, orbit), _from_eps(_canonical(sp.sympify(user_series.coefficient(o)).xreplace(display))))
                   for o in map(sp.Rational, user_series.orders) if o > pn)

    eps_value = sp.sqrt(S.x) if orbit == "circular" else 1 / S.c
    truncated = _from_eps(user_series.truncate(pn).to_expression(_EPS)).xreplace({_EPS: eps_value})
    reference = _from_eps(derived_series.to_expression(_EPS)).xreplace({_EPS: eps_value})
    check = _spot_check(truncated, reference, orbit, decimals)

    terms = [t for o in orders for t in o.terms]
    verdict = _worst([t.status for t in terms])
    notes = []
    if decimals and verdict == "agree":
        # decimal input is only as precise as it was given, even where it agrees exactly
        verdict = "agrees to digits"
    if verdict == "agrees to digits" and all(t.relative_difference in (None, 0.0) for t in terms):
        notes.append("your expression has decimals; read as exact fractions, it agrees exactly")
    if verdict in ("agree", "agrees to digits") and not check.passed:
        verdict = "cannot decide"
        notes.append("the term-by-term comparison agrees but the numeric spot check does not: please report this")
    digits = None
    if verdict == "agrees to digits":
        digits = min([t.digits for t in terms if t.status == "agrees to digits"] or [d.digits for d in decimals])
    return ComparisonReport(label, orbit, pn, tuple(orders), beyond, beyond_known, check,
                            verdict == "agree", tuple(notes), verdict, digits)


def _spot_check(yours: sp.Expr, reference: sp.Expr, orbit: str, decimals: Sequence[DecimalLiteral]) -> SpotCheck:
    """The whole truncated series at random points (a second route to the verdict)."""
    rng = random.Random(_SPOT_SEED)
    points = [_spot_values(orbit, rng) for _ in range(SPOT_POINTS)]
    exact_values = {d.symbol: d.value for d in decimals}
    # symbols beyond the orbit's (a derivation in phi keeps G, m, r0 inside logarithms) get
    # values too, the same on both sides
    others = {s for s in (yours.free_symbols | reference.free_symbols) - set(exact_values) if s not in points[0]}
    points = [{**_random_values(others, rng), **point} for point in points]
    exact_yours = sp.expand(yours.xreplace(exact_values))
    expanded_reference = sp.expand(reference)
    try:
        numbers = _compare_numerically(sp.expand(yours), exact_yours, expanded_reference,
                                       sp.expand(exact_yours - expanded_reference), decimals, points)
    except ExpressionRefusedError:
        return SpotCheck(SPOT_POINTS, math.inf, False)
    passed = numbers.within_decimals if decimals else numbers.relative <= SEPARATION
    return SpotCheck(SPOT_POINTS, numbers.relative, passed)


def compare_with_derived(user_expr: str | sp.Expr, l: int, m: int, *, orbit: str = "circular", pn: Any,
                         sign_convention: str = "review", phase: str = "psi") -> ComparisonReport:
    """Compare a user's Hhat_lm with the toolkit's derivation through absolute order ``pn``.

    Parameters
    ----------
    user_expr:
        Text (parsed by :func:`~stfalgebra.checking.safe_parser.parse_with_decimals`, never
        evaluated; decimals are compared at the precision given) or a sympy expression in the
        orbit's symbols.
    l, m:
        The mode.
    orbit:
        ``"circular"`` (Hhat in x, nu, delta) or ``"general"`` (r, rdot, phidot, m, c, nu,
        delta; G = 1).
    pn:
        Absolute PN order (circular: every term through x^pn).
    sign_convention, phase:
        Passed to :func:`stfalgebra.radiative.modes.derive_mode`.

    Returns
    -------
    ComparisonReport

    Conventions
    -----------
    Hhat_lm as in ``conventions.md``: circular h_lm = (2 G m nu x/(R c^2)) sqrt(16 pi/5)
    Hhat_lm exp(-i m psi) with Hhat_22 = 1 + O(x); general orbits with exp(-i m phi).

    Examples
    --------
    >>> report = compare_with_derived("1 + x*(-107/42 + 55*nu/42)", 2, 2, pn=1)
    >>> report.agree
    True

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), circular-orbit mode amplitudes (the Hhat_22
    of the example, from memory).
    """
    from ..radiative.modes import derive_mode

    decimals: tuple[DecimalLiteral, ...] = ()
    if isinstance(user_expr, str):
        parsed = parse_with_decimals(user_expr, orbit=orbit)
        user_expr, decimals = parsed.with_decimals, parsed.decimals
    result = derive_mode(l, m, orbit=orbit, pn=pn, sign_convention=sign_convention, phase=phase)
    return compare_expressions(user_expr, result.hhat, orbit=orbit, pn=pn, label=f"Hhat_{l},{m}",
                               decimals=decimals)
