"""Checking generated code against exact evaluation of the expressions it came from.

The C source is compiled into a shared library with the system compiler and called through
:mod:`ctypes`; the numpy module is executed and called with arrays. Both are compared, at
random points drawn from the emission's sampler, with the sympy expressions evaluated by
mpmath at 30 significant digits (the inputs are the exact binary values of the doubles the
generated code receives).
"""

from __future__ import annotations

import ctypes
import math
import os
import random
import shutil
import subprocess
import tempfile
from dataclasses import dataclass
from pathlib import Path

import sympy as sp

from ..errors import CompilerFailureError
from .c_source import CSource, emit_c
from .emission import EmissionSet
from .numpy_source import emit_numpy, load_generated_module

__all__ = [
    "COMPILER_FLAGS",
    "CompilerFailureError",
    "GeneratedCodeMismatchError",
    "VerificationReport",
    "find_c_compiler",
    "compile_shared_library",
    "load_shared_library",
    "exact_values",
    "verify_c",
    "verify_numpy",
]

COMPILER_FLAGS: tuple[str, ...] = ("-std=c99", "-O2", "-Wall", "-Wextra", "-Werror", "-shared", "-fPIC")
"""Flags of the verification build: the code must compile warning-free with these."""

DEFAULT_TOLERANCE = 1e-12
DEFAULT_POINTS = 8
DEFAULT_SEED = 20240517
# Values smaller than this fraction of the largest |value| of the same output over the sample
# are near a zero of the output, where a relative error means nothing: they are skipped.
NEAR_ZERO_FRACTION = 1e-9


class GeneratedCodeMismatchError(RuntimeError):
    """Generated code failed to compile or disagreed with exact evaluation (a bug in the
    emitter, never the user's fault)."""


@dataclass(frozen=True)
class VerificationReport:
    """Outcome of one verification.

    ``verified`` is False only when verification could not run (no compiler); a failed
    comparison raises :class:`GeneratedCodeMismatchError` instead of returning.
    """

    language: str
    verified: bool
    points: int
    compared: int
    skipped_near_zero: int
    max_relative_error: float
    compiler: str | None = None
    note: str = ""

    def summary(self) -> str:
        """One line for the user."""
        if not self.verified:
            return f"{self.language}: not verified: {self.note}"
        text = (f"{self.language}: verified against exact evaluation at {self.points} points "
                f"({self.compared} values, max relative error {self.max_relative_error:.1e}")
        if self.skipped_near_zero:
            text += f", {self.skipped_near_zero} values near a zero skipped"
        return text + ")"


def find_c_compiler() -> str | None:
    """Return the path of the C compiler to use, or None when there is none.

    Parameters
    ----------
    None.

    Returns
    -------
    str or None
        ``$CC`` when set and found on ``PATH``, else the first of ``cc``, ``gcc``, ``clang``.

    Conventions
    -----------
    Only the compiler's presence is checked here; a compiler that cannot build shared
    libraries shows up as a failure of :func:`compile_shared_library`.

    Examples
    --------
    >>> find_c_compiler() is None or isinstance(find_c_compiler(), str)
    True

    References
    ----------
    Common practice (the ``CC`` environment variable of make).
    """
    candidates = [os.environ["CC"]] if os.environ.get("CC") else []
    candidates += ["cc", "gcc", "clang"]
    for candidate in candidates:
        path = shutil.which(candidate)
        if path:
            return path
    return None


