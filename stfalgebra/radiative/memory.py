"""The non-linear memory from the energy radiated per solid angle, in modes and in STF terms.

The gravitational waves radiated by a source carry energy, and that energy flux sources, at
second order, a non-oscillating ("memory") part of the waveform. Its mode amplitudes are the
past integral of the energy radiated per unit retarded time and solid angle, projected on the
ordinary spherical harmonics (Thorne 1992; in modes, Favata 2009):

    h^mem_lm(u) = -(16 pi G/(c^4 R)) sqrt((l-2)!/(l+2)!) int_-inf^u du' int dOmega
                  dE/(du' dOmega) conj(Y_lm),
    dE/(du dOmega) = (R^2 c^3/(16 pi G)) |dh/du|^2,   h = sum h_lm (-2)Y_lm,

so that, with the modes themselves,

    dh^mem_lm/du = -(R/c) sqrt((l-2)!/(l+2)!) sum dh_l1m1/du conj(dh_l2m2/du) C(l1 m1, l2 m2; l m),
    C = int dOmega (-2)Y_l1m1 conj((-2)Y_l2m2) conj(Y_lm)      (m = m1 - m2)

(:func:`memory_rate`, :func:`memory_coupling`). The overall minus sign is the project's triad
(P = -e_Phi, Q = e_Theta; ``conventions.md``): in the (e_Theta, e_Phi) triad every h_lm flips and
the quadratic right-hand side does not, so the formula there carries a plus sign.

Fed with the modes of the linear waves, h_l'm' = -(G/(sqrt 2 R c^(l'+2))) [U_l'm' - (i/c) V_l'm']
with U_L' = M^(l')_L', V_L' = S^(l')_L', the formula gives the memory integrals of the radiative
moments, int M^(a)_A M^(b)_B, in STF form: :func:`memory_terms_from_flux` writes them as terms of
U_L, V_L in the split the MPM iteration prints (``stfalgebra radiative-moment``: the two
derivative orders as equal as possible; an integration by parts moves int X^(p) Y^(q) to
(-1)^(p-a) int X^(a) Y^(b) plus instantaneous terms). That is an independent route to the memory
terms of :mod:`stfalgebra.mpm`: the iteration integrates the quadratic source of the field
equations; this module integrates the flux over the sphere.

**Conventions**: ``conventions.md``: h = h_plus - i h_cross, the modes h_lm on (-2)Y_lm (Goldberg
et al. with the overall (-1)^m of the PN literature, :mod:`stfalgebra.stf.harmonics`), Y_lm with
the Condon-Shortley phase; G = c = R = 1 in the STF comparison (every term of one pair has the
same powers, checked by :func:`memory_terms_from_flux`).

References
----------
K. S. Thorne, Phys. Rev. D 45, 520 (1992) (the memory from the energy radiated per solid angle);
M. Favata, Phys. Rev. D 80, 024002 (2009), the memory in spin-weighted spherical-harmonic modes;
D. Christodoulou, Phys. Rev. Lett. 67, 1486 (1991).
"""

from __future__ import annotations

from fractions import Fraction
from functools import lru_cache
from itertools import product
from math import factorial
from typing import Mapping

from ..exact import SurdConstant
from ..lazy_sympy import sp

__all__ = [
    "wigner_3j_exact", "memory_coupling_surd", "memory_coupling", "memory_rate", "memory_prefactor", "MemoryTerm", "memory_terms_from_flux",
    "memory_pairs",
]


def _check_lm(l: int, m: int, lowest: int = 0) -> None:
    if isinstance(l, bool) or not isinstance(l, int) or isinstance(m, bool) or not isinstance(m, int):
        raise TypeError(f"l and m must be ints, got {l!r}, {m!r}")
    if l < lowest or abs(m) > l:
        raise ValueError(f"need l >= {lowest} and |m| <= l, got l = {l}, m = {m}")


