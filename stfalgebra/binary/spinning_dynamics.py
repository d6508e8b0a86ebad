"""The dynamics of a spinning binary through 1PN plus the leading spin-orbit terms, in three algebras.

The cited formulas (:mod:`stfalgebra.binary.cited_inputs` for the point masses,
:mod:`stfalgebra.binary.spin_orbit_inputs` for the spin-orbit terms) are evaluated here:

- **aligned spins, exact engine**: the vectors on the polar triad ``(n, lambda, e_z)`` of the
  planar orbit, ``x = r n``, ``v = rdot n + r phidot lambda``, spins ``s_l e_z``,
  ``sigma_l e_z`` with ``s_l, sigma_l`` polynomials in the generators ``chi1, chi2``
  (:func:`aligned_spin_namespace`, :func:`aligned_spin_acceleration`), and the time derivative
  along that orbit (:class:`AlignedSpinOrbitDerivative`);
- **any spin directions, floats**: the equations of motion of the relative orbit and of the two
  spins, the conserved energy and total angular momentum (:func:`numeric_spinning_binary`), for
  numerical integration.

**Accuracy.** The point-mass terms are those of the cited inputs at the requested PN order; the
spin terms are leading spin-orbit only, so every spinning result is known through relative
order 3/2 (:data:`~stfalgebra.binary.spin_variables.SPINNING_KNOWN_THROUGH`): spin-spin terms
(2PN) and next-to-leading spin-orbit terms (2.5PN) are not entered.

**Conventions**: :mod:`stfalgebra.binary.spin_variables` (spins), ``shared/conventions.md``
(orbit): harmonic coordinates, centre-of-mass frame, covariant spin supplementary condition.
For aligned spins the orbit stays in the plane orthogonal to the spins and the spins do not
precess (``Omega_A`` is along ``e_z``).
"""

from __future__ import annotations

from fractions import Fraction
from functools import lru_cache
from types import SimpleNamespace
from typing import Any, Callable

from ..exact import ExactPolynomial, engine_symbols
from ..orders import PNOrder
from ..pnseries import PNSeries
from .cited_inputs import (
    acceleration_n_factor, acceleration_v_factor, angular_momentum_per_reduced_mass,
    check_input_order, energy_per_reduced_mass,
)
from .orbit_derivative import derivative_with_rates
from .spin_orbit_inputs import (
    precession_frequencies, spin_orbit_acceleration, spin_orbit_angular_momentum, spin_orbit_energy,
)
from .spin_variables import SPIN_ORBIT_ORDER, SPINNING_KNOWN_THROUGH, aligned_spin_components, spin_combinations
from .triad_vectors import TriadVector, cross, dot

__all__ = [
    "aligned_spin_namespace",
    "aligned_spin_acceleration",
    "aligned_spin_energy",
    "aligned_spin_angular_momentum",
    "AlignedSpinOrbitDerivative",
    "numeric_spinning_binary",
    "NumericSpinningBinary",
]

#: PN order of the point-mass terms combined with the leading spin-orbit terms (1PN: the
#: spinning results are known through 3/2, so the 2PN point-mass terms would add nothing known).
_POINT_MASS_ORDER = 1


@lru_cache(maxsize=1)
def aligned_spin_namespace() -> SimpleNamespace:
    """The engine namespace of the spin-orbit inputs for aligned spins on the polar triad.

    Returns
    -------
    SimpleNamespace
        :func:`~stfalgebra.exact.engine_symbols` plus ``x = (r, 0, 0)``,
        ``v = (rdot, r phidot, 0)``, ``spin = (0, 0, s_l)``, ``spin_difference = (0, 0, sigma_l)``
        as :class:`~stfalgebra.binary.triad_vectors.TriadVector` on ``(n, lambda, e_z)``, and
        ``cross``, ``dot``.

    Example
    -------
    >>> aligned_spin_namespace().spin.components[2]
    chi1/2 + chi2/2 - nu*chi1 - nu*chi2 + delta*chi1/2 - delta*chi2/2
    """
    base = engine_symbols()
    zero = ExactPolynomial(0)
    s_l, sigma_l = aligned_spin_components()
    values = dict(vars(base))   # the vector x replaces the circular-orbit variable x here
    values.update(x=TriadVector(base.r, zero, zero),
                  v=TriadVector(base.rdot, base.r * base.phidot, zero),
                  spin=TriadVector(zero, zero, s_l),
                  spin_difference=TriadVector(zero, zero, sigma_l),
                  cross=cross, dot=dot)
    return SimpleNamespace(**values)


