"""Source moments of a binary with spins of any direction, and their time derivatives, over a vector basis.

The moments are those of :mod:`stfalgebra.moments.spin_moments` (the 1PN orbital moments plus the
spin parts derived from the pole-dipole source, :func:`~stfalgebra.moments.spin_moments.general_spin_part`),
written over :data:`PRECESSING_BASIS`

    (x, v, ell, chi1, chi2, x cross chi1, x cross chi2, v cross chi1, v cross chi2),

``ell = x cross v`` and ``chi_A = c S_A/(G m_A^2)`` the dimensionless spin vectors
(``S_A = (G m^2 X_A^2/c) chi_A``). The time derivative acts on the *vectors*
(:func:`differentiate_along_precessing_orbit`): ``dx/dt = v``, ``dv/dt = a`` with the 1PN
point-mass and the leading spin-orbit acceleration (whose part along ``ell``, linear in the
in-plane spins, tilts the orbital plane), ``dchi_A/dt = Omega_A cross chi_A``; the rules for
``ell``, ``x cross chi_A``, ``v cross chi_A`` follow by the product rule. Each rule is obtained by
evaluating the cited inputs (:mod:`stfalgebra.binary.spin_orbit_inputs`) on a small algebra of
combinations of basis vectors, with ``a cross (b cross c) = b (a.c) - c (a.b)`` and the scalar
products taken on the instantaneous triad; terms quadratic in the spins are dropped (spin-spin,
not entered). Coefficients are engine polynomials in r, rdot, phidot, the spin components
(:data:`~stfalgebra.binary.precessing_dynamics.SPIN_COMPONENTS`) and constants, differentiated
by :class:`~stfalgebra.binary.precessing_dynamics.PrecessingOrbitDerivative`. Working with the
vectors rather than with components on the moving triad avoids the triad's tilt rate
``(a.ell)/(r phidot)`` (singular at ``phidot = 0``): every coefficient stays a polynomial.

**Conventions** (instantaneous source frame, :mod:`stfalgebra.binary.precessing_dynamics`): the
orbital plane is the x-y plane at the instant, ``n = (cos phi, sin phi, 0)``,
``lambda = e_z cross n``, ``ell = e_z``; on the spinor probes ``Z+- = k.(n +- i lambda)``,
``u_z = k.e_z`` (:mod:`stfalgebra.moments.orbit_tensor`) a spin has
``chi.k = ((chi_n - i chi_lambda)/2) Z+ + ((chi_n + i chi_lambda)/2) Z- + chi_ell u_z``, so the
in-plane components feed the channels without ``u_z`` of current moments and the ``u_z`` channels
of mass moments: every mode receives both kinds of moment, and ``Hhat_{l,-m} = (-1)^l
conj(Hhat_lm)`` does not hold.
"""

from __future__ import annotations

from fractions import Fraction
from functools import lru_cache
from typing import Any

from ..binary.cited_inputs import acceleration_n_factor, acceleration_v_factor
from ..binary.precessing_dynamics import PrecessingOrbitDerivative, general_spin_namespace
from ..binary.spin_orbit_inputs import precession_frequencies, spin_orbit_acceleration
from ..binary.spin_variables import SPIN_ORBIT_ORDER, SPINNING_KNOWN_THROUGH, spin_combinations
from ..exact import ExactPolynomial, engine_symbols
from ..pnseries import PNSeries
from .current import current_moment
from .mass import mass_moment
from .orbit_tensor import OrbitTensor, VectorBasis
from .point_particles import mass_fractions
from .spin_moments import GENERAL_SPIN_VECTORS, SPIN_PART_KNOWN_THROUGH, general_spin_part

__all__ = [
    "PRECESSING_BASIS", "VectorCombination", "precessing_derivative_rules", "precessing_spin_part",
    "precessing_mass_moment", "precessing_current_moment", "differentiate_along_precessing_orbit",
]

_NAMES = ("x", "v", "ell", "chi1", "chi2", "x_cross_chi1", "x_cross_chi2", "v_cross_chi1", "v_cross_chi2")
_ZERO = ExactPolynomial(0)


