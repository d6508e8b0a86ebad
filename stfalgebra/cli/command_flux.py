"""``stfalgebra flux``: orbit-averaged / circular energy and angular-momentum fluxes.

Contract:

    stfalgebra flux --orbit circular --pn P [--json]     JSON key "energy": F / ((32/5)(c^5/G) nu^2 x^5)
    stfalgebra flux --orbit eccentric --pn P [--json]    JSON keys "energy", "angular_momentum"
                                                          (the latter / ((32/5) m c^2 nu^2 x^(7/2)))

For circular orbits both routes (mode sum and STF multipole formula) are computed and must
agree; the output says so. ``--spins aligned`` (circular orbits) adds the leading spin-orbit
terms of spins along the orbital angular momentum (symbols ``chi1``, ``chi2``; key
``"spins": "aligned"``); without it the output is as before.

Eccentric orbits, P <= 3/2: "energy" and "angular_momentum" are the orbit averages in x, nu and
the time eccentricity et, exact closed forms through 1PN. At P = 3/2 they carry the leading
tail as ``4*pi*x**(3/2)*phi(et)`` and ``4*pi*x**(3/2)*psi(et)``, with the enhancement
functions phi, psi left symbolic (no closed form exists); two more keys describe them:
"enhancement_functions" {"phi", "psi"} (their definitions, in words) and
"enhancement_series" {"order", "phi", "psi"} (their exact power series through
et**ENHANCEMENT_SERIES_ORDER, rational coefficients). Numbers: ``stfalgebra enhancement``.
"""

from __future__ import annotations

import argparse
import json
import sys

from . import register
from .cache import DerivationCache, looks_like_expression
from .options import maximum_pn_order, parse_bounded_order, parse_order_syntax

__all__ = ["flux_payload", "check_flux_payload", "eccentric_flux_payload", "ENHANCEMENT_SERIES_ORDER",
           "ENHANCEMENT_DEFINITIONS"]

_FLUX_NAMES = frozenset({"x", "nu", "et", "pi", "EulerGamma", "log", "sqrt", "phi", "psi", "chi1", "chi2", "delta"})

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
        PN order 0, 1/2, 1 or 3/2 (int, Rational, Fraction or text).

    Returns
    -------
    dict
        ``{"energy": str, "angular_momentum": str}``: the averaged fluxes of
        :mod:`stfalgebra.radiative.eccentric_fluxes` as expressions in ``x, nu, et`` (sympy
        syntax); at 3/2 also ``"enhancement_functions"`` and ``"enhancement_series"`` (module
        docstring).

    Raises
    ------
    OrderBeyondInputsError
        ``pn > 3/2``.

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

    payload = {"energy": text(averaged_energy_flux(order)),
               "angular_momentum": text(averaged_angular_momentum_flux(order))}
    if order >= sp.Rational(3, 2):
        phi, psi = tail_enhancement_series(ENHANCEMENT_SERIES_ORDER)
        payload["enhancement_functions"] = dict(ENHANCEMENT_DEFINITIONS)
        payload["enhancement_series"] = {"order": ENHANCEMENT_SERIES_ORDER,
                                         "phi": sp.sstr(phi), "psi": sp.sstr(psi)}
    return payload


def check_flux_payload(value: object, orbit: str, pn: str) -> None:
    """Raise ValueError unless ``value`` has the shape :func:`flux_payload` stores (a cache
    entry is data from disk)."""
    keys = {"orbit", "pn", "energy", "angular_momentum"}
    optional: set[str] = set()
    if orbit == "circular":
        keys |= {"normalisation", "routes", "routes_agree"}
        optional = {"spins"}
    else:
        optional = {"enhancement_functions", "enhancement_series"}
    if not isinstance(value, dict) or not keys <= set(value) <= keys | optional:
        raise ValueError("unexpected keys")
    if (value["orbit"], value["pn"]) != (orbit, pn):
        raise ValueError("another orbit or order")
    if not all(looks_like_expression(value[name], _FLUX_NAMES) for name in ("energy", "angular_momentum")):
        raise ValueError("a flux is not an expression")
    if orbit == "circular" and (value["routes_agree"] is not True or not isinstance(value["routes"], dict)
                                or not isinstance(value["normalisation"], dict)):
        raise ValueError("bad routes or normalisation")