def compile_shared_library(code: CSource, directory: str | os.PathLike[str], *, compiler: str | None = None) -> Path:
    """Write ``code`` into ``directory`` and compile it into a shared library.

    Parameters
    ----------
    code:
        Generated C (header and source).
    directory:
        An existing scratch directory.
    compiler:
        Compiler command; default :func:`find_c_compiler`.

    Returns
    -------
    pathlib.Path
        Path of the shared library.

    Conventions
    -----------
    Flags :data:`COMPILER_FLAGS` plus ``-lm``. When the build fails, a trivial program is
    built with the same command: if that fails too (or the compiler cannot be run, or times
    out), the compiler is at fault and :class:`~stfalgebra.errors.CompilerFailureError` is
    raised; otherwise the generated code is, and :class:`GeneratedCodeMismatchError` carries
    the compiler's first diagnostic lines.

    Examples
    --------
    >>> import sympy as sp, tempfile
    >>> from stfalgebra.codegen.emission import CodeInput, EmissionSet, NamedExpression
    >>> x = sp.Symbol("x", positive=True)
    >>> code = emit_c(EmissionSet("f", (CodeInput(x, "x"),), (NamedExpression("y", x),), "demo"))
    >>> with tempfile.TemporaryDirectory() as d:
    ...     compile_shared_library(code, d).name if find_c_compiler() else "libf.so"
    'libf.so'

    References
    ----------
    GCC manual, options ``-shared`` and ``-fPIC``.
    """
    compiler = compiler or find_c_compiler()
    if compiler is None:
        raise CompilerFailureError("no C compiler found (looked for $CC, cc, gcc, clang)")
    directory = Path(directory)
    (directory / code.header_name).write_text(code.header, encoding="utf-8")
    source_path = directory / f"{code.function_name}.c"
    source_path.write_text(code.source, encoding="utf-8")
    library = directory / f"lib{code.function_name}.so"
    done = _run_compiler(compiler, source_path, library)
    if done.returncode != 0 or not library.is_file():
        message = " | ".join((done.stderr or done.stdout).strip().splitlines()[:4]) or "no library produced"
        _check_compiler_works(compiler, directory)
        raise GeneratedCodeMismatchError(f"generated C does not compile with {' '.join(COMPILER_FLAGS)}: {message}")
    return library


def load_shared_library(library: Path, compiler: str) -> ctypes.CDLL:
    """Load a library built by :func:`compile_shared_library`; a library the loader refuses is
    the compiler's fault when a trivial one is refused too."""
    try:
        return ctypes.CDLL(str(library))
    except OSError as exc:
        _check_compiler_works(compiler, library.parent)
        raise GeneratedCodeMismatchError(f"the compiled library cannot be loaded: {exc}") from None


_PROBE_SOURCE = "int stfalgebra_compiler_probe(int a);\nint stfalgebra_compiler_probe(int a) { return a + 1; }\n"


def _run_compiler(compiler: str, source: Path, library: Path) -> subprocess.CompletedProcess:
    command = [compiler, *COMPILER_FLAGS, "-o", str(library), str(source), "-lm"]
    try:
        return subprocess.run(command, capture_output=True, text=True, timeout=600, cwd=source.parent,
                              stdin=subprocess.DEVNULL)
    except subprocess.TimeoutExpired:
        raise CompilerFailureError(f"the C compiler {compiler} did not finish within 600 s") from None
    except OSError as exc:
        raise CompilerFailureError(f"the C compiler {compiler} cannot be run: {exc.strerror or exc}") from None


def _check_compiler_works(compiler: str, directory: Path) -> None:
    """Raise CompilerFailureError when ``compiler`` cannot build a trivial shared library that
    loads either."""
    probe = directory / "stfalgebra_compiler_probe.c"
    probe.write_text(_PROBE_SOURCE, encoding="utf-8")
    library = directory / "libstfalgebra_compiler_probe.so"
    done = _run_compiler(compiler, probe, library)
    if done.returncode != 0:
        detail = " | ".join((done.stderr or done.stdout).strip().splitlines()[:2]) or f"exit status {done.returncode}"
        raise CompilerFailureError(f"the C compiler {compiler} fails on a trivial program too ({detail})")
    try:
        ctypes.CDLL(str(library))
    except OSError as exc:
        raise CompilerFailureError(f"the C compiler {compiler} builds no loadable library from a trivial "
                                   f"program ({exc})") from None


