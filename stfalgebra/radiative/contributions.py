"""The table of contributions: what every PN order of the radiative moments needs.

The radiative moments U_L (mass type) and V_L (current type) are sums of contributions: the
instantaneous l-th time derivative of the source moments, the hereditary tails, the
quadratic interactions of two source moments (instantaneous and memory), and, at higher
orders, tails of tails, radiation reaction, spin-orbit terms. Each row of :data:`CONTRIBUTIONS`
is one such contribution, or one implementation of it at a given accuracy:

- ``family``: the contribution it implements ("instantaneous", "tail", "quadratic", ...);
  every row of a family enters at the same relative order for a given moment;
- ``kinds`` and ``l_min``, ``l_max``: the moments it feeds (mass or current, range of l);
- ``enters``: the relative PN order where the family first contributes;
- ``known_through``: the relative order through which this row is complete (``None``: the
  toolkit does not have it; the row then describes what is missing, and refusals name it);
- ``needs``: the orders of the inputs it is evaluated with (source moments, equations of
  motion, ...);
- ``orbits``: the orbits on which it is evaluated ("circular", "general");
- ``origin``: "derived" and how, or "cited" with its source;
- ``evaluator``: the function (or "module:function") giving its part of the radiative moment
  on the channel of a mode.

Every order limit of the toolkit is computed from this table (modes on every orbit, both flux
routes, the eccentric averages, code generation, the checker and the command line's bounds),
and every refusal names the missing row. Adding an order or an interaction means adding rows
and evaluators here, never editing a limit elsewhere. The functions take the table as an
argument (default :data:`CONTRIBUTIONS`) so that a test can add a row and see it take effect.

**Conventions**: relative orders count powers of 1/c^2 beyond the leading (Newtonian) term of
each radiative moment; a mode's absolute order adds the mode's leading order.
"""

from __future__ import annotations

import importlib
from dataclasses import dataclass, field
from typing import Any, Callable, Iterable, Sequence

from ..binary.cited_inputs import INPUT_ORDERS, known_through
from ..errors import OrderBeyondInputsError
from ..limits import L_MAXIMUM
from ..moments.current_two_pn_status import CURRENT_TWO_PN_SOURCE, current_two_pn_complete, missing_terms_text
from ..moments.reaction_provenance import REACTION_CURRENT_SOURCE, REACTION_MOMENT_SOURCE
from ..orders import PNOrder

__all__ = [
    "Contribution", "CONTRIBUTIONS", "RadiativePlan", "plan_radiative_moment",
    "maximum_relative_order", "maximum_mode_order", "maximum_flux_order", "maximum_eccentric_order",
    "maximum_order_any_mode", "LMAX_BOUND", "mode_kind", "leading_order", "circular_zero_mode_reason",
    "check_degree", "check_mode", "QUADRATIC_TABULATED_LMAX", "SPIN_ORBIT_CONTRIBUTIONS", "SPIN_OPTIONS",
    "PRECESSING_SPIN_CONTRIBUTIONS",
    "table_for_spins", "memory_row", "instantaneous_part", "omitted_from_instantaneous_part",
]

#: The largest l the toolkit accepts anywhere (modes, mode sets, emission): bounded so that no
#: request runs without bound; derivations are exact at any l below it.
LMAX_BOUND = L_MAXIMUM

ORBITS = ("circular", "general")
#: every orbit a row can cover: "eccentric" means the orbit-averaged fluxes of eccentric orbits
#: (the instantaneous general-orbit fluxes averaged over the quasi-Keplerian orbit; their rows'
#: evaluators are flux-level functions, not mode channels)
ALL_ORBITS = ("circular", "general", "eccentric")
_ANY_L = 10**6


def check_degree(l: Any) -> int:
    """A multipole degree of a radiative moment: an integer ``l >= 2`` (TypeError, ValueError).

    Example
    -------
    >>> check_degree(3)
    3
    """
    if isinstance(l, bool) or not (isinstance(l, int) or getattr(l, "is_Integer", False)):
        raise TypeError(f"multipole degree l must be an int, got {l!r}")
    l = int(l)
    if l < 2:
        raise ValueError(f"multipole degree l must be >= 2 for radiative moments and modes, got l = {l}")
    return l


def check_mode(l: Any, m: Any) -> tuple[int, int]:
    """A mode (l, m) with ``l >= 2`` and ``|m| <= l`` (TypeError, ValueError naming the values).

    Example
    -------
    >>> check_mode(2, -2)
    (2, -2)
    """
    l = check_degree(l)
    if isinstance(m, bool) or not isinstance(m, int):
        raise TypeError(f"m must be an int, got {m!r}")
    if abs(m) > l:
        raise ValueError(f"|m| must not exceed l: got l = {l}, m = {m}")
    return l, m


def mode_kind(l: int, m: int) -> str:
    """"mass" for l + m even, "current" for l + m odd (planar orbits)."""
    return "mass" if (l + m) % 2 == 0 else "current"


def leading_order(l: int, m: int) -> PNOrder:
    """PN order of the leading term of Hhat_lm relative to the Newtonian h_22: (l - 2)/2 for
    mass modes, (l - 1)/2 for current modes.

    Example
    -------
    >>> leading_order(2, 1), leading_order(4, 4)
    (PNOrder(1/2), PNOrder(1))
    """
    return PNOrder(l - 2, 2) if mode_kind(l, m) == "mass" else PNOrder(l - 1, 2)


