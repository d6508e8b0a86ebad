"""The modes of an eccentric binary along its orbit, as exact functions of the eccentric anomaly.

The general-orbit modes of :func:`~stfalgebra.radiative.modes.derive_mode` (instantaneous terms,
``Hhat_lm`` in ``r, rdot, phidot``) are evaluated on the quasi-Keplerian orbit through 1PN (the 1PN
orbit of :func:`~stfalgebra.binary.keplerian.quasi_keplerian_from_frequency`, harmonic coordinates)
and written with the two periodicities of the motion apart:

    h_lm = (2 G m nu x/(R c^2)) sqrt(16 pi/5) H_lm(x, e_t, u) exp(-i m W(x, e_t, u)) exp(-i m lambda),

with ``x = (G m omega/c^3)^(2/3)``, ``omega = (1 + k) n`` the averaged azimuthal frequency,
``lambda = omega (t - t_0)`` the mean orbital phase (the azimuthal periodicity), and

    phi = lambda + W,     W = (1 + k) (v_phi(u) - l(u)),     l = u - e_t sin u = n (t - t_0),

``W`` and ``H_lm`` periodic in ``u`` (the radial periodicity, through ``l``). ``H_lm =
Hhat_lm/(2 x c^2)`` on the orbit is a truncated series in ``sqrt(x)`` whose coefficients are
rational in ``cos u, sin u`` and ``beta = sqrt(1 - e_t^2)``, with denominators ``(1 - e_t cos
u)^K (1 - e_t^2)^J`` only (computed in the polynomial ring of
:mod:`~stfalgebra.binary.anomaly_polynomials`, no ``simplify``). ``W`` holds the true anomaly,
written ``v - u = 2 atan(e_t sin u/(1 + sqrt(1 - e_t^2) - e_t cos u))`` (a positive denominator:
continuous and periodic); at 1PN, ``W = (v - l) + x [k_1 (v - l) + e_t (4 - nu) dv/de_t]`` with
``k = k_1 x = 3 x/(1 - e_t^2)`` and ``e_phi = e_t (1 + x (4 - nu))`` (``e_phi != e_t``), expanded
about ``e_t``. The normalisation is the circular one of ``../shared/conventions.md``: at ``e_t =
0``, ``W = 0`` and ``H_lm`` is the circular ``Hhat_lm`` (phase ``psi = phi`` below 1.5PN). Every
term through ``x^pn`` relative to the Newtonian ``h_22`` is kept (``pn <= 1``; modes with
``l >= 5`` start beyond 1PN and are zero there).

**Instantaneous part only**: the hereditary tails (from 1.5PN) and the non-linear memory (the DC
part of the m = 0 modes) are not included.

The harmonic content, ``H_lm exp(-i m W) = sum_p c_p exp(i p l)``, is computed numerically
(FFT on a uniform grid in the mean anomaly): harmonic ``p`` radiates at ``p n - m omega``.
"""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction
from functools import lru_cache
from typing import Any

import numpy as np
import sympy as sp


from ..binary.anomaly_polynomials import OrbitFunction, orbit_variables
from ..binary.keplerian import quasi_keplerian_from_frequency, u, validate_eccentricity
from ..orders import PNOrder, parse_pn_order
from ..symbols import G, c, et, nu, phidot, r, rdot, x
from ..symbols import m as total_mass

__all__ = [
    "ECCENTRIC_MODE_MAX_PN",
    "ModeAlongOrbit",
    "mode_along_orbit",
    "numeric_mode_harmonics",
]

#: The highest absolute PN order served: the quasi-Keplerian orbit is entered through 1PN.
ECCENTRIC_MODE_MAX_PN = PNOrder(1)



