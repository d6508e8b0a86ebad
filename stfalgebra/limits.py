"""Bounds on what a request may ask for, shared by every layer.

The largest multipole order is a bound on the work a request may cause (the derivations are
exact at any l below it); the largest PN orders are not here: they are read off the table of
contributions (:mod:`stfalgebra.radiative.contributions`).
"""

from __future__ import annotations

__all__ = ["L_MAXIMUM"]

#: Largest multipole order l (and lmax) of every command and of the mode-set API.
L_MAXIMUM = 30
