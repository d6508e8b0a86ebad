"""The cubic (G^2 m_A m_B m_C) non-compact terms of the 2PN current moments J_L, for every l.

In the reduction (J4) of :mod:`stfalgebra.moments.current_two_pn`, the cubic part of
Sigma_b at c^-4 is the bracket

    (1/(pi G)) [ 2 d_k U d_b R_k - Delta(U R_b + U^2 U_b/2) + (3/2) U d_t U d_b U
                 - (1/2) U_b dU.dU + U_k d_k U d_b U ]                                       (C1)

(plus the compact terms -6 U^2 sigma_b - 4 R_b sigma, not here) and the terms of
Lambda^0b|eps^7/(16 pi G) with the non-compact W^nc_ij of (N3). With the probe form (J2),

    J_L k_L |cubic = (1/l) curl { w: FP int d^3x (k.x)^l C_w },   Sigma_b = sum_w C_w w_b + (x_b part),

w among y1, y2, v1, v2 ((x - y_A)_b = x_b - y_A_b: the x_b part drops out of x cross Sigma). Each
C_w is a sum of terms (x.v1)^p (x.v2)^q r1^a r2^b with coefficients in the body invariants,
integrated by :func:`stfalgebra.moments.partie_finie.partie_finie_seed_integral` (the Hadamard
partie finie at the bodies: the products of three potentials reach r_A^-7 at a body, beyond
the r_A^-3 where the (r1 r2)^eps continuation is the partie finie; the regulator (|x|/r0)^B
centred on the origin at infinity). The curl is taken key by key (poles at the bodies and the
powers of ln r12, ln r0 cancel only after it) and put on the Newtonian centre-of-mass orbit
(:func:`stfalgebra.moments.current_two_pn.curl_on_newtonian_orbit`).

The potentials (Newtonian order, :mod:`stfalgebra.moments.near_zone`): U = G sum m_A/r_A,
U_b = G sum m_A v_A^b/r_A, d_t U = G sum m_A (n_A.v_A)/r_A^2 (time derivative at fixed x),
R^C_k = G^2 m1 m2 (v1 - v2)_k (1/r1 - 1/r2)/r12 and the self part of R^nc (N5),
-G^2 m_A^2 (v_A - (n_A.v_A) n_A)/(8 r_A^2).

**Terms included so far** (:func:`cubic_field_term`): in (C1) the three products
(3/2) U d_t U d_b U - (1/2) U_b dU.dU + U_k d_k U d_b U (every body combination),
2 d_k U d_b R_k with R = R^C + (self part of R^nc), and the surface term at infinity of
-Delta(U R_b + U^2 U_b/2) with the whole R (:func:`surface_term`; it vanishes for every l);
in the W^nc terms of Lambda^0b|eps^7/(16 pi G) (the W-dependent monomials of (L3) of
:mod:`stfalgebra.moments.pseudo_tensor`, divided by 16), the pointwise terms with the self
parts m_A^2 (delta_ij - n_A^i n_A^j)/(4 r_A^2) of W^nc ("W^nc_self") and the delta parts of
-W_kl d_kl U_b + (1/2) W Delta U_b with the whole W^nc ("W^nc_delta", Hadamard values (N4)).
**The g = ln(r1 + r2 + r12) volume terms** (G^2 m1 m2 m_C): the cross part of R^nc in
2 d_k U d_b R_k, and the cross part -G^2 m1 m2 (d_1i d_2j + d_1j d_2i) g of W^nc in the pointwise
W terms, are :func:`stfalgebra.moments.current_two_pn_g_volume.g_volume_term`. They have third
derivatives of g, with powers of 1/(r1 + r2 + r12) that the seeds (P1) do not integrate (unlike
(I5) of :mod:`stfalgebra.moments.mass_two_pn`, the powers do not cancel); they are integrated
exactly in prolate spheroidal coordinates (:mod:`stfalgebra.moments.spheroidal_integrals`).
Independent check: direct numerical quadrature of the explicit potentials at l = 1 and 2
(tests/moments/test_current_two_pn_cubic_g_terms.py).

**Regularisation constants.** ln r0 (the scale of the finite part at infinity) and ln r12 are
kept as keys until the curl is on the orbit; the Hadamard scales of the bodies would come with
a pole at a body: :func:`stfalgebra.moments.polynomial_seeds.finite_total` raises if one
survives. For the terms included, every ln r0 and every pole cancels (tested): no constant.

**Conventions**: null probe k; ell = x cross v; harmonic coordinates; centre-of-mass frame;
results are ring elements of :mod:`stfalgebra.moments.orbit_polynomials`, the coefficient of
ell.k/c^4 in J_L k_L, the factor (k.x)^(l-1) included (as
:func:`stfalgebra.moments.current_two_pn.one_pn_field_term`).

Example
-------
>>> from stfalgebra.symbols import r
>>> sp.factor(cubic_field_term(1).as_expr().subs(sp.Symbol("ir", positive=True), 1 / r))
-3*G**2*m**3*nu*(11*nu - 4)/(2*r**2)

References
----------
L. Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 3 (source moments), Sec. 5 (potentials);
L. Blanchet, G. Faye & B. Ponsot, Phys. Rev. D 58, 124002 (1998) (R_i, g).
"""

