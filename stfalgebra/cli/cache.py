"""On-disk cache of derived results, for the command line.

A derivation (a mode, a flux, a moment at some PN order) is keyed by its inputs, the options
that fix its conventions, and a hash of the toolkit's own source code, so that a change to any
module of stfalgebra invalidates every earlier entry. Values are stored as JSON: the commands
store printed forms (strings, lists, dicts), never live sympy objects.

Each entry is one file ``<key>.entry`` whose first line is a header carrying the key and the
sha256 of the payload that follows; files are written to a temporary file in the same directory
and moved into place with ``os.replace``, so a reader sees either no entry or a whole one. An
entry that fails any check (header, key, checksum, JSON) is deleted and reported as a miss.

This module uses the standard library only: a warm CLI call must be able to consult the cache
before (or instead of) importing sympy.
"""

from __future__ import annotations

import hashlib
import json
import os
import re
import sys
import tempfile
import time
from pathlib import Path
from typing import Any

__all__ = ["DerivationCache", "toolkit_source_hash", "default_cache_directory"]

# Bumped whenever the entry layout or the key recipe changes; part of every key.
_ENTRY_FORMAT = "v1"
_MAGIC = b"stfalgebra-cache-entry"
_ENTRY_SUFFIX = ".entry"
_TEMP_PREFIX = ".tmp-"
_TEMP_SUFFIX = ".part"
_KEY_PATTERN = re.compile(r"[0-9a-f]{64}")
_ENTRY_NAME_PATTERN = re.compile(r"[0-9a-f]{64}" + re.escape(_ENTRY_SUFFIX))
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

    def get(self, key: str) -> object | None:
        """The stored value for ``key``, or ``None`` on a miss.

        Parameters
        ----------
        key : str
            A key from :meth:`key`.

        Returns
        -------
        object or None
            The JSON-decoded value; ``None`` if there is no entry, caching is disabled, or the
            entry failed a check (bad header, another key inside, checksum mismatch, bad JSON),
            in which case the entry is deleted.

        **Conventions**
            A damaged entry is never trusted: it is removed and the caller recomputes.

        Examples
        --------
        >>> DerivationCache(Path("no-such-dir"), code_hash="0" * 64).get("a" * 64) is None
        True

        **References**
            Common practice (checksummed cache entries).
        """
        _check_key(key)
        if not self._enabled:
            return None
        path = self._entry_path(key)
        try:
            with open(path, "rb") as handle:
                identity = os.fstat(handle.fileno())
                data = handle.read()
        except OSError:
            return None
        value = self._decode(key, data)
        if value is None:
            self._discard(path, identity)
        return value

    @staticmethod
    def _decode(key: str, data: bytes) -> object | None:
        header, newline, payload = data.partition(b"\n")
        if not newline:
            return None
        parts = header.split(b" ")
        if len(parts) != 4 or parts[0] != _MAGIC or parts[1] != _ENTRY_FORMAT.encode("ascii"):
            return None
        if parts[2] != key.encode("ascii"):
            return None
        if parts[3] != hashlib.sha256(payload).hexdigest().encode("ascii"):
            return None
        try:
            return json.loads(payload.decode("utf-8"))
        except ValueError:  # JSONDecodeError and UnicodeDecodeError are both ValueErrors
            return None

    @staticmethod
    def _discard(path: Path, identity: os.stat_result) -> None:
        # Delete only the file we read: a concurrent writer may already have replaced it
        # with a good entry, which must survive.
        try:
            current = os.stat(path)
            if (current.st_dev, current.st_ino) == (identity.st_dev, identity.st_ino):
                os.unlink(path)
        except OSError:
            pass

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
            Does nothing when caching is disabled. If the directory cannot be created or
            written, writing is turned off for this cache with one warning line on stderr
            (once per directory and process).

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
        if not self._enabled or not self._writable:
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
                os.replace(temp_name, self._entry_path(key))
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

    def _listing(self) -> list[os.DirEntry]:
        try:
            with os.scandir(self._directory) as entries:
                return list(entries)
        except OSError:
            return []

    def clear(self) -> int:
        """Delete every entry (and temporary files left by killed writers).

        Returns
        -------
        int
            The number of entries removed. Files that do not look like entries are left alone,
            so pointing the cache at a wrong directory cannot destroy other data.

        **Conventions**
            Acts on the directory even when caching is disabled.

        Examples
        --------
        >>> DerivationCache(Path("no-such-dir"), code_hash="0" * 64).clear()
        0

        **References**
            Common practice.
        """
        removed = 0
        now = time.time()
        for entry in self._listing():
            name = entry.name
            try:
                if _ENTRY_NAME_PATTERN.fullmatch(name):
                    os.unlink(entry.path)
                    removed += 1
                elif name.startswith(_TEMP_PREFIX) and name.endswith(_TEMP_SUFFIX):
                    if now - entry.stat(follow_symlinks=False).st_mtime > _STALE_TEMP_SECONDS:
                        os.unlink(entry.path)
            except OSError:
                pass
        return removed

    def info(self) -> dict:
        """Where the cache is and how much it holds.

        Returns
        -------
        dict
            ``directory`` (str), ``entries`` (int), ``bytes`` (int, total size of the entry
            files), ``enabled`` (bool).

        **Conventions**
            Entries are counted by file name, not validated; a damaged one is found and removed
            by the next :meth:`get` of its key.

        Examples
        --------
        >>> DerivationCache(Path("no-such-dir"), code_hash="0" * 64).info()["entries"]
        0

        **References**
            Common practice.
        """
        entries = 0
        size = 0
        for entry in self._listing():
            if _ENTRY_NAME_PATTERN.fullmatch(entry.name):
                try:
                    size += entry.stat(follow_symlinks=False).st_size
                except OSError:  # removed meanwhile
                    continue
                entries += 1
        return {"directory": str(self._directory), "entries": entries, "bytes": size, "enabled": self._enabled}
