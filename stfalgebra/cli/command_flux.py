"""``stfalgebra flux``: orbit-averaged / circular energy and angular-momentum fluxes.

Contract:

    stfalgebra flux --orbit circular --pn P [--json]     JSON key "energy": F / ((32/5)(c^5/G) nu^2 x^5),
                                                          "binding_energy": E / (-(m nu c^2 x/2)),
                                                          "x_rate": (dx/dt) / ((64/5) nu c^3 x^5/(G m))
    stfalgebra flux --orbit eccentric --pn P [--json]    JSON keys "energy", "angular_momentum"
                                                          (the latter / ((32/5) m c^2 nu^2 x^(7/2)))

``--format text|latex|json`` (``--json`` is ``--format json``): text prints each flux in the
canonical form, prefactor * [terms in increasing PN order], with its normalisation as the
prefactor (F = 32/5*nu**2*c**5*x**5/G*(1 + ...)); LaTeX one equation per flux. The JSON keeps
"energy" and "angular_momentum" (the normalised series, as before) and adds "forms"
{"energy", "angular_momentum"}: the same fluxes with their prefactor, each with "symbol",
"words", "expression", "latex", "prefactor", "prefactor_latex", "leading_order", "variable" and
"terms" [{"order", "coefficient", "coefficient_latex"}] (circular: each term also with its
"provenance", the contributions of the table it comes from).

For circular orbits both routes (mode sum and STF multipole formula) are computed and must
agree; the output says so. Circular orbits also give the conserved energy and the rate of x
through the same order P: "binding_energy" is E(x) from the cited conserved energy on the
circular orbit, "x_rate" is dx/dt = -F/(dE/dx) with the flux above
(:func:`stfalgebra.radiative.energy_balance.relative_series`), each normalised by its leading
term (their normalisations are in "normalisation", their forms in "forms"). Should P exceed the
order of the conserved energy, the two keys are left out and "notes" says why.

``--spins aligned`` (circular orbits; eccentric orbits below) adds the leading spin-orbit terms of spins along the
orbital angular momentum (symbols ``chi1``, ``chi2``; key ``"spins": "aligned"``), with the same
keys: the fluxes by both routes (:mod:`stfalgebra.radiative.spinning_fluxes`), "binding_energy"
from the derived aligned-spin circular energy
(:func:`stfalgebra.binary.spin_circular.circular_energy`) and "x_rate" from the same balance
(:func:`stfalgebra.radiative.spinning_fluxes.spinning_circular_x_rate`). Without it the output
is that of a non-spinning binary, exactly as without the option.

Eccentric orbits, P up to the eccentric rows of the table of contributions (2): "energy" and
"angular_momentum" are the orbit averages in x, nu and the time eccentricity et (harmonic
coordinates), exact closed forms of the instantaneous terms through 2PN. From P = 3/2 they carry the leading
tail as ``4*pi*x**(3/2)*phi(et)`` and ``4*pi*x**(3/2)*psi(et)``, with the enhancement
functions phi, psi left symbolic (no closed form exists); two more keys describe them:
"enhancement_functions" {"phi", "psi"} (their definitions, in words) and
"enhancement_series" {"order", "phi", "psi"} (their exact power series through
et**ENHANCEMENT_SERIES_ORDER, rational coefficients). Numbers: ``stfalgebra enhancement``.
With ``--spins aligned`` (P <= 3/2, from the table with the spin rows) the same keys plus
"spins": the averages of :mod:`stfalgebra.radiative.spinning_eccentric_fluxes`, with the
spin-orbit term in chi1, chi2, delta at x^(3/2) (payload in :mod:`stfalgebra.cli.spinning_eccentric`).
"""

from __future__ import annotations

import argparse
import json
import sys
from fractions import Fraction

from . import register
from .cache import DerivationCache, looks_like_expression
from .forms import latex_lines, sympy_series_form
from .options import (
    LazyHelp, add_format_option, maximum_pn_order, output_format, parse_bounded_order, parse_order_syntax,
)

