"""Writing generated files so that a reader never sees a half-written one, and never through
something that is not a regular file.

A set of files (a C header and its source) is written as a unit: every file is written and
flushed to a temporary file beside its destination first, and only then are the temporary
files moved over the destinations, one :func:`os.replace` each. Whatever happens, each
destination holds either its old or its new content, whole; the generated texts carry a hash
of the set (:func:`stfalgebra.codegen.c_source.emission_set_id`), so a mixed set (a crash
between two replacements) is recognisable and does not compile.

Before anything is written every destination is checked: a symbolic link, a FIFO, a device or
a directory is never replaced, and a read-only file is replaced only when the caller forces
it. File names and paths are length-checked (with room for the temporary name) so that the
operating system never refuses a name half way through.
"""

from __future__ import annotations

import os
import stat
import tempfile
from pathlib import Path
from typing import Sequence

from ..errors import OutputRefusedError

__all__ = ["write_text_atomically", "write_file_set", "check_output_path", "MAX_PATH_BYTES"]

MAX_PATH_BYTES = 4000
"""Longest destination path accepted, in bytes (POSIX systems allow 4096 with the temporary
name beside it)."""
# the temporary name is ".NAME." + 8 random characters + ".tmp"
_TEMPORARY_EXTRA = 16
_DEFAULT_NAME_MAX = 255


def _describe(mode: int) -> str:
    if stat.S_ISLNK(mode):
        return "a symbolic link"
    if stat.S_ISDIR(mode):
        return "a directory"
    if stat.S_ISFIFO(mode):
        return "a FIFO"
    if stat.S_ISSOCK(mode):
        return "a socket"
    if stat.S_ISCHR(mode) or stat.S_ISBLK(mode):
        return "a device"
    return "not a regular file"


def _shown(path: Path) -> str:
    text = str(path)
    return repr(text if len(text) <= 60 else text[:28] + "..." + text[-28:])


def check_output_path(path: str | os.PathLike[str], *, force: bool = False) -> Path:
    """Check that generated code may be written to ``path``, before any work is done.

    Parameters
    ----------
    path:
        The destination file.
    force:
        Replace a read-only regular file too.

    Returns
    -------
    pathlib.Path
        The destination.

    Raises
    ------
    ValueError
        The directory does not exist, or the name or the path is too long.
    OutputRefusedError
        The destination exists and is not a regular file (a link, FIFO, device, directory), or
        is read-only and ``force`` is False. One line naming the path and the reason.

    Conventions
    -----------
    Read-only means no write permission bit set, or no write access for this process; even a
    privileged user is refused a read-only file without ``force``.

    Examples
    --------
    >>> import tempfile, pathlib
    >>> with tempfile.TemporaryDirectory() as d:
    ...     check_output_path(pathlib.Path(d) / "modes.c").name
    'modes.c'

    References
    ----------
    POSIX ``lstat(2)``, ``pathconf(3)`` (``NAME_MAX``).
    """
    target = Path(path)
    directory = target.parent if str(target.parent) else Path(".")
    if not directory.is_dir():
        raise ValueError(f"output directory {_shown(directory)} does not exist")
    try:
        name_max = os.pathconf(directory, "PC_NAME_MAX")
    except (OSError, ValueError):
        name_max = _DEFAULT_NAME_MAX
    name_bytes = len(target.name.encode("utf-8", "surrogateescape"))
    if name_bytes + _TEMPORARY_EXTRA > name_max:
        raise ValueError(f"output file name {_shown(Path(target.name))} has {name_bytes} bytes, "
                         f"at most {name_max - _TEMPORARY_EXTRA}")
    if len(os.fsencode(os.path.abspath(target))) > MAX_PATH_BYTES:
        raise ValueError(f"output path {_shown(target)} is longer than {MAX_PATH_BYTES} bytes")
    try:
        status = os.lstat(target)
    except FileNotFoundError:
        return target
    if not stat.S_ISREG(status.st_mode):
        raise OutputRefusedError(f"refusing to replace {_shown(target)}: it is {_describe(status.st_mode)}, "
                                 f"not a regular file")
    read_only = not (status.st_mode & (stat.S_IWUSR | stat.S_IWGRP | stat.S_IWOTH)) or not os.access(target, os.W_OK)
    if read_only and not force:
        raise OutputRefusedError(f"refusing to replace {_shown(target)}: it is read-only (force to replace it)")
    return target


