"""The 2PN near-zone field of two point masses in harmonic coordinates, through its potentials.

The harmonic-gauge metric is written with the gothic deviation h^{ab} = sqrt(-g) g^{ab} - eta^{ab}
in terms of elementary retarded potentials (Blanchet, Faye & Ponsot, Phys. Rev. D 58, 124002
(1998); Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 5.2; quoted from memory and checked in
the tests against the relaxed field equations):

    h^00 = -4 V/c^2 - 2 (W + 4 V^2)/c^4,   h^0i = -4 V_i/c^3 - 8 (R_i + V V_i)/c^5,
    h^ij = -4 (W_ij - delta_ij W/2)/c^4,                                              (N1)

    Box V = -4 pi G sigma,   Box V_i = -4 pi G sigma_i,
    Box W_ij = -4 pi G (sigma_ij - delta_ij sigma_kk) - d_i V d_j V,
    Box R_i = -4 pi G (V sigma_i - V_i sigma) - 2 d_k V d_i V_k - (3/2) d_t V d_i V,   (N2)

with sigma = (T^00 + T^ii)/c^2, sigma_i = T^0i/c, sigma_ij = T^ij and W = W_kk. This module
gives them for two point masses, as explicit functions of the field point x (components) and
of the bodies (positions y_A, velocities v_A, masses m_A):

* V through 1PN: V = U + (1/(2 c^2)) d_t^2 X, U = G sum_A mu_A/r_A with the 1PN weights
  mu_A = m_A [1 + (3/2 v_A^2 - G m_B/r12)/c^2] of sigma, X = G sum_A m_A r_A (Delta X = 2 U);
  the expansion of the retarded integral (common practice).
* V_i = G sum_A m_A v_A^i/r_A (Newtonian).
* W_ij (Newtonian): the compact part G sum_A m_A (v_A^i v_A^j - delta_ij v_A^2)/r_A and the
  non-compact part, the Poisson integral of -d_i U d_j U,

      W^nc_ij = -G^2 [ m1^2 (delta_ij - n1_i n1_j)/(4 r1^2) + m2^2 (1 <-> 2)
                       + m1 m2 (d_{1i} d_{2j} + d_{1j} d_{2i}) g ],   g = ln(r1 + r2 + r12),   (N3)

  with d_{Ai} = d/dy_A^i. Derivation: Delta[(delta_ij - n_i n_j)/(4 r^2)] = n_i n_j/r^4 (from
  Delta(x_i x_j r^-4) = 2 delta_ij r^-4 - 4 n_i n_j r^-4), and Delta g = 1/(r1 r2) (tested),
  so Delta d_{1i} d_{2j} g = d_i(1/r1) d_j(1/r2); both decay at infinity and carry no delta
  source, hence they are the Poisson integrals.
* R_i (Newtonian order, the part of h^0i at c^-5): the compact part, from the regularised
  products (V sigma_i - V_i sigma) at the bodies,

      R^C_i = G^2 m1 m2 (v1^i - v2^i) [1/r1 - 1/r2] / r12,

  and the non-compact part, the Poisson integral of -2 d_k U d_i U_k - (3/2) d_t U d_i U,

      R^nc_i = -G^2 [ m1^2 (v1^i - (n1.v1) n1^i)/(8 r1^2) + m2^2 (1 <-> 2) ]
               + G^2 m1 m2 [ ((3/2) v1 - 2 v2)^k d_{1k} d_{2i} + ((3/2) v2 - 2 v1)^k d_{2k} d_{1i} ] g.  (N5)

  Hadamard value at body 1 (body 2 by exchange): the m1^2 self part has no r1^0 term, the m2^2
  one is smooth there; at x -> y1, (d_{1k} d_{2i} g)_1 = (2 n12_i n12_k - delta_ik)/(2 r12^2)
  (bounded there: the limit averaged over the directions), and (1/r1)_1 = 0, so

      (R_i)_1 = -G^2 m1 m2 (v1 - v2)_i/r12^2
                - G^2 m1 m2 [2 (n12.(v1 + v2)) n12_i - (v1 + v2)_i]/(4 r12^2)
                - G^2 m2^2 [v2_i - (n12.v2) n12_i]/(8 r12^2).                             (N6)

  Derivation: the self part of the source is -(1/2) G^2 m1^2 v1^k n1_k n1_i/r1^4 (from
  d_t(1/r1) = (n1.v1)/r1^2), integrated with the kernel of (N3); the cross part is
  G^2 m1 m2 times the operator above applied to 1/(r1 r2) = Delta g, since
  d_k(1/r1) d_i(1/r2) = d_{1k} d_{2i} [1/(r1 r2)] and d_t(1/r_A) = (v_A . d_A)(1/r_A).

The quantities at the bodies are Hadamard partie-finie values (F)_A: the angular average of
the r_A^0 coefficient of the expansion of F around y_A. At body 1 (body 2 by exchange):

    (U)_1 = G m2/r12 (Newtonian),        (V_i)_1 = G m2 v2^i/r12,
    (d_t^2 X)_1 = G m2 [(v2^2 - (n12.v2)^2)/r12 - G m1/r12^2],
    (W_kk)_1 = -2 G m2 v2^2/r12 - G^2 m2^2/(2 r12^2) + G^2 m1 m2/r12^2,                 (N4)

(derived from the forms above: the self parts are pure powers of r1 and have no r1^0 term;
(d_t^2 X)_1 uses the Newtonian acceleration a2 = G m1 n12/r12^2; the cross part of W_kk is
-G^2 m1 m2 [1/(r1 r2) - 1/(r1 r12) - 1/(r2 r12)], from 2 d_1.d_2 g = Delta g - Delta_1 g -
Delta_2 g and the symmetry of g in its three points). Tested against direct numerical Hadamard
extraction from the explicit potentials.

X^hat (the c^-6 part of g_00) is not needed at 2PN: it enters the point-particle weights at 3PN.

**Conventions**: harmonic coordinates; r_A = |x - y_A|, n_A = (x - y_A)/r_A, r12 = |y1 - y2|,
n12 = (y1 - y2)/r12; signature (-+++), x^0 = c t.

Example
-------
>>> import sympy as sp
>>> from stfalgebra.moments.near_zone import auxiliary_g
>>> x, y1, y2 = (0, 0, 0), (1, 0, 0), (0, 1, 0)
>>> sp.nsimplify(sp.exp(auxiliary_g(x, y1, y2)))
sqrt(2) + 2

References
----------
L. Blanchet, G. Faye & B. Ponsot, Phys. Rev. D 58, 124002 (1998) (the 2PN potentials of point
masses and the function g); L. Blanchet, T. Damour & B. R. Iyer, Phys. Rev. D 51, 5360 (1995);
L. Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 5.2 (equation numbers not checked).
"""