def _check(l_index: Any, m_index: Any, pn: Any) -> PNOrder:
    for name, value in (("l", l_index), ("m", m_index)):
        if isinstance(value, bool) or not isinstance(value, int):
            raise TypeError(f"{name} must be an int, got {value!r}")
    if l_index < 2 or abs(m_index) > l_index:
        raise ValueError(f"need l >= 2 and |m| <= l, got (l, m) = ({l_index}, {m_index})")
    order = pn if isinstance(pn, PNOrder) else parse_pn_order(str(pn)) if isinstance(pn, str) else PNOrder(pn)
    if order < 0 or order > ECCENTRIC_MODE_MAX_PN:
        raise ValueError(f"pn must lie in [0, {ECCENTRIC_MODE_MAX_PN}] for modes along an eccentric orbit, "
                         f"got {pn!r}")
    return order


@dataclass(frozen=True)
class ModeAlongOrbit:
    """A mode along the eccentric orbit: amplitude ``H_lm`` and periodic phase ``W``.

    Attributes
    ----------
    l, m:
        The mode.
    pn:
        The absolute PN order kept (every term through ``x^pn`` relative to the Newtonian h_22).
    amplitude:
        ``H_lm(x, e_t, u)``: a polynomial in ``x^(1/2)`` (truncated) with coefficients rational in
        ``cos u, sin u, sqrt(1 - et^2)``, ``nu``, ``delta``.
    periodic_phase:
        ``W(x, e_t, u) = phi - lambda`` through the same relative order as the orbit
        (``x^1`` at 1PN), with the true anomaly in closed form.
    amplitude_terms, phase_terms:
        The same as ``((order, coefficient), ...)`` in increasing powers of ``x`` (``order`` a
        Fraction: the power of ``x``), for printing.

    **Conventions**: module docstring; ``h_lm = (2 G m nu x/(R c^2)) sqrt(16 pi/5) H_lm
    exp(-i m W) exp(-i m lambda)``.
    """

    l: int
    m: int
    pn: PNOrder
    amplitude: sp.Expr
    periodic_phase: sp.Expr
    amplitude_terms: tuple = ()
    phase_terms: tuple = ()

    def waveform_factor(self) -> sp.Expr:
        """``H_lm exp(-i m W)``: the mode without ``exp(-i m lambda)`` and the prefactor."""
        return self.amplitude * sp.exp(-sp.I * self.m * self.periodic_phase)

    def numeric(self, anomaly: Any, eccentricity: float, frequency: float, values: dict | None = None
                ) -> np.ndarray:
        """``H_lm exp(-i m W)`` in floating point at eccentric anomalies (array).

        ``values`` gives ``nu`` and ``delta`` (default ``nu = 1/4``, ``delta = 0``).
        """
        from ..symbols import delta

        numbers = {nu: 0.25, delta: 0.0}
        numbers.update(values or {})
        ecc = float(validate_eccentricity(eccentricity))
        function = _lambdified(self.amplitude, self.periodic_phase, self.m,
                               tuple(sorted(numbers.items(), key=lambda item: str(item[0]))))
        angle = np.asarray(anomaly, dtype=float)
        # a constant (or zero) mode lambdifies to a scalar: broadcast it over the anomalies
        return np.asarray(function(angle, ecc, float(frequency)), dtype=complex) + np.zeros(angle.shape)


@lru_cache(maxsize=64)
def _lambdified(amplitude: sp.Expr, phase: sp.Expr, m_index: int, numbers: tuple):
    fixed = dict(numbers)
    expr = (amplitude * sp.exp(-sp.I * m_index * phase)).subs(fixed)
    return sp.lambdify((u, et, x), expr, "numpy")


def _true_minus_eccentric(ecc: sp.Expr) -> sp.Expr:
    # 2 atan(rho sin u/(1 - rho cos u)), rho = e/(1 + sqrt(1 - e^2)), with (1 + sqrt(1 - e^2))
    # cleared: the denominator stays positive, so v - u is continuous and periodic
    return 2 * sp.atan(ecc * sp.sin(u) / (1 + sp.sqrt(1 - ecc**2) - ecc * sp.cos(u)))


