"""Every numeric option of the command line, parsed, validated and bounded in one place.

A command never converts option text itself: it calls the parser of this module that belongs
to the option, so that the same option has the same accepted range on every command that
takes it, and every refusal is one line naming the value and the range. The parsers bound the
*text* before converting it (at most a few dozen characters, no exponent notation with more
than two digits), so that no input can make a conversion work hard: ``1e100000000`` is refused
at once instead of being expanded into a huge integer.

==================  =====================================  ==================================
option              accepted                               commands
==================  =====================================  ==================================
``l``, ``--mode``   integers 2 <= l <= 30, abs(m) <= l     mode, check, emit
``--lmax``          integers 2 <= lmax <= 30               modes, emit
``--pn``,           multiples of 1/2 from 0 to the         mode, modes, flux, check, emit,
``--pn-relative``   largest order the command derives      evolve
                    (:func:`maximum_pn_order`)
``--nu``            (0, 1/4]                               evolve
``--e0``            [0, 1)                                 evolve
``--x0``,           [1e-8, 1)                              evolve
``--x-final``
``--steps``         integers 1 to 100000                   evolve
``--chi1``,         [-1, 1] (aligned spin components;      evolve (with ``--spins aligned``)
``--chi2``          default 0)
``--points``        integers 2 to 10000 (track rows);      evolve; emit
                    1 to 1000 (verification points)
``--time-limit``    1 to 3600 seconds (default 120)        check
``--jobs``          integers 1 to 64 (default 1)           modes, emit
==================  =====================================  ==================================

Two named options are shared too: ``--format text|latex|json`` (:data:`FORMATS`; ``--json``
stays a synonym of ``--format json`` where it existed) and ``--sign-convention
minus-phi-theta|theta-phi`` (:func:`add_sign_convention_option`; the old name ``review`` is
accepted for one release with a one-line warning on stderr).

Numbers are decimals (``0.25``, ``2.5e-3``) or fractions (``1/4``) wherever a number is
accepted; they are read exactly (as :class:`fractions.Fraction`), and ``nan``, ``inf`` and
hexadecimal text are refused.

This module uses the standard library only (and :mod:`stfalgebra.orders`): a warm command-line
call must be able to parse its options without importing sympy. The largest PN order a command
derives is read from the engine only when a result has to be derived
(:func:`maximum_pn_order`).
"""

from __future__ import annotations

import argparse
import re
from fractions import Fraction
from typing import Callable, Iterable

from ..conventions import DEPRECATED_SIGN_CONVENTIONS, SIGN_CONVENTIONS, deprecation_message
from ..errors import OrderBeyondInputsError
from ..limits import L_MAXIMUM
from ..orders import PNOrder, parse_pn_order

__all__ = [
    "LazyHelp",
    "L_MAXIMUM",
    "STEPS_RANGE",
    "TRACK_POINTS_RANGE",
    "VERIFICATION_POINTS_RANGE",
    "TIME_LIMIT_RANGE",
    "DEFAULT_CHECK_TIME_LIMIT",
    "X_MINIMUM",
    "HARMONICS_RANGE",
    "parse_harmonics",
    "parse_integer",
    "parse_l",
    "parse_m",
    "parse_lmax",
    "parse_mode_index",
    "check_mode",
    "parse_order_syntax",
    "parse_bounded_order",
    "maximum_pn_order",
    "mode_order_refusal",
    "parse_number",
    "exact_number_text",
    "parse_nu",
    "parse_eccentricity",
    "parse_frequency_parameter",
    "parse_steps",
    "parse_spin_component",
    "parse_track_points",
    "parse_verification_points",
    "parse_time_limit",
    "parse_jobs",
    "JOBS_RANGE",
    "argparse_type",
    "FORMATS",
    "add_format_option",
    "output_format",
    "add_sign_convention_option",
    "sign_convention_of",
]

#: How a command prints its result: text (sympy-parseable expressions), LaTeX (one equation per
#: result) or one JSON document.
FORMATS = ("text", "latex", "json")

