"""The mode assembler: h_lm of a compact binary (without spins, or with spins aligned with the
orbital angular momentum), derived from its source moments.

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

**Conventions.** Polarisation triad P = -e_Phi, Q = e_Theta (``sign_convention="minus-phi-theta"``,
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
from ..conventions import DEPRECATED_SIGN_CONVENTIONS, SIGN_CONVENTIONS, resolve_sign_convention
from ..errors import OrderBeyondInputsError, RefusedModeError
from ..exact import ExactPolynomial, SurdConstant
from ..lazy_sympy import sp
from ..orders import PNOrder, parse_pn_order
from ..pnseries import PNSeries
from ..presentation import PresentedSeries, order_text, present_series
from .contributions import (
    check_mode, circular_zero_mode_reason, instantaneous_part, leading_order, memory_row, mode_kind,
    omitted_from_instantaneous_part, plan_radiative_moment, table_for_spins,
)
from .projection import alpha_on_spinor_basis_exact, mode_channel

__all__ = [
    "ModeResult", "derive_mode", "derive_modes", "leading_order", "ORBITS", "SIGN_CONVENTIONS",
    "DEPRECATED_SIGN_CONVENTIONS", "resolve_sign_convention", "PHASES", "NORMALISATIONS", "INSTANTANEOUS_ONLY",
    "INSTANTANEOUS_PART_ONLY",
    "format_amplitude", "format_amplitude_latex",
]

ORBITS = ("circular", "general")
PHASES = ("psi", "phi")
INSTANTANEOUS_ONLY = ("instantaneous part only: the non-linear memory contribution to m = 0 "
                      "modes is not computed")
#: the opening words of the note of a general-orbit mode asked for with ``instantaneous_only``
INSTANTANEOUS_PART_ONLY = "instantaneous part only (source moments along the orbit)"

#: words and sympy text of the normalisation of Hhat_lm, per orbit
NORMALISATIONS = {
    "circular": ("h_lm = (2 G m nu x/(R c^2)) sqrt(16 pi/5) Hhat_lm exp(-i m psi)",
                 "2*G*m*nu*x*sqrt(16*pi/5)/(R*c**2)"),
    "general": ("h_lm = (4 G m nu/(R c^4)) sqrt(pi/5) Hhat_lm exp(-i m phi), with G = 1 inside Hhat_lm",
                "4*G*m*nu*sqrt(pi/5)/(R*c**4)"),
}
#: the words of the circular normalisation when the modes are given in the orbital phase phi
CIRCULAR_PHI_WORDS = ("h_lm = (2 G m nu x/(R c^2)) sqrt(16 pi/5) Hhat_lm exp(-i m phi), phi the orbital phase; "
                      "Hhat_lm holds the tail's logarithm: Hhat_lm = Hhat_lm(psi) [1 + 3 i m x^(3/2) ln(x/x0) + ...], "
                      "x0 = (G m omega_0/c^3)^(2/3) the reference of psi = phi - 3 x^(3/2) ln(x/x0)")


def _sympy_locals() -> dict[str, Any]:
    from .. import symbols as S

    return {"G": S.G, "m": S.m, "nu": S.nu, "x": S.x, "R": S.R, "c": S.c, "delta": S.delta,
            "r": S.r, "rdot": S.rdot, "phidot": S.phidot, "r0": S.r0, "M": S.M_adm}


@dataclass(frozen=True)
class ModeResult:
    """A derived (or refused) mode amplitude Hhat_lm with its conventions and provenance.

    The amplitude is ``constant * sum_n series_n v^(2n)`` with ``v = sqrt(x)`` (circular) or
    ``1/c`` (general); :attr:`hhat` is that as a sympy expression (None when refused, with
    the reason in ``refused``). It is written the way it is printed everywhere (text, LaTeX,
    JSON, notebook) by :meth:`presentation`: a prefactor times a bracket of terms in increasing
    PN order (:mod:`stfalgebra.presentation`); :meth:`hhat_text` and :meth:`hhat_latex` give it
    without sympy. ``provenance`` lists where each ingredient came from, ``term_provenance``
    which of them each order of the series comes from.
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
    term_provenance: tuple[tuple[PNOrder, tuple[str, ...]], ...] = field(default=(), compare=False, repr=False)
    spins: str | None = None
    instantaneous_only: bool = False

    @property
    def kind(self) -> str:
        """"mass" or "current"; "memory" for the even-l, m = 0 modes of circular orbits (their
        DC memory, :mod:`stfalgebra.radiative.circular_memory`)."""
        if self.orbit == "circular" and self.m == 0 and self.l % 2 == 0:
            return "memory"
        return mode_kind(self.l, self.m)

    @property
    def normalisation_words(self) -> str:
        if self.orbit == "circular" and self.phase == "phi":
            return CIRCULAR_PHI_WORDS
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

    def presentation(self) -> PresentedSeries | None:
        """Hhat_lm as prefactor * [terms in increasing PN order] (None when refused)."""
        if self.refused is not None:
            return None
        cached = self.__dict__.get("_presentation")
        if cached is None:
            cached = present_series(self.series, constant=self.constant,
                                    variable="x" if self.orbit == "circular" else "1/c")
            object.__setattr__(self, "_presentation", cached)
        return cached

    def hhat_text(self) -> str | None:
        """Hhat_lm as sympy-parseable text, printed by the engine (None when refused)."""
        if self.refused is not None:
            return None
        return self.presentation().to_text()

    def hhat_latex(self) -> str | None:
        """Hhat_lm in LaTeX, printed by the engine (None when refused)."""
        if self.refused is not None:
            return None
        return self.presentation().to_latex()

    @property
    def label(self) -> str:
        return f"Hhat_{self.l},{self.m}"

    def notes(self) -> tuple[str, ...]:
        """Everything a reader must know beside the expression: the m = 0 note, and where the
        mode starts when the request stops below its leading term."""
        out = [self.note] if self.note else []
        if self.refused is None and self.series is not None and not self.series.terms:
            out.append(self.starts_at())
        return tuple(out)

    def starts_at(self) -> str:
        """Where the mode's series starts, e.g. 'Hhat_4,4 starts at x^1 (order 1)'."""
        n0 = leading_order(self.l, self.m)
        through = self.pn if self.pn is not None else n0 + self.pn_relative
        why = ""
        if self.m == 0 and self.orbit == "circular":
            # odd l (even l is refused): the source moments give nothing on the circle; the
            # instantaneous quadratic interactions of V_L start at relative 3/2
            n0 = n0 + PNOrder(3, 2)
            why = ", from the quadratic interactions of V_L"
            if self.spins is not None:
                # the next-to-leading spin-orbit terms of V_L enter at the same order (refused)
                why += "; its spin-orbit terms at that order are not derived"
        power = _order_power_words(n0, self.orbit)
        return (f"{self.label} starts at {power} (absolute order {n0}{why}): every term through order "
                f"{through} is zero")

    def to_json(self) -> dict:
        """The JSON object of the command-line contract (expression strings parseable by sympy;
        PN orders as exact strings such as "3/2")."""
        out: dict[str, Any] = {"l": self.l, "m": self.m, "orbit": self.orbit}
        if self.pn is not None:
            out["pn"] = order_text(self.pn)
        if self.pn_relative is not None:
            out["pn_relative"] = order_text(self.pn_relative)
        out["kind"] = self.kind
        out["hhat"] = self.hhat_text()
        if self.refused is not None:
            out["refused"] = self.refused
        notes = self.notes()
        if notes:
            out["note"] = "; ".join(notes)
        out["normalisation"] = {"words": self.normalisation_words, "sympy": NORMALISATIONS[self.orbit][1]}
        out["phase"] = self.phase
        out["sign_convention"] = SIGN_CONVENTIONS[self.sign_convention][1]
        out["provenance"] = list(self.provenance)
        presented = self.presentation()
        if presented is not None:
            form = presented.to_json()
            by_order = dict(self.term_provenance)
            out["prefactor"] = form["prefactor"]
            out["prefactor_latex"] = form["prefactor_latex"]
            out["leading_order"] = form["leading_order"]
            out["terms"] = form["terms"]
            for term, item in zip(presented.terms, out["terms"]):
                absolute = presented.leading_order + term.order
                item["provenance"] = list(by_order.get(absolute, ()))
        if self.spins is not None:
            out["spins"] = self.spins
        if self.instantaneous_only:
            out["instantaneous_only"] = True
        return out

    def __str__(self) -> str:
        head = f"{self.label} ({self.orbit} orbit)"
        if self.refused is not None:
            return f"{head}: refused: {self.refused}"
        text = f"{head} = {self.hhat_text()}"
        return text + "".join(f"\n  note: {note}" for note in self.notes())

    def __repr__(self) -> str:
        """The REPL's display: the printed form (``str``), not the fields."""
        return str(self)

    def _repr_latex_(self) -> str:
        name = rf"\hat{{H}}_{{{self.l},{self.m}}}"
        if self.refused is not None:
            return rf"${name}$: refused ({self.refused})"
        notes = "".join(rf" \quad \text{{({note})}}" for note in self.notes())
        return rf"${name} = {self.hhat_latex()}{notes}$"


