"""The relative 2.5PN parts of U^(1)_ij for the STF route of the circular flux, in the time domain.

The second route of :mod:`stfalgebra.radiative.fluxes` contracts ``U^(1)_L U^(1)_L`` as probe
polynomials ``U^(1)_L k_L`` at phi = 0 (x = r e_1, v = r omega e_2 + rdot e_1, ell = r^2 omega e_3),
with the STF core. Through relative 2.5PN the mass quadrupole needs, besides the instantaneous
terms through 2PN:

- the tail with the 1PN moment and the ADM mass (:func:`tail_polynomial_with_adm_mass`): the
  1PN moment at t - tau is the moment at t rotated by -omega tau (exact on a circle), so each
  harmonic exp(i s omega tau) of it integrates with the derived kernel
  (:func:`~stfalgebra.radiative.tails.tail_kernel`);
- the radiation-reaction part (:func:`reaction_rate_polynomial`): the third derivative of the
  Newtonian I_ij along the inspiralling orbit (orbit-tensor derivative with the reaction
  acceleration; rdot_RR in the coefficients and in v), the third derivative of the derived 2.5PN
  term of I_ij (:mod:`stfalgebra.moments.mass_reaction`), of the canonical correction ``(4 G/c^5)(W^(2) I - W^(1) I^(1))``, and the first
  derivative of the quadratic terms of the MPM iteration (a memory term's derivative is its
  integrand), the products contracted as polynomials:
  ``A_ai B_aj k_i k_j = (1/4) grad A(k) . grad B(k)``,
  ``eps_iab S_a M_bj k_i k_j = (1/2) k . (S x grad M(k))``.

These share with the mode route only the inputs (moments, the 2.5PN term of I_ij, cited reaction inputs, the tabulated
interaction terms); the projection, the harmonics and the contractions are separate.

**Conventions**: sympy expressions with c explicit, in r, omega, G, m, nu, delta and the probes
k1, k2, k3 of :mod:`stfalgebra.stf.cartesian`.
"""

from __future__ import annotations

from fractions import Fraction
from functools import lru_cache

from ..lazy_sympy import sp
from ..moments.orbit_tensor import OrbitTensor, differentiate_along_orbit
from ..pnseries import PNSeries

__all__ = ["tail_polynomial_with_adm_mass", "reaction_rate_polynomial"]


def _symbols():
    from .. import symbols as S

    return S


def _reference(terms: dict, rdot=0):
    """sum s (x.k)^a (v.k)^b (ell.k)^c at phi = 0 (v with a radial part rdot)."""
    from ..stf.cartesian import PROBE

    S = _symbols()
    k1, k2, k3 = PROBE
    xk, vk, lk = S.r * k1, S.r * S.omega * k2 + rdot * k1, S.r**2 * S.omega * k3
    return sp.expand(sp.Add(*[coeff * xk**a * vk**b * lk**cc for (a, b, cc), coeff in terms.items()]))


def _sympy_terms(tensor: OrbitTensor, through) -> dict:
    """{key: sympy coefficient} with eps = 1/c, on the circle (rdot = 0, phidot = omega)."""
    S = _symbols()
    out = {}
    for key, series in tensor.terms.items():
        expr = series.truncate(through).to_expression(S.eps).subs(S.eps, 1 / S.c)
        out[key] = sp.expand(expr.subs({S.rdot: 0, S.phidot: S.omega}))
    return out


def _kepler(expr):
    """G -> omega^2 r^3/m inside terms that are already of relative order 5/2."""
    S = _symbols()
    return sp.expand(expr.subs(S.G, S.omega**2 * S.r**3 / S.m))


