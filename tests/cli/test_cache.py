"""Tests of stfalgebra/cli/cache.py (the on-disk cache) and stfalgebra/cli/command_cache.py."""

from __future__ import annotations

import argparse
import hashlib
import json
import multiprocessing
import os
import shutil
import subprocess
import sys
import time
from pathlib import Path

import pytest
from hypothesis import given, settings, strategies as st

import stfalgebra
from stfalgebra.cli.cache import DerivationCache, default_cache_directory, toolkit_source_hash
from stfalgebra.cli.command_cache import CacheCommand

PACKAGE_PARENT = Path(stfalgebra.__file__).resolve().parent.parent
FIXED_HASH = "f" * 64


@pytest.fixture(autouse=True)
def _clean_environment(monkeypatch):
    for name in ("STFALGEBRA_NO_CACHE", "STFALGEBRA_CACHE_DIR", "XDG_CACHE_HOME"):
        monkeypatch.delenv(name, raising=False)


@pytest.fixture
def cache(tmp_path) -> DerivationCache:
    return DerivationCache(tmp_path / "cache", code_hash=FIXED_HASH)


def entry_file(c: DerivationCache, key: str) -> Path:
    return c.directory / f"{key}.entry"


def get_or_compute(c: DerivationCache, key: str, compute):
    """The pattern the mode commands use; returns (value, whether it was recomputed)."""
    value = c.get(key)
    if value is not None:
        return value, False
    value = compute()
    c.put(key, value)
    return value, True


# ---------------------------------------------------------------------------------- round trip

def test_round_trip_of_typical_values(cache):
    values = {
        "string": "-(107/42) + 55*nu/42",
        "integer": 12,
        "list": [1, "2/3", [True, False], {"a": 1}],
        "dict": {"H22": "1", "H33": "-3*I*sqrt(30)/4*delta*x**(1/2)"},
        "unicode": "\u03bd \u03b4",
    }
    keys = {name: cache.key(command="test", name=name) for name in values}
    assert len(set(keys.values())) == len(keys)
    assert cache.get(keys["string"]) is None  # miss before any write
    for name, value in values.items():
        cache.put(keys[name], value)
    for name, value in values.items():
        assert cache.get(keys[name]) == value


def test_read_does_not_create_the_directory(cache):
    assert cache.get(cache.key(x=1)) is None
    assert not cache.directory.exists()
    cache.put(cache.key(x=1), "one")
    assert cache.directory.is_dir()


def test_tuples_and_integer_dict_keys_come_back_json_decoded(cache):
    # Documented behaviour (common practice of JSON stores): tuples -> lists, int keys -> str.
    cache.put(cache.key(x=2), {"t": (1, 2), 3: "c"})
    assert cache.get(cache.key(x=2)) == {"t": [1, 2], "3": "c"}


json_scalars = st.one_of(
    st.booleans(),
    st.integers(min_value=-10**30, max_value=10**30),
    st.floats(allow_nan=False, allow_infinity=False),
    st.text(max_size=20),
)
json_values = st.recursive(
    json_scalars,
    lambda children: st.one_of(st.lists(children, max_size=4), st.dictionaries(st.text(max_size=8), children, max_size=4)),
    max_leaves=12,
)


@settings(max_examples=40, deadline=None)
@given(value=json_values)
def test_round_trip_property(tmp_path_factory, value):
    c = DerivationCache(tmp_path_factory.mktemp("rt"), code_hash=FIXED_HASH)
    key = c.key(value=value)
    c.put(key, value)
    assert c.get(key) == value
    assert c.key(value=json.loads(json.dumps(value))) == key  # key is a function of the JSON


# ----------------------------------------------------------------------------------------- key

def test_key_is_canonical_and_distinguishes_inputs(cache):
    k = cache.key(command="modes", l=2, m=2, options={"sign": "default", "order": 2})
    assert k == cache.key(options={"order": 2, "sign": "default"}, m=2, l=2, command="modes")
    assert len(k) == 64 and all(ch in "0123456789abcdef" for ch in k)
    assert k != cache.key(command="modes", l=2, m=2, options={"sign": "flipped", "order": 2})
    # 1, 1.0 and True are different inputs (canonical JSON "1", "1.0", "true").
    assert len({cache.key(a=1), cache.key(a=1.0), cache.key(a=True)}) == 3
    assert cache.key(a=(1, 2)) == cache.key(a=[1, 2])


