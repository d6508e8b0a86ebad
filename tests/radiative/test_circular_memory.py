"""The DC memory of circular inspirals (stfalgebra.radiative.circular_memory) and its modes."""

from functools import lru_cache

import numpy as np
import pytest
import sympy as sp
from scipy.integrate import solve_ivp

from stfalgebra import symbols as S
from stfalgebra.errors import OrderBeyondInputsError
from stfalgebra.orders import PNOrder
from stfalgebra.radiative.circular_memory import circular_memory_amplitude, integrate_from_zero, memory_leading_order
from stfalgebra.radiative.contributions import CONTRIBUTIONS, memory_row
from stfalgebra.radiative.energy_balance import relative_series
from stfalgebra.radiative.memory import memory_coupling, memory_prefactor
from stfalgebra.radiative.modes import derive_mode

x, nu = S.x, S.nu


def _hhat(l, **options):
    return sp.expand(derive_mode(l, 0, **options).hhat)


def test_hhat20_and_hhat40_through_relative_1pn_match_the_published_memory():
    # Favata, Phys. Rev. D 80, 024002 (2009), the memory modes h_20, h_40 of circular inspirals, in
    # the normalisation of Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 9.5 (from memory):
    # Hhat_20 = -5/(14 sqrt 6) [1 + x (-4075/4032 + 67 nu/48)],
    # Hhat_40 = -1/(504 sqrt 2) [1 + x (-180101/29568 + 27227 nu/1056)]; no x^(3/2) term in either
    h20 = -5 / (14 * sp.sqrt(6)) * (1 + x * (-sp.Rational(4075, 4032) + sp.Rational(67, 48) * nu))
    h40 = -1 / (504 * sp.sqrt(2)) * (1 + x * (-sp.Rational(180101, 29568) + sp.Rational(27227, 1056) * nu))
    assert sp.expand(_hhat(2, pn_relative=1) - h20) == 0
    assert sp.expand(_hhat(4, pn_relative=1) - h40) == 0
    assert sp.expand(_hhat(2, pn_relative=sp.Rational(3, 2)) - h20) == 0
    assert sp.expand(_hhat(4, pn_relative=sp.Rational(3, 2)) - h40) == 0


def test_hhat20_and_hhat40_at_relative_2pn_match_the_published_memory():
    # Favata, Phys. Rev. D 80, 024002 (2009), the x^2 terms of the memory modes h_20, h_40 relative
    # to their leading terms (from memory): -151877213/67060224 - 123815 nu/44352 + 205 nu^2/352
    # and 2201411267/158505984 - 34829479 nu/432432 + 844951 nu^2/27456
    x2_20 = -sp.Rational(151877213, 67060224) - sp.Rational(123815, 44352) * nu + sp.Rational(205, 352) * nu**2
    x2_40 = sp.Rational(2201411267, 158505984) - sp.Rational(34829479, 432432) * nu + sp.Rational(844951, 27456) * nu**2
    for l, lead, x2 in ((2, -5 / (14 * sp.sqrt(6)), x2_20), (4, -1 / (504 * sp.sqrt(2)), x2_40)):
        relative = sp.expand(_hhat(l, pn_relative=2) / lead)
        assert sp.expand(relative.coeff(x, 2) - x2) == 0
        assert relative.subs(x, 0) == 1 and relative.coeff(x, 3) == 0   # normalised; nothing beyond x^2


def test_memory_modes_are_kind_memory_with_the_assumption_and_flip_with_the_triad():
    res = derive_mode(2, 0, pn=0)
    assert res.kind == "memory" and "adiabatic" in res.note and "infinite past" in res.note
    assert res.to_json()["kind"] == "memory"
    flipped = derive_mode(2, 0, pn=0, sign_convention="theta-phi")
    assert sp.simplify(flipped.hhat + res.hhat) == 0


@pytest.mark.parametrize("l", [2, 4, 6, 8])
def test_every_even_l_is_served_through_relative_2pn_from_its_leading_order(l):
    constant, series, _ = circular_memory_amplitude(l, PNOrder(2))
    assert series.orders[0] == memory_leading_order(l)
    assert series.known_through >= memory_leading_order(l) + PNOrder(2)
    with pytest.raises(OrderBeyondInputsError, match="memory row"):
        derive_mode(l, 0, pn_relative=sp.Rational(5, 2))


def test_leading_order_and_odd_l_refused():
    assert [memory_leading_order(l) for l in (2, 4, 6, 8, 10)] == [0, 0, 1, 2, 3]
    with pytest.raises(ValueError, match="even l"):
        memory_leading_order(3)


def test_the_table_holds_the_memory_row_and_the_plans_of_the_oscillating_modes_ignore_it():
    rows = [row for row in CONTRIBUTIONS if row.family == "memory"]
    assert rows and all(row.modes == "m = 0" for row in rows)
    assert memory_row(2, PNOrder(2)) is not None and memory_row(2, PNOrder(5, 2)) is None
    assert "memory" not in {part.split(":")[0] for part in derive_mode(2, 2, pn=1).provenance}