@lru_cache(maxsize=None)
def tail_polynomial_with_adm_mass(kind: str, l: int):
    """``(M/m) int_0^oo dtau M_L^(l+3)(t - tau)[ln(c tau/(2 r0)) + k_l]`` at phi = 0 for the
    1PN moment on the circular orbit, M/m = 1 + nu (v^2/2 - G m/r)/c^2 (the binding energy).

    Example
    -------
    >>> S = _symbols()
    >>> tail_polynomial_with_adm_mass("mass", 2).has(S.c)
    True
    """
    from ..moments.current import current_moment
    from ..moments.mass import mass_moment
    from .fluxes import _rotation_back
    from .tails import tail_kernel

    S = _symbols()
    moment = mass_moment(l, 1) if kind == "mass" else current_moment(l, 1)
    terms = _sympy_terms(moment, Fraction(1))
    total = sp.Integer(0)
    for s, part in _rotation_back(terms).items():
        if s == 0:
            continue            # a constant part has no derivative
        # the (l+3)-th derivative of the harmonic exp(-i s omega t') is (-i s omega)^(l+3); the
        # integral of exp(i s omega tau)[ln + k_l] is K(s omega)/(-i s omega)^2
        total += (-sp.I * s * S.omega) ** (l + 1) * tail_kernel(l, kind, s * S.omega) * part
    adm_ratio = 1 + S.nu * (S.r**2 * S.omega**2 / 2 - S.G * S.m / S.r) / S.c**2
    return sp.expand(total * adm_ratio)


def _probe_gradient(poly):
    from ..stf.cartesian import PROBE

    return [sp.diff(poly, k) for k in PROBE]


def _quadratic_rate_polynomial():
    """d/dt of the quadratic terms of U_ij at relative 2.5PN (G/c^5 included), circular orbit."""
    from ..moments.mass import mass_moment
    from ..stf.cartesian import PROBE, harmonic_part_cartesian
    from .interaction_table import radiative_terms

    S = _symbols()

    def factor(name: str, rank: int, times: int):
        if name == "S" and rank == 1:
            return 0 if times else S.nu * S.m * S.r**2 * S.omega * PROBE[2]     # S = nu m ell
        if name == "M" and rank == 2:
            derived = differentiate_along_orbit(mass_moment(2, 0), 0, times=times)
            # the orbit tensor's STF bracket is implied; a contraction sees the traces, so take
            # the harmonic (STF) part of the probe polynomial first
            return harmonic_part_cartesian(_kepler(_reference(_sympy_terms(derived, Fraction(0)))), 2)
        raise ValueError(f"unexpected factor {name}_{rank} in U_ij")

    def pair(term, left, right):
        if term.epsilon == 0 and term.contractions == 1:
            return sp.Add(*[a * b for a, b in zip(_probe_gradient(left), _probe_gradient(right))]) / 4
        if term.epsilon == 1 and term.contractions == 0:
            spin = _probe_gradient(left)
            grad = _probe_gradient(right)
            cross = sp.Matrix(spin).cross(sp.Matrix(grad))
            return sp.Add(*[k * v for k, v in zip(PROBE, cross)]) / 2
        raise ValueError(f"unexpected product in U_ij: {term}")

    total = sp.Integer(0)
    for term in radiative_terms("U", 2, Fraction(5, 2)):
        if term.kind not in ("instantaneous", "memory") or term.order != Fraction(5, 2):
            continue
        (n1, r1, p), (n2, r2, q) = term.factors
        # d/dt of an instantaneous product (Leibniz); of a memory integral: its integrand
        splits = [(p, q)] if term.kind == "memory" else [(p + 1, q), (p, q + 1)]
        for a, b in splits:
            total += term.coefficient * pair(term, factor(n1, r1, a), factor(n2, r2, b))
    return sp.expand(total * S.G / S.c**5)


