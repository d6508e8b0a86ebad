"""On-disk cache of derived results, for the command line.

A derivation (a mode, a flux, a moment at some PN order) is keyed by its inputs, the options
that fix its conventions, and a hash of the toolkit's own source code, so that a change to any
module of stfalgebra invalidates every earlier entry. Values are stored as JSON: the commands
store printed forms (strings, lists, dicts), never live sympy objects.

Each entry is one file ``<key>.entry`` whose first line is a header carrying the key and the
sha256 of the payload that follows; files are written to a temporary file in the same directory
and moved into place with ``os.replace``, so a reader sees either no entry or a whole one.

The directory is data from disk, not trusted:

* an entry is read only if it is a regular file (no link is followed, a FIFO or device is
  never opened for a blocking read) of at most :data:`MAX_ENTRY_BYTES`;
* an entry that fails any check (header, key, checksum, JSON, and the caller's check of the
  payload's shape) is not used: the caller recomputes, and one warning line goes to stderr;
* a file is deleted or replaced only when its first line is a header this toolkit writes, or
  when it is empty (nothing to lose); anything else named like an entry is left in place and
  reported by :meth:`DerivationCache.clear_entries`.

This module uses the standard library only: a warm CLI call must be able to consult the cache
before (or instead of) importing sympy.
"""

from __future__ import annotations

import errno
import hashlib
import json
import os
import re
import stat
import sys
import tempfile
import time
from dataclasses import dataclass
from pathlib import Path
from typing import Any, Callable

__all__ = [
    "DerivationCache", "ClearReport", "toolkit_source_hash", "default_cache_directory", "MAX_ENTRY_BYTES",
    "looks_like_expression",
]

# Bumped whenever the entry layout or the key recipe changes; part of every key.
_ENTRY_FORMAT = "v1"
_MAGIC = b"stfalgebra-cache-entry"
_ENTRY_SUFFIX = ".entry"
_TEMP_PREFIX = ".tmp-"
_TEMP_SUFFIX = ".part"
_KEY_PATTERN = re.compile(r"[0-9a-f]{64}")
_ENTRY_NAME_PATTERN = re.compile(r"[0-9a-f]{64}" + re.escape(_ENTRY_SUFFIX))
_TEMP_NAME_PATTERN = re.compile(re.escape(_TEMP_PREFIX) + r"[0-9a-f]{16}-[A-Za-z0-9_]+" + re.escape(_TEMP_SUFFIX))
# what a header line we wrote looks like (any entry format: older formats are ours too)
_HEADER_PATTERN = re.compile(re.escape(_MAGIC) + rb" v[0-9]{1,4} [0-9a-f]{64} [0-9a-f]{64}")
_HEADER_BYTES = 200

MAX_ENTRY_BYTES = 64 * 1024 * 1024
"""Largest entry read or written (a mode table through l = 30 is a few megabytes)."""
# Temporary files older than this are left-overs of killed writers; younger ones may belong to
# a writer that is still running, so `clear` leaves them alone.
_STALE_TEMP_SECONDS = 3600.0
_FALSE_WORDS = frozenset({"", "0", "false", "no", "off"})

# Directories already reported as unwritable in this process: warn once per directory.
_WARNED_DIRECTORIES: set[str] = set()
_SOURCE_HASHES: dict[str, str] = {}


def _package_root() -> Path:
    return Path(__file__).resolve().parent.parent


def toolkit_source_hash(package_root: Path | None = None) -> str:
    """Hash of every ``.py`` file of the stfalgebra package (sha256 hex), once per process.

    Parameters
    ----------
    package_root : Path or None
        Directory to hash; default the installed ``stfalgebra`` package this module belongs to.

    Returns
    -------
    str
        64 hexadecimal digits. Files are taken in sorted order of their path relative to the
        root, each with its relative path and length, so renaming, adding or removing a file
        changes the hash; ``__pycache__`` and non-Python files are ignored.

    **Conventions**
        The result is memoised per resolved root for the life of the process: a source edit is
        seen by the next process, which is when it matters for the cache.

    Examples
    --------
    >>> h = toolkit_source_hash()
    >>> len(h), h == toolkit_source_hash()
    (64, True)

    **References**
        Common practice for build caches: key on a content hash of the code that produced the
        result.
    """
    root = (package_root if package_root is not None else _package_root())
    if not isinstance(root, (str, os.PathLike)):
        raise TypeError(f"package_root must be a path, got {package_root!r}")
    root = Path(root).resolve()
    if not root.is_dir():
        raise ValueError(f"package_root {str(root)!r} is not a directory")
    cached = _SOURCE_HASHES.get(str(root))
    if cached is not None:
        return cached
    files = sorted(
        (path.relative_to(root).as_posix(), path)
        for path in root.rglob("*.py")
        if "__pycache__" not in path.relative_to(root).parts and path.is_file()
    )
    digest = hashlib.sha256()
    for relative, path in files:
        content = path.read_bytes()
        name = relative.encode("utf-8")
        # Length prefixes keep (name, content) boundaries unambiguous.
        digest.update(b"%d:" % len(name) + name + b"%d:" % len(content))
        digest.update(content)
    result = digest.hexdigest()
    _SOURCE_HASHES[str(root)] = result
    return result