def test_key_rejects_bad_inputs(cache):
    with pytest.raises(ValueError, match="at least one input"):
        cache.key()
    with pytest.raises(TypeError, match="not JSON-serialisable"):
        cache.key(order=object())
    with pytest.raises(ValueError, match="cannot be stored"):
        cache.key(x=float("nan"))


def test_default_code_hash_is_the_toolkit_source_hash(tmp_path):
    assert DerivationCache(tmp_path).key(x=1) == DerivationCache(tmp_path, code_hash=toolkit_source_hash()).key(x=1)


def test_code_hash_change_invalidates_keys(tmp_path):
    old = DerivationCache(tmp_path, code_hash="a" * 64)
    new = DerivationCache(tmp_path, code_hash="b" * 64)
    assert old.key(l=2, m=2) != new.key(l=2, m=2)
    old.put(old.key(l=2, m=2), "old result")
    assert new.get(new.key(l=2, m=2)) is None
    assert old.get(old.key(l=2, m=2)) == "old result"


def copy_package(destination: Path) -> Path:
    target = destination / "stfalgebra"
    shutil.copytree(PACKAGE_PARENT / "stfalgebra", target, ignore=shutil.ignore_patterns("__pycache__"))
    return target


def test_toolkit_source_hash_follows_python_sources_only(tmp_path):
    first = copy_package(tmp_path / "one")
    second = copy_package(tmp_path / "two")
    assert toolkit_source_hash(first) == toolkit_source_hash(second)
    # Non-Python files and byte-code do not matter.
    third = copy_package(tmp_path / "three")
    (third / "notes.txt").write_text("scratch")
    (third / "__pycache__").mkdir(exist_ok=True)
    (third / "__pycache__" / "junk.py").write_text("x = 1\n")
    assert toolkit_source_hash(third) == toolkit_source_hash(first)
    # One character of one module does.
    fourth = copy_package(tmp_path / "four")
    errors = fourth / "errors.py"
    errors.write_text(errors.read_text() + "\n# edited\n")
    assert toolkit_source_hash(fourth) != toolkit_source_hash(first)
    # So does a rename.
    fifth = copy_package(tmp_path / "five")
    (fifth / "errors.py").rename(fifth / "errors_renamed.py")
    assert toolkit_source_hash(fifth) != toolkit_source_hash(first)


def test_toolkit_source_hash_rejects_bad_roots(tmp_path):
    with pytest.raises(ValueError, match="not a directory"):
        toolkit_source_hash(tmp_path / "missing")
    with pytest.raises(TypeError, match="path"):
        toolkit_source_hash(42)


def test_source_edit_invalidates_keys_across_processes(tmp_path):
    """End to end: a copy of the package computes a key, a module is edited, the key changes."""
    copy_package(tmp_path)
    script = "from stfalgebra.cli.cache import DerivationCache; print(DerivationCache().key(command='modes', l=2))"
    env = {k: v for k, v in os.environ.items() if not k.startswith("STFALGEBRA_")}
    env["PYTHONPATH"] = str(tmp_path)

    def run() -> str:
        done = subprocess.run([sys.executable, "-c", script], cwd=tmp_path, env=env, capture_output=True, text=True, check=True)
        return done.stdout.strip()

    before, again = run(), run()
    assert before == again
    module = tmp_path / "stfalgebra" / "errors.py"
    module.write_text(module.read_text() + "\n# a change\n")
    assert run() != before


# ----------------------------------------------------------------------------- corrupt entries

def truncate(path: Path) -> None:
    data = path.read_bytes()
    path.write_bytes(data[: len(data) - 5])


def flip_payload_byte(path: Path) -> None:
    data = bytearray(path.read_bytes())
    data[-3] ^= 0x01
    path.write_bytes(bytes(data))


def flip_header_byte(path: Path) -> None:
    data = bytearray(path.read_bytes())
    data[5] ^= 0x20
    path.write_bytes(bytes(data))


