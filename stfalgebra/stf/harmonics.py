"""Spherical harmonics, spin-weighted harmonics, STF harmonics Y^lm_L and alpha_L^lm, exact.

Everything here is written from explicit finite sums (no call to sympy's ``Ynm``), exact in
sympy: rationals, Gaussian rationals, square roots of rationals and of pi.

Conventions
-----------
* Y_lm(theta, phi) carries the Condon-Shortley phase (-1)^m for m > 0 and is orthonormal on the
  unit sphere: int Y_lm conj(Y_l'm') dOmega = delta_ll' delta_mm'; Y_{l,-m} = (-1)^m conj(Y_lm).
  theta is the polar angle from +z, phi the azimuth from +x.
* Spin-weighted harmonics sY_lm follow the sum formula of Goldberg et al. (1967) with the
  overall (-1)^m of the PN-review literature, which gives
  (-2)Y_22 = sqrt(5/(64 pi)) (1 + cos theta)^2 exp(2 i phi) and 0Y_lm = Y_lm.
* The STF harmonic Y^lm_L is stored as its Cartesian polynomial Y^lm_L k_L = |k|^l Y_lm(k/|k|)
  (the solid harmonic), in the probe vector ``PROBE`` of :mod:`stfalgebra.stf.cartesian`.
* alpha_L^lm is defined by n_<L> = sum_m alpha_L^lm Y_lm(n); it equals
  (4 pi l!/(2l+1)!!) conj(Y^lm_L) (integrate n_<L> conj(Y_lm(n)) over the sphere with
  int n_<L> n_<K> dOmega = 4 pi l!/(2l+1)!! delta_<L>,<K>).

References
----------
* K. S. Thorne, Rev. Mod. Phys. 52, 299 (1980): eqs. (2.11)-(2.12) for Y^lm_L, Sec. II for
  the angular integrals of n_<L>.
* J. N. Goldberg, A. J. Macfarlane, E. T. Newman, F. Rohrlich, E. C. G. Sudarshan,
  J. Math. Phys. 8, 2155 (1967): spin-weighted harmonics as a finite sum (Wigner-d form).
* L. E. Kidder, Phys. Rev. D 77, 044016 (2008); L. Blanchet, Living Rev. Relativ. 17, 2 (2014):
  alpha_L^lm and the mode decomposition of the radiative moments.
"""

from __future__ import annotations

from fractions import Fraction
from functools import lru_cache
from math import comb, factorial

import sympy as sp

from stfalgebra.stf._kernels import double_factorial_int
from stfalgebra.stf.cartesian import (
    MultiIndex,
    _as_expression,
    _as_integer,
    _polynomial,
)

__all__ = [
    "spherical_harmonic",
    "spin_weighted_harmonic",
    "solid_harmonic",
    "stf_harmonic",
    "alpha_polynomial",
    "alpha_on_triad",
]

GaussianRational = tuple[Fraction, Fraction]


# --------------------------------------------------------------------------- validation


def _degree_and_order(l: object, m: object) -> tuple[int, int]:
    """Validate (l, m): integers with l >= 0 and |m| <= l; raise ValueError naming the value."""
    degree = _as_integer(l, "l")
    order = _as_integer(m, "m")
    if degree < 0:
        raise ValueError(f"l must be a non-negative integer, got l={l!r}")
    if abs(order) > degree:
        raise ValueError(f"|m| must not exceed l, got m={m!r} with l={l!r}")
    return degree, order


def _normalisation_squared(l: int, m: int) -> int:
    """4 pi N_lm^2 with N_lm = sqrt((2l+1) (l+m)! (l-m)!/(4 pi)) (common to both sums)."""
    return (2 * l + 1) * factorial(l + m) * factorial(l - m)


# --------------------------------------------------------------------------- Y_lm(theta, phi)