__all__ = ["flux_payload", "check_flux_payload", "eccentric_flux_payload", "ENHANCEMENT_SERIES_ORDER",
           "ENHANCEMENT_DEFINITIONS"]

PN_SEVEN_HALVES = Fraction(7, 2)

_FLUX_NAMES = frozenset({"x", "nu", "et", "pi", "EulerGamma", "log", "sqrt", "phi", "psi", "chi1", "chi2", "delta"})
# the dimensional prefactors of the two fluxes (their JSON "energy" and "angular_momentum" are
# the series divided by them)
_PREFACTORS = {
    "energy": ("F", r"\mathcal{F}", "energy flux, positive for a loss", {"c": 5, "G": -1},
               "32/5*nu**2*c**5*x**5/G", r"\frac{32 \nu^{2} c^{5} x^{5}}{5 G}"),
    "angular_momentum": ("dJ_z/dt", r"\frac{dJ_z}{dt}", "angular-momentum flux about z, positive for a loss",
                         {"m": 1, "c": 2}, "32/5*m*nu**2*c**2*x**(7/2)", r"\frac{32}{5} m \nu^{2} c^{2} x^{7/2}"),
}

# the keys of the energy balance in the circular payload, with the engine's names
_BALANCE_KEYS = {"binding_energy": "energy", "x_rate": "x_rate"}

#: The power of et through which `flux --orbit eccentric --pn 3/2` prints phi and psi.
ENHANCEMENT_SERIES_ORDER = 10

#: What phi(et) and psi(et) stand for, in the words printed by `flux` and `evolve`.
ENHANCEMENT_DEFINITIONS = {
    "phi": "1.5PN tail of the averaged energy flux: (32/5)(c^5/G) nu^2 x^5 * 4 pi x^(3/2) phi(et); "
           "phi(0) = 1; the whole et dependence (not divided by the Newtonian factor)",
    "psi": "1.5PN tail of the averaged angular-momentum flux: (32/5) m c^2 nu^2 x^(7/2) * 4 pi "
           "x^(3/2) psi(et); psi(0) = 1",
}


def eccentric_flux_payload(pn) -> dict:
    """The averaged eccentric-orbit fluxes for the command line, as sympy strings.

    Parameters
    ----------
    pn:
        PN order 0, 1/2, 1, 3/2 or 2 (int, Rational, Fraction or text).

    Returns
    -------
    dict
        ``{"energy": str, "angular_momentum": str}``: the averaged fluxes of
        :mod:`stfalgebra.radiative.eccentric_fluxes` as expressions in ``x, nu, et`` (sympy
        syntax); from 3/2 also ``"enhancement_functions"`` and ``"enhancement_series"`` (module
        docstring).

    Raises
    ------
    OrderBeyondInputsError
        ``pn`` beyond the eccentric rows of the table of contributions (2).

    **Conventions**: energy flux divided by ``(32/5)(c^5/G) nu^2 x^5``, angular-momentum flux
    by ``(32/5) m c^2 nu^2 x^(7/2)``; harmonic coordinates, time eccentricity ``et``.

    Example
    -------
    >>> eccentric_flux_payload(0)["angular_momentum"]
    '(7*et**2/8 + 1)/(1 - et**2)**2'

    References
    ----------
    As :func:`stfalgebra.radiative.eccentric_fluxes.averaged_energy_flux`.
    """
    import sympy as sp

    from ..radiative.eccentric_fluxes import (
        averaged_angular_momentum_flux, averaged_energy_flux, check_eccentric_order,
    )
    from ..radiative.tail_enhancement import tail_enhancement_series
    from ..symbols import x

    order = check_eccentric_order(pn)

    def text(series) -> str:
        terms = [coeff * x ** k for k, coeff in series.terms.items()]
        return sp.sstr(sp.Add(*terms, evaluate=False) if len(terms) > 1 else sp.Add(*terms))

    energy_series, angular_series = averaged_energy_flux(order), averaged_angular_momentum_flux(order)
    payload = {"energy": text(energy_series), "angular_momentum": text(angular_series),
               "forms": {"energy": _form("energy", energy_series, exact=False),
                         "angular_momentum": _form("angular_momentum", angular_series, exact=False)}}
    if order >= sp.Rational(3, 2):
        phi, psi = tail_enhancement_series(ENHANCEMENT_SERIES_ORDER)
        payload["enhancement_functions"] = dict(ENHANCEMENT_DEFINITIONS)
        payload["enhancement_series"] = {"order": ENHANCEMENT_SERIES_ORDER,
                                         "phi": sp.sstr(phi), "psi": sp.sstr(psi)}
    return payload