def default_cache_directory() -> Path:
    """The cache directory used when none is given.

    Returns
    -------
    Path
        ``$STFALGEBRA_CACHE_DIR`` if set and non-empty, else ``$XDG_CACHE_HOME/stfalgebra`` if
        ``XDG_CACHE_HOME`` is an absolute path, else ``~/.cache/stfalgebra``. Nothing is created.

    **Conventions**
        Follows the XDG base-directory rule for user caches.

    Examples
    --------
    >>> default_cache_directory().name != ""
    True

    **References**
        XDG Base Directory Specification (freedesktop.org), ``XDG_CACHE_HOME``.
    """
    explicit = os.environ.get("STFALGEBRA_CACHE_DIR", "")
    if explicit:
        return Path(explicit).expanduser()
    xdg = os.environ.get("XDG_CACHE_HOME", "")
    if xdg and os.path.isabs(xdg):
        return Path(xdg) / "stfalgebra"
    return Path.home() / ".cache" / "stfalgebra"


def _compact_json(value: Any, what: str, *, canonical: bool) -> str:
    try:
        return json.dumps(value, sort_keys=canonical, separators=(",", ":"), ensure_ascii=True, allow_nan=False)
    except TypeError as exc:
        raise TypeError(f"{what} is not JSON-serialisable: {exc}") from None
    except ValueError as exc:
        raise ValueError(f"{what} cannot be stored: {exc}") from None


def _check_key(key: object) -> str:
    if not isinstance(key, str):
        raise TypeError(f"cache key must be a str from DerivationCache.key(), got {key!r}")
    if not _KEY_PATTERN.fullmatch(key):
        raise ValueError(f"cache key must be 64 lowercase hex digits, got {key!r}")
    return key


@dataclass(frozen=True)
class ClearReport:
    """What :meth:`DerivationCache.clear_entries` did: the number of entries removed and, for
    every file named like an entry (or a stale temporary file) that it left, the path and the
    reason (not a regular file, not written by stfalgebra, or the operating system's refusal)."""

    directory: str
    removed: int
    left: tuple[tuple[str, str], ...] = ()


