"""The circular inspiral from the energy balance: E(x), J(x), the flux, dx/dt, phi(x), t(x).

On a circular orbit every quantity is a PN series in the frequency parameter
x = (G m omega/c^3)^(2/3); this module derives them exactly, in the engine:

- the conserved energy E(x) and angular momentum J(x) from the cited conserved quantities of
  the harmonic-coordinate dynamics (:mod:`stfalgebra.binary.cited_inputs`) put on the circular
  orbit (:func:`stfalgebra.binary.circular_frequency.circular_reduction`);
- the energy flux F(x) summed over the derived modes
  (:func:`stfalgebra.radiative.fluxes.circular_energy_flux_from_modes`);
- the energy balance dE/dt = -F gives dx/dt = -F/(dE/dx); with dphi/dt = omega = c^3
  x^(3/2)/(G m),

      dphi/dx = omega/(dx/dt),        dt/dx = 1/(dx/dt),

  whose right-hand sides are expanded as PN series in x and integrated term by term, so that
  the orbital phase phi(x) - phi_0 and the time t(x) - t_0 are exact PN series with their
  PN order (phi_0, t_0 constants of integration). A term in 1/x integrates to ln x (the scale
  of the logarithm is absorbed in the constant); a coefficient holding powers of ln x is
  integrated exactly too. Nothing else is kept: every series stops at the order through which
  its inputs are known, and asking beyond it is refused with the input that limits it.

Writing E = -(m c^2 nu x/2) e(x) and F = (32/5)(c^5/G) nu^2 x^5 f(x):

    dx/dt = (64/5) (c^3/(G m)) nu x^5 f(x)/(x e)',
    dphi/dx = (5/(64 nu)) x^(-7/2) (x e)'/f,      dt/dx = (5 G m/(64 nu c^3)) x^(-5) (x e)'/f.

**Conventions**: harmonic coordinates, centre-of-mass frame, E without the rest mass, J along
+z, F positive for a loss (``conventions.md``); a quantity's PN order ``pn`` counts the
relative orders kept beyond its leading term.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from fractions import Fraction
from functools import lru_cache
from typing import Any

from ..binary.circular_frequency import circular_reduction, gamma_over_x_with_reaction, reduction_with_gamma
from ..binary.cited_inputs import (
    INPUT_ORDERS, REACTION_KNOWN_THROUGH, REACTION_ORDER, angular_momentum_per_reduced_mass,
    angular_momentum_reaction_term, energy_per_reduced_mass, energy_reaction_term, known_through,
)
from ..errors import OrderBeyondInputsError
from ..exact import ExactPolynomial, engine_symbols
from ..orders import PNOrder, parse_pn_order
from ..pnseries import PNSeries
from ..presentation import PresentedSeries, present_series
from .contributions import maximum_flux_order

__all__ = [
    "CircularQuantity", "QUANTITIES", "NORMALISATIONS", "circular_quantity", "relative_series",
    "maximum_quantity_order", "integrate_in_x",
]

#: The quantities, in the order they are printed.
QUANTITIES = ("energy", "angular_momentum", "energy_flux", "x_rate", "phase", "time")

#: What the leading term of each series of :func:`relative_series` is (the series is the
#: quantity divided by it).
NORMALISATIONS = {
    "energy": "E / (-(m nu c^2 x/2))",
    "energy_flux": "F / ((32/5) (c^5/G) nu^2 x^5)",
    "x_rate": "(dx/dt) / ((64/5) nu c^3 x^5/(G m))",
}

_ONE = ExactPolynomial(1)
_NU = ExactPolynomial("nu")


@dataclass(frozen=True)
class CircularQuantity:
    """One quantity of the circular inspiral: ``factors * series`` with ``series`` an exact PN
    series in x (order n multiplies x^n) and ``factors`` the dimensional factors in front
    (``{"m": 1, "c": 2}`` for E = m c^2 * series).

    ``pn`` is the relative order kept beyond the leading term, ``symbol``/``latex_symbol`` name
    the quantity (``"phi - phi_0"``), ``words`` say what it is, ``provenance`` where it comes from.
    """

    name: str
    symbol: str
    latex_symbol: str
    words: str
    series: PNSeries
    factors: dict[str, int]
    pn: PNOrder
    provenance: tuple[str, ...] = field(default=())

    def presentation(self) -> PresentedSeries:
        """The quantity as prefactor * [terms in increasing PN order]."""
        return present_series(self.series, factors=self.factors)

    def __repr__(self) -> str:
        """The REPL's display: ``symbol = prefactor*(terms)`` and the order kept."""
        return f"{self.symbol} = {self.presentation()}  (through relative order {self.pn})"

    def _repr_latex_(self) -> str:
        """The notebook's display: ``symbol = prefactor [terms]``."""
        return f"${self.latex_symbol} = {self.presentation().to_latex()}$"


