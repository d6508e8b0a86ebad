"""The linearised multipolar metric in harmonic coordinates, from canonical moments M_L, S_L.

With the gothic metric ``h^{mu nu} = sqrt(-g) g^{mu nu} - eta^{mu nu}`` (signature -+++),
G = c = 1 and every moment at the retarded time t - r:

    h^00 = -4 sum_l (-1)^l/l! d_L [M_L/r],
    h^0i =  4 sum_l (-1)^l/l! { d_(L-1) [M^(1)_(iL-1)/r] + l/(l+1) eps_iab d_(aL-1) [S_(bL-1)/r] },
    h^ij = -4 sum_l (-1)^l/l! { d_(L-2) [M^(2)_(ijL-2)/r] + 2l/(l+1) d_(aL-2) [eps_ab(i S^(1)_j)bL-2 / r] }

(Thorne, Rev. Mod. Phys. 52, 299 (1980), sec. VIII; Blanchet & Damour, Phil. Trans. R. Soc. A
320, 379 (1986); Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 2.2; written from memory
and checked here: Box h = 0, the harmonic condition d_nu h^{mu nu} = 0, the Newtonian potential
and the Lense-Thirring field g_0i = -2 eps_ijk J_j x_k/r^3 of the angular momentum S_i = J_i).

A moment is given by a harmonic polynomial ``H(x) = M_L x_L`` (its STF tensor) and the marker of
its time derivatives (``s1`` for the first moment of an interaction, ``s2`` for the second).
Contractions with the STF tensor are derivatives of H: ``M_(iL-1) x_(L-1) = (1/l) d_i H``,
``M_(ijL-2) x_(L-2) = d_i d_j H/(l (l-1))`` and ``eps_iab x_a S_(bL-1) x_(L-1) = (x cross grad S)_i/l``.
"""

from __future__ import annotations

from dataclasses import dataclass
from math import factorial

import flint

from .coefficient_ring import RING, gens
from .retarded_field import COORDINATES, RetardedField, multipole_wave

__all__ = ["LinearMoment", "linear_metric", "cross_gradient", "metric_component"]

_ZERO = RING.from_dict({})


@dataclass(frozen=True)
class LinearMoment:
    """One canonical moment of a linear field.

    Attributes
    ----------
    kind:
        ``"M"`` (mass) or ``"S"`` (current).
    rank:
        l; mass moments l >= 0, current moments l >= 1.
    harmonic:
        Harmonic polynomial of degree l in x1, x2, x3 (the STF tensor), coefficients rational.
    marker:
        ``"s1"`` or ``"s2"``: the derivative marker of this moment.
    constant:
        The moment does not depend on time (M, S_i): its rate is 0.
    """

    kind: str
    rank: int
    harmonic: flint.fmpq_mpoly
    marker: str
    constant: bool = False

    def __post_init__(self) -> None:
        if self.kind not in ("M", "S"):
            raise ValueError(f"kind must be 'M' or 'S', got {self.kind!r}")
        if self.kind == "S" and self.rank < 1:
            raise ValueError(f"current moments have rank >= 1, got {self.rank}")
        if self.marker not in ("s1", "s2"):
            raise ValueError(f"marker must be 's1' or 's2', got {self.marker!r}")

    @property
    def rate(self) -> flint.fmpq_mpoly:
        return _ZERO if self.constant else gens()[self.marker]

    def derivative_marker(self, times: int) -> flint.fmpq_mpoly:
        return self.rate ** times if times else RING.from_dict({(0,) * RING.nvars(): 1})


def cross_gradient(poly: flint.fmpq_mpoly) -> tuple[flint.fmpq_mpoly, ...]:
    """Return ``(x cross grad P)_i``, i = 1..3 (harmonic when P is)."""
    g = gens()
    x = [g[name] for name in COORDINATES]
    grad = [poly.derivative(name) for name in COORDINATES]
    return tuple(x[(i + 1) % 3] * grad[(i + 2) % 3] - x[(i + 2) % 3] * grad[(i + 1) % 3]
                 for i in range(3))


def linear_metric(moment: LinearMoment) -> dict[tuple[int, int], RetardedField]:
    """Return the components ``h^{mu nu}`` (mu <= nu) of the linear metric of one moment.

    Parameters
    ----------
    moment:
        A :class:`LinearMoment`.

    Returns
    -------
    dict
        ``{(mu, nu): RetardedField}`` for 0 <= mu <= nu <= 3 (absent components are zero
        fields), in the convention of the module docstring.

    Example
    -------
    >>> one = RING.from_dict({(0,) * 11: 1})
    >>> h = linear_metric(LinearMoment("M", 0, one, "s1", constant=True))
    >>> str(h[0, 0].terms[1])        # h^00 = -4 M/r
    '-4'

    References
    ----------
    Thorne, Rev. Mod. Phys. 52, 299 (1980), sec. VIII; Blanchet & Damour, Phil. Trans. R. Soc.
    A 320, 379 (1986) (from memory; checked by the tests, see the module docstring).
    """
    l = moment.rank
    rate = moment.rate
    H = moment.harmonic
    sign = -1 if l % 2 else 1
    weight = flint.fmpq(sign, factorial(l))
    out = {(mu, nu): RetardedField.zero(rate) for mu in range(4) for nu in range(mu, 4)}

    def marker(times: int) -> flint.fmpq_mpoly:
        return moment.derivative_marker(times)

    names = COORDINATES
    if moment.kind == "M":
        out[0, 0] = multipole_wave(H, l, marker(0), rate).scale(-4 * weight)
        if l >= 1:
            for i in range(3):
                piece = H.derivative(names[i]) * flint.fmpq(1, l)
                out[0, i + 1] = multipole_wave(piece, l - 1, marker(1), rate).scale(4 * weight)
        if l >= 2:
            for i in range(3):
                for j in range(i, 3):
                    piece = H.derivative(names[i]).derivative(names[j]) * flint.fmpq(1, l * (l - 1))
                    out[i + 1, j + 1] = multipole_wave(piece, l - 2, marker(2), rate).scale(-4 * weight)
        return out
    # current moment
    rotated = cross_gradient(H)
    for i in range(3):
        piece = rotated[i] * flint.fmpq(1, l + 1)       # (l/(l+1)) (1/l) (x cross grad S)_i
        out[0, i + 1] = multipole_wave(piece, l, marker(0), rate).scale(4 * weight)
    if l >= 2:
        rotated_gradients = [cross_gradient(H.derivative(names[j])) for j in range(3)]
        for i in range(3):
            for j in range(i, 3):
                # (2l/(l+1)) (1/(2 l (l-1))) [(x cross grad d_j S)_i + (x cross grad d_i S)_j]
                piece = (rotated_gradients[j][i] + rotated_gradients[i][j]) * flint.fmpq(1, (l + 1) * (l - 1))
                out[i + 1, j + 1] = multipole_wave(piece, l - 1, marker(1), rate).scale(-4 * weight)
    return out


def metric_component(metric: dict[tuple[int, int], RetardedField], mu: int, nu: int) -> RetardedField:
    """``h^{mu nu}`` from the upper triangle."""
    return metric[(mu, nu)] if mu <= nu else metric[(nu, mu)]
