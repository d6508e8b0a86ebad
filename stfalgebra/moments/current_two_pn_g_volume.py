"""The g = ln(r1 + r2 + r12) volume terms of the 2PN current moments J_L, for every l.

In the cubic bracket (C1) of :mod:`stfalgebra.moments.current_two_pn_cubic` two families of
terms carry the cross parts (G^2 m1 m2) of the non-compact potentials, body derivatives of g:

* 2 d_k U d_b R^X_k, with R^X_i = G^2 m1 m2 [((3/2) v1 - 2 v2)^k d_1k d_2i
  + ((3/2) v2 - 2 v1)^k d_2k d_1i] g (the cross part of R^nc, (N5) of
  :mod:`stfalgebra.moments.near_zone`);
* the pointwise W terms of Lambda^0b|eps^7/(16 pi G) ((L3) of
  :mod:`stfalgebra.moments.pseudo_tensor`, the W-dependent monomials divided by 16) with
  W^X_ij = -G^2 m1 m2 (d_1i d_2j + d_1j d_2i) g (the cross part of (N3)); their delta parts at
  the bodies are the "W^nc_delta" term of the cubic module.

Their contribution to J_L k_L is, in the probe form (J2) of
:mod:`stfalgebra.moments.current_two_pn`,

    FP int d^3x (k.x)^(l-1) k.(x cross Sigma^X) / (pi G),                              (G1)

integrated exactly by :mod:`stfalgebra.moments.spheroidal_integrals` (the density has powers of
1/(r1 + r2 + r12) the Riesz seeds do not reach). The body derivatives and the field derivatives
are taken symbolically with r1, r2, r12 as symbols (chain rule), the time derivative at fixed x
as v1.d_1 + v2.d_2 (Newtonian motion: accelerations enter at higher order).

Each term is linear in the velocities, so on any orbit of the centre-of-mass frame (planar,
x = y1 - y2, v = dx/dt, ell = x cross v) the contribution is ell.k (k.x)^(l-1) times a function
of the masses and r only (the velocity-free factor of a current moment; tested with a second
null probe and a velocity along x). It is therefore evaluated once per l in the configuration
y1 = (0, 0, X2 r), y2 = (0, 0, -X1 r), v1 = X2 v e_x, v2 = -X1 v e_x, k = (0, i, 1)
(k.x = r, ell.k = i r v).

**Regularisation**: the density is at most r_A^-3 singular at the bodies; the Hadamard scales
s1, s2 and the regulator scale r0 at infinity drop out (checked: an ArithmeticError otherwise).

Example
-------
>>> import sympy as sp
>>> from stfalgebra.symbols import r
>>> sp.factor(g_volume_term(1).as_expr().subs(sp.Symbol("ir", positive=True), 1 / r))
-2*G**2*m**3*nu*(23*nu - 6)/(3*r**2)

References
----------
L. Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 3 (source moments), Sec. 5 (potentials);
L. Blanchet, G. Faye & B. Ponsot, Phys. Rev. D 58, 124002 (1998) (R_i, the function g).
"""

from __future__ import annotations

from fractions import Fraction
from functools import lru_cache

import flint
import sympy as sp

from ..symbols import G, delta, m
from . import orbit_polynomials as op
from .pseudo_tensor import LAMBDA_0I_EPS7
from .spheroidal_integrals import axisymmetric_monomials, finite_part_integral

__all__ = ["g_volume_term", "g_volume_density", "G_VOLUME_TERMS"]

#: The two families of terms this module integrates (named as in the cubic module).
G_VOLUME_TERMS = ("2 d_kU d_bR_k with the g part of R^nc (G^2 m1 m2 m_C)",
                  "the pointwise W terms of Lambda^0b|eps^7 with the g part of W^nc (G^2 m1 m2 m_C)")

_X = sp.symbols("X1:4", real=True)
_Y1 = sp.symbols("a1:4", real=True)
_Y2 = sp.symbols("b1:4", real=True)
_V1 = sp.symbols("p1:4", real=True)
_V2 = sp.symbols("q1:4", real=True)
_R1, _R2, _R12, _PERIMETER = sp.symbols("R1 R2 R12 P", positive=True)
_M1, _M2 = sp.symbols("m1 m2", positive=True)
_DELTA = sp.Symbol("delta_mass")