#: Inclusive range of ``evolve --steps`` (Runge-Kutta steps).
STEPS_RANGE = (1, 100_000)
#: Inclusive range of ``evolve --points`` (rows of the track).
TRACK_POINTS_RANGE = (2, 10_000)
#: Inclusive range of ``emit --points`` (random points of the verification).
VERIFICATION_POINTS_RANGE = (1, 1000)
#: Inclusive range of ``--jobs`` (worker processes of a mode set).
JOBS_RANGE = (1, 64)
#: Inclusive range, in seconds, of ``check --time-limit`` (one budget for the whole run).
TIME_LIMIT_RANGE = (1, 3600)
#: Default time budget of one ``check`` run, in seconds.
DEFAULT_CHECK_TIME_LIMIT = 120
#: Smallest accepted frequency parameter x (a binary pulsar has x ~ 1e-6).
X_MINIMUM = Fraction(1, 10**8)
#: Inclusive range of ``orbit-mode --harmonics N`` (harmonics p = -N..N).
HARMONICS_RANGE = (1, 200)

_INTEGER = re.compile(r"^\s*([+-]?)(\d{1,9})\s*$")
# a decimal with at most 30 digits and an exponent of at most two digits, or a fraction of
# two integers of at most 30 digits each: every physical value fits, nothing is expensive
_DECIMAL = re.compile(r"^\s*([+-]?)(\d{0,30})(?:\.(\d{0,30}))?(?:[eE]([+-]?\d{1,2}))?\s*$")
_FRACTION = re.compile(r"^\s*([+-]?)(\d{1,30})\s*/\s*(\d{1,30})\s*$")
_MAX_TEXT = 70


def _shown(text: object) -> str:
    """The offending value for a message, shortened (a message stays one short line)."""
    shown = text if not isinstance(text, str) or len(text) <= 40 else text[:37] + "..."
    return repr(shown)


def _one_line(message: str) -> str:
    return " ".join(message.split())


# ----------------------------------------------------------------------------- integers
def parse_integer(text: str, flag: str, low: int, high: int) -> int:
    """An integer option in the inclusive range [low, high].

    Parameters
    ----------
    text:
        The option's text (an int is accepted too, for callers from Python).
    flag:
        The option's name, for the message.
    low, high:
        Inclusive bounds.

    Returns
    -------
    int

    Raises
    ------
    ValueError
        Not an integer of at most 9 digits, or outside the range; one line naming both.

    **Conventions**: decimal digits with an optional sign; nothing else.

    Example
    -------
    >>> parse_integer("12", "--lmax", 2, 30)
    12
    >>> parse_integer("60", "--lmax", 2, 30)
    Traceback (most recent call last):
    ...
    ValueError: --lmax must be an integer from 2 to 30, got '60'

    References
    ----------
    Common practice.
    """
    wanted = f"{flag} must be an integer from {low} to {high}, got {_shown(text)}"
    if isinstance(text, int) and not isinstance(text, bool):
        value = text
    elif isinstance(text, str):
        match = _INTEGER.match(text)
        if match is None:
            raise ValueError(wanted)
        value = int(match.group(1) + match.group(2))
    else:
        raise ValueError(wanted)
    if not low <= value <= high:
        raise ValueError(wanted)
    return value


def parse_l(text: str, flag: str = "l") -> int:
    """A multipole order l: an integer from 2 to :data:`L_MAXIMUM`.

    Example
    -------
    >>> parse_l("2000")
    Traceback (most recent call last):
    ...
    ValueError: l must be an integer from 2 to 30, got '2000'
    """
    return parse_integer(text, flag, 2, L_MAXIMUM)


def parse_m(text: str, flag: str = "m") -> int:
    """An azimuthal number m with abs(m) <= :data:`L_MAXIMUM` (its bound by l is :func:`check_mode`)."""
    return parse_integer(text, flag, -L_MAXIMUM, L_MAXIMUM)


def parse_mode_index(text: str, flag: str = "mode indices") -> int:
    """One index of ``--mode L M``: an integer of modulus at most :data:`L_MAXIMUM` (the pair is
    checked by :func:`check_mode`)."""
    return parse_integer(text, flag, -L_MAXIMUM, L_MAXIMUM)


def parse_lmax(text: str, flag: str = "--lmax") -> int:
    """The highest l of a set of modes: an integer from 2 to :data:`L_MAXIMUM`.

    Example
    -------
    >>> parse_lmax("30")
    30
    """
    return parse_integer(text, flag, 2, L_MAXIMUM)


def check_mode(l: int, m: int) -> tuple[int, int]:
    """A mode (l, m) with 2 <= l <= :data:`L_MAXIMUM` and abs(m) <= l, or a ValueError.

    Example
    -------
    >>> check_mode(2, 5)
    Traceback (most recent call last):
    ...
    ValueError: |m| must not exceed l, got l = 2, m = 5
    """
    parse_l(l)
    parse_m(m)
    if abs(m) > l:
        raise ValueError(f"|m| must not exceed l, got l = {l}, m = {m}")
    return l, m