def write_file_set(files: Sequence[tuple[str | os.PathLike[str], str]], *, force: bool = False) -> list[Path]:
    """Write several text files as a unit; return their paths.

    Parameters
    ----------
    files:
        ``(path, text)`` pairs; each directory must exist.
    force:
        Replace read-only regular files too.

    Returns
    -------
    list of pathlib.Path
        The destinations, in the order given.

    Raises
    ------
    ValueError, OutputRefusedError
        As :func:`check_output_path`, for any destination, before anything is written.
    OSError
        Writing failed; every temporary file is removed and no destination was touched, unless
        the failure came between two replacements (the hash in the files tells).

    Conventions
    -----------
    All contents are written, flushed and synced to temporary files first; the replacements
    follow in the order given, then the directories are synced. New files get the permissions
    a plain ``open(path, "w")`` would give.

    Examples
    --------
    >>> import tempfile, pathlib
    >>> with tempfile.TemporaryDirectory() as d:
    ...     paths = write_file_set([(pathlib.Path(d) / "a.h", "h\\n"), (pathlib.Path(d) / "a.c", "c\\n")])
    ...     [p.read_text() for p in paths]
    ['h\\n', 'c\\n']

    References
    ----------
    POSIX ``rename(2)``; Python documentation of :func:`os.replace` and :func:`os.fsync`.
    """
    pairs = []
    for path, text in files:
        if not isinstance(text, str):
            raise TypeError(f"text must be a str, got {type(text).__name__}")
        pairs.append((check_output_path(path, force=force), text))
    if len({os.path.abspath(target) for target, _ in pairs}) != len(pairs):
        raise ValueError("two generated files would have the same path")
    temporaries: list[str] = []
    try:
        for target, text in pairs:
            directory = target.parent if str(target.parent) else Path(".")
            fd, temp_name = tempfile.mkstemp(prefix=f".{target.name}.", suffix=".tmp", dir=directory)
            temporaries.append(temp_name)
            with os.fdopen(fd, "w", encoding="utf-8", newline="\n") as handle:
                handle.write(text)
                handle.flush()
                os.fsync(handle.fileno())
            os.chmod(temp_name, 0o666 & ~_current_umask())
        # last look: nothing may have turned into a link or a FIFO meanwhile
        for target, _ in pairs:
            check_output_path(target, force=force)
        for index, (target, _) in enumerate(pairs):
            os.replace(temporaries[index], target)
            temporaries[index] = ""
    finally:
        for temp_name in temporaries:
            if temp_name:
                try:
                    os.unlink(temp_name)
                except FileNotFoundError:
                    pass
    for directory in {target.parent if str(target.parent) else Path(".") for target, _ in pairs}:
        _sync_directory(directory)
    return [target for target, _ in pairs]


def write_text_atomically(path: str | os.PathLike[str], text: str, *, force: bool = False) -> Path:
    """Write ``text`` to ``path`` through a temporary file in the same directory.

    Parameters
    ----------
    path:
        Destination file. Its directory must exist; an existing regular file is replaced (a
        read-only one only with ``force``); anything else is refused.
    text:
        The content, written as UTF-8.
    force:
        Replace a read-only file too.

    Returns
    -------
    pathlib.Path
        The destination path.

    Conventions
    -----------
    :func:`write_file_set` of one file: the content goes to a temporary file beside the
    destination, is flushed to disk, and is moved over the destination with
    :func:`os.replace`. On any failure the temporary file is removed and the destination is
    left as it was.

    Examples
    --------
    >>> import tempfile, pathlib
    >>> with tempfile.TemporaryDirectory() as d:
    ...     p = write_text_atomically(pathlib.Path(d) / "a.txt", "hello\\n")
    ...     p.read_text()
    'hello\\n'

    References
    ----------
    POSIX ``rename(2)``; Python documentation of :func:`os.replace`.
    """
    if not isinstance(text, str):
        raise TypeError(f"text must be a str, got {type(text).__name__}")
    return write_file_set([(path, text)], force=force)[0]


def _sync_directory(directory: Path) -> None:
    # the replacements themselves reach the disk only with the directory
    try:
        fd = os.open(directory, os.O_RDONLY | getattr(os, "O_DIRECTORY", 0))
    except OSError:
        return
    try:
        os.fsync(fd)
    except OSError:
        pass
    finally:
        os.close(fd)


def _current_umask() -> int:
    # os.umask can only be read by setting it; restore immediately.
    mask = os.umask(0o022)
    os.umask(mask)
    return mask