@lru_cache(maxsize=None)
def wigner_3j_exact(j1: int, j2: int, j3: int, m1: int, m2: int, m3: int) -> SurdConstant:
    """The Wigner 3j symbol (j1 j2 j3; m1 m2 m3) of integer arguments, exact, without sympy.

    Racah's single sum:
    (-1)^(j1-j2-m3) sqrt(Delta prod_i (j_i+m_i)!(j_i-m_i)!) sum_k (-1)^k / [k! (j3-j2+k+m1)!
    (j3-j1+k-m2)! (j1+j2-j3-k)! (j1-k-m1)! (j2-k+m2)!], Delta = (j1+j2-j3)!(j1-j2+j3)!(-j1+j2+j3)!/
    (j1+j2+j3+1)!; zero off the selection rules (the tests compare it with sympy's).

    Example
    -------
    >>> wigner_3j_exact(2, 2, 2, 2, -2, 0)
    SurdConstant(1/35*sqrt(70))

    References
    ----------
    G. Racah, Phys. Rev. 62, 438 (1942); A. R. Edmonds, Angular Momentum in Quantum Mechanics (1957), eq. (3.7.3).
    """
    if (m1 + m2 + m3 != 0 or not abs(j1 - j2) <= j3 <= j1 + j2
            or any(abs(m) > j for j, m in ((j1, m1), (j2, m2), (j3, m3)))):
        return SurdConstant(0)
    f = factorial
    delta = Fraction(f(j1 + j2 - j3) * f(j1 - j2 + j3) * f(-j1 + j2 + j3), f(j1 + j2 + j3 + 1))
    weights = f(j1 + m1) * f(j1 - m1) * f(j2 + m2) * f(j2 - m2) * f(j3 + m3) * f(j3 - m3)
    total = Fraction(0)
    for k in range(max(0, j2 - j3 - m1, j1 - j3 + m2), min(j1 + j2 - j3, j1 - m1, j2 + m2) + 1):
        total += Fraction(1 - 2 * (k % 2), f(k) * f(j3 - j2 + k + m1) * f(j3 - j1 + k - m2) * f(j1 + j2 - j3 - k)
                          * f(j1 - k - m1) * f(j2 - k + m2))
    return SurdConstant((1 - 2 * ((j1 - j2 - m3) % 2)) * total, delta * weights)


@lru_cache(maxsize=None)
def memory_coupling_surd(l1: int, m1: int, l2: int, m2: int, l: int, m: int) -> SurdConstant:
    """sqrt(4 pi) times :func:`memory_coupling`, as an exact surd (no sympy): the coupling is
    (-1)^m1 sqrt((2l1+1)(2l2+1)(2l+1)/(4 pi)) (l1 l2 l; m1 -m2 -m) (l1 l2 l; 2 -2 0).

    Example
    -------
    >>> memory_coupling_surd(2, 2, 2, 2, 2, 0)
    SurdConstant(2/7*sqrt(5))
    """
    if m != m1 - m2:
        return SurdConstant(0)
    return (SurdConstant(1 - 2 * (m1 % 2), (2 * l1 + 1) * (2 * l2 + 1) * (2 * l + 1))
            * wigner_3j_exact(l1, l2, l, m1, -m2, -m) * wigner_3j_exact(l1, l2, l, 2, -2, 0))


@lru_cache(maxsize=None)
def memory_coupling(l1: int, m1: int, l2: int, m2: int, l: int, m: int):
    """The angular integral C = int dOmega (-2)Y_l1m1 conj((-2)Y_l2m2) conj(Y_lm), exact.

    Zero unless m = m1 - m2 and |l1 - l2| <= l <= l1 + l2. Written with Wigner 3j symbols,

        C = (-1)^(m1) sqrt((2l1+1)(2l2+1)(2l+1)/(4 pi)) (l1 l2 l; m1 -m2 -m) (l1 l2 l; 2 -2 0),

    from conj(sY_lm) = (-1)^(s+m) (-s)Y_l,-m and the integral of three spin-weighted harmonics
    (Goldberg et al. 1967); the tests compare it with the quadrature of the harmonics of
    :mod:`stfalgebra.stf.harmonics`.

    Example
    -------
    >>> memory_coupling(2, 2, 2, 2, 2, 0)
    sqrt(5)*sqrt(pi)/(7*pi)
    """
    from sympy.physics.wigner import wigner_3j

    for a, b in ((l1, m1), (l2, m2)):
        _check_lm(a, b, 2)
    _check_lm(l, m)
    if m != m1 - m2 or not abs(l1 - l2) <= l <= l1 + l2:
        return sp.Integer(0)
    value = (sp.Integer(-1) ** m1 * sp.sqrt(sp.Rational((2 * l1 + 1) * (2 * l2 + 1) * (2 * l + 1), 4) / sp.pi)
             * wigner_3j(l1, l2, l, m1, -m2, -m) * wigner_3j(l1, l2, l, 2, -2, 0))
    return sp.radsimp(value)