def _components() -> tuple:
    s = engine_symbols()
    half = ExactPolynomial(1) / 2
    out = [
        (s.r * half, s.r * half, _ZERO),
        ((s.rdot - s.I * s.r * s.phidot) * half, (s.rdot + s.I * s.r * s.phidot) * half, _ZERO),
        (_ZERO, _ZERO, s.r**2 * s.phidot),
    ]
    spins = [[ExactPolynomial(f"chi{a}_{k}") for k in ("n", "lambda", "ell")] for a in (1, 2)]
    for n, lam, ell in spins:
        out.append(((n - s.I * lam) * half, (n + s.I * lam) * half, ell))
    for n, lam, ell in spins:        # x cross chi = r (chi_lambda ell - chi_ell lambda)
        out.append((s.I * s.r * ell * half, -s.I * s.r * ell * half, s.r * lam))
    for n, lam, ell in spins:        # v cross chi = r phidot chi_ell n - rdot chi_ell lambda + (rdot chi_lambda - r phidot chi_n) ell
        out.append(((s.r * s.phidot + s.I * s.rdot) * ell * half, (s.r * s.phidot - s.I * s.rdot) * ell * half,
                    s.rdot * lam - s.r * s.phidot * n))
    return tuple(out)


def _rules_ignoring_factors(alpha_x: Any, alpha_v: Any) -> dict[str, dict[str, PNSeries]]:
    return precessing_derivative_rules()


#: Vectors of a binary with spins of any direction (module docstring).
PRECESSING_BASIS = VectorBasis(_NAMES, _components(), _rules_ignoring_factors)


# ----------------------------------------------------------------------------- vector algebra
class VectorCombination:
    """A linear combination of the vectors of :data:`PRECESSING_BASIS` with engine coefficients.

    Enough algebra to evaluate the cited inputs (``+``, ``-``, scalar ``*``, :func:`_cross`,
    :func:`_dot`); a product quadratic in the spins raises ``ArithmeticError``.

    Example
    -------
    >>> 2 * VectorCombination({"x": 1}) - VectorCombination({"v": 1})
    VectorCombination({'x': 2, 'v': -1})
    """

    __slots__ = ("terms",)

    def __init__(self, terms: dict) -> None:
        self.terms = {k: ExactPolynomial(v) if isinstance(v, (int, Fraction)) else v
                      for k, v in terms.items()}
        self.terms = {k: v for k, v in self.terms.items() if not v.is_zero()}

    def __add__(self, other: "VectorCombination") -> "VectorCombination":
        out = dict(self.terms)
        for k, v in other.terms.items():
            out[k] = out[k] + v if k in out else v
        return VectorCombination(out)

    def __sub__(self, other: "VectorCombination") -> "VectorCombination":
        return self + other * -1

    def __neg__(self) -> "VectorCombination":
        return self * -1

    def __mul__(self, scalar: Any) -> "VectorCombination":
        if isinstance(scalar, VectorCombination):
            return NotImplemented
        return VectorCombination({k: v * scalar for k, v in self.terms.items()})

    __rmul__ = __mul__

    def __repr__(self) -> str:
        return f"VectorCombination({ {k: str(v) if not v.is_constant() else v.to_sympy() for k, v in self.terms.items()} })"


def _scalar_products() -> dict[tuple[str, str], ExactPolynomial]:
    s = engine_symbols()
    table = {("x", "x"): s.r**2, ("x", "v"): s.r * s.rdot, ("v", "v"): s.rdot**2 + s.r**2 * s.phidot**2,
             ("x", "ell"): _ZERO, ("v", "ell"): _ZERO, ("ell", "ell"): s.r**4 * s.phidot**2}
    for a in (1, 2):
        n, lam, ell = (ExactPolynomial(f"chi{a}_{k}") for k in ("n", "lambda", "ell"))
        table[("x", f"chi{a}")] = s.r * n
        table[("v", f"chi{a}")] = s.rdot * n + s.r * s.phidot * lam
        table[("ell", f"chi{a}")] = s.r**2 * s.phidot * ell
    table.update({(b, a): v for (a, b), v in list(table.items())})
    return table


