"""Lines of words, cells, and tables found by their headers (ruled or aligned by position only)."""

from __future__ import annotations

import functools
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

    @functools.cached_property
    def text(self) -> str:  # a line is looked at many times: its text and cells are kept once made
        return " ".join([w[0] for w in self.words])

    @functools.cached_property
    def cells(self) -> tuple[tuple[str, float, float], ...]:
        return tuple(_cells(self.words, SETTINGS.cell_gap))


def group_lines(page: int, words: Iterable[WordT], tolerance: float = SETTINGS.line) -> list[Line]:
    rows: list[list[WordT]] = []
    words = list(words)
    tenth = {top: round(top, 1) for top in {w[3] for w in words}}  # a line's words share their top: round once
    for w in sorted(words, key=lambda w: (tenth[w[3]], w[1])):
        if rows and abs(rows[-1][0][3] - w[3]) <= tolerance:
            rows[-1].append(w)
        else:
            rows.append([w])
    return [Line(page, r[0][3], tuple(sorted(r, key=lambda w: w[1]))) for r in rows]


def cells_of(line: Line, gap: float = SETTINGS.cell_gap) -> list[tuple[str, float, float]]:
    """Words joined into cells where the horizontal gap is small: (text, x0, x1)."""
    return list(line.cells) if gap == SETTINGS.cell_gap else _cells(line.words, gap)


def _cells(words: tuple[WordT, ...], gap: float) -> list[tuple[str, float, float]]:
    cells: list[tuple[str, float, float]] = []
    texts: list[str] = []
    x0 = x1 = 0.0
    for text, left, right, _, _ in words:
        if texts and left - x1 <= gap:
            texts.append(text)
            x1 = right
            continue
        if texts:
            cells.append((" ".join(texts), x0, x1))
        texts, x0, x1 = [text], left, right
    if texts:
        cells.append((" ".join(texts), x0, x1))
    return cells


@dataclass(frozen=True)
class HeadCell:
    """One column of a table head: its x range and the texts over it, top band first, its own last."""

    x0: float
    x1: float
    path: tuple[str, ...]

    @property
    def text(self) -> str:
        return " ".join(self.path)


def single_band(line: Line) -> list[HeadCell]:
    return [HeadCell(x0, x1, (text,)) for text, x0, x1 in head_cells(line)]


def head_cells(line: Line) -> list[tuple[str, float, float]]:
    """A head line's cells, less a spreadsheet's row number standing first (a bare whole number)."""
    cells = cells_of(line)
    if len(cells) > 1 and ROW_NUMBER.fullmatch(cells[0][0]):
        return cells[1:]
    return cells


@dataclass(frozen=True)
class Table:
    fields: tuple[str, ...]
    bounds: tuple[tuple[float, float], ...]  # x range of each column
    units: dict[str, str]
    name: str
    kind: str  # near-support when the header says Qr' or Qf'
    alt_bounds: tuple[tuple[float, float], ...] = ()  # borderless tables: columns split midway between headers
    labels: tuple[str, ...] = ()  # each column's head as printed (its bands, then its own text)
    spans: tuple[tuple[float, float], ...] = ()  # each head cell's own x range (its text)


def rulings_across(line: Line, edges: list[EdgeT]) -> list[float]:
    """x positions of vertical rules that run through the line (a ruled table's cell walls)."""
    top = line.top
    bottom = max(w[4] for w in line.words)
    xs = sorted(x for x, t, b in edges if t <= top + 1 and b >= bottom - 1)
    merged: list[float] = []
    for x in xs:
        if not merged or x - merged[-1] > 1.5:
            merged.append(x)
    return merged


def _column_bounds(found: list[Found], rulings: list[float]) -> list[tuple[float, float]]:
    """Each header cell's column: between the rules around it in a ruled table; otherwise from its
    left edge to the next header's left edge (left-aligned headers, numbers aligned either way)."""
    if len(rulings) >= 3:
        bounds = []
        for f in found:
            centre = (f.x0 + f.x1) / 2
            left = max((x for x in rulings if x <= centre), default=-1e9)
            right = min((x for x in rulings if x > centre), default=1e9)
            bounds.append((left, right))
        return bounds
    starts = [f.x0 - 2 for f in found]
    return [(-1e9 if i == 0 else starts[i], 1e9 if i == len(found) - 1 else starts[i + 1]) for i in range(len(found))]


