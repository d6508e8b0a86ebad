"""Hereditary tail integrals of the radiative moments (the leading, 1.5PN-relative tails).

The radiative mass and current moments carry, beyond the instantaneous l-th time derivative of
the source moments, a hereditary integral over the whole past of the source:

    U_L(t) = I_L^(l)(t) + (2 G M/c^3) int_0^oo dtau I_L^(l+2)(t - tau) [ln(c tau/(2 r0)) + kappa_l]
    V_L(t) = J_L^(l)(t) + (2 G M/c^3) int_0^oo dtau J_L^(l+2)(t - tau) [ln(c tau/(2 r0)) + pi_l]

(M the ADM mass, r0 the arbitrary constant length of the tail integrals). This module gives

* :func:`tail_constant` -- the constants kappa_l, pi_l (exact Rationals);
* :class:`TailIntegral` -- the bare hereditary integral as an unevaluated sympy expression, the
  form in which tails stay in general-orbit results; :func:`tail_term` multiplies it by
  ``2 G M / c^3``;
* :func:`tail_factor` -- for a single harmonic ``A exp(-i s t)`` of a source moment, the exact
  factor by which the tail multiplies the instantaneous part ``(-i s)^l A exp(-i s t)``.

The factor is *derived* here, not typed in: sympy integrates ``exp(-p tau) log(tau)`` and
``exp(-p tau)`` over ``(0, oo)`` for ``p > 0``; the result, analytic for ``Re p > 0``, is
continued to ``p = eps - i s`` and the limit ``eps -> 0+`` is taken, separately for ``s > 0``
and ``s < 0``; the two branches are recombined with ``Abs(s)`` and ``sign(s)``. The regulator
``exp(-eps tau)`` is the adiabatic switch-on of a source that is stationary in the remote past.
"""

from __future__ import annotations

import functools
from typing import Any

import sympy as sp
from sympy.core.symbol import Str

from stfalgebra.radiative.contributions import check_degree
from stfalgebra.radiative.tail_constants import TAIL_CONSTANTS_SOURCE, tail_constant_exact
from stfalgebra.scalars import as_scalar_expression
from stfalgebra.symbols import G, M_adm, c, r0, t

__all__ = [
    "KAPPA_PI_SOURCE",
    "TailIntegral",
    "canonical_logs",
    "hereditary_harmonic_integral",
    "hereditary_log_integral",
    "tail_constant",
    "tail_factor",
    "tail_kernel",
    "tail_term",
]

#: Where the tail constants come from (they are inputs to this module, not derived here).
KAPPA_PI_SOURCE = TAIL_CONSTANTS_SOURCE

_KINDS = ("mass", "current")

# The bound (retarded-time) variable of every TailIntegral integrand. One fixed Dummy (with a
# fixed index, so the same in every process, e.g. after unpickling) keeps the representation
# canonical, so equality and hashing stay structural.
_RETARDED = sp.Dummy("u", real=True, dummy_index=7_340_001)
_TAU = sp.Symbol("tau", positive=True)


# ----------------------------------------------------------------------------- validation


def _check_kind(kind: Any) -> str:
    if isinstance(kind, Str):
        kind = kind.name
    if not isinstance(kind, str):
        raise TypeError(f"kind must be the string 'mass' or 'current', got {kind!r}")
    if kind not in _KINDS:
        raise ValueError(f"kind must be 'mass' or 'current', got {kind!r}")
    return kind


def _check_frequency(s: Any) -> sp.Expr:
    expr = as_scalar_expression(s, "frequency s", exact=True)
    if expr.is_zero:
        raise ValueError(
            f"frequency s = {expr}: a zero-frequency (constant) piece has no tail; the "
            f"harmonic factor is defined for real non-zero s only")
    if expr.is_extended_real is not True:
        raise ValueError(
            f"frequency s = {expr} is not known to be real; declare its symbols real "
            f"(e.g. Symbol('s', real=True)) or positive")
    return expr


def _split_rational_logs(expr: sp.Expr) -> sp.Expr:
    """Write every log of a positive rational as a sum of logs of primes.

    ``expand_log`` leaves ``log(6)`` whole; splitting it makes ``log(6) - log(2) - log(3)``
    cancel structurally, so r0- and ln-cancellations are visible without ``simplify``.
    """

    def split(term: sp.log) -> sp.Expr:
        number = term.args[0]
        pieces = sp.factorint(number.p)
        pieces.update({q: -k for q, k in sp.factorint(number.q).items()})
        return sp.Add(*[k * sp.log(q) for q, k in pieces.items() if q != 1])

    return expr.replace(
        lambda e: isinstance(e, sp.log) and e.args[0].is_Rational and e.args[0].is_positive,
        split)


