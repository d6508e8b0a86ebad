"""Fixtures of the codegen tests (inputs from codegen_inputs.py)."""

from __future__ import annotations

import pytest
from codegen_inputs import GENERAL_22, PUBLISHED_CIRCULAR, fake_mode


@pytest.fixture
def published_modes():
    return [fake_mode(l, m, h) for (l, m), h in sorted(PUBLISHED_CIRCULAR.items())]


@pytest.fixture
def general_mode():
    return fake_mode(2, 2, GENERAL_22, orbit="general")