def test_integration_from_zero_divides_by_n_plus_one():
    series = relative_series("x_rate", 1)
    integrated = integrate_from_zero(series)
    for order, value in series.terms.items():
        assert integrated.terms[order] * (order + 1) == value


# ----------------------------------------------------------------------------- numerical route
@lru_cache(maxsize=None)
def _numeric_modes(pn):
    """Hhat_lm(x) and d(x Hhat_lm)/dx as numpy functions of x for the modes feeding the l = 2
    memory through ``pn`` (every m != 0 mode with l <= 4), at nu = 1/5."""
    values = {nu: sp.Rational(1, 5), S.delta: sp.sqrt(1 - sp.Rational(4, 5))}
    out = {}
    for l in range(2, 5):
        for m in range(-l, l + 1):
            if m == 0:
                continue
            try:
                expr = derive_mode(l, m, pn=pn).hhat.subs(values)
            except OrderBeyondInputsError:
                continue
            if expr == 0:
                continue
            out[(l, m)] = (sp.lambdify(x, expr, "numpy"), sp.lambdify(x, sp.diff(x * expr, x), "numpy"))
    return out


def _memory_along_inspiral(pn, x_start, x_end):
    """h_20(x_end) - h_20(x_start), units G = m = c = R = 1, by integrating the memory formula in
    time along x(t) evolved numerically from dx/dt (energy balance at relative ``pn``), with the
    modes h_lm = K x Hhat_lm exp(-i m phi) differentiated in time including the drift of x."""
    nu_value = 0.2
    rate = relative_series("x_rate", pn)
    eps = sp.Symbol("eps", positive=True)
    rate_of_x = sp.lambdify(x, rate.to_expression(eps).subs({eps: sp.sqrt(x), nu: sp.Rational(1, 5)}), "numpy")
    modes = _numeric_modes(pn)
    couplings = {(a, b): complex(sp.N(memory_coupling(a[0], a[1], b[0], b[1], 2, 0)))
                 for a in modes for b in modes if a[1] == b[1]}
    weight = float(memory_prefactor(2))
    amplitude = 2 * nu_value * np.sqrt(16 * np.pi / 5)

    def rhs(t, state):
        xv, phase, _ = state
        omega = xv**1.5
        xdot = 64 / 5 * nu_value * xv**5 * rate_of_x(xv)
        hdot = {lm: amplitude * np.exp(-1j * lm[1] * phase) * (slope(xv) * xdot - 1j * lm[1] * omega * xv * value(xv))
                for lm, (value, slope) in modes.items()}
        total = sum(hdot[a] * np.conj(hdot[b]) * c for (a, b), c in couplings.items())
        return [xdot, omega, -weight * total.real]

    def reached(t, state):
        return state[0] - x_end
    reached.terminal = True
    horizon = 5 / (256 * nu_value) * x_start**-4 * 2
    solution = solve_ivp(rhs, (0, horizon), [x_start, 0.0, 0.0], method="DOP853", rtol=1e-11, atol=1e-30,
                         events=reached)
    assert solution.status == 1
    return solution.y_events[0][0][2]


def _closed_form(pn, x_value):
    expr = derive_mode(2, 0, pn=pn).hhat.subs(nu, sp.Rational(1, 5))
    return float(2 * 0.2 * np.sqrt(16 * np.pi / 5) * x_value * expr.subs(x, x_value))


def test_numerically_integrated_memory_matches_the_closed_form_at_leading_order():
    # only Hhat_22 = 1 and the Newtonian dx/dt: the closed form is exact up to the drift of x in
    # dh/dt, a relative (xdot/(x omega))^2 = ((64/5) nu x^(5/2))^2 ~ 2e-6 effect at x = 0.05
    numeric = _memory_along_inspiral(0, 0.01, 0.05)
    exact = _closed_form(0, 0.05) - _closed_form(0, 0.01)
    assert numeric == pytest.approx(exact, rel=1e-6)
    assert numeric != pytest.approx(exact, rel=1e-9)   # the drift is there, and this small


def test_numerically_integrated_memory_matches_the_closed_form_through_1pn():
    # through 1PN the closed form drops products beyond x^1: relative x^2 ~ 1e-4 at x = 0.01,
    # while the 1PN term itself is ~1e-2 (the leading-order closed form misses by that much)
    numeric = _memory_along_inspiral(1, 0.002, 0.01)
    exact = _closed_form(1, 0.01) - _closed_form(1, 0.002)
    leading = _closed_form(0, 0.01) - _closed_form(0, 0.002)
    assert numeric == pytest.approx(exact, rel=3e-4)
    assert abs(numeric - leading) > 20 * abs(numeric - exact)
