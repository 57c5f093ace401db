"""Stage 5 (from a PDF): pull the claimed bearing checks out of a calc package.

One pdfium pass finds the pages that carry the trade's symbols and reads their characters and
rules (pdfplumber where pdfium cannot, such as sideways text). Lines of words become
tables by their headers (Qf, Qr, KB, ...), whether the table is ruled or aligned by position
only, and tables continue onto following pages with or without repeated headers. Worked
equations ("Qr = 45.2 kN >= Qf = 31.0 kN") are read with the location label above them. Every
claim keeps its page, its position and the raw text it came from.
"""

from __future__ import annotations

import os
import re
from collections.abc import Callable
from dataclasses import dataclass, replace
from pathlib import Path

from audit.core.errors import InputError, Location
from audit.inputs.pdf.columns import (
    CANDIDATE,
    FACTOR_FIELDS,
    NUMERIC_FIELDS,
    ColumnMap,
    default_map,
    read_column_map,
)
from audit.inputs.pdf.equations import EQUATION, claim_from_equation, joined_equation
from audit.inputs.pdf.pages import EdgeT, open_document, page_words, parse_pages, scan_pages
from audit.inputs.pdf.settings import SETTINGS
from audit.inputs.pdf.tables import (
    Line,
    Table,
    group_lines,
    header_of,
    primed_under_groups,
    row_cells,
    stacked,
    unit_row,
)
from audit.inputs.pdf.values import STARTS_NUMERIC, parse_adequate, parse_value
from audit.inputs.read_claims import Claim, Where

__all__ = ["ColumnMap", "Extraction", "claims_yaml", "extract", "read_column_map"]

# ---------------------------------------------------------------- assembling claims


@dataclass
class _State:
    table: Table | None = None
    open_at_end: bool = False
    last_location: str = ""
    table_count: int = 0


@dataclass(frozen=True)
class Extraction:
    claims: tuple[Claim, ...]
    warnings: tuple[str, ...]
    pages_scanned: int
    pages_parsed: tuple[int, ...]
    no_text_pages: tuple[int, ...]
    candidate_pages: tuple[int, ...] = ()  # pages carrying the trade's vocabulary
    unread: tuple[Unread, ...] = ()  # rows and pages that look like checks and gave no claim

    def coverage(self) -> str:
        rows = sum(1 for u in self.unread if u.what.startswith("table row"))
        pages = sum(1 for u in self.unread if u.what.startswith("page"))
        return (
            f"{self.pages_scanned} pages read, {len(self.candidate_pages)} with bearing-check vocabulary, "
            f"{len(self.claims)} claims, {rows} table rows and {pages} pages with vocabulary not read"
        )


def _claim_from_row(
    cells: dict[str, str], table: Table, line: Line, state: _State, cmap: ColumnMap, name: str
) -> Claim:
    where = Location(name, line.page, int(line.words[0][1]), "row")
    location = cells.get("location", "").strip() or state.last_location
    if not location:
        raise InputError("row has no location label", where)
    state.last_location = location
    values: dict[str, float] = {}
    for field_name in (*NUMERIC_FIELDS, *FACTOR_FIELDS):
        if cells.get(field_name, "").strip():
            values[field_name] = parse_value(cells[field_name], field_name, table.units, where)
    if not any(f in values for f in NUMERIC_FIELDS):
        raise InputError("row has no Qf, Qr or utilisation", where)
    kind_text = cells.get("kind", "").lower()
    kind = cmap.kind or (
        "near-support" if ("near" in kind_text or "squeez" in kind_text or "'" in kind_text) else table.kind or "local"
    )
    return _row_claim(cells, values, table, line, location, kind, where)


def pair_claims(
    cells: dict[str, str], table: Table, line: Line, state: _State, cmap: ColumnMap, name: str
) -> list[Claim]:
    """A row's claims: one, or a local and a near-support one where the row carries Qf | Qr | Qf' | Qr'."""
    first = _claim_from_row(cells, table, line, state, cmap, name)
    if not any(cells.get(f, "").strip() for f in ("Qf'", "Qr'")):
        return [first]
    where = Location(name, line.page, int(line.words[0][1]), "row")
    near = {
        f: parse_value(cells[f"{f}'"], f, {f: table.units.get(f"{f}'", table.units.get(f, ""))}, where)
        for f in ("Qf", "Qr")
        if cells.get(f"{f}'", "").strip()
    }
    second = replace(first, kind="near-support", qf=near.get("Qf"), qr=near.get("Qr"), utilisation=None, factors={})
    return [first, second]


