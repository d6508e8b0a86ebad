"""Tests of the g-volume terms of the 2PN current moments (current_two_pn_g_volume).

The external checks: with these terms the assembled 2PN current dipole is the cited 2PN angular
momentum of the harmonic-coordinate dynamics (all orders in G), and the current quadrupole gives
what the published (2,1) mode at relative 2PN requires; the numerical quadrature of the explicit
potentials (test_current_two_pn_cubic_g_terms.py) is the independent route.
"""

from __future__ import annotations

import pytest
import sympy as sp

from stfalgebra.binary.cited_inputs import angular_momentum_per_reduced_mass
from stfalgebra.moments import current_two_pn_g_volume as V
from stfalgebra.moments import current_two_pn_quadratic as Q
from stfalgebra.moments.current_two_pn_cubic import MISSING_TERMS, cubic_field_term
from stfalgebra.symbols import G, delta, eps, m, nu, phidot, r, rdot

_IR = sp.Symbol("ir", positive=True)
_DELTA = sp.Symbol("delta_mass")


def _expression(f):
    return sp.expand(Q.normalise(f).as_expr().subs(_IR, 1 / r))


def test_the_cubic_terms_are_complete():
    assert MISSING_TERMS == ()


def test_the_two_pn_current_dipole_is_the_cited_angular_momentum():
    # J_i at 2PN of two point masses, every power of G, equals the 2PN angular momentum of the
    # harmonic-coordinate dynamics (Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 7.3,
    # cited in stfalgebra.binary.cited_inputs): the G^2 terms test the g-volume terms
    s = type("S", (), dict(G=G, m=m, nu=nu, r=r, rdot=rdot, phidot=phidot, q=sp.Rational))
    cited = angular_momentum_per_reduced_mass(s)
    reference = sp.expand(nu * m * sum(cited[k] * eps**(2 * k) for k in cited) / (r**2 * phidot))
    total = Q.non_cubic_terms(1) + Q._eps(4) * cubic_field_term(1)
    difference = sp.expand(_expression(total) - reference)
    for power in (0, 2, 4):
        assert sp.expand(difference.coeff(eps, power)) == 0
    assert _expression(Q._eps(4) * V.g_volume_term(1)).coeff(G, 2) != 0


def test_the_current_quadrupole_term_is_what_the_published_21_mode_requires():
    # what the published relative x^2 coefficient of the circular (2,1) mode,
    # -43/126 - 509 nu/126 + 79 nu^2/168 (Blanchet, Faye, Iyer & Sinha 2008, from memory),
    # requires of the g-volume terms once the other terms of J_ij are added (found before these
    # terms were derived): G^2 m^3 nu delta (11 nu - 2/3)/r^2 (k.x)(ell.k)
    value = _expression(V.g_volume_term(2))
    kx = sp.Symbol("kx")
    expected = G**2 * m**3 * nu * delta * (11 * nu - sp.Rational(2, 3)) * kx / r**2
    assert sp.expand(value - expected) == 0


def test_the_fast_route_agrees_with_the_sympy_route_for_another_null_probe():
    # k = (3, 5i, 4): ell = (0, 1, 0) (x along z, v along x), ell.k = 5i, k.x = 4; the sympy route
    # with this probe must give 5i 4^(l-1) times the fast route's coefficient (the form
    # ell.k (k.x)^(l-1) of the module docstring)
    from stfalgebra.moments.spheroidal_integrals import finite_part_integral

    l = 1
    monomials = V.g_volume_density(l, (3, 5 * sp.I, 4))
    result = finite_part_integral(monomials, -_DELTA / 2)
    assert all(sp.expand(result[key]) == 0 for key in ("ln r0", "ln s1", "ln s2"))
    fast = V.probe_value(l) / sp.I
    assert sp.expand(result["finite"] / sp.pi - 5 * sp.I * 4**(l - 1) * fast) == 0


@pytest.mark.parametrize("l", [3, 4])
def test_regularisation_scales_cancel_and_the_body_exchange_symmetry_holds(l):
    # probe_value raises if ln r0 or a Hadamard scale survives; under 1 <-> 2 (delta -> -delta,
    # x -> -x, v -> -v, ell unchanged) the coefficient of ell.k (k.x)^(l-1) picks (-1)^(l-1)
    value = sp.expand(V.probe_value(l) / sp.I)
    assert sp.expand(value.subs(_DELTA, -_DELTA) - (-1)**(l - 1) * value) == 0
    assert value.subs(_DELTA, 1) == 0 and value.subs(_DELTA, -1) == 0     # test-mass limit: nu factor


def test_bad_rank_is_refused():
    with pytest.raises(ValueError, match="l >= 1"):
        V.g_volume_term(0)