def flux_payload(orbit: str, pn: str, use_cache: bool = True, spins: str | None = None) -> dict:
    """The JSON object of ``stfalgebra flux`` (derived, or from the cache after a shape check);
    ``pn`` is the order's text ("3/2"), bounded here before a derivation; ``spins`` None or
    "aligned" (circular orbits)."""
    if spins not in (None, "aligned"):
        raise ValueError(f"spins must be None or 'aligned', got {spins!r}")
    if spins is not None and orbit != "circular":
        raise ValueError(f"--spins {spins} is available on circular orbits only, got --orbit {orbit}")
    cache = DerivationCache(enabled=use_cache)
    spin_key = {} if spins is None else {"spins": spins}     # the non-spinning keys stay as they were
    key = cache.key(command="flux", orbit=orbit, pn=pn, schema=1, **spin_key)
    cached = cache.get(key, validate=lambda value: check_flux_payload(value, orbit, pn))
    if cached is not None:
        return cached
    if spins is not None:
        payload = _spinning_flux_payload(pn)
        cache.put(key, payload)
        return payload
    parse_bounded_order(pn, "--pn", maximum_pn_order("flux", orbit=orbit))
    import sympy as sp

    if orbit == "circular":
        from ..radiative.fluxes import (
            circular_angular_momentum_flux_from_modes, circular_energy_flux_from_modes,
            circular_energy_flux_from_moments,
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
        angular = format_amplitude(None, circular_angular_momentum_flux_from_modes(order), "circular")
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
        }
    else:
        payload = {"orbit": orbit, "pn": pn, **eccentric_flux_payload(sp.Rational(pn))}
    cache.put(key, payload)
    return payload


def _spinning_flux_payload(pn: str) -> dict:
    """:func:`flux_payload` for a circular orbit with aligned spins (both routes)."""
    from ..radiative.modes import format_amplitude
    from ..radiative.spinning_fluxes import (
        check_spinning_flux_order, spinning_energy_flux_from_modes, spinning_energy_flux_from_moments,
    )

    order = parse_bounded_order(pn, "--pn", check_spinning_flux_order("3/2"), reason=lambda _order: (
        "with spins the flux needs the spin-spin terms from x^2 and the next-to-leading spin-orbit terms "
        "from x^(5/2), which the toolkit does not have"))
    by_modes = spinning_energy_flux_from_modes(order)
    by_moments = spinning_energy_flux_from_moments(order)
    from ..exact import ExactPolynomial

    agree = all((by_modes.coefficient(n) - ExactPolynomial.from_sympy(by_moments.coefficient(n))).is_zero()
                for n in sorted(set(by_modes.orders) | set(by_moments.orders)))
    if not agree:
        raise RuntimeError("the two flux routes disagree: this is a bug, please report it")
    energy = format_amplitude(None, by_modes, "circular")
    return {
        "orbit": "circular", "pn": pn, "spins": "aligned",
        # on a circular orbit dJ_z/dt = F/omega: with these normalisations the two series coincide
        "energy": energy, "angular_momentum": energy,
        "normalisation": {
            "energy": "F / ((32/5) (c^5/G) nu^2 x^5)",
            "angular_momentum": "(dJ_z/dt) / ((32/5) m c^2 nu^2 x^(7/2))",
        },
        "routes": {"mode_sum": energy, "stf_multipole_formula": format_amplitude(None, by_moments, "circular")},
        "routes_agree": agree,
    }


@register("flux", "energy and angular-momentum fluxes (circular: two independent routes; eccentric: orbit averages)")
class FluxCommand:
    @staticmethod
    def configure(parser: argparse.ArgumentParser) -> None:
        parser.add_argument("--orbit", choices=("circular", "eccentric"), default="circular")
        parser.add_argument("--pn", metavar="P", required=True,
                            help="absolute PN order of the flux (a multiple of 1/2: at most 3/2 circular and eccentric)")
        parser.add_argument("--json", action="store_true")
        parser.add_argument("--no-cache", action="store_true")
        parser.add_argument("--spins", choices=("none", "aligned"), default="none",
                            help="none (default) or aligned: spins along the orbital angular momentum, chi1 and chi2 "
                                 "as symbols, leading spin-orbit terms (circular orbits, at most 3/2)")

    @staticmethod
    def run(args) -> int:
        pn = str(parse_order_syntax(args.pn, "--pn"))
        payload = flux_payload(args.orbit, pn, not args.no_cache, None if args.spins == "none" else args.spins)
        if args.json:
            sys.stdout.write(json.dumps(payload, indent=1) + "\n")
            return 0
        lines = [f"# {args.orbit} orbit, through {pn}PN"]
        if "spins" in payload:
            lines.append("# spins aligned with the orbital angular momentum: chi1, chi2 = c S_A.ell/(G m_A^2)")
        for name in ("energy", "angular_momentum"):
            if name in payload:
                lines.append(f"{name}: {payload[name]}")
                norm = payload.get("normalisation", {}).get(name)
                if norm:
                    lines.append(f"  ({norm})")
        if "routes_agree" in payload:
            lines.append(f"mode sum and STF multipole formula agree: {payload['routes_agree']}")
        if "enhancement_series" in payload:
            series = payload["enhancement_series"]
            for name in ("phi", "psi"):
                lines.append(f"{name}(et): {payload['enhancement_functions'][name]}")
                lines.append(f"  through et^{series['order']}: {series[name]}")
        sys.stdout.write("\n".join(lines) + "\n")
        return 0
