"""The typed-in inputs of the two-body dynamics, each written once beside its source.

The harmonic-coordinate relative acceleration in the centre-of-mass frame, the conserved energy
and angular momentum, and the centre-of-mass relations, through 2PN, enter here and nowhere else
(the quasi-Keplerian elements of :mod:`stfalgebra.binary.keplerian` are the layer's other typed-in
input). The circular-orbit relations are *derived* from these (:mod:`stfalgebra.binary.circular`),
never typed in.

**Form of every input.** A plain function of one namespace argument ``s`` whose attributes are
the symbols ``s.G, s.m, s.nu, s.delta, s.r, s.rdot, s.phidot`` and the exact-rational constructor
``s.q(numerator, denominator)``. The body uses only ``+``, ``-``, ``*`` and ``**`` with integer
exponents (negative powers of ``s.r`` only), so any exact arithmetic evaluates it: sympy symbols
(:mod:`stfalgebra.binary.dynamics` builds its series that way), polynomials of an exact engine,
or plain :class:`fractions.Fraction` numbers. It returns ``{k: coefficient}``, where order ``k``
multiplies ``1/c^(2k)`` (``c`` removed).

**Conventions** (``shared/conventions.md``): harmonic coordinates, centre-of-mass frame;
``x = y1 - y2``, ``r = |x|``, ``n = x/r``, ``v = dx/dt``, ``rdot = n.v``, planar motion with
``v = rdot n + r phidot lambda``, ``v^2 = rdot^2 + r^2 phidot^2``; ``m = m1 + m2``,
``nu = m1 m2/m^2``, ``delta = (m1 - m2)/m``, ``X1 = (1 + delta)/2``, ``X2 = (1 - delta)/2``.

**Accuracy.** These are the *conservative* dynamics of non-spinning point masses: no 0.5PN or
1.5PN terms exist, and the first odd order is the 2.5PN radiation reaction, which is not entered
here (a later issue). :data:`KNOWN_THROUGH` records, per implemented PN order, the relative order
through which the inputs are known: ``p + 1/2`` below 2PN, and 2 at 2PN, because the 2.5PN
radiation-reaction terms (in the acceleration, in the harmonic-coordinate energy and in the
centre-of-mass relation along ``v``) are real terms at relative 5/2 that are not entered
among the conservative inputs.

**Radiation reaction.** The 2.5PN (dissipative) terms are entered apart, as their own functions
(:func:`acceleration_reaction_n_factor`, :func:`acceleration_reaction_v_factor`,
:func:`energy_reaction_term`, :func:`angular_momentum_reaction_term`,
:func:`centre_of_mass_velocity_reaction_term`), listed in :data:`REACTION_INPUTS` with their
order in :data:`REACTION_KNOWN_THROUGH`: added to the 2PN conservative inputs they make the
dynamics known through relative 5/2 only in combination (the 3PN conservative terms, the next
ones, are not entered). Their keys are the order ``5/2`` (a :class:`~stfalgebra.orders.PNOrder`),
multiplying ``1/c^5``.

**Sources.** Each input is the form restated in Blanchet, Living Rev. Relativ. 17, 2 (2014)
(arXiv:1310.1528), Sec. 7.3 "Equations of motion in the center-of-mass frame" (section title
checked against the review's table of contents). The text of the equations could not be read
through the project's search tool (only the review's abstract and contents were reachable), so
every coefficient below was entered **from memory** and the equation numbers are not given. Each
is checked by the tests against things outside the project: exact conservation of ``E`` and
``J`` along the equations of motion (symbolically, and numerically with the residual falling as
``c^-6``), the Schwarzschild geodesic in harmonic coordinates derived independently with sympy
(test-mass limit of ``A, B, E, J``), and the published circular-orbit energy and angular
momentum through 2PN. The conservation check caught one coefficient recalled wrongly (the
``nu^2 rdot^2 v^2 G m/r`` term of ``E``); the centre-of-mass relations at 2PN (``P`` at order 2
and ``Q``) have no independent check yet. Original derivations (bibliographic details from
memory): Blanchet, Faye & Ponsot, Phys. Rev. D 58, 124002 (1998) (harmonic equations of motion
through 2.5PN); Blanchet & Iyer, Class. Quantum Grav. 20, 755 (2003), arXiv:gr-qc/0209089
(centre-of-mass relations, E and J in the centre-of-mass frame).
"""