def memory_prefactor(l: int):
    """sqrt((l-2)!/(l+2)!), the weight of the l-th harmonic of the memory formula."""
    _check_lm(l, 0, 2)
    return sp.sqrt(sp.Rational(factorial(l - 2), factorial(l + 2)))


def memory_rate(l: int, m: int, hdot: Mapping[tuple[int, int], object]):
    """dh^mem_lm/du from the time derivatives of the modes (module docstring), G = c = R = 1.

    Parameters
    ----------
    l, m:
        The memory mode, l >= 2.
    hdot:
        ``{(l', m'): dh_l'm'/du}`` (sympy expressions or numbers); modes not given are zero.

    Returns
    -------
    sympy.Expr
        -sqrt((l-2)!/(l+2)!) sum_{A, B} hdot_A conj(hdot_B) C(A, B; l, m). Multiply by R/c
        (the modes carrying their 1/R) for physical units.

    Example
    -------
    >>> a = sp.Symbol("a", real=True)
    >>> memory_rate(2, 0, {(2, 2): a, (2, -2): a})   # a real
    -sqrt(30)*a**2/(42*sqrt(pi))
    """
    _check_lm(l, m, 2)
    total = sp.Integer(0)
    for (l1, m1), first in hdot.items():
        for (l2, m2), second in hdot.items():
            if m1 - m2 != m:
                continue
            coupling = memory_coupling(l1, m1, l2, m2, l, m)
            if coupling != 0:
                total += first * sp.conjugate(second) * coupling
    return sp.expand(-memory_prefactor(l) * total)


# ----------------------------------------------------------------- the STF form of the formula
class MemoryTerm(tuple):
    """(coefficient, factors, contractions, epsilon) of one memory term of U_L or V_L, in the
    form the MPM iteration prints: coefficient x int STF_L[...] of the two factors
    [type, rank, derivatives] (``stfalgebra.mpm.radiative_terms.RadiativeTerm``)."""

    __slots__ = ()

    def __new__(cls, coefficient: Fraction, factors: tuple, contractions: int, epsilon: int):
        return super().__new__(cls, (Fraction(coefficient), tuple(factors), contractions, epsilon))

    coefficient = property(lambda self: self[0])
    factors = property(lambda self: self[1])
    contractions = property(lambda self: self[2])
    epsilon = property(lambda self: self[3])


def _canonical_split(first: tuple[str, int], second: tuple[str, int], total: int) -> tuple[int, int]:
    """The derivative orders (a, b) of the MPM split: equal when the total is even, otherwise the
    extra one on the factor of higher rank, or on the second factor at equal rank."""
    half, odd = divmod(total, 2)
    if not odd:
        return half, half
    if first[1] > second[1]:
        return half + 1, half
    return half, half + 1


