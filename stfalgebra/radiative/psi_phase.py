"""The phase variable psi, in which the tails' logarithms are absorbed.

``../shared/conventions.md`` writes circular-orbit modes as ``Hhat_lm exp(-i m psi)`` with

    psi = phi - (2 G M omega / c^3) ln(omega / omega_0),
    omega_0 = exp(11/12 - gamma_E) / (4 tau_0),   tau_0 = r0 / c,

phi the orbital phase, M the ADM mass, r0 the constant length of the tail integrals
(:mod:`stfalgebra.radiative.tails`). Then ``exp(-i m phi) = exp(-i m psi) S_m`` with
``S_m = exp(-i m (2 G M omega/c^3) ln(omega/omega_0))``, and to first order in G M/c^3
(enough for the 1.5PN tails) ``S_m = 1 - i m (2 G M omega/c^3) ln(omega/omega_0)``.

Multiplying the harmonic tail factor of :func:`~stfalgebra.radiative.tails.tail_factor` at
``s = m omega`` by ``S_m`` gives the relative 1.5PN tail correction of the (l, m) mode in psi:

    1 + (2 G M m omega / c^3) [pi/2 + i (ln(m/2) + 11/12 - k_l)]     (m > 0),

free of r0 and of ln omega for every (l, m); for (l, m) = (2, 2), where k_2 = kappa_2 = 11/12,
it is real: ``1 + 2 pi x^(3/2)``. This module derives that (it is not typed in).

In x (``x = (G m omega/c^3)^(2/3)``, and M = m at this order):
``G M omega/c^3 = x^(3/2)``, ``2 omega r0/c = 2 omega tau_0 = 2 c^2 r0 x^(3/2)/(G m)``, and
``(2 G M omega/c^3) ln(omega/omega_0) = 3 x^(3/2) ln(x/x_0)``, ``x_0 = (G m omega_0/c^3)^(2/3)``.
"""

from __future__ import annotations

import functools
from typing import Any

import sympy as sp

from stfalgebra.orders import PNOrder
from stfalgebra.pnseries import PNSeries
from stfalgebra.radiative.tails import canonical_logs, tail_constant, tail_factor
from stfalgebra.symbols import G, M_adm, c, m as total_mass, omega, r0, x

__all__ = [
    "PSI_CONSTANT",
    "absorb_tail_log_into_psi",
    "express_in_x",
    "phi_from_psi_factor",
    "phi_from_psi_series",
    "phi_from_psi_in_x",
    "psi_minus_phi",
    "psi_shift",
    "relative_tail_factor",
    "relative_tail_series",
    "tail_reference_frequency",
]

#: The constant 11/12 in omega_0 (input: ``../shared/conventions.md``; it equals kappa_2).
PSI_CONSTANT = sp.Rational(11, 12)

_PHASE_VARIABLES = ("psi", "phi")


def _check_azimuthal(m: Any) -> int:
    if isinstance(m, bool) or not isinstance(m, (int, sp.Integer)):
        raise TypeError(f"azimuthal number m must be an integer, got {m!r}")
    return int(m)


def _check_phase_variable(phase_variable: Any) -> str:
    if phase_variable not in _PHASE_VARIABLES:
        raise ValueError(f"phase_variable must be 'psi' or 'phi', got {phase_variable!r}")
    return phase_variable


def _first_order_in_G(expr: sp.Expr) -> sp.Expr:
    """Truncate ``expr`` after its term linear in G (G M/c^3 is the tail's small parameter)."""
    bookkeeping = sp.Dummy("epsilon")
    marked = sp.expand(expr.subs(G, bookkeeping * G))
    if marked.is_polynomial(bookkeeping):
        kept = marked.coeff(bookkeeping, 0) + marked.coeff(bookkeeping, 1)
    else:
        kept = sp.series(marked, bookkeeping, 0, 2).removeO().subs(bookkeeping, 1)
    return canonical_logs(kept)


