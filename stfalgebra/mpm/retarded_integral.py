"""The finite-part retarded integral of one multipolar piece ``nhat_L r^(-k) F(t - r)``.

The quadratic source is a sum of pieces ``nhat_L r^(-k) F(t - r)`` (k >= 2); the iteration
needs ``u = FP_(B=0) Box^-1_ret [(r/r0)^B nhat_L r^(-k) F]`` (c = 1). This module gives

* :func:`instantaneous_solution` -- the closed form for ``3 <= k <= l + 2``,

      u = -(2^(k-3) (k-3)! (l+2-k)!/(l+k-2)!) nhat_L sum_(j=0)^(k-3) (l+j)!/(2^j j! (l-j)!) F^(k-3-j)(t - r)/r^(j+1)

  (Blanchet & Damour, Phys. Rev. D 46, 4304 (1992); Blanchet, Living Rev. Relativ. 17, 2
  (2014), sec. 3; from memory: the tests apply Box to it);
* :func:`far_zone_multiplier` -- for every k >= 2, the coefficient of ``nhat_L / r`` at
  future null infinity (u = t - r fixed, r -> oo) as an operator on F, derived from the
  radial Green function of one harmonic ``F = exp(-i omega t)``:

      r u -> (-i)^(l+2) omega^(k-3-B) r0^(-B) I_l(3 + B - k) exp(-i omega u),
      I_l(s) = int_0^oo x^(s-1) e^(ix) j_l(x) dx = 2^(-s) i^(l+s) Gamma(l+s) Gamma(1-s)/Gamma(l+2-s)

  (the Weber-Schafheitlin integral of ``e^(-ax) J_nu(x) x^(mu-1)`` at ``a = -i``, Gauss's sum
  for 2F1 at 1 and the duplication formula; the tests check I_l(s) by quadrature). For
  ``3 <= k <= l + 2`` this is the leading term of the closed form above. For ``k >= l + 3``
  Gamma(l + s) has a pole at B = 0 and the finite part brings ``ln r0``, harmonic numbers and
  the hereditary logarithm ``int_0^oo dtau ln(tau) F^(k-2)(u - tau)``. For ``k = 2`` the
  integral converges and is ``-nhat_L int_1^oo dx Q_l(x) F(t - r x)`` (Q_l the Legendre
  function of the second kind); with ``Q_l(1 + y) = (1/2) ln(2/y) - H_l + O(y ln y)`` its far
  zone is ``(nhat_L/r) int_0^oo dtau F(u - tau) [(1/2) ln(tau/(2 r)) + H_l]`` (the tails and
  the memory; the tests check it by quadrature);
* :func:`pole_residue` -- ``FP_(B=0) Box^-1_ret [B (r/r0)^B nhat_L r^(-k) F]``, the homogeneous
  retarded solution ``(-1)^k 2^(k-3) (k-3)!/((k-l-3)! (k+l-2)!) d_L [F^(k-l-3)(t - r)/r]`` for
  ``k >= l + 3`` and 0 otherwise (the residue of the same Gamma function; needed for the
  divergence of the iterated metric).

Multipliers are ring polynomials (:mod:`.coefficient_ring`): ``rate`` is d/du, ``z`` its
inverse (``int_0^oo dtau``), ``lg * z`` the hereditary logarithm, ``logr``, ``logr0``, ``log2``
the logarithms of r, of the finite-part scale r0 and of 2.

**Conventions**: c = 1; r0 is the finite-part scale of the iteration (the factor
``(r/r0)^B``), not the constant b of the radiative coordinates.
"""

from __future__ import annotations

from fractions import Fraction
from math import factorial

import flint

from .coefficient_ring import RING, gens, harmonic_number
from .retarded_field import RetardedField, multipole_wave

__all__ = ["instantaneous_solution", "far_zone_multiplier", "pole_residue", "pole_residue_wave"]


def _fmpq(value: Fraction) -> flint.fmpq:
    return flint.fmpq(value.numerator, value.denominator)


def _check(l: int, k: int) -> None:
    if l < 0 or k < 2:
        raise ValueError(f"a piece nhat_L r^-k needs l >= 0 and k >= 2, got l = {l}, k = {k}")