def _row_claim(cells, values, table: Table, line: Line, location: str, kind: str, where: Location) -> Claim:
    return Claim(
        id="",
        where=Where(page=line.page, table=table.name, x=round(line.words[0][1], 1), y=round(line.top, 1)),
        label=location,
        member=cells.get("member", "").strip(),
        kind=kind,
        qf=values.get("Qf"),
        qr=values.get("Qr"),
        utilisation=values.get("utilisation"),
        factors={k: v for k, v in values.items() if k in FACTOR_FIELDS},
        adequate=parse_adequate(cells["adequate"]) if "adequate" in cells else parse_adequate(line.words[-1][0]),
        text=line.text,
        loc=where,
    )


def claims_of_page(
    lines: list[Line],
    state: _State,
    cmap: ColumnMap,
    name: str,
    warnings: list[str],
    edges: list[EdgeT] | None = None,
    unread: list[Unread] | None = None,
) -> list[Claim]:
    """The page's claims. Rows inside a table that carry numbers but yield no claim go to ``unread``."""
    out: list[Claim] = []
    unread = unread if unread is not None else []
    table = state.table if state.open_at_end else None
    continuing = table is not None  # lines above the first row (a running header) do not end it
    row_table: Table | None = None
    last_row_index = -1
    just_headed = False
    skip = -1
    for i, line in enumerate(lines):
        if i == skip:
            continue  # the second line of a header read with the line above
        header = header_of(line, cmap, edges)
        if (
            header is None
            and i + 1 < len(lines)
            and MAYBE_HEADER.search(line.text)
            and header_of(lines[i + 1], cmap, edges) is None
        ):
            header = header_of(stacked(line, lines[i + 1]), cmap, edges)
            if header is not None:
                skip = i + 1
        if header is not None and i > 0 and (primed := primed_under_groups(lines[i - 1], line)) is not None:
            header = header_of(primed, cmap, edges) or header  # a near-support group over some columns
        if header is not None:
            state.table_count += 1
            table = replace(header, name=f"table {state.table_count} (p. {line.page})")
            state.last_location = ""
            row_table, continuing, just_headed = None, False, True
            continue
        has_q = "Q" in line.text  # every equation names Qf or Qr: most lines need no search
        eq = EQUATION.search(line.text) if has_q else None
        eq_line = line
        if eq is None and has_q and (joined := joined_equation(lines, i)) is not None:
            eq, eq_line, skip = joined  # an equation over several lines; its later line is read with it
        if eq:
            try:
                claim = claim_from_equation(eq, eq_line, lines[:i], name)
                if claim:
                    out.append(claim)
            except InputError as exc:
                warnings.append(exc.one_line())
            table, row_table, continuing = None, None, False
            continue
        if table is None:
            continue
        if just_headed and (units := unit_row(line, table)):
            table = replace(table, units={**table.units, **units})  # a row of units under the header
            just_headed = False
            continue
        just_headed = False
        cells = row_cells(line, table)
        if cells is None or not any(STARTS_NUMERIC.match(cells.get(f, "")) for f in NUMERIC_FIELDS):
            if continuing and i < SETTINGS.running_lines:
                continue
            if cells is not None and set(cells) <= LABEL_FIELDS and i + 1 < len(lines) and _is_row(lines[i + 1], table):
                continue  # a group row (a level or member heading) between rows: the table goes on
            if (
                row_table is not None
                and HAS_DIGIT.search(line.text)
                and i + 1 < len(lines)
                and _is_row(lines[i + 1], table)
            ):
                unread.append(Unread(line.page, "table row not read", line.text[:160]))
                continue
            table = None  # running text or a new block ends the table
            continue
        continuing = False
        if SUBTOTAL.match(cells.get("location", "")):
            unread.append(Unread(line.page, "table row not read: a total, not a check", line.text[:160]))
            continue
        try:
            out += pair_claims(cells, table, line, state, cmap, name)
            row_table, last_row_index = table, i
        except InputError as exc:
            warnings.append(f"{exc.one_line()} (text: '{line.text[:120]}')")
            unread.append(Unread(line.page, f"table row not read: {exc.message}", line.text[:160]))
    # a table whose last row stands at the foot of the page (only a footer below) may go on
    state.open_at_end = row_table is not None and last_row_index >= len(lines) - SETTINGS.footer_lines
    state.table = row_table
    return out


HAS_DIGIT = re.compile(r"\d")
MAYBE_HEADER = re.compile(r"(?<![A-Za-z])Q(?![a-eg-qs-z])")  # a line that may be the top half of a Q_f / Q_r header
LABEL_FIELDS = {"location", "member", "kind"}
SUBTOTAL = re.compile(r"^\s*(sub-?\s*)?totals?\b|^\s*sum\b", re.IGNORECASE)


def _is_row(line: Line, table: Table) -> bool:
    cells = row_cells(line, table)
    return cells is not None and any(STARTS_NUMERIC.match(cells.get(f, "")) for f in NUMERIC_FIELDS)


@dataclass(frozen=True)
class Unread:
    """Something that looks like a bearing check and yielded no claim: reported, never dropped."""

    page: int
    what: str
    text: str

    def line(self) -> str:
        return f"page {self.page}: {self.what}: '{self.text}'"