def _field(f: sp.Expr, i: int) -> sp.Expr:
    """d/dx^i with r_A = |x - y_A| as symbols."""
    return (sp.diff(f, _X[i]) + sp.diff(f, _R1) * (_X[i] - _Y1[i]) / _R1
            + sp.diff(f, _R2) * (_X[i] - _Y2[i]) / _R2)


def _body(f: sp.Expr, body: int, i: int) -> sp.Expr:
    """d/dy_A^i with r_A and r12 = |y1 - y2| as symbols."""
    if body == 1:
        return (sp.diff(f, _Y1[i]) - sp.diff(f, _R1) * (_X[i] - _Y1[i]) / _R1
                + sp.diff(f, _R12) * (_Y1[i] - _Y2[i]) / _R12)
    return (sp.diff(f, _Y2[i]) - sp.diff(f, _R2) * (_X[i] - _Y2[i]) / _R2
            - sp.diff(f, _R12) * (_Y1[i] - _Y2[i]) / _R12)


def _time(f: sp.Expr) -> sp.Expr:
    """d/dt at fixed x: the bodies move with v_A."""
    return sum(_V1[i] * _body(f, 1, i) + _V2[i] * _body(f, 2, i) for i in range(3))


@lru_cache(maxsize=None)
def _configuration() -> dict:
    """The substitution into the evaluation configuration (module docstring), G = m = r = v = 1."""
    x1, x2 = (1 + _DELTA) / 2, (1 - _DELTA) / 2
    values = {_M1: x1, _M2: x2, _R12: 1}
    values.update(dict(zip(_Y1, (0, 0, x2))))
    values.update(dict(zip(_Y2, (0, 0, -x1))))
    values.update(dict(zip(_V1, (x2, 0, 0))))
    values.update(dict(zip(_V2, (-x1, 0, 0))))
    return values


@lru_cache(maxsize=None)
def _source_vector() -> tuple:
    """Sigma^X_b (G = 1, the configuration substituted, 1/(r1 + r2 + r12) as 1/P)."""
    values = _configuration()
    g = sp.log(_R1 + _R2 + _R12)
    first = {(A, i): _body(g, A, i) for A in (1, 2) for i in range(3)}
    second = {(i, j): _body(first[(2, j)], 1, i) for i in range(3) for j in range(3)}   # d_1i d_2j g
    alpha = [sp.Rational(3, 2) * p - 2 * q for p, q in zip(_V1, _V2)]
    beta = [sp.Rational(3, 2) * q - 2 * p for p, q in zip(_V1, _V2)]
    other = {(i, j): _body(first[(1, j)], 2, i) for i in range(3) for j in range(3)}    # d_2i d_1j g
    cross_r = [_M1 * _M2 * sum(alpha[k] * second[(k, i)] + beta[k] * other[(k, i)] for k in range(3))
               for i in range(3)]
    cross_w = [[-_M1 * _M2 * (second[(i, j)] + second[(j, i)]) for j in range(3)] for i in range(3)]
    dt_w = [[_time(cross_w[i][j]) for j in range(3)] for i in range(3)]

    def settle(f):
        return f.xreplace(values)

    w = [[settle(cross_w[i][j]) for j in range(3)] for i in range(3)]
    dt_w = [[settle(dt_w[i][j]) for j in range(3)] for i in range(3)]
    cross_r = [settle(c) for c in cross_r]
    potential = (_M1 / _R1 + _M2 / _R2).xreplace(values)
    vector = [(_M1 * _V1[i] / _R1 + _M2 * _V2[i] / _R2).xreplace(values) for i in range(3)]
    time_potential = settle(_time(_M1 / _R1 + _M2 / _R2))
    trace = sum(w[i][i] for i in range(3))

    def d(f, *indices):
        for i in indices:
            f = _field(f, i).xreplace(values)
        return f

    c = {key: sp.Rational(value, 16) for key, value in LAMBDA_0I_EPS7.items()}
    grad_u = [d(potential, k) for k in range(3)]
    grad_vector = [[d(vector[l], k) for l in range(3)] for k in range(3)]    # [k][l] = d_k V_l
    grad_trace = [d(trace, k) for k in range(3)]
    divergence = sum(grad_vector[k][k] for k in range(3))
    out = []
    for b in range(3):
        total = 2 * sum(grad_u[k] * d(cross_r[k], b) for k in range(3))
        total += c["W_kl d_kl V_i"] * sum(w[k][l] * d(vector[b], k, l) for k in range(3) for l in range(3))
        total += c["d_k V_i d_k W"] * sum(grad_vector[k][b] * grad_trace[k] for k in range(3))
        total += c["d_k V_l d_i W_kl"] * sum(grad_vector[k][l] * d(w[k][l], b) for k in range(3) for l in range(3))
        total += c["d_k V_l d_k W_il"] * sum(grad_vector[k][l] * d(w[b][l], k) for k in range(3) for l in range(3))
        total += c["d_k V_l d_l W_ik"] * sum(grad_vector[k][l] * d(w[b][k], l) for k in range(3) for l in range(3))
        total += c["d_k V_k d_i W"] * divergence * grad_trace[b]
        total += c["dt V d_i W"] * time_potential * grad_trace[b]
        total += c["d_k V dt W_ik"] * sum(grad_u[k] * dt_w[b][k] for k in range(3))
        out.append(total.xreplace({_R1 + _R2 + 1: _PERIMETER}))
    return tuple(out)


