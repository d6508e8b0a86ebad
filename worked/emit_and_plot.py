"""Emit verified C for the circular-orbit modes h_lm (l <= 4), evaluate it for a demo binary, plot.

Run:  python worked/emit_and_plot.py [OUTDIR] [--lmax N] [--pn-relative Q]
      (OUTDIR default: worked/_out/; defaults --lmax 4 --pn-relative 1.5)

What it shows:

1. every mode 2 <= l <= lmax, derived at the relative order Q where the toolkit serves
   it, else at the highest lower order it serves (the script steps down by 1/2 and says so);
   circular m = 0 modes of even l are the DC memory (integrated along the adiabatic inspiral
   from the infinite past), those of odd l start at relative 1.5PN (instantaneous quadratic
   interactions): a mode that is refused or exactly zero at the order asked is skipped, with the reason;
2. one C99 function for all of them (``R c^2 h_lm/(G m)`` for inputs x, nu, delta, psi),
   verified against exact evaluation when it is emitted, written into OUTDIR, compiled into a
   shared library and called through ctypes. Without a C compiler, the generated numpy
   function (verified the same way) is used instead, and the script says so;
3. a demo binary (9 + 4 solar masses, so nu = 36/169, delta = 5/13) and a PNG in OUTDIR with
   |h_lm| against x in [0.02, 0.2] and h_plus over three orbits at x = 0.08, seen at an
   inclination of 60 degrees.

Demo only: x is held fixed over the three orbits, so this is NOT a waveform model.
"""

from __future__ import annotations

import argparse
import ctypes
import subprocess
from pathlib import Path

import numpy as np
import sympy as sp

from stfalgebra import OrderBeyondInputsError, derive_mode, derive_modes, spin_weighted_harmonic
from stfalgebra.codegen import (
    find_c_compiler,
    generate_code,
    load_generated_module,
    mode_emission,
    output_stem,
    write_generated_code,
)
from stfalgebra.orders import PNOrder, parse_pn_order

FUNCTION_NAME = "demo_modes"
M1, M2 = 9, 4                                   # solar masses; only nu and delta enter
NU = sp.Rational(M1 * M2, (M1 + M2) ** 2)       # 36/169
DELTA = sp.Rational(M1 - M2, M1 + M2)           # 5/13
X_FIXED = 0.08
ORBITS = 3
THETA, PHI = sp.pi / 3, sp.Integer(0)           # direction of the observer in the source frame


def relative_order(text: str) -> PNOrder:
    """A relative PN order from the command line (a multiple of 1/2)."""
    return parse_pn_order(text, "--pn-relative")


def order_text(order: PNOrder) -> str:
    """3/2 -> '1.5', 1 -> '1'."""
    return str(order) if order.denominator == 1 else f"{float(order):g}"


def serve_modes(lmax: int, pn_relative: PNOrder) -> list:
    """The m != 0 modes at the highest relative order <= pn_relative that the toolkit derives."""
    while True:
        try:
            results = derive_modes(lmax, orbit="circular", pn_relative=pn_relative)
            break
        except OrderBeyondInputsError as exc:
            if pn_relative < PNOrder(1, 2):
                raise
            print(f"  no mode is served at relative order {order_text(pn_relative)} ({exc}); "
                  f"asking for {order_text(pn_relative - PNOrder(1, 2))}")
            pn_relative -= PNOrder(1, 2)
    served = []
    for result in results:
        if result.hhat is not None:
            if result.hhat == 0:
                print(f"  ({result.l},{result.m}) skipped: zero through relative order {order_text(pn_relative)}")
                continue
            served.append(result)
            continue
        if result.m == 0:
            print(f"  ({result.l},{result.m}) skipped: {result.refused}")
            continue
        order = pn_relative - PNOrder(1, 2)
        while order >= 0:
            try:
                served.append(derive_mode(result.l, result.m, orbit="circular", pn_relative=order))
                print(f"  ({result.l},{result.m}) not available at relative order {order_text(pn_relative)}; "
                      f"using relative order {order_text(order)}")
                break
            except OrderBeyondInputsError:
                order -= PNOrder(1, 2)
        else:
            print(f"  ({result.l},{result.m}) skipped: {result.refused}")
    return served