def canonical_logs(expr: Any) -> sp.Expr:
    """Expand logarithms fully: products and powers split, rationals split into primes.

    Parameters
    ----------
    expr:
        A sympy expression whose symbols inside logarithms are positive (as the project's
        physical symbols are).

    Returns
    -------
    sympy.Expr
        The expanded expression, e.g. ``log(12 w)`` becomes ``2 log(2) + log(3) + log(w)``.

    **Conventions**: ``force=True`` log expansion (valid for positive arguments).

    Example
    -------
    >>> import sympy as sp
    >>> w = sp.Symbol("w", positive=True)
    >>> canonical_logs(sp.log(12 * w) - sp.log(4)) == sp.log(3) + sp.log(w)
    True

    References
    ----------
    Common practice (sympy ``expand_log``).
    """
    value = sp.expand(sp.expand_log(sp.sympify(expr), force=True))
    return sp.expand(_split_rational_logs(value))


# ----------------------------------------------------------------------------- constants
def tail_constant(l: int, kind: str) -> sp.Rational:
    """Return the constant kappa_l (mass) or pi_l (current) of the tail integrals.

    Parameters
    ----------
    l:
        Multipole degree, an integer ``>= 2``.
    kind:
        ``"mass"`` for kappa_l (tails of I_L), ``"current"`` for pi_l (tails of J_L).

    Returns
    -------
    sympy.Rational
        ``kappa_l = (2 l^2 + 5 l + 4)/(l (l+1) (l+2)) + H_(l-2)`` or
        ``pi_l = (l - 1)/(l (l+1)) + H_(l-1)``, ``H_k`` the k-th harmonic number.

    **Conventions**: the constants go with the logarithm ``ln(c tau/(2 r0))`` inside the
    integral (see the module docstring); another choice of the constant length r0 shifts them.
    They are inputs (:data:`KAPPA_PI_SOURCE`), not derived here.

    Example
    -------
    >>> tail_constant(2, "mass"), tail_constant(2, "current")
    (11/12, 7/6)

    References
    ----------
    Blanchet & Damour, Phys. Rev. D 46, 4304 (1992); Blanchet, Living Rev. Relativ. 17, 2 (2014),
    eqs. for the radiative moments at 1.5PN (from memory).
    """
    l = check_degree(l)
    kind = _check_kind(kind)
    return sp.Rational(tail_constant_exact(l, kind))


# ----------------------------------------------------------------------------- derivation
@functools.lru_cache(maxsize=1)
def _fourier_transforms_from_laplace() -> dict[int, tuple[sp.Expr, sp.Expr, sp.Symbol]]:
    """Derive ``int_0^oo exp(i s tau) ln(tau) dtau`` and ``int_0^oo exp(i s tau) dtau``.

    Both integrals are Abel-regulated: the Laplace transforms at real ``p > 0`` are computed
    by sympy, continued to ``p = eps - i s`` and the limit ``eps -> 0+`` is taken. Returns a
    dict ``{+1: (log_part, one_part, sigma), -1: ...}`` for ``s = +sigma`` and ``s = -sigma``,
    ``sigma > 0``.
    """
    p = sp.Symbol("p", positive=True)
    eps = sp.Symbol("epsilon", positive=True)
    sigma = sp.Symbol("sigma", positive=True)
    laplace_log = sp.simplify(sp.integrate(sp.exp(-p * _TAU) * sp.log(_TAU), (_TAU, 0, sp.oo)))
    laplace_one = sp.simplify(sp.integrate(sp.exp(-p * _TAU), (_TAU, 0, sp.oo)))
    out = {}
    for sgn in (1, -1):
        continued = {}
        for name, expr in (("log", laplace_log), ("one", laplace_one)):
            value = sp.limit(expr.subs(p, eps - sp.I * sgn * sigma), eps, 0, "+")
            continued[name] = sp.expand(sp.simplify(value))
        out[sgn] = (continued["log"], continued["one"], sigma)
    return out


