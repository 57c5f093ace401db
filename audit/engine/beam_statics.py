"""Support reactions of a straight beam on point supports.

Two supports: exact statics (overhangs included). Three or more: the stiffness method for a
continuous beam of constant EI (rotations at the supports are the unknowns; vertical
movement of the supports is zero). Overhangs beyond the end supports are statically
determinate and enter as a force and a moment at the end support.

Sign conventions: loads are positive downward, reactions positive upward, moments and
rotations positive counterclockwise. Plain floats only; no units, no external libraries.
"""

from __future__ import annotations

import itertools
import math
from bisect import bisect_left
from collections.abc import Sequence

GAUSS = 1.0 / math.sqrt(3.0)


def equivalent_point_loads(
    supports: Sequence[float], uniforms: Sequence[tuple[float, float, float]]
) -> list[tuple[float, float]]:
    """Replace uniform loads (x1, x2, w) by point loads giving the same reactions.

    Within a span the fixed-end actions of a point load are cubic in its position, so two
    Gauss points per span piece reproduce them exactly; an overhang piece needs only its
    resultant.
    """
    out: list[tuple[float, float]] = []
    first, last = supports[0], supports[-1]
    for x1, x2, w in uniforms:
        cuts = [x1, *(s for s in supports if x1 < s < x2), x2]
        for a, b in itertools.pairwise(cuts):
            length = b - a
            if length <= 0:
                continue
            mid = 0.5 * (a + b)
            if b <= first or a >= last:
                out.append((mid, w * length))
            else:
                half = 0.5 * length * GAUSS
                out.append((mid - half, 0.5 * w * length))
                out.append((mid + half, 0.5 * w * length))
    return out


def reactions(
    supports: Sequence[float],
    points: Sequence[tuple[float, float]],
    uniforms: Sequence[tuple[float, float, float]] = (),
) -> list[float]:
    """Upward reactions at the (sorted, distinct) support positions."""
    if len(supports) < 2:
        raise ValueError("a beam needs at least two supports")
    loads = list(points) + equivalent_point_loads(supports, uniforms)
    if len(supports) == 2:
        return _two_supports(supports[0], supports[1], loads)
    return _continuous(supports, loads)


def _two_supports(a: float, b: float, loads: Sequence[tuple[float, float]]) -> list[float]:
    span = b - a
    total = sum(p for _, p in loads)
    moment_about_a = sum(p * (x - a) for x, p in loads)
    rb = moment_about_a / span
    return [total - rb, rb]


def _continuous(supports: Sequence[float], loads: Sequence[tuple[float, float]]) -> list[float]:
    n = len(supports)
    spans = [supports[i + 1] - supports[i] for i in range(n - 1)]
    fem_left = [0.0] * (n - 1)  # fixed-end moment at the left end of each span
    fem_right = [0.0] * (n - 1)
    simple_left = [0.0] * (n - 1)
    simple_right = [0.0] * (n - 1)
    reaction = [0.0] * n
    applied_moment = [0.0] * n
    for x, p in loads:
        if x <= supports[0]:
            reaction[0] += p
            applied_moment[0] += p * (supports[0] - x)
            continue
        if x >= supports[-1]:
            reaction[-1] += p
            applied_moment[-1] -= p * (x - supports[-1])
            continue
        i = bisect_left(supports, x) - 1
        span = spans[i]
        a = x - supports[i]
        b = span - a
        fem_left[i] += p * a * b * b / (span * span)
        fem_right[i] -= p * a * a * b / (span * span)
        simple_left[i] += p * b / span
        simple_right[i] += p * a / span

    diag = [0.0] * n
    off = [0.0] * (n - 1)
    rhs = applied_moment[:]
    for i, span in enumerate(spans):
        diag[i] += 4.0 / span
        diag[i + 1] += 4.0 / span
        off[i] = 2.0 / span
        rhs[i] -= fem_left[i]
        rhs[i + 1] -= fem_right[i]
    theta = _solve_symmetric_tridiagonal(diag, off, rhs)

    for i, span in enumerate(spans):
        m_left = fem_left[i] + (4.0 * theta[i] + 2.0 * theta[i + 1]) / span
        m_right = fem_right[i] + (2.0 * theta[i] + 4.0 * theta[i + 1]) / span
        shear = (m_left + m_right) / span
        reaction[i] += simple_left[i] + shear
        reaction[i + 1] += simple_right[i] - shear
    return reaction


def _solve_symmetric_tridiagonal(diag: list[float], off: list[float], rhs: list[float]) -> list[float]:
    """Thomas algorithm; the matrix is symmetric positive definite, so no pivoting is needed."""
    n = len(diag)
    c = [0.0] * n
    d = [0.0] * n
    c[0] = off[0] / diag[0] if n > 1 else 0.0
    d[0] = rhs[0] / diag[0]
    for i in range(1, n):
        denom = diag[i] - off[i - 1] * c[i - 1]
        c[i] = off[i] / denom if i < n - 1 else 0.0
        d[i] = (rhs[i] - off[i - 1] * d[i - 1]) / denom
    x = [0.0] * n
    x[-1] = d[-1]
    for i in range(n - 2, -1, -1):
        x[i] = d[i] - c[i] * x[i + 1]
    return x


def simple_span_reactions(
    supports: Sequence[float],
    points: Sequence[tuple[float, float]],
    uniforms: Sequence[tuple[float, float, float]] = (),
) -> list[float]:
    """Reactions as if the beam were cut over every interior support: each span simply supported.

    What a calc gives when it ignores continuity; overhangs go to their end span's statics.
    """
    n = len(supports)
    out = [0.0] * n
    for i in range(n - 1):
        a, b = supports[i], supports[i + 1]
        first, last = i == 0, i == n - 2
        lo = -math.inf if first else a
        hi = math.inf if last else b
        span_points = [(x, p) for x, p in points if lo <= x < hi or (last and x == hi)]
        span_uniforms = [(max(x1, lo), min(x2, hi), w) for x1, x2, w in uniforms if min(x2, hi) > max(x1, lo)]
        if not span_points and not span_uniforms:
            continue
        left, right = _two_supports(a, b, list(span_points) + equivalent_point_loads([a, b], span_uniforms))
        out[i] += left
        out[i + 1] += right
    return out
