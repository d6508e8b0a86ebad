"""Orbital elements under radiation reaction beyond the orbit average: secular drift plus periodic wiggle.

Run:  python worked/post_adiabatic_elements.py [OUTDIR] [--strength S] [--eccentricity E] [--orbits N]

What it shows (a starting point for your own post-adiabatic work):

1. the exact secular rates <da/dt>, <de/dt> of the osculating Keplerian elements under the
   leading (2.5PN) reaction force, and the exact periodic parts atilde(u), etilde(u) of the
   method of variation of constants (binary/post_adiabatic.py), printed as sympy text;
2. a numerical experiment: the Newtonian two-body motion plus the reaction force with its
   1/c^5 replaced by a strength S (large enough to see on a few orbits) is integrated with
   scipy; its osculating a(t), e(t) are compared with (i) the secular elements alone and
   (ii) secular + periodic parts. The second residual is of second order in S (the
   neglected terms), the first of first order (the missing periodic parts);
3. post_adiabatic_elements.json in OUTDIR: the residuals and the settings.

Units: G = m = 1, initial a = 1; nu = 1/4.
"""

from __future__ import annotations

import argparse
import json
import math
from pathlib import Path

import numpy as np
import sympy as sp
from scipy.integrate import solve_ivp

from stfalgebra.binary.keplerian import a, e
from stfalgebra.binary.orbit_integration import RelativeOrbitModel, cartesian_state, polar_coordinates
from stfalgebra.binary.osculating_elements import osculating_elements
from stfalgebra.binary.post_adiabatic import post_adiabatic_evolution, reaction_scale
from stfalgebra.symbols import G, c, m, nu

NU = 0.25


def eccentric_anomaly(mean_anomaly, ecc):
    """Kepler's equation l = u - e sin u solved by Newton's method (numpy arrays)."""
    anomaly = np.array(mean_anomaly, dtype=float) + ecc * np.sin(mean_anomaly)
    for _ in range(50):
        anomaly -= (anomaly - ecc * np.sin(anomaly) - mean_anomaly) / (1 - ecc * np.cos(anomaly))
    return anomaly


def start_state(ecc: float) -> tuple[float, float, float, float]:
    """Periastron of the ellipse a = 1, e = ecc (G = m = 1), on the x axis."""
    return cartesian_state(1 - ecc, 0.0, 0.0, math.sqrt(1 - ecc**2) / (1 - ecc) ** 2)


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("outdir", nargs="?", default=str(Path(__file__).parent / "_out"))
    parser.add_argument("--strength", type=float, default=4e-5, help="the factor replacing 1/c^5")
    parser.add_argument("--eccentricity", type=float, default=0.5)
    parser.add_argument("--orbits", type=int, default=4)
    args = parser.parse_args(argv)
    outdir = Path(args.outdir)
    outdir.mkdir(parents=True, exist_ok=True)

    evolution = post_adiabatic_evolution()
    axis, ecc_element = evolution["semi_major_axis"], evolution["eccentricity"]
    print("secular rates (exact):")
    print(f"  <da/dt> = {sp.sstr(axis.secular_rate)}")
    print(f"  <de/dt> = {sp.sstr(ecc_element.secular_rate)}")
    print("periodic parts (exact, zero orbit average; u the eccentric anomaly):")
    print(f"  atilde = {sp.sstr(axis.periodic_part())}")
    print(f"  etilde = {sp.sstr(ecc_element.periodic_part())}")

    # the numbers: G = m = c = 1 in the exact rates, and the strength S in place of 1/c^5
    strength, ecc0 = args.strength, args.eccentricity
    units = {G: 1, m: 1, nu: NU, c: 1}
    rate_a = sp.lambdify((a, e), axis.secular_rate.subs(units))
    rate_e = sp.lambdify((a, e), ecc_element.secular_rate.subs(units))
    epsilon_unit = float(reaction_scale(1).subs(units)) * strength      # epsilon = that * a^(-5/2)

    span = args.orbits * 2 * math.pi
    times = np.linspace(0.0, span, 400)
    model = RelativeOrbitModel(0, NU, 1.0, reaction_strength=strength)
    orbit = model.integrate(start_state(ecc0), span)
    numeric = osculating_elements(*polar_coordinates(orbit.sol(times)))

    # mean elements at t = 0: osculating minus periodic part (at periastron, u = 0)
    epsilon0 = epsilon_unit
    a_mean0 = 1.0 - float(axis.numeric_periodic_part(0.0, 1.0, ecc0, epsilon0))
    e_mean0 = ecc0 - float(ecc_element.numeric_periodic_part(0.0, 1.0, ecc0, epsilon0))
    residuals = {}
    for label, (a_start, e_start, periodic) in {"secular only": (1.0, ecc0, False),
                                                "secular + periodic": (a_mean0, e_mean0, True)}.items():
        track = solve_ivp(lambda t, y: (rate_a(y[0], y[1]) * strength, rate_e(y[0], y[1]) * strength,
                                        y[0] ** -1.5),
                          (0.0, span), (a_start, e_start, 0.0), rtol=1e-12, atol=1e-14, dense_output=True)
        a_bar, e_bar, l_bar = track.sol(times)
        a_model, e_model = a_bar, e_bar
        if periodic:
            anomaly = eccentric_anomaly(l_bar, e_bar)
            epsilon = epsilon_unit * a_bar**-2.5
            a_model = a_bar + axis.numeric_periodic_part(anomaly, a_bar, e_bar, epsilon)
            e_model = e_bar + ecc_element.numeric_periodic_part(anomaly, a_bar, e_bar, epsilon)
        residuals[label] = {"semi_major_axis": float(np.max(np.abs(numeric["semi_major_axis"] - a_model))),
                            "eccentricity": float(np.max(np.abs(numeric["eccentricity"] - e_model)))}
    drift = float(abs(numeric["semi_major_axis"][-1] - 1.0))
    print(f"numerical orbit: Newtonian motion + reaction of strength S = {strength:g}, e0 = {ecc0}, "
          f"{args.orbits} orbits; a drifts by {drift:.3e}")
    for label, values in residuals.items():
        print(f"  {label}: max |a_osc - a_model| = {values['semi_major_axis']:.3e}, "
              f"max |e_osc - e_model| = {values['eccentricity']:.3e}")
    print("  (the periodic parts remove the first-order wiggle; what is left is O(S^2))")
    (outdir / "post_adiabatic_elements.json").write_text(json.dumps(
        {"strength": strength, "eccentricity": ecc0, "orbits": args.orbits, "nu": NU,
         "residuals": residuals}, indent=1) + "\n", encoding="utf-8")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
