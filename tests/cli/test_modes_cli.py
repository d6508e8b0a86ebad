"""The command-line contract of `mode`, `modes` and `flux` (names, flags, JSON keys, exit codes)."""

from __future__ import annotations

import json
import os
import subprocess
import sys
from pathlib import Path

import pytest
import sympy as sp

import stfalgebra
from stfalgebra.cli import main

PACKAGE_PARENT = Path(stfalgebra.__file__).resolve().parent.parent

KEYS = {"l", "m", "orbit", "hhat", "normalisation", "phase", "sign_convention"}


@pytest.fixture(autouse=True)
def _private_cache(tmp_path, monkeypatch):
    monkeypatch.setenv("STFALGEBRA_CACHE_DIR", str(tmp_path / "cache"))


def _run(capsys, *argv):
    code = main(list(argv))
    out, err = capsys.readouterr()
    return code, out, err


def test_mode_json_has_the_contract_keys(capsys):
    code, out, _ = _run(capsys, "mode", "2", "2", "--orbit", "circular", "--pn", "1", "--json")
    assert code == 0
    obj = json.loads(out)
    # PN orders are exact strings in every JSON output (issue 13: "pn" was a number here)
    assert KEYS <= set(obj) and obj["pn"] == "1" and "pn_relative" not in obj
    # Blanchet, Living Rev. Relativ. 17, 2 (2014), eq. (9.4): Hhat_22 through 1PN
    expected = 1 + sp.Symbol("x") * (sp.Rational(-107, 42) + sp.Rational(55, 42) * sp.Symbol("nu"))
    assert sp.expand(sp.sympify(obj["hhat"]) - expected) == 0
    assert obj["phase"] == "psi"
    assert "sympy" in obj["normalisation"] and "words" in obj["normalisation"]


def test_negative_m_and_relative_order(capsys):
    code, out, _ = _run(capsys, "mode", "2", "-2", "--pn-relative", "0", "--json")
    assert code == 0
    obj = json.loads(out)
    assert obj["m"] == -2 and obj["pn_relative"] == "0" and obj["hhat"] == "1"


def test_delta_squared_is_always_reduced(capsys):
    code, out, _ = _run(capsys, "modes", "--pn-relative", "1", "--lmax", "4", "--json")
    assert code == 0
    for obj in json.loads(out)["modes"]:
        if obj["hhat"] is not None:
            poly = sp.Poly(sp.sympify(obj["hhat"], locals={"I": sp.I}), sp.Symbol("delta"))
            assert poly.degree() <= 1, obj


def test_modes_lists_refused_modes_with_a_reason(capsys):
    code, out, _ = _run(capsys, "modes", "--orbit", "circular", "--pn-relative", "0", "--lmax", "3", "--json")
    assert code == 0
    modes = json.loads(out)["modes"]
    assert [(o["l"], o["m"]) for o in modes][:3] == [(2, 2), (2, 1), (2, 0)]
    refused = {(o["l"], o["m"]): o for o in modes if o["hhat"] is None}
    # even l: the DC memory, served; odd l: served (Hhat_30 starts at relative 3/2: 0 here)
    assert set(refused) == set()
    assert next(o for o in modes if (o["l"], o["m"]) == (2, 0))["kind"] == "memory"
    code, out, _ = _run(capsys, "modes", "--orbit", "circular", "--pn", "5/2", "--lmax", "4", "--json")
    refused = {(o["l"], o["m"]): o for o in json.loads(out)["modes"] if o["hhat"] is None}
    assert code == 0 and "memory row" in refused[(4, 0)]["refused"]
    assert next(o for o in modes if (o["l"], o["m"]) == (3, 0))["hhat"] == "0"


def test_mode_beyond_leading_absolute_order_is_zero(capsys):
    code, out, _ = _run(capsys, "mode", "5", "5", "--pn", "1", "--json")
    assert code == 0 and json.loads(out)["hhat"] == "0"