@functools.lru_cache(maxsize=None)
def _kernel_branches(kind: str, l: int) -> tuple[sp.Expr, sp.Expr, sp.Symbol]:
    """Even and odd (in sign(s)) parts of ``(-i s)^2 int_0^oo e^{i s tau}[ln(c tau/2r0)+k] dtau``.

    Returns ``(even, odd_over_sigma, sigma)`` with the kernel equal to
    ``even(|s|) + s * odd_over_sigma(|s|)`` (using ``sign(s) |s| = s``).
    """
    constant = tail_constant(l, kind)
    branches = _fourier_transforms_from_laplace()
    kernels = {}
    sigma = branches[1][2]
    for sgn, (log_part, one_part, _) in branches.items():
        s_value = sgn * sigma
        integral = log_part + (sp.log(c / (2 * r0)) + constant) * one_part
        kernels[sgn] = sp.expand(sp.expand_log((-sp.I * s_value) ** 2 * integral, force=True))
    even = sp.expand((kernels[1] + kernels[-1]) / 2)
    odd_over_sigma = sp.expand((kernels[1] - kernels[-1]) / (2 * sigma))
    return even, odd_over_sigma, sigma


def tail_kernel(l: int, kind: str, s: Any) -> sp.Expr:
    """Return ``K(s) = (-i s)^2 int_0^oo dtau exp(i s tau) [ln(c tau/(2 r0)) + k_l]``.

    The tail of one harmonic ``A exp(-i s t)`` of a source moment is
    ``(2 G M/c^3) K(s) (-i s)^l A exp(-i s t)``; :func:`tail_factor` is ``1 + (2 G M/c^3) K``.

    Parameters
    ----------
    l:
        Multipole degree, ``>= 2``.
    kind:
        ``"mass"`` (constant kappa_l) or ``"current"`` (pi_l).
    s:
        Real non-zero angular frequency of the harmonic (exact; symbols must be real).

    Returns
    -------
    sympy.Expr
        ``K(s)``, with ``Abs(s)`` and ``log(Abs(s))`` where the sign of ``s`` matters;
        logarithms are expanded.

    **Conventions**: time dependence ``exp(-i s t)`` (``s = m omega`` for the (l, m) mode of a
    circular orbit, phase ``exp(-i m phi)``); integral Abel-regulated by ``exp(-eps tau)``.

    Example
    -------
    >>> import sympy as sp
    >>> w = sp.Symbol("w", positive=True)
    >>> sp.re(tail_kernel(2, "mass", w))
    pi*w/2

    References
    ----------
    Blanchet & Damour, Phys. Rev. D 46, 4304 (1992) (tail integrals); Blanchet, Living Rev.
    Relativ. 17, 2 (2014), sec. 3.
    """
    l = check_degree(l)
    kind = _check_kind(kind)
    s = _check_frequency(s)
    even, odd_over_sigma, sigma = _kernel_branches(kind, l)
    size = sp.Abs(s)
    value = even.subs(sigma, size) + s * odd_over_sigma.subs(sigma, size)
    return canonical_logs(value)


def hereditary_harmonic_integral(s: Any) -> sp.Expr:
    """Return ``int_0^oo dtau exp(i s tau)``, Abel-regulated: the memory integral of a harmonic.

    A hereditary integral without logarithm, ``int_0^oo dtau F(t - tau)``, of one harmonic
    ``F = A exp(-i s t)`` is ``A exp(-i s t)`` times this number (the oscillating part of the
    non-linear memory on a circular orbit).

    Parameters
    ----------
    s:
        Real non-zero angular frequency (exact; symbols must be real). ``s = 0`` is refused:
        the integral of a constant grows without bound (the non-oscillating memory).

    Returns
    -------
    sympy.Expr
        Derived as the tail factor is (see the module docstring): sympy's Laplace transform
        of 1 continued to ``p = eps - i s``, ``eps -> 0+``, on both signs of s; it works out
        to ``i/s``.

    **Conventions**: harmonics ``exp(-i s t)``; the source is switched on adiabatically in
    the remote past (regulator ``exp(-eps tau)``).

    Example
    -------
    >>> import sympy as sp
    >>> w = sp.Symbol("w", positive=True)
    >>> hereditary_harmonic_integral(2 * w), hereditary_harmonic_integral(-3)
    (I/(2*w), -I/3)

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 3 (the memory integral of U_ijkl at
    1.5PN); common practice (Abel regularisation of a Fourier integral).
    """
    s = _check_frequency(s)
    branches = _fourier_transforms_from_laplace()
    sigma = branches[1][2]
    positive = branches[1][1]
    negative = branches[-1][1]
    # the two branches are i/sigma and -i/sigma: one odd function s * odd(|s|)
    odd_over_sigma = sp.expand((positive - negative) / (2 * sigma))
    even = sp.expand((positive + negative) / 2)
    size = sp.Abs(s)
    return sp.simplify(even.subs(sigma, size) + s * odd_over_sigma.subs(sigma, size))