@dataclass(frozen=True)
class Contribution:
    """One row of the table of contributions (module docstring)."""

    family: str
    description: str
    kinds: tuple[str, ...]
    enters: PNOrder
    known_through: PNOrder | None
    orbits: tuple[str, ...]
    origin: str
    needs: tuple[tuple[str, int], ...] = ()
    l_min: int = 2
    l_max: int = _ANY_L
    evaluator: Callable[..., Any] | str | None = field(default=None, compare=False)
    missing_on: str = ""
    #: "all" modes of the moments it feeds, or "m = 0" (the DC memory: it is not part of the
    #: radiative moment's plan, the m = 0 modes read it through :func:`memory_row`)
    modes: str = "all"

    @property
    def available(self) -> bool:
        return self.known_through is not None and self.evaluator is not None

    def feeds(self, kind: str, l: int) -> bool:
        return kind in self.kinds and self.l_min <= l <= self.l_max

    def need(self, name: str, default: int | None = None) -> int | None:
        return dict(self.needs).get(name, default)

    def evaluate(self, *args: Any, **kwargs: Any) -> Any:
        """Call the evaluator (imported on first use)."""
        if self.evaluator is None:
            raise OrderBeyondInputsError(f"{self.description}: not available")
        function = self.evaluator
        if isinstance(function, str):
            module, _, name = function.partition(":")
            function = getattr(importlib.import_module(module), name)
        return function(*args, row=self, **kwargs)

    def label(self) -> str:
        """A short name for refusals and provenance."""
        return self.description


#: The largest l whose quadratic interactions at relative 1.5PN the tabulated iteration holds
#: (radiative/data/radiative_moment_terms.json; a test checks the file against it).
QUADRATIC_TABULATED_LMAX = 8

_DERIVED_TAIL = (
    "derived: kappa_l, pi_l from the MPM iteration (stfalgebra.mpm, tabulated for l <= 30; the tests compare "
    "them with the closed forms of Blanchet & Damour, Phys. Rev. D 46, 4304 (1992)); harmonic factor "
    "derived (Abel-regulated hereditary integral)")
_DERIVED_QUADRATIC = (
    "derived: the MPM iteration (stfalgebra.mpm), every pair of source moments allowed at relative 1.5PN, "
    "tabulated (stfalgebra.mpm.tabulation) for the l the table of contributions lists; the tests compare U_ijkl, V_ijk with Blanchet, "
    "Living Rev. Relativ. 17, 2 (2014), sec. 3, and the modes with Blanchet, Faye, Iyer & Sinha, "
    "Class. Quantum Grav. 25, 165003 (2008)")
_DERIVED_MEMORY = (
    "derived: the memory formula of the energy radiated per solid angle (Thorne, Phys. Rev. D 45, 520 (1992)) in "
    "modes (stfalgebra.radiative.memory, checked term by term against the MPM memory terms), summed over the "
    "derived modes and integrated along x(t) of the energy balance; compared with Favata, Phys. Rev. D 80, "
    "024002 (2009)")
_DERIVED_QUADRATIC_25 = (
    "derived: the terms of the MPM iteration (stfalgebra.mpm, tabulated) put on the circle as harmonic probe "
    "polynomials (stfalgebra.radiative.circular_interactions); the tests check each term against explicit "
    "Cartesian components projected on Y_lm, U_ij against the component evaluation and the 1.5PN terms against "
    "the orbit-tensor route")
_CIRCULAR_INTERACTIONS = "stfalgebra.radiative.circular_interactions:circular_interaction_channel"
_DERIVED_CANONICAL = (
    "derived: the relations by the quadratic MPM iteration with the linear gauge vector of W_L, X_L, Y_L, Z_L (the "
    "pairs source moment x gauge moment read at future null infinity, stfalgebra.mpm.gauge_interactions; at l = 2, 3 "
    "they are (C1), (K1), (K2) of Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 3.3 and Faye, Blanchet & Iyer, "
    "Class. Quantum Grav. 32, 045016 (2015), sec. 2, from memory, with +3 I_<ij Y_k>^(1) where -3 was recalled); W_L, "
    "Y_i of two bodies derived at Newtonian order (stfalgebra.moments.canonical); on the circle the mass correction "
    "is minus the centre-of-mass-shift part of the derived 2.5PN I_L (tested, l = 3..8); put on the circle as probe "
    "polynomials (stfalgebra.radiative.circular_canonical; checked with Cartesian components)")
_BOTH = ("mass", "current")
_INSTANT = "stfalgebra.radiative.radiative_moments:instantaneous_channel"