def extract(
    path: Path | str,
    pages: str | None = None,
    cmap: ColumnMap | None = None,
    workers: int | None = None,
    progress: Callable[[int], None] | None = None,
    standard_headers: dict[str, str] | None = None,
) -> Extraction:
    """Read the claimed bearing checks of a calc package PDF; ``standard_headers``: a standard's own symbols."""
    path = Path(path)
    cmap = cmap or default_map(standard_headers)
    doc = open_document(path)
    count = len(doc)
    doc.close()
    wanted = parse_pages(pages or cmap.pages, count, Location(str(path), 0, 0, "pages"))
    custom_headers = cmap.headers != default_map().headers
    read: dict = {}
    candidates, empty, warnings = scan_pages(path, wanted, any_text=custom_headers, read=read)
    workers = workers if workers is not None else max(1, min(os.cpu_count() or 1, 8))
    parsed = {**read, **page_words(path, [n for n in candidates if n not in read], workers, progress)}
    if progress and read:
        progress(len(read))
    state = _State()
    claims: list[Claim] = []
    unread: list[Unread] = []
    per_page: dict[int, int] = {}
    wanted_set = set(wanted)
    queue = sorted(candidates)  # pages read ahead (the page after a candidate) wait until a table goes on
    done: set[int] = set()
    while queue:
        number = queue.pop(0)
        if number in done:
            continue
        done.add(number)
        if number not in parsed:
            parsed.update(page_words(path, [number], 1))
        words, edges, problem = parsed[number]
        if problem:
            warnings.append(problem)
        if state.open_at_end and number - 1 not in done:
            state.open_at_end = False
        found = claims_of_page(group_lines(number, words), state, cmap, str(path), warnings, edges, unread)
        per_page[number] = len(found)
        claims += found
        following = number + 1
        if state.open_at_end and following in wanted_set and following not in done and following not in queue:
            queue.insert(0, following)  # the table may go on over the page without a header
    numbered = tuple(replace(c, id=f"p{c.where.page}-{i + 1}") for i, c in enumerate(claims))
    with_rows = {u.page for u in unread}
    for number in candidates:
        if per_page.get(number, 0) == 0 and number not in with_rows:
            unread.append(
                Unread(number, "page with bearing-check vocabulary gave no claim", _vocabulary(parsed, number))
            )
    unread.sort(key=lambda u: (u.page, u.what))
    return Extraction(
        numbered, tuple(warnings), len(wanted), tuple(sorted(done)), tuple(empty), tuple(candidates), tuple(unread)
    )


def _vocabulary(parsed: dict, number: int) -> str:
    """The page's first line with the trade's symbols, to say where to look."""
    words = parsed.get(number, ([], [], ""))[0]
    for line in group_lines(number, words):
        if CANDIDATE.search(line.text):
            return line.text[:160]
    return ""


# ---------------------------------------------------------------- writing the claims file


def _force(value: float | None) -> str | None:
    return None if value is None else f"{value / 1000:.9g} kN"


def claims_yaml(extraction: Extraction, source: str) -> str:
    import yaml

    items = []
    for c in extraction.claims:
        item: dict = {
            "id": c.id,
            "where": {"page": c.where.page, "table": c.where.table, "x": c.where.x, "y": c.where.y},
        }
        item["location"] = c.label
        if c.member:
            item["member"] = c.member
        item["kind"] = c.kind
        if c.qf is not None:
            item["Qf"] = _force(c.qf)
        if c.qr is not None:
            item["Qr"] = _force(c.qr)
        if c.utilisation is not None:
            item["utilisation"] = round(c.utilisation, 6)
        if c.factors:
            item["factors"] = {k: _factor_text(k, v) for k, v in c.factors.items()}
        if c.adequate is not None:
            item["adequate"] = c.adequate
        item["text"] = c.text
        items.append(item)
    header = (
        f"# Claims extracted by bearing-audit from {source}\n"
        f"# {len(items)} claims from {len(extraction.pages_parsed)} of {extraction.pages_scanned} pages read.\n"
        f"# coverage: {extraction.coverage()}\n"
        "# Confirm each against the calc (page, position and raw text are given) before relying on it.\n"
    )
    for u in extraction.unread:
        header += f"# not read: {u.line()}\n"
    for w in extraction.warnings:
        header += f"# warning: {w}\n"
    return header + yaml.safe_dump({"claims": items}, sort_keys=False, allow_unicode=True, width=120)


def _factor_text(name: str, value: float) -> float | str:
    if name == "fcp":
        return f"{value / 1e6:.4g} MPa"
    if name == "Ab":
        return f"{value * 1e6:.6g} mm**2"
    if name == "length":
        return f"{value * 1000:.4g} mm"
    return round(value, 6)
