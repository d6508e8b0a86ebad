"""The one PN-order type: an exact multiple of 1/2, parsed and bounded once at the edge.

A post-Newtonian order counts powers of ``1/c^2``: order ``n`` multiplies ``(1/c)^(2n)`` (for
circular orbits ``x^n``). Orders are half-integers: spin-orbit terms, tails and radiation
reaction enter at odd multiples of 1/2. :class:`PNOrder` is a :class:`fractions.Fraction`
restricted to multiples of 1/2, so it compares, hashes and prints like the exact number it is
(``str(PNOrder(3, 2)) == "3/2"``), sympy accepts it as a Rational, and sums and differences of
orders stay orders.

Names used throughout the project (code and command line alike):

- ``pn``: an *absolute* order (circular modes: every term through ``x^pn``; general orbits:
  through ``(1/c)^(2 pn)`` relative to the Newtonian h_22);
- ``pn_relative``: a *relative* order, the number of PN orders kept beyond a result's own
  leading term.

Text from a user (the command line, a file) becomes a :class:`PNOrder` only through
:func:`parse_pn_order`, which bounds the length and the value before any arithmetic, so that an
input such as ``1e100000000`` is refused at once instead of being expanded into a huge integer.
"""

from __future__ import annotations

import re
from fractions import Fraction
from typing import Any, Union

from .errors import OrderBeyondInputsError

__all__ = ["PNOrder", "parse_pn_order", "as_pn_order", "OrderLike"]

OrderLike = Union["PNOrder", int, Fraction, Any]

# at most 4 digits before and 6 after the decimal point, or a short fraction: every order the
# toolkit could ever serve fits, and nothing a user types can make the parser work hard
_DECIMAL = re.compile(r"^\s*\+?(\d{1,4})(?:\.(\d{1,6}))?\s*$")
_FRACTION = re.compile(r"^\s*\+?(\d{1,4})\s*/\s*(\d{1,4})\s*$")


