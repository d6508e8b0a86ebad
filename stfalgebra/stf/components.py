"""Explicit-component view of symmetric tensors, and naive component routines for tests.

:func:`explicit_components` turns a :class:`~stfalgebra.stf.tensors.SymmetricTensor` whose
vectors all carry components into a sympy array of shape (3,)*l. The other functions are the
slow textbook algorithms on such arrays (symmetrise by averaging over index permutations,
remove traces component by component, contract by summing products), kept as an independent
reference for the tests of the polynomial kernels. They are exact and slow: use them for
ranks up to about 6.

Conventions
-----------
Indices run over 0, 1, 2 (x, y, z). Symmetrisation is the average over the l! index
permutations. eps_012 = +1.

References
----------
K. S. Thorne, Rev. Mod. Phys. 52, 299 (1980), eq. (2.2) (STF part of a symmetric tensor as
a sum of trace terms).
"""

from __future__ import annotations

import itertools
from math import factorial

import sympy as sp
from sympy import ImmutableDenseNDimArray

from stfalgebra.stf.cartesian import monomial_coefficients
from stfalgebra.stf.tensors import SymmetricTensor, double_factorial
from stfalgebra.stf.vectors import Vector

__all__ = [
    "explicit_components",
    "vector_components",
    "outer_components",
    "delta_components",
    "epsilon_components",
    "symmetrize_components",
    "trace_components",
    "naive_stf_components",
    "contract_components",
    "epsilon_contraction_components",
]


def _array(values: dict[tuple[int, ...], sp.Expr], rank: int) -> ImmutableDenseNDimArray:
    flat = [values.get(index, sp.Integer(0)) for index in itertools.product(range(3), repeat=rank)]
    return ImmutableDenseNDimArray(flat, (3,) * rank)


def _rank_of(array: ImmutableDenseNDimArray) -> int:
    if not isinstance(array, sp.NDimArray):
        raise TypeError(f"expected a sympy array of shape (3,)*l, got {array!r}")
    shape = array.shape
    if any(size != 3 for size in shape):
        raise ValueError(f"expected a sympy array of shape (3,)*l, got shape {shape}")
    return len(shape)


def _as_dict(array: ImmutableDenseNDimArray) -> dict[tuple[int, ...], sp.Expr]:
    """Components by index tuple (sympy's own indexing is slow in the inner loops)."""
    rank = _rank_of(array)
    if rank == 0:
        return {(): array[()]}
    # the dense array's flat row-major storage; element-wise indexing is far slower
    flat = getattr(array, "_array", None)
    if flat is None:  # pragma: no cover - other array classes
        flat = sp.flatten(array.tolist())
    return dict(zip(itertools.product(range(3), repeat=rank), flat))


_EPSILON = {
    index: int(sp.LeviCivita(*index)) for index in itertools.product(range(3), repeat=3)
}


def explicit_components(tensor: SymmetricTensor) -> ImmutableDenseNDimArray:
    """All 3^l Cartesian components T_{i1...il} of a tensor whose vectors carry components.

    Parameters
    ----------
    tensor : SymmetricTensor
        A tensor all of whose vectors have explicit components.

    Returns
    -------
    sympy.ImmutableDenseNDimArray
        Shape (3,)*l (shape () at rank 0).

    Raises
    ------
    TypeError
        If ``tensor`` is not a SymmetricTensor.
    ValueError
        If one of its vectors has no components.

    Conventions
    -----------
    T_{x..y..z..} (a1 x's, a2 y's, a3 z's) = (a1! a2! a3!/l!) times the coefficient of
    k1^a1 k2^a2 k3^a3 in the Cartesian polynomial.

    Examples
    --------
    >>> x = Vector("x", components=(1, 2, 0))
    >>> explicit_components(SymmetricTensor.from_vectors(x, x))
    [[1, 2, 0], [2, 4, 0], [0, 0, 0]]

    References
    ----------
    Thorne, Rev. Mod. Phys. 52, 299 (1980), Sec. II.
    """
    if not isinstance(tensor, SymmetricTensor):
        raise TypeError(f"explicit_components needs a SymmetricTensor, got {tensor!r}")
    rank = tensor.rank
    coefficients = monomial_coefficients(tensor.cartesian(), rank)
    values = {}
    for index in itertools.product(range(3), repeat=rank):
        counts = (index.count(0), index.count(1), index.count(2))
        value = coefficients.get(counts)
        if value is not None:
            weight = sp.Rational(
                factorial(counts[0]) * factorial(counts[1]) * factorial(counts[2]), factorial(rank)
            )
            values[index] = weight * value
    return _array(values, rank)


