"""Eccentric orbits: the Keplerian ellipse and the 1PN and 2PN quasi-Keplerian representations.

Newtonian order: the Keplerian ellipse in terms of the eccentric anomaly ``u``,

    r = a (1 - e cos u),   l = n (t - t_0) = u - e sin u,   n = sqrt(G m/a^3),
    phi - phi_0 = v(u) = 2 arctan( sqrt((1 + e)/(1 - e)) tan(u/2) ).

1PN order (harmonic coordinates): the quasi-Keplerian representation of Damour & Deruelle,

    r = a_r (1 - e_r cos u),   n (t - t_0) = u - e_t sin u,
    phi - phi_0 = (1 + k) v_phi(u),   v_phi = 2 arctan( sqrt((1 + e_phi)/(1 - e_phi)) tan(u/2) ),

with three eccentricities e_r, e_t, e_phi, the mean motion n (radial period P = 2 pi/n) and the
fractional periastron advance k. 2PN order (harmonic coordinates, Memmesheimer, Gopakumar &
Schafer 2004): the same radial equation, and periodic terms at 1/c^4 in time and angle,

    n (t - t_0) = u - e_t sin u + f_t (v - u) + g_t sin v,
    phi - phi_0 = (1 + k) (v + f_phi sin 2v + g_phi sin 3v),   v = v_phi(u).

The elements are entered as functions of the conserved energy
``E`` and angular momentum ``J`` per unit reduced mass (the published input, from memory, and
checked in the tests against the 1PN equations of motion of :mod:`stfalgebra.binary.dynamics`).
Their forms in the frequency parameter ``x = (G m omega/c^3)^(2/3)``, ``omega = (1 + k) n`` the
orbit-averaged azimuthal frequency, and the time eccentricity ``e_t`` are derived here by series
reversion (nothing typed in).

Series in ``E, J`` are :class:`~stfalgebra.pnseries.PNSeries` in ``eps = 1/c``; series in
``x, e_t`` are PNSeries in ``eps = sqrt(x)`` with absolute orders (``n`` starts at ``x^(3/2)``,
``a_r`` at ``x^(-1)``), the convention of :mod:`stfalgebra.binary.circular`.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache
from typing import Any

import sympy as sp

from ..scalars import as_scalar_expression

from stfalgebra.binary.cited_inputs import INPUT_ORDERS
from stfalgebra.binary.dynamics import check_pn_order
from stfalgebra.pnseries import PNSeries
from stfalgebra.symbols import G, c, et, m, nu, phidot, r, rdot, x

__all__ = [
    "u",
    "a",
    "e",
    "E_orbit",
    "J_orbit",
    "validate_eccentricity",
    "validate_frequency_parameter",
    "KeplerEllipse",
    "QuasiKeplerianElements",
    "quasi_keplerian_from_energy",
    "quasi_keplerian_from_frequency",
    "true_anomaly",
    "tidy_eccentricity",
]

#: Eccentric anomaly.
u = sp.Symbol("u", real=True)
#: Semi-major axis of the Newtonian ellipse.
a = sp.Symbol("a", positive=True)
#: Eccentricity of the Newtonian ellipse.
e = sp.Symbol("e", nonnegative=True)
#: Conserved orbital energy per unit reduced mass (negative on bound orbits).
E_orbit = sp.Symbol("E", negative=True)
#: Conserved orbital angular momentum per unit reduced mass.
J_orbit = sp.Symbol("J", positive=True)

_HALF = sp.Rational(1, 2)
# private bookkeeping symbols of the derivations (never in results)
_X = sp.Symbol("X_energy", positive=True)     # -2 E/c^2
_j = sp.Symbol("j_momentum", positive=True)   # -2 E J^2/(G m)^2
# sqrt(1 - e_t^2) during the reversion: every coefficient stays rational in it (and nu), so
# cancellation keeps them small; replaced by sqrt(1 - et^2) at the end
_ROOT = sp.Symbol("root_one_minus_et2", positive=True)


# ----------------------------------------------------------------------------- validation
def validate_eccentricity(value: Any, name: str = "eccentricity") -> sp.Expr:
    """Check an eccentricity: numeric values must lie in [0, 1); symbols pass.

    Parameters
    ----------
    value:
        A number (exact or float) or a sympy expression.
    name:
        Name used in the error message.

    Returns
    -------
    sympy.Expr
        The value, sympified.

    Raises
    ------
    ValueError
        A numeric value outside [0, 1) (bound orbits only; the message names it).
    TypeError
        Not a number or expression.

    **Conventions**: bound (elliptic) orbits, ``0 <= e < 1``.

    Example
    -------
    >>> validate_eccentricity(sp.Rational(1, 2))
    1/2
    >>> validate_eccentricity(1)
    Traceback (most recent call last):
    ...
    ValueError: eccentricity must lie in [0, 1) (bound orbit), got 1

    References
    ----------
    Common practice.
    """
    expr = as_scalar_expression(value, name)
    if expr.is_number:
        if expr.is_real is False or not (expr >= 0 and expr < 1):
            raise ValueError(f"{name} must lie in [0, 1) (bound orbit), got {value!r}")
    return expr


def validate_frequency_parameter(value: Any, name: str = "x") -> sp.Expr:
    """Check a frequency parameter ``x = (G m omega/c^3)^(2/3)``: numeric values must be > 0.

    Parameters
    ----------
    value:
        A number or a sympy expression.
    name:
        Name used in the error message.

    Returns
    -------
    sympy.Expr
        The value, sympified.

    Raises
    ------
    ValueError
        A numeric value that is not positive.
    TypeError
        Not a number or expression.

    **Conventions**: ``x`` is positive by definition.

    Example
    -------
    >>> validate_frequency_parameter(-0.1)
    Traceback (most recent call last):
    ...
    ValueError: x must be positive, got -0.1

    References
    ----------
    Common practice.
    """
    expr = as_scalar_expression(value, name)
    if expr.is_number and (expr.is_real is False or not expr > 0):
        raise ValueError(f"{name} must be positive, got {value!r}")
    return expr


# ----------------------------------------------------------------------------- Newtonian ellipse
def true_anomaly(eccentricity: Any, anomaly: sp.Expr = u) -> sp.Expr:
    """The true anomaly ``v`` as a function of the eccentric anomaly.

    Parameters
    ----------
    eccentricity:
        ``e`` in [0, 1) (or a symbol).
    anomaly:
        The eccentric anomaly (default the symbol ``u``).

    Returns
    -------
    sympy.Expr
        ``2 atan(sqrt((1 + e)/(1 - e)) tan(u/2))``.

    **Conventions**: the branch of ``atan`` gives ``v`` in (-pi, pi) for ``u`` in (-pi, pi);
    continue by ``v(u + 2 pi) = v(u) + 2 pi``. ``v = 0`` at periastron.

    Example
    -------
    >>> true_anomaly(0)
    2*atan(tan(u/2))

    References
    ----------
    Common practice (Kepler problem, e.g. Goldstein, Classical Mechanics, ch. 3).
    """
    ecc = validate_eccentricity(eccentricity)
    return 2 * sp.atan(sp.sqrt((1 + ecc) / (1 - ecc)) * sp.tan(anomaly / 2))


@dataclass(frozen=True)
class KeplerEllipse:
    """The Newtonian relative orbit (Keplerian ellipse) as explicit functions of ``u``.

    Parameters
    ----------
    semi_major_axis:
        ``a > 0`` (default the symbol ``a``).
    eccentricity:
        ``e`` in [0, 1) (default the symbol ``e``).

    **Conventions**: ``r = a (1 - e cos u)``, mean anomaly ``l = u - e sin u = n (t - t_0)``,
    ``n = sqrt(G m/a^3)``; periastron at ``u = 0`` on the x axis (``phi = 0``), motion along
    +phi (angular momentum along +z). Every quantity is a rational function of ``cos u``,
    ``sin u`` (no inverse trigonometric functions) except :meth:`phase`.

    Example
    -------
    >>> orbit = KeplerEllipse()
    >>> orbit.radius()
    a*(-e*cos(u) + 1)
    >>> orbit.angular_velocity()
    sqrt(G)*sqrt(m)*sqrt(1 - e**2)/(a**(3/2)*(-e*cos(u) + 1)**2)

    References
    ----------
    Common practice (Kepler problem, e.g. Goldstein, Classical Mechanics, ch. 3).
    """

    semi_major_axis: sp.Expr = a
    eccentricity: sp.Expr = e

    def __post_init__(self) -> None:
        axis = as_scalar_expression(self.semi_major_axis, "semi_major_axis")
        if axis.is_number and (axis.is_real is False or not axis > 0):
            raise ValueError(f"semi_major_axis must be positive, got {self.semi_major_axis!r}")
        object.__setattr__(self, "semi_major_axis", axis)
        object.__setattr__(self, "eccentricity", validate_eccentricity(self.eccentricity))

    @classmethod
    def from_frequency(cls, frequency: Any = x, eccentricity: Any = e) -> KeplerEllipse:
        """The ellipse whose mean motion is ``n = c^3 x^(3/2)/(G m)``: ``a = G m/(c^2 x)``.

        **Conventions**: at Newtonian order the averaged azimuthal frequency equals the mean
        motion, so ``x = (G m n/c^3)^(2/3)``.

        Example
        -------
        >>> KeplerEllipse.from_frequency().semi_major_axis
        G*m/(c**2*x)
        """
        xv = validate_frequency_parameter(frequency)
        return cls(G * m / (c**2 * xv), eccentricity)

    @property
    def mean_motion(self) -> sp.Expr:
        """``n = sqrt(G m/a^3)`` (Kepler's third law)."""
        return sp.sqrt(G * m / self.semi_major_axis**3)

    def _w(self, anomaly: sp.Expr) -> sp.Expr:
        return 1 - self.eccentricity * sp.cos(anomaly)

    def radius(self, anomaly: sp.Expr = u) -> sp.Expr:
        """``r = a (1 - e cos u)``."""
        return self.semi_major_axis * self._w(anomaly)

    def mean_anomaly(self, anomaly: sp.Expr = u) -> sp.Expr:
        """``l = u - e sin u`` (Kepler's equation)."""
        return anomaly - self.eccentricity * sp.sin(anomaly)

    def time(self, anomaly: sp.Expr = u) -> sp.Expr:
        """``t - t_0 = (u - e sin u)/n``, periastron passage at ``t_0``."""
        return self.mean_anomaly(anomaly) / self.mean_motion

    def radial_velocity(self, anomaly: sp.Expr = u) -> sp.Expr:
        """``rdot = a n e sin u/(1 - e cos u)``."""
        return (self.semi_major_axis * self.mean_motion * self.eccentricity * sp.sin(anomaly)
                / self._w(anomaly))

    def cos_phase(self, anomaly: sp.Expr = u) -> sp.Expr:
        """``cos phi = (cos u - e)/(1 - e cos u)``."""
        return (sp.cos(anomaly) - self.eccentricity) / self._w(anomaly)

    def sin_phase(self, anomaly: sp.Expr = u) -> sp.Expr:
        """``sin phi = sqrt(1 - e^2) sin u/(1 - e cos u)``."""
        return sp.sqrt(1 - self.eccentricity**2) * sp.sin(anomaly) / self._w(anomaly)

    def phase(self, anomaly: sp.Expr = u) -> sp.Expr:
        """``phi = v(u)``, the true anomaly (see :func:`true_anomaly` for the branch)."""
        return true_anomaly(self.eccentricity, anomaly)

    def phase_factor(self, m_index: int, anomaly: sp.Expr = u) -> sp.Expr:
        """``exp(-i m phi)`` as a rational function of ``cos u, sin u``.

        ``exp(-i phi) = ((cos u - e) - i sqrt(1 - e^2) sin u)/(1 - e cos u)``, raised to ``m``.
        """
        if isinstance(m_index, bool) or not isinstance(m_index, int):
            raise TypeError(f"m must be an int, got {m_index!r}")
        one = (self.cos_phase(anomaly) - sp.I * self.sin_phase(anomaly))
        return one**m_index if m_index >= 0 else sp.conjugate(one) ** (-m_index)

    def angular_velocity(self, anomaly: sp.Expr = u) -> sp.Expr:
        """``phidot = n sqrt(1 - e^2)/(1 - e cos u)^2``."""
        return self.mean_motion * sp.sqrt(1 - self.eccentricity**2) / self._w(anomaly) ** 2

    def orbit_substitution(self, anomaly: sp.Expr = u) -> dict[sp.Symbol, sp.Expr]:
        """``{r: r(u), rdot: rdot(u), phidot: phidot(u)}`` for the general-orbit symbols."""
        return {r: self.radius(anomaly), rdot: self.radial_velocity(anomaly),
                phidot: self.angular_velocity(anomaly)}

    @property
    def energy(self) -> sp.Expr:
        """Energy per unit reduced mass, ``-G m/(2 a)``."""
        return -G * m / (2 * self.semi_major_axis)

    @property
    def angular_momentum(self) -> sp.Expr:
        """Angular momentum per unit reduced mass, ``sqrt(G m a (1 - e^2))``."""
        return sp.sqrt(G * m * self.semi_major_axis * (1 - self.eccentricity**2))


# ----------------------------------------------------------------------------- quasi-Keplerian 1PN
@dataclass(frozen=True)
class QuasiKeplerianElements:
    """The elements of the quasi-Keplerian representation, as PN series.

    Attributes
    ----------
    variables:
        ``"energy"`` (series in ``eps = 1/c``, coefficients in ``E, J, G, m, nu``) or
        ``"frequency"`` (series in ``eps = sqrt(x)``, coefficients in ``et, nu, G, m, c``).
    pn_order:
        0 or 1.
    mean_motion, semi_major_axis, radial_eccentricity, time_eccentricity,
    angular_eccentricity, periastron_advance:
        ``n``, ``a_r``, ``e_r``, ``e_t``, ``e_phi``, ``k``.
    energy, angular_momentum:
        ``E/mu`` and ``J/mu`` (in the frequency variables; the symbols themselves in the
        energy variables).
    time_anomaly_term, time_sine_term, phase_sine_2v_term, phase_sine_3v_term:
        The 2PN periodic coefficients ``f_t``, ``g_t``, ``f_phi``, ``g_phi`` (None below 2PN:
        they vanish there).

    **Conventions**: harmonic coordinates; ``r = a_r (1 - e_r cos u)``,
    ``n (t - t_0) = u - e_t sin u + f_t (v - u) + g_t sin v``,
    ``phi - phi_0 = (1 + k) (v + f_phi sin 2v + g_phi sin 3v)`` with
    ``v = 2 atan(sqrt((1 + e_phi)/(1 - e_phi)) tan(u/2))``; ``omega = (1 + k) n``.

    Example
    -------
    >>> q = quasi_keplerian_from_frequency(1)
    >>> q.periastron_advance
    PNSeries(3/(1 - et**2)*eps**2 + O(eps**4))

    References
    ----------
    Damour & Deruelle, Ann. Inst. H. Poincare 43, 107 (1985).
    """

    variables: str
    pn_order: int
    mean_motion: PNSeries
    semi_major_axis: PNSeries
    radial_eccentricity: PNSeries
    time_eccentricity: PNSeries
    angular_eccentricity: PNSeries
    periastron_advance: PNSeries
    energy: PNSeries
    angular_momentum: PNSeries
    time_anomaly_term: PNSeries | None = None
    time_sine_term: PNSeries | None = None
    phase_sine_2v_term: PNSeries | None = None
    phase_sine_3v_term: PNSeries | None = None

    def _w(self, ecc: PNSeries, anomaly: sp.Expr) -> PNSeries:
        return 1 - ecc * sp.cos(anomaly)

    @property
    def has_periodic_terms(self) -> bool:
        """True from 2PN on (the periodic terms ``f_t, g_t, f_phi, g_phi`` are present)."""
        return self.time_anomaly_term is not None

    def _anomaly_rate(self, anomaly: sp.Expr) -> PNSeries:
        """``dv/du = sqrt(1 - e_phi^2)/(1 - e_phi cos u)``."""
        root = (1 - self.angular_eccentricity**2) ** _HALF
        return (root / self._w(self.angular_eccentricity, anomaly)).expand()

    def _cos_sin_anomaly(self, anomaly: sp.Expr) -> tuple[PNSeries, PNSeries]:
        """``cos v = (cos u - e_phi)/(1 - e_phi cos u)``, ``sin v = sqrt(1 - e_phi^2) sin u/(1 - e_phi cos u)``."""
        den = self._w(self.angular_eccentricity, anomaly)
        cos_v = ((sp.cos(anomaly) - self.angular_eccentricity) / den).expand()
        sin_v = ((1 - self.angular_eccentricity**2) ** _HALF * sp.sin(anomaly) / den).expand()
        return cos_v, sin_v

    def radius(self, anomaly: sp.Expr = u) -> PNSeries:
        """``r = a_r (1 - e_r cos u)``."""
        return (self.semi_major_axis * self._w(self.radial_eccentricity, anomaly)).expand()

    def mean_anomaly(self, anomaly: sp.Expr = u) -> PNSeries:
        """``l = n (t - t_0) = u - e_t sin u + f_t (v - u) + g_t sin v``."""
        value = anomaly - self.time_eccentricity * sp.sin(anomaly)
        if not self.has_periodic_terms:
            return value
        v_phi = _compose_function(lambda ecc: true_anomaly(ecc, anomaly), self.angular_eccentricity)
        _, sin_v = self._cos_sin_anomaly(anomaly)
        return (value + self.time_anomaly_term * (v_phi - anomaly) + self.time_sine_term * sin_v).expand()

    def mean_anomaly_rate(self, anomaly: sp.Expr = u) -> PNSeries:
        """``dl/du = n dt/du = 1 - e_t cos u + f_t (dv/du - 1) + g_t cos v dv/du``."""
        value = self._w(self.time_eccentricity, anomaly)
        if not self.has_periodic_terms:
            return value
        rate = self._anomaly_rate(anomaly)
        cos_v, _ = self._cos_sin_anomaly(anomaly)
        return (value + self.time_anomaly_term * (rate - 1) + self.time_sine_term * cos_v * rate).expand()

    def radial_velocity(self, anomaly: sp.Expr = u) -> PNSeries:
        """``rdot = (dr/du)/(dt/du) = a_r e_r n sin u/(dl/du)`` (``dl/du = 1 - e_t cos u`` below 2PN)."""
        num = self.semi_major_axis * self.radial_eccentricity * self.mean_motion * sp.sin(anomaly)
        return (num / self.mean_anomaly_rate(anomaly)).expand()

    def angular_velocity(self, anomaly: sp.Expr = u) -> PNSeries:
        """``phidot = (dphi/du)/(dt/du)``: below 2PN
        ``(1 + k) n sqrt(1 - e_phi^2)/((1 - e_phi cos u)(1 - e_t cos u))``; from 2PN
        ``dphi/du = (1 + k) (1 + 2 f_phi cos 2v + 3 g_phi cos 3v) dv/du``."""
        rate = self._anomaly_rate(anomaly)
        if self.has_periodic_terms:
            cos_v, _ = self._cos_sin_anomaly(anomaly)
            cos_2v = 2 * cos_v**2 - 1
            cos_3v = (4 * cos_v**2 - 3) * cos_v
            rate = (rate * (1 + 2 * self.phase_sine_2v_term * cos_2v
                            + 3 * self.phase_sine_3v_term * cos_3v)).expand()
        num = (1 + self.periastron_advance) * self.mean_motion * rate
        return (num / self.mean_anomaly_rate(anomaly)).expand()

    def phase(self, anomaly: sp.Expr = u) -> PNSeries:
        """``phi - phi_0 = (1 + k) (v + f_phi sin 2v + g_phi sin 3v)``, expanded about the
        leading ``e_phi``."""
        v_phi = _compose_function(lambda ecc: true_anomaly(ecc, anomaly), self.angular_eccentricity)
        if self.has_periodic_terms:
            cos_v, sin_v = self._cos_sin_anomaly(anomaly)
            sin_2v = 2 * sin_v * cos_v
            sin_3v = (4 * cos_v**2 - 1) * sin_v
            v_phi = v_phi + self.phase_sine_2v_term * sin_2v + self.phase_sine_3v_term * sin_3v
        return ((1 + self.periastron_advance) * v_phi).expand()

    def orbit_substitution(self, anomaly: sp.Expr = u) -> dict[sp.Symbol, PNSeries]:
        """``{r: r(u), rdot: rdot(u), phidot: phidot(u)}`` as PN series."""
        return {r: self.radius(anomaly), rdot: self.radial_velocity(anomaly),
                phidot: self.angular_velocity(anomaly)}


def _compose_function(func, series: PNSeries) -> PNSeries:
    """``func(series)`` by Taylor expansion about the order-0 coefficient (orders >= 0)."""
    if series.orders and series.orders[0] < 0:
        raise ValueError(f"cannot compose a function with a series of negative order: {series!r}")
    if series.is_exact and len(series.orders) > 1:
        raise ValueError(f"composition with an exact multi-term series is infinite: {series!r}")
    s = sp.Dummy("s")
    c0 = series.coefficient(0)
    rest = series - c0
    known = series.known_through
    total = PNSeries({}, known) + func(c0)
    if not rest.orders:
        return total
    power = PNSeries({0: 1}, sp.oo)
    derivative = func(s)
    k = 0
    while (k + 1) * rest.orders[0] <= known:
        k += 1
        power = power * rest
        derivative = sp.diff(derivative, s)
        total = total + power * (derivative.subs(s, c0) / sp.factorial(k))
    return total.expand()


#: PN orders at which the quasi-Keplerian elements are entered (recorded with the other inputs).
_QUASI_KEPLERIAN_ORDERS = INPUT_ORDERS["quasi-Keplerian orbit"]


def _check_order(pn_order: Any) -> sp.Rational:
    return check_pn_order(pn_order, "quasi-Keplerian elements", available=_QUASI_KEPLERIAN_ORDERS)


@lru_cache(maxsize=None)
def quasi_keplerian_from_energy(pn_order: int) -> QuasiKeplerianElements:
    """Quasi-Keplerian elements in terms of the conserved energy and angular momentum.

    Parameters
    ----------
    pn_order:
        0 (Keplerian ellipse), 1 (1PN) or 2 (2PN), harmonic coordinates.

    Returns
    -------
    QuasiKeplerianElements
        PN series in ``eps = 1/c``, coefficients in ``E``, ``J`` (per unit reduced mass,
        symbols :data:`E_orbit`, :data:`J_orbit`), ``G, m, nu``; known through
        ``pn_order + 1/2`` below 2PN and through 2 at 2PN (the 2.5PN radiation reaction is the
        next term).

    Raises
    ------
    OrderBeyondInputsError
        ``pn_order > 2``.

    **Conventions**: harmonic coordinates; with ``X = -2E``, ``h = J/(G m)`` and
    ``j = -2 E h^2`` (``1 - e^2`` at Newtonian order),

    * ``n = (X^(3/2)/(G m)) [1 + eps^2 X (nu - 15)/8
      + eps^4 X^2 ((555 + 30 nu + 11 nu^2)/128 + (3/2)(2 nu - 5)/sqrt(j))]``,
    * ``a_r = (G m/X) [1 + eps^2 X (nu - 7)/4 + eps^4 X^2 ((1 + nu^2)/16 + (7 nu - 4)/j)]``,
    * ``e_t^2 = 1 - j + eps^2 (X/4) [-8 + 8 nu + (17 - 7 nu) j]
      + eps^4 (X^2/8) [12 + 72 nu + 20 nu^2 - (112 - 47 nu + 16 nu^2) j
      + 24 (5 - 2 nu)(sqrt(j) - 1/sqrt(j)) + 16 (4 - 7 nu)/j]``,
    * ``e_r^2 = 1 - j + eps^2 (X/4) [24 - 4 nu + 5 (nu - 3) j]
      + eps^4 (X^2/8) [60 + 148 nu + 2 nu^2 - (80 - 45 nu + 4 nu^2) j + 32 (4 - 7 nu)/j]``,
    * ``e_phi^2 = 1 - j + eps^2 (X/4) [24 + (nu - 15) j]
      + eps^4 (X^2/16) [-40 + 34 nu + 18 nu^2 - (160 - 31 nu + 3 nu^2) j
      + (416 - 91 nu - 15 nu^2)/j]``,
    * ``k = 3 eps^2 X/j + eps^4 X^2 [(6 nu - 15)/(4 j) + (105 - 30 nu)/(4 j^2)]``,
    * ``f_t = eps^4 X^2 (3/2)(5 - 2 nu)/sqrt(j)``,
      ``g_t = eps^4 X^2 nu (15 - nu) sqrt(1 - j)/(8 sqrt(j))``,
    * ``f_phi = eps^4 X^2 (1 + 19 nu - 3 nu^2)(1 - j)/(8 j^2)``,
      ``g_phi = eps^4 X^2 nu (1 - 3 nu)(1 - j)^(3/2)/(32 j^2)``.

    Example
    -------
    >>> quasi_keplerian_from_energy(1).periastron_advance
    PNSeries(3*G**2*m**2/J**2*eps**2 + O(eps**4))

    References
    ----------
    1PN: Damour & Deruelle, Ann. Inst. H. Poincare 43, 107 (1985). 2PN: the harmonic-coordinate
    generalized quasi-Keplerian parametrisation of Memmesheimer, Gopakumar & Schafer, Phys. Rev.
    D 70, 104011 (2004), eqs. (25) (form and 1PN/2PN elements; the paper's equations could not be
    read through the project's search tool, which reaches only its abstract and introduction, so
    the equation number is from memory). The 2PN coefficients written here are the unique
    solution of the conservation of the cited 2PN ``E`` and ``J``
    (:mod:`stfalgebra.binary.cited_inputs`) along that form (the tests check the conservation
    exactly, integrate the 2PN equations of motion numerically against the parametrised orbit,
    and compare ``n``, ``k``, ``f_t``, ``f_phi`` with the values recalled from the paper).
    """
    known = _check_order(pn_order)
    minus_2e = -2 * E_orbit
    gm = G * m
    h2 = J_orbit**2 / gm**2
    j = minus_2e * h2                       # -2 E h^2 = 1 - e^2 at Newtonian order
    root_j = sp.sqrt(minus_2e) * J_orbit / gm
    newtonian_ecc = sp.sqrt(1 - j)
    newtonian_ecc2 = 1 - j
    x2 = minus_2e**2

    def series(n0: sp.Expr, n1: sp.Expr, n2: sp.Expr = 0) -> PNSeries:
        terms = {0: sp.expand(n0)}
        if pn_order >= 1:
            terms[1] = sp.expand(n1)
        if pn_order >= 2:
            terms[2] = sp.expand(n2)
        return PNSeries(terms, known)

    n0 = minus_2e ** sp.Rational(3, 2) / gm
    mean_motion = series(n0, n0 * minus_2e * (nu - 15) / 8,                                   # MGS (25)
                         n0 * x2 * ((555 + 30 * nu + 11 * nu**2) / 128 + sp.Rational(3, 2) * (2 * nu - 5) / root_j))
    axis = series(gm / minus_2e, gm / minus_2e * minus_2e * (nu - 7) / 4,                    # MGS (25)
                  gm / minus_2e * x2 * ((1 + nu**2) / 16 + (7 * nu - 4) / j))
    et2 = series(newtonian_ecc2, minus_2e / 4 * (-8 + 8 * nu + (17 - 7 * nu) * j),            # MGS (25)
                 x2 / 8 * (12 + 72 * nu + 20 * nu**2 - (112 - 47 * nu + 16 * nu**2) * j
                           + 24 * (5 - 2 * nu) * (root_j - 1 / root_j) + 16 * (4 - 7 * nu) / j))
    er2 = series(newtonian_ecc2, minus_2e / 4 * (24 - 4 * nu + 5 * (nu - 3) * j),             # MGS (25)
                 x2 / 8 * (60 + 148 * nu + 2 * nu**2 - (80 - 45 * nu + 4 * nu**2) * j + 32 * (4 - 7 * nu) / j))
    ephi2 = series(newtonian_ecc2, minus_2e / 4 * (24 + (nu - 15) * j),                      # MGS (25)
                   x2 / 16 * (-40 + 34 * nu + 18 * nu**2 - (160 - 31 * nu + 3 * nu**2) * j
                              + (416 - 91 * nu - 15 * nu**2) / j))
    advance = series(0, 3 / h2,                                                              # MGS (25)
                     x2 * ((6 * nu - 15) / (4 * j) + (105 - 30 * nu) / (4 * j**2)))
    periodic = {}
    if pn_order >= 2:
        periodic = {                                                                          # MGS (25)
            "time_anomaly_term": series(0, 0, x2 * sp.Rational(3, 2) * (5 - 2 * nu) / root_j),
            "time_sine_term": series(0, 0, x2 * nu * (15 - nu) * newtonian_ecc / (8 * root_j)),
            "phase_sine_2v_term": series(0, 0, x2 * (1 + 19 * nu - 3 * nu**2) * newtonian_ecc2 / (8 * j**2)),
            "phase_sine_3v_term": series(0, 0, x2 * nu * (1 - 3 * nu) * newtonian_ecc**3 / (32 * j**2)),
        }
    return QuasiKeplerianElements(
        variables="energy", pn_order=int(pn_order),
        mean_motion=mean_motion, semi_major_axis=axis,
        radial_eccentricity=(er2 ** _HALF).expand(),
        time_eccentricity=(et2 ** _HALF).expand(),
        angular_eccentricity=(ephi2 ** _HALF).expand(),
        periastron_advance=advance,
        energy=PNSeries({0: E_orbit}, sp.oo),
        angular_momentum=PNSeries({0: J_orbit}, sp.oo),
        **periodic,
    )


def _dimensionless(series: PNSeries, scale: sp.Expr, lead: sp.Rational) -> dict[int, sp.Expr]:
    """An energy-form series (in 1/c) as ``sum_n X^(lead + n) f_n(j)``, returned as
    ``{n: f_n(j)}``, with ``X = -2E/c^2`` and ``j = -2E J^2/(G m)^2``.

    Substitutes ``E = -c^2 X/2``, ``J = G m sqrt(j/X)/c``, ``eps = 1/c``, divides by ``scale``
    (the dimensionful factor) and checks that the term of order ``n`` is ``X^(lead + n)`` times
    a function of ``j`` (dimensional homogeneity).
    """
    subs = {E_orbit: -c**2 * _X / 2, J_orbit: G * m * sp.sqrt(_j / _X) / c}
    out = {}
    for order, coeff in series.terms.items():
        term = coeff.subs(subs) / (c ** (2 * order) * scale * _X ** (lead + order))
        term = sp.factor(sp.cancel(sp.powsimp(sp.expand(term), force=True)))
        if term.has(c) or term.has(G) or term.has(m) or term.has(_X):
            raise ArithmeticError(f"element not dimensionally homogeneous: {term}")
        out[int(order)] = term
    return out


def _evaluate_in_frequency(pieces: dict[int, sp.Expr], lead: sp.Rational, big_x: PNSeries,
                           small_j: PNSeries, known: sp.Rational) -> PNSeries:
    """``sum_n X^(lead + n) f_n(j)`` with X, j PN series in sqrt(x); truncated at ``known``."""
    total = PNSeries({}, known)
    for order, func in pieces.items():
        if order > known - lead:
            continue
        # X^(lead + order) starts at x^(lead + order): j is needed only through the rest
        needed = known - lead - order
        j_series = small_j.truncate(min(small_j.known_through, needed))
        factor = _compose_function(lambda value, f=func: f.subs(_j, value), j_series)
        factor = factor.map_coefficients(_cancel)
        total = total + (big_x ** (lead + order)).map_coefficients(_cancel) * factor
    return total.truncate(min(known, total.known_through)).map_coefficients(_cancel)


def _cancel(value: sp.Expr) -> sp.Expr:
    """One rational function of the reversion's variables (``_ROOT``, ``nu``, ...)."""
    return sp.cancel(sp.together(value))


@lru_cache(maxsize=None)
def _frequency_inversion(pn_order: int) -> tuple[PNSeries, PNSeries]:
    """X = -2E/c^2 and j = -2E J^2/(G m)^2 as PN series in sqrt(x) (coefficients rational in
    ``_ROOT = sqrt(1 - e_t^2)`` and nu).

    Reverts ``x = [(G m/c^3) n (1 + k)]^(2/3)`` and ``e_t^2 = e_t^2(E, J)`` by fixed-point
    iteration, one order per step: ``X = x [(G m/c^3) n (1 + k)/X^(3/2)]^(-2/3)``,
    ``j = 1 - e_t^2 + (e_t^2(X, j) - (1 - j))``.
    """
    energy_form = quasi_keplerian_from_energy(pn_order)
    relative = energy_form.mean_motion.known_through      # relative order known
    frequency = _dimensionless((energy_form.mean_motion * (1 + energy_form.periastron_advance)
                                ).expand(), c**3 / (G * m), sp.Rational(3, 2))
    ecc2 = _dimensionless((energy_form.time_eccentricity ** 2).expand(), 1, 0)
    # e_t^2 = (1 - j) + sum_{n >= 1} X^n h_n(j): the correction part
    ecc2_correction = {n: f for n, f in ecc2.items() if n >= 1}
    if sp.simplify(ecc2.get(0, 0) - (1 - _j)) != 0:
        raise ArithmeticError(f"Newtonian e_t^2 is not 1 - j: {ecc2.get(0)}")
    big_x = PNSeries({1: 1}, 1)
    small_j = PNSeries({0: _ROOT**2}, 0)
    while big_x.known_through < 1 + relative or small_j.known_through < relative:
        rel_freq = _evaluate_in_frequency(frequency, 0, big_x, small_j, relative)
        new_x = (rel_freq ** sp.Rational(-2, 3)).shift(1).map_coefficients(_cancel)
        correction = _evaluate_in_frequency(ecc2_correction, 0, big_x, small_j, relative)
        new_j = (correction + _ROOT**2).map_coefficients(_cancel)
        new_x = new_x.truncate(min(new_x.known_through, 1 + relative))
        if new_x.known_through <= big_x.known_through and new_j.known_through <= small_j.known_through:
            raise ArithmeticError("series reversion for (x, e_t) does not converge")
        big_x, small_j = new_x, new_j
    return big_x, small_j


def _energy_form_in_frequency(series: PNSeries, scale: sp.Expr, lead: sp.Rational,
                              pn_order: int) -> PNSeries:
    """An energy-form element re-expressed in (x, et): a PNSeries in eps = sqrt(x) with
    absolute orders starting at ``lead``, coefficients times ``scale`` (its dimensionful
    factor)."""
    big_x, small_j = _frequency_inversion(pn_order)
    pieces = _dimensionless(series, scale, lead)
    out = _evaluate_in_frequency(pieces, lead, big_x, small_j, lead + series.known_through)
    root = sp.sqrt(1 - et**2)
    return out.map_coefficients(lambda v: tidy_eccentricity(v.subs(_ROOT, root), et) * scale)


def tidy_eccentricity(expr: sp.Expr, ecc: sp.Symbol) -> sp.Expr:
    """Canonical form of an expression rational in ``ecc`` and ``sqrt(1 - ecc^2)``.

    Parameters
    ----------
    expr:
        Rational in ``ecc``, ``sqrt(1 - ecc^2)`` and other symbols.
    ecc:
        The eccentricity symbol.

    Returns
    -------
    sympy.Expr
        ``A + B`` with ``A = P(ecc)/(Q(ecc) (1 - ecc^2)^k)`` and
        ``B = P'(ecc)/(Q'(ecc) (1 - ecc^2)^(k' - 1/2))`` (``P`` expanded, numeric content in
        the numerator, ``Q`` monic and prime to ``1 - ecc^2``).

    **Conventions**: ``sqrt(1 - ecc^2)`` is the positive root (``0 <= ecc < 1``).

    Example
    -------
    >>> tidy_eccentricity(1/(et - 1) + 1/(et + 1), et)
    -2*et/(1 - et**2)
    >>> tidy_eccentricity(sp.sqrt(1 - et**2) / (3 * et**2 - 3), et)
    -1/(3*sqrt(1 - et**2))

    References
    ----------
    Common practice.
    """
    root = sp.Dummy("root", positive=True)
    expr = sp.sympify(expr)
    if expr.has(sp.sqrt(1 - ecc)):    # the pairing subs is slow on large sums: only when needed
        expr = expr.subs(sp.sqrt(1 - ecc) * sp.sqrt(1 + ecc), sp.sqrt(1 - ecc**2))
    expr = expr.replace(lambda p: p.is_Pow and p.base == 1 - ecc**2 and (2 * p.exp).is_Integer,
                        lambda p: root ** int(2 * p.exp))
    if expr.has(sp.sqrt(1 - ecc)) or expr.has(sp.sqrt(1 + ecc)):
        raise ValueError(f"unpaired sqrt(1 -+ {ecc}) in {expr}")
    num, den = sp.fraction(sp.cancel(sp.together(expr)))
    relation = root**2 - (1 - ecc**2)
    num = sp.rem(sp.expand(num), relation, root)
    den = sp.rem(sp.expand(den), relation, root)
    # rationalise: (n0 + n1 root)/(d0 + d1 root)
    d0, d1 = sp.expand(den).coeff(root, 0), sp.expand(den).coeff(root, 1)
    if d1 != 0:
        num = sp.rem(sp.expand(num * (d0 - d1 * root)), relation, root)
        den = sp.expand(d0**2 - d1**2 * (1 - ecc**2))
    n0, n1 = sp.expand(num).coeff(root, 0), sp.expand(num).coeff(root, 1)
    parts = []
    for piece, half in ((n0, 0), (n1, 1)):
        if piece == 0:
            continue
        p, q = sp.fraction(sp.cancel(piece / den))
        power = 0
        q_poly = sp.Poly(q, ecc)
        one_minus = sp.Poly(1 - ecc**2, ecc)
        while q_poly.degree() >= 2:
            quotient, rem = sp.div(q_poly, one_minus)
            if not rem.is_zero:
                break
            q_poly, power = quotient, power + 1
        q_expr = q_poly.as_expr()
        content, q_prim = sp.factor_terms(q_expr).as_coeff_Mul()
        if q_prim.is_Number:
            content, q_prim = content * q_prim, sp.S.One
        exponent = power - sp.Rational(half, 2)
        parts.append(sp.expand(p / content) / (q_prim * (1 - ecc**2) ** exponent))
    return sp.Add(*parts)


@lru_cache(maxsize=None)
def quasi_keplerian_from_frequency(pn_order: int) -> QuasiKeplerianElements:
    """Quasi-Keplerian elements in terms of ``x`` and the time eccentricity ``e_t``.

    Derived from :func:`quasi_keplerian_from_energy` by reverting
    ``x = (G m (1 + k) n/c^3)^(2/3)`` and ``e_t = e_t(E, J)`` for ``E`` and ``J``.

    Parameters
    ----------
    pn_order:
        0, 1 or 2.

    Returns
    -------
    QuasiKeplerianElements
        PN series in ``eps = sqrt(x)``, absolute orders (``n``: from 3/2, coefficient
        ``c^3/(G m)``; ``a_r``: from -1, ``G m/c^2``; eccentricities and ``k``: from 0;
        ``E/mu``: from 1, ``-c^2/2``; ``J/mu``: from -1/2), coefficients in ``et, nu`` and the
        dimensionful constants; known through the leading order plus ``pn_order + 1/2`` (plus 2
        at 2PN); from 2PN also ``f_t, g_t, f_phi, g_phi`` (from absolute order 2).

    **Conventions**: ``omega = (1 + k) n`` the orbit-averaged azimuthal frequency,
    ``x = (G m omega/c^3)^(2/3)``; harmonic coordinates; the time eccentricity is the symbol
    ``et`` (exact).

    Example
    -------
    >>> q = quasi_keplerian_from_frequency(1)
    >>> q.radial_eccentricity
    PNSeries(et + (-3*et*nu/2 + 4*et)*eps**2 + O(eps**4))

    References
    ----------
    Damour & Deruelle, Ann. Inst. H. Poincare 43, 107 (1985); the reversion is derived here
    (compare Arun, Blanchet, Iyer & Qusailah, Phys. Rev. D 77, 064035 (2008), where the same
    elements are written in ``x`` and ``e_t``).
    """
    known = _check_order(pn_order)
    energy_form = quasi_keplerian_from_energy(pn_order)
    gm = G * m
    conv = lambda s, scale, lead: _energy_form_in_frequency(s, scale, lead, pn_order)  # noqa: E731
    mean_motion = conv(energy_form.mean_motion, c**3 / gm, sp.Rational(3, 2))
    axis = conv(energy_form.semi_major_axis, gm / c**2, -1)
    er = conv(energy_form.radial_eccentricity, 1, 0)
    ephi = conv(energy_form.angular_eccentricity, 1, 0)
    advance = conv(energy_form.periastron_advance, 1, 0)
    et_series = conv(energy_form.time_eccentricity, 1, 0)
    if et_series.terms != {0: et}:
        raise ArithmeticError(f"reversion does not reproduce e_t: {et_series!r}")
    energy = conv(PNSeries({0: E_orbit}, known), c**2, 1)
    angular = conv(PNSeries({0: J_orbit}, known), gm / c, sp.Rational(-1, 2))
    periodic = {}
    if energy_form.has_periodic_terms:
        periodic = {name: conv(getattr(energy_form, name), 1, 0)
                    for name in ("time_anomaly_term", "time_sine_term", "phase_sine_2v_term", "phase_sine_3v_term")}
    return QuasiKeplerianElements(
        variables="frequency", pn_order=int(pn_order),
        mean_motion=mean_motion, semi_major_axis=axis, radial_eccentricity=er,
        time_eccentricity=PNSeries({0: et}, known),
        angular_eccentricity=ephi, periastron_advance=advance,
        energy=energy, angular_momentum=angular,
        **periodic,
    )
