"""Tests of stfalgebra/cli/command_moment.py: the source moments on the command line.

Checked against: the published 1PN mass quadrupole of two point masses on a general orbit and
on a circular orbit (Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 9, from memory), and a
second route for the circular reduction (the sympy reduction of stfalgebra.binary.circular
applied to the same moments); the bound of --pn read from the moments' own orders."""

from __future__ import annotations

import json

import pytest
import sympy as sp

from stfalgebra import symbols as S

NAMES = {"x": S.x, "nu": S.nu, "m": S.m, "G": S.G, "c": S.c, "r": S.r, "rdot": S.rdot, "phidot": S.phidot,
         "delta": S.delta}


def _structures(out):
    return {tuple(s["vectors"].values()): sp.sympify(s["expression"], locals=NAMES)
            for s in json.loads(out)["structures"]}


def test_general_orbit_mass_quadrupole_at_1pn(run_cli):
    code, out, _ = run_cli("moment", "mass", "2", "--pn", "1", "--format", "json")
    assert code == 0
    document = json.loads(out)
    assert (document["symbol"], document["l"], document["pn"], document["variable"]) == ("I_L", 2, "1", "1/c")
    got = _structures(out)
    nu, m, G, c, r, rdot, phidot = S.nu, S.m, S.G, S.c, S.r, S.rdot, S.phidot
    v2 = rdot**2 + r**2 * phidot**2
    # I_ij = nu m {x^<ij> [1 + (29/42 (1 - 3 nu) v^2 - (5 - 8 nu)/7 G m/r)/c^2]
    #        - (4/7)(1 - 3 nu) r rdot x^<i v^j>/c^2 + (11/21)(1 - 3 nu) r^2 v^<ij>/c^2}
    expected = {(2, 0, 0): nu * m * (1 + (sp.Rational(29, 42) * (1 - 3 * nu) * v2
                                           - sp.Rational(1, 7) * (5 - 8 * nu) * G * m / r) / c**2),
                (1, 1, 0): -sp.Rational(4, 7) * (1 - 3 * nu) * nu * m * r * rdot / c**2,
                (0, 2, 0): sp.Rational(11, 21) * (1 - 3 * nu) * nu * m * r**2 / c**2}
    assert set(got) == set(expected)
    for key, value in expected.items():
        assert sp.expand(got[key] - value) == 0, key


def test_circular_mass_quadrupole_against_the_published_gamma_form(run_cli):
    code, out, _ = run_cli("moment", "mass", "2", "--pn", "1", "--orbit", "circular", "--format", "json")
    assert code == 0
    got = _structures(out)
    nu, m, G, c, x = S.nu, S.m, S.G, S.c, S.x
    # I_ij = nu m r^2 {[1 - gamma (1/42 + 13/14 nu)] n^<ij> + (11/21)(1 - 3 nu) gamma lambda^<ij>}
    # (from memory), with gamma = x [1 + (1 - nu/3) x] and r = G m/(c^2 gamma)
    gamma = x * (1 + (1 - nu / 3) * x)
    r2 = (G * m / c**2) ** 2 / gamma**2
    for key, inner in (((2, 0, 0), 1 - gamma * (sp.Rational(1, 42) + sp.Rational(13, 14) * nu)),
                       ((0, 2, 0), sp.Rational(11, 21) * (1 - 3 * nu) * gamma)):
        published = sp.series(nu * m * r2 * inner * x**2 * c**4 / (G**2 * m**3), x, 0, 2).removeO()
        assert sp.expand(got[key] * x**2 * c**4 / (G**2 * m**3) - published) == 0, key


def test_circular_current_moment_against_the_sympy_reduction(run_cli):
    from stfalgebra.binary.circular import to_circular_orbit
    from stfalgebra.moments.current import current_moment
    from stfalgebra.pnseries import PNSeries

    code, out, _ = run_cli("moment", "current", "3", "--pn", "1", "--orbit", "circular", "--format", "json")
    assert code == 0
    got = _structures(out)
    tensor = current_moment(3, 1).truncate(1).on_circular_orbit()
    for key, series in tensor.terms.items():
        a, b, cc = key
        weighted = PNSeries({order: sp.expand(value.to_sympy() * S.r ** (a + b + 2 * cc) * S.phidot ** (b + cc))
                             for order, value in series.terms.items()}, series.known_through)
        if not weighted.terms:
            assert key not in got
            continue
        value = to_circular_orbit(weighted, 1).to_expression(S.eps).subs(S.eps, sp.sqrt(S.x))
        assert sp.expand(got[key] - value) == 0, key


def test_text_latex_and_large_l(run_cli):
    code, out, _ = run_cli("moment", "mass", "2", "--pn", "1")
    assert code == 0 and "STF(x v):" in out and "-4/7*m*nu*r*rdot/c**2*(1 - 3*nu)" in out
    code, out, _ = run_cli("moment", "current", "3", "--pn", "1", "--format", "latex")
    assert code == 0 and r"\begin{align}" in out and r"J_{ijk} &=" in out and r"\ell^{k\rangle}" in out
    code, out, _ = run_cli("moment", "mass", "30", "--pn", "1/2", "--orbit", "circular")
    assert code == 0 and "STF(n^30):" in out


@pytest.mark.parametrize("argv", [["moment", "mass", "2", "--pn", "5/2"], ["moment", "mass", "1", "--pn", "0"],
                                  ["moment", "spin", "2", "--pn", "0"], ["moment", "mass", "31", "--pn", "0"]])
def test_bad_requests_exit_2_with_one_line(run_cli, argv):
    code, out, err = run_cli(*argv)
    assert code == 2 and out == "" and err.count("\n") == 1


def test_bound_is_read_from_the_moments_orders(run_cli):
    from stfalgebra.moments.point_particles import MOMENT_PN_ORDERS

    top = max(MOMENT_PN_ORDERS.values())
    assert run_cli("moment", "mass", "2", "--pn", str(top))[0] == 0
    code, _, err = run_cli("moment", "mass", "2", "--pn", str(top + sp.Rational(1, 2)))
    assert code == 2 and str(top) in err
