"""General-orbit modes with spins of any direction (stfalgebra/radiative/precessing_channels.py).

The independent route: the radiative quadrupole and octupole as explicit Cartesian component
arrays at a numeric configuration (spins of random direction), differentiated by Taylor
expansion of the trajectory in time (exact rationals), made STF component by component
(stf/components.py), assembled into h_ij^TT along many directions and projected on the
spin-weighted harmonics (stf/harmonics.py) by quadrature.
"""

from __future__ import annotations

import random
from fractions import Fraction
from functools import lru_cache
from math import factorial, pi, sqrt
from types import SimpleNamespace

import numpy as np
import pytest
import sympy as sp

from stfalgebra.binary.spin_orbit_inputs import spin_orbit_acceleration
from stfalgebra.binary.spin_variables import spin_combinations
from stfalgebra.binary.triad_vectors import TriadVector, cross, dot
from stfalgebra.exact import ExactPolynomial
from stfalgebra.moments.spin_moments import GENERAL_SPIN_VECTORS, general_spin_part
from stfalgebra.orders import PNOrder
from stfalgebra.radiative.modes import derive_mode
from stfalgebra.stf.components import naive_stf_components
from stfalgebra.stf.harmonics import spin_weighted_harmonic

T_MAX = 3          # time derivatives needed (l <= 3)
E_MAX = 3          # powers of eps = 1/c kept in the moments


# ----------------------------------------------------------------------------- jets in (t, eps)
class Jet:
    """A polynomial in t (degree <= T_MAX) and eps (degree <= E_MAX) with rational coefficients."""

    def __init__(self, c=None):
        self.c = c if c is not None else [[Fraction(0)] * (E_MAX + 1) for _ in range(T_MAX + 1)]

    @classmethod
    def const(cls, value, eps_power=0):
        out = cls()
        out.c[0][eps_power] = Fraction(value)
        return out

    def _coerce(self, other):
        return other if isinstance(other, Jet) else Jet.const(other)

    def __add__(self, other):
        if isinstance(other, TriadVector):
            return NotImplemented
        other = self._coerce(other)
        return Jet([[a + b for a, b in zip(ra, rb)] for ra, rb in zip(self.c, other.c)])

    __radd__ = __add__

    def __neg__(self):
        return Jet([[-a for a in row] for row in self.c])

    def __sub__(self, other):
        return self + (-self._coerce(other))

    def __rsub__(self, other):
        return self._coerce(other) - self

    def __mul__(self, other):
        if isinstance(other, TriadVector):
            return NotImplemented
        if not isinstance(other, Jet):
            f = Fraction(other)
            return Jet([[a * f for a in row] for row in self.c])
        out = Jet()
        for i, ra in enumerate(self.c):
            for j, a in enumerate(ra):
                if a == 0:
                    continue
                for k in range(T_MAX + 1 - i):
                    for e in range(E_MAX + 1 - j):
                        b = other.c[k][e]
                        if b:
                            out.c[i + k][j + e] += a * b
        return out

    __rmul__ = __mul__

    def _unit_power(self, exponent):
        """(self/c0)^exponent for a rational exponent, with c0 the constant term."""
        c0 = self.c[0][0]
        u = self * (1 / c0) - 1
        total, term, coefficient = Jet.const(1), Jet.const(1), Fraction(1)
        for j in range(1, T_MAX + E_MAX + 1):
            coefficient = coefficient * (exponent - j + 1) / j
            term = term * u
            total = total + term * coefficient
        return total

    def __pow__(self, k):
        if k >= 0:
            out = Jet.const(1)
            for _ in range(k):
                out = out * self
            return out
        return self._unit_power(Fraction(k)) * (1 / self.c[0][0]) ** (-k)

    def integral(self, start):
        out = Jet()
        out.c[0] = list(start.c[0]) if isinstance(start, Jet) else [Fraction(start)] + [Fraction(0)] * E_MAX
        for i in range(T_MAX):
            out.c[i + 1] = [a / (i + 1) for a in self.c[i]]
        return out

    def derivative_value(self, order):
        """d^order/dt^order at t = 0: the eps coefficients."""
        return [a * factorial(order) for a in self.c[order]]


