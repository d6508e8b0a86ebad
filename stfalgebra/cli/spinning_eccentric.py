"""The aligned-spin payloads of ``flux --orbit eccentric --spins aligned`` and ``evolve --spins aligned``.

The non-spinning payloads of :mod:`stfalgebra.cli.command_flux` and
:mod:`stfalgebra.cli.command_evolve` with the averages and rates of
:mod:`stfalgebra.radiative.spinning_eccentric_fluxes` and
:mod:`stfalgebra.radiative.spinning_secular_rates` (the leading spin-orbit terms at x^(3/2), the
symbols chi1, chi2 and delta), and the key ``"spins": "aligned"``. Those commands call these
functions only with ``--spins aligned``: without it every output is as before.

**Conventions**: :mod:`stfalgebra.binary.spin_variables` (``chi1, chi2 = c S_A.ell/(G m_A^2)``,
``delta = (m1 - m2)/m``); normalisations of the non-spinning payloads.
"""

from __future__ import annotations

__all__ = ["SPIN_NOTE", "spinning_eccentric_flux_payload", "spinning_rates_payload", "check_spin_options"]

#: One line stating what the spin symbols mean, printed with every aligned-spin result.
SPIN_NOTE = ("spins aligned with the orbital angular momentum: chi1, chi2 = c S_A.ell/(G m_A^2), "
             "leading spin-orbit terms (x^(3/2)); delta = (m1 - m2)/m")


def _reason(order) -> str | None:
    """Why an order is refused with spins: the table's refusal for the quadrupole at that order."""
    from ..errors import OrderBeyondInputsError
    from ..radiative.contributions import plan_radiative_moment, table_for_spins

    try:
        plan_radiative_moment("mass", 2, order, "eccentric", table=table_for_spins("aligned"))
    except OrderBeyondInputsError as exc:
        return str(exc)
    return None


def _text(series) -> str:
    import sympy as sp

    from ..symbols import x

    terms = [coeff * x**k for k, coeff in series.terms.items()]
    return sp.sstr(sp.Add(*terms, evaluate=False) if len(terms) > 1 else sp.Add(*terms))


def spinning_eccentric_flux_payload(pn: str, form) -> dict:
    """``flux --orbit eccentric --spins aligned``: the orbit-averaged fluxes with spins.

    Parameters
    ----------
    pn:
        The order's text; bounded here by the table with the spin rows.
    form:
        The flux command's form builder (``_form(name, series, exact)``).

    Returns
    -------
    dict
        The keys of the non-spinning eccentric payload ("orbit", "pn", "energy",
        "angular_momentum", "forms", from 3/2 "enhancement_functions" and "enhancement_series")
        and "spins": "aligned".
    """
    import sympy as sp

    from ..radiative.spinning_eccentric_fluxes import (
        spinning_averaged_angular_momentum_flux, spinning_averaged_energy_flux,
    )
    from ..radiative.tail_enhancement import tail_enhancement_series
    from .command_flux import ENHANCEMENT_DEFINITIONS, ENHANCEMENT_SERIES_ORDER
    from .options import maximum_pn_order, parse_bounded_order

    order = parse_bounded_order(pn, "--pn", maximum_pn_order("flux", orbit="eccentric", spins="aligned"),
                                reason=_reason)
    energy, angular = spinning_averaged_energy_flux(order), spinning_averaged_angular_momentum_flux(order)
    payload = {"orbit": "eccentric", "pn": pn, "spins": "aligned",
               "energy": _text(energy), "angular_momentum": _text(angular),
               "forms": {"energy": form("energy", energy, exact=False),
                         "angular_momentum": form("angular_momentum", angular, exact=False)}}
    if order >= sp.Rational(3, 2):
        phi, psi = tail_enhancement_series(ENHANCEMENT_SERIES_ORDER)
        payload["enhancement_functions"] = dict(ENHANCEMENT_DEFINITIONS)
        payload["enhancement_series"] = {"order": ENHANCEMENT_SERIES_ORDER, "phi": sp.sstr(phi), "psi": sp.sstr(psi)}
    return payload


def spinning_rates_payload(pn: str, forms: dict, normalisation: dict) -> dict:
    """``evolve --spins aligned``: the secular rates with spins (no track).

    Parameters
    ----------
    pn:
        The order's text; bounded here by the table with the spin rows.
    forms:
        The evolve command's ``{name: (symbol, latex_symbol, words, prefactor, prefactor_latex)}``.
    normalisation:
        The evolve command's normalisations.

    Returns
    -------
    dict
        "pn", "spins", "rates" {"dx_dt", "de_dt"}, "normalisation", "forms", from 3/2
        "enhancement_functions".
    """
    import sympy as sp

    from ..radiative.spinning_secular_rates import spinning_secular_rates
    from .command_flux import ENHANCEMENT_DEFINITIONS
    from .forms import sympy_series_form
    from .options import maximum_pn_order, parse_bounded_order

    order = parse_bounded_order(pn, "--pn", maximum_pn_order("evolve", spins="aligned"), reason=_reason)
    x_rate, e_rate = spinning_secular_rates(order)
    out_forms = {}
    for name, series in (("dx_dt", x_rate), ("de_dt", e_rate)):
        symbol, latex_symbol, words, prefactor, prefactor_latex = forms[name]
        out_forms[name] = {"symbol": symbol, "latex_symbol": latex_symbol, "words": words,
                           **sympy_series_form(series, prefactor=prefactor, prefactor_latex=prefactor_latex)}
    payload = {"pn": pn, "spins": "aligned", "rates": {"dx_dt": _text(x_rate), "de_dt": _text(e_rate)},
               "normalisation": dict(normalisation), "forms": out_forms}
    if order >= sp.Rational(3, 2):
        payload["enhancement_functions"] = dict(ENHANCEMENT_DEFINITIONS)
    return payload


def check_spin_options(spins: str | None, chi1, chi2) -> tuple[float, float] | None:
    """The numeric spins of a track: ``(chi1, chi2)`` with ``--spins aligned`` (each defaulting to
    0), None without spins; ``--chi1``/``--chi2`` without ``--spins aligned`` are refused.

    Example
    -------
    >>> check_spin_options("aligned", None, 0.5)
    (0.0, 0.5)
    >>> check_spin_options(None, 0.5, None)
    Traceback (most recent call last):
    ...
    ValueError: --chi1 needs --spins aligned (spin components of spins along the orbital angular momentum)
    """
    given = [flag for flag, value in (("--chi1", chi1), ("--chi2", chi2)) if value is not None]
    if spins is None:
        if given:
            raise ValueError(f"{', '.join(given)} needs --spins aligned (spin components of spins along the "
                             f"orbital angular momentum)")
        return None
    return (float(chi1) if chi1 is not None else 0.0, float(chi2) if chi2 is not None else 0.0)