# ----------------------------------------------------------------------------- orders
def _conserved_orders() -> list[tuple[int, PNOrder]]:
    orders = [(k, known_through(k)) for k in INPUT_ORDERS["conserved quantities"]]
    if _reaction_terms_vanish_on_the_circle():
        # the 2PN quantities joined with their (vanishing) 2.5PN terms: known through 5/2
        orders.append((2, REACTION_KNOWN_THROUGH[REACTION_ORDER]))
    return orders


@lru_cache(maxsize=None)
def _reaction_terms_vanish_on_the_circle() -> bool:
    """The 2.5PN terms of the harmonic-coordinate E and J (cited) are proportional to rdot: on the
    inspiralling circular orbit (rdot of order 1/c^5) they are of order 1/c^10, so the binding
    energy and angular momentum have no 2.5PN term (checked here on the inputs, not assumed)."""
    s = engine_symbols()
    return all(function(s)[REACTION_ORDER].substitute({"rdot": 0}).is_zero()
               for function in (energy_reaction_term, angular_momentum_reaction_term))


def maximum_quantity_order(name: str) -> PNOrder:
    """The largest relative PN order through which ``name`` (one of :data:`QUANTITIES`) is
    derived: read from the orders of the conserved quantities and from the table of
    contributions (the flux), never typed in.

    Example
    -------
    >>> maximum_quantity_order("energy") >= maximum_quantity_order("phase")
    True
    """
    if name not in QUANTITIES:
        raise ValueError(f"quantity must be one of {', '.join(QUANTITIES)}, got {name!r}")
    conserved = max(order for _, order in _conserved_orders())
    if name in ("energy", "angular_momentum"):
        return conserved
    flux = maximum_flux_order("circular")
    if name == "energy_flux":
        return flux
    return min(conserved, flux)


def _limit_reason(name: str) -> str:
    conserved = max(order for _, order in _conserved_orders())
    flux = maximum_flux_order("circular")
    if name in ("energy", "angular_momentum") or (name != "energy_flux" and conserved < flux):
        return f"the conserved quantities are known through relative order {conserved}"
    return f"the energy flux is derived through relative order {flux} (the table of contributions)"


def _check_order(name: str, pn: Any) -> PNOrder:
    order = parse_pn_order(pn, "pn")
    limit = maximum_quantity_order(name)
    if order > limit:
        raise OrderBeyondInputsError(f"{name} at relative order {order}: the toolkit derives it through relative "
                                     f"order {limit} ({_limit_reason(name)})")
    return order


# ----------------------------------------------------------------------------- the pieces
def _conserved_on_circle(function, pn: PNOrder) -> tuple[PNSeries, tuple[int, int, int], int]:
    """A conserved quantity per reduced mass on the circular orbit, with its units and the
    order of the dynamics used."""
    k, known = next(((k, order) for k, order in _conserved_orders() if order >= pn), (None, None))
    if k is None:  # pragma: no cover - _check_order refuses first
        raise OrderBeyondInputsError(f"no conserved quantity known through relative order {pn}")
    per_mass = {2 * j: value for j, value in function(engine_symbols()).items() if j <= k}
    series = PNSeries._from_trusted(per_mass, known.twice)
    if known > known_through(k):
        # with the 2.5PN reaction: its terms vanish on the circle, and g(x) has no 2.5PN term
        reduced, scale = reduction_with_gamma(series, gamma_over_x_with_reaction())
    else:
        reduced, scale = circular_reduction(series, k)
    return reduced, scale, k


@lru_cache(maxsize=None)
def _energy_relative(pn: PNOrder) -> tuple[PNSeries, int]:
    """e(x) with E = -(m c^2 nu x/2) e(x), through relative order pn; and the order of the
    dynamics used."""
    reduced, _, k = _conserved_on_circle(energy_per_reduced_mass, pn)
    # E/(mu c^2) = -(x/2) e(x)
    return (reduced * Fraction(-2)).shift(-1).truncate(pn), k


@lru_cache(maxsize=None)
def _flux_relative(pn: PNOrder) -> PNSeries:
    """f(x) with F = (32/5)(c^5/G) nu^2 x^5 f(x), through relative order pn."""
    from .fluxes import circular_energy_flux_from_modes

    return circular_energy_flux_from_modes(pn).truncate(pn)


def _derivative_of_x_times(series: PNSeries) -> PNSeries:
    """(x s(x))' for a relative series s = sum s_k x^k: sum (k + 1) s_k x^k."""
    return PNSeries._from_trusted({order.twice: value * (order + 1) for order, value in series.terms.items()},
                                  series.known_through.twice)


