"""The spin parts of the source moments of a spinning binary, for every l, at leading order.

The one-particle spin parts (:mod:`stfalgebra.moments.pole_dipole`: the pole-dipole
stress-energy inserted into the general mass and current formulas) are summed over the two bodies
in the centre-of-mass frame, with Newtonian positions ``y_1 = X2 x``, ``y_2 = -X1 x`` and
velocities ``v_1 = X2 v``, ``v_2 = -X1 v`` (enough at this order). The mass moments also receive
the spin part of the centre-of-mass relation, derived here from the mass dipole: the l = 1 mass
moment ``sum_A m_A y_A + sum_A (v_A x S_A)/c^2`` vanishes in the centre-of-mass frame, so both
positions move by

    delta_y = -(1/(m c^2)) sum_A s_A v x S_A = (nu/(m c^2)) v x Sigma,

which adds ``sum_A m_A l y_A^<L-1} delta_y^{i_l>}`` to ``I_L``. Nothing two-body is typed in.

Orders (spins with ``S_A = G m_A^2 chi_A/c``): the spin part of ``J_L`` enters at relative 0.5PN
(``1/c``) and is known through relative 1 (next-to-leading spin-orbit terms at 3/2 are not
entered); that of ``I_L`` enters at relative 1.5PN (``1/c^3``) and is known through 3/2
(spin-spin terms at 2).

Two views of the result:

- any spin directions: :func:`general_spin_part`, STF products of ``x, v, S_A, x x S_A, v x S_A``
  with exact coefficients (physical spins, a stated power of ``1/c``);
- aligned spins (``S_A = (G m^2 X_A^2 chi_A/c) e_z``): :class:`~stfalgebra.moments.orbit_tensor.OrbitTensor`
  over :data:`ALIGNED_SPIN_BASIS` ``(x, v, ell, e_z, x cross e_z, v cross e_z)``, with the orbital
  1PN moments lifted onto the same basis (:func:`aligned_spin_mass_moment`,
  :func:`aligned_spin_current_moment`) and their time derivative along the aligned-spin orbit
  (:func:`differentiate_along_aligned_orbit`), so that the mode machinery applies unchanged.

**Conventions**: :mod:`stfalgebra.binary.spin_variables`; ``x = y1 - y2``, ``ell = x cross v``;
on the spinor probes ``e_z.k = u_z``, ``(x cross e_z).k = (i r/2)(Z+ - Z-)``,
``(v cross e_z).k = ((r phidot + i rdot)/2) Z+ + ((r phidot - i rdot)/2) Z-``. Aligned spins keep
the orbit planar, so ``Hhat_{l,-m} = (-1)^l conj(Hhat_lm)`` still holds; a spin part feeds the
same modes as the orbital part of its moment (mass: l + m even; current: l + m odd).
"""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction
from functools import lru_cache
from typing import Mapping

from ..binary.cited_inputs import acceleration_n_factor, acceleration_v_factor
from ..binary.spin_variables import SPIN_ORBIT_ORDER
from ..binary.spinning_dynamics import AlignedSpinOrbitDerivative, aligned_spin_acceleration
from ..exact import ExactPolynomial, engine_symbols
from ..orders import PNOrder
from ..pnseries import PNSeries
from .current import current_moment
from .mass import _check_rank, mass_moment
from .point_particles import mass_fractions
from .pole_dipole import BODY_SCALARS, BODY_VECTORS, BodyTensor, current_spin_part, mass_spin_part
from .orbit_tensor import OrbitTensor, VectorBasis

__all__ = [
    "GENERAL_SPIN_VECTORS", "SpinPart", "general_spin_part", "centre_of_mass_spin_shift",
    "ALIGNED_SPIN_BASIS", "aligned_spin_part", "aligned_spin_mass_moment", "aligned_spin_current_moment",
    "lift_to_aligned_basis", "differentiate_along_aligned_orbit", "SPIN_PART_KNOWN_THROUGH",
]

#: The two-body vectors of the spin parts for spins of any direction.
GENERAL_SPIN_VECTORS = ("x", "v", "S1", "S2", "x_cross_S1", "x_cross_S2", "v_cross_S1", "v_cross_S2")

#: Relative order (of the whole moment) through which the moments with spins are known.
SPIN_PART_KNOWN_THROUGH = {"mass": PNOrder(3, 2), "current": PNOrder(1)}

_KINDS = ("mass", "current")