# ----------------------------------------------------------------------------- PN orders
def parse_order_syntax(text: str, flag: str) -> PNOrder:
    """A PN order's text, checked for its form only (a non-negative multiple of 1/2 of at
    most four digits): enough to build a cache key without importing the engine. Before a
    result is derived, :func:`parse_bounded_order` applies the command's largest order.

    Example
    -------
    >>> parse_order_syntax("3/2", "--pn")
    PNOrder(3/2)
    """
    return parse_pn_order(text, flag)


def parse_bounded_order(text: str, flag: str, maximum: PNOrder | Callable[[], PNOrder], *,
                        reason: Callable[[PNOrder], str | None] | None = None) -> PNOrder:
    """A PN order no larger than ``maximum`` (normally from :func:`maximum_pn_order`).

    ``maximum`` may be a function of no argument: it is called only once the text has the
    form of an order, so that malformed text is refused before the engine is imported.
    ``reason``, called with an order beyond the maximum, may give the engine's own explanation
    (:func:`mode_order_refusal`), added to the message.

    Raises
    ------
    ValueError
        Malformed text (one line naming the accepted form).
    OrderBeyondInputsError
        Above ``maximum`` (a ValueError too): the message names the largest order.

    Example
    -------
    >>> parse_bounded_order("3/2", "--pn", lambda: PNOrder(2))
    PNOrder(3/2)
    """
    order = parse_pn_order(text, flag)
    try:
        return parse_pn_order(text, flag, maximum=maximum() if callable(maximum) else maximum)
    except OrderBeyondInputsError as exc:
        why = reason(order) if reason is not None else None
        if why:
            raise OrderBeyondInputsError(f"{exc} ({why})") from None
        raise


class LazyHelp:
    """A help text computed only when argparse prints it (``--help``), so that building the
    parser of every command does not read the table of contributions (that import costs more
    than a cached command itself).

    Example
    -------
    >>> text = LazyHelp(lambda: f"at most {1 + 1}")
    >>> bool(text), text % {}
    (True, 'at most 2')
    """

    def __init__(self, make) -> None:
        self._make = make

    def __str__(self) -> str:
        return self._make()

    def __bool__(self) -> bool:
        return True

    def strip(self) -> str:
        return str(self).strip()

    def __mod__(self, params) -> str:    # argparse expands "%(default)s" with this
        return str(self) % params


def mode_order_refusal(order: PNOrder, *, orbit: str, relative: bool, modes: Iterable[tuple[int, int]] | None = None,
                       lmax: int | None = None, spins: str | None = None,
                       instantaneous_only: bool = False) -> str | None:
    """The table of contributions' own reason for refusing ``order`` for the first of the modes
    asked for that it refuses (a missing interaction, the general-orbit tail), or None.

    Example
    -------
    >>> "relative 1PN" in mode_order_refusal(PNOrder(3, 2), orbit="general", relative=True, modes=[(2, 2)])
    True
    """
    from ..radiative.contributions import (
        instantaneous_part, leading_order, mode_kind, plan_radiative_moment, table_for_spins,
    )

    rows = table_for_spins(spins)
    if instantaneous_only:
        rows = instantaneous_part(rows)
    wanted = list(modes or ())
    if lmax is not None:
        wanted += [(l, m) for l in range(2, lmax + 1) for m in range(l, -l - 1, -1)]
    for l, m in wanted:
        beyond = order if relative else order - leading_order(l, m)
        if beyond < 0 or (orbit == "circular" and m == 0 and l % 2 == 0):
            continue
        try:
            plan_radiative_moment(mode_kind(l, m), l, beyond, orbit, m=m, table=rows)
        except OrderBeyondInputsError as exc:
            return " ".join(str(exc).split())
    return None


