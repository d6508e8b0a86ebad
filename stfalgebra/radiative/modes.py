"""The mode assembler: h_lm of a non-spinning compact binary, derived from its source moments.

Pipeline for a mode (l, m) of a planar orbit:

1. the table of contributions (:mod:`stfalgebra.radiative.contributions`) chooses what the
   radiative moment of rank l (U_L for l + m even, V_L for l + m odd) needs through the
   requested relative order, or refuses and names what is missing;
2. each chosen row's evaluator gives its part on the spinor channel (p, q, c) of the mode
   (:mod:`stfalgebra.radiative.radiative_moments`), in the exact engine;
3. the projection on alpha_L^lm and the normalisation of ``../shared/conventions.md``:

       h_lm = -(G/(sqrt(2) R c^(l+2))) [U_lm - (i/c) V_lm],
       U_lm = (4/l!) sqrt((l+1)(l+2)/(2l(l-1))) alpha_L^lm U_L,
       V_lm = -(8/l!) sqrt(l(l+2)/(2(l+1)(l-1))) alpha_L^lm V_L

   (Kidder, Phys. Rev. D 77, 044016 (2008); Blanchet, Living Rev. Relativ. 17, 2 (2014));
4. the output normalisation: circular orbits
   h_lm = (2 G m nu x/(R c^2)) sqrt(16 pi/5) Hhat_lm exp(-i m psi),
   general orbits h_lm = (4 G m nu/(R c^4)) sqrt(pi/5) Hhat_lm exp(-i m phi) with G = 1 inside Hhat.

A result is one exact surd constant (:class:`~stfalgebra.exact.SurdConstant`) times a PN series
with engine coefficients; sympy is needed only to ask for the sympy expression
(:attr:`ModeResult.hhat`). Modes with m < 0 come from m > 0 by the planar-orbit symmetry
Hhat_{l,-m} = (-1)^l conj(Hhat_lm) (``../shared/conventions.md``).

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
from typing import Any

from ..binary.circular_frequency import on_circular_orbit
from ..errors import OrderBeyondInputsError, RefusedModeError
from ..exact import ExactPolynomial, SurdConstant
from ..lazy_sympy import sp
from ..orders import PNOrder, parse_pn_order
from ..pnseries import PNSeries
from .contributions import (
    check_mode, circular_zero_mode_reason, leading_order, mode_kind, plan_radiative_moment, table_for_spins,
)
from .projection import alpha_on_spinor_basis_exact, mode_channel

__all__ = [
    "ModeResult", "derive_mode", "derive_modes", "leading_order", "ORBITS", "SIGN_CONVENTIONS",
    "PHASES", "NORMALISATIONS", "INSTANTANEOUS_ONLY",
]

ORBITS = ("circular", "general")
SIGN_CONVENTIONS = {
    "review": (1, "review: polarisation triad P = -e_Phi, Q = e_Theta (Hhat_22 = +1 + O(x))"),
    "theta-phi": (-1, "theta-phi: polarisation triad P = e_Theta, Q = e_Phi (every h_lm has the opposite sign)"),
}
PHASES = ("psi", "phi")
INSTANTANEOUS_ONLY = ("instantaneous part only: the non-linear memory contribution to m = 0 "
                      "modes is not computed")

#: words and sympy text of the normalisation of Hhat_lm, per orbit
NORMALISATIONS = {
    "circular": ("h_lm = (2 G m nu x/(R c^2)) sqrt(16 pi/5) Hhat_lm exp(-i m psi)",
                 "2*G*m*nu*x*sqrt(16*pi/5)/(R*c**2)"),
    "general": ("h_lm = (4 G m nu/(R c^4)) sqrt(pi/5) Hhat_lm exp(-i m phi), with G = 1 inside Hhat_lm",
                "4*G*m*nu*sqrt(pi/5)/(R*c**4)"),
}


def _sympy_locals() -> dict[str, Any]:
    from .. import symbols as S

    return {"G": S.G, "m": S.m, "nu": S.nu, "x": S.x, "R": S.R, "c": S.c, "delta": S.delta,
            "r": S.r, "rdot": S.rdot, "phidot": S.phidot, "r0": S.r0, "M": S.M_adm}


@dataclass(frozen=True)
class ModeResult:
    """A derived (or refused) mode amplitude Hhat_lm with its conventions and provenance.

    The amplitude is ``constant * sum_n series_n v^(2n)`` with ``v = sqrt(x)`` (circular) or
    ``1/c`` (general); :attr:`hhat` is that as a sympy expression (None when refused, with
    the reason in ``refused``), :meth:`hhat_text` as sympy-parseable text made without sympy.
    In a notebook it displays as LaTeX; ``provenance`` lists where each ingredient came from.
    """

    l: int
    m: int
    orbit: str
    pn: PNOrder | None
    pn_relative: PNOrder | None
    refused: str | None
    phase: str
    sign_convention: str
    provenance: tuple[str, ...] = ()
    note: str | None = None
    constant: SurdConstant | None = field(default=None, repr=False)
    series: PNSeries | None = field(default=None, compare=False, repr=False)
    spins: str | None = None

    @property
    def kind(self) -> str:
        return mode_kind(self.l, self.m)

    @property
    def normalisation_words(self) -> str:
        return NORMALISATIONS[self.orbit][0]

    @property
    def normalisation(self) -> Any:
        """The normalisation prefactor in the project's own (real, positive) symbols (sympy)."""
        return sp.sympify(NORMALISATIONS[self.orbit][1], locals=_sympy_locals())

    @property
    def hhat(self) -> Any:
        """Hhat_lm as a sympy expression (None when refused)."""
        if self.refused is not None:
            return None
        cached = self.__dict__.get("_hhat")
        if cached is None:
            from .. import symbols as S

            variable = sp.sqrt(S.x) if self.orbit == "circular" else 1 / S.c
            total = sp.Add(*[sp.sympify(value) * variable**order.twice for order, value in self.series.terms.items()])
            cached = self.constant.to_sympy() * total if self.constant is not None else total
            object.__setattr__(self, "_hhat", cached)
        return cached

    def hhat_text(self) -> str | None:
        """Hhat_lm as sympy-parseable text, printed by the engine (None when refused)."""
        if self.refused is not None:
            return None
        return format_amplitude(self.constant, self.series, self.orbit)

    def hhat_latex(self) -> str | None:
        """Hhat_lm in LaTeX, printed by the engine (None when refused)."""
        if self.refused is not None:
            return None
        return format_amplitude_latex(self.constant, self.series, self.orbit)

    def to_json(self) -> dict:
        """The JSON object of the command-line contract (expression strings parseable by sympy)."""
        out: dict[str, Any] = {"l": self.l, "m": self.m, "orbit": self.orbit}
        if self.pn is not None:
            out["pn"] = _order_json(self.pn)
        if self.pn_relative is not None:
            out["pn_relative"] = _order_json(self.pn_relative)
        out["kind"] = self.kind
        out["hhat"] = self.hhat_text()
        if self.refused is not None:
            out["refused"] = self.refused
        if self.note is not None:
            out["note"] = self.note
        out["normalisation"] = {"words": self.normalisation_words, "sympy": NORMALISATIONS[self.orbit][1]}
        out["phase"] = self.phase
        out["sign_convention"] = SIGN_CONVENTIONS[self.sign_convention][1]
        out["provenance"] = list(self.provenance)
        if self.spins is not None:
            out["spins"] = self.spins
        return out

    def __str__(self) -> str:
        head = f"Hhat_{self.l},{self.m} ({self.orbit} orbit)"
        if self.refused is not None:
            return f"{head}: refused: {self.refused}"
        return f"{head} = {self.hhat_text()}"

    def _repr_latex_(self) -> str:
        if self.refused is not None:
            return rf"$\hat H_{{{self.l}{self.m}}}$: refused ({self.refused})"
        return rf"$\hat H_{{{self.l},{self.m}}} = {sp.latex(self.hhat)}$"


