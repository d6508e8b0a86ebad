"""Energy and angular-momentum fluxes, by two independent routes.

Route (a), from the modes (``../shared/conventions.md``):
    F = (R^2 c^3/(16 pi G)) sum_lm |dh_lm/dt|^2,
    dJ_z/dt = (R^2 c^3/(16 pi G)) sum_lm m Im[h_lm conj(dh_lm/dt)].
On a circular orbit dh_lm/dt = -i m omega h_lm, so with the output normalisation
F / ((32/5)(c^5/G) nu^2 x^5) = (1/8) sum_lm m^2 |Hhat_lm|^2 and F = omega dJ_z/dt.

Route (b), the multipole formula in STF contractions of the radiative moments (Thorne 1980,
Rev. Mod. Phys. 52, 299, eq. (4.16'); Blanchet, Living Rev. Relativ. 17, 2 (2014), eq. (68a)):
    F = sum_l (G/c^(2l+1)) [ (l+1)(l+2)/((l-1) l l! (2l+1)!!) U^(1)_L U^(1)_L
                            + 4 l (l+2)/(c^2 (l-1) (l+1)! (2l+1)!!) V^(1)_L V^(1)_L ],
with U_L = d^l I_L/dt^l, V_L = d^l J_L/dt^l built as tensors of x, v, ell and contracted with
the STF core (harmonic projection and full contraction of Cartesian polynomials), without
spherical harmonics or the alpha_L^lm: the two routes share only the source moments.
From 1.5PN the tail enters U^(1)_L (V^(1)_L likewise):

    U^(1)_L = I^(l+1)_L + (2 G M/c^3) int_0^oo dtau I^(l+3)_L(t - tau) [ln(c tau/(2 r0)) + kappa_l],

evaluated here in the time domain: on the Newtonian circular orbit x(t - tau) and v(t - tau)
are x(t), v(t) rotated by -omega tau about ell,

    x(t - tau) = cos(omega tau) x - sin(omega tau) v/omega,
    v(t - tau) = cos(omega tau) v + omega sin(omega tau) x,

so the integrand is a trigonometric polynomial in omega tau with tensor coefficients, and each
exp(i s omega tau) integrates to the derived kernel
(:func:`~stfalgebra.radiative.tails.tail_kernel`) divided by (-i s omega)^2. Only U_ij's tail
reaches the flux at 1.5PN; the others start at 2.5PN.
"""

from __future__ import annotations

from functools import lru_cache
from math import factorial

import sympy as sp

from ..binary.masses import reduce_mass_difference
from ..errors import OrderBeyondInputsError
from ..moments.current import current_moment
from ..moments.mass import mass_moment
from ..moments.two_body import EPS, derivative_along_orbit
from ..pnseries import PNSeries
from ..stf.cartesian import PROBE, contract_cartesian, harmonic_part_cartesian
from ..symbols import G, c, m as total_mass, nu, omega, phidot, r, r0, rdot, x
from .modes import _EPS_X, _G_REL, _relative_gamma, derive_mode, leading_order, parse_order
from .tails import canonical_logs, tail_kernel

__all__ = ["circular_energy_flux_from_modes", "circular_energy_flux_from_moments",
           "circular_angular_momentum_flux_from_modes", "FLUX_MAX_PN"]

#: Highest absolute PN order of the circular fluxes the toolkit derives.
FLUX_MAX_PN = sp.Rational(3, 2)


def _check_flux_order(pn) -> sp.Rational:
    order = parse_order(pn, "pn")
    if order > FLUX_MAX_PN:
        raise OrderBeyondInputsError(
            f"the circular fluxes are derived through {FLUX_MAX_PN}PN; pn = {order} needs "
            f"radiative moments beyond relative 1.5PN (2PN source moments)")
    return order


def _double_factorial(n: int) -> int:
    out = 1
    while n > 1:
        out *= n
        n -= 2
    return out


def _contributing_modes(order: sp.Rational):
    """Modes (l, m), m != 0, whose |Hhat_lm|^2 starts at or below x^order."""
    l = 2
    while True:
        found = False
        for m in range(-l, l + 1):
            if m == 0:
                continue
            n0 = leading_order(l, m)
            if 2 * n0 <= order:
                found = True
                yield l, m, n0
        if not found and l > 2 * order + 3:
            return
        l += 1


