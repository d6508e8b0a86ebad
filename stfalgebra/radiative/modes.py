"""The mode assembler: h_lm of a non-spinning compact binary, derived from its source moments.

Pipeline for a mode (l, m) of a planar orbit:

1. the source moment of rank l (mass I_L for l + m even, current J_L for l + m odd) from
   :mod:`stfalgebra.moments` (Newtonian or 1PN), as a sum of STF products of x, v, ell;
2. its spinor channel (p, q, c) with p - q = m (:func:`~stfalgebra.radiative.projection.mode_channel`),
   differentiated l times along the orbit: each time d/dt - i m phidot
   (:mod:`stfalgebra.radiative.radiative_moments`); on a circular orbit this is (-i m omega)^l;
3. the projection on alpha_L^lm and the normalisation of ``../shared/conventions.md``:

       h_lm = -(G/(sqrt(2) R c^(l+2))) [U_lm - (i/c) V_lm],
       U_lm = (4/l!) sqrt((l+1)(l+2)/(2l(l-1))) alpha_L^lm U_L,
       V_lm = -(8/l!) sqrt(l(l+2)/(2(l+1)(l-1))) alpha_L^lm V_L

   (Kidder, Phys. Rev. D 77, 044016 (2008); Blanchet, Living Rev. Relativ. 17, 2 (2014));
4. the output normalisation: circular orbits
   h_lm = (2 G m nu x/(R c^2)) sqrt(16 pi/5) Hhat_lm exp(-i m psi),
   general orbits h_lm = (4 G m nu/(R c^4)) sqrt(pi/5) Hhat_lm exp(-i m phi) with G = 1 inside Hhat.

**Conventions.** Polarisation triad P = -e_Phi, Q = e_Theta (``sign_convention="review"``,
which gives Hhat_22 = 1 + O(x)); ``sign_convention="theta-phi"`` (P = e_Theta, Q = e_Phi)
flips the sign of every h_lm. PN orders: ``pn`` is the absolute order (circular: every term
through x^pn; general: through (1/c)^(2 pn) relative to the Newtonian h_22), ``pn_relative``
the number of PN orders kept beyond the mode's own leading term.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from fractions import Fraction
from functools import lru_cache
from math import factorial

import sympy as sp

from ..binary.circular import circular_gamma
from ..binary.masses import reduce_mass_difference
from ..errors import OrderBeyondInputsError, RefusedModeError
from ..pnseries import PNSeries
from ..symbols import G, c, m as mass, nu, omega, r, x
from .phase import phi_from_psi_series
from .projection import alpha_on_spinor_basis, mode_channel, mode_kind
from .radiative_moments import radiative_channel, radiative_channel_circular, radiative_accuracy

__all__ = [
    "ModeResult", "derive_mode", "derive_modes", "leading_order", "ORBITS", "SIGN_CONVENTIONS",
    "parse_order",
]

ORBITS = ("circular", "general")
SIGN_CONVENTIONS = {
    "review": (1, "review: polarisation triad P = -e_Phi, Q = e_Theta (Hhat_22 = +1 + O(x))"),
    "theta-phi": (-1, "theta-phi: polarisation triad P = e_Theta, Q = e_Phi (every h_lm has the opposite sign)"),
}
PHASES = ("psi", "phi")
INSTANTANEOUS_ONLY = ("instantaneous part only: the non-linear memory contribution to m = 0 "
                      "modes is not computed")

_EPS_X = sp.Symbol("eps_x", positive=True)     # sqrt(x)
_EPS_C = sp.Symbol("eps", positive=True)       # 1/c
_G_REL = sp.Symbol("g_rel", positive=True)     # gamma/x

NORMALISATIONS = {
    "circular": ("h_lm = (2 G m nu x/(R c^2)) sqrt(16 pi/5) Hhat_lm exp(-i m psi)",
                 "2*G*m*nu*x*sqrt(16*pi/5)/(R*c**2)"),
    "general": ("h_lm = (4 G m nu/(R c^4)) sqrt(pi/5) Hhat_lm exp(-i m phi), with G = 1 inside Hhat_lm",
                "4*G*m*nu*sqrt(pi/5)/(R*c**4)"),
}


def _normalisation_expression(text: str) -> sp.Expr:
    """The normalisation prefactor in the project's own (real, positive) symbols."""
    from ..symbols import R

    return sp.sympify(text, locals={"G": G, "m": mass, "nu": nu, "x": x, "R": R, "c": c})


