"""Exact functions on the quasi-Keplerian orbit: polynomials over fixed denominators.

A function of the eccentric anomaly ``u`` on the orbit of time eccentricity ``e`` (= ``e_t``) and
frequency parameter ``x``, through a given power of ``sqrt(x)``, is held as

    N(I, sin u, beta, delta, cos u, e, nu, sqrt(x)) / ((1 - e cos u)^K (1 - e^2)^J),

``beta = sqrt(1 - e^2)``, ``N`` a polynomial with rational coefficients (python-flint
``fmpq_mpoly``, lexicographic order ``I > sin u > beta > delta > cos u > e > nu > sqrt(x)``) in the
normal form modulo

    I^2 + 1,   sin^2 u + cos^2 u - 1,   beta^2 + e^2 - 1,   delta^2 + 4 nu - 1

(their leading monomials are coprime: a Groebner basis, so the remainder is unique), and terms
beyond the kept power of ``sqrt(x)`` dropped. ``N`` is then a combination of the basis
``{1, I} x {1, sin u} x {1, beta} x {1, delta}`` with polynomial coefficients in
``cos u, e, nu, sqrt(x)``; dividing by ``1 - e cos u`` or ``1 - e^2`` (which do not hold the basis
generators) preserves the normal form, so the representation with the smallest ``K, J`` is
canonical and :meth:`OrbitFunction.tidy` finds it by exact polynomial division. No ``simplify``,
no gcd of multivariate fractions: products and sums only multiply by the known denominators.

:func:`orbit_variables` gives the dimensionless orbit variables of the 1PN quasi-Keplerian orbit
(harmonic coordinates, :func:`~stfalgebra.binary.keplerian.quasi_keplerian_from_frequency`) in
this form, with ``G = 1``:

    r = (m/(c^2 x)) R,   rdot = c sqrt(x) V_r,   phidot = (c^3 x^(3/2)/m) V_phi,

so that ``m/r = c^2 x/R`` and ``r phidot = c sqrt(x) R V_phi``.
"""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction
from functools import lru_cache
from typing import Any, Iterable

import flint
import sympy as sp

from ..orders import PNOrder
from ..symbols import et, nu
from .keplerian import quasi_keplerian_from_frequency, u

__all__ = ["ANOMALY_GENERATORS", "OrbitFunction", "OrbitVariables", "orbit_variables",
           "from_eccentricity_expression"]

#: Generators of the numerator ring, in their lexicographic order (``y = sqrt(x)``).
ANOMALY_GENERATORS = ("I", "sin_u", "beta", "delta", "cos_u", "et", "nu", "y")
_CTX = flint.fmpq_mpoly_ctx.get(ANOMALY_GENERATORS, "lex")
_I, _S, _B, _DELTA, _C, _E, _NU, _Y = _CTX.gens()
_RULES = (_I**2 + 1, _S**2 + _C**2 - 1, _B**2 + _E**2 - 1, _DELTA**2 + 4 * _NU - 1)
_RADIAL = 1 - _E * _C          # 1 - e cos u
_ECCENTRIC = 1 - _E**2         # 1 - e^2
_Y_INDEX = ANOMALY_GENERATORS.index("y")


def _normal(poly: flint.fmpq_mpoly, known: int) -> flint.fmpq_mpoly:
    for rule in _RULES:
        poly = divmod(poly, rule)[1]
    if known >= 0 and not poly.is_zero() and poly.degrees()[_Y_INDEX] > known:
        poly = divmod(poly, _Y ** (known + 1))[1]
    return poly


def _lowest_y(poly: flint.fmpq_mpoly) -> int | None:
    if poly.is_zero():
        return None
    return min(int(exponents[_Y_INDEX]) for exponents in poly.monoms())


