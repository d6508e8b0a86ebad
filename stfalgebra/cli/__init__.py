"""Command line of stfalgebra.

Each sub-command lives in its own module of this package and registers itself through
:func:`register`; ``main`` builds the parser from the registry. Errors the user can fix (bad
l, m, an order beyond what the toolkit derives, a malformed expression) become one line on
stderr and exit code 2, never a traceback.
"""

from __future__ import annotations

import argparse
import sys
from typing import Callable, Sequence

__all__ = ["main", "register", "UsageError"]

# name -> (help, configure(parser), run(args) -> exit code)
_COMMANDS: dict[str, tuple[str, Callable[[argparse.ArgumentParser], None], Callable[[argparse.Namespace], int]]] = {}


class UsageError(Exception):
    """Raised by a command for bad input; reported on one line with exit code 2."""


def register(name: str, help: str):
    """Decorator pair: ``@register(name, help)`` on a class with ``configure`` and ``run``."""

    def wrap(cls):
        _COMMANDS[name] = (help, cls.configure, cls.run)
        return cls

    return wrap


class _Parser(argparse.ArgumentParser):
    def error(self, message: str) -> None:  # argparse's own usage errors: exit 2, one line
        import re

        # "argument --nu: --nu must be ..." reads better without the repeated name
        message = re.sub(r"^argument ([^:]+): \1 ", r"\1 ", " ".join(message.split()))
        sys.stderr.write(f"stfalgebra: error: {message}\n")
        raise SystemExit(2)


def build_parser() -> argparse.ArgumentParser:
    _load_commands()
    parser = _Parser(prog="stfalgebra", description="Exact PN multipole algebra: modes, fluxes, code generation, checks.")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND", parser_class=_Parser)
    sub.required = True
    for name in sorted(_COMMANDS):
        help_text, configure, _ = _COMMANDS[name]
        p = sub.add_parser(name, help=help_text, description=help_text)
        configure(p)
    return parser


def _load_commands() -> None:
    import importlib
    import pkgutil

    for info in pkgutil.iter_modules(__path__):
        if info.name.startswith("command_"):
            importlib.import_module(f"{__name__}.{info.name}")


def main(argv: Sequence[str] | None = None) -> int:
    """Run one command; return its exit code.

    Exit codes common to every command: 0 success, 2 bad input (one line on stderr), 130
    interrupted (Ctrl-C: the command stops at once and prints nothing on standard output).
    Commands add their own (``check``: 1 differ, 3 cannot decide, 4 agrees to N digits;
    ``emit``: 1 failed verification, 3 compiler failure; ``cache clear``: 1 left entries).
    Every command writes its standard output in one piece at the end, so an interrupted or
    failed command leaves none.
    """
    try:
        return _dispatch(argv)
    except KeyboardInterrupt:
        sys.stderr.write("stfalgebra: interrupted\n")
        return 130


def _dispatch(argv: Sequence[str] | None) -> int:
    from ..errors import StfAlgebraError

    parser = build_parser()
    try:
        args = parser.parse_args(argv)
    except SystemExit as stop:  # --help (0) or a usage error already reported on one line (2)
        return stop.code if isinstance(stop.code, int) else 2
    _, _, run = _COMMANDS[args.command]
    try:
        return run(args)
    except (UsageError, StfAlgebraError, ValueError, TypeError) as exc:
        message = " ".join(str(exc).split())
        sys.stderr.write(f"stfalgebra {args.command}: error: {message}\n")
        return 2
    except BrokenPipeError:
        # the reader went away (e.g. piped into `head`): stop quietly, as Unix tools do
        import os

        os.dup2(os.open(os.devnull, os.O_WRONLY), sys.stdout.fileno())
        return 0


if __name__ == "__main__":  # pragma: no cover
    raise SystemExit(main())
