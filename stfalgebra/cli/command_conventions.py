"""``stfalgebra conventions``: print the conventions every result is written in.

The document ships with the package (``stfalgebra/conventions.md``); it names the two sign
conventions by their polarisation triads, the phases psi and phi, the normalisations of the
modes and fluxes, and the form in which every result is printed.
"""

from __future__ import annotations

import argparse
import sys

from . import register

__all__: list[str] = []


@register("conventions", "print the conventions of every result (binary, orders, modes, phases, fluxes, output form)")
class ConventionsCommand:
    @staticmethod
    def configure(parser: argparse.ArgumentParser) -> None:
        return None

    @staticmethod
    def run(args: argparse.Namespace) -> int:
        from ..conventions import conventions_document

        sys.stdout.write(conventions_document())
        return 0
