"""The instantaneous part of a general-orbit mode h_lm of a binary with spins of any direction.

The evaluator of the table's row for ``spins="general"``
(:data:`~stfalgebra.radiative.contributions.PRECESSING_SPIN_CONTRIBUTIONS`). At the instant
considered the orbital plane is the x-y plane of the source frame (``n = (cos phi, sin phi, 0)``,
``lambda = e_z cross n``, ``ell = e_z`` along ``x cross v``) and each spin is given by its
components ``chiA_n, chiA_lambda, chiA_ell`` on that triad
(:mod:`stfalgebra.binary.precessing_dynamics`). ``U_L = d^l I_L/dt^l`` and
``V_L = d^l J_L/dt^l`` are differentiated over the vectors
(:func:`~stfalgebra.moments.precessing_spin_moments.differentiate_along_precessing_orbit`:
1PN point-mass and leading spin-orbit acceleration, including its part along ``ell`` that tilts
the plane; leading precession) and projected on ``alpha_L^lm``: every channel
``Z+^p Z-^q u_z^c`` with ``p - q = m`` contributes (module
:mod:`stfalgebra.radiative.projection`), from the mass *and* the current moment, so every m from
-l to l is derived on its own (no planar symmetry).

Normalisation (``shared/conventions.md``): ``h_lm = -(G/(sqrt(2) R c^(l+2))) [U_lm - (i/c) V_lm]``,
``h_lm = (4 G m nu/(R c^4)) sqrt(pi/5) Hhat_lm exp(-i m phi)``. The evaluator returns the
series that the mode assembler (:mod:`stfalgebra.radiative.modes`) treats as the channel of the
mode's planar kind (mass for l + m even, current for l + m odd): each channel of either moment
enters with the exact rational ratio of its ``alpha_L^lm`` and mode constant to those of the
planar channel (their square roots agree: ``sqrt((l+1)(l+2)/(2l(l-1))) = ((l+1)/l)
sqrt(l(l+2)/(2(l+1)(l-1)))``), and with the relative power of ``1/c`` and the factor ``i`` of
the current term.

Accuracy: the mass moments with spins are known through relative 3/2, the current moments
through relative 1 (:data:`~stfalgebra.moments.spin_moments.SPIN_PART_KNOWN_THROUGH`); in a
mode of planar kind "mass" the current moment enters one half order later, in a mode of kind
"current" the mass moment one half order earlier, so every mode is known through relative 3/2
(mass kind) or 1 (current kind) beyond its leading term, linear in the spins.
"""

from __future__ import annotations

from fractions import Fraction
from functools import lru_cache
from math import factorial

from ..exact import ExactPolynomial, SurdConstant
from ..moments.precessing_spin_moments import (
    PRECESSING_BASIS, differentiate_along_precessing_orbit, precessing_current_moment, precessing_mass_moment,
)
from ..orders import PNOrder
from ..pnseries import PNSeries
from .contributions import Contribution, check_mode
from .projection import alpha_on_spinor_basis_exact, mode_channel, mode_kind

__all__ = ["precessing_radiative_channel", "precessing_instantaneous_channel"]


@lru_cache(maxsize=None)
def _radiative_moment(kind: str, l: int):
    moment = precessing_mass_moment(l) if kind == "mass" else precessing_current_moment(l)
    return differentiate_along_precessing_orbit(moment, l)