from __future__ import annotations

from functools import lru_cache

import sympy as sp

from ..symbols import G, delta, m
from . import invariants as inv
from . import orbit_polynomials as op
from .current_two_pn import curl_on_newtonian_orbit
from .current_two_pn_g_volume import g_volume_term
# the cubic terms cubic_field_term does not include (an assembly of J_L at 2PN refuses, naming
# them, while this is not empty; empty since the g-volume terms are derived): kept in the
# sympy-free status module, which the table of contributions reads
from .current_two_pn_status import MISSING_TERMS
from .partie_finie import partie_finie_seed_integral

__all__ = ["cubic_field_term", "cubic_source_vector", "surface_term", "g_cross_potential", "CUBIC_TERMS",
           "MISSING_TERMS"]

#: The named pieces of the bracket (C1) that :func:`cubic_field_term` includes.
CUBIC_TERMS = ("U dtU dU", "Ub dU.dU", "Uk dkU dU", "dU dR^C", "dU dR^nc_self", "W^nc_self", "W^nc_delta")

_R1, _R2, _XV1, _XV2 = sp.symbols("r1 r2 xv1 xv2", positive=True)
_M1, _M2 = sp.symbols("m1 m2", positive=True)
_RADII = {"1": _R1, "2": _R2}
_XV = {"1": _XV1, "2": _XV2}


def _symbol(a: str, b: str) -> sp.Symbol:
    return sp.Symbol(str(inv.dot(a, b)))


_R12 = sp.Symbol("r12")
_IR12 = sp.Symbol("ir12")


def _dot(a: str, b: str) -> sp.Expr:
    """Dot product of two basis vectors: n1 = x - y1, n2 = x - y2, v1, v2."""
    if a > b:
        a, b = b, a
    if a[0] == "n" and b[0] == "n":
        if a == b:
            return _RADII[a[1]]**2
        return (_R1**2 + _R2**2 - _R12**2) / 2
    if a[0] == "n":
        return _XV[b[1]] - _symbol("y" + a[1], b)
    return _symbol(a, b)


def _contract(u: dict, w: dict) -> sp.Expr:
    return sp.expand(sum((f * g * _dot(p, q) for p, f in u.items() for q, g in w.items()), sp.Integer(0)))


def _scale(u: dict, factor) -> dict:
    return {w: sp.expand(f * factor) for w, f in u.items()}


def _add(*vectors: dict) -> dict:
    out: dict = {}
    for u in vectors:
        for w, f in u.items():
            out[w] = out.get(w, 0) + f
    return {w: sp.expand(f) for w, f in out.items()}


def _gradient(f: sp.Expr) -> dict:
    """grad_x f for f a function of r1, r2, x.v1, x.v2: n_A/r_A d/dr_A + v_C d/d(x.v_C)."""
    out = {}
    for body in ("1", "2"):
        out["n" + body] = sp.diff(f, _RADII[body]) / _RADII[body]
        out["v" + body] = sp.diff(f, _XV[body])
    return {w: sp.expand(g) for w, g in out.items() if g != 0}