def exact_values(emission: EmissionSet, point: dict[sp.Symbol, float], *, digits: int = 30) -> list[complex]:
    """Evaluate every output of ``emission`` at ``point`` with mpmath at ``digits`` digits.

    Parameters
    ----------
    emission:
        The emission whose outputs to evaluate.
    point:
        A float per input symbol; the exact binary value of each float is used.
    digits:
        Working precision of sympy's ``evalf``.

    Returns
    -------
    list of complex
        One value per output, rounded to double precision at the end only.

    Conventions
    -----------
    Intermediates (e.g. nu from the masses) are substituted symbolically first, so the
    reference does not share the generated code's rounding of them.

    Examples
    --------
    >>> import sympy as sp
    >>> from stfalgebra.codegen.emission import CodeInput, EmissionSet, NamedExpression
    >>> x = sp.Symbol("x", positive=True)
    >>> e = EmissionSet("f", (CodeInput(x, "x"),), (NamedExpression("y", sp.I*sp.sqrt(x)),), "demo")
    >>> exact_values(e, {x: 2.25})
    [1.5j]

    References
    ----------
    sympy documentation of ``evalf`` (adaptive precision with ``subs``).
    """
    exact_point = {symbol: sp.Rational(value) for symbol, value in point.items()}
    values = []
    for output in emission.outputs:
        expression = emission.substitute_intermediates(output.expression)
        value = sp.N(expression, digits, subs=exact_point)
        if value.free_symbols:
            raise GeneratedCodeMismatchError(f"output {output.name!r} did not evaluate to a number: {value}")
        values.append(complex(value))
    return values


def _compare(reference: list[list[complex]], computed: list[list[complex]], tolerance: float,
             names: tuple[str, ...], language: str) -> tuple[int, int, float]:
    compared = skipped = 0
    worst = 0.0
    for k, name in enumerate(names):
        column = [abs(row[k]) for row in reference]
        scale = max(column)
        for point_index, (exact_row, computed_row) in enumerate(zip(reference, computed)):
            exact, value = exact_row[k], computed_row[k]
            if not (math.isfinite(value.real) and math.isfinite(value.imag)):
                raise GeneratedCodeMismatchError(
                    f"{language} output {name!r} is not finite at point {point_index}: {value}")
            if scale == 0.0:
                error = abs(value)
                if error > 1e-300:
                    raise GeneratedCodeMismatchError(
                        f"{language} output {name!r} should vanish, got {value} at point {point_index}")
                compared += 1
                continue
            if abs(exact) < NEAR_ZERO_FRACTION * scale:
                skipped += 1
                continue
            error = abs(value - exact) / abs(exact)
            worst = max(worst, error)
            compared += 1
            if error > tolerance:
                raise GeneratedCodeMismatchError(
                    f"{language} output {name!r} differs from exact evaluation at point {point_index}: "
                    f"relative error {error:.2e} > {tolerance:.0e} (got {value}, exact {exact})")
    return compared, skipped, worst


def _draw(emission: EmissionSet, points: int, seed: int) -> list[dict[sp.Symbol, float]]:
    if not isinstance(points, int) or isinstance(points, bool) or points < 1:
        raise ValueError(f"number of verification points must be a positive int, got {points!r}")
    rng = random.Random(seed)
    return [emission.draw_point(rng) for _ in range(points)]


