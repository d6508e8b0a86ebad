"""The worked examples in ``worked/`` run to the end, print what they promise, and write valid files.

The notebook ``worked/first_steps.ipynb`` is executed in a Jupyter kernel (nbclient, from the
test extra); its fresh outputs are checked, and so are the outputs stored in the file (they must
be those a fresh run gives, so that the notebook as read on disk shows the current toolkit).

Every ``worked/*.py`` is run in a subprocess (as a user would run it: ``python worked/NAME.py
OUTDIR [options]``) with a temporary OUTDIR and a temporary cache directory; scripts with known
options run at small orders / lmax to keep this file well under a minute. A script without an
entry in ``SCRIPTS`` is still run and its PNGs checked, so a new example cannot rot unnoticed.
"""

from __future__ import annotations

import math
import os
import re
import struct
import subprocess
import sys
from pathlib import Path

import pytest

from stfalgebra.codegen import find_c_compiler

WORKED = Path(__file__).resolve().parent.parent / "worked"
ALL_SCRIPTS = sorted(p.name for p in WORKED.glob("*.py"))

PNG_SIGNATURE = b"\x89PNG\r\n\x1a\n"
MIN_PNG_BYTES = 10_000  # a two-panel plot with curves; an empty canvas is a few kB
TIMEOUT_SECONDS = 300

# script -> (extra command-line options, files it must write into OUTDIR)
SCRIPTS = {
    "derive_mode_latex.py": ([], ["hhat_3_2.tex"]),
    "check_hand_result.py": ([], ["check_hand_result.json"]),
    "emit_and_plot.py": (["--lmax", "3", "--pn-relative", "1"], ["modes_and_hplus.png"]),
    "eccentric_enhancement.py": ([], ["eccentric_enhancement.png"]),
    "post_adiabatic_elements.py": ([], ["post_adiabatic_elements.json"]),
}


def run_script(name: str, outdir: Path, options: list[str], tmp_path: Path,
               env_changes: dict[str, str | None] | None = None) -> subprocess.CompletedProcess:
    env = dict(os.environ)
    env["STFALGEBRA_CACHE_DIR"] = str(tmp_path / "cache")
    env["MPLBACKEND"] = "Agg"
    for key, value in (env_changes or {}).items():
        if value is None:
            env.pop(key, None)
        else:
            env[key] = value
    done = subprocess.run([sys.executable, str(WORKED / name), str(outdir), *options], capture_output=True,
                          text=True, env=env, cwd=tmp_path, timeout=TIMEOUT_SECONDS)
    assert done.returncode == 0, f"{name} exited {done.returncode}\nstdout:\n{done.stdout}\nstderr:\n{done.stderr}"
    return done


def assert_valid_png(path: Path) -> None:
    data = path.read_bytes()
    assert data[:8] == PNG_SIGNATURE, f"{path.name} is not a PNG (starts {data[:8]!r})"
    assert data[12:16] == b"IHDR", f"{path.name}: first chunk is {data[12:16]!r}, not IHDR"
    width, height = struct.unpack(">II", data[16:24])
    assert width >= 200 and height >= 200, f"{path.name}: {width} x {height} pixels"
    assert data[-8:-4] == b"IEND", f"{path.name} is truncated (no IEND chunk at the end)"
    assert len(data) >= MIN_PNG_BYTES, f"{path.name} has only {len(data)} bytes"


def printed_number(pattern: str, text: str) -> float:
    found = re.search(pattern, text)
    assert found, f"no line matching {pattern!r} in:\n{text}"
    return float(found.group(1))


def test_every_known_script_exists():
    missing = sorted(set(SCRIPTS) - set(ALL_SCRIPTS))
    assert not missing, f"worked scripts named in this test but missing: {missing}"


@pytest.mark.parametrize("name", ALL_SCRIPTS)
def test_script_runs_and_writes_valid_files(name, tmp_path):
    options, expected = SCRIPTS.get(name, ([], []))
    outdir = tmp_path / "out"
    done = run_script(name, outdir, options, tmp_path)
    assert done.stdout.strip(), f"{name} printed nothing"
    for file_name in expected:
        assert (outdir / file_name).is_file(), f"{name} did not write {file_name}"
    for png in outdir.glob("*.png"):
        assert_valid_png(png)
    check = CHECKS.get(name)
    if check is not None:
        check(done.stdout, outdir)