@lru_cache(maxsize=None)
def _periodic_phase(pn: PNOrder) -> tuple:
    """``W = phi - lambda = (1 + k)(v_phi(u) - l(u))`` through ``x^1`` (below 1PN: ``v - l``).

    ``v_phi`` is the true anomaly of the angular eccentricity ``e_phi = e_t (1 + x (4 - nu))``,
    expanded about ``e_t`` with ``dv/de = sin u/(sqrt(1 - e^2)(1 - e cos u))``; ``k = 3 x/(1 -
    e_t^2)``."""
    leading = _true_minus_eccentric(et) + et * sp.sin(u)          # v - l, l = u - e_t sin u
    if pn < 1:
        return ((Fraction(0), leading),)
    elements = quasi_keplerian_from_frequency(1)
    advance = elements.periastron_advance.coefficient(1)
    angular_shift = elements.angular_eccentricity.coefficient(1)   # e_phi - e_t at order x
    dv_de = sp.sin(u) / (sp.sqrt(1 - et**2) * (1 - et * sp.cos(u)))
    return ((Fraction(0), leading), (Fraction(1), advance * leading + sp.factor(angular_shift) * dv_de))


# the dimensionless orbit variables of anomaly_polynomials: r = m R/(c^2 x), rdot = c sqrt(x) V_r,
# phidot = c^3 x^(3/2) V_phi/m (G = 1)
_R, _VR, _VPHI, _Y = sp.symbols("R_orbit V_r V_phi y_orbit")
_MAX_INVERSE_POWER = 12


def _orbit_polynomial(piece: sp.Expr, power: int) -> sp.Poly:
    """The part ``Hhat_j c^(-j)`` of a general-orbit Hhat as ``2 x c^2`` times a polynomial in
    ``R, V_r, V_phi, y`` (``R`` raised by ``_MAX_INVERSE_POWER`` so that ``1/R`` is a
    polynomial too), with Gaussian-rational coefficients."""
    value = piece.subs({r: total_mass * _R / (c**2 * _Y**2), rdot: c * _Y * _VR,
                        phidot: c**3 * _Y**3 * _VPHI / total_mass}, simultaneous=True)
    value = sp.expand(value / (c**power * 2 * c**2 * _Y**2) * _R**_MAX_INVERSE_POWER)
    if value.has(c) or value.has(total_mass) or value.has(G):
        raise ArithmeticError(f"Hhat is not dimensionless on the orbit: {value}")
    from ..symbols import delta

    return sp.Poly(value, _R, _VR, _VPHI, _Y, nu, delta, domain="QQ_I")


def _on_orbit(poly: sp.Poly, orbit) -> OrbitFunction:
    """Evaluate the polynomial of :func:`_orbit_polynomial` on the orbit variables."""
    cache: dict = {}

    def power(name: str, k: int) -> OrbitFunction:
        if (name, k) not in cache:
            base = {"R": orbit.radius, "1/R": orbit.inverse_radius, "V_r": orbit.radial_velocity,
                    "V_phi": orbit.angular_velocity, "y": OrbitFunction.generator("y"),
                    "nu": OrbitFunction.generator("nu"), "delta": OrbitFunction.generator("delta")}[name]
            cache[(name, k)] = OrbitFunction.constant(1) if k == 0 else power(name, k - 1) * base
        return cache[(name, k)]

    imaginary = OrbitFunction.generator("I")
    total = OrbitFunction.constant(0, orbit.radius.known)
    for (a, b, d, f, n_power, d_power), coefficient in poly.terms():
        real, imag = (Fraction(int(part.p), int(part.q)) for part in coefficient.as_real_imag())
        shift = a - _MAX_INVERSE_POWER
        term = (power("R", shift) if shift >= 0 else power("1/R", -shift)) * power("V_r", b)
        term = term * power("V_phi", d) * power("y", f) * power("nu", n_power) * power("delta", d_power)
        total = total + term * (OrbitFunction.constant(real) + imaginary * imag)
    return total


