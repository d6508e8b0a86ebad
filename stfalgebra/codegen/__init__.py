"""Code generation: C99 and numpy functions for named complex expressions (mode sets, fluxes),
verified against exact evaluation on emission.

Layer 5: imports from the layers below only (``radiative`` results are consumed duck-typed).
"""

from .c_source import CSource, emit_c
from .emission import CodeInput, EmissionSet, NamedExpression, prepare_emission, split_real_imaginary
from .files import write_text_atomically
from .generate import LANGUAGES, GeneratedCode, generate_code, output_stem, write_generated_code
from .identifiers import sanitize_identifier
from .mode_sets import PSI, QUANTITIES, mode_emission, orbit_emission
from .numpy_source import emit_numpy, load_generated_module
from .verification import (
    GeneratedCodeMismatchError,
    VerificationReport,
    find_c_compiler,
    verify_c,
    verify_numpy,
)

__all__ = [
    "CSource", "emit_c", "CodeInput", "EmissionSet", "NamedExpression", "prepare_emission",
    "split_real_imaginary", "write_text_atomically", "LANGUAGES", "GeneratedCode", "generate_code",
    "output_stem", "write_generated_code", "sanitize_identifier", "PSI", "QUANTITIES", "mode_emission",
    "orbit_emission", "emit_numpy", "load_generated_module", "GeneratedCodeMismatchError",
    "VerificationReport", "find_c_compiler", "verify_c", "verify_numpy",
]
