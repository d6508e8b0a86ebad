"""Emission sets for waveform modes and other orbit-dependent quantities.

Fixes the signature of generated functions per orbit type:

* circular orbits: ``(x, nu, delta, psi)``, or ``(x, m1, m2, psi)`` with ``mass_inputs``; modes
  in the orbital phase phi take ``(x, nu, delta, x0, phi)``, x0 the reference of psi in their
  ``ln(x/x0)``;
* general orbits: ``(r, rdot, phi, phidot, m, nu, delta, c)``, or
  ``(r, rdot, phi, phidot, m1, m2, c)`` with ``mass_inputs``;

the phase (psi or phi) is left out when no output depends on it. Modes are emitted as the
dimensionless strain ``R c^2 h_lm / (G m)`` (default) or as ``Hhat_lm``. Modes of a binary with
aligned spins add the inputs ``chi1, chi2`` (after the masses; the dimensionless spin components
along the orbital angular momentum, in [-1, 1]).
"""

from __future__ import annotations

import math
import random
from typing import Any, Iterable, Sequence

import sympy as sp

from .. import symbols as S
from ..errors import RefusedModeError
from .emission import CodeInput, EmissionSet, NamedExpression

__all__ = ["PSI", "QUANTITIES", "SPIN_INPUTS", "orbit_emission", "mode_emission"]

PSI = sp.Symbol("psi", real=True)
"""The circular-orbit phase with the tail logarithm absorbed (conventions: psi)."""

QUANTITIES = ("strain", "hhat")
"""What a mode output is: ``strain`` = R c^2 h_lm/(G m) (with the phase factor), ``hhat`` = Hhat_lm."""

_ORBITS = ("circular", "general")

#: The aligned-spin inputs (the engine's real symbols chi1, chi2).
SPIN_INPUTS = tuple(CodeInput(sp.Symbol(f"chi{body}", real=True),
                              f"dimensionless spin of body {body} along the orbital angular momentum, "
                              f"chi{body} = c S_{body}.ell/(G m{body}^2)", -1.0, 1.0) for body in (1, 2))


def _with_spins(sampler):
    """The sampler with random aligned spins added."""
    def sample(rng: random.Random) -> dict:
        point = sampler(rng)
        for spin in SPIN_INPUTS:
            point[spin.symbol] = rng.uniform(-1.0, 1.0)
        return point

    return sample


def _mass_ratio_point(rng: random.Random) -> tuple[float, float, float, float]:
    q = rng.uniform(1.0, 10.0)  # m1/m2 >= 1, so delta >= 0
    m2 = rng.uniform(0.5, 2.0)
    m1 = q * m2
    return m1, m2, m1 * m2 / (m1 + m2) ** 2, (m1 - m2) / (m1 + m2)


def _circular_sampler(rng: random.Random) -> dict:
    m1, m2, nu, delta = _mass_ratio_point(rng)
    return {S.x: rng.uniform(0.02, 0.25), S.nu: nu, S.delta: delta, S.m1: m1, S.m2: m2,
            PSI: rng.uniform(-math.pi, math.pi), S.phi: rng.uniform(-math.pi, math.pi), S.x0: rng.uniform(0.02, 0.25)}


def _general_sampler(rng: random.Random) -> dict:
    m1, m2, nu, delta = _mass_ratio_point(rng)
    m = m1 + m2
    r = m * rng.uniform(8.0, 40.0)
    return {S.r: r, S.rdot: math.sqrt(m / r) * rng.uniform(-0.3, 0.3), S.phi: rng.uniform(-math.pi, math.pi),
            S.phidot: math.sqrt(m / r**3) * rng.uniform(0.7, 1.3), S.m: m, S.nu: nu, S.delta: delta,
            S.m1: m1, S.m2: m2, S.c: rng.uniform(0.8, 1.5)}