def test_general_orbit_symbols(capsys):
    code, out, _ = _run(capsys, "mode", "2", "2", "--orbit", "general", "--pn", "0", "--json")
    assert code == 0
    obj = json.loads(out)
    assert obj["phase"] == "phi"
    names = {s.name for s in sp.sympify(obj["hhat"]).free_symbols}
    assert names <= {"r", "rdot", "phidot", "m", "nu", "delta", "c"}
    code, out, _ = _run(capsys, "mode", "2", "0", "--orbit", "general", "--pn", "0", "--json")
    assert code == 0 and "instantaneous part only" in json.loads(out)["note"]


@pytest.mark.parametrize("argv", [
    ["mode", "2", "2", "--pn", "0.3"],
    ["mode", "2", "2", "--pn", "-1"],
    ["mode", "1", "1", "--pn", "0"],
    ["mode", "3", "4", "--pn", "0"],
    ["mode", "4", "0", "--pn", "5/2"],
    ["mode", "2", "2", "--orbit", "general", "--pn", "3"],
    ["modes", "--pn", "0", "--lmax", "1"],
    ["mode", "2", "2", "--pn", "1", "--pn-relative", "1"],
    ["mode", "2", "2"],
    ["flux", "--pn", "9"],
])
def test_bad_input_exits_2_with_one_line(capsys, argv):
    with pytest.raises(SystemExit) as info:
        raise SystemExit(main(argv))
    assert info.value.code == 2
    err = capsys.readouterr().err
    assert err.count("\n") == 1 and "Traceback" not in err


def test_text_and_latex_tables(capsys):
    code, out, _ = _run(capsys, "modes", "--pn-relative", "0", "--lmax", "2")
    assert code == 0 and "(2,2)" in out and "(2,0)   memory" in out
    code, out, _ = _run(capsys, "modes", "--pn", "5/2", "--lmax", "4", "--format", "latex")
    # one equation environment per derived mode, refusals as comments
    assert code == 0 and "% (4,0) refused" in out


def test_sign_convention_flips_every_mode(capsys):
    _, out, _ = _run(capsys, "mode", "2", "1", "--pn-relative", "1", "--json")
    _, flipped, _ = _run(capsys, "mode", "2", "1", "--pn-relative", "1", "--json", "--sign-convention", "theta-phi")
    a, b = (sp.sympify(json.loads(text)["hhat"]) for text in (out, flipped))
    assert sp.expand(a + b) == 0


def test_flux_json(capsys):
    code, out, _ = _run(capsys, "flux", "--orbit", "circular", "--pn", "1", "--json")
    assert code == 0
    obj = json.loads(out)
    # Wagoner & Will (1976); Blanchet 2014 eq. (314): 1 + (-1247/336 - 35 nu/12) x
    x, nu = sp.symbols("x nu")
    assert sp.expand(sp.sympify(obj["energy"]) - (1 + (sp.Rational(-1247, 336) - sp.Rational(35, 12) * nu) * x)) == 0
    assert obj["routes_agree"] is True


def test_output_is_deterministic_across_hash_seeds(tmp_path):
    outputs = set()
    for seed in ("0", "12345"):
        env = dict(os.environ, PYTHONHASHSEED=seed, STFALGEBRA_NO_CACHE="1")
        proc = subprocess.run([sys.executable, "-m", "stfalgebra", "modes", "--pn-relative", "1",
                               "--lmax", "2", "--json"], capture_output=True, text=True, env=env, check=True)
        outputs.add(proc.stdout)
    assert len(outputs) == 1


def test_cache_serves_the_same_bytes(tmp_path):
    env = dict(os.environ, STFALGEBRA_CACHE_DIR=str(tmp_path / "c"))
    argv = [sys.executable, "-m", "stfalgebra", "mode", "3", "2", "--pn", "2", "--json"]
    cold = subprocess.run(argv, capture_output=True, text=True, env=env, check=True).stdout
    warm = subprocess.run(argv, capture_output=True, text=True, env=env, check=True).stdout
    assert cold == warm and json.loads(cold)["hhat"] != "0"