#: The table of contributions to the radiative moments.
CONTRIBUTIONS: tuple[Contribution, ...] = (
    # the instantaneous part: d^l I_L/dt^l and d^l J_L/dt^l of the source moments
    Contribution("instantaneous", "Newtonian source moments of two point masses, Newtonian equations of motion",
                 _BOTH, PNOrder(0), PNOrder(1, 2), ALL_ORBITS,
                 "derived: Newtonian moments sum_A m_A y_A^<L> (and eps y_A^L-1 v_A) of two point masses",
                 needs=(("source moments", 0), ("equations of motion", 0)), evaluator=_INSTANT),
    Contribution("instantaneous", "1PN source moments of two point masses, 1PN harmonic equations of motion",
                 _BOTH, PNOrder(0), PNOrder(3, 2), ALL_ORBITS,
                 "derived: Blanchet & Damour (1989) 1PN mass moment, Damour & Iyer (1991) 1PN current moment "
                 "(with its non-compact field terms) applied to point masses; 1PN centre-of-mass relations",
                 needs=(("source moments", 1), ("equations of motion", 1)), evaluator=_INSTANT),
    Contribution("instantaneous", "2PN mass moments of two point masses, 2PN harmonic equations of motion",
                 ("mass",), PNOrder(0), PNOrder(2), ALL_ORBITS,
                 "derived: the general source mass moment reduced at 2PN and applied to point masses "
                 "(stfalgebra.moments.mass_two_pn: compact terms with the Hadamard-regularised metric, "
                 "non-compact terms through finite-part kernels); 2PN centre-of-mass relations",
                 needs=(("source moments", 2), ("equations of motion", 2)), evaluator=_INSTANT),
    # derived through relative 2PN once the last cubic terms of J_L are (current_two_pn_status:
    # until then the row names them and every refusal quotes it)
    Contribution("instantaneous", "2PN current moments of two point masses with the 2PN equations of motion"
                 + (f" (not complete: {missing_terms_text()})" if not current_two_pn_complete() else ""),
                 # known through 5/2: the conservative 2PN J_L have no c^-5 term; the 2.5PN part of
                 # d^l J_L/dt^l (reaction terms of J_L, reaction in the motion) is the radiation-reaction row
                 ("current",), PNOrder(0), PNOrder(5, 2) if current_two_pn_complete() else None, ALL_ORBITS,
                 CURRENT_TWO_PN_SOURCE + "; 2PN centre-of-mass relations" if current_two_pn_complete()
                 else "not yet derived: " + missing_terms_text(),
                 needs=(("source moments", 2), ("equations of motion", 2)),
                 evaluator="stfalgebra.radiative.radiative_moments:conservative_instantaneous_channel"
                 if current_two_pn_complete() else None),
    Contribution("instantaneous", "2PN mass moments with their 2.5PN radiation-reaction terms, 2PN + 2.5PN "
                 "equations of motion (the inspiralling circular orbit)",
                 ("mass",), PNOrder(0), PNOrder(5, 2), ("circular",),
                 "derived: the 2PN row, plus d^l I_L/dt^l along the inspiralling orbit (the cited 2.5PN reaction "
                 "acceleration in the derivatives, rdot_RR = 2 a_lambda/omega derived from it); "
                 + REACTION_MOMENT_SOURCE,
                 needs=(("source moments", 2), ("equations of motion", 2)), l_min=2,
                 evaluator="stfalgebra.radiative.circular_reaction:reaction_instantaneous_channel",
                 missing_on="the 2.5PN reaction terms of I_L are put on circular orbits only (Python API: "
                            "reaction_mass_moment(l) on a general orbit)"),
    Contribution("instantaneous", "2PN mass moments with their 2.5PN radiation-reaction terms, 2PN + 2.5PN "
                 "equations of motion (general orbit)",
                 ("mass",), PNOrder(0), PNOrder(5, 2), ("general",),
                 "derived: the 2PN row with the derived 2.5PN term of I_L, differentiated along the 2PN + 2.5PN "
                 "motion (the cited 2.5PN reaction acceleration); " + REACTION_MOMENT_SOURCE,
                 needs=(("source moments", 2), ("equations of motion", 2)), l_min=2,
                 evaluator="stfalgebra.radiative.circular_reaction:reaction_instantaneous_general_channel"),
    Contribution("instantaneous", "2.5PN radiation-reaction terms of I_L in the orbit averages of eccentric "
                 "orbits", ("mass",), PNOrder(0), None, ("eccentric",), "not available", l_min=2),
    # the 2.5PN (odd) part of d^l J_L/dt^l is a family of its own: the conservative current rows
    # have no c^-5 term, so a current mode at relative 2.5PN takes the 2PN current row (still
    # missing: refusals name it) and this one
    *(Contribution("radiation reaction", "2.5PN radiation-reaction part of d^l J_L/dt^l: the derived 2.5PN term of "
                   f"J_L and the reaction acceleration in the derivatives of the Newtonian J_L ({where})",
                   ("current",), PNOrder(5, 2), PNOrder(5, 2), (orbit,),
                   "derived: d^l J_L/dt^l along the Newtonian + 2.5PN motion (the cited reaction acceleration"
                   + (", rdot_RR = 2 a_lambda/omega derived from it" if orbit == "circular" else "") + "); "
                   + REACTION_CURRENT_SOURCE,
                   needs=(("source moments", 0), ("equations of motion", 0)), l_min=2,
                   evaluator=f"stfalgebra.radiative.circular_reaction:{evaluator}")
      for orbit, where, evaluator in (("circular", "the inspiralling circular orbit", "reaction_current_channel"),
                                      ("general", "general orbit", "reaction_current_general_channel"))),
    Contribution("radiation reaction", "2.5PN radiation-reaction terms of J_L in the orbit averages of eccentric "
                 "orbits", ("current",), PNOrder(5, 2), None, ("eccentric",), "not available", l_min=2),
    # hereditary tails (M x I_L, M x J_L)
    Contribution("tail", "leading tail (2 G M/c^3) int I_L^(l+2) [ln(c tau/(2 r0)) + kappa_l] (and J_L with pi_l), "
                 "Newtonian moments, M = m", _BOTH, PNOrder(3, 2), PNOrder(2), ("circular",),
                 _DERIVED_TAIL, needs=(("source moments", 0), ("equations of motion", 0)),
                 evaluator="stfalgebra.radiative.radiative_moments:tail_channel",
                 missing_on="on a general orbit the tail stays an unevaluated hereditary integral "
                            "(Python API: general_orbit_tail(l, m)); the instantaneous part alone: "
                            "instantaneous_only=True (command line: --instantaneous-only)"),
    Contribution("tail", "leading tail of the orbit-averaged fluxes on eccentric orbits: enhancement functions "
                 "phi(e_t), psi(e_t) from the Newtonian harmonic decomposition of the modes", ("mass",),
                 PNOrder(3, 2), PNOrder(2), ("eccentric",),
                 "derived: per-harmonic tail factor summed over the Bessel harmonics of the Keplerian orbit",
                 l_min=2, l_max=2, evaluator="stfalgebra.radiative.tail_enhancement:tail_enhancement"),
    Contribution("tail", "tail at relative 2.5PN (1PN moments inside the tail, ADM mass M = m + E/c^2 in the "
                 "tail and in psi)", _BOTH, PNOrder(3, 2), PNOrder(5, 2), ("circular",),
                 _DERIVED_TAIL + "; the 1PN channel of one harmonic times the same harmonic factor; M from the "
                 "cited binding energy E", needs=(("source moments", 1), ("equations of motion", 1)),
                 evaluator="stfalgebra.radiative.radiative_moments:adm_tail_channel",
                 missing_on="on a general orbit the tail stays an unevaluated hereditary integral "
                            "(Python API: general_orbit_tail(l, m))"),
    # quadratic interactions of two source moments: from relative 1.5PN for U_L with l >= 4 and
    # V_L with l >= 3 (the iteration gives none below: a product of two moments of rank >= 2 has
    # rank >= 4, or 3 with eps or a current dipole), from relative 2.5PN for the others
    *(Contribution("quadratic", "quadratic interactions of two source moments at relative 1.5PN: instantaneous "
                   "products and memory integrals (U_L: M_A x M_B, |A| + |B| = l; V_L: eps M_A M_B, "
                   "|A| + |B| = l + 1, and S_A x M_B, |A| + |B| = l), Newtonian moments",
                   (kind,), PNOrder(3, 2), PNOrder(2), ("circular",), _DERIVED_QUADRATIC,
                   needs=(("source moments", 0), ("equations of motion", 0)), l_min=l_min,
                   l_max=QUADRATIC_TABULATED_LMAX,
                   evaluator="stfalgebra.radiative.radiative_moments:quadratic_channel",
                   missing_on="the quadratic interactions are evaluated on circular orbits only (Python API: "
                              "quadratic_instantaneous_tensor(l, kind) on a general orbit, without the memory)")
      for kind, l_min in (("mass", 4), ("current", 3))),
    Contribution("quadratic", "the quadratic interactions at relative 1.5PN of a moment the MPM iteration's table "
                 f"does not hold (l > {QUADRATIC_TABULATED_LMAX}; extend it with python3 -m "
                 "stfalgebra.mpm.tabulation, minutes per moment)",
                 _BOTH, PNOrder(3, 2), None, ALL_ORBITS, "not tabulated", l_min=QUADRATIC_TABULATED_LMAX + 1),
    Contribution("quadratic", "quadratic interactions of U_ij at relative 2.5PN on the circular orbit: "
                 "instantaneous products and the oscillatory memory (the DC memory of m = 0 is the memory row)",
                 ("mass",), PNOrder(5, 2), PNOrder(5, 2), ("circular",),
                 "derived: the terms of the MPM iteration (stfalgebra.mpm, tabulated) evaluated with explicit "
                 "components of the Newtonian quadrupole and angular momentum on the circle",
                 needs=(("source moments", 0), ("equations of motion", 0)), l_min=2, l_max=2,
                 evaluator="stfalgebra.radiative.circular_quadratic:circular_quadratic_channel",
                 missing_on="the 2.5PN quadratic interactions of U_ij are evaluated on circular orbits only"),
    # through relative 2.5PN on the circle: the first quadratic terms of U_ijk, V_ij (Newtonian
    # moments), and for the higher l the 1.5PN terms with 1PN moments plus the 2.5PN terms
    *(Contribution("quadratic", f"quadratic interactions of {name} at relative 2.5PN on the circular orbit: "
                   "instantaneous products and the oscillatory memory, Newtonian moments",
                   (kind,), PNOrder(5, 2), PNOrder(5, 2), ("circular",), _DERIVED_QUADRATIC_25,
                   needs=(("source moments", 0), ("equations of motion", 0)), l_min=l, l_max=l,
                   evaluator=_CIRCULAR_INTERACTIONS,
                   missing_on=f"the 2.5PN quadratic interactions of {name} are evaluated on circular orbits only")
      for kind, l, name in (("mass", 3, "U_ijk"), ("current", 2, "V_ij"))),
    *(Contribution("quadratic", "quadratic interactions through relative 2.5PN on the circular orbit: the 1.5PN "
                   "terms with 1PN moments (and the 1PN angular momentum), the 2.5PN terms with Newtonian moments; "
                   "instantaneous products and the oscillatory memory",
                   (kind,), PNOrder(3, 2), PNOrder(5, 2), ("circular",), _DERIVED_QUADRATIC_25,
                   needs=(("source moments", 1), ("equations of motion", 1)), l_min=l_min,
                   l_max=QUADRATIC_TABULATED_LMAX, evaluator=_CIRCULAR_INTERACTIONS,
                   missing_on="the quadratic interactions are evaluated on circular orbits only")
      for kind, l_min in (("mass", 4), ("current", 3))),
    # the DC memory of circular inspirals: the memory formula (energy radiated per solid angle)
    # integrated along the adiabatic inspiral; stops before relative 2.5PN, where instantaneous
    # quadratic terms, the drift of the modes and the memory of the memory enter
    Contribution("memory", "DC memory of the even-l, m = 0 modes of circular inspirals: the past integral of the "
                 "energy radiated per solid angle along the adiabatic inspiral from the infinite past "
                 "(modes, flux and energy balance through relative 2PN)", ("mass",), PNOrder(0), PNOrder(2),
                 ("circular",), _DERIVED_MEMORY, needs=(("source moments", 2), ("equations of motion", 2)),
                 evaluator="stfalgebra.radiative.circular_memory:memory_channel", modes="m = 0"),
    Contribution("memory", "DC memory of the even-l, m = 0 modes at relative 2.5PN and beyond (the instantaneous "
                 "quadratic terms, the radiation-reaction drift of the modes and the memory of the memory)", ("mass",),
                 PNOrder(0), None, ("circular",), "not available", modes="m = 0"),
    Contribution("canonical moments", "canonical quadrupole M_ij = I_ij + (4 G/c^5)(W^(2) I_ij - W^(1) I_ij^(1)), "
                 "two-body W = nu m r rdot/3", ("mass",), PNOrder(5, 2), PNOrder(5, 2), ("circular",),
                 "derived: W from the Newtonian gauge-moment integral (1/3) sum_A m_A y_A.v_A (stfalgebra.moments."
                 "canonical); relation (C1) from Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 3.3 (from memory), "
                 "derived by the iteration with the gauge vector (stfalgebra.mpm.gauge_interactions; tested)",
                 needs=(("source moments", 0), ("equations of motion", 0)), l_min=2, l_max=2,
                 evaluator="stfalgebra.radiative.circular_reaction:canonical_correction_channel",
                 missing_on="the canonical correction is put on circular orbits only"),
    Contribution("canonical moments", "canonical current moments S_L - J_L (2 <= l <= 8) at relative 2.5PN on the "
                 "circular orbit, relation (K2_l) S_L = J_L + (G/c^5)[2 (l-1) E[I_ab^(3), W_L-1] - (4/l) E[I_L^(1), "
                 "Y^(1)] + 4 E[I_L, Y^(2)] + (4 (l^2-1)/l) J_<L-1 Y_i_l>^(1) - 4 J_L^(1) W^(1)], E[A, B] = "
                 "STF eps_iab A_a.. B_b..: zero at l = 2 (its W terms vanish, the W_a and Y_a terms cancel; tested)",
                 ("current",), PNOrder(5, 2), PNOrder(5, 2), ("circular",),
                 _DERIVED_CANONICAL,
                 needs=(("source moments", 0), ("equations of motion", 0)), l_min=2, l_max=8,
                 evaluator="stfalgebra.radiative.circular_canonical:circular_canonical_channel",
                 missing_on="the canonical correction S_L - J_L is put on circular orbits only"),
    Contribution("canonical moments", "canonical mass moments M_L - I_L (3 <= l <= 8) at relative 2.5PN on the "
                 "circular orbit, relation (K1_l) M_L = I_L + (4 G/c^5)[W^(2) I_L - W^(1) I_L^(1) + l I_<L-1 Y_i_l>^(1)]: "
                 "its W terms vanish there, the Y term remains", ("mass",), PNOrder(5, 2), PNOrder(5, 2), ("circular",),
                 _DERIVED_CANONICAL, needs=(("source moments", 0), ("equations of motion", 0)), l_min=3, l_max=8,
                 evaluator="stfalgebra.radiative.circular_canonical:circular_canonical_channel",
                 missing_on="the canonical correction M_L - I_L is put on circular orbits only"),
    Contribution("canonical moments", "canonical moments M_L - I_L, S_L - J_L at relative 2.5PN where no row above "
                 "evaluates them (l >= 9, general orbits): the relations are derived for every l by the iteration "
                 "(stfalgebra.mpm.gauge_interactions), but their closed form was compared with it through l = 8 only, "
                 "and no general-orbit evaluation is written",
                 _BOTH, PNOrder(5, 2), None, ALL_ORBITS, "not available"),
    Contribution("tails of tails", "tails of tails and cubic interactions", _BOTH, PNOrder(3), None, ALL_ORBITS,
                 "not available"),
)


