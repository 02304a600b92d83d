"""Exact rational linear algebra for the small systems of the beam model.

Spans, hinge positions and stiffnesses arrive as binary floats, which are exact
rationals; with :class:`fractions.Fraction` the stiffness system and the
mechanism test can be solved with no rounding at all. This is used where
floating point is not good enough: a hinge layout close to a mechanism (hinges
very close together or to a support) makes the stiffness matrix so
ill-conditioned that a double-precision solve loses most of its digits.
"""

from __future__ import annotations

from fractions import Fraction

__all__ = ["Matrix", "null_space", "solve"]

Matrix = list[list[Fraction]]


def _reduce(rows: Matrix, n_cols: int) -> tuple[Matrix, list[int]]:
    """Reduced row echelon form of ``rows`` over the first ``n_cols`` columns, and its pivots."""
    m = [list(r) for r in rows]
    pivots: list[int] = []
    top = 0
    for col in range(n_cols):
        pick = next((r for r in range(top, len(m)) if m[r][col] != 0), None)
        if pick is None:
            continue
        m[top], m[pick] = m[pick], m[top]
        lead = m[top][col]
        m[top] = [v / lead for v in m[top]]
        for r in range(len(m)):
            if r != top and m[r][col] != 0:
                f = m[r][col]
                m[r] = [a - f * b for a, b in zip(m[r], m[top], strict=True)]
        pivots.append(col)
        top += 1
        if top == len(m):
            break
    return m, pivots


def solve(a: Matrix, b: Matrix) -> Matrix:
    """The exact solution X of A X = B for a square, nonsingular A.

    Raises ``ZeroDivisionError`` if A is singular.
    """
    n = len(a)
    reduced, pivots = _reduce([a[i] + b[i] for i in range(n)], n)
    if len(pivots) < n:
        raise ZeroDivisionError("singular matrix")
    return [row[n:] for row in reduced]


def null_space(a: Matrix, n_cols: int) -> Matrix:
    """A basis of the vectors x with A x = 0 (empty when A has full column rank)."""
    reduced, pivots = _reduce(a, n_cols)
    basis = []
    for free in (c for c in range(n_cols) if c not in pivots):
        x = [Fraction(0)] * n_cols
        x[free] = Fraction(1)
        for row, p in zip(reduced, pivots, strict=False):
            x[p] = -row[free]
        basis.append(x)
    return basis
