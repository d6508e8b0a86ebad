"""Energy and angular-momentum fluxes, by two independent routes.

Route (a), from the modes (``../shared/conventions.md``):
    F = (R^2 c^3/(16 pi G)) sum_lm |dh_lm/dt|^2,
    dJ_z/dt = (R^2 c^3/(16 pi G)) sum_lm m Im[h_lm conj(dh_lm/dt)].
On a circular orbit dh_lm/dt = -i m omega h_lm, so with the output normalisation
F / ((32/5)(c^5/G) nu^2 x^5) = (1/8) sum_lm m^2 |Hhat_lm|^2 and F = omega dJ_z/dt.

Route (b), the multipole formula in STF contractions of the radiative moments (Thorne 1980,
Rev. Mod. Phys. 52, 299, eq. (4.16'); Blanchet, Living Rev. Relativ. 17, 2 (2014), eq. (68a)):
    F = sum_l (G/c^(2l+1)) [ (l+1)(l+2)/((l-1) l l! (2l+1)!!) U^(1)_L U^(1)_L
                            + 4 l (l+2)/(c^2 (l-1) (l+1)! (2l+1)!!) V^(1)_L V^(1)_L ],
with U_L = d^l I_L/dt^l, V_L = d^l J_L/dt^l built as tensors of x, v, ell and contracted with
the STF core (harmonic projection and full contraction of Cartesian polynomials), without
spherical harmonics or the alpha_L^lm: the two routes share only the source moments.
From 1.5PN the tail enters U^(1)_L (V^(1)_L likewise):

    U^(1)_L = I^(l+1)_L + (2 G M/c^3) int_0^oo dtau I^(l+3)_L(t - tau) [ln(c tau/(2 r0)) + kappa_l],

evaluated here in the time domain: on the Newtonian circular orbit x(t - tau) and v(t - tau)
are x(t), v(t) rotated by -omega tau about ell,

    x(t - tau) = cos(omega tau) x - sin(omega tau) v/omega,
    v(t - tau) = cos(omega tau) v + omega sin(omega tau) x,

so the integrand is a trigonometric polynomial in omega tau with tensor coefficients, and each
exp(i s omega tau) integrates to the derived kernel
(:func:`~stfalgebra.radiative.tails.tail_kernel`) divided by (-i s omega)^2. Only U_ij's tail
reaches the flux at 1.5PN; the others start at 2.5PN.
"""

from __future__ import annotations

from functools import lru_cache
from math import factorial, prod
from typing import Any

from ..binary.circular_frequency import gamma_over_x, gamma_over_x_with_reaction
from ..lazy_sympy import sp
from ..moments.current import current_moment
from ..moments.mass import mass_moment
from ..moments.orbit_tensor import differentiate_along_orbit
from ..orders import PNOrder, parse_pn_order
from ..pnseries import PNSeries
from .contributions import leading_order, maximum_flux_order, plan_radiative_moment, table_for_spins
from .modes import derive_mode

__all__ = ["circular_energy_flux_from_modes", "circular_energy_flux_from_moments", "circular_flux_term_provenance",
           "multipole_flux_term",
           "circular_angular_momentum_flux_from_modes", "check_flux_order"]


def check_flux_order(pn: Any, orbit: str = "circular") -> PNOrder:
    """A flux order, parsed and bounded by the table of contributions.

    Example
    -------
    >>> check_flux_order("3/2")
    PNOrder(3/2)
    """
    return parse_pn_order(pn, "pn", maximum=maximum_flux_order(orbit))


def _contributing_modes(order: PNOrder):
    """Modes (l, m), m != 0, whose |Hhat_lm|^2 starts at or below x^order."""
    l = 2
    while True:
        found = False
        for m in range(-l, l + 1):
            if m == 0:
                continue
            n0 = leading_order(l, m)
            if 2 * n0 <= order:
                found = True
                yield l, m, n0
        if not found and l > 2 * order + 3:
            return
        l += 1


def _sum_over_modes(order: PNOrder) -> PNSeries:
    """sum_lm m^2 |Hhat_lm|^2 / 8 through x^order, each mode taken to the order its
    |Hhat_lm|^2 needs. On a circular orbit dh_lm/dt = -i m omega h_lm, so both fluxes are
    this sum (their normalisations differ by omega)."""
    total = PNSeries._from_trusted({}, order.twice)
    for l, m, n0 in _contributing_modes(order):
        result = derive_mode(l, m, pn=order - n0)
        series = result.series
        square = series * series.map_coefficients(lambda v: v.conjugate())
        total = total + square * (result.constant.squared() * m * m / 8)
    return total.truncate(order)


