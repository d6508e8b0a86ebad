"""``stfalgebra orbit-mode``: one mode along an eccentric orbit, exact in the eccentric anomaly,
and optionally its harmonics.

Contract:

    stfalgebra orbit-mode L M [--pn P] [--format text|latex|json | --json]
    stfalgebra orbit-mode L M [--pn P] --eccentricity E [--harmonics N] [--x X] [--nu NU] [...]

prints ``H_lm(x, e_t, u)`` and ``W(x, e_t, u)`` of :mod:`stfalgebra.radiative.eccentric_modes`,

    h_lm = (2 G m nu x/(R c^2)) sqrt(16 pi/5) H_lm exp(-i m W) exp(-i m lambda),

``lambda = omega (t - t_0)`` (azimuthal periodicity), ``u`` the eccentric anomaly of the 1PN
quasi-Keplerian orbit in harmonic coordinates (``l = u - et sin u = n (t - t_0)``, periastron at
``u = 0``; radial periodicity), ``et`` the time eccentricity, ``x = (G m omega/c^3)^(2/3)``.
Instantaneous part only: no tails, no memory. ``P`` (absolute, every term through ``x^P``
relative to the Newtonian h_22; default 1) is 0, 1/2 or 1.

With ``--eccentricity E`` (0 <= E <= 0.9) the command adds the Fourier coefficients ``c_p`` of
``H_lm exp(-i m W) = sum_p c_p exp(i p l)`` for ``p = -N..N`` (``--harmonics N``, 1..200, default
20), computed numerically (FFT, 8 N points, at least 256) at ``--x X`` (in [1e-8, 1), default
0.1) and ``--nu NU`` (in (0, 1/4], default 1/4; ``delta = sqrt(1 - 4 nu)``, body 1 the heavier).
Harmonic ``p`` of ``h_lm`` oscillates at the frequency ``p n - m omega``.

JSON keys: ``"l"``, ``"m"``, ``"pn"`` (exact text), ``"amplitude"`` and ``"phase"`` (the forms of
:mod:`stfalgebra.cli.forms`: ``"symbol"``, ``"words"``, ``"expression"``, ``"latex"``,
``"prefactor"``, ``"terms"``, ``"provenance"`` ... ; terms in powers of ``x``), ``"notes"`` (list of text), and with
an eccentricity ``"numeric"``: ``{"eccentricity", "x", "nu"`` (exact texts), ``"harmonics"`` (N),
``"coefficients"``: ``[{"p", "real", "imag"}, ...]`` in increasing ``p``}.

Results are cached on disk (``stfalgebra cache``); ``--no-cache`` derives afresh.

Bad input is one line on stderr and exit code 2: l < 2 or above 30, abs(m) > l, an order beyond
1PN (the message names what is missing), a number outside its range, ``--harmonics``, ``--x`` or
``--nu`` without ``--eccentricity``.
"""

from __future__ import annotations

import argparse
import json
import sys
from fractions import Fraction
from types import SimpleNamespace

from . import UsageError, register
from .cache import DerivationCache
from .forms import check_quantity_json, latex_lines, sympy_series_form, text_lines
from .options import (HARMONICS_RANGE, add_format_option, check_mode, exact_number_text, output_format,
                      parse_bounded_order,
                      parse_frequency_parameter, parse_harmonics, parse_l, parse_m, parse_nu, parse_number,
                      parse_order_syntax)

__all__ = ["orbit_mode_payload", "MAX_ECCENTRICITY", "DEFAULT_X", "DEFAULT_NU",
           "DEFAULT_HARMONICS"]

#: Largest eccentricity whose harmonics the command computes.
MAX_ECCENTRICITY = Fraction(9, 10)
DEFAULT_HARMONICS = 20
DEFAULT_X = Fraction(1, 10)
DEFAULT_NU = Fraction(1, 4)

_NOTES = (
    "h_lm = (2 G m nu x/(R c^2)) sqrt(16 pi/5) H_lm exp(-i m W) exp(-i m lambda), lambda = omega (t - t_0)",
    "u: eccentric anomaly of the 1PN quasi-Keplerian orbit (harmonic coordinates), l = u - et sin u = n (t - t_0), "
    "periastron at u = 0; et: time eccentricity; x = (G m omega/c^3)^(2/3), omega = (1 + k) n",
    "instantaneous part only: no tails, no memory",
)


