"""Tests of ``stfalgebra radiative-moment`` (stfalgebra/cli/command_radiative_moment.py): the
JSON contract, the text and LaTeX forms, and the refusals (exit code 2, one line)."""

from __future__ import annotations

import json
from fractions import Fraction

import pytest

CONTRACT_KEYS = ["moment", "l", "pn_relative", "terms"]
TERM_KEYS = {"kind", "order", "coefficient", "factors", "contractions", "epsilon"}


def test_json_contract_of_the_hexadecapole(run_cli):
    code, out, err = run_cli("radiative-moment", "U", "4", "--pn-relative", "3/2", "--json")
    assert code == 0 and err == ""
    payload = json.loads(out)
    assert list(payload) == CONTRACT_KEYS
    assert (payload["moment"], payload["l"], payload["pn_relative"]) == ("U", 4, "3/2")
    for term in payload["terms"]:
        assert set(term) - {"constant"} == TERM_KEYS
        assert term["kind"] in ("linear", "tail", "instantaneous", "memory")
        assert ("constant" in term) == (term["kind"] == "tail")
        for kind, rank, times in term["factors"]:
            assert kind in ("M", "S") and isinstance(rank, int) and isinstance(times, int)
        # l = p + q - 2 k - epsilon for products
        if len(term["factors"]) == 2 and term["kind"] != "tail":
            (_, p, _), (_, q, _) = term["factors"]
            assert p + q - 2 * term["contractions"] - term["epsilon"] == 4
    by_kind = {term["kind"]: term for term in payload["terms"]}
    assert by_kind["linear"]["factors"] == [["M", 4, 4]] and by_kind["linear"]["coefficient"] == "1"
    # the tail: 2 (G M/c^3) int M^(6)_L [ln(c tau/(2 b)) + kappa_4], kappa_4 = 59/30 (the closed
    # form (2l^2+5l+4)/(l(l+1)(l+2)) + H_(l-2), Blanchet & Damour 1992, from memory)
    assert by_kind["tail"]["coefficient"] == "2" and by_kind["tail"]["constant"] == "59/30"
    assert by_kind["tail"]["factors"] == [["M", 0, 0], ["M", 4, 6]]
    # the instantaneous -21/5 M_<ij M^(5)_kl> (Blanchet 2014 sec. 3.3, from memory); a symmetric
    # product: the order of its two factors carries no meaning
    assert any(term["coefficient"] == "-21/5" and sorted(term["factors"]) == [["M", 2, 0], ["M", 2, 5]]
               for term in payload["terms"])
    memory = [term for term in payload["terms"] if term["kind"] == "memory"]
    assert [(t["coefficient"], t["factors"]) for t in memory] == [("2/5", [["M", 2, 3], ["M", 2, 3]])]


@pytest.mark.parametrize(("moment", "l"), [("U", 5), ("V", 4)])
def test_every_allowed_pair_is_listed(run_cli, moment, l):
    # a pair allowed by rank, dimension and parity appears even when its coefficient is 0
    from stfalgebra.mpm.interactions import allowed_pairs

    code, out, _ = run_cli("radiative-moment", moment, str(l), "--pn-relative", "3/2", "--json")
    assert code == 0
    listed = {(tuple((kind, rank) for kind, rank, _ in term["factors"]), term["contractions"], term["epsilon"])
              for term in json.loads(out)["terms"] if len(term["factors"]) == 2}
    for first, second, contractions, epsilon, order in allowed_pairs(moment, l, Fraction(3, 2)):
        assert ((first, second), contractions, epsilon) in listed, (first, second, order)


def test_text_and_latex_forms(run_cli):
    code, out, _ = run_cli("radiative-moment", "V", "3", "--pn-relative", "3/2")
    assert code == 0
    assert out.startswith("# V_L, l = 3, through relative 3/2") and "[tail, relative 3/2]" in out
    code, latex, _ = run_cli("radiative-moment", "V", "3", "--pn-relative", "3/2", "--latex")
    assert code == 0 and latex.startswith("% V_L, l = 3") and "\\varepsilon_{iab}" in latex


@pytest.mark.parametrize(("argv", "named"), [
    (("W", "2", "--pn-relative", "1"), "moment must be U or V"),
    (("U", "1", "--pn-relative", "1"), "l"),
    (("U", "31", "--pn-relative", "1"), "l"),
    (("U", "2", "--pn-relative", "3"), "at most 5/2"),
    (("U", "2", "--pn-relative", "1e100000000"), "--pn-relative"),
    (("U", "2", "--pn-relative", "one"), "--pn-relative"),
    (("U", "20", "--pn-relative", "3/2"), "stfalgebra.mpm.tabulation"),
])
def test_bad_input_is_one_line_and_exit_two(run_cli, argv, named):
    code, out, err = run_cli("radiative-moment", *argv)
    assert code == 2 and out == ""
    assert named in err and len(err.strip().splitlines()) == 1


def test_the_quadrupole_through_relative_five_halves(run_cli):
    # U_ij at 2.5PN: memory -(2/7) int M^(3)_a<i M^(3)_j>a and the instantaneous 1/7, -5/7, -2/7
    # (Blanchet, Class. Quantum Grav. 15, 89 (1998); from memory)
    code, out, _ = run_cli("radiative-moment", "U", "2", "--pn-relative", "5/2", "--json")
    assert code == 0
    terms = [t for t in json.loads(out)["terms"] if t["order"] == "5/2"]
    memory = [(t["coefficient"], t["factors"], t["contractions"]) for t in terms if t["kind"] == "memory"]
    assert memory == [("-2/7", [["M", 2, 3], ["M", 2, 3]], 1)]
    assert sorted(t["coefficient"] for t in terms if t["kind"] == "instantaneous" and not t["epsilon"]) == \
        ["-2/7", "-5/7", "1/7"]