def empty(path: Path) -> None:
    path.write_bytes(b"")


def header_only(path: Path) -> None:
    path.write_bytes(path.read_bytes().partition(b"\n")[0])


# damage that leaves the first line ours (or the file empty): the entry is provably ours
CORRUPTIONS = [truncate, flip_payload_byte, empty, header_only]


@pytest.mark.parametrize("corrupt", CORRUPTIONS, ids=lambda f: f.__name__)
def test_corrupt_entry_is_deleted_and_recomputed(cache, corrupt, capsys):
    key = cache.key(command="flux", order=1)
    calls = []

    def compute():
        calls.append(1)
        return {"F": "1 - x*(1247/336 + 35*nu/12)"}

    first, recomputed = get_or_compute(cache, key, compute)
    assert recomputed and len(calls) == 1
    assert get_or_compute(cache, key, compute) == (first, False)
    corrupt(entry_file(cache, key))
    assert cache.get(key) is None
    assert not entry_file(cache, key).exists()  # deleted, never trusted
    value, recomputed = get_or_compute(cache, key, compute)
    assert recomputed and value == first and len(calls) == 2
    assert cache.get(key) == first
    err = capsys.readouterr().err
    assert err.count("\n") == 1 and "not used" in err and "removed it and recomputing" in err


def test_entry_whose_header_is_not_ours_is_left_in_place_and_reported(cache, capsys):
    # regression: a file named like an entry but without our header line was deleted; the
    # cache may only delete what it can prove it wrote
    key = cache.key(command="flux", order=1)
    cache.put(key, {"F": "1"})
    flip_header_byte(entry_file(cache, key))
    foreign = entry_file(cache, key).read_bytes()
    for _ in range(2):
        assert cache.get(key) is None
        cache.put(key, {"F": "1"})  # never written over a file that is not ours
    assert entry_file(cache, key).read_bytes() == foreign
    err = capsys.readouterr().err
    assert err.count("left it in place and recomputing") == 2 and err.count("\n") == 2
    report = cache.clear_entries()
    assert report.removed == 0 and report.left == ((str(entry_file(cache, key)), "not written by stfalgebra"),)


def test_entry_with_another_key_inside_is_a_miss(cache):
    key_a, key_b = cache.key(l=2), cache.key(l=3)
    cache.put(key_a, "value of a")
    shutil.copyfile(entry_file(cache, key_a), entry_file(cache, key_b))
    assert cache.get(key_b) is None
    assert not entry_file(cache, key_b).exists()
    assert cache.get(key_a) == "value of a"


def test_entry_with_valid_checksum_but_bad_json_is_a_miss(cache):
    key = cache.key(l=4)
    payload = b'{"unterminated": '
    header = b"stfalgebra-cache-entry v1 " + key.encode() + b" " + hashlib.sha256(payload).hexdigest().encode()
    cache.directory.mkdir(parents=True)
    entry_file(cache, key).write_bytes(header + b"\n" + payload)
    assert cache.get(key) is None
    assert not entry_file(cache, key).exists()


def test_entry_that_is_a_directory_is_a_miss(cache):
    key = cache.key(l=5)
    entry_file(cache, key).mkdir(parents=True)
    assert cache.get(key) is None


# ------------------------------------------------------------------------------ bad arguments

def test_bad_keys_and_values_are_refused(cache):
    with pytest.raises(ValueError, match="'../etc/passwd'"):
        cache.get("../etc/passwd")
    with pytest.raises(ValueError, match="64 lowercase hex"):
        cache.put("A" * 64, 1)
    with pytest.raises(TypeError, match="got 12"):
        cache.get(12)
    key = cache.key(x=1)
    with pytest.raises(ValueError, match="None cannot be cached"):
        cache.put(key, None)
    with pytest.raises(TypeError, match="set"):
        cache.put(key, {1, 2})
    with pytest.raises(TypeError, match="enabled must be a bool, got 'yes'"):
        DerivationCache(cache.directory, enabled="yes")
    with pytest.raises(TypeError, match="directory must be a path, got 3"):
        DerivationCache(3)
    with pytest.raises(ValueError, match="code_hash"):
        DerivationCache(cache.directory, code_hash="")


# ------------------------------------------------------------------------------- concurrency