# ----------------------------------------------------------------------------- per script
def check_derive_mode_latex(out: str, outdir: Path) -> None:
    assert r"\hat H_{32} = " in out
    assert "% h_lm = (2 G m nu x/(R c^2)) sqrt(16 pi/5) Hhat_lm exp(-i m psi)" in out
    assert "% derived from:" in out
    assert "J_L" in out  # (3,2) is a current mode: l + m odd
    written = (outdir / "hhat_3_2.tex").read_text(encoding="utf-8")
    # the file is pasteable LaTeX: the equation line and comment lines only
    for line in written.splitlines():
        assert line.startswith("%") or line.startswith(r"\hat H_{32} = "), line
    assert written in out


def check_check_hand_result(out: str, outdir: Path) -> None:
    import json

    # The planted error: 37/18 instead of 73/18 in the nu^2 term of x^2 (Hhat_32 from
    # Blanchet, Living Rev. Relativ. 17, 2 (2014), from memory); the difference is
    # sqrt(5/7)/3 * (73 - 37)/18 = 2 sqrt(35)/21 (worked by hand).
    assert "result: DIFFER at x^2" in out
    assert "differs at PN order 2, i.e. x^2 (1PN beyond the leading x^1 of this mode), in the nu^2 term" in out
    assert "yours - derived = 2*sqrt(35)/21" in out
    assert out.count("differs at PN order") == 1
    assert out.rstrip().splitlines()[-2] == "result: AGREE"
    reports = json.loads((outdir / "check_hand_result.json").read_text(encoding="utf-8"))
    assert reports["hand_result"]["verdict"] == "differ"
    assert reports["published"]["verdict"] == "agree"


def check_emit_and_plot(out: str, outdir: Path) -> None:
    # (2,0) is the DC memory, served; (3,0) starts at relative 3/2
    assert "(3,0) skipped: zero through relative order 1" in out
    assert "11 modes: (2,2), (2,1), (2,0), (2,-1), (2,-2), (3,3), (3,2), (3,1), (3,-1), (3,-2), (3,-3)" in out
    if find_c_compiler() is not None:
        assert re.search(r"c: verified against exact evaluation at \d+ points", out)
        assert "loaded libdemo_modes.so through ctypes" in out
        assert (outdir / "demo_modes.c").is_file() and (outdir / "demo_modes.h").is_file()
    else:
        assert "no C compiler found: using the generated numpy function instead of C" in out
        assert "numpy: verified against exact evaluation" in out
    check_demo_numbers(out, pn_relative=1)


def check_demo_numbers(out: str, pn_relative: float) -> None:
    """The numbers the demo prints come out of the generated code: check them by hand."""
    # Hhat_22 = 1 + x(-107/42 + 55 nu/42) + 2 pi x^(3/2): Blanchet, Living Rev. Relativ. 17, 2
    # (2014), circular-orbit modes (from memory); nu = 36/169 for 9 + 4 masses, x = 0.08.
    nu, x = 36 / 169, 0.08
    hhat = 1 + x * (-107 / 42 + 55 * nu / 42) + (2 * math.pi * x**1.5 if pn_relative >= 1.5 else 0.0)
    # the 2PN term, Blanchet, Faye, Iyer & Sinha, Class. Quantum Grav. 25, 165003 (2008) (from memory)
    hhat += x**2 * (-2173 / 1512 - 1069 * nu / 216 + 2047 * nu**2 / 1512) if pn_relative >= 2 else 0.0
    # the 2.5PN term, Kidder, Phys. Rev. D 77, 044016 (2008) and the same paper (from memory)
    hhat += x**2.5 * (-107 * math.pi / 21 + (34 * math.pi / 21 - 24j) * nu) if pn_relative >= 2.5 else 0.0
    expected = 2 * nu * x * math.sqrt(16 * math.pi / 5) * abs(hhat)
    assert printed_number(r"\|h_22\| at x = 0\.08: ([0-9.]+)", out) == pytest.approx(expected, abs=1e-6)
    # planar orbits: h_l,-m = (-1)^l conj(h_lm) (conventions.md)
    assert printed_number(r"conj\(h_lm\)\| from the generated code: ([0-9.e+-]+)", out) < 1e-12
    assert 0 < printed_number(r"max \|h_plus\| = ([0-9.]+)", out) < 1