from __future__ import annotations

from typing import Any, Callable, NamedTuple

from ..errors import OrderBeyondInputsError
from ..orders import PNOrder

__all__ = [
    "KNOWN_THROUGH",
    "acceleration_n_factor",
    "acceleration_v_factor",
    "energy_per_reduced_mass",
    "angular_momentum_per_reduced_mass",
    "centre_of_mass_shift",
    "centre_of_mass_velocity_term",
    "REACTION_ORDER",
    "REACTION_KNOWN_THROUGH",
    "acceleration_reaction_n_factor",
    "acceleration_reaction_v_factor",
    "energy_reaction_term",
    "angular_momentum_reaction_term",
    "centre_of_mass_velocity_reaction_term",
    "CitedInput",
    "CITED_INPUTS",
    "REACTION_INPUTS",
    "INPUT_ORDERS",
    "REACTION_INPUT_ORDERS",
    "check_input_order",
    "known_through",
]

#: Implemented PN order -> relative order through which the inputs are known (no 0.5PN or 1.5PN
#: conservative terms: common practice; at 2PN the 2.5PN radiation reaction, not entered, is the
#: next term).
KNOWN_THROUGH: dict[int, PNOrder] = {0: PNOrder(1, 2), 1: PNOrder(3, 2), 2: PNOrder(2)}

_REVIEW = "Blanchet, Living Rev. Relativ. 17, 2 (2014) (arXiv:1310.1528), Sec. 7.3"


def _speed_squared(s: Any) -> Any:
    return s.rdot**2 + s.r**2 * s.phidot**2


def _acceleration_a(s: Any) -> dict[int, Any]:
    """The coefficient A of ``a = -(G m/r^2)[(1 + A) n + B v]``: ``{1: A_1PN, 2: A_2PN}``."""
    q, nu, rdot = s.q, s.nu, s.rdot
    v2 = _speed_squared(s)
    gm_r = s.G * s.m * s.r**-1
    return {
        1: -q(3, 2) * nu * rdot**2 + (1 + 3 * nu) * v2 - (4 + 2 * nu) * gm_r,
        2: (q(15, 8) * nu * rdot**4 - q(45, 8) * nu**2 * rdot**4
            - q(9, 2) * nu * rdot**2 * v2 + 6 * nu**2 * rdot**2 * v2
            + 3 * nu * v2**2 - 4 * nu**2 * v2**2
            + gm_r * (-2 * rdot**2 - 25 * nu * rdot**2 - 2 * nu**2 * rdot**2
                      - q(13, 2) * nu * v2 + 2 * nu**2 * v2)
            + gm_r**2 * (9 + q(87, 4) * nu)),
    }


def _acceleration_b(s: Any) -> dict[int, Any]:
    """The coefficient B of ``a = -(G m/r^2)[(1 + A) n + B v]``: ``{1: B_1PN, 2: B_2PN}``."""
    q, nu, rdot = s.q, s.nu, s.rdot
    v2 = _speed_squared(s)
    gm_r = s.G * s.m * s.r**-1
    return {
        1: -4 * rdot + 2 * nu * rdot,
        2: (q(9, 2) * nu * rdot**3 + 3 * nu**2 * rdot**3
            - q(15, 2) * nu * rdot * v2 - 2 * nu**2 * rdot * v2
            + gm_r * (2 * rdot + q(41, 2) * nu * rdot + 4 * nu**2 * rdot)),
    }


def acceleration_n_factor(s: Any) -> dict[int, Any]:
    """Factor of ``n`` in the relative acceleration ``a = alpha n + beta v`` (harmonic, CM frame).

    Parameters
    ----------
    s:
        Namespace of symbols (module docstring).

    Returns
    -------
    dict
        ``alpha = {0: -G m/r^2, 1: -(G m/r^2) A_1PN, 2: -(G m/r^2) A_2PN}``; order ``k``
        multiplies ``1/c^(2k)``.

    **Conventions**: ``a = dv/dt = -(G m/r^2)[(1 + A) n + B v]`` with ``n = x/r`` pointing from
    body 2 to body 1 (module docstring), so ``alpha = -(G m/r^2)(1 + A)``. ``n`` and ``v`` are
    not orthogonal: the polar radial component is ``alpha + beta rdot``. Conservative part only
    (the 2.5PN radiation reaction is a later issue).

    Example
    -------
    >>> from fractions import Fraction
    >>> from types import SimpleNamespace
    >>> s = SimpleNamespace(G=1, m=1, nu=Fraction(1, 4), delta=0, r=Fraction(10),
    ...                     rdot=Fraction(0), phidot=Fraction(1, 30), q=Fraction)
    >>> acceleration_n_factor(s)[0]
    Fraction(-1, 100)

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 7.3, the coefficients A (1PN and 2PN)
    (from memory, equation number not checked). Tested: conservation of E and J, the Schwarzschild geodesic at nu = 0, and
    the published circular-orbit energy.
    """
    newtonian = -s.G * s.m * s.r**-2
    out = {0: newtonian}
    for order, value in _acceleration_a(s).items():
        out[order] = newtonian * value
    return out