@dataclass(frozen=True)
class SpinPart:
    """The spin part of a two-body moment for spins of any direction.

    ``terms`` maps exponent tuples over :data:`GENERAL_SPIN_VECTORS` (summing to ``rank``, one
    spin vector in each) to exact coefficients in nu, delta, r, rdot; the tensor is
    ``c^(-inverse_c_power) sum coefficient STF[product]`` with physical spins ``S_A``.

    Example
    -------
    >>> general_spin_part("current", 2).coefficient({"x": 1, "S1": 1})
    3/4 - 3*delta/4
    """

    kind: str
    rank: int
    terms: Mapping[tuple, ExactPolynomial]
    inverse_c_power: int

    def coefficient(self, vectors: Mapping[str, int]) -> ExactPolynomial:
        """The coefficient of ``STF[prod vectors]`` (0 if absent)."""
        key = tuple(vectors.get(name, 0) for name in GENERAL_SPIN_VECTORS)
        return self.terms.get(key, ExactPolynomial(0))


def _body_positions() -> tuple[ExactPolynomial, ExactPolynomial]:
    x1, x2 = mass_fractions()
    return x2, -x1


def _reduce_body(tensor: BodyTensor, body: int) -> dict[tuple, ExactPolynomial]:
    """Body ``body``'s tensor in centre-of-mass variables: ``y = s_A x``, ``v_A = s_A v``."""
    s = engine_symbols()
    position = _body_positions()[body - 1]
    names = {"y": "x", "v": "v", "S": f"S{body}", "y_cross_S": f"x_cross_S{body}", "v_cross_S": f"v_cross_S{body}"}
    # each y and v carries one s_A (also inside y x S and v x S)
    weights = {"y": 1, "v": 1, "S": 0, "y_cross_S": 1, "v_cross_S": 1}
    scalar_values = {"y.y": s.r**2, "y.v": s.r * s.rdot}
    scalar_weights = {"y.y": 2, "y.v": 2}
    out: dict[tuple, ExactPolynomial] = {}
    for (vectors, scalars), value in tensor.terms.items():
        key = [0] * len(GENERAL_SPIN_VECTORS)
        factor = ExactPolynomial(value)
        power = 0
        for name, exponent in zip(BODY_VECTORS, vectors):
            if exponent:
                key[GENERAL_SPIN_VECTORS.index(names[name])] += exponent
                power += weights[name] * exponent
        for name, exponent in zip(BODY_SCALARS, scalars):
            if exponent:
                if name not in scalar_values:
                    raise ValueError(f"the scalar {name} involves the spin: not expected at leading order")
                factor = factor * scalar_values[name] ** exponent
                power += scalar_weights[name] * exponent
        factor = factor * position**power
        key = tuple(key)
        out[key] = out[key] + factor if key in out else factor
    return out


def _sum_bodies(tensor: BodyTensor) -> dict[tuple, ExactPolynomial]:
    total: dict[tuple, ExactPolynomial] = {}
    for body in (1, 2):
        for key, value in _reduce_body(tensor, body).items():
            total[key] = total[key] + value if key in total else value
    return total


@lru_cache(maxsize=1)
def centre_of_mass_spin_shift() -> dict[str, ExactPolynomial]:
    """The spin part ``delta_y`` of both centre-of-mass positions, derived from the mass dipole.

    Returns
    -------
    dict
        ``{vector name: coefficient}`` with ``delta_y = (1/(m c^2)) sum coefficient * vector``
        (physical spins): ``-X2 v x S_1 + X1 v x S_2 = nu v x Sigma``.

    Example
    -------
    >>> centre_of_mass_spin_shift()
    {'v_cross_S1': -1/2 + delta/2, 'v_cross_S2': 1/2 + delta/2}

    References
    ----------
    Derived from the l = 1 mass moment of :func:`~stfalgebra.moments.pole_dipole.mass_spin_part`
    (the conserved mass dipole vanishes in the centre-of-mass frame); compare Blanchet, Living
    Rev. Relativ. 17, 2 (2014), Sec. 11.2, ``y_1 = X2 x + (nu/(m c^2)) v x Sigma`` (from memory;
    tested).
    """
    dipole = _sum_bodies(mass_spin_part(1))
    shift: dict[str, ExactPolynomial] = {}
    for key, value in dipole.items():
        (name,) = [n for n, e in zip(GENERAL_SPIN_VECTORS, key) if e]
        # sum_A m_A delta_y + dipole = 0 with the same delta_y for both bodies: m delta_y = -dipole
        shift[name] = -value
    return shift