from __future__ import annotations

from typing import NamedTuple, Sequence

import sympy as sp

__all__ = [
    "PointMass", "auxiliary_g", "newtonian_potential", "superpotential", "potential_v",
    "vector_potential", "w_potential", "w_noncompact", "r_noncompact", "r_potential",
    "r_regularised_value", "regularised_values",
]


class PointMass(NamedTuple):
    """A point mass: mass, position, velocity (3-sequences of sympy expressions or numbers)."""

    mass: object
    position: Sequence[object]
    velocity: Sequence[object]


def _vector(values) -> tuple:
    values = tuple(sp.sympify(v) for v in values)
    if len(values) != 3:
        raise ValueError(f"a 3-vector needs three components, got {values!r}")
    return values


def _distance(a, b) -> sp.Expr:
    return sp.sqrt(sum((p - q) ** 2 for p, q in zip(a, b)))


def auxiliary_g(x, y1, y2) -> sp.Expr:
    """g = ln(r1 + r2 + r12): Delta_x g = 1/(r1 r2), symmetric in its three points.

    Example
    -------
    >>> import sympy as sp
    >>> auxiliary_g((0, 0, 0), (3, 0, 0), (0, 4, 0))
    log(12)
    """
    x, y1, y2 = _vector(x), _vector(y1), _vector(y2)
    return sp.log(_distance(x, y1) + _distance(x, y2) + _distance(y1, y2))


def newtonian_potential(x, bodies: Sequence[PointMass], G=sp.Symbol("G", positive=True)) -> sp.Expr:
    """U = G sum_A m_A / r_A (the weights are the caller's: pass 1PN weights for V at 1PN)."""
    x = _vector(x)
    return sum((G * body.mass / _distance(x, _vector(body.position)) for body in bodies), sp.Integer(0))


def superpotential(x, bodies: Sequence[PointMass], G=sp.Symbol("G", positive=True)) -> sp.Expr:
    """X = G sum_A m_A r_A, with Delta X = 2 U."""
    x = _vector(x)
    return sum((G * body.mass * _distance(x, _vector(body.position)) for body in bodies), sp.Integer(0))


def _second_time_derivative_of_distance(x, body: PointMass, acceleration) -> sp.Expr:
    """d_t^2 |x - y(t)| at fixed x: (v^2 - (n.v)^2)/r - a.n, n = (x - y)/r."""
    x, y, v, a = _vector(x), _vector(body.position), _vector(body.velocity), _vector(acceleration)
    r = _distance(x, y)
    n = [(p - q) / r for p, q in zip(x, y)]
    n_dot_v = sum(p * q for p, q in zip(n, v))
    return (sum(q**2 for q in v) - n_dot_v**2) / r - sum(p * q for p, q in zip(a, n))


