"""Tests of the derived-once table of the 2PN current moments (current_two_pn_table): the file
format round-trips the probe polynomials exactly, the generator refuses while terms of J_L are
missing, and a stored table equals the derivation."""

from __future__ import annotations

import pytest

from stfalgebra.errors import OrderBeyondInputsError
from stfalgebra.moments import current_two_pn_quadratic as Q
from stfalgebra.moments import current_two_pn_table as T
from stfalgebra.moments import orbit_polynomials as op
from stfalgebra.moments import current_two_pn_status as status
from stfalgebra.moments.current_two_pn_status import current_two_pn_complete


def test_the_stored_generators_are_those_of_the_orbit_ring():
    assert T.GENERATORS == tuple(str(symbol) for symbol in op.RING.symbols)


def test_a_written_table_reads_back_the_same_polynomials(tmp_path):
    # the non-cubic terms stand in for the probe polynomials: exact rationals, every generator
    path = tmp_path / "table.json"
    T.write_table(T.tabulate(3, Q.non_cubic_terms), path, "test")
    back = T.read_table(path)
    assert sorted(back) == [1, 2, 3]
    for l, polynomial in back.items():
        assert polynomial == Q.non_cubic_terms(l) and polynomial.ring == op.RING
    assert any(c.denominator != 1 for c in back[3].coeffs())


def test_a_missing_file_reads_as_an_empty_table_and_a_foreign_one_is_refused(tmp_path):
    assert T.read_table(tmp_path / "absent.json") == {}
    (tmp_path / "other.json").write_text('{"format": 1, "generators": ["x"], "moments": {}}')
    with pytest.raises(ValueError, match="not a table"):
        T.read_table(tmp_path / "other.json")


def test_the_generator_and_the_reader_refuse_an_incomplete_moment(tmp_path, capsys, monkeypatch):
    missing = ("a term not derived yet",)
    monkeypatch.setattr(status, "MISSING_TERMS", missing)
    with pytest.raises(SystemExit) as info:
        T.main(["--lmax", "2", "--output", str(tmp_path / "t.json")])
    assert info.value.code == 2 and missing[0] in capsys.readouterr().err
    assert not (tmp_path / "t.json").exists()
    with pytest.raises(OrderBeyondInputsError, match="not derived yet: a term not derived yet"):
        T.stored_probe_polynomial(2)


def test_a_stored_table_is_the_derivation():
    # an incomplete moment is never stored; a stored one is re-derived for its lowest l
    stored = T.stored_degrees()
    assert current_two_pn_complete() or not stored
    for l in stored[:2]:
        from stfalgebra.moments import current_two_pn_cubic as cubic

        derived = Q.two_pn_probe_polynomial(l, cubic.cubic_field_term)
        assert T.stored_probe_polynomial(l) == derived