def acceleration_v_factor(s: Any) -> dict[int, Any]:
    """Factor of ``v`` in the relative acceleration ``a = alpha n + beta v`` (harmonic, CM frame).

    Parameters
    ----------
    s:
        Namespace of symbols (module docstring).

    Returns
    -------
    dict
        ``beta = {1: -(G m/r^2) B_1PN, 2: -(G m/r^2) B_2PN}`` (no Newtonian term).

    **Conventions**: as :func:`acceleration_n_factor`.

    Example
    -------
    >>> from fractions import Fraction
    >>> from types import SimpleNamespace
    >>> s = SimpleNamespace(G=1, m=1, nu=0, delta=1, r=Fraction(10),
    ...                     rdot=Fraction(1, 10), phidot=Fraction(1, 30), q=Fraction)
    >>> acceleration_v_factor(s)[1]   # -(1/100)(-4/10) at nu = 0
    Fraction(1, 250)

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 7.3, the coefficients B (1PN and 2PN)
    (from memory, equation number not checked). Tested as :func:`acceleration_n_factor`.
    """
    newtonian = -s.G * s.m * s.r**-2
    return {order: newtonian * value for order, value in _acceleration_b(s).items()}


def energy_per_reduced_mass(s: Any) -> dict[int, Any]:
    """Conserved energy per reduced mass ``E/mu`` (harmonic, CM frame, rest mass excluded).

    Parameters
    ----------
    s:
        Namespace of symbols (module docstring).

    Returns
    -------
    dict
        ``{0: v^2/2 - G m/r, 1: ..., 2: ...}``, ``mu = m nu``.

    **Conventions**: conserved by the conservative equations of motion of
    :func:`acceleration_n_factor`, :func:`acceleration_v_factor`; the harmonic-coordinate energy
    acquires a 2.5PN radiation-reaction piece that is not entered here.

    Example
    -------
    >>> from fractions import Fraction
    >>> from types import SimpleNamespace
    >>> s = SimpleNamespace(G=1, m=1, nu=0, delta=1, r=Fraction(1),
    ...                     rdot=Fraction(0), phidot=Fraction(1), q=Fraction)
    >>> energy_per_reduced_mass(s)[0]
    Fraction(-1, 2)

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 7.3, the centre-of-mass energy through
    2PN (from memory, equation number not checked; the coefficient of
    ``nu^2 rdot^2 v^2 G m/r`` at 2PN, recalled first as -3/2, is -15/4 as exact conservation
    along the 2PN equations of motion requires); Blanchet & Iyer, Class. Quantum Grav. 20, 755
    (2003).
    """
    q, nu, rdot = s.q, s.nu, s.rdot
    v2 = _speed_squared(s)
    gm_r = s.G * s.m * s.r**-1
    return {
        0: q(1, 2) * v2 - gm_r,
        1: (q(3, 8) * v2**2 - q(9, 8) * nu * v2**2
            + gm_r * (q(1, 2) * nu * rdot**2 + q(3, 2) * v2 + q(1, 2) * nu * v2)
            + q(1, 2) * gm_r**2),
        2: (q(5, 16) * v2**3 - q(35, 16) * nu * v2**3 + q(65, 16) * nu**2 * v2**3
            + gm_r * (-q(3, 8) * nu * rdot**4 + q(9, 8) * nu**2 * rdot**4
                      + q(1, 4) * nu * rdot**2 * v2 - q(15, 4) * nu**2 * rdot**2 * v2
                      + q(21, 8) * v2**2 - q(23, 8) * nu * v2**2 - q(27, 8) * nu**2 * v2**2)
            + gm_r**2 * (q(1, 2) * rdot**2 + q(69, 8) * nu * rdot**2
                         + q(3, 2) * nu**2 * rdot**2 + q(7, 4) * v2 - q(55, 8) * nu * v2
                         + q(1, 2) * nu**2 * v2)
            + gm_r**3 * (-q(1, 2) - q(15, 4) * nu)),
    }