def potential_v(x, bodies: Sequence[PointMass], c=sp.Symbol("c", positive=True),
                G=sp.Symbol("G", positive=True)) -> sp.Expr:
    """V through 1PN for two point masses: U with the 1PN weights of sigma, plus d_t^2 X/(2 c^2).

    The accelerations inside d_t^2 X are the Newtonian ones (the term is already 1PN).
    """
    if len(bodies) != 2:
        raise ValueError(f"two bodies expected, got {len(bodies)}")
    (m1, y1, v1), (m2, y2, v2) = bodies
    y1, y2, v1, v2 = _vector(y1), _vector(y2), _vector(v1), _vector(v2)
    r12 = _distance(y1, y2)
    weights = []
    accelerations = []
    for (mass, v), (other, y_self, y_other) in (((m1, v1), (m2, y1, y2)), ((m2, v2), (m1, y2, y1))):
        v_squared = sum(q**2 for q in v)
        weights.append(mass * (1 + (sp.Rational(3, 2) * v_squared - G * other / r12) / c**2))
        accelerations.append([-G * other * (p - q) / r12**3 for p, q in zip(y_self, y_other)])
    x = _vector(x)
    u = sum((G * w / _distance(x, y) for w, y in zip(weights, (y1, y2))), sp.Integer(0))
    retardation = sum((G * body.mass * _second_time_derivative_of_distance(x, body, acc)
                       for body, acc in zip(bodies, accelerations)), sp.Integer(0))
    return u + retardation / (2 * c**2)


def vector_potential(x, bodies: Sequence[PointMass], G=sp.Symbol("G", positive=True)) -> tuple:
    """V_i = G sum_A m_A v_A^i / r_A (Newtonian)."""
    x = _vector(x)
    return tuple(
        sum((G * body.mass * _vector(body.velocity)[i] / _distance(x, _vector(body.position))
             for body in bodies), sp.Integer(0))
        for i in range(3))


def w_noncompact(x, bodies: Sequence[PointMass], G=sp.Symbol("G", positive=True)) -> sp.Matrix:
    """The non-compact part (N3) of W_ij, the Poisson integral of -d_i U d_j U."""
    if len(bodies) != 2:
        raise ValueError(f"two bodies expected, got {len(bodies)}")
    x = _vector(x)
    (m1, y1, _), (m2, y2, _) = bodies
    y1, y2 = _vector(y1), _vector(y2)
    a = sp.symbols("a1:4", real=True)
    b = sp.symbols("b1:4", real=True)
    g = auxiliary_g(x, a, b)
    values = {**dict(zip(a, y1)), **dict(zip(b, y2))}
    out = sp.zeros(3, 3)
    for i in range(3):
        for j in range(3):
            cross = (sp.diff(g, a[i], b[j]) + sp.diff(g, a[j], b[i])).xreplace(values)
            self_terms = 0
            for mass, y in ((m1, y1), (m2, y2)):
                r = _distance(x, y)
                n_i, n_j = (x[i] - y[i]) / r, (x[j] - y[j]) / r
                self_terms += mass**2 * ((1 if i == j else 0) - n_i * n_j) / (4 * r**2)
            out[i, j] = -G**2 * (self_terms + m1 * m2 * cross)
    return out


def w_potential(x, bodies: Sequence[PointMass], G=sp.Symbol("G", positive=True)) -> sp.Matrix:
    """W_ij (Newtonian): compact part plus the non-compact part (N3)."""
    x = _vector(x)
    out = w_noncompact(x, bodies, G)
    for body in bodies:
        y, v = _vector(body.position), _vector(body.velocity)
        r = _distance(x, y)
        v_squared = sum(q**2 for q in v)
        for i in range(3):
            for j in range(3):
                out[i, j] += G * body.mass * (v[i] * v[j] - (v_squared if i == j else 0)) / r
    return out