def compile_and_load(code, outdir: Path, compiler: str):
    """Write the C files, build a shared library in outdir and return an evaluator, or None."""
    stem, _ = output_stem("c", outdir / f"{FUNCTION_NAME}.c")
    written = write_generated_code(code, stem)
    library = outdir / f"lib{FUNCTION_NAME}.so"
    command = [compiler, "-std=c99", "-O2", "-shared", "-fPIC", "-o", str(library), f"{stem}.c", "-lm"]
    print(f"wrote {', '.join(str(p) for p in written)}")
    print(f"compiling: {' '.join(command)}")
    done = subprocess.run(command, capture_output=True, text=True)
    if done.returncode != 0:
        print(f"compilation failed ({done.stderr.strip()[:200]}); falling back to numpy")
        return None
    function = getattr(ctypes.CDLL(str(library.resolve())), code.function_name)
    function.restype = None

    def evaluate(inputs: list[np.ndarray], n_out: int) -> np.ndarray:
        function.argtypes = [ctypes.c_double] * len(inputs) + [ctypes.POINTER(ctypes.c_double)] * 2
        values = np.empty((n_out, inputs[0].size), dtype=complex)
        real, imag = (ctypes.c_double * n_out)(), (ctypes.c_double * n_out)()
        for i, point in enumerate(zip(*inputs)):
            function(*map(float, point), real, imag)
            values[:, i] = np.array(real[:]) + 1j * np.array(imag[:])
        return values

    return evaluate