def check_flux_payload(value: object, orbit: str, pn: str) -> None:
    """Raise ValueError unless ``value`` has the shape :func:`flux_payload` stores (a cache
    entry is data from disk)."""
    keys = {"orbit", "pn", "energy", "angular_momentum", "forms"}
    optional: set[str] = set()
    if orbit == "circular":
        keys |= {"normalisation", "routes", "routes_agree"}
        optional = {*_BALANCE_KEYS, "notes", "spins"}
    else:
        optional = {"enhancement_functions", "enhancement_series", "spins"}
    if not isinstance(value, dict) or not keys <= set(value) <= keys | optional:
        raise ValueError("unexpected keys")
    if (value["orbit"], value["pn"]) != (orbit, pn):
        raise ValueError("another orbit or order")
    balance = [name for name in _BALANCE_KEYS if name in value]
    if orbit == "circular" and not balance and not value.get("notes"):
        raise ValueError("binding energy and x rate left out without a note")
    if not all(looks_like_expression(value[name], _FLUX_NAMES) for name in ("energy", "angular_momentum", *balance)):
        raise ValueError("a flux is not an expression")
    if orbit == "circular" and (value["routes_agree"] is not True or not isinstance(value["routes"], dict)
                                or not isinstance(value["normalisation"], dict)):
        raise ValueError("bad routes or normalisation")
    forms = value["forms"]
    if not isinstance(forms, dict) or set(forms) != {"energy", "angular_momentum", *balance} or not all(
            isinstance(form, dict) and looks_like_expression(form.get("expression"), _FLUX_NAMES | {"c", "G", "m"})
            for form in forms.values()):
        raise ValueError("bad forms")


def _form(name: str, presented_or_series, exact: bool) -> dict:
    symbol, latex_symbol, words, _, prefactor, prefactor_latex = _PREFACTORS[name]
    if exact:
        form = {"expression": presented_or_series.to_text(), "latex": presented_or_series.to_latex(),
                **presented_or_series.to_json()}
    else:
        form = sympy_series_form(presented_or_series, prefactor=prefactor, prefactor_latex=prefactor_latex)
    return {"symbol": symbol, "latex_symbol": latex_symbol, "words": words, **form}


def _circular_form(name: str, series, term_provenance=()) -> dict:
    """The engine series of a normalised circular flux, written with its prefactor; each term
    with the contributions it comes from (``term_provenance``, by order of the normalised
    series)."""
    from ..exact import ExactPolynomial
    from ..presentation import present_series

    factors = _PREFACTORS[name][3]
    scaled = series.map_coefficients(lambda v: v * ExactPolynomial("nu") ** 2 * ExactPolynomial(32) / 5)
    shifted = scaled.shift(5 if name == "energy" else PN_SEVEN_HALVES)
    form = _form(name, present_series(shifted, factors=factors), exact=True)
    rows = {str(order): list(names) for order, names in term_provenance}
    for term in form["terms"]:
        term["provenance"] = rows.get(term["order"], [])
    return form