def _vec(components):
    return TriadVector(*[c if isinstance(c, Jet) else Jet.const(c) for c in components])


# ----------------------------------------------------------------------------- configuration
def _configuration(seed):
    rng = random.Random(seed)
    cfg = dict(delta=Fraction(rng.randint(1, 9), 11), r=Fraction(rng.randint(20, 40), 3),
               rdot=Fraction(rng.randint(-9, 9), 40), phidot=Fraction(rng.randint(3, 9), 100))
    cfg["nu"] = (1 - cfg["delta"] ** 2) / 4
    for a in (1, 2):
        for k in ("n", "lambda", "ell"):
            cfg[f"chi{a}_{k}"] = Fraction(rng.randint(-9, 9), 10)
    return cfg


def _trajectory(cfg, spins):
    """x(t), v(t) as jets: Newtonian plus leading spin-orbit acceleration (cited input) at eps^3."""
    nu, delta = cfg["nu"], cfg["delta"]
    chi = [TriadVector(*[cfg[f"chi{a}_{k}"] * spins for k in ("n", "lambda", "ell")]) for a in (1, 2)]
    s_vec, sigma_vec = spin_combinations(chi[0], chi[1], delta)
    x0 = _vec((cfg["r"], 0, 0))
    v0 = _vec((cfg["rdot"], cfg["r"] * cfg["phidot"], 0))
    x, v = x0, v0
    eps3 = Jet.const(1, 3)
    for _ in range(T_MAX + 1):
        r = (dot(x, x))._unit_power(Fraction(1, 2)) * cfg["r"]
        ns = SimpleNamespace(G=1, m=1, nu=nu, delta=delta, r=r, rdot=dot(x, v) * r**-1, q=Fraction,
                             x=x, v=v, spin=_vec(s_vec.components), spin_difference=_vec(sigma_vec.components),
                             cross=cross, dot=dot)
        a = x * (-(r**-3)) + spin_orbit_acceleration(ns)[Fraction(3, 2)] * eps3
        v = TriadVector(*[ai.integral(v0i) for ai, v0i in zip(a.components, v0.components)])
        x = TriadVector(*[vi.integral(x0i) for vi, x0i in zip(v.components, x0.components)])
    return x, v, chi, r


def _outer(vectors):
    """Raw (unsymmetrised) outer product as {index tuple: Jet}."""
    out = {(): Jet.const(1)}
    for vector in vectors:
        out = {key + (i,): value * vector.components[i] for key, value in out.items() for i in range(3)}
    return out


def _add_into(total, tensor, factor):
    for key, value in tensor.items():
        piece = value * factor
        total[key] = total[key] + piece if key in total else piece


