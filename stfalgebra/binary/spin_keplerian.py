"""The quasi-Keplerian orbit of a binary with aligned spins: 1PN plus the leading spin-orbit terms.

Derived here, in harmonic coordinates with the covariant spin supplementary condition, from the
project's conserved energy and orbital angular momentum with their spin-orbit terms
(:func:`~stfalgebra.binary.spinning_dynamics.aligned_spin_energy`,
:func:`~stfalgebra.binary.spinning_dynamics.aligned_spin_angular_momentum`, cited inputs of
Kidder 1995). Nothing is typed in:

1. ``E`` and ``J`` (per reduced mass, ``G = m = 1``) are solved for ``rdot^2`` and ``phidot`` as
   functions of ``r`` through ``1/c^3``: ``rdot^2 = A + 2B/r + C/r^2 + D/r^3`` and
   ``phidot = H/r^2 + I/r^3`` with ``D, I = O(1/c^2)`` (checked: no other powers of ``1/r``).
2. The radial motion, to first order in ``D`` and ``I`` (their products are ``O(1/c^4)``): the
   cubic ``A r^3 + 2B r^2 + C r + D`` has the turning points ``r_+-`` and a small root
   ``r_0 = -D/C``; with ``r = a_r (1 - e_r cos u)``, ``a_r = (r_+ + r_-)/2``,
   ``dt/du = (r + r_0/2)/sqrt(-A)`` gives Kepler's equation ``n (t - t_0) = u - e_t sin u``
   with ``n = (-A)^(3/2)/B`` and ``e_t = e_r a_r/(-B/A)``.
3. The angular motion: ``dphi/du = [H/r + K/r^2]/sqrt(-A)``, ``K = I + H r_0/2``, is
   ``(1 + k) dv_phi/du`` with ``e_phi = e_r (1 + K/(H a_r))`` and
   ``1 + k = (H + K/a_r)/(a_r sqrt(-A) sqrt(1 - e_phi^2))``, ``v_phi`` the true anomaly of
   ``e_phi``.
4. The elements in ``x = (G m omega/c^3)^(2/3)``, ``omega = (1 + k) n``, and the time
   eccentricity ``e_t``: ``E`` and ``J`` reverted order by order.

This is the method of Damour & Deruelle (1985) for the 1PN orbit, carried to the leading
spin-orbit terms, which enter at ``1/c^3`` (``x^(3/2)``) in ``k``, ``e_t``, ``e_r``, ``e_phi``,
``a_r``, ``E`` and ``J``; ``n(E)`` gets none. The same representation was published in ADM-type
coordinates by Konigsdorffer & Gopakumar, Phys. Rev. D 71, 024039 (2005) (its equations are not
reachable by the project's search tool); coordinate-dependent elements (``a_r``, ``e_r``,
``e_phi``, ``e_t``) differ between the two gauges at the spin-orbit order, the invariant ones
(``n(E)``, ``k(E, J)``, ``E(x)``) do not. The tests check conservation of ``E`` and ``J`` along
the parametrised orbit, a numerical integration of the spinning equations of motion, the
Lense-Thirring periastron advance of a test mass, and the circular limit against
:mod:`stfalgebra.binary.spin_circular`.

**Conventions**: :mod:`stfalgebra.binary.spin_variables` (``chi1, chi2`` the components along
the orbital angular momentum, ``delta = (m1 - m2)/m``); ``E``, ``J`` per reduced mass, ``J``
the orbital angular momentum with its spin-orbit term (the conserved total adds
``(G m^2/c) s_l``); ``r = a_r (1 - e_r cos u)``, ``n (t - t_0) = u - e_t sin u``,
``phi - phi_0 = (1 + k) v_phi(u)``. Every element is known through relative order 3/2
(spin-spin terms enter at 2PN).
"""

from __future__ import annotations

from functools import lru_cache

import sympy as sp