def tail_reference_frequency() -> sp.Expr:
    """Return omega_0 = exp(11/12 - gamma_E)/(4 tau_0), tau_0 = r0/c.

    Returns
    -------
    sympy.Expr
        ``c exp(11/12 - EulerGamma) / (4 r0)``.

    **Conventions**: ``../shared/conventions.md`` (the 11/12 is :data:`PSI_CONSTANT`, equal to
    kappa_2, which makes the 1.5PN tail of the (2, 2) mode real in psi).

    Example
    -------
    >>> tail_reference_frequency()
    c*exp(11/12 - EulerGamma)/(4*r0)

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 9.4 (the phase variable psi).
    """
    return sp.exp(PSI_CONSTANT - sp.EulerGamma) / (4 * r0 / c)


def psi_minus_phi(frequency: Any = omega, *, adm_mass: Any = M_adm) -> sp.Expr:
    """Return ``psi - phi = -(2 G M omega/c^3) ln(omega/omega_0)`` (logarithms expanded).

    Parameters
    ----------
    frequency:
        The orbital angular frequency omega (a positive symbol or expression).
    adm_mass:
        The mass M, default the ADM mass symbol.

    Returns
    -------
    sympy.Expr
        The exact difference (first order in G by construction).

    **Conventions**: ``../shared/conventions.md``; in x it reads
    ``-3 x^(3/2) ln(x/x_0)`` (see :func:`express_in_x`).

    Example
    -------
    >>> psi_minus_phi().coeff(sp.log(omega))
    -2*G*M*omega/c**3

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 9.4.
    """
    frequency = sp.sympify(frequency)
    ratio = frequency / tail_reference_frequency()
    value = -2 * G * sp.sympify(adm_mass) * frequency / c**3 * sp.log(ratio)
    return canonical_logs(value)


def psi_shift(m: int, frequency: Any = omega, *, adm_mass: Any = M_adm,
              first_order: bool = True) -> sp.Expr:
    """Return S_m with ``exp(-i m phi) = exp(-i m psi) * S_m``.

    Parameters
    ----------
    m:
        Azimuthal number (any integer).
    frequency:
        The orbital angular frequency omega.
    adm_mass:
        The mass M, default the ADM mass symbol.
    first_order:
        If true (default), ``S_m`` expanded to first order in G M/c^3, which is all the 1.5PN
        tails need; otherwise the exact exponential.

    Returns
    -------
    sympy.Expr
        ``exp(-i m (2 G M omega/c^3) ln(omega/omega_0))`` or its first-order expansion
        ``1 - i m (2 G M omega/c^3) ln(omega/omega_0)``.

    **Conventions**: modes carry ``exp(-i m phi)`` (or ``exp(-i m psi)``), phi measured from
    the x axis; psi as in ``../shared/conventions.md``.

    Example
    -------
    >>> psi_shift(0)
    1
    >>> sp.im(psi_shift(2)).coeff(sp.log(omega))
    -4*G*M*omega/c**3

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 9.4.
    """
    m = _check_azimuthal(m)
    # phi = psi - (psi - phi), so exp(-i m phi) = exp(-i m psi) exp(i m (psi - phi)).
    exponent = sp.I * m * psi_minus_phi(frequency, adm_mass=adm_mass)
    if not first_order:
        return sp.exp(exponent)
    # The exponent is exactly linear in G, so exp's Taylor series stops at 1 + exponent.
    return sp.expand(1 + exponent)


def phi_from_psi_factor(m: int, frequency: Any = omega, *, adm_mass: Any = M_adm,
                        first_order: bool = True) -> sp.Expr:
    """Return the factor F with ``Hhat_lm(phi) = Hhat_lm(psi) * F``.

    A mode written ``Hhat exp(-i m psi)`` equals ``Hhat F exp(-i m phi)``, F = 1/S_m.

    Parameters
    ----------
    m, frequency, adm_mass, first_order:
        As for :func:`psi_shift`.

    Returns
    -------
    sympy.Expr
        ``exp(+i m (2 G M omega/c^3) ln(omega/omega_0))`` or its first-order expansion.

    **Conventions**: as :func:`psi_shift`; the phi form reintroduces ln omega and r0.

    Example
    -------
    >>> sp.expand(phi_from_psi_factor(2) * psi_shift(2)).coeff(G, 1)
    0

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 9.4.
    """
    m = _check_azimuthal(m)
    return psi_shift(-m, frequency, adm_mass=adm_mass, first_order=first_order)


