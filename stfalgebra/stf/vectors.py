"""Abstract Euclidean 3-vectors: named symbols, optional explicit components, cross products.

A :class:`Vector` is a name (and optionally three exact components). Scalars built from
vectors are sympy expressions:

- ``dot(a, b)`` is the real symbol ``a.b`` (names in sorted order), 1 for ``dot(n, n)`` with a
  unit vector ``n``, and the explicit sum a_i b_i when both vectors carry components;
- ``triple_product(a, b, c)`` = a.(b x c) is the real symbol ``[a,b,c]`` with the names sorted
  and the sign of the sorting permutation in front, zero when a name repeats, and the explicit
  determinant when all three vectors carry components;
- ``cross(a, b)`` is a derived vector whose dot products follow from
  (a x b).a = 0, (a x b).c = [a, b, c] and (a x b).(c x d) = (a.c)(b.d) - (a.d)(b.c).

Names identify vectors: two vectors with the same name stand for the same vector, and the scalar
symbols of abstract vectors are built from the names. Names must be Python identifiers.

Conventions
-----------
Flat Euclidean 3-space, right-handed Levi-Civita symbol, eps_123 = +1, so
(a x b)_i = eps_ijk a_j b_k and [a, b, c] = eps_ijk a_i b_j c_k.

References
----------
K. S. Thorne, Rev. Mod. Phys. 52, 299 (1980), Sec. II (Cartesian tensors, eps_ijk).
"""

from __future__ import annotations

from typing import Iterable

import sympy as sp

__all__ = ["Vector", "dot", "cross", "triple_product", "probe_projection", "PROBE_NORM"]

# The probe vector k of the tensor polynomials appears in displays as k.a and k.k.
_PROBE_NAME = "k"

#: Display symbol for k.k = |k|^2 (a delta_ij pair of a symmetric tensor polynomial).
PROBE_NORM: sp.Symbol = sp.Symbol(f"{_PROBE_NAME}.{_PROBE_NAME}", nonnegative=True)

# Symbols reserved for the probe vector, which components must not contain.
_PROBE_COMPONENT_NAMES = frozenset({"k1", "k2", "k3"})


def _exact(value: object, what: str) -> sp.Expr:
    try:
        expression = sp.sympify(value, strict=True)
    except sp.SympifyError as exc:
        raise TypeError(f"{what} must be a sympy expression or number, got {value!r}") from exc
    if not isinstance(expression, sp.Expr):
        raise TypeError(f"{what} must be a scalar expression, got {value!r}")
    if expression.has(sp.Float):
        raise ValueError(f"{what} must be exact (use sympy.Rational, not a float), got {value!r}")
    return expression