@lru_cache(maxsize=None)
def general_spin_part(kind: str, l: int) -> SpinPart:
    """The spin part of ``I_L`` or ``J_L`` of the binary, spins of any direction, leading order.

    Parameters
    ----------
    kind:
        ``"mass"`` or ``"current"``.
    l:
        Multipole order, ``l >= 1``.

    Returns
    -------
    SpinPart
        Current: ``sum_A ((l+1)/2) s_A^(l-1) STF[x^(l-1) S_A]`` (no power of 1/c); mass
        (``1/c^2``): the two bodies' pole-dipole terms plus the centre-of-mass shift.

    **Conventions**: module docstring.

    Example
    -------
    >>> part = general_spin_part("mass", 2)
    >>> part.coefficient({"x": 1, "v_cross_S1": 1}), part.inverse_c_power
    (4/3 - 8*nu/3 - 4*delta/3, 2)

    References
    ----------
    The general formulas (C1), (M1) with the pole-dipole source (:mod:`stfalgebra.moments.pole_dipole`).
    """
    if kind not in _KINDS:
        raise ValueError(f"kind must be 'mass' or 'current', got {kind!r}")
    _check_rank(l)
    if l < 1:
        raise ValueError(f"the spin parts start at l = 1, got l = {l}")
    if kind == "current":
        return SpinPart(kind, l, _sum_bodies(current_spin_part(l)), 0)
    terms = _sum_bodies(mass_spin_part(l))
    # centre-of-mass shift: sum_A m_A l y_A^<L-1> delta_y^<i_l>, with sum_A X_A s_A^(l-1)
    x1, x2 = mass_fractions()
    s1, s2 = _body_positions()
    weight = l * (x1 * s1 ** (l - 1) + x2 * s2 ** (l - 1))
    if not weight.is_zero():
        for name, value in centre_of_mass_spin_shift().items():
            key = [0] * len(GENERAL_SPIN_VECTORS)
            key[0] = l - 1
            key[GENERAL_SPIN_VECTORS.index(name)] = 1
            key = tuple(key)
            terms[key] = terms[key] + weight * value if key in terms else weight * value
    return SpinPart(kind, l, {k: v for k, v in terms.items() if not v.is_zero()}, 2)


# ----------------------------------------------------------------------------- aligned spins
def _aligned_components() -> tuple:
    s = engine_symbols()
    half = ExactPolynomial(1) / 2
    zero = ExactPolynomial(0)
    return (
        (s.r * half, s.r * half, zero),
        ((s.rdot - s.I * s.r * s.phidot) * half, (s.rdot + s.I * s.r * s.phidot) * half, zero),
        (zero, zero, s.r**2 * s.phidot),
        (zero, zero, ExactPolynomial(1)),
        (s.I * s.r * half, -s.I * s.r * half, zero),
        ((s.r * s.phidot + s.I * s.rdot) * half, (s.r * s.phidot - s.I * s.rdot) * half, zero),
    )


def _refuse_two_factor_rules(alpha_x, alpha_v):
    raise TypeError("the aligned-spin basis needs the acceleration's x cross e_z part too: "
                    "use differentiate_along_aligned_orbit")


#: Vectors of a binary with aligned spins: x, v, ell = x cross v, e_z (along the spins and ell),
#: x cross e_z and v cross e_z (the spin parts carry x cross S_A, v cross S_A).
ALIGNED_SPIN_BASIS = VectorBasis(("x", "v", "ell", "e_z", "x_cross_e_z", "v_cross_e_z"),
                                 _aligned_components(), _refuse_two_factor_rules)

_ALIGNED_NAMES = {"x": "x", "v": "v", "S1": "e_z", "S2": "e_z", "x_cross_S1": "x_cross_e_z",
                  "x_cross_S2": "x_cross_e_z", "v_cross_S1": "v_cross_e_z", "v_cross_S2": "v_cross_e_z"}


