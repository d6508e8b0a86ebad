"""``stfalgebra check``: compare your expression for Hhat_lm with the toolkit's derivation.

Command-line contract:

    stfalgebra check --mode L M --pn P [--orbit circular|general] [--json | --format text|latex|json] EXPR
    stfalgebra check --mode L M --pn P [--orbit circular|general] [--json] -- -EXPR
    stfalgebra check --mode L M --pn P [--orbit circular|general] [--json] --file PATH

EXPR is parsed by the safe parser (never evaluated): plain syntax or a LaTeX subset in the
orbit's symbols, with parentheses, square brackets (``\\left[ \\right]`` too) and braces as
grouping; every expression the toolkit prints (``mode``, ``modes``: text and LaTeX, either
phase, either sign convention) is accepted back. ``--file`` holds several expressions: a JSON list of strings, a JSON object
name -> string, or one expression per line (blank lines and lines starting with ``#``
skipped). The report goes to standard output, deterministic to the byte; ``--json`` prints one
JSON document instead; ``--format latex`` prints the report as LaTeX comments followed by your
expression and the derived one as two ``equation`` environments.

Verdicts and exit codes (``checking/compare.py`` says how a verdict is reached):

====  =====================  =========================================================
exit  verdict (JSON)         meaning
====  =====================  =========================================================
0     ``agree``              equal, proven exactly
1     ``differ``             a difference, proven exactly or far above the numeric
                             resolution (1e-80 of the size of the terms, 100 digits)
2     ``refused``            bad input: a refused expression, mode, order or option
3     ``cannot decide``      not equal as written, and numerically equal to 100 digits:
                             neither agreement nor difference can be shown
4     ``agrees to digits``   the expression has decimals, and agrees within the precision
                             they were given ("agrees to N digits"; JSON ``"digits": N``)
====  =====================  =========================================================

With several expressions the exit code is the least favourable one, in the order refused,
differ, cannot decide, agrees to N digits, agree. One time budget (``--time-limit``, default
120 s) covers the whole run, the derivation included: an expression still running when it is
spent, and every expression after it, is refused.
"""

from __future__ import annotations

import argparse
import json
import sys
import time

from . import UsageError, register
from .options import (
    DEFAULT_CHECK_TIME_LIMIT, add_format_option, add_sign_convention_option, argparse_type, check_mode,
    maximum_pn_order, mode_order_refusal, output_format, parse_bounded_order, parse_mode_index, parse_time_limit,
    sign_convention_of,
)
_MAX_FILE_BYTES = 2_000_000
_MAX_EXPRESSIONS = 200
# exit code per verdict, and the order in which verdicts of several expressions win
_EXIT_CODES = {"agree": 0, "differ": 1, "refused": 2, "cannot decide": 3, "agrees to digits": 4}
_PRECEDENCE = ("refused", "differ", "cannot decide", "agrees to digits", "agree")


def _read_expressions(path: str) -> list[tuple[str, str]]:
    """(name, text) pairs from a file: JSON list, JSON object or one expression per line."""
    try:
        with open(path, "rb") as handle:
            raw = handle.read(_MAX_FILE_BYTES + 1)
    except OSError as exc:
        raise UsageError(f"cannot read --file {path!r}: {exc.strerror or exc}") from None
    if len(raw) > _MAX_FILE_BYTES:
        raise UsageError(f"--file {path!r} is larger than {_MAX_FILE_BYTES} bytes")
    try:
        content = raw.decode("utf-8")
    except UnicodeDecodeError:
        raise UsageError(f"--file {path!r} is not UTF-8 text") from None
    stripped = content.strip()
    if stripped.startswith(("[", "{")):
        try:
            document = json.loads(stripped)
        except (json.JSONDecodeError, RecursionError) as exc:
            raise UsageError(f"--file {path!r} is not valid JSON: {str(exc)[:80]}") from None
        if isinstance(document, list):
            entries = [(f"item {k}", value) for k, value in enumerate(document, start=1)]
        elif isinstance(document, dict):
            entries = list(document.items())
        else:  # pragma: no cover - json.loads of '[...' or '{...' gives a list or dict
            raise UsageError(f"--file {path!r}: expected a JSON list or object")
        for name, value in entries:
            if not isinstance(value, str):
                raise UsageError(f"--file {path!r}: entry {str(name)[:40]!r} is not a string")
    else:
        entries = [(f"line {k}", line) for k, line in enumerate(content.splitlines(), start=1)
                   if line.strip() and not line.lstrip().startswith("#")]
    if not entries:
        raise UsageError(f"--file {path!r} holds no expression")
    if len(entries) > _MAX_EXPRESSIONS:
        raise UsageError(f"--file {path!r} holds {len(entries)} expressions (at most {_MAX_EXPRESSIONS})")
    return entries


