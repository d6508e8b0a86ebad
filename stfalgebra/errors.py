"""The project's own errors.

Bad values raise the builtin ``ValueError`` and bad types ``TypeError`` (with a message naming
the value received). The classes below are for failures specific to the toolkit; they subclass
``ValueError`` so that callers catching bad input catch these too, except
:class:`CompilerFailureError`, which is a fault of the machine, not of the input.
"""

from __future__ import annotations

__all__ = [
    "StfAlgebraError",
    "OrderBeyondInputsError",
    "RefusedModeError",
    "ExpressionRefusedError",
    "OutputRefusedError",
    "CompilerFailureError",
]


class StfAlgebraError(ValueError):
    """Base class of every error raised on purpose by stfalgebra."""


class OrderBeyondInputsError(StfAlgebraError):
    """A PN order was requested beyond what the available inputs determine.

    Raised instead of silently truncating: a series known through relative order ``known``
    cannot answer for a coefficient at a higher order.
    """


class RefusedModeError(StfAlgebraError):
    """A mode the toolkit refuses to give, with the physical reason in the message
    (e.g. circular-orbit m = 0 modes, which come from the non-linear memory)."""


class ExpressionRefusedError(StfAlgebraError):
    """An untrusted expression was refused by the safe parser; the message names what."""


class OutputRefusedError(StfAlgebraError):
    """A destination for generated files was refused before anything was written: it is not a
    regular file (a link, a FIFO, a device, a directory), or it is read-only and replacing it
    was not forced. The message names the path and the reason."""


class CompilerFailureError(RuntimeError):
    """The system C compiler could not be used: it failed on a trivial program too (or could
    not be run), so a failed build says nothing about the generated code. Distinct from
    ``GeneratedCodeMismatchError``, the generated code's own failure."""
