"""Spin variables of a binary of spinning compact bodies, and how spin terms are counted.

**Conventions** (``../shared/conventions.md``, section Spins; Kidder, Phys. Rev. D 52, 821 (1995),
Sec. II; Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 11):

- ``S_1``, ``S_2`` are the spin vectors of the bodies with the covariant (Tulczyjew) spin
  supplementary condition ``S^{mu nu} p_nu = 0``, and the constant-magnitude spin variables of
  the PN literature (``|S_A|`` is conserved by the precession equations). At the order used
  here (leading spin-orbit) the spatial spin tensor is ``S^{ij} = eps_{ijk} S^k`` and, with the
  covariant condition, ``S^{i0} = S^{ij} v^j/c``.
- ``S = S_1 + S_2`` and ``Sigma = m (S_2/m_2 - S_1/m_1)``; conversely
  ``S_1 = X_1 S - nu Sigma`` and ``S_2 = X_2 S + nu Sigma`` (``X_A = m_A/m``).
- Dimensionless spins ``chi_A = c S_A/(G m_A^2)`` (``|chi_A| <= 1`` for black holes). The
  dimensionless combinations used by every formula of the toolkit are

      s     = c S/(G m^2)     = X_1^2 chi_1 + X_2^2 chi_2,
      sigma = c Sigma/(G m^2) = X_2 chi_2 - X_1 chi_1,

  so that a spin enters an equation as ``S = (G m^2/c) s``.
- Aligned spins: the spins are along the unit orbital angular momentum ``ell = e_z``;
  ``chi1``, ``chi2`` are then the components ``chi_A . ell`` (negative for anti-aligned spins)
  and appear as symbols (generators of the exact engine) in every output:
  ``S_l = (G m^2/c) s_l``, ``s_l = X_1^2 chi1 + X_2^2 chi2``, ``sigma_l = X_2 chi2 - X_1 chi1``.

**Counting.** A maximally spinning body has ``S_A ~ G m_A^2/c``: with the spins written through
``chi_A`` the spin-orbit terms of the equations of motion, of the precession-coupled energy and
of the angular momentum carry ``1/c^3`` relative to the Newtonian terms and count as **1.5PN**;
spin-spin terms would count as 2PN. In the source moments the spin part of the current moments
enters at relative **0.5PN** and that of the mass moments at relative **1.5PN**. The
precession frequencies ``Omega_A`` (``dS_A/dt = Omega_A x S_A``) are of relative order 1PN of
the orbital frequency. Next-to-leading spin-orbit terms (2.5PN) and spin-spin terms (2PN) are
not part of the toolkit: every spinning result is known through relative order 3/2
(:data:`SPINNING_KNOWN_THROUGH`).
"""

from __future__ import annotations

from fractions import Fraction
from typing import Any

from ..exact import ExactPolynomial
from ..orders import PNOrder

__all__ = [
    "SPIN_ORBIT_ORDER",
    "SPINNING_KNOWN_THROUGH",
    "MISSING_SPIN_TERMS",
    "spin_combinations",
    "individual_spins",
    "aligned_spin_components",
]

#: Relative PN order of the leading spin-orbit terms of the dynamics (spins through chi).
SPIN_ORBIT_ORDER = PNOrder(3, 2)

#: Relative order through which every spinning result is known: the spin-spin terms (2PN) and
#: the next-to-leading spin-orbit terms (2.5PN) are not entered.
SPINNING_KNOWN_THROUGH = PNOrder(3, 2)

#: The spin terms the toolkit refuses, by name, with the relative order where each enters.
MISSING_SPIN_TERMS: dict[str, PNOrder] = {
    "spin-spin terms": PNOrder(2),
    "next-to-leading spin-orbit terms": PNOrder(5, 2),
}


def spin_combinations(chi1: Any, chi2: Any, delta: Any) -> tuple[Any, Any]:
    """The dimensionless ``s = c S/(G m^2)`` and ``sigma = c Sigma/(G m^2)`` from ``chi_1, chi_2``.

    Parameters
    ----------
    chi1, chi2:
        Dimensionless spins ``c S_A/(G m_A^2)``: scalars (aligned components) or vectors of any
        algebra that allows ``+``, ``-`` and multiplication by scalars.
    delta:
        ``(m1 - m2)/m``.

    Returns
    -------
    (s, sigma)
        ``s = X1^2 chi1 + X2^2 chi2``, ``sigma = X2 chi2 - X1 chi1`` with ``X_A = (1 +- delta)/2``.

    **Conventions**: module docstring.

    Example
    -------
    >>> spin_combinations(Fraction(1), Fraction(0), Fraction(1))     # test mass around Kerr
    (Fraction(1, 1), Fraction(-1, 1))

    References
    ----------
    Kidder, Phys. Rev. D 52, 821 (1995), Sec. II (``Delta = m(S_2/m_2 - S_1/m_1)``, here Sigma);
    Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 11.1 (from memory).
    """
    x1 = (1 + delta) * Fraction(1, 2)
    x2 = (1 - delta) * Fraction(1, 2)
    return x1 * x1 * chi1 + x2 * x2 * chi2, x2 * chi2 - x1 * chi1


def individual_spins(total: Any, difference: Any, delta: Any, nu: Any) -> tuple[Any, Any]:
    """``(S_1, S_2)`` from ``S`` and ``Sigma``: ``S_1 = X_1 S - nu Sigma``, ``S_2 = X_2 S + nu Sigma``.

    The same relation holds between the dimensionless ``s, sigma`` and ``(X_1^2 chi_1, X_2^2 chi_2)``.

    Example
    -------
    >>> individual_spins(Fraction(3), Fraction(0), Fraction(0), Fraction(1, 4))
    (Fraction(3, 2), Fraction(3, 2))
    """
    x1 = (1 + delta) * Fraction(1, 2)
    x2 = (1 - delta) * Fraction(1, 2)
    return x1 * total - nu * difference, x2 * total + nu * difference


def aligned_spin_components() -> tuple[ExactPolynomial, ExactPolynomial]:
    """``(s_l, sigma_l)`` for aligned spins as exact-engine polynomials in chi1, chi2, delta.

    Returns
    -------
    (ExactPolynomial, ExactPolynomial)
        ``c S_l/(G m^2) = X1^2 chi1 + X2^2 chi2`` and ``c Sigma_l/(G m^2) = X2 chi2 - X1 chi1``,
        with ``delta^2 = 1 - 4 nu`` applied.

    Example
    -------
    >>> s_l, sigma_l = aligned_spin_components()
    >>> sigma_l
    -chi1/2 + chi2/2 - delta*chi1/2 - delta*chi2/2
    """
    return spin_combinations(ExactPolynomial("chi1"), ExactPolynomial("chi2"), ExactPolynomial("delta"))