from ..exact import ExactPolynomial
from ..pnseries import PNSeries
from ..symbols import G, c, et, m, phidot, r, rdot
from .keplerian import QuasiKeplerianElements, tidy_eccentricity
from .spin_variables import SPINNING_KNOWN_THROUGH
from .spinning_dynamics import aligned_spin_angular_momentum, aligned_spin_energy

__all__ = [
    "SPIN_ENERGY",
    "SPIN_ANGULAR_MOMENTUM",
    "aligned_spin_radial_equation",
    "aligned_spin_elements_from_energy",
    "aligned_spin_quasi_keplerian",
]

#: Energy per reduced mass of the energy-form elements (``G = m = 1``, negative on bound orbits).
SPIN_ENERGY = sp.Symbol("E", negative=True)
#: Orbital angular momentum per reduced mass of the energy-form elements (``G = m = 1``).
SPIN_ANGULAR_MOMENTUM = sp.Symbol("J", positive=True)

_E, _J = SPIN_ENERGY, SPIN_ANGULAR_MOMENTUM
_EPS = sp.Symbol("eps_inverse_c", positive=True)        # 1/c in the derivation
_INVERSE_R = sp.Symbol("inverse_r", positive=True)


def _in_eps(series: PNSeries) -> sp.Expr:
    """An engine PN series in 1/c as a sympy expression in ``_EPS`` with ``G = m = 1``."""
    total = sp.Integer(0)
    for order, value in series.terms.items():
        total += value.to_sympy() * _EPS ** int(2 * order)
    return sp.expand(total.subs({G: 1, m: 1}))


class _Corrected:
    """``lead (1 + d2 t^2 + d3 t^3)`` with ``t`` the expansion parameter (``1/c`` or ``sqrt(x)``).

    Every correction kept here is ``O(t^2)`` and the result is wanted through ``t^3``, so products
    of two corrections (``O(t^4)``) drop out: sums, products, powers and quotients are exact to
    that order with the first-order rules below (no series expansion needed).
    """

    __slots__ = ("lead", "d2", "d3")

    def __init__(self, lead: sp.Expr, d2: sp.Expr = 0, d3: sp.Expr = 0) -> None:
        self.lead, self.d2, self.d3 = lead, sp.sympify(d2), sp.sympify(d3)

    @classmethod
    def from_polynomial(cls, expr: sp.Expr, parameter: sp.Symbol) -> "_Corrected":
        poly = sp.expand(expr)
        lead = poly.coeff(parameter, 0)
        if poly.coeff(parameter, 1) != 0 or lead == 0:
            raise ArithmeticError(f"not of the form lead (1 + O(t^2)): {expr}")
        return cls(lead, sp.cancel(poly.coeff(parameter, 2) / lead), sp.cancel(poly.coeff(parameter, 3) / lead))

    def __mul__(self, other: "_Corrected") -> "_Corrected":
        if not isinstance(other, _Corrected):
            other = _Corrected(sp.sympify(other))
        return _Corrected(self.lead * other.lead, self.d2 + other.d2, self.d3 + other.d3)

    __rmul__ = __mul__

    def __pow__(self, power: sp.Expr) -> "_Corrected":
        return _Corrected(self.lead**power, power * self.d2, power * self.d3)

    def __truediv__(self, other: "_Corrected") -> "_Corrected":
        return self * other**-1

    def __add__(self, other: "_Corrected") -> "_Corrected":
        lead = sp.cancel(self.lead + other.lead)
        return _Corrected(lead, sp.cancel((self.lead * self.d2 + other.lead * other.d2) / lead),
                          sp.cancel((self.lead * self.d3 + other.lead * other.d3) / lead))

    def __neg__(self) -> "_Corrected":
        return _Corrected(-self.lead, self.d2, self.d3)

    def __sub__(self, other: "_Corrected") -> "_Corrected":
        return self + (-other)

    def small(self, parameter: sp.Symbol) -> sp.Expr:
        """``lead (d2 t^2 + d3 t^3)``: a quantity whose leading term vanishes (``lead`` is then its scale)."""
        return sp.expand(self.lead * (self.d2 * parameter**2 + self.d3 * parameter**3))

    def expression(self, parameter: sp.Symbol) -> sp.Expr:
        return sp.expand(self.lead * (1 + self.d2 * parameter**2 + self.d3 * parameter**3))

    def simplified(self, simplify) -> "_Corrected":
        return _Corrected(simplify(self.lead), simplify(self.d2), simplify(self.d3))