def _refusal(order) -> str:
    return ("modes along an eccentric orbit are served through 1PN: beyond it they need the 2PN "
            "quasi-Keplerian orbit and the 1.5PN hereditary tails along the eccentric orbit, neither built")


def _form(terms, pn: str, symbol: str, latex_symbol: str, words: str, provenance: str) -> dict:
    """The forms.py series form of ``((power of x, coefficient), ...)``."""
    import sympy as sp

    series = SimpleNamespace(terms=dict(terms) or {Fraction(0): sp.S.Zero})
    form = sympy_series_form(series, prefactor="1", prefactor_latex="1")
    return {"symbol": symbol, "latex_symbol": latex_symbol, "words": words, "pn": pn, **form,
            "provenance": [provenance]}


_NAMES = frozenset({"et", "u", "x", "nu", "delta", "I", "sqrt", "cos", "sin", "atan"})


def _check_payload(value: object, l: int, m: int, pn: str, numeric: bool) -> None:
    """Raise unless a cache entry has the shape of this command's payload."""
    if not isinstance(value, dict) or (value.get("l"), value.get("m"), value.get("pn")) != (l, m, pn):
        raise ValueError("not an orbit-mode document")
    for key in ("amplitude", "phase"):
        check_quantity_json(value.get(key), _NAMES)
    if numeric:
        rows = value["numeric"]["coefficients"]
        if not all(isinstance(row["p"], int) and isinstance(row["real"], float) and isinstance(row["imag"], float)
                   for row in rows):
            raise ValueError("not a list of harmonics")
    elif "numeric" in value:
        raise ValueError("unexpected harmonics")


def orbit_mode_payload(l: int, m: int, pn: str, eccentricity: Fraction | None = None,
                       harmonics: int = DEFAULT_HARMONICS, frequency: Fraction = DEFAULT_X,
                       nu_value: Fraction = DEFAULT_NU, use_cache: bool = True) -> dict:
    """The JSON object of ``stfalgebra orbit-mode`` (module docstring), derived or from the
    cache after a shape check. ``pn`` is the order's text (bounded here before a derivation:
    a cache hit does not import the engine); the other arguments are already checked."""
    cache = DerivationCache(enabled=use_cache)
    numeric_inputs = None if eccentricity is None else [
        exact_number_text(eccentricity), harmonics, exact_number_text(frequency), exact_number_text(nu_value)]
    key = cache.key(command="orbit-mode", l=l, m=m, pn=pn, numeric=numeric_inputs, schema=1)
    cached = cache.get(key, validate=lambda value: _check_payload(value, l, m, pn, eccentricity is not None))
    if cached is not None:
        return cached
    from ..radiative.eccentric_modes import ECCENTRIC_MODE_MAX_PN

    order = parse_bounded_order(pn, "--pn", ECCENTRIC_MODE_MAX_PN, reason=_refusal)
    payload = _derive_payload(l, m, order, eccentricity, harmonics, frequency, nu_value)
    cache.put(key, payload)
    return payload


def _derive_payload(l: int, m: int, order, eccentricity: Fraction | None, harmonics: int, frequency: Fraction,
                    nu_value: Fraction) -> dict:
    import math

    from ..radiative.eccentric_modes import mode_along_orbit, numeric_mode_harmonics
    from ..symbols import delta, nu

    mode = mode_along_orbit(l, m, order)
    pn = str(order)
    payload: dict = {
        "l": l, "m": m, "pn": pn,
        "amplitude": _form(mode.amplitude_terms, pn, f"H_{l}{m}" if m >= 0 else f"H_{l}m{-m}",
                           rf"H_{{{l}{m}}}" if m >= 0 else rf"H_{{{l},{m}}}",
                           "amplitude along the orbit, function of (x, et, u)",
                           "general-orbit instantaneous mode (derive_mode) on the quasi-Keplerian orbit"),
        "phase": _form(mode.phase_terms, pn, "W", "W", "periodic phase phi - lambda, function of (x, et, u)",
                       "(1 + k)(v_phi - l) of the quasi-Keplerian orbit, expanded in x"),
        "notes": list(_NOTES),
    }
    if eccentricity is not None:
        values = {nu: float(nu_value), delta: math.sqrt(1 - 4 * float(nu_value))}
        coefficients = numeric_mode_harmonics(l, m, float(eccentricity), float(frequency), pn=order,
                                              harmonics=harmonics, values=values)
        payload["numeric"] = {
            "eccentricity": exact_number_text(eccentricity), "x": exact_number_text(frequency),
            "nu": exact_number_text(nu_value), "harmonics": harmonics,
            "coefficients": [{"p": p, "real": coefficients[p].real, "imag": coefficients[p].imag}
                             for p in sorted(coefficients)],
        }
    return payload