@functools.lru_cache(maxsize=None)
def _log_moment_of_gamma(power: int) -> tuple[sp.Expr, sp.Symbol]:
    """``d^power/dz^power [Gamma(z) p^(-z)]`` at z = 1, written with L = ln p (times p)."""
    z = sp.Symbol("z", positive=True)
    big_l = sp.Symbol("L_p")
    # Gamma(z) p^(-z) = Gamma(z) exp(-z L); multiply by p = exp(L) to strip the 1/p
    expression = sp.gamma(z) * sp.exp(-(z - 1) * big_l)
    value = sp.diff(expression, z, power).subs(z, 1)
    return sp.expand(sp.simplify(value.rewrite(sp.polygamma))), big_l


def hereditary_log_integral(power: int, s: Any) -> sp.Expr:
    """Return ``int_0^oo dtau exp(i s tau) ln(tau)^power``, Abel-regulated, for any ``power >= 0``.

    The hereditary kernels of every order in G M: the leading tail needs powers 0 and 1, the
    tails of tails (cubic, G^2 M^2) the power 2, and so on.

    Parameters
    ----------
    power:
        Non-negative int.
    s:
        Real non-zero angular frequency (exact; symbols must be real).

    Returns
    -------
    sympy.Expr
        From ``int_0^oo exp(-p tau) tau^(z-1) dtau = Gamma(z) p^(-z)`` (``Re p > 0``),
        differentiated ``power`` times in z at z = 1 (derivatives of Gamma at 1: Euler's
        constant, zeta values), continued to ``p = eps - i s``, ``eps -> 0+``: ``1/p = i/s``,
        ``ln p = ln|s| - i (pi/2) sign(s)``.

    **Conventions**: harmonics ``exp(-i s t)``; regulator ``exp(-eps tau)`` (the source is
    switched on adiabatically in the remote past), as :func:`hereditary_harmonic_integral`.

    Example
    -------
    >>> import sympy as sp
    >>> w = sp.Symbol("w", positive=True)
    >>> hereditary_log_integral(0, w)
    I/w
    >>> sp.expand(hereditary_log_integral(1, w) - (-sp.I * (sp.EulerGamma + sp.log(w)) - sp.pi / 2) / w)
    0

    References
    ----------
    Common practice (Laplace transform of tau^(z-1) and its z-derivatives, Abel-continued to
    the imaginary axis); Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 3 (tails and tails of
    tails as hereditary integrals with powers of logarithms).
    """
    if isinstance(power, bool) or not isinstance(power, int) or power < 0:
        raise ValueError(f"power must be a non-negative int, got {power!r}")
    s = _check_frequency(s)
    value, big_l = _log_moment_of_gamma(power)
    log_p = sp.log(sp.Abs(s)) - sp.I * sp.pi * sp.sign(s) / 2
    return sp.expand(value.subs(big_l, log_p) * sp.I / s)