def _order_json(value: PNOrder) -> int | float:
    return int(value) if value.denominator == 1 else float(value)


def _power_text(order: PNOrder, orbit: str) -> str:
    if orbit == "circular":
        if order == Fraction(1, 2):
            return "sqrt(x)"
        if order.denominator == 1:
            return "x" if order == 1 else f"x**{order.numerator}"
        return f"x**({order})"
    return f"c**(-{order.twice})"


def format_amplitude(constant: SurdConstant | None, series: PNSeries, orbit: str) -> str:
    """``constant * sum_n c_n v^(2n)`` as sympy-parseable text (v = sqrt(x) or 1/c); the
    constant's rational part is folded into the coefficients, its square root stays outside."""
    rational = constant.rational if constant is not None else Fraction(1)
    pieces = []
    for order, value in series.terms.items():
        if isinstance(value, ExactPolynomial):
            value = value * rational
            text = value.to_text()
            single = len(value) == 1
        else:
            value = sp.factor_terms(value * sp.Rational(rational.numerator, rational.denominator))
            text = sp.sstr(value)
            single = not isinstance(value, sp.Add)
        if order == 0:
            pieces.append(text)
        else:
            pieces.append(f"{text}*{_power_text(order, orbit)}" if single else f"({text})*{_power_text(order, orbit)}")
    body = " + ".join(pieces) if pieces else "0"
    body = body.replace("+ -", "- ")
    if constant is not None and constant.radicand != 1 and pieces:
        return f"sqrt({constant.radicand})*({body})"
    return body