@dataclass(frozen=True)
class Found:
    """A head cell as read: the field it names ('' if none), its x range, its own text (the symbol
    with any unit under it) and the bands over it."""

    name: str
    x0: float
    x1: float
    own: str
    groups: tuple[str, ...]


def _bracketed_unit(text: str) -> str | None:
    m = re.search(r"[\(\[]\s*([^\)\]]+?)\s*[\)\]]", text)
    if m:
        return m[1]
    parts = text.split()
    if len(parts) > 1 and UNIT_CELL.match(parts[-1]) and parts[-1] != "-":
        return parts[-1]  # a unit under or after its symbol, unbracketed ('Qf kN')
    return None


ROW_NUMBER = re.compile(r"\d{1,5}")
BRACKETED = re.compile(r"[\(\[].*?[\)\]]")


def _strip(text: str) -> str:
    return BRACKETED.sub("", text).strip()


def _name_cell(head: HeadCell, position: int, cmap: ColumnMap, used: set[str]) -> Found:
    """The field a head cell names: by its position where the map gives one, else by the nearest text of
    its path (from its own text up) that a header pattern matches, a band pattern allowing; units
    under a symbol stay with it."""
    by_position = cmap.positions.get(position)
    if by_position and by_position not in used:
        return Found(by_position, head.x0, head.x1, head.path[-1], head.path[:-1])
    path = head.path
    j = len(path) - 1
    while j > 0 and (not _strip(path[j]) or UNIT_CELL.match(path[j].strip())):
        j -= 1  # units under the symbol stay with it
    own, groups, label = " ".join(path[j:]), path[:j], _strip(path[j])
    if cmap.any_head is not None and cmap.any_head.search(label) is None:
        return Found("", head.x0, head.x1, own, groups)  # no pattern names it (the loop below would say so)
    for name, pattern in cmap.headers.items():
        if name in used or name in cmap.positions.values() or not pattern.search(label):
            continue
        band = cmap.bands.get(name)
        if band is not None and not any(band.search(g) for g in groups):
            continue
        return Found(name, head.x0, head.x1, own, groups)
    return Found("", head.x0, head.x1, own, groups)


def header_of(
    line: Line, cmap: ColumnMap, edges: list[EdgeT] | None = None, heads: list[HeadCell] | None = None
) -> Table | None:
    """The table a head line (or a head of several bands, ``heads``) opens, or None when it is not one."""
    heads = heads if heads is not None else single_band(line)
    if len(heads) < 2:
        return None  # a table head names two fields at least (the test below): most lines are one cell
    found: list[Found] = []
    used: set[str] = set()
    for position, head in enumerate(heads, start=1):
        cell = _name_cell(head, position, cmap, used)
        if cell.name:
            used.add(cell.name)
        found.append(cell)
    named = [f for f in found if f.name]
    if len(named) < 2 or not any(f.name in NUMERIC_FIELDS for f in named):
        return None
    rulings = rulings_across(line, edges or [])
    bounds = _column_bounds(found, rulings)
    units = dict(cmap.units)
    for f in named:
        unit = _bracketed_unit(f.own)
        if unit and f.name not in units:
            units[f.name] = unit
    fields = [f.name for f in found]
    near_of = [
        f.name in ("Qf", "Qr") and (_primed_for_near(f, cmap) or bool(NEAR_GROUP.search(" ".join(f.groups))))
        for f in found
    ]
    q_columns = [i for i, f in enumerate(found) if f.name in ("Qf", "Qr")]
    near = bool(q_columns) and all(near_of[i] for i in q_columns)
    if not near:  # a local and a near-support pair on one row: Qf | Qr | Qf' | Qr'
        for i, f in enumerate(found):
            if near_of[i]:
                fields[i] = f"{f.name}'"
                unit = _bracketed_unit(f.own) or units.get(f.name, "")
                if f.name not in cmap.units:
                    units.pop(f.name, None)
                if unit:
                    units[fields[i]] = unit
                continue
            primed = PRIMED.match(_strip(f.own))
            symbol = re.match(r"^q\s*([fr])(?![a-z])", _strip(f.own), re.IGNORECASE)
            near_group = NEAR_GROUP.search(" ".join(f.groups))
            if not f.name and (primed or (symbol and near_group)):
                letter = (primed[1] or primed[2]) if primed else symbol[1]  # type: ignore[index]
                fields[i] = f"Q{letter.lower()}'"
                unit = _bracketed_unit(f.own)
                if unit:
                    units[fields[i]] = unit
    for q in ("Qf", "Qr"):  # a symbol's unit serves its primed pair where that has none
        if f"{q}'" in fields and f"{q}'" not in units and q in units:
            units[f"{q}'"] = units[q]
    alt = () if len(rulings) >= 3 else tuple(_midway_bounds(found))
    return Table(
        tuple(fields),
        tuple(bounds),
        units,
        "",
        "near-support" if near else "",
        alt,
        tuple(h.text for h in heads),
        tuple((f.x0, f.x1) for f in found),
    )