def angular_momentum_per_reduced_mass(s: Any) -> dict[int, Any]:
    """Conserved orbital angular momentum (z component) per reduced mass ``J/mu``.

    Parameters
    ----------
    s:
        Namespace of symbols (module docstring).

    Returns
    -------
    dict
        ``{0: r^2 phidot, 1: ..., 2: ...}``: ``J = mu (x cross v)[1 + ...]`` with
        ``(x cross v)_z = r^2 phidot``.

    **Conventions**: harmonic coordinates, CM frame; positive for motion along +phi.

    Example
    -------
    >>> from fractions import Fraction
    >>> from types import SimpleNamespace
    >>> s = SimpleNamespace(G=1, m=1, nu=0, delta=1, r=Fraction(2),
    ...                     rdot=Fraction(0), phidot=Fraction(1, 3), q=Fraction)
    >>> angular_momentum_per_reduced_mass(s)[0]
    Fraction(4, 3)

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 7.3, the centre-of-mass angular momentum
    through 2PN (from memory, equation number not checked); Blanchet & Iyer, Class. Quantum
    Grav. 20, 755 (2003).
    """
    q, nu, rdot = s.q, s.nu, s.rdot
    v2 = _speed_squared(s)
    gm_r = s.G * s.m * s.r**-1
    newtonian = s.r**2 * s.phidot
    return {
        0: newtonian,
        1: newtonian * ((q(1, 2) - q(3, 2) * nu) * v2 + (3 + nu) * gm_r),
        2: newtonian * (q(3, 8) * v2**2 - q(21, 8) * nu * v2**2 + q(39, 8) * nu**2 * v2**2
                        + gm_r * (-nu * rdot**2 - q(5, 2) * nu**2 * rdot**2 + q(7, 2) * v2
                                  - 5 * nu * v2 - q(9, 2) * nu**2 * v2)
                        + gm_r**2 * (q(7, 2) - q(41, 4) * nu + nu**2)),
    }


def centre_of_mass_shift(s: Any) -> dict[int, Any]:
    """The common factor ``P`` of the centre-of-mass positions along ``x``.

    ``y1 = [X2 + nu delta P] x + nu delta Q v`` and ``y2 = [-X1 + nu delta P] x + nu delta Q v``.

    Parameters
    ----------
    s:
        Namespace of symbols (module docstring).

    Returns
    -------
    dict
        ``{1: P_1PN, 2: P_2PN}`` (``P`` has no Newtonian term).

    **Conventions**: harmonic coordinates; the CM frame is the frame where the conserved
    centre-of-mass integral vanishes.

    Example
    -------
    >>> from fractions import Fraction
    >>> from types import SimpleNamespace
    >>> s = SimpleNamespace(G=1, m=1, nu=0, delta=1, r=Fraction(1),
    ...                     rdot=Fraction(0), phidot=Fraction(1), q=Fraction)
    >>> centre_of_mass_shift(s)[1]
    Fraction(0, 1)

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 7.3, the centre-of-mass positions
    (from memory, equation number not checked); Blanchet & Iyer, Class. Quantum Grav. 20, 755
    (2003). The 1PN term is derived in the tests from the 1PN mass dipole; the 2PN term has no
    independent check yet.
    """
    q, nu, rdot = s.q, s.nu, s.rdot
    v2 = _speed_squared(s)
    gm_r = s.G * s.m * s.r**-1
    return {
        1: q(1, 2) * v2 - q(1, 2) * gm_r,
        2: (q(3, 8) * v2**2 - q(3, 2) * nu * v2**2
            + gm_r * (-q(1, 8) * rdot**2 + q(3, 4) * nu * rdot**2 + q(19, 8) * v2
                      + q(3, 2) * nu * v2)
            + gm_r**2 * (q(7, 4) - q(1, 2) * nu)),
    }