N_KEYS = 6


def expected_value(index: int) -> dict:
    # Large enough that a write is many file-system blocks, so a torn read would be visible.
    return {"index": index, "terms": [f"{index}*x**{j}/{j + 1}" for j in range(4000)]}


def hammer(directory: str, worker: int, rounds: int, with_clear: bool) -> tuple[int, int, list[str]]:
    """Worker process: mixed puts and gets on shared keys.

    With ``with_clear`` worker 0 also empties the cache now and then, so a read may miss but
    must never see a wrong or partial value. Without it every worker first writes every key,
    after which entries are only ever replaced atomically, so every later read must hit: a
    reader that caught a half-written file would report a miss.
    """
    import random

    c = DerivationCache(Path(directory), code_hash=FIXED_HASH)
    keys = [c.key(derivation="hammer", index=i) for i in range(N_KEYS)]
    rng = random.Random(worker)
    hits = misses = 0
    problems = []
    if not with_clear:
        for i in range(N_KEYS):
            c.put(keys[i], expected_value(i))
    for step in range(rounds):
        i = rng.randrange(N_KEYS)
        if with_clear and worker == 0 and step % 25 == 24:
            c.clear()
        elif rng.random() < 0.5:
            c.put(keys[i], expected_value(i))
        else:
            got = c.get(keys[i])
            if got is None:
                misses += 1
                if not with_clear:
                    problems.append(f"worker {worker} key {i}: miss after the key was written")
            elif got == expected_value(i):
                hits += 1
            else:
                problems.append(f"worker {worker} key {i}: wrong value {str(got)[:60]}")
    return hits, misses, problems


def test_concurrent_writers_and_readers_see_a_miss_or_the_whole_value(tmp_path):
    # spawn: fresh interpreters, as separate CLI calls would be (and no fork of a threaded parent).
    context = multiprocessing.get_context("spawn")
    with context.Pool(4) as pool:
        for with_clear in (True, False):
            directory = tmp_path / f"shared-{with_clear}"
            results = pool.starmap(hammer, [(str(directory), w, 120, with_clear) for w in range(4)])
            assert [p for r in results for p in r[2]] == []
            assert sum(r[0] for r in results) > 0  # the readers did see whole values
            # Whatever is left is valid, and no temporary file is left behind.
            c = DerivationCache(directory, code_hash=FIXED_HASH)
            for i in range(N_KEYS):
                assert c.get(c.key(derivation="hammer", index=i)) in (None, expected_value(i))
            assert [p.name for p in directory.iterdir() if not p.name.endswith(".entry")] == []


# ------------------------------------------------------------------------------- clear, info

def test_clear_removes_entries_and_stale_temporaries_only(cache):
    for i in range(3):
        cache.put(cache.key(i=i), i + 1)
    unrelated = cache.directory / "notes.txt"
    unrelated.write_text("keep me")
    fresh_temp = cache.directory / ".tmp-0123456789abcdef-live.part"
    fresh_temp.write_text("a writer is busy")
    # a temporary file a killed writer left: its first line is an entry header of ours
    stale_temp = cache.directory / ".tmp-0123456789abcdef-dead.part"
    stale_temp.write_bytes(entry_file(cache, cache.key(i=0)).read_bytes())
    two_hours_ago = time.time() - 7200
    os.utime(stale_temp, (two_hours_ago, two_hours_ago))
    assert cache.clear() == 3
    assert sorted(p.name for p in cache.directory.iterdir()) == sorted([unrelated.name, fresh_temp.name])
    assert cache.get(cache.key(i=0)) is None
    assert cache.clear() == 0


def test_clear_and_info_of_a_missing_directory(tmp_path):
    c = DerivationCache(tmp_path / "never", code_hash=FIXED_HASH)
    assert c.clear() == 0
    assert c.info() == {"directory": str(tmp_path / "never"), "entries": 0, "bytes": 0, "enabled": True}
    assert not (tmp_path / "never").exists()


def test_info_counts_entries_and_bytes(cache):
    for i in range(4):
        cache.put(cache.key(i=i), ["x"] * (i + 1))
    (cache.directory / "README").write_text("not an entry")
    info = cache.info()
    sizes = sum(p.stat().st_size for p in cache.directory.glob("*.entry"))
    assert info == {"directory": str(cache.directory), "entries": 4, "bytes": sizes, "enabled": True}


