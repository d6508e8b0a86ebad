"""Code generation: C99 and numpy functions for named complex expressions (mode sets, fluxes),
verified against exact evaluation on emission.

Layer 5: imports from the layers below only (``radiative`` results are consumed duck-typed).
"""

from .c_source import CSource, emission_set_id, emit_c
from .emission import CodeInput, EmissionSet, NamedExpression, prepare_emission, split_real_imaginary
from .files import check_output_path, write_file_set, write_text_atomically
from .generate import LANGUAGES, GeneratedCode, generate_code, output_paths, output_stem, write_generated_code
from .identifiers import function_identifier, sanitize_identifier
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
    "CSource", "emit_c", "emission_set_id", "CodeInput", "EmissionSet", "NamedExpression", "prepare_emission",
    "split_real_imaginary", "write_text_atomically", "write_file_set", "check_output_path", "LANGUAGES",
    "GeneratedCode", "generate_code", "output_stem", "output_paths", "write_generated_code", "sanitize_identifier",
    "function_identifier", "PSI", "QUANTITIES", "mode_emission",
    "orbit_emission", "emit_numpy", "load_generated_module", "GeneratedCodeMismatchError",
    "VerificationReport", "find_c_compiler", "verify_c", "verify_numpy",
]