_SPIN_INSTANT = "stfalgebra.radiative.spinning_channels:spinning_instantaneous_channel"

#: Rows for a binary with spins along the orbital angular momentum (``spins="aligned"``, a planar
#: orbit, circular or general, and the orbit averages of eccentric orbits): they
#: replace the instantaneous rows of :data:`CONTRIBUTIONS`; the other families are unchanged
#: (spin corrections to tails and quadratic interactions enter at relative 3PN and beyond).
SPIN_ORBIT_CONTRIBUTIONS: tuple[Contribution, ...] = (
    Contribution("instantaneous", "1PN source moments of two point masses plus their leading spin parts "
                 "(pole-dipole source), 1PN and leading spin-orbit equations of motion, aligned spins",
                 _BOTH, PNOrder(0), PNOrder(3, 2), ALL_ORBITS,
                 "derived: pole-dipole stress-energy in the general source-moment formulas, spin part of the "
                 "centre-of-mass relation derived; leading spin-orbit acceleration cited (Kidder 1995, from memory); "
                 "eccentric averages on the quasi-Keplerian orbit with the spin-orbit terms derived from the cited "
                 "energy and angular momentum (stfalgebra.binary.spin_keplerian)",
                 needs=(("source moments", 1), ("equations of motion", 1)), evaluator=_SPIN_INSTANT),
    Contribution("next-to-leading spin-orbit", "next-to-leading spin-orbit terms of the current moments",
                 ("current",), PNOrder(3, 2), None, ALL_ORBITS, "not available"),
    Contribution("next-to-leading spin-orbit", "next-to-leading spin-orbit terms of the mass moments and the dynamics",
                 ("mass",), PNOrder(5, 2), None, ALL_ORBITS, "not available"),
    Contribution("spin-spin", "spin-spin terms of the moments and the dynamics", _BOTH, PNOrder(2), None,
                 ALL_ORBITS, "not available"),
)