def mode_along_orbit(l: int, m: int, pn: Any = 0) -> ModeAlongOrbit:
    """The instantaneous mode ``h_lm`` along the quasi-Keplerian orbit, exact in ``u``.

    Parameters
    ----------
    l, m:
        The mode (``l >= 2``, ``|m| <= l``).
    pn:
        Absolute PN order, 0, 1/2 or 1 (every term through ``x^pn`` relative to the Newtonian
        h_22; a mode whose leading term is beyond ``pn`` is zero). Instantaneous part only: no
        tails, no memory.

    Returns
    -------
    ModeAlongOrbit

    Raises
    ------
    ValueError, TypeError
        Bad ``l``, ``m`` or an order beyond 1PN.

    **Conventions**: module docstring (harmonic coordinates, time eccentricity ``et``; periastron
    at ``u = 0``); ``G = 1`` only inside the dimensionless ``H_lm``.

    Example
    -------
    >>> mode = mode_along_orbit(2, 2)
    >>> sp.simplify(mode.amplitude.subs(et, 0))
    1
    >>> sp.factor(mode.amplitude.subs(u, 0))
    -(et + 2)/(2*(et - 1))
    >>> mode_along_orbit(2, 2, 1).amplitude.subs(et, 0)
    x*(55*nu/42 - 107/42) + 1

    References
    ----------
    The modes of :func:`~stfalgebra.radiative.modes.derive_mode` on the orbit of Damour &
    Deruelle, Ann. Inst. H. Poincare 43, 107 (1985) (1PN quasi-Keplerian representation);
    the 1PN elements in ``x, e_t`` as derived in :mod:`~stfalgebra.binary.keplerian`.
    """
    return _mode_along_orbit(l, m, _check(l, m, pn))


@lru_cache(maxsize=None)
def _mode_along_orbit(l: int, m: int, order: PNOrder) -> ModeAlongOrbit:
    from .contributions import leading_order
    from .modes import derive_mode

    phase_terms = _periodic_phase(order)
    phase = sp.Add(*(coefficient * x ** sp.Rational(power.numerator, power.denominator)
                     for power, coefficient in phase_terms))
    if leading_order(l, m) > order:
        return ModeAlongOrbit(l, m, order, sp.S.Zero, phase, (), phase_terms)
    if m < 0:
        # planar orbits: h_{l,-m} = (-1)^l conj(h_lm), and u, et, x, W are real, so
        # H_{l,-m} = (-1)^l conj(H_lm) (a symmetry, not a second derivation)
        mirror = _mode_along_orbit(l, -m, order)
        terms = tuple((power, sp.expand((-1) ** l * coefficient.xreplace({sp.I: -sp.I}), deep=False))
                      for power, coefficient in mirror.amplitude_terms)
        amplitude = sp.Add(*(coefficient * x ** sp.Rational(power.numerator, power.denominator)
                             for power, coefficient in terms))
        return ModeAlongOrbit(l, m, order, amplitude, phase, terms, phase_terms)
    hhat = sp.expand(derive_mode(l, m, orbit="general", pn=order).hhat)
    # split Hhat by powers of 1/c: Hhat = sum_j Hhat_j c^(-j); each part carries at most one
    # constant surd (sqrt(210) for (3,3), ...), kept outside the polynomial ring
    by_power: dict[int, sp.Expr] = {}
    for term in sp.Add.make_args(hhat):
        coefficient, exponent = term.as_coeff_exponent(c)
        by_power[int(-exponent)] = by_power.get(int(-exponent), 0) + coefficient
    orbit = orbit_variables(order)
    by_surd: dict[sp.Expr, OrbitFunction] = {}
    for power, piece in sorted(by_power.items()):
        surds = {atom for atom in sp.sympify(piece).atoms(sp.Pow)
                 if atom.base.is_Rational and atom.exp == sp.Rational(1, 2)}
        if len(surds) > 1:
            raise ArithmeticError(f"H_{l}{m} holds several surds: {surds}")
        surd = surds.pop() if surds else sp.S.One
        # h_lm = (4 G m nu/(R c^4)) sqrt(pi/5) Hhat exp(-i m phi): the circular prefactor
        # (8 G m nu x/(R c^2)) sqrt(pi/5) leaves H = Hhat/(2 x c^2)
        value = _on_orbit(_orbit_polynomial(sp.expand(piece / surd), power), orbit)
        by_surd[surd] = by_surd[surd] + value if surd in by_surd else value
    terms = []
    for k in range(order.twice + 1):
        coefficient = sp.Add(*(surd * value.coefficient(k).to_sympy() for surd, value in by_surd.items()))
        if coefficient != 0:
            terms.append((Fraction(k, 2), coefficient))
    amplitude = sp.Add(*(coefficient * x ** sp.Rational(power.numerator, power.denominator)
                         for power, coefficient in terms))
    return ModeAlongOrbit(l, m, order, amplitude, phase, tuple(terms), phase_terms)


