"""Comparing a user's expression with the toolkit's derivation, PN order by PN order.

Both sides are expanded as :class:`~stfalgebra.pnseries.PNSeries` in the orbit's expansion
parameter (eps = sqrt(x) for circular orbits, eps = 1/c for general ones), put in canonical
form (delta^2 = 1 - 4 nu, logarithms expanded), and compared coefficient by coefficient and,
inside each coefficient, power of nu by power of nu. The user's terms beyond the requested
order are listed, not compared. A numeric spot check at random points (30 digits) backs the
symbolic verdict.
"""

from __future__ import annotations

import contextlib
from fractions import Fraction
import math
import random
import signal
import threading
from dataclasses import dataclass
from typing import Any, Iterator

import sympy as sp

from .. import symbols as S
from ..binary.masses import reduce_mass_difference
from ..errors import ExpressionRefusedError
from ..pnseries import PNSeries
from .safe_parser import parse_expression

__all__ = [
    "TermComparison",
    "OrderComparison",
    "SpotCheck",
    "ComparisonReport",
    "compare_expressions",
    "compare_with_derived",
    "time_limit",
    "parse_pn_order",
    "MAX_EXPANDED_TERMS",
]

MAX_EXPANDED_TERMS = 5000
"""Largest accepted estimate of the number of terms an expression expands to."""
_BEYOND = 1  # for non-polynomial user expressions: orders reported beyond pn
_SPOT_POINTS = 5
_SPOT_SEED = 1729
_SPOT_TOLERANCE = 1e-20
_NUMERIC_ZERO = 1e-30

_EPS = sp.Symbol("eps", positive=True)
_LOG_X = sp.Symbol("log_x_placeholder", real=True)
_LOG_C = sp.Symbol("log_c_placeholder", real=True)


@dataclass(frozen=True)
class TermComparison:
    """One power of nu inside one PN coefficient. ``nu_power`` None marks the part that is not
    a monomial in nu (e.g. sqrt(1 - 4 nu)); ``numeric_only`` marks an agreement established
    numerically (40 digits) after symbolic simplification gave up."""

    nu_power: sp.Rational | None
    status: str
    yours: sp.Expr
    derived: sp.Expr
    difference: sp.Expr
    numeric_only: bool = False


@dataclass(frozen=True)
class OrderComparison:
    """One PN order: ``status`` "agree" or "differ", with the per-nu-power terms."""

    order: sp.Rational
    label: str
    status: str
    terms: tuple[TermComparison, ...]


@dataclass(frozen=True)
class SpotCheck:
    """Numeric comparison of the truncated series at random points (30 digits)."""

    points: int
    max_relative_difference: float
    passed: bool