def _order_power_words(order: PNOrder, orbit: str) -> str:
    if orbit == "circular":
        return f"x^{order}" if order.denominator == 1 else f"x^({order})"
    return "c^0" if order == 0 else f"c^-{order.twice}"


def _order_json(value: PNOrder) -> str:
    return order_text(value)


def _power_text(order: PNOrder, orbit: str) -> str:
    if orbit == "circular":
        if order == Fraction(1, 2):
            return "sqrt(x)"
        if order.denominator == 1:
            return "x" if order == 1 else f"x**{order.numerator}"
        return f"x**({order})"
    return f"c**(-{order.twice})"


def _all_exact(series: PNSeries) -> bool:
    return all(isinstance(value, ExactPolynomial) for value in series.terms.values())


def format_amplitude(constant: SurdConstant | None, series: PNSeries, orbit: str) -> str:
    """``constant * sum_n c_n v^(2n)`` as sympy-parseable text (v = sqrt(x) or 1/c), in the
    canonical form of :mod:`stfalgebra.presentation` (prefactor * [terms]) for engine
    coefficients; sympy coefficients (the eccentric averages) are printed by sympy."""
    if _all_exact(series):
        return present_series(series, constant=constant, variable="x" if orbit == "circular" else "1/c").to_text()
    rational = constant.rational if constant is not None else Fraction(1)
    pieces = []
    for order, value in series.terms.items():
        value = sp.factor_terms(sp.sympify(value) * sp.Rational(rational.numerator, rational.denominator))
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
    """LaTeX of ``constant * sum_n c_n v^(2n)``, canonical form for engine coefficients
    (:func:`format_amplitude`); sympy coefficients printed by sympy with ``\\ln``."""
    if _all_exact(series):
        return present_series(series, constant=constant, variable="x" if orbit == "circular" else "1/c").to_latex()
    rational = constant.rational if constant is not None else Fraction(1)
    pieces = []
    for order, value in series.terms.items():
        value = sp.factor_terms(sp.sympify(value) * sp.Rational(rational.numerator, rational.denominator))
        text, single = sp.latex(value, ln_notation=True), not isinstance(value, sp.Add)
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