def _potentials() -> dict:
    """U, grad U, d_t U, U_b and R_b (G = 1), as scalars or vectors in the basis n1, n2, v1, v2."""
    masses = {"1": _M1, "2": _M2}
    U = sum(masses[A] / _RADII[A] for A in "12")
    dU = _add(*({"n" + A: -masses[A] / _RADII[A]**3} for A in "12"))
    dtU = sum(masses[A] * _dot("n" + A, "v" + A) / _RADII[A]**3 for A in "12")
    Ub = _add(*({"v" + A: masses[A] / _RADII[A]} for A in "12"))
    compact = {"v1": _M1 * _M2 * (1 / _R1 - 1 / _R2) * _IR12, "v2": -_M1 * _M2 * (1 / _R1 - 1 / _R2) * _IR12}
    self_part = _add(*({"v" + A: -masses[A]**2 / (8 * _RADII[A]**2),
                        "n" + A: masses[A]**2 * _dot("n" + A, "v" + A) / (8 * _RADII[A]**4)} for A in "12"))
    return {"U": sp.expand(U), "dU": dU, "dtU": sp.expand(dtU), "Ub": Ub, "RC": compact, "Rself": self_part}


def _w_self_terms() -> dict:
    """The pointwise part of the W^nc self terms of Lambda^0b|eps^7/(16 pi G), times pi G, G = 1:

        -W_kl d_kl U_b - d_k U_b d_k W - d_k U_l d_b W_kl + d_k U_l d_k W_bl + d_k U_l d_l W_bk
        + (1/2) (d_k U_k + d_t U) d_b W + d_k U d_t W_bk,

    W_ij = -m_A^2 (delta_ij - n_A^i n_A^j)/(4 r_A^2) (the self part of (N3)), W = W_kk =
    -m_A^2/(2 r_A^2), d_t W_ij = -(v_A.grad) W_ij; d_k U_k + d_t U = 0 (U_k = G sum m v/r).
    Each field derivative acts on W only, the contracted vectors n_C = x - y_C held fixed."""
    masses = {"1": _M1, "2": _M2}
    total = []
    for A in "12":
        nA, rA, mass = "n" + A, _RADII[A], masses[A]**2
        c1, c2 = -mass / (4 * rA**2), mass / (4 * rA**4)
        grad1, grad2 = _gradient(c1), _gradient(c2)

        def along(d: dict, b: dict) -> dict:
            """(d.grad) W_bk b_k with b fixed."""
            return _add(_scale(b, _contract(d, grad1)), {nA: _contract(d, grad2) * _contract({nA: 1}, b)},
                        _scale(d, c2 * _contract({nA: 1}, b)), {nA: c2 * _contract(d, b)})

        def gradient_fixed(a: dict, b: dict) -> dict:
            """grad_b [W_kl a_k b_l] with a, b fixed."""
            return _add(_scale(grad1, _contract(a, b)), _scale(grad2, _contract({nA: 1}, a) * _contract({nA: 1}, b)),
                        _scale(a, c2 * _contract({nA: 1}, b)), _scale(b, c2 * _contract({nA: 1}, a)))

        for C in "12":
            nC, vC, rC, mC = "n" + C, "v" + C, _RADII[C], masses[C]
            weight = mC / rC**3
            cosine = _contract({nA: 1}, {nC: 1})
            total.append({vC: -mC * c2 * (3 * cosine**2 / rC**5 - rA**2 / rC**3)})
            total.append({vC: mC * mass * cosine / (rC**3 * rA**4)})
            total.append(_scale(gradient_fixed({nC: 1}, {vC: 1}), weight))
            total.append(_scale(along({nC: 1}, {vC: 1}), -weight))
            total.append(_scale(along({vC: 1}, {nC: 1}), -weight))
            total.append(_scale(along({"v" + A: 1}, {nC: 1}), weight))
    return _add(*total)


