"""Explicit mode amplitudes used as codegen test inputs (independent of stfalgebra.radiative).

A helper module (not collected): tests in this directory import it by name.
"""

from __future__ import annotations

from types import SimpleNamespace

import sympy as sp

from stfalgebra import symbols as S

x, nu, delta, I, pi = S.x, S.nu, S.delta, sp.I, sp.pi
half = sp.Rational(1, 2)

# Circular Hhat_lm, from memory of Blanchet, Living Rev. Relativ. 17, 2 (2014) (circular-orbit
# mode amplitudes; the 3PN term of Hhat_22 abridged to its non-nu part). Only
# their structure matters here (codegen must reproduce whatever it is given); the constants,
# logarithms and imaginary parts exercise every printer path.
PUBLISHED_CIRCULAR = {
    (2, 2): 1 + x * (-sp.Rational(107, 42) + sp.Rational(55, 42) * nu) + 2 * pi * x**sp.Rational(3, 2)
    + x**2 * (-sp.Rational(2173, 1512) - sp.Rational(1069, 216) * nu + sp.Rational(2047, 1512) * nu**2)
    + x**sp.Rational(5, 2) * (-sp.Rational(107, 21) * pi + (sp.Rational(34, 21) * pi - 24 * I) * nu)
    + x**3 * (sp.Rational(27027409, 646800) - sp.Rational(856, 105) * sp.EulerGamma + sp.Rational(428, 105) * I * pi
              + 2 * pi**2 / 3 - sp.Rational(428, 105) * sp.log(16 * x)),
    (2, 1): I * delta / 3 * (x**half + x**sp.Rational(3, 2) * (-sp.Rational(17, 28) + sp.Rational(5, 7) * nu)
                             + x**2 * (pi + I * (-half - 2 * sp.log(2)))),
    (3, 3): -sp.Rational(3, 4) * I * sp.sqrt(sp.Rational(15, 14)) * delta
    * (x**half + x**sp.Rational(3, 2) * (-4 + 2 * nu) + x**2 * (3 * pi + I * (-sp.Rational(21, 5) + 6 * sp.log(sp.Rational(3, 2))))),
    (3, 2): sp.Rational(1, 3) * sp.sqrt(sp.Rational(5, 7)) * x * (1 - 3 * nu),
    (4, 4): -sp.Rational(8, 9) * sp.sqrt(sp.Rational(5, 7)) * x * (1 - 3 * nu),
}

# General-orbit leading Hhat_22 (conventions.md): G m/r + r^2 phidot^2 + 2 i r rdot phidot - rdot^2.
GENERAL_22 = S.m / S.r + S.r**2 * S.phidot**2 + 2 * I * S.r * S.rdot * S.phidot - S.rdot**2


def fake_mode(l, m, hhat, orbit="circular"):
    """A stand-in with the attributes of stfalgebra.radiative.modes.ModeResult."""
    if orbit == "circular":
        words = "h_lm = (2 G m nu x/(R c^2)) sqrt(16 pi/5) Hhat_lm exp(-i m psi)"
        norm = 2 * S.G * S.m * S.nu * S.x / (S.R * S.c**2) * sp.sqrt(16 * pi / 5)
        phase = "psi"
    else:
        words = "h_lm = (4 G m nu/(R c^4)) sqrt(pi/5) Hhat_lm exp(-i m phi), with G = 1 inside Hhat_lm"
        norm = 4 * S.G * S.m * S.nu / (S.R * S.c**4) * sp.sqrt(pi / 5)
        phase = "phi"
    return SimpleNamespace(l=l, m=m, orbit=orbit, pn=sp.Integer(3), pn_relative=None, hhat=hhat, refused=None,
                           normalisation_words=words, normalisation=norm, phase=phase,
                           sign_convention="minus-phi-theta", provenance=("test input",))


def random_mode_like_expression(draw, st):
    """A hypothesis-drawn complex expression shaped like a PN mode amplitude times a phase."""
    terms = []
    for _ in range(draw(st.integers(1, 6))):
        coefficient = sp.Rational(draw(st.integers(-999, 999)), draw(st.integers(1, 500)))
        factor = draw(st.sampled_from([sp.Integer(1), sp.pi, sp.EulerGamma, sp.log(2), sp.sqrt(sp.Rational(15, 14)),
                                       sp.log(16 * x), sp.I, sp.I * sp.pi]))
        terms.append(coefficient * factor * x ** sp.Rational(draw(st.integers(0, 8)), 2)
                     * nu ** draw(st.integers(0, 3)) * delta ** draw(st.integers(0, 1)))
    m = draw(st.integers(-4, 4))
    psi = sp.Symbol("psi", real=True)
    return sp.Add(*terms) * (sp.cos(m * psi) - sp.I * sp.sin(m * psi))