class PNOrder(Fraction):
    """An exact PN order: a multiple of 1/2 (possibly negative inside series arithmetic).

    Parameters
    ----------
    value:
        An int, a :class:`fractions.Fraction`, a sympy Rational or a ``PNOrder``; with two
        arguments, numerator and denominator. Floats and strings are refused here (text goes
        through :func:`parse_pn_order`; a float is not exact).

    Returns
    -------
    PNOrder
        Equal to, and hashing like, the same Fraction.

    **Conventions**: order ``n`` multiplies ``(1/c)^(2n)``; ``pn`` is absolute, ``pn_relative``
    relative to a result's leading term (module docstring).

    Example
    -------
    >>> from stfalgebra.orders import PNOrder
    >>> PNOrder(3, 2) + 1
    PNOrder(5/2)
    >>> str(PNOrder(3, 2)), PNOrder(2).twice
    ('3/2', 4)

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 1 (relative PN orders).
    """

    __slots__ = ()

    def __new__(cls, value: Any = 0, denominator: Any = None) -> "PNOrder":
        if denominator is not None:
            for part in (value, denominator):
                if isinstance(part, bool) or not isinstance(part, int):
                    raise TypeError(f"a PN order's numerator and denominator must be ints, got {part!r}")
            frac = Fraction(value, denominator)
        else:
            frac = _exact_fraction(value)
        if frac.denominator not in (1, 2):
            raise ValueError(f"a PN order must be a multiple of 1/2, got {frac}")
        return super().__new__(cls, frac.numerator, frac.denominator)

    @classmethod
    def from_twice(cls, twice: int) -> "PNOrder":
        """The order ``twice/2`` (unchecked apart from the int type; for hot paths)."""
        return super().__new__(cls, twice, 2)

    @property
    def twice(self) -> int:
        """Twice the order, an int (the exponent of ``1/c`` or of ``sqrt(x)``)."""
        return 2 * self.numerator // self.denominator

    # arithmetic that stays among orders
    def __add__(self, other: Any) -> Any:
        total = Fraction.__add__(self, other)
        return _maybe_order(total)

    __radd__ = __add__

    def __sub__(self, other: Any) -> Any:
        return _maybe_order(Fraction.__sub__(self, other))

    def __rsub__(self, other: Any) -> Any:
        return _maybe_order(Fraction.__rsub__(self, other))

    def __neg__(self) -> "PNOrder":
        return PNOrder.from_twice(-self.twice)

    def __mul__(self, other: Any) -> Any:
        return _maybe_order(Fraction.__mul__(self, other))

    __rmul__ = __mul__

    def __repr__(self) -> str:
        return f"PNOrder({self})"

    def __reduce__(self):
        return (PNOrder, (self.numerator, self.denominator))

    def to_json(self) -> str:
        """The exact string used in every JSON output: ``"3/2"``, ``"1"``."""
        return str(self)

    def words(self) -> str:
        """``"1.5PN"``-style label (``"Newtonian"`` for 0)."""
        if self == 0:
            return "Newtonian"
        text = str(self.numerator // self.denominator) if self.denominator == 1 else f"{float(self):g}"
        return f"{text}PN"


def _maybe_order(value: Any) -> Any:
    if isinstance(value, Fraction) and value.denominator in (1, 2):
        return PNOrder.from_twice(2 * value.numerator // value.denominator)
    return value


def _exact_fraction(value: Any) -> Fraction:
    if isinstance(value, PNOrder):
        return value
    if isinstance(value, bool) or isinstance(value, float) or isinstance(value, str):
        raise TypeError(f"a PN order must be exact (int, Fraction or Rational), got {value!r}")
    if isinstance(value, int):
        return Fraction(value)
    if isinstance(value, Fraction):
        return value
    # a sympy Rational (duck-typed so that this base module never imports sympy)
    numerator, denominator = getattr(value, "p", None), getattr(value, "q", None)
    if isinstance(numerator, int) and isinstance(denominator, int) and getattr(value, "is_Rational", False):
        return Fraction(numerator, denominator)
    raise TypeError(f"a PN order must be exact (int, Fraction or Rational), got {value!r}")


def as_pn_order(value: OrderLike, what: str = "PN order") -> PNOrder:
    """An exact order from code (int, Fraction, Rational, PNOrder); floats and text are refused.

    Parameters
    ----------
    value:
        The order.
    what:
        Its name, for the message.

    Returns
    -------
    PNOrder

    Raises
    ------
    TypeError, ValueError
        Not exact, or not a multiple of 1/2; the message names ``what`` and the value.

    **Conventions**: module docstring.

    Example
    -------
    >>> as_pn_order(1)
    PNOrder(1)

    References
    ----------
    Common practice.
    """
    try:
        return PNOrder(value)
    except (TypeError, ValueError) as exc:
        raise type(exc)(f"{what}: {exc}") from None


def parse_pn_order(value: Any, what: str = "PN order", *, maximum: OrderLike | None = None,
                   minimum: OrderLike = 0) -> PNOrder:
    """Parse a PN order given by a user, bounded before any arithmetic.

    Parameters
    ----------
    value:
        Text (``"1.5"``, ``"3/2"``, ``"2"``), an int, a Fraction, a Rational or a PNOrder. A
        float is accepted only when it is an exact multiple of 1/2 (``1.5``).
    what:
        The option's name, for the message (``"--pn"``).
    maximum, minimum:
        Inclusive bounds; ``maximum`` is normally the largest order the table of
        contributions supports (the message names it).

    Returns
    -------
    PNOrder

    Raises
    ------
    ValueError
        Malformed text, not a multiple of 1/2, or out of range: one line naming the value
        and the accepted range.
    OrderBeyondInputsError
        Above ``maximum`` (a subclass of ValueError): the toolkit cannot derive that order.

    **Conventions**: module docstring.

    Example
    -------
    >>> parse_pn_order("3/2", "--pn", maximum=2)
    PNOrder(3/2)
    >>> parse_pn_order("1e100000000", "--pn", maximum=2)
    Traceback (most recent call last):
    ...
    ValueError: --pn must be a multiple of 1/2 such as 1, 1.5 or 3/2, got '1e100000000'

    References
    ----------
    Common practice.
    """
    low = PNOrder(minimum)
    if isinstance(value, str):
        text = value if len(value) <= 24 else value[:24] + "..."
        match = _DECIMAL.match(value) if len(value) <= 24 else None
        frac_match = _FRACTION.match(value) if len(value) <= 24 else None
        if match:
            whole, digits = match.group(1), match.group(2) or ""
            frac = Fraction(int(whole + digits), 10 ** len(digits))
        elif frac_match and int(frac_match.group(2)) != 0:
            frac = Fraction(int(frac_match.group(1)), int(frac_match.group(2)))
        else:
            raise ValueError(f"{what} must be a multiple of 1/2 such as 1, 1.5 or 3/2, got {text!r}")
    elif isinstance(value, float):
        if not (value == value and abs(value) < 1e4) or (2 * value) != int(2 * value):
            raise ValueError(f"{what} must be a multiple of 1/2 such as 1, 1.5 or 3/2, got {value!r}")
        frac = Fraction(int(2 * value), 2)
    else:
        try:
            frac = _exact_fraction(value)
        except TypeError:
            raise ValueError(f"{what} must be a multiple of 1/2 such as 1, 1.5 or 3/2, got {value!r}") from None
    if frac.denominator not in (1, 2):
        raise ValueError(f"{what} must be a multiple of 1/2, got {value!r}")
    order = PNOrder(frac)
    if order < low:
        raise ValueError(f"{what} must be at least {low}, got {value!r}")
    if maximum is not None and order > PNOrder(maximum):
        raise OrderBeyondInputsError(
            f"{what} = {order}: the toolkit derives this result through order {PNOrder(maximum)} at most")
    return order