def _probe_density(l: int, k: tuple) -> sp.Expr:
    """(k.x)^(l-1) k.(x cross Sigma^X) for a null probe k (G = 1, without 1/pi), as sympy."""
    sigma = _source_vector()
    x = _X
    cross = (x[1] * sigma[2] - x[2] * sigma[1], x[2] * sigma[0] - x[0] * sigma[2], x[0] * sigma[1] - x[1] * sigma[0])
    along = sum(p * q for p, q in zip(k, x))
    return along**(l - 1) * sum(p * q for p, q in zip(k, cross))


def g_volume_density(l: int, k: tuple = (0, sp.I, 1)) -> dict:
    """The density of (G1) in the configuration of the module docstring, phi-averaged, as the
    monomials of :func:`stfalgebra.moments.spheroidal_integrals.axisymmetric_monomials`
    (sympy route, any null probe k; the fast route for k = (0, i, 1) is
    :func:`_fast_monomials`)."""
    density = _probe_density(l, tuple(sp.sympify(q) for q in k))
    return axisymmetric_monomials(density, _X, _R1, _R2, _PERIMETER, -_DELTA / 2)


_FIELD_NAMES = ("X1", "X2", "X3", "R1", "iR1", "R2", "iR2", "iP", "delta_mass", "I")
_FIELD_RING = flint.fmpq_mpoly_ctx.get(_FIELD_NAMES, "lex")
_COEFFICIENT_RING = flint.fmpq_mpoly_ctx.get(("delta_mass", "I"), "lex")


def factorial2(n: int) -> int:
    return 1 if n <= 0 else n * factorial2(n - 2)


def _to_field_ring(expression: sp.Expr):
    """A sympy expression polynomial in X, delta, I and Laurent in R1, R2, P as a flint element."""
    symbols = {_X[0]: 0, _X[1]: 1, _X[2]: 2, _DELTA: 8}
    terms: dict = {}
    for term in sp.Add.make_args(sp.expand(expression)):
        exponents = [0] * len(_FIELD_NAMES)
        coefficient = sp.Integer(1)
        for factor in sp.Mul.make_args(term):
            base, e = factor.as_base_exp()
            if factor == sp.I:
                exponents[9] += 1
            elif base in symbols:
                exponents[symbols[base]] += int(e)
            elif base in (_R1, _R2, _PERIMETER):
                slot = {_R1: 3, _R2: 5, _PERIMETER: 6}[base]
                if base == _PERIMETER:
                    if e > 0:
                        raise ValueError("a positive power of r1 + r2 + r12 in the g-volume density")
                    exponents[7] += int(-e)
                elif e > 0:
                    exponents[slot] += int(e)
                else:
                    exponents[slot + 1] += int(-e)
            elif factor.is_Rational:
                coefficient *= factor
            else:
                raise ValueError(f"unexpected factor {factor} in the g-volume density")
        key = tuple(exponents)
        terms[key] = terms.get(key, 0) + coefficient
    return _FIELD_RING.from_dict({key: flint.fmpq(int(v.p), int(v.q)) for key, v in terms.items() if v != 0})