class Vector:
    """A Euclidean 3-vector: a name, optionally unit length, optionally explicit components.

    Parameters
    ----------
    name : str
        A Python identifier naming the vector (e.g. ``"n"``, ``"v"``, ``"x1"``).
    unit : bool, keyword-only
        True for a unit vector: then ``dot(n, n) == 1``.
    components : tuple of three sympy expressions or None, keyword-only
        Exact Cartesian components (no floats, no probe symbols k1, k2, k3). With components,
        dot and triple products with other component vectors evaluate explicitly.

    Raises
    ------
    TypeError
        If ``name`` is not a string, ``unit`` not a bool, or a component is not an expression.
    ValueError
        If ``name`` is not an identifier, ``components`` has not three entries, a component is a
        float or contains k1, k2, k3, or ``unit=True`` with components of numeric norm != 1.

    Conventions
    -----------
    Frozen and hashable; equality is structural (name, unit flag, components, and for a cross
    product its two factors). Derived vectors from :func:`cross` are named ``(a x b)``.

    Examples
    --------
    >>> n = Vector("n", unit=True)
    >>> dot(n, n)
    1
    >>> x = Vector("x", components=(1, 2, 2))
    >>> dot(x, x)
    9

    References
    ----------
    Thorne, Rev. Mod. Phys. 52, 299 (1980), Sec. II.
    """

    __slots__ = ("_name", "_unit", "_components", "_factors", "_hash", "_sort_key")

    def __init__(
        self,
        name: str,
        *,
        unit: bool = False,
        components: tuple | None = None,
    ) -> None:
        if not isinstance(name, str):
            raise TypeError(f"vector name must be a string, got {name!r}")
        if not name.isidentifier():
            raise ValueError(f"vector name must be a Python identifier, got {name!r}")
        if not isinstance(unit, bool):
            raise TypeError(f"unit must be a bool, got {unit!r}")
        checked = None
        if components is not None:
            if isinstance(components, (str, bytes)) or not isinstance(components, Iterable):
                raise TypeError(f"components must be a tuple of three expressions, got {components!r}")
            entries = tuple(components)
            if len(entries) != 3:
                raise ValueError(f"a vector has three components, got {len(entries)}: {components!r}")
            checked = tuple(_exact(entry, f"component of vector {name!r}") for entry in entries)
            for entry in checked:
                if any(s.name in _PROBE_COMPONENT_NAMES for s in entry.free_symbols):
                    raise ValueError(
                        f"components of vector {name!r} must not contain the probe symbols "
                        f"k1, k2, k3, got {components!r}"
                    )
            if unit:
                _check_unit_norm(name, checked)
        self._init(name, unit, checked, None)

    def _init(
        self,
        name: str,
        unit: bool,
        components: tuple[sp.Expr, sp.Expr, sp.Expr] | None,
        factors: tuple[Vector, Vector] | None,
    ) -> None:
        setter = object.__setattr__
        setter(self, "_name", name)
        setter(self, "_unit", unit)
        setter(self, "_components", components)
        setter(self, "_factors", factors)
        setter(self, "_hash", hash((name, unit, components, factors)))
        setter(self, "_sort_key", (name, "" if components is None else str(components), unit))

    @classmethod
    def _unchecked(
        cls,
        name: str,
        unit: bool,
        components: tuple[sp.Expr, sp.Expr, sp.Expr] | None,
        factors: tuple[Vector, Vector] | None,
    ) -> Vector:
        """Internal constructor: no validation (hot paths and derived vectors)."""
        vector = cls.__new__(cls)
        vector._init(name, unit, components, factors)
        return vector

    def __setattr__(self, key: str, value: object) -> None:
        raise AttributeError("Vector is immutable")

    def __delattr__(self, key: str) -> None:
        raise AttributeError("Vector is immutable")

    @property
    def name(self) -> str:
        """The vector's name (``(a x b)`` for a cross product)."""
        return self._name

    @property
    def unit(self) -> bool:
        """True for a unit vector."""
        return self._unit

    @property
    def components(self) -> tuple[sp.Expr, sp.Expr, sp.Expr] | None:
        """The explicit Cartesian components, or None for an abstract vector."""
        return self._components

    @property
    def factors(self) -> tuple[Vector, Vector] | None:
        """``(a, b)`` for the cross product ``a x b``, None for a named vector."""
        return self._factors

    @property
    def sort_key(self) -> tuple:
        """Deterministic ordering key (name first); used for canonical forms."""
        return self._sort_key

    def __eq__(self, other: object) -> bool:
        if self is other:
            return True
        if not isinstance(other, Vector):
            return NotImplemented
        return (
            self._hash == other._hash
            and self._name == other._name
            and self._unit == other._unit
            and self._components == other._components
            and self._factors == other._factors
        )

    def __hash__(self) -> int:
        return self._hash

    def __lt__(self, other: Vector) -> bool:
        if not isinstance(other, Vector):
            return NotImplemented
        return self._sort_key < other._sort_key

    def __repr__(self) -> str:
        if self._factors is not None:
            return f"cross({self._factors[0]!r}, {self._factors[1]!r})"
        extras = ""
        if self._unit:
            extras += ", unit=True"
        if self._components is not None:
            extras += f", components={self._components!r}"
        return f"Vector({self._name!r}{extras})"

    def __str__(self) -> str:
        return self._name

    def __reduce__(self):
        return (_rebuild_vector, (self._name, self._unit, self._components, self._factors))


def _rebuild_vector(name, unit, components, factors) -> Vector:
    return Vector._unchecked(name, unit, components, factors)


