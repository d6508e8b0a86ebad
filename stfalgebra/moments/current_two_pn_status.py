"""Whether the 2PN current moments J_L of two point masses are complete: the terms still missing.

The table of contributions reads this module to decide whether its row "2PN current moments of
two point masses with the 2PN equations of motion" is derived (and to name what is missing when
it is not). It lives apart from :mod:`stfalgebra.moments.current_two_pn_cubic` (which re-exports
:data:`MISSING_TERMS`) so that reading the table (every cold ``mode``/``modes`` command) does
not import sympy, which the derivation uses.

:data:`MISSING_TERMS` is empty since the g = ln(r1 + r2 + r12) volume terms are derived
(:mod:`stfalgebra.moments.current_two_pn_g_volume`, included in
:func:`stfalgebra.moments.current_two_pn_cubic.cubic_field_term`): the row of the table is derived
through relative 2PN. A term found missing later goes back here, and the row and
:func:`stfalgebra.moments.current_two_pn_quadratic.current_moment_two_pn` refuse, naming it.

Example
-------
>>> from stfalgebra.moments.current_two_pn_status import missing_terms_text
>>> current_two_pn_complete(), missing_terms_text()
(True, '')
"""

from __future__ import annotations

__all__ = ["MISSING_TERMS", "CURRENT_TWO_PN_SOURCE", "current_two_pn_complete", "missing_terms_text"]

#: The cubic non-compact terms of the 2PN J_L that
#: :func:`stfalgebra.moments.current_two_pn_cubic.cubic_field_term` does not include and no other
#: function supplies yet (an assembly of J_L at 2PN refuses, naming them, until this is empty).
MISSING_TERMS: tuple[str, ...] = ()

#: How the 2PN J_L are derived (the table of contributions quotes it).
CURRENT_TWO_PN_SOURCE = (
    "derived: the general source current moment (formula (J1) of stfalgebra.moments.current_two_pn) reduced at "
    "2PN and applied to point masses: compact terms with the Hadamard-regularised metric and the 2PN "
    "centre-of-mass relations (stfalgebra.moments.current_two_pn_quadratic), bilinear field terms through "
    "two-centre finite-part kernels, cubic non-compact terms through the Hadamard partie finie with "
    "polynomial weights and the g = ln(r1 + r2 + r12) volume terms (stfalgebra.moments.current_two_pn_cubic, "
    "current_two_pn_g_volume); the tests compare the circular (2,1) mode at relative 2PN and the circular J_ij at 2PN "
    "with Blanchet, Faye, Iyer & Sinha, Class. Quantum Grav. 25, 165003 (2008) (from memory)")


def current_two_pn_complete() -> bool:
    """True when no term of the 2PN J_L is missing (:data:`MISSING_TERMS` empty).

    Example
    -------
    >>> current_two_pn_complete() == (not MISSING_TERMS)
    True
    """
    return not MISSING_TERMS


def missing_terms_text() -> str:
    """The missing terms in words, for the table's row and the refusals ("" when complete).

    Example
    -------
    >>> missing_terms_text() == "" if current_two_pn_complete() else "not derived yet" in missing_terms_text()
    True
    """
    if not MISSING_TERMS:
        return ""
    return "terms of the cubic non-compact part not derived yet: " + "; ".join(MISSING_TERMS)
