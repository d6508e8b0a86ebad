"""Numerical integration of the relative two-body motion, for checks against the analytic orbit.

The relative acceleration ``dv/dt = a_x x + a_v v`` of the cited inputs (conservative terms
through 0, 1 or 2PN, optionally the 2.5PN reaction with a chosen strength) is evaluated in
floating point and integrated with scipy's ``solve_ivp`` in Cartesian coordinates of the orbital
plane, state ``(x, y, v_x, v_y)``. Units: ``G = m = 1``; ``c`` is a number (``eps = 1/c``).

Floats live only here and in the tests: the analytic results are exact elsewhere. The
*reaction strength* replaces the factor ``1/c^5`` of the reaction terms: the physical value is
``eps^5``; a larger one with the conservative corrections switched off (``pn_order = 0``) is the
model "Newtonian motion plus a scaled reaction force", whose effects on one orbit are large
enough to measure while its neglected terms (second order in the strength) stay small.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from functools import lru_cache
from typing import Any, Callable

import numpy as np
import sympy as sp

from stfalgebra.binary import cited_inputs
from stfalgebra.binary.dynamics import cited_series, relative_acceleration_factors
from stfalgebra.pnseries import PNSeries

__all__ = [
    "RelativeOrbitModel",
    "polar_coordinates",
    "cartesian_state",
]

_REACTION = cited_inputs.REACTION_ORDER


@lru_cache(maxsize=None)
def _reaction_factors() -> tuple[Any, Any]:
    """(a_x, a_v) of the 2.5PN reaction (coefficient of 1/c^5), sympy."""
    from stfalgebra.symbols import r, sympy_symbols

    s = sympy_symbols()
    alpha = cited_inputs.acceleration_reaction_n_factor(s)[_REACTION]
    beta = cited_inputs.acceleration_reaction_v_factor(s)[_REACTION]
    return sp.expand(alpha / r), sp.expand(beta)


def _check_float(value: Any, name: str, positive: bool = False, allow_none: bool = False) -> float | None:
    if value is None and allow_none:
        return None
    if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value):
        raise TypeError(f"{name} must be a finite number, got {value!r}")
    if positive and value <= 0:
        raise ValueError(f"{name} must be positive, got {value!r}")
    return float(value)


def polar_coordinates(state: Any) -> tuple[Any, Any, Any, Any]:
    """``(r, rdot, phi, phidot)`` of a Cartesian state ``(x, y, v_x, v_y)`` (arrays allowed).

    Parameters
    ----------
    state:
        Sequence or array whose first axis holds ``x, y, v_x, v_y``.

    Returns
    -------
    tuple
        ``r = |x|``, ``rdot = n.v``, ``phi = atan2(y, x)`` (in (-pi, pi]), ``phidot =
        (x v_y - y v_x)/r^2``.

    **Conventions**: orbital plane x-y, angular momentum along +z.

    Example
    -------
    >>> polar_coordinates((2.0, 0.0, 0.5, 1.0))
    (2.0, 0.5, 0.0, 0.5)

    References
    ----------
    Common practice.
    """
    px, py, vx, vy = state
    radius = np.hypot(px, py)
    rdot = (px * vx + py * vy) / radius
    phidot = (px * vy - py * vx) / radius**2
    phase = np.arctan2(py, px)
    if np.ndim(radius) == 0:
        return float(radius), float(rdot), float(phase), float(phidot)
    return radius, rdot, phase, phidot


def cartesian_state(radius: float, rdot: float, phase: float, phidot: float) -> tuple[float, float, float, float]:
    """The Cartesian state of polar values (inverse of :func:`polar_coordinates`).

    Example
    -------
    >>> cartesian_state(2.0, 0.5, 0.0, 0.25)
    (2.0, 0.0, 0.5, 0.5)

    References
    ----------
    Common practice.
    """
    cos_p, sin_p = math.cos(phase), math.sin(phase)
    return (radius * cos_p, radius * sin_p,
            rdot * cos_p - radius * phidot * sin_p, rdot * sin_p + radius * phidot * cos_p)


@dataclass(frozen=True)
class RelativeOrbitModel:
    """The relative equations of motion in floating point, ready for ``solve_ivp``.

    Parameters
    ----------
    pn_order:
        Conservative terms kept: 0, 1 or 2 (the cited harmonic-coordinate acceleration).
    nu:
        Symmetric mass ratio in (0, 1/4].
    speed_of_light:
        ``c`` in units ``G = m = 1`` (``eps = 1/c``).
    reaction_strength:
        The factor that multiplies the 2.5PN reaction terms in place of ``1/c^5``: ``None``
        (default) gives no reaction; ``eps**5`` the physical one.

    **Conventions**: harmonic coordinates, centre-of-mass frame, ``G = m = 1``; state
    ``(x, y, v_x, v_y)``.

    Example
    -------
    >>> model = RelativeOrbitModel(0, 0.25, 10.0)
    >>> model.acceleration((1.0, 0.0, 0.0, 1.0))
    (-1.0, 0.0)

    References
    ----------
    The cited inputs of :mod:`stfalgebra.binary.cited_inputs`.
    """

    pn_order: int
    nu: float
    speed_of_light: float
    reaction_strength: float | None = None
    _factors: tuple[Callable, Callable] = field(init=False, repr=False, compare=False)

    def __post_init__(self) -> None:
        if isinstance(self.pn_order, bool) or self.pn_order not in cited_inputs.INPUT_ORDERS["equations of motion"]:
            raise ValueError(f"pn_order must be one of 0, 1, 2, got {self.pn_order!r}")
        nu_value = _check_float(self.nu, "nu", positive=True)
        if nu_value > 0.25:
            raise ValueError(f"nu must lie in (0, 1/4], got {self.nu!r}")
        _check_float(self.speed_of_light, "speed_of_light", positive=True)
        _check_float(self.reaction_strength, "reaction_strength", allow_none=True)
        object.__setattr__(self, "_factors", self._numeric_factors())

    @property
    def eps(self) -> float:
        """``1/c``."""
        return 1.0 / self.speed_of_light

    def _substitutions(self) -> dict:
        from stfalgebra.symbols import G, m, nu

        return {G: 1, m: 1, nu: sp.nsimplify(self.nu, rational=True)}

    def _numeric_factors(self) -> tuple[Callable, Callable]:
        from stfalgebra.symbols import phidot, r, rdot

        a_x, a_v = relative_acceleration_factors(self.pn_order)
        reaction = _reaction_factors()
        values = self._substitutions()
        out = []
        for series, extra in ((a_x, reaction[0]), (a_v, reaction[1])):
            expr = sum((coeff * sp.Float(self.eps) ** int(2 * order) for order, coeff in series.terms.items()),
                       sp.S.Zero)
            if self.reaction_strength is not None:
                expr = expr + sp.Float(self.reaction_strength) * extra
            out.append(sp.lambdify((r, rdot, phidot), sp.sympify(expr).subs(values), "math"))
        return out[0], out[1]

    def acceleration(self, state: Any) -> tuple[float, float]:
        """``dv/dt`` at a Cartesian state (see the class example)."""
        radius, rdot, _, phidot = polar_coordinates(state)
        a_x = self._factors[0](radius, rdot, phidot)
        a_v = self._factors[1](radius, rdot, phidot)
        return (a_x * state[0] + a_v * state[2], a_x * state[1] + a_v * state[3])

    def rhs(self, _time: float, state: Any) -> tuple[float, float, float, float]:
        """The right-hand side ``d(x, y, v_x, v_y)/dt`` for ``solve_ivp``."""
        ax, ay = self.acceleration(state)
        return (state[2], state[3], ax, ay)

    def integrate(self, initial_state: Any, duration: float, *, rtol: float = 1e-12,
                  atol: float = 1e-14, events: Any = None, max_step: float = math.inf) -> Any:
        """Integrate from ``t = 0`` over ``duration`` (DOP853, dense output).

        Parameters
        ----------
        initial_state:
            ``(x, y, v_x, v_y)``.
        duration:
            Positive time span.
        rtol, atol, events, max_step:
            Passed to :func:`scipy.integrate.solve_ivp`.

        Returns
        -------
        scipy.integrate OdeResult
            With ``sol`` (dense output).

        Raises
        ------
        ArithmeticError
            The integrator failed (its message is named).

        Example
        -------
        >>> model = RelativeOrbitModel(0, 0.25, 10.0)
        >>> end = model.integrate((1.0, 0.0, 0.0, 1.0), 2 * math.pi).y[:, -1]
        >>> [round(float(value), 8) + 0.0 for value in end]
        [1.0, 0.0, 0.0, 1.0]
        """
        from scipy.integrate import solve_ivp

        span = _check_float(duration, "duration", positive=True)
        solution = solve_ivp(self.rhs, (0.0, span), tuple(float(v) for v in initial_state),
                             method="DOP853", rtol=rtol, atol=atol, dense_output=True,
                             events=events, max_step=max_step)
        if not solution.success:
            raise ArithmeticError(f"orbit integration failed: {solution.message}")
        return solution

    def evaluate(self, series: PNSeries, states: Any) -> np.ndarray:
        """A PN series in ``r, rdot, phidot`` evaluated along states (numpy arrays).

        Parameters
        ----------
        series:
            A PNSeries in ``eps = 1/c`` (e.g. the conserved energy); its order 5/2, if any, is
            weighted with :attr:`reaction_strength` (0 when there is no reaction) instead of
            ``eps^5``.
        states:
            Array of shape ``(4, N)`` (or one state).

        Returns
        -------
        numpy.ndarray

        Example
        -------
        >>> from stfalgebra.binary.dynamics import conserved_energy
        >>> model = RelativeOrbitModel(0, 0.25, 10.0)
        >>> float(model.evaluate(conserved_energy(0), (1.0, 0.0, 0.0, 1.0)))
        -0.5
        """
        from stfalgebra.symbols import phidot, r, rdot

        values = self._substitutions()
        expr = sp.S.Zero
        for order, coeff in series.terms.items():
            if order.denominator == 1:
                weight = sp.Float(self.eps) ** int(2 * order)
            elif order == _REACTION:
                weight = sp.Float(self.reaction_strength or 0.0)
            else:
                raise ValueError(f"no numeric weight for order {order} of {series!r}")
            expr = expr + weight * coeff
        function = sp.lambdify((r, rdot, phidot), sp.sympify(expr).subs(values), "numpy")
        radius, rdot_value, _, phidot_value = polar_coordinates(np.asarray(states, dtype=float))
        return np.asarray(function(radius, rdot_value, phidot_value), dtype=float)