def r_noncompact(x, bodies: Sequence[PointMass], G=sp.Symbol("G", positive=True)) -> tuple:
    """The non-compact part (N5) of R_i, the Poisson integral of -2 d_k U d_i U_k - (3/2) d_t U d_i U.

    Example
    -------
    >>> import sympy as sp
    >>> bodies = [PointMass(1, (0, 0, 0), (0, 1, 0)), PointMass(1, (2, 0, 0), (0, -1, 0))]
    >>> sp.simplify(r_noncompact((0, 1, 0), bodies, G=1)[1])
    1/50
    """
    if len(bodies) != 2:
        raise ValueError(f"two bodies expected, got {len(bodies)}")
    x = _vector(x)
    (m1, y1, v1), (m2, y2, v2) = bodies
    y1, y2, v1, v2 = _vector(y1), _vector(y2), _vector(v1), _vector(v2)
    a = sp.symbols("a1:4", real=True)
    b = sp.symbols("b1:4", real=True)
    g = auxiliary_g(x, a, b)
    values = {**dict(zip(a, y1)), **dict(zip(b, y2))}
    half = sp.Rational(3, 2)
    along_one = [half * p - 2 * q for p, q in zip(v1, v2)]
    along_two = [half * q - 2 * p for p, q in zip(v1, v2)]
    out = []
    for i in range(3):
        cross = sum(along_one[k] * sp.diff(g, a[k], b[i]) + along_two[k] * sp.diff(g, b[k], a[i])
                    for k in range(3))
        self_terms = 0
        for mass, y, v in ((m1, y1, v1), (m2, y2, v2)):
            r = _distance(x, y)
            n = [(p - q) / r for p, q in zip(x, y)]
            n_dot_v = sum(p * q for p, q in zip(n, v))
            self_terms += mass**2 * (v[i] - n_dot_v * n[i]) / (8 * r**2)
        out.append(G**2 * (m1 * m2 * cross.xreplace(values) - self_terms))
    return tuple(out)


def r_potential(x, bodies: Sequence[PointMass], G=sp.Symbol("G", positive=True)) -> tuple:
    """R_i (Newtonian order) of two point masses: the compact part R^C_i plus (N5)."""
    x = _vector(x)
    (m1, y1, v1), (m2, y2, v2) = bodies
    y1, y2, v1, v2 = _vector(y1), _vector(y2), _vector(v1), _vector(v2)
    r12 = _distance(y1, y2)
    compact = G**2 * m1 * m2 / r12 * (1 / _distance(x, y1) - 1 / _distance(x, y2))
    return tuple(compact * (p - q) + nc for p, q, nc in zip(v1, v2, r_noncompact(x, bodies, G)))


def r_regularised_value(bodies: Sequence[PointMass], G=sp.Symbol("G", positive=True)) -> tuple:
    """(R_i)_1, the Hadamard value (N6) of R_i at body 1 (exchange the bodies for body 2).

    Example
    -------
    >>> bodies = [PointMass(1, (0, 0, 0), (0, 1, 0)), PointMass(1, (2, 0, 0), (0, -1, 0))]
    >>> r_regularised_value(bodies, G=1)
    (0, -15/32, 0)
    """
    (m1, y1, v1), (m2, y2, v2) = bodies
    y1, y2, v1, v2 = _vector(y1), _vector(y2), _vector(v1), _vector(v2)
    r12 = _distance(y1, y2)
    n12 = [(p - q) / r12 for p, q in zip(y1, y2)]
    total = [p + q for p, q in zip(v1, v2)]
    along = sum(p * q for p, q in zip(n12, total))
    n12_v2 = sum(p * q for p, q in zip(n12, v2))
    return tuple(sp.simplify(-G**2 * m1 * m2 * (p - q) / r12**2
                             - G**2 * m1 * m2 * (2 * along * n - t) / (4 * r12**2)
                             - G**2 * m2**2 * (q - n12_v2 * n) / (8 * r12**2))
                 for p, q, n, t in zip(v1, v2, n12, total))


def regularised_values(G=sp.Symbol("G", positive=True), c=sp.Symbol("c", positive=True)) -> dict:
    """Hadamard partie-finie values (N4) at body 1, in terms of the body invariants.

    Returns
    -------
    dict
        Keys ``"U"`` (Newtonian), ``"V"`` (through 1PN), ``"Vi_v1"`` ((V_i)_1 v1^i),
        ``"W"`` ((W_kk)_1), as sympy expressions in the symbols returned under ``"symbols"``:
        m1, m2, r12, v1v1, v2v2, v1v2 (dot products) and n12v2 = n12.v2. Body 2 follows by
        exchanging the labels (n12 -> -n12).

    Example
    -------
    >>> values = regularised_values()
    >>> values["U"]
    G*m2/r12
    """
    m1, m2 = sp.symbols("m1 m2", positive=True)
    r12 = sp.Symbol("r12", positive=True)
    v1v1, v2v2, v1v2, n12v2 = sp.symbols("v1v1 v2v2 v1v2 n12v2", real=True)
    u = G * m2 / r12
    weight2 = m2 * (1 + (sp.Rational(3, 2) * v2v2 - G * m1 / r12) / c**2)
    retardation = G * m2 * ((v2v2 - n12v2**2) / r12 - G * m1 / r12**2)
    return {
        "U": u,
        "V": G * weight2 / r12 + retardation / (2 * c**2),
        "Vi_v1": G * m2 * v1v2 / r12,
        "W": -2 * G * m2 * v2v2 / r12 - G**2 * m2**2 / (2 * r12**2) + G**2 * m1 * m2 / r12**2,
        "symbols": (m1, m2, r12, v1v1, v2v2, v1v2, n12v2),
    }