def _sum_over_modes(order: sp.Rational, weight) -> PNSeries:
    """sum_lm weight(m) |Hhat_lm|^2 / 8 through x^order, each mode taken to the order its
    |Hhat_lm|^2 needs. On a circular orbit dh_lm/dt = -i m omega h_lm, so both fluxes are
    such sums with a weight read off their definitions."""
    total = PNSeries({}, order)
    for l, m, n0 in _contributing_modes(order):
        series = derive_mode(l, m, pn=order - n0).series.truncate(order - n0)
        conj = series.map_coefficients(sp.conjugate)
        total = total + (series * conj) * (weight(m) / 8)
    return total.truncate(order).map_coefficients(lambda e: reduce_mass_difference(sp.expand(e)))


@lru_cache(maxsize=None)
def circular_energy_flux_from_modes(pn) -> PNSeries:
    """Circular-orbit energy flux / ((32/5)(c^5/G) nu^2 x^5), summed over the modes.

    Returns a PN series in eps = sqrt(x) through x^pn.

    Example
    -------
    >>> from stfalgebra.radiative.fluxes import circular_energy_flux_from_modes
    >>> circular_energy_flux_from_modes(1).coefficient(1)
    -35*nu/12 - 1247/336
    """
    # |dh/dt|^2 = |-i m omega|^2 |h|^2
    return _sum_over_modes(_check_flux_order(pn), lambda m: sp.Abs(-sp.I * m)**2)


@lru_cache(maxsize=None)
def circular_angular_momentum_flux_from_modes(pn) -> PNSeries:
    """Circular-orbit dJ_z/dt / ((32/5) m c^2 nu^2 x^(7/2)), summed over the modes.

    From m Im[h conj(dh/dt)] with dh/dt = -i m omega h; F = omega dJ_z/dt follows (tested).
    """
    return _sum_over_modes(_check_flux_order(pn), lambda m: m * sp.im(sp.conjugate(-sp.I * m)))


def _cartesian_at_reference(tensor_terms: dict, rank: int) -> sp.Expr:
    """Cartesian polynomial of sum s (x.k)^a (v.k)^b (ell.k)^c at phi = 0 on a circular orbit:
    x = (r, 0, 0), v = (0, r omega, 0), ell = (0, 0, r^2 omega)."""
    k1, k2, k3 = PROBE
    xk, vk, lk = r * k1, r * omega * k2, r**2 * omega * k3
    return sp.expand(sp.Add(*[coeff * xk**a * vk**b * lk**cc for (a, b, cc), coeff in tensor_terms.items()]))


def _radiative_tensor_terms(kind: str, l: int, moment_order: int, relative: sp.Rational) -> dict:
    """Terms of d^(l+1)/dt^(l+1) of the source moment on a circular orbit, as c-expressions."""
    moment = mass_moment(l, moment_order) if kind == "mass" else current_moment(l, moment_order)
    derived = derivative_along_orbit(moment, moment_order, times=l + 1)
    out = {}
    for key, series in derived.terms.items():
        expr = series.truncate(min(series.known_through, relative)).to_expression(EPS).subs(EPS, 1 / c)
        out[key] = expr.subs({rdot: 0, phidot: omega})
    return out


def _rotation_back(terms: dict) -> dict[int, sp.Expr]:
    """Harmonics of a circular-orbit tensor sum s (x.k)^a (v.k)^b (ell.k)^c at t - tau.

    Returns {s: P_s} with the tensor at t - tau equal to sum_s P_s exp(i s omega tau), each
    P_s a polynomial in the probes X = x.k, V = v.k, L = ell.k (as the Cartesian polynomial
    at phi = 0 of :func:`_cartesian_at_reference`)."""
    k1, k2, k3 = PROBE
    X, V, L = r * k1, r * omega * k2, r**2 * omega * k3
    E = sp.Symbol("E_rot", positive=True)      # exp(i omega tau)
    cos = (E + 1 / E) / 2
    sin = (E - 1 / E) / (2 * sp.I)
    X_back = cos * X - sin * V / omega
    V_back = cos * V + omega * sin * X
    total = sp.Add(*[coeff * X_back**a * V_back**b * L**cc for (a, b, cc), coeff in terms.items()])
    degree = max((a + b for (a, b, _) in terms), default=0)
    poly = sp.Poly(sp.expand(total * E**degree), E)
    return {int(k) - degree: sp.expand(value) for (k,), value in poly.terms()}