@dataclass(frozen=True, eq=False)
class OrbitFunction:
    """``numerator / ((1 - e cos u)^radial (1 - e^2)^eccentric)``, known through ``y^known``.

    Build with :meth:`constant`, :meth:`generator` or :func:`from_eccentricity_expression`;
    the arithmetic keeps the numerator in the normal form of the module docstring.
    ``known`` is the highest power of ``y = sqrt(x)`` that is determined (a large value for
    exact functions).

    **Conventions**: ``beta = sqrt(1 - et^2) > 0``, ``y = sqrt(x) > 0``; module docstring.

    Example
    -------
    >>> cos_u, sin_u = OrbitFunction.generator("cos_u"), OrbitFunction.generator("sin_u")
    >>> cos_u * cos_u + sin_u * sin_u == OrbitFunction.constant(1)
    True
    >>> (1 - OrbitFunction.generator("et") * cos_u).over(radial=2).to_sympy()
    1/(-et*cos(u) + 1)

    References
    ----------
    Common practice (normal forms modulo a Groebner basis).
    """

    numerator: flint.fmpq_mpoly
    radial: int
    eccentric: int
    known: int

    # -- construction ---------------------------------------------------------------------
    @classmethod
    def _make(cls, numerator: flint.fmpq_mpoly, radial: int, eccentric: int, known: int) -> OrbitFunction:
        if radial < 0:
            numerator, radial = numerator * _RADIAL ** (-radial), 0
        if eccentric < 0:
            numerator, eccentric = numerator * _ECCENTRIC ** (-eccentric), 0
        return cls(_normal(numerator, known), radial, eccentric, known)

    @classmethod
    def constant(cls, value: Any, known: int = 10**6) -> OrbitFunction:
        """A rational constant."""
        if hasattr(value, "p") and hasattr(value, "q"):      # sympy Rational
            value = Fraction(int(value.p), int(value.q))
        fraction = Fraction(value)
        return cls._make(_CTX.from_dict({}) + flint.fmpq(fraction.numerator, fraction.denominator),
                         0, 0, known)

    @classmethod
    def generator(cls, name: str, known: int = 10**6) -> OrbitFunction:
        """One generator of :data:`ANOMALY_GENERATORS`, or ``"inverse_radial"`` for
        ``1/(1 - e cos u)``."""
        if name == "inverse_radial":
            return cls._make(_CTX.from_dict({}) + 1, 1, 0, known)
        return cls._make(_CTX.gens()[ANOMALY_GENERATORS.index(name)], 0, 0, known)

    # -- arithmetic -----------------------------------------------------------------------
    def _lifted(self, radial: int, eccentric: int) -> flint.fmpq_mpoly:
        return (self.numerator * _RADIAL ** (radial - self.radial)
                * _ECCENTRIC ** (eccentric - self.eccentric))

    def _coerce(self, other: Any) -> OrbitFunction:
        return other if isinstance(other, OrbitFunction) else OrbitFunction.constant(other)

    def __add__(self, other: Any) -> OrbitFunction:
        other = self._coerce(other)
        radial, eccentric = max(self.radial, other.radial), max(self.eccentric, other.eccentric)
        return OrbitFunction._make(self._lifted(radial, eccentric) + other._lifted(radial, eccentric),
                                   radial, eccentric, min(self.known, other.known))

    __radd__ = __add__

    def __neg__(self) -> OrbitFunction:
        return OrbitFunction(-self.numerator, self.radial, self.eccentric, self.known)

    def __sub__(self, other: Any) -> OrbitFunction:
        return self + (-self._coerce(other))

    def __rsub__(self, other: Any) -> OrbitFunction:
        return self._coerce(other) + (-self)

    def lowest_order(self) -> int | None:
        """The lowest power of ``y`` present (None for zero)."""
        return _lowest_y(self.numerator)

    def __mul__(self, other: Any) -> OrbitFunction:
        other = self._coerce(other)
        # a product is known through min(known_a + low_b, known_b + low_a)
        low_a, low_b = self.lowest_order(), other.lowest_order()
        known = min(self.known + (low_b if low_b is not None else 10**6),
                    other.known + (low_a if low_a is not None else 10**6))
        return OrbitFunction._make(self.numerator * other.numerator, self.radial + other.radial,
                                   self.eccentric + other.eccentric, known)

    __rmul__ = __mul__

    def __pow__(self, exponent: int) -> OrbitFunction:
        if isinstance(exponent, bool) or not isinstance(exponent, int) or exponent < 0:
            raise ValueError(f"exponent must be a non-negative int, got {exponent!r}")
        result = OrbitFunction.constant(1)
        for _ in range(exponent):
            result = result * self
        return result

    def over(self, radial: int = 0, eccentric: int = 0) -> OrbitFunction:
        """Divided by ``(1 - e cos u)^radial (1 - e^2)^eccentric`` (negative: multiplied)."""
        return OrbitFunction._make(self.numerator, self.radial + radial, self.eccentric + eccentric,
                                   self.known)

    def truncated(self, known: int) -> OrbitFunction:
        """Terms through ``y^known`` only."""
        return OrbitFunction._make(self.numerator, self.radial, self.eccentric, min(known, self.known))

    def series(self, coefficients: Iterable[Any]) -> OrbitFunction:
        """``sum_k a_k t^k`` for this ``t`` (no ``y^0`` term: the sum stops at the known order)."""
        low = self.lowest_order()
        if low == 0:
            raise ValueError("a series in t needs t = O(sqrt(x))")
        total, power = OrbitFunction.constant(0, self.known), OrbitFunction.constant(1)
        for k, coefficient in enumerate(coefficients):
            if k and (low is None or k * low > self.known):
                break
            if k:
                power = power * self
            total = total + power * coefficient
        return total

    # -- canonical form and read-out ------------------------------------------------------
    def tidy(self) -> OrbitFunction:
        """The representation with the smallest ``(radial, eccentric)`` (canonical)."""
        numerator, radial, eccentric = self.numerator, self.radial, self.eccentric
        if numerator.is_zero():
            return OrbitFunction(numerator, 0, 0, self.known)
        for attr in ("radial", "eccentric"):
            factor = _RADIAL if attr == "radial" else _ECCENTRIC
            while (radial if attr == "radial" else eccentric) > 0:
                quotient, remainder = divmod(numerator, factor)
                if not remainder.is_zero():
                    break
                numerator = quotient
                if attr == "radial":
                    radial -= 1
                else:
                    eccentric -= 1
        return OrbitFunction(numerator, radial, eccentric, self.known)

    def coefficient(self, power: int) -> OrbitFunction:
        """The coefficient of ``y^power`` (tidied, exact)."""
        if power > self.known:
            raise ValueError(f"y^{power} is beyond the known order y^{self.known}")
        terms = {tuple(e[:_Y_INDEX]) + (0,): c for e, c in self.numerator.to_dict().items()
                 if int(e[_Y_INDEX]) == power}
        return OrbitFunction(_CTX.from_dict(terms) if terms else _CTX.from_dict({}),
                             self.radial, self.eccentric, 10**6).tidy()

    def is_zero(self) -> bool:
        return self.numerator.is_zero()

    def __eq__(self, other: object) -> bool:
        if not isinstance(other, OrbitFunction):
            return NotImplemented
        difference = self - other
        return difference.numerator.is_zero()

    def __hash__(self) -> int:  # canonical after tidy
        tidy = self.tidy()
        return hash((str(tidy.numerator), tidy.radial, tidy.eccentric))

    def to_sympy(self, frequency: sp.Expr | None = None, delta: sp.Expr | None = None) -> sp.Expr:
        """The sympy expression in ``cos(u), sin(u), sqrt(1 - et**2), nu, delta, x``."""
        from ..symbols import delta as delta_symbol
        from ..symbols import x

        tidy = self.tidy()
        values = (sp.I, sp.sin(u), sp.sqrt(1 - et**2), delta if delta is not None else delta_symbol,
                  sp.cos(u), et, nu, sp.sqrt(frequency if frequency is not None else x))
        terms = []
        for exponents, coefficient in tidy.numerator.to_dict().items():
            term = sp.Rational(int(coefficient.p), int(coefficient.q))
            for value, power in zip(values, exponents):
                if power:
                    term *= value ** int(power)
            terms.append(term)
        denominator = (1 - et * sp.cos(u)) ** tidy.radial * (1 - et**2) ** tidy.eccentric
        return sp.Add(*terms) / denominator

    def __repr__(self) -> str:
        tidy = self.tidy()
        return (f"OrbitFunction(({tidy.numerator})/((1 - et*cos_u)^{tidy.radial} "
                f"(1 - et^2)^{tidy.eccentric}), known through y^{self.known})")