_ORBITAL = ("x", "v", "ell")


def _dot_names(a: str, b: str) -> ExactPolynomial:
    try:
        return _SCALARS[(a, b)]
    except KeyError:
        raise ArithmeticError(f"the scalar product {a}.{b} is quadratic in the spins or not needed") from None


def _cross_names(a: str, b: str) -> VectorCombination:
    """``a cross b`` for two basis vectors, linear in the spins."""
    if a == b:
        return VectorCombination({})
    if b in _ORBITAL and a not in _ORBITAL:
        return -_cross_names(b, a)
    if (a, b) == ("x", "v"):
        return VectorCombination({"ell": 1})
    if (a, b) == ("v", "x"):
        return VectorCombination({"ell": -1})
    if a in _ORBITAL and b in _ORBITAL:
        # a cross (x cross v) = x (a.v) - v (a.x); (x cross v) cross b = -(b cross ell)
        if b == "ell":
            return VectorCombination({"x": _dot_names(a, "v"), "v": -_dot_names(a, "x")})
        return -_cross_names(b, a)
    if b in ("chi1", "chi2") and a in ("x", "v"):
        return VectorCombination({f"{a}_cross_{b}": 1})
    if b in ("chi1", "chi2") and a == "ell":
        # (x cross v) cross chi = v (x.chi) - x (v.chi)
        return VectorCombination({"v": _dot_names("x", b), "x": -_dot_names("v", b)})
    if a in ("x", "v") and "_cross_" in b:
        inner, spin = b.split("_cross_")
        # a cross (inner cross chi) = inner (a.chi) - chi (a.inner)
        return VectorCombination({inner: _dot_names(a, spin), spin: -_dot_names(a, inner)})
    raise ArithmeticError(f"the cross product {a} x {b} is quadratic in the spins or not needed")


def _cross(u: VectorCombination, w: VectorCombination) -> VectorCombination:
    out = VectorCombination({})
    for a, ca in u.terms.items():
        for b, cb in w.terms.items():
            out = out + _cross_names(a, b) * (ca * cb)
    return out


def _dot(u: VectorCombination, w: VectorCombination) -> ExactPolynomial:
    total = _ZERO
    for a, ca in u.terms.items():
        for b, cb in w.terms.items():
            total = total + _dot_names(a, b) * ca * cb
    return total


@lru_cache(maxsize=1)
def _vector_namespace():
    from types import SimpleNamespace

    values = dict(vars(general_spin_namespace()))
    chi1, chi2 = VectorCombination({"chi1": 1}), VectorCombination({"chi2": 1})
    spin, difference = spin_combinations(chi1, chi2, values["delta"])
    values.update(x=VectorCombination({"x": 1}), v=VectorCombination({"v": 1}), spin=spin,
                  spin_difference=difference, cross=_cross, dot=_dot)
    return SimpleNamespace(**values)


