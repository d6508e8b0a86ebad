"""Tests of stfalgebra.radiative.secular_rates: da/dt, de/dt (Newtonian) and dx/dt, de_t/dt
through 1.5PN from the balance of energy and angular momentum."""

from __future__ import annotations

import pytest
import sympy as sp

from stfalgebra.binary.keplerian import a, e
from stfalgebra.errors import OrderBeyondInputsError
from stfalgebra.radiative.secular_rates import (
    newtonian_secular_rates,
    numeric_secular_rates,
    secular_rates,
)
from stfalgebra.radiative.tail_enhancement import (
    AngularMomentumTailEnhancement,
    EnergyTailEnhancement,
    tail_enhancement,
)
from stfalgebra.symbols import G, c, et, m, nu

THREE_HALVES = sp.Rational(3, 2)
PETERS_X = sp.Rational(64, 5) * (1 + sp.Rational(73, 24) * et**2 + sp.Rational(37, 96) * et**4) \
    / (1 - et**2) ** sp.Rational(7, 2)
PETERS_E = -sp.Rational(304, 15) * et * (1 + sp.Rational(121, 304) * et**2) / (1 - et**2) ** sp.Rational(5, 2)


def test_newtonian_secular_rates_are_peters():
    # Peters, Phys. Rev. 136, B1224 (1964), with m1 m2 (m1 + m2) = nu m^3
    da, de = newtonian_secular_rates()
    peters_da = (-sp.Rational(64, 5) * G**3 * nu * m**3 / (c**5 * a**3 * (1 - e**2) ** sp.Rational(7, 2))
                 * (1 + sp.Rational(73, 24) * e**2 + sp.Rational(37, 96) * e**4))
    peters_de = (-sp.Rational(304, 15) * e * G**3 * nu * m**3 / (c**5 * a**4 * (1 - e**2) ** sp.Rational(5, 2))
                 * (1 + sp.Rational(121, 304) * e**2))
    assert sp.simplify(da - peters_da) == 0
    assert sp.simplify(de - peters_de) == 0


def test_1pn_secular_rates_circular_limit_and_newtonian_part():
    dx, de = secular_rates(1)
    # Peters (1964) at Newtonian order in x: dx/dt = (64/5) nu x^5 f(e) (c^3/(G m))
    assert sp.simplify(dx.coefficient(0) - PETERS_X) == 0
    assert sp.simplify(de.coefficient(0) - PETERS_E) == 0
    # circular: dx/dt = (64/5) nu x^5 [1 - (743/336 + 11 nu/4) x] (Blanchet, Living Rev.
    # Relativ. 17, 2 (2014), from memory)
    assert sp.expand(dx.coefficient(1).subs(et, 0)
                     + sp.Rational(64, 5) * (sp.Rational(743, 336) + sp.Rational(11, 4) * nu)) == 0
    assert de.coefficient(1).subs(et, 0) == 0
    # from memory: Junker & Schafer, MNRAS 254, 146 (1992) / Arun et al, Phys. Rev. D 80,
    # 124018 (2009): de_t/dt = -(304/15) nu x^4 e_t [1 + x (-2817/2128 - 1021/228 nu) + ...]
    # at small e_t (only this leading e_t term is recalled)
    small_e = sp.series(de.coefficient(1) / de.coefficient(0).diff(et).subs(et, 0), et, 0, 2).removeO()
    assert sp.expand(small_e - et * (sp.Rational(-2817, 2128) - sp.Rational(1021, 228) * nu)) == 0


