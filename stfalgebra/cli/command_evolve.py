"""``stfalgebra evolve``: secular evolution of an eccentric binary under radiation reaction.

Contract:

    stfalgebra evolve --pn P [--json]
        the orbit-averaged rates dx/dt and de_t/dt (flux balance on the quasi-Keplerian orbit),
        normalised by (c^3/(G m)) nu x^5 and (c^3/(G m)) nu x^4, as sympy strings in x, nu, et,
        and the closed Newtonian track a(e); P is 0, 1/2, 1, 3/2 or 2, bounded by the eccentric
        rows of the table of contributions (from 3/2 with the tail enhancement functions
        phi(et), psi(et), left symbolic; at 2 the 2PN instantaneous terms on the 2PN
        quasi-Keplerian orbit, harmonic coordinates);
    stfalgebra evolve --pn P --x0 X0 --e0 E0 --x-final XF [--nu NU] [--points N] [--steps S] [--json]
        additionally integrates the rates from (X0, E0) to XF (scipy's adaptive solve_ivp,
        DOP853, rtol 1e-10, atol 1e-12, in ln x; at most S steps) and prints x, e_t and
        tau = c^3 (t - t_0)/(G m) at N points equally spaced in ln x.

JSON keys: "pn", "rates" {"dx_dt", "de_dt"}, "normalisation" {"dx_dt", "de_dt", "tau"},
"forms" {"dx_dt", "de_dt"} (each rate written with its prefactor: "expression", "latex",
"prefactor", "terms" ...), "newtonian_track", from P = 3/2 "enhancement_functions" {"phi",
"psi"}, and with a track "nu" and "track" (a list of {"x", "et", "tau"}). ("de_dt" is d e_t/dt;
it was called "det_dt" before issue 13.) ``--format text|latex|json`` (``--json`` is ``--format
json``): LaTeX prints one equation per rate.
``--spins aligned`` (P <= 3/2, bounded by the table with the spin rows) gives the rates with the
leading spin-orbit terms (chi1, chi2, delta as symbols, key "spins": "aligned";
:mod:`stfalgebra.cli.spinning_eccentric`), and a track integrates them at ``--chi1 A --chi2 B``
(each in [-1, 1], default 0; keys "chi1", "chi2"; body 1 the heavier, delta = sqrt(1 - 4 nu));
``--chi1``/``--chi2`` without ``--spins aligned`` are refused. Without ``--spins`` the output is
as before.
Bad input is one line on stderr and exit code 2: every number is checked before any work
(``options.py``: x in [1e-8, 1), e_t in [0, 1) ([0, 0.95] from P = 3/2), nu in (0, 1/4], at most
100000 steps and 10000 points, an order beyond what the table of contributions supports refused;
decimals and fractions such as 1/4 accepted). A track that reaches x/(1 - e_t^2) > 1/(6 + 2 e_t),
beyond the test-mass separatrix p = 6 + 2e (p ~ (1 - e^2)/x in units of G m/c^2), where the PN
rates no longer describe a binary, is printed with one warning line on stderr.
"""

from __future__ import annotations

import argparse
import json
import sys

from . import UsageError, register
from .cache import DerivationCache, looks_like_expression
from .forms import latex_lines, sympy_series_form
from .options import (
    LazyHelp, add_format_option, argparse_type, maximum_pn_order, output_format, parse_bounded_order,
    parse_eccentricity,
    parse_frequency_parameter, parse_nu, parse_order_syntax, parse_spin_component, parse_steps, parse_track_points,
)
from .spinning_eccentric import check_spin_options

__all__ = ["evolve_payload", "check_rates_payload", "regime_warning"]

_MAX_POINTS = 100_000
_MAX_STEPS = 10_000_000

_NORMALISATION = {
    "dx_dt": "(dx/dt) / ((c^3/(G m)) nu x^5)",
    "de_dt": "(de_t/dt) / ((c^3/(G m)) nu x^4)",
    "tau": "c^3 (t - t_0)/(G m)",
}
# rate -> (symbol, LaTeX symbol, words, prefactor text, prefactor LaTeX)
_FORMS = {
    "dx_dt": ("dx/dt", r"\left\langle \frac{dx}{dt} \right\rangle", "orbit-averaged rate of x",
              "nu*c**3*x**5/(G*m)", r"\frac{\nu c^{3} x^{5}}{G m}"),
    "de_dt": ("de_t/dt", r"\left\langle \frac{de_t}{dt} \right\rangle", "orbit-averaged rate of the time "
              "eccentricity e_t", "nu*c**3*x**4/(G*m)", r"\frac{\nu c^{3} x^{4}}{G m}"),
}
_RATE_NAMES = frozenset({"x", "nu", "et", "pi", "log", "sqrt", "phi", "psi"})
_SPIN_NAMES = frozenset({"chi1", "chi2", "delta"})
_DEFAULT_NU = "1/4"
_DEFAULT_POINTS = "11"
_DEFAULT_STEPS = "2000"


