"""The typed-in inputs of the leading-order spin-orbit dynamics, each written once beside its source.

The spin-orbit part of the relative acceleration, the precession frequencies of the spins, and the
spin-orbit parts of the conserved energy and orbital angular momentum, in harmonic coordinates,
centre-of-mass frame, with the covariant spin supplementary condition. The circular-orbit
relations with spins are *derived* from these (:mod:`stfalgebra.binary.spin_circular`), never
typed in; the spin parts of the centre-of-mass relations are derived from the mass dipole
(:mod:`stfalgebra.moments.spin_moments`).

**Form of every input.** A plain function of one namespace ``s`` (as in
:mod:`stfalgebra.binary.cited_inputs`) with the scalars ``s.G, s.m, s.nu, s.delta, s.r, s.rdot``,
the exact-rational constructor ``s.q(p, q)``, the vectors ``s.x`` (relative position),
``s.v`` (relative velocity), ``s.spin = c S/(G m^2)`` and ``s.spin_difference = c Sigma/(G m^2)``
(:mod:`stfalgebra.binary.spin_variables`), and the products ``s.cross(a, b)``, ``s.dot(a, b)``.
The body uses ``+``, ``-``, ``*``, integer powers (negative ones of ``s.r`` only) and the two
products, so it evaluates on exact-engine vectors on the polar triad (aligned spins,
:mod:`stfalgebra.binary.triad_vectors`), on sympy vectors (general directions, exact) and on
floats (numerical integration). It returns ``{order: value}``, order ``k`` multiplying
``1/c^(2k)`` with the spins written through ``s`` and ``sigma`` (so the spin-orbit terms sit at
``k = 3/2``; the precession frequency, spin-independent, at ``k = 1``).

**Conventions** (``shared/conventions.md``): ``x = y1 - y2``, ``r = |x|``, ``n = x/r``,
``v = dx/dt``, ``rdot = n.v``; ``m = m1 + m2``, ``nu = m1 m2/m^2``, ``delta = (m1 - m2)/m``,
``X1 = (1 + delta)/2``, ``X2 = (1 - delta)/2``; ``S = S_1 + S_2``,
``Sigma = m (S_2/m_2 - S_1/m_1)``, spins with the covariant supplementary condition and
constant magnitude; ``dS_A/dt = Omega_A x S_A``.

**Sources.** Kidder, Phys. Rev. D 52, 821 (1995) (arXiv:gr-qc/9506022), Sec. II: the
spin-orbit acceleration, the precession equations, the spin-orbit energy and orbital angular
momentum (his ``Delta`` is ``Sigma``, his ``delta m/m`` is ``delta``), restated in Blanchet,
Living Rev. Relativ. 17, 2 (2014), Sec. 11.2. The project's search tool reaches the abstracts
and introductions of both texts but not their equations: every coefficient below was entered
**from memory** and the equation numbers given are from memory too (not checked against the
text). The tests are what holds them: exact conservation of the energy and of the total angular
momentum ``J = L + S_1 + S_2`` at spin-orbit order for arbitrary spin directions (sympy), the
numerical conservation along integrated precessing orbits (residual falling as ``c^-5``), the
gauge-invariant circular-orbit energy ``E(x)`` with its published ``x^(3/2)`` coefficient, and the
test-mass limit against the exact circular equatorial Kerr geodesic.
"""

from __future__ import annotations

from types import SimpleNamespace
from typing import Any

from ..orders import PNOrder
from .cited_inputs import CitedInput

__all__ = [
    "spin_orbit_acceleration",
    "spin_precession_frequency",
    "spin_orbit_energy",
    "spin_orbit_angular_momentum",
    "precession_frequencies",
    "exchanged_bodies",
    "SPIN_ORBIT_INPUTS",
]

_SPIN_ORBIT = PNOrder(3, 2)
_KIDDER = "Kidder, Phys. Rev. D 52, 821 (1995), Sec. II"
_REVIEW = "Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 11.2"