def test_tail_rates_at_one_and_a_half_pn():
    dx, de = secular_rates(THREE_HALVES)
    phi, psi = EnergyTailEnhancement(et), AngularMomentumTailEnhancement(et)
    assert dx.known_through == THREE_HALVES and de.known_through == THREE_HALVES
    lower_x, lower_e = secular_rates(1)
    for order in (0, sp.Rational(1, 2), 1):
        assert dx.coefficient(order) == lower_x.coefficient(order)
        assert de.coefficient(order) == lower_e.coefficient(order)
    # dx/dt is (64/5) times the energy flux at this order (E = -x/2 at Newtonian order); the
    # circular value (64/5) 4 pi (Blanchet, Living Rev. Relativ. 17, 2 (2014), from memory)
    assert sp.expand(dx.coefficient(THREE_HALVES) - sp.Rational(256, 5) * sp.pi * phi) == 0
    # de_t/dt needs both functions, and vanishes on circular orbits
    tail_e = de.coefficient(THREE_HALVES)
    assert tail_e.has(EnergyTailEnhancement) and tail_e.has(AngularMomentumTailEnhancement)
    assert sp.limit(tail_e.subs({phi: 1 + sp.Rational(2335, 192) * et**2,
                                 psi: 1 + sp.Rational(209, 32) * et**2}), et, 0) == 0
    # from memory: Arun, Blanchet, Iyer & Sinha, Phys. Rev. D 80, 124018 (2009), small e_t:
    # de_t/dt = -(304/15) nu x^4 e_t [... + (985/152) pi x^(3/2) + ...]
    small = sp.series(tail_e, et, 0, 2).removeO()
    assert sp.expand(small - sp.Rational(-304, 15) * sp.Rational(985, 152) * sp.pi * et) == 0


def test_numeric_rates_agree_with_the_symbolic_ones():
    x_rate, e_rate = numeric_secular_rates(THREE_HALVES)
    dx, de = secular_rates(THREE_HALVES)
    for ecc in (0.0, 0.01, 0.049, 0.051, 0.3, 0.8):
        values = tail_enhancement(ecc)
        subs = {EnergyTailEnhancement(et): values.energy,
                AngularMomentumTailEnhancement(et): values.angular_momentum, nu: 0.2}
        for numeric, series in ((x_rate, dx), (e_rate, de)):
            if ecc == 0:
                exact = sum(sp.limit(coeff.subs(subs), et, 0) * 0.01**k
                            for k, coeff in series.terms.items())
            else:
                exact = sum(coeff.subs(subs).subs(et, ecc) * 0.01**k for k, coeff in series.terms.items())
            assert numeric(0.01, ecc, 0.2) == pytest.approx(float(exact), rel=1e-9, abs=1e-13)


def test_orders_beyond_the_inputs_are_refused():
    with pytest.raises(OrderBeyondInputsError):
        secular_rates("5/2")
    with pytest.raises(OrderBeyondInputsError):
        numeric_secular_rates(3)


def test_two_pn_rates_circular_limit_and_lower_orders():
    """dx/dt at e_t = 0 is the circular (64/5) nu x^5 [... + x^2 (34103/18144 + 13661/2016 nu
    + 59/18 nu^2)] (Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 9.3, from memory);
    de_t/dt vanishes with e_t; the lower orders are those of the 1.5PN rates."""
    x_rate, e_rate = secular_rates(2)
    assert x_rate.known_through == 2 and e_rate.known_through == 2
    circular = sp.Rational(64, 5) * (sp.Rational(34103, 18144) + sp.Rational(13661, 2016) * nu
                                     + sp.Rational(59, 18) * nu**2)
    assert sp.expand(x_rate.coefficient(2).subs(et, 0) - circular) == 0
    assert e_rate.coefficient(2).subs(et, 0) == 0
    lower_x, lower_e = secular_rates("3/2")
    for order in lower_x.orders:
        assert sp.simplify(lower_x.coefficient(order) - x_rate.coefficient(order)) == 0
        assert sp.simplify(lower_e.coefficient(order) - e_rate.coefficient(order)) == 0
    x_number, e_number = numeric_secular_rates(2)
    value = sum(float(coeff.subs({et: sp.Rational(3, 10), nu: sp.Rational(1, 4)})) * 0.01 ** float(k)
                for k, coeff in x_rate.terms.items() if not coeff.has(EnergyTailEnhancement))
    tail = x_rate.coefficient(sp.Rational(3, 2))
    tail_value = float(tail.subs({EnergyTailEnhancement(et): tail_enhancement(0.3).energy, et: 0.3})) * 0.01 ** 1.5
    assert abs(x_number(0.01, 0.3, 0.25) - value - tail_value) < 1e-9 * abs(value)