def absorb_tail_log_into_psi(factor: Any, m: int, frequency: Any = omega, *,
                             adm_mass: Any = M_adm) -> sp.Expr:
    """Rewrite a relative factor of a mode from the phi convention to the psi convention.

    Parameters
    ----------
    factor:
        A relative factor of the (l, m) mode written with ``exp(-i m phi)``, typically
        ``tail_factor(l, kind, m * omega)``; it must be exact to first order in G.
    m:
        Azimuthal number of the mode.
    frequency:
        The orbital angular frequency omega.
    adm_mass:
        The mass M, default the ADM mass symbol.

    Returns
    -------
    sympy.Expr
        ``factor * S_m`` truncated after first order in G (logarithms expanded), the factor
        that multiplies ``exp(-i m psi)``.

    **Conventions**: see the module docstring.

    Example
    -------
    >>> from stfalgebra.radiative.tails import canonical_logs, tail_constant, tail_factor
    >>> absorb_tail_log_into_psi(tail_factor(2, "mass", 2 * omega), 2)
    2*pi*G*M*omega/c**3 + 1

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 9.4 (Hhat_22 at 1.5PN: 2 pi x^(3/2)).
    """
    if isinstance(factor, (bool, float)):
        raise TypeError(f"factor must be an exact sympy expression, got {factor!r}")
    expr = sp.sympify(factor)
    if expr.has(sp.Float):
        raise TypeError(f"factor must be exact (no floats), got {expr}")
    shift = psi_shift(m, frequency, adm_mass=adm_mass, first_order=True)
    return _first_order_in_G(expr * shift)


def express_in_x(expr: Any, frequency: sp.Symbol = omega, *, adm_mass: Any = M_adm) -> sp.Expr:
    """Rewrite an expression in omega and M through x = (G m omega/c^3)^(2/3), M = m.

    Parameters
    ----------
    expr:
        A sympy expression in ``frequency`` (and possibly ``adm_mass``).
    frequency:
        The symbol standing for omega.
    adm_mass:
        The ADM-mass symbol, replaced by m (true at the 1.5PN order the tails need).

    Returns
    -------
    sympy.Expr
        ``expr`` with ``M -> m``, ``omega -> c^3 x^(3/2)/(G m)``, logarithms expanded; so
        ``G M omega/c^3 -> x^(3/2)`` and ``2 omega r0/c -> 2 c^2 r0 x^(3/2)/(G m)``.

    **Conventions**: ``x = (G m omega / c^3)^(2/3)``, ``../shared/conventions.md``.

    Example
    -------
    >>> express_in_x(G * M_adm * omega / c**3)
    x**(3/2)

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 9 (the PN parameter x).
    """
    value = sp.sympify(expr).subs(sp.sympify(adm_mass), total_mass)
    value = value.subs(frequency, c**3 * x ** sp.Rational(3, 2) / (G * total_mass))
    return canonical_logs(value)