_PRECESSING_INSTANT = "stfalgebra.radiative.precessing_channels:precessing_instantaneous_channel"

#: Rows for spins of any direction (``spins="general"``, general orbits only: the modes at an
#: instant, in the frame whose x-y plane is the instantaneous orbital plane); every m is derived
#: on its own, both moments feeding every mode. The missing rows are those of the aligned spins.
PRECESSING_SPIN_CONTRIBUTIONS: tuple[Contribution, ...] = tuple(
    row for row in SPIN_ORBIT_CONTRIBUTIONS if not row.available) + (
    Contribution("instantaneous", "1PN source moments of two point masses plus their leading spin parts "
                 "(pole-dipole source), 1PN and leading spin-orbit equations of motion with the precession, "
                 "spins of any direction (both moments in every mode)",
                 _BOTH, PNOrder(0), PNOrder(3, 2), ("general",),
                 "derived: pole-dipole stress-energy in the general source-moment formulas, spin part of the "
                 "centre-of-mass relation derived; leading spin-orbit acceleration and precession cited "
                 "(Kidder 1995, from memory)",
                 needs=(("source moments", 1), ("equations of motion", 1)), evaluator=_PRECESSING_INSTANT,
                 missing_on="modes with spins of any direction are derived on general orbits only"),
)