@lru_cache(maxsize=None, typed=True)   # typed: pn=True or 1.0 must reach the validation, not 1's entry
def circular_energy_flux_from_modes(pn: Any) -> PNSeries:
    """Circular-orbit energy flux / ((32/5)(c^5/G) nu^2 x^5), summed over the modes.

    Returns a PN series in eps = sqrt(x) through x^pn (engine coefficients).

    Example
    -------
    >>> from stfalgebra.radiative.fluxes import circular_energy_flux_from_modes
    >>> circular_energy_flux_from_modes(1).coefficient(1)
    -1247/336 - 35*nu/12
    """
    # |dh/dt|^2 = |-i m omega|^2 |h|^2
    return _sum_over_modes(check_flux_order(pn))


@lru_cache(maxsize=None, typed=True)   # typed: pn=True or 1.0 must reach the validation, not 1's entry
def circular_angular_momentum_flux_from_modes(pn: Any) -> PNSeries:
    """Circular-orbit dJ_z/dt / ((32/5) m c^2 nu^2 x^(7/2)), summed over the modes.

    From m Im[h conj(dh/dt)] with dh/dt = -i m omega h (weight m Im(i m) = m^2); F = omega dJ_z/dt
    follows (tested).
    """
    return _sum_over_modes(check_flux_order(pn))


# ------------------------------------------------------------------ route (b): the STF formula
def _sympy_symbols():
    from .. import symbols as S

    return S


def _cartesian_at_reference(tensor_terms: dict, rank: int) -> Any:
    """Cartesian polynomial of sum s (x.k)^a (v.k)^b (ell.k)^c at phi = 0 on a circular orbit:
    x = (r, 0, 0), v = (0, r omega, 0), ell = (0, 0, r^2 omega)."""
    from ..stf.cartesian import PROBE

    S = _sympy_symbols()
    k1, k2, k3 = PROBE
    xk, vk, lk = S.r * k1, S.r * S.omega * k2, S.r**2 * S.omega * k3
    return sp.expand(sp.Add(*[coeff * xk**a * vk**b * lk**cc for (a, b, cc), coeff in tensor_terms.items()]))


def _radiative_tensor_terms(kind: str, l: int, moment_order: int, eom_order: int, relative: PNOrder) -> dict:
    """Terms of d^(l+1)/dt^(l+1) of the source moment on a circular orbit, as c-expressions."""
    S = _sympy_symbols()
    eps = S.eps
    moment = mass_moment(l, moment_order) if kind == "mass" else current_moment(l, moment_order)
    derived = differentiate_along_orbit(moment, eom_order, times=l + 1)
    out = {}
    for key, series in derived.terms.items():
        expr = series.truncate(min(series.known_through, relative)).to_expression(eps).subs(eps, 1 / S.c)
        out[key] = expr.subs({S.rdot: 0, S.phidot: S.omega})
    return out


def _rotation_back(terms: dict) -> dict[int, Any]:
    """Harmonics of a circular-orbit tensor sum s (x.k)^a (v.k)^b (ell.k)^c at t - tau.

    Returns {s: P_s} with the tensor at t - tau equal to sum_s P_s exp(i s omega tau), each
    P_s a polynomial in the probes X = x.k, V = v.k, L = ell.k (as the Cartesian polynomial
    at phi = 0 of :func:`_cartesian_at_reference`)."""
    from ..stf.cartesian import PROBE

    S = _sympy_symbols()
    k1, k2, k3 = PROBE
    X, V, L = S.r * k1, S.r * S.omega * k2, S.r**2 * S.omega * k3
    E = sp.Symbol("E_rot", positive=True)      # exp(i omega tau)
    cos = (E + 1 / E) / 2
    sin = (E - 1 / E) / (2 * sp.I)
    X_back = cos * X - sin * V / S.omega
    V_back = cos * V + S.omega * sin * X
    total = sp.Add(*[coeff * X_back**a * V_back**b * L**cc for (a, b, cc), coeff in terms.items()])
    degree = max((a + b for (a, b, _) in terms), default=0)
    poly = sp.Poly(sp.expand(total * E**degree), E)
    return {int(k) - degree: sp.expand(value) for (k,), value in poly.terms()}


@lru_cache(maxsize=None)
def _circular_tail_polynomial(kind: str, l: int) -> Any:
    """Cartesian polynomial (at phi = 0) of int_0^oo dtau M_L^(l+3)(t - tau) [ln(c tau/(2 r0)) + k_l]
    for the Newtonian moment M_L (I_L or J_L) on the Newtonian circular orbit."""
    from .tails import tail_kernel

    S = _sympy_symbols()
    moment = mass_moment(l, 0) if kind == "mass" else current_moment(l, 0)
    derived = differentiate_along_orbit(moment, 0, times=l + 3)
    terms = {}
    for key, series in derived.terms.items():
        expr = sp.sympify(series.coefficient(0)).subs({S.rdot: 0, S.phidot: S.omega})
        terms[key] = sp.expand(expr.subs(S.G, S.omega**2 * S.r**3 / S.m))   # G m = omega^2 r^3
    total = sp.Integer(0)
    for s, part in _rotation_back(terms).items():
        if s == 0:
            if part != 0:
                raise AssertionError(f"zero-frequency part {part} of a derivative on a circular orbit")
            continue
        # int_0^oo dtau exp(i s omega tau) [ln(c tau/(2 r0)) + k_l] = K(s omega)/(-i s omega)^2
        weight = tail_kernel(l, kind, s * S.omega) / (-sp.I * s * S.omega)**2
        total += weight * part
    return sp.expand(total)