def parse_order(value, what: str = "PN order") -> sp.Rational:
    """A PN order given as int, Rational, string ("1.5", "3/2") or float that is an exact
    multiple of 1/2 and >= 0; anything else is a ValueError naming it."""
    if isinstance(value, bool):
        raise ValueError(f"{what} must be a non-negative multiple of 1/2, got {value!r}")
    try:
        if isinstance(value, str):
            frac = Fraction(value.strip())
        elif isinstance(value, float):
            frac = Fraction(value)
        elif isinstance(value, (int, Fraction)):
            frac = Fraction(value)
        elif isinstance(value, sp.Basic) and value.is_Rational:
            frac = Fraction(int(value.p), int(value.q))
        else:
            raise TypeError
    except (TypeError, ValueError, ZeroDivisionError):
        raise ValueError(f"{what} must be a non-negative multiple of 1/2, got {value!r}") from None
    if frac < 0 or (2 * frac).denominator != 1:
        raise ValueError(f"{what} must be a non-negative multiple of 1/2, got {value!r}")
    return sp.Rational(frac.numerator, frac.denominator)


def leading_order(l: int, m: int) -> sp.Rational:
    """PN order of the leading term of Hhat_lm relative to the Newtonian h_22:
    (l - 2)/2 for mass modes, (l - 1)/2 for current modes."""
    return sp.Rational(l - 2, 2) if mode_kind(l, m) == "mass" else sp.Rational(l - 1, 2)


@dataclass(frozen=True)
class ModeResult:
    """A derived (or refused) mode amplitude Hhat_lm with its conventions and provenance.

    ``hhat`` is a sympy expression (None when refused, with the reason in ``refused``).
    In a notebook it displays as LaTeX; ``provenance`` lists where each ingredient came from.
    """

    l: int
    m: int
    orbit: str
    pn: sp.Rational | None
    pn_relative: sp.Rational | None
    hhat: sp.Expr | None
    refused: str | None
    normalisation_words: str
    normalisation: sp.Expr
    phase: str
    sign_convention: str
    provenance: tuple[str, ...] = ()
    note: str | None = None
    series: PNSeries | None = field(default=None, compare=False, repr=False)

    @property
    def kind(self) -> str:
        return mode_kind(self.l, self.m)

    def to_json(self) -> dict:
        """The JSON object of the command-line contract (strings in sympy syntax)."""
        out = {"l": self.l, "m": self.m, "orbit": self.orbit}
        if self.pn is not None:
            out["pn"] = _order_json(self.pn)
        if self.pn_relative is not None:
            out["pn_relative"] = _order_json(self.pn_relative)
        out["kind"] = self.kind
        out["hhat"] = None if self.hhat is None else sp.sstr(self.hhat)
        if self.refused is not None:
            out["refused"] = self.refused
        if self.note is not None:
            out["note"] = self.note
        out["normalisation"] = {"words": self.normalisation_words, "sympy": sp.sstr(self.normalisation)}
        out["phase"] = self.phase
        out["sign_convention"] = SIGN_CONVENTIONS[self.sign_convention][1]
        out["provenance"] = list(self.provenance)
        return out

    def __str__(self) -> str:
        head = f"Hhat_{self.l},{self.m} ({self.orbit} orbit)"
        if self.hhat is None:
            return f"{head}: refused: {self.refused}"
        return f"{head} = {sp.sstr(self.hhat)}"

    def _repr_latex_(self) -> str:
        if self.hhat is None:
            return rf"$\hat H_{{{self.l}{self.m}}}$: refused ({self.refused})"
        return rf"$\hat H_{{{self.l},{self.m}}} = {sp.latex(self.hhat)}$"


def _order_json(value: sp.Rational):
    return int(value) if value.q == 1 else float(value)


def _validate_mode(l, m) -> None:
    for name, value in (("l", l), ("m", m)):
        if isinstance(value, bool) or not isinstance(value, int):
            raise TypeError(f"{name} must be an int, got {value!r}")
    if l < 2:
        raise ValueError(f"modes start at l = 2, got l = {l}")
    if abs(m) > l:
        raise ValueError(f"|m| must not exceed l: got l = {l}, m = {m}")


