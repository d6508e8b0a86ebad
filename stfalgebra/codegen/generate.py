"""One call from an emission to verified code and files on disk."""

from __future__ import annotations

import os
from dataclasses import dataclass
from pathlib import Path

from .c_source import emit_c
from .emission import EmissionSet, prepare_emission
from .files import check_output_path, write_file_set
from .identifiers import function_identifier
from .numpy_source import emit_numpy
from .verification import DEFAULT_POINTS, DEFAULT_SEED, VerificationReport, verify_c, verify_numpy

__all__ = ["LANGUAGES", "GeneratedCode", "generate_code", "output_stem", "output_paths", "write_generated_code"]

LANGUAGES = ("c", "numpy")


@dataclass(frozen=True)
class GeneratedCode:
    """Generated texts: ``single_text`` for standard output, ``files`` as
    ``(suffix, text)`` pairs for writing beside an output stem, and the verification report
    (None when verification was switched off)."""

    language: str
    function_name: str
    single_text: str
    files: tuple[tuple[str, str], ...]
    report: VerificationReport | None


def generate_code(emission: EmissionSet, language: str = "c", *, verify: bool = True, points: int = DEFAULT_POINTS,
                  seed: int = DEFAULT_SEED, header_name: str | None = None) -> GeneratedCode:
    """Generate C or numpy code for ``emission`` and verify it against exact evaluation.

    Parameters
    ----------
    emission:
        The function to generate.
    language:
        ``"c"`` (C99 header and source) or ``"numpy"`` (a Python module).
    verify:
        Compare the code with exact evaluation at ``points`` random points (``seed`` fixed).
    header_name:
        For C, the header file name the source includes (default ``NAME.h``).

    Returns
    -------
    GeneratedCode
        The texts and the verification report. A failed verification raises
        :class:`~stfalgebra.codegen.verification.GeneratedCodeMismatchError`; a missing C
        compiler gives a report with ``verified`` False.

    Conventions
    -----------
    The same emission gives the same bytes on every run (sympy's canonical CSE ordering, no
    timestamps in the output).

    Examples
    --------
    >>> import sympy as sp
    >>> from stfalgebra.codegen.emission import CodeInput, EmissionSet, NamedExpression
    >>> x = sp.Symbol("x", positive=True)
    >>> e = EmissionSet("f", (CodeInput(x, "x"),), (NamedExpression("y", 1 + x/3),), "demo")
    >>> generate_code(e, "numpy").report.verified
    True

    References
    ----------
    See :mod:`stfalgebra.codegen.verification`.
    """
    if language not in LANGUAGES:
        raise ValueError(f"language must be one of {LANGUAGES}, got {language!r}")
    prepared = prepare_emission(emission)
    report = None
    if language == "c":
        code = emit_c(prepared, header_name=header_name)
        if verify:
            report = verify_c(emission, code, points=points, seed=seed)
        return GeneratedCode("c", code.function_name, code.single_file(),
                             ((".h", code.header), (".c", code.source)), report)
    source = emit_numpy(prepared)
    if verify:
        report = verify_numpy(emission, source, points=points, seed=seed)
    return GeneratedCode("numpy", prepared.function_name, source, (("", source),), report)


def output_stem(language: str, path: str | os.PathLike[str], function_name: str | None = None
                ) -> tuple[Path, str | None]:
    """Split an output path into the stem the files are written beside and the header name.

    Parameters
    ----------
    language:
        ``"c"`` or ``"numpy"``.
    path:
        The path the user gave: a file, a stem, or an existing directory.
    function_name:
        The generated function's name; an existing directory ``path`` gets files named after
        it inside (C: ``DIR/NAME.h`` and ``DIR/NAME.c``; numpy: ``DIR/NAME.py``).

    Returns
    -------
    (pathlib.Path, str or None)
        For C, ``out/modes.c``, ``out/modes.h`` and ``out/modes`` all give
        (``out/modes``, ``"modes.h"``); for numpy the path itself and None.

    Raises
    ------
    ValueError
        ``path`` is a directory and no ``function_name`` was given.

    Conventions
    -----------
    C output is always a header/source pair sharing one stem.

    Examples
    --------
    >>> output_stem("c", "out/modes.c")
    (PosixPath('out/modes'), 'modes.h')
    >>> output_stem("numpy", "/", "gen_modes")
    (PosixPath('/gen_modes.py'), None)

    References
    ----------
    Common practice.
    """
    target = Path(path)
    if target.is_dir():
        if function_name is None:
            raise ValueError(f"output path {str(target)!r} is a directory: a function name is needed to name the files")
        name = function_identifier(function_name)
        target = target / (name if language == "c" else name + ".py")
    if language == "c":
        if target.suffix in (".c", ".h"):
            target = target.with_suffix("")
        return target, target.name + ".h"
    return target, None


def output_paths(language: str, path: str | os.PathLike[str], function_name: str | None = None, *,
                 force: bool = False) -> list[Path]:
    """The files ``write_generated_code`` will write for ``path``, each checked by
    :func:`~stfalgebra.codegen.files.check_output_path`: call it before any work.

    Examples
    --------
    >>> [p.name for p in output_paths("c", "/tmp/modes.c")]
    ['modes.h', 'modes.c']
    """
    if language not in LANGUAGES:
        raise ValueError(f"language must be one of {LANGUAGES}, got {language!r}")
    stem, _ = output_stem(language, path, function_name)
    suffixes = (".h", ".c") if language == "c" else ("",)
    return [check_output_path(Path(str(stem) + suffix), force=force) for suffix in suffixes]


def write_generated_code(code: GeneratedCode, path: str | os.PathLike[str], *, force: bool = False) -> list[Path]:
    """Write generated code as one set and return the paths written.

    Parameters
    ----------
    code:
        From :func:`generate_code` (for C, generated with the header name of
        ``output_stem("c", path, name)``).
    path:
        For numpy, the module file; for C, ``STEM``, ``STEM.c`` or ``STEM.h``: ``STEM.h`` and
        ``STEM.c`` are written. An existing directory gets files named after the function.
    force:
        Replace read-only files too.

    Returns
    -------
    list of pathlib.Path

    Conventions
    -----------
    :func:`~stfalgebra.codegen.files.write_file_set`: every file is written to a temporary
    file first, links, FIFOs and other non-regular files are never replaced, read-only files
    only with ``force``; a C header and source carry the same emission-set hash and compile
    only together.

    Examples
    --------
    >>> import sympy as sp, tempfile, pathlib
    >>> from stfalgebra.codegen.emission import CodeInput, EmissionSet, NamedExpression
    >>> x = sp.Symbol("x", positive=True)
    >>> e = EmissionSet("f", (CodeInput(x, "x"),), (NamedExpression("y", x),), "demo")
    >>> with tempfile.TemporaryDirectory() as d:
    ...     [p.name for p in write_generated_code(generate_code(e, "c", verify=False), pathlib.Path(d) / "f.c")]
    ['f.h', 'f.c']

    References
    ----------
    See :func:`stfalgebra.codegen.files.write_file_set`.
    """
    stem, _ = output_stem(code.language, path, code.function_name)
    pairs = [(Path(str(stem) + suffix) if suffix else stem, text) for suffix, text in code.files]
    return write_file_set(pairs, force=force)
