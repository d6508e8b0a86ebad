"""Turning arbitrary labels into identifiers that are safe in C99 and in Python.

A label such as ``"h(2,-1)"`` or ``"3PN flux"`` becomes ``h_2_m1`` or ``v_3PN_flux``: every
character outside ``[A-Za-z0-9_]`` is replaced, a leading digit is prefixed, and a name that a
C compiler, the C math library or Python reserves gets a trailing underscore. The mapping is
deterministic, so the same label always yields the same identifier.
"""

from __future__ import annotations

import keyword
import re
from typing import Iterable

__all__ = ["RESERVED_IDENTIFIERS", "MAX_FUNCTION_NAME_LENGTH", "sanitize_identifier", "unique_identifiers",
           "function_identifier"]

MAX_FUNCTION_NAME_LENGTH = 48
"""Longest generated function name: the header defines ``NAME_INDEX_<output>`` macros, which
then stay within the 63 significant initial characters C99 guarantees for macro names
(ISO/IEC 9899:1999, 5.2.4.1), and every file name built from it stays short."""

_C_KEYWORDS = frozenset(
    """auto break case char const continue default do double else enum extern float for goto if
    inline int long register restrict return short signed sizeof static struct switch typedef
    union unsigned void volatile while _Bool _Complex _Imaginary""".split()
)

# Names from <math.h> and <stdlib.h> that a generated parameter or output must not shadow:
# the generated bodies call some of them, and shadowing the rest confuses readers.
_C_LIBRARY_NAMES = frozenset(
    """acos acosh asin asinh atan atan2 atanh cbrt ceil copysign cos cosh erf erfc exp exp2
    expm1 fabs fdim floor fma fmax fmin fmod frexp gamma hypot ilogb ldexp lgamma llrint llround
    log log10 log1p log2 logb lrint lround modf nan nearbyint nextafter pow remainder remquo
    rint round scalbn sin sinh sqrt tan tanh tgamma trunc abs div exit free malloc main errno
    signgam y0 y1 yn j0 j1 jn complex imaginary I NULL numpy""".split()
)

RESERVED_IDENTIFIERS: frozenset[str] = (
    _C_KEYWORDS | _C_LIBRARY_NAMES | frozenset(keyword.kwlist) | frozenset(keyword.softkwlist)
)
"""Every name :func:`sanitize_identifier` refuses to return unchanged."""

_INVALID = re.compile(r"[^A-Za-z0-9_]")
_MINUS_DIGIT = re.compile(r"-([0-9])")


def sanitize_identifier(label: str, *, reserved: Iterable[str] = ()) -> str:
    """Return an identifier valid in C99 and Python derived deterministically from ``label``.

    Parameters
    ----------
    label:
        Any non-empty text naming an output, an input or a function.
    reserved:
        Extra names to avoid (for instance the names already taken by the inputs).

    Returns
    -------
    str
        ``label`` itself when it is already a safe identifier; otherwise ``label`` with each
        minus sign before a digit written ``m`` (so ``h_2_-1`` and ``h_2_1`` stay distinct), every other character
        outside ``[A-Za-z0-9_]`` written ``_``, runs of ``_`` collapsed, ``v_`` prefixed to a
        leading digit or underscore, and ``_`` appended to a reserved name.

    Conventions
    -----------
    Identifiers never start with an underscore (C reserves many such names) and never equal a
    C or Python keyword, a C library function name or an entry of ``reserved``.

    Examples
    --------
    >>> sanitize_identifier("h(2,-1)")
    'h_2_m1'
    >>> sanitize_identifier("log")
    'log_'
    >>> sanitize_identifier("3PN flux")
    'v_3PN_flux'
    >>> sanitize_identifier("gen-modes")
    'gen_modes'

    References
    ----------
    ISO/IEC 9899:1999 (C99), section 6.4.2 (identifiers) and 7.1.3 (reserved identifiers).
    """
    if not isinstance(label, str):
        raise TypeError(f"identifier label must be a str, got {label!r}")
    if not label.strip():
        raise ValueError(f"identifier label must not be empty, got {label!r}")
    text = _MINUS_DIGIT.sub(r"m\1", label.strip())
    text = _INVALID.sub("_", text)
    text = re.sub(r"_+", "_", text).strip("_") or "v"
    if text[0].isdigit():
        text = "v_" + text
    taken = RESERVED_IDENTIFIERS | frozenset(reserved)
    while text in taken:
        text += "_"
    return text


def unique_identifiers(labels: Iterable[str], *, reserved: Iterable[str] = ()) -> tuple[str, ...]:
    """Sanitise several labels so that the results are distinct from each other and ``reserved``.

    Parameters
    ----------
    labels:
        The labels, in output order.
    reserved:
        Names none of the results may take.

    Returns
    -------
    tuple of str
        One identifier per label; a collision after sanitising gets ``_2``, ``_3``... appended.

    Conventions
    -----------
    The first label keeps the plain sanitised name; later colliding labels are numbered in
    order of appearance.

    Examples
    --------
    >>> unique_identifiers(["h 22", "h_22", "x"], reserved=["x"])
    ('h_22', 'h_22_2', 'x_')

    References
    ----------
    Common practice.
    """
    reserved = frozenset(reserved)
    taken = set(reserved)
    result = []
    for label in labels:
        base = sanitize_identifier(label, reserved=reserved)
        name, k = base, 2
        while name in taken:
            name = f"{base}_{k}"
            k += 1
        taken.add(name)
        result.append(name)
    return tuple(result)


def function_identifier(label: str) -> str:
    """The identifier of a generated function: :func:`sanitize_identifier` of ``label``, at
    most :data:`MAX_FUNCTION_NAME_LENGTH` characters long.

    Parameters
    ----------
    label:
        The name the user asked for (``--function-name``).

    Returns
    -------
    str

    Raises
    ------
    ValueError
        Empty, or too long after sanitising: one line naming its length and the maximum.

    Conventions
    -----------
    A long name is refused, never cut: two long names cut to one prefix would collide.

    Examples
    --------
    >>> function_identifier("gen-modes")
    'gen_modes'
    >>> function_identifier("f" * 260)
    Traceback (most recent call last):
    ...
    ValueError: function name 'fffffffffffffffffffffffffffffffffffff...' has 260 characters, at most 48
    """
    name = sanitize_identifier(label)
    if len(name) > MAX_FUNCTION_NAME_LENGTH:
        shown = label if len(label) <= 40 else label[:37] + "..."
        raise ValueError(f"function name {shown!r} has {len(name)} characters, at most {MAX_FUNCTION_NAME_LENGTH}")
    return name