@lru_cache(maxsize=None)
def _vector_power(index: int, exponent: int) -> tuple:
    """``(V.k)^exponent`` of basis vector ``index`` as ((p, q, c), coefficient) pairs."""
    plus, minus, along = PRECESSING_BASIS.components[index]
    out = []
    for i in range(exponent + 1):
        for j in range(exponent - i + 1):
            k = exponent - i - j
            value = plus**i * minus**j * along**k
            if not value.is_zero():
                out.append(((i, j, k), value * (factorial(exponent) // (factorial(i) * factorial(j) * factorial(k)))))
    return tuple(out)


@lru_cache(maxsize=None)
def _all_channels(kind: str, l: int) -> dict:
    """Every channel of the radiative moment at once: each monomial's probe polynomial is expanded
    once for all (p, q, c) (the per-channel route of ``OrbitTensor.channel`` repeats it per channel)."""
    tensor = _radiative_moment(kind, l)
    sums: dict[tuple, dict[int, ExactPolynomial]] = {}
    known2 = min((s._known2 for s in tensor.terms.values()), default=float("inf"))
    for key, series in tensor.terms.items():
        expansion = {(0, 0, 0): ExactPolynomial(1)}
        for index, exponent in enumerate(key):
            if not exponent:
                continue
            updated: dict[tuple, ExactPolynomial] = {}
            for (a1, b1, c1), v1 in expansion.items():
                for (a2, b2, c2), v2 in _vector_power(index, exponent):
                    target = (a1 + a2, b1 + b2, c1 + c2)
                    product = v1 * v2
                    updated[target] = updated[target] + product if target in updated else product
            expansion = updated
        for channel, factor in expansion.items():
            into = sums.setdefault(channel, {})
            for k2, coefficient in series._terms:
                product = coefficient * factor
                into[k2] = into[k2] + product if k2 in into else product
    return {channel: PNSeries._from_trusted({k: v for k, v in values.items() if not v.is_zero()}, known2)
            for channel, values in sums.items()}


def precessing_radiative_channel(kind: str, l: int, p: int, q: int, c: int) -> PNSeries:
    """The channel ``Z+^p Z-^q u_z^c`` of ``d^l I_L/dt^l`` (kind "mass") or ``d^l J_L/dt^l`` ("current").

    Parameters
    ----------
    kind:
        "mass" or "current".
    l, p, q, c:
        ``p + q + c = l``.

    Returns
    -------
    PNSeries
        In ``eps = 1/c`` (mass known through 3/2, current through 1); engine coefficients in r,
        rdot, phidot, G, m, nu, delta and the spin components.

    Example
    -------
    >>> precessing_radiative_channel("current", 2, 2, 0, 0).coefficient(Fraction(1, 2)).substitute(
    ...     {"chi2_n": 0, "chi2_lambda": 0, "delta": 0, "nu": Fraction(1, 4), "rdot": 0})   # in-plane spin, c = 0
    -3*chi1_n*G**2*m**3*r**(-2)/64 + 3*I*chi1_lambda*G**2*m**3*r**(-2)/64
    """
    if kind not in ("mass", "current"):
        raise ValueError(f"kind must be 'mass' or 'current', got {kind!r}")
    if min(p, q, c) < 0 or p + q + c != l:
        raise ValueError(f"channel ({p}, {q}, {c}) does not have rank {l}")
    channels = _all_channels(kind, l)
    if (p, q, c) in channels:
        return channels[(p, q, c)]
    return PNSeries._from_trusted({}, min((s._known2 for s in channels.values()), default=float("inf")))


def _mode_constant(kind: str, l: int) -> SurdConstant:
    if kind == "mass":
        return SurdConstant(Fraction(-4, factorial(l)), Fraction((l + 1) * (l + 2), 2 * l * (l - 1)))
    return SurdConstant(Fraction(-8, factorial(l)), Fraction(l * (l + 2), 2 * (l + 1) * (l - 1)))


@lru_cache(maxsize=None)
def _combined(l: int, m: int) -> PNSeries:
    planar = mode_kind(l, m)
    reference = alpha_on_spinor_basis_exact(l, m, *mode_channel(l, m)) * _mode_constant(planar, l)
    imaginary = ExactPolynomial("I")
    total = None
    for kind in ("mass", "current"):
        for c in range(l + 1):
            if (l - c + m) % 2:
                continue
            p = (l - c + m) // 2
            q = l - c - p
            if p < 0 or q < 0:
                continue
            alpha = alpha_on_spinor_basis_exact(l, m, p, q, c)
            if alpha.rational == 0:
                continue
            ratio = alpha * _mode_constant(kind, l) / reference
            if ratio.radicand != 1:
                raise ArithmeticError(f"mode ({l},{m}): channel constants with different square roots")
            channel = precessing_radiative_channel(kind, l, p, q, c)
            # relative to the planar kind: the current term carries i/c, the mass term none
            if kind == planar:
                piece = channel * ExactPolynomial(ratio.rational)
            elif kind == "current":      # current term in a mass-kind mode: i eps V
                piece = (channel * (imaginary * ratio.rational)).shift(PNOrder(1, 2))
            else:                         # mass term in a current-kind mode: U/(i eps) = -i U/eps
                piece = (channel * (-imaginary * ratio.rational)).shift(PNOrder(-1, 2))
            total = piece if total is None else total + piece
    return total


def precessing_instantaneous_channel(l: int, m: int, *, row: Contribution, orbit: str) -> PNSeries:
    """The instantaneous part of mode (l, m) with spins of any direction, as the planar-kind channel.

    Parameters
    ----------
    l, m:
        The mode, any m from -l to l.
    row:
        The row of the table (unused beyond the dispatch).
    orbit:
        "general" only (the instantaneous triad of a general orbit; circular orbits with
        precessing spins are not defined by these variables).

    Returns
    -------
    PNSeries
        The series the mode assembler multiplies by ``i`` (current-kind modes), divides by
        ``m nu`` and by the planar constant (module docstring).

    Example
    -------
    >>> from stfalgebra.radiative.contributions import PRECESSING_SPIN_CONTRIBUTIONS
    >>> row = PRECESSING_SPIN_CONTRIBUTIONS[-1]
    >>> precessing_instantaneous_channel(2, 2, row=row, orbit="general").orders[:2]
    (PNOrder(0), PNOrder(1))

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 3 (``U_L = I_L^(l) + ...``);
    Kidder, Phys. Rev. D 77, 044016 (2008) (mode decomposition).
    """
    check_mode(l, m)
    if orbit != "general":
        raise ValueError(f"modes with spins of any direction are derived on general orbits only, got {orbit!r}")
    return _combined(l, m)