@register("check", "compare an expression for Hhat_lm with the derived one, PN order by PN order")
class CheckCommand:
    @staticmethod
    def configure(parser: argparse.ArgumentParser) -> None:
        parser.add_argument("--mode", nargs=2, type=argparse_type(parse_mode_index), required=True,
                            metavar=("L", "M"), help="the mode (l, m), 2 <= l <= 30, |m| <= l")
        parser.add_argument("--pn", required=True, metavar="P",
                            help="absolute PN order through which to compare (circular: through x^P)")
        parser.add_argument("--orbit", choices=("circular", "general"), default="circular",
                            help="circular: EXPR in x, nu, delta; general: in r, rdot, phidot, m, c, nu, delta (G = 1)")
        add_sign_convention_option(parser)
        parser.add_argument("--phase", choices=("psi", "phi"), default="psi",
                            help="phase variable of circular modes: psi (default) or phi (EXPR may then hold "
                                 "ln(x/x0), x0 the reference of psi)")
        add_format_option(parser, ("text", "latex", "json"))
        parser.add_argument("--spins", choices=("none", "aligned"), default="none",
                            help="none (default) or aligned: the mode of a binary with spins along the orbital "
                                 "angular momentum; the expression may use chi1, chi2")
        parser.add_argument("--file", metavar="PATH", help="several expressions (JSON list/object or one per line)")
        parser.add_argument("--time-limit", metavar="SECONDS", type=argparse_type(parse_time_limit),
                            default=float(DEFAULT_CHECK_TIME_LIMIT),
                            help=f"time budget of the whole run, 1 to 3600 s (default {DEFAULT_CHECK_TIME_LIMIT})")
        parser.add_argument("expression", nargs="?", metavar="EXPR",
                            help="the expression (after '--' when it starts with '-')")

    @staticmethod
    def run(args: argparse.Namespace) -> int:
        started = time.monotonic()
        l, m = check_mode(*args.mode)
        sign_convention = sign_convention_of(args, "check")
        if (args.expression is None) == (args.file is None):
            raise UsageError("give exactly one of EXPR and --file PATH")
        entries = [(None, args.expression)] if args.file is None else _read_expressions(args.file)
        spins = None if args.spins == "none" else args.spins
        pn = parse_bounded_order(args.pn, "--pn", lambda: maximum_pn_order("check", orbit=args.orbit, modes=[(l, m)],
                                                                         spins=spins),
                                 reason=lambda order: mode_order_refusal(order, orbit=args.orbit, relative=False,
                                                                         modes=[(l, m)], spins=spins))

        import sympy as sp

        from ..checking.compare import compare_expressions, time_limit
        from ..checking.safe_parser import parse_with_decimals
        from ..errors import ExpressionRefusedError
        from ..radiative.modes import derive_mode

        budget = args.time_limit

        def left() -> float:
            return budget - (time.monotonic() - started)

        order = sp.Rational(pn.numerator, pn.denominator)
        try:
            with time_limit(max(left(), 1e-3), "deriving the mode"):
                derived = derive_mode(l, m, orbit=args.orbit, pn=order, sign_convention=sign_convention,
                                      phase=args.phase, spins=spins)
        except ExpressionRefusedError:
            raise UsageError(f"deriving Hhat_{l},{m} took longer than the time budget of the run "
                             f"({budget:g} s, --time-limit)") from None
        label = f"Hhat_{l},{m}"

        checks, texts, verdicts = [], [], []
        for name, text in entries:
            try:
                remaining = left()
                if remaining <= 0:
                    raise ExpressionRefusedError(
                        f"expression refused: not checked, the time budget of the run ({budget:g} s, "
                        f"--time-limit) is spent")
                try:
                    with time_limit(remaining, "parsing and comparing the expression"):
                        parsed = parse_with_decimals(text, orbit=args.orbit, spins=spins)
                        report = _compare(compare_expressions, parsed, derived.hhat, args.orbit, order, label)
                except ExpressionRefusedError as exc:
                    if "took longer than" in str(exc):
                        raise ExpressionRefusedError(
                            f"expression refused: the time budget of the run ({budget:g} s, --time-limit) ran "
                            f"out while comparing it (expression too expensive)") from None
                    raise
            except ExpressionRefusedError as exc:
                if args.file is None:
                    raise
                where = f"{name}: " if name else ""
                sys.stderr.write(f"stfalgebra check: error: {where}{exc}\n")
                checks.append({"name": name, "verdict": "refused", "reason": str(exc)})
                texts.append(f"== {name}: refused: {exc}")
                verdicts.append("refused")
                continue
            verdicts.append(report.verdict)
            shown = sp.sstr(parsed.display())
            checks.append({"name": name, "verdict": report.verdict, "digits": report.digits,
                           "expression": shown, "report": report.to_json()})
            if output_format(args) == "latex":
                texts.append(_latex_report(name, parsed.display(), derived, report))
                continue
            head = "" if name is None else f"== {name}\n"
            texts.append(head + f"your expression: {shown}\n" + report.to_text())
        verdict = next(v for v in _PRECEDENCE if v in verdicts)
        exit_code = _EXIT_CODES[verdict]
        if output_format(args) == "json":
            digits = [c["digits"] for c in checks if c["verdict"] == "agrees to digits"]
            document = {"mode": [l, m], "orbit": args.orbit, "pn": str(pn),
                        "sign_convention": sign_convention, "phase": derived.phase,
                        "verdict": verdict, "digits": min(digits) if verdict == "agrees to digits" else None,
                        "exit_code": exit_code, "checks": checks}
            if spins is not None:
                document["spins"] = spins
            sys.stdout.write(json.dumps(document, indent=2, ensure_ascii=True) + "\n")
        else:
            sys.stdout.write("\n\n".join(texts) + "\n")
        return exit_code