@lru_cache(maxsize=None, typed=True)   # typed: pn=True or 1.0 must reach the validation, not 1's entry
def multipole_flux_term(kind: str, l: int, poly: Any, with_tail: bool, tail_moments: int = 0) -> Any:
    """The term of one multipole in the STF flux formula, from its radiative moment's first
    time derivative ``poly`` (a probe polynomial of rank l, circular orbit, sympy).

    ``(G/c^(2l+1)) (l+1)(l+2)/((l-1) l l! (2l+1)!!) U^(1)_L U^(1)_L`` for mass moments and
    ``(G/c^(2l+3)) 4 l (l+2)/((l-1) (l+1)! (2l+1)!!) V^(1)_L V^(1)_L`` for current moments
    (Thorne 1980, eq. (4.16'), common practice), with, when ``with_tail``, the cross term
    ``2 U^(1)_inst . U^(1)_tail`` (U_tail^2 is relative 3PN); ``tail_moments`` 0: the Newtonian
    moment in the tail with M = m, 1: the 1PN moment with the ADM mass
    (:func:`~stfalgebra.radiative.stf_flux_terms.tail_polynomial_with_adm_mass`), for relative 2.5PN.
    """
    from ..stf.cartesian import contract_cartesian, harmonic_part_cartesian
    from .tails import canonical_logs

    S = _sympy_symbols()
    square = contract_cartesian(harmonic_part_cartesian(poly, l), poly, l)
    if with_tail:
        if tail_moments:
            from .stf_flux_terms import tail_polynomial_with_adm_mass

            tail = tail_polynomial_with_adm_mass(kind, l)
        else:
            tail = _circular_tail_polynomial(kind, l)
        cross = sp.expand(contract_cartesian(harmonic_part_cartesian(poly, l), tail, l))
        # keep the cross term through the tail's own accuracy (relative 0 or 1 beyond the
        # tail): the rest (e.g. reaction terms times the tail) is beyond relative 2.5PN
        cross = canonical_logs(sp.Add(*[term for term in sp.Add.make_args(cross)
                                        if term.as_powers_dict().get(S.c, 0) >= -2 * tail_moments]))
        if cross.has(S.r0) or sp.expand(sp.im(cross)) != 0:
            raise AssertionError(f"tail contribution to the flux is not real and r0-free: {cross}")
        square += 2 * (2 * S.G * S.m / S.c**3) * cross
    if kind == "mass":
        weight = sp.Rational((l + 1) * (l + 2), (l - 1) * l * factorial(l) * prod(range(2 * l + 1, 0, -2)))
        return S.G / S.c**(2 * l + 1) * weight * square
    weight = sp.Rational(4 * l * (l + 2), (l - 1) * factorial(l + 1) * prod(range(2 * l + 1, 0, -2)))
    return S.G / S.c**(2 * l + 3) * weight * square


