"""``stfalgebra mode`` and ``stfalgebra modes``: derived mode amplitudes Hhat_lm.

Command-line contract (kept exactly; checks outside the repository use it):

    stfalgebra mode L M --orbit circular|general (--pn P | --pn-relative Q) [--json | --format F]
    stfalgebra modes --orbit circular|general (--pn P | --pn-relative Q) --lmax N [--json | --format F]

Every amplitude is written in one canonical form (:mod:`stfalgebra.presentation`): a prefactor
times a bracket of terms in increasing PN order. ``--format text`` (default) prints one line per
mode in sympy syntax, ``--format latex`` one ``equation`` environment per mode, ``--format json``
(or ``--json``) one JSON document: per mode the contract's keys ("l", "m", "orbit", "pn" or
"pn_relative" as exact strings such as "3/2", "kind", "hhat", "hhat_latex", "normalisation",
"phase", "sign_convention", "provenance", "note", "refused") and the form's keys ("prefactor",
"prefactor_latex", "leading_order", "terms": [{"order", "coefficient", "coefficient_latex",
"provenance"}]). Every note (m = 0 modes given without their memory part, a request that stops
below a mode's leading term) is printed in every format. Results are served from the on-disk
cache when the same request was derived before by the same code (``--no-cache`` to bypass).
Neither command imports sympy: the engine derives and prints.

``--spins aligned`` (circular and general planar orbits) adds the leading spin-orbit terms of
spins along the orbital angular momentum, with the dimensionless components ``chi1``, ``chi2``
as symbols; the JSON objects then carry ``"spins": "aligned"`` and the text and LaTeX outputs
say so in their header. ``--spins general`` (general orbits only) takes spins of any direction:
the components ``chi1_n, chi1_lambda, chi1_ell`` (and body 2's) on the instantaneous triad
(n, lambda, ell = e_z) of the orbital plane, every m derived on its own (``"spins": "general"``).
Without it (``--spins none``, the default) every output is that of a non-spinning binary,
exactly as without the option.

``--instantaneous-only`` (general orbits) serves the instantaneous part of a mode (the source
moments differentiated along the orbit: mass modes through relative 2PN) beyond relative 1PN,
where the tail enters and stays an unevaluated integral; each such mode carries
``"instantaneous_only": true`` and a note naming what is left out. Without it the output is as
before.
"""

from __future__ import annotations

import argparse
import json
import sys

from . import register
from .cache import DerivationCache, looks_like_expression
from .options import (
    add_format_option, add_sign_convention_option, argparse_type, check_mode, maximum_pn_order, mode_order_refusal,
    output_format, parse_bounded_order, parse_jobs, parse_l, parse_lmax, parse_m, parse_order_syntax,
    sign_convention_of,
)

__all__ = ["mode_payloads", "check_mode_payload", "mode_table"]

_SPIN_CHOICES = ("none", "aligned", "general")


def _add_common(parser: argparse.ArgumentParser) -> None:
    parser.add_argument("--orbit", choices=("circular", "general"), default="circular",
                        help="circular (Hhat in x, nu, delta) or general (in r, rdot, phidot, m, nu, delta, c)")
    order = parser.add_mutually_exclusive_group(required=True)
    order.add_argument("--pn", metavar="P",
                       help="absolute PN order: every term through x^P (circular) or (1/c)^(2P) beyond the "
                            "Newtonian h_22; a multiple of 1/2 up to the largest order derived for the modes asked")
    order.add_argument("--pn-relative", metavar="Q",
                       help="PN orders kept beyond each mode's own leading term (a multiple of 1/2, up to the "
                            "largest order the table of contributions gives for the modes asked)")
    add_format_option(parser)
    add_sign_convention_option(parser)
    parser.add_argument("--phase", choices=("psi", "phi"), default="psi",
                        help="phase variable of circular modes: psi (absorbs the tail's logarithm, default) or "
                             "phi (the orbital phase: the logarithm 3 i m x^(3/2) ln(x/x0) is inside Hhat)")
    parser.add_argument("--no-cache", action="store_true", help="derive afresh, do not read or write the cache")
    parser.add_argument("--spins", choices=_SPIN_CHOICES, default="none",
                        help="none (default), aligned: spins along the orbital angular momentum, chi1 and chi2 as "
                             "symbols, leading spin-orbit terms (relative 0.5PN in current modes, 1.5PN in mass "
                             "modes); or general (--orbit general only): spins of any direction, components "
                             "chiA_n, chiA_lambda, chiA_ell on the instantaneous triad (n, lambda, ell)")
    parser.add_argument("--instantaneous-only", action="store_true",
                        help="general orbits: the instantaneous part (source moments along the orbit) beyond the "
                             "order where the tail enters; the note names what is left out")