def _moments(cfg, spins, l):
    """Raw Cartesian I_L, J_L (jets): Newtonian two-body sums plus the spin parts."""
    nu, delta = cfg["nu"], cfg["delta"]
    x1, x2 = (1 + delta) / 2, (1 - delta) / 2
    x, v, chi, r = _trajectory(cfg, spins)
    ell = cross(x, v)
    mass, current = {}, {}
    # Newtonian moments: sum over bodies, y_1 = X2 x, y_2 = -X1 x (common practice)
    for m_a, s_a in ((x1, x2), (x2, -x1)):
        _add_into(mass, _outer([x] * l), m_a * s_a**l)
        _add_into(current, _outer([x] * (l - 1) + [ell]), m_a * s_a**(l + 1))
    eps = Jet.const(1, 1)
    physical = [chi[0] * (x1 * x1), chi[1] * (x2 * x2)]          # c S_A/(G m^2), G = m = 1
    if l == 2:
        # Kidder, Phys. Rev. D 52, 821 (1995), Sec. III (equation numbers from memory):
        # J_ij^S = -(3/2) nu x^<i Sigma^j>,  I_ij^S = (nu/c^2)[(8/3) x^<i (v x xi)^j> - (4/3) v^<i (x x xi)^j>],
        # xi = S + delta Sigma, spins S = (G m^2/c) s
        s_vec, sigma_vec = spin_combinations(physical[0] * (1 / (x1 * x1)), physical[1] * (1 / (x2 * x2)), delta)
        xi = _vec((s_vec + sigma_vec * delta).components)
        _add_into(current, _outer([x, _vec(sigma_vec.components)]), eps * (-Fraction(3, 2) * nu))
        eps3 = Jet.const(1, 3)
        _add_into(mass, _outer([x, cross(v, xi)]), eps3 * (Fraction(8, 3) * nu))
        _add_into(mass, _outer([v, cross(x, xi)]), eps3 * (-Fraction(4, 3) * nu))
    else:
        # the derived spin parts (pole-dipole source), evaluated on the components
        vectors = {"x": x, "v": v}
        for a in (1, 2):
            vectors[f"S{a}"] = _vec(physical[a - 1].components)
            vectors[f"x_cross_S{a}"] = cross(x, vectors[f"S{a}"])
            vectors[f"v_cross_S{a}"] = cross(v, vectors[f"S{a}"])
        scalars = {"nu": nu, "delta": delta, "r": r, "rinv": r**-1, "rdot": dot(x, v) * r**-1}
        for kind, target in (("mass", mass), ("current", current)):
            part = general_spin_part(kind, l)
            factor = Jet.const(1, part.inverse_c_power + 1)
            for key, coefficient in part.terms.items():
                value = Jet.const(0)
                for monomial, rational in coefficient.terms():
                    term = Jet.const(rational)
                    for name, power in monomial.items():
                        term = term * (scalars[name] ** power if isinstance(scalars[name], Jet)
                                       else Jet.const(scalars[name] ** power))
                    value = value + term
                factors = [vectors[name] for name, e in zip(GENERAL_SPIN_VECTORS, key) for _ in range(e)]
                _add_into(target, _outer(factors), value * factor)
    return mass, current


def _radiative(cfg, spins, l):
    """{eps power: numpy STF array} of d^l I_L/dt^l and d^l J_L/dt^l."""
    out = []
    for tensor in _moments(cfg, spins, l):
        by_power = {}
        for e in range(E_MAX + 1):
            array = sp.MutableDenseNDimArray.zeros(*(3,) * l)
            for key, jet in tensor.items():
                array[key] = sp.Rational(jet.derivative_value(l)[e])
            stf = naive_stf_components(sp.ImmutableDenseNDimArray(array))
            by_power[e] = np.array(stf.tolist(), dtype=float)
        out.append(by_power)
    return out


_LEVI = np.zeros((3, 3, 3))
for (i, j, k), sign in {(0, 1, 2): 1, (1, 2, 0): 1, (2, 0, 1): 1, (0, 2, 1): -1, (2, 1, 0): -1, (1, 0, 2): -1}.items():
    _LEVI[i, j, k] = sign


