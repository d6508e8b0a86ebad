"""``stfalgebra enhancement``: the tail enhancement functions phi(e_t), psi(e_t) of eccentric orbits.

Contract:

    stfalgebra enhancement --eccentricity E [--series N] [--json]
    stfalgebra enhancement --series N [--json]

phi(e_t) is defined by the 1.5PN tail part of the orbit-averaged energy flux being
(32/5)(c^5/G) nu^2 x^5 * 4 pi x^(3/2) phi(e_t), psi(e_t) likewise from the angular-momentum flux,
(32/5) m c^2 nu^2 x^(7/2) * 4 pi x^(3/2) psi(e_t) (the whole e_t dependence; phi(0) = psi(0) = 1);
they are sums over the harmonics of the Newtonian modes (:mod:`stfalgebra.radiative.tail_enhancement`).

JSON: ``{"eccentricity": "E", "energy": phi, "angular_momentum": psi}`` (floats, relative
accuracy better than 1e-10; "eccentricity" is the exact value given, as a decimal or p/q);
``--series N`` adds ``"energy_series"`` and ``"angular_momentum_series"``, the exact power
series through et**N (rational coefficients, sympy syntax). With ``--series`` the eccentricity
may be omitted, and only the two series keys are printed.

Bad input is one line on stderr and exit code 2: E outside [0, 0.95] (more harmonics than the
command's budget beyond), malformed, NaN or huge; N odd or outside [2, 40].
"""

from __future__ import annotations

import argparse
import json
import sys
from fractions import Fraction

from . import UsageError, register
from .options import exact_number_text, parse_integer, parse_number
from .cache import DerivationCache

__all__ = ["enhancement_payload", "MAX_ECCENTRICITY", "SERIES_ORDERS"]

#: Largest eccentricity the command evaluates (about 2000 harmonics there).
MAX_ECCENTRICITY = Fraction(95, 100)
#: Smallest and largest power of et that --series accepts (even only).
SERIES_ORDERS = (2, 40)


def enhancement_payload(eccentricity: Fraction | None, series: int | None,
                        use_cache: bool = True) -> tuple[dict, int | None]:
    """The JSON object of ``stfalgebra enhancement`` (module docstring), derived or cached,
    and the number of harmonics summed (None without an eccentricity).

    ``eccentricity`` must already lie in [0, 0.95] and ``series`` be even in [2, 40] (the
    command checks them).
    """
    cache = DerivationCache(enabled=use_cache)
    text = None if eccentricity is None else exact_number_text(eccentricity)
    key = cache.key(command="enhancement", eccentricity=text, series=series, schema=1)
    cached = cache.get(key)
    if cached is not None:
        return cached["payload"], cached["harmonics"]
    from ..radiative.tail_enhancement import tail_enhancement, tail_enhancement_series

    payload: dict = {}
    harmonics = None
    if eccentricity is not None:
        values = tail_enhancement(float(eccentricity))
        payload = {"eccentricity": text, "energy": values.energy,
                   "angular_momentum": values.angular_momentum}
        harmonics = values.harmonics
    if series is not None:
        import sympy as sp

        phi, psi = tail_enhancement_series(series)
        payload["energy_series"] = sp.sstr(phi)
        payload["angular_momentum_series"] = sp.sstr(psi)
    cache.put(key, {"payload": payload, "harmonics": harmonics})
    return payload, harmonics


@register("enhancement", "tail enhancement functions phi(e_t), psi(e_t) of the averaged fluxes "
                         "of eccentric orbits (1.5PN): numbers and exact series")
class EnhancementCommand:
    @staticmethod
    def configure(parser: argparse.ArgumentParser) -> None:
        parser.add_argument("--eccentricity", metavar="E",
                            help="time eccentricity e_t in [0, 0.95] (decimal or p/q)")
        parser.add_argument("--series", metavar="N",
                            help="also the exact series through et^N (N even, 2 <= N <= 40)")
        parser.add_argument("--json", action="store_true", help="machine-readable JSON output")
        parser.add_argument("--no-cache", action="store_true", help="evaluate afresh")

    @staticmethod
    def run(args) -> int:
        if args.eccentricity is None and args.series is None:
            raise UsageError("give --eccentricity E, --series N, or both")
        eccentricity = None
        if args.eccentricity is not None:
            eccentricity = parse_number(args.eccentricity, "--eccentricity", low=Fraction(0),
                                        high=MAX_ECCENTRICITY)
        series = None
        if args.series is not None:
            series = parse_integer(args.series, "--series", *SERIES_ORDERS)
            if series % 2:
                raise UsageError(f"--series must be even (the series hold even powers of et), "
                                 f"got {args.series.strip()!r}")
        payload, harmonics = enhancement_payload(eccentricity, series, not args.no_cache)
        if args.json:
            sys.stdout.write(json.dumps(payload, indent=1) + "\n")
            return 0
        print("# tail enhancement functions of the averaged fluxes (1.5PN), time eccentricity et")
        if eccentricity is not None:
            print(f"et = {payload['eccentricity']}")
            print(f"phi(et) = {payload['energy']!r}")
            print(f"psi(et) = {payload['angular_momentum']!r}")
            print(f"  ({harmonics} harmonics of the mean motion summed; relative accuracy 1e-10)")
        if series is not None:
            print(f"phi(et) through et^{series}: {payload['energy_series']}")
            print(f"psi(et) through et^{series}: {payload['angular_momentum_series']}")
        return 0