def relative_tail_factor(l: int, kind: str, m: int, *, phase_variable: str = "psi") -> sp.Expr:
    """Return the relative 1.5PN tail factor of the circular-orbit (l, m) mode, in x.

    Parameters
    ----------
    l:
        Multipole degree, ``>= 2``.
    kind:
        ``"mass"`` (modes with l + m even for planar orbits) or ``"current"`` (l + m odd).
    m:
        Azimuthal number, ``1 <= |m| <= l`` (m = 0 has no tail here: those modes come from
        the memory).
    phase_variable:
        ``"psi"`` (default, the mode is ``Hhat exp(-i m psi)``) or ``"phi"``
        (``Hhat exp(-i m phi)``, which keeps ln x and r0).

    Returns
    -------
    sympy.Expr
        ``1 + x^(3/2) * (...)``: multiply the leading-order Hhat_lm by it to get its 1.5PN
        relative tail term.

    **Conventions**: ``../shared/conventions.md`` (psi, x, exp(-i m phi)), M = m.

    Example
    -------
    >>> relative_tail_factor(2, "mass", 2)
    2*pi*x**(3/2) + 1
    >>> relative_tail_factor(2, "current", 1)
    pi*x**(3/2) - 2*I*x**(3/2)*log(2) - I*x**(3/2)/2 + 1

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 9.4 (the modes at 1.5PN).
    """
    m = _check_azimuthal(m)
    phase_variable = _check_phase_variable(phase_variable)
    if m == 0:
        raise ValueError("m = 0: circular-orbit m = 0 modes come from the memory and carry no "
                         "tail factor here")
    tail_constant(l, kind)  # validates l and kind before m is compared with l
    if abs(m) > int(l):
        raise ValueError(f"|m| = {abs(m)} exceeds l = {l}")
    return _relative_tail_factor(int(l), kind, m, phase_variable)


@functools.lru_cache(maxsize=256)
def _relative_tail_factor(l: int, kind: str, m: int, phase_variable: str) -> sp.Expr:
    factor = tail_factor(l, kind, m * omega)
    if phase_variable == "psi":
        factor = absorb_tail_log_into_psi(factor, m)
    return express_in_x(factor)


def relative_tail_series(l: int, kind: str, m: int, *, phase_variable: str = "psi") -> PNSeries:
    """Return :func:`relative_tail_factor` as a PN series in x, known through order 3/2.

    Parameters
    ----------
    l, kind, m, phase_variable:
        As for :func:`relative_tail_factor`.

    Returns
    -------
    PNSeries
        Orders 0 (coefficient 1) and 3/2; orders 1/2 and 1 are exactly zero; order 3/2 is the
        last known (beyond it: 1PN corrections to the tail, tails of tails).

    **Conventions**: PNSeries order n multiplies ``x^n`` (``eps = sqrt(x)``).

    Example
    -------
    >>> relative_tail_series(2, "mass", 2).coefficient(sp.Rational(3, 2))
    2*pi

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 9.4.
    """
    three_halves = sp.Rational(3, 2)
    factor = relative_tail_factor(l, kind, m, phase_variable=phase_variable)
    correction = sp.expand((factor - 1) / x**three_halves)
    if correction.has(x) and correction.subs(sp.log(x), sp.Dummy()).has(x):
        raise AssertionError(f"tail correction {correction} is not x^(3/2) times a constant")
    return PNSeries({0: 1, three_halves: correction}, known_through=three_halves)


def phi_from_psi_series(m: int) -> PNSeries:
    """Return the factor F with ``Hhat_lm(phi) = Hhat_lm(psi) * F`` as a PN series in x.

    Parameters
    ----------
    m:
        Azimuthal number of the mode (any integer; m = 0 gives exactly 1).

    Returns
    -------
    PNSeries
        Orders 0 (coefficient 1) and 3/2, known through 3/2 (the next term of the exponential
        and the 1PN correction of M = m are beyond it). The 3/2 coefficient is
        ``2 i m [(3/2) ln x + ln(4 c^2 r0/(G m)) + gamma_E - 11/12]``: derived from
        :func:`phi_from_psi_factor` in x (:func:`express_in_x`), with the logarithms of the
        dimensional constants gathered into the one dimensionless ratio ``c^2 r0/(G m)``
        (r0 in units of G m/c^2).

    **Conventions**: ``eps = sqrt(x)`` (order n multiplies x^n); M = m; the mode in the phi
    variable is ``Hhat_lm(phi) exp(-i m phi)``.

    Example
    -------
    >>> phi_from_psi_series(0).coefficient(sp.Rational(3, 2))
    0
    >>> print(phi_from_psi_series(1).coefficient(sp.Rational(3, 2)).coeff(sp.log(x)))
    3*I

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 9.4 (the phase variable psi).
    """
    return _phi_from_psi_series(_check_azimuthal(m))


