"""Tests of stfalgebra/codegen/files.py: atomic writes."""

from __future__ import annotations

import os

import pytest

from stfalgebra.codegen import files
from stfalgebra.codegen.files import write_text_atomically


def test_writes_and_replaces(tmp_path):
    target = tmp_path / "out.c"
    write_text_atomically(target, "first\n")
    write_text_atomically(target, "second\n")
    assert target.read_text() == "second\n"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["out.c"]


def test_permissions_follow_the_umask(tmp_path):
    target = tmp_path / "out.py"
    write_text_atomically(target, "x = 1\n")
    mask = os.umask(0o022)
    os.umask(mask)
    assert target.stat().st_mode & 0o777 == 0o666 & ~mask


def test_failure_leaves_old_content_and_no_temporary(tmp_path, monkeypatch):
    target = tmp_path / "out.h"
    write_text_atomically(target, "old\n")

    def broken_replace(source, destination):
        raise OSError("disk full (simulated)")

    monkeypatch.setattr(files.os, "replace", broken_replace)
    with pytest.raises(OSError, match="simulated"):
        write_text_atomically(target, "new\n")
    assert target.read_text() == "old\n"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["out.h"]


def test_missing_directory_is_a_value_error(tmp_path):
    with pytest.raises(ValueError, match="does not exist"):
        write_text_atomically(tmp_path / "nowhere" / "out.c", "x")


def test_directory_target_is_refused(tmp_path):
    with pytest.raises(ValueError, match="is a directory"):
        write_text_atomically(tmp_path, "x")


def test_non_text_is_refused(tmp_path):
    with pytest.raises(TypeError, match="bytes"):
        write_text_atomically(tmp_path / "a", b"x")
