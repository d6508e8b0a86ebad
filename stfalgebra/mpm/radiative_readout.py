"""Reading the radiative moments U_L, V_L off the transverse-traceless waveform at infinity.

At order 1/R the spatial gothic metric defines the radiative moments (G = c = 1):

    TT[R h^{ij}] = -4 sum_l (1/l!) TT[ n_(L-2) U_(ijL-2) - (2l/(l+1)) n_(aL-2) eps_ab(i V_j)bL-2 ]

(Thorne, Rev. Mod. Phys. 52, 299 (1980), eq. (4.3); Blanchet, Living Rev. Relativ. 17, 2
(2014), eq. (66); from memory: the normalisation is checked by the linear metric, which gives
U_L = M^(l)_L and V_L = S^(l)_L). TT is the projection
``P_ia P_jb - (1/2) P_ij P_ab`` with ``P_ij = delta_ij - n_i n_j``.

:func:`fit_radiative_moments` evaluates both sides at rational points of the unit sphere
(``n = (2a, 2b, a^2 + b^2 - 1)/(a^2 + b^2 + 1)``) and solves for the coefficient of each
expected tensor structure exactly; the residual at every point must vanish, so a term of an
unexpected shape cannot hide.
"""

from __future__ import annotations

from fractions import Fraction
from math import factorial

import flint

from .coefficient_ring import RING, gens
from .retarded_field import COORDINATES, RetardedField

__all__ = ["sphere_points", "tt_value", "structure_basis_value", "fit_radiative_moments"]

_ZERO = RING.from_dict({})


