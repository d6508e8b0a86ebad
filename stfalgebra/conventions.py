"""The project's named conventions: the two sign conventions and the conventions document.

A convention is named after what it is, not after a paper: the sign of every h_lm depends on
the polarisation triad (N, P, Q) of the observer, and the two triads in use are

- ``minus-phi-theta``: P = -e_Phi, Q = e_Theta (P along the line of nodes); it gives
  Hhat_22 = 1 + O(x) and is the default;
- ``theta-phi``: P = e_Theta, Q = e_Phi; every h_lm has the opposite sign.

The whole set of conventions (binary, STF tensors, moments, modes, phases, fluxes, orders) is
written out in ``conventions.md`` beside this module; :func:`conventions_document` returns it
(``stfalgebra conventions`` prints it). This module uses the standard library only, so that
the command line can check a convention's name before importing the engine.
"""

from __future__ import annotations

import warnings
from importlib import resources

__all__ = ["SIGN_CONVENTIONS", "DEPRECATED_SIGN_CONVENTIONS", "resolve_sign_convention", "conventions_document"]

#: name -> (sign of every h_lm relative to the default, the words printed with a result)
SIGN_CONVENTIONS = {
    "minus-phi-theta": (1, "minus-phi-theta: polarisation triad P = -e_Phi, Q = e_Theta (Hhat_22 = +1 + O(x))"),
    "theta-phi": (-1, "theta-phi: polarisation triad P = e_Theta, Q = e_Phi (every h_lm has the opposite sign)"),
}
#: Old names, accepted for one release with a deprecation warning: old -> new.
DEPRECATED_SIGN_CONVENTIONS = {"review": "minus-phi-theta"}


def deprecation_message(name: str) -> str:
    """The words of the warning for an old sign-convention name."""
    new = DEPRECATED_SIGN_CONVENTIONS[name]
    return (f"sign convention {name!r} is deprecated and will be removed in the next release; use {new!r} "
            f"(the same convention: {SIGN_CONVENTIONS[new][1].partition(': ')[2]})")


def resolve_sign_convention(name: str, *, warn: bool = True) -> str:
    """The current name of a sign convention; an old name is replaced, with a DeprecationWarning.

    Parameters
    ----------
    name:
        ``"minus-phi-theta"``, ``"theta-phi"`` or an old name (``"review"``).
    warn:
        Issue the DeprecationWarning for an old name (the command line writes its own line).

    Returns
    -------
    str

    Raises
    ------
    ValueError
        An unknown name (the message lists the known ones).

    **Conventions**: module docstring.

    Example
    -------
    >>> resolve_sign_convention("theta-phi")
    'theta-phi'
    >>> resolve_sign_convention("review", warn=False)
    'minus-phi-theta'

    References
    ----------
    Common practice (the two polarisation triads of the PN literature).
    """
    if name in DEPRECATED_SIGN_CONVENTIONS:
        if warn:
            warnings.warn(deprecation_message(name), DeprecationWarning, stacklevel=3)
        return DEPRECATED_SIGN_CONVENTIONS[name]
    if name not in SIGN_CONVENTIONS:
        raise ValueError(f"sign convention must be one of {', '.join(SIGN_CONVENTIONS)}, got {name!r}")
    return name


def conventions_document() -> str:
    """The conventions document shipped with the package (``stfalgebra/conventions.md``).

    Example
    -------
    >>> conventions_document().startswith("# Conventions")
    True
    """
    return resources.files("stfalgebra").joinpath("conventions.md").read_text(encoding="utf-8")