def _balance_entries(order) -> dict:
    """The "binding_energy" and "x_rate" entries of the circular payload at ``order``: the
    normalised series as text, their normalisations and forms; or a note when the order is
    beyond the conserved energy."""
    from ..radiative.energy_balance import NORMALISATIONS, circular_quantity, maximum_quantity_order, relative_series
    from ..radiative.modes import format_amplitude

    limit = min(maximum_quantity_order(name) for name in _BALANCE_KEYS.values())
    if order > limit:
        return {"notes": [f"binding_energy and x_rate are left out: the conserved energy of the circular orbit is "
                          f"known through relative order {limit}"]}
    entries: dict = {"values": {}, "normalisation": {}, "forms": {}}
    for key, name in _BALANCE_KEYS.items():
        quantity = circular_quantity(name, order)
        presented = quantity.presentation()
        entries["values"][key] = format_amplitude(None, relative_series(name, order), "circular")
        entries["normalisation"][key] = NORMALISATIONS[name]
        entries["forms"][key] = {"symbol": quantity.symbol, "latex_symbol": quantity.latex_symbol,
                                 "words": quantity.words, "expression": presented.to_text(),
                                 "latex": presented.to_latex(), **presented.to_json(),
                                 "provenance": list(quantity.provenance)}
    return entries


def flux_payload(orbit: str, pn: str, use_cache: bool = True, spins: str | None = None) -> dict:
    """The JSON object of ``stfalgebra flux`` (derived, or from the cache after a shape check);
    ``pn`` is the order's text ("3/2"), bounded here before a derivation; ``spins`` None or
    "aligned" (circular orbits and eccentric averages)."""
    if spins not in (None, "aligned"):
        raise ValueError(f"spins must be None or 'aligned', got {spins!r}")
    cache = DerivationCache(enabled=use_cache)
    spin_key = {} if spins is None else {"spins": spins}     # the non-spinning keys stay as they were
    key = cache.key(command="flux", orbit=orbit, pn=pn, schema=4, **spin_key)
    cached = cache.get(key, validate=lambda value: check_flux_payload(value, orbit, pn))
    if cached is not None:
        return cached
    if spins is not None:
        if orbit == "circular":
            payload = _spinning_flux_payload(pn)
        else:
            from .spinning_eccentric import spinning_eccentric_flux_payload

            payload = spinning_eccentric_flux_payload(pn, _form)
        cache.put(key, payload)
        return payload
    parse_bounded_order(pn, "--pn", maximum_pn_order("flux", orbit=orbit))
    import sympy as sp

    if orbit == "circular":
        from ..radiative.fluxes import (
            circular_angular_momentum_flux_from_modes, circular_energy_flux_from_modes,
            circular_energy_flux_from_moments, circular_flux_term_provenance,
        )
        from ..radiative.modes import format_amplitude

        order = sp.Rational(pn)
        by_modes = circular_energy_flux_from_modes(order)
        by_moments = circular_energy_flux_from_moments(order)
        agree = all(sp.expand(sp.sympify(by_modes.coefficient(n)) - sp.sympify(by_moments.coefficient(n))) == 0
                    for n in sorted(set(by_modes.orders) | set(by_moments.orders)))
        if not agree:
            raise RuntimeError("the two flux routes disagree: this is a bug, please report it")
        energy = format_amplitude(None, by_modes, "circular")
        angular_series = circular_angular_momentum_flux_from_modes(order)
        angular = format_amplitude(None, angular_series, "circular")
        payload = {
            "orbit": orbit, "pn": pn,
            "energy": energy,
            "angular_momentum": angular,
            "normalisation": {
                "energy": "F / ((32/5) (c^5/G) nu^2 x^5)",
                "angular_momentum": "(dJ_z/dt) / ((32/5) m c^2 nu^2 x^(7/2))",
            },
            "routes": {"mode_sum": energy,
                       "stf_multipole_formula": format_amplitude(None, by_moments, "circular")},
            "routes_agree": agree,
            "forms": {"energy": _circular_form("energy", by_modes, circular_flux_term_provenance(order)),
                      "angular_momentum": _circular_form("angular_momentum", angular_series,
                                                         circular_flux_term_provenance(order))},
        }
        balance = _balance_entries(order)
        if "notes" in balance:
            payload["notes"] = balance["notes"]
        else:
            payload.update(balance["values"])
            payload["normalisation"].update(balance["normalisation"])
            payload["forms"].update(balance["forms"])
    else:
        payload = {"orbit": orbit, "pn": pn, **eccentric_flux_payload(sp.Rational(pn))}
    cache.put(key, payload)
    return payload