def tail_factor(l: int, kind: str, s: Any, *, adm_mass: Any = M_adm) -> sp.Expr:
    """Return the factor by which the tail multiplies one harmonic of a radiative moment.

    If the source moment contains ``A exp(-i s t)``, the radiative moment contains
    ``tail_factor(l, kind, s) * (-i s)^l A exp(-i s t)`` at this order.

    Parameters
    ----------
    l:
        Multipole degree, ``>= 2``.
    kind:
        ``"mass"`` (U_L from I_L, constant kappa_l) or ``"current"`` (V_L from J_L, pi_l).
    s:
        Real non-zero angular frequency (exact; ``k * omega`` for harmonic k of a circular
        orbit). ``s = 0`` is refused: a constant has no time derivative and no tail.
    adm_mass:
        The mass in the tail prefactor, default the ADM mass symbol ``M``.

    Returns
    -------
    sympy.Expr
        ``1 + (2 G M/c^3) K(s)`` with K from :func:`tail_kernel`; it works out to
        ``1 + (2 G M/c^3) [pi |s|/2 + i s (ln(2 |s| r0/c) + EulerGamma - k_l)]`` (not typed
        in: derived, see the module docstring).

    **Conventions**: harmonics ``exp(-i s t)``; ``tail_factor(l, kind, -s)`` is the complex
    conjugate of ``tail_factor(l, kind, s)`` (real moments). Exact in G; only the leading
    tail (first order in G M/c^3) is included.

    Example
    -------
    >>> import sympy as sp
    >>> w = sp.Symbol("w", positive=True)
    >>> from stfalgebra.symbols import G, M_adm, c
    >>> factor = tail_factor(2, "mass", 2 * w)
    >>> sp.re(factor)
    2*pi*G*M*w/c**3 + 1
    >>> sp.logcombine(sp.expand(sp.im(factor) * c**3 / (4 * G * M_adm * w)), force=True)
    log(4*r0*w/c) - 11/12 + EulerGamma

    References
    ----------
    Blanchet & Damour, Phys. Rev. D 46, 4304 (1992); Blanchet, Living Rev. Relativ. 17, 2
    (2014), sec. 3 (tails of the radiative moments) and sec. 9 (their effect on the modes).
    """
    mass = sp.sympify(adm_mass)
    return sp.expand(1 + 2 * G * mass / c**3 * tail_kernel(l, kind, s))


# ----------------------------------------------------------------------------- the object
def _as_integrand_lambda(integrand: Any, time: Any) -> tuple[sp.Lambda, sp.Expr]:
    """Canonical (Lambda over the fixed retarded variable, evaluation time) of an integrand."""
    if isinstance(integrand, sp.Lambda):
        if len(integrand.variables) != 1:
            raise ValueError(f"integrand Lambda must take one argument (time), got {integrand}")
        at = sp.sympify(time)
        body = integrand.expr.xreplace({integrand.variables[0]: _RETARDED})
        return sp.Lambda(_RETARDED, body), at
    if not isinstance(time, sp.Symbol):
        raise TypeError(f"time must be a sympy Symbol when the integrand is given as an "
                        f"expression or label, got {time!r}")
    if isinstance(integrand, str):
        if not integrand.isidentifier():
            raise ValueError(f"integrand label must be an identifier, got {integrand!r}")
        body = sp.Function(integrand, real=True)(_RETARDED)
        return sp.Lambda(_RETARDED, body), time
    if isinstance(integrand, (bool, float)) or not isinstance(integrand, (int, sp.Expr)):
        raise TypeError(f"integrand must be a label (str) or a sympy expression, got {integrand!r}")
    expr = sp.sympify(integrand)
    if expr.has(sp.Float):
        raise TypeError(f"integrand must be exact (no floats), got {expr}")
    return sp.Lambda(_RETARDED, expr.xreplace({time: _RETARDED})), time