def circular_energy_flux_from_moments(pn: Any) -> PNSeries:
    """Circular-orbit energy flux / ((32/5)(c^5/G) nu^2 x^5) from Thorne's STF formula.

    The radiative moments are chosen by the same table of contributions as the modes
    (source-moment and equation-of-motion orders, whether the tail enters); everything else
    (harmonic projection, contractions, the tail in the time domain) is independent of the
    mode route.

    Example
    -------
    >>> from stfalgebra.radiative.fluxes import circular_energy_flux_from_moments
    >>> circular_energy_flux_from_moments(0).coefficient(0)
    1
    """
    from ..binary.masses import reduce_mass_difference
    from ..stf.cartesian import contract_cartesian, harmonic_part_cartesian
    from .tails import canonical_logs

    S = _sympy_symbols()
    order = check_flux_order(pn)
    total = sp.Integer(0)
    eom_needed = 0
    for l in range(2, int(order) + 3):
        # mass l enters at relative (l-2), current l at relative (l-1) (in powers of 1/c^2)
        for kind, n0 in (("mass", l - 2), ("current", l - 1)):
            relative = order - n0
            if relative < 0:
                continue
            plan = plan_radiative_moment(kind, l, relative, "circular")
            families = {row.family for row in plan.rows}
            if families - {"instantaneous", "tail", "quadratic", "canonical moments"}:
                raise AssertionError(f"the STF route does not evaluate {sorted(families)}")
            eom = plan.input_order("equations of motion")
            eom_needed = max(eom_needed, eom)
            terms = _radiative_tensor_terms(kind, l, plan.input_order("source moments"), eom, relative)
            poly = _cartesian_at_reference(terms, l)
            tail_moments = max((row.need("source moments", 0) for row in plan.rows if row.family == "tail"), default=0)
            if relative >= PNOrder(5, 2):
                if (kind, l) != ("mass", 2):
                    raise AssertionError(f"the STF route evaluates relative 2.5PN for U_ij only, got {kind} l = {l}")
                from .stf_flux_terms import reaction_rate_polynomial

                poly = sp.expand(poly + reaction_rate_polynomial())
            total += multipole_flux_term(kind, l, poly, "tail" in families, tail_moments)
    eps_x = S.eps                                   # sqrt(x)
    g_rel = sp.Symbol("g_rel", positive=True)       # gamma/x
    normalised = total / (sp.Rational(32, 5) * S.c**5 / S.G * S.nu**2 * S.x**5)
    normalised = normalised.subs({S.omega: S.c**3 * S.x**sp.Rational(3, 2) / (S.G * S.m)})
    normalised = normalised.subs({S.r: S.G * S.m / (S.c**2 * S.x * g_rel)})
    normalised = sp.expand(sp.powsimp(sp.expand(normalised), force=True))
    if normalised.has(S.c) or normalised.has(S.G):
        raise AssertionError(f"flux still depends on c or G: {normalised}")
    series = PNSeries.from_expression(normalised.subs(S.x, eps_x**2), eps_x, order)
    # beyond 2PN the orbit is the 2PN one with the 2.5PN reaction: g(x) known through 5/2
    g = gamma_over_x_with_reaction() if order > 2 else gamma_over_x(eom_needed)
    series = series.substitute(g_rel, g, eps_x)
    return series.truncate(order).map_coefficients(lambda e: reduce_mass_difference(sp.expand(e)))


# ------------------------------------------------------------------ general orbits
def energy_flux_from_modes(orbit: str = "general", pn: Any = 0) -> PNSeries:
    """Instantaneous general-orbit energy flux from the modes: S with F = (G/c^5) S, a PN
    series in eps = 1/c (see :mod:`stfalgebra.radiative.general_fluxes`)."""
    if orbit != "general":
        raise ValueError(f"use circular_energy_flux_from_modes for circular orbits, got orbit={orbit!r}")
    from .general_fluxes import general_orbit_energy_flux

    return general_orbit_energy_flux(pn)


def angular_momentum_flux_from_modes(orbit: str = "general", pn: Any = 0) -> PNSeries:
    """Instantaneous general-orbit dJ_z/dt from the modes: S_J with dJ_z/dt = (G/c^5) S_J."""
    if orbit != "general":
        raise ValueError(f"use circular_angular_momentum_flux_from_modes for circular orbits, got orbit={orbit!r}")
    from .general_fluxes import general_orbit_angular_momentum_flux

    return general_orbit_angular_momentum_flux(pn)


@lru_cache(maxsize=None, typed=True)   # typed: pn=True or 1.0 must reach the validation, not 1's entry
def circular_flux_term_provenance(pn: Any, spins: str | None = None) -> tuple[tuple[PNOrder, tuple[str, ...]], ...]:
    """For each order of the circular fluxes summed over the modes, the contributions of the
    table that give it a part: the order n of sum m^2 |Hhat_lm|^2 collects the products of the
    mode terms at orders a + b = n, each term with the rows it comes from
    (``ModeResult.term_provenance``); ``spins`` None or ``"aligned"`` (the modes of
    :func:`~stfalgebra.radiative.modes.derive_mode` with the same option).

    Returns
    -------
    tuple
        ``((order, (row, ...)), ...)`` in increasing order, each row named once.

    Example
    -------
    >>> dict(circular_flux_term_provenance("3/2"))[PNOrder(3, 2)][-1].startswith("tail")
    True
    """
    order = parse_pn_order(pn, "pn", maximum=maximum_flux_order("circular", table_for_spins(spins)))
    by_order: dict[PNOrder, list[str]] = {}
    for l, m, n0 in _contributing_modes(order):
        if m < 0:      # |Hhat_l,-m| = |Hhat_lm|: the same terms
            continue
        result = derive_mode(l, m, pn=order - n0, spins=spins)
        rows = dict(result.term_provenance)
        for a in result.series.terms:
            for b in result.series.terms:
                if a + b <= order:
                    names = by_order.setdefault(a + b, [])
                    names.extend(name for name in rows.get(a, ()) + rows.get(b, ()) if name not in names)
    return tuple((k, tuple(by_order[k])) for k in sorted(by_order))