def memory_pairs(moment: str, l: int, pn_relative: Fraction) -> tuple[tuple[tuple[str, int], tuple[str, int], int, int], ...]:
    """Every pair of radiating moments whose memory can enter U_L (``"U"``) or V_L at exactly
    ``pn_relative``: ((type, rank), (type, rank), contractions, epsilon), each unordered pair once
    (mass before current, lower rank first).

    Powers of c: the formula's term in h_lm has G^2/(R c^(l1 + l2 + 5 + s)), s the number of
    current factors; the term of U_L at relative order n has G^2/(R c^(l + 2 + 2n)) (one more
    power for V_L). Parity: a term of U_L has an even number of current factors and epsilons.
    """
    if moment not in ("U", "V"):
        raise ValueError(f"moment must be 'U' or 'V', got {moment!r}")
    target = l + 2 + 2 * Fraction(pn_relative) + (moment == "V")
    if target.denominator != 1:
        return ()
    out = []
    types = (("M", 0), ("S", 1))
    for (t1, s1), (t2, s2) in ((types[0], types[0]), (types[0], types[1]), (types[1], types[1])):
        for p in range(2, int(target)):
            for q in range(p if t1 == t2 else 2, int(target)):
                if p + q + 5 + s1 + s2 != target:
                    continue
                for epsilon in (0, 1):
                    twice_k = p + q - l - epsilon
                    if twice_k < 0 or twice_k % 2 or twice_k // 2 > min(p, q) - epsilon:
                        continue
                    parity_ok = (s1 + s2 + epsilon + (moment == "V")) % 2 == 0
                    if parity_ok:
                        out.append(((t1, p), (t2, q), twice_k // 2, epsilon))
    return tuple(out)


def _sample_tensor(rank: int, seed: int) -> dict[int, object]:
    """Mode components a_m of a real STF tensor (a_{-m} = (-1)^m conj(a_m)), a fixed generic choice."""
    out = {0: sp.Integer(seed + rank)}
    for m in range(1, rank + 1):
        value = sp.Integer(1 + ((3 * m + seed) % 5)) + sp.I * sp.Integer((2 * m + 2 * seed) % 7 - 3)
        out[m] = value
        out[-m] = sp.Integer(-1) ** m * sp.conjugate(value)
    return out


def _polynomial_of(rank: int, components: Mapping[int, object]):
    """The polynomial T_L k_L of the STF tensor with mode components a_m = alpha^lm_L T_L."""
    from ..stf.harmonics import solid_harmonic

    return sp.expand(sum(value * solid_harmonic(rank, m) for m, value in components.items()))


@lru_cache(maxsize=None)
def _sphere_monomial(a: int, b: int, c: int):
    """int n1^a n2^b n3^c dOmega over the unit sphere (exact)."""
    if a % 2 or b % 2 or c % 2:
        return sp.Integer(0)
    return 2 * sp.gamma(sp.Rational(a + 1, 2)) * sp.gamma(sp.Rational(b + 1, 2)) * sp.gamma(
        sp.Rational(c + 1, 2)) / sp.gamma(sp.Rational(a + b + c + 3, 2))


def _project(polynomial, l: int, m: int):
    """int T(n) conj(Y_lm(n)) dOmega for a homogeneous polynomial T of degree l."""
    from ..stf.cartesian import PROBE
    from ..stf.harmonics import solid_harmonic

    harmonic = sp.Poly(sp.conjugate(solid_harmonic(l, m)), *PROBE).terms()
    terms = []
    for powers, coefficient in sp.Poly(polynomial, *PROBE).terms():
        for other, weight in harmonic:
            integral = _sphere_monomial(*(a + b for a, b in zip(powers, other)))
            if integral != 0:
                terms.append(coefficient * weight * integral)
    return sp.expand(sp.Add(*terms))


def _structure(first, second, contractions: int, epsilon: int, ranks: tuple[int, int]):
    """The polynomial STF_L[eps^epsilon A_{(a)KP} B_{(b)KQ}] n_L of two tensor polynomials."""
    from ..stf.cartesian import PROBE

    p, q = ranks
    k = contractions

    def contract(x, y, depth):
        if depth == 0:
            return x * y
        return sum(contract(sp.diff(x, probe), sp.diff(y, probe), depth - 1) for probe in PROBE)

    scale = sp.Rational(factorial(p - k - epsilon) * factorial(q - k - epsilon), factorial(p) * factorial(q))
    if not epsilon:
        return sp.expand(scale * contract(first, second, k))
    n = PROBE
    total = 0
    for i, a, b in product(range(3), repeat=3):
        sign = sp.LeviCivita(i, a, b)
        if sign:
            total += sign * n[i] * contract(sp.diff(first, n[a]), sp.diff(second, n[b]), k)
    return sp.expand(scale * total)


def _mode_of_moment(kind: str, l: int):
    """The factor turning alpha^lm_L U_L (or V_L) into h_lm, G = R = c = 1 (``conventions.md``)."""
    if kind == "M":
        return -sp.Rational(4, factorial(l)) * sp.sqrt(sp.Rational((l + 1) * (l + 2), 2 * l * (l - 1))) / sp.sqrt(2)
    return -sp.I * sp.Rational(8, factorial(l)) * sp.sqrt(sp.Rational(l * (l + 2), 2 * (l + 1) * (l - 1))) / sp.sqrt(2)


@lru_cache(maxsize=None)
def memory_terms_from_flux(moment: str, l: int, pn_relative: Fraction) -> tuple[MemoryTerm, ...]:
    """The memory terms of U_L (``"U"``) or V_L at exactly ``pn_relative``, from the memory formula.

    For every pair of :func:`memory_pairs`, the formula's part of h_lm from the linear modes of
    the two moments (the time derivative of a radiative moment being M^(l'+1)_L' or S^(l'+1)_L')
    is compared, for every m, with the mode of one STF structure; their ratio, the same for every
    m (checked; a ``ValueError`` otherwise), is the coefficient. The derivative orders are moved
    to the MPM split by parts (module docstring). A pair whose coefficient is zero is returned
    with coefficient 0.

    Example
    -------
    >>> [(str(t.coefficient), t.factors) for t in memory_terms_from_flux("U", 4, Fraction(3, 2))]
    [('2/5', (('M', 2, 3), ('M', 2, 3)))]

    References
    ----------
    Thorne, Phys. Rev. D 45, 520 (1992); Favata, Phys. Rev. D 80, 024002 (2009), eq. for h^mem_lm
    in modes; the MPM memory terms it reproduces: Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 3.
    """
    out = []
    for first, second, contractions, epsilon in memory_pairs(moment, l, Fraction(pn_relative)):
        same = first == second
        a_modes = _sample_tensor(first[1], 1)
        b_modes = a_modes if same else _sample_tensor(second[1], 2)
        derivatives = first[1] + second[1] + 2
        a_order, b_order = _canonical_split(first, second, derivatives)
        sign = (-1) ** (first[1] + 1 - a_order)
        hdot_a = {(first[1], m): _mode_of_moment(first[0], first[1]) * v for m, v in a_modes.items()}
        hdot_b = {(second[1], m): _mode_of_moment(second[0], second[1]) * v for m, v in b_modes.items()}
        structure = _structure(_polynomial_of(first[1], a_modes), _polynomial_of(second[1], b_modes),
                               contractions, epsilon, (first[1], second[1]))
        ratio = None
        for m in range(0, l + 1):   # real tensors: m < 0 is the conjugate of m > 0
            if same:
                formula = memory_rate(l, m, hdot_a)
            else:
                both = {key: hdot_a.get(key, 0) + hdot_b.get(key, 0) for key in {**hdot_a, **hdot_b}}
                formula = (memory_rate(l, m, both) - memory_rate(l, m, hdot_a)
                           - memory_rate(l, m, hdot_b))
            formula = sp.expand(sign * formula)
            mpm = sp.expand(_mode_of_moment("M" if moment == "U" else "S", l) * _project(structure, l, m))
            if ratio is None and mpm != 0:
                # the ratio is rational: read it off at 60 digits, then check it exactly below
                ratio = Fraction(str(sp.nsimplify(sp.re(sp.N(formula / mpm, 60)), rational=True,
                                                  tolerance=sp.Rational(1, 10**40)))).limit_denominator(10**9)
            difference = sp.expand(formula - sp.Rational(ratio.numerator, ratio.denominator) * mpm
                                   if ratio is not None else formula)
            if difference != 0 and sp.simplify(difference) != 0:
                raise ValueError(f"the memory formula is not proportional to the STF structure {first} x {second} "
                                 f"at (l, m) = ({l}, {m})")
        coefficient = Fraction(0) if ratio is None else ratio
        out.append(MemoryTerm(coefficient, ((first[0], first[1], a_order), (second[0], second[1], b_order)),
                              contractions, epsilon))
    return tuple(out)