@dataclass(frozen=True)
class ComparisonReport:
    """The outcome of a comparison; ``agree`` is the verdict."""

    label: str
    orbit: str
    pn: sp.Rational
    orders: tuple[OrderComparison, ...]
    beyond: tuple[tuple[sp.Rational, str, sp.Expr], ...]
    beyond_known_through: sp.Expr
    spot_check: SpotCheck
    agree: bool
    notes: tuple[str, ...] = ()

    def to_text(self) -> str:
        """A human-readable report (deterministic)."""
        through = _order_label(self.pn, self.orbit)
        lines = [f"{self.label} ({self.orbit} orbit), compared through {through} (PN order {self.pn}):"]
        width = max((len(o.label) for o in self.orders), default=0)
        for order in self.orders:
            if order.status == "agree" and not order.terms:
                lines.append(f"  {order.label.ljust(width)}  agree (both zero)")
                continue
            lines.append(f"  {order.label.ljust(width)}  {order.status}")
            for term in order.terms:
                head = f"    {_nu_label(term.nu_power)}: {term.status}"
                if term.status == "differ":
                    head += (f": yours {sp.sstr(term.yours)}, derived {sp.sstr(term.derived)}, "
                             f"yours - derived = {sp.sstr(term.difference)}")
                elif term.numeric_only:
                    head += " (numerically, to 30 digits)"
                lines.append(head)
        if self.beyond:
            known = "" if self.beyond_known_through == sp.oo else f", expanded through {_order_label(self.beyond_known_through, self.orbit)}"
            lines.append(f"  beyond {through} in your expression (not compared{known}):")
            for _, label, coefficient in self.beyond:
                lines.append(f"    {label}: {sp.sstr(coefficient)}")
        check = self.spot_check
        lines.append(f"  numeric spot check at {check.points} points: max relative difference "
                     f"{check.max_relative_difference:.1e}")
        for note in self.notes:
            lines.append(f"  note: {note}")
        differing = [o.label for o in self.orders if o.status == "differ"]
        if self.agree:
            lines.append("result: AGREE")
        elif differing:
            lines.append(f"result: DIFFER at {', '.join(differing)}")
        else:
            lines.append("result: DIFFER (numeric spot check)")
        return "\n".join(lines)

    def to_json(self) -> dict:
        """A JSON-serialisable dict (strings in sympy syntax, orders as strings)."""
        return {
            "label": self.label,
            "orbit": self.orbit,
            "pn": str(self.pn),
            "verdict": "agree" if self.agree else "differ",
            "orders": [
                {"order": str(o.order), "label": o.label, "status": o.status,
                 "terms": [{"nu_power": None if t.nu_power is None else str(t.nu_power), "status": t.status,
                            "yours": sp.sstr(t.yours), "derived": sp.sstr(t.derived),
                            "difference": sp.sstr(t.difference), "numeric_only": t.numeric_only}
                           for t in o.terms]}
                for o in self.orders],
            "beyond": [{"order": str(order), "label": label, "yours": sp.sstr(coefficient)}
                       for order, label, coefficient in self.beyond],
            "beyond_known_through": str(self.beyond_known_through),
            "spot_check": {"points": self.spot_check.points,
                           "max_relative_difference": float(f"{self.spot_check.max_relative_difference:.3e}"),
                           "passed": self.spot_check.passed},
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
    A context manager.

    Conventions
    -----------
    Uses ``SIGALRM`` (POSIX, main thread only); elsewhere the block runs without a limit.

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

    active = [True]

    def expired(signum, frame):
        if active[0]:
            raise _Timeout

    previous = signal.signal(signal.SIGALRM, expired)
    # Re-arm every second after the first expiry: sympy catches broad exceptions in places,
    # so one swallowed alarm must not end the limit (_Timeout is a BaseException for the same
    # reason: "except Exception" does not catch it).
    signal.setitimer(signal.ITIMER_REAL, seconds, 1.0)
    try:
        try:
            yield
        finally:
            active[0] = False
            signal.setitimer(signal.ITIMER_REAL, 0)
    except _Timeout:
        active[0] = False
        signal.setitimer(signal.ITIMER_REAL, 0)
        raise ExpressionRefusedError(f"{what} took longer than {seconds:g} s (expression too expensive)") from None
    finally:
        signal.signal(signal.SIGALRM, previous)


class _Timeout(BaseException):
    """Raised by the alarm handler of :func:`time_limit`."""


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
    """A PN order: a non-negative multiple of 1/2 given as int, Rational or text.

    Parameters
    ----------
    value:
        ``2``, ``sp.Rational(3, 2)``, ``"1.5"``, ``"3/2"``.

    Returns
    -------
    sympy.Rational

    Conventions
    -----------
    Floats and text are converted exactly; anything that is not a non-negative multiple of
    1/2 is a ValueError naming it.

    Examples
    --------
    >>> parse_pn_order("3/2"), parse_pn_order(2)
    (3/2, 2)

    References
    ----------
    Common practice.
    """
    if isinstance(value, bool):
        raise ValueError(f"PN order must be a non-negative multiple of 1/2, got {value!r}")
    try:
        if isinstance(value, str):
            if len(value) > 40:
                raise ValueError
            fraction = Fraction(value.strip())
        elif isinstance(value, sp.Basic) and value.is_Rational:
            fraction = Fraction(int(value.p), int(value.q))
        elif isinstance(value, (int, float, Fraction)):
            fraction = Fraction(value)
        else:
            raise ValueError
    except (ValueError, ZeroDivisionError, OverflowError):
        raise ValueError(f"PN order must be a non-negative multiple of 1/2, got {value!r}") from None
    if fraction < 0 or (2 * fraction).denominator != 1 or fraction > 100:
        raise ValueError(f"PN order must be a non-negative multiple of 1/2 (at most 100), got {value!r}")
    return sp.Rational(fraction.numerator, fraction.denominator)


def _canonical(expression: sp.Expr) -> sp.Expr:
    expression = sp.expand(sp.expand_log(expression, force=True))
    try:
        return reduce_mass_difference(expression)
    except ValueError:  # delta inside a function: leave it as written
        return expression


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


def _numeric_values(symbols: set[sp.Symbol], rng: random.Random) -> dict[sp.Symbol, sp.Rational]:
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


def _may_hide_zero(expression: sp.Expr) -> bool:
    for function in expression.atoms(sp.Function):
        if not (isinstance(function, sp.log) and (function.args[0].is_Integer or function.args[0].is_Symbol)):
            return True
    return any(not power.exp.is_Integer and not power.base.is_Rational for power in expression.atoms(sp.Pow))


def _is_zero(difference: sp.Expr) -> tuple[bool, bool]:
    """(zero, numerically_only) for a canonical difference."""
    if difference == 0:
        return True, False
    if not _may_hide_zero(difference):
        # An expanded polynomial in the symbols, with rationals, pi, EulerGamma, logarithms of
        # integers (expanded into primes) and square roots of rationals (sympy keeps those in a
        # canonical form): a structural non-zero is a true non-zero.
        return False, False
    simplified = sp.simplify(difference)
    if simplified == 0:
        return True, False
    rng = random.Random(_SPOT_SEED)
    for _ in range(3):
        point = _numeric_values(difference.free_symbols, rng)
        value = sp.N(difference, 40, subs=point)
        if not value.is_number or abs(complex(value)) > _NUMERIC_ZERO:
            return False, False
    return True, True


def _compare_coefficients(yours: sp.Expr, derived: sp.Expr) -> tuple[TermComparison, ...]:
    mine, theirs = _by_nu_power(_canonical(yours)), _by_nu_power(_canonical(derived))
    keys = sorted(set(mine) | set(theirs), key=lambda k: (k is None, k if k is not None else 0))
    if None in mine or None in theirs:
        # One side is not polynomial in nu: compare the coefficient as a whole.
        difference = _canonical(yours - derived)
        zero, numeric = _is_zero(difference)
        return (TermComparison(None, "agree" if zero else "differ", _from_eps(sp.Add(*mine.values())),
                               _from_eps(sp.Add(*theirs.values())), _from_eps(difference), numeric),)
    terms = []
    for key in keys:
        a, b = mine.get(key, sp.S.Zero), theirs.get(key, sp.S.Zero)
        difference = _canonical(a - b)
        zero, numeric = _is_zero(difference)
        terms.append(TermComparison(key, "agree" if zero else "differ", _from_eps(a), _from_eps(b),
                                    _from_eps(difference), numeric))
    return tuple(terms)


def _spot_points(orbit: str, rng: random.Random) -> dict[sp.Symbol, sp.Rational]:
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


def _spot_check(yours: sp.Expr, derived: sp.Expr, orbit: str) -> SpotCheck:
    rng = random.Random(_SPOT_SEED)
    worst = 0.0
    for _ in range(_SPOT_POINTS):
        point = _spot_points(orbit, rng)
        a = sp.N(yours, 30, subs=point)
        b = sp.N(derived, 30, subs=point)
        if not (a.is_number and b.is_number):
            return SpotCheck(_SPOT_POINTS, math.inf, False)
        a, b = complex(a), complex(b)
        scale = max(abs(a), abs(b))
        difference = abs(a - b)
        relative = 0.0 if difference == 0 else (difference / scale if scale > 0 else math.inf)
        if not math.isfinite(relative):
            return SpotCheck(_SPOT_POINTS, math.inf, False)
        worst = max(worst, relative)
    return SpotCheck(_SPOT_POINTS, worst, worst <= _SPOT_TOLERANCE)


# ----------------------------------------------------------------------------- public
def compare_expressions(yours: sp.Expr, derived: sp.Expr, *, orbit: str = "circular", pn: Any,
                        label: str = "expression") -> ComparisonReport:
    """Compare two expressions as PN series through absolute order ``pn``.

    Parameters
    ----------
    yours:
        The expression under test (a sympy expression in the orbit's symbols).
    derived:
        The reference (trusted; terms beyond ``pn`` are ignored).
    orbit:
        ``"circular"`` (expansion in sqrt(x)) or ``"general"`` (expansion in 1/c).
    pn:
        Absolute PN order through which to compare (multiple of 1/2; circular: x^pn).
    label:
        Name used in the report.

    Returns
    -------
    ComparisonReport
        Per order and power of nu: agree or differ with both values and the difference;
        the user's terms beyond ``pn``; a numeric spot check.

    Conventions
    -----------
    Canonical form before comparing: logarithms expanded, delta^2 = 1 - 4 nu, expanded.
    Circular order n is the coefficient of x^n (log x kept inside the coefficient); general
    order n the coefficient of (1/c)^(2n). The verdict is "agree" when every order agrees
    and the spot check confirms it to 20 digits.

    Examples
    --------
    >>> from stfalgebra.symbols import x, nu
    >>> derived = 1 + x*(-sp.Rational(107, 42) + 55*nu/42)
    >>> compare_expressions(1 + x*(-sp.Rational(107, 42) + 55*nu/43), derived, pn=1).orders[2].terms[1].status
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
    _guard_size(yours, "your expression")
    user_series = None
    try:
        user_series = _series(yours, orbit, sp.oo)
        beyond_known = sp.oo
    except ValueError:
        beyond_known = pn + _BEYOND
        user_series = _series(yours, orbit, beyond_known)
    derived_series = _series(derived, orbit, pn)

    lowest = min([sp.Integer(0), *map(sp.Rational, user_series.orders), *map(sp.Rational, derived_series.orders)])
    orders = []
    order = lowest
    while order <= pn:
        mine, theirs = (sp.sympify(series.coefficient(order)) for series in (user_series, derived_series))
        terms = () if (mine == 0 and theirs == 0) else _compare_coefficients(mine, theirs)
        status = "agree" if all(t.status == "agree" for t in terms) else "differ"
        orders.append(OrderComparison(order, _order_label(order, orbit), status, terms))
        order += sp.Rational(1, 2)
    beyond = tuple((o, _order_label(o, orbit), _from_eps(_canonical(sp.sympify(user_series.coefficient(o)))))
                   for o in map(sp.Rational, user_series.orders) if o > pn)

    eps_value = sp.sqrt(S.x) if orbit == "circular" else 1 / S.c
    truncated = _from_eps(user_series.truncate(pn).to_expression(_EPS)).xreplace({_EPS: eps_value})
    reference = _from_eps(derived_series.to_expression(_EPS)).xreplace({_EPS: eps_value})
    check = _spot_check(truncated, reference, orbit)
    symbolic = all(o.status == "agree" for o in orders)
    notes = []
    if symbolic and not check.passed:
        notes.append("the symbolic comparison agrees but the numeric spot check does not: please report this")
    return ComparisonReport(label, orbit, pn, tuple(orders), beyond, beyond_known, check,
                            symbolic and check.passed, tuple(notes))


def compare_with_derived(user_expr: str | sp.Expr, l: int, m: int, *, orbit: str = "circular", pn: Any,
                         sign_convention: str = "review", phase: str = "psi") -> ComparisonReport:
    """Compare a user's Hhat_lm with the toolkit's derivation through absolute order ``pn``.

    Parameters
    ----------
    user_expr:
        Text (parsed by :func:`~stfalgebra.checking.safe_parser.parse_expression`, never
        evaluated) or a sympy expression in the orbit's symbols.
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

    if isinstance(user_expr, str):
        user_expr = parse_expression(user_expr, orbit=orbit)
    result = derive_mode(l, m, orbit=orbit, pn=pn, sign_convention=sign_convention, phase=phase)
    return compare_expressions(user_expr, result.hhat, orbit=orbit, pn=pn, label=f"Hhat_{l},{m}")