def centre_of_mass_velocity_term(s: Any) -> dict[int, Any]:
    """The factor ``Q`` of the centre-of-mass positions along ``v`` (first present at 2PN).

    Parameters
    ----------
    s:
        Namespace of symbols (module docstring).

    Returns
    -------
    dict
        ``{2: -(7/4) G m rdot}``.

    **Conventions**: as :func:`centre_of_mass_shift`. The 2.5PN (radiation-reaction) term of
    ``Q`` is not entered (a later issue).

    Example
    -------
    >>> from fractions import Fraction
    >>> from types import SimpleNamespace
    >>> s = SimpleNamespace(G=1, m=1, nu=0, delta=1, r=Fraction(1),
    ...                     rdot=Fraction(1, 2), phidot=Fraction(1), q=Fraction)
    >>> centre_of_mass_velocity_term(s)[2]
    Fraction(-7, 8)

    References
    ----------
    As :func:`centre_of_mass_shift` (from memory; no independent check yet).
    """
    return {2: -s.q(7, 4) * s.G * s.m * s.rdot}


# ----------------------------------------------------------------------------- radiation reaction
#: The PN order of the leading radiation reaction (the first odd, dissipative, order).
REACTION_ORDER = PNOrder(5, 2)

#: The dissipative inputs: order -> relative order through which the dynamics is known when the
#: reaction is added to the 2PN conservative inputs. The combination 2PN + 2.5PN is known
#: through relative 5/2 only *in combination*: the next terms are the 3PN conservative ones,
#: which are not entered (and the 3.5PN reaction after them).
REACTION_KNOWN_THROUGH: dict[PNOrder, PNOrder] = {REACTION_ORDER: PNOrder(5, 2)}

_REACTION_SOURCE = ("Blanchet, Living Rev. Relativ. 17, 2 (2014) (arXiv:1310.1528), Sec. 7.3 "
                    "(from memory; the equations could not be read through the search tool)")


def acceleration_reaction_n_factor(s: Any) -> dict[PNOrder, Any]:
    """The 2.5PN radiation-reaction part of the factor of ``n`` in ``a = alpha n + beta v``.

    Parameters
    ----------
    s:
        Namespace of symbols (module docstring).

    Returns
    -------
    dict
        ``{5/2: alpha_RR}`` with ``alpha_RR = -(G m/r^2) A_2.5PN``,
        ``A_2.5PN = -(8/5) nu (G m/r) rdot (3 v^2 + (17/3) G m/r)``; order 5/2 multiplies
        ``1/c^5``.

    **Conventions**: harmonic coordinates, centre-of-mass frame, ``a = -(G m/r^2)[(1 + A) n +
    B v]`` as :func:`acceleration_n_factor`. Added to the 2PN conservative acceleration the
    dynamics is known through relative 5/2 (:data:`REACTION_KNOWN_THROUGH`).

    Example
    -------
    >>> from fractions import Fraction
    >>> from types import SimpleNamespace
    >>> s = SimpleNamespace(G=1, m=1, nu=Fraction(1, 4), delta=0, r=Fraction(1),
    ...                     rdot=Fraction(1), phidot=Fraction(0), q=Fraction)
    >>> acceleration_reaction_n_factor(s)[Fraction(5, 2)]   # (2/5)(3 + 17/3)
    Fraction(52, 15)

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 7.3, the 2.5PN coefficient A (from
    memory; equation number not checked). The same form follows from the general-frame 2.5PN
    harmonic acceleration of body 1 (Sec. 7.1 of the review, also from memory) reduced to the
    relative motion; it is the member alpha = -1, beta = 0 of the two-parameter family of Iyer &
    Will, Phys. Rev. D 52, 6882 (1995) (from memory). Tested: exact energy and angular-momentum
    balance against the Newtonian fluxes of the modes up to total time derivatives, orbit
    averages of a numerically integrated orbit, the circular inspiral rate.
    """
    q, nu, rdot = s.q, s.nu, s.rdot
    gm = s.G * s.m
    value = q(8, 5) * nu * gm**2 * s.r**-3 * rdot * (3 * _speed_squared(s) + q(17, 3) * gm * s.r**-1)
    return {REACTION_ORDER: value}