def _latex_power(order: PNOrder, orbit: str) -> str:
    if orbit == "circular":
        if order == 1:
            return "x"
        return f"x^{{{order.numerator}}}" if order.denominator == 1 else f"x^{{{order.numerator}/{order.denominator}}}"
    return f"c^{{-{order.twice}}}"


def format_amplitude_latex(constant: SurdConstant | None, series: PNSeries, orbit: str) -> str:
    """LaTeX of ``constant * sum_n c_n v^(2n)`` (the rational part folded into the
    coefficients, the square root in front), made by the engine for engine coefficients."""
    rational = constant.rational if constant is not None else Fraction(1)
    pieces = []
    for order, value in series.terms.items():
        if isinstance(value, ExactPolynomial):
            value = value * rational
            text, single = value.to_latex(), len(value) == 1
        else:
            value = sp.factor_terms(value * sp.Rational(rational.numerator, rational.denominator))
            text, single = sp.latex(value), not isinstance(value, sp.Add)
        if order == 0:
            pieces.append(text)
        else:
            body = text if single else rf"\left({text}\right)"
            pieces.append(f"{body} {_latex_power(order, orbit)}")
    body = " + ".join(pieces) if pieces else "0"
    body = body.replace("+ -", "- ")
    if constant is not None and constant.radicand != 1 and pieces:
        return rf"\sqrt{{{constant.radicand}}} \left[{body}\right]"
    return body




def _validate_spins(spins: Any, orbit: str) -> None:
    table_for_spins(spins)


def _validate_options(orbit: str, sign_convention: str, phase: str) -> None:
    if orbit not in ORBITS:
        raise ValueError(f"orbit must be one of {', '.join(ORBITS)}, got {orbit!r}")
    if sign_convention not in SIGN_CONVENTIONS:
        raise ValueError(f"sign_convention must be one of {', '.join(SIGN_CONVENTIONS)}, got {sign_convention!r}")
    if phase not in PHASES:
        raise ValueError(f"phase must be 'psi' or 'phi', got {phase!r}")


def _orders(pn: Any, pn_relative: Any) -> tuple[PNOrder | None, PNOrder | None]:
    if (pn is None) == (pn_relative is None):
        raise ValueError("give exactly one of pn (absolute order) and pn_relative")
    return (None if pn is None else parse_pn_order(pn, "pn"),
            None if pn_relative is None else parse_pn_order(pn_relative, "pn_relative"))


def derive_mode(l: int, m: int, *, orbit: str = "circular", pn: Any = None, pn_relative: Any = None,
                sign_convention: str = "review", phase: str = "psi", spins: str | None = None) -> ModeResult:
    """Derive the mode amplitude Hhat_lm of a binary, without spins or with aligned spins.

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
        leading term. Multiples of 1/2 (ints, Fractions, PNOrder, or text such as "3/2").
    sign_convention:
        "review" (default, Hhat_22 = +1) or "theta-phi" (every h_lm flipped).
    phase:
        "psi" (default) or "phi": the phase variable of the circular-orbit exponential.
    spins:
        None (default: no spins) or "aligned": spins along the orbital angular momentum, with the
        dimensionless components chi1, chi2 as symbols (the orbit stays planar, circular or
        general; the leading spin-orbit terms, at relative 0.5PN in current modes and 1.5PN in
        mass modes; ``S_A = G m_A^2 chi_A/c``, conventions in
        :mod:`stfalgebra.binary.spin_variables`).

    Returns
    -------
    ModeResult

    Raises
    ------
    ValueError, TypeError
        Bad l, m, orbit or order.
    RefusedModeError
        Circular m = 0 modes (non-linear memory or quadratic interactions, not computed).
    OrderBeyondInputsError
        An order beyond what the table of contributions supports (the message names the
        missing contribution).

    Example
    -------
    >>> from stfalgebra.radiative.modes import derive_mode
    >>> print(derive_mode(2, 2, pn=1).hhat_text())
    1 + (-107/42 + 55*nu/42)*x

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), mode decomposition and normalisation;
    Kidder, Phys. Rev. D 77, 044016 (2008).
    """
    check_mode(l, m)
    _validate_options(orbit, sign_convention, phase)
    _validate_spins(spins, orbit)
    pn, pn_relative = _orders(pn, pn_relative)
    if orbit == "circular" and m == 0:
        raise RefusedModeError(circular_zero_mode_reason(l))
    n0 = leading_order(l, m)
    through = pn if pn is not None else n0 + pn_relative
    relative = through - n0
    common = dict(l=l, m=m, orbit=orbit, pn=pn, pn_relative=pn_relative,
                  phase=phase if orbit == "circular" else "phi", sign_convention=sign_convention, spins=spins)
    if relative < 0:
        return ModeResult(refused=None, constant=None, series=PNSeries._from_trusted({}, float("inf")),
                          provenance=(f"leading term of Hhat_{l}{m} is at order {n0}, beyond {through}",),
                          **common)
    constant, series, provenance = _mode_amplitude(l, m, orbit, relative, sign_convention, common["phase"], spins)
    note = INSTANTANEOUS_ONLY if m == 0 else None
    return ModeResult(refused=None, constant=constant, series=series.truncate(through), provenance=provenance,
                      note=note, **common)