def _spins(args) -> str | None:
    """The ``spins`` keyword of the engine: None, "aligned" or "general" (refused on circular orbits)."""
    if args.spins == "general" and args.orbit != "general":
        raise ValueError("--spins general (spins of any direction) is derived on general orbits only: "
                         "use --orbit general (circular orbits take --spins aligned)")
    return None if args.spins == "none" else args.spins


def _order_request(args) -> dict:
    """The order as the cache key and the engine see it ({"pn": "3/2"} or {"pn_relative": ...});
    its form is checked here, its bound before a derivation (:func:`_bound_order`)."""
    if args.pn is not None:
        return {"pn": str(parse_order_syntax(args.pn, "--pn"))}
    return {"pn_relative": str(parse_order_syntax(args.pn_relative, "--pn-relative"))}


def _bound_order(order: dict, orbit: str, modes: list[tuple[int, int]] | None, lmax: int | None,
                 spins: str | None = None, instantaneous_only: bool = False) -> None:
    """Refuse (OrderBeyondInputsError, exit 2) an order beyond what the modes asked for can reach."""
    (name, text), = order.items()
    relative = name == "pn_relative"
    flag = "--pn-relative" if relative else "--pn"
    parts = {"instantaneous_only": True} if instantaneous_only else {}
    maximum = maximum_pn_order("modes", orbit=orbit, relative=relative, modes=modes, lmax=lmax, spins=spins, **parts)
    parse_bounded_order(text, flag, maximum, reason=lambda order: mode_order_refusal(
        order, orbit=orbit, relative=relative, modes=modes, lmax=lmax, spins=spins, **parts))


def mode_payloads(modes: list[tuple[int, int]] | None, lmax: int | None, orbit: str, order: dict,
                  sign_convention: str, phase: str, use_cache: bool, jobs: int = 1,
                  spins: str | None = None, instantaneous_only: bool = False) -> list[dict]:
    """JSON objects of the requested modes (derived, or from the cache after a shape check);
    a mode set is derived by ``jobs`` processes (the output does not depend on it)."""
    if instantaneous_only and orbit != "general":
        raise ValueError("--instantaneous-only applies to --orbit general (circular modes include their tails "
                         "and quadratic interactions)")
    cache = DerivationCache(enabled=use_cache)
    spin_key = {} if spins is None else {"spins": spins}     # the non-spinning keys stay as they were
    parts = {"instantaneous_only": True} if instantaneous_only else {}
    key = cache.key(command="modes", modes=modes, lmax=lmax, orbit=orbit, order=order,
                    sign_convention=sign_convention, phase=phase, schema=2, **spin_key, **parts)
    wanted = modes if modes is not None else [(l, m) for l in range(2, lmax + 1) for m in range(l, -l - 1, -1)]
    cached = cache.get(key, validate=lambda value: check_mode_payload(value, wanted, orbit, order))
    if cached is not None:
        return cached
    _bound_order(order, orbit, modes, lmax, spins, instantaneous_only)
    from ..radiative.modes import derive_mode, derive_modes

    kwargs = dict(orbit=orbit, sign_convention=sign_convention, phase=phase, **order, **spin_key, **parts)
    if modes is not None:
        results = [derive_mode(l, m, **kwargs) for l, m in modes]
    else:
        from .process_pool import mode_executor

        with mode_executor(jobs) as pool:
            results = derive_modes(lmax, executor=pool, **kwargs)
    payload = []
    for res in results:
        obj = res.to_json()
        obj["hhat_latex"] = res.hhat_latex()
        payload.append(obj)
    cache.put(key, payload)
    return payload


