"""The leading-order memory growth of the m = 0 modes of eccentric binaries, orbit-averaged.

At leading order only the mass quadrupole radiates, and the memory formula
(:mod:`stfalgebra.radiative.memory`) gives for the m = 0 modes (G = m = c = R = 1)

    dh_l0/dt = -sqrt((l-2)!/(l+2)!) sum_{m'=-2..2} C(2 m', 2 m'; l 0) |dh_2m'/dt|^2,   l = 2, 4,

with h_2m' = 4 nu sqrt(pi/5) Hhat_2m'(r, rdot, phidot) exp(-i m' phi) the Newtonian general-orbit
modes (``conventions.md``). Averaged over the radial period of the Keplerian ellipse
(:func:`stfalgebra.binary.orbit_averages.orbit_average`), each |dh_2m'/dt|^2 is x^5 times an exact
function of e, x = (G m n/c^3)^(2/3) with n the mean motion. Relative to the circular orbit of the
same mean motion:

    <dh_l0/dt>(e) = <dh_l0/dt>_circular(x) * g_l(e)      (:func:`memory_rate_enhancement`),

and along the Newtonian eccentric inspiral (dx/dt enhanced by the Peters-Mathews f(e)),
dh_l0/dx = K Hhat_l0^circular g_l(e)/f(e) (:func:`memory_growth_per_x`), K = 2 nu sqrt(16 pi/5),
so that the memory accumulated between two frequencies is the integral of g_l/f along the track
e(x). Per radial period the memory grows by Delta h_l0 = K x Hhat_l0^circular (128 pi/5) nu x^(5/2) g_l(e)
(:func:`memory_growth_per_orbit`).

**Conventions**: ``conventions.md``; the Keplerian ellipse with eccentricity e (= e_t at this
order), periastron at u = 0; triad P = -e_Phi, Q = e_Theta.

References
----------
M. Favata, Phys. Rev. D 84, 124013 (2011) (the memory of eccentric binaries); P. C. Peters and
J. Mathews, Phys. Rev. 131, 435 (1963) (the averaged flux, the check of the m' sum).
"""

from __future__ import annotations

from functools import lru_cache

import sympy as sp

from .. import symbols as S
from ..binary.keplerian import e as eccentricity, u
from ..binary.orbit_averages import orbit_average
from .memory import memory_coupling_surd, memory_prefactor

__all__ = ["averaged_quadrupole_power", "memory_rate_enhancement", "memory_growth_per_x", "memory_growth_per_orbit",
           "peters_mathews_enhancement"]


def _check_l(l: int) -> None:
    if l not in (2, 4):
        raise ValueError(f"the leading-order memory of the quadrupole feeds l = 2 and l = 4 only, got l = {l}")


@lru_cache(maxsize=None)
def averaged_quadrupole_power(m: int) -> sp.Expr:
    """<|d Hhat_2m exp(-i m phi)/dt|^2> over the radial period, in units G = m = c = 1, a = 1
    (so n = x = 1), as an exact function of e (symbol :data:`stfalgebra.binary.keplerian.e`).

    Example
    -------
    >>> averaged_quadrupole_power(2).subs(eccentricity, 0)
    16
    """
    from .modes import derive_mode

    if m not in range(-2, 3):
        raise ValueError(f"m must be in -2..2, got {m}")
    r, rdot, phidot = S.r, S.rdot, S.phidot
    hhat = derive_mode(2, m, orbit="general", pn=0).hhat.subs({S.m: 1, S.c: 1})
    # d/dt along the Newtonian orbit, then the phase: exp(-i m phi) has rate -i m phidot
    rate = (sp.diff(hhat, r) * rdot + sp.diff(hhat, rdot) * (r * phidot**2 - 1 / r**2)
            + sp.diff(hhat, phidot) * (-2 * rdot * phidot / r) - sp.I * m * phidot * hhat)
    rate = sp.expand(rate)
    real = rate.subs(sp.I, 0)
    imaginary = sp.expand((rate - real) / sp.I)
    w = 1 - eccentricity * sp.cos(u)
    kepler = {r: w, rdot: eccentricity * sp.sin(u) / w, phidot: sp.sqrt(1 - eccentricity**2) / w**2}
    return sp.factor(sp.simplify(orbit_average(sp.expand(real**2 + imaginary**2).subs(kepler), eccentricity)))


def _weighted_power(l: int) -> sp.Expr:
    return sum(memory_coupling_surd(2, m, 2, m, l, 0).to_sympy() * averaged_quadrupole_power(m) for m in range(-2, 3))


@lru_cache(maxsize=None)
def memory_rate_enhancement(l: int) -> sp.Expr:
    """g_l(e): the orbit-averaged rate of growth of the memory h_l0 (l = 2, 4) divided by its
    value on the circular orbit of the same mean motion; g_l(0) = 1.

    Example
    -------
    >>> memory_rate_enhancement(2).subs(eccentricity, 0)
    1
    """
    _check_l(l)
    weighted = _weighted_power(l)
    return sp.factor(sp.simplify(weighted / weighted.subs(eccentricity, 0)))


def peters_mathews_enhancement() -> sp.Expr:
    """f(e) = (1 + 73 e^2/24 + 37 e^4/96)/(1 - e^2)^(7/2), derived here as the sum over m' of the
    averaged quadrupole powers (the energy flux), relative to the circular orbit."""
    total = sum(averaged_quadrupole_power(m) for m in range(-2, 3))
    return sp.factor(sp.simplify(total / total.subs(eccentricity, 0)))


def memory_growth_per_x(l: int) -> sp.Expr:
    """g_l(e)/f(e): dh_l0/dx along a Newtonian eccentric inspiral divided by its circular value
    K Hhat_l0 (module docstring); 1 at e = 0."""
    return sp.factor(sp.simplify(memory_rate_enhancement(l) / peters_mathews_enhancement()))


def memory_growth_per_orbit(l: int) -> sp.Expr:
    """Delta h_l0 over one radial period divided by K x = (2 G m nu x/(R c^2)) sqrt(16 pi/5):
    Hhat_l0^circular (128 pi/5) nu x^(5/2) g_l(e) (leading order), in the symbols nu, x, e.

    Example
    -------
    >>> memory_growth_per_orbit(2).subs(eccentricity, 0)
    -32*sqrt(6)*pi*nu*x**(5/2)/21
    """
    from ..orders import PNOrder
    from .circular_memory import circular_memory_amplitude

    _check_l(l)
    constant, series, _ = circular_memory_amplitude(l, PNOrder(0))
    circular = constant.to_sympy() * series.terms[PNOrder(0)].to_sympy()
    return circular * sp.Rational(128, 5) * sp.pi * S.nu * S.x**sp.Rational(5, 2) * memory_rate_enhancement(l)
