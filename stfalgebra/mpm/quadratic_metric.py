"""The quadratic metric of two moments at future null infinity: u_2, its divergence w_2, the
gauge correction v_2 and the shift to radiative coordinates.

For moments X (marker s1) and Y (marker s2) with linear metrics h_X, h_Y:

* the source is the cross term ``N(h_X, h_Y) + N(h_Y, h_X)`` (:mod:`.quadratic_source`);
* ``u_2 = FP Box^-1_ret [(r/r0)^B N]``, kept at order 1/r (:func:`far_zone_of_source`);
* ``w_2^mu = d_nu u_2^{mu nu} = FP Box^-1_ret [B (r/r0)^B n_i N^{mu i}/r]`` (exact: the sum of
  the pole residues, :func:`divergence_of_iterated_metric`);
* the gauge correction v_2 (``d_nu v_2^{mu nu} = -w_2^mu``, Box v_2 = 0) written with w_2 as
  ``w^0 = sum d_L[N_L/r]``, ``w^i = sum d_(iL)[P_L/r] + d_(L-1)[Q_(iL-1)/r] + eps_iab d_(aL-1)[R_(bL-1)/r]``;
  its spatial components that survive the transverse-traceless projection at order 1/r are
  ``d_(L-2)[(N^(1) + 3 P^(2) - Q)_(ijL-2)/r] - 2 d_(aL-2)[eps_ab(i R_j)bL-2/r]`` (l >= 2)
  (Blanchet, Living Rev. Relativ. 17, 2 (2014), eqs. (38)-(40), from memory);
* radiative coordinates: with ``U = t - r - 2 M ln(r/b)`` the linear field ``h_Y(t - r)``
  becomes ``h_Y(U) + 2 M ln(r/b) dh_Y/du`` at order G (M the mass monopole, b the constant of
  the radiative coordinates, distinct from the finite-part scale r0).

Functions of the direction at order 1/r are :class:`~.retarded_field.RetardedField` objects
whose terms all have ``n = (x-degree) + 1``.
"""

from __future__ import annotations

import flint

from .coefficient_ring import RING, gens, normal_form
from .harmonic_split import homogeneous_parts, multipolar_pieces, vector_harmonic_split, harmonic_decomposition
from .linear_metric import LinearMoment, linear_metric
from .quadratic_source import quadratic_source
from .retarded_field import COORDINATES, RetardedField
from .retarded_integral import far_zone_multiplier, pole_residue_wave

__all__ = [
    "cross_source", "far_zone_of_source", "divergence_of_iterated_metric", "far_zone_part",
    "gauge_correction_far_zone", "radiative_shift_far_zone", "QuadraticFarZone", "quadratic_far_zone",
]

_ZERO = RING.from_dict({})


def cross_source(first: LinearMoment, second: LinearMoment) -> dict[tuple[int, int], RetardedField]:
    """``N(h_X, h_Y) + N(h_Y, h_X)`` for the linear metrics of two moments."""
    rate = first.rate + second.rate
    h1, h2 = linear_metric(first), linear_metric(second)
    zero = RetardedField.zero(rate)

    def derivative(field, mu):
        return field.derivative(mu)

    def times(a, b):
        return a.times(b)

    forward = quadratic_source(h1, h2, derivative, times, zero)
    backward = quadratic_source(h2, h1, derivative, times, zero)
    return {key: RetardedField((forward[key] + backward[key]).terms, rate) for key in forward}


def far_zone_of_source(source: RetardedField) -> RetardedField:
    """Return the order-1/r part of ``FP Box^-1_ret[(r/r0)^B source]`` (u = t - r fixed)."""
    rate = source.rate
    out: dict[int, flint.fmpq_mpoly] = {}
    for (l, k), harmonic in multipolar_pieces(source).items():
        value = normal_form(harmonic * far_zone_multiplier(l, k, rate), rate)
        out[l + 1] = out[l + 1] + value if l + 1 in out else value
    return RetardedField(out, rate)


def divergence_of_iterated_metric(source: dict[tuple[int, int], RetardedField], mu: int) -> RetardedField:
    """Return ``w^mu = FP Box^-1_ret[B (r/r0)^B n_i N^{mu i}/r]`` exactly (sum of pole residues)."""
    g = gens()
    rate = source[(0, 0)].rate
    radial = RetardedField.zero(rate)
    for i in range(1, 4):
        component = source[(min(mu, i), max(mu, i))]
        radial = radial + component.times_polynomial(g[COORDINATES[i - 1]]).shift_radius(2)
    total = RetardedField.zero(rate)
    one = RING.from_dict({(0,) * RING.nvars(): 1})
    for (l, k), harmonic in multipolar_pieces(radial).items():
        total = total + pole_residue_wave(harmonic, l, k, one, rate)
    return total


def far_zone_part(field: RetardedField) -> RetardedField:
    """The order-1/r part of a field (terms ``P r^-n`` of x-degree n - 1), logarithms aside."""
    out: dict[int, flint.fmpq_mpoly] = {}
    for n, poly in field.terms.items():
        for d, part in homogeneous_parts(poly).items():
            if n - d == 1:
                out[n] = out[n] + part if n in out else part
    return RetardedField(out, field.rate)


def _by_degree(field: RetardedField) -> dict[int, flint.fmpq_mpoly]:
    """Harmonic content of a far-zone function: ``{l: H_l}`` with the function = sum H_l(n)."""
    out: dict[int, flint.fmpq_mpoly] = {}
    for n, poly in field.terms.items():
        for d, part in homogeneous_parts(poly).items():
            for l, harmonic in harmonic_decomposition(part, d).items():
                out[l] = out[l] + harmonic if l in out else harmonic
    return {l: h for l, h in out.items() if not h.is_zero()}


