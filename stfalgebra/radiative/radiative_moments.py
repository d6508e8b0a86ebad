"""Radiative moments U_L, V_L of a planar binary, channel by channel.

At the orders the toolkit reaches, U_L = d^l I_L/dt^l + (tail, from relative 1.5PN) and
V_L = d^l J_L/dt^l + (tail); the instantaneous part is computed here on the spinor channel of
a mode (see :mod:`stfalgebra.moments.relative_tensor`): each time derivative acts as
d/dt - i m phidot on the channel coefficient, with d/dt along the PN relative orbit
(:class:`stfalgebra.binary.dynamics.OrbitTimeDerivative`). On a circular orbit, r, rdot and
phidot are constants of the motion, so the l derivatives reduce to (-i m omega)^l.

Accuracy bookkeeping (:func:`radiative_accuracy`): with Newtonian source moments a radiative
moment is known through relative order 1/2, with 1PN moments through relative 1 (the tail
enters at 3/2); the relative-1.5PN terms need the tails and, for U_ijkl and V_ijk, the
quadratic interactions of the source moments.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache

import sympy as sp

from ..binary.dynamics import OrbitTimeDerivative
from ..errors import OrderBeyondInputsError
from ..moments.current import current_moment
from ..moments.mass import mass_moment
from ..pnseries import PNSeries
from ..symbols import omega, phidot, rdot
from .projection import mode_channel, mode_kind

__all__ = ["RadiativeAccuracy", "radiative_accuracy", "radiative_channel", "radiative_channel_circular"]


@dataclass(frozen=True)
class RadiativeAccuracy:
    """What a mode needs at a given relative order: the source-moment order, whether the
    tails enter, and the relative order through which the result is then known."""

    moment_order: int
    tails: bool
    relative_known: sp.Rational
    provenance: tuple[str, ...]


def radiative_accuracy(l: int, m: int, relative: sp.Rational, orbit: str) -> RadiativeAccuracy:
    """Choose the inputs for relative order ``relative`` of mode (l, m), or refuse."""
    kind = mode_kind(l, m)
    moment = "I_L (mass)" if kind == "mass" else "J_L (current)"
    if relative <= sp.Rational(1, 2):
        return RadiativeAccuracy(0, False, sp.Rational(1, 2), (
            f"source moment {moment}, l = {l}: Newtonian, point masses",
            "time derivatives: Newtonian equation of motion dv/dt = -G m x/r^3",
        ))
    if relative <= 1:
        eom = "1PN harmonic-coordinate relative acceleration"
        formula = ("Blanchet & Damour (1989) 1PN mass moment" if kind == "mass" else
                   "Damour & Iyer (1991) 1PN current moment with the non-compact field terms")
        return RadiativeAccuracy(1, False, sp.Integer(1), (
            f"source moment {moment}, l = {l}: 1PN, {formula}, 1PN centre-of-mass relations",
            f"time derivatives: {eom}",
            "no tail: hereditary terms start at relative 1.5PN",
        ))
    raise OrderBeyondInputsError(
        f"mode ({l},{m}) at relative order {relative}: the toolkit derives radiative moments "
        f"through relative 1PN; relative {relative} needs the hereditary tail"
        + (" and the quadratic moment interactions" if (kind, l) in (("mass", 4), ("current", 3)) else "")
        + " (not available)")


@lru_cache(maxsize=None)
def _source_channel(l: int, m: int, moment_order: int, circular: bool = False) -> PNSeries:
    p, q, c = mode_channel(l, m)
    moment = mass_moment(l, moment_order) if c == 0 else current_moment(l, moment_order)
    return moment.channel(p, q, c, circular_frequency=omega if circular else None)


@lru_cache(maxsize=None)
def radiative_channel(l: int, m: int, moment_order: int) -> PNSeries:
    """Instantaneous radiative moment (U_L or V_L) on the channel of mode (l, m), general orbit.

    A PN series in eps = 1/c whose coefficients are functions of r, rdot, phidot, G, m, nu,
    delta; the factor exp(-i m phi) is implied.
    """
    derivative = OrbitTimeDerivative(moment_order)
    value = _source_channel(l, m, moment_order)
    rotation = -sp.I * m * phidot
    for _ in range(l):
        value = (derivative(value) + value * rotation).expand()
    return value


@lru_cache(maxsize=None)
def radiative_channel_circular(l: int, m: int, accuracy: RadiativeAccuracy,
                               phase: str = "psi") -> PNSeries:
    """The same on a circular orbit (rdot = 0, phidot = omega): (-i m omega)^l times the
    source channel, the constants of the motion being unaffected by d/dt. ``phase`` ("psi" or
    "phi") is the phase variable of the implied exponential."""
    value = _source_channel(l, m, accuracy.moment_order, circular=True)
    return value * (-sp.I * m * omega)**l