def _signature(orbit: str, mass_inputs: bool) -> tuple[list[CodeInput], list[tuple[sp.Symbol, sp.Expr]],
                                                      tuple[sp.Symbol, ...]]:
    masses = [CodeInput(S.m1, "mass of body 1 (delta = (m1 - m2)/(m1 + m2))", 1.0, 10.0),
              CodeInput(S.m2, "mass of body 2", 0.5, 2.0)]
    if orbit == "circular":
        inputs = [CodeInput(S.x, "PN parameter x = (G m omega/c^3)^(2/3)", 0.02, 0.25)]
        if mass_inputs:
            inputs += masses
            intermediates = [(S.nu, S.m1 * S.m2 / (S.m1 + S.m2) ** 2), (S.delta, (S.m1 - S.m2) / (S.m1 + S.m2))]
        else:
            inputs += [CodeInput(S.nu, "symmetric mass ratio nu = m1 m2/m^2", 0.05, 0.25),
                       CodeInput(S.delta, "mass difference ratio delta = (m1 - m2)/m, delta^2 = 1 - 4 nu", 0.0, 0.9)]
            intermediates = []
        # modes in the orbital phase phi hold ln(x/x0): x0 is an input then, and phi replaces psi
        inputs.append(CodeInput(S.x0, "reference of the phase psi, x0 = (G m omega_0/c^3)^(2/3) (phase phi only)",
                                0.02, 0.25))
        inputs.append(CodeInput(PSI, "orbital phase psi with the tail logarithm absorbed", -math.pi, math.pi))
        inputs.append(CodeInput(S.phi, "orbital phase phi", -math.pi, math.pi))
        return inputs, intermediates, (S.x0, PSI, S.phi)
    inputs = [CodeInput(S.r, "orbital separation r (G = 1 units)", 8.0, 40.0),
              CodeInput(S.rdot, "radial velocity dr/dt", -0.1, 0.1),
              CodeInput(S.phi, "orbital phase phi", -math.pi, math.pi),
              CodeInput(S.phidot, "orbital angular velocity dphi/dt", 0.005, 0.05)]
    if mass_inputs:
        inputs += masses
        total = S.m1 + S.m2
        intermediates = [(S.m, total), (S.nu, S.m1 * S.m2 / total**2), (S.delta, (S.m1 - S.m2) / total)]
    else:
        inputs += [CodeInput(S.m, "total mass m = m1 + m2", 0.5, 2.0),
                   CodeInput(S.nu, "symmetric mass ratio nu = m1 m2/m^2", 0.05, 0.25),
                   CodeInput(S.delta, "mass difference ratio delta = (m1 - m2)/m, delta^2 = 1 - 4 nu", 0.0, 0.9)]
        intermediates = []
    inputs.append(CodeInput(S.c, "speed of light (kept explicit to count PN orders; 1 in G = c = 1 units)", 0.8, 1.5))
    return inputs, intermediates, (S.phi,)