# --------------------------------------------------------------------------------- disabled

def test_disabled_cache_neither_reads_nor_writes(tmp_path):
    on = DerivationCache(tmp_path / "d", code_hash=FIXED_HASH)
    off = DerivationCache(tmp_path / "d", enabled=False, code_hash=FIXED_HASH)
    off.put(off.key(x=1), "v")
    assert not (tmp_path / "d").exists()
    on.put(on.key(x=1), "v")
    assert off.get(off.key(x=1)) is None
    assert off.info()["enabled"] is False and off.info()["entries"] == 1


@pytest.mark.parametrize("setting, enabled", [("1", False), ("yes", False), ("0", True), ("", True), ("false", True)])
def test_environment_switch(tmp_path, monkeypatch, setting, enabled):
    monkeypatch.setenv("STFALGEBRA_NO_CACHE", setting)
    c = DerivationCache(tmp_path, code_hash=FIXED_HASH)
    assert c.enabled is enabled
    c.put(c.key(x=1), 1)
    assert (c.get(c.key(x=1)) == 1) is enabled


def test_unwritable_directory_degrades_with_one_warning(tmp_path, capsys):
    blocker = tmp_path / "a-file"
    blocker.write_text("")
    # A directory below a regular file cannot be created, even by root.
    c = DerivationCache(blocker / "cache", code_hash=FIXED_HASH)
    for i in range(3):
        c.put(c.key(i=i), i + 1)
        assert c.get(c.key(i=i)) is None
    DerivationCache(blocker / "cache", code_hash=FIXED_HASH).put(c.key(i=9), 1)  # same process, same directory
    err = capsys.readouterr().err
    assert err.count("warning") == 1
    assert str(blocker / "cache") in err and "continuing without caching" in err
    assert c.clear() == 0 and c.info()["entries"] == 0


# ---------------------------------------------------------------------------- default place

def test_default_directory(tmp_path, monkeypatch):
    monkeypatch.setenv("HOME", str(tmp_path / "home"))
    assert default_cache_directory() == tmp_path / "home" / ".cache" / "stfalgebra"
    monkeypatch.setenv("XDG_CACHE_HOME", "relative/ignored")
    assert default_cache_directory() == tmp_path / "home" / ".cache" / "stfalgebra"
    monkeypatch.setenv("XDG_CACHE_HOME", str(tmp_path / "xdg"))
    assert default_cache_directory() == tmp_path / "xdg" / "stfalgebra"
    monkeypatch.setenv("STFALGEBRA_CACHE_DIR", str(tmp_path / "mine"))
    assert default_cache_directory() == tmp_path / "mine"
    assert DerivationCache().directory == tmp_path / "mine"


# ---------------------------------------------------------------------------- light import

def test_cache_import_does_not_import_sympy():
    code = (
        "import stfalgebra.cli, stfalgebra.cli.cache, stfalgebra.cli.command_cache, sys; "
        "assert 'sympy' not in sys.modules, 'sympy imported'; "
        "assert 'symengine' not in sys.modules, 'symengine imported'"
    )
    env = dict(os.environ, PYTHONPATH=str(PACKAGE_PARENT))
    done = subprocess.run([sys.executable, "-c", code], env=env, capture_output=True, text=True)
    assert done.returncode == 0, done.stderr


# ------------------------------------------------------------------------------------ CLI

def run_command(argv: list[str]) -> int:
    parser = argparse.ArgumentParser()
    CacheCommand.configure(parser)
    return CacheCommand.run(parser.parse_args(argv))


