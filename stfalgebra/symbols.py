"""The project's shared sympy symbols, one place for every layer.

Conventions (``../shared/conventions.md``): m = m1 + m2, nu = m1 m2/m^2, delta = (m1 - m2)/m,
x = (G m omega/c^3)^(2/3), gamma = G m/(r c^2); r, rdot, phi, phidot describe the relative
orbit; R is the distance to the observer, (Theta, Phi) the direction of propagation.
"""

from __future__ import annotations

import sympy as sp

__all__ = [
    "G", "c", "m", "m1", "m2", "nu", "delta", "x", "gamma", "omega",
    "r", "rdot", "phi", "phidot", "R", "Theta", "Phi", "t", "M_adm", "r0", "et",
]

G = sp.Symbol("G", positive=True)
c = sp.Symbol("c", positive=True)
m = sp.Symbol("m", positive=True)
m1 = sp.Symbol("m1", positive=True)
m2 = sp.Symbol("m2", positive=True)
nu = sp.Symbol("nu", positive=True)
delta = sp.Symbol("delta", real=True)
x = sp.Symbol("x", positive=True)
gamma = sp.Symbol("gamma", positive=True)
omega = sp.Symbol("omega", positive=True)
r = sp.Symbol("r", positive=True)
rdot = sp.Symbol("rdot", real=True)
phi = sp.Symbol("phi", real=True)
phidot = sp.Symbol("phidot", real=True)
R = sp.Symbol("R", positive=True)
Theta = sp.Symbol("Theta", real=True)
Phi = sp.Symbol("Phi", real=True)
t = sp.Symbol("t", real=True)
M_adm = sp.Symbol("M", positive=True)
r0 = sp.Symbol("r0", positive=True)
et = sp.Symbol("et", nonnegative=True)