@lru_cache(maxsize=1)
def aligned_spin_acceleration() -> tuple[ExactPolynomial, ExactPolynomial]:
    """Polar components ``(a_n, a_lambda)`` of the spin-orbit acceleration for aligned spins.

    Returns
    -------
    (ExactPolynomial, ExactPolynomial)
        Coefficients of ``1/c^3`` in ``a . n`` and ``a . lambda`` (the ``e_z`` component
        vanishes: the orbit stays planar). ``a_lambda`` is proportional to ``rdot``, so circular
        orbits exist.

    Example
    -------
    >>> a_n, a_lambda = aligned_spin_acceleration()
    >>> a_lambda.substitute({"chi1": 1, "chi2": 1, "delta": 0, "nu": Fraction(1, 4)})
    -G**2*m**2*r**(-3)*rdot
    """
    value = spin_orbit_acceleration(aligned_spin_namespace())[SPIN_ORBIT_ORDER]
    a_n, a_lambda, a_z = value.components
    if not a_z.is_zero():
        raise ArithmeticError("aligned spins: the spin-orbit acceleration leaves the orbital plane")
    return a_n, a_lambda


@lru_cache(maxsize=None)
def aligned_spin_energy(pn_order: int = _POINT_MASS_ORDER) -> PNSeries:
    """Conserved energy per reduced mass with aligned spins, a PN series in ``1/c``.

    Parameters
    ----------
    pn_order:
        PN order of the point-mass part (0 or 1; the result is known through
        ``min(pn_order + 1/2, 3/2)``, the spin-orbit term being kept only when it is known).

    Returns
    -------
    PNSeries
        ``E/mu`` (rest mass excluded): point-mass terms plus ``(G^2 m^2/r^3) r^2 phidot
        (s_l + delta sigma_l)/c^3``.

    Example
    -------
    >>> aligned_spin_energy(1).coefficient(Fraction(3, 2)).substitute({"chi1": 0, "chi2": 0})
    0
    """
    return _aligned_series(pn_order, energy_per_reduced_mass, lambda s: spin_orbit_energy(s)[SPIN_ORBIT_ORDER])


@lru_cache(maxsize=None)
def aligned_spin_angular_momentum(pn_order: int = _POINT_MASS_ORDER) -> PNSeries:
    """Orbital angular momentum per reduced mass along ``e_z`` with aligned spins (``1/c`` series).

    Returns
    -------
    PNSeries
        ``L/mu``: point-mass terms plus the spin-orbit term along ``e_z``; the conserved total is
        ``J = mu L/mu + (G m^2/c) s_l``.

    Example
    -------
    >>> aligned_spin_angular_momentum(1).coefficient(0)
    r**2*phidot
    """
    return _aligned_series(pn_order, angular_momentum_per_reduced_mass,
                           lambda s: spin_orbit_angular_momentum(s)[SPIN_ORBIT_ORDER].components[2])


def _aligned_series(pn_order: int, point_mass: Callable, spin_part: Callable) -> PNSeries:
    check_input_order(pn_order, "conserved quantities", available=(0, 1))
    known = min(PNOrder(2 * pn_order + 1, 2), SPINNING_KNOWN_THROUGH)
    s = aligned_spin_namespace()
    pieces = {2 * k: v for k, v in point_mass(s).items() if k <= pn_order}
    if SPIN_ORBIT_ORDER <= known:
        pieces[SPIN_ORBIT_ORDER.twice] = spin_part(s)
    return PNSeries._from_trusted(pieces, known.twice)


