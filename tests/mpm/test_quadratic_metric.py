"""The quadratic metric at infinity: its divergence equals the pole residues (the harmonic-gauge
bookkeeping of the iteration), and r0 and ln r disappear from the waveform."""

from __future__ import annotations

import pytest

from stfalgebra.mpm.coefficient_ring import RING, gens, normal_form
from stfalgebra.mpm.harmonic_split import sample_harmonic
from stfalgebra.mpm.linear_metric import LinearMoment
from stfalgebra.mpm.quadratic_metric import QuadraticFarZone, far_zone_part
from stfalgebra.mpm.retarded_field import RetardedField

ONE = RING.from_dict({(0,) * RING.nvars(): 1})


def _moment(kind, rank, marker, seed):
    constant = (kind, rank) in (("M", 0), ("S", 1))
    return LinearMoment(kind, rank, sample_harmonic(rank, seed) if rank else ONE, marker, constant=constant)


PAIRS = [(("M", 0), ("M", 2)), (("M", 2), ("M", 2)), (("S", 1), ("M", 2)), (("M", 2), ("S", 2)),
         (("M", 2), ("M", 3))]


@pytest.mark.parametrize("first,second", PAIRS)
def test_divergence_of_u_at_infinity_is_the_pole_residue(first, second):
    # d_nu u^{mu nu} = w^mu: at order 1/r, d_u [u^{mu 0} - n_i u^{mu i}] = (w^mu)_(1/r); u comes
    # from the far-zone multipliers, w from the residues: two routes through the finite part
    far = QuadraticFarZone(_moment(*first, "s1", 1), _moment(*second, "s2", 2))
    g = gens()
    nonzero = False
    for mu in range(4):
        lhs = far.u[(0, mu)].time_derivative()
        for i in range(1, 4):
            lhs = lhs - far.u[(min(mu, i), max(mu, i))].times_polynomial(g[f"x{i}"]).shift_radius(1).time_derivative()
        rhs = far_zone_part(far.w[mu])
        nonzero = nonzero or bool(rhs.terms)
        difference = lhs - rhs
        difference = RetardedField({n: normal_form(p, far.rate) for n, p in difference.terms.items()}, far.rate)
        assert difference.is_zero(), mu
    if first != ("M", 0):
        assert nonzero      # the gauge correction is exercised


def test_far_zone_logarithm_is_absorbed_by_the_radiative_time():
    # the ln r of u_2 (M x M_ij) cancels against 2 M ln(r/b) d/du h_1 in every spatial component
    far = QuadraticFarZone(_moment("M", 0, "s1", 1), _moment("M", 2, "s2", 2))
    for i in range(1, 4):
        for j in range(i, 4):
            total = far.spatial(i, j)
            assert all(p.degrees()[RING.names().index("logr")] == 0 for p in total.terms.values())
