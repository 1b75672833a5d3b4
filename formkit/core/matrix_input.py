"""Reading integer matrices: dense rows, sparse rows ``{column: entry}`` or FLINT matrices.

The matrix functions of :mod:`formkit.core.lattice`, :mod:`formkit.core.abelian_quotient`
and their callers take a matrix in any of three shapes; this module reads them into one
(the number of columns and sparse rows without zeros), checks that the entries are
integers, and converts back to dense lists or FLINT's ``fmpz_mat``.

References
----------
.. [1] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138, Springer
       1993, §2.4 (integer matrices and their lattices).
"""

from __future__ import annotations

from collections.abc import Iterable, Mapping, Sequence
from typing import Union

import flint

from ..errors import FormkitError
from .arith import as_int

__all__ = [
    "MatrixLike",
    "read_matrix",
    "dense_lists",
    "dense_matrix",
    "matrix_tuples",
    "identity_lists",
]

#: A matrix given by its rows: each row a sequence of integers, or a mapping
#: ``{column: entry}`` (sparse rows; then the number of columns must be given).
MatrixLike = Union[Sequence[Sequence[int]], Sequence[Mapping[int, int]], "flint.fmpz_mat"]

#: A matrix as a tuple of rows of Python integers.
Rows = tuple[tuple[int, ...], ...]


def read_matrix(A: MatrixLike, ncols: int | None = None, name: str = "A") -> tuple[int, list[dict[int, int]]]:
    """``(n, rows)``: the number of columns of ``A`` and its rows as sparse dicts (no zeros).

    Parameters
    ----------
    A : sequence of rows, or ``flint.fmpz_mat``
        Rows as sequences of integers, or as mappings ``{column: entry}`` (then ``ncols``
        is required).
    ncols : int, optional
        The number of columns (required for sparse rows or a matrix without rows).
    name : str
        The name of the matrix in error messages.

    Returns
    -------
    tuple
        ``(n, rows)``.

    Raises
    ------
    FormkitError
        If ``A`` is not a matrix of integers, or its rows disagree with ``ncols``.

    Examples
    --------
    >>> read_matrix([[1, 0, 2], [0, 0, 0]])
    (3, [{0: 1, 2: 2}, {}])
    >>> read_matrix([{4: -1}], 5)
    (5, [{4: -1}])
    >>> read_matrix([{7: 1}], 5)
    Traceback (most recent call last):
        ...
    formkit.errors.FormkitError: row 0 of A has column index 7, outside 0..4
    """
    rows: list[dict[int, int]] = []
    if isinstance(A, flint.fmpz_mat):
        nc: int = A.ncols()
        for frow in A.tolist():
            rows.append({j: int(v) for j, v in enumerate(frow) if v})
        if ncols is not None and ncols != nc:
            raise FormkitError(f"{name} has {nc} columns, not ncols = {ncols}")
        return nc, rows
    if isinstance(A, (str, bytes)) or not isinstance(A, Iterable):
        raise FormkitError(f"{name} must be a sequence of rows of integers, not {A!r}")
    n = ncols
    for i, r in enumerate(A):
        if isinstance(r, Mapping):
            if ncols is None:
                raise FormkitError(f"{name} has sparse rows (mappings): give ncols, the number of columns")
            d = {}
            for j, v in r.items():
                j = as_int(j, f"column index in row {i} of {name}")
                if not 0 <= j < ncols:
                    raise FormkitError(f"row {i} of {name} has column index {j}, outside 0..{ncols - 1}")
                v = as_int(v, f"{name}[{i}][{j}]")
                if v:
                    d[j] = v
            rows.append(d)
            continue
        if isinstance(r, (str, bytes)) or not isinstance(r, Iterable):
            raise FormkitError(f"row {i} of {name} must be a sequence of integers, not {r!r}")
        vals: list[int] = list(r)
        if not all(type(v) is int for v in vals):
            vals = [as_int(v, f"{name}[{i}][{j}]") for j, v in enumerate(vals)]
        if n is None:
            n = len(vals)
        elif len(vals) != n:
            raise FormkitError(f"row {i} of {name} has {len(vals)} entries, not {n} like the others")
        rows.append({j: v for j, v in enumerate(vals) if v})
    if n is None:
        raise FormkitError(f"{name} has no rows: give ncols, the number of columns")
    if n < 0:
        raise FormkitError(f"ncols must be at least 0, not {n}")
    return n, rows


def dense_lists(rows: Sequence[Mapping[int, int]], cols: Sequence[int]) -> list[list[int]]:
    """The sparse ``rows`` (every entry in a column of ``cols``) on ``cols``, in that order, as dense lists.

    Examples
    --------
    >>> dense_lists([{2: 5}, {1: -2, 2: 1}], [2, 1])
    [[5, 0], [1, -2]]
    """
    pos = {c: k for k, c in enumerate(cols)}
    out = []
    for r in rows:
        v = [0] * len(cols)
        for j, x in r.items():
            v[pos[j]] = x
        out.append(v)
    return out


def dense_matrix(rows: Sequence[Mapping[int, int]], cols: Sequence[int]) -> flint.fmpz_mat:
    """The FLINT matrix of the sparse ``rows`` restricted to ``cols`` (in that order)."""
    out = dense_lists(rows, cols)
    if not out:
        return flint.fmpz_mat(0, len(cols), [])
    return flint.fmpz_mat(out)


def matrix_tuples(M: flint.fmpz_mat) -> Rows:
    """The rows of a FLINT matrix as tuples of Python integers."""
    return tuple(tuple(int(x) for x in r) for r in M.tolist())


def identity_lists(n: int) -> list[list[int]]:
    """The n × n identity matrix as lists."""
    return [[int(i == j) for j in range(n)] for i in range(n)]