def _check_unit_norm(name: str, components: tuple[sp.Expr, ...]) -> None:
    norm_squared = sp.expand(sum(entry**2 for entry in components))
    if norm_squared == 1:
        return
    # symbolic components (cos phi, sin phi, 0) need simplify to see the 1; a norm that
    # stays symbolic after it cannot be decided here and is accepted
    reduced = sp.simplify(norm_squared - 1)
    if reduced.is_number and reduced != 0:
        raise ValueError(
            f"unit vector {name!r} has components {components!r} of squared norm {norm_squared}"
        )


def _require_vector(value: object, role: str) -> Vector:
    if not isinstance(value, Vector):
        raise TypeError(f"{role} must be a Vector, got {value!r}")
    return value


# Symbols are cached so that repeated dot products do not rebuild them.
_dot_symbols: dict[tuple[str, str], sp.Symbol] = {}
_triple_symbols: dict[tuple[str, str, str], sp.Symbol] = {}
_probe_symbols: dict[str, sp.Symbol] = {}


def _dot_symbol(a: Vector, b: Vector) -> sp.Symbol:
    first, second = (a.name, b.name) if a.sort_key <= b.sort_key else (b.name, a.name)
    key = (first, second)
    symbol = _dot_symbols.get(key)
    if symbol is None:
        if first == second:
            symbol = sp.Symbol(f"{first}.{second}", positive=True)
        else:
            symbol = sp.Symbol(f"{first}.{second}", real=True)
        _dot_symbols[key] = symbol
    return symbol


def dot(a: Vector, b: Vector) -> sp.Expr:
    """The Euclidean scalar product a.b.

    Parameters
    ----------
    a, b : Vector
        The two vectors (named, with components, or cross products).

    Returns
    -------
    sympy.Expr
        1 for a unit vector with itself; the expanded sum a_i b_i if both carry components;
        the triple product or the Binet-Cauchy identity for cross products; otherwise the real
        symbol ``a.b`` (names sorted; positive for ``a.a``).

    Raises
    ------
    TypeError
        If either argument is not a :class:`Vector`.

    Conventions
    -----------
    (a x b).c = [a, b, c]; (a x b).(c x d) = (a.c)(b.d) - (a.d)(b.c). A vector with components
    and a vector without them give the abstract symbol.

    Examples
    --------
    >>> a, b = Vector("a"), Vector("b")
    >>> dot(b, a)
    a.b
    >>> dot(cross(a, b), a)
    0

    References
    ----------
    Thorne, Rev. Mod. Phys. 52, 299 (1980), Sec. II (eps-delta identities).
    """
    _require_vector(a, "first argument of dot")
    _require_vector(b, "second argument of dot")
    if a == b and a.unit:
        return sp.Integer(1)
    if a.components is not None and b.components is not None:
        return sp.expand(sum((p * q for p, q in zip(a.components, b.components)), sp.Integer(0)))
    if a.factors is not None:
        return triple_product(a.factors[0], a.factors[1], b)
    if b.factors is not None:
        return triple_product(b.factors[0], b.factors[1], a)
    return _dot_symbol(a, b)


def cross(a: Vector, b: Vector) -> Vector:
    """The cross product a x b as a derived :class:`Vector`.

    Parameters
    ----------
    a, b : Vector
        The factors, in order.

    Returns
    -------
    Vector
        A vector named ``(a x b)`` that remembers its factors (its dot products follow from
        them); with explicit components when both factors have components.

    Raises
    ------
    TypeError
        If either argument is not a :class:`Vector`.

    Conventions
    -----------
    (a x b)_i = eps_ijk a_j b_k, eps_123 = +1. ``cross(b, a)`` is a different vector from
    ``cross(a, b)`` (its negative); tensors built on cross products put them in canonical
    order with the sign in the coefficient.

    Examples
    --------
    >>> a, b, c = Vector("a"), Vector("b"), Vector("c")
    >>> dot(cross(a, b), c)
    [a,b,c]
    >>> dot(cross(b, a), c)
    -[a,b,c]
    >>> cross(Vector("e", components=(1, 0, 0)), Vector("f", components=(0, 1, 0))).components
    (0, 0, 1)

    References
    ----------
    Thorne, Rev. Mod. Phys. 52, 299 (1980), Sec. II.
    """
    _require_vector(a, "first argument of cross")
    _require_vector(b, "second argument of cross")
    components = None
    if a.components is not None and b.components is not None:
        a1, a2, a3 = a.components
        b1, b2, b3 = b.components
        components = (
            sp.expand(a2 * b3 - a3 * b2),
            sp.expand(a3 * b1 - a1 * b3),
            sp.expand(a1 * b2 - a2 * b1),
        )
    return Vector._unchecked(f"({a.name} x {b.name})", False, components, (a, b))