def test_output_piped_into_a_closed_reader_ends_quietly(tmp_path):
    # regression: `stfalgebra modes ... | head` printed a BrokenPipeError traceback. The read
    # end of the pipe is closed before the command writes, so its first write fails.
    env = dict(os.environ, STFALGEBRA_CACHE_DIR=str(tmp_path / "c"))
    read_end, write_end = os.pipe()
    os.close(read_end)
    try:
        proc = subprocess.run([sys.executable, "-m", "stfalgebra", "modes", "--pn-relative", "0", "--lmax", "2"],
                              stdout=write_end, stderr=subprocess.PIPE, text=True, env=env)
    finally:
        os.close(write_end)
    assert "Traceback" not in proc.stderr and proc.returncode == 0


def _cpu_seconds(pid: int) -> float:
    """User + system CPU time of a running process, from /proc (0 once it has ended)."""
    try:
        with open(f"/proc/{pid}/stat", encoding="ascii") as handle:
            fields = handle.read().rsplit(")", 1)[1].split()
    except OSError:
        return 0.0
    return (int(fields[11]) + int(fields[12])) / os.sysconf("SC_CLK_TCK")


# ------------------------------------------------------------ issue 12 regressions

def test_ctrl_c_ends_a_derivation_with_exit_130_and_no_output(tmp_path):
    # regression: after SIGINT a command could keep running (30 s and more) or print part of
    # its output. A derivation that takes minutes is interrupted once it is under way.
    import signal
    import time

    env = dict(os.environ, STFALGEBRA_CACHE_DIR=str(tmp_path / "c"), PYTHONPATH=str(PACKAGE_PARENT))
    # the child starts with SIGINT at its default disposition and unblocked, as under a terminal:
    # a test worker may run with SIGINT ignored or blocked, which a child would inherit (and then
    # never see the Ctrl-C; seen once in a clean-clone run)
    def default_interrupts():
        signal.signal(signal.SIGINT, signal.SIG_DFL)
        signal.pthread_sigmask(signal.SIG_UNBLOCK, {signal.SIGINT})

    proc = subprocess.Popen([sys.executable, "-m", "stfalgebra", "modes", "--lmax", "30", "--pn-relative", "1",
                             "--no-cache"], stdout=subprocess.PIPE, stderr=subprocess.PIPE, env=env,
                            preexec_fn=default_interrupts)
    try:
        # past start-up and the imports, inside the derivation (tens of CPU seconds): wait for
        # CPU time, not wall time, so that a loaded machine does not interrupt the imports
        deadline = time.monotonic() + 120
        while _cpu_seconds(proc.pid) < 2.0 and time.monotonic() < deadline:
            time.sleep(0.05)
        assert proc.poll() is None, "the derivation ended before it could be interrupted"
        sent = time.monotonic()
        proc.send_signal(signal.SIGINT)
        out, err = proc.communicate(timeout=30)
        elapsed = time.monotonic() - sent
    finally:
        if proc.poll() is None:
            proc.kill()
            proc.communicate()
    assert proc.returncode == 130, err
    assert out == b"" and b"Traceback" not in err and err.count(b"\n") == 1
    assert elapsed < 20, elapsed   # promptly: the derivation alone takes longer


@pytest.mark.parametrize("payload", [[], {"a": 1}, [{"l": 2, "m": 2, "hhat": "WRONG"}], [None], "text",
                                     [{"l": 2, "m": 2, "orbit": "circular", "pn": 0, "kind": "mass", "hhat": "WRONG",
                                       "hhat_latex": "W", "normalisation": {}, "phase": "psi",
                                       "sign_convention": "minus-phi-theta", "provenance": []}]])