def _body_gradient(f: sp.Expr, A: str) -> dict:
    """grad_{y_A} f for f a function of r1, r2, r12 (symbol), x.v_C and y_A.v_C: n_A = x - y_A,
    grad_{y_A} r_A = -n_A/r_A, grad_{y1} r12 = (y1 - y2)/r12 = (n2 - n1)/r12."""
    sign = 1 if A == "1" else -1
    d12 = sp.diff(f, _R12) / _R12
    out = _add({"n" + A: -sp.diff(f, _RADII[A]) / _RADII[A]}, {"n2": sign * d12, "n1": -sign * d12},
               *({w: sp.diff(f, _symbol("y" + A, w))} for w in ("v1", "v2")))
    return {w: c for w, c in out.items() if c != 0}


def _body_directional(vector: dict, direction: dict, A: str) -> dict:
    """(d.grad_{y_A}) of a vector field sum_w c_w w (grad_{y_A} n_A = -delta)."""
    total: dict = {}
    for w, c in vector.items():
        total = _add(total, {w: _contract(direction, _body_gradient(c, A))})
        if w == "n" + A:
            total = _add(total, _scale(direction, -c))
    return total


def g_cross_potential() -> tuple:
    """The cross part of R^nc (N5) without G^2 m1 m2, as ((basis vector, scalar), ...):
    [((3/2) v1 - 2 v2).d_1 d_2i + ((3/2) v2 - 2 v1).d_2 d_1i] g, g = ln(r1 + r2 + r12), with
    the symbol r12 (the scalars keep powers of 1/(r1 + r2 + r12)).

    Example
    -------
    >>> sorted(w for w, _ in g_cross_potential())
    ['n1', 'n2', 'v1', 'v2']
    """
    g = sp.log(_R1 + _R2 + _R12)
    alpha = {"v1": sp.Rational(3, 2), "v2": -2}
    beta = {"v2": sp.Rational(3, 2), "v1": -2}
    out = _add(_body_directional(_body_gradient(g, "2"), alpha, "1"),
               _body_directional(_body_gradient(g, "1"), beta, "2"))
    return tuple(sorted((w, sp.factor(c)) for w, c in out.items() if c != 0))


def _gradient_contraction(a: dict, R: dict) -> dict:
    """a_k d_b R_k for R = sum_w f_w w_k (d_b n_A,k = delta_bk)."""
    out = []
    for w, f in R.items():
        out.append(_scale(_gradient(f), _contract(a, {w: 1})))
        if w[0] == "n":
            out.append(_scale(a, f))
    return _add(*out)


@lru_cache(maxsize=None)
def cubic_source_vector(term: str) -> tuple:
    """One named piece of the bracket (C1) without its 1/(pi G) and with G = 1: Sigma_b as
    ((basis vector, sympy scalar), ...), basis n1 = x - y1, n2 = x - y2, v1, v2; scalars in
    r1, r2, xv1 = x.v1, xv2 = x.v2, the masses m1, m2 and the body invariants (symbols named
    as the generators of :mod:`stfalgebra.moments.invariants`; r12 and ir12 = 1/r12).

    Example
    -------
    >>> dict(cubic_source_vector("Ub dU.dU"))["v2"].coeff(_M1**2)     # -(1/2) U_b(2) |dU(1)|^2
    -m2/(2*r1**4*r2)
    """
    p = _potentials()
    if term == "U dtU dU":
        out = _scale(p["dU"], sp.Rational(3, 2) * p["U"] * p["dtU"])
    elif term == "Ub dU.dU":
        out = _scale(p["Ub"], -_contract(p["dU"], p["dU"]) / 2)
    elif term == "Uk dkU dU":
        out = _scale(p["dU"], _contract(p["Ub"], p["dU"]))
    elif term == "dU dR^C":
        out = _scale(_gradient_contraction(p["dU"], p["RC"]), 2)
    elif term == "dU dR^nc_self":
        out = _scale(_gradient_contraction(p["dU"], p["Rself"]), 2)
    elif term == "W^nc_self":
        out = _w_self_terms()
    else:
        raise ValueError(f"unknown cubic term {term!r}; known: {CUBIC_TERMS}")
    return tuple(sorted((w, f) for w, f in out.items() if f != 0))


