"""Osculating Keplerian elements of a perturbed two-body orbit and their rates.

At every instant the relative position and velocity ``(r, rdot, phi, phidot)`` define the
Newtonian ellipse they would follow if the perturbation stopped: its semi-major axis ``a``,
eccentricity ``e``, argument of periastron ``omega`` (``phi = omega + v``, ``v`` the true anomaly)
and mean anomaly ``l = u - e sin u`` (``u`` the eccentric anomaly):

    E = v^2/2 - G m/r = -G m/(2 a),        J = r^2 phidot = sqrt(G m a (1 - e^2)),
    e cos u = 1 - r/a,                      e sin u = r rdot/sqrt(G m a).

Under a perturbing acceleration ``f = R n + S lambda`` (per unit reduced mass, ``lambda =
e_z x n``) the elements change at the rates obtained by differentiating these definitions along
``dv/dt = -G m n/r^2 + f`` (only ``f`` survives):

    dE/dt = rdot R + r phidot S,     dJ/dt = r S,
    da/dt = (2 a^2/(G m)) dE/dt,     e de/dt = (J^2 dE/dt + 2 E J dJ/dt)/(G m)^2,
    d(e cos u)/dt|_f = (r/a^2) da/dt,
    d(e sin u)/dt|_f = r R/sqrt(G m a) - (r rdot/(2 sqrt(G m) a^(3/2))) da/dt,
    du/dt|_f = (cos u d(e sin u)/dt|_f - sin u d(e cos u)/dt|_f)/e,
    dl/dt - n = (1 - e cos u) du/dt|_f - sin u de/dt,
    domega/dt = -(dv/du) du/dt|_f - (dv/de) de/dt,   dv/du = sqrt(1 - e^2)/(1 - e cos u),
                                                    dv/de = sin u/(sqrt(1 - e^2)(1 - e cos u)),

with ``n = sqrt(G m/a^3)``. :func:`element_rates` gives these exactly on the ellipse (functions of
``u``); :func:`osculating_elements` evaluates the map in floating point along a numerical orbit.
The elements ``omega`` and ``l`` are singular at ``e = 0`` (the periastron is undefined there);
``e cos omega``, ``e sin omega`` are not.
"""

from __future__ import annotations

import math
from typing import Any

import numpy as np
import sympy as sp

from ..symbols import G, m, phidot, r, rdot
from .keplerian import KeplerEllipse, a, e, u

__all__ = [
    "ELEMENT_NAMES",
    "element_rates",
    "osculating_elements",
]

#: The osculating elements, in the order the functions of this module return them.
ELEMENT_NAMES = ("semi_major_axis", "eccentricity", "periastron_argument", "mean_anomaly")


def element_rates(radial: Any, transverse: Any, semi_major_axis: Any = a) -> dict[str, sp.Expr]:
    """The rates of the osculating elements under a perturbing acceleration, on the ellipse.

    Parameters
    ----------
    radial, transverse:
        The components ``R = f.n`` and ``S = f.lambda`` of the perturbing acceleration per unit
        reduced mass, as expressions in ``r, rdot, phidot`` (the general-orbit symbols) and
        constants; they are evaluated on the ellipse of semi-major axis ``a`` and eccentricity
        ``e`` (the symbols of :mod:`stfalgebra.binary.keplerian`).
    semi_major_axis:
        The ``a`` of the ellipse (default the symbol; a number such as 1 fixes the unit of
        length).

    Returns
    -------
    dict
        ``{"semi_major_axis": da/dt, "eccentricity": de/dt, "periastron_argument": domega/dt,
        "mean_anomaly": dl/dt - n}`` as expressions in ``cos(u)``, ``sin(u)``, ``a``, ``e`` and the
        constants (``n = sqrt(G m/a^3)``).

    Raises
    ------
    TypeError
        A component that is not an expression.

    **Conventions**: module docstring; periastron at ``u = 0``, motion along +phi.

    Example
    -------
    >>> rates = element_rates(0, -sp.Symbol("k") * phidot * r)      # a drag along lambda
    >>> sp.factor(rates["semi_major_axis"].subs(e, 0))
    -2*a*k

    References
    ----------
    Common practice (Lagrange-Gauss planetary equations, derived here from E, J and Kepler's
    equation; e.g. Murray & Dermott, Solar System Dynamics, Sec. 2.9).
    """
    for name, value in (("radial", radial), ("transverse", transverse)):
        if not isinstance(value, (int, sp.Basic)) or isinstance(value, bool):
            raise TypeError(f"{name} must be a sympy expression, got {value!r}")
    axis = sp.sympify(semi_major_axis)
    orbit = KeplerEllipse(axis, e)
    on_orbit = orbit.orbit_substitution()
    big_r = sp.sympify(radial).subs(on_orbit)
    big_s = sp.sympify(transverse).subs(on_orbit)
    radius, velocity, angular = on_orbit[r], on_orbit[rdot], on_orbit[phidot]
    energy, momentum = orbit.energy, orbit.angular_momentum
    root = sp.sqrt(1 - e**2)
    energy_rate = velocity * big_r + radius * angular * big_s
    momentum_rate = radius * big_s
    a_rate = 2 * axis**2 / (G * m) * energy_rate
    e_rate = (momentum**2 * energy_rate + 2 * energy * momentum * momentum_rate) / ((G * m) ** 2 * e)
    e_cos_rate = radius / axis**2 * a_rate
    e_sin_rate = (radius * big_r / sp.sqrt(G * m * axis)
                  - radius * velocity / (2 * sp.sqrt(G * m) * axis ** sp.Rational(3, 2)) * a_rate)
    u_rate = (sp.cos(u) * e_sin_rate - sp.sin(u) * e_cos_rate) / e
    w = 1 - e * sp.cos(u)
    l_rate = w * u_rate - sp.sin(u) * e_rate
    omega_rate = -(root / w) * u_rate - sp.sin(u) / (root * w) * e_rate
    rates = (a_rate, e_rate, omega_rate, l_rate)
    return {name: sp.cancel(sp.together(rate)) for name, rate in zip(ELEMENT_NAMES, rates)}


