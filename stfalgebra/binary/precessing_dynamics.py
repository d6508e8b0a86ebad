"""The dynamics of a binary with spins of any direction, on the instantaneous orbital triad (exact engine).

At the instant considered the source frame is chosen with the orbital plane as its x-y plane:
``n = x/r = (cos phi, sin phi, 0)``, ``lambda = e_z cross n``, ``ell = e_z`` along the Newtonian
orbital angular momentum ``x cross v`` (so ``x = r n``, ``v = rdot n + r phidot lambda`` with
``phidot = |x cross v|/r^2 > 0``). Each dimensionless spin ``chi_A = c S_A/(G m_A^2)`` is given by
its components on that triad, the engine generators

    chi1_n, chi1_lambda, chi1_ell, chi2_n, chi2_lambda, chi2_ell

(aligned spins: ``chiA_ell = chiA``, the other four zero). The cited spin-orbit acceleration and
precession frequencies (:mod:`stfalgebra.binary.spin_orbit_inputs`) are evaluated on these
components (:func:`general_spin_namespace`); the acceleration has a component along ``ell``
(proportional to the in-plane spin components) that tilts the orbital plane.

:class:`PrecessingOrbitDerivative` is the time derivative of a function of
``r, rdot, phidot`` and the six spin components along that motion (1PN point-mass plus leading
spin-orbit acceleration, leading-order precession):

    dr/dt = rdot,  d rdot/dt = r phidot^2 + a.n,  d phidot/dt = (a.lambda - 2 rdot phidot)/r,
    d chiA_n/dt = (phidot - W_A) chiA_lambda,  d chiA_lambda/dt = -(phidot - W_A) chiA_n,
    d chiA_ell/dt = 0,

with ``Omega_A = W_A ell`` the precession frequency (1PN relative to ``phidot``). The turning of
the triad about ``n`` (the plane's tilt, rate ``(a.ell)/(r phidot)``, itself linear in the spins)
changes the spin components only at quadratic order in the spins: spin-spin terms, not entered.
Results are linear in the spins and known through relative order 3/2 (the leading spin-orbit
order), as every spinning result of the toolkit
(:data:`~stfalgebra.binary.spin_variables.SPINNING_KNOWN_THROUGH`).

**Conventions**: :mod:`stfalgebra.binary.spin_variables`, ``shared/conventions.md`` (harmonic
coordinates, centre-of-mass frame, covariant spin supplementary condition).
"""

from __future__ import annotations

from fractions import Fraction
from functools import lru_cache
from types import SimpleNamespace

from ..exact import ExactPolynomial, engine_symbols
from ..pnseries import PNSeries
from .cited_inputs import acceleration_n_factor, acceleration_v_factor
from .orbit_derivative import derivative_with_named_rates
from .spin_orbit_inputs import precession_frequencies, spin_orbit_acceleration
from .spin_variables import SPIN_ORBIT_ORDER, SPINNING_KNOWN_THROUGH, spin_combinations
from .triad_vectors import TriadVector, cross, dot

__all__ = [
    "SPIN_COMPONENTS", "spin_component_vectors", "general_spin_namespace", "general_spin_acceleration",
    "precession_rates", "PrecessingOrbitDerivative",
]

#: The engine generators of the spin components on the instantaneous triad (n, lambda, ell).
SPIN_COMPONENTS = tuple(f"chi{a}_{k}" for a in (1, 2) for k in ("n", "lambda", "ell"))

_POINT_MASS_ORDER = 1


def spin_component_vectors() -> tuple[TriadVector, TriadVector]:
    """``(chi_1, chi_2)`` as :class:`~stfalgebra.binary.triad_vectors.TriadVector` on ``(n, lambda, ell)``.

    Example
    -------
    >>> spin_component_vectors()[0]
    TriadVector(chi1_n, chi1_lambda, chi1_ell)
    """
    return tuple(TriadVector(*(ExactPolynomial(f"chi{a}_{k}") for k in ("n", "lambda", "ell")))
                 for a in (1, 2))


@lru_cache(maxsize=1)
def general_spin_namespace() -> SimpleNamespace:
    """The engine namespace of the spin-orbit inputs for spins of any direction (module docstring).

    Returns
    -------
    SimpleNamespace
        :func:`~stfalgebra.exact.engine_symbols` plus ``x = (r, 0, 0)``, ``v = (rdot, r phidot, 0)``,
        ``spin = X1^2 chi_1 + X2^2 chi_2``, ``spin_difference = X2 chi_2 - X1 chi_1`` on the triad
        ``(n, lambda, ell)``, ``cross`` and ``dot``.

    Example
    -------
    >>> general_spin_namespace().spin_difference.components[0]
    -chi1_n/2 + chi2_n/2 - delta*chi1_n/2 - delta*chi2_n/2
    """
    base = engine_symbols()
    zero = ExactPolynomial(0)
    chi1, chi2 = spin_component_vectors()
    s, sigma = spin_combinations(chi1, chi2, base.delta)
    values = dict(vars(base))
    values.update(x=TriadVector(base.r, zero, zero), v=TriadVector(base.rdot, base.r * base.phidot, zero),
                  spin=s, spin_difference=sigma, cross=cross, dot=dot)
    return SimpleNamespace(**values)