def verify_c(emission: EmissionSet, code: CSource | None = None, *, points: int = DEFAULT_POINTS,
             seed: int = DEFAULT_SEED, tolerance: float = DEFAULT_TOLERANCE,
             compiler: str | None = None) -> VerificationReport:
    """Compile the generated C, call it through ctypes and compare with exact evaluation.

    Parameters
    ----------
    emission:
        The emission the code was generated from.
    code:
        The generated C; default ``emit_c(emission)``.
    points, seed:
        Number of random points and the seed of their generator (fixed: reproducible runs).
    tolerance:
        Largest accepted relative error per value.
    compiler:
        Compiler command; default :func:`find_c_compiler`.

    Returns
    -------
    VerificationReport
        ``verified`` False (with a note) when no compiler exists.

    Conventions
    -----------
    Relative error |computed - exact|/|exact| of the complex value; values within
    ``1e-9`` of the output's largest modulus over the sample are skipped (near a zero).
    Raises :class:`GeneratedCodeMismatchError` on a compile failure or a larger error.

    Examples
    --------
    >>> import sympy as sp
    >>> from stfalgebra.codegen.emission import CodeInput, EmissionSet, NamedExpression
    >>> x = sp.Symbol("x", positive=True)
    >>> e = EmissionSet("f", (CodeInput(x, "x"),), (NamedExpression("y", sp.log(x) + sp.I*sp.pi),), "demo")
    >>> report = verify_c(e)
    >>> report.verified or report.note.startswith("no C compiler")
    True

    References
    ----------
    Python documentation of :mod:`ctypes`; sympy documentation of ``evalf``.
    """
    code = code or emit_c(emission)
    compiler = compiler or find_c_compiler()
    if compiler is None:
        return VerificationReport("c", False, 0, 0, 0, 0.0, None,
                                  "no C compiler found (looked for $CC, cc, gcc, clang); code emitted unverified")
    sample = _draw(emission, points, seed)
    reference = [exact_values(emission, point) for point in sample]
    n_out = len(code.output_names)
    computed = []
    with tempfile.TemporaryDirectory(prefix="stfalgebra-cverify-") as scratch:
        library = load_shared_library(compile_shared_library(code, scratch, compiler=compiler), compiler)
        function = getattr(library, code.function_name)
        function.restype = None
        function.argtypes = [ctypes.c_double] * len(code.parameters) + [ctypes.POINTER(ctypes.c_double)] * 2
        symbols = emission.input_symbols()
        for point in sample:
            real = (ctypes.c_double * n_out)()
            imag = (ctypes.c_double * n_out)()
            function(*[point[s] for s in symbols], real, imag)
            computed.append([complex(real[k], imag[k]) for k in range(n_out)])
    compared, skipped, worst = _compare(reference, computed, tolerance, code.output_names, "C")
    return VerificationReport("c", True, len(sample), compared, skipped, worst, compiler)


def verify_numpy(emission: EmissionSet, source: str | None = None, *, points: int = DEFAULT_POINTS,
                 seed: int = DEFAULT_SEED, tolerance: float = DEFAULT_TOLERANCE) -> VerificationReport:
    """Execute the generated numpy module on arrays of random points and compare with exact
    evaluation.

    Parameters
    ----------
    emission:
        The emission the code was generated from.
    source:
        The generated module text; default ``emit_numpy(emission)``.
    points, seed, tolerance:
        As in :func:`verify_c`.

    Returns
    -------
    VerificationReport

    Conventions
    -----------
    All points go through one vectorised call (arrays of shape ``(points,)``), so broadcasting
    is exercised too. Raises :class:`GeneratedCodeMismatchError` on a larger error.

    Examples
    --------
    >>> import sympy as sp
    >>> from stfalgebra.codegen.emission import CodeInput, EmissionSet, NamedExpression
    >>> x = sp.Symbol("x", positive=True)
    >>> e = EmissionSet("f", (CodeInput(x, "x"),), (NamedExpression("y", x**sp.Rational(3, 2)),), "demo")
    >>> verify_numpy(e).verified
    True

    References
    ----------
    NumPy broadcasting rules; sympy documentation of ``evalf``.
    """
    import numpy

    source = source if source is not None else emit_numpy(emission)
    sample = _draw(emission, points, seed)
    reference = [exact_values(emission, point) for point in sample]
    module = load_generated_module(source, "stfalgebra_generated_check")
    names = tuple(module.OUTPUT_NAMES)
    function_name = _function_name(module)
    symbols = emission.input_symbols()
    arrays = [numpy.array([point[s] for point in sample], dtype=float) for s in symbols]
    result = getattr(module, function_name)(*arrays)
    computed = [[complex(result[name][i]) for name in names] for i in range(len(sample))]
    compared, skipped, worst = _compare(reference, computed, tolerance, names, "numpy")
    return VerificationReport("numpy", True, len(sample), compared, skipped, worst)


def _function_name(module) -> str:
    functions = [k for k, v in vars(module).items() if callable(v) and getattr(v, "__module__", None) == module.__name__]
    if len(functions) != 1:
        raise GeneratedCodeMismatchError(f"generated module defines {len(functions)} functions, expected 1")
    return functions[0]