def derive_modes(lmax: int, *, orbit: str = "circular", pn: Any = None, pn_relative: Any = None,
                 sign_convention: str = "review", phase: str = "psi", executor: Any = None,
                 spins: str | None = None) -> list[ModeResult]:
    """Every mode 2 <= l <= lmax, -l <= m <= l; refused modes are kept with their reason.

    Parameters
    ----------
    lmax:
        Highest l, ``2 <= lmax <= LMAX_BOUND``.
    orbit, pn, pn_relative, sign_convention, phase, spins:
        As for :func:`derive_mode`.
    executor:
        Optional :class:`concurrent.futures.Executor` (a process pool, or any executor with the
        same interface, e.g. a cluster scheduler's): each l is derived as one task. The result
        is identical to the serial one.

    Raises
    ------
    OrderBeyondInputsError
        No mode at all can be served at the requested order.

    Example
    -------
    >>> [str(res) for res in derive_modes(2, pn_relative=0)][:2]
    ['Hhat_2,2 (circular orbit) = 1', 'Hhat_2,1 (circular orbit) = I*delta/3*sqrt(x)']
    """
    from .contributions import LMAX_BOUND

    if isinstance(lmax, bool) or not isinstance(lmax, int):
        raise TypeError(f"lmax must be an int, got {lmax!r}")
    if not 2 <= lmax <= LMAX_BOUND:
        raise ValueError(f"lmax must be between 2 and {LMAX_BOUND}, got {lmax}")
    _validate_options(orbit, sign_convention, phase)
    _validate_spins(spins, orbit)
    orders = _orders(pn, pn_relative)
    task = dict(orbit=orbit, pn=orders[0], pn_relative=orders[1], sign_convention=sign_convention, phase=phase,
                spins=spins)
    ls = range(2, lmax + 1)
    if executor is None:
        per_l = [_modes_of_degree(l, task) for l in ls]
    else:
        per_l = list(executor.map(_modes_of_degree, ls, [task] * len(ls)))
    results = [res for group in per_l for res, _ in group]
    beyond = [message for group in per_l for _, message in group if message]
    if beyond and all(res.refused is not None for res in results):
        raise OrderBeyondInputsError(beyond[0])
    return results


def _modes_of_degree(l: int, task: dict) -> list[tuple[ModeResult, str | None]]:
    """The modes of one l, m = l ... -l (a unit of work for an executor)."""
    out = []
    for m in range(l, -l - 1, -1):
        try:
            out.append((derive_mode(l, m, **task), None))
        except (RefusedModeError, OrderBeyondInputsError) as exc:
            beyond = str(exc) if isinstance(exc, OrderBeyondInputsError) else None
            out.append((ModeResult(
                l=l, m=m, orbit=task["orbit"], pn=task["pn"], pn_relative=task["pn_relative"],
                refused=str(exc), phase=task["phase"] if task["orbit"] == "circular" else "phi",
                sign_convention=task["sign_convention"], spins=task.get("spins")), beyond))
    return out


