"""The DC memory of circular inspirals: the even-l, m = 0 modes from the memory formula.

On a circular orbit the oscillating modes are h_lm = K x Hhat_lm exp(-i m psi), with
K = (2 G m nu/(R c^2)) sqrt(16 pi/5), and dh_lm/du = -i m omega h_lm up to the slow drift of x
(a relative 2.5PN correction). In the memory formula (:mod:`stfalgebra.radiative.memory`) the
products dh_l1m' conj(dh_l2m') with equal m' do not oscillate; they feed the m = 0 modes,

    dh_l0/du = -(R/c) sqrt((l-2)!/(l+2)!) K^2 omega^2 x^2 sum m'^2 Hhat_l1m' conj(Hhat_l2m') C(l1 m', l2 m'; l 0).

Integrated over the whole past of an adiabatic inspiral, du = dx/(dx/dt) with the energy
balance dx/dt = (64/5)(c^3/(G m)) nu x^5 f(x)/(x e(x))' (:mod:`stfalgebra.radiative.energy_balance`),
and normalised like every circular mode (``conventions.md``):

    Hhat_l0 = -(5/32) sqrt(16 pi/5) sqrt((l-2)!/(l+2)!) (1/x) int_0^x dx'
              [(x e)'/f](x') sum m'^2 Hhat_l1m' conj(Hhat_l2m') C(l1 m', l2 m'; l 0),

so that a term x'^n of the integrand gives x^n/(n + 1). The assumption is that the binary has
inspiralled adiabatically from infinite separation (x = 0 in the infinite past); the memory of
any earlier history (a capture, a formation kick) would add a constant.

Through which order: every mode pair whose product starts at or below the requested order enters,
each mode through the order the pair needs; the modes, the flux and the energy are those the
toolkit derives (the table of contributions bounds them): through relative 2PN. At relative 2.5PN instantaneous
quadratic terms of U_L, the radiation-reaction drift of dh_lm/du and the memory of the m = 0 modes
themselves enter; the memory row of the table stops before them.

**Conventions**: ``conventions.md`` (triad P = -e_Phi, Q = e_Theta; ``sign_convention="theta-phi"``
flips every h_lm, the memory modes too); the series is in x, order n multiplying x^n.

References
----------
M. Favata, Phys. Rev. D 80, 024002 (2009) and Astrophys. J. Lett. 696, L159 (2009) (the memory
modes of circular inspirals); K. S. Thorne, Phys. Rev. D 45, 520 (1992).
"""

from __future__ import annotations

from fractions import Fraction
from functools import lru_cache
from math import factorial

from ..errors import OrderBeyondInputsError
from ..exact import ExactPolynomial, SurdConstant
from ..orders import PNOrder
from ..pnseries import PNSeries
from .memory import memory_coupling_surd

__all__ = ["memory_leading_order", "circular_memory_amplitude", "memory_channel", "MEMORY_ASSUMPTION", "integrate_from_zero"]

#: The assumption every circular m = 0 memory mode rests on (printed with it).
MEMORY_ASSUMPTION = ("DC (non-linear) memory: the past integral of the energy radiated per solid angle, "
                     "along the adiabatic circular inspiral from the infinite past (x = 0), with dx/dt "
                     "from the energy balance")


def memory_leading_order(l: int) -> PNOrder:
    """The order (in x) where the memory Hhat_l0 of a circular inspiral starts, for even l:
    0 for l = 2 and 4, (l - 4)/2 beyond (the lightest pair of mass modes that couples to l has
    l1 + l2 = l).

    Example
    -------
    >>> [str(memory_leading_order(l)) for l in (2, 4, 6, 8)]
    ['0', '0', '1', '2']
    """
    if l < 2 or l % 2:
        raise ValueError(f"the circular DC memory lives in even l >= 2, got l = {l}")
    return PNOrder(max(0, l - 4), 2)


def integrate_from_zero(series: PNSeries) -> PNSeries:
    """(1/x) int_0^x s(x') dx' term by term: a term x^n becomes x^n/(n + 1).

    Raises
    ------
    OrderBeyondInputsError
        A coefficient holding ln x (the integral of x^n ln x is not of this form; it first
        arises beyond the orders served).
    """
    terms = {}
    for order, value in series.terms.items():
        if "log(x)" in value.to_text():
            raise OrderBeyondInputsError("the memory integrand holds ln x: not integrated at this order")
        terms[order.twice] = value * Fraction(1) / (Fraction(order) + 1)
    return PNSeries._from_trusted(terms, series.known_through.twice)


def _mode_order(l: int, m: int) -> PNOrder:
    return PNOrder(l - 2, 2) if (l + m) % 2 == 0 else PNOrder(l - 1, 2)