@lru_cache(maxsize=None)
def _rate_relative(pn: PNOrder) -> PNSeries:
    """f/(x e)' through relative order pn: dx/dt = (64/5)(c^3/(G m)) nu x^5 times this."""
    slope = _derivative_of_x_times(_energy_relative(pn)[0])
    return (_flux_relative(pn) * slope.inverse()).truncate(pn)


@lru_cache(maxsize=None)
def _balance_ratio(pn: PNOrder) -> PNSeries:
    """(x e)'/f through relative order pn: dphi/dx and dt/dx are this times a power of x."""
    slope = _derivative_of_x_times(_energy_relative(pn)[0])
    return (slope * _flux_relative(pn).inverse()).truncate(pn)


def integrate_in_x(series: PNSeries) -> PNSeries:
    """The antiderivative in x of a series in x, term by term (order n multiplies x^n).

    Parameters
    ----------
    series:
        Engine coefficients, which may hold powers of ``log(x)`` (the generator ``log_x``).

    Returns
    -------
    PNSeries
        Known one order further: int x^n dx = x^(n+1)/(n+1), int dx/x = ln x, and
        int x^n (ln x)^j dx = x^(n+1) (ln x)^j/(n+1) - j/(n+1) int x^n (ln x)^(j-1) dx.

    **Conventions**: the constant of integration is left out (zero at order 0 with no
    logarithm).

    Example
    -------
    >>> s = PNSeries({Fraction(-7, 2): ExactPolynomial(1), -1: ExactPolynomial(3)}, known_through=0)
    >>> integrate_in_x(s)
    PNSeries(-2/5*eps**-5 + 3*log(x) + O(eps**3))

    References
    ----------
    Common practice (integration by parts).
    """
    log_x = ExactPolynomial("log_x")
    out: dict[int, ExactPolynomial] = {}

    def add(order2: int, value: ExactPolynomial) -> None:
        out[order2] = out[order2] + value if order2 in out else value

    for order, value in series.terms.items():
        for j, part in value.coefficients_in("log_x").items():
            j = int(j)
            if order == -1:
                add(0, part * log_x ** (j + 1) / (j + 1))
                continue
            # int x^n (ln x)^j = x^(n+1) sum_i (-1)^i j!/(j-i)! (ln x)^(j-i)/(n+1)^(i+1)
            n1 = Fraction(order + 1)
            falling = 1
            for i in range(j + 1):
                add((order + 1).twice, part * log_x ** (j - i) * (Fraction((-1) ** i * falling) / n1 ** (i + 1)))
                falling *= j - i
    return PNSeries._from_trusted(out, series.known_through.twice + 2)


# ----------------------------------------------------------------------------- the quantities
def relative_series(name: str, pn: Any) -> PNSeries:
    """A quantity of the circular inspiral divided by its leading term: a PN series in x that
    starts with 1, through relative order ``pn``.

    Parameters
    ----------
    name:
        ``"energy"`` (e(x) = E/(-(m nu c^2 x/2))), ``"energy_flux"``
        (F/((32/5)(c^5/G) nu^2 x^5)) or ``"x_rate"`` (dx/dt / ((64/5) nu c^3 x^5/(G m))); the
        normalisations are :data:`NORMALISATIONS`.
    pn:
        Relative order, at most :func:`maximum_quantity_order` of ``name``.

    Returns
    -------
    PNSeries
        Engine coefficients in nu (and pi, logarithms where the flux carries them); order n
        multiplies x^n.

    Raises
    ------
    OrderBeyondInputsError
        An order beyond the inputs (the message names the limiting input).

    **Conventions**: module docstring. The energy comes from the cited conserved energy on
    the circular orbit, with gamma(x) derived from the cited omega(r); the flux is the one
    the table of contributions serves (so the rate reaches every order the flux reaches, up to
    the order of the conserved energy); dx/dt = -F/(dE/dx), i.e. f(x)/(x e(x))'.

    Example
    -------
    >>> relative_series("x_rate", 1)
    PNSeries(1 + (-743/336 - 11*nu/4)*eps**2 + O(eps**3))

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 9.3 (the balance equation; from memory).
    """
    if name not in NORMALISATIONS:
        raise ValueError(f"relative series exist for {', '.join(NORMALISATIONS)}, got {name!r}")
    order = _check_order(name, pn)
    if name == "energy":
        return _energy_relative(order)[0]
    if name == "energy_flux":
        return _flux_relative(order)
    return _rate_relative(order)



_CONSERVED_SOURCE = ("conserved {what} of the harmonic-coordinate two-body dynamics at {k}PN "
                     "(stfalgebra.binary.cited_inputs, Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 7) "
                     "on the circular orbit x = (G m omega/c^3)^(2/3)")