def _ring_coefficient(expression: sp.Expr):
    return inv.RING.from_expr(expression) if expression.free_symbols else inv.RING(sp.Rational(expression))


def _probe_vectors(vector: tuple) -> dict:
    """Sigma_b in the probe basis y1, y2, v1, v2 (n_A = x - y_A: the x part dropped)."""
    out: dict = {}
    for w, f in vector:
        target, sign = (("y" + w[1]), -1) if w[0] == "n" else (w, 1)
        out[target] = out.get(target, 0) + sign * f
    return {w: sp.expand(f) for w, f in out.items()}


def _delta_part(l: int) -> dict:
    """The delta parts of the W^nc terms: -W_kl d_kl U_b + (1/2) W Delta U_b with
    d_kl(1/r_C) = Pf(...) - (4 pi/3) delta_kl delta_C and Delta(1/r_C) = -4 pi delta_C give
    -(2 pi/3) (W^nc)_C m_C v_C delta_C (G = 1), with the Hadamard values (N4)
    (W^nc)_1 = -m2^2/(2 r12^2) + m1 m2/r12^2 (body 2 by exchange)."""
    out: dict = {}
    key = (0, 0, 0, 0, 0, 0)
    for C, own, other in (("1", (1, 0), (0, 1)), ("2", (0, 1), (1, 0))):
        probe = inv.dot("k", "y" + C)**l * inv.INV_R12**2 * sp.Rational(-2, 3)
        for masses, factor in (((own[0] + 2 * other[0], own[1] + 2 * other[1]), sp.Rational(-1, 2)), ((2, 1) if C == "1" else (1, 2), 1)):
            form = out.setdefault(masses, {}).setdefault(key, {})
            form["v" + C] = form.get("v" + C, inv.RING(0)) + probe * factor
    return out


@lru_cache(maxsize=None)
def _integrated(l: int, term: str) -> dict:
    """{(mass powers (i, j)): {key: {w: FP int (k.x)^l C_w / pi}}} for one term of (C1)."""
    if term == "W^nc_delta":
        return _delta_part(l)
    return _integrate_vector(l, cubic_source_vector(term))


def _integrate_vector(l: int, vector: tuple) -> dict:
    """{(mass powers (i, j)): {key: {w: FP int (k.x)^l C_w / pi}}} for a source vector in the
    form of :func:`cubic_source_vector` (any number of potentials)."""
    out: dict = {}
    for w, (p, q, a, b, i, j), coefficient in _monomials(vector):
        seeds = partie_finie_seed_integral(l, ("v1",) * p + ("v2",) * q, a, b)
        by_key = out.setdefault((i, j), {})
        for key, value in seeds.items():
            form = by_key.setdefault(key, {})
            form[w] = form.get(w, inv.RING(0)) + coefficient * value
    return out


@lru_cache(maxsize=None)
def _monomials(vector: tuple) -> tuple:
    """The terms of a source vector (the same for every l) as (w, (p, q, a, b, i, j),
    invariants coefficient): C_w = sum coefficient (x.v1)^p (x.v2)^q r1^a r2^b m1^i m2^j."""
    out = []
    for w, component in _probe_vectors(vector).items():
        for piece in sp.Add.make_args(component):
            powers = piece.as_powers_dict()
            a, b = int(powers.get(_R1, 0)), int(powers.get(_R2, 0))
            p, q = int(powers.get(_XV1, 0)), int(powers.get(_XV2, 0))
            i, j = int(powers.get(_M1, 0)), int(powers.get(_M2, 0))
            rest = piece / (_R1**a * _R2**b * _XV1**p * _XV2**q * _M1**i * _M2**j)
            out.append((w, (p, q, a, b, i, j), _ring_coefficient(sp.expand(rest))))
    return tuple(out)


def _on_orbit(l: int, term: str) -> dict:
    """{key: ring element of orbit_polynomials} (the curl on the orbit, masses included, /l)."""
    return _curl_on_orbit(l, _integrated(l, term))


