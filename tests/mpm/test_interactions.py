"""The radiative moments from the iteration against published and typed values."""

from __future__ import annotations

from fractions import Fraction

import pytest

from stfalgebra.errors import OrderBeyondInputsError
from stfalgebra.mpm.interactions import (
    allowed_pairs, radiative_moment_terms, tail_constant_from_iteration,
)
from stfalgebra.radiative.nonlinear import QUADRATIC_INTERACTIONS
from stfalgebra.radiative.tails import tail_constant


def _harmonic(n):
    return sum((Fraction(1, j) for j in range(1, n + 1)), Fraction(0))


def test_kappa_l_from_the_iteration_matches_the_closed_form():
    # kappa_l = (2l^2 + 5l + 4)/(l(l+1)(l+2)) + H_(l-2): Blanchet & Damour, Phys. Rev. D 46,
    # 4304 (1992); Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 3 (closed form quoted in issue 15)
    for l in range(2, 13):
        expected = Fraction(2 * l * l + 5 * l + 4, l * (l + 1) * (l + 2)) + _harmonic(l - 2)
        assert tail_constant_from_iteration(l, "M") == expected, l


def test_pi_l_from_the_iteration_matches_the_closed_form():
    # pi_l = (l - 1)/(l(l+1)) + H_(l-1): same references
    for l in range(2, 13):
        expected = Fraction(l - 1, l * (l + 1)) + _harmonic(l - 1)
        assert tail_constant_from_iteration(l, "S") == expected, l
        assert expected == tail_constant(l, "current")      # and the project's typed table


def _typed(key):
    """Today's typed coefficients (stfalgebra/radiative/nonlinear.py) as (kind, factors, eps, coefficient)."""
    symbol = {"mass": "M", "current": "S"}
    out = set()
    for term in QUADRATIC_INTERACTIONS[key]:
        factors = tuple((symbol[kind], rank, times) for kind, rank, times in term.factors)
        kind = "memory" if term.hereditary else "instantaneous"
        if term.hereditary:   # typed as int_0^oo of I^(3) I^(3): the same orders as ours
            factors = tuple((k, rank, times) for k, rank, times in factors)
        out.add((kind, factors, 1 if term.product == "cross" else 0, Fraction(str(term.coefficient))))
    return out


def _derived(moment, l):
    out = set()
    for term in radiative_moment_terms(moment, l, Fraction(3, 2)):
        if term.kind in ("memory", "instantaneous"):
            out.add((term.kind, term.factors, term.epsilon, term.coefficient))
    return out


def test_hexadecapole_quadratic_terms_match_the_typed_values():
    # U_ijkl at 1.5PN: nonlinear.py (Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 3,
    # typed from memory there): 2/5 memory, -21/5, -63/5, -102/5, each separately
    assert _derived("U", 4) == _typed(("mass", 4))


def test_current_octupole_quadratic_terms_match_the_typed_values():
    # V_ijk at 1.5PN: nonlinear.py: (1/10) eps M^(5) M, -(1/2) eps M^(4) M^(1), -2 S_i M^(4)_jk
    assert _derived("V", 3) == _typed(("current", 3))


def test_quadrupole_at_relative_2_5pn_matches_the_published_terms():
    # U_ij at 2.5PN, Blanchet, Class. Quantum Grav. 15, 89 (1998) and Living Rev. Relativ. 17, 2
    # (2014), sec. 3.3 (values as quoted in issue 15; equation numbers not re-read here):
    # -(2/7) int M^(3)_a<i M^(3)_j>a + (1/7) M^(5)_a<i M_j>a - (5/7) M^(4)_a<i M^(1)_j>a
    # - (2/7) M^(3)_a<i M^(2)_j>a + (1/3) eps_ab<i M^(4)_j>a S_b.
    # Ours lists the spin term as STF[eps_iab S_a M^(4)_bj] = -eps_ab<i M^(4)_j>a S_b.
    terms = {(t.kind, t.factors, t.contractions, t.epsilon): t.coefficient
             for t in radiative_moment_terms("U", 2, Fraction(5, 2)) if t.order == Fraction(5, 2)}
    assert terms == {
        ("memory", (("M", 2, 3), ("M", 2, 3)), 1, 0): Fraction(-2, 7),
        ("instantaneous", (("M", 2, 0), ("M", 2, 5)), 1, 0): Fraction(1, 7),
        ("instantaneous", (("M", 2, 1), ("M", 2, 4)), 1, 0): Fraction(-5, 7),
        ("instantaneous", (("M", 2, 2), ("M", 2, 3)), 1, 0): Fraction(-2, 7),
        ("instantaneous", (("S", 1, 0), ("M", 2, 4)), 0, 1): Fraction(-1, 3),
    }


def test_json_shape_of_a_tail_term():
    tail = radiative_moment_terms("U", 4, Fraction(3, 2))[1].to_json()
    assert tail == {"kind": "tail", "order": "3/2", "coefficient": "2", "constant": "59/30",
                    "factors": [["M", 0, 0], ["M", 4, 6]], "contractions": 0, "epsilon": 0}


def test_allowed_pairs_at_1_5pn_follow_the_counting_rules():
    # U_L: M_A x M_B with |A| + |B| = l; V_L: eps M_A M_B with |A| + |B| = l + 1 and S_A x M_B
    # with |A| + |B| = l (issue 15, step 4)
    pairs = {(a, b, k, e) for a, b, k, e, _ in allowed_pairs("U", 5, Fraction(3, 2))}
    assert pairs == {(("M", 0), ("M", 5), 0, 0), (("M", 2), ("M", 3), 0, 0)}
    pairs = {(a, b, k, e) for a, b, k, e, _ in allowed_pairs("V", 4, Fraction(3, 2))}
    assert pairs == {(("M", 0), ("S", 4), 0, 0), (("S", 1), ("M", 3), 0, 0), (("S", 2), ("M", 2), 0, 0),
                     (("M", 2), ("M", 3), 0, 1)}


def test_zero_coefficients_are_reported():
    # every allowed pair appears in the output, zero or not
    terms = radiative_moment_terms("V", 4, Fraction(3, 2))
    pairs = {tuple((k, r) for k, r, _ in t.factors) for t in terms[1:]}
    assert len(pairs) == len(allowed_pairs("V", 4, Fraction(3, 2)))


def test_bad_input_is_refused():
    with pytest.raises(ValueError):
        radiative_moment_terms("W", 2, 0)
    with pytest.raises(ValueError):
        radiative_moment_terms("U", 1, 0)
    with pytest.raises(OrderBeyondInputsError):
        radiative_moment_terms("U", 2, 3)