# the names a derived Hhat_lm may contain (sympy syntax)
_HHAT_NAMES = frozenset({"x", "x0", "nu", "delta", "r", "rdot", "phidot", "m", "c", "I", "pi", "EulerGamma",
                         "sqrt", "log", "exp", "chi1", "chi2", "chi1_n", "chi1_lambda", "chi1_ell", "chi2_n",
                         "chi2_lambda", "chi2_ell"})
_MODE_KEYS = {"l", "m", "orbit", "kind", "hhat", "normalisation", "phase", "sign_convention", "provenance",
              "hhat_latex"}
_FORM_KEYS = {"prefactor", "prefactor_latex", "leading_order", "terms"}


def check_mode_payload(value: object, wanted: list[tuple[int, int]], orbit: str, order: dict) -> None:
    """Raise ValueError unless ``value`` has the shape :func:`mode_payloads` stores for this
    request: one object per requested mode, in order, with the contract's keys and types, and
    every Hhat a sympy expression in the orbit's symbols (a cache entry is data from disk)."""
    if not isinstance(value, list) or len(value) != len(wanted):
        raise ValueError(f"expected a list of {len(wanted)} modes")
    (order_name, order_text), = order.items()
    for obj, (l, m) in zip(value, wanted):
        if not isinstance(obj, dict) or not _MODE_KEYS <= set(obj):
            raise ValueError(f"mode ({l},{m}): missing keys")
        if (obj["l"], obj["m"], obj["orbit"]) != (l, m, orbit) or order_name not in obj:
            raise ValueError(f"mode ({l},{m}): another mode or orbit")
        if obj["kind"] not in ("mass", "current", "memory") or not isinstance(obj["provenance"], list):
            raise ValueError(f"mode ({l},{m}): bad kind or provenance")
        if not isinstance(obj["normalisation"], dict) or not isinstance(obj["phase"], str) \
                or not isinstance(obj["sign_convention"], str):
            raise ValueError(f"mode ({l},{m}): bad conventions")
        if obj["hhat"] is None:
            if not isinstance(obj.get("refused"), str) or obj["hhat_latex"] is not None:
                raise ValueError(f"mode ({l},{m}): refused without a reason")
        elif not looks_like_expression(obj["hhat"], _HHAT_NAMES) or not isinstance(obj["hhat_latex"], str):
            raise ValueError(f"mode ({l},{m}): Hhat is not an expression")
        elif not _FORM_KEYS <= set(obj) or not isinstance(obj["terms"], list) or not all(
                isinstance(term, dict) and isinstance(term.get("order"), str)
                and looks_like_expression(term.get("coefficient"), _HHAT_NAMES) for term in obj["terms"]):
            raise ValueError(f"mode ({l},{m}): no prefactor and terms")
        if not isinstance(obj[order_name], str):
            raise ValueError(f"mode ({l},{m}): the order is not an exact string")


_SPINS_HEADERS = {
    "aligned": "spins aligned with the orbital angular momentum: chi1, chi2 = c S_A.ell/(G m_A^2)",
    "general": "spins of any direction: chiA_n, chiA_lambda, chiA_ell = c S_A.(n, lambda, ell)/(G m_A^2) on the "
               "instantaneous triad, ell = e_z along x cross v",
}


def _label(obj: dict) -> str:
    return f"({obj['l']},{obj['m']})".ljust(8) + obj["kind"].ljust(8)