def check_rates_payload(value: object, pn: str) -> None:
    """Raise ValueError unless ``value`` has the shape ``_rates_payload`` stores (a cache entry
    is data from disk)."""
    if not isinstance(value, dict) or not ({"pn", "rates", "normalisation", "newtonian_track", "forms"} <= set(value)
                                           <= {"pn", "rates", "normalisation", "newtonian_track", "forms",
                                               "enhancement_functions", "spins"}):
        raise ValueError("unexpected keys")
    names = _RATE_NAMES | _SPIN_NAMES if value.get("spins") == "aligned" else _RATE_NAMES
    rates = value["rates"]
    if value["pn"] != pn or not isinstance(rates, dict) or set(rates) != {"dx_dt", "de_dt"}:
        raise ValueError("another order, or bad rates")
    if not all(looks_like_expression(rates[name], names) for name in rates):
        raise ValueError("a rate is not an expression")
    if value["normalisation"] != _NORMALISATION or not isinstance(value["newtonian_track"], str):
        raise ValueError("bad normalisation or track")
    forms = value["forms"]
    if not isinstance(forms, dict) or set(forms) != set(rates) or not all(
            isinstance(form, dict) and looks_like_expression(form.get("expression"), names | {"c", "G", "m"})
            for form in forms.values()):
        raise ValueError("bad forms")


def _rates_payload(pn: str, use_cache: bool, spins: str | None = None) -> dict:
    cache = DerivationCache(enabled=use_cache)
    spin_key = {} if spins is None else {"spins": spins}     # the non-spinning key stays as it was
    key = cache.key(command="evolve", pn=pn, schema=2, **spin_key)
    cached = cache.get(key, validate=lambda value: check_rates_payload(value, pn))
    if cached is not None and cached.get("spins") == spins:
        return cached
    if spins is not None:
        from ..radiative.secular_tracks import newtonian_semi_major_axis_track
        from .spinning_eccentric import spinning_rates_payload

        payload = spinning_rates_payload(pn, _FORMS, _NORMALISATION)
        import sympy as sp

        payload["newtonian_track"] = "a = " + sp.sstr(newtonian_semi_major_axis_track())
        cache.put(key, payload)
        return payload
    parse_bounded_order(pn, "--pn", maximum_pn_order("evolve"))
    import sympy as sp

    from ..radiative.secular_rates import secular_rates
    from ..radiative.secular_tracks import newtonian_semi_major_axis_track
    from ..symbols import x
    from .command_flux import ENHANCEMENT_DEFINITIONS

    def text(series) -> str:
        return sp.sstr(sp.Add(*[coeff * x**order for order, coeff in series.terms.items()]))

    x_rate, e_rate = secular_rates(sp.Rational(pn))
    forms = {}
    for name, series in (("dx_dt", x_rate), ("de_dt", e_rate)):
        symbol, latex_symbol, words, prefactor, prefactor_latex = _FORMS[name]
        forms[name] = {"symbol": symbol, "latex_symbol": latex_symbol, "words": words,
                       **sympy_series_form(series, prefactor=prefactor, prefactor_latex=prefactor_latex)}
    payload = {
        "pn": pn,
        "rates": {"dx_dt": text(x_rate), "de_dt": text(e_rate)},
        "normalisation": dict(_NORMALISATION),
        "forms": forms,
        "newtonian_track": "a = " + sp.sstr(newtonian_semi_major_axis_track()),
    }
    if sp.Rational(pn) >= sp.Rational(3, 2):
        payload["enhancement_functions"] = dict(ENHANCEMENT_DEFINITIONS)
    cache.put(key, payload)
    return payload