def acceleration_reaction_v_factor(s: Any) -> dict[PNOrder, Any]:
    """The 2.5PN radiation-reaction part of the factor of ``v`` in ``a = alpha n + beta v``.

    Parameters
    ----------
    s:
        Namespace of symbols (module docstring).

    Returns
    -------
    dict
        ``{5/2: beta_RR}`` with ``beta_RR = -(G m/r^2) B_2.5PN``,
        ``B_2.5PN = (8/5) nu (G m/r) (v^2 + 3 G m/r)``.

    **Conventions**: as :func:`acceleration_reaction_n_factor`. On a circular orbit
    (``v^2 = G m/r``) the reaction is a drag ``-(32/5) nu (G m)^3/(c^5 r^4) v``.

    Example
    -------
    >>> from fractions import Fraction
    >>> from types import SimpleNamespace
    >>> s = SimpleNamespace(G=1, m=1, nu=Fraction(1, 4), delta=0, r=Fraction(1),
    ...                     rdot=Fraction(0), phidot=Fraction(1), q=Fraction)
    >>> acceleration_reaction_v_factor(s)[Fraction(5, 2)]   # -(2/5)(1 + 3)
    Fraction(-8, 5)

    References
    ----------
    As :func:`acceleration_reaction_n_factor` (the 2.5PN coefficient B, from memory).
    """
    q, nu = s.q, s.nu
    gm = s.G * s.m
    value = -q(8, 5) * nu * gm**2 * s.r**-3 * (_speed_squared(s) + 3 * gm * s.r**-1)
    return {REACTION_ORDER: value}


def energy_reaction_term(s: Any) -> dict[PNOrder, Any]:
    """The 2.5PN term of the harmonic-coordinate energy per reduced mass.

    With it, ``d(E + E_2.5PN)/dt = -F`` holds exactly at order ``1/c^5`` along the motion,
    ``F`` the Newtonian (quadrupole) energy flux written in ``r, rdot, phidot``: the reaction
    balances the flux only up to the total time derivative ``-dE_2.5PN/dt``.

    Parameters
    ----------
    s:
        Namespace of symbols (module docstring).

    Returns
    -------
    dict
        ``{5/2: (8/5) nu (G m/r)^2 rdot v^2}``.

    **Conventions**: energy per ``mu = m nu``, harmonic coordinates, centre-of-mass frame;
    odd in the velocities (vanishes on average over a closed orbit).

    Example
    -------
    >>> from fractions import Fraction
    >>> from types import SimpleNamespace
    >>> s = SimpleNamespace(G=1, m=1, nu=Fraction(1, 4), delta=0, r=Fraction(2),
    ...                     rdot=Fraction(1, 2), phidot=Fraction(0), q=Fraction)
    >>> energy_reaction_term(s)[Fraction(5, 2)]
    Fraction(1, 80)

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 7.3, the 2.5PN term of the
    centre-of-mass energy (from memory). Tested: it is the unique term of its form that turns
    the power of the reaction force into minus the Newtonian flux of the modes.
    """
    gm_r = s.G * s.m * s.r**-1
    return {REACTION_ORDER: s.q(8, 5) * s.nu * gm_r**2 * s.rdot * _speed_squared(s)}


def angular_momentum_reaction_term(s: Any) -> dict[PNOrder, Any]:
    """The 2.5PN term of the harmonic-coordinate angular momentum per reduced mass.

    With it, ``d(J + J_2.5PN)/dt = -G_z`` holds exactly at order ``1/c^5``, ``G_z`` the
    Newtonian angular-momentum flux.

    Parameters
    ----------
    s:
        Namespace of symbols (module docstring).

    Returns
    -------
    dict
        ``{5/2: -(8/5) nu (G m/r)^2 rdot r^2 phidot}``.

    **Conventions**: as :func:`energy_reaction_term` (z component, positive for motion along
    +phi).

    Example
    -------
    >>> from fractions import Fraction
    >>> from types import SimpleNamespace
    >>> s = SimpleNamespace(G=1, m=1, nu=Fraction(1, 4), delta=0, r=Fraction(2),
    ...                     rdot=Fraction(1, 2), phidot=Fraction(1, 4), q=Fraction)
    >>> angular_momentum_reaction_term(s)[Fraction(5, 2)]
    Fraction(-1, 20)

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 7.3, the 2.5PN term of the
    centre-of-mass angular momentum (from memory). Tested as :func:`energy_reaction_term`.
    """
    gm_r = s.G * s.m * s.r**-1
    return {REACTION_ORDER: -s.q(8, 5) * s.nu * gm_r**2 * s.rdot * s.r**2 * s.phidot}