#: The values of the ``spins`` option: None (non-spinning, the default), "aligned", or "general"
#: (spins of any direction, general-orbit modes only).
SPIN_OPTIONS = (None, "aligned", "general")


def table_for_spins(spins: str | None, table: Sequence[Contribution] = CONTRIBUTIONS) -> tuple[Contribution, ...]:
    """The table for a binary without spins (``None``), with aligned spins (``"aligned"``) or with
    spins of any direction (``"general"``, :data:`PRECESSING_SPIN_CONTRIBUTIONS`).

    With aligned spins the instantaneous rows are replaced by :data:`SPIN_ORBIT_CONTRIBUTIONS`;
    their missing rows name what is refused (next-to-leading spin-orbit, spin-spin terms).

    Example
    -------
    >>> maximum_relative_order("current", 2, "circular", table_for_spins("aligned"))
    PNOrder(1)
    >>> maximum_relative_order("mass", 2, "circular", table_for_spins("aligned"))
    PNOrder(3/2)
    """
    if spins not in SPIN_OPTIONS:
        raise ValueError(f"spins must be None, 'aligned' or 'general', got {spins!r}")
    if spins is None:
        return tuple(table)
    rows = SPIN_ORBIT_CONTRIBUTIONS if spins == "aligned" else PRECESSING_SPIN_CONTRIBUTIONS
    # the missing spin rows first: a refusal names the first family that fails
    missing = tuple(row for row in rows if not row.available)
    present = tuple(row for row in rows if row.available)
    return missing + tuple(row for row in table if row.family != "instantaneous") + present


# the spin families are instantaneous too (terms of the source moments and of the equations of
# motion): kept, so that the instantaneous part of a spinning mode is refused by their names
_INSTANTANEOUS_FAMILIES = ("instantaneous", "radiation reaction", "next-to-leading spin-orbit", "spin-spin")


def instantaneous_part(table: Sequence[Contribution]) -> tuple[Contribution, ...]:
    """The rows of the instantaneous part of a table (the source moments differentiated along the
    orbit): every other family (tails, quadratic interactions, memory) is hereditary or non-linear.

    Example
    -------
    >>> maximum_relative_order("mass", 2, "general"), maximum_relative_order("mass", 2, "general",
    ...                                                                      instantaneous_part(CONTRIBUTIONS))
    (PNOrder(1), PNOrder(5/2))
    """
    return tuple(row for row in table if row.family in _INSTANTANEOUS_FAMILIES)


def omitted_from_instantaneous_part(kind: str, l: int, pn_relative: Any,
                                    table: Sequence[Contribution] = CONTRIBUTIONS) -> tuple[str, ...]:
    """The families (with the order where each enters) that the instantaneous part of U_L or V_L
    leaves out through ``pn_relative``, e.g. ``('tail (from relative 3/2)',)``.

    Example
    -------
    >>> omitted_from_instantaneous_part("mass", 4, PNOrder(2))
    ('tail (from relative 3/2)', 'quadratic (from relative 3/2)')
    """
    order = PNOrder(pn_relative)
    out = []
    for family, rows in _rows_for(kind, l, table).items():
        if family not in _INSTANTANEOUS_FAMILIES and rows[0].enters <= order:
            out.append(f"{family} (from relative {rows[0].enters})")
    return tuple(out)


@dataclass(frozen=True)
class RadiativePlan:
    """The rows chosen for a radiative moment through a relative order."""

    kind: str
    l: int
    pn_relative: PNOrder
    orbit: str
    rows: tuple[Contribution, ...]

    def input_order(self, name: str) -> int:
        """The highest order of an input (e.g. "equations of motion") any chosen row uses."""
        return max((row.need(name, 0) for row in self.rows), default=0)

    @property
    def provenance(self) -> tuple[str, ...]:
        return tuple(f"{row.family}: {row.description} [{row.origin}]" for row in self.rows)