@lru_cache(maxsize=None)
def _flint_probe_factor():
    """k.(x cross Sigma^X) for k = (0, i, 1) in the flint field ring."""
    sigma = _source_vector()
    x = _X
    cross_y = x[2] * sigma[0] - x[0] * sigma[2]
    cross_z = x[0] * sigma[1] - x[1] * sigma[0]
    i = _FIELD_RING.gens()[9]
    return i * _to_field_ring(cross_y) + _to_field_ring(cross_z)


@lru_cache(maxsize=None)
def _cylinder(j: int, c: int) -> tuple:
    """rho_cyl^(2j) z^c with rho_cyl^2 = (s^2 - 1)(1 - d^2)/4, z = -(delta + s d)/2:
    ((n, k, power of delta, rational), ...)."""
    s, d, dl = sp.symbols("s d dl")
    polynomial = sp.Poly(sp.expand(((s**2 - 1) * (1 - d**2) / 4)**j * (-(dl + s * d) / 2)**c), s, d, dl)
    return tuple((n, k, e, Fraction(int(q.p), int(q.q))) for (n, k, e), q in polynomial.terms())


def _fast_monomials(l: int) -> dict:
    """:func:`g_volume_density` for k = (0, i, 1) through flint: {shape: coefficient in the
    flint ring of delta_mass and I}."""
    gens = _FIELD_RING.gens()
    along = gens[9] * gens[1] + gens[2]
    density = _flint_probe_factor() * along**(l - 1)
    collected: dict = {}
    for exponents, q in zip(density.monoms(), density.coeffs()):
        x1, x2, x3, r1, ir1, r2, ir2, ip, dl, im = (int(e) for e in exponents)
        if x1 % 2 or x2 % 2:
            continue
        angular = Fraction(factorial2(x1 - 1) * factorial2(x2 - 1), factorial2(x1 + x2))
        scale = angular * Fraction(int(q.p), int(q.q)) * Fraction(2)**(ir1 - r1 + ir2 - r2)
        for n, k, power, w in _cylinder((x1 + x2) // 2, x3):
            shape = (n, k, ir1 - r1, ir2 - r2, ip)
            bucket = collected.setdefault(shape, {})
            key = (dl + power, im)
            bucket[key] = bucket.get(key, 0) + scale * w
    out = {}
    for shape, bucket in collected.items():
        element = _COEFFICIENT_RING.from_dict({key: flint.fmpq(v.numerator, v.denominator)
                                               for key, v in bucket.items() if v})
        if element != 0:
            out[shape] = element
    return out


def probe_value(l: int) -> sp.Expr:
    """(G1) for k = (0, i, 1) in the configuration of the module docstring (G = m = r = v = 1),
    a polynomial in the mass difference; raises ArithmeticError if a regularisation scale
    survives (the sympy route :func:`g_volume_density` checks it in the tests)."""
    delta_mass = _COEFFICIENT_RING.gens()[0]
    result = finite_part_integral(_fast_monomials(l), -delta_mass / 2)
    for scale in ("ln r0", "ln s1", "ln s2"):
        if sp.expand(result[scale]) != 0:
            raise ArithmeticError(f"the scale {scale} survives in the g-volume terms at l = {l}: {result[scale]}")
    return sp.expand(result["finite"].subs(sp.Symbol("delta_mass"), _DELTA) / sp.pi)


@lru_cache(maxsize=None)
def g_volume_term(l: int) -> object:
    """The g-volume terms of J_L at 2PN on any centre-of-mass orbit: the coefficient of
    ell.k/c^4 in J_L k_L, (k.x)^(l-1) included, as an element of
    :mod:`stfalgebra.moments.orbit_polynomials` (the form of
    :func:`stfalgebra.moments.current_two_pn_cubic.cubic_field_term`).

    **Conventions**: x = y1 - y2, ell = x cross v, harmonic coordinates, centre-of-mass frame.
    """
    if isinstance(l, bool) or not isinstance(l, int) or l < 1:
        raise ValueError(f"current moments need l >= 1, got {l!r}")
    value = sp.expand(probe_value(l) / sp.I)        # ell.k = i, k.x = 1
    if value.has(sp.I):
        raise ArithmeticError(f"the g-volume terms at l = {l} are not of the form ell.k (k.x)^(l-1)")
    expression = value.subs(_DELTA, delta) * G**2 * m**3 * sp.Symbol("ir", positive=True)**2 \
        * sp.Symbol("kx")**(l - 1)
    return op.reduce_mass_difference(op.from_expression(expression))