@lru_cache(maxsize=None)
def _circular_tail_polynomial(kind: str, l: int) -> sp.Expr:
    """Cartesian polynomial (at phi = 0) of int_0^oo dtau M_L^(l+3)(t - tau) [ln(c tau/(2 r0)) + k_l]
    for the Newtonian moment M_L (I_L or J_L) on the Newtonian circular orbit."""
    moment = mass_moment(l, 0) if kind == "mass" else current_moment(l, 0)
    derived = derivative_along_orbit(moment, 0, times=l + 3)
    terms = {}
    for key, series in derived.terms.items():
        expr = series.coefficient(0).subs({rdot: 0, phidot: omega})
        terms[key] = sp.expand(expr.subs(G, omega**2 * r**3 / total_mass))   # G m = omega^2 r^3
    total = sp.Integer(0)
    for s, part in _rotation_back(terms).items():
        if s == 0:
            if part != 0:
                raise AssertionError(f"zero-frequency part {part} of a derivative on a circular orbit")
            continue
        # int_0^oo dtau exp(i s omega tau) [ln(c tau/(2 r0)) + k_l] = K(s omega)/(-i s omega)^2
        weight = tail_kernel(l, kind, s * omega) / (-sp.I * s * omega)**2
        total += weight * part
    return sp.expand(total)


@lru_cache(maxsize=None)
def circular_energy_flux_from_moments(pn) -> PNSeries:
    """Circular-orbit energy flux / ((32/5)(c^5/G) nu^2 x^5) from Thorne's STF formula.

    Example
    -------
    >>> from stfalgebra.radiative.fluxes import circular_energy_flux_from_moments
    >>> circular_energy_flux_from_moments(0).coefficient(0)
    1
    """
    order = _check_flux_order(pn)
    total = sp.Integer(0)
    for l in range(2, int(order) + 3):
        # mass l enters at relative (l-2), current l at relative (l-1) (in powers of 1/c^2)
        for kind, n0 in (("mass", l - 2), ("current", l - 1)):
            relative = order - n0
            if relative < 0:
                continue
            moment_order = 0 if relative < 1 else 1
            terms = _radiative_tensor_terms(kind, l, moment_order, relative)
            poly = _cartesian_at_reference(terms, l)
            square = contract_cartesian(harmonic_part_cartesian(poly, l), poly, l)
            if relative >= sp.Rational(3, 2):
                # 2 U^(1)_inst . U^(1)_tail, M = m at this order (U_tail^2 is relative 3PN)
                tail = _circular_tail_polynomial(kind, l)
                cross = canonical_logs(contract_cartesian(harmonic_part_cartesian(poly, l), tail, l))
                if cross.has(r0) or sp.expand(sp.im(cross)) != 0:
                    raise AssertionError(f"tail contribution to the flux is not real and r0-free: {cross}")
                square += 2 * (2 * G * total_mass / c**3) * cross
            if kind == "mass":
                weight = sp.Rational((l + 1) * (l + 2), (l - 1) * l * factorial(l) * _double_factorial(2 * l + 1))
                total += G / c**(2 * l + 1) * weight * square
            else:
                weight = sp.Rational(4 * l * (l + 2), (l - 1) * factorial(l + 1) * _double_factorial(2 * l + 1))
                total += G / c**(2 * l + 3) * weight * square
    normalised = total / (sp.Rational(32, 5) * c**5 / G * nu**2 * x**5)
    normalised = normalised.subs({omega: c**3 * x**sp.Rational(3, 2) / (G * total_mass)})
    normalised = normalised.subs({r: G * total_mass / (c**2 * x * _G_REL)})
    normalised = sp.expand(sp.powsimp(sp.expand(normalised), force=True))
    if normalised.has(c) or normalised.has(G):
        raise AssertionError(f"flux still depends on c or G: {normalised}")
    series = PNSeries.from_expression(normalised.subs(x, _EPS_X**2), _EPS_X, order)
    series = series.substitute(_G_REL, _relative_gamma(1 if order >= 1 else 0), _EPS_X)
    return series.truncate(order).map_coefficients(lambda e: reduce_mass_difference(sp.expand(e)))


# ------------------------------------------------------------------ general orbits
def energy_flux_from_modes(orbit: str = "general", pn=0) -> PNSeries:
    """Instantaneous general-orbit energy flux from the modes: S with F = (G/c^5) S, a PN
    series in eps = 1/c (see :mod:`stfalgebra.radiative.general_fluxes`)."""
    if orbit != "general":
        raise ValueError(f"use circular_energy_flux_from_modes for circular orbits, got orbit={orbit!r}")
    from .general_fluxes import general_orbit_energy_flux

    return general_orbit_energy_flux(pn)


def angular_momentum_flux_from_modes(orbit: str = "general", pn=0) -> PNSeries:
    """Instantaneous general-orbit dJ_z/dt from the modes: S_J with dJ_z/dt = (G/c^5) S_J."""
    if orbit != "general":
        raise ValueError(f"use circular_angular_momentum_flux_from_modes for circular orbits, got orbit={orbit!r}")
    from .general_fluxes import general_orbit_angular_momentum_flux

    return general_orbit_angular_momentum_flux(pn)