def test_cli_info_and_clear(tmp_path, capsys, monkeypatch):
    directory = tmp_path / "cli"
    c = DerivationCache(directory)
    for i in range(2):
        c.put(c.key(i=i), "v")
    assert run_command(["info", "--json", "--cache-dir", str(directory)]) == 0
    info = json.loads(capsys.readouterr().out)
    assert info["directory"] == str(directory) and info["entries"] == 2 and info["bytes"] > 0 and info["enabled"] is True
    assert run_command(["info", "--cache-dir", str(directory)]) == 0
    text = capsys.readouterr().out
    assert "entries:   2" in text and str(directory) in text
    monkeypatch.setenv("STFALGEBRA_CACHE_DIR", str(directory))  # the default place, no option
    assert run_command(["clear", "--json"]) == 0
    assert json.loads(capsys.readouterr().out) == {"directory": str(directory), "removed": 2, "left": []}
    assert run_command(["clear"]) == 0
    assert capsys.readouterr().out == f"removed 0 entries from {directory}\n"


def test_cli_through_main(tmp_path, capsys):
    from stfalgebra.cli import main

    assert main(["cache", "info", "--json", "--cache-dir", str(tmp_path)]) == 0
    assert json.loads(capsys.readouterr().out)["entries"] == 0
    assert main(["cache"]) == 2
    assert "error" in capsys.readouterr().err



# ------------------------------------------------------- hostile directory (issue 12 regressions)

_HOSTILE_READ = r"""
import resource, sys, time
resource.setrlimit(resource.RLIMIT_AS, (1 << 30, 1 << 30))  # a runaway read fails instead of eating the machine
from pathlib import Path
from stfalgebra.cli.cache import DerivationCache
c = DerivationCache(Path(sys.argv[1]), code_hash="f" * 64)
start = time.monotonic()
value = c.get(sys.argv[2])
print(value is None, round(time.monotonic() - start, 3))
"""


def _hostile_get(directory: Path, key: str) -> subprocess.CompletedProcess:
    # in a child process with a timeout and a memory limit: without the fix these reads block
    # forever (a FIFO) or exhaust memory (/dev/zero)
    env = dict(os.environ, PYTHONPATH=str(PACKAGE_PARENT))
    return subprocess.run([sys.executable, "-c", _HOSTILE_READ, str(directory), key], env=env,
                          capture_output=True, text=True, timeout=60)


@pytest.mark.parametrize("device", ["/dev/zero", "/dev/urandom"])
def test_entry_replaced_by_a_link_to_a_device_is_not_followed(cache, device):
    key = cache.key(x=1)
    cache.put(key, "value")
    entry_file(cache, key).unlink()
    entry_file(cache, key).symlink_to(device)
    done = _hostile_get(cache.directory, key)
    assert done.returncode == 0, done.stderr
    assert done.stdout.split()[0] == "True" and float(done.stdout.split()[1]) < 5
    assert "symbolic link" in done.stderr and done.stderr.count("\n") == 1
    assert entry_file(cache, key).is_symlink()  # a link is not ours to delete
    cache.put(key, "again")  # nor to write through or over
    assert os.readlink(entry_file(cache, key)) == device


def test_entry_replaced_by_a_fifo_does_not_block(cache):
    key = cache.key(x=2)
    cache.directory.mkdir(parents=True)
    os.mkfifo(entry_file(cache, key))
    done = _hostile_get(cache.directory, key)
    assert done.returncode == 0, done.stderr
    assert done.stdout.split()[0] == "True" and "not a regular file" in done.stderr
    assert cache.clear_entries().left == ((str(entry_file(cache, key)), "not a regular file"),)


def test_oversized_entry_is_not_read_whole(cache, capsys):
    from stfalgebra.cli.cache import MAX_ENTRY_BYTES

    key = cache.key(x=3)
    cache.put(key, "small")
    path = entry_file(cache, key)
    header = path.read_bytes().partition(b"\n")[0]
    with open(path, "r+b") as handle:  # our header, then a (sparse) payload beyond the cap
        handle.write(header + b"\n")
        handle.truncate(2 * MAX_ENTRY_BYTES)
    start = time.monotonic()
    assert cache.get(key) is None
    assert time.monotonic() - start < 2.0
    assert "larger than the size cap" in capsys.readouterr().err
    assert not path.exists()  # our header: a damaged entry of ours, removed
    foreign = entry_file(cache, cache.key(x=4))
    with open(foreign, "wb") as handle:  # a 2 GB file of somebody else's (sparse)
        handle.truncate(2 << 30)
    assert cache.get(cache.key(x=4)) is None and foreign.exists()