@lru_cache(maxsize=1)
def aligned_spin_radial_equation() -> tuple[dict[str, sp.Expr], dict[str, sp.Expr]]:
    """``rdot^2`` and ``phidot`` as polynomials in ``1/r`` on an orbit of given ``E``, ``J``.

    Returns
    -------
    (dict, dict)
        ``{"A", "B", "C", "D"}`` with ``rdot^2 = A + 2B/r + C/r^2 + D/r^3`` and ``{"H", "I"}``
        with ``phidot = H/r^2 + I/r^3``, each a polynomial in ``1/c`` (the symbol
        ``eps_inverse_c``) through ``1/c^3`` with coefficients in :data:`SPIN_ENERGY`,
        :data:`SPIN_ANGULAR_MOMENTUM`, nu, delta, chi1, chi2 (``G = m = 1``).

    Raises
    ------
    ArithmeticError
        Another power of ``1/r`` appears, or ``rdot`` enters other than through ``rdot^2``.

    **Conventions**: module docstring.

    Example
    -------
    >>> coefficients, _ = aligned_spin_radial_equation()
    >>> coefficients["A"]
    9*E**2*eps_inverse_c**2*nu - 3*E**2*eps_inverse_c**2 + 2*E

    References
    ----------
    Common practice (Damour & Deruelle, Ann. Inst. H. Poincare 43, 107 (1985), Sec. 2, for the
    point masses).
    """
    speed2 = sp.Symbol("rdot_squared")
    energy = _in_eps(aligned_spin_energy(1)).subs(rdot**2, speed2)
    momentum = _in_eps(aligned_spin_angular_momentum(1)).subs(rdot**2, speed2)
    if energy.has(rdot) or momentum.has(rdot):
        raise ArithmeticError("the conserved quantities depend on rdot other than through rdot^2")
    unknowns = sp.symbols("p2 p3 f2 f3")
    p2, p3, f2, f3 = unknowns
    speed_trial = 2 * _E + 2 / r - _J**2 / r**2 + _EPS**2 * p2 + _EPS**3 * p3
    phidot_trial = _J / r**2 + _EPS**2 * f2 + _EPS**3 * f3
    residues = [sp.expand(value.subs({speed2: speed_trial, phidot: phidot_trial}) - target)
                for value, target in ((energy, _E), (momentum, _J))]
    solution: dict[sp.Symbol, sp.Expr] = {}
    for power, pair in ((0, None), (1, None), (2, (p2, f2)), (3, (p3, f3))):
        equations = [sp.expand(residue.coeff(_EPS, power).subs(solution)) for residue in residues]
        if pair is None:
            if any(equation != 0 for equation in equations):
                raise ArithmeticError(f"the Newtonian orbit does not solve E, J at 1/c^{power}")
            continue
        solved = sp.solve(equations, pair, dict=True)
        if len(solved) != 1:
            raise ArithmeticError(f"E, J do not fix rdot^2, phidot at 1/c^{power}")
        solution.update({key: sp.expand(value) for key, value in solved[0].items()})
    speed = sp.Poly(sp.expand(speed_trial.subs(solution).subs(r, 1 / _INVERSE_R)), _INVERSE_R)
    angular = sp.Poly(sp.expand(phidot_trial.subs(solution).subs(r, 1 / _INVERSE_R)), _INVERSE_R)
    if speed.degree() > 3 or angular.degree() > 3 or any(
            angular.coeff_monomial(_INVERSE_R**k) != 0 for k in (0, 1)):
        raise ArithmeticError("rdot^2 or phidot is not of the quasi-Keplerian form")
    radial = {"A": speed.coeff_monomial(1), "B": speed.coeff_monomial(_INVERSE_R) / 2,
              "C": speed.coeff_monomial(_INVERSE_R**2), "D": speed.coeff_monomial(_INVERSE_R**3)}
    if radial["D"].subs(_EPS, 0) != 0:
        raise ArithmeticError("the 1/r^3 term of rdot^2 is not post-Newtonian")
    return ({key: sp.expand(value) for key, value in radial.items()},
            {"H": angular.coeff_monomial(_INVERSE_R**2), "I": angular.coeff_monomial(_INVERSE_R**3)})