@lru_cache(maxsize=None)
def aligned_spin_part(kind: str, l: int) -> OrbitTensor:
    """The spin part of ``I_L`` or ``J_L`` for aligned spins, over :data:`ALIGNED_SPIN_BASIS`.

    Parameters
    ----------
    kind:
        ``"mass"`` or ``"current"``.
    l:
        ``l >= 1``.

    Returns
    -------
    OrbitTensor
        Coefficients are PN series in ``eps = 1/c`` (absolute orders: the current part at 1/2,
        the mass part at 3/2) in G, m, nu, delta, chi1, chi2, r, rdot; ``S_A = (G m^2 X_A^2
        chi_A/c) e_z``. Known through order 1 (current) or 3/2 (mass).

    Example
    -------
    >>> part = aligned_spin_part("current", 1)
    >>> part.terms[(0, 0, 0, 1, 0, 0)].coefficient(Fraction(1, 2))      # J_i^S = S
    chi1*G*m**2/2 + chi2*G*m**2/2 - nu*chi1*G*m**2 - nu*chi2*G*m**2 + delta*chi1*G*m**2/2 - delta*chi2*G*m**2/2

    References
    ----------
    :func:`general_spin_part` with aligned spins.
    """
    general = general_spin_part(kind, l)
    s = engine_symbols()
    x1, x2 = mass_fractions()
    magnitudes = {"1": s.G * s.m**2 * x1 * x1 * ExactPolynomial("chi1"),
                  "2": s.G * s.m**2 * x2 * x2 * ExactPolynomial("chi2")}
    order2 = general.inverse_c_power + 1
    known2 = SPIN_PART_KNOWN_THROUGH[kind].twice
    terms: dict[tuple, ExactPolynomial] = {}
    for key, value in general.terms.items():
        new = [0] * len(ALIGNED_SPIN_BASIS.names)
        factor = value
        for name, exponent in zip(GENERAL_SPIN_VECTORS, key):
            if exponent:
                new[ALIGNED_SPIN_BASIS.index(_ALIGNED_NAMES[name])] += exponent
                if name[-1] in magnitudes:
                    factor = factor * magnitudes[name[-1]] ** exponent
        new = tuple(new)
        terms[new] = terms[new] + factor if new in terms else factor
    return OrbitTensor._trusted(
        l, {k: PNSeries._from_trusted({order2: v}, known2) for k, v in terms.items() if not v.is_zero()},
        ALIGNED_SPIN_BASIS,
        (f"{kind} moment, l = {l}: spin part at leading order, pole-dipole source in the general "
         "formula, aligned spins",))


def lift_to_aligned_basis(tensor: OrbitTensor) -> OrbitTensor:
    """An orbital moment over the planar basis ``(x, v, ell)`` written over :data:`ALIGNED_SPIN_BASIS`.

    Example
    -------
    >>> lift_to_aligned_basis(mass_moment(2)).terms.keys()
    dict_keys([(2, 0, 0, 0, 0, 0)])
    """
    if tensor.basis.names != ("x", "v", "ell"):
        raise ValueError(f"only tensors over the planar basis (x, v, ell) lift, got {tensor.basis.names}")
    return OrbitTensor._trusted(tensor.rank, {key + (0, 0, 0): value for key, value in tensor.terms.items()},
                                   ALIGNED_SPIN_BASIS, tensor.provenance)


@lru_cache(maxsize=None)
def aligned_spin_mass_moment(l: int) -> OrbitTensor:
    """``I_L`` of a binary with aligned spins: the 1PN orbital moment plus the spin part.

    Returns
    -------
    OrbitTensor
        Over :data:`ALIGNED_SPIN_BASIS`, known through relative order 3/2.

    Example
    -------
    >>> aligned_spin_mass_moment(2).terms[(1, 0, 0, 0, 0, 1)].orders
    (PNOrder(3/2),)
    """
    moment = lift_to_aligned_basis(mass_moment(l, 1))
    if l >= 1:
        moment = moment + aligned_spin_part("mass", l)
    return moment.truncate(SPIN_PART_KNOWN_THROUGH["mass"]).with_provenance(
        f"I_L, l = {l}: 1PN orbital moment plus the leading spin part (aligned spins)")


@lru_cache(maxsize=None)
def aligned_spin_current_moment(l: int) -> OrbitTensor:
    """``J_L`` of a binary with aligned spins: the 1PN orbital moment plus the spin part.

    Returns
    -------
    OrbitTensor
        Over :data:`ALIGNED_SPIN_BASIS`, known through relative order 1 (the next-to-leading
        spin-orbit terms, at 3/2, are not entered).

    Example
    -------
    >>> sorted(aligned_spin_current_moment(2).terms)
    [(0, 1, 1, 0, 0, 0), (1, 0, 0, 1, 0, 0), (1, 0, 1, 0, 0, 0)]
    """
    moment = lift_to_aligned_basis(current_moment(l, 1)) + aligned_spin_part("current", l)
    return moment.truncate(SPIN_PART_KNOWN_THROUGH["current"]).with_provenance(
        f"J_L, l = {l}: 1PN orbital moment plus the leading spin part (aligned spins)")