def maximum_pn_order(command: str, *, orbit: str = "circular", relative: bool = False,
                     modes: Iterable[tuple[int, int]] | None = None, lmax: int | None = None,
                     spins: str | None = None, instantaneous_only: bool = False) -> PNOrder:
    """The largest PN order ``command`` derives, read off the table of contributions: the bound
    of its ``--pn`` / ``--pn-relative``.

    Parameters
    ----------
    command:
        ``"mode"``, ``"modes"``, ``"check"``, ``"emit"`` (mode amplitudes), ``"flux"`` or
        ``"evolve"``.
    orbit:
        ``"circular"`` or ``"general"`` for the mode commands; ``"circular"`` or
        ``"eccentric"`` for ``flux``.
    relative:
        True for ``--pn-relative`` (orders beyond each mode's leading term), False for
        ``--pn`` (absolute order).
    modes, lmax:
        The modes asked for: the bound is the largest order any of them supports (each mode
        beyond its own limit is still refused by the table, with the missing contribution).
    spins:
        None (no spins), ``"aligned"`` or ``"general"`` (the table with the spin-orbit rows; mode
        commands; ``"general"`` on general orbits only; ``flux`` and ``evolve`` take ``"aligned"``).
    instantaneous_only:
        Mode commands on general orbits: the bound of the instantaneous part alone (the rows of
        :func:`~stfalgebra.radiative.contributions.instantaneous_part`).

    Returns
    -------
    PNOrder

    **Conventions**: ``pn`` absolute (circular: through x^pn), ``pn_relative`` relative to a
    mode's leading term, which is (l - 2)/2 for mass modes (l + m even) and (l - 1)/2 for
    current modes.

    Example
    -------
    >>> maximum_pn_order("mode", relative=True, modes=[(2, 2)])
    PNOrder(5/2)
    >>> maximum_pn_order("mode", modes=[(2, 2)])
    PNOrder(5/2)
    >>> maximum_pn_order("modes", orbit="general", lmax=4)
    PNOrder(5/2)

    References
    ----------
    :mod:`stfalgebra.radiative.contributions` (the table).
    """
    from ..radiative import contributions as table

    if command in ("mode", "modes", "check", "emit"):
        if orbit not in ("circular", "general"):
            raise ValueError(f"orbit must be 'circular' or 'general', got {orbit!r}")
        rows = table.table_for_spins(spins)
        if instantaneous_only:
            rows = table.instantaneous_part(rows)
        wanted = list(modes or ()) + [(l, m) for l in range(2, (lmax or 1) + 1) for m in (l, l - 1)]
        if not wanted:
            if relative:
                return table.maximum_order_any_mode(orbit, relative=True, table=rows)
            raise ValueError("an absolute order is bounded per mode: give modes or lmax")
        if relative:
            return max(table.maximum_relative_order(table.mode_kind(l, m), l, orbit, rows, m=m) for l, m in wanted)
        return max(table.maximum_mode_order(l, m, orbit, rows) for l, m in wanted)
    # with spins, flux and evolve read the table with the spin rows (refusals name the spin-spin rows)
    spin_rows = {} if spins is None else {"table": table.table_for_spins(spins)}
    if command == "flux":
        if orbit == "circular":
            return table.maximum_flux_order("circular", **spin_rows)
        if orbit == "eccentric":
            return table.maximum_eccentric_order(**spin_rows)
        raise ValueError(f"flux orbit must be 'circular' or 'eccentric', got {orbit!r}")
    if command == "evolve":
        return table.maximum_eccentric_order(**spin_rows)
    raise ValueError(f"unknown command {command!r}")