def check_eccentric_enhancement(out: str, outdir: Path) -> None:
    # Newtonian enhancement factors: Peters & Mathews, Phys. Rev. 131, 435 (1963) (energy) and
    # Peters, Phys. Rev. 136, B1224 (1964) (angular momentum); from memory.
    assert "energy:           (37*et**4/96 + 73*et**2/24 + 1)/(1 - et**2)**(7/2)" in out
    assert "angular momentum: (7*et**2/8 + 1)/(1 - et**2)**2" in out
    differences = [float(v) for v in re.findall(r"relative difference ([0-9.e+-]+)", out)]
    assert len(differences) == 3 and max(differences) < 1e-10, differences
    e2 = 0.25
    energy = (1 + 73 / 24 * e2 + 37 / 96 * e2**2) / (1 - e2) ** 3.5
    momentum = (1 + 7 / 8 * e2) / (1 - e2) ** 2
    assert printed_number(r"e = 0\.5: energy enhancement ([0-9.]+)", out) == pytest.approx(energy, abs=1e-6)
    assert printed_number(r"angular-momentum enhancement ([0-9.]+)", out) == pytest.approx(momentum, abs=1e-6)
    # tail enhancement: Blanchet & Schafer, Class. Quantum Grav. 10, 2699 (1993) and Arun,
    # Blanchet, Iyer & Sinha, Phys. Rev. D 80, 124018 (2009), first terms (from memory)
    assert "2335*et**2/192 + 1" in out and "209*et**2/32 + 1" in out
    phi_small = printed_number(r"e = 0\.1: phi = ([0-9.]+)", out)
    assert phi_small == pytest.approx(1 + 2335 / 192 * 0.01 + 42955 / 768 * 1e-4, rel=2e-4)
    assert printed_number(r"e = 0\.9: phi = ([0-9.]+)", out) > printed_number(r"e = 0\.5: phi = ([0-9.]+)", out)


def check_post_adiabatic_elements(out: str, outdir: Path) -> None:
    import json

    # Peters, Phys. Rev. 136, B1224 (1964) (from memory): <da/dt> = -(64/5) nu/a^3 (1 + 73/24 e^2
    # + 37/96 e^4)/(1 - e^2)^(7/2), <de/dt> = -(304/15) nu e/a^4 (1 + 121/304 e^2)/(1 - e^2)^(5/2)
    assert "<da/dt> = 2*G**3*m**3*nu*(-37*e**4 - 292*e**2 - 96)/(15*a**3*c**5*(1 - e**2)**(7/2))" in out
    assert "<de/dt> = -G**3*m**3*nu*(121*e**3 + 304*e)/(15*a**4*c**5*(1 - e**2)**(5/2))" in out
    residuals = json.loads((outdir / "post_adiabatic_elements.json").read_text(encoding="utf-8"))["residuals"]
    for name in ("semi_major_axis", "eccentricity"):
        # the periodic parts take away the first-order residual (that the rest is O(S^2) is
        # tests/binary/test_post_adiabatic.py)
        assert residuals["secular + periodic"][name] < residuals["secular only"][name] / 100, name


CHECKS = {
    "derive_mode_latex.py": check_derive_mode_latex,
    "check_hand_result.py": check_check_hand_result,
    "emit_and_plot.py": check_emit_and_plot,
    "eccentric_enhancement.py": check_eccentric_enhancement,
    "post_adiabatic_elements.py": check_post_adiabatic_elements,
}


# ----------------------------------------------------------------------------- fallbacks
def test_emit_and_plot_without_a_compiler_uses_numpy_and_steps_down(tmp_path):
    # An empty PATH hides every C compiler; relative 3PN is beyond the toolkit, so the
    # script steps down to 2.5PN (Hhat_22 and Hhat_21 with their 2.5PN terms).
    empty = tmp_path / "empty_path"
    empty.mkdir()
    outdir = tmp_path / "out"
    done = run_script("emit_and_plot.py", outdir, ["--lmax", "2", "--pn-relative", "3"], tmp_path,
                      {"PATH": str(empty), "CC": None})
    out = done.stdout
    assert "no mode is served at relative order 3" in out and "asking for 2.5" in out
    assert "(2,1) not available" not in out
    assert "4 modes: (2,2), (2,1), (2,-1), (2,-2)" in out and "(2,0) skipped" in out   # memory: through 2PN
    assert "no C compiler found: using the generated numpy function instead of C" in out
    assert "numpy: verified against exact evaluation" in out
    assert (outdir / "demo_modes.py").is_file()
    assert not (outdir / "demo_modes.c").exists()
    assert_valid_png(outdir / "modes_and_hplus.png")
    check_demo_numbers(out, pn_relative=2.5)


def test_emit_and_plot_refuses_an_order_that_is_not_a_multiple_of_one_half(tmp_path):
    done = subprocess.run([sys.executable, str(WORKED / "emit_and_plot.py"), str(tmp_path), "--pn-relative", "0.3"],
                          capture_output=True, text=True, timeout=TIMEOUT_SECONDS)
    assert done.returncode == 2
    assert "--pn-relative" in done.stderr and "'0.3'" in done.stderr and "Traceback" not in done.stderr


# ----------------------------------------------------------------------------- the notebook
NOTEBOOK = WORKED / "first_steps.ipynb"


