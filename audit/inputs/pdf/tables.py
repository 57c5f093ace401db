"""Lines of words, cells, and tables found by their headers (ruled or aligned by position only)."""

from __future__ import annotations

import itertools
import re
from collections.abc import Iterable
from dataclasses import dataclass

from audit.inputs.pdf.columns import NUMERIC_FIELDS, ColumnMap
from audit.inputs.pdf.pages import EdgeT, WordT
from audit.inputs.pdf.settings import SETTINGS


@dataclass(frozen=True)
class Line:
    page: int
    top: float
    words: tuple[WordT, ...]

    @property
    def text(self) -> str:
        return " ".join(w[0] for w in self.words)


def group_lines(page: int, words: Iterable[WordT], tolerance: float = SETTINGS.line) -> list[Line]:
    rows: list[list[WordT]] = []
    for w in sorted(words, key=lambda w: (round(w[3], 1), w[1])):
        if rows and abs(rows[-1][0][3] - w[3]) <= tolerance:
            rows[-1].append(w)
        else:
            rows.append([w])
    return [Line(page, r[0][3], tuple(sorted(r, key=lambda w: w[1]))) for r in rows]


def cells_of(line: Line, gap: float = SETTINGS.cell_gap) -> list[tuple[str, float, float]]:
    """Words joined into cells where the horizontal gap is small: (text, x0, x1)."""
    cells: list[list] = []
    for text, x0, x1, _, _ in line.words:
        if cells and x0 - cells[-1][2] <= gap:
            cells[-1][0] += " " + text
            cells[-1][2] = x1
        else:
            cells.append([text, x0, x1])
    return [(c[0], c[1], c[2]) for c in cells]


@dataclass(frozen=True)
class Table:
    fields: tuple[str, ...]
    bounds: tuple[tuple[float, float], ...]  # x range of each column
    units: dict[str, str]
    name: str
    kind: str  # near-support when the header says Qr' or Qf'
    alt_bounds: tuple[tuple[float, float], ...] = ()  # borderless tables: columns split midway between headers


def _rulings_across(line: Line, edges: list[EdgeT]) -> list[float]:
    """x positions of vertical rules that run through the line (a ruled table's cell walls)."""
    top = line.top
    bottom = max(w[4] for w in line.words)
    xs = sorted(x for x, t, b in edges if t <= top + 1 and b >= bottom - 1)
    merged: list[float] = []
    for x in xs:
        if not merged or x - merged[-1] > 1.5:
            merged.append(x)
    return merged


def _column_bounds(found: list[tuple[str, float, float, str]], rulings: list[float]) -> list[tuple[float, float]]:
    """Each header cell's column: between the rules around it in a ruled table; otherwise from its
    left edge to the next header's left edge (left-aligned headers, numbers aligned either way)."""
    if len(rulings) >= 3:
        bounds = []
        for _, x0, x1, _ in found:
            centre = (x0 + x1) / 2
            left = max((x for x in rulings if x <= centre), default=-1e9)
            right = min((x for x in rulings if x > centre), default=1e9)
            bounds.append((left, right))
        return bounds
    starts = [f[1] - 2 for f in found]
    return [(-1e9 if i == 0 else starts[i], 1e9 if i == len(found) - 1 else starts[i + 1]) for i in range(len(found))]


def header_of(line: Line, cmap: ColumnMap, edges: list[EdgeT] | None = None) -> Table | None:
    cells = cells_of(line)
    found: list[tuple[str, float, float, str]] = []
    used: set[str] = set()
    for text, x0, x1 in cells:
        label = re.sub(r"[\(\[].*?[\)\]]", "", text).strip()
        for name, pattern in cmap.headers.items():
            if name not in used and pattern.search(label):
                used.add(name)
                found.append((name, x0, x1, text))
                break
        else:
            found.append(("", x0, x1, text))
    named = [f for f in found if f[0]]
    if len(named) < 2 or not any(f[0] in NUMERIC_FIELDS for f in named):
        return None
    bounds = _column_bounds(found, _rulings_across(line, edges or []))
    units = dict(cmap.units)
    for name, _, _, text in named:
        m = re.search(r"[\(\[]\s*([^\)\]]+?)\s*[\)\]]", text)
        if m and name not in units:
            units[name] = m[1]
    near = any(f[0] in ("Qf", "Qr") and "'" in f[3] for f in named)
    fields = [f[0] for f in found]
    if not near:  # a local and a near-support pair on one row: Qf | Qr | Qf' | Qr'
        for i, (name, _, _, text) in enumerate(found):
            primed = PRIMED.match(re.sub(r"[\(\[].*?[\)\]]", "", text).strip())
            if not name and primed:
                fields[i] = f"Q{(primed[1] or primed[2]).lower()}'"
                m = re.search(r"[\(\[]\s*([^\)\]]+?)\s*[\)\]]", text)
                if m:
                    units[fields[i]] = m[1]
    rulings = _rulings_across(line, edges or [])
    alt = () if len(rulings) >= 3 else tuple(_midway_bounds(found))
    return Table(tuple(fields), tuple(bounds), units, "", "near-support" if near else "", alt)


