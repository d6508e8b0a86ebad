"""The cited inputs of the two-body dynamics in harmonic coordinates, written once for any algebra.

Each input is a plain function of a symbol namespace ``s`` (:func:`stfalgebra.exact.engine_symbols`
for the exact engine, :func:`stfalgebra.symbols.sympy_symbols` for sympy) and of the PN order,
returning ``{k: coefficient of 1/c^(2k)}``. Nothing here imports sympy: the derivation
pipeline evaluates these formulas in the exact engine, and the sympy-facing modules
(:mod:`~stfalgebra.binary.dynamics`, :mod:`~stfalgebra.binary.centre_of_mass`) build their
series from the same functions, so every formula exists once.

:data:`DYNAMICS_INPUTS` is the table of these inputs: for each, the PN orders available and
where the formula comes from. The table of contributions
(:mod:`stfalgebra.radiative.contributions`) reads the available orders from it.

**Conventions**: harmonic coordinates, centre-of-mass frame; ``x = y1 - y2``, ``r = |x|``,
``n = x/r``, ``v = dx/dt = rdot n + r phidot lambda``, ``lambda = e_z x n``; ``X1 = (1 + delta)/2``,
``X2 = (1 - delta)/2``; planar motion in the x-y plane (``../shared/conventions.md``). The
conservative dynamics of non-spinning point masses has no 0.5PN or 1.5PN terms (the first odd
order is radiation reaction at 2.5PN; common practice), so an input given through PN order
``p`` is known through relative order ``p + 1/2``.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any, Callable

from ..errors import OrderBeyondInputsError
from ..orders import PNOrder

__all__ = [
    "DynamicsInput", "DYNAMICS_INPUTS", "dynamics_input", "known_through",
    "harmonic_acceleration", "centre_of_mass_position", "orbital_energy", "orbital_angular_momentum",
]


def harmonic_acceleration(s: Any, pn_order: int) -> tuple[dict[int, Any], dict[int, Any]]:
    """The relative acceleration ``a = a_n n + a_lambda lambda``, order by order.

    Parameters
    ----------
    s:
        A symbol namespace (module docstring).
    pn_order:
        Highest PN order included (validated by :func:`dynamics_input`).

    Returns
    -------
    (a_n, a_lambda):
        ``{k: coefficient of 1/c^(2k)}`` for each component.

    **Conventions**: Newtonian ``a = -(G m/r^2) n``; at 1PN ``a = -(G m/r^2)[(1 + A) n + B v]``
    with ``A = -(3/2) nu rdot^2 + (1 + 3 nu) v^2 - 2 (2 + nu) G m/r``, ``B = -2 (2 - nu) rdot``.

    Example
    -------
    >>> from stfalgebra.exact import engine_symbols
    >>> harmonic_acceleration(engine_symbols(), 0)[0]
    {0: -G*m*r**(-2)}

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), the 1PN relative acceleration in harmonic
    coordinates (entered from memory; checked in the tests by the exact conservation of the
    1PN energy and angular momentum along it).
    """
    gm_r2 = s.G * s.m * s.r**-2
    a_n = {0: -gm_r2}
    a_lambda: dict[int, Any] = {}
    if pn_order >= 1:
        v2 = s.rdot**2 + s.r**2 * s.phidot**2
        big_a = -s.q(3, 2) * s.nu * s.rdot**2 + (1 + 3 * s.nu) * v2 - 2 * (2 + s.nu) * s.G * s.m * s.r**-1
        big_b = -2 * (2 - s.nu) * s.rdot
        a_n[1] = -gm_r2 * (big_a + big_b * s.rdot)
        a_lambda[1] = -gm_r2 * big_b * s.r * s.phidot
    return a_n, a_lambda


def centre_of_mass_position(s: Any, pn_order: int) -> tuple[dict[int, Any], dict[int, Any]]:
    """The factors ``s_A`` of the body positions ``y_A = s_A x`` in the centre-of-mass frame.

    Parameters
    ----------
    s:
        A symbol namespace.
    pn_order:
        Highest PN order included.

    Returns
    -------
    (s1, s2):
        ``{k: coefficient of 1/c^(2k)}``.

    **Conventions**: ``s1 = X2 + nu delta (v^2 - G m/r)/(2 c^2)``,
    ``s2 = -X1 + nu delta (v^2 - G m/r)/(2 c^2)``.

    Example
    -------
    >>> from stfalgebra.exact import engine_symbols
    >>> centre_of_mass_position(engine_symbols(), 0)
    ({0: 1/2 - delta/2}, {0: -1/2 - delta/2})

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), centre-of-mass relations in harmonic
    coordinates (the 1PN part from memory; the tests derive it from the 1PN mass dipole).
    """
    x1, x2 = (1 + s.delta) * s.q(1, 2), (1 - s.delta) * s.q(1, 2)
    s1: dict[int, Any] = {0: x2}
    s2: dict[int, Any] = {0: -x1}
    if pn_order >= 1:
        correction = s.nu * s.delta * (s.rdot**2 + s.r**2 * s.phidot**2 - s.G * s.m * s.r**-1) * s.q(1, 2)
        s1[1] = correction
        s2[1] = correction
    return s1, s2


def orbital_energy(s: Any, pn_order: int) -> dict[int, Any]:
    """The conserved energy per unit reduced mass ``E/mu`` (rest mass excluded).

    Example
    -------
    >>> from stfalgebra.exact import engine_symbols
    >>> orbital_energy(engine_symbols(), 0)[0]
    rdot**2/2 - G*m*r**(-1) + r**2*phidot**2/2

    **Conventions**: ``E/mu = v^2/2 - G m/r + (1/c^2)[(3/8)(1 - 3 nu) v^4 + (G m/(2 r))((3 + nu) v^2
    + nu rdot^2 + G m/r)]``, ``mu = m nu``.

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), 1PN energy in harmonic coordinates (from
    memory; checked in the tests by its vanishing time derivative along the 1PN motion).
    """
    v2 = s.rdot**2 + s.r**2 * s.phidot**2
    gm_r = s.G * s.m * s.r**-1
    terms = {0: v2 * s.q(1, 2) - gm_r}
    if pn_order >= 1:
        terms[1] = s.q(3, 8) * (1 - 3 * s.nu) * v2**2 + gm_r * s.q(1, 2) * ((3 + s.nu) * v2 + s.nu * s.rdot**2 + gm_r)
    return terms


def orbital_angular_momentum(s: Any, pn_order: int) -> dict[int, Any]:
    """The conserved angular momentum (z component) per unit reduced mass ``J/mu``.

    Example
    -------
    >>> from stfalgebra.exact import engine_symbols
    >>> orbital_angular_momentum(engine_symbols(), 0)[0]
    r**2*phidot

    **Conventions**: ``J/mu = r^2 phidot [1 + (1/c^2)((1 - 3 nu) v^2/2 + (3 + nu) G m/r)]``,
    positive for motion along +phi.

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), 1PN angular momentum (from memory; checked in
    the tests by its vanishing time derivative along the 1PN motion).
    """
    terms = {0: s.r**2 * s.phidot}
    if pn_order >= 1:
        v2 = s.rdot**2 + s.r**2 * s.phidot**2
        terms[1] = s.r**2 * s.phidot * ((1 - 3 * s.nu) * v2 * s.q(1, 2) + (3 + s.nu) * s.G * s.m * s.r**-1)
    return terms


@dataclass(frozen=True)
class DynamicsInput:
    """One cited input of the two-body dynamics: its formula, the PN orders it has, its source."""

    name: str
    formula: Callable[[Any, int], Any] | None
    orders: tuple[int, ...]
    source: str


_BLANCHET_2014 = "Blanchet, Living Rev. Relativ. 17, 2 (2014), harmonic coordinates (from memory)"

#: The inputs of the dynamics, by name.
DYNAMICS_INPUTS: dict[str, DynamicsInput] = {
    item.name: item for item in (
        DynamicsInput("equations of motion", harmonic_acceleration, (0, 1), _BLANCHET_2014),
        DynamicsInput("centre-of-mass relations", centre_of_mass_position, (0, 1), _BLANCHET_2014),
        DynamicsInput("conserved energy", orbital_energy, (0, 1), _BLANCHET_2014),
        DynamicsInput("conserved angular momentum", orbital_angular_momentum, (0, 1), _BLANCHET_2014),
        # the orbit representation lives in stfalgebra.binary.keplerian (a sympy parametrisation)
        DynamicsInput("quasi-Keplerian orbit", None, (0, 1),
                      "Damour & Deruelle, Ann. Inst. H. Poincare 43, 107 (1985), 1PN quasi-Keplerian "
                      "representation in harmonic coordinates (from memory)"),
    )
}


def known_through(pn_order: int) -> PNOrder:
    """The relative order through which an input given through ``pn_order`` is known
    (``pn_order + 1/2``: no half-integer conservative terms, module docstring)."""
    return PNOrder(pn_order) + PNOrder(1, 2)


def dynamics_input(name: str, pn_order: Any) -> DynamicsInput:
    """The input ``name`` after checking that it exists at ``pn_order``.

    Raises
    ------
    TypeError
        ``pn_order`` not an int.
    ValueError
        Negative order or unknown name.
    OrderBeyondInputsError
        The order is beyond the cited input (the message names the orders available).

    Example
    -------
    >>> dynamics_input("equations of motion", 1).orders
    (0, 1)
    """
    if isinstance(pn_order, bool) or not isinstance(pn_order, int):
        if getattr(pn_order, "is_Integer", False):
            pn_order = int(pn_order)
        else:
            raise TypeError(f"pn_order must be an int, got {pn_order!r}")
    if name not in DYNAMICS_INPUTS:
        raise ValueError(f"no dynamics input called {name!r}")
    if pn_order < 0:
        raise ValueError(f"pn_order must be a non-negative int, got {pn_order}")
    item = DYNAMICS_INPUTS[name]
    if pn_order not in item.orders:
        raise OrderBeyondInputsError(
            f"the {name} are implemented at PN orders {', '.join(map(str, item.orders))}; "
            f"pn_order {pn_order} is beyond the toolkit's inputs")
    return item