def _curl_on_orbit(l: int, integrated: dict) -> dict:
    x1 = op.from_expression(m * (1 + delta) / 2)
    x2 = op.from_expression(m * (1 - delta) / 2)
    out: dict = {}
    for (i, j), by_key in integrated.items():
        masses = x1**i * x2**j
        for key, form in by_key.items():
            value = curl_on_newtonian_orbit(inv.probe_curl(form)) * masses
            out[key] = out.get(key, op.RING(0)) + value
    return {key: op.reduce_mass_difference(value) * sp.Rational(1, l) for key, value in out.items()}


def _finite(l: int, terms) -> object:
    total: dict = {}
    for term in terms:
        for key, value in _on_orbit(l, term).items():
            total[key] = total.get(key, op.RING(0)) + value
    finite = (0, 0, 0, 0, 0, 0)
    for key, value in total.items():
        if key != finite and _orbit_nonzero(value):
            raise ArithmeticError(f"a regularisation constant or pole survives on the orbit: {key}: {value}")
    return total.get(finite, op.RING(0))


def _orbit_nonzero(value) -> bool:
    expression = sp.expand(value.as_expr().subs(sp.Symbol("ir", positive=True), 1 / sp.Symbol("r", positive=True)))
    return expression != 0


@lru_cache(maxsize=None)
def cubic_field_term(l: int) -> object:
    """The cubic (G^2 m_A m_B m_C) non-compact terms of J_L at 2PN (module docstring: the pieces
    :data:`CUBIC_TERMS`, the surface term and the g-volume terms), on the Newtonian
    centre-of-mass orbit.

    Returns the coefficient of ell.k/c^4 in J_L k_L, (k.x)^(l-1) included: a ring element of
    :mod:`stfalgebra.moments.orbit_polynomials` (generators G, m, nu, delta, r, ir = 1/r, kx).

    Raises ArithmeticError if a pole at a body, ln r12 or ln r0 survives on the orbit.
    """
    if isinstance(l, bool) or not isinstance(l, int) or l < 1:
        raise ValueError(f"current moments need l >= 1, got {l!r}")
    return _finite(l, CUBIC_TERMS) * op.from_expression(G**2) + surface_term(l) + g_volume_term(l)


# ---------------------------------------------------------------- the surface term at infinity
# Far-zone series: x = n/t (t = 1/|x|); a scalar is {power of t: invariants element}, a vector
# {power of t: {basis: element}} with the basis k (standing for n here), y1, y2, v1, v2. In the
# invariants ring the slot k holds n (so "ky1" is n.y1, and k.k = n.n = 1 never occurs).
def _series_product(f: dict, g: dict, order: int) -> dict:
    out: dict = {}
    for p, a in f.items():
        for q, b in g.items():
            if p + q <= order:
                out[p + q] = out.get(p + q, inv.RING(0)) + a * b
    return out


def _series_add(*terms) -> dict:
    out: dict = {}
    for factor, f in terms:
        for p, a in f.items():
            out[p] = out.get(p, inv.RING(0)) + a * factor
    return out


def _power_series(coefficients, argument: dict, order: int) -> dict:
    total, power = {}, {0: inv.RING(1)}
    for coefficient in coefficients:
        total = _series_add((1, total), (coefficient, power))
        power = _series_product(power, argument, order)
        if not power:
            break
    return total


def _vector_times(scalar: dict, vector: dict, order: int) -> dict:
    return {w: _series_product(scalar, f, order) for w, f in vector.items()}


def _vector_add(*terms) -> dict:
    out: dict = {}
    for factor, vector in terms:
        for w, f in vector.items():
            out[w] = _series_add((1, out.get(w, {})), (factor, f))
    return out


def _far_gradient(f: dict, body: str) -> dict:
    """grad_{y_A} of a far-zone scalar, coefficient by coefficient (t does not depend on y_A)."""
    out: dict = {}
    for p, a in f.items():
        for w, c in inv.gradient(a, body).items():
            out.setdefault(w, {})[p] = out.setdefault(w, {}).get(p, inv.RING(0)) + c
    return out