def _with_small(quantity: _Corrected, small: sp.Expr) -> _Corrected:
    """``quantity + small`` for a ``small`` of order ``t^2`` (an expression in ``1/c``)."""
    small = sp.expand(small)
    if small.coeff(_EPS, 0) != 0 or small.coeff(_EPS, 1) != 0:
        raise ArithmeticError(f"not a post-Newtonian correction: {small}")
    return _Corrected(quantity.lead, quantity.d2 + sp.cancel(small.coeff(_EPS, 2) / quantity.lead),
                      quantity.d3 + sp.cancel(small.coeff(_EPS, 3) / quantity.lead))


@lru_cache(maxsize=1)
def _energy_form() -> dict[str, _Corrected]:
    radial, angular = aligned_spin_radial_equation()
    A, B, C = (_Corrected.from_polynomial(radial[key], _EPS) for key in "ABC")
    H = _Corrected.from_polynomial(angular["H"], _EPS)
    D, I = radial["D"], angular["I"]                       # O(1/c^2): first order suffices
    small_root = sp.expand(-D / C.lead)                    # the third root of the radial cubic
    axis = _with_small(-B / A, D / (2 * C.lead))           # (r_+ + r_-)/2
    product = _with_small(C / A, -2 * B.lead * D / (A.lead * C.lead))     # r_+ r_-
    one = _Corrected(sp.Integer(1))
    radial_ecc2 = one - product / axis**2
    mean_motion = (-A) ** sp.Rational(3, 2) / B
    time_ecc2 = radial_ecc2 * axis**2 * A**2 / B**2
    correction = sp.expand(I + H.lead * small_root / 2)   # K
    angular_ecc2 = _with_small(radial_ecc2, 2 * radial_ecc2.lead * correction / (H.lead * axis.lead))
    one_plus_k = _with_small(H, correction / axis.lead) / (axis * (-A) ** sp.Rational(1, 2)
                                                          * (one - angular_ecc2) ** sp.Rational(1, 2))
    simplify = lambda value: sp.factor(sp.powsimp(sp.cancel(value), force=True))   # noqa: E731
    out = {"mean_motion": mean_motion, "semi_major_axis": axis, "radial_eccentricity_squared": radial_ecc2,
           "time_eccentricity_squared": time_ecc2, "angular_eccentricity_squared": angular_ecc2,
           "one_plus_periastron_advance": one_plus_k}
    out = {name: value.simplified(simplify) for name, value in out.items()}
    if out["one_plus_periastron_advance"].lead != 1:
        raise ArithmeticError(f"the Newtonian orbit does not close: 1 + k = {out['one_plus_periastron_advance'].lead}")
    return out


def aligned_spin_elements_from_energy() -> dict[str, sp.Expr]:
    """The quasi-Keplerian elements with aligned spins in terms of ``E`` and ``J`` (``G = m = 1``).

    Returns
    -------
    dict
        ``"mean_motion"`` (``n``), ``"semi_major_axis"`` (``a_r``), ``"radial_eccentricity_squared"``,
        ``"time_eccentricity_squared"``, ``"angular_eccentricity_squared"`` and
        ``"periastron_advance"`` (``k``): polynomials in ``1/c`` (the symbol ``eps_inverse_c``)
        through ``1/c^3``, coefficients in :data:`SPIN_ENERGY`, :data:`SPIN_ANGULAR_MOMENTUM`,
        nu, delta, chi1, chi2.

    **Conventions**: module docstring (steps 2 and 3), harmonic coordinates.

    Example
    -------
    >>> from stfalgebra.symbols import delta, nu
    >>> chi2 = ExactPolynomial("chi2").to_sympy()
    >>> k = aligned_spin_elements_from_energy()["periastron_advance"]
    >>> k.coeff(sp.Symbol("eps_inverse_c", positive=True), 3).subs(
    ...     {nu: 0, delta: 1, chi2: 0})               # test mass: Lense-Thirring, -4 chi/J^3
    -4*chi1/J**3

    References
    ----------
    Derived here (module docstring); Damour & Deruelle, Ann. Inst. H. Poincare 43, 107 (1985)
    for the method and the 1PN terms.
    """
    form = _energy_form()
    out = {name: value.expression(_EPS) for name, value in form.items() if name != "one_plus_periastron_advance"}
    out["periastron_advance"] = form["one_plus_periastron_advance"].small(_EPS)
    return out