def from_eccentricity_expression(expr: Any, known: int = 10**6) -> OrbitFunction:
    """A sympy expression rational in ``et``, ``nu`` and ``sqrt(1 - et**2)`` whose denominator is
    a power of ``1 - et**2`` times a constant, as an :class:`OrbitFunction`.

    Raises
    ------
    ValueError
        Another denominator or symbol.

    Example
    -------
    >>> from_eccentricity_expression(3 / (1 - et**2))
    OrbitFunction((3)/((1 - et*cos_u)^0 (1 - et^2)^1), known through y^1000000)
    """
    beta = sp.Dummy("beta")
    value = sp.sympify(expr).subs(sp.sqrt(1 - et) * sp.sqrt(1 + et), sp.sqrt(1 - et**2))
    # odd powers of sqrt(1 - et^2) become powers of beta; whole powers of 1 - et^2 stay
    value = value.replace(lambda p: p.is_Pow and p.base == 1 - et**2 and not p.exp.is_Integer
                          and (2 * p.exp).is_Integer, lambda p: beta ** int(2 * p.exp))
    numerator, denominator = sp.fraction(sp.cancel(sp.together(value)))
    power = 0
    remaining = sp.Poly(denominator, et, beta)
    while remaining.degree(et) > 0 or remaining.degree(beta) > 0:
        quotient, remainder = sp.div(remaining, sp.Poly(1 - et**2, et, beta))
        if not remainder.is_zero:
            raise ValueError(f"denominator {denominator} is not a power of 1 - et**2")
        remaining, power = quotient, power + 1
    scale = remaining.as_expr()
    if not scale.is_Rational:
        raise ValueError(f"denominator {denominator} is not a power of 1 - et**2")
    names = (beta, et, nu)
    poly = sp.Poly(sp.expand(numerator / scale), *names)
    if poly.free_symbols - set(names):
        raise ValueError(f"{expr} holds symbols other than et, nu, sqrt(1 - et**2)")
    terms = {}
    for (b_power, e_power, nu_power), coefficient in poly.terms():
        rational = sp.Rational(coefficient)
        key = (0, 0, int(b_power), 0, 0, int(e_power), int(nu_power), 0)
        terms[key] = flint.fmpq(int(rational.p), int(rational.q))
    return OrbitFunction._make(_CTX.from_dict(terms), 0, power, known)