def _far_directional(f: dict, direction: dict, body: str) -> dict:
    """(sum_w c_w w).grad_{y_A} f, the direction a constant combination of base vectors."""
    out: dict = {}
    for w, c in direction.items():
        for p, a in f.items():
            out[p] = out.get(p, inv.RING(0)) + c * inv.directional_derivative(a, w, body)
    return out


@lru_cache(maxsize=None)
def _far_fields(order: int) -> dict:
    """Far-zone series (through t^order) of the potentials, G = 1, per body: 1/r_A, n_A, and the
    pieces of R (rho_C, rho_A self, rho_X = the g part), without the masses."""
    t1 = {1: inv.RING(1)}
    out = {}
    binomial = {e: [sp.binomial(sp.Rational(e, 2), j) for j in range(order + 1)] for e in (-1, -2, 1)}
    for body in ("y1", "y2"):
        u = {1: -2 * inv.dot("k", body), 2: inv.dot(body, body)}
        inverse = _series_product(t1, _power_series(binomial[-1], u, order), order)       # 1/r_A
        inverse_square = _series_product(_series_product(t1, t1, order), _power_series(binomial[-2], u, order), order)
        root = _power_series(binomial[-1], u, order)                                      # r/r_A
        unit = {"k": root, body: _series_product({1: inv.RING(-1)}, root, order)}          # n_A
        speed = "v" + body[1]
        along = _series_product(root, {0: inv.dot("k", speed), 1: -inv.dot(body, speed)}, order)  # n_A.v_A
        # self part of R^nc: -(v_A - (n_A.v_A) n_A)/(8 r_A^2)
        self_part = _vector_add((sp.Rational(-1, 8), {speed: inverse_square}),
                                (sp.Rational(1, 8), _vector_times(_series_product(inverse_square, along, order), unit, order)))
        out[body] = {"inverse": inverse, "self": self_part, "radius_minus_one": _power_series(binomial[1], u, order)}
    # g = ln(2r) + ln(1 + X), X = ((r1 - r)/r + (r2 - r)/r)/2 + t r12/2; only body derivatives of g enter
    s1 = _series_add((1, out["y1"]["radius_minus_one"]), (-1, {0: inv.RING(1)}))
    s2 = _series_add((1, out["y2"]["radius_minus_one"]), (-1, {0: inv.RING(1)}))
    X = _series_add((sp.Rational(1, 2), s1), (sp.Rational(1, 2), s2), (sp.Rational(1, 2), {1: inv.R12}))
    logarithm = [sp.Integer(0)] + [sp.Rational((-1)**(m + 1), m) for m in range(1, order + 1)]
    g = _power_series(logarithm, X, order)
    alpha = {"v1": sp.Rational(3, 2), "v2": -2}
    beta = {"v2": sp.Rational(3, 2), "v1": -2}
    cross: dict = {}
    for first, second, direction in (("y1", "y2", alpha), ("y2", "y1", beta)):
        # direction^k d_{first k} d_{second i} g: the free index i from the gradient along second
        for w, f in _far_gradient(g, second).items():
            cross = _vector_add((1, cross), (1, {w: _far_directional(f, direction, first)}))
            if w == first:   # d_{first k} of the base vector y_first itself: delta_ki
                cross = _vector_add((1, cross), (1, {v: {p: a * c for p, a in f.items()} for v, c in direction.items()}))
    compact = _series_add((1, out["y1"]["inverse"]), (-1, out["y2"]["inverse"]))
    out["compact"] = {"v1": {p: a * inv.INV_R12 for p, a in compact.items()},
                      "v2": {p: -a * inv.INV_R12 for p, a in compact.items()}}
    out["cross"] = cross
    return out


#: The far-zone truncation order the surface terms of l <= 8 share (:func:`surface_term`).
_SHARED_FAR_ORDER = 9


