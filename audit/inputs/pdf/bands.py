"""Table heads of several bands: cells merged across columns (a group label over the columns below)
and down rows (a label standing alone beside the bands), a units row under the symbols.

A head is read bottom-up: a cell with no cell of a lower band under it is a column (a leaf); a
cell over leaves is a group of those leaves. Each column keeps its path, the texts from the top
band down to its own, so a symbol under "Near support" can be read as a near-support check and a
column map can name a band.
"""

from __future__ import annotations

import re

from audit.inputs.pdf.pages import EdgeT
from audit.inputs.pdf.settings import SETTINGS
from audit.inputs.pdf.tables import HeadCell, Line, head_cells, rulings_across
from audit.inputs.pdf.values import NUMBER_TEXT, lenient_number

CellT = tuple[str, float, float]

NUMBER_CELL = re.compile(rf"^[-+\u2212]?{NUMBER_TEXT}(\s*[A-Za-z%²]+\.?)?$")


def is_head_like(line: Line) -> bool:
    """A line that may be a band of a table head: no number standing as a cell, no long text."""
    for text, _, _ in head_cells(line):
        if NUMBER_CELL.match(text.strip()) and lenient_number(text.split()[0]) is not None:
            return False
        if len(text.split()) > SETTINGS.head_cell_words:
            return False
    return True


def close_below(upper: Line, lower: Line) -> bool:
    """The lower line follows the upper one as the next band of a head does (no paragraph gap)."""
    height = max(w[4] - w[3] for w in upper.words)
    return lower.top - upper.top <= SETTINGS.band_pitch * height


def compose(lines: list[Line], edges: list[EdgeT] | None = None) -> list[HeadCell]:
    """The columns of a head drawn over ``lines`` (top band first); in a ruled head a group spans the
    columns between the rules around it."""
    bands = [head_cells(line) for line in lines]
    walls = [rulings_across(line, edges or []) for line in lines]
    leaves: list[tuple[CellT, int]] = []
    for k in reversed(range(len(bands))):
        lower = list(leaves)
        for cell in bands[k]:
            if any(_overlaps(cell, leaf) for leaf, _ in lower) or _centred_over_gap(cell, lower):
                continue
            if len(walls[k]) >= 2 and _walled(cell, -1, lower, walls[k]):
                continue  # a ruled cell with columns of the bands below between its walls
            leaves.append((cell, k))
    leaves.sort(key=lambda item: item[0][1])
    paths: list[list[str]] = [[cell[0]] for cell, _ in leaves]
    spans: list[list[float]] = [[cell[1], cell[2]] for cell, _ in leaves]
    for k in reversed(range(len(bands))):
        groups = [cell for cell in bands[k] if not any(cell is leaf for leaf, _ in leaves)]
        if not groups:
            continue
        if len(walls[k]) >= 2:
            owner = {i: g for g in groups for i in _walled(g, k, leaves, walls[k])}
        else:
            owner = _nearest_groups(groups, k, leaves)
        for g in groups:
            covered = [i for i, o in owner.items() if o is g]
            for i in covered:
                paths[i].insert(0, g[0])
                if len(covered) == 1:  # a cell over one column widens it (a symbol over its unit)
                    spans[i] = [min(spans[i][0], g[1]), max(spans[i][1], g[2])]
    return [HeadCell(s[0], s[1], tuple(p)) for s, p in zip(spans, paths, strict=True)]


def _nearest_groups(groups: list[CellT], band: int, leaves: list[tuple[CellT, int]]) -> dict[int, CellT]:
    """Each leaf of a lower band under the group cell of this band nearest to it, where a run of leaves
    of its own band joins it to a leaf under that cell (a label centred over a span wider than itself);
    a leaf of another band between them (a cell merged down the rows) stands in the way."""
    seeds: dict[int, list[int]] = {}
    for n, g in enumerate(groups):
        under = [i for i, (leaf, k) in enumerate(leaves) if k > band and _overlaps(g, leaf)]
        lower = [(leaf, k) for leaf, k in leaves if k > band]
        if not under and (flanks := _flanks(g, leaves)) is not None and _centred_over_gap(g, lower):
            under = list(flanks)  # a label centred over the gap between its two columns
        elif not under:
            centre = (g[1] + g[2]) / 2
            below = [i for i, (_, k) in enumerate(leaves) if k > band]
            under = [min(below, key=lambda i: abs((leaves[i][0][1] + leaves[i][0][2]) / 2 - centre))] if below else []
        seeds[n] = under
    owner: dict[int, CellT] = {}
    for i, (leaf, level) in enumerate(leaves):
        if level <= band:
            continue
        centre = (leaf[1] + leaf[2]) / 2
        ranked = sorted(range(len(groups)), key=lambda n: _distance(centre, groups[n]))
        for n in ranked[:1]:
            if any(_joined(leaves, i, s) for s in seeds[n]):
                owner[i] = groups[n]
    return owner


def _distance(x: float, cell: CellT) -> float:
    return 0.0 if cell[1] <= x <= cell[2] else min(abs(cell[1] - x), abs(cell[2] - x))


def _joined(leaves: list[tuple[CellT, int]], i: int, seed: int) -> bool:
    """Leaves i and seed stand in one run of leaves of the same band."""
    level = leaves[i][1]
    lo, hi = min(i, seed), max(i, seed)
    return all(leaves[j][1] == level for j in range(lo, hi + 1))


def _flanks(cell: CellT, leaves: list[tuple[CellT, int]]) -> tuple[int, int] | None:
    """The leaves either side of a cell that overlaps none (their indices in ``leaves``)."""
    left = [i for i, (leaf, _) in enumerate(leaves) if leaf[2] <= cell[1]]
    right = [i for i, (leaf, _) in enumerate(leaves) if leaf[1] >= cell[2]]
    if not left or not right:
        return None
    return max(left, key=lambda i: leaves[i][0][2]), min(right, key=lambda i: leaves[i][0][1])


def _centred_over_gap(cell: CellT, lower: list[tuple[CellT, int]]) -> bool:
    """A label over the gap between two columns of the bands below, centred on them: a group over
    them (a merged cell narrower than its span), not a column of its own."""
    flanks = _flanks(cell, lower)
    if flanks is None:
        return False
    a, b = lower[flanks[0]][0], lower[flanks[1]][0]
    middle = ((a[1] + a[2]) / 2 + (b[1] + b[2]) / 2) / 2
    return abs((cell[1] + cell[2]) / 2 - middle) <= max(3.0, 0.1 * (b[2] - a[1]))


def _overlaps(a: CellT, b: CellT, slack: float = 1.0) -> bool:
    return a[1] < b[2] + slack and b[1] < a[2] + slack


def _walled(cell: CellT, band: int, leaves: list[tuple[CellT, int]], walls: list[float]) -> list[int]:
    """Leaves under a group cell of a ruled head: those between the rules on either side of its text."""
    left = max((x for x in walls if x <= cell[1] + 1.0), default=None)
    right = min((x for x in walls if x >= cell[2] - 1.0), default=None)
    if left is None or right is None or right - left < 1.0:
        return []
    return [i for i, (leaf, k) in enumerate(leaves) if k > band and left <= (leaf[1] + leaf[2]) / 2 <= right]
