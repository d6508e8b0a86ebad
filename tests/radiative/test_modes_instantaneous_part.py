"""General-orbit modes beyond relative 1PN: the instantaneous part (``instantaneous_only=True``
of stfalgebra.radiative.modes.derive_mode), checked on the circle against published values."""

import pytest
import sympy as sp

from stfalgebra import symbols as S
from stfalgebra.errors import OrderBeyondInputsError
from stfalgebra.radiative.contributions import instantaneous_part, omitted_from_instantaneous_part, CONTRIBUTIONS
from stfalgebra.radiative.modes import INSTANTANEOUS_PART_ONLY, derive_mode

x, nu, c = S.x, S.nu, S.c


def _on_the_circle(hhat_general, through):
    """Hhat_general/(2 x c^2) on the 2PN circular orbit, as a polynomial in y = sqrt(x) through
    y^through.

    The circular orbit in harmonic coordinates, gamma = G m/(r c^2) = x [1 + (1 - nu/3) x +
    (1 - 65 nu/12) x^2] (Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 7.2, from memory),
    omega = c^3 x^(3/2)/(G m), with G = 1 as inside the general-orbit Hhat. Each power r^k is
    replaced by (m/(c^2 x))^k (gamma/x)^(-k), the last factor a binomial series in x."""
    y = sp.Symbol("y", positive=True)
    mass = S.m
    value = sp.expand(hhat_general.subs({S.rdot: 0, S.phidot: c**3 * y**3 / mass}) / (2 * y**2 * c**2))
    ratio = 1 + (1 - nu / 3) * y**2 + (1 - sp.Rational(65, 12) * nu) * y**4           # gamma/x
    total = 0
    for term in sp.Add.make_args(value):
        k = term.as_powers_dict().get(S.r, 0)
        power = sp.series(ratio**(-k), y, 0, 5).removeO()
        total += sp.expand(term / S.r**k * (mass / (c**2 * y**2))**k * power)
    total = sp.expand(total)
    return sum(total.coeff(y, n) * y**n for n in range(0, through + 1))


def test_hhat22_instantaneous_part_on_the_circle_is_the_published_2pn_mode_without_its_tail():
    # Blanchet, Faye, Iyer & Sinha, Class. Quantum Grav. 25, 165003 (2008), Hhat_22 (from memory):
    # 1 + x (-107/42 + 55 nu/42) + 2 pi x^(3/2) + x^2 (-2173/1512 - 1069 nu/216 + 2047 nu^2/1512);
    # the instantaneous part is all of it but the tail's 2 pi x^(3/2)
    general = derive_mode(2, 2, orbit="general", pn_relative=2, instantaneous_only=True)
    published = (1 + x * (-sp.Rational(107, 42) + sp.Rational(55, 42) * nu)
                 + x**2 * (-sp.Rational(2173, 1512) - sp.Rational(1069, 216) * nu + sp.Rational(2047, 1512) * nu**2))
    y = sp.Symbol("y", positive=True)
    assert sp.expand(_on_the_circle(general.hhat, 4) - published.subs(x, y**2)) == 0


@pytest.mark.parametrize("l, m", [(3, 3), (3, 1), (4, 4), (4, 2)])
def test_mass_modes_instantaneous_part_on_the_circle_equal_the_circular_modes_but_their_relative_3_2_terms(l, m):
    # the circular modes are checked against the published ones elsewhere; their relative 3/2
    # terms are the tail (and, for l = 4, the quadratic interactions), absent here
    y = sp.Symbol("y", positive=True)
    general = derive_mode(l, m, orbit="general", pn_relative=2, instantaneous_only=True)
    circular = sp.expand(derive_mode(l, m, pn_relative=2).hhat.subs(x, y**2))
    lead = l - 2                                   # the leading power of y
    kept = sum(circular.coeff(y, lead + k) * y**(lead + k) for k in (0, 2, 4))
    assert sp.expand(_on_the_circle(general.hhat, lead + 4) - kept) == 0


def test_the_note_names_what_is_left_out_and_json_says_instantaneous_only():
    res = derive_mode(4, 4, orbit="general", pn_relative=2, instantaneous_only=True)
    assert res.note.startswith(INSTANTANEOUS_PART_ONLY) and "tail" in res.note and "quadratic" in res.note
    assert res.to_json()["instantaneous_only"] is True
    below = derive_mode(2, 2, orbit="general", pn_relative=1, instantaneous_only=True)
    assert below.note is None          # nothing is left out through relative 1PN
    assert below.hhat == derive_mode(2, 2, orbit="general", pn_relative=1).hhat
    assert "instantaneous_only" not in derive_mode(2, 2, orbit="general", pn_relative=1).to_json()


def test_refusals_without_the_option_on_circular_orbits_and_beyond_the_instantaneous_rows():
    with pytest.raises(OrderBeyondInputsError, match="instantaneous_only=True"):
        derive_mode(2, 2, orbit="general", pn_relative=2)
    with pytest.raises(ValueError, match="general orbits"):
        derive_mode(2, 2, pn_relative=1, instantaneous_only=True)
    with pytest.raises(TypeError, match="True or False"):
        derive_mode(2, 2, orbit="general", pn_relative=1, instantaneous_only="yes")
    # the instantaneous rows end at relative 2.5PN (the 2PN J_L with their reaction row there)
    assert derive_mode(2, 1, orbit="general", pn_relative="5/2", instantaneous_only=True).refused is None
    with pytest.raises(OrderBeyondInputsError):
        derive_mode(2, 1, orbit="general", pn_relative=3, instantaneous_only=True)


def test_instantaneous_part_of_the_table_and_what_it_omits():
    rows = instantaneous_part(CONTRIBUTIONS)
    assert rows and {row.family for row in rows} <= {"instantaneous", "radiation reaction"}
    assert omitted_from_instantaneous_part("mass", 2, 1) == ()
    assert omitted_from_instantaneous_part("mass", 2, 2) == ("tail (from relative 3/2)",)
    assert "quadratic (from relative 3/2)" in omitted_from_instantaneous_part("current", 3, 2)