def evolve_payload(pn: str, track: dict | None = None, use_cache: bool = True, spins: str | None = None) -> dict:
    """The JSON object of ``stfalgebra evolve``.

    ``track`` (optional): ``{"x0", "e0", "x_final", "nu", "points", "steps"}`` for a numerical
    integration of the secular equations (values already checked by ``options.py``); with
    ``spins="aligned"`` also ``"chi1"``, ``"chi2"``.
    """
    payload = dict(_rates_payload(pn, use_cache, spins))
    if track is not None:
        from ..radiative.secular_rates import compile_secular_rates
        from ..radiative.secular_tracks import integrate_secular_evolution

        if spins is not None:
            from ..radiative.spinning_secular_rates import numeric_spinning_secular_rates

            rates = numeric_spinning_secular_rates(pn, track["chi1"], track["chi2"])
            payload["chi1"], payload["chi2"] = track["chi1"], track["chi2"]
        else:
            # the rates of the (possibly cached) payload, not a second derivation
            rates = compile_secular_rates(*(_series_from_text(payload["rates"][name]) for name in ("dx_dt", "de_dt")))
        points = integrate_secular_evolution(track["x0"], track["e0"], track["x_final"], track["nu"],
                                             pn=pn, points=track["points"], steps=track["steps"], rates=rates)
        payload["nu"] = track["nu"]
        payload["track"] = [point.to_json() for point in points]
    return payload


def _series_from_text(text: str):
    """A rate of the payload (``sum coeff * x**k``, sympy syntax) back as a PN series in sqrt(x),
    the enhancement functions as the toolkit's functions."""
    import sympy as sp

    from ..pnseries import PNSeries
    from ..radiative.tail_enhancement import AngularMomentumTailEnhancement, EnergyTailEnhancement
    from ..symbols import et, nu, x

    names = {"x": x, "et": et, "nu": nu, "phi": EnergyTailEnhancement, "psi": AngularMomentumTailEnhancement}
    expr = sp.sympify(text, locals=names)
    terms: dict = {}
    for term in sp.Add.make_args(sp.expand(expr)):
        coeff, power = term.as_coeff_exponent(x)
        if coeff.has(x):
            raise ValueError(f"a rate term is not a power of x: {term}")
        terms[power] = terms.get(power, 0) + coeff
    return PNSeries(terms, max(terms))


def regime_warning(track: list[dict]) -> str | None:
    """One line when a track point lies beyond the test-mass separatrix, else None.

    The PN expansion parameter of an eccentric orbit is G m/(c^2 p) ~ x/(1 - e^2) (p the
    semi-latus rectum); a test mass on a Schwarzschild geodesic plunges for p < 6 + 2e, i.e.
    x/(1 - e^2) > 1/(6 + 2e) (Cutler, Kennefick & Poisson, Phys. Rev. D 50, 3816 (1994),
    from memory). Beyond it the truncated PN rates no longer describe an inspiral.

    Example
    -------
    >>> regime_warning([{"x": 0.01, "et": 0.3, "tau": 0.0}]) is None
    True
    >>> regime_warning([{"x": 0.2, "et": 0.0, "tau": 0.0}])[:40]
    'the track reaches x/(1 - e_t^2) = 0.2 at'
    """
    for point in track:
        x, e = point["x"], point["et"]
        size = x / (1 - e * e)
        if size > 1 / (6 + 2 * e):
            return (f"the track reaches x/(1 - e_t^2) = {size:.3g} at x = {x:.3g}, e_t = {e:.3g}, beyond "
                    f"1/(6 + 2 e_t) (the test-mass separatrix p = 6 + 2e): the PN rates are not a "
                    f"description of the binary there")
    return None