class AlignedSpinOrbitDerivative:
    """Time derivative along the planar orbit of a binary with aligned spins (engine coefficients).

    Acts on PN series in ``eps = 1/c`` whose coefficients are engine polynomials in ``r``,
    ``1/r``, ``rdot``, ``phidot`` and constants (``chi1``, ``chi2`` are constant: aligned spins
    do not precess). Polar kinematics with the 1PN point-mass acceleration and the leading
    spin-orbit acceleration (:func:`aligned_spin_acceleration`):

        dr/dt = rdot,  d rdot/dt = r phidot^2 + a_n,  d phidot/dt = (a_lambda - 2 rdot phidot)/r.

    The result is known through ``min(known, k0 + 3/2)``, ``k0`` the lowest order whose
    coefficient depends on ``rdot`` or ``phidot``.

    Example
    -------
    >>> s = engine_symbols()
    >>> d = AlignedSpinOrbitDerivative()
    >>> d(PNSeries._from_trusted({0: s.rdot}, 3)).coefficient(Fraction(3, 2)).substitute(
    ...     {"chi1": 1, "chi2": 0, "delta": 1, "nu": 0})
    2*G**2*m**2*r**(-2)*phidot

    References
    ----------
    Common practice (chain rule along the equations of motion in polar coordinates).
    """

    __slots__ = ("_cache",)

    def __init__(self) -> None:
        self._cache: dict[PNSeries, PNSeries] = {}

    def __call__(self, series: PNSeries) -> PNSeries:
        if not isinstance(series, PNSeries):
            raise TypeError(f"AlignedSpinOrbitDerivative acts on a PNSeries, got {series!r}")
        cached = self._cache.get(series)
        if cached is not None:
            return cached
        known2 = series._known2
        for k2, coefficient in series._terms:
            if coefficient.has("rdot", "phidot"):
                known2 = min(known2, k2 + SPINNING_KNOWN_THROUGH.twice)
                break
        pieces: dict[int, ExactPolynomial] = {}
        for k2, coefficient in series._terms:
            for offset, value in _aligned_derivative(coefficient):
                if k2 + offset <= known2:
                    pieces[k2 + offset] = pieces[k2 + offset] + value if k2 + offset in pieces else value
        result = PNSeries._from_trusted(pieces, known2)
        self._cache[series] = result
        return result


@lru_cache(maxsize=1)
def _aligned_rates() -> tuple[dict[int, ExactPolynomial], dict[int, ExactPolynomial]]:
    """``{doubled order: piece}`` of d rdot/dt and d phidot/dt along the aligned-spin orbit."""
    s = engine_symbols()
    rdot_rate = {0: s.r * s.phidot**2}
    phidot_rate = {0: -2 * s.rdot * s.phidot * s.r**-1}
    alpha, beta = acceleration_n_factor(s), acceleration_v_factor(s)
    for k in range(_POINT_MASS_ORDER + 1):
        a_n = alpha.get(k, ExactPolynomial(0)) + beta.get(k, ExactPolynomial(0)) * s.rdot
        a_lambda = beta.get(k, ExactPolynomial(0)) * s.r * s.phidot
        rdot_rate[2 * k] = rdot_rate.get(2 * k, ExactPolynomial(0)) + a_n
        phidot_rate[2 * k] = phidot_rate.get(2 * k, ExactPolynomial(0)) + a_lambda * s.r**-1
    so_n, so_lambda = aligned_spin_acceleration()
    rdot_rate[SPIN_ORBIT_ORDER.twice] = so_n
    phidot_rate[SPIN_ORBIT_ORDER.twice] = so_lambda * s.r**-1
    return ({k: v for k, v in rdot_rate.items() if not v.is_zero()},
            {k: v for k, v in phidot_rate.items() if not v.is_zero()})


@lru_cache(maxsize=65536)
def _aligned_derivative(coefficient: ExactPolynomial) -> tuple[tuple[int, ExactPolynomial], ...]:
    return derivative_with_rates(coefficient, *_aligned_rates())