def _outputs_by_tag(notebook) -> dict[str, list]:
    return {cell.metadata["tags"][0]: cell.outputs for cell in notebook.cells
            if cell.cell_type == "code" and cell.metadata.get("tags")}


def _stream(outputs) -> str:
    return "".join(output.text for output in outputs if output.output_type == "stream")


def _data(outputs, kind: str) -> list[str]:
    return [output.data[kind] for output in outputs if "data" in output and kind in output.data]


def _stable_text(outputs) -> str:
    """Printed text, LaTeX and plain display of a cell, without the numbers of floating-point
    round-off."""
    text = _stream(outputs) + "".join(_data(outputs, "text/latex") + _data(outputs, "text/plain"))
    return re.sub(r"(max relative error|exact value:) \S+", r"\1 ...", text)


@pytest.fixture(scope="module")
def executed_notebook(tmp_path_factory):
    import nbformat
    from nbclient import NotebookClient

    work = tmp_path_factory.mktemp("notebook")
    notebook = nbformat.read(NOTEBOOK, as_version=4)
    stored = nbformat.read(NOTEBOOK, as_version=4)
    root = str(WORKED.parent)
    saved = {key: os.environ.get(key) for key in ("PYTHONPATH", "STFALGEBRA_CACHE_DIR", "MPLBACKEND")}
    os.environ["PYTHONPATH"] = os.pathsep.join(filter(None, [root, saved["PYTHONPATH"]]))
    os.environ["STFALGEBRA_CACHE_DIR"] = str(work / "cache")
    os.environ.pop("MPLBACKEND", None)          # the kernel's inline backend draws the figures
    try:
        NotebookClient(notebook, timeout=TIMEOUT_SECONDS, kernel_name="python3", record_timing=False,
                       resources={"metadata": {"path": str(work)}}).execute()
    finally:
        for key, value in saved.items():
            if value is None:
                os.environ.pop(key, None)
            else:
                os.environ[key] = value
    return _outputs_by_tag(notebook), _outputs_by_tag(stored)


def test_notebook_derives_displays_checks_emits_and_plots(executed_notebook):
    fresh, _ = executed_notebook
    # Hhat_33 = -(3/4) i sqrt(15/14) delta [x^(1/2) - 4(1 - nu/2) x^(3/2) + x^2 (3 pi + i(-21/5 +
    # 6 ln(3/2)))]: Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 9.5 (from memory)
    (latex,) = _data(fresh["derive-mode"], "text/latex")
    assert latex.startswith(r"$\hat{H}_{3,3} = -\frac{3}{56} \sqrt{210} i \delta x^{1/2} \left[1 + x \left(-4 + 2 \nu\right)")
    assert r"6 \ln\left(\frac{3}{2}\right)" in latex
    terms = _stream(fresh["mode-terms"])
    assert "x^(3/2) beyond the leading term: 3*pi + I*(-21/5 + 6*log(3/2))" in terms and "from: tail" in terms
    # the planted transposition 37/18 for 73/18 is found where it was planted
    check = _stream(fresh["check-planted-error"])
    assert "result: DIFFER at x^2" in check and check.count("differ:") == 1
    assert "nu^2: differ: yours -37*sqrt(35)/378, derived -73*sqrt(35)/378" in check
    assert _stream(fresh["check-corrected"]).strip() == "result: AGREE"
    emitted = _stream(fresh["emit-and-evaluate"])
    assert re.search(r"numpy: verified against exact evaluation at \d+ points", emitted)
    assert printed_number(r"relative difference from the exact value: (\S+)", emitted) < 1e-12
    import base64

    (png,) = _data(fresh["plot-amplitudes"], "image/png")
    image = base64.b64decode(png)
    assert image[:8] == PNG_SIGNATURE and len(image) >= MIN_PNG_BYTES
    # Blanchet 2014, sec. 9.3 (from memory): phi = -x^(-5/2)/(32 nu) [1 + (3715/1008 + 55 nu/12) x - 10 pi x^(3/2)]
    (phase,) = _data(fresh["phasing"], "text/latex")
    assert phase == (r"$\phi - \phi_0 = -\frac{1}{32 \nu x^{5/2}} \left[1 + x \left(\frac{3715}{1008} + "
                     r"\frac{55}{12} \nu\right) - 10 \pi x^{3/2}\right]$")


def test_notebook_on_disk_shows_what_a_fresh_run_gives(executed_notebook):
    fresh, stored = executed_notebook
    assert set(fresh) == set(stored)
    for tag in fresh:
        assert _stable_text(stored[tag]) == _stable_text(fresh[tag]), f"stored outputs of cell {tag!r} are stale"
        assert bool(_data(stored[tag], "image/png")) == bool(_data(fresh[tag], "image/png")), tag