def spherical_harmonic(l: int, m: int, theta: sp.Expr, phi: sp.Expr) -> sp.Expr:
    """Scalar spherical harmonic Y_lm(theta, phi), exact, Condon-Shortley phase.

    Parameters
    ----------
    l, m : int
        Degree l >= 0 and order |m| <= l.
    theta, phi : sympy.Expr
        Polar angle (from +z) and azimuth (from +x); symbols or exact numbers.

    Returns
    -------
    sympy.Expr
        Y_lm = N_lm exp(i m phi) sum_q (-1)^(q+m) sin(theta)^(2q+m) cos(theta)^(l-2q-m)
        / (2^(2q+m) (q+m)! q! (l-m-2q)!), N_lm = sqrt((2l+1)(l+m)!(l-m)!/(4 pi)), the sum
        over max(0, -m) <= q <= (l-m)/2. This is the solid harmonic (below) on the unit sphere.

    Raises
    ------
    ValueError
        If l or m is not an integer, l < 0, or |m| > l.

    Conventions
    -----------
    Orthonormal on the unit sphere; Condon-Shortley phase, so Y_11 = -sqrt(3/(8 pi))
    sin(theta) exp(i phi) and Y_{l,-m} = (-1)^m conj(Y_lm).

    Examples
    --------
    >>> theta, phi = sp.symbols("theta phi", real=True)
    >>> spherical_harmonic(1, 1, theta, phi)
    -sqrt(6)*exp(I*phi)*sin(theta)/(4*sqrt(pi))
    >>> spherical_harmonic(2, 0, sp.pi/2, 0)
    -sqrt(5)/(4*sqrt(pi))

    References
    ----------
    Thorne, Rev. Mod. Phys. 52, 299 (1980), eq. (2.11) (the same sum written in Cartesian form).
    """
    degree, order = _degree_and_order(l, m)
    theta = _as_expression(theta)
    phi = _as_expression(phi)
    cosine, sine = sp.cos(theta), sp.sin(theta)
    terms = []
    for q in range(max(0, -order), (degree - order) // 2 + 1):
        p = q + order
        s = degree - p - q
        weight = sp.Rational((-1) ** p, 2 ** (p + q) * factorial(p) * factorial(q) * factorial(s))
        terms.append(weight * sine ** (p + q) * cosine**s)
    normalisation = sp.sqrt(sp.Integer(_normalisation_squared(degree, order))) / (
        2 * sp.sqrt(sp.pi)
    )
    return normalisation * sp.exp(sp.I * order * phi) * sp.Add(*terms)


# --------------------------------------------------------------------------- sY_lm


def spin_weighted_harmonic(s: int, l: int, m: int, theta: sp.Expr, phi: sp.Expr) -> sp.Expr:
    """Spin-weighted spherical harmonic sY_lm(theta, phi), exact.

    Parameters
    ----------
    s : int
        Spin weight (s = -2 for the gravitational-wave polarisations h_plus - i h_cross).
    l, m : int
        Degree and order, |m| <= l.
    theta, phi : sympy.Expr
        Polar angle and azimuth of the direction (symbols or exact numbers).

    Returns
    -------
    sympy.Expr
        sY_lm = (-1)^m sqrt((l+m)!(l-m)!(2l+1)/(4 pi (l+s)!(l-s)!)) exp(i m phi)
        sum_r C(l-s, r) C(l+s, r+s-m) (-1)^(l-r-s) sin(theta/2)^(2l-2r-s+m)
        cos(theta/2)^(2r+s-m), with the half-angle powers rewritten through cos(theta) and
        sin(theta) (no half angles in the result). Exact zero when l < |s| (no such harmonic).

    Raises
    ------
    ValueError
        If s, l or m is not an integer, l < 0, or |m| > l.

    Conventions
    -----------
    The sign convention of the PN-review literature: (-2)Y_22 = sqrt(5/(64 pi))
    (1 + cos theta)^2 exp(2 i phi), (-2)Y_21 = sqrt(5/(16 pi)) sin theta (1 + cos theta)
    exp(i phi); s = 0 gives Y_lm with the Condon-Shortley phase. Orthonormal on the sphere for
    fixed s, and conj(sY_lm) = (-1)^(s+m) (-s)Y_{l,-m}.

    Examples
    --------
    >>> theta, phi = sp.symbols("theta phi", real=True)
    >>> spin_weighted_harmonic(-2, 2, 2, theta, phi)
    sqrt(5)*(cos(theta) + 1)**2*exp(2*I*phi)/(8*sqrt(pi))

    References
    ----------
    Goldberg, Macfarlane, Newman, Rohrlich, Sudarshan, J. Math. Phys. 8, 2155 (1967), eq. (3.1)
    with the overall (-1)^m; Blanchet, Living Rev. Relativ. 17, 2 (2014) for the sign used in
    gravitational-wave modes.
    """
    spin = _as_integer(s, "s")
    degree, order = _degree_and_order(l, m)
    theta = _as_expression(theta)
    phi = _as_expression(phi)
    if degree < abs(spin):
        return sp.S.Zero  # sY_lm exists only for l >= |s|
    cosine, sine = sp.cos(theta), sp.sin(theta)
    terms = []
    for r in range(0, degree - spin + 1):
        lower = r + spin - order
        if lower < 0 or lower > degree + spin:
            continue
        weight = comb(degree - spin, r) * comb(degree + spin, lower) * (-1) ** (degree - r - spin)
        cos_half_power = 2 * r + spin - order  # power of cos(theta/2)
        sin_half_power = 2 * degree - cos_half_power  # power of sin(theta/2)
        # sin^a(t/2) cos^b(t/2) with a + b = 2l: 2^-l (1-cos)^(a/2) (1+cos)^(b/2) for a, b even,
        # 2^-l sin (1-cos)^((a-1)/2) (1+cos)^((b-1)/2) for a, b odd; the 2^-l goes up front.
        if cos_half_power % 2 == 0:
            angular = (1 - cosine) ** (sin_half_power // 2) * (1 + cosine) ** (cos_half_power // 2)
        else:
            angular = (
                sine
                * (1 - cosine) ** ((sin_half_power - 1) // 2)
                * (1 + cosine) ** ((cos_half_power - 1) // 2)
            )
        terms.append(weight * angular)
    normalisation_squared = Fraction(
        factorial(degree + order) * factorial(degree - order) * (2 * degree + 1),
        factorial(degree + spin) * factorial(degree - spin),
    )
    normalisation = (
        (-1) ** abs(order)
        * sp.sqrt(sp.Rational(normalisation_squared.numerator, normalisation_squared.denominator))
        / (2 ** (degree + 1) * sp.sqrt(sp.pi))
    )
    return normalisation * sp.exp(sp.I * order * phi) * sp.Add(*terms)


# --------------------------------------------------------------------------- solid harmonics


@lru_cache(maxsize=None)
def _solid_gaussian(l: int, m: int) -> dict[MultiIndex, GaussianRational]:
    """Coefficients g_a with |k|^l Y_lm(k/|k|) = N_lm sum_a g_a k^a, g_a Gaussian rationals.

    From |k|^l Y_lm = N_lm sum_{p-q=m, p+q+s=l} (-(k1 + i k2)/2)^p ((k1 - i k2)/2)^q k3^s
    / (p! q! s!), the Cartesian form of Thorne (1980) eq. (2.11), with the binomial theorem
    for (k1 +- i k2)^p.
    """
    result: dict[MultiIndex, list[Fraction]] = {}
    for q in range(max(0, -m), (l - m) // 2 + 1):
        p = q + m
        s = l - p - q
        prefactor = Fraction((-1) ** p, 2 ** (p + q) * factorial(p) * factorial(q) * factorial(s))
        for j1 in range(p + 1):  # j1 powers of k1 from (k1 + i k2)^p
            for j2 in range(q + 1):  # j2 powers of k1 from (k1 - i k2)^q
                magnitude = prefactor * comb(p, j1) * comb(q, j2)
                # i^(p-j1) (-i)^(q-j2) = i^((p - j1) + 3 (q - j2))
                quarter_turns = ((p - j1) + 3 * (q - j2)) % 4
                key = (j1 + j2, p + q - j1 - j2, s)
                entry = result.setdefault(key, [Fraction(0), Fraction(0)])
                if quarter_turns == 0:
                    entry[0] += magnitude
                elif quarter_turns == 1:
                    entry[1] += magnitude
                elif quarter_turns == 2:
                    entry[0] -= magnitude
                else:
                    entry[1] -= magnitude
    return {
        key: (value[0], value[1]) for key, value in result.items() if value[0] or value[1]
    }


def _gaussian_to_sympy(value: GaussianRational) -> sp.Expr:
    real, imaginary = value
    return sp.Rational(real.numerator, real.denominator) + sp.I * sp.Rational(
        imaginary.numerator, imaginary.denominator
    )


@lru_cache(maxsize=None)
def _solid_coefficients(l: int, m: int) -> dict[MultiIndex, sp.Expr]:
    normalisation = sp.sqrt(sp.Integer(_normalisation_squared(l, m))) / (2 * sp.sqrt(sp.pi))
    return {
        key: normalisation * _gaussian_to_sympy(value)
        for key, value in _solid_gaussian(l, m).items()
    }


@lru_cache(maxsize=None)
def _alpha_coefficients(l: int, m: int) -> dict[MultiIndex, sp.Expr]:
    """Monomial coefficients of alpha_L^lm k_L = (4 pi l!/(2l+1)!!) conj(Y^lm_L) k_L."""
    # 4 pi l!/(2l+1)!! times N_lm = sqrt((2l+1)(l+m)!(l-m)!) / (2 sqrt(pi))
    normalisation = (
        sp.Rational(2 * factorial(l), double_factorial_int(2 * l + 1))
        * sp.sqrt(sp.pi)
        * sp.sqrt(sp.Integer(_normalisation_squared(l, m)))
    )
    return {
        key: normalisation * _gaussian_to_sympy((real, -imaginary))
        for key, (real, imaginary) in _solid_gaussian(l, m).items()
    }


@lru_cache(maxsize=None)
def _alpha_triad_table(l: int, m: int) -> dict[MultiIndex, sp.Expr]:
    """alpha_L^lm contracted with a x's, b y's, c z's: (a! b! c!/l!) times the coefficient."""
    return {
        (a, b, c): sp.Rational(factorial(a) * factorial(b) * factorial(c), factorial(l)) * value
        for (a, b, c), value in _alpha_coefficients(l, m).items()
    }


@lru_cache(maxsize=None)
def _solid_harmonic_cached(l: int, m: int) -> sp.Expr:
    return _polynomial(_solid_coefficients(l, m))


def solid_harmonic(l: int, m: int) -> sp.Expr:
    """Solid harmonic |k|^l Y_lm(k/|k|) = Y^lm_L k_L as a polynomial in ``PROBE``.

    Parameters
    ----------
    l, m : int
        Degree l >= 0 and order |m| <= l.

    Returns
    -------
    sympy.Expr
        A homogeneous harmonic polynomial of degree l in (k1, k2, k3) with coefficients
        sqrt((2l+1)(l+m)!(l-m)!/(4 pi)) times Gaussian rationals. It is the Cartesian
        polynomial of the STF tensor Y^lm_L (cached).

    Raises
    ------
    ValueError
        If l or m is not an integer, l < 0, or |m| > l.

    Conventions
    -----------
    Condon-Shortley phase, orthonormal Y_lm (see :func:`spherical_harmonic`):
    |k|^l Y_lm(k/|k|) = N_lm sum_{p-q=m, p+q+s=l} (-(k1 + i k2)/2)^p ((k1 - i k2)/2)^q k3^s
    / (p! q! s!), N_lm = sqrt((2l+1)(l+m)!(l-m)!/(4 pi)).

    Examples
    --------
    >>> solid_harmonic(1, 0)
    sqrt(3)*k3/(2*sqrt(pi))
    >>> sp.factor(solid_harmonic(2, 2))
    sqrt(30)*(k1 + I*k2)**2/(8*sqrt(pi))

    References
    ----------
    Thorne, Rev. Mod. Phys. 52, 299 (1980), eqs. (2.11)-(2.12).
    """
    degree, order = _degree_and_order(l, m)
    return _solid_harmonic_cached(degree, order)


#: Y^lm_L k_L, the STF harmonic of Thorne (1980) eq. (2.11) in Cartesian-polynomial form; the
#: same polynomial as :func:`solid_harmonic`.
stf_harmonic = solid_harmonic


@lru_cache(maxsize=None)
def _alpha_polynomial_cached(l: int, m: int) -> sp.Expr:
    return _polynomial(_alpha_coefficients(l, m))


def alpha_polynomial(l: int, m: int) -> sp.Expr:
    """alpha_L^lm k_L, the tensor that projects n_<L> onto Y_lm, as a polynomial in ``PROBE``.

    Parameters
    ----------
    l, m : int
        Degree l >= 0 and order |m| <= l.

    Returns
    -------
    sympy.Expr
        (4 pi l!/(2l+1)!!) conj(Y^lm_L) k_L (cached), homogeneous harmonic of degree l.

    Raises
    ------
    ValueError
        If l or m is not an integer, l < 0, or |m| > l.

    Conventions
    -----------
    n_<L> = sum_m alpha_L^lm Y_lm(n) with the orthonormal, Condon-Shortley Y_lm; hence
    alpha_L^lm = int n_<L> conj(Y_lm(n)) dOmega = (4 pi l!/(2l+1)!!) conj(Y^lm_L), and
    alpha_L^lm Y^lm'_L = delta_mm'.

    Examples
    --------
    >>> sp.factor(alpha_polynomial(2, 2))
    sqrt(30)*sqrt(pi)*(k1 - I*k2)**2/15

    References
    ----------
    Kidder, Phys. Rev. D 77, 044016 (2008); Blanchet, Living Rev. Relativ. 17, 2 (2014);
    Thorne, Rev. Mod. Phys. 52, 299 (1980), eqs. (2.11) and (2.26) style angular integrals.
    """
    degree, order = _degree_and_order(l, m)
    return _alpha_polynomial_cached(degree, order)


@lru_cache(maxsize=None)
def alpha_on_triad(l: int, m: int, a: int, b: int, c: int) -> sp.Expr:
    """Full contraction of alpha_L^lm with a copies of e_x, b of e_y and c of e_z.

    Parameters
    ----------
    l, m : int
        Degree l >= 0 and order |m| <= l.
    a, b, c : int
        Non-negative counts of e_x = (1,0,0), e_y = (0,1,0), e_z = (0,0,1), a + b + c = l.

    Returns
    -------
    sympy.Expr
        alpha_L^lm e_x^(a) e_y^(b) e_z^(c) = (a! b! c!/l!) times the coefficient of
        k1^a k2^b k3^c in :func:`alpha_polynomial`: a Gaussian-rational multiple (real for b
        even, imaginary for b odd) of sqrt(pi) times the square root of a rational. Exact zero by
        the selection rule unless a + b >= |m| and a + b - m is even (so for planar tensors,
        c = 0, only l + m even survives, and for one e_z, c = 1, only l + m odd).

    Raises
    ------
    ValueError
        If an argument is not an integer, l < 0, |m| > l, a count is negative, or
        a + b + c != l.

    Conventions
    -----------
    As :func:`alpha_polynomial`. Summing alpha_on_triad(l, m, a, b, c) times the number of
    index orderings l!/(a! b! c!) and x^a y^b z^c gives alpha_L^lm n_L for n = (x, y, z).

    Examples
    --------
    >>> alpha_on_triad(2, 2, 2, 0, 0)     # alpha_xx^22
    sqrt(30)*sqrt(pi)/15
    >>> alpha_on_triad(2, 2, 1, 1, 0)     # alpha_xy^22
    -sqrt(30)*I*sqrt(pi)/15
    >>> alpha_on_triad(2, 1, 2, 0, 0)     # selection rule
    0

    References
    ----------
    Kidder, Phys. Rev. D 77, 044016 (2008); Blanchet, Living Rev. Relativ. 17, 2 (2014).
    """
    degree, order = _degree_and_order(l, m)
    counts = tuple(_as_integer(value, name) for value, name in ((a, "a"), (b, "b"), (c, "c")))
    if any(count < 0 for count in counts):
        raise ValueError(f"triad counts must be non-negative, got (a, b, c)={(a, b, c)!r}")
    if sum(counts) != degree:
        raise ValueError(f"a + b + c must equal l={l!r}, got (a, b, c)={(a, b, c)!r}")
    planar = counts[0] + counts[1]
    if planar < abs(order) or (planar - order) % 2:
        return sp.S.Zero
    return _alpha_triad_table(degree, order).get(counts, sp.S.Zero)
