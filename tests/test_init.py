"""Tests of stfalgebra/__init__.py: the curated top-level API.

Every exported name resolves lazily to the object of the module it names, and every name a
message of the toolkit points the user to ("Python API: name(...)") is importable from the
package (a refusal that sends the reader to a name that does not import is a defect)."""

from __future__ import annotations

import importlib
import re

import pytest

import stfalgebra


@pytest.mark.parametrize("name", stfalgebra.__all__)
def test_every_export_is_the_object_of_its_module(name):
    module = importlib.import_module(stfalgebra._EXPORTS[name])
    assert getattr(stfalgebra, name) is getattr(module, name)
    assert name in module.__all__


def test_names_that_messages_point_to_import_from_the_package():
    from stfalgebra.radiative.contributions import CONTRIBUTIONS

    pointed = {match for row in CONTRIBUTIONS for text in (row.missing_on or "",)
               for match in re.findall(r"Python API: (?:stfalgebra\.)?(\w+)\(", text)}
    assert "general_orbit_tail" in pointed
    for name in pointed:
        assert callable(getattr(stfalgebra, name)), name
    namespace: dict = {}
    exec("from stfalgebra import general_orbit_tail", namespace)
    assert str(namespace["general_orbit_tail"](2, 2))


def test_unknown_names_raise_attribute_error():
    with pytest.raises(AttributeError, match="no attribute 'no_such_name'"):
        stfalgebra.no_such_name