@dataclass(frozen=True)
class OrbitVariables:
    """The dimensionless orbit variables (module docstring) through ``y^known``.

    Attributes
    ----------
    radius, inverse_radius, radial_velocity, angular_velocity:
        ``R``, ``1/R``, ``V_r``, ``V_phi``.
    """

    radius: OrbitFunction
    inverse_radius: OrbitFunction
    radial_velocity: OrbitFunction
    angular_velocity: OrbitFunction


def _element_series(series, scale: sp.Expr, lead: Any, known: int) -> OrbitFunction:
    """A quasi-Keplerian element (PNSeries in sqrt(x), absolute orders from ``lead``) divided by
    its dimensionful ``scale`` and by ``x^lead``: a series in ``y`` from ``y^0``."""
    total = OrbitFunction.constant(0, known)
    y = OrbitFunction.generator("y")
    for order, coefficient in series.terms.items():
        power = int(2 * (sp.Rational(order.numerator, order.denominator) - sp.Rational(lead)))
        if power > known:
            continue
        value = sp.cancel(coefficient / scale)
        total = total + from_eccentricity_expression(value) * y**power
    return total.truncated(known)


@lru_cache(maxsize=None)
def orbit_variables(pn: PNOrder) -> OrbitVariables:
    """``R, 1/R, V_r, V_phi`` on the quasi-Keplerian orbit through relative order ``pn``.

    Parameters
    ----------
    pn:
        0, 1/2 or 1 (the elements are entered through 1PN).

    Returns
    -------
    OrbitVariables
        Known through ``y^(2 pn)``.

    **Conventions**: harmonic coordinates, ``G = 1``, time eccentricity ``et``, periastron at
    ``u = 0``: ``R = (c^2 x/m) a_r (1 - e_r cos u)``, ``V_r = a_r e_r n sin u/(c sqrt(x) (1 - et
    cos u))``, ``V_phi = (m/(c^3 x^(3/2))) (1 + k) n sqrt(1 - e_phi^2)/((1 - e_phi cos u)(1 - et
    cos u))``, where ``(1 + k) n = c^3 x^(3/2)/m`` exactly (definition of ``x``).

    Example
    -------
    >>> orbit_variables(PNOrder(0)).angular_velocity
    OrbitFunction((beta)/((1 - et*cos_u)^2 (1 - et^2)^0), known through y^0)

    References
    ----------
    Damour & Deruelle, Ann. Inst. H. Poincare 43, 107 (1985) (1PN quasi-Keplerian
    representation), with the elements of
    :func:`~stfalgebra.binary.keplerian.quasi_keplerian_from_frequency`.
    """
    known = PNOrder(pn).twice
    if known < 0 or known > 2:
        raise ValueError(f"the quasi-Keplerian orbit is entered through 1PN, got pn = {pn}")
    elements = quasi_keplerian_from_frequency(1)
    axis = _element_series(elements.semi_major_axis, elements.semi_major_axis.coefficient(-1), -1, known)
    motion = _element_series(elements.mean_motion, elements.mean_motion.coefficient(sp.Rational(3, 2)),
                             sp.Rational(3, 2), known)
    e_r = _element_series(elements.radial_eccentricity, 1, 0, known)
    e_phi = _element_series(elements.angular_eccentricity, 1, 0, known)
    cos_u, sin_u, ecc = (OrbitFunction.generator(name) for name in ("cos_u", "sin_u", "et"))
    beta = OrbitFunction.generator("beta")
    radius = (axis * (1 - e_r * cos_u)).truncated(known)
    # 1/R = a_r^(-1) (1 - e cos u)^(-1) / (1 - (e_r - e) cos u/(1 - e cos u))
    inverse_axis = (axis - 1).series([(-1) ** k for k in range(known + 1)])
    inverse_radius = (inverse_axis * ((e_r - ecc) * cos_u).over(radial=1).series([1] * (known + 1))
                      ).over(radial=1).truncated(known)
    radial_velocity = (axis * motion * e_r * sin_u).over(radial=1).truncated(known)
    # sqrt(1 - e_phi^2) = beta sqrt(1 - t), t = (e_phi^2 - e^2)/(1 - e^2)
    t = (e_phi * e_phi - ecc * ecc).over(eccentric=1)
    root = beta * t.series([sp.binomial(sp.Rational(1, 2), k) * (-1) ** k for k in range(known + 1)])
    inverse_phi = ((e_phi - ecc) * cos_u).over(radial=1).series([1] * (known + 1)).over(radial=1)
    angular_velocity = (root * inverse_phi).over(radial=1).truncated(known)
    return OrbitVariables(radius, inverse_radius, radial_velocity, angular_velocity)