def sphere_points(count: int) -> list[tuple[Fraction, Fraction, Fraction]]:
    """Rational points of the unit sphere (inverse stereographic projection)."""
    points = []
    a_values = [Fraction(1, 2), Fraction(2, 3), Fraction(-1, 3), Fraction(3, 5), Fraction(-2, 7),
                Fraction(5, 4), Fraction(-3, 2), Fraction(1, 7), Fraction(4, 9), Fraction(-5, 3)]
    b_values = [Fraction(1, 3), Fraction(-1, 4), Fraction(2, 5), Fraction(5, 7), Fraction(-3, 8),
                Fraction(1, 6), Fraction(7, 5), Fraction(-4, 3), Fraction(3, 11), Fraction(2, 9)]
    k = 0
    while len(points) < count:
        a = a_values[k % len(a_values)] + k // len(a_values)
        b = b_values[(3 * k + 1) % len(b_values)] - Fraction(k // len(b_values), 2)
        s = a * a + b * b
        points.append((2 * a / (s + 1), 2 * b / (s + 1), (s - 1) / (s + 1)))
        k += 1
    return points


def _evaluate(poly: flint.fmpq_mpoly, point) -> flint.fmpq_mpoly:
    return poly.subs({name: flint.fmpq(value.numerator, value.denominator)
                      for name, value in zip(COORDINATES, point)})


def _field_value(field: RetardedField, point) -> flint.fmpq_mpoly:
    # r = 1 on the unit sphere
    return sum((_evaluate(p, point) for p in field.terms.values()), _ZERO)


def tt_value(matrix, point) -> dict[tuple[int, int], flint.fmpq_mpoly]:
    """TT projection of a symmetric 3x3 matrix of ring values at direction ``point``."""
    n = point
    P = [[(1 if i == j else 0) - n[i] * n[j] for j in range(3)] for i in range(3)]
    out = {}
    for i in range(3):
        for j in range(i, 3):
            total = _ZERO
            for a in range(3):
                for b in range(3):
                    weight = P[i][a] * P[j][b] - Fraction(1, 2) * P[i][j] * P[a][b]
                    if weight:
                        total += matrix[a][b] * _q(weight)
            out[(i, j)] = total
    return out


def _epsilon(i: int, j: int, k: int) -> int:
    return (i - j) * (j - k) * (k - i) // 2


def structure_basis_value(kind: str, l: int, tensor: flint.fmpq_mpoly, point):
    """``TT`` of the waveform of a unit radiative moment ``U_L`` or ``V_L = tensor`` at a point.

    ``tensor`` is the harmonic polynomial ``T(x) = T_L x_L``; ``n_(L-2) T_(ijL-2) = d_i d_j T(n)/(l(l-1))``.
    """
    weight = Fraction(-4, factorial(l))
    second = [[tensor.derivative(COORDINATES[i]).derivative(COORDINATES[j]) for j in range(3)] for i in range(3)]
    matrix = [[_ZERO] * 3 for _ in range(3)]
    scale = Fraction(1, l * (l - 1))
    for i in range(3):
        for j in range(3):
            if kind == "U":
                value = _evaluate(second[i][j], point) * _q(weight * scale)
            else:
                # -(2l/(l+1)) (1/2) [eps_abi n_a T_jb.. + eps_abj n_a T_ib..]
                total = _ZERO
                for a in range(3):
                    for b in range(3):
                        e_i = _epsilon(a, b, i)
                        e_j = _epsilon(a, b, j)
                        if e_i:
                            total += _evaluate(second[j][b], point) * _q(point[a] * e_i)
                        if e_j:
                            total += _evaluate(second[i][b], point) * _q(point[a] * e_j)
                value = total * _q(weight * scale * Fraction(-2 * l, l + 1) / 2)
            matrix[i][j] = value
    return tt_value(matrix, point)


def _q(value: Fraction) -> flint.fmpq:
    value = Fraction(value)
    return flint.fmpq(value.numerator, value.denominator)


def fit_radiative_moments(spatial: dict[tuple[int, int], RetardedField],
                          structures: list[tuple[str, int, flint.fmpq_mpoly]]) -> list[flint.fmpq_mpoly]:
    """Solve ``TT[R h^{ij}] = sum_s c_s (waveform of structure s)`` exactly for the c_s.

    Parameters
    ----------
    spatial:
        ``{(i, j): far-zone field}`` for 1 <= i <= j <= 3 (order 1/R of h^{ij}).
    structures:
        ``(kind "U"/"V", l, T(x))`` for each expected tensor structure.

    Returns
    -------
    list
        The coefficients (ring polynomials free of x), in the order of ``structures``.

    Raises
    ------
    ArithmeticError
        If the structures are degenerate at the sample points, or the waveform is not a
        combination of them (non-zero residual).
    """
    count = len(structures)
    points = sphere_points(count + 4)
    rows_basis = []
    rows_data = []
    for point in points:
        matrix = [[_field_value(spatial[(min(i, j) + 1, max(i, j) + 1)], point) for j in range(3)] for i in range(3)]
        data = tt_value(matrix, point)
        basis = [structure_basis_value(kind, l, tensor, point) for kind, l, tensor in structures]
        for key in data:
            rows_data.append(data[key])
            rows_basis.append([_constant(b[key]) for b in basis])
    A = flint.fmpq_mat(len(rows_basis), count, [v for row in rows_basis for v in row])
    normal = A.transpose() * A
    if normal.det() == 0:
        raise ArithmeticError("degenerate structures: the test tensors do not separate them")
    inverse = normal.inv()
    projected = [sum((rows_data[r] * A[r, c] for r in range(len(rows_data))), _ZERO) for c in range(count)]
    coefficients = [sum((projected[c] * inverse[s, c] for c in range(count)), _ZERO) for s in range(count)]
    for r, row in enumerate(rows_basis):
        residual = rows_data[r] - sum((coefficients[s] * row[s] for s in range(count)), _ZERO)
        if not residual.is_zero():
            raise ArithmeticError(f"the waveform is not a combination of the expected structures: {residual}")
    return coefficients


def _constant(poly: flint.fmpq_mpoly) -> flint.fmpq:
    if poly.is_zero():
        return flint.fmpq(0)
    if not poly.is_constant():
        raise ArithmeticError("a structure's waveform depends on more than the direction")
    return poly.leading_coefficient()
