"""``stfalgebra emit``: C99 or numpy code for a set of modes, verified on emission.

    stfalgebra emit (--mode L M [--mode L M ...] | --lmax N) (--pn P | --pn-relative Q)
                    [--orbit circular|general] [--language c|numpy] [--output PATH]
                    [--quantity strain|hhat] [--mass-inputs] [--function-name NAME]
                    [--sign-convention review|theta-phi] [--phase psi|phi]
                    [--no-verify] [--points N]

Without ``--output`` the code goes to standard output (C as one self-contained file); with it,
C is written as ``STEM.h`` and ``STEM.c`` and numpy as the given file, each atomically. The
verification summary goes to standard error. Exit 0 on success, 2 on bad input, 1 when the
generated code fails its verification (nothing is written then).
"""

from __future__ import annotations

import argparse
import sys
from pathlib import Path

from . import UsageError, register

_SIGN_CHOICES = ("review", "theta-phi")


def _mode_pair(text: str) -> int:
    try:
        return int(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"mode indices must be integers, got {text!r}") from None


def _positive_int(text: str) -> int:
    try:
        value = int(text)
    except ValueError:
        value = 0
    if value < 1 or value > 1000:
        raise argparse.ArgumentTypeError(f"expected an integer from 1 to 1000, got {text!r}")
    return value


@register("emit", "generate C99 or numpy code for modes h_lm, verified against exact evaluation")
class EmitCommand:
    @staticmethod
    def configure(parser: argparse.ArgumentParser) -> None:
        which = parser.add_mutually_exclusive_group(required=True)
        which.add_argument("--mode", nargs=2, type=_mode_pair, action="append", metavar=("L", "M"),
                           help="a mode to emit (repeat for several)")
        which.add_argument("--lmax", type=int, metavar="N", help="every mode 2 <= l <= N (refused modes left out)")
        order = parser.add_mutually_exclusive_group(required=True)
        order.add_argument("--pn", metavar="P", help="absolute PN order (circular: every term through x^P)")
        order.add_argument("--pn-relative", metavar="Q", help="PN orders kept beyond each mode's leading term")
        parser.add_argument("--orbit", choices=("circular", "general"), default="circular",
                            help="circular: inputs x, nu, delta, psi; general: r, rdot, phi, phidot, m, nu, delta, c")
        parser.add_argument("--language", choices=("c", "numpy"), default="c", help="C99 (default) or numpy")
        parser.add_argument("--output", metavar="PATH",
                            help="write files instead of printing (C: PATH without suffix, .c or .h gives STEM.h and STEM.c)")
        parser.add_argument("--quantity", choices=("strain", "hhat"), default="strain",
                            help="strain: R c^2 h_lm/(G m) including exp(-i m phase) (default); hhat: Hhat_lm")
        parser.add_argument("--mass-inputs", action="store_true",
                            help="take the masses m1, m2 as inputs instead of (m,) nu, delta")
        parser.add_argument("--function-name", default="stfalgebra_modes", metavar="NAME",
                            help="name of the generated function (sanitised into an identifier)")
        parser.add_argument("--sign-convention", choices=_SIGN_CHOICES, default="review",
                            help="review: Hhat_22 = +1 (default); theta-phi: every h_lm flipped")
        parser.add_argument("--phase", choices=("psi", "phi"), default="psi",
                            help="phase variable of circular modes (psi absorbs the tail logarithm)")
        parser.add_argument("--no-verify", action="store_true", help="skip compiling and checking the code")
        parser.add_argument("--points", type=_positive_int, default=8, metavar="N",
                            help="random points of the verification (default 8)")

    @staticmethod
    def run(args: argparse.Namespace) -> int:
        from ..codegen import (
            GeneratedCodeMismatchError,
            generate_code,
            mode_emission,
            output_stem,
            sanitize_identifier,
            write_generated_code,
        )
        from ..radiative.modes import derive_mode, derive_modes

        if args.output is not None:
            directory = Path(args.output).parent
            if not directory.is_dir():
                raise UsageError(f"output directory {str(directory)!r} does not exist")
        if args.lmax is not None and not 2 <= args.lmax <= 12:
            raise UsageError(f"--lmax must be between 2 and 12, got {args.lmax}")
        if args.mode is not None:
            seen = set()
            for l, m in args.mode:
                if (l, m) in seen:
                    raise UsageError(f"mode ({l}, {m}) given twice")
                seen.add((l, m))
        order = {"pn": args.pn} if args.pn is not None else {"pn_relative": args.pn_relative}
        kwargs = dict(orbit=args.orbit, sign_convention=args.sign_convention, phase=args.phase, **order)
        if args.mode is not None:
            results = [derive_mode(l, m, **kwargs) for l, m in args.mode]
        else:
            results = derive_modes(args.lmax, **kwargs)
        emission = mode_emission(results, quantity=args.quantity, function_name=args.function_name,
                                 mass_inputs=args.mass_inputs, skip_refused=args.mode is None)
        name = sanitize_identifier(args.function_name)
        if name != args.function_name:
            sys.stderr.write(f"stfalgebra emit: note: function name {args.function_name!r} written as {name!r}\n")
        header_name = None
        if args.output is not None:
            header_name = output_stem(args.language, args.output)[1]
        try:
            code = generate_code(emission, args.language, verify=not args.no_verify, points=args.points,
                                 header_name=header_name)
        except GeneratedCodeMismatchError as exc:
            sys.stderr.write(f"stfalgebra emit: error: generated code failed verification, nothing written: {exc}\n")
            return 1
        if code.report is not None:
            prefix = "stfalgebra emit: " + ("" if code.report.verified else "note: ")
            sys.stderr.write(prefix + code.report.summary() + "\n")
        if args.output is None:
            sys.stdout.write(code.single_text)
            return 0
        try:
            written = write_generated_code(code, args.output)
        except OSError as exc:
            raise UsageError(f"cannot write {args.output!r}: {exc.strerror or exc}") from None
        for path in written:
            sys.stdout.write(f"wrote {path}\n")
        return 0
