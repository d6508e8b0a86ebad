"""The TT readout calibrated on the linear metric: U_L = M^(l)_L, V_L = S^(l)_L."""

from __future__ import annotations

import pytest

from stfalgebra.mpm.coefficient_ring import gens
from stfalgebra.mpm.harmonic_split import sample_harmonic
from stfalgebra.mpm.linear_metric import LinearMoment, linear_metric
from stfalgebra.mpm.quadratic_metric import far_zone_part
from stfalgebra.mpm.radiative_readout import fit_radiative_moments, sphere_points


@pytest.mark.parametrize("kind,l", [("M", 2), ("M", 3), ("S", 2), ("S", 3), ("M", 4)])
def test_linear_field_reads_back_its_moment(kind, l):
    # Thorne, Rev. Mod. Phys. 52, 299 (1980), eq. (4.3): U_L = M^(l)_L and V_L = S^(l)_L at linear order
    H = sample_harmonic(l, 1)
    h = linear_metric(LinearMoment(kind, l, H, "s2"))
    spatial = {key: far_zone_part(value) for key, value in h.items() if key[0] > 0}
    (value,) = fit_radiative_moments(spatial, [("U" if kind == "M" else "V", l, H)])
    assert value == gens()["s2"] ** l


def test_wrong_structure_is_refused():
    H = sample_harmonic(2, 1)
    h = linear_metric(LinearMoment("M", 2, H, "s2"))
    spatial = {key: far_zone_part(value) for key, value in h.items() if key[0] > 0}
    with pytest.raises(ArithmeticError):
        fit_radiative_moments(spatial, [("V", 2, H)])


def test_sphere_points_are_on_the_unit_sphere():
    assert all(sum(c * c for c in point) == 1 for point in sphere_points(12))
