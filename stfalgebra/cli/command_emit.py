"""``stfalgebra emit``: C99 or numpy code for a set of modes, verified on emission.

    stfalgebra emit (--mode L M [--mode L M ...] | --lmax N) (--pn P | --pn-relative Q)
                    [--orbit circular|general] [--language c|numpy] [--output PATH]
                    [--quantity strain|hhat] [--mass-inputs] [--function-name NAME]
                    [--sign-convention minus-phi-theta|theta-phi] [--phase psi|phi]
                    [--no-verify] [--points N] [--spins none|aligned]

Without ``--output`` the code goes to standard output (C as one self-contained file); with it,
C is written as ``STEM.h`` and ``STEM.c`` and numpy as the given file; an existing directory
gets files named after the function inside it. The files are written as one set (a header and
a source from different runs refuse to compile together); a destination that is not a regular
file (a link, a FIFO) is refused, and a read-only one unless ``--force`` is given. The
verification summary goes to standard error, and so does a note for every mode of ``--lmax``
that is left out (with the reason: the same notes are in the generated file's documentation).

Exit codes: 0 success; 1 the generated code failed its verification (nothing written); 2 bad
input (a mode, an order, a name or a path refused, before any work); 3 the C compiler failed
on a trivial program too, so the code could not be verified (nothing written; ``--no-verify``
emits it unverified).
"""

from __future__ import annotations

import argparse
import sys
from pathlib import Path

from . import UsageError, register
from .options import (
    add_sign_convention_option, argparse_type, check_mode, maximum_pn_order, mode_order_refusal,
    parse_bounded_order, parse_jobs, parse_lmax, parse_mode_index, parse_verification_points, sign_convention_of,
)