# ----------------------------------------------------------------------------- real numbers
def exact_number_text(value: Fraction) -> str:
    """The shortest exact text of a number: a decimal when it has one, else ``p/q``.

    Example
    -------
    >>> exact_number_text(Fraction(1, 2)), exact_number_text(Fraction(1, 3)), exact_number_text(Fraction(0))
    ('0.5', '1/3', '0')

    References
    ----------
    Common practice.
    """
    denominator = value.denominator
    for prime in (2, 5):
        while denominator % prime == 0:
            denominator //= prime
    if denominator != 1:
        return f"{value.numerator}/{value.denominator}"
    digits = 0
    while (value * 10**digits).denominator != 1:
        digits += 1
    if not digits:
        return str(value.numerator)
    scaled = str(abs(value.numerator) * 10**digits // value.denominator).rjust(digits + 1, "0")
    sign = "-" if value < 0 else ""
    return f"{sign}{scaled[:-digits]}.{scaled[-digits:]}"


def parse_number(text: str, flag: str, *, low: Fraction | None = None, high: Fraction | None = None,
                 low_open: bool = False, high_open: bool = False, range_text: str | None = None) -> Fraction:
    """A real number given as a decimal or a fraction, exactly, inside a range.

    Parameters
    ----------
    text:
        ``"0.25"``, ``"2.5e-3"``, ``"1/4"`` (at most 30 digits per part, exponent of at most
        two digits).
    flag:
        The option's name, for the message.
    low, high:
        Bounds (None: unbounded on that side).
    low_open, high_open:
        Whether the bound itself is excluded.
    range_text:
        How the message writes the range (default built from the bounds).

    Returns
    -------
    fractions.Fraction
        The exact value of the text.

    Raises
    ------
    ValueError
        Not a number in that form (``nan``, ``inf``, ``abc`` ...), a zero denominator, or
        outside the range: one line naming the value and the range.

    **Conventions**: the value is exact; callers that integrate numerically take ``float``
    of it.

    Example
    -------
    >>> parse_number("1/4", "--nu", low=Fraction(0), high=Fraction(1, 4), low_open=True)
    Fraction(1, 4)
    >>> parse_number("nan", "--nu", low=Fraction(0), high=Fraction(1, 4), low_open=True)
    Traceback (most recent call last):
    ...
    ValueError: --nu must be a number in (0, 0.25] (a decimal such as 0.2 or a fraction such as 1/4), got 'nan'

    References
    ----------
    Common practice.
    """
    if range_text is None:
        left = "(-inf" if low is None else ("(" if low_open else "[") + _number_text(low)
        right = "inf)" if high is None else _number_text(high) + (")" if high_open else "]")
        range_text = f"{left}, {right}"
    wanted = (f"{flag} must be a number in {range_text} (a decimal such as 0.2 or a fraction such as 1/4), "
              f"got {_shown(text)}")
    value = _exact_number(text)
    if value is None:
        raise ValueError(_one_line(wanted))
    if low is not None and (value < low or (low_open and value == low)):
        raise ValueError(_one_line(wanted))
    if high is not None and (value > high or (high_open and value == high)):
        raise ValueError(_one_line(wanted))
    return value


def _number_text(value: Fraction) -> str:
    return exact_number_text(value)


def _exact_number(text: object) -> Fraction | None:
    if isinstance(text, Fraction):
        return text
    if isinstance(text, int) and not isinstance(text, bool):
        return Fraction(text)
    if not isinstance(text, str) or len(text) > _MAX_TEXT:
        return None
    match = _FRACTION.match(text)
    if match:
        sign, numerator, denominator = match.groups()
        if int(denominator) == 0:
            return None
        return Fraction(int(sign + numerator), int(denominator))
    match = _DECIMAL.match(text)
    if match:
        sign, whole, digits, exponent = match.groups()
        digits = digits or ""
        if not whole and not digits:
            return None
        value = Fraction(int(whole + digits or "0"), 10 ** len(digits)) * Fraction(10) ** int(exponent or 0)
        return -value if sign == "-" else value
    return None


def parse_nu(text: str, flag: str = "--nu") -> Fraction:
    """A symmetric mass ratio nu = m1 m2/m^2 in (0, 1/4].

    Example
    -------
    >>> parse_nu("0.2")
    Fraction(1, 5)
    """
    return parse_number(text, flag, low=Fraction(0), high=Fraction(1, 4), low_open=True, range_text="(0, 1/4]")


def parse_eccentricity(text: str, flag: str = "--e0") -> Fraction:
    """An eccentricity of a bound orbit, in [0, 1); refused when its double rounds to 1.

    Example
    -------
    >>> parse_eccentricity("1")
    Traceback (most recent call last):
    ...
    ValueError: --e0 must be a number in [0, 1) (a decimal such as 0.2 or a fraction such as 1/4), got '1'
    """
    value = parse_number(text, flag, low=Fraction(0), high=Fraction(1), high_open=True, range_text="[0, 1)")
    if float(value) >= 1.0:  # the integration works in doubles
        raise ValueError(f"{flag} must be a number in [0, 1) whose double is below 1, got {_shown(text)}")
    return value


def parse_frequency_parameter(text: str, flag: str) -> Fraction:
    """A frequency parameter x = (G m omega/c^3)^(2/3) in [1e-8, 1).

    Example
    -------
    >>> parse_frequency_parameter("1/100", "--x0")
    Fraction(1, 100)
    """
    return parse_number(text, flag, low=X_MINIMUM, high=Fraction(1), high_open=True, range_text="[1e-8, 1)")


def parse_spin_component(text: str, flag: str) -> Fraction:
    """A dimensionless aligned spin component chi_A = c S_A.ell/(G m_A^2), in [-1, 1].

    Example
    -------
    >>> parse_spin_component("-0.7", "--chi1")
    Fraction(-7, 10)
    >>> parse_spin_component("1.5", "--chi2")
    Traceback (most recent call last):
    ...
    ValueError: --chi2 must be a number in [-1, 1] (a decimal such as 0.2 or a fraction such as 1/4), got '1.5'
    """
    return parse_number(text, flag, low=Fraction(-1), high=Fraction(1), range_text="[-1, 1]")


def parse_steps(text: str, flag: str = "--steps") -> int:
    """Runge-Kutta steps of ``evolve``: an integer in :data:`STEPS_RANGE`."""
    return parse_integer(text, flag, *STEPS_RANGE)


def parse_track_points(text: str, flag: str = "--points") -> int:
    """Rows of an ``evolve`` track: an integer in :data:`TRACK_POINTS_RANGE`."""
    return parse_integer(text, flag, *TRACK_POINTS_RANGE)


def parse_verification_points(text: str, flag: str = "--points") -> int:
    """Random points of an ``emit`` verification: an integer in :data:`VERIFICATION_POINTS_RANGE`."""
    return parse_integer(text, flag, *VERIFICATION_POINTS_RANGE)


def parse_time_limit(text: str, flag: str = "--time-limit") -> float:
    """A time budget in seconds, in :data:`TIME_LIMIT_RANGE` (decimals and fractions accepted).

    Example
    -------
    >>> parse_time_limit("2.5")
    2.5
    """
    low, high = TIME_LIMIT_RANGE
    return float(parse_number(text, flag, low=Fraction(low), high=Fraction(high),
                              range_text=f"[{low}, {high}] seconds"))


def parse_harmonics(text: str, flag: str = "--harmonics") -> int:
    """The number N of harmonics p = -N..N of ``orbit-mode``: an integer in :data:`HARMONICS_RANGE`.

    Example
    -------
    >>> parse_harmonics("201")
    Traceback (most recent call last):
    ...
    ValueError: --harmonics must be an integer from 1 to 200, got '201'
    """
    return parse_integer(text, flag, *HARMONICS_RANGE)


def parse_jobs(text: str, flag: str = "--jobs") -> int:
    """Worker processes of a mode set: an integer from 1 to 64.

    Example
    -------
    >>> parse_jobs("4")
    4
    """
    return parse_integer(text, flag, *JOBS_RANGE)


def argparse_type(parse, *fixed: object, **named: object):
    """Wrap a parser of this module as an argparse ``type=``: its ValueError becomes argparse's
    one-line usage error (exit code 2) while the command line is read, before any work."""

    def convert(text: str):
        try:
            return parse(text, *fixed, **named)
        except ValueError as exc:
            raise argparse.ArgumentTypeError(str(exc)) from None

    convert.__name__ = getattr(parse, "__name__", "value").replace("parse_", "")
    return convert


# ----------------------------------------------------------------------------- shared named options
def add_format_option(parser: argparse.ArgumentParser, formats: tuple[str, ...] = FORMATS, *,
                      json_flag: bool = True) -> None:
    """``--format`` (and, where it was part of the contract, ``--json`` as its synonym)."""
    parser.add_argument("--format", choices=formats, default="text",
                        help="text (expressions sympy can read), latex (one equation per result) or json"
                        if "latex" in formats else "text or json")
    if json_flag:
        parser.add_argument("--json", action="store_true", help="the same as --format json")


def output_format(args: argparse.Namespace) -> str:
    """The format asked for: ``--json`` wins over ``--format``."""
    return "json" if getattr(args, "json", False) else args.format


def add_sign_convention_option(parser: argparse.ArgumentParser) -> None:
    """``--sign-convention``: the polarisation triad (default minus-phi-theta)."""
    parser.add_argument("--sign-convention", choices=tuple(SIGN_CONVENTIONS) + tuple(DEPRECATED_SIGN_CONVENTIONS),
                        default="minus-phi-theta", metavar="{" + ",".join(SIGN_CONVENTIONS) + "}",
                        help="minus-phi-theta: triad P = -e_Phi, Q = e_Theta (Hhat_22 = +1, default); "
                             "theta-phi: P = e_Theta, Q = e_Phi (every h_lm flipped)")


def sign_convention_of(args: argparse.Namespace, command: str) -> str:
    """The sign convention's current name; an old name gets one warning line on stderr.

    Example
    -------
    >>> sign_convention_of(argparse.Namespace(sign_convention="theta-phi"), "mode")
    'theta-phi'
    """
    import sys

    name = args.sign_convention
    if name in DEPRECATED_SIGN_CONVENTIONS:
        sys.stderr.write(f"stfalgebra {command}: warning: {deprecation_message(name)}\n")
        return DEPRECATED_SIGN_CONVENTIONS[name]
    return name