def _permutation_sign(keys: list) -> int:
    sign = 1
    keys = list(keys)
    for i in range(len(keys)):
        for j in range(len(keys) - 1 - i):
            if keys[j] > keys[j + 1]:
                keys[j], keys[j + 1] = keys[j + 1], keys[j]
                sign = -sign
    return sign


def triple_product(a: Vector, b: Vector, c: Vector) -> sp.Expr:
    """The scalar triple product [a, b, c] = a.(b x c) = eps_ijk a_i b_j c_k.

    Parameters
    ----------
    a, b, c : Vector
        The three vectors, in order.

    Returns
    -------
    sympy.Expr
        The determinant when all three carry components; the Binet-Cauchy reduction when one is
        a cross product; 0 when two named vectors coincide; otherwise +-``[p,q,r]``, a real
        symbol with the names sorted and the sign of the sorting permutation.

    Raises
    ------
    TypeError
        If an argument is not a :class:`Vector`.

    Conventions
    -----------
    Totally antisymmetric; [e_x, e_y, e_z] = +1 (right-handed, eps_123 = +1).

    Examples
    --------
    >>> a, b, c = Vector("a"), Vector("b"), Vector("c")
    >>> triple_product(c, b, a)
    -[a,b,c]
    >>> triple_product(a, b, a)
    0

    References
    ----------
    Thorne, Rev. Mod. Phys. 52, 299 (1980), Sec. II.
    """
    vectors = (
        _require_vector(a, "first argument of triple_product"),
        _require_vector(b, "second argument of triple_product"),
        _require_vector(c, "third argument of triple_product"),
    )
    if all(v.components is not None for v in vectors):
        return sp.expand(sp.Matrix([list(v.components) for v in vectors]).det())
    for shift in range(3):
        first = vectors[shift]
        if first.factors is not None:
            second, third = vectors[(shift + 1) % 3], vectors[(shift + 2) % 3]
            p, q = first.factors
            # [p x q, s, t] = (p x q).(s x t) = (p.s)(q.t) - (p.t)(q.s)
            return sp.expand(dot(p, second) * dot(q, third) - dot(p, third) * dot(q, second))
    names = [v.name for v in vectors]
    if len(set(names)) < 3:
        return sp.Integer(0)
    sign = _permutation_sign([v.sort_key for v in vectors])
    ordered = tuple(v.name for v in sorted(vectors, key=lambda v: v.sort_key))
    symbol = _triple_symbols.get(ordered)
    if symbol is None:
        symbol = sp.Symbol(f"[{ordered[0]},{ordered[1]},{ordered[2]}]", real=True)
        _triple_symbols[ordered] = symbol
    return sign * symbol


def probe_projection(vector: Vector) -> sp.Symbol:
    """The display symbol ``k.a`` for the projection of the probe vector k on ``vector``.

    Parameters
    ----------
    vector : Vector
        The vector a.

    Returns
    -------
    sympy.Symbol
        The real symbol named ``k.a`` (``k.(a x b)`` for a cross product).

    Raises
    ------
    TypeError
        If ``vector`` is not a :class:`Vector`.

    Conventions
    -----------
    Used only to display a symmetric tensor as its polynomial T_L k_L; ``PROBE_NORM`` is k.k.

    Examples
    --------
    >>> probe_projection(Vector("n"))
    k.n

    References
    ----------
    Thorne, Rev. Mod. Phys. 52, 299 (1980), Sec. II.
    """
    _require_vector(vector, "probe_projection argument")
    symbol = _probe_symbols.get(vector.name)
    if symbol is None:
        symbol = sp.Symbol(f"{_PROBE_NAME}.{vector.name}", real=True)
        _probe_symbols[vector.name] = symbol
    return symbol
