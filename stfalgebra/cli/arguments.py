"""Bounded parsing of the numbers a user types on the command line.

Text becomes a number only after a short regular expression has accepted it, so that no input
can make the parser work hard (``Fraction("1e100000000")`` would build a hundred-million-digit
integer) and NaN, infinities and hexadecimal forms never get through. Errors are
:class:`~stfalgebra.cli.UsageError` naming the option and the text: one line, exit code 2.
"""

from __future__ import annotations

import re
from fractions import Fraction

from . import UsageError

__all__ = ["parse_exact_number", "parse_float", "parse_int", "exact_number_text"]

_MAX_TEXT = 64
# a sign, at most 20 digits before and 30 after the point, an exponent of at most 3 digits
_DECIMAL = re.compile(r"^\s*[+-]?(?:\d{1,20}(?:\.\d{0,30})?|\.\d{1,30})(?:[eE][+-]?\d{1,3})?\s*$")
_RATIO = re.compile(r"^\s*[+-]?\d{1,20}\s*/\s*\d{1,20}\s*$")
_INTEGER = re.compile(r"^\s*[+-]?\d{1,9}\s*$")
# floats beyond this are refused before conversion (float() would overflow)
_FLOAT_LIMIT = Fraction(10) ** 300


def _shown(text: str) -> str:
    return text if len(text) <= _MAX_TEXT else text[:_MAX_TEXT] + "..."


def parse_exact_number(text: str, flag: str) -> Fraction:
    """A decimal (``0.5``, ``5e-1``) or a ratio (``1/2``) typed by a user, as an exact Fraction.

    Parameters
    ----------
    text:
        The option's text.
    flag:
        The option's name, for the message.

    Returns
    -------
    fractions.Fraction

    Raises
    ------
    UsageError
        Anything else (NaN, inf, hexadecimal, a huge exponent, a zero denominator, over-long
        text): one line naming the option and the text.

    **Conventions**: at most 20 digits before the point, 30 after it and 3 in the exponent.

    Example
    -------
    >>> parse_exact_number("5e-1", "--eccentricity")
    Fraction(1, 2)

    References
    ----------
    Common practice.
    """
    if len(text) <= _MAX_TEXT and _DECIMAL.match(text):
        return Fraction(text.strip())
    if len(text) <= _MAX_TEXT and _RATIO.match(text):
        numerator, denominator = text.split("/")
        if int(denominator) != 0:
            return Fraction(int(numerator), int(denominator))
    raise UsageError(f"{flag} must be a number such as 0.5 or 1/2, got {_shown(text)!r}")


def parse_float(text: str, flag: str) -> float:
    """:func:`parse_exact_number`, then a float (values beyond 1e300 in size are refused).

    Example
    -------
    >>> parse_float("0.25", "--nu")
    0.25

    References
    ----------
    Common practice.
    """
    value = parse_exact_number(text, flag)
    if abs(value) > _FLOAT_LIMIT:
        raise UsageError(f"{flag} is out of range, got {_shown(text)!r}")
    return float(value)


def parse_int(text: str, flag: str, low: int, high: int) -> int:
    """An integer typed by a user, in ``[low, high]``.

    Parameters
    ----------
    text, flag:
        As for :func:`parse_exact_number`.
    low, high:
        Inclusive bounds.

    Returns
    -------
    int

    Raises
    ------
    UsageError
        Not an integer of at most 9 digits, or out of range.

    Example
    -------
    >>> parse_int("12", "--series", 2, 40)
    12

    References
    ----------
    Common practice.
    """
    if len(text) > _MAX_TEXT or not _INTEGER.match(text):
        raise UsageError(f"{flag} must be an integer, got {_shown(text)!r}")
    value = int(text)
    if not low <= value <= high:
        raise UsageError(f"{flag} must lie in [{low}, {high}], got {_shown(text)!r}")
    return value


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