# ----------------------------------------------------------------------------- internals
def _normalisation_constant(l: int, m: int, orbit: str, sign_convention: str) -> SurdConstant:
    """alpha-projection, mode and output normalisation constants (their sqrt(pi) cancel):
    Hhat = constant * (channel of U_L or i V_L)/(nu [m]) in the engine's units."""
    p, q, c = mode_channel(l, m)
    alpha = alpha_on_spinor_basis_exact(l, m, p, q, c)            # alpha/sqrt(pi)
    if c == 0:
        mode = SurdConstant(Fraction(-4, factorial(l)), Fraction((l + 1) * (l + 2), 2 * l * (l - 1)))
    else:   # the factor i of -(i/c) V_lm goes into the polynomial
        mode = SurdConstant(Fraction(-8, factorial(l)), Fraction(l * (l + 2), 2 * (l + 1) * (l - 1)))
    output = SurdConstant(Fraction(1, 8), 5) if orbit == "circular" else SurdConstant(Fraction(1, 4), 5)
    return alpha * mode * SurdConstant(1, Fraction(1, 2)) * output * SIGN_CONVENTIONS[sign_convention][0]


def _mode_amplitude(l: int, m: int, orbit: str, relative: PNOrder, sign_convention: str,
                    phase: str, spins: str | None = None) -> tuple[SurdConstant, PNSeries, tuple[str, ...]]:
    if m < 0:
        # planar orbits: Hhat_{l,-m} = (-1)^l conj(Hhat_lm) (every generator but I is real;
        # aligned spins keep the orbit planar)
        constant, series, provenance = _direct_amplitude(l, -m, orbit, relative, sign_convention, phase, spins)
        conjugated = series.map_coefficients(
            lambda v: v.conjugate() if isinstance(v, ExactPolynomial) else sp.conjugate(v))
        return constant * (-1) ** l, conjugated, provenance
    return _direct_amplitude(l, m, orbit, relative, sign_convention, phase, spins)


@lru_cache(maxsize=None)
def _direct_amplitude(l: int, m: int, orbit: str, relative: PNOrder, sign_convention: str,
                      phase: str, spins: str | None = None) -> tuple[SurdConstant, PNSeries, tuple[str, ...]]:
    kind = mode_kind(l, m)
    plan = plan_radiative_moment(kind, l, relative, orbit, m=m, table=table_for_spins(spins))
    channel = None
    for row in plan.rows:
        piece = row.evaluate(l, m, orbit=orbit)
        channel = piece if channel is None else channel + piece
    channel = channel.truncate(relative)
    if kind == "current":
        channel = channel * ExactPolynomial("I")
    n0 = leading_order(l, m)
    nu = ExactPolynomial("nu")
    if orbit == "circular":
        # G = m = c = 1: r = 1/(x g(x)), phidot = x^(3/2); then divide by x (normalisation)
        if spins is None:
            series = on_circular_orbit(channel, plan.input_order("equations of motion")).shift(-1)
        else:   # the circular orbit with the spin-orbit term of r(x)
            from ..binary.spin_circular import spinning_circular_reduction

            series = spinning_circular_reduction(channel)[0].shift(-1)
        series = series.map_coefficients(lambda v: v / nu)
    else:
        mass_nu = ExactPolynomial("m") * nu
        series = channel.map_coefficients(lambda v: v.substitute({"G": 1}) / mass_nu).shift(n0)
    series = series.truncate(n0 + relative)
    if phase == "phi" and any(row.family == "tail" for row in plan.rows):
        from .psi_phase import phi_from_psi_in_x

        series = (series * phi_from_psi_in_x(m)).truncate(n0 + relative)
    return _normalisation_constant(l, m, orbit, sign_convention), series, plan.provenance


def _direct_mode(l: int, m: int, **options: Any) -> ModeResult:
    """:func:`derive_mode` without the m < 0 symmetry (tests check the symmetry with it)."""
    result = derive_mode(l, abs(m), **options) if m >= 0 else None
    if result is not None:
        return result
    pn, pn_relative = _orders(options.get("pn"), options.get("pn_relative"))
    n0 = leading_order(l, m)
    through = pn if pn is not None else n0 + pn_relative
    orbit = options.get("orbit", "circular")
    sign = options.get("sign_convention", "review")
    phase = options.get("phase", "psi")
    spins = options.get("spins")
    constant, series, provenance = _direct_amplitude(l, m, orbit, through - n0, sign,
                                                     phase if orbit == "circular" else "phi", spins)
    return ModeResult(l=l, m=m, orbit=orbit, pn=pn, pn_relative=pn_relative, refused=None, spins=spins,
                      phase=phase if orbit == "circular" else "phi", sign_convention=sign,
                      provenance=provenance, constant=constant, series=series.truncate(through))