@register("emit", "generate C99 or numpy code for modes h_lm, verified against exact evaluation")
class EmitCommand:
    @staticmethod
    def configure(parser: argparse.ArgumentParser) -> None:
        which = parser.add_mutually_exclusive_group(required=True)
        which.add_argument("--mode", nargs=2, type=argparse_type(parse_mode_index), action="append",
                           metavar=("L", "M"), help="a mode to emit, 2 <= L <= 30 (repeat for several)")
        which.add_argument("--lmax", type=argparse_type(parse_lmax), metavar="N",
                           help="every mode 2 <= l <= N, N <= 30 (refused modes left out)")
        order = parser.add_mutually_exclusive_group(required=True)
        order.add_argument("--pn", metavar="P", help="absolute PN order (circular: every term through x^P)")
        order.add_argument("--pn-relative", metavar="Q", help="PN orders kept beyond each mode's leading term")
        parser.add_argument("--orbit", choices=("circular", "general"), default="circular",
                            help="circular: inputs x, nu, delta, psi; general: r, rdot, phi, phidot, m, nu, delta, c")
        parser.add_argument("--language", choices=("c", "numpy"), default="c", help="C99 (default) or numpy")
        parser.add_argument("--output", metavar="PATH",
                            help="write files instead of printing (C: PATH without suffix, .c or .h gives STEM.h "
                                 "and STEM.c; an existing directory gets files named after the function)")
        parser.add_argument("--force", action="store_true", help="replace read-only output files")
        parser.add_argument("--quantity", choices=("strain", "hhat"), default="strain",
                            help="strain: R c^2 h_lm/(G m) including exp(-i m phase) (default); hhat: Hhat_lm")
        parser.add_argument("--mass-inputs", action="store_true",
                            help="take the masses m1, m2 as inputs instead of (m,) nu, delta")
        parser.add_argument("--function-name", default="stfalgebra_modes", metavar="NAME",
                            help="name of the generated function (sanitised into an identifier, at most 48 characters)")
        add_sign_convention_option(parser)
        parser.add_argument("--phase", choices=("psi", "phi"), default="psi",
                            help="phase variable of circular modes: psi (absorbs the tail's logarithm, default) or "
                                 "phi (the orbital phase; the code then takes x0 as an input)")
        parser.add_argument("--no-verify", action="store_true", help="skip compiling and checking the code")
        parser.add_argument("--points", type=argparse_type(parse_verification_points), default=8, metavar="N",
                            help="random points of the verification, 1 to 1000 (default 8)")
        parser.add_argument("--jobs", type=argparse_type(parse_jobs), default=1, metavar="N",
                            help="worker processes deriving the modes of --lmax, 1 to 64 (default 1)")
        parser.add_argument("--spins", choices=("none", "aligned"), default="none",
                            help="none (default) or aligned: spins along the orbital angular momentum, the generated "
                                 "function takes chi1, chi2 (after the masses)")

    @staticmethod
    def run(args: argparse.Namespace) -> int:
        # every input is checked before any work: modes, order, function name, output files
        modes = None
        if args.mode is not None:
            modes = [check_mode(l, m) for l, m in args.mode]
            if len(set(modes)) != len(modes):
                l, m = next(mode for mode in modes if modes.count(mode) > 1)
                raise UsageError(f"mode ({l}, {m}) given twice")
        relative = args.pn is None
        spins = None if args.spins == "none" else args.spins
        flag, text = ("--pn-relative", args.pn_relative) if relative else ("--pn", args.pn)
        order = parse_bounded_order(
            text, flag, lambda: maximum_pn_order("emit", orbit=args.orbit, relative=relative, modes=modes, lmax=args.lmax,
                                                 spins=spins),
            reason=lambda order: mode_order_refusal(order, orbit=args.orbit, relative=relative, modes=modes,
                                                    lmax=args.lmax, spins=spins))

        from ..codegen import generate_code, mode_emission
        from ..codegen.generate import output_paths, output_stem, write_generated_code
        from ..codegen.identifiers import function_identifier
        from ..codegen.verification import GeneratedCodeMismatchError
        from ..errors import CompilerFailureError
        from ..radiative.modes import derive_mode, derive_modes

        name = function_identifier(args.function_name)
        stem = header_name = None
        if args.output is not None:
            output_paths(args.language, args.output, args.function_name, force=args.force)
            stem, header_name = output_stem(args.language, args.output, args.function_name)
        kwargs = dict(orbit=args.orbit, sign_convention=sign_convention_of(args, "emit"), phase=args.phase,
                      **{"pn_relative" if relative else "pn": order}, **({} if spins is None else {"spins": spins}))
        if modes is not None:
            results = [derive_mode(l, m, **kwargs) for l, m in modes]
        else:
            from .process_pool import mode_executor

            with mode_executor(args.jobs) as pool:
                results = derive_modes(args.lmax, executor=pool, **kwargs)
        emission = mode_emission(results, quantity=args.quantity, function_name=args.function_name,
                                 mass_inputs=args.mass_inputs, skip_refused=modes is None)
        # every mode left out is said on the console, not only inside the generated file
        notes = [f"stfalgebra emit: note: {note}\n" for note in emission.notes if " left out: " in note]
        if name != args.function_name:
            notes.append(f"stfalgebra emit: note: function name {args.function_name!r} written as {name!r}\n")
        try:
            code = generate_code(emission, args.language, verify=not args.no_verify, points=args.points,
                                 header_name=header_name)
        except GeneratedCodeMismatchError as exc:
            sys.stderr.write("".join(notes) + f"stfalgebra emit: error: generated code failed verification, "
                             f"nothing written: {' '.join(str(exc).split())}\n")
            return 1
        except CompilerFailureError as exc:
            sys.stderr.write("".join(notes) + f"stfalgebra emit: error: {' '.join(str(exc).split())}; the code "
                             f"could not be verified and nothing was written (set CC to a working compiler, "
                             f"or pass --no-verify)\n")
            return 3
        if code.report is not None:
            prefix = "stfalgebra emit: " + ("" if code.report.verified else "note: ")
            notes.append(prefix + code.report.summary() + "\n")
        sys.stderr.write("".join(notes))
        if stem is None:
            sys.stdout.write(code.single_text)
            return 0
        try:
            written = write_generated_code(code, stem, force=args.force)
        except OSError as exc:
            raise UsageError(f"cannot write {args.output!r}: {exc.strerror or exc}") from None
        sys.stdout.write("".join(f"wrote {path}\n" for path in written))
        return 0