def _primed_for_near(found: Found, cmap: ColumnMap) -> bool:
    """A prime marks the near-support pair (O86's Qr') only where the column's symbol is read without it:
    in the NDS the prime of P' is part of the symbol (the adjusted allowable), not a second check."""
    if "'" not in found.own:
        return False
    pattern = cmap.headers.get(found.name)
    return pattern is None or bool(pattern.search(_strip(found.own).replace("'", "").strip()))


def _midway_bounds(found: list[Found]) -> list[tuple[float, float]]:
    """Columns split midway across the gaps between header cells: centred headers over numbers aligned
    right (or left) wider than the header itself."""
    cuts = [(a.x1 + b.x0) / 2 for a, b in itertools.pairwise(found)]
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
    return {name: m[1] for name, m in found.items() if m is not None and m[1] != "-" and not name.startswith("#")}


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
    return _nearest_placed(line, table) if table.alt_bounds and table.spans else None


def _nearest_placed(line: Line, table: Table) -> dict[str, str] | None:
    """A borderless row whose words fit neither way: each word under the head nearest to it (words
    aligned left or right under centred heads, a unit set apart from its number). A cell (words close
    together) must fall under one head, and a word under two heads is running text: None."""
    spans = table.spans
    texts: dict[int, list[str]] = {}
    for _, x0, x1 in cells_of(line):
        words = [w for w in line.words if w[1] >= x0 - 0.01 and w[2] <= x1 + 0.01]
        columns = {_nearest(w[1], w[2], spans) for w in words}
        if len(columns) != 1 or None in columns:
            return None
        index = columns.pop()
        assert index is not None
        texts.setdefault(index, []).extend(w[0] for w in words)
    return {table.fields[i] or f"#{i + 1}": " ".join(t) for i, t in texts.items()}


def _nearest(x0: float, x1: float, spans: tuple[tuple[float, float], ...]) -> int | None:
    overlapped = [i for i, (a, b) in enumerate(spans) if x0 < b and a < x1]
    if len(overlapped) > 1:
        return None
    if overlapped:
        return overlapped[0]
    return min(range(len(spans)), key=lambda i: min(abs(spans[i][0] - x1), abs(x0 - spans[i][1])))


def _placed(line: Line, fields: tuple[str, ...], bounds) -> dict[str, str] | None:
    texts: dict[int, list[str]] = {}
    for text, x0, x1, _, _ in line.words:
        centre = (x0 + x1) / 2
        index = next((i for i, (a, b) in enumerate(bounds) if a <= centre < b), None)
        if index is None and (x1 <= bounds[0][0] or x0 >= bounds[-1][1]):
            continue  # outside the table's walls: a spreadsheet's row numbers, a mark in the margin
        if index is None:
            return None
        a, b = bounds[index]
        if x0 < a - SETTINGS.cell_slack or x1 > b + SETTINGS.cell_slack:
            return None
        texts.setdefault(index, []).append(text)
    # a column whose head names no field keeps its words under its position ('#3'): its words may say
    # the check's kind or verdict, and a number there is reported with its head
    return {fields[i] or f"#{i + 1}": " ".join(t) for i, t in texts.items()}