def _numeric_lines(numeric: dict, prefix: str) -> list[str]:
    lines = [f"{prefix} harmonics c_p of H exp(-i m W) = sum_p c_p exp(i p l) (frequency p n - m omega), "
             f"et = {numeric['eccentricity']}, x = {numeric['x']}, nu = {numeric['nu']} (FFT)",
             f"{prefix} p  Re(c_p)  Im(c_p)"]
    rows = [f"{row['p']} {row['real']!r} {row['imag']!r}" for row in numeric["coefficients"]]
    return lines + ([f"{prefix} " + row for row in rows] if prefix == "%" else rows)


@register("orbit-mode", "one mode along an eccentric orbit through 1PN, exact in the eccentric anomaly "
                        "(instantaneous part), and its numerical harmonics")
class OrbitModeCommand:
    @staticmethod
    def configure(parser: argparse.ArgumentParser) -> None:
        parser.add_argument("l", metavar="L", help="multipole order l >= 2")
        parser.add_argument("m", metavar="M", help="azimuthal number, |m| <= l")
        parser.add_argument("--pn", metavar="P", default="1",
                            help="absolute PN order 0, 1/2 or 1 (default 1)")
        parser.add_argument("--eccentricity", metavar="E",
                            help="time eccentricity in [0, 0.9]: add the numerical harmonics")
        parser.add_argument("--harmonics", metavar="N",
                            help=f"harmonics p = -N..N, N from {HARMONICS_RANGE[0]} to {HARMONICS_RANGE[1]} "
                                 f"(default {DEFAULT_HARMONICS})")
        parser.add_argument("--x", metavar="X", help="frequency parameter x in [1e-8, 1) (default 0.1)")
        parser.add_argument("--nu", metavar="NU", help="symmetric mass ratio in (0, 1/4] (default 1/4)")
        add_format_option(parser)
        parser.add_argument("--no-cache", action="store_true", help="derive afresh, do not read or write the cache")

    @staticmethod
    def run(args) -> int:
        l_index, m_index = check_mode(parse_l(args.l), parse_m(args.m))
        pn = str(parse_order_syntax(args.pn, "--pn"))
        eccentricity = None
        if args.eccentricity is not None:
            eccentricity = parse_number(args.eccentricity, "--eccentricity", low=Fraction(0),
                                        high=MAX_ECCENTRICITY)
        else:
            for flag, value in (("--harmonics", args.harmonics), ("--x", args.x), ("--nu", args.nu)):
                if value is not None:
                    raise UsageError(f"{flag} needs --eccentricity (the harmonics are numerical)")
        harmonics = (DEFAULT_HARMONICS if args.harmonics is None
                     else parse_harmonics(args.harmonics))
        frequency = DEFAULT_X if args.x is None else parse_frequency_parameter(args.x, "--x")
        nu_value = DEFAULT_NU if args.nu is None else parse_nu(args.nu)
        payload = orbit_mode_payload(l_index, m_index, pn, eccentricity, harmonics, frequency, nu_value,
                                     not args.no_cache)
        fmt = output_format(args)
        quantities = (payload["amplitude"], payload["phase"])
        header = [f"mode ({l_index}, {m_index}) along an eccentric orbit", *payload["notes"]]
        if fmt == "json":
            text = json.dumps(payload, indent=1) + "\n"
        elif fmt == "latex":
            text = latex_lines(header, quantities)
            if "numeric" in payload:
                text += "\n".join(_numeric_lines(payload["numeric"], "%")) + "\n"
        else:
            text = text_lines(header, quantities)
            if "numeric" in payload:
                text += "\n".join(_numeric_lines(payload["numeric"], "#")) + "\n"
        sys.stdout.write(text)
        return 0