class NumericSpinningBinary:
    """Floating-point equations of motion of a binary with spins of any direction.

    The state is ``(x, v, chi_1, chi_2)`` (12 numbers: relative position and velocity, the two
    dimensionless spin vectors). Units are the caller's (for example ``G = m = 1``); ``c`` is a
    number, so that PN orders can be probed by varying it.

    Attributes
    ----------
    G, m, nu, c, pn_order:
        The constants and the PN order of the point-mass terms (0, 1 or 2).

    **Conventions**: module docstring; ``chi_A = c S_A/(G m_A^2)``.
    """

    def __init__(self, G: float, m: float, nu: float, c: float, pn_order: int) -> None:
        import math

        for name, value in (("G", G), ("m", m), ("c", c)):
            if not value > 0:
                raise ValueError(f"{name} must be positive, got {value!r}")
        if not 0 < nu <= 0.25:
            raise ValueError(f"nu must lie in (0, 1/4], got {nu!r}")
        self.G, self.m, self.nu, self.c = float(G), float(m), float(nu), float(c)
        self.pn_order = check_input_order(pn_order, "equations of motion")
        self.delta = math.sqrt(max(0.0, 1.0 - 4.0 * self.nu))

    def _namespace(self, state: Any) -> SimpleNamespace:
        # plain floats on TriadVector: for 3-vectors this is several times faster than numpy
        values = [float(a) for a in state]
        x, v = TriadVector(*values[0:3]), TriadVector(*values[3:6])
        chi1, chi2 = TriadVector(*values[6:9]), TriadVector(*values[9:12])
        r = dot(x, x) ** 0.5
        normal = cross(x, v)
        spin, difference = spin_combinations(chi1, chi2, self.delta)
        return SimpleNamespace(G=self.G, m=self.m, nu=self.nu, delta=self.delta, r=r, rdot=dot(x, v) / r,
                               phidot=dot(normal, normal) ** 0.5 / r**2, q=lambda a, b: a / b, x=x, v=v,
                               spin=spin, spin_difference=difference, chi1=chi1, chi2=chi2,
                               cross=cross, dot=dot)

    def derivatives(self, _t: float, state: Any) -> list[float]:
        """``d(state)/dt`` for ``scipy.integrate.solve_ivp``."""
        s = self._namespace(state)
        eps2 = 1.0 / self.c**2
        alpha, beta = acceleration_n_factor(s), acceleration_v_factor(s)
        radial = sum(eps2**k * alpha.get(k, 0.0) for k in range(self.pn_order + 1)) / s.r
        along_v = sum(eps2**k * beta.get(k, 0.0) for k in range(self.pn_order + 1))
        acceleration = (radial * s.x + along_v * s.v
                        + self.c**-3 * spin_orbit_acceleration(s)[SPIN_ORBIT_ORDER])
        omega1, omega2 = precession_frequencies(s)
        return [*s.v.components, *acceleration.components, *(eps2 * cross(omega1, s.chi1)).components,
                *(eps2 * cross(omega2, s.chi2)).components]

    def energy(self, state: Any) -> float:
        """``E/mu`` (rest mass excluded) with the spin-orbit term."""
        s = self._namespace(state)
        point_mass = energy_per_reduced_mass(s)
        total = sum(self.c ** (-2 * k) * point_mass[k] for k in range(self.pn_order + 1))
        return float(total + self.c**-3 * spin_orbit_energy(s)[SPIN_ORBIT_ORDER])

    def total_angular_momentum(self, state: Any) -> tuple[float, float, float]:
        """``J/mu``: orbital part with its spin-orbit term, plus the spins ``(G m^2/c) s/mu``."""
        s = self._namespace(state)
        point_mass = angular_momentum_per_reduced_mass(s)
        factor = sum(self.c ** (-2 * k) * point_mass[k] for k in range(self.pn_order + 1)) / point_mass[0]
        total = (factor * cross(s.x, s.v) + self.c**-3 * spin_orbit_angular_momentum(s)[SPIN_ORBIT_ORDER]
                 + (self.G * self.m / (self.c * self.nu)) * s.spin)
        return total.components


def numeric_spinning_binary(G: float = 1.0, m: float = 1.0, nu: float = 0.25, c: float = 1.0,
                            pn_order: int = 2) -> NumericSpinningBinary:
    """Floating-point equations of motion, energy and total angular momentum of a spinning binary.

    Parameters
    ----------
    G, m, nu, c:
        Constants (``0 < nu <= 1/4``).
    pn_order:
        PN order of the point-mass terms (0, 1 or 2); the spin-orbit terms are leading order.

    Returns
    -------
    NumericSpinningBinary
        ``derivatives(t, state)`` for ``scipy.integrate.solve_ivp``, ``energy(state)``,
        ``total_angular_momentum(state)``.

    **Conventions**: module docstring.

    Example
    -------
    >>> binary = numeric_spinning_binary(nu=0.2, c=10.0)
    >>> state = [10.0, 0, 0, 0, 0.3, 0, 0, 0, 0.5, 0, 0, -0.5]
    >>> round(binary.energy(state), 6)
    -0.054794

    References
    ----------
    The cited inputs of :mod:`stfalgebra.binary.cited_inputs` and
    :mod:`stfalgebra.binary.spin_orbit_inputs`.
    """
    return NumericSpinningBinary(G, m, nu, c, pn_order)