_ROOT = sp.sqrt(1 - et**2)
_NEWTONIAN = {_E: -sp.Rational(1, 2), _J: _ROOT}      # E, J at x = 1 (each element is homogeneous in x)


def _in_frequency(quantity: _Corrected, shifts: dict[sp.Symbol, tuple[sp.Expr, sp.Expr]]) -> tuple[sp.Expr, ...]:
    """``(lead, r2, r3)`` of an energy-form element at ``E = -x/2 (1 + e2 x + e3 x^(3/2))``,
    ``J = sqrt(1 - e_t^2) x^(-1/2) (1 + j2 x + j3 x^(3/2))`` (``shifts = {E: (e2, e3), J: (j2, j3)}``),
    relative to its Newtonian power of ``x``: the lead's logarithmic derivatives carry the shifts."""
    lead = quantity.lead
    weights = {symbol: sp.cancel(symbol * sp.diff(lead, symbol) / lead) for symbol in (_E, _J)}
    r2 = quantity.d2 + sum(weights[symbol] * shifts[symbol][0] for symbol in (_E, _J))
    r3 = quantity.d3 + sum(weights[symbol] * shifts[symbol][1] for symbol in (_E, _J))
    return tuple(sp.expand(value.subs(_NEWTONIAN)) for value in (lead, r2, r3))


@lru_cache(maxsize=1)
def _reversion() -> dict[str, tuple[sp.Expr, sp.Expr, sp.Expr]]:
    """Every element as ``(lead, r2, r3)`` in ``x``, ``e_t`` (``G = m = c = 1``): the value is
    ``lead x^p (1 + r2 x + r3 x^(3/2))``, ``p`` the Newtonian power."""
    form = _energy_form()
    e2, e3, j2, j3 = sp.symbols("energy_2 energy_3 momentum_2 momentum_3")
    shifts = {_E: (e2, e3), _J: (j2, j3)}
    frequency = _in_frequency(form["mean_motion"] * form["one_plus_periastron_advance"], shifts)
    eccentricity = _in_frequency(form["time_eccentricity_squared"], shifts)
    if sp.simplify(frequency[0] - 1) != 0 or sp.simplify(eccentricity[0] - et**2) != 0:
        raise ArithmeticError("the Newtonian orbit does not have x^(3/2) = G m n/c^3, e_t = e")
    solution: dict[sp.Symbol, sp.Expr] = {}
    for index, pair in ((1, (e2, j2)), (2, (e3, j3))):
        solved = sp.solve([frequency[index], eccentricity[index]], pair, dict=True)
        if len(solved) != 1:
            raise ArithmeticError("(x, e_t) do not fix E and J")
        solution.update({key: tidy_eccentricity(value, et) for key, value in solved[0].items()})
    shifts = {symbol: tuple(value.subs(solution) for value in pair) for symbol, pair in shifts.items()}
    converted = {name: _in_frequency(value, shifts) for name, value in form.items()}
    converted["energy"] = (-sp.Rational(1, 2), shifts[_E][0], shifts[_E][1])
    converted["angular_momentum"] = (_ROOT, shifts[_J][0], shifts[_J][1])
    return {name: tuple(tidy_eccentricity(value, et) for value in values) for name, values in converted.items()}