@functools.lru_cache(maxsize=64)
def _phi_from_psi_series(m: int) -> PNSeries:
    three_halves = sp.Rational(3, 2)
    factor = express_in_x(phi_from_psi_factor(m, adm_mass=total_mass))
    correction = sp.expand((factor - 1) / x**three_halves)
    # r0 = (G m/c^2) rho: every log of c, G, m cancels into ln(rho)
    rho = sp.Dummy("rho", positive=True)
    correction = canonical_logs(correction.subs(r0, G * total_mass * rho / c**2))
    if correction.has(c) or correction.has(G) or correction.has(total_mass):
        raise AssertionError(f"phi/psi conversion {correction} is not dimensionless")
    if correction.subs(sp.log(x), 0).has(x):
        raise AssertionError(f"phi/psi conversion {correction} is not x^(3/2) times a constant")
    correction = correction.subs(sp.log(rho), sp.log(c**2 * r0 / (G * total_mass)))
    return PNSeries({0: 1, three_halves: correction}, known_through=three_halves)


@functools.lru_cache(maxsize=64)
def phi_from_psi_in_x(m: int) -> PNSeries:
    """The factor F with ``Hhat_lm(phi) = Hhat_lm(psi) * F``, written with one logarithm in x.

    Parameters
    ----------
    m:
        Azimuthal number of the mode (m = 0 gives exactly 1).

    Returns
    -------
    PNSeries
        In ``eps = sqrt(x)`` with engine coefficients:
        ``1 + 3 i m (M/m) x^(3/2) ln(x/x0) = 1 + 3 i m x^(3/2) ln(x/x0) - (3/2) i m nu x^(5/2) ln(x/x0)``,
        known through relative 5/2 (the next term, the square of the logarithm's term, is x^3),
        where ``x0 = (G m omega_0/c^3)^(2/3)`` is the reference of psi.

    **Conventions**: ``psi = phi - (2 G M omega/c^3) ln(omega/omega_0)`` with M the ADM mass,
    ``M/m = 1 + E/(m c^2) = 1 - nu x/2 + O(x^2)`` (:func:`~stfalgebra.radiative.radiative_moments.adm_mass_ratio`
    on the circular orbit), ``G M omega/c^3 = (M/m) x^(3/2)`` and ``omega/omega_0 = (x/x0)^(3/2)``, so
    ``exp(-i m phi) = exp(-i m psi) [1 + 3 i m (M/m) x^(3/2) ln(x/x0) + O(x^3)]``
    (``../shared/conventions.md``); ``x0`` carries ``omega_0 = exp(11/12 - gamma_E)/(4 r0/c)``.
    The tests check its 1.5PN term against :func:`phi_from_psi_series` (the same factor derived
    with the dimensional logarithms of G, m, c, r0).

    Example
    -------
    >>> phi_from_psi_in_x(2)
    PNSeries(1 + (6*I*log(x) - 6*I*log(x0))*eps**3 + (-3*I*nu*log(x) + 3*I*nu*log(x0))*eps**5 + O(eps**6))

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 9.4 (the phase variable psi, with the ADM mass).
    """
    from stfalgebra.binary.circular_frequency import on_circular_orbit
    from stfalgebra.exact import ExactPolynomial
    from stfalgebra.radiative.radiative_moments import adm_mass_ratio

    m = _check_azimuthal(m)
    log_ratio = ExactPolynomial("log_x") - ExactPolynomial("log_x0")
    ratio = on_circular_orbit(adm_mass_ratio().map_coefficients(lambda v: v.substitute({"rdot": 0})), 1)
    term = PNSeries._from_trusted({3: ExactPolynomial("I") * (3 * m) * log_ratio}, float("inf"))
    return (PNSeries._from_trusted({0: ExactPolynomial(1)}, float("inf")) + term * ratio).truncate(PNOrder(5, 2))