def _validate_spins(spins: Any, orbit: str = "general") -> None:
    table_for_spins(spins)      # raises ValueError unless None, "aligned" or "general"
    if spins == "general" and orbit != "general":
        raise ValueError(f"spins='general' (spins of any direction) is derived on general orbits only, got "
                         f"orbit={orbit!r}; circular orbits take spins='aligned'")


def _validate_instantaneous_only(instantaneous_only: Any, orbit: str) -> None:
    if not isinstance(instantaneous_only, bool):
        raise TypeError(f"instantaneous_only must be True or False, got {instantaneous_only!r}")
    if instantaneous_only and orbit != "general":
        raise ValueError("instantaneous_only applies to general orbits (on circular orbits the tails and the "
                         "quadratic interactions are evaluated)")


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
                sign_convention: str = "minus-phi-theta", phase: str = "psi", spins: str | None = None,
                instantaneous_only: bool = False) -> ModeResult:
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
        "minus-phi-theta" (default: triad P = -e_Phi, Q = e_Theta, Hhat_22 = +1) or
        "theta-phi" (P = e_Theta, Q = e_Phi: every h_lm flipped); the old name "review" is
        accepted with a DeprecationWarning.
    phase:
        "psi" (default) or "phi": the phase variable of the circular-orbit exponential.
    spins:
        None (default: no spins) or "aligned": spins along the orbital angular momentum, with the
        dimensionless components chi1, chi2 as symbols (the orbit stays planar, circular or
        general; the leading spin-orbit terms, at relative 0.5PN in current modes and 1.5PN in
        mass modes; ``S_A = G m_A^2 chi_A/c``, conventions in
        :mod:`stfalgebra.binary.spin_variables`), or "general" (general orbits only): spins of any
        direction, components ``chiA_n, chiA_lambda, chiA_ell`` on the instantaneous triad
        (n, lambda, ell = e_z) of the orbital plane, every m derived on its own
        (:mod:`stfalgebra.radiative.precessing_channels`).
    instantaneous_only:
        General orbits only. False (default): the complete mode, refused where a hereditary or
        non-linear contribution enters that the toolkit does not evaluate on a general orbit
        (the tail, from relative 1.5PN). True: the instantaneous part (the source moments and
        the equations of motion, through the order their rows reach: 2PN for mass modes), the
        note naming what it leaves out; the tail is
        :func:`~stfalgebra.radiative.radiative_moments.general_orbit_tail`, an unevaluated integral.

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
    1 + x*(-107/42 + 55/42*nu)

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), mode decomposition and normalisation;
    Kidder, Phys. Rev. D 77, 044016 (2008).
    """
    check_mode(l, m)
    sign_convention = resolve_sign_convention(sign_convention)
    _validate_options(orbit, sign_convention, phase)
    _validate_spins(spins, orbit)
    _validate_instantaneous_only(instantaneous_only, orbit)
    pn, pn_relative = _orders(pn, pn_relative)
    if orbit == "circular" and m == 0 and l % 2 == 0:
        if spins is not None:
            # the memory row integrates the non-spinning modes and energy balance
            raise RefusedModeError(f"circular-orbit m = 0 mode ({l},0) with aligned spins: the DC memory is "
                                   f"derived for non-spinning binaries only")
        return _memory_mode(l, pn, pn_relative, sign_convention, phase)
    n0 = leading_order(l, m)
    through = pn if pn is not None else n0 + pn_relative
    relative = through - n0
    common = dict(l=l, m=m, orbit=orbit, pn=pn, pn_relative=pn_relative,
                  phase=phase if orbit == "circular" else "phi", sign_convention=sign_convention, spins=spins,
                  instantaneous_only=instantaneous_only)
    if relative < 0:
        return ModeResult(refused=None, constant=None, series=PNSeries._from_trusted({}, float("inf")),
                          provenance=(f"leading term of Hhat_{l}{m} is at order {n0}, beyond {through}",),
                          **common)
    constant, series, provenance = _mode_amplitude(l, m, orbit, relative, sign_convention, common["phase"], spins,
                                                   instantaneous_only)
    note = _general_orbit_note(l, m, orbit, relative, spins, instantaneous_only)
    by_order = _term_provenance(l, abs(m), orbit, relative, common["phase"], spins, instantaneous_only)
    return ModeResult(refused=None, constant=constant, series=series.truncate(through), provenance=provenance,
                      note=note, term_provenance=by_order, **common)


def _general_orbit_note(l: int, m: int, orbit: str, relative: PNOrder, spins: str | None,
                        instantaneous_only: bool) -> str | None:
    """What a general-orbit mode leaves out: the memory of m = 0, and with ``instantaneous_only``
    the hereditary and non-linear families entering through ``relative``."""
    if orbit == "circular":
        return None
    notes = [INSTANTANEOUS_ONLY] if m == 0 else []
    if instantaneous_only:
        omitted = omitted_from_instantaneous_part(mode_kind(l, m), l, relative, table_for_spins(spins))
        if omitted:
            notes.append(f"{INSTANTANEOUS_PART_ONLY}: not included: {', '.join(omitted)}; the tail is the "
                         f"unevaluated hereditary integral general_orbit_tail({l}, {m}) of the Python API")
    return "; ".join(notes) or None


def _memory_mode(l: int, pn: PNOrder | None, pn_relative: PNOrder | None, sign_convention: str,
                 phase: str) -> ModeResult:
    """The DC memory of the circular mode (l, 0), l even, from the memory row of the table of
    contributions; refused beyond it with :func:`circular_zero_mode_reason`."""
    from .circular_memory import MEMORY_ASSUMPTION, memory_leading_order

    n0 = memory_leading_order(l)
    through = pn if pn is not None else n0 + pn_relative
    relative = through - n0
    common = dict(l=l, m=0, orbit="circular", pn=pn, pn_relative=pn_relative, phase=phase,
                  sign_convention=sign_convention)
    if relative < 0:
        return ModeResult(refused=None, constant=None, series=PNSeries._from_trusted({}, float("inf")),
                          provenance=(f"the memory Hhat_{l}0 starts at order {n0}, beyond {through}",), **common)
    row = memory_row(l, relative)
    if row is None:
        raise OrderBeyondInputsError(circular_zero_mode_reason(l, relative))
    constant, series, provenance = row.evaluate(l, relative)
    sign = DEPRECATED_SIGN_CONVENTIONS.get(sign_convention, sign_convention)
    series = series.truncate(through)
    by_order = tuple((order, (f"memory: {row.description}",)) for order in series.orders)
    return ModeResult(refused=None, constant=constant * SIGN_CONVENTIONS[sign][0], series=series,
                      provenance=provenance, note=MEMORY_ASSUMPTION, term_provenance=by_order, **common)


def derive_modes(lmax: int, *, orbit: str = "circular", pn: Any = None, pn_relative: Any = None,
                 sign_convention: str = "minus-phi-theta", phase: str = "psi", executor: Any = None,
                 spins: str | None = None, instantaneous_only: bool = False) -> list[ModeResult]:
    """Every mode 2 <= l <= lmax, -l <= m <= l; refused modes are kept with their reason.

    Parameters
    ----------
    lmax:
        Highest l, ``2 <= lmax <= LMAX_BOUND``.
    orbit, pn, pn_relative, sign_convention, phase, spins, instantaneous_only:
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
    ['Hhat_2,2 (circular orbit) = 1', 'Hhat_2,1 (circular orbit) = 1/3*I*delta*sqrt(x)']
    """
    from .contributions import LMAX_BOUND

    if isinstance(lmax, bool) or not isinstance(lmax, int):
        raise TypeError(f"lmax must be an int, got {lmax!r}")
    if not 2 <= lmax <= LMAX_BOUND:
        raise ValueError(f"lmax must be between 2 and {LMAX_BOUND}, got {lmax}")
    sign_convention = resolve_sign_convention(sign_convention)
    _validate_options(orbit, sign_convention, phase)
    _validate_spins(spins, orbit)
    _validate_instantaneous_only(instantaneous_only, orbit)
    orders = _orders(pn, pn_relative)
    task = dict(orbit=orbit, pn=orders[0], pn_relative=orders[1], sign_convention=sign_convention, phase=phase,
                spins=spins, instantaneous_only=instantaneous_only)
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
                sign_convention=task["sign_convention"], spins=task.get("spins"),
                instantaneous_only=task.get("instantaneous_only", False)), beyond))
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
    sign_convention = DEPRECATED_SIGN_CONVENTIONS.get(sign_convention, sign_convention)
    return alpha * mode * SurdConstant(1, Fraction(1, 2)) * output * SIGN_CONVENTIONS[sign_convention][0]


def _mode_amplitude(l: int, m: int, orbit: str, relative: PNOrder, sign_convention: str,
                    phase: str, spins: str | None = None,
                    instantaneous_only: bool = False) -> tuple[SurdConstant, PNSeries, tuple[str, ...]]:
    if m < 0 and spins != "general":
        # planar orbits: Hhat_{l,-m} = (-1)^l conj(Hhat_lm) (every generator but I is real;
        # aligned spins keep the orbit planar; spins of any direction do not: every m derived)
        constant, series, provenance = _direct_amplitude(l, -m, orbit, relative, sign_convention, phase, spins,
                                                         instantaneous_only)
        conjugated = series.map_coefficients(
            lambda v: v.conjugate() if isinstance(v, ExactPolynomial) else sp.conjugate(v))
        return constant * (-1) ** l, conjugated, provenance
    return _direct_amplitude(l, m, orbit, relative, sign_convention, phase, spins, instantaneous_only)


def _table(spins: str | None, instantaneous_only: bool) -> tuple:
    rows = table_for_spins(spins)
    return instantaneous_part(rows) if instantaneous_only else rows


@lru_cache(maxsize=None)
def _row_contributions(l: int, m: int, orbit: str, relative: PNOrder,
                       spins: str | None = None, instantaneous_only: bool = False) -> tuple[Any, tuple[PNSeries, ...]]:
    """The plan of the radiative moment and each chosen row's part of Hhat_lm (phase psi,
    without the normalisation constant), as series in x (circular) or 1/c (general); with
    ``spins="aligned"`` the rows of :func:`~stfalgebra.radiative.contributions.table_for_spins`
    and, on circular orbits, the circular orbit with the spin-orbit term of r(x)."""
    kind = mode_kind(l, m)
    plan = plan_radiative_moment(kind, l, relative, orbit, m=m, table=_table(spins, instantaneous_only))
    n0 = leading_order(l, m)
    nu = ExactPolynomial("nu")
    eom = plan.input_order("equations of motion")
    parts = []
    for row in plan.rows:
        channel = row.evaluate(l, m, orbit=orbit).truncate(relative)
        if kind == "current":
            channel = channel * ExactPolynomial("I")
        if not channel.orders:
            # no term through this order (Hhat_30 has none from the source moments; its
            # quadratic part starts at relative 3/2)
            parts.append(PNSeries({}, n0 + relative))
            continue
        if orbit == "circular":
            # G = m = c = 1: r = 1/(x g(x)), phidot = x^(3/2); then divide by x (normalisation)
            if spins is None:
                # beyond relative 2 the orbit is the 2PN one with the 2.5PN reaction (inspiralling)
                # (a plan with the 1PN dynamics only, an odd-l m = 0 mode, has no reaction term)
                series = on_circular_orbit(channel, eom, with_reaction=relative > 2 and eom == 2).shift(-1)
            else:
                from ..binary.spin_circular import spinning_circular_reduction

                series = spinning_circular_reduction(channel)[0].shift(-1)
            series = series.map_coefficients(lambda v: v / nu)
        else:
            mass_nu = ExactPolynomial("m") * nu
            series = channel.map_coefficients(lambda v: v.substitute({"G": 1}) / mass_nu).shift(n0)
        parts.append(series.truncate(n0 + relative))
    return plan, tuple(parts)


def _with_phase(series: PNSeries, m: int, plan: Any, relative: PNOrder, n0: PNOrder, phase: str) -> PNSeries:
    if phase == "phi" and any(row.family == "tail" for row in plan.rows):
        from .psi_phase import phi_from_psi_in_x

        return (series * phi_from_psi_in_x(m)).truncate(n0 + relative)
    return series


@lru_cache(maxsize=None)
def _direct_amplitude(l: int, m: int, orbit: str, relative: PNOrder, sign_convention: str,
                      phase: str, spins: str | None = None,
                      instantaneous_only: bool = False) -> tuple[SurdConstant, PNSeries, tuple[str, ...]]:
    plan, parts = _row_contributions(l, m, orbit, relative, spins, instantaneous_only)
    series = parts[0]
    for part in parts[1:]:
        series = series + part
    series = _with_phase(series, m, plan, relative, leading_order(l, m), phase)
    return _normalisation_constant(l, m, orbit, sign_convention), series, _provenance(plan, l, mode_kind(l, m))


def _provenance(plan, l: int, kind: str) -> tuple[str, ...]:
    """The plan's rows, and the quadratic terms the mode used, written out."""
    if not any(row.family == "quadratic" for row in plan.rows):
        return plan.provenance
    from .nonlinear import quadratic_terms

    terms = ", ".join(term.describe() for term in quadratic_terms(l, kind)) or "none at this l"
    moment = "U_L" if kind == "mass" else "V_L"
    return plan.provenance + (f"quadratic terms of {moment}, l = {l}, inside (G/c^3){{...}}: {terms}",)