def test_cached_payload_of_another_shape_is_discarded_and_recomputed(capsys, tmp_path, payload):
    # regression: an entry with a valid header and checksum but a payload of another shape
    # crashed with a traceback ([] and {"a": 1}) or was printed as a result ("WRONG")
    import hashlib

    from stfalgebra.cli.cache import DerivationCache

    cache = DerivationCache()
    key = cache.key(command="modes", modes=[(2, 2)], lmax=None, orbit="circular", order={"pn": "0"},
                    sign_convention="minus-phi-theta", phase="psi", schema=2)
    body = json.dumps(payload).encode()
    cache.directory.mkdir(parents=True, exist_ok=True)
    (cache.directory / f"{key}.entry").write_bytes(
        b"stfalgebra-cache-entry v1 " + key.encode() + b" " + hashlib.sha256(body).hexdigest().encode() + b"\n" + body)
    code, out, err = _run(capsys, "mode", "2", "2", "--pn", "0", "--json")
    assert code == 0 and json.loads(out)["hhat"] == "1"  # Hhat_22 = 1 at leading order (conventions.md)
    assert err.count("\n") == 1 and "warning: cache entry" in err and "recomputing" in err
    code, again, err = _run(capsys, "mode", "2", "2", "--pn", "0", "--json")
    assert (code, again, err) == (0, out, "")  # the recomputed entry replaced the bad one


def test_jobs_give_byte_identical_output(capsys):
    # issue: parallel mode sets through the standard executor interface; the output must not
    # depend on the number of processes
    serial = _run(capsys, "modes", "--lmax", "5", "--pn-relative", "1", "--json", "--no-cache")
    parallel = _run(capsys, "modes", "--lmax", "5", "--pn-relative", "1", "--json", "--no-cache", "--jobs", "2")
    assert serial[0] == parallel[0] == 0 and serial[1] == parallel[1]


def test_any_executor_plugs_into_the_python_api():
    # a scheduler's executor only needs map(); a thread pool stands in for one here
    from concurrent.futures import ThreadPoolExecutor

    from stfalgebra.radiative.modes import derive_modes

    with ThreadPoolExecutor(max_workers=2) as pool:
        threaded = derive_modes(4, pn_relative=1, executor=pool)
    serial = derive_modes(4, pn_relative=1)
    assert [res.hhat_text() for res in threaded] == [res.hhat_text() for res in serial]


def test_instantaneous_only_serves_the_general_orbit_instantaneous_part_and_is_cached_apart(capsys):
    argv = ("mode", "2", "2", "--orbit", "general", "--pn-relative", "2", "--json")
    code, _, err = _run(capsys, *argv)
    assert code == 2 and "--instantaneous-only" in err and len(err.strip().splitlines()) == 1
    code, out, _ = _run(capsys, *argv, "--instantaneous-only")
    obj = json.loads(out)
    assert code == 0 and obj["instantaneous_only"] is True and "tail" in obj["note"]
    assert obj["hhat"] is not None and "c**4" in obj["hhat"]
    # the flag is part of the cache key: the complete mode is still refused afterwards
    assert _run(capsys, *argv)[0] == 2
    code, out, _ = _run(capsys, "mode", "2", "2", "--orbit", "general", "--pn-relative", "1", "--json")
    assert code == 0 and "instantaneous_only" not in json.loads(out)
    code, _, err = _run(capsys, "mode", "2", "2", "--pn-relative", "1", "--instantaneous-only")
    assert code == 2 and "--orbit general" in err
    # beyond the instantaneous rows (2.5PN for the mass moments, with their derived 2.5PN terms):
    # the refusal names the missing row
    code, _, err = _run(capsys, "modes", "--orbit", "general", "--pn-relative", "3", "--lmax", "2",
                        "--instantaneous-only")
    assert code == 2 and "instantaneous contribution beyond relative 5/2" in err