def derive_mode(l: int, m: int, *, orbit: str = "circular", pn=None, pn_relative=None,
                sign_convention: str = "review", phase: str = "psi") -> ModeResult:
    """Derive the mode amplitude Hhat_lm of a non-spinning binary.

    Parameters
    ----------
    l, m:
        The mode, l >= 2, |m| <= l.
    orbit:
        "circular" (Hhat in x, nu, delta) or "general" (Hhat in r, rdot, phidot, m, nu,
        delta, c with G = 1).
    pn, pn_relative:
        Exactly one of them: the absolute PN order (every term through x^pn, or (1/c)^(2 pn)
        relative to the Newtonian h_22) or the number of PN orders kept beyond this mode's
        leading term. Multiples of 1/2.
    sign_convention:
        "review" (default, Hhat_22 = +1) or "theta-phi" (every h_lm flipped).
    phase:
        "psi" (default) or "phi": the phase variable of the circular-orbit exponential.

    Returns
    -------
    ModeResult

    Raises
    ------
    ValueError, TypeError
        Bad l, m, orbit or order.
    RefusedModeError
        Circular m = 0 modes (non-linear memory, not computed).
    OrderBeyondInputsError
        An order beyond what the toolkit derives.

    Example
    -------
    >>> from stfalgebra.radiative.modes import derive_mode
    >>> derive_mode(2, 2, pn=1).hhat
    x*(55*nu - 107)/42 + 1

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), mode decomposition and normalisation;
    Kidder, Phys. Rev. D 77, 044016 (2008).
    """
    _validate_mode(l, m)
    if orbit not in ORBITS:
        raise ValueError(f"orbit must be one of {', '.join(ORBITS)}, got {orbit!r}")
    if sign_convention not in SIGN_CONVENTIONS:
        raise ValueError(f"sign_convention must be one of {', '.join(SIGN_CONVENTIONS)}, got {sign_convention!r}")
    if phase not in PHASES:
        raise ValueError(f"phase must be 'psi' or 'phi', got {phase!r}")
    if (pn is None) == (pn_relative is None):
        raise ValueError("give exactly one of pn (absolute order) and pn_relative")
    pn = None if pn is None else parse_order(pn, "pn")
    pn_relative = None if pn_relative is None else parse_order(pn_relative, "pn_relative")
    if orbit == "circular" and m == 0:
        raise RefusedModeError(
            f"circular-orbit m = 0 mode ({l},0): it comes from the non-linear memory, "
            f"which the toolkit does not compute (the instantaneous moments give zero)")
    n0 = leading_order(l, m)
    through = pn if pn is not None else n0 + pn_relative
    relative = through - n0
    words, norm = NORMALISATIONS[orbit]
    common = dict(l=l, m=m, orbit=orbit, pn=pn, pn_relative=pn_relative,
                  normalisation_words=words, normalisation=_normalisation_expression(norm),
                  phase=phase if orbit == "circular" else "phi", sign_convention=sign_convention)
    if relative < 0:
        return ModeResult(hhat=sp.Integer(0), refused=None,
                          provenance=(f"leading term of Hhat_{l}{m} is at order {n0}, beyond {through}",),
                          **common)
    series, provenance = _mode_series(l, m, orbit, relative, sign_convention, common["phase"])
    hhat = _series_expression(series.truncate(through), orbit)
    note = INSTANTANEOUS_ONLY if m == 0 else None
    return ModeResult(hhat=hhat, refused=None, provenance=provenance, series=series, note=note,
                      **common)


def derive_modes(lmax: int, *, orbit: str = "circular", pn=None, pn_relative=None,
                 sign_convention: str = "review", phase: str = "psi") -> list[ModeResult]:
    """Every mode 2 <= l <= lmax, -l <= m <= l; refused modes are kept with their reason.

    Raises OrderBeyondInputsError when no mode at all can be served at the requested order.
    """
    if isinstance(lmax, bool) or not isinstance(lmax, int):
        raise TypeError(f"lmax must be an int, got {lmax!r}")
    if lmax < 2:
        raise ValueError(f"lmax must be >= 2, got {lmax}")
    results = []
    beyond = []
    for l in range(2, lmax + 1):
        for m in range(l, -l - 1, -1):
            try:
                results.append(derive_mode(l, m, orbit=orbit, pn=pn, pn_relative=pn_relative,
                                           sign_convention=sign_convention, phase=phase))
            except (RefusedModeError, OrderBeyondInputsError) as exc:
                if isinstance(exc, OrderBeyondInputsError):
                    beyond.append(str(exc))
                words, norm = NORMALISATIONS[orbit]
                results.append(ModeResult(
                    l=l, m=m, orbit=orbit,
                    pn=None if pn is None else parse_order(pn, "pn"),
                    pn_relative=None if pn_relative is None else parse_order(pn_relative, "pn_relative"),
                    hhat=None, refused=str(exc), normalisation_words=words,
                    normalisation=_normalisation_expression(norm), phase=phase if orbit == "circular" else "phi",
                    sign_convention=sign_convention))
    if beyond and all(res.hhat is None for res in results):
        raise OrderBeyondInputsError(beyond[0])
    return results