class DerivationCache:
    """A directory of derived results keyed by inputs, conventions and the toolkit's code.

    Parameters
    ----------
    directory : Path or None
        Where the entries live; default :func:`default_cache_directory`. Created on the first
        write, never on a read.
    enabled : bool
        ``False`` turns caching off (``get`` always misses, ``put`` does nothing); so does the
        environment variable ``STFALGEBRA_NO_CACHE`` set to anything but ``""``, ``0``,
        ``false``, ``no``, ``off``. ``clear`` and ``info`` still act on the directory.
    code_hash : str or None
        Hash folded into every key; default :func:`toolkit_source_hash` of the installed
        package. Pin it only in tests or tools that must address entries across versions.

    **Conventions**
        Pass to :meth:`key` every input that changes the result, including the convention
        options (``sign_convention``, the phase variable, ...) even at their default values:
        the cache knows nothing of their meaning and keys only on what it is given. Values come
        back JSON-decoded: tuples become lists, dict keys become strings. A directory that
        cannot be written turns writing off with one line on stderr, never an exception.

    Examples
    --------
    >>> import tempfile
    >>> scratch = tempfile.TemporaryDirectory()
    >>> cache = DerivationCache(Path(scratch.name) / "c")
    >>> k = cache.key(command="modes", l=2, m=2, order="1PN", sign_convention="default")
    >>> cache.get(k) is None
    True
    >>> cache.put(k, {"H22": "1 - x*(107/42 - 55*nu/42)"})
    >>> cache.get(k)
    {'H22': '1 - x*(107/42 - 55*nu/42)'}
    >>> cache.info()["entries"], cache.clear(), cache.get(k)
    (1, 1, None)
    >>> scratch.cleanup()

    **References**
        Atomic replacement: POSIX ``rename(2)`` (Python ``os.replace``). Cache location: XDG
        Base Directory Specification.
    """

    def __init__(self, directory: Path | None = None, *, enabled: bool = True, code_hash: str | None = None) -> None:
        if directory is None:
            directory = default_cache_directory()
        elif not isinstance(directory, (str, os.PathLike)):
            raise TypeError(f"directory must be a path, got {directory!r}")
        if not isinstance(enabled, bool):
            raise TypeError(f"enabled must be a bool, got {enabled!r}")
        if code_hash is not None:
            if not isinstance(code_hash, str):
                raise TypeError(f"code_hash must be a str, got {code_hash!r}")
            if not code_hash:
                raise ValueError(f"code_hash must be non-empty, got {code_hash!r}")
        self._directory = Path(directory).expanduser()
        env_off = os.environ.get("STFALGEBRA_NO_CACHE", "").strip().lower() not in _FALSE_WORDS
        self._enabled = enabled and not env_off
        self._code_hash = code_hash
        self._writable = True

    def __repr__(self) -> str:
        return f"DerivationCache({str(self._directory)!r}, enabled={self._enabled})"

    @property
    def directory(self) -> Path:
        """The cache directory (it may not exist yet)."""
        return self._directory

    @property
    def enabled(self) -> bool:
        """Whether ``get`` and ``put`` use the directory."""
        return self._enabled

    def key(self, **inputs: Any) -> str:
        """Key (sha256 hex) of a derivation from its inputs.

        Parameters
        ----------
        **inputs
            JSON-serialisable values (str, int, float, bool, None, lists, dicts with str keys)
            naming the derivation and every option that changes its result.

        Returns
        -------
        str
            64 lowercase hex digits; equal inputs give equal keys whatever their keyword order,
            and a different toolkit source (or entry format) gives a different key.

        **Conventions**
            Inputs are compared as canonical JSON: ``1`` and ``1.0`` and ``True`` are distinct,
            a tuple and a list with the same items are the same.

        Examples
        --------
        >>> c = DerivationCache(Path("unused"), code_hash="0" * 64)
        >>> c.key(l=2, m=2) == c.key(m=2, l=2), c.key(l=2, m=2) == c.key(l=2, m=-2)
        (True, False)

        **References**
            Common practice (content-addressed caches).
        """
        if not inputs:
            raise ValueError("key() needs at least one input naming the derivation, got none")
        code = self._code_hash if self._code_hash is not None else toolkit_source_hash()
        document = {"format": _ENTRY_FORMAT, "code": code, "inputs": inputs}
        text = _compact_json(document, f"inputs {inputs!r}", canonical=True)
        return hashlib.sha256(text.encode("ascii")).hexdigest()

    def _entry_path(self, key: str) -> Path:
        return self._directory / (key + _ENTRY_SUFFIX)

    def get(self, key: str, validate: Callable[[Any], None] | None = None) -> object | None:
        """The stored value for ``key``, or ``None`` on a miss.

        Parameters
        ----------
        key : str
            A key from :meth:`key`.
        validate : callable or None
            Called with the decoded value; raises (any Exception) when the value does not have
            the shape the caller stores under this key. A value it refuses is not returned.

        Returns
        -------
        object or None
            The JSON-decoded value; ``None`` if there is no entry, caching is disabled, or the
            entry failed a check: not a regular file (links are not followed, FIFOs and devices
            are not read), larger than :data:`MAX_ENTRY_BYTES`, bad header, another key inside,
            checksum mismatch, bad JSON, refused by ``validate``. A failed check writes one
            warning line on stderr; the entry is deleted when its first line is a header this
            toolkit writes (or it is empty), and left in place otherwise.

        **Conventions**
            An entry is never trusted: the caller recomputes whenever it is refused.

        Examples
        --------
        >>> DerivationCache(Path("no-such-dir"), code_hash="0" * 64).get("a" * 64) is None
        True

        **References**
            Common practice (checksummed cache entries); POSIX ``open(2)``, ``O_NOFOLLOW`` and
            ``O_NONBLOCK``.
        """
        _check_key(key)
        if not self._enabled:
            return None
        path = self._entry_path(key)
        data, identity, problem = _read_regular_file(path, MAX_ENTRY_BYTES)
        if problem == "missing":
            return None
        if problem is None:
            value, problem = self._decode(key, data)
            if problem is None and validate is not None:
                try:
                    validate(value)
                except Exception as exc:  # the caller's shape check: any failure refuses the entry
                    problem = f"unexpected content ({' '.join(str(exc).split())[:80]})"
            if problem is None:
                return value
        removed = identity is not None and _written_here(data) and _discard(path, identity)
        fate = "removed it" if removed else "left it in place"
        sys.stderr.write(f"stfalgebra: warning: cache entry {path} not used ({problem}); {fate} and recomputing\n")
        return None

    @staticmethod
    def _decode(key: str, data: bytes) -> tuple[object, str | None]:
        header, newline, payload = data.partition(b"\n")
        if not newline:
            return None, "no header line"
        parts = header.split(b" ")
        if len(parts) != 4 or parts[0] != _MAGIC or parts[1] != _ENTRY_FORMAT.encode("ascii"):
            return None, "bad header"
        if parts[2] != key.encode("ascii"):
            return None, "another key inside"
        if parts[3] != hashlib.sha256(payload).hexdigest().encode("ascii"):
            return None, "checksum mismatch"
        try:
            value = json.loads(payload.decode("utf-8"))
        except (ValueError, RecursionError):  # JSONDecodeError and UnicodeDecodeError are ValueErrors
            return None, "not JSON"
        if value is None:
            return None, "null payload"
        return value, None

    def put(self, key: str, value: object) -> None:
        """Store ``value`` under ``key``, atomically.

        Parameters
        ----------
        key : str
            A key from :meth:`key`.
        value : object
            JSON-serialisable, not ``None`` (``None`` is how :meth:`get` reports a miss).

        Returns
        -------
        None
            Does nothing when caching is disabled, when the encoded value is larger than
            :data:`MAX_ENTRY_BYTES`, or when a file that this toolkit did not write (a link, a
            FIFO, a foreign file) holds the entry's name. If the directory cannot be created or
            written, writing is turned off for this cache with one warning line on stderr (once
            per directory and process).

        **Conventions**
            Last writer wins; concurrent writers of one key store equal values, so which one
            wins does not matter.

        Examples
        --------
        >>> import tempfile
        >>> scratch = tempfile.TemporaryDirectory()
        >>> c = DerivationCache(Path(scratch.name), code_hash="0" * 64)
        >>> c.put(c.key(x=1), [1, "2/3"]); c.get(c.key(x=1))
        [1, '2/3']
        >>> scratch.cleanup()

        **References**
            POSIX ``rename(2)``: the replacement of the target is atomic.
        """
        _check_key(key)
        if value is None:
            raise ValueError("None cannot be cached: get() returns None for a miss")
        payload = _compact_json(value, f"value of type {type(value).__name__}", canonical=False).encode("ascii")
        if not self._enabled or not self._writable or len(payload) > MAX_ENTRY_BYTES:
            return
        target = self._entry_path(key)
        if not _replaceable(target):
            return
        checksum = hashlib.sha256(payload).hexdigest()
        header = b" ".join([_MAGIC, _ENTRY_FORMAT.encode("ascii"), key.encode("ascii"), checksum.encode("ascii")])
        try:
            self._directory.mkdir(parents=True, exist_ok=True)
            descriptor, temp_name = tempfile.mkstemp(prefix=_TEMP_PREFIX + key[:16] + "-", suffix=_TEMP_SUFFIX, dir=self._directory)
        except OSError as exc:
            self._give_up_writing(exc)
            return
        try:
            try:
                with os.fdopen(descriptor, "wb") as handle:
                    handle.write(header + b"\n" + payload)
            except OSError as exc:  # disk full, quota: no point trying again in this process
                self._give_up_writing(exc)
                return
            try:
                os.replace(temp_name, target)
            except OSError:
                # The temporary file vanished (a concurrent clear) or the target is busy: skip
                # this one write; the directory itself is fine.
                return
            temp_name = None
        finally:
            if temp_name is not None:
                try:
                    os.unlink(temp_name)
                except OSError:
                    pass

    def _give_up_writing(self, exc: OSError) -> None:
        self._writable = False
        where = str(self._directory)
        if where not in _WARNED_DIRECTORIES:
            _WARNED_DIRECTORIES.add(where)
            reason = exc.strerror or type(exc).__name__
            sys.stderr.write(f"stfalgebra: warning: cannot write the cache directory {where} ({reason}); continuing without caching\n")

    def _listing(self) -> tuple[list[os.DirEntry], str | None]:
        try:
            with os.scandir(self._directory) as entries:
                return list(entries), None
        except FileNotFoundError:
            return [], None
        except OSError as exc:
            return [], exc.strerror or type(exc).__name__

    def clear(self) -> int:
        """Delete every entry this toolkit wrote; return how many (see :meth:`clear_entries`).

        Examples
        --------
        >>> DerivationCache(Path("no-such-dir"), code_hash="0" * 64).clear()
        0
        """
        return self.clear_entries().removed

    def clear_entries(self) -> ClearReport:
        """Delete every entry, and every temporary file left by a killed writer, that this
        toolkit provably wrote; report what it left.

        Returns
        -------
        ClearReport
            The number removed, and ``(path, reason)`` for each file named like an entry or a
            stale temporary file that was left: not a regular file (a link, a FIFO, a
            directory), not written by stfalgebra (neither empty nor starting with a header
            line of ours), or the operating system refused (a read-only directory). A directory
            that cannot be listed is reported the same way.

        **Conventions**
            Acts on the directory even when caching is disabled. Files that are not named like
            entries are never touched, so pointing the cache at a wrong directory cannot destroy
            other data. Temporary files younger than an hour may belong to a running writer and
            are left without a report.

        Examples
        --------
        >>> DerivationCache(Path("no-such-dir"), code_hash="0" * 64).clear_entries().left
        ()

        **References**
            Common practice.
        """
        removed = 0
        left: list[tuple[str, str]] = []
        listing, problem = self._listing()
        if problem is not None:
            left.append((str(self._directory), f"cannot list the directory: {problem}"))
        now = time.time()
        for entry in sorted(listing, key=lambda e: e.name):
            entry_name = _ENTRY_NAME_PATTERN.fullmatch(entry.name)
            temp_name = _TEMP_NAME_PATTERN.fullmatch(entry.name)
            if not (entry_name or temp_name):
                continue
            try:
                status = os.lstat(entry.path)
            except FileNotFoundError:  # removed meanwhile
                continue
            except OSError as exc:
                left.append((entry.path, exc.strerror or type(exc).__name__))
                continue
            if temp_name and now - status.st_mtime <= _STALE_TEMP_SECONDS:
                continue
            if not stat.S_ISREG(status.st_mode):
                left.append((entry.path, "not a regular file"))
                continue
            data, identity, problem = _read_regular_file(Path(entry.path), _HEADER_BYTES)
            if problem == "missing":
                continue
            if problem not in (None, "larger than the size cap") or not _written_here(data):
                left.append((entry.path, "not written by stfalgebra"))
                continue
            try:
                if _discard(Path(entry.path), identity, strict=True):
                    removed += entry_name is not None
            except OSError as exc:
                left.append((entry.path, exc.strerror or type(exc).__name__))
        return ClearReport(str(self._directory), removed, tuple(left))

    def info(self) -> dict:
        """Where the cache is and how much it holds.

        Returns
        -------
        dict
            ``directory`` (str), ``entries`` (int), ``bytes`` (int, total size of the entry
            files), ``enabled`` (bool).

        **Conventions**
            Entries are regular files named like entries, counted by name, not validated; a
            damaged one is found by the next :meth:`get` of its key.

        Examples
        --------
        >>> DerivationCache(Path("no-such-dir"), code_hash="0" * 64).info()["entries"]
        0

        **References**
            Common practice.
        """
        entries = 0
        size = 0
        for entry in self._listing()[0]:
            if _ENTRY_NAME_PATTERN.fullmatch(entry.name):
                try:
                    status = entry.stat(follow_symlinks=False)
                except OSError:  # removed meanwhile
                    continue
                if stat.S_ISREG(status.st_mode):
                    size += status.st_size
                    entries += 1
        return {"directory": str(self._directory), "entries": entries, "bytes": size, "enabled": self._enabled}