def vector_components(vector: Vector) -> ImmutableDenseNDimArray:
    """The components of a vector as a rank-1 array.

    Parameters
    ----------
    vector : Vector
        A vector with explicit components.

    Returns
    -------
    sympy.ImmutableDenseNDimArray
        Shape (3,).

    Raises
    ------
    TypeError
        If ``vector`` is not a Vector.
    ValueError
        If it has no components.

    Conventions
    -----------
    Index 0, 1, 2 = x, y, z.

    Examples
    --------
    >>> vector_components(Vector("a", components=(1, 0, 2)))
    [1, 0, 2]

    References
    ----------
    None (bookkeeping).
    """
    if not isinstance(vector, Vector):
        raise TypeError(f"vector_components needs a Vector, got {vector!r}")
    if vector.components is None:
        raise ValueError(f"vector {vector.name!r} has no explicit components")
    return ImmutableDenseNDimArray(list(vector.components), (3,))


def outer_components(*vectors: Vector) -> ImmutableDenseNDimArray:
    """The unsymmetrised outer product a_i1 b_i2 ... of vectors with components.

    Parameters
    ----------
    *vectors : Vector
        Vectors with explicit components.

    Returns
    -------
    sympy.ImmutableDenseNDimArray
        Shape (3,)*len(vectors).

    Raises
    ------
    TypeError, ValueError
        As :func:`vector_components`.

    Conventions
    -----------
    No symmetrisation.

    Examples
    --------
    >>> a = Vector("a", components=(1, 0, 0)); b = Vector("b", components=(0, 1, 0))
    >>> outer_components(a, b)
    [[0, 1, 0], [0, 0, 0], [0, 0, 0]]

    References
    ----------
    None (definition).
    """
    parts = [vector_components(vector) for vector in vectors]
    values = {}
    for index in itertools.product(range(3), repeat=len(parts)):
        values[index] = sp.Mul(*(part[i] for part, i in zip(parts, index)))
    return _array(values, len(parts))


def delta_components() -> ImmutableDenseNDimArray:
    """The Kronecker delta as a 3x3 array.

    Returns
    -------
    sympy.ImmutableDenseNDimArray
        delta_ij.

    Conventions
    -----------
    Euclidean metric.

    Examples
    --------
    >>> delta_components()[0, 0], delta_components()[0, 1]
    (1, 0)

    References
    ----------
    None (definition).
    """
    return _array({(i, i): sp.Integer(1) for i in range(3)}, 2)


def epsilon_components() -> ImmutableDenseNDimArray:
    """The Levi-Civita symbol as a 3x3x3 array.

    Returns
    -------
    sympy.ImmutableDenseNDimArray
        eps_ijk with eps_012 = +1.

    Conventions
    -----------
    Right-handed: eps_xyz = +1.

    Examples
    --------
    >>> epsilon_components()[0, 1, 2], epsilon_components()[1, 0, 2]
    (1, -1)

    References
    ----------
    None (definition).
    """
    return _array({index: sp.Integer(value) for index, value in _EPSILON.items()}, 3)


def symmetrize_components(array: ImmutableDenseNDimArray) -> ImmutableDenseNDimArray:
    """The symmetric part: the average of the array over all permutations of its indices.

    Parameters
    ----------
    array : sympy array of shape (3,)*l

    Returns
    -------
    sympy.ImmutableDenseNDimArray
        T_(L) = (1/l!) sum over permutations.

    Raises
    ------
    TypeError, ValueError
        If ``array`` is not a sympy array of shape (3,)*l.

    Conventions
    -----------
    Each distinct sorted index is averaged once and copied to its permutations.

    Examples
    --------
    >>> symmetrize_components(sp.Array([[0, 1, 0], [0, 0, 0], [0, 0, 0]]))
    [[0, 1/2, 0], [1/2, 0, 0], [0, 0, 0]]

    References
    ----------
    None (definition).
    """
    rank = _rank_of(array)
    entries = _as_dict(array)
    values = {}
    weight = sp.Rational(1, factorial(rank))
    for index in itertools.combinations_with_replacement(range(3), rank):
        average = weight * sp.Add(*(entries[perm] for perm in itertools.permutations(index)))
        for perm in set(itertools.permutations(index)):
            values[perm] = average
    return _array(values, rank)


def trace_components(array: ImmutableDenseNDimArray, times: int = 1) -> ImmutableDenseNDimArray:
    """Contract the last two indices, ``times`` times (the multiple trace of a symmetric array).

    Parameters
    ----------
    array : sympy array of shape (3,)*l
    times : int
        Number of traces, 2 times <= l.

    Returns
    -------
    sympy.ImmutableDenseNDimArray
        Shape (3,)*(l - 2 times).

    Raises
    ------
    ValueError
        If 2 times > l or times < 0.

    Conventions
    -----------
    For symmetric arrays which pair is traced does not matter.

    Examples
    --------
    >>> trace_components(delta_components())
    3

    References
    ----------
    None (definition).
    """
    rank = _rank_of(array)
    if times < 0 or 2 * times > rank:
        raise ValueError(f"cannot take {times} traces of a rank-{rank} array")
    current, current_rank = _as_dict(array), rank
    for _ in range(times):
        values = {}
        for index in itertools.product(range(3), repeat=current_rank - 2):
            values[index] = sp.Add(*(current[index + (a, a)] for a in range(3)))
        current_rank -= 2
        current = values
    return _array(current, current_rank)