def numeric_mode_harmonics(l: int, m: int, eccentricity: float, frequency: float, pn: Any = 0,
                           harmonics: int = 40, values: dict | None = None) -> dict[int, complex]:
    """The Fourier coefficients ``c_p`` of ``H_lm exp(-i m W)`` in the mean anomaly (numerical).

    Parameters
    ----------
    l, m, pn:
        As :func:`mode_along_orbit`.
    eccentricity:
        ``e_t`` in [0, 1).
    frequency:
        ``x`` > 0 (enters at 1PN).
    harmonics:
        ``p`` from ``-harmonics`` to ``harmonics`` (1..2000).
    values:
        ``nu`` and ``delta`` (default 1/4 and 0).

    Returns
    -------
    dict
        ``{p: c_p}`` with ``H_lm exp(-i m W) = sum_p c_p exp(i p l)``: harmonic ``p`` of ``h_lm``
        oscillates at ``p n - m omega``.

    **Conventions**: FFT on 8 * harmonics (at least 256) points uniform in ``l`` (Kepler's
    equation solved by Newton's method); the error falls geometrically with the number of
    points for ``e_t < 1``.

    Example
    -------
    >>> coefficients = numeric_mode_harmonics(2, 2, 0.0, 0.01)
    >>> round(abs(coefficients[0]), 12)
    1.0

    References
    ----------
    Common practice (discrete Fourier transform).
    """
    if isinstance(harmonics, bool) or not isinstance(harmonics, int) or not 1 <= harmonics <= 2000:
        raise ValueError(f"harmonics must be an int in 1..2000, got {harmonics!r}")
    ecc = float(validate_eccentricity(eccentricity))
    if not (isinstance(frequency, (int, float)) and 0 < frequency < 1):
        raise ValueError(f"frequency x must lie in (0, 1), got {frequency!r}")
    mode = mode_along_orbit(l, m, pn)
    points = max(256, 8 * harmonics)
    mean_anomaly = 2 * np.pi * np.arange(points) / points
    anomaly = mean_anomaly.copy()
    for _ in range(60):
        anomaly = anomaly - (anomaly - ecc * np.sin(anomaly) - mean_anomaly) / (1 - ecc * np.cos(anomaly))
    if mode.amplitude == 0:
        return {p: 0j for p in range(-harmonics, harmonics + 1)}
    samples = np.asarray(mode.numeric(anomaly, ecc, frequency, values), dtype=complex) * np.ones(points)
    spectrum = np.fft.fft(samples) / points       # c_p = mean of f exp(-i p l)
    return {p: complex(spectrum[p % points]) for p in range(-harmonics, harmonics + 1)}