# ----------------------------------------------------------------------------- payload checks
_EXPRESSION_TOKEN = re.compile(r"[A-Za-z_][A-Za-z_0-9]*|[0-9]+|\*\*|[-+*/(). ]")


def looks_like_expression(text: object, names: frozenset[str] | set[str]) -> bool:
    """Whether ``text`` is written with numbers, ``+ - * / ** ( ) .``, spaces and the given
    names only: the check a command's payload validator applies to every expression it reads
    back from the cache (cheap, and without sympy).

    Examples
    --------
    >>> looks_like_expression("I*delta*x**(3/2)*(20*nu - 17)/84", {"I", "delta", "x", "nu"})
    True
    >>> looks_like_expression("WRONG", {"x"})
    False
    """
    if not isinstance(text, str) or not text or len(text) > MAX_ENTRY_BYTES:
        return False
    position = 0
    for token in _EXPRESSION_TOKEN.finditer(text):
        if token.start() != position:
            return False
        position = token.end()
        word = token.group(0)
        if (word[0].isalpha() or word[0] == "_") and word not in names:
            return False
    return position == len(text)


# ----------------------------------------------------------------------------- file helpers
_OPEN_FLAGS = os.O_RDONLY | getattr(os, "O_NOFOLLOW", 0) | getattr(os, "O_NONBLOCK", 0) | getattr(os, "O_CLOEXEC", 0)