_FLUX_SOURCE = "energy flux summed over the derived modes h_lm (stfalgebra.radiative.fluxes)"
_BALANCE = "energy balance dE/dt = -F, expanded as a PN series in x"


@lru_cache(maxsize=None, typed=True)   # typed: pn=True or 1.0 must reach the validation, not 1's entry
def circular_quantity(name: str, pn: Any) -> CircularQuantity:
    """One quantity of the circular inspiral through relative PN order ``pn``.

    Parameters
    ----------
    name:
        ``"energy"`` (E, rest mass excluded), ``"angular_momentum"`` (J), ``"energy_flux"``
        (F), ``"x_rate"`` (dx/dt), ``"phase"`` (phi - phi_0) or ``"time"`` (t - t_0).
    pn:
        Relative order kept beyond the quantity's leading term (a multiple of 1/2), at most
        :func:`maximum_quantity_order`.

    Returns
    -------
    CircularQuantity

    Raises
    ------
    OrderBeyondInputsError
        An order beyond what the inputs give (the message names the limiting input).

    **Conventions**: module docstring.

    Example
    -------
    >>> print(circular_quantity("energy", 1).presentation())
    -1/2*m*nu*c**2*x*(1 + x*(-3/4 - 1/12*nu))
    >>> print(circular_quantity("phase", 1).presentation())
    -1/(32*nu*x**(5/2))*(1 + x*(3715/1008 + 55/12*nu))

    References
    ----------
    Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 9.3 (the energy balance of circular
    orbits and the phase as a function of x; from memory, equation numbers not checked).
    """
    order = _check_order(name, pn)
    if name == "energy":
        e, k = _energy_relative(order)
        series = (e * (_NU * Fraction(-1, 2))).shift(1)
        return CircularQuantity(name, "E", "E", "conserved energy of the circular orbit (rest mass excluded)",
                                series, {"m": 1, "c": 2}, order,
                                (_CONSERVED_SOURCE.format(what="energy", k=k),))
    if name == "angular_momentum":
        reduced, (g, mm, c), k = _conserved_on_circle(angular_momentum_per_reduced_mass, order)
        # J = mu (G m/c) x^(-1/2) [...] with mu = m nu: the series is J c/(G m^2)
        series = (reduced * _NU).truncate(order - Fraction(1, 2))
        return CircularQuantity(name, "J", "J", "conserved orbital angular momentum of the circular orbit, along +z",
                                series, {"G": g, "m": mm + 1, "c": c}, order,
                                (_CONSERVED_SOURCE.format(what="angular momentum", k=k),))
    if name == "energy_flux":
        series = (_flux_relative(order) * (_NU**2 * Fraction(32, 5))).shift(5)
        return CircularQuantity(name, "F", r"\mathcal{F}", "energy flux (luminosity) of the circular orbit, "
                                "positive for a loss", series, {"c": 5, "G": -1}, order, (_FLUX_SOURCE,))
    energy_k = _energy_relative(order)[1]
    sources = (_CONSERVED_SOURCE.format(what="energy", k=energy_k), _FLUX_SOURCE, _BALANCE)
    if name == "x_rate":
        series = (_rate_relative(order) * (_NU * Fraction(64, 5))).shift(5)
        return CircularQuantity(name, "dx/dt", r"\frac{dx}{dt}", "rate of change of x = (G m omega/c^3)^(2/3) "
                                "from the energy balance", series, {"c": 3, "G": -1, "m": -1}, order, sources)
    ratio = _balance_ratio(order)
    if name == "phase":
        # nu (phi - phi_0) = (5/64) int x^(-7/2) (x e)'/f dx
        series = integrate_in_x((ratio * Fraction(5, 64)).shift(Fraction(-7, 2)))
        return CircularQuantity(name, "phi - phi_0", r"\phi - \phi_0",
                                "orbital phase as a function of x, phi_0 a constant of integration",
                                series.truncate(Fraction(-5, 2) + order), {"nu": -1}, order,
                                sources + ("dphi/dx = omega/(dx/dt), integrated term by term",))
    if name == "time":
        # nu (t - t_0) c^3/(G m) = (5/64) int x^(-5) (x e)'/f dx
        series = integrate_in_x((ratio * Fraction(5, 64)).shift(-5))
        return CircularQuantity(name, "t - t_0", "t - t_0", "time as a function of x, t_0 a constant of integration",
                                series.truncate(-4 + order), {"G": 1, "m": 1, "c": -3, "nu": -1}, order,
                                sources + ("dt/dx = 1/(dx/dt), integrated term by term",))
    raise ValueError(f"quantity must be one of {', '.join(QUANTITIES)}, got {name!r}")  # pragma: no cover
