"""The README shows what the toolkit prints: every command of a console example that is followed
by its output is run, and its standard output must be the lines shown; every ``>>> print(...)``
of the Python example followed by an output line prints that line."""

from __future__ import annotations

import re
import shlex
from pathlib import Path

import pytest

from stfalgebra.cli import main

README = Path(__file__).resolve().parent.parent / "README.md"


def _blocks(language: str) -> list[list[str]]:
    return [block.splitlines() for block in re.findall(rf"```{language}\n(.*?)```", README.read_text(), re.S)]


def _console_examples() -> list[tuple[str, list[str]]]:
    examples = []
    for lines in _blocks("console"):
        for k, line in enumerate(lines):
            if not line.startswith("$ stfalgebra "):
                continue
            output = []
            for following in lines[k + 1:]:
                if following.startswith("$ ") or following.startswith(" "):
                    break
                output.append(following)
            if output:
                examples.append((line[2:], output))
    return examples


def _python_examples() -> list[tuple[str, str]]:
    examples = []
    for lines in _blocks("python"):
        for k, line in enumerate(lines[:-1]):
            if line.startswith(">>> print(") and not lines[k + 1].startswith(">>>"):
                examples.append((line[4:], lines[k + 1]))
    return examples


def test_the_readme_has_examples_with_output():
    assert len(_console_examples()) >= 3 and len(_python_examples()) >= 2


@pytest.mark.parametrize("command, expected", _console_examples(), ids=lambda value: str(value)[:40])
def test_console_example_prints_what_the_readme_shows(command, expected, capsys, tmp_path, monkeypatch):
    monkeypatch.setenv("STFALGEBRA_CACHE_DIR", str(tmp_path / "cache"))
    argv = shlex.split(command)[1:]
    assert main(argv) == 0
    assert capsys.readouterr().out.splitlines() == expected


@pytest.mark.parametrize("statement, expected", _python_examples(), ids=lambda value: str(value)[:40])
def test_python_example_prints_what_the_readme_shows(statement, expected, capsys):
    import stfalgebra

    namespace = {name: getattr(stfalgebra, name) for name in ("derive_mode", "circular_quantity")}
    exec(statement, namespace)
    assert capsys.readouterr().out.rstrip("\n") == expected