def orbit_emission(function_name: str, outputs: Sequence[NamedExpression], *, orbit: str = "circular",
                   mass_inputs: bool = False, summary: str = "", notes: Iterable[str] = (),
                   spins: bool = False) -> EmissionSet:
    """An :class:`EmissionSet` with the project's standard signature for ``orbit``.

    Parameters
    ----------
    function_name:
        Name of the generated function (sanitised by the emitters).
    outputs:
        Named complex expressions in the orbit's symbols (circular: x, nu, delta, psi;
        general: r, rdot, phi, phidot, m, nu, delta, c; G = 1).
    orbit:
        ``"circular"`` or ``"general"``.
    mass_inputs:
        Take the two masses m1, m2 as inputs instead of (m,) nu and delta.
    summary, notes:
        Text for the generated documentation.
    spins:
        Add the aligned-spin inputs ``chi1, chi2`` (:data:`SPIN_INPUTS`) before the phase.

    Returns
    -------
    EmissionSet
        With a sampler drawing physically consistent points (delta^2 = 1 - 4 nu, bound orbits
        with m/r between 1/40 and 1/8).

    Conventions
    -----------
    Inputs in the order listed in the module docstring; the phase (psi or phi) and x0 are
    dropped from the signature when no output uses them.

    Examples
    --------
    >>> from stfalgebra import symbols as S
    >>> e = orbit_emission("flux", [NamedExpression("F", 1 - S.x*(1247/sp.Integer(336) + 35*S.nu/12))])
    >>> [i.symbol.name for i in e.inputs]
    ['x', 'nu', 'delta']

    References
    ----------
    Conventions of the project (``conventions.md``): x, nu, delta, psi, and G = 1 inside Hhat.
    """
    if orbit not in _ORBITS:
        raise ValueError(f"orbit must be one of {_ORBITS}, got {orbit!r}")
    if not isinstance(mass_inputs, bool):
        raise TypeError(f"mass_inputs must be a bool, got {mass_inputs!r}")
    outputs = tuple(outputs)
    inputs, intermediates, optional = _signature(orbit, mass_inputs)
    unused = {symbol for symbol in optional if not any(o.expression.has(symbol) for o in outputs)}
    inputs = [i for i in inputs if i.symbol not in unused]
    sampler = _circular_sampler if orbit == "circular" else _general_sampler
    if spins:
        # after the masses: before psi (circular, when present) or before c (general)
        before = PSI if orbit == "circular" else S.c
        at = next((k for k, i in enumerate(inputs) if i.symbol == before), len(inputs))
        inputs = inputs[:at] + list(SPIN_INPUTS) + inputs[at:]
        sampler = _with_spins(sampler)
    return EmissionSet(function_name, tuple(inputs), outputs, summary or f"{len(outputs)} expression(s), {orbit} orbits",
                       tuple(intermediates), tuple(notes), sampler)


_PROJECT_SYMBOLS = {getattr(S, name).name: getattr(S, name) for name in S.__all__}


def _with_project_symbols(expression: sp.Expr) -> sp.Expr:
    # A normalisation built by sympify carries assumption-free symbols; use the shared ones so
    # that G, m, R and c cancel against the scale factor.
    return expression.xreplace({s: _PROJECT_SYMBOLS[s.name] for s in expression.free_symbols
                                if s.name in _PROJECT_SYMBOLS})


def _signed(m: int) -> str:
    return f"m{-m}" if m < 0 else str(m)


def _field(result: Any, name: str):
    try:
        return getattr(result, name)
    except AttributeError:
        raise TypeError(f"expected a mode result with attribute {name!r}, got {type(result).__name__}") from None


