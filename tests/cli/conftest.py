"""Shared fixtures of the command-line tests: a private cache directory for every test, and a
runner that returns (exit code, stdout, stderr)."""

from __future__ import annotations

import pytest

from stfalgebra.cli import main


@pytest.fixture(autouse=True)
def _private_cache(tmp_path, monkeypatch):
    monkeypatch.setenv("STFALGEBRA_CACHE_DIR", str(tmp_path / "cache"))


@pytest.fixture
def run_cli(capsys):
    """``run_cli(*argv)`` runs the command line in this process."""

    def run(*argv: str) -> tuple[int, str, str]:
        code = main(list(argv))
        out, err = capsys.readouterr()
        return code, out, err

    return run