@lru_cache(maxsize=None)
def _surface_vector(order: int) -> dict:
    """F_b = U R_b + U^2 U_b/2 through t^order, G = 1, as {(i, j): vector} by mass powers."""
    fields = _far_fields(order)
    u = {"1": fields["y1"]["inverse"], "2": fields["y2"]["inverse"]}
    out: dict = {}

    def add(masses, vector):
        out[masses] = _vector_add((1, out.get(masses, {})), (1, vector))

    for A, power in (("1", (1, 0)), ("2", (0, 1))):
        both = _vector_add((1, fields["compact"]), (1, fields["cross"]))
        add((power[0] + 1, power[1] + 1), _vector_times(u[A], both, order))
        for B, self_power in (("1", (2, 0)), ("2", (0, 2))):
            add((power[0] + self_power[0], power[1] + self_power[1]), _vector_times(u[A], fields["y" + B]["self"], order))
        for B, second in (("1", (1, 0)), ("2", (0, 1))):
            product = _series_product(u[A], u[B], order)
            for C, third in (("1", (1, 0)), ("2", (0, 1))):
                masses = (power[0] + second[0] + third[0], power[1] + second[1] + third[1])
                add(masses, {"v" + C: {p: a * sp.Rational(1, 2) for p, a in _series_product(product, u[C], order).items()}})
    return out


_N_NAMES = {"kk": None, "ky1": "y1", "ky2": "y2", "kv1": "v1", "kv2": "v2"}


def _angular_probe_integral(f, l: int):
    """int dOmega (k.n)^l f(n) / pi, f an invariants element with n in the slot k; the result
    with k the null probe."""
    from .partie_finie import sphere_average

    names = [str(generator) for generator in inv.RING.gens]
    slots = {"ky1": 1, "ky2": 2, "kv1": 3, "kv2": 4}
    total = inv.RING(0)
    for monomial, coefficient in f.terms():
        exponents = [0, 0, 0, 0, 0]
        exponents[0] = l
        rest = list(monomial)
        for index, name in enumerate(names):
            if name in slots and monomial[index]:
                exponents[slots[name]] += monomial[index]
                rest[index] = 0
        if monomial[names.index("kk")]:
            raise AssertionError("n.n in a far-zone coefficient")
        total += 4 * inv.RING({tuple(rest): coefficient}) * sphere_average(tuple(exponents))
    return inv.on_null_cone(total)


@lru_cache(maxsize=None)
def surface_term(l: int) -> object:
    """The surface term at infinity of -(1/(pi G)) Delta(U R_b + U^2 U_b/2) in J_L k_L, on the
    Newtonian centre-of-mass orbit: the coefficient of ell.k/c^4, (k.x)^(l-1) included.

    For a harmonic weight W_b = (k.x)^(l-1) (k cross x)_b of degree l (null k),
    FP int W_b Delta F_b = -(2l+1) int dOmega W_b(n) F_b^(-l-1)(n), F^(-l-1) the coefficient of
    |x|^(-l-1) in the far-zone expansion of F (the regulator |x|^B: FP_B B (B + 2l + 1)
    int |x|^(B-2) W F; the Laplacian taken in the sense of distributions, whose integral
    against the harmonic W has no contribution at the bodies). With
    (k.n)^(l-1) (k cross n).w = (1/l) eps_abc k_c d/dk_a (k.n)^l w_b the term is
    (2l+1)/l curl {w: int dOmega (k.n)^l F_w^(-l-1)}. R = R^C + R^nc including the cross part
    (body derivatives of the far-zone series of g = ln(r1 + r2 + r12)).
    """
    if isinstance(l, bool) or not isinstance(l, int) or l < 1:
        raise ValueError(f"current moments need l >= 1, got {l!r}")
    x1 = op.from_expression(m * (1 + delta) / 2)
    x2 = op.from_expression(m * (1 - delta) / 2)
    total = op.RING(0)
    # the coefficient of t^(l+1) does not depend on the truncation order: the l of a mode set
    # (l <= 8) share one expansion
    for (i, j), vector in _surface_vector(max(l + 1, _SHARED_FAR_ORDER)).items():
        form = {w: _angular_probe_integral(f.get(l + 1, inv.RING(0)), l) * (2 * l + 1)
                for w, f in vector.items() if w != "k"}
        total += curl_on_newtonian_orbit(inv.probe_curl(form)) * x1**i * x2**j
    return op.reduce_mass_difference(total) * sp.Rational(1, l) * op.from_expression(G**2)