def _series(values: tuple[sp.Expr, sp.Expr, sp.Expr], lead: sp.Rational, scale: sp.Expr,
            relative_only: bool = False) -> PNSeries:
    """``scale x^lead L (1 + r2 x + r3 x^(3/2))`` as a PN series in ``sqrt(x)`` known through
    ``lead + 3/2``; ``relative_only``: ``scale x^lead L (r2 x + r3 x^(3/2))`` (``k``)."""
    base, r2, r3 = values
    terms = {} if relative_only else {lead: base * scale}
    for shift, value in ((1, r2), (sp.Rational(3, 2), r3)):
        value = tidy_eccentricity(sp.expand(base * value), et)
        if value != 0:
            terms[lead + shift] = value * scale
    return PNSeries(terms, lead + SPINNING_KNOWN_THROUGH)


def _square_root(values: tuple[sp.Expr, sp.Expr, sp.Expr]) -> tuple[sp.Expr, sp.Expr, sp.Expr]:
    base, r2, r3 = values
    if sp.simplify(base - et**2) != 0:
        raise ArithmeticError(f"an eccentricity squared should start with et^2, got {base}")
    return et, r2 / 2, r3 / 2


@lru_cache(maxsize=1)
def aligned_spin_quasi_keplerian() -> QuasiKeplerianElements:
    """Quasi-Keplerian elements with aligned spins in ``x`` and the time eccentricity ``e_t``.

    Returns
    -------
    QuasiKeplerianElements
        ``variables="frequency"``, ``pn_order=1``; PN series in ``eps = sqrt(x)`` with absolute
        orders as in :func:`~stfalgebra.binary.keplerian.quasi_keplerian_from_frequency`
        (``n`` from ``x^(3/2)`` with ``c^3/(G m)``, ``a_r`` from ``x^-1`` with ``G m/c^2``,
        eccentricities and ``k`` from ``x^0``, ``E/mu`` from ``x`` with ``c^2``, ``J/mu`` from
        ``x^(-1/2)`` with ``G m/c``), coefficients in ``et``, nu, delta, chi1, chi2; each known
        through its leading order plus 3/2. The time eccentricity is the symbol ``et`` (exact).

    **Conventions**: module docstring; ``omega = (1 + k) n``, ``x = (G m omega/c^3)^(2/3)``.
    With ``chi1 = chi2 = 0`` the elements are those of
    :func:`~stfalgebra.binary.keplerian.quasi_keplerian_from_frequency` (tested).

    Example
    -------
    >>> from stfalgebra.symbols import delta, nu
    >>> q = aligned_spin_quasi_keplerian()
    >>> q.periastron_advance.coefficient(sp.Rational(3, 2)).subs({nu: 0, delta: 1, ExactPolynomial("chi2").to_sympy(): 0})
    -4*chi1/(1 - et**2)**(3/2)

    References
    ----------
    Derived here (module docstring); compare Konigsdorffer & Gopakumar, Phys. Rev. D 71, 024039
    (2005) (ADM-type coordinates; the invariant ``k`` and ``E(x, e_t)`` agree, from memory, not
    checked against the text).
    """
    converted = _reversion()
    return QuasiKeplerianElements(
        variables="frequency", pn_order=1,
        mean_motion=_series(converted["mean_motion"], sp.Rational(3, 2), c**3 / (G * m)),
        semi_major_axis=_series(converted["semi_major_axis"], -1, G * m / c**2),
        radial_eccentricity=_series(_square_root(converted["radial_eccentricity_squared"]), 0, 1),
        time_eccentricity=PNSeries({0: et}, SPINNING_KNOWN_THROUGH),
        angular_eccentricity=_series(_square_root(converted["angular_eccentricity_squared"]), 0, 1),
        periastron_advance=_series(converted["one_plus_periastron_advance"], 0, 1, relative_only=True),
        energy=_series(converted["energy"], 1, c**2),
        angular_momentum=_series(converted["angular_momentum"], -sp.Rational(1, 2), G * m / c),
    )
