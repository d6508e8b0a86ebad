"""The m < 0 modes come from the m > 0 ones by the planar-orbit symmetry
Hhat_{l,-m} = (-1)^l conj(Hhat_lm) (../shared/conventions.md: h_{l,-m} = (-1)^l conj(h_lm) for
planar orbits). The shortcut the assembler takes is checked against direct derivation of the
negative-m channel for every pair with l <= 8."""

from __future__ import annotations

import pytest

from stfalgebra.radiative import modes as modes_module
from stfalgebra.radiative.modes import _direct_amplitude, derive_mode


@pytest.mark.parametrize("l", range(2, 9))
def test_negative_m_equals_direct_derivation_circular(l):
    for m in range(1, l + 1):
        shortcut = derive_mode(l, -m, pn_relative=1)
        constant, series, _ = _direct_amplitude(l, -m, "circular", shortcut.pn_relative, "review", "psi")
        direct_text = modes_module.format_amplitude(constant, series.truncate(shortcut.series.known_through),
                                                    "circular")
        assert shortcut.hhat_text() == direct_text, (l, m)


@pytest.mark.parametrize("l", range(2, 5))
def test_negative_m_equals_direct_derivation_general_and_with_tails(l):
    for m in range(1, l + 1):
        shortcut = derive_mode(l, -m, orbit="general", pn_relative=1)
        constant, series, _ = _direct_amplitude(l, -m, "general", shortcut.pn_relative, "review", "phi")
        assert shortcut.hhat_text() == modes_module.format_amplitude(
            constant, series.truncate(shortcut.series.known_through), "general"), (l, m)
    for m in range(1, l + 1):
        if (l, m) in ((4, 3), (4, 1)):
            continue       # refused at relative 3/2 (missing quadratic interactions)
        shortcut = derive_mode(l, -m, pn_relative="3/2")
        constant, series, _ = _direct_amplitude(l, -m, "circular", shortcut.pn_relative, "review", "psi")
        assert shortcut.hhat_text() == modes_module.format_amplitude(
            constant, series.truncate(shortcut.series.known_through), "circular"), (l, m)