def numpy_fallback(emission, outdir: Path):
    """Generate, verify and load the numpy function; return an evaluator."""
    code = generate_code(emission, "numpy")
    print(f"  {code.report.summary()}")
    written = write_generated_code(code, outdir / f"{FUNCTION_NAME}.py")
    print(f"wrote {', '.join(str(p) for p in written)}")
    module = load_generated_module(code.single_text, FUNCTION_NAME)
    function = getattr(module, code.function_name)

    def evaluate(inputs: list[np.ndarray], n_out: int) -> np.ndarray:
        result = function(*inputs)
        return np.array([np.broadcast_to(result[name], inputs[0].shape) for name in module.OUTPUT_NAMES])

    return evaluate


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("outdir", nargs="?", default=str(Path(__file__).parent / "_out"),
                        help="directory for the generated code and the PNG (default worked/_out/)")
    parser.add_argument("--lmax", type=int, default=4, help="largest l (default 4)")
    parser.add_argument("--pn-relative", type=relative_order, default="1.5",
                        help="relative PN order to ask for (default 1.5; lower where not served)")
    args = parser.parse_args(argv)
    if args.lmax < 2:
        parser.error(f"--lmax must be at least 2, got {args.lmax}")
    outdir = Path(args.outdir)
    outdir.mkdir(parents=True, exist_ok=True)
    pn_relative = args.pn_relative

    print(f"Deriving the circular-orbit modes l <= {args.lmax} at relative order {order_text(pn_relative)}:")
    modes = serve_modes(args.lmax, pn_relative)
    print(f"  {len(modes)} modes: " + ", ".join(f"({r.l},{r.m})" for r in modes))
    emission = mode_emission(modes, function_name=FUNCTION_NAME)
    n_out = len(emission.outputs)

    evaluate = None
    compiler = find_c_compiler()
    if compiler is None:
        print("no C compiler found: using the generated numpy function instead of C")
    else:
        print(f"Emitting C ({compiler}):")
        code = generate_code(emission, "c", header_name=f"{FUNCTION_NAME}.h")
        print(f"  {code.report.summary()}")
        evaluate = compile_and_load(code, outdir, compiler)
        if evaluate is not None:
            print(f"loaded lib{FUNCTION_NAME}.so through ctypes")
    if evaluate is None:
        print("Emitting numpy:")
        evaluate = numpy_fallback(emission, outdir)

    def strain(x: np.ndarray, psi: np.ndarray) -> np.ndarray:
        """R c^2 h_lm/(G m), one row per mode, for the demo binary."""
        values = {"x": x, "nu": np.full_like(x, float(NU)), "delta": np.full_like(x, float(DELTA)), "psi": psi}
        return evaluate([values[i.symbol.name] for i in emission.inputs], n_out)

    # Panel 1: |h_lm| against x (independent of the phase; |h_l,-m| = |h_lm|, so m > 0 only).
    x_grid = np.linspace(0.02, 0.2, 181)
    amplitudes = np.abs(strain(x_grid, np.zeros_like(x_grid)))

    # Panel 2: h_plus over three orbits at FIXED x. No phase evolution, no radiation reaction:
    # the phase simply advances as psi = omega t with G m omega/c^3 = x^(3/2) (psi and the
    # orbital phase phi differ by a constant at fixed omega). This is not a waveform model.
    omega = X_FIXED ** 1.5                               # in units of c^3/(G m)
    t = np.linspace(0.0, ORBITS * 2 * np.pi / omega, 1200)  # in units of G m/c^3
    modes_in_time = strain(np.full_like(t, X_FIXED), omega * t)
    harmonics = np.array([complex(sp.N(spin_weighted_harmonic(-2, r.l, r.m, THETA, PHI))) for r in modes])
    h = harmonics @ modes_in_time                        # h_plus - i h_cross, units G m/(R c^2)
    h_plus = h.real

    index = {(r.l, r.m): k for k, r in enumerate(modes)}
    at_x = strain(np.array([X_FIXED]), np.array([0.3]))[:, 0]
    symmetry = max(abs(at_x[index[(l, -m)]] - (-1) ** l * np.conj(at_x[index[(l, m)]]))
                   for (l, m) in index if m > 0 and (l, -m) in index)
    print(f"demo binary {M1} + {M2} solar masses: nu = {NU}, delta = {DELTA}")
    print(f"|h_22| at x = {X_FIXED}: {abs(at_x[index[(2, 2)]]):.6f} G m/(R c^2)")
    print(f"max |h_l,-m - (-1)^l conj(h_lm)| from the generated code: {symmetry:.1e}")
    print(f"h_plus over {ORBITS} orbits at x = {X_FIXED}, inclination 60 deg: "
          f"max |h_plus| = {np.max(np.abs(h_plus)):.6f} G m/(R c^2)")

    import matplotlib
    matplotlib.use("Agg")
    import matplotlib.pyplot as plt

    figure, (left, right) = plt.subplots(1, 2, figsize=(12, 4.5))
    for k, r in enumerate(modes):
        if r.m > 0:
            left.semilogy(x_grid, amplitudes[k], label=f"({r.l},{r.m}), {order_text(r.pn_relative)}PN rel.")
    left.set_xlabel("x = (G m omega / c^3)^(2/3)")
    left.set_ylabel("|h_lm|  [G m / (R c^2)]")
    left.set_title(f"mode amplitudes, {M1} + {M2} Msun (m > 0)")
    left.legend(fontsize=7, ncol=2)
    right.plot(t, h_plus, color="black", lw=1)
    right.set_xlabel("t  [G m / c^3]")
    right.set_ylabel("h_plus  [G m / (R c^2)]")
    right.set_title(f"h_plus at fixed x = {X_FIXED}, inclination 60 deg\n(no phase evolution: not a waveform model)")
    figure.tight_layout()
    png = outdir / "modes_and_hplus.png"
    figure.savefig(png, dpi=100)
    plt.close(figure)
    print(f"saved {png}")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