def _spinning_flux_payload(pn: str) -> dict:
    """:func:`flux_payload` for a circular orbit with aligned spins: both routes, the forms with
    per-term provenance, and the binding energy and rate of x of the aligned-spin circular orbit."""
    from ..exact import ExactPolynomial
    from ..radiative.fluxes import circular_flux_term_provenance
    from ..radiative.modes import format_amplitude
    from ..radiative.spinning_fluxes import (
        check_spinning_flux_order, spinning_energy_flux_from_modes, spinning_energy_flux_from_moments,
    )

    order = parse_bounded_order(pn, "--pn", check_spinning_flux_order("3/2"), reason=lambda _order: (
        "with spins the flux needs the spin-spin terms from x^2 and the next-to-leading spin-orbit terms "
        "from x^(5/2), which the toolkit does not have"))
    by_modes = spinning_energy_flux_from_modes(order)
    by_moments = spinning_energy_flux_from_moments(order)
    agree = all((by_modes.coefficient(n) - ExactPolynomial.from_sympy(by_moments.coefficient(n))).is_zero()
                for n in sorted(set(by_modes.orders) | set(by_moments.orders)))
    if not agree:
        raise RuntimeError("the two flux routes disagree: this is a bug, please report it")
    energy = format_amplitude(None, by_modes, "circular")
    provenance = circular_flux_term_provenance(order, spins="aligned")
    payload = {
        "orbit": "circular", "pn": pn, "spins": "aligned",
        # on a circular orbit dJ_z/dt = F/omega: with these normalisations the two series coincide
        "energy": energy, "angular_momentum": energy,
        "normalisation": {
            "energy": "F / ((32/5) (c^5/G) nu^2 x^5)",
            "angular_momentum": "(dJ_z/dt) / ((32/5) m c^2 nu^2 x^(7/2))",
        },
        "routes": {"mode_sum": energy, "stf_multipole_formula": format_amplitude(None, by_moments, "circular")},
        "routes_agree": agree,
        "forms": {"energy": _circular_form("energy", by_modes, provenance),
                  "angular_momentum": _circular_form("angular_momentum", by_modes, provenance)},
    }
    balance = _spinning_balance_entries(order)
    payload.update(balance["values"])
    payload["normalisation"].update(balance["normalisation"])
    payload["forms"].update(balance["forms"])
    return payload


def _spinning_balance_entries(order) -> dict:
    """The "binding_energy" and "x_rate" entries of the aligned-spin circular payload (as
    :func:`_balance_entries`): E(x) derived on the aligned-spin circular orbit and dx/dt from the
    balance with the aligned-spin flux, both known through the flux's order."""
    from ..binary.spin_circular import circular_energy
    from ..exact import ExactPolynomial
    from ..presentation import present_series
    from ..radiative.energy_balance import NORMALISATIONS
    from ..radiative.modes import format_amplitude
    from ..radiative.spinning_fluxes import spinning_circular_x_rate

    nu = ExactPolynomial("nu")
    # E/(mu c^2) = -(x/2) e(x): e(x) starts with 1
    relative_energy = circular_energy().map_coefficients(lambda v: v * -2).shift(-1).truncate(order)
    relative_rate = spinning_circular_x_rate(order)
    spin_source = ("aligned spins, leading spin-orbit terms (stfalgebra.binary.spin_circular: the circular orbit "
                   "derived from the cited 1PN and spin-orbit dynamics)")
    quantities = {
        "binding_energy": ("energy", relative_energy, (relative_energy * (nu * Fraction(-1, 2))).shift(1),
                           {"m": 1, "c": 2}, "E", "E", "conserved energy of the circular orbit (rest mass excluded)",
                           (spin_source,)),
        "x_rate": ("x_rate", relative_rate, (relative_rate * (nu * Fraction(64, 5))).shift(5),
                   {"c": 3, "G": -1, "m": -1}, "dx/dt", r"\frac{dx}{dt}",
                   "rate of change of x = (G m omega/c^3)^(2/3) from the energy balance",
                   (spin_source, "energy flux summed over the derived modes h_lm with aligned spins "
                    "(stfalgebra.radiative.spinning_fluxes)", "energy balance dE/dt = -F, expanded as a PN series in x")),
    }
    entries: dict = {"values": {}, "normalisation": {}, "forms": {}}
    for key, (name, relative, series, factors, symbol, latex_symbol, words, sources) in quantities.items():
        presented = present_series(series, factors=factors)
        entries["values"][key] = format_amplitude(None, relative, "circular")
        entries["normalisation"][key] = NORMALISATIONS[name]
        entries["forms"][key] = {"symbol": symbol, "latex_symbol": latex_symbol, "words": words,
                                 "expression": presented.to_text(), "latex": presented.to_latex(),
                                 **presented.to_json(), "provenance": list(sources)}
    return entries