def _pairs(l: int, through: PNOrder):
    """Every (l1, l2, m') with m' != 0 whose product of modes starts at or below ``through`` and
    couples to (l, 0); with the absolute order each of the two modes is needed through."""
    lmax = 2 * int(through) + 3
    for l1 in range(2, lmax + 1):
        for l2 in range(2, lmax + 1):
            if not abs(l1 - l2) <= l <= l1 + l2:
                continue
            for mp in range(-min(l1, l2), min(l1, l2) + 1):
                if mp == 0:
                    continue
                n1, n2 = _mode_order(l1, mp), _mode_order(l2, mp)
                if n1 + n2 > through:
                    continue
                coupling = memory_coupling_surd(l1, mp, l2, mp, l, 0)
                if coupling.rational == 0:
                    continue
                yield l1, l2, mp, coupling, through - n2, through - n1


@lru_cache(maxsize=None)
def circular_memory_amplitude(l: int, pn_relative: PNOrder) -> tuple[SurdConstant, PNSeries, tuple[str, ...]]:
    """Hhat_l0 of a circular inspiral from the memory formula: ``constant * series`` through the
    relative order ``pn_relative`` beyond :func:`memory_leading_order` (triad P = -e_Phi).

    Returns
    -------
    (SurdConstant, PNSeries, provenance)
        The series has exact engine coefficients in nu (and delta, pi) and starts with a rational.

    Raises
    ------
    OrderBeyondInputsError
        A mode, the flux or the energy is not available through the order needed (the message
        of the limiting input).

    Example
    -------
    >>> constant, series, _ = circular_memory_amplitude(2, PNOrder(0))
    >>> constant, series
    (SurdConstant(-5/84*sqrt(6)), PNSeries(1 + O(eps)))

    References
    ----------
    Favata, Phys. Rev. D 80, 024002 (2009) (module docstring).
    """
    from .energy_balance import relative_series
    from .modes import derive_mode

    through = memory_leading_order(l) + pn_relative
    # -(5/32) sqrt(16 pi/5) sqrt((l-2)!/(l+2)!) / sqrt(4 pi): the coupling surds carry sqrt(4 pi)
    weight = SurdConstant(Fraction(-5, 16), Fraction(factorial(l - 2), 5 * factorial(l + 2)))
    parts: list[tuple[SurdConstant, PNSeries]] = []
    used = set()
    for l1, l2, mp, coupling, order1, order2 in _pairs(l, through):
        first = derive_mode(l1, mp, pn=order1)
        second = derive_mode(l2, mp, pn=order2)
        used.update({(l1, mp), (l2, mp)})
        series = first.series * second.series.map_coefficients(lambda v: v.conjugate())
        parts.append((weight * coupling * first.constant * second.constant * (mp * mp), series.truncate(through)))
    if not parts:
        raise OrderBeyondInputsError(f"no mode pair feeds the memory of ({l},0) through order {through}")
    common = next((c for c, s in parts if c.rational != 0 and s.terms), parts[0][0])
    total = None
    for constant, series in parts:
        if constant.rational == 0:
            continue
        if constant.radicand != common.radicand:   # pragma: no cover - the pairs share one surd
            raise ArithmeticError(f"memory of ({l},0): surds {constant} and {common} do not combine")
        scaled = series.map_coefficients(lambda v, r=constant.rational / common.rational: v * r)
        total = scaled if total is None else total + scaled
    # the pairs start at the leading order: (x e)'/f is needed through pn_relative only
    balance = relative_series("x_rate", pn_relative).inverse()
    result = integrate_from_zero((total * balance).truncate(through))
    lead = result.terms[result.orders[0]] if result.orders else None
    if lead is not None and lead.is_constant():   # print Hhat_l0 = constant (1 + ...)
        scale = lead.constant_value()
        common = common * scale
        result = result.map_coefficients(lambda v: v / scale)
    provenance = (MEMORY_ASSUMPTION,
                  "memory formula: Thorne, Phys. Rev. D 45, 520 (1992); in modes, Favata, Phys. Rev. D 80, 024002 "
                  "(2009); exact couplings from Wigner 3j symbols (stfalgebra.radiative.memory)",
                  "modes used: " + ", ".join(f"({a},{b})" for a, b in sorted(used)),
                  "dx/dt: energy balance with the derived flux and the cited conserved energy "
                  "(stfalgebra.radiative.energy_balance)")
    return common, result, provenance



def memory_channel(l: int, pn_relative: PNOrder, *, row=None) -> tuple[SurdConstant, PNSeries, tuple[str, ...]]:
    """The evaluator of the memory row of the table of contributions: :func:`circular_memory_amplitude`
    with the row's description and source added to the provenance."""
    constant, series, provenance = circular_memory_amplitude(l, PNOrder(pn_relative))
    if row is not None:
        provenance = (f"{row.family}: {row.description} [{row.origin}]",) + provenance
    return constant, series, provenance
