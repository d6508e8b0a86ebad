"""Tests of stfalgebra/mpm/tabulation.py: the table it writes, extending a table, refusing a
file of another format, and the atomic write of its command line."""

from __future__ import annotations

import json
from fractions import Fraction

import pytest

from stfalgebra.mpm.interactions import radiative_moment_terms
from stfalgebra.mpm.tabulation import FORMAT, main, tabulate, tabulate_tail_constants


def test_table_of_the_quadrupoles():
    table = tabulate(2, Fraction(1))
    assert table["format"] == FORMAT and sorted(table["moments"]) == ["U2", "V2"]
    entry = table["moments"]["U2"]
    assert entry["pn_relative"] == "1"
    assert entry["terms"] == [term.to_json() for term in radiative_moment_terms("U", 2, Fraction(1))]


def test_extending_keeps_moments_held_further():
    held = tabulate(2, Fraction(3, 2))
    before = json.dumps(held, sort_keys=True)
    tabulate(2, Fraction(1), into=held)          # asks less: nothing changes
    assert json.dumps(held, sort_keys=True) == before
    tabulate(3, Fraction(0), lmin=3, into=held)
    assert sorted(held["moments"]) == ["U2", "U3", "V2", "V3"]
    assert held["moments"]["U2"]["pn_relative"] == "3/2"


def test_refuses_a_file_of_another_format():
    with pytest.raises(ValueError, match="not a table"):
        tabulate(2, Fraction(0), into={"format": "something else", "moments": {}})


def test_tail_constants_closed_form():
    # kappa_l = (2l^2+5l+4)/(l(l+1)(l+2)) + H_(l-2), pi_l = (l-1)/(l(l+1)) + H_(l-1)
    # (Blanchet & Damour, Phys. Rev. D 46, 4304 (1992), from memory)
    constants = tabulate_tail_constants(4, {"format": FORMAT, "moments": {}})["tail_constants"]
    assert constants["mass"] == {"2": "11/12", "3": "97/60", "4": "59/30"}
    assert constants["current"] == {"2": "7/6", "3": "5/3", "4": "119/60"}


def test_command_line_writes_and_extends_one_file(tmp_path, capsys):
    target = tmp_path / "terms.json"
    assert main(["--lmax", "2", "--pn-relative", "0", "--output", str(target)]) == 0
    assert main(["--lmin", "3", "--lmax", "3", "--pn-relative", "0", "--tail-lmax", "2",
                 "--output", str(target)]) == 0
    data = json.loads(target.read_text())
    assert sorted(data["moments"]) == ["U2", "U3", "V2", "V3"] and data["tail_constants"]["mass"] == {"2": "11/12"}
    assert [p.name for p in tmp_path.iterdir()] == ["terms.json"]        # no .part file left
    assert "U3:" in capsys.readouterr().out