def test_value_too_large_is_not_stored(cache, monkeypatch):
    import stfalgebra.cli.cache as cache_module

    monkeypatch.setattr(cache_module, "MAX_ENTRY_BYTES", 100)
    cache.put(cache.key(x=5), "x" * 200)
    assert cache.get(cache.key(x=5)) is None and cache.info()["entries"] == 0


def test_deeply_nested_payload_is_a_miss_not_a_crash(cache, capsys):
    key = cache.key(x=6)
    payload = b"[" * 100000 + b"]" * 100000
    header = b"stfalgebra-cache-entry v1 " + key.encode() + b" " + hashlib.sha256(payload).hexdigest().encode()
    cache.directory.mkdir(parents=True)
    entry_file(cache, key).write_bytes(header + b"\n" + payload)
    assert cache.get(key) is None
    assert "not JSON" in capsys.readouterr().err


def test_validator_refusal_discards_the_entry_with_one_warning(cache, capsys):
    key = cache.key(x=7)
    cache.put(key, {"a": 1})

    def expects_a_list(value):
        if not isinstance(value, list):
            raise ValueError("expected a list")

    assert cache.get(key, validate=expects_a_list) is None
    err = capsys.readouterr().err
    assert err.count("\n") == 1 and "unexpected content (expected a list)" in err
    assert not entry_file(cache, key).exists()


def test_clear_leaves_and_reports_what_is_not_its_own(cache, tmp_path, capsys):
    # regression: files named like entries, a link named like an entry and an old temporary
    # file were deleted
    cache.put(cache.key(i=1), "ours")
    forged = cache.directory / ("a" * 64 + ".entry")
    forged.write_text("somebody's notes")
    target = tmp_path / "precious.txt"
    target.write_text("keep")
    link = cache.directory / ("b" * 64 + ".entry")
    link.symlink_to(target)
    old_part = cache.directory / ".tmp-0123456789abcdef-abc123.part"
    old_part.write_text("not a cache entry")
    two_hours_ago = time.time() - 7200
    os.utime(old_part, (two_hours_ago, two_hours_ago))
    assert run_command(["clear", "--cache-dir", str(cache.directory)]) == 1
    out, err = capsys.readouterr()
    assert out == f"removed 1 entry from {cache.directory}\n"
    assert sorted(err.splitlines()) == sorted([
        f"stfalgebra cache: could not remove {forged}: not written by stfalgebra",
        f"stfalgebra cache: could not remove {link}: not a regular file",
        f"stfalgebra cache: could not remove {old_part}: not written by stfalgebra",
    ])
    assert forged.exists() and link.is_symlink() and old_part.exists() and target.read_text() == "keep"


def test_clear_on_a_read_only_directory_reports_and_exits_1(cache, capsys, monkeypatch):
    # regression: "removed 0 entries" and exit 0. Running as root ignores directory
    # permissions, so the refusal of the file system is simulated.
    import stfalgebra.cli.cache as cache_module

    for i in range(2):
        cache.put(cache.key(i=i), i)

    def read_only(path):
        raise PermissionError(13, "Permission denied")

    monkeypatch.setattr(cache_module.os, "unlink", read_only)
    assert run_command(["clear", "--json", "--cache-dir", str(cache.directory)]) == 1
    out, err = capsys.readouterr()
    document = json.loads(out)
    assert document["removed"] == 0 and len(document["left"]) == 2
    assert {item["reason"] for item in document["left"]} == {"Permission denied"}
    assert err.count("could not remove") == 2


def test_clear_reports_a_directory_it_cannot_list(tmp_path, monkeypatch):
    import stfalgebra.cli.cache as cache_module

    c = DerivationCache(tmp_path, code_hash=FIXED_HASH)

    def unreadable(path):
        raise PermissionError(13, "Permission denied")

    monkeypatch.setattr(cache_module.os, "scandir", unreadable)
    assert c.clear_entries().left == ((str(tmp_path), "cannot list the directory: Permission denied"),)


def test_info_counts_regular_entries_only(cache):
    cache.put(cache.key(i=1), 1)
    (cache.directory / ("c" * 64 + ".entry")).symlink_to("/dev/zero")
    assert cache.info()["entries"] == 1
