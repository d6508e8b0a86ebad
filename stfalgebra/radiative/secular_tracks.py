"""Solutions of the secular equations of an eccentric binary: closed and integrated tracks.

* :func:`newtonian_semi_major_axis_track`: the semi-major axis as a closed function of the
  eccentricity along the Newtonian evolution, by partial fractions over the rationals.
* :func:`integrate_secular_evolution`: ``e_t(x)`` and the elapsed time along the evolution
  driven by the rates of :mod:`stfalgebra.radiative.secular_rates` (through 1.5PN), integrated
  in ``ln x`` with scipy's adaptive ``solve_ivp`` (explicit Runge-Kutta of order 8(5,3),
  ``DOP853``, relative tolerance 1e-10, absolute 1e-12).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache
from typing import Any

import numpy as np
import sympy as sp
from scipy.integrate import solve_ivp

from ..binary.keplerian import a as semi_major_axis_symbol, e as kepler_eccentricity
from ..binary.keplerian import validate_eccentricity, validate_frequency_parameter
from ..binary.masses import validate_nu
from ..symbols import G, nu
from .eccentric_fluxes import check_eccentric_order
from .secular_rates import newtonian_secular_rates, numeric_secular_rates
from .tail_enhancement import TAIL_ENHANCEMENT_MAX_ECCENTRICITY

__all__ = [
    "newtonian_semi_major_axis_track",
    "SecularTrackPoint",
    "INTEGRATION_RTOL",
    "INTEGRATION_ATOL",
    "integrate_secular_evolution",
]

#: Relative and absolute tolerances of the adaptive integration (per step, on e_t and tau).
INTEGRATION_RTOL = 1e-10
INTEGRATION_ATOL = 1e-12
_METHOD = "DOP853"
_STAGES_PER_STEP = 12      # right-hand-side evaluations of one DOP853 step


@lru_cache(maxsize=None)
def newtonian_semi_major_axis_track() -> sp.Expr:
    """The semi-major axis as a function of the eccentricity along the Newtonian evolution.

    Integrates ``d ln a/de = (da/dt)/(a de/dt)`` from
    :func:`~stfalgebra.radiative.secular_rates.newtonian_secular_rates` by partial fractions
    over the rationals (every factor of the denominator gives a power).

    Returns
    -------
    sympy.Expr
        ``a(e)`` with the integration constant ``c0`` (a symbol).

    Raises
    ------
    ArithmeticError
        If the integral were not a sum of logarithms (it is).

    **Conventions**: ``e`` the Keplerian eccentricity, ``c0`` fixed by the initial condition.

    Example
    -------
    >>> newtonian_semi_major_axis_track()
    c0*e**(12/19)*(121*e**2/304 + 1)**(870/2299)/(1 - e**2)

    References
    ----------
    Peters, Phys. Rev. 136, B1224 (1964) (compared in the tests).
    """
    ecc = kepler_eccentricity
    da, de = newtonian_secular_rates()
    rate = sp.cancel(sp.powsimp(da / (semi_major_axis_symbol * de), force=True))
    if rate.has(semi_major_axis_symbol) or rate.has(nu) or rate.has(G):
        raise ArithmeticError(f"d ln a/de depends on more than e: {rate}")
    num, den = sp.fraction(sp.cancel(rate))
    quotient, remainder = sp.div(sp.Poly(num, ecc), sp.Poly(den, ecc))
    if not quotient.is_zero:
        raise ArithmeticError(f"d ln a/de has a polynomial part: {quotient}")
    _, factors = sp.factor_list(den, ecc)
    unknowns = []
    ansatz = sp.S.Zero
    logs = []
    for factor, multiplicity in factors:
        if multiplicity != 1 or sp.degree(factor, ecc) > 2:
            raise ArithmeticError(f"unexpected factor {factor}**{multiplicity} in d ln a/de")
        alpha = sp.Dummy("alpha")
        unknowns.append(alpha)
        ansatz += alpha * sp.diff(factor, ecc) / factor
        logs.append((alpha, factor))
        if sp.degree(factor, ecc) == 2:
            beta = sp.Dummy("beta")
            unknowns.append(beta)
            ansatz += beta / factor
    numerator_eq = sp.Poly(sp.cancel(ansatz * den) - sp.cancel(rate * den), ecc)
    solution = sp.solve(numerator_eq.coeffs(), unknowns, dict=True)
    if len(solution) != 1:
        raise ArithmeticError("partial fractions of d ln a/de failed")
    solution = solution[0]
    for symbol in unknowns:
        if symbol.name == "beta" and solution.get(symbol, 0) != 0:
            raise ArithmeticError("d ln a/de integrates to an arctangent")
    track = sp.Symbol("c0", positive=True)
    powers: dict[sp.Expr, sp.Expr] = {}
    for alpha, factor in logs:
        # |factor| made positive on 0 < e < 1
        sign = 1 if factor.subs(ecc, sp.Rational(1, 2)) > 0 else -1
        base = sp.expand(sign * factor)
        lead = base.subs(ecc, 0)
        base = sp.expand(base / lead) if lead not in (0,) else base
        powers[base] = powers.get(base, 0) + solution[alpha]
    # merge (1 - e)^p (1 + e)^p into (1 - e^2)^p
    one_minus, one_plus = 1 - ecc, 1 + ecc
    if one_minus in powers and one_plus in powers and powers[one_minus] == powers[one_plus]:
        p = powers.pop(one_minus)
        powers.pop(one_plus)
        powers[1 - ecc**2] = p
    for base, p in powers.items():
        track = track * base**p
    return track


@dataclass(frozen=True)
class SecularTrackPoint:
    """One point of a secular evolution: ``x``, ``e_t`` and ``tau = c^3 (t - t_0)/(G m)``."""

    x: float
    et: float
    tau: float

    def to_json(self) -> dict:
        return {"x": self.x, "et": self.et, "tau": self.tau}


class _StepBudgetExceeded(Exception):
    """Raised inside the right-hand side to stop an integration that exceeds its budget."""


def integrate_secular_evolution(x_initial: Any, e_initial: Any, x_final: Any, nu_value: Any,
                                pn: Any = 1, points: int = 11, steps: int = 2000, *,
                                rates: tuple[Any, Any] | None = None) -> list[SecularTrackPoint]:
    """Integrate the secular equations ``de_t/dx`` and ``dt/dx`` from ``x_initial`` to ``x_final``.

    Parameters
    ----------
    x_initial, x_final:
        Frequency parameters (> 0); the integration runs in ``ln x`` (either direction).
    e_initial:
        Initial time eccentricity in [0, 1) (in [0, 0.95] from 1.5PN, where the tail
        enhancement functions are evaluated).
    nu_value:
        Symmetric mass ratio in (0, 1/4].
    pn:
        0, 1/2, 1, 3/2 or 2 (order of :func:`~stfalgebra.radiative.secular_rates.secular_rates`).
    points:
        Number of output points (>= 2), equally spaced in ``ln x``.
    steps:
        Budget of the adaptive integrator: at most this many steps (counted as
        ``12 * steps`` right-hand-side evaluations, the stages of a DOP853 step); the step
        sizes themselves are chosen by the error control.
    rates:
        Optional float rates ``(X, Y)`` of ``(x, e_t, nu)`` replacing those of
        :func:`~stfalgebra.radiative.secular_rates.numeric_secular_rates`: the rates of order ``pn``
        already compiled (:func:`~stfalgebra.radiative.secular_rates.compile_secular_rates`, so
        that a caller holding the derived series does not derive them again), or with aligned
        spins :func:`~stfalgebra.radiative.spinning_secular_rates.numeric_spinning_secular_rates`.

    Returns
    -------
    list of SecularTrackPoint
        ``x``, ``e_t`` and ``tau = c^3 (t - t_initial)/(G m)`` at each output point (values
        between the integrator's steps from its dense output).

    Raises
    ------
    ValueError
        Non-positive ``x``, ``e`` outside [0, 1) (or above 0.95 from 1.5PN), ``nu`` outside
        (0, 1/4], the eccentricity leaving that range during the integration, ``dx/dt <= 0``
        (beyond the range of the truncated rates), or the step budget exhausted.

    **Conventions**: ``de_t/d ln x = (de_t/dt) x/(dx/dt)``, ``dtau/d ln x = x/(dx/dt)``, rates
    from :func:`~stfalgebra.radiative.secular_rates.numeric_secular_rates`. The integration
    is scipy's ``solve_ivp`` with ``DOP853``, ``rtol = 1e-10``, ``atol = 1e-12``.

    Example
    -------
    >>> track = integrate_secular_evolution(0.01, 0.3, 0.02, 0.25, pn=0, points=2)
    >>> round(track[-1].et, 4)
    0.1158

    References
    ----------
    Peters, Phys. Rev. 136, B1224 (1964) (Newtonian evolution); Hairer, Norsett & Wanner,
    Solving Ordinary Differential Equations I (DOP853), as implemented in scipy.
    """
    order = check_eccentric_order(pn)
    x0 = float(validate_frequency_parameter(x_initial, "x_initial"))
    x1 = float(validate_frequency_parameter(x_final, "x_final"))
    e0 = float(validate_eccentricity(e_initial, "e_initial"))
    nv = float(validate_nu(nu_value))
    if isinstance(points, bool) or not isinstance(points, int) or points < 2:
        raise ValueError(f"points must be an int >= 2, got {points!r}")
    if isinstance(steps, bool) or not isinstance(steps, int) or steps < 1:
        raise ValueError(f"steps must be a positive int, got {steps!r}")
    with_tails = order >= sp.Rational(3, 2)
    limit = TAIL_ENHANCEMENT_MAX_ECCENTRICITY if with_tails else 1.0
    if with_tails and e0 > limit:
        raise ValueError(f"e_initial must lie in [0, {limit}] at {order}PN (the tail "
                         f"enhancement functions are evaluated there), got {e_initial!r}")
    x_rate, e_rate = numeric_secular_rates(order) if rates is None else rates
    budget = _STAGES_PER_STEP * steps + 2
    calls = [0]

    def derivatives(log_x: float, state: np.ndarray) -> list[float]:
        calls[0] += 1
        if calls[0] > budget:
            raise _StepBudgetExceeded
        ecc = float(state[0])
        xv = math.exp(log_x)
        if not 0 <= ecc < 1 or (with_tails and ecc > limit):
            raise ValueError(f"the eccentricity left [0, {limit}{']' if with_tails else ')'} "
                             f"during the integration (e = {ecc}, x = {xv})")
        xdot = nv * xv**5 * x_rate(xv, ecc, nv)
        edot = nv * xv**4 * e_rate(xv, ecc, nv)
        if xdot <= 0:
            raise ValueError(f"dx/dt = {xdot} is not positive at x = {xv}, e = {ecc}: outside the "
                             f"range where the truncated PN rates make sense")
        return [edot * xv / xdot, xv / xdot]

    start, stop = math.log(x0), math.log(x1)
    outputs = np.linspace(start, stop, points)
    try:
        solution = solve_ivp(derivatives, (start, stop), [e0, 0.0], method=_METHOD,
                             t_eval=outputs, rtol=INTEGRATION_RTOL, atol=INTEGRATION_ATOL)
    except _StepBudgetExceeded:
        raise ValueError(f"the integration needs more than steps = {steps} steps; raise the "
                         f"budget or shorten the range") from None
    if not solution.success:
        raise ValueError(f"the integration failed: {solution.message}")
    track = []
    for index, (log_x, ecc, tau) in enumerate(zip(solution.t, solution.y[0], solution.y[1])):
        xv = x0 if index == 0 else x1 if index == points - 1 else math.exp(log_x)
        track.append(SecularTrackPoint(xv, max(float(ecc), 0.0), float(tau)))
    return track