def _read_regular_file(path: Path, limit: int) -> tuple[bytes, os.stat_result | None, str | None]:
    """(data, identity, problem): at most ``limit`` bytes of ``path`` if it is a regular file.

    The file is opened without following a link and without blocking (a FIFO opens at once and
    is then refused by its type); ``problem`` is None, ``"missing"``, or a short reason. When
    the file is larger than ``limit`` only its first line's worth of bytes is read (enough to
    tell whose it is) and comes back with the reason ``"larger than the size cap"``.
    """
    try:
        descriptor = os.open(path, _OPEN_FLAGS)
    except (FileNotFoundError, NotADirectoryError):  # no entry, or no directory to hold one
        return b"", None, "missing"
    except OSError as exc:
        if exc.errno == errno.ELOOP:
            return b"", None, "a symbolic link, not a regular file"
        return b"", None, exc.strerror or type(exc).__name__
    try:
        identity = os.fstat(descriptor)
        if not stat.S_ISREG(identity.st_mode):
            return b"", None, "not a regular file"
        if identity.st_size > limit:
            return os.read(descriptor, _HEADER_BYTES), identity, "larger than the size cap"
        chunks, total = [], 0
        while total <= limit:
            chunk = os.read(descriptor, min(1 << 20, limit + 1 - total))
            if not chunk:
                break
            chunks.append(chunk)
            total += len(chunk)
    except OSError as exc:
        return b"", None, exc.strerror or type(exc).__name__
    finally:
        os.close(descriptor)
    data = b"".join(chunks)
    if len(data) > limit:
        return data[:limit], identity, "larger than the size cap"
    return data, identity, None