@lru_cache(maxsize=1)
def _aligned_acceleration_factors() -> tuple[PNSeries, PNSeries, PNSeries]:
    """``a = alpha_x x + alpha_v v + alpha_c (x cross e_z)`` along the aligned-spin orbit (1PN +
    leading spin-orbit): ``lambda = -(x cross e_z)/r`` carries the tangential spin-orbit part."""
    s = engine_symbols()
    alpha_x = {2 * k: v * s.r**-1 for k, v in acceleration_n_factor(s).items() if k <= 1}
    alpha_v = {2 * k: v for k, v in acceleration_v_factor(s).items() if k <= 1}
    spin_n, spin_lambda = aligned_spin_acceleration()
    alpha_x[SPIN_ORBIT_ORDER.twice] = spin_n * s.r**-1
    known2 = SPIN_ORBIT_ORDER.twice
    return (PNSeries._from_trusted(alpha_x, known2), PNSeries._from_trusted(alpha_v, known2),
            PNSeries._from_trusted({SPIN_ORBIT_ORDER.twice: -spin_lambda * s.r**-1}, known2))


def _aligned_rules() -> dict[str, dict[str, PNSeries]]:
    alpha_x, alpha_v, alpha_c = _aligned_acceleration_factors()
    one = PNSeries._from_trusted({0: ExactPolynomial(1)}, float("inf"))
    r_squared = PNSeries._from_trusted({0: ExactPolynomial("r") ** 2}, float("inf"))
    return {
        "x": {"v": one},
        "v": {"x": alpha_x, "v": alpha_v, "x_cross_e_z": alpha_c},
        # d(x cross v)/dt = x cross a = alpha_v ell + alpha_c x cross (x cross e_z) = alpha_v ell - alpha_c r^2 e_z
        "ell": {"ell": alpha_v, "e_z": -(alpha_c * r_squared)},
        "e_z": {},
        "x_cross_e_z": {"v_cross_e_z": one},
        # a cross e_z, with (x cross e_z) cross e_z = -x in the orbital plane
        "v_cross_e_z": {"x_cross_e_z": alpha_x, "v_cross_e_z": alpha_v, "x": -alpha_c},
    }


def differentiate_along_aligned_orbit(tensor: OrbitTensor, times: int = 1) -> OrbitTensor:
    """The ``times``-th time derivative of a tensor over :data:`ALIGNED_SPIN_BASIS` along the orbit
    of a binary with aligned spins (1PN point-mass plus leading spin-orbit acceleration).

    Parameters
    ----------
    tensor:
        Over :data:`ALIGNED_SPIN_BASIS` with engine coefficients.
    times:
        A non-negative int.

    Returns
    -------
    OrbitTensor
        Known through the orbit's accuracy (relative 3/2 beyond the first velocity-dependent term).

    Example
    -------
    >>> x = OrbitTensor.monomial(1, (1, 0, 0, 0, 0, 0), basis=ALIGNED_SPIN_BASIS)
    >>> sorted(differentiate_along_aligned_orbit(x, 2).terms)      # a = alpha_x x + alpha_v v + alpha_c x cross e_z
    [(0, 0, 0, 0, 1, 0), (0, 1, 0, 0, 0, 0), (1, 0, 0, 0, 0, 0)]
    """
    if isinstance(times, bool) or not isinstance(times, int) or times < 0:
        raise ValueError(f"times must be a non-negative int, got {times!r}")
    if tensor.basis.names != ALIGNED_SPIN_BASIS.names:
        raise ValueError(f"the tensor is not over the aligned-spin basis: {tensor.basis.names}")
    derivative = _SCALAR_DERIVATIVE
    rules = _aligned_rules()
    names = ALIGNED_SPIN_BASIS.names
    for _ in range(times):
        out: dict[tuple, PNSeries] = {}

        def add(key: tuple, value: PNSeries) -> None:
            out[key] = out[key] + value if key in out else value

        for key, coefficient in tensor.terms.items():
            add(key, derivative(coefficient))
            for i, exponent in enumerate(key):
                if not exponent:
                    continue
                for target, weight in rules[names[i]].items():
                    new = list(key)
                    new[i] -= 1
                    new[names.index(target)] += 1
                    add(tuple(new), coefficient * weight * exponent)
        tensor = OrbitTensor._trusted(tensor.rank, out, ALIGNED_SPIN_BASIS, tensor.provenance)
    return tensor


_SCALAR_DERIVATIVE = AlignedSpinOrbitDerivative()