def gauge_correction_far_zone(w: list[RetardedField], rate: flint.fmpq_mpoly) -> dict[tuple[int, int], RetardedField]:
    """The TT-relevant order-1/r part of v_2^{ij} from the divergence w (module docstring).

    With ``w^0 -> sum (-1)^l nhat_L N^(l)_L / r`` and the vector harmonics of ``w^i`` at 1/r
    (:func:`~.harmonic_split.vector_harmonic_split`), N^(l), P^(l+1), Q^(l-1), R^(l) are read
    off; the antiderivatives the formula needs are the multiplier z = 1/rate.
    """
    g = gens()
    z = g["z"]
    scalar = _by_degree(far_zone_part(w[0]))
    vectors: dict[int, list] = {}
    for i in range(3):
        for d, h in _by_degree(far_zone_part(w[i + 1])).items():
            vectors.setdefault(d, [_ZERO, _ZERO, _ZERO])[i] = h
    gradient, rotation, radial = {}, {}, {}
    for d, vector in vectors.items():
        psi, rot, phi = vector_harmonic_split(tuple(vector), d)
        gradient[d + 1] = gradient.get(d + 1, _ZERO) + psi
        rotation[d] = rotation.get(d, _ZERO) + rot
        radial[d] = radial.get(d, _ZERO) + phi
    top = max([0] + list(scalar) + [d + 2 for d in vectors])
    out = {(i, j): RetardedField.zero(rate) for i in range(1, 4) for j in range(i, 4)}
    for l in range(2, top + 1):
        sign = -1 if l % 2 else 1
        n_l = scalar.get(l, _ZERO) * sign                                   # N^(l)
        p_l = radial.get(l + 1, _ZERO) * (-sign)                            # P^(l+1)
        q_l = (gradient.get(l, _ZERO) * (-sign) - p_l * flint.fmpq(1, 2 * l + 1)) * l   # Q^(l-1)
        r_l = rotation.get(l, _ZERO) * (sign * l)                           # R^(l)
        combined = normal_form((n_l + p_l * 3 - q_l) * z, rate)             # N^(l-1) + 3P^(l) - Q^(l-2)
        rotated = normal_form(r_l * z, rate)                                # R^(l-1)
        if combined.is_zero() and rotated.is_zero():
            continue
        weight = flint.fmpq(sign, l * (l - 1))
        for i in range(1, 4):
            for j in range(i, 4):
                value = combined.derivative(COORDINATES[i - 1]).derivative(COORDINATES[j - 1]) * weight
                # -2 (-1)^(l-1) n_(aL-2) eps_ab(i R^(l-1)_j)bL-2
                twist = _ZERO
                for (p, q) in ((i, j), (j, i)):
                    second = rotated.derivative(COORDINATES[q - 1])
                    for a in range(1, 4):
                        for b in range(1, 4):
                            e = _epsilon(a - 1, b - 1, p - 1)
                            if e:
                                twist += g[COORDINATES[a - 1]] * second.derivative(COORDINATES[b - 1]) * e
                value += twist * flint.fmpq(sign, l * (l - 1))   # -2 (-1)^(l-1) (1/2) = (-1)^l
                if not value.is_zero():
                    for d, part in homogeneous_parts(value).items():
                        out[(i, j)] = out[(i, j)] + RetardedField({d + 1: part}, rate)
    return out


def _epsilon(i: int, j: int, k: int) -> int:
    return (i - j) * (j - k) * (k - i) // 2


def radiative_shift_far_zone(second: LinearMoment, rate: flint.fmpq_mpoly) -> dict[tuple[int, int], RetardedField]:
    """``2 (ln r - ln b) d/du h_Y^{ij}`` at order 1/r (the monopole's shift of the retarded time)."""
    g = gens()
    h = linear_metric(second)
    out = {}
    for i in range(1, 4):
        for j in range(i, 4):
            far = far_zone_part(h[(i, j)])
            out[(i, j)] = RetardedField(far.terms, rate).scale((g["logr"] - g["logb"]) * 2 * second.rate)
    return out


class QuadraticFarZone:
    """The quadratic metric of two moments at order 1/r: u_2, v_2 (TT-relevant), the shift."""

    def __init__(self, first: LinearMoment, second: LinearMoment) -> None:
        self.first, self.second = first, second
        self.rate = first.rate + second.rate
        self.source = cross_source(first, second)
        self.u = {key: far_zone_of_source(field) for key, field in self.source.items()}
        self.w = [divergence_of_iterated_metric(self.source, mu) for mu in range(4)]
        self.v = gauge_correction_far_zone(self.w, self.rate)
        if first.kind == "M" and first.rank == 0:
            self.shift = radiative_shift_far_zone(second, self.rate)
        else:
            self.shift = None

    def spatial(self, i: int, j: int) -> RetardedField:
        """The order-1/r part of h_2^{ij} in radiative coordinates (TT-relevant terms)."""
        key = (min(i, j), max(i, j))
        total = self.u[key] + self.v[key]
        if self.shift is not None:
            total = total + self.shift[key]
        return total


def quadratic_far_zone(first: LinearMoment, second: LinearMoment) -> QuadraticFarZone:
    """The :class:`QuadraticFarZone` of two moments (callers cache by their own keys)."""
    return QuadraticFarZone(first, second)