def _rows_for(kind: str, l: int, table: Iterable[Contribution]) -> dict[str, list[Contribution]]:
    families: dict[str, list[Contribution]] = {}
    for row in table:
        if row.feeds(kind, l) and row.modes == "all":
            families.setdefault(row.family, []).append(row)
    return families


def _refusal(kind: str, l: int, pn_relative: PNOrder, orbit: str, family: str, rows: Sequence[Contribution],
             m: int | None, table: Sequence[Contribution]) -> str:
    limit = maximum_relative_order(kind, l, orbit, table, _explain=False, m=m)
    return (f"{_refusal_reason(kind, l, pn_relative, orbit, family, rows, m)}; the toolkit derives "
            f"{'this mode' if m is not None else 'it'} through relative {limit.words()} on {orbit} orbits")


def _refusal_reason(kind: str, l: int, pn_relative: PNOrder, orbit: str, family: str, rows: Sequence[Contribution],
                    m: int | None) -> str:
    symbol = "U_L" if kind == "mass" else "V_L"
    what = f"mode ({l},{m})" if m is not None else f"the {kind} radiative moment {symbol}, l = {l},"
    wrong_orbit = [row for row in rows if row.available and orbit not in row.orbits
                   and row.known_through >= pn_relative]
    if wrong_orbit:
        row = wrong_orbit[0]
        return (f"{what} at relative order {pn_relative} ({orbit} orbit): it needs the {row.family} "
                f"contribution ({row.description}), entering at relative {row.enters}; {row.missing_on}")
    # a missing row of this orbit names what is refused; beyond every row, the family's next order
    missing = [row for row in rows if not row.available and orbit in row.orbits]
    have = max((row.known_through for row in rows if row.available and orbit in row.orbits), default=None)
    if missing:
        described = missing[0].description
    elif have is not None:
        described = f"the {family} contribution beyond relative {have}"
    else:
        described = f"the {family} contribution"
    have_text = f" (it has this contribution through relative {have})" if have is not None else ""
    return (f"{what} at relative order {pn_relative}: it needs {described}, entering at relative "
            f"{rows[0].enters}, which the toolkit does not have{have_text}")


#: Families whose part of a circular-orbit odd-l m = 0 mode is zero: the l-th time derivative of
#: the constant (m = 0) part of the moments (instantaneous and radiation-reaction terms, canonical
#: corrections) and the
#: hereditary integral of a derivative of it (tails). The inspiral makes that part drift at the
#: rate omega x^(5/2), so its l-th derivative is x^(5 l/2) (l >= 3: relative 7.5PN) beyond the
#: oscillating terms. The mode comes from the instantaneous quadratic interactions of V_L.
_ZERO_FOR_CIRCULAR_ODD_M0 = ("instantaneous", "tail", "canonical moments", "radiation reaction")


def plan_radiative_moment(kind: str, l: int, pn_relative: Any, orbit: str, *, m: int | None = None,
                          table: Sequence[Contribution] = CONTRIBUTIONS, _explain: bool = True) -> RadiativePlan:
    """Choose the rows that give U_L (``kind="mass"``) or V_L through ``pn_relative``, or refuse.

    Parameters
    ----------
    kind:
        "mass" or "current".
    l:
        Multipole degree, ``2 <= l <= LMAX_BOUND``.
    pn_relative:
        Relative order (a multiple of 1/2).
    orbit:
        "circular" or "general".
    m:
        The mode: for the wording of a refusal, and for a circular-orbit odd-l m = 0 mode the
        families whose part of it is zero (``_ZERO_FOR_CIRCULAR_ODD_M0``) need no row.
    table:
        The table of contributions.

    Returns
    -------
    RadiativePlan
        For every family entering at or below ``pn_relative``, the available row (on this
        orbit) with the lowest accuracy that suffices.

    Raises
    ------
    OrderBeyondInputsError
        A family enters at or below the order and no available row covers it: the message
        names the missing row (or why the orbit is not covered).

    **Conventions**: module docstring.

    Example
    -------
    >>> plan = plan_radiative_moment("mass", 2, PNOrder(3, 2), "circular")
    >>> [row.family for row in plan.rows]
    ['instantaneous', 'tail']
    >>> plan.input_order("equations of motion")
    1

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 3 (the structure of the radiative moments).
    """
    order = PNOrder(pn_relative)
    chosen = []
    constant_mode = m == 0 and l % 2 == 1 and orbit == "circular"
    for family, rows in _rows_for(kind, l, table).items():
        if rows[0].enters > order:
            continue
        usable = [row for row in rows if row.available and orbit in row.orbits and row.known_through >= order]
        if not usable and constant_mode and family in _ZERO_FOR_CIRCULAR_ODD_M0:
            continue        # its part of this mode is zero (see _ZERO_FOR_CIRCULAR_ODD_M0)
        if not usable:
            raise OrderBeyondInputsError(_refusal(kind, l, order, orbit, family, rows, m, table) if _explain
                                         else f"{family} of the {kind} moment l = {l} at relative {order}")
        chosen.append(min(usable, key=lambda row: row.known_through))
    return RadiativePlan(kind, l, order, orbit, tuple(chosen))


