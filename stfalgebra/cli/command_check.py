"""``stfalgebra check``: compare your expression for Hhat_lm with the toolkit's derivation.

Command-line contract:

    stfalgebra check --mode L M --pn P [--orbit circular|general] [--json] EXPR
    stfalgebra check --mode L M --pn P [--orbit circular|general] [--json] -- -EXPR
    stfalgebra check --mode L M --pn P [--orbit circular|general] [--json] --file PATH

EXPR is parsed by the safe parser (never evaluated): plain syntax or a LaTeX subset in the
orbit's symbols. ``--file`` holds several expressions: a JSON list of strings, a JSON object
name -> string, or one expression per line (blank lines and lines starting with ``#``
skipped). Exit 0 when every expression agrees, 1 when one differs, 2 on bad input (a refused
expression, a bad mode or order). The report goes to standard output, deterministic to the
byte; ``--json`` prints one JSON document instead.
"""

from __future__ import annotations

import argparse
import json
import sys

from . import UsageError, register

_SIGN_CHOICES = ("review", "theta-phi")
_MAX_FILE_BYTES = 2_000_000
_MAX_EXPRESSIONS = 200
_TIME_LIMIT_SECONDS = 30.0


def _integer(text: str) -> int:
    try:
        return int(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"mode indices must be integers, got {text!r}") from None


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
        parser.add_argument("--mode", nargs=2, type=_integer, required=True, metavar=("L", "M"),
                            help="the mode (l, m)")
        parser.add_argument("--pn", required=True, metavar="P",
                            help="absolute PN order through which to compare (circular: through x^P)")
        parser.add_argument("--orbit", choices=("circular", "general"), default="circular",
                            help="circular: EXPR in x, nu, delta; general: in r, rdot, phidot, m, c, nu, delta (G = 1)")
        parser.add_argument("--sign-convention", choices=_SIGN_CHOICES, default="review",
                            help="review: Hhat_22 = +1 (default); theta-phi: every h_lm flipped")
        parser.add_argument("--phase", choices=("psi", "phi"), default="psi",
                            help="phase variable of circular modes (psi absorbs the tail logarithm)")
        parser.add_argument("--json", action="store_true", help="print one JSON document")
        parser.add_argument("--file", metavar="PATH", help="several expressions (JSON list/object or one per line)")
        parser.add_argument("expression", nargs="?", metavar="EXPR",
                            help="the expression (after '--' when it starts with '-')")

    @staticmethod
    def run(args: argparse.Namespace) -> int:
        from ..checking.compare import compare_expressions, parse_pn_order, time_limit
        from ..checking.safe_parser import parse_expression
        from ..errors import ExpressionRefusedError
        from ..radiative.modes import derive_mode

        if (args.expression is None) == (args.file is None):
            raise UsageError("give exactly one of EXPR and --file PATH")
        entries = [(None, args.expression)] if args.file is None else _read_expressions(args.file)
        pn = parse_pn_order(args.pn)
        l, m = args.mode
        derived = derive_mode(l, m, orbit=args.orbit, pn=pn, sign_convention=args.sign_convention,
                              phase=args.phase)
        label = f"Hhat_{l},{m}"

        checks, texts, codes = [], [], []
        for name, text in entries:
            try:
                with time_limit(_TIME_LIMIT_SECONDS, "parsing and comparing the expression"):
                    expression = parse_expression(text, orbit=args.orbit)
                    report = _compare(compare_expressions, expression, derived.hhat, args.orbit, pn, label)
            except ExpressionRefusedError as exc:
                if args.file is None:
                    raise
                where = f"{name}: " if name else ""
                sys.stderr.write(f"stfalgebra check: error: {where}{exc}\n")
                checks.append({"name": name, "verdict": "refused", "reason": str(exc)})
                texts.append(f"== {name}: refused: {exc}")
                codes.append(2)
                continue
            code = 0 if report.agree else 1
            codes.append(code)
            checks.append({"name": name, "verdict": "agree" if report.agree else "differ",
                           "expression": _sstr(expression), "report": report.to_json()})
            head = "" if name is None else f"== {name}\n"
            texts.append(head + f"your expression: {_sstr(expression)}\n" + report.to_text())
        exit_code = max(codes)
        if args.json:
            document = {"mode": [l, m], "orbit": args.orbit, "pn": str(pn),
                        "sign_convention": args.sign_convention, "phase": derived.phase,
                        "verdict": {0: "agree", 1: "differ", 2: "refused"}[exit_code],
                        "exit_code": exit_code, "checks": checks}
            sys.stdout.write(json.dumps(document, indent=2, ensure_ascii=True) + "\n")
        else:
            sys.stdout.write("\n\n".join(texts) + "\n")
        return exit_code


def _compare(compare_expressions, expression, derived, orbit, pn, label):
    """Run the comparison; any failure on the user's (untrusted) expression becomes a refusal,
    reported on one line, instead of a traceback."""
    from ..errors import ExpressionRefusedError, StfAlgebraError

    try:
        return compare_expressions(expression, derived, orbit=orbit, pn=pn, label=label)
    except StfAlgebraError:
        raise
    except Exception as exc:  # sympy raises many error types (PolynomialError, NotImplementedError...)
        detail = " ".join(str(exc).split())[:120]
        raise ExpressionRefusedError(
            f"expression refused: cannot expand it as a PN series ({type(exc).__name__}: {detail})") from None


def _sstr(expression) -> str:
    import sympy as sp

    return sp.sstr(expression)
