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


# ----------------------------------------------------------------- sets of files (issue 12)

from stfalgebra.codegen.files import check_output_path, write_file_set  # noqa: E402
from stfalgebra.errors import OutputRefusedError  # noqa: E402


def test_a_set_is_written_only_when_every_target_is_acceptable(tmp_path):
    fifo = tmp_path / "b.c"
    os.mkfifo(fifo)
    with pytest.raises(OutputRefusedError, match="it is a FIFO"):
        write_file_set([(tmp_path / "b.h", "h\n"), (fifo, "c\n")])
    assert sorted(p.name for p in tmp_path.iterdir()) == ["b.c"]  # not even the header was written


def test_links_devices_and_read_only_files_are_refused(tmp_path):
    link = tmp_path / "link.c"
    link.symlink_to("/dev/null")
    with pytest.raises(OutputRefusedError, match="symbolic link"):
        check_output_path(link)
    read_only = tmp_path / "ro.c"
    read_only.write_text("old\n")
    read_only.chmod(0o444)
    with pytest.raises(OutputRefusedError, match="read-only"):
        write_text_atomically(read_only, "new\n")
    write_text_atomically(read_only, "new\n", force=True)
    assert read_only.read_text() == "new\n"


def test_failure_between_two_replacements_leaves_whole_files_and_no_temporary(tmp_path, monkeypatch):
    write_file_set([(tmp_path / "a.h", "old h\n"), (tmp_path / "a.c", "old c\n")])
    calls = []
    real = os.replace

    def second_fails(source, destination):
        calls.append(destination)
        if len(calls) == 2:
            raise OSError("disk removed (simulated)")
        real(source, destination)

    monkeypatch.setattr(files.os, "replace", second_fails)
    with pytest.raises(OSError, match="simulated"):
        write_file_set([(tmp_path / "a.h", "new h\n"), (tmp_path / "a.c", "new c\n")])
    assert (tmp_path / "a.h").read_text() == "new h\n" and (tmp_path / "a.c").read_text() == "old c\n"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["a.c", "a.h"]


def test_names_too_long_for_the_file_system_are_refused_in_one_line(tmp_path):
    with pytest.raises(ValueError, match="output file name .* bytes, at most"):
        check_output_path(tmp_path / ("n" * 250 + ".c"))