@register("evolve", "secular evolution of an eccentric binary: averaged dx/dt, de_t/dt and an integrated track")
class EvolveCommand:
    @staticmethod
    def configure(parser: argparse.ArgumentParser) -> None:
        parser.add_argument("--pn", metavar="P", required=True,
                            help=LazyHelp(lambda: f"PN order of the rates (a multiple of 1/2, at most "
                                                  f"{maximum_pn_order('evolve')}: the table of contributions)"))
        parser.add_argument("--x0", metavar="X0", type=argparse_type(parse_frequency_parameter, "--x0"),
                            help="initial frequency parameter x, in [1e-8, 1)")
        parser.add_argument("--e0", metavar="E0", type=argparse_type(parse_eccentricity, "--e0"),
                            help="initial time eccentricity, in [0, 1) ([0, 0.95] from --pn 3/2)")
        parser.add_argument("--x-final", metavar="XF", type=argparse_type(parse_frequency_parameter, "--x-final"),
                            help="final x of the integration, in [1e-8, 1)")
        parser.add_argument("--nu", metavar="NU", type=argparse_type(parse_nu), default=None,
                            help="symmetric mass ratio in (0, 1/4], e.g. 0.2 or 1/4 (default 1/4, equal masses)")
        parser.add_argument("--points", metavar="N", type=argparse_type(parse_track_points), default=None,
                            help="output points, 2 to 10000 (default 11)")
        parser.add_argument("--steps", metavar="S", type=argparse_type(parse_steps), default=None,
                            help="step budget of the adaptive integrator: at most S steps in ln x, "
                                 "1 to 100000 (default 2000)")
        parser.add_argument("--spins", choices=("none", "aligned"), default="none",
                            help="none (default) or aligned: spins along the orbital angular momentum, leading "
                                 "spin-orbit terms (chi1, chi2 as symbols in the rates; at most --pn 3/2)")
        parser.add_argument("--chi1", metavar="A", type=argparse_type(parse_spin_component, "--chi1"), default=None,
                            help="with --spins aligned: body 1's spin component along the orbital angular momentum, "
                                 "c S_1.ell/(G m_1^2) in [-1, 1], for the track (default 0)")
        parser.add_argument("--chi2", metavar="B", type=argparse_type(parse_spin_component, "--chi2"), default=None,
                            help="with --spins aligned: the same for body 2 (default 0); body 1 is the heavier")
        add_format_option(parser)
        parser.add_argument("--no-cache", action="store_true", help="derive the rates afresh")

    @staticmethod
    def run(args) -> int:
        pn = str(parse_order_syntax(args.pn, "--pn"))
        spins = None if args.spins == "none" else args.spins
        try:
            spin_values = check_spin_options(spins, args.chi1, args.chi2)
        except ValueError as exc:
            raise UsageError(str(exc)) from None
        given = [flag for flag, value in (("--x0", args.x0), ("--e0", args.e0),
                                          ("--x-final", args.x_final)) if value is not None]
        track = None
        if given:
            if len(given) != 3:
                raise UsageError("a track needs all of --x0, --e0 and --x-final")
            track = {"x0": float(args.x0), "e0": float(args.e0), "x_final": float(args.x_final),
                     "nu": float(args.nu if args.nu is not None else parse_nu(_DEFAULT_NU)),
                     "points": args.points if args.points is not None else parse_track_points(_DEFAULT_POINTS),
                     "steps": args.steps if args.steps is not None else parse_steps(_DEFAULT_STEPS)}
            if spin_values is not None:
                track["chi1"], track["chi2"] = spin_values
        unused = [flag for flag, value in (("--nu", args.nu), ("--points", args.points), ("--steps", args.steps),
                                           ("--chi1", args.chi1), ("--chi2", args.chi2)) if value is not None]
        payload = evolve_payload(pn, track, not args.no_cache, spins)
        if track is None and unused:
            sys.stderr.write(f"stfalgebra evolve: note: {', '.join(unused)} used only with a track "
                             f"(--x0, --e0, --x-final)\n")
        warning = regime_warning(payload["track"]) if track is not None else None
        if warning is not None:
            sys.stderr.write(f"stfalgebra evolve: warning: {warning}\n")
        fmt = output_format(args)
        if fmt == "json":
            sys.stdout.write(json.dumps(payload, indent=1) + "\n")
            return 0
        header = f"secular evolution, every term through relative order {pn} (harmonic coordinates, time eccentricity et)"
        if spins is not None:
            from .spinning_eccentric import SPIN_NOTE

            header += "; " + SPIN_NOTE
        if fmt == "latex":
            notes = [f"{name}(e_t): {text}" for name, text in payload.get("enhancement_functions", {}).items()]
            sys.stdout.write(latex_lines([header, *notes], [dict(form, pn=pn) for form in payload["forms"].values()]))
            return 0
        lines = [f"# {header}"]
        for name in ("dx_dt", "de_dt"):
            form = payload["forms"][name]
            lines.append(f"{name}: <{form['symbol']}> = {form['expression']}")
        lines.append(f"Newtonian track: {payload['newtonian_track']}")
        if "track" in payload:
            spin_text = f"; chi1 = {payload['chi1']}, chi2 = {payload['chi2']}" if "chi1" in payload else ""
            lines.append(f"# nu = {payload['nu']}{spin_text}; tau = {_NORMALISATION['tau']}")
            lines.append(f"{'x':>14} {'et':>14} {'tau':>16}")
            for point in payload["track"]:
                lines.append(f"{point['x']:14.8g} {point['et']:14.8g} {point['tau']:16.8g}")
        sys.stdout.write("\n".join(lines) + "\n")
        return 0
