"""``stfalgebra cache``: inspect or empty the on-disk cache of derived results.

``stfalgebra cache info [--json]`` prints the directory, the number of entries and their size;
``stfalgebra cache clear [--json]`` deletes every entry the toolkit provably wrote and names, on
stderr (in JSON under ``"left"``), every file named like an entry that it left in place, with
the reason; it exits 1 when it left any, 0 otherwise. ``--cache-dir DIR`` acts on another
directory than the default (``$STFALGEBRA_CACHE_DIR`` or the XDG user cache).
"""

from __future__ import annotations

import argparse
import json
import sys
from pathlib import Path

from . import register
from .cache import DerivationCache

__all__ = ["CacheCommand"]


@register("cache", "Show or clear the on-disk cache of derived results.")
class CacheCommand:
    """The ``cache`` sub-command (``info`` and ``clear``).

    **Conventions**
        Works with the cache directory whether or not caching is turned off by
        ``STFALGEBRA_NO_CACHE``; the ``enabled`` field of ``info`` says which.

    Examples
    --------
    >>> import tempfile
    >>> from stfalgebra.cli import main
    >>> scratch = tempfile.TemporaryDirectory()
    >>> main(["cache", "clear", "--cache-dir", scratch.name])  # doctest: +ELLIPSIS
    removed 0 entries from ...
    0
    >>> scratch.cleanup()

    **References**
        Common practice (a cache that the user can inspect and empty).
    """

    @staticmethod
    def configure(parser: argparse.ArgumentParser) -> None:
        """Add the ``info`` and ``clear`` actions and their options to ``parser``.

        Parameters
        ----------
        parser : argparse.ArgumentParser
            The ``cache`` sub-parser built by the registry.

        Returns
        -------
        None

        **Conventions**
            ``--json`` prints one JSON object on stdout instead of text lines.

        Examples
        --------
        >>> p = argparse.ArgumentParser(); CacheCommand.configure(p)
        >>> p.parse_args(["info", "--json"]).as_json
        True

        **References**
            Python ``argparse`` documentation, sub-commands.
        """
        actions = parser.add_subparsers(dest="cache_action", metavar="ACTION")
        actions.required = True
        for name, help_text in (
            ("info", "Print the cache directory, its number of entries and their total size."),
            ("clear", "Delete every entry of the cache that stfalgebra wrote; name what is left (exit 1)."),
        ):
            action = actions.add_parser(name, help=help_text, description=help_text)
            action.add_argument("--json", dest="as_json", action="store_true", help="print one JSON object")
            action.add_argument("--cache-dir", dest="cache_dir", type=Path, default=None, metavar="DIR",
                                help="cache directory (default: $STFALGEBRA_CACHE_DIR or ~/.cache/stfalgebra)")

    @staticmethod
    def run(args: argparse.Namespace) -> int:
        """Carry out ``cache info`` or ``cache clear``.

        Parameters
        ----------
        args : argparse.Namespace
            Parsed arguments with ``cache_action``, ``as_json`` and ``cache_dir``.

        Returns
        -------
        int
            Exit code 0; 1 when ``clear`` left files named like entries (not regular files,
            not written by stfalgebra, or refused by the operating system).

        **Conventions**
            Text output is ``key: value`` lines for ``info`` and one sentence for ``clear``.

        Examples
        --------
        >>> import tempfile
        >>> scratch = tempfile.TemporaryDirectory()
        >>> ns = argparse.Namespace(cache_action="info", as_json=True, cache_dir=Path(scratch.name))
        >>> CacheCommand.run(ns)  # doctest: +ELLIPSIS
        {"directory": "...", "enabled": ..., "entries": 0, "bytes": 0}
        0
        >>> scratch.cleanup()

        **References**
            Common practice.
        """
        cache = DerivationCache(args.cache_dir)
        out = sys.stdout
        if args.cache_action == "info":
            info = cache.info()
            if args.as_json:
                out.write(json.dumps({"directory": info["directory"], "enabled": info["enabled"],
                                      "entries": info["entries"], "bytes": info["bytes"]}) + "\n")
            else:
                out.write(f"directory: {info['directory']}\n"
                          f"enabled:   {'yes' if info['enabled'] else 'no (STFALGEBRA_NO_CACHE)'}\n"
                          f"entries:   {info['entries']}\n"
                          f"bytes:     {info['bytes']}\n")
            return 0
        if args.cache_action == "clear":
            report = cache.clear_entries()
            left = [{"path": path, "reason": reason} for path, reason in report.left]
            if args.as_json:
                out.write(json.dumps({"directory": report.directory, "removed": report.removed, "left": left}) + "\n")
            else:
                noun = "entry" if report.removed == 1 else "entries"
                out.write(f"removed {report.removed} {noun} from {report.directory}\n")
            for item in left:
                sys.stderr.write(f"stfalgebra cache: could not remove {item['path']}: {item['reason']}\n")
            return 1 if left else 0
        raise ValueError(f"unknown cache action {args.cache_action!r}; expected 'info' or 'clear'")
