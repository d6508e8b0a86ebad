"""Tests of stfalgebra/codegen/identifiers.py."""

from __future__ import annotations

import keyword
import re

import pytest
from hypothesis import example, given, settings
from hypothesis import strategies as st

from stfalgebra.codegen.identifiers import (
    MAX_FUNCTION_NAME_LENGTH, RESERVED_IDENTIFIERS, function_identifier, sanitize_identifier, unique_identifiers,
)

_IDENTIFIER = re.compile(r"[A-Za-z][A-Za-z0-9_]*\Z")


@settings(max_examples=200, deadline=None)
@given(st.text(min_size=1, max_size=40).filter(lambda s: s.strip()))
@example("h(2,-1)")
@example("__class__")
@example("int")
@example("9")
@example("_")
@example("-")
@example("ν")
def test_result_is_a_safe_identifier(label):
    name = sanitize_identifier(label)
    assert _IDENTIFIER.match(name), name
    assert name not in RESERVED_IDENTIFIERS
    assert not keyword.iskeyword(name)
    assert sanitize_identifier(label) == name  # deterministic


@pytest.mark.parametrize("label, expected", [
    ("h_2_2", "h_2_2"),          # common practice: a valid name is kept
    ("h(2,-1)", "h_2_m1"),       # minus sign kept distinct from plus
    ("double", "double_"),       # C keyword
    ("lambda", "lambda_"),       # Python keyword
    ("pow", "pow_"),             # C library function
    ("3PN", "v_3PN"),            # leading digit
    ("__init__", "init"),        # leading underscores dropped
])
def test_examples(label, expected):
    assert sanitize_identifier(label) == expected


def test_negative_and_positive_m_stay_distinct():
    assert sanitize_identifier("h_2_-1") != sanitize_identifier("h_2_1")


def test_reserved_extra_names_are_avoided():
    assert sanitize_identifier("x", reserved=["x"]) == "x_"


@pytest.mark.parametrize("bad", ["", "   "])
def test_empty_label_is_refused(bad):
    with pytest.raises(ValueError, match="empty"):
        sanitize_identifier(bad)


def test_non_string_label_is_refused():
    with pytest.raises(TypeError, match="42"):
        sanitize_identifier(42)


@settings(max_examples=100, deadline=None)
@given(st.lists(st.text(min_size=1, max_size=8).filter(lambda s: s.strip()), min_size=1, max_size=8))
def test_unique_identifiers_are_distinct(labels):
    names = unique_identifiers(labels, reserved=["x"])
    assert len(set(names)) == len(names) == len(labels)
    assert "x" not in names


def test_function_names_are_length_checked():
    # regression (issue 12): a 260-character function name ended in an OSError traceback
    assert function_identifier("m" * MAX_FUNCTION_NAME_LENGTH) == "m" * MAX_FUNCTION_NAME_LENGTH
    with pytest.raises(ValueError, match=f"has 260 characters, at most {MAX_FUNCTION_NAME_LENGTH}"):
        function_identifier("f" * 260)
    # NAME_INDEX_<output> stays within the 63 significant characters of C99 5.2.4.1 for short outputs
    assert MAX_FUNCTION_NAME_LENGTH + len("_INDEX_h_2_m2") <= 63