def maximum_relative_order(kind: str, l: int, orbit: str, table: Sequence[Contribution] = CONTRIBUTIONS,
                           _explain: bool = True, *, m: int | None = None) -> PNOrder:
    """The highest relative order through which the table gives U_L or V_L on ``orbit`` (with
    ``m``: on the channel of the mode (l, m); it matters for the circular odd-l m = 0 modes).

    Example
    -------
    >>> maximum_relative_order("mass", 2, "circular"), maximum_relative_order("mass", 2, "general")
    (PNOrder(5/2), PNOrder(1))
    """
    families = _rows_for(kind, l, table)
    candidates = sorted({row.known_through for rows in families.values() for row in rows
                         if row.available and orbit in row.orbits} | {PNOrder(0)})
    best = None
    order = PNOrder(0)
    limit = max(candidates)
    while order <= limit:
        try:
            plan_radiative_moment(kind, l, order, orbit, m=m, table=table, _explain=False)
        except OrderBeyondInputsError:
            break
        best = order
        order = order + PNOrder(1, 2)
    if best is None:
        raise OrderBeyondInputsError(f"the table gives no order of the {kind} moment l = {l} on {orbit} orbits")
    return best


def maximum_mode_order(l: int, m: int, orbit: str, table: Sequence[Contribution] = CONTRIBUTIONS) -> PNOrder:
    """The highest absolute order of Hhat_lm the table supports (leading order + relative)."""
    return leading_order(l, m) + maximum_relative_order(mode_kind(l, m), l, orbit, table, m=m)


def maximum_order_any_mode(orbit: str, *, relative: bool, lmax: int = LMAX_BOUND,
                           table: Sequence[Contribution] = CONTRIBUTIONS) -> PNOrder:
    """The largest order any mode with ``l <= lmax`` supports (the bound of ``--pn`` or
    ``--pn-relative`` at the command line's edge)."""
    best = PNOrder(0)
    for l in range(2, lmax + 1):
        for kind, m in (("mass", l), ("current", l - 1)):
            rel = maximum_relative_order(kind, l, orbit, table)
            best = max(best, rel if relative else leading_order(l, m) + rel)
    return best


def maximum_flux_order(orbit: str = "circular", table: Sequence[Contribution] = CONTRIBUTIONS) -> PNOrder:
    """The highest absolute order of the energy and angular-momentum fluxes.

    The flux through order P sums every mode whose ``|Hhat_lm|^2`` starts at or below P (at
    twice the mode's leading order), each through relative ``P - 2 leading order``; both routes
    (mode sum, STF formula) use the same radiative moments.

    Example
    -------
    >>> maximum_flux_order("circular"), maximum_flux_order("general")
    (PNOrder(5/2), PNOrder(1))
    >>> maximum_flux_order("eccentric")
    PNOrder(2)
    """
    order = PNOrder(0)
    best = None
    while True:
        ok = True
        for l in range(2, 2 * int(order) + 4):
            for kind, m in (("mass", l), ("current", l - 1)):
                lead = leading_order(l, m)
                if 2 * lead > order:
                    continue
                if maximum_relative_order(kind, l, orbit, table) < order - 2 * lead:
                    ok = False
        if not ok:
            break
        best = order
        order = order + PNOrder(1, 2)
        if order > 20:
            break
    return best


def maximum_eccentric_order(table: Sequence[Contribution] = CONTRIBUTIONS) -> PNOrder:
    """The highest PN order of the orbit-averaged eccentric fluxes and secular rates: the rows
    covering eccentric orbits and the quasi-Keplerian orbit representation must both reach it.

    Example
    -------
    >>> maximum_eccentric_order()
    PNOrder(2)
    """
    orbit_orders = INPUT_ORDERS["quasi-Keplerian orbit"]
    return min(maximum_flux_order("eccentric", table), known_through(max(orbit_orders)))


def memory_row(l: int, pn_relative: PNOrder | None = None,
               table: Sequence[Contribution] = CONTRIBUTIONS) -> Contribution | None:
    """The available row giving the DC memory of the circular mode (l, 0), l even, through
    ``pn_relative`` (relative to the memory's own leading order; None: any), or None.

    Example
    -------
    >>> memory_row(2).known_through
    PNOrder(2)
    """
    usable = [row for row in table if row.family == "memory" and row.modes == "m = 0" and row.available
              and row.feeds("mass", l) and "circular" in row.orbits
              and (pn_relative is None or row.known_through >= pn_relative)]
    return min(usable, key=lambda row: row.known_through) if usable else None


def circular_zero_mode_reason(l: int, pn_relative: PNOrder | None = None,
                              table: Sequence[Contribution] = CONTRIBUTIONS) -> str:
    """Why a circular-orbit m = 0 mode of even l is refused: it comes from the non-oscillating
    part of the non-linear memory, an integral over the whole past of the inspiral; the memory
    row of the table of contributions gives it through some relative order, and the request is
    beyond it (or the table has no such row). The odd-l m = 0 modes are served: they come from
    instantaneous quadratic interactions of V_L.

    Example
    -------
    >>> circular_zero_mode_reason(2, PNOrder(2))[:40]
    'circular-orbit m = 0 mode (2,0): it come'
    """
    if l % 2:
        raise ValueError(f"the circular-orbit m = 0 mode of odd l = {l} is served, not refused")
    rows = [row for row in table if row.family == "memory" and row.feeds("mass", l)]
    have = max((row.known_through for row in rows if row.available), default=None)
    missing = next((row.description for row in rows if not row.available), None)
    have_text = ("which the toolkit does not compute" if have is None else
                 f"which the toolkit derives through relative {have.words()} (memory row of the table of contributions)")
    asked = "" if pn_relative is None else f"; asked for relative {pn_relative}"
    needs = f"; beyond it needs the {missing}" if missing and have is not None else ""
    return (f"circular-orbit m = 0 mode ({l},0): it comes from the non-oscillating part of the non-linear "
            f"memory, an integral over the whole past of the inspiral, {have_text}{asked}{needs}")