@lru_cache(maxsize=None)
def _numeric_modes(seed, spins):
    """h_lm/(4 nu sqrt(pi/5)) as {(l, m): {power of eps: complex}} (G = m = R = 1, phi = 0)."""
    cfg = _configuration(seed)
    moments = {l: _radiative(cfg, spins, l) for l in (2, 3)}
    nodes, weights = np.polynomial.legendre.leggauss(12)
    phis = np.linspace(0, 2 * pi, 16, endpoint=False)
    th, ph = sp.symbols("theta phi", real=True)
    harmonics = {(l, m): sp.lambdify((th, ph), sp.conjugate(spin_weighted_harmonic(-2, l, m, th, ph)), "numpy")
                 for l in (2, 3) for m in range(-l, l + 1)}
    result = {key: {} for key in harmonics}
    for cos_t, w in zip(nodes, weights):
        sin_t = sqrt(1 - cos_t**2)
        theta = np.arccos(cos_t)
        for phi in phis:
            n = np.array([sin_t * np.cos(phi), sin_t * np.sin(phi), cos_t])
            e_theta = np.array([cos_t * np.cos(phi), cos_t * np.sin(phi), -sin_t])
            e_phi = np.array([-np.sin(phi), np.cos(phi), 0.0])
            p, q = -e_phi, e_theta
            plus_tensor = (np.outer(p, p) - np.outer(q, q)) / 2
            cross_tensor = (np.outer(p, q) + np.outer(q, p)) / 2
            # h_ij^TT = (4G/(c^2 R)) P_ijab sum_l (1/(c^l l!)) {N_{L-2} U_abL-2 - (2l/(c(l+1))) N_cL-2 eps_cda V_bdL-2}
            # (Blanchet, Living Rev. Relativ. 17, 2 (2014), eq. (66), from memory); powers of eps collected
            h = {}
            for l, (mass, current) in moments.items():
                for e in range(E_MAX + 1):
                    u, vv = mass[e], current[e]
                    for _ in range(l - 2):
                        u, vv = u @ n, vv @ n
                    term_u = 4 * u / factorial(l)
                    term_v = -4 * (2 * l / (l + 1)) * np.einsum("c,cda,bd->ab", n, _LEVI, vv) / factorial(l)
                    for power, term in ((2 + l + e, term_u), (3 + l + e, term_v)):
                        value = np.sum(plus_tensor * term) - 1j * np.sum(cross_tensor * term)
                        h[power] = h.get(power, 0) + value
            for key, harmonic in harmonics.items():
                weight = w * (2 * pi / len(phis)) * complex(harmonic(theta, phi))
                for power, value in h.items():
                    result[key][power] = result[key].get(power, 0) + value * weight
    norm = 4 * cfg["nu"] * sqrt(pi / 5)
    return {key: {power - 4: value / float(norm) for power, value in by.items()} for key, by in result.items()}


def _engine_mode(l, m, cfg, spins):
    # mass-kind modes through relative 3/2: the instantaneous part (the tail enters there too)
    mass_kind = (l + m) % 2 == 0
    res = derive_mode(l, m, orbit="general", pn_relative=Fraction(3, 2) if mass_kind else 1, spins="general",
                      instantaneous_only=mass_kind)
    values = {"m": 1, "nu": cfg["nu"], "delta": cfg["delta"], "r": cfg["r"], "rinv": 1 / cfg["r"], "rdot": cfg["rdot"],
              "phidot": cfg["phidot"]}
    values.update({k: cfg[k] * spins for k in cfg if k.startswith("chi")})
    constant = complex(res.constant.to_sympy()) if res.constant is not None else 1
    out = {}
    for order, coefficient in res.series.terms.items():
        out[order.twice] = constant * complex(sp.sympify(coefficient.substitute(values).to_sympy()))
    return out, res.pn_relative + (PNOrder(l - 2, 2) if (l + m) % 2 == 0 else PNOrder(l - 1, 2))


@pytest.mark.parametrize("l", [2, 3])
def test_spin_parts_of_every_mode_agree_with_the_component_route(l):
    seed = 7
    cfg = _configuration(seed)
    spinning, bare = _numeric_modes(seed, 1), _numeric_modes(seed, 0)
    checked = 0
    for m in range(-l, l + 1):
        engine, through = _engine_mode(l, m, cfg, 1)
        engine_bare, _ = _engine_mode(l, m, cfg, 0)
        for power in range(0, through.twice + 1):
            derived = engine.get(power, 0) - engine_bare.get(power, 0)
            numeric = spinning[(l, m)].get(power, 0) - bare[(l, m)].get(power, 0)
            assert abs(derived - numeric) < 1e-9 * (1 + abs(numeric)), (l, m, power, derived, numeric)
            checked += abs(numeric) > 1e-6
    assert checked >= 2 * l      # the spin terms are there, in modes of both parities