def naive_stf_components(array: ImmutableDenseNDimArray) -> ImmutableDenseNDimArray:
    """The STF part, computed component by component: symmetrise, then subtract traces.

    Parameters
    ----------
    array : sympy array of shape (3,)*l

    Returns
    -------
    sympy.ImmutableDenseNDimArray
        F_<L> = sum_k a_k Sym(delta^k F^(k)) with F^(k) the k-fold trace of the symmetrised
        array and a_k = (-1)^k l! (2l-2k-1)!! / ((l-2k)! (2l-1)!! (2k)!!).

    Raises
    ------
    TypeError, ValueError
        If ``array`` is not a sympy array of shape (3,)*l.

    Conventions
    -----------
    Sym is the average over index permutations, applied naively to each delta^k F^(k).

    Examples
    --------
    >>> naive_stf_components(delta_components())
    [[0, 0, 0], [0, 0, 0], [0, 0, 0]]

    References
    ----------
    Thorne, Rev. Mod. Phys. 52, 299 (1980), eq. (2.2).
    """
    rank = _rank_of(array)
    symmetric = symmetrize_components(array)
    total: dict[tuple[int, ...], sp.Expr] = dict(_as_dict(symmetric))
    for k in range(1, rank // 2 + 1):
        coefficient = sp.Rational(
            (-1) ** k * factorial(rank) * int(double_factorial(2 * rank - 2 * k - 1)),
            factorial(rank - 2 * k) * int(double_factorial(2 * rank - 1)) * int(double_factorial(2 * k)),
        )
        traced = _as_dict(trace_components(symmetric, k))
        product = {}
        for index in itertools.product(range(3), repeat=rank):
            deltas = 1
            for j in range(k):
                if index[2 * j] != index[2 * j + 1]:
                    deltas = 0
                    break
            if deltas:
                product[index] = traced[index[2 * k:]]
        symmetrized = _as_dict(symmetrize_components(_array(product, rank)))
        for index in total:
            total[index] += coefficient * symmetrized[index]
    return _array({index: sp.expand(value) for index, value in total.items()}, rank)


def contract_components(first: ImmutableDenseNDimArray, second: ImmutableDenseNDimArray) -> sp.Expr:
    """Full contraction sum_L A_L B_L of two arrays of the same rank.

    Parameters
    ----------
    first, second : sympy arrays of shape (3,)*l

    Returns
    -------
    sympy.Expr
        The expanded sum of products.

    Raises
    ------
    ValueError
        If the ranks differ.

    Conventions
    -----------
    Euclidean metric (no index positions).

    Examples
    --------
    >>> contract_components(delta_components(), delta_components())
    3

    References
    ----------
    None (definition).
    """
    rank = _rank_of(first)
    if _rank_of(second) != rank:
        raise ValueError(f"contraction needs equal ranks, got {rank} and {_rank_of(second)}")
    left, right = _as_dict(first), _as_dict(second)
    return sp.expand(sp.Add(*(left[index] * right[index] for index in left)))


def epsilon_contraction_components(array: ImmutableDenseNDimArray, vector: Vector) -> ImmutableDenseNDimArray:
    """Sym over L of eps_{i_l a b} u_a T_{b i_1 ... i_(l-1)}, component by component.

    Parameters
    ----------
    array : sympy array of shape (3,)*l, l >= 1
        A symmetric array T.
    vector : Vector
        u, with explicit components.

    Returns
    -------
    sympy.ImmutableDenseNDimArray
        Shape (3,)*l.

    Raises
    ------
    ValueError
        If l = 0 or the vector has no components.

    Conventions
    -----------
    eps_012 = +1; symmetrisation by averaging over permutations.

    Examples
    --------
    >>> z = Vector("z", components=(0, 0, 1))
    >>> epsilon_contraction_components(sp.Array([1, 0, 0]), z)
    [0, 1, 0]

    References
    ----------
    None (definition).
    """
    rank = _rank_of(array)
    if rank == 0:
        raise ValueError("the epsilon contraction needs rank >= 1, got rank 0")
    u = vector.components if isinstance(vector, Vector) else None
    if u is None:
        vector_components(vector)  # raises the right error
    entries = _as_dict(array)
    values = {}
    for index in itertools.product(range(3), repeat=rank):
        last, rest = index[-1], index[:-1]
        values[index] = sp.Add(
            *(
                _EPSILON[(last, a, b)] * u[a] * entries[(b,) + rest]
                for a in range(3)
                for b in range(3)
                if _EPSILON[(last, a, b)]
            )
        )
    return symmetrize_components(_array(values, rank))