def _written_here(data: bytes) -> bool:
    """Whether ``data`` starts with a header line this toolkit writes (for any key: a copy of
    an entry is ours too), or is empty: an empty file holds nothing to lose (a writer killed
    before its first byte, a crash before the data reached the disk)."""
    if not data:
        return True
    match = _HEADER_PATTERN.match(data)
    return bool(match) and data[match.end():match.end() + 1] in (b"\n", b"")


def _replaceable(target: Path) -> bool:
    """A new entry may take ``target``'s place: nothing is there, or an entry of ours."""
    try:
        status = os.lstat(target)
    except (FileNotFoundError, NotADirectoryError):
        return True
    except OSError:
        return False
    if not stat.S_ISREG(status.st_mode):
        return False
    data, _, problem = _read_regular_file(target, _HEADER_BYTES)
    return problem == "missing" or (problem in (None, "larger than the size cap") and _written_here(data))


def _discard(path: Path, identity: os.stat_result, *, strict: bool = False) -> bool:
    """Delete ``path`` if it is still the file read (a concurrent writer may already have put a
    good entry in its place, which must survive); return whether it was deleted. With
    ``strict`` an operating-system refusal is raised instead of ignored."""
    try:
        current = os.lstat(path)
        if (current.st_dev, current.st_ino) != (identity.st_dev, identity.st_ino):
            return False
        os.unlink(path)
        return True
    except FileNotFoundError:
        return False
    except OSError:
        if strict:
            raise
        return False