def centre_of_mass_velocity_reaction_term(s: Any) -> dict[PNOrder, Any]:
    """The 2.5PN term of the factor ``Q`` of the centre-of-mass positions along ``v``.

    ``y1 = [X2 + nu delta P] x + nu delta Q v``, ``y2 = [-X1 + nu delta P] x + nu delta Q v``
    (:func:`centre_of_mass_shift`, :func:`centre_of_mass_velocity_term`).

    Parameters
    ----------
    s:
        Namespace of symbols (module docstring).

    Returns
    -------
    dict
        ``{5/2: (4/5) G m (v^2 - 2 G m/r)}``.

    **Conventions**: harmonic coordinates; the centre-of-mass frame is where the centre-of-mass
    integral, including its 2.5PN term, vanishes.

    Example
    -------
    >>> from fractions import Fraction
    >>> from types import SimpleNamespace
    >>> s = SimpleNamespace(G=1, m=1, nu=Fraction(1, 4), delta=0, r=Fraction(1),
    ...                     rdot=Fraction(0), phidot=Fraction(2), q=Fraction)
    >>> centre_of_mass_velocity_reaction_term(s)[Fraction(5, 2)]
    Fraction(8, 5)

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 7.3, the 2.5PN term of ``Q``
    (from memory, recalled as ``(4/5) G m nu (v^2 - 2 G m/r)``; entered without the factor
    ``nu``, which the test derivation rules out: the centre-of-mass integral that the
    general-frame 2.5PN harmonic accelerations conserve gives ``(4/5) G m (v^2 - 2 G m/r)``).
    """
    gm = s.G * s.m
    return {REACTION_ORDER: s.q(4, 5) * gm * (_speed_squared(s) - 2 * gm * s.r**-1)}


class CitedInput(NamedTuple):
    """One typed-in input: its function, what it is, and where it comes from."""

    name: str
    function: Callable[[Any], dict[int, Any]]
    quantity: str
    source: str
    checked_by: str


#: Every typed-in input of the two-body dynamics, with its source and its independent checks.
CITED_INPUTS: tuple[CitedInput, ...] = (
    CitedInput("acceleration_n_factor", acceleration_n_factor,
               "relative acceleration, factor of n = x/r (coefficient A), through 2PN",
               _REVIEW + ", coefficients A (from memory)",
               "E and J conservation; Schwarzschild geodesic at nu = 0; circular E(x)"),
    CitedInput("acceleration_v_factor", acceleration_v_factor,
               "relative acceleration, factor of v (coefficient B), through 2PN",
               _REVIEW + ", coefficients B (from memory)",
               "E and J conservation; Schwarzschild geodesic at nu = 0"),
    CitedInput("energy_per_reduced_mass", energy_per_reduced_mass,
               "conserved energy E/mu through 2PN",
               _REVIEW + ", centre-of-mass energy (from memory, one coefficient corrected)",
               "conservation; Schwarzschild geodesic energy at nu = 0; circular E(x)"),
    CitedInput("angular_momentum_per_reduced_mass", angular_momentum_per_reduced_mass,
               "conserved angular momentum J/mu through 2PN",
               _REVIEW + ", centre-of-mass angular momentum (from memory)",
               "conservation; Schwarzschild geodesic at nu = 0; circular J(x)"),
    CitedInput("centre_of_mass_shift", centre_of_mass_shift,
               "centre-of-mass factor P along x through 2PN",
               _REVIEW + ", centre-of-mass positions (from memory)",
               "1PN term: the 1PN mass dipole; 2PN term: none yet"),
    CitedInput("centre_of_mass_velocity_term", centre_of_mass_velocity_term,
               "centre-of-mass factor Q along v at 2PN",
               _REVIEW + ", centre-of-mass positions (from memory)",
               "none yet"),
)