# ----------------------------------------------------------------------------- internals
def _mass_current_prefactor(l: int, m: int) -> sp.Expr:
    """alpha-projection and normalisation constants that turn the radiative channel into
    h_lm exp(i m phi) R c^(l+2)/G (mass) or R c^(l+3)/G (current)."""
    p, q, cc = mode_channel(l, m)
    A = alpha_on_spinor_basis(l, m, p, q, cc)
    if cc == 0:
        norm_u = sp.Rational(4, factorial(l)) * sp.sqrt(sp.Rational((l + 1) * (l + 2), 2 * l * (l - 1)))
        return -norm_u * A / sp.sqrt(2)
    norm_v = -sp.Rational(8, factorial(l)) * sp.sqrt(sp.Rational(l * (l + 2), 2 * (l + 1) * (l - 1)))
    return -(-sp.I) * norm_v * A / sp.sqrt(2)


@lru_cache(maxsize=None)
def _mode_series(l: int, m: int, orbit: str, relative: sp.Rational, sign_convention: str,
                 phase: str = "psi"):
    sign = SIGN_CONVENTIONS[sign_convention][0]
    n0 = leading_order(l, m)
    kind = mode_kind(l, m)
    accuracy = radiative_accuracy(l, m, relative, orbit)   # raises beyond the inputs
    pref = sign * _mass_current_prefactor(l, m)
    # h e^{i m phi} = (G/(R c^(l+2))) pref * U  (mass)  or (G/(R c^(l+3))) pref * V (current)
    if orbit == "general":
        channel = radiative_channel(l, m, accuracy.moment_order)
        # divide by (4 G m nu/(R c^4)) sqrt(pi/5): Hhat = pref U c^(2-l)/(4 m nu sqrt(pi/5))
        scale = pref / (4 * mass * nu * sp.sqrt(sp.pi / 5))
        series = (channel * scale).shift(n0).map_coefficients(lambda e: _canonical(e.subs(G, 1)))
        known = min(series.known_through, n0 + accuracy.relative_known)
        series = series.truncate(known)
    else:
        # the channel in psi is free of r0 and ln(omega); phi is reached in x below
        channel = radiative_channel_circular(l, m, accuracy, "psi")
        # divide by (2 G m nu x/(R c^2)) sqrt(16 pi/5)
        extra_c = 0 if kind == "mass" else 1
        # omega = c^3 x^(3/2)/(G m), r = G m/(c^2 x g), g = gamma/x, written with eps_x = sqrt(x)
        # so that every power is an integer power and expansion alone cancels c and G.
        on_x = {omega: c**3 * _EPS_X**3 / (G * mass), r: G * mass / (c**2 * _EPS_X**2 * _G_REL)}
        factor = pref / (c**(l + extra_c) * 2 * mass * nu * _EPS_X**2 * sp.sqrt(16 * sp.pi / 5))
        expr = sp.expand(sp.Add(*[
            channel.coefficient(order).xreplace(on_x) * c**(-2 * order) for order in channel.orders
        ]) * factor)
        if expr.has(c) or expr.has(G):
            raise AssertionError(f"circular Hhat_{l}{m} still depends on c or G: {expr}")
        known = n0 + accuracy.relative_known
        series = PNSeries.from_expression(expr, _EPS_X, known)
        series = series.substitute(_G_REL, _relative_gamma(accuracy.moment_order), _EPS_X)
        series = series.map_coefficients(_canonical)
        if phase == "phi" and accuracy.tails:
            series = (series * phi_from_psi_series(m)).map_coefficients(_canonical)
    provenance = accuracy.provenance
    return series, provenance


@lru_cache(maxsize=None)
def _relative_gamma(order: int) -> PNSeries:
    """gamma/x as a PN series in sqrt(x) (orders 0, 1, ...)."""
    return circular_gamma(order).shift(-1)


def _canonical(expr: sp.Expr) -> sp.Expr:
    return reduce_mass_difference(sp.expand(expr))


def _series_expression(series: PNSeries, orbit: str) -> sp.Expr:
    value = 1 / c if orbit == "general" else sp.sqrt(x)
    terms = []
    for order in series.orders:
        coeff = sp.factor_terms(series.coefficient(order))
        terms.append(coeff * (value**(2 * order)))
    return sp.Add(*terms)
