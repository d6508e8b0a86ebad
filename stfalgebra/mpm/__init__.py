"""Layer 2 (beside binary): the multipolar post-Minkowskian iteration in vacuum, quadratic order.

From canonical moments M_L, S_L of any l: the linear harmonic-gauge metric
(:mod:`.linear_metric`), the quadratic source (:mod:`.quadratic_source`), the finite-part
retarded integral of each multipolar piece (:mod:`.retarded_integral`), the quadratic metric at
future null infinity with its gauge correction and the radiative time (:mod:`.quadratic_metric`),
the TT readout of U_L, V_L (:mod:`.radiative_readout`) and the table of quadratic terms of every
radiative moment (:mod:`.interactions`, terms in :mod:`.radiative_terms`). Exact arithmetic in
one python-flint ring (:mod:`.coefficient_ring`); fields in :mod:`.retarded_field`, harmonic
(STF) splitting in :mod:`.harmonic_split`.

Two constants stay apart: r0, the finite-part scale of the iteration (it cancels from every
quadratic radiative coefficient), and b, the constant of the radiative coordinates
U = t - r/c - (2 G M/c^3) ln(r/(c b)) that appears in the tails as ln(c tau/(2 b)).
"""

from .interactions import radiative_moment_terms, tail_constant_from_iteration
from .radiative_terms import RadiativeTerm

__all__ = ["radiative_moment_terms", "tail_constant_from_iteration", "RadiativeTerm"]