def spin_orbit_acceleration(s: Any) -> dict[PNOrder, Any]:
    """Spin-orbit part of the relative acceleration (harmonic coordinates, covariant SSC).

    Parameters
    ----------
    s:
        Namespace of symbols and vectors (module docstring).

    Returns
    -------
    dict
        ``{3/2: a_SO}`` with ``a = a_N + a_1PN/c^2 + ... + a_SO/c^3``,

            a_SO = (G^2 m^2/r^3) { 6 (x/r^2) [(x cross v).(2 s + delta sigma)]
                                    - v cross (7 s + 3 delta sigma)
                                    + 3 (rdot/r) x cross (3 s + delta sigma) },

        i.e. ``(G/(c^2 r^3)) {6 n [(n x v).(2S + delta Sigma)] - v x (7S + 3 delta Sigma)
        + 3 rdot n x (3S + delta Sigma)}`` with ``S = (G m^2/c) s``.

    **Conventions**: module docstring; ``n`` points from body 2 to body 1.

    Example
    -------
    >>> from fractions import Fraction
    >>> from types import SimpleNamespace
    >>> from stfalgebra.binary.triad_vectors import TriadVector, cross, dot
    >>> s = SimpleNamespace(G=1, m=1, nu=Fraction(1, 4), delta=0, r=Fraction(10), rdot=0, q=Fraction,
    ...                     x=TriadVector(10, 0, 0), v=TriadVector(0, Fraction(1, 3), 0),
    ...                     spin=TriadVector(0, 0, 1), spin_difference=TriadVector(0, 0, 0),
    ...                     cross=cross, dot=dot)
    >>> spin_orbit_acceleration(s)[Fraction(3, 2)]       # circular, aligned: radial, (5/r^2) phidot s
    TriadVector(1/600, 0, 0)

    References
    ----------
    Kidder, Phys. Rev. D 52, 821 (1995), eq. (2.2c) (from memory, equation number not checked);
    Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 11.2 (from memory).
    """
    sigma_part = s.delta * s.spin_difference
    first = 2 * s.spin + sigma_part
    second = 7 * s.spin + 3 * sigma_part
    third = 3 * s.spin + sigma_part
    scale = s.G**2 * s.m**2 * s.r**-3
    value = (6 * s.r**-2 * s.dot(s.cross(s.x, s.v), first) * s.x
             - s.cross(s.v, second)
             + 3 * s.rdot * s.r**-1 * s.cross(s.x, third))
    return {_SPIN_ORBIT: scale * value}


def spin_precession_frequency(s: Any) -> dict[PNOrder, Any]:
    """Precession frequency of body 1's spin at leading order: ``dS_1/dt = Omega_1 x S_1``.

    Returns
    -------
    dict
        ``{1: Omega_1}`` with ``Omega_1 = (G m/r^3) (2 nu + (3/2) X2^2) (x cross v)``, i.e.
        ``(G/(c^2 r^3)) (2 + 3 m_2/(2 m_1)) L_N``, ``L_N = m nu x cross v`` (the same frequency
        turns ``chi_1``). Body 2: :func:`precession_frequencies`.

    **Conventions**: module docstring. Only the spin-orbit precession (the spin-spin terms of
    the precession are 2PN-type and not entered).

    Example
    -------
    >>> from fractions import Fraction
    >>> from types import SimpleNamespace
    >>> from stfalgebra.binary.triad_vectors import TriadVector, cross, dot
    >>> s = SimpleNamespace(G=1, m=1, nu=0, delta=1, r=Fraction(2), rdot=0, q=Fraction,
    ...                     x=TriadVector(2, 0, 0), v=TriadVector(0, Fraction(1, 2), 0),
    ...                     cross=cross, dot=dot)
    >>> spin_precession_frequency(s)[1]                # a test mass does not turn the big spin
    TriadVector(0, 0, 0)

    References
    ----------
    Kidder, Phys. Rev. D 52, 821 (1995), eq. (2.4a) (from memory, equation number not checked);
    Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 11.2 (from memory).
    """
    x2 = (1 - s.delta) * s.q(1, 2)
    weight = 2 * s.nu + s.q(3, 2) * x2 * x2
    return {1: s.G * s.m * s.r**-3 * weight * s.cross(s.x, s.v)}


def spin_orbit_energy(s: Any) -> dict[PNOrder, Any]:
    """Spin-orbit part of the conserved energy per reduced mass.

    Returns
    -------
    dict
        ``{3/2: (G^2 m^2/r^3) (x cross v).(s + delta sigma)}``, i.e.
        ``E_SO = (G/(c^2 r^3)) L_N.(S + delta Sigma)`` with ``L_N = m nu x cross v``.

    **Conventions**: module docstring; added to :func:`~stfalgebra.binary.cited_inputs.energy_per_reduced_mass`.

    Example
    -------
    >>> from fractions import Fraction
    >>> from types import SimpleNamespace
    >>> from stfalgebra.binary.triad_vectors import TriadVector, cross, dot
    >>> s = SimpleNamespace(G=1, m=1, nu=0, delta=1, r=Fraction(4), rdot=0, q=Fraction,
    ...                     x=TriadVector(4, 0, 0), v=TriadVector(0, Fraction(1, 2), 0),
    ...                     spin=TriadVector(0, 0, 1), spin_difference=TriadVector(0, 0, -1),
    ...                     cross=cross, dot=dot)
    >>> spin_orbit_energy(s)[Fraction(3, 2)]            # test mass: s + delta sigma = 0
    Fraction(0, 1)

    References
    ----------
    Kidder, Phys. Rev. D 52, 821 (1995), eq. (2.7) (from memory, equation number not checked);
    Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 11.2 (from memory).
    """
    return {_SPIN_ORBIT: s.G**2 * s.m**2 * s.r**-3
            * s.dot(s.cross(s.x, s.v), s.spin + s.delta * s.spin_difference)}


