"""Enhancement functions of the leading (1.5PN) tail in the averaged fluxes of eccentric orbits.

The leading tail multiplies each harmonic ``A exp(-i s t)`` of the radiative quadrupole by
:func:`~stfalgebra.radiative.tails.tail_factor` ``T(s) = 1 + (2 G M/c^3) K(s)``. A flux is a sum
of ``|harmonic|^2`` over the harmonics of the orbit (Parseval; no cross terms between different
frequencies survive the orbit average), so each harmonic's power and angular momentum are
multiplied by

    |T(s)|^2 = 1 + (4 G M/c^3) Re K(s) + O(G^2) = 1 + (G M |s|/c^3) * w,

with ``w = 4 Re K(s)/|s|`` derived here from the kernel (it is ``2 pi``). On the Keplerian
ellipse the harmonic ``n`` has ``|s| = n n_orbit`` and ``G M n_orbit/c^3 = x^(3/2)`` at this
order (``M = m`` and ``n_orbit = omega`` up to 1PN corrections, which reach the flux at 2.5PN),
so the tail parts of the averaged fluxes are

    <F>_tail      = (32/5)(c^5/G) nu^2 x^5     * x^(3/2) w sum_n n P_n   = ... 4 pi x^(3/2) phi(e_t),
    <dJ/dt>_tail  = (32/5) m c^2 nu^2 x^(7/2)  * x^(3/2) w sum_n n L_n   = ... 4 pi x^(3/2) psi(e_t),

with ``P_n, L_n`` the Newtonian power and angular momentum in harmonic ``n``
(:mod:`stfalgebra.radiative.keplerian_harmonics`). Hence ``phi = (w/(4 pi)) sum_n n P_n``,
``psi = (w/(4 pi)) sum_n n L_n``; ``phi(0) = psi(0) = 1`` (a circular orbit radiates in
``n = 2`` only). The 1.5PN part of the averaged fluxes is this tail alone: for non-spinning
binaries the instantaneous fluxes have no 1.5PN term (the source moments and the conservative
dynamics have none; radiation reaction enters at 2.5PN).

``phi`` and ``psi`` are given

* as exact power series in ``e_t`` with rational coefficients, to any even order
  (:func:`tail_enhancement_series`), from the Bessel series of the harmonics;
* as numbers (:func:`tail_enhancement`), summing the harmonics with scipy's Bessel functions
  until the estimated remainder is below ``1e-13`` of the sum (relative accuracy better than
  ``1e-10`` for ``0 <= e_t <= 0.95``);
* as sympy functions :class:`EnergyTailEnhancement` (printed ``phi(et)``) and
  :class:`AngularMomentumTailEnhancement` (``psi(et)``) that stand in the averaged fluxes and the
  secular rates; they evaluate numerically (``evalf``) and expand in series (``series``).

Nothing here is taken from a fitted approximant; the published small-``e_t`` series are
compared in the tests.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache
from typing import Any

import sympy as sp

from ..binary.keplerian import validate_eccentricity
from ..symbols import et
from .keplerian_harmonics import (
    DEFAULT_SUM_TOLERANCE,
    weighted_harmonic_series,
    weighted_harmonic_sums,
)
from .tails import tail_kernel

__all__ = [
    "TAIL_FLUX_NORMALISATION",
    "TAIL_ENHANCEMENT_MAX_ECCENTRICITY",
    "tail_harmonic_weight",
    "TailEnhancement",
    "tail_enhancement",
    "tail_enhancement_series",
    "EnergyTailEnhancement",
    "AngularMomentumTailEnhancement",
]

#: The 1.5PN tail terms of the normalised averaged fluxes are written
#: ``TAIL_FLUX_NORMALISATION * x^(3/2) * phi(e_t)`` (energy) and ``... psi(e_t)`` (angular
#: momentum); with this normalisation phi(0) = psi(0) = 1 (the circular-orbit 4 pi x^(3/2)).
TAIL_FLUX_NORMALISATION = 4 * sp.pi

#: The numbers are served for ``0 <= e_t <= 0.95`` (relative accuracy 1e-10, at most about
#: two thousand harmonics); beyond, the number of harmonics grows as ``(1 - e_t)^(-3/2)``.
TAIL_ENHANCEMENT_MAX_ECCENTRICITY = 0.95


@lru_cache(maxsize=1)
def tail_harmonic_weight() -> sp.Rational:
    """The rational ``r`` with ``phi = r sum_n n P_n`` and ``psi = r sum_n n L_n``.

    Returns
    -------
    sympy.Rational
        ``(4 Re K(s)/s)/(4 pi)`` for ``s > 0``, with ``K`` the derived tail kernel of the mass
        quadrupole (:func:`~stfalgebra.radiative.tails.tail_kernel`); it works out to 1/2.

    Raises
    ------
    ArithmeticError
        If the kernel's real part were not proportional to ``|s|`` with a rational multiple of
        pi (it is).

    **Conventions**: module docstring; ``|T(s)|^2 = 1 + (4 G M/c^3) Re K(s)`` at first order
    in ``G M/c^3``.

    Example
    -------
    >>> tail_harmonic_weight()
    1/2

    References
    ----------
    Blanchet & Schafer, Class. Quantum Grav. 10, 2699 (1993) (the tail raises each Fourier
    component of the waves by a factor linear in the frequency); derived here from the kernel.
    """
    s = sp.Symbol("s", positive=True)
    per_frequency = sp.simplify(4 * sp.re(tail_kernel(2, "mass", s)) / s)
    ratio = sp.simplify(per_frequency / TAIL_FLUX_NORMALISATION)
    if not ratio.is_Rational:
        raise ArithmeticError(f"the tail's increase per unit frequency is {per_frequency}, "
                              f"not a rational multiple of 4 pi")
    return ratio


@dataclass(frozen=True)
class TailEnhancement:
    """Values of the enhancement functions at one eccentricity and the harmonics summed."""

    energy: float
    angular_momentum: float
    harmonics: int


def tail_enhancement(eccentricity: Any, tolerance: float = DEFAULT_SUM_TOLERANCE) -> TailEnhancement:
    """The tail enhancement functions ``phi(e_t)`` and ``psi(e_t)`` as numbers.

    Parameters
    ----------
    eccentricity:
        ``e_t`` in [0, 0.95], a number (:data:`TAIL_ENHANCEMENT_MAX_ECCENTRICITY`; the sums
        slow down as ``e_t -> 1``).
    tolerance:
        Relative truncation of the harmonic sums
        (:func:`~stfalgebra.radiative.keplerian_harmonics.weighted_harmonic_sums`); the
        default ``1e-13`` leaves a margin of 1000 under the ``1e-10`` accuracy claimed.

    Returns
    -------
    TailEnhancement
        ``energy = phi``, ``angular_momentum = psi``, ``harmonics`` the number of harmonics of
        the mean motion summed (47 at e_t = 0.5, 671 at 0.9, 1942 at 0.95).

    Raises
    ------
    ValueError, TypeError
        An eccentricity outside [0, 0.95] or not a number.

    **Conventions**: module docstring (``phi(0) = psi(0) = 1``).

    Example
    -------
    >>> values = tail_enhancement(0.5)
    >>> round(values.energy, 9), round(values.angular_momentum, 9), values.harmonics
    (13.125938881, 4.876617025, 47)

    References
    ----------
    Blanchet & Schafer, Class. Quantum Grav. 10, 2699 (1993) (phi); Arun, Blanchet, Iyer &
    Sinha, Phys. Rev. D 80, 124018 (2009) (psi); derived here.
    """
    value = validate_eccentricity(eccentricity, "e_t")
    if not value.is_number:
        raise TypeError(f"e_t must be a number, got {eccentricity!r}")
    if value > TAIL_ENHANCEMENT_MAX_ECCENTRICITY:
        raise ValueError(f"the tail enhancement functions are evaluated for 0 <= e_t <= "
                         f"{TAIL_ENHANCEMENT_MAX_ECCENTRICITY}, got {eccentricity!r}")
    sums = weighted_harmonic_sums(float(value), 1, tolerance)
    ratio = float(tail_harmonic_weight())
    return TailEnhancement(ratio * sums.energy, ratio * sums.angular_momentum, sums.harmonics)


def _check_series_order(order: Any) -> int:
    if isinstance(order, bool) or not isinstance(order, int) or order < 0 or order % 2:
        raise ValueError(f"series order must be an even int >= 0, got {order!r}")
    return order


def tail_enhancement_series(order: int, eccentricity: sp.Symbol = et) -> tuple[sp.Expr, sp.Expr]:
    """``phi(e_t)`` and ``psi(e_t)`` as exact power series through ``e_t^order``.

    Parameters
    ----------
    order:
        The highest power of ``e_t`` kept: an even int ``>= 0`` (the series are even).
    eccentricity:
        The symbol of the series (default ``et``).

    Returns
    -------
    (sympy.Expr, sympy.Expr)
        Polynomials in ``eccentricity`` with rational coefficients (``phi``, ``psi``); every
        coefficient is exact and complete.

    **Conventions**: module docstring.

    Example
    -------
    >>> phi, psi = tail_enhancement_series(4)
    >>> phi
    42955*et**4/768 + 2335*et**2/192 + 1
    >>> psi
    2415*et**4/128 + 209*et**2/32 + 1

    References
    ----------
    Blanchet & Schafer, Class. Quantum Grav. 10, 2699 (1993); Arun, Blanchet, Iyer & Sinha,
    Phys. Rev. D 80, 124018 (2009) (compared in the tests); derived here.
    """
    _check_series_order(order)
    energy, momentum = weighted_harmonic_series(order, 1)
    ratio = tail_harmonic_weight()
    return tuple(sp.Add(*[ratio * coeff * eccentricity**k for k, coeff in enumerate(series)])
                 for series in (energy, momentum))


class _TailEnhancementFunction(sp.Function):
    """Common behaviour of phi(e_t) and psi(e_t) as sympy functions."""

    nargs = 1
    _printed_name = ""
    _latex_name = ""
    _index = 0        # 0: energy (phi), 1: angular momentum (psi)

    @classmethod
    def eval(cls, eccentricity: sp.Expr) -> sp.Expr | None:
        if eccentricity.is_zero:
            return sp.S.One
        if eccentricity.is_number and eccentricity.is_real is not False:
            if not (eccentricity >= 0 and eccentricity < 1):
                raise ValueError(f"{cls._printed_name}(e_t) needs 0 <= e_t < 1, got {eccentricity}")
        if eccentricity.is_Float:
            # as sympy's own functions do: a float argument gives a float
            return cls._numeric_value(float(eccentricity))
        return None

    @classmethod
    def _numeric_value(cls, eccentricity: float) -> sp.Float:
        values = tail_enhancement(eccentricity)
        return sp.Float((values.energy, values.angular_momentum)[cls._index], 15)

    def _eval_is_extended_real(self) -> bool | None:
        return self.args[0].is_extended_real

    def _eval_is_positive(self) -> bool | None:
        return True if self.args[0].is_extended_real else None

    def _eval_evalf(self, prec: int) -> sp.Expr | None:
        argument = self.args[0].evalf(prec)
        if not argument.is_Number:
            return None
        return self._numeric_value(float(argument))

    def _eval_as_leading_term(self, x: sp.Symbol, logx: Any = None, cdir: Any = 0) -> sp.Expr:
        return sp.S.One if self.args[0] == x else self

    def _eval_nseries(self, x: sp.Symbol, n: int, logx: Any, cdir: Any = 0) -> sp.Expr:
        if self.args[0] != x:
            raise NotImplementedError(f"series of {self} in {x}")
        n = int(n)
        order = n if n % 2 == 0 else n + 1
        series = tail_enhancement_series(max(order, 2), x)[self._index]
        kept = sp.Add(*[term for term in sp.Add.make_args(series)
                        if sp.degree(term, x) < n])
        return kept + sp.Order(x**n, x)

    def _sympystr(self, printer: Any) -> str:
        return f"{self._printed_name}({printer._print(self.args[0])})"

    def _latex(self, printer: Any, exp: Any = None) -> str:
        text = rf"{self._latex_name}\left({printer._print(self.args[0])}\right)"
        return text if exp is None else rf"{text}^{{{exp}}}"


class EnergyTailEnhancement(_TailEnhancementFunction):
    """``phi(e_t)``: the 1.5PN tail of the averaged energy flux is
    ``(32/5)(c^5/G) nu^2 x^5 * 4 pi x^(3/2) phi(e_t)``.

    Parameters
    ----------
    eccentricity:
        ``e_t`` (a symbol, or a number in [0, 1)).

    Returns
    -------
    sympy.Expr
        Unevaluated for a symbol or an exact number (``1`` at ``e_t = 0``); a Float argument
        and ``evalf`` sum the harmonics (:func:`tail_enhancement`, relative accuracy 1e-10 or
        better, ``0 <= e_t <= 0.95``); ``series`` gives the exact power series
        (:func:`tail_enhancement_series`).

    **Conventions**: module docstring; the whole ``e_t`` dependence (not divided by the
    Newtonian Peters-Mathews factor).

    Example
    -------
    >>> phi = EnergyTailEnhancement(et)
    >>> phi, EnergyTailEnhancement(0)
    (phi(et), 1)
    >>> phi.series(et, 0, 4)
    1 + 2335*et**2/192 + O(et**4)

    References
    ----------
    Blanchet & Schafer, Class. Quantum Grav. 10, 2699 (1993).
    """

    _printed_name = "phi"
    _latex_name = r"\varphi"
    _index = 0


class AngularMomentumTailEnhancement(_TailEnhancementFunction):
    """``psi(e_t)``: the 1.5PN tail of the averaged angular-momentum flux is
    ``(32/5) m c^2 nu^2 x^(7/2) * 4 pi x^(3/2) psi(e_t)``.

    Parameters
    ----------
    eccentricity:
        ``e_t`` (a symbol, or a number in [0, 1)).

    Returns
    -------
    sympy.Expr
        As :class:`EnergyTailEnhancement`, for the angular momentum.

    **Conventions**: module docstring.

    Example
    -------
    >>> AngularMomentumTailEnhancement(et).series(et, 0, 4)
    1 + 209*et**2/32 + O(et**4)

    References
    ----------
    Arun, Blanchet, Iyer & Sinha, Phys. Rev. D 80, 124018 (2009).
    """

    _printed_name = "psi"
    _latex_name = r"\psi"
    _index = 1