@lru_cache(maxsize=1)
def precessing_derivative_rules() -> dict[str, dict[str, PNSeries]]:
    """For each vector of :data:`PRECESSING_BASIS`, its time derivative ``{vector: PN series}``.

    Returns
    -------
    dict
        Known through relative order 3/2 (the spin-orbit terms at ``1/c^3``, the precession at
        ``1/c^2``, the 1PN point-mass acceleration); linear in the spins.

    Example
    -------
    >>> sorted(precessing_derivative_rules()["chi1"])        # Omega_1 x chi_1 = W_1 (v (n.chi_1) r - x (v.chi_1))/(r^2 phidot)
    ['v', 'x']

    References
    ----------
    :func:`~stfalgebra.binary.spin_orbit_inputs.spin_orbit_acceleration`,
    :func:`~stfalgebra.binary.spin_orbit_inputs.precession_frequencies` (Kidder 1995, from memory).
    """
    s = _vector_namespace()
    e = engine_symbols()
    x, v = s.x, s.v
    acceleration: dict[int, VectorCombination] = {}
    alpha, beta = acceleration_n_factor(e), acceleration_v_factor(e)
    for k in (0, 1):
        acceleration[2 * k] = x * (alpha.get(k, _ZERO) * e.r**-1) + v * beta.get(k, _ZERO)
    acceleration[SPIN_ORBIT_ORDER.twice] = spin_orbit_acceleration(s)[SPIN_ORBIT_ORDER]
    omegas = precession_frequencies(s)
    pieces: dict[str, dict[int, VectorCombination]] = {
        "x": {0: v},
        "v": dict(acceleration),
        "ell": {k: _cross(x, a) for k, a in acceleration.items()},
    }
    for a, omega in zip((1, 2), omegas):
        chi = VectorCombination({f"chi{a}": 1})
        turn = _cross(omega, chi)
        pieces[f"chi{a}"] = {2: turn}
        pieces[f"x_cross_chi{a}"] = {0: VectorCombination({f"v_cross_chi{a}": 1}), 2: _cross(x, turn)}
        # a_SO cross chi is quadratic in the spins (spin-spin): not entered
        pieces[f"v_cross_chi{a}"] = {k: _cross(acc, chi) for k, acc in acceleration.items() if k < 3}
        pieces[f"v_cross_chi{a}"][2] = pieces[f"v_cross_chi{a}"][2] + _cross(v, turn)
    known2 = SPINNING_KNOWN_THROUGH.twice
    rules: dict[str, dict[str, PNSeries]] = {}
    for name, by_order in pieces.items():
        collected: dict[str, dict[int, ExactPolynomial]] = {}
        for k2, combination in by_order.items():
            for target, value in combination.terms.items():
                collected.setdefault(target, {})[k2] = value
        rules[name] = {target: PNSeries._from_trusted(values, known2) for target, values in collected.items()}
    return rules


# ----------------------------------------------------------------------------- moments
_SPIN_NAMES = {"x": "x", "v": "v", "S1": "chi1", "S2": "chi2", "x_cross_S1": "x_cross_chi1",
               "x_cross_S2": "x_cross_chi2", "v_cross_S1": "v_cross_chi1", "v_cross_S2": "v_cross_chi2"}


@lru_cache(maxsize=None)
def precessing_spin_part(kind: str, l: int) -> OrbitTensor:
    """The spin part of ``I_L`` or ``J_L`` over :data:`PRECESSING_BASIS` (spins of any direction).

    Parameters
    ----------
    kind:
        ``"mass"`` or ``"current"``.
    l:
        ``l >= 1``.

    Returns
    -------
    OrbitTensor
        :func:`~stfalgebra.moments.spin_moments.general_spin_part` with ``S_A = (G m^2 X_A^2/c) chi_A``:
        the current part at order 1/2, the mass part at 3/2.

    Example
    -------
    >>> part = precessing_spin_part("current", 2)
    >>> part.terms[(1, 0, 0, 1, 0, 0, 0, 0, 0)].coefficient(Fraction(1, 2))     # (3/4)(1 - delta) X1^2 G m^2
    3*nu*G*m**2/4 + 3*nu*delta*G*m**2/4

    References
    ----------
    :func:`~stfalgebra.moments.spin_moments.general_spin_part` (pole-dipole source in the general formulas).
    """
    general = general_spin_part(kind, l)
    s = engine_symbols()
    x1, x2 = mass_fractions()
    magnitudes = {"1": s.G * s.m**2 * x1 * x1, "2": s.G * s.m**2 * x2 * x2}
    order2 = general.inverse_c_power + 1      # eps power: c^-(inverse_c_power) and S_A ~ 1/c
    known2 = SPIN_PART_KNOWN_THROUGH[kind].twice
    terms: dict[tuple, ExactPolynomial] = {}
    for key, value in general.terms.items():
        new = [0] * len(_NAMES)
        factor = value
        for name, exponent in zip(GENERAL_SPIN_VECTORS, key):
            if exponent:
                new[_NAMES.index(_SPIN_NAMES[name])] += exponent
                if name[-1] in magnitudes:
                    factor = factor * magnitudes[name[-1]] ** exponent
        new = tuple(new)
        terms[new] = terms[new] + factor if new in terms else factor
    return OrbitTensor._trusted(
        l, {k: PNSeries._from_trusted({order2: v}, known2) for k, v in terms.items() if not v.is_zero()},
        PRECESSING_BASIS,
        (f"{kind} moment, l = {l}: spin part at leading order, pole-dipole source in the general formula, "
         "spins of any direction",))


