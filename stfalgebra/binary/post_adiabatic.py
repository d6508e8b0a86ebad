"""Secular and periodic evolution of the orbital elements under the 2.5PN radiation reaction.

The Newtonian orbit perturbed by the leading (2.5PN) reaction acceleration of
:mod:`stfalgebra.binary.cited_inputs` is described by osculating Keplerian elements
(:mod:`stfalgebra.binary.osculating_elements`), each split by the method of variation of
constants into a slowly drifting mean and a periodic part of relative size ``1/c^5``:

    c(t) = cbar(t) + ctilde(u; cbar),      dcbar/dt = <dc/dt>,      <ctilde> = 0,

``<.>`` the average over one radial period at fixed elements and ``u`` the eccentric anomaly. With
the reaction scale ``epsilon = nu (G m/(c^2 a))^(5/2)`` and ``n = sqrt(G m/a^3)`` the rates are
``da/dt = n a epsilon A(u)``, ``de/dt = n epsilon E(u)``, ``domega/dt = n epsilon W(u)``,
``dl/dt = n + n epsilon L(u)`` (``A, E, W, L`` functions of ``u`` and ``e`` alone), and to first
order in ``epsilon``

    atilde = a epsilon int (A - <A>) dl,     etilde = epsilon int (E - <E>) dl,
    omegatilde = epsilon int (W - <W>) dl,
    ltilde = epsilon int (L - <L> - (3/2) atilde/(a epsilon)) dl,

the last because the mean anomaly advances at the osculating mean motion, whose periodic part is
``-(3/2) n atilde/a``; ``dlbar/dt = nbar``. The averages ``<A>``, ``<E>`` are the secular
(Peters) rates; ``<W> = <L> = 0``. Every periodic part is exact in ``u`` (rational functions of
``cos u, sin u``, ``v - u``, ``log(1 - e cos u)``, and for ``ltilde`` the dilogarithm
``Re Li_2(rho e^(i u))``, :mod:`stfalgebra.binary.anomaly_integrals`). The neglected terms are of
relative order ``epsilon^2`` (and, over a time ``T``, ``epsilon^2 n T`` in the secular drift).
The conservative PN corrections (1PN, 2PN) are not included: the elements are those of the
Newtonian ellipse.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache
from typing import Any

import numpy as np
import sympy as sp

from ..symbols import G, c, m, nu, sympy_symbols
from . import cited_inputs
from .anomaly_integrals import RATIONAL, TRUE_MINUS_ECCENTRIC_ANOMALY, AnomalyFunction, zero_mean_integral
from .keplerian import a, e, u
from .osculating_elements import ELEMENT_NAMES, element_rates

__all__ = [
    "reaction_scale",
    "reaction_element_rates",
    "ElementEvolution",
    "post_adiabatic_evolution",
]

_THREE_HALVES = sp.Rational(3, 2)


def reaction_scale(semi_major_axis: Any = a) -> sp.Expr:
    """``epsilon = nu (G m/(c^2 a))^(5/2)``, the relative size of the 2.5PN reaction.

    Example
    -------
    >>> reaction_scale()
    G**(5/2)*m**(5/2)*nu/(a**(5/2)*c**5)

    References
    ----------
    Common practice.
    """
    return nu * (G * m / (c**2 * sp.sympify(semi_major_axis))) ** sp.Rational(5, 2)


def _units() -> dict[str, sp.Expr]:
    """The unit of each rate: ``n a epsilon`` for ``a``, ``n epsilon`` otherwise."""
    epsilon = reaction_scale()
    n = sp.sqrt(G * m / a**3)
    return {"semi_major_axis": n * a * epsilon, "eccentricity": n * epsilon,
            "periastron_argument": n * epsilon, "mean_anomaly": n * epsilon}


@lru_cache(maxsize=None)
def _shapes() -> dict[str, sp.Expr]:
    """The dimensionless rates A, E, W, L (functions of u and e): the rates in units
    G = m = a = 1 of the reaction with nu/c^5 = 1, where every unit of :func:`_units` is 1."""
    from ..symbols import phidot, r, rdot

    s = sympy_symbols()
    order = cited_inputs.REACTION_ORDER
    ones = {G: 1, m: 1, nu: 1}
    alpha = sp.sympify(cited_inputs.acceleration_reaction_n_factor(s)[order]).subs(ones)
    beta = sp.sympify(cited_inputs.acceleration_reaction_v_factor(s)[order]).subs(ones)
    rates = element_rates(sp.expand(alpha + beta * rdot), sp.expand(beta * r * phidot), semi_major_axis=1)
    out = {}
    for name, rate in rates.items():
        shape = sp.factor(rate.subs(ones))
        if shape.free_symbols - {u, e}:
            raise ArithmeticError(f"the rate of {name} depends on more than u and e: {shape}")
        out[name] = shape
    return out


@lru_cache(maxsize=None)
def reaction_element_rates() -> dict[str, sp.Expr]:
    """The exact rates of the osculating elements under the 2.5PN reaction, functions of ``u``.

    Returns
    -------
    dict
        ``{"semi_major_axis": da/dt, "eccentricity": de/dt, "periastron_argument": domega/dt,
        "mean_anomaly": dl/dt - n}`` in ``cos(u)``, ``sin(u)``, ``a``, ``e``, ``G``, ``m``,
        ``nu``, ``c``: the unit (``n a epsilon`` or ``n epsilon``) times a function of ``u`` and
        ``e`` (the reaction is ``nu (G m)^2/c^5`` times a homogeneous function of ``r``, ``v``:
        every rate scales exactly so).

    **Conventions**: harmonic-coordinate reaction acceleration
    (:func:`~stfalgebra.binary.cited_inputs.acceleration_reaction_n_factor`), Newtonian ellipse;
    :mod:`stfalgebra.binary.osculating_elements`.

    Example
    -------
    >>> rate = reaction_element_rates()["semi_major_axis"]
    >>> sp.factor(rate.subs(e, 0))
    -64*G**3*m**3*nu/(5*a**3*c**5)

    References
    ----------
    The reaction acceleration as cited in :mod:`stfalgebra.binary.cited_inputs`; the rates by
    :func:`~stfalgebra.binary.osculating_elements.element_rates`.
    """
    units = _units()
    return {name: sp.powsimp(units[name] * shape, force=True) for name, shape in _shapes().items()}


@dataclass(frozen=True)
class ElementEvolution:
    """The secular rate and the periodic part of one osculating element.

    Attributes
    ----------
    name:
        One of :data:`~stfalgebra.binary.osculating_elements.ELEMENT_NAMES`.
    secular_rate:
        ``dcbar/dt`` in ``a, e, G, m, nu, c`` (for the mean anomaly: ``dlbar/dt - n``).
    scale:
        The factor of the periodic shape: ``a epsilon`` for the semi-major axis, ``epsilon``
        otherwise (:func:`reaction_scale`).
    periodic_shape:
        The dimensionless periodic part, an
        :class:`~stfalgebra.binary.anomaly_integrals.AnomalyFunction` of ``u`` and ``e`` with
        zero orbit average.
    """

    name: str
    secular_rate: sp.Expr
    scale: sp.Expr
    periodic_shape: AnomalyFunction

    def periodic_part(self) -> sp.Expr:
        """``ctilde`` as one closed-form expression in ``u``, ``a``, ``e`` and the constants."""
        return self.scale * self.periodic_shape.expression()

    def numeric_periodic_part(self, anomaly: Any, semi_major_axis: Any, eccentricity: Any,
                              epsilon: Any) -> np.ndarray:
        """``ctilde`` in floating point (numpy broadcasting): ``epsilon`` the value of
        :func:`reaction_scale` (``a epsilon`` is formed here for the semi-major axis)."""
        factor = np.asarray(epsilon, dtype=float)
        if self.name == "semi_major_axis":
            factor = factor * np.asarray(semi_major_axis, dtype=float)
        return factor * self.periodic_shape.numeric(anomaly, eccentricity)


@lru_cache(maxsize=None)
def post_adiabatic_evolution() -> dict[str, ElementEvolution]:
    """Secular rates and exact periodic parts of the osculating elements (first order in 1/c^5).

    Returns
    -------
    dict
        ``{name: ElementEvolution}`` for the semi-major axis, eccentricity, argument of
        periastron and mean anomaly.

    **Conventions**: module docstring; periastron at ``u = 0``; the periodic parts average to
    zero over the radial period (so the secular elements are the orbit means); ``epsilon`` at
    the mean semi-major axis.

    Example
    -------
    >>> evolution = post_adiabatic_evolution()
    >>> evolution["semi_major_axis"].secular_rate
    2*G**3*m**3*nu*(-37*e**4 - 292*e**2 - 96)/(15*a**3*c**5*(1 - e**2)**(7/2))
    >>> evolution["periastron_argument"].secular_rate
    0

    References
    ----------
    The method of variation of constants with the two-scale split (Damour, Gopakumar & Iyer,
    Phys. Rev. D 70, 064028 (2004), Sec. III); derived here. The secular rates agree with
    Peters, Phys. Rev. 136, B1224 (1964) (tested).
    """
    shapes = _shapes()
    epsilon = reaction_scale()
    units = _units()
    results = {}
    for name in ("semi_major_axis", "eccentricity", "periastron_argument"):
        integral = zero_mean_integral(shapes[name])
        results[name] = (integral.mean, integral.periodic)
    # the mean anomaly is driven by its own rate and by the periodic part of the mean motion
    axis_periodic = results["semi_major_axis"][1]
    rational = axis_periodic.coefficient(RATIONAL)
    v_coefficient = axis_periodic.coefficient(TRUE_MINUS_ECCENTRIC_ANOMALY)
    if v_coefficient.has(u):
        raise ArithmeticError("the periodic semi-major axis has a u-dependent (v - u) coefficient")
    integral = zero_mean_integral(shapes["mean_anomaly"] - _THREE_HALVES * rational,
                                  -_THREE_HALVES * v_coefficient)
    results["mean_anomaly"] = (integral.mean, integral.periodic)
    out = {}
    for name in ELEMENT_NAMES:
        mean, periodic = results[name]
        secular = units[name] * mean
        secular = _display_rate(secular) if mean != 0 else sp.S.Zero
        scale = a * epsilon if name == "semi_major_axis" else epsilon
        out[name] = ElementEvolution(name, secular, scale, periodic)
    return out


def _display_rate(expr: sp.Expr) -> sp.Expr:
    """The factor free of ``e`` times the canonical form of the rest (the form of the Peters
    rates: ``P(e)/(1 - e^2)^(k/2)``)."""
    from .keplerian import tidy_eccentricity

    expr = sp.powsimp(sp.expand(expr), force=True)
    unit = sp.Mul(*[f for f in sp.Mul.make_args(sp.factor(expr)) if not f.has(e)])
    return unit * tidy_eccentricity(sp.powsimp(expr / unit, force=True), e)
