"""Writing generated files so that a reader never sees a half-written one."""

from __future__ import annotations

import os
import tempfile
from pathlib import Path

__all__ = ["write_text_atomically"]


def write_text_atomically(path: str | os.PathLike[str], text: str) -> Path:
    """Write ``text`` to ``path`` through a temporary file in the same directory.

    Parameters
    ----------
    path:
        Destination file. Its directory must exist; an existing file is replaced.
    text:
        The content, written as UTF-8.

    Returns
    -------
    pathlib.Path
        The destination path.

    Conventions
    -----------
    The content goes to a temporary file beside the destination, is flushed to disk, and is
    moved over the destination with :func:`os.replace` (atomic on POSIX and Windows within one
    file system). On any failure the temporary file is removed and the destination is left as
    it was. The new file gets the permissions a plain ``open(path, "w")`` would give.

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
    target = Path(path)
    directory = target.parent if str(target.parent) else Path(".")
    if not directory.is_dir():
        raise ValueError(f"output directory {str(directory)!r} does not exist")
    if target.is_dir():
        raise ValueError(f"output path {str(target)!r} is a directory")
    fd, temp_name = tempfile.mkstemp(prefix=f".{target.name}.", suffix=".tmp", dir=directory)
    try:
        with os.fdopen(fd, "w", encoding="utf-8", newline="\n") as handle:
            handle.write(text)
            handle.flush()
            os.fsync(handle.fileno())
        os.chmod(temp_name, 0o666 & ~_current_umask())
        os.replace(temp_name, target)
    except BaseException:
        try:
            os.unlink(temp_name)
        except FileNotFoundError:
            pass
        raise
    return target


def _current_umask() -> int:
    # os.umask can only be read by setting it; restore immediately.
    mask = os.umask(0o022)
    os.umask(mask)
    return mask