def test_orbital_leading_terms_agree_with_the_component_route():
    # the Newtonian parts (no spins) of both routes: a check of the projection and normalisation
    seed = 7            # the configuration of the spin test (cached)
    cfg = _configuration(seed)
    bare = _numeric_modes(seed, 0)
    for l in (2, 3):
        for m in range(-l, l + 1):
            engine, _ = _engine_mode(l, m, cfg, 0)
            lowest = l - 2 if (l + m) % 2 == 0 else l - 1
            assert abs(engine.get(lowest, 0) - bare[(l, m)].get(lowest, 0)) < 1e-9


ALIGNED = {"chi1_n": 0, "chi1_lambda": 0, "chi2_n": 0, "chi2_lambda": 0,
           "chi1_ell": ExactPolynomial("chi1"), "chi2_ell": ExactPolynomial("chi2")}


@pytest.mark.parametrize("l", [2, 3])
def test_aligned_limit_is_the_aligned_spin_mode(l):
    # chi_A = chi_A ell: every mode, m of both signs, equals today's spins="aligned" general-orbit mode
    for m in range(-l, l + 1):
        general = derive_mode(l, m, orbit="general", pn_relative=1, spins="general")
        aligned = derive_mode(l, m, orbit="general", pn_relative=1, spins="aligned")
        ratio = general.constant / aligned.constant         # m < 0: the aligned constant carries (-1)^l
        assert ratio.radicand == 1
        limit = general.series.map_coefficients(lambda v: v.substitute(ALIGNED) * ratio.rational)
        assert (limit - aligned.series).orders == (), (l, m)


def test_in_plane_spins_break_the_planar_symmetry():
    # Hhat_{l,-m} = (-1)^l conj(Hhat_lm) holds for planar orbits only
    plus = derive_mode(2, 2, orbit="general", pn_relative=1, spins="general")
    minus = derive_mode(2, -2, orbit="general", pn_relative=1, spins="general")
    mirrored = minus.series.map_coefficients(lambda v: v.conjugate())
    difference = plus.series - mirrored
    assert difference.orders == (PNOrder(1),)
    assert difference.coefficient(1).has("chi1_n", "chi1_lambda")
    assert not difference.coefficient(1).has("chi1_ell")


def test_spin_terms_enter_at_the_leading_spin_orbit_orders():
    # current-kind modes: chi_ell at relative 0.5PN; mass-kind modes: in-plane spins at relative 1PN
    h21 = derive_mode(2, 1, orbit="general", pn_relative=1, spins="general").series
    assert h21.coefficient(1).has("chi1_ell") and not h21.coefficient(1).has("chi1_n")
    assert h21.coefficient(Fraction(3, 2)).has("chi1_n", "chi1_lambda")
    h22 = derive_mode(2, 2, orbit="general", pn_relative=1, spins="general").series
    assert not h22.coefficient(0).has(*ALIGNED)
    assert h22.coefficient(1).has("chi1_n")


def test_zero_modes_are_labelled_instantaneous():
    result = derive_mode(2, 0, orbit="general", pn_relative=1, spins="general")
    assert "instantaneous part only" in " ".join(result.notes())
    assert result.to_json()["spins"] == "general"


def test_refusals_name_what_is_missing():
    from stfalgebra.errors import OrderBeyondInputsError

    with pytest.raises(ValueError, match="general orbits only"):
        derive_mode(2, 2, orbit="circular", pn_relative=1, spins="general")
    with pytest.raises(OrderBeyondInputsError, match="next-to-leading spin-orbit"):
        derive_mode(2, 1, orbit="general", pn_relative=Fraction(3, 2), spins="general")
    with pytest.raises(OrderBeyondInputsError, match="spin-spin"):
        derive_mode(2, 2, orbit="general", pn_relative=2, spins="general")
    with pytest.raises(OrderBeyondInputsError, match="tail"):
        derive_mode(2, 2, orbit="general", pn_relative=Fraction(3, 2), spins="general")
    with pytest.raises(ValueError, match="spins must be"):
        derive_mode(2, 2, orbit="general", pn_relative=1, spins="precessing")