def _inspiral_rate_polynomial():
    """The 2.5PN part of I_ij^(3) (Newtonian I_ij) along the inspiralling orbit."""
    from ..binary.cited_inputs import (
        REACTION_ORDER, acceleration_n_factor, acceleration_reaction_n_factor, acceleration_reaction_v_factor,
    )
    from ..binary.orbit_derivative import derivative_with_rates
    from ..exact import engine_symbols
    from ..moments.mass import mass_moment
    from .circular_reaction import inspiral_rates, inspiral_radial_velocity

    S = _symbols()
    e = engine_symbols()
    k = REACTION_ORDER.twice
    alpha_x = PNSeries._from_trusted({0: acceleration_n_factor(e)[0] / e.r,
                                      k: acceleration_reaction_n_factor(e)[REACTION_ORDER] / e.r}, k)
    alpha_v = PNSeries._from_trusted({k: acceleration_reaction_v_factor(e)[REACTION_ORDER]}, k)
    rates = inspiral_rates()

    def scalar_derivative(series: PNSeries) -> PNSeries:
        out: dict[int, object] = {}
        for k2, coefficient in series._terms:
            for offset, piece in derivative_with_rates(coefficient, *rates):
                if k2 + offset <= k:
                    out[k2 + offset] = out[k2 + offset] + piece if k2 + offset in out else piece
        return PNSeries._from_trusted(out, k)

    # the Newtonian moment's own 1PN, 2PN and 2.5PN terms are other terms of U_ij: only the
    # dynamics' reaction part of its derivatives is taken here (the 1/c^5 part below)
    tensor = mass_moment(2, 0).truncate(0)
    tensor = OrbitTensor._trusted(2, {key: PNSeries._from_trusted(dict(v._terms), k) for key, v in tensor.terms.items()},
                                  tensor.basis)
    for _ in range(3):
        tensor = tensor.time_derivative(scalar_derivative, alpha_x, alpha_v)
    rdot_rr = sp.sympify(inspiral_radial_velocity().to_sympy()).subs(S.phidot, S.omega) / S.c**5
    terms = {}
    for key, series in tensor.terms.items():
        expr = series.to_expression(S.eps).subs(S.eps, 1 / S.c).subs(S.phidot, S.omega)
        # along the inspiral: P(rdot_RR) = P(0) + rdot_RR P'(0) + O(c^-10)
        terms[key] = expr.subs(S.rdot, 0) + rdot_rr * sp.diff(expr, S.rdot).subs(S.rdot, 0)
    full = sp.expand(_reference(terms, rdot=rdot_rr))
    # keep the 1/c^5 part: the rest is the Newtonian I^(3) (instantaneous route) or O(c^-10)
    return _kepler(sp.expand(full.coeff(S.c, -5) / S.c**5))


def _cited_rate_polynomial():
    """I_ij^(3) of the derived 2.5PN term of I_ij, and of the canonical correction, circular orbit."""
    from ..binary.orbit_derivative import OrbitTimeDerivative
    from ..moments.canonical import gauge_moment_w
    from ..moments.mass import mass_moment
    from ..moments.mass_reaction import reaction_mass_moment_circular

    cited = differentiate_along_orbit(reaction_mass_moment_circular(2), 0, times=3)
    derivative = OrbitTimeDerivative(0)
    w1 = derivative(gauge_moment_w())
    w2 = derivative(w1)
    moment = mass_moment(2, 0)
    rate = differentiate_along_orbit(moment, 0, times=1)
    correction = moment.scale(w2) - rate.scale(w1)
    correction = differentiate_along_orbit(correction.scale(4), 0, times=3)
    S = _symbols()
    cited_poly = _reference(_sympy_terms(cited, Fraction(5, 2)))
    gauge_poly = _reference(_sympy_terms(correction, Fraction(0))) * S.G / S.c**5
    return _kepler(sp.expand(cited_poly + gauge_poly))


@lru_cache(maxsize=None)
def reaction_rate_polynomial():
    """The relative 2.5PN, non-tail part of U^(1)_ij at phi = 0 on the inspiralling circular orbit.

    Example
    -------
    >>> S = _symbols()
    >>> reaction_rate_polynomial().has(S.c)
    True
    """
    return sp.expand(_inspiral_rate_polynomial() + _cited_rate_polynomial() + _quadratic_rate_polynomial())