def _lift(tensor: OrbitTensor) -> OrbitTensor:
    if tensor.basis.names != ("x", "v", "ell"):
        raise ValueError(f"only tensors over the planar basis (x, v, ell) lift, got {tensor.basis.names}")
    pad = (0,) * (len(_NAMES) - 3)
    return OrbitTensor._trusted(tensor.rank, {key + pad: value for key, value in tensor.terms.items()},
                                PRECESSING_BASIS, tensor.provenance)


@lru_cache(maxsize=None)
def precessing_mass_moment(l: int) -> OrbitTensor:
    """``I_L`` with spins of any direction: the 1PN orbital moment plus the spin part (through 3/2).

    Example
    -------
    >>> sorted(precessing_mass_moment(2).terms)[:2]
    [(0, 1, 0, 0, 0, 0, 1, 0, 0), (0, 1, 0, 0, 0, 1, 0, 0, 0)]
    """
    moment = _lift(mass_moment(l, 1)) + precessing_spin_part("mass", l)
    return moment.truncate(SPIN_PART_KNOWN_THROUGH["mass"]).with_provenance(
        f"I_L, l = {l}: 1PN orbital moment plus the leading spin part (spins of any direction)")


@lru_cache(maxsize=None)
def precessing_current_moment(l: int) -> OrbitTensor:
    """``J_L`` with spins of any direction: the 1PN orbital moment plus the spin part (through 1).

    Example
    -------
    >>> sorted(precessing_current_moment(2).terms)[:2]
    [(0, 1, 1, 0, 0, 0, 0, 0, 0), (1, 0, 0, 0, 1, 0, 0, 0, 0)]
    """
    moment = _lift(current_moment(l, 1)) + precessing_spin_part("current", l)
    return moment.truncate(SPIN_PART_KNOWN_THROUGH["current"]).with_provenance(
        f"J_L, l = {l}: 1PN orbital moment plus the leading spin part (spins of any direction)")


_SCALAR_DERIVATIVE = PrecessingOrbitDerivative()


def differentiate_along_precessing_orbit(tensor: OrbitTensor, times: int = 1) -> OrbitTensor:
    """The ``times``-th time derivative of a tensor over :data:`PRECESSING_BASIS` (module docstring).

    Parameters
    ----------
    tensor:
        Over :data:`PRECESSING_BASIS`, engine coefficients.
    times:
        A non-negative int.

    Returns
    -------
    OrbitTensor
        Linear in the spins; known through the orbit's accuracy (relative 3/2 beyond the first
        velocity- or spin-dependent term).

    Example
    -------
    >>> x = OrbitTensor.monomial(1, (1,) + (0,) * 8, basis=PRECESSING_BASIS)
    >>> [key.index(1) for key in differentiate_along_precessing_orbit(x, 2).terms]      # a: x, v, x cross chi_A, v cross chi_A
    [8, 7, 6, 5, 1, 0]
    """
    if isinstance(times, bool) or not isinstance(times, int) or times < 0:
        raise ValueError(f"times must be a non-negative int, got {times!r}")
    if tensor.basis.names != _NAMES:
        raise ValueError(f"the tensor is not over the precessing basis: {tensor.basis.names}")
    for _ in range(times):
        tensor = tensor.time_derivative(_SCALAR_DERIVATIVE, None, None)
    return tensor


_SCALARS = _scalar_products()