def spin_orbit_angular_momentum(s: Any) -> dict[PNOrder, Any]:
    """Spin-orbit part of the orbital angular momentum per reduced mass (a vector).

    Returns
    -------
    dict
        ``{3/2: (G m) [(G m/r^3) x cross (x cross (3 s + delta sigma))
        - (1/2) v cross (v cross (s + delta sigma))]}``, i.e.
        ``L_SO = (nu/c^2) {(G m/r) n x [n x (3S + delta Sigma)] - (1/2) v x [v x (S + delta Sigma)]}``.
        The conserved total angular momentum is
        ``J = m nu (x cross v)(1 + 1PN ...) + m nu L_SO/c^3 + (G m^2/c) s``.

    **Conventions**: module docstring.

    Example
    -------
    >>> from fractions import Fraction
    >>> from types import SimpleNamespace
    >>> from stfalgebra.binary.triad_vectors import TriadVector, cross, dot
    >>> s = SimpleNamespace(G=1, m=1, nu=0, delta=1, r=Fraction(1), rdot=0, q=Fraction,
    ...                     x=TriadVector(1, 0, 0), v=TriadVector(0, 1, 0),
    ...                     spin=TriadVector(0, 0, 1), spin_difference=TriadVector(0, 0, -1),
    ...                     cross=cross, dot=dot)
    >>> spin_orbit_angular_momentum(s)[Fraction(3, 2)]
    TriadVector(0, 0, -2)

    References
    ----------
    Kidder, Phys. Rev. D 52, 821 (1995), eq. (2.9c) (from memory, equation number not checked);
    Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 11.2 (from memory).
    """
    near = 3 * s.spin + s.delta * s.spin_difference
    far = s.spin + s.delta * s.spin_difference
    value = (s.G * s.m * s.r**-3 * s.cross(s.x, s.cross(s.x, near))
             - s.q(1, 2) * s.cross(s.v, s.cross(s.v, far)))
    return {_SPIN_ORBIT: s.G * s.m * value}


def exchanged_bodies(s: Any) -> SimpleNamespace:
    """The namespace with bodies 1 and 2 exchanged: ``delta -> -delta``, ``x, v -> -x, -v``,
    ``sigma -> -sigma`` (``s`` and ``nu`` are symmetric).

    Example
    -------
    >>> exchanged_bodies(SimpleNamespace(delta=1, x=2, v=3, spin_difference=4)).delta
    -1
    """
    values = dict(vars(s))
    for name in ("delta", "x", "v", "spin_difference"):
        if name in values:
            values[name] = -values[name]
    return SimpleNamespace(**values)


def precession_frequencies(s: Any) -> tuple[Any, Any]:
    """``(Omega_1, Omega_2)``, the second from the first by exchanging the bodies.

    Example
    -------
    >>> from fractions import Fraction
    >>> from stfalgebra.binary.triad_vectors import TriadVector, cross, dot
    >>> s = SimpleNamespace(G=1, m=1, nu=Fraction(1, 4), delta=0, r=Fraction(1), rdot=0, q=Fraction,
    ...                     x=TriadVector(1, 0, 0), v=TriadVector(0, 1, 0), cross=cross, dot=dot)
    >>> precession_frequencies(s)                     # equal masses: 2 nu + 3/8 = 7/8 each
    (TriadVector(0, 0, 7/8), TriadVector(0, 0, 7/8))
    """
    return spin_precession_frequency(s)[1], spin_precession_frequency(exchanged_bodies(s))[1]


#: Every typed-in input of the spin-orbit dynamics, with its source and its independent checks.
SPIN_ORBIT_INPUTS: tuple[CitedInput, ...] = (
    CitedInput("spin_orbit_acceleration", spin_orbit_acceleration,
               "spin-orbit part of the relative acceleration (vector), leading order",
               _KIDDER + ", eq. (2.2c); " + _REVIEW + " (from memory)",
               "exact and numerical conservation of E and J = L + S; circular omega(r) and E(x); "
               "Kerr equatorial geodesic at nu = 0"),
    CitedInput("spin_precession_frequency", spin_precession_frequency,
               "precession frequency Omega_1 of the spins (body 2 by exchange), leading order",
               _KIDDER + ", eq. (2.4a); " + _REVIEW + " (from memory)",
               "exact and numerical conservation of J = L + S_1 + S_2"),
    CitedInput("spin_orbit_energy", spin_orbit_energy,
               "spin-orbit part of the conserved energy E/mu, leading order",
               _KIDDER + ", eq. (2.7); " + _REVIEW + " (from memory)",
               "exact and numerical conservation; circular E(x) (Kidder 1995, Blanchet 2014); "
               "Kerr equatorial geodesic energy at nu = 0"),
    CitedInput("spin_orbit_angular_momentum", spin_orbit_angular_momentum,
               "spin-orbit part of the orbital angular momentum J/mu (vector), leading order",
               _KIDDER + ", eq. (2.9c); " + _REVIEW + " (from memory)",
               "exact and numerical conservation of J = L + S; first law dE = omega dJ on "
               "circular orbits"),
)
