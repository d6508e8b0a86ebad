"""The dynamics with spins of any direction on the instantaneous triad (stfalgebra/binary/precessing_dynamics.py)."""

from fractions import Fraction

import pytest

from stfalgebra.binary.precessing_dynamics import (
    SPIN_COMPONENTS, PrecessingOrbitDerivative, general_spin_acceleration, precession_rates,
)
from stfalgebra.binary.spinning_dynamics import aligned_spin_acceleration
from stfalgebra.exact import ExactPolynomial
from stfalgebra.pnseries import PNSeries

ALIGNED = {"chi1_n": 0, "chi1_lambda": 0, "chi2_n": 0, "chi2_lambda": 0,
           "chi1_ell": ExactPolynomial("chi1"), "chi2_ell": ExactPolynomial("chi2")}


def _series(value, known=10):
    return PNSeries._from_trusted({0: value}, known)


@pytest.mark.parametrize("body", [1, 2])
def test_spin_magnitudes_are_conserved_along_the_derivative(body):
    # |chi_A|^2 is conserved by the precession equations (constant-magnitude spin variables,
    # Kidder 1995, Sec. II): the frame turning and the precession both rotate the components
    n, lam, ell = (ExactPolynomial(f"chi{body}_{k}") for k in ("n", "lambda", "ell"))
    rate = PrecessingOrbitDerivative()(_series(n**2 + lam**2 + ell**2))
    assert rate.orders == ()
    assert rate.known_through >= Fraction(3, 2)
    # a single component does move: the check is not empty
    assert PrecessingOrbitDerivative()(_series(n)).orders == (0, 1)


def test_aligned_limit_of_the_acceleration_is_the_planar_one():
    a_n, a_lambda, a_ell = (value.substitute(ALIGNED) for value in general_spin_acceleration())
    aligned_n, aligned_lambda = aligned_spin_acceleration()
    assert (a_n - aligned_n).is_zero() and (a_lambda - aligned_lambda).is_zero()
    assert a_ell.is_zero()


def test_in_plane_spins_push_the_orbit_out_of_its_plane():
    # a.ell = (G^2 m^2/r^3) [r phidot (7 s + 3 delta sigma).n + 2 rdot s.lambda] (from the cited
    # acceleration, Kidder 1995 eq. (2.2c), from memory): in-plane components only
    a_ell = general_spin_acceleration()[2]
    assert not a_ell.is_zero()
    assert not a_ell.has("chi1_ell", "chi2_ell")
    equal = a_ell.substitute({"nu": Fraction(1, 4), "delta": 0, "chi2_n": 0, "chi2_lambda": 0, "chi1_lambda": 0})
    # s = chi1/4 for equal masses: 7/4 r phidot chi1_n G^2 m^2/r^3
    expected = Fraction(7, 4) * ExactPolynomial("chi1_n") * ExactPolynomial("G")**2 * ExactPolynomial("m")**2 \
        * ExactPolynomial("r")**-2 * ExactPolynomial("phidot")
    assert (equal - expected).is_zero()


def test_precession_rates_exchange_bodies():
    w1, w2 = precession_rates()
    assert (w1.substitute({"delta": -ExactPolynomial("delta")}) - w2).is_zero()


def test_in_plane_spins_leave_the_in_plane_motion_alone():
    # a.n and a.lambda of the spin-orbit acceleration involve the components along ell only
    derivative = PrecessingOrbitDerivative()
    in_plane = [name for name in SPIN_COMPONENTS if not name.endswith("ell")]
    for variable in ("rdot", "phidot"):
        rate = derivative(_series(ExactPolynomial(variable), 3)).coefficient(Fraction(3, 2))
        assert rate.has("chi1_ell", "chi2_ell") and not rate.has(*in_plane)


def test_bad_input():
    with pytest.raises(TypeError, match="PNSeries"):
        PrecessingOrbitDerivative()(3)