@lru_cache(maxsize=None)
def _term_provenance(l: int, m: int, orbit: str, relative: PNOrder, phase: str,
                     spins: str | None = None,
                     instantaneous_only: bool = False) -> tuple[tuple[PNOrder, tuple[str, ...]], ...]:
    """For each order of Hhat_lm, the rows of the table of contributions (and the change of
    phase variable) that give it a non-zero part."""
    plan, parts = _row_contributions(l, m, orbit, relative, spins, instantaneous_only)
    by_order: dict[PNOrder, list[str]] = {}
    for row, part in zip(plan.rows, parts):
        for order in part.terms:
            by_order.setdefault(order, []).append(f"{row.family}: {row.description}")
    total = parts[0]
    for part in parts[1:]:
        total = total + part
    rotated = _with_phase(total, m, plan, relative, leading_order(l, m), phase)
    if rotated is not total:
        for order in (rotated - total).terms:
            by_order.setdefault(order, []).append(
                "phase phi: exp(-i m psi) = exp(-i m phi) [1 + 3 i m x^(3/2) ln(x/x0)], the tail's logarithm")
    return tuple((order, tuple(rows)) for order, rows in sorted(by_order.items()))


def _direct_mode(l: int, m: int, **options: Any) -> ModeResult:
    """:func:`derive_mode` without the m < 0 symmetry (tests check the symmetry with it)."""
    result = derive_mode(l, abs(m), **options) if m >= 0 else None
    if result is not None:
        return result
    pn, pn_relative = _orders(options.get("pn"), options.get("pn_relative"))
    n0 = leading_order(l, m)
    through = pn if pn is not None else n0 + pn_relative
    orbit = options.get("orbit", "circular")
    sign = resolve_sign_convention(options.get("sign_convention", "minus-phi-theta"))
    phase = options.get("phase", "psi")
    spins = options.get("spins")
    instantaneous_only = options.get("instantaneous_only", False)
    constant, series, provenance = _direct_amplitude(l, m, orbit, through - n0, sign,
                                                     phase if orbit == "circular" else "phi", spins, instantaneous_only)
    return ModeResult(l=l, m=m, orbit=orbit, pn=pn, pn_relative=pn_relative, refused=None, spins=spins,
                      instantaneous_only=instantaneous_only,
                      phase=phase if orbit == "circular" else "phi", sign_convention=sign,
                      provenance=provenance, constant=constant, series=series.truncate(through))