class TailIntegral(sp.Expr):
    """The bare hereditary tail integral of a source moment, kept unevaluated.

    ``TailIntegral(l, kind, F)`` stands for

        int_0^oo dtau F^(l+2)(t - tau) [ln(c tau/(2 r0)) + k_l]

    with ``k_l`` = kappa_l (kind ``"mass"``) or pi_l (kind ``"current"``). The tail part of the
    radiative moment is ``(2 G M/c^3) TailIntegral(...)`` (:func:`tail_term`), so the PN order
    stays visible as a power of c outside the object.

    Parameters
    ----------
    l:
        Multipole degree, ``>= 2``.
    kind:
        ``"mass"`` or ``"current"``.
    integrand:
        The source moment (or a component or projection of it) as a function of time: a label
        (str, becomes an undefined real function of time), a sympy expression in ``time``, or
        a one-argument ``sympy.Lambda``.
    time:
        The time symbol of an expression or label integrand (default ``t``); for a ``Lambda``
        integrand, the time at which the integral is evaluated.

    Returns
    -------
    TailIntegral
        A sympy expression: it adds, multiplies, substitutes (time included) and differentiates
        (``d/dt`` acts on the integrand) like any other; an integrand free of time gives 0.

    **Conventions**: the source is stationary in the remote past (equivalently the integral is
    Abel-regulated by ``exp(-eps tau)``); that fixes ``d/dc`` and ``d/dr0`` of the object
    through ``int_0^oo F^(l+2)(t - tau) dtau = F^(l+1)(t)``. :meth:`evaluate_harmonics` gives
    the closed form for integrands that are sums of ``A exp(-i s t)``, s real.

    Example
    -------
    >>> import sympy as sp
    >>> tail = TailIntegral(2, "mass", "I_xx")
    >>> print(tail)
    TailIntegral(2, mass, I_xx(t))
    >>> print(tail.formula())
    int_0^oo dtau I_xx^(4)(t - tau) [log(c*tau/(2*r0)) + 11/12]
    >>> sp.diff(tail, sp.Symbol("t", real=True))
    TailIntegral(2, mass, Derivative(I_xx(t), t))

    References
    ----------
    Blanchet & Damour, Phys. Rev. D 46, 4304 (1992); Blanchet, Living Rev. Relativ. 17, 2
    (2014), sec. 3.
    """

    is_commutative = True

    def __new__(cls, l: Any, kind: Any, integrand: Any, time: Any = t) -> sp.Expr:
        degree = check_degree(l)
        kind_name = _check_kind(kind)
        body, at = _as_integrand_lambda(integrand, time)
        if not body.expr.has(_RETARDED):
            return sp.S.Zero
        return sp.Expr.__new__(cls, sp.Integer(degree), Str(kind_name), body, at)

    # -- accessors ----------------------------------------------------------------------
    @property
    def degree(self) -> int:
        """The multipole degree l."""
        return int(self.args[0])

    @property
    def kind(self) -> str:
        """``"mass"`` or ``"current"``."""
        return self.args[1].name

    @property
    def integrand(self) -> sp.Lambda:
        """The source moment as a one-argument Lambda of time."""
        return self.args[2]

    @property
    def at(self) -> sp.Expr:
        """The time at which the integral is evaluated."""
        return self.args[3]

    @property
    def constant(self) -> sp.Rational:
        """kappa_l or pi_l."""
        return tail_constant(self.degree, self.kind)

    @property
    def free_symbols(self) -> set[sp.Basic]:
        return self.integrand.free_symbols | self.at.free_symbols | {c, r0}

    def _source_at(self, time: sp.Expr) -> sp.Expr:
        return self.integrand.expr.xreplace({_RETARDED: time})

    def _source_derivative_at(self, order: int, time: sp.Expr) -> sp.Expr:
        return sp.diff(self.integrand.expr, _RETARDED, order).subs(_RETARDED, time)

    def _with_body(self, body: sp.Expr) -> sp.Expr:
        return TailIntegral(self.degree, self.kind, sp.Lambda(_RETARDED, body), self.at)

    # -- sympy hooks --------------------------------------------------------------------
    def _eval_is_extended_real(self) -> bool | None:
        if self.integrand.expr.is_extended_real and self.at.is_extended_real:
            return True
        return None

    def _eval_derivative(self, symbol: sp.Symbol) -> sp.Expr:
        body = self.integrand.expr
        result = sp.S.Zero
        if body.has(symbol):
            result += self._with_body(sp.diff(body, symbol))
        at_rate = sp.diff(self.at, symbol)
        if at_rate != 0:
            result += at_rate * self._with_body(sp.diff(body, _RETARDED))
        # Only the logarithm ln(c tau/(2 r0)) depends on c and r0; with a past-stationary
        # source int_0^oo F^(l+2)(t - tau) dtau = F^(l+1)(t).
        if symbol == c:
            result += self._source_derivative_at(self.degree + 1, self.at) / c
        elif symbol == r0:
            result -= self._source_derivative_at(self.degree + 1, self.at) / r0
        return result

    def _eval_conjugate(self) -> sp.Expr | None:
        if self.at.is_extended_real:
            return self._with_body(sp.conjugate(self.integrand.expr))
        return None

    def _sympystr(self, printer: Any) -> str:
        head = f"TailIntegral({self.degree}, {self.kind}, "
        if isinstance(self.at, sp.Symbol) and self.at not in self.integrand.free_symbols:
            return head + f"{printer._print(self._source_at(self.at))})"
        shown = self.integrand.expr.xreplace({_RETARDED: sp.Symbol("u")})
        return head + f"Lambda(u, {printer._print(shown)}), {printer._print(self.at)})"

    def _latex(self, printer: Any) -> str:
        order = self.degree + 2
        tau_latex = r"\tau"
        retarded = sp.latex(self.at - sp.Symbol("tau"))
        body = self.integrand.expr
        if isinstance(body, sp.core.function.AppliedUndef) and body.args == (_RETARDED,):
            name = printer._print(sp.Symbol(body.func.__name__))
            source = rf"{name}^{{({order})}}\left({retarded}\right)"
        else:
            shown = printer._print(body.xreplace({_RETARDED: sp.Symbol("u")}))
            source = (rf"\left.\frac{{d^{{{order}}}}}{{d u^{{{order}}}}}\left[{shown}\right]"
                      rf"\right|_{{u = {retarded}}}")
        constant = printer._print(self.constant)
        return (rf"\int_{{0}}^{{\infty}} d{tau_latex}\, {source} "
                rf"\left[\ln\left(\frac{{c {tau_latex}}}{{2 r_{{0}}}}\right) + {constant}\right]")

    # -- the formula --------------------------------------------------------------------
    def formula(self) -> str:
        """The integral written out in plain text."""
        order = self.degree + 2
        body = self.integrand.expr
        retarded = sp.sstr(self.at - sp.Symbol("tau"))
        if isinstance(body, sp.core.function.AppliedUndef) and body.args == (_RETARDED,):
            source = f"{body.func.__name__}^({order})({retarded})"
        else:
            shown = sp.sstr(body.xreplace({_RETARDED: sp.Symbol("u")}))
            source = f"[d^{order}/du^{order} ({shown})]_(u = {retarded})"
        return f"int_0^oo dtau {source} [log(c*tau/(2*r0)) + {self.constant}]"

    def as_integral(self) -> sp.Integral:
        """The explicit (unevaluated) sympy Integral over tau from 0 to oo."""
        source = self._source_derivative_at(self.degree + 2, self.at - _TAU)
        return sp.Integral(source * (sp.log(c * _TAU / (2 * r0)) + self.constant), (_TAU, 0, sp.oo))

    def evaluate_harmonics(self) -> sp.Expr:
        """Closed form for an integrand that is a finite sum of ``A_k exp(-i s_k t)``.

        Trigonometric functions of ``a t + b`` are rewritten as exponentials first. Each
        harmonic with real non-zero ``s_k`` gives ``K(s_k) (-i s_k)^l A_k exp(-i s_k t)``
        (:func:`tail_kernel`); a constant gives 0.

        Raises
        ------
        ValueError
            If a term is not of that form (the tail of a general signal stays unevaluated).
        """
        expanded = sp.expand(sp.powsimp(sp.expand(self.integrand.expr.rewrite(sp.exp))))
        total = sp.S.Zero
        for term in sp.Add.make_args(expanded):
            amplitude, dependent = term.as_independent(_RETARDED, as_Add=False)
            if dependent == 1:
                continue
            if not isinstance(dependent, sp.exp):
                raise ValueError(f"integrand term {term} is not a harmonic A*exp(-I*s*t)")
            exponent = sp.expand(dependent.exp)
            rate = exponent.coeff(_RETARDED)
            offset = sp.expand(exponent - rate * _RETARDED)
            if offset.has(_RETARDED):
                raise ValueError(f"integrand term {term} is not a harmonic A*exp(-I*s*t)")
            s = sp.expand(sp.I * rate)
            if s.is_extended_real is not True:
                raise ValueError(f"integrand term {term} has a frequency {s} not known to be real")
            kernel = tail_kernel(self.degree, self.kind, s)
            total += kernel * (-sp.I * s) ** self.degree * amplitude * sp.exp(offset) \
                * sp.exp(-sp.I * s * self.at)
        return total


def tail_term(l: int, kind: str, integrand: Any, time: Any = t, *,
              adm_mass: Any = M_adm) -> sp.Expr:
    """Return the tail part of a radiative moment, ``(2 G M/c^3) TailIntegral(l, kind, ...)``.

    Parameters
    ----------
    l, kind, integrand, time:
        As for :class:`TailIntegral`.
    adm_mass:
        The mass in the prefactor, default the ADM mass symbol ``M``.

    Returns
    -------
    sympy.Expr
        The product; add it to ``d^l I_L/dt^l`` (kind ``"mass"``) or ``d^l J_L/dt^l``.

    **Conventions**: as :class:`TailIntegral`; G and c explicit.

    Example
    -------
    >>> print(tail_term(2, "mass", "I_xx"))
    2*G*M*TailIntegral(2, mass, I_xx(t))/c**3

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 3 (the radiative moments at 1.5PN).
    """
    return 2 * G * sp.sympify(adm_mass) / c**3 * TailIntegral(l, kind, integrand, time)
