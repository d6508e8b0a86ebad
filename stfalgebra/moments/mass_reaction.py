"""The 2.5PN (radiation-reaction) term of the two-body mass quadrupole on circular orbits: a cited input.

The odd-order terms of the source moments come from the odd (radiation-reaction) part of the
near-zone metric, which the toolkit does not compute. The mass quadrupole's 2.5PN term in the
centre-of-mass frame is therefore entered as an input, on circular orbits only (``rdot = 0``):

    I_ij |_2.5PN = nu m (48/7) (G^2 m^2 nu/(c^5 r)) x_<i v_j>                              (R1)

(Blanchet, Faye, Iyer & Sinha, Class. Quantum Grav. 25, 165003 (2008), sec. V, the
circular-orbit mass quadrupole; Arun, Blanchet, Iyer & Qusailah, Phys. Rev. D 77, 064035
(2008), sec. III, the general-orbit form; from memory: the arXiv texts the project searches
hold only the papers' openings). Because it is cited, the published x^(5/2) term of Hhat_22
tests the assembly of the 2.5PN contributions, not this term. The 2.5PN term of the
centre-of-mass relations (a shift ``nu delta Q v`` common to both bodies) does not reach the
Newtonian quadrupole: its linear change is proportional to ``m_1 X_2 - m_2 X_1 = 0`` (tested).

**Conventions**: harmonic coordinates, centre-of-mass frame; ``x_<i v_j>`` the STF product of
the relative position and velocity (``../shared/conventions.md``).
"""

from __future__ import annotations

from functools import lru_cache

from ..exact import engine_symbols
from ..pnseries import PNSeries
from .orbit_tensor import PLANAR_BASIS, OrbitTensor

__all__ = ["REACTION_QUADRUPOLE_SOURCE", "reaction_mass_quadrupole_circular"]

#: Where (R1) comes from.
REACTION_QUADRUPOLE_SOURCE = (
    "cited: the 2.5PN term (48/7) nu^2 m (G m)^2/(c^5 r) x_<i v_j> of the circular-orbit mass quadrupole, "
    "Blanchet, Faye, Iyer & Sinha, Class. Quantum Grav. 25, 165003 (2008), sec. V, and Arun, Blanchet, Iyer & "
    "Qusailah, Phys. Rev. D 77, 064035 (2008), sec. III (from memory)")


@lru_cache(maxsize=None)
def reaction_mass_quadrupole_circular() -> OrbitTensor:
    """The 2.5PN term (R1) of I_ij on a circular orbit, an orbit tensor of order 5/2.

    Example
    -------
    >>> T = reaction_mass_quadrupole_circular()
    >>> T.channel(2, 0, 0, circular_frequency=True)
    PNSeries(-12*I*nu**2*G**2*m**3*r*phidot/7*eps**5 + O(eps**6))

    References
    ----------
    Blanchet, Faye, Iyer & Sinha, Class. Quantum Grav. 25, 165003 (2008), sec. V (from memory).
    """
    s = engine_symbols()
    coefficient = s.nu * s.m * s.q(48, 7) * s.G**2 * s.m**2 * s.nu / s.r
    # known through relative 5/2: the next term of the quadrupole is its 3PN term
    series = PNSeries._from_trusted({5: coefficient}, 5)
    return OrbitTensor(2, {(1, 1, 0): series}, basis=PLANAR_BASIS).with_provenance(REACTION_QUADRUPOLE_SOURCE)

