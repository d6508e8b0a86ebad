"""The general source-moment formulas applied to two point masses: sums over the bodies and the
retardation terms the mass and current formulas share.

Masses ``m_A = m X_A`` with ``X1 = (1 + delta)/2``, ``X2 = (1 - delta)/2``; centre-of-mass
positions ``y_A = s_A x`` (Newtonian ``s1 = X2``, ``s2 = -X1``; the 1PN shift ``nu delta P`` is
:func:`~stfalgebra.binary.cited_inputs.centre_of_mass_shift`). A body sum ``sum_A m_A s_A^p`` is the mass-ratio factor
of a moment: nothing two-body is typed in, the factors come out of these sums. Every value is
an exact engine polynomial (:mod:`stfalgebra.exact`), with ``delta^2 = 1 - 4 nu`` applied.
"""

from __future__ import annotations

from functools import lru_cache

from ..binary.cited_inputs import centre_of_mass_shift
from ..errors import OrderBeyondInputsError
from ..exact import ExactPolynomial, engine_symbols
from ..orders import PNOrder
from ..pnseries import PNSeries
from .orbit_tensor import Monomial, OrbitTensor, differentiate_along_orbit

__all__ = [
    "MOMENT_PN_ORDERS", "check_moment_order", "mass_fractions", "position_factor_sum",
    "companion_weighted_sum", "one_pn_position_shift", "exact_series", "retardation_term",
    "first_derivative_term",
]

#: PN orders of the source moments the toolkit derives, and the relative order through which
#: each is then known: a Newtonian moment is known through relative 1/2 and a 1PN one through
#: 3/2, because non-spinning point-mass source moments have no 0.5PN or 1.5PN corrections
#: (odd half-orders first appear with radiation reaction at 2.5PN; common practice).
MOMENT_PN_ORDERS = {0: PNOrder(1, 2), 1: PNOrder(3, 2)}


def check_moment_order(pn_order: int) -> PNOrder:
    """Validate a source-moment PN order; return the relative order it is known through.

    Example
    -------
    >>> check_moment_order(1)
    PNOrder(3/2)
    """
    if isinstance(pn_order, bool) or pn_order not in MOMENT_PN_ORDERS:
        raise OrderBeyondInputsError(
            f"source moments are derived at PN orders {', '.join(map(str, MOMENT_PN_ORDERS))}; "
            f"PN order {pn_order!r} is beyond the toolkit's inputs")
    return MOMENT_PN_ORDERS[pn_order]


def mass_fractions() -> tuple[ExactPolynomial, ExactPolynomial]:
    """``(X1, X2) = ((1 + delta)/2, (1 - delta)/2)`` in the engine.

    Example
    -------
    >>> mass_fractions()
    (1/2 + delta/2, 1/2 - delta/2)
    """
    delta = ExactPolynomial("delta")
    return (1 + delta) / 2, (1 - delta) / 2


@lru_cache(maxsize=None)
def position_factor_sum(power: int) -> ExactPolynomial:
    """``sum_A m_A s_A^power`` with Newtonian ``s_A`` (delta^2 reduced).

    For ``power = l`` this is the mass-ratio factor of the Newtonian I_L:
    ``nu m (X2^(l-1) + (-1)^l X1^(l-1))``.

    Example
    -------
    >>> position_factor_sum(3)
    -nu*delta*m
    """
    x1, x2 = mass_fractions()
    m = ExactPolynomial("m")
    return m * (x1 * x2**power + x2 * (-x1) ** power)


@lru_cache(maxsize=None)
def companion_weighted_sum(power: int) -> ExactPolynomial:
    """``sum_A m_A (m_B/m) s_A^power`` with Newtonian ``s_A`` (the weight of the other body's
    potential ``G m_B/r12`` at body A).

    Example
    -------
    >>> companion_weighted_sum(0)
    2*nu*m
    """
    x1, x2 = mass_fractions()
    m = ExactPolynomial("m")
    return m * x1 * x2 * (x2**power + (-x1) ** power)


@lru_cache(maxsize=1)
def one_pn_position_shift() -> ExactPolynomial:
    """The common 1PN centre-of-mass shift: ``y_A = (s_A^N + shift/c^2) x``.

    Example
    -------
    >>> one_pn_position_shift()
    nu*delta*rdot**2/2 - nu*delta*G*m*r**(-1)/2 + nu*delta*r**2*phidot**2/2
    """
    s = engine_symbols()
    return s.nu * s.delta * centre_of_mass_shift(s)[1]


def exact_series(pieces: dict[int, ExactPolynomial], known: PNOrder | float) -> PNSeries:
    """A PN series in 1/c from ``{PN order k: coefficient of 1/c^(2k)}`` (integer orders)."""
    known2 = known if known == float("inf") else PNOrder(known).twice
    return PNSeries._from_trusted({2 * k: v for k, v in pieces.items()}, known2)


def retardation_term(l: int, structure: Monomial, weight: ExactPolynomial) -> OrbitTensor:
    """The first retardation correction common to the 1PN mass (M1) and current (C1) formulas:
    ``(1/(2 c^2 (2l+3))) d^2/dt^2 [weight r^2 STF[structure]]``, time derivatives along the
    Newtonian orbit (the term is already 1PN)."""
    r = ExactPolynomial("r")
    term = OrbitTensor._trusted(l, {structure: exact_series({0: weight * r**2}, float("inf"))},
                                   _basis())
    term = differentiate_along_orbit(term, 0, times=2)
    return term.scale(exact_series({1: ExactPolynomial(1) / (2 * (2 * l + 3))}, float("inf")))


def first_derivative_term(l: int, inner: dict, factor: ExactPolynomial) -> OrbitTensor:
    """``factor/c^2 * d/dt [sum inner]`` along the Newtonian orbit, ``inner = {key: coefficient}``."""
    term = OrbitTensor._trusted(l, {key: exact_series({0: value}, float("inf")) for key, value in inner.items()},
                                   _basis())
    return differentiate_along_orbit(term, 0, times=1).scale(exact_series({1: factor}, float("inf")))


def _basis():
    from .orbit_tensor import PLANAR_BASIS

    return PLANAR_BASIS