def mode_table(payload: list[dict], fmt: str) -> str:
    """The mode objects as text (one line per mode, notes on the next line) or LaTeX (one
    ``equation`` environment per mode; conventions, refusals and notes as comments, the m = 0
    note also inside the equation)."""
    if not payload:
        return ""
    first = payload[0]
    order = f"pn = {first['pn']}" if "pn" in first else f"pn_relative = {first['pn_relative']}"
    lines = []
    if fmt == "latex":
        lines.append("% " + first["normalisation"]["words"])
        lines.append(f"% orbit {first['orbit']}, {order}, phase {first['phase']}, "
                     f"sign convention {first['sign_convention']}")
        if "spins" in first:
            lines.append("% " + _SPINS_HEADERS[first["spins"]])
        for obj in payload:
            l, m = obj["l"], obj["m"]
            if obj["hhat"] is None:
                lines.append(f"% ({l},{m}) refused: {obj['refused']}")
                continue
            note = obj.get("note")
            if note:
                lines.append(f"% ({l},{m}) note: {note}")
            body = obj["hhat_latex"]
            if note and "instantaneous part only" in note:
                body += r" \quad \text{(instantaneous part only)}"
            lines += [r"\begin{equation}", rf"\hat{{H}}_{{{l},{m}}} = {body}", r"\end{equation}"]
    else:
        lines.append(f"# {first['normalisation']['words']}")
        lines.append(f"# orbit {first['orbit']}, {order}, phase {first['phase']}, "
                     f"sign convention {first['sign_convention']}")
        if "spins" in first:
            lines.append("# " + _SPINS_HEADERS[first["spins"]])
        for obj in payload:
            body = f"refused: {obj['refused']}" if obj["hhat"] is None else obj["hhat"]
            lines.append(f"{_label(obj)}{body}")
            if obj["hhat"] is not None and obj.get("note"):
                lines.append(" " * 16 + f"note: {obj['note']}")
    return "\n".join(lines) + "\n"


def _emit(payload, args, single: bool) -> int:
    # one write at the end: an interrupted command leaves no partial output
    if output_format(args) == "json":
        document = payload[0] if single else {"modes": payload}
        sys.stdout.write(json.dumps(document, indent=1) + "\n")
    else:
        sys.stdout.write(mode_table(payload, args.format))
    return 0


@register("mode", "derive one mode amplitude Hhat_lm (e.g. 'mode 2 2 --pn 1', 'mode 2 -2 --pn-relative 0')")
class ModeCommand:
    @staticmethod
    def configure(parser: argparse.ArgumentParser) -> None:
        parser.add_argument("l", type=argparse_type(parse_l), help="multipole order, 2 <= l <= 30")
        parser.add_argument("m", type=argparse_type(parse_m), help="azimuthal number, -l <= m <= l")
        _add_common(parser)

    @staticmethod
    def run(args) -> int:
        check_mode(args.l, args.m)
        payload = mode_payloads([(args.l, args.m)], None, args.orbit, _order_request(args),
                                sign_convention_of(args, "mode"), args.phase, not args.no_cache, spins=_spins(args),
                                instantaneous_only=args.instantaneous_only)
        return _emit(payload, args, single=True)


@register("modes", "derive every mode 2 <= l <= lmax, -l <= m <= l (refused modes say why)")
class ModesCommand:
    @staticmethod
    def configure(parser: argparse.ArgumentParser) -> None:
        _add_common(parser)
        parser.add_argument("--lmax", type=argparse_type(parse_lmax), required=True,
                            help="highest l, 2 <= lmax <= 30")
        parser.add_argument("--jobs", type=argparse_type(parse_jobs), default=1, metavar="N",
                            help="worker processes, 1 to 64 (default 1); the output does not depend on it")

    @staticmethod
    def run(args) -> int:
        payload = mode_payloads(None, args.lmax, args.orbit, _order_request(args),
                                sign_convention_of(args, "modes"), args.phase, not args.no_cache, args.jobs,
                                spins=_spins(args), instantaneous_only=args.instantaneous_only)
        return _emit(payload, args, single=False)