def mode_emission(results: Sequence[Any], *, quantity: str = "strain", function_name: str = "stfalgebra_modes",
                  mass_inputs: bool = False, skip_refused: bool = False) -> EmissionSet:
    """An :class:`EmissionSet` for a set of modes from ``stfalgebra.radiative.modes``.

    Parameters
    ----------
    results:
        Mode results (``derive_mode``/``derive_modes``), all for the same orbit type.
    quantity:
        ``"strain"``: R c^2 h_lm/(G m) = (normalisation R c^2/(G m)) Hhat_lm exp(-i m phase);
        ``"hhat"``: Hhat_lm alone.
    function_name:
        Name of the generated function.
    mass_inputs:
        Take m1, m2 as inputs instead of (m,) nu, delta.
    skip_refused:
        Leave refused modes out (noted in the documentation) instead of raising.

    Returns
    -------
    EmissionSet
        Outputs named ``h_l_m`` (strain) or ``Hhat_l_m``, negative m written ``m1`` etc.

    Conventions
    -----------
    Circular: R c^2 h_lm/(G m) = 2 nu x sqrt(16 pi/5) Hhat_lm exp(-i m psi); general:
    R c^2 h_lm/(G m) = (4 nu/c^2) sqrt(pi/5) Hhat_lm exp(-i m phi) with G = 1; each mode's
    own normalisation, sign convention and phase variable are taken from its result.

    Examples
    --------
    >>> from types import SimpleNamespace
    >>> from stfalgebra import symbols as S
    >>> h22 = SimpleNamespace(l=2, m=2, orbit="circular", hhat=1 + S.x*(-sp.Rational(107, 42) + 55*S.nu/42),
    ...     refused=None, normalisation=2*S.G*S.m*S.nu*S.x/(S.R*S.c**2)*sp.sqrt(16*sp.pi/5),
    ...     normalisation_words="", phase="psi", sign_convention="minus-phi-theta", pn=1, pn_relative=1, provenance=())
    >>> mode_emission([h22]).outputs[0].name
    'h_2_2'

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), mode decomposition and normalisation of Hhat_lm.
    """
    if quantity not in QUANTITIES:
        raise ValueError(f"quantity must be one of {QUANTITIES}, got {quantity!r}")
    results = list(results)
    if not results:
        raise ValueError("no modes to emit: the mode list is empty")
    orbits = {_field(r, "orbit") for r in results}
    if len(orbits) != 1:
        raise ValueError(f"modes of different orbit types cannot share one function: {sorted(orbits)}")
    orbit = orbits.pop()
    outputs, notes = [], []
    scale = S.R * S.c**2 / (S.G * S.m)
    for result in results:
        l, m = _field(result, "l"), _field(result, "m")
        hhat = _field(result, "hhat")
        if hhat is None:
            reason = _field(result, "refused") or "refused"
            if skip_refused:
                notes.append(f"mode ({l}, {m}) left out: {reason}")
                continue
            raise RefusedModeError(f"mode ({l}, {m}) is refused: {reason}")
        order = f"through x^({result.pn})" if orbit == "circular" and result.pn is not None else (
            f"absolute order {result.pn}" if result.pn is not None else f"relative order {result.pn_relative}")
        if quantity == "hhat":
            expression, label = hhat, f"Hhat_{l}_{_signed(m)}"
            words = f"Hhat_lm for (l, m) = ({l}, {m}), {order}"
        else:
            phase = PSI if _field(result, "phase") == "psi" else S.phi
            rotation = sp.cos(m * phase) - sp.I * sp.sin(m * phase)  # exp(-i m phase)
            normalisation = _with_project_symbols(_field(result, "normalisation"))
            expression = sp.Mul(normalisation, scale) * hhat * rotation
            label = f"h_{l}_{_signed(m)}"
            words = f"R c^2 h_lm/(G m) for (l, m) = ({l}, {m}), {order}"
        words += f", sign convention {result.sign_convention}"
        outputs.append(NamedExpression(label, expression, words))
    if not outputs:
        raise RefusedModeError("every requested mode is refused: " + "; ".join(notes))
    first = next(r for r in results if r.hhat is not None)
    spins = {getattr(r, "spins", None) for r in results}
    if len(spins) != 1:
        raise ValueError("modes with and without spins cannot share one function")
    if quantity == "strain":
        summary = (f"Gravitational-wave modes, {orbit} orbits: R c^2 h_lm/(G m), with "
                   f"{first.normalisation_words}.")
    else:
        summary = f"Mode amplitudes Hhat_lm, {orbit} orbits ({first.normalisation_words})."
    summary += "\nh = h_plus - i h_cross = sum_lm h_lm (-2)Y_lm(Theta, Phi)."
    provenance = tuple(dict.fromkeys(p for r in results if r.hhat is not None for p in (r.provenance or ())))
    notes += [f"source: {p}" for p in provenance]
    spinning = spins.pop() is not None
    if spinning:
        summary += "\nAligned spins: chi1, chi2 along the orbital angular momentum (leading spin-orbit terms)."
    return orbit_emission(function_name, outputs, orbit=orbit, mass_inputs=mass_inputs, summary=summary, notes=notes,
                          spins=spinning)
