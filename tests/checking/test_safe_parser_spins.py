"""The spin symbols of the safe parser (stfalgebra.checking.safe_parser, spins="aligned")."""

from __future__ import annotations

import pytest
import sympy as sp

from stfalgebra.checking.safe_parser import SPIN_SYMBOLS, allowed_symbols, parse_expression
from stfalgebra.errors import ExpressionRefusedError
from stfalgebra.exact import ExactPolynomial


def test_spin_symbols_are_the_engines():
    # the parsed chi1 must be the very symbol the derived modes carry, or nothing would cancel
    assert ExactPolynomial("chi1").to_sympy() == SPIN_SYMBOLS["chi1"]
    assert sp.expand(parse_expression("chi1*x - chi2", spins="aligned")
                     - (SPIN_SYMBOLS["chi1"] * sp.Symbol("x", positive=True) - SPIN_SYMBOLS["chi2"])).free_symbols \
        <= {sp.Symbol("x", positive=True)} | set(allowed_symbols("circular").values())


def test_spins_are_refused_without_the_option():
    assert "chi1" in allowed_symbols("general", "aligned") and "chi1" not in allowed_symbols("general")
    with pytest.raises(ExpressionRefusedError, match="chi1"):
        parse_expression("chi1*x")
    with pytest.raises(ValueError, match="spins"):
        allowed_symbols("circular", "precessing")