def instantaneous_solution(harmonic: flint.fmpq_mpoly, l: int, k: int, time_factor: flint.fmpq_mpoly,
                           rate: flint.fmpq_mpoly) -> RetardedField:
    """Return ``FP Box^-1_ret [nhat_L r^-k F(t - r)]`` for ``3 <= k <= l + 2`` (closed form).

    Parameters
    ----------
    harmonic:
        ``H(x) = H_L x_L``, harmonic of degree l (``nhat_L H_L = H(n)``).
    l, k:
        The multipolarity and the power of 1/r.
    time_factor, rate:
        Marker polynomial of F and the rate of the field.

    Example
    -------
    >>> g = gens()
    >>> one = RING.from_dict({(0,) * 11: 1})
    >>> u = instantaneous_solution(g["x3"], 1, 3, one, g["s1"])
    >>> source = RetardedField({4: g["x3"]}, g["s1"])          # n_3 r^-3 F
    >>> (u.dalembertian() - source).is_zero()
    True

    References
    ----------
    Blanchet & Damour, Phys. Rev. D 46, 4304 (1992); Blanchet, Living Rev. Relativ. 17, 2
    (2014), sec. 3 (from memory; checked by applying Box).
    """
    _check(l, k)
    if not 3 <= k <= l + 2:
        raise ValueError(f"the instantaneous closed form needs 3 <= k <= l + 2, got l = {l}, k = {k}")
    prefactor = Fraction(-(2 ** (k - 3)) * factorial(k - 3) * factorial(l + 2 - k), factorial(l + k - 2))
    out = {}
    for j in range(k - 2):
        weight = Fraction(factorial(l + j), 2 ** j * factorial(j) * factorial(l - j)) * prefactor
        out[l + j + 1] = harmonic * time_factor * rate ** (k - 3 - j) * _fmpq(weight)
    return RetardedField(out, rate)


def far_zone_multiplier(l: int, k: int, rate: flint.fmpq_mpoly) -> flint.fmpq_mpoly:
    """Return the operator ``K`` with ``r FP Box^-1_ret[nhat_L r^-k F] -> nhat_L K[F](u)`` at infinity.

    Parameters
    ----------
    l, k:
        Multipolarity and power of 1/r of the piece (k >= 2).
    rate:
        d/du on F as a ring polynomial.

    Returns
    -------
    flint.fmpq_mpoly
        In ``rate``, ``z``, ``lg``, ``logr``, ``logr0``, ``log2`` (see the module docstring);
        the terms in ``logr`` are the far-zone logarithms absorbed by the radiative time.

    Example
    -------
    >>> g = gens()
    >>> str(far_zone_multiplier(2, 3, g["s1"]))        # -(1/6) F(u)
    '-1/6'

    References
    ----------
    Derived (module docstring); Blanchet & Damour, Phys. Rev. D 46, 4304 (1992) for k = 2 and
    3 <= k <= l + 2.
    """
    _check(l, k)
    g = gens()
    if k == 2:
        return g["z"] * (g["lg"] * flint.fmpq(1, 2) + _fmpq(harmonic_number(l))
                         - g["log2"] * flint.fmpq(1, 2) - g["logr"] * flint.fmpq(1, 2))
    if k <= l + 2:
        value = Fraction(-(2 ** (k - 3)) * factorial(k - 3) * factorial(l + 2 - k), factorial(l + k - 2))
        return rate ** (k - 3) * _fmpq(value)
    n = k - l - 3
    weight = Fraction(-(2 ** (k - 3)) * (-1) ** n * factorial(k - 3), factorial(n) * factorial(l + k - 2))
    constant = harmonic_number(n) - harmonic_number(k - 3) + harmonic_number(l + k - 2)
    bracket = g["lg"] - g["log2"] - g["logr0"] + _fmpq(constant)
    return rate ** (k - 3) * bracket * _fmpq(weight)


def pole_residue(l: int, k: int) -> tuple[Fraction, int]:
    """Return ``(C, j)`` with ``FP Box^-1_ret[B (r/r0)^B nhat_L r^-k F] = C d_L[F^(j)(t - r)/r]``.

    ``C = 0`` when ``k <= l + 2`` (no pole); otherwise
    ``C = (-1)^k 2^(k-3) (k-3)!/((k-l-3)! (k+l-2)!)`` and ``j = k - l - 3``.

    Example
    -------
    >>> pole_residue(0, 3)
    (Fraction(-1, 1), 0)

    References
    ----------
    Derived from the residue of the Gamma function of :func:`far_zone_multiplier`; Blanchet,
    Living Rev. Relativ. 17, 2 (2014), sec. 2.2 (the divergence w of the iterated metric;
    from memory).
    """
    _check(l, k)
    if k <= l + 2:
        return Fraction(0), 0
    n = k - l - 3
    return Fraction((-1) ** k * 2 ** (k - 3) * factorial(k - 3), factorial(n) * factorial(k + l - 2)), n


def pole_residue_wave(harmonic: flint.fmpq_mpoly, l: int, k: int, time_factor: flint.fmpq_mpoly,
                      rate: flint.fmpq_mpoly) -> RetardedField:
    """The residue of :func:`pole_residue` as a field ``C d_L[H_L F^(j)/r]``."""
    value, order = pole_residue(l, k)
    if value == 0:
        return RetardedField.zero(rate)
    return multipole_wave(harmonic, l, time_factor * rate ** order, rate).scale(_fmpq(value))
