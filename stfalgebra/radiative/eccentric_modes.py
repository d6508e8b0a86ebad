"""The modes of an eccentric binary along its orbit, as exact functions of the eccentric anomaly.

The general-orbit modes of :func:`~stfalgebra.radiative.modes.derive_mode` (instantaneous terms,
``Hhat_lm`` in ``r, rdot, phidot``) are evaluated on the quasi-Keplerian orbit (the Newtonian ellipse
through 0.5PN; the 1PN orbit of :func:`~stfalgebra.binary.keplerian.quasi_keplerian_from_frequency`
in harmonic coordinates is prepared but not yet served) and written with the two periodicities of the motion apart:

    h_lm = (2 G m nu x/(R c^2)) sqrt(16 pi/5) H_lm(x, e_t, u) exp(-i m W(x, e_t, u)) exp(-i m lambda),

with ``x = (G m omega/c^3)^(2/3)``, ``omega = (1 + k) n`` the averaged azimuthal frequency,
``lambda = omega (t - t_0)`` the mean orbital phase (the azimuthal periodicity), and

    phi = lambda + W,     W = (1 + k) (v_phi(u) - l(u)),     l = u - e_t sin u = n (t - t_0),

``W`` and ``H_lm`` periodic in ``u`` (the radial periodicity). ``H_lm = Hhat_lm e^{-i m (phi -
lambda)} exp(i m W)/(2 x c^2)`` is rational in ``cos u, sin u`` and ``sqrt(1 - e_t^2)``; ``W``
holds the true anomaly, written ``v - u = 2 atan(rho sin u/(1 - rho cos u))``, ``rho = e_t/(1 +
sqrt(1 - e_t^2))`` (continuous and periodic). The normalisation is the circular one of
``../shared/conventions.md``: at ``e_t = 0``, ``W = 0`` and ``H_lm`` is the circular ``Hhat_lm``
(phase ``psi = phi`` below 1.5PN). Both are truncated PN series in ``x`` (every term through
``x^pn`` relative to the Newtonian ``h_22``). The hereditary (tail, memory) parts are not included:
these are the instantaneous modes.

The harmonic content, ``H_lm exp(-i m W) = sum_p c_p exp(i p l)``, is computed numerically
(FFT on a uniform grid in the mean anomaly): harmonic ``p`` radiates at ``p n - m omega``.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache
from typing import Any

import numpy as np
import sympy as sp

from ..binary.anomaly_integrals import anomaly_ratio
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

#: The highest absolute PN order served (0.5PN: the Newtonian ellipse suffices; 1PN needs the
#: 1PN orbit, whose exact simplification is not fast enough yet).
ECCENTRIC_MODE_MAX_PN = PNOrder(sp.Rational(1, 2))



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


def _element(series, newtonian_order: Any, correction: bool) -> sp.Expr:
    """The Newtonian term (absolute order ``newtonian_order``) of a quasi-Keplerian element (PN
    series in sqrt(x)), or with ``correction`` its 1PN term, in ``x`` with ``G = 1``."""
    order = PNOrder(newtonian_order) + (1 if correction else 0)
    if order not in series.orders:
        return sp.S.Zero
    return series.coefficient(order).subs(G, 1) * x ** sp.Rational(order.numerator, order.denominator)


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

    **Conventions**: module docstring; ``h_lm = (2 G m nu x/(R c^2)) sqrt(16 pi/5) H_lm
    exp(-i m W) exp(-i m lambda)``.
    """

    l: int
    m: int
    pn: PNOrder
    amplitude: sp.Expr
    periodic_phase: sp.Expr

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
        return function(angle, ecc, float(frequency))


@lru_cache(maxsize=64)
def _lambdified(amplitude: sp.Expr, phase: sp.Expr, m_index: int, numbers: tuple):
    fixed = dict(numbers)
    expr = (amplitude * sp.exp(-sp.I * m_index * phase)).subs(fixed)
    return sp.lambdify((u, et, x), expr, "numpy")


_COS, _SIN, _ROOT = sp.symbols("cos_u sin_u root_1_minus_et2")
_SQRT_X = sp.Symbol("sqrt_x", positive=True)