def osculating_elements(radius: Any, radial_velocity: Any, phase: Any, angular_velocity: Any,
                        gravitational_mass: float = 1.0) -> dict[str, np.ndarray]:
    """The osculating Keplerian elements of states (floating point, arrays allowed).

    Parameters
    ----------
    radius, radial_velocity, phase, angular_velocity:
        ``r, rdot, phi, phidot`` (e.g. from
        :func:`~stfalgebra.binary.orbit_integration.polar_coordinates`).
    gravitational_mass:
        ``G m`` (default 1).

    Returns
    -------
    dict
        ``semi_major_axis``, ``eccentricity``, ``periastron_argument`` (``phi - v``, in
        (-pi, pi]), ``mean_anomaly`` (``u - e sin u``, in (-pi, pi]) and ``eccentric_anomaly``
        (in (-pi, pi]), as numpy arrays (floats for scalar input).

    Raises
    ------
    ValueError
        A state that is not bound (``E >= 0``) or a non-positive ``G m``.

    **Conventions**: module docstring. Unwrap the angles (``numpy.unwrap``) along an orbit.

    Example
    -------
    >>> elements = osculating_elements(0.5, 0.0, 0.0, math.sqrt(3) * 2)
    >>> [round(float(elements[k]), 12) for k in ("semi_major_axis", "eccentricity", "mean_anomaly")]
    [1.0, 0.5, 0.0]

    References
    ----------
    Common practice (Kepler problem).
    """
    gm = float(gravitational_mass)
    if not gm > 0:
        raise ValueError(f"gravitational_mass must be positive, got {gravitational_mass!r}")
    rr = np.asarray(radius, dtype=float)
    rd = np.asarray(radial_velocity, dtype=float)
    ph = np.asarray(phase, dtype=float)
    pd = np.asarray(angular_velocity, dtype=float)
    energy = (rd**2 + (rr * pd) ** 2) / 2 - gm / rr
    if np.any(energy >= 0):
        raise ValueError(f"osculating elements need bound states (E < 0), got E = {energy!r}")
    axis = -gm / (2 * energy)
    momentum = rr**2 * pd
    ecc = np.sqrt(np.maximum(0.0, 1 - momentum**2 / (gm * axis)))
    e_cos, e_sin = 1 - rr / axis, rr * rd / np.sqrt(gm * axis)
    anomaly = np.arctan2(e_sin, e_cos)
    mean_anomaly = np.angle(np.exp(1j * (anomaly - e_sin)))
    true_anomaly = anomaly + 2 * np.arctan2(ecc * np.sin(anomaly) / (1 + np.sqrt(1 - ecc**2)),
                                            1 - ecc * np.cos(anomaly) / (1 + np.sqrt(1 - ecc**2)))
    omega = np.angle(np.exp(1j * (ph - true_anomaly)))
    out = {"semi_major_axis": axis, "eccentricity": ecc, "periastron_argument": omega,
           "mean_anomaly": mean_anomaly, "eccentric_anomaly": anomaly}
    if np.ndim(rr) == 0:
        return {key: float(value) for key, value in out.items()}
    return out