#: The dissipative inputs (radiation reaction), kept apart from :data:`CITED_INPUTS` because
#: their order 5/2 is not an order of :data:`KNOWN_THROUGH`; the orders they are known through
#: are in :data:`REACTION_KNOWN_THROUGH`.
REACTION_INPUTS: tuple[CitedInput, ...] = (
    CitedInput("acceleration_reaction_n_factor", acceleration_reaction_n_factor,
               "relative acceleration, 2.5PN radiation-reaction factor of n (coefficient A)",
               _REACTION_SOURCE,
               "exact energy and angular-momentum balance with the Newtonian fluxes of the "
               "modes; general-frame body accelerations; numerical orbit averages; circular "
               "inspiral rate"),
    CitedInput("acceleration_reaction_v_factor", acceleration_reaction_v_factor,
               "relative acceleration, 2.5PN radiation-reaction factor of v (coefficient B)",
               _REACTION_SOURCE,
               "as the factor of n"),
    CitedInput("energy_reaction_term", energy_reaction_term,
               "2.5PN term of the energy E/mu",
               _REACTION_SOURCE,
               "unique balancing term of the energy balance (derived in the tests)"),
    CitedInput("angular_momentum_reaction_term", angular_momentum_reaction_term,
               "2.5PN term of the angular momentum J/mu",
               _REACTION_SOURCE,
               "unique balancing term of the angular-momentum balance (derived in the tests)"),
    CitedInput("centre_of_mass_velocity_reaction_term", centre_of_mass_velocity_reaction_term,
               "2.5PN term of the centre-of-mass factor Q along v",
               _REACTION_SOURCE + "; the recalled factor nu removed",
               "centre-of-mass integral of the general-frame 2.5PN accelerations (derived in "
               "the tests)"),
)


#: The PN orders each input of the dynamics is available at (the table of contributions reads
#: its limits from here). The quasi-Keplerian orbit representation is a sympy parametrisation in
#: :mod:`stfalgebra.binary.keplerian` (Damour & Deruelle, Ann. Inst. H. Poincare 43, 107 (1985),
#: 1PN, from memory; Memmesheimer, Gopakumar & Schafer, Phys. Rev. D 70, 104011 (2004), 2PN,
#: harmonic coordinates).
INPUT_ORDERS: dict[str, tuple[int, ...]] = {
    "equations of motion": tuple(sorted(KNOWN_THROUGH)),
    "conserved quantities": tuple(sorted(KNOWN_THROUGH)),
    "centre-of-mass relations": tuple(sorted(KNOWN_THROUGH)),
    "quasi-Keplerian orbit": (0, 1, 2),
}

#: The orders of the dissipative inputs (the table of contributions can read them from here).
REACTION_INPUT_ORDERS: dict[str, tuple[PNOrder, ...]] = {
    "radiation reaction": tuple(sorted(REACTION_KNOWN_THROUGH)),
}

_ORDER_NAMES = {0: "Newtonian (0)", 1: "1PN (1)", 2: "2PN (2)"}


def _order_words(orders: tuple[int, ...]) -> str:
    names = [_ORDER_NAMES.get(k, f"{k}PN ({k})") for k in orders]
    return names[0] if len(names) == 1 else ", ".join(names[:-1]) + " and " + names[-1]


def known_through(pn_order: int) -> PNOrder:
    """The relative order through which the inputs given at ``pn_order`` are known.

    Example
    -------
    >>> known_through(1), known_through(2)
    (PNOrder(3/2), PNOrder(2))
    """
    return KNOWN_THROUGH[pn_order]


def check_input_order(pn_order: Any, what: str = "equations of motion",
                      available: tuple[int, ...] | None = None) -> int:
    """Validate the PN order of an input of the dynamics; return it as an int.

    Raises
    ------
    TypeError
        Not an int.
    ValueError
        A negative int.
    OrderBeyondInputsError
        An order the input does not have (the message names the orders it has).

    Example
    -------
    >>> check_input_order(2)
    2
    """
    orders = INPUT_ORDERS.get(what, INPUT_ORDERS["equations of motion"]) if available is None else tuple(sorted(available))
    if isinstance(pn_order, bool) or not isinstance(pn_order, int):
        if getattr(pn_order, "is_Integer", False):
            pn_order = int(pn_order)
        else:
            raise TypeError(f"pn_order must be an int ({', '.join(map(str, orders))}), got {pn_order!r}")
    if pn_order < 0:
        raise ValueError(f"pn_order must be one of {', '.join(map(str, orders))}, got {pn_order!r}")
    if pn_order not in orders:
        raise OrderBeyondInputsError(
            f"the {what} are implemented at {_order_words(orders)} order; pn_order "
            f"{pn_order} is beyond the toolkit's inputs")
    return pn_order