@lru_cache(maxsize=1)
def general_spin_acceleration() -> tuple[ExactPolynomial, ExactPolynomial, ExactPolynomial]:
    """Components ``(a.n, a.lambda, a.ell)`` of the spin-orbit acceleration (coefficient of ``1/c^3``).

    Returns
    -------
    tuple
        Engine polynomials in r, rdot, phidot, G, m, delta, nu and the spin components; ``a.ell``
        involves only the in-plane components (the plane stays put for aligned spins).

    Example
    -------
    >>> general_spin_acceleration()[2].substitute({"chi1_n": 0, "chi1_lambda": 0, "chi2_n": 0, "chi2_lambda": 0})
    0

    References
    ----------
    :func:`~stfalgebra.binary.spin_orbit_inputs.spin_orbit_acceleration` (Kidder 1995, from memory).
    """
    return tuple(spin_orbit_acceleration(general_spin_namespace())[SPIN_ORBIT_ORDER].components)


@lru_cache(maxsize=1)
def precession_rates() -> tuple[ExactPolynomial, ExactPolynomial]:
    """``(W_1, W_2)``: the precession frequencies ``Omega_A = W_A ell`` (coefficient of ``1/c^2``).

    Example
    -------
    >>> precession_rates()[0].substitute({"nu": Fraction(1, 4), "delta": 0})
    7*G*m*r**(-1)*phidot/8

    References
    ----------
    :func:`~stfalgebra.binary.spin_orbit_inputs.precession_frequencies` (Kidder 1995, from memory).
    """
    out = []
    for omega in precession_frequencies(general_spin_namespace()):
        along_n, along_lambda, along_ell = omega.components
        if not (along_n.is_zero() and along_lambda.is_zero()):
            raise ArithmeticError("the leading-order precession frequency is not along ell")
        out.append(along_ell)
    return tuple(out)


@lru_cache(maxsize=1)
def _rates() -> dict[str, dict[int, ExactPolynomial]]:
    """``{generator: {doubled order: rate}}`` (``r`` handled by the chain rule in ``r``)."""
    s = engine_symbols()
    zero = ExactPolynomial(0)
    rdot_rate = {0: s.r * s.phidot**2}
    phidot_rate = {0: -2 * s.rdot * s.phidot * s.r**-1}
    alpha, beta = acceleration_n_factor(s), acceleration_v_factor(s)
    for k in range(_POINT_MASS_ORDER + 1):
        a_n = alpha.get(k, zero) + beta.get(k, zero) * s.rdot
        a_lambda = beta.get(k, zero) * s.r * s.phidot
        rdot_rate[2 * k] = rdot_rate.get(2 * k, zero) + a_n
        phidot_rate[2 * k] = phidot_rate.get(2 * k, zero) + a_lambda * s.r**-1
    so_n, so_lambda, _ = general_spin_acceleration()
    rdot_rate[SPIN_ORBIT_ORDER.twice] = so_n
    phidot_rate[SPIN_ORBIT_ORDER.twice] = so_lambda * s.r**-1
    rates = {"rdot": rdot_rate, "phidot": phidot_rate}
    for a, w in zip((1, 2), precession_rates()):
        n, lam = ExactPolynomial(f"chi{a}_n"), ExactPolynomial(f"chi{a}_lambda")
        # frame turning (phidot about ell) and precession (W about ell)
        rates[f"chi{a}_n"] = {0: s.phidot * lam, 2: -w * lam}
        rates[f"chi{a}_lambda"] = {0: -s.phidot * n, 2: w * n}
    return {name: {k: v for k, v in rate.items() if not v.is_zero()} for name, rate in rates.items()}


_MOVING = ("rdot", "phidot") + SPIN_COMPONENTS


@lru_cache(maxsize=65536)
def _derivative(coefficient: ExactPolynomial) -> tuple[tuple[int, ExactPolynomial], ...]:
    return derivative_with_named_rates(coefficient, _rates())


class PrecessingOrbitDerivative:
    """Time derivative along the orbit of a binary with spins of any direction (module docstring).

    Acts on PN series in ``eps = 1/c`` whose coefficients are engine polynomials in ``r``,
    ``1/r``, ``rdot``, ``phidot``, the spin components :data:`SPIN_COMPONENTS` and constants.
    The result is known through ``min(known, k0 + 3/2)``, ``k0`` the lowest order whose
    coefficient depends on a moving variable (the velocity or a spin component). Terms quadratic
    in the spins (spin-spin) are not produced.

    Example
    -------
    >>> d = PrecessingOrbitDerivative()
    >>> chi = ExactPolynomial("chi1_n")**2 + ExactPolynomial("chi1_lambda")**2 + ExactPolynomial("chi1_ell")**2
    >>> d(PNSeries._from_trusted({0: chi}, 10)).orders          # |chi_1| is conserved
    ()

    References
    ----------
    Common practice (chain rule along the equations of motion on a rotating triad).
    """

    __slots__ = ("_cache",)

    def __init__(self) -> None:
        self._cache: dict[PNSeries, PNSeries] = {}

    def __call__(self, series: PNSeries) -> PNSeries:
        if not isinstance(series, PNSeries):
            raise TypeError(f"PrecessingOrbitDerivative acts on a PNSeries, got {series!r}")
        cached = self._cache.get(series)
        if cached is not None:
            return cached
        known2 = series._known2
        for k2, coefficient in series._terms:
            if coefficient.has(*_MOVING):
                known2 = min(known2, k2 + SPINNING_KNOWN_THROUGH.twice)
                break
        pieces: dict[int, ExactPolynomial] = {}
        for k2, coefficient in series._terms:
            for offset, value in _derivative(coefficient):
                if k2 + offset <= known2:
                    pieces[k2 + offset] = pieces[k2 + offset] + value if k2 + offset in pieces else value
        result = PNSeries._from_trusted({k: v for k, v in pieces.items() if not v.is_zero()}, known2)
        self._cache[series] = result
        return result

