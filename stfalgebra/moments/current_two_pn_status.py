"""Whether the 2PN current moments J_L of two point masses are complete: the terms still missing.

The table of contributions reads this module to decide whether its row "2PN current moments of
two point masses with the 2PN equations of motion" is derived (and to name what is missing when
it is not). It lives apart from :mod:`stfalgebra.moments.current_two_pn_cubic` (which re-exports
:data:`MISSING_TERMS`) so that reading the table (every cold ``mode``/``modes`` command) does
not import sympy, which the derivation uses.

When the last cubic term is derived, :data:`MISSING_TERMS` becomes empty: the row of the table
becomes derived through relative 2PN, and
:func:`stfalgebra.moments.current_two_pn_quadratic.current_moment_two_pn` adds the g-volume terms
(``current_two_pn_cubic.g_volume_term``) to the other terms.

Example
-------
>>> from stfalgebra.moments.current_two_pn_status import missing_terms_text
>>> missing_terms_text().startswith("the g = ln(r1 + r2 + r12) volume terms") or missing_terms_text() == ""
True
"""

from __future__ import annotations

__all__ = ["MISSING_TERMS", "CURRENT_TWO_PN_SOURCE", "current_two_pn_complete", "missing_terms_text"]

#: The cubic non-compact terms of the 2PN J_L that
#: :func:`stfalgebra.moments.current_two_pn_cubic.cubic_field_term` does not include and no other
#: function supplies yet (an assembly of J_L at 2PN refuses, naming them, until this is empty).
MISSING_TERMS: tuple[str, ...] = (
    "2 d_kU d_bR_k with the g part of R^nc (G^2 m1 m2 m_C)",
    "the pointwise W terms of Lambda^0b|eps^7 with the g part of W^nc (G^2 m1 m2 m_C)")

#: How the 2PN J_L are derived (the table of contributions quotes it).
CURRENT_TWO_PN_SOURCE = (
    "derived: the general source current moment (formula (J1) of stfalgebra.moments.current_two_pn) reduced at "
    "2PN and applied to point masses: compact terms with the Hadamard-regularised metric and the 2PN "
    "centre-of-mass relations (stfalgebra.moments.current_two_pn_quadratic), bilinear field terms through "
    "two-centre finite-part kernels, cubic non-compact terms through the Hadamard partie finie with "
    "polynomial weights and the g = ln(r1 + r2 + r12) volume terms (stfalgebra.moments.current_two_pn_cubic)")


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
    >>> "g part of R^nc" in missing_terms_text() or current_two_pn_complete()
    True
    """
    if not MISSING_TERMS:
        return ""
    return ("the g = ln(r1 + r2 + r12) volume terms of the cubic non-compact part, not derived yet: "
            + "; ".join(MISSING_TERMS))