def _midway_bounds(found: list[tuple[str, float, float, str]]) -> list[tuple[float, float]]:
    """Columns split midway across the gaps between header cells: centred headers over numbers aligned
    right (or left) wider than the header itself."""
    cuts = [(a[2] + b[1]) / 2 for a, b in itertools.pairwise(found)]
    return [(-1e9 if i == 0 else cuts[i - 1], 1e9 if i == len(found) - 1 else cuts[i]) for i in range(len(found))]


PRIMED = re.compile(r"^q\s*(?:'\s*([fr])|([fr])\s*')(?![a-z])", re.IGNORECASE)
UNIT_CELL = re.compile(
    r"^[\(\[]?\s*(kN|N|lbf|lbs?|kips?|k|MPa|psi|mm|in|mm2|mm²|in2|in²|mm\*\*2|-)\s*[\)\]]?$", re.IGNORECASE
)


def unit_row(line: Line, table: Table) -> dict[str, str] | None:
    """A row of units under a header ('(kN)', 'mm', ...): field -> unit, or None when the line is not one."""
    cells = row_cells(line, table)
    if not cells:
        return None
    found = {name: UNIT_CELL.match(text.strip()) for name, text in cells.items()}
    if not all(found.values()):
        return None
    return {name: m[1] for name, m in found.items() if m is not None and m[1] != "-"}


def stacked(upper: Line, lower: Line) -> Line:
    """Two lines read as one header: words of the lower line under a word of the upper join it (a header
    split over two lines, a subscript drawn lower than its letter, a unit under its symbol)."""
    words: list[WordT] = list(upper.words)
    loose: list[WordT] = []
    for w in lower.words:
        index = next((i for i, u in enumerate(words) if w[1] < u[2] + 1.0 and u[1] < w[2] + 1.0), None)
        if index is None:
            loose.append(w)
            continue
        u = words[index]
        glue = "" if len(w[0]) <= 2 and w[1] - u[2] < 1.5 else " "  # a subscript sits right against its letter
        words[index] = (f"{u[0]}{glue}{w[0]}", min(u[1], w[1]), max(u[2], w[2]), u[3], max(u[4], w[4]))
    return Line(upper.page, upper.top, tuple(sorted(words + loose, key=lambda w: w[1])))


NEAR_GROUP = re.compile(r"near|squeez|within\s*d|effect of loads", re.IGNORECASE)


def primed_under_groups(above: Line, header: Line) -> Line | None:
    """A header under group labels ('Local bearing' over Qf | Qr, 'Near support' over Qf | Qr): the header
    with its symbols under a near-support group primed (Qf -> Qf'); None when no near group spans it."""
    changed = False
    words = list(header.words)
    groups = cells_of(above)
    for k, (cell, x0, _) in enumerate(groups):
        end = groups[k + 1][1] - 4.0 if k + 1 < len(groups) else 1e9  # a group runs to the next group's start
        under = [i for i, w in enumerate(words) if x0 - 4.0 <= (w[1] + w[2]) / 2 < end]
        if len(under) < 2 or not NEAR_GROUP.search(cell):
            continue
        for i in under:
            w = words[i]
            if re.match(r"^q\s*[fr]$", w[0], re.IGNORECASE):
                words[i] = (w[0] + "'", *w[1:])
                changed = True
    return Line(header.page, header.top, tuple(words)) if changed else None


def row_cells(line: Line, table: Table) -> dict[str, str] | None:
    """Words placed in the table's columns, or None when a word straddles columns (running text).

    Columns run from each header's left edge; where a row does not fit those (numbers aligned
    right under centred headers), a borderless table tries columns split midway between headers.
    """
    for bounds in (table.bounds, table.alt_bounds):
        if bounds:
            cells = _placed(line, table.fields, bounds)
            if cells is not None:
                return cells
    return None


def _placed(line: Line, fields: tuple[str, ...], bounds) -> dict[str, str] | None:
    texts: dict[int, list[str]] = {}
    for text, x0, x1, _, _ in line.words:
        centre = (x0 + x1) / 2
        index = next((i for i, (a, b) in enumerate(bounds) if a <= centre < b), None)
        if index is None:
            return None
        a, b = bounds[index]
        if x0 < a - SETTINGS.cell_slack or x1 > b + SETTINGS.cell_slack:
            return None
        texts.setdefault(index, []).append(text)
    return {fields[i]: " ".join(t) for i, t in texts.items() if fields[i]}