@lru_cache(maxsize=1)
def _field():
    """Q(i)(cos u, sin u, et, root, nu, delta, sqrt x, m, c): sympy's sparse field (fast)."""
    from sympy.polys.domains import QQ_I
    from sympy.polys.fields import field

    from ..symbols import delta

    return field([_COS, _SIN, et, _ROOT, nu, delta, _SQRT_X, total_mass, c], QQ_I)


def _reduce(poly):
    ring = poly.ring
    cos_u, sin_u, ecc, root = ring.gens[:4]
    total = ring.zero
    for monomial, coefficient in poly.terms():
        i, j, k, l = monomial[:4]
        rest = ring({(0, 0, 0, 0) + tuple(monomial[4:]): coefficient})
        total += (rest * cos_u**i * ecc**k * (1 - cos_u**2) ** (j // 2) * sin_u ** (j % 2)
                  * (1 - ecc**2) ** (l // 2) * root ** (l % 2))
    return total


def _canonical(expr: sp.Expr) -> sp.Expr:
    """A rational function of cos u, sin u, sqrt(1 - et^2), x^(1/2) and constants, with
    sin^2 u and the root squared reduced and a denominator free of both (field arithmetic)."""
    K = _field()[0]
    value = sp.sympify(expr).subs({sp.cos(u): _COS, sp.sin(u): _SIN})
    value = value.subs(sp.sqrt(1 - et) * sp.sqrt(1 + et), _ROOT).subs(sp.sqrt(1 - et**2), _ROOT)
    value = value.subs(x, _SQRT_X**2)
    if value.has(u) or value.has(sp.sqrt(1 - et)):
        raise ArithmeticError(f"not rational in cos u, sin u, sqrt(1 - et^2): {expr}")
    element = K.from_expr(value)
    ring = element.numer.ring
    num, den = _reduce(element.numer), _reduce(element.denom)
    for index, square in ((3, 1 - ring.gens[2] ** 2), (1, 1 - ring.gens[0] ** 2)):
        if den.degree(index) > 0:
            generator = ring.gens[index]
            d1, d0 = den.coeff_wrt(generator, 1), den.coeff_wrt(generator, 0)
            num = _reduce(num * (d0 - d1 * generator))
            den = _reduce(d0**2 - d1**2 * square)
    element = K(num) / K(den)
    back = {_COS: sp.cos(u), _SIN: sp.sin(u), _ROOT: sp.sqrt(1 - et**2), _SQRT_X: sp.sqrt(x)}
    return (element.numer.as_expr() / sp.factor(element.denom.as_expr())).subs(back, simultaneous=True)


def _true_minus_eccentric(ecc: sp.Expr) -> sp.Expr:
    rho = anomaly_ratio(ecc)
    return 2 * sp.atan(rho * sp.sin(u) / (1 - rho * sp.cos(u)))


@lru_cache(maxsize=None)
def _orbit(pn: PNOrder) -> tuple[dict, dict, sp.Expr]:
    """The Newtonian (r, rdot, phidot) on the orbit, their 1PN corrections (zero below 1PN) and W,
    in x and u with G = 1.

    Each element is ``lead + s corr`` (``s`` counts the 1PN order); the 1PN correction of a
    quantity is its derivative in ``s`` at ``s = 0``."""
    s = sp.Symbol("s_pn")
    quasi = quasi_keplerian_from_frequency(1)
    with_correction = pn >= 1

    def element(series, newtonian_order):
        return (_element(series, newtonian_order, False)
                + (s * _element(series, newtonian_order, True) if with_correction else 0))

    axis, e_r = element(quasi.semi_major_axis, -1), element(quasi.radial_eccentricity, 0)
    e_phi, n = element(quasi.angular_eccentricity, 0), element(quasi.mean_motion, sp.Rational(3, 2))
    k = element(quasi.periastron_advance, 0)
    w_t = 1 - et * sp.cos(u)
    quantities = {
        r: axis * (1 - e_r * sp.cos(u)),
        rdot: axis * e_r * n * sp.sin(u) / w_t,
        phidot: (1 + k) * n * sp.sqrt(1 - e_phi**2) / ((1 - e_phi * sp.cos(u)) * w_t),
    }
    newtonian = {key: value.subs(s, 0) for key, value in quantities.items()}
    corrections = {key: sp.diff(value, s).subs(s, 0) for key, value in quantities.items()}
    # v_phi expanded about e_t: dv/de = sin u/(sqrt(1 - e^2)(1 - e cos u))
    dv_de = sp.sin(u) / (sp.sqrt(1 - et**2) * w_t)
    leading = _true_minus_eccentric(et) + et * sp.sin(u)
    phase = leading
    if with_correction:
        phase = leading + sp.diff((1 + k) * (leading + dv_de * (e_phi - et)), s).subs(s, 0)
    return newtonian, corrections, phase


def mode_along_orbit(l: int, m: int, pn: Any = 0) -> ModeAlongOrbit:
    """The instantaneous mode ``h_lm`` along the quasi-Keplerian orbit, exact in ``u``.

    Parameters
    ----------
    l, m:
        The mode (``l >= 2``, ``|m| <= l``).
    pn:
        Absolute PN order, 0 or 1/2 (every term through ``x^pn`` relative to the Newtonian
        h_22; a mode whose leading term is beyond ``pn`` is zero). The 1PN orbit is built
        (:func:`_orbit`) but the 1PN amplitudes are not served yet: their exact simplification
        is too slow in this implementation.

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

    References
    ----------
    The modes of :func:`~stfalgebra.radiative.modes.derive_mode` on the orbit of Damour &
    Deruelle, Ann. Inst. H. Poincare 43, 107 (1985) (1PN quasi-Keplerian representation).
    """
    return _mode_along_orbit(l, m, _check(l, m, pn))


@lru_cache(maxsize=None)
def _mode_along_orbit(l: int, m: int, order: PNOrder) -> ModeAlongOrbit:
    from .contributions import leading_order
    from .modes import derive_mode

    if leading_order(l, m) > order:
        return ModeAlongOrbit(l, m, order, sp.S.Zero, _orbit(order)[2])
    hhat = sp.expand(derive_mode(l, m, orbit="general", pn=order).hhat)
    newtonian, corrections, phase = _orbit(order)
    # split Hhat by powers of 1/c: Hhat = sum_j Hhat_j c^(-j)
    by_power: dict[int, sp.Expr] = {}
    for term in sp.Add.make_args(hhat):
        coefficient, exponent = term.as_coeff_exponent(c)
        by_power[int(-exponent)] = by_power.get(int(-exponent), 0) + coefficient
    lowest = min(by_power)
    # h_lm = (4 G m nu/(R c^4)) sqrt(pi/5) Hhat exp(-i m phi) with phi = lambda + W: the circular
    # prefactor (8 G m nu x/(R c^2)) sqrt(pi/5) leaves H = Hhat/(2 x c^2); the 1PN corrections of
    # the orbit enter only through the lowest term of Hhat
    amplitude = sp.S.Zero
    for power, piece in sorted(by_power.items()):
        value = piece.subs(newtonian, simultaneous=True)
        if power == lowest and any(v != 0 for v in corrections.values()):
            value += sum(sp.diff(piece, q).subs(newtonian, simultaneous=True) * corrections[q]
                         for q in (r, rdot, phidot))
        # a mode's constant surd (sqrt(210) for (3,3), ...) rides outside the field
        surds = {atom for atom in sp.sympify(value).atoms(sp.Pow)
                 if atom.base.is_Rational and atom.exp == sp.Rational(1, 2)}
        surd = surds.pop() if len(surds) == 1 else sp.S.One
        if surds:
            raise ArithmeticError(f"H_{l}{m} holds several surds: {surds}")
        value = surd * _canonical(sp.expand(value / surd) / (2 * x * c**power * c**2))
        if value.has(c) or value.has(total_mass):
            raise ArithmeticError(f"H_{l}{m} is not dimensionless: {value}")
        amplitude += value
    return ModeAlongOrbit(l, m, order, amplitude, phase)


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
