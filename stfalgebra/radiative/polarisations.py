"""Polarisations h_plus, h_cross summed from the modes at a given direction.

    h_plus - i h_cross = sum_{l, m} h_lm (-2)Y_lm(Theta, Phi)            (../shared/conventions.md)

with (Theta, Phi) the direction of propagation in the source frame and the polarisation
triad P = -e_Phi, Q = e_Theta of the default sign convention (the "theta-phi" convention
flips every h_lm, hence both polarisations).
"""

from __future__ import annotations

import sympy as sp

from ..stf.harmonics import spin_weighted_harmonic
from ..symbols import G, Phi, Theta, m as total_mass, phi
from .modes import derive_modes

__all__ = ["polarisations_from_modes"]

_PSI = sp.Symbol("psi", real=True)


def polarisations_from_modes(lmax: int, *, orbit: str = "circular", pn=None, pn_relative=None,
                             theta: sp.Expr = Theta, azimuth: sp.Expr = Phi,
                             sign_convention: str = "minus-phi-theta") -> tuple[sp.Expr, sp.Expr]:
    """(h_plus, h_cross) from every mode 2 <= l <= lmax at the direction (theta, azimuth).

    Parameters
    ----------
    lmax:
        Highest l summed.
    orbit, pn, pn_relative, sign_convention:
        As :func:`~stfalgebra.radiative.modes.derive_mode`. Circular m = 0 modes (memory) are
        left out, as the toolkit does not compute them; say so when you quote the result.
    theta, azimuth:
        The direction of propagation (Theta, Phi), symbols or numbers.

    Returns
    -------
    (h_plus, h_cross)
        Real expressions; circular orbits in x, nu, delta, psi and G, m, R, c; general orbits
        in r, rdot, phi, phidot and G, m, R, c.

    **Conventions**: h = h_plus - i h_cross = sum h_lm (-2)Y_lm; triad P = -e_Phi, Q = e_Theta.

    Example
    -------
    >>> import sympy as sp
    >>> from stfalgebra.radiative.polarisations import polarisations_from_modes
    >>> hp, hc = polarisations_from_modes(2, pn=0, theta=0, azimuth=0)
    >>> hp, hc                 # face-on, Newtonian: circular polarisation
    (4*G*m*nu*x*cos(2*psi)/(R*c**2), 4*G*m*nu*x*sin(2*psi)/(R*c**2))

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), mode decomposition of the polarisations.
    """
    results = derive_modes(lmax, orbit=orbit, pn=pn, pn_relative=pn_relative,
                           sign_convention=sign_convention)
    phase = _PSI if orbit == "circular" else phi
    total = sp.Integer(0)
    for res in results:
        if res.hhat is None:
            continue
        hhat = res.hhat
        if orbit == "general":
            # Hhat is printed with G = 1; every m in it comes as G m (the m nu of the
            # prefactor is divided out), so G is restored by m -> G m.
            hhat = hhat.subs(total_mass, G * total_mass)
        h_lm = res.normalisation * hhat * sp.exp(-sp.I * res.m * phase)
        total += h_lm * spin_weighted_harmonic(-2, res.l, res.m, theta, azimuth)
    # every symbol is real (x, nu, delta, psi, angles, r, rdot, phi, phidot), so the
    # conjugate acts on I and the exponentials only
    conj = sp.conjugate(total)
    h_plus = sp.expand(((total + conj) / 2).rewrite(sp.cos))
    h_cross = sp.expand((sp.I * (total - conj) / 2).rewrite(sp.cos))
    return h_plus, h_cross
