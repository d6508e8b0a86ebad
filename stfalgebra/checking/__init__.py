"""The safe checker: parse untrusted expression text without evaluating it, and compare it with
the toolkit's derivation PN order by PN order and power of nu by power of nu.

Layer 5: imports from the layers below only.
"""

from .compare import (
    VERDICTS,
    ComparisonReport,
    OrderComparison,
    SpotCheck,
    TermComparison,
    canonical_logarithms,
    compare_expressions,
    compare_with_derived,
    parse_pn_order,
    time_limit,
)
from .safe_parser import DecimalLiteral, ParsedExpression, allowed_symbols, parse_expression, parse_with_decimals

__all__ = [
    "VERDICTS", "ComparisonReport", "OrderComparison", "SpotCheck", "TermComparison", "canonical_logarithms",
    "compare_expressions", "compare_with_derived", "parse_pn_order", "time_limit", "DecimalLiteral",
    "ParsedExpression", "allowed_symbols", "parse_expression", "parse_with_decimals",
]
