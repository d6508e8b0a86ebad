"""Where the derived 2.5PN (radiation-reaction) terms of the source moments come from.

The table of contributions quotes this text in its rows; it lives apart from
:mod:`stfalgebra.moments.mass_reaction` so that reading the table (every cold ``mode``/``modes``
command) does not import sympy, which the derivation uses.
"""

from __future__ import annotations

__all__ = ["REACTION_MOMENT_SOURCE", "REACTION_CURRENT_SOURCE"]

#: Where the 2.5PN terms of I_L come from (the table of contributions quotes it).
REACTION_MOMENT_SOURCE = (
    "derived: the odd (2.5PN) terms of I_L for every l from the general source mass moment with the odd parts "
    "of the near-zone retarded potentials (stfalgebra.moments.mass_reaction); 2.5PN centre-of-mass shift "
    "cited (stfalgebra.binary.cited_inputs); l = 2 reproduces the (48/7) of Blanchet, Faye, Iyer & Sinha, "
    "Class. Quantum Grav. 25, 165003 (2008), and the general-orbit -(24/7), (48/7) of Arun, Blanchet, Iyer & "
    "Qusailah, Phys. Rev. D 77, 064035 (2008), sec. III (from memory; tests)")

#: Where the 2.5PN terms of J_L come from (the table of contributions quotes it).
REACTION_CURRENT_SOURCE = (
    "derived: the odd (2.5PN) terms of J_L for every l from the general source current moment with the odd "
    "near-zone constants V_3, W1_ij (stfalgebra.moments.current_reaction); 2.5PN centre-of-mass shift cited; "
    "no published value of J_L checked (l = 1 is the source dipole, not the angular momentum of the equations "
    "of motion: tests/moments/test_current_reaction.py)")