def _latex_report(name, yours, derived, report) -> str:
    """The report as LaTeX comments, then the user's expression and the derived one as two
    equations (the derived one in the toolkit's printed form)."""
    import sympy as sp

    from .. import symbols as S

    names = {S.nu: r"\nu", S.delta: r"\delta", S.x0: "x_0", S.rdot: r"\dot{r}", S.phidot: r"\dot{\phi}"}
    symbol = rf"\hat{{H}}_{{{derived.l},{derived.m}}}"
    lines = [] if name is None else [f"% == {name}"]
    lines += [f"% {line}" for line in report.to_text().splitlines()]
    lines += [r"\begin{equation}", rf"{symbol}^{{\mathrm{{yours}}}} = "
              + sp.latex(yours, ln_notation=True, symbol_names=names, imaginary_unit="i"), r"\end{equation}",
              r"\begin{equation}", f"{symbol} = {derived.hhat_latex()}", r"\end{equation}"]
    return "\n".join(lines)


def _compare(compare_expressions, parsed, derived, orbit, pn, label):
    """Run the comparison; any failure on the user's (untrusted) expression becomes a refusal,
    reported on one line, instead of a traceback."""
    from ..errors import ExpressionRefusedError, StfAlgebraError

    try:
        return compare_expressions(parsed.with_decimals, derived, orbit=orbit, pn=pn, label=label,
                                   decimals=parsed.decimals)
    except StfAlgebraError:
        raise
    except Exception as exc:  # sympy raises many error types (PolynomialError, NotImplementedError...)
        detail = " ".join(str(exc).split())[:120]
        raise ExpressionRefusedError(
            f"expression refused: cannot expand it as a PN series ({type(exc).__name__}: {detail})") from None