@register("flux", "energy and angular-momentum fluxes (circular: two independent routes; eccentric: orbit averages)")
class FluxCommand:
    @staticmethod
    def configure(parser: argparse.ArgumentParser) -> None:
        parser.add_argument("--orbit", choices=("circular", "eccentric"), default="circular")
        parser.add_argument("--pn", metavar="P", required=True, help=LazyHelp(
            lambda: f"absolute PN order of the flux (a multiple of 1/2: at most "
                    f"{maximum_pn_order('flux', orbit='circular')} circular, "
                    f"{maximum_pn_order('flux', orbit='eccentric')} eccentric; from the table of contributions)"))
        add_format_option(parser)
        parser.add_argument("--no-cache", action="store_true")
        parser.add_argument("--spins", choices=("none", "aligned"), default="none",
                            help="none (default) or aligned: spins along the orbital angular momentum, chi1 and chi2 "
                                 "as symbols, leading spin-orbit terms (circular orbits and eccentric averages, "
                                 "at most 3/2)")

    @staticmethod
    def run(args) -> int:
        pn = str(parse_order_syntax(args.pn, "--pn"))
        spins = None if args.spins == "none" else args.spins
        payload = flux_payload(args.orbit, pn, not args.no_cache, spins)
        fmt = output_format(args)
        if fmt == "json":
            sys.stdout.write(json.dumps(payload, indent=1) + "\n")
            return 0
        header = f"{args.orbit} orbit, every term through relative order {pn}"
        spin_header = ["spins aligned with the orbital angular momentum: chi1, chi2 = c S_A.ell/(G m_A^2)"] \
            if "spins" in payload else []
        forms = [dict(form, pn=pn) for form in payload["forms"].values()]
        if fmt == "latex":
            notes = list(payload.get("notes", ()))
            if "enhancement_series" in payload:
                notes = [f"{name}(e_t): {payload['enhancement_functions'][name]}" for name in ("phi", "psi")]
            sys.stdout.write(latex_lines([header, *spin_header, *notes], forms))
            return 0
        lines = [f"# {header}"] + [f"# {line}" for line in spin_header]
        for name, form in payload["forms"].items():
            lines.append(f"{name}: {form['symbol']} = {form['expression']}")
        if "routes_agree" in payload:
            lines.append(f"mode sum and STF multipole formula agree: {payload['routes_agree']}")
        lines += [f"note: {note}" for note in payload.get("notes", ())]
        if "enhancement_series" in payload:
            series = payload["enhancement_series"]
            for name in ("phi", "psi"):
                lines.append(f"{name}(et): {payload['enhancement_functions'][name]}")
                lines.append(f"  through et^{series['order']}: {series[name]}")
        sys.stdout.write("\n".join(lines) + "\n")
        return 0
