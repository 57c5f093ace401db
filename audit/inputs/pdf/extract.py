"""Stage 5 (from a PDF): pull the claimed bearing checks out of a calc package.

One pdfium pass finds the pages that carry the trade's symbols and reads their characters and
rules (pdfplumber where pdfium cannot, such as sideways text). Lines of words become
tables by their headers (Qf, Qr, KB, ...), whether the table is ruled or aligned by position
only, and tables continue onto following pages with or without repeated headers. Worked
equations ("Qr = 45.2 kN >= Qf = 31.0 kN") are read with the location label above them. Every
claim keeps its page, its position and the raw text it came from.
"""

from __future__ import annotations

import re
from collections.abc import Callable
from dataclasses import dataclass, replace
from pathlib import Path

from audit.core.errors import InputError, Location
from audit.inputs.pdf.bands import NUMBER_CELL, close_below, compose, is_head_like
from audit.inputs.pdf.columns import (
    FACTOR_FIELDS,
    NUMERIC_FIELDS,
    ColumnMap,
    Vocabulary,
    default_map,
    page_vocabulary,
    read_column_map,
    standard_symbol,
)
from audit.inputs.pdf.equations import EQUATION_HINT, claim_from_equation, find_equation, joined_equation
from audit.inputs.pdf.pages import EdgeT, Scan, open_document, page_words, parse_pages, scan_pages
from audit.inputs.pdf.settings import SETTINGS
from audit.inputs.pdf.tables import (
    UNIT_CELL,
    Line,
    Table,
    cells_of,
    group_lines,
    head_cells,
    header_of,
    primed_under_groups,
    row_cells,
    stacked,
    unit_row,
)
from audit.inputs.pdf.values import (
    DECIMAL_MARKS,
    POINT,
    STARTS_NUMERIC,
    Numbers,
    marks_seen,
    parse_adequate,
    parse_value,
)
from audit.inputs.read_claims import Claim, Where
from audit.standards.resistance import Symbol

__all__ = ["ColumnMap", "Extraction", "claims_yaml", "extract", "read_column_map"]

# ---------------------------------------------------------------- assembling claims


@dataclass
class _State:
    table: Table | None = None
    open_at_end: bool = False
    last_location: str = ""
    table_count: int = 0
    decimal: str = "point"  # the decimal mark the calc is read with: point, comma or either


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


NEAR_WORDS = re.compile(r"near|squeez|within\s*d\b|adjacent to (the )?support|'", re.IGNORECASE)
LOCAL_WORDS = re.compile(r"\b(local|crushing|direct|at the bearing)\b", re.IGNORECASE)
VALUE_FIELDS = (*NUMERIC_FIELDS, *FACTOR_FIELDS, "Qf'", "Qr'")


def kind_in_words(cells: dict[str, str]) -> str:
    """The check's kind as a row's words give it, in a kind column or any column that is not a value, a
    location or a member ('Near support', 'squeeze', 'local'); '' when they say neither."""
    for key, text in cells.items():
        if key in VALUE_FIELDS or key in ("location", "member"):
            continue
        if NEAR_WORDS.search(text):
            return "near-support"
        if LOCAL_WORDS.search(text):
            return "local"
    return ""


def _split_verdicts(cells: dict[str, str]) -> tuple[dict[str, str], bool | None]:
    """Value cells with an OK or N.G. after the number (an OK column with a blank head falls in the last
    column): the cells without it, and the verdict."""
    verdict: bool | None = None
    out = dict(cells)
    for key in VALUE_FIELDS:
        parts = out.get(key, "").split()
        if len(parts) >= 2 and (v := parse_adequate(parts[-1])) is not None:
            out[key] = " ".join(parts[:-1])
            verdict = v
    return out, verdict


def _claim_from_row(
    cells: dict[str, str], table: Table, line: Line, state: _State, cmap: ColumnMap, name: str, numbers: Numbers
) -> Claim:
    where = Location(name, line.page, int(line.words[0][1]), "row")
    location = cells.get("location", "").strip() or state.last_location
    if not location:
        raise InputError("row has no location label", where)
    state.last_location = location
    cells, verdict = _split_verdicts(cells)
    values: dict[str, float] = {}
    for field_name in (*NUMERIC_FIELDS, *FACTOR_FIELDS):
        if cells.get(field_name, "").strip():
            values[field_name] = parse_value(cells[field_name], field_name, table.units, where, numbers)
    if not any(f in values for f in NUMERIC_FIELDS):
        raise InputError("row has no Qf, Qr or utilisation", where)
    kind = cmap.kind or kind_in_words(cells) or table.kind or "local"
    adequate = parse_adequate(cells.get("adequate", ""))
    if adequate is None:
        adequate = verdict if verdict is not None else parse_adequate(line.words[-1][0])
    return _row_claim(cells, values, table, line, location, kind, where, adequate)


def pair_claims(
    cells: dict[str, str],
    table: Table,
    line: Line,
    state: _State,
    cmap: ColumnMap,
    name: str,
    numbers: Numbers = POINT,
) -> list[Claim]:
    """A row's claims: one, or a local and a near-support one where the row carries Qf | Qr | Qf' | Qr'."""
    first = _claim_from_row(cells, table, line, state, cmap, name, numbers)
    if not any(cells.get(f, "").strip() for f in ("Qf'", "Qr'")):
        return [first]
    where = Location(name, line.page, int(line.words[0][1]), "row")
    cells, _ = _split_verdicts(cells)
    near = {
        f: parse_value(cells[f"{f}'"], f, {f: table.units.get(f"{f}'", table.units.get(f, ""))}, where, numbers)
        for f in ("Qf", "Qr")
        if cells.get(f"{f}'", "").strip()
    }
    second = replace(first, kind="near-support", qf=near.get("Qf"), qr=near.get("Qr"), utilisation=None, factors={})
    return [first, second]


def _row_claim(
    cells, values, table: Table, line: Line, location: str, kind: str, where: Location, adequate: bool | None
) -> Claim:
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
        adequate=adequate,
        text=line.text,
        loc=where,
    )


def head_at(
    lines: list[Line], i: int, cmap: ColumnMap, edges: list[EdgeT] | None, taken: dict[int, str]
) -> tuple[Table, list[int]] | None:
    """The table whose head stands at line ``i``, with the lines its head takes: one line; two read
    stacked (a symbol over its subscript or unit); or bands of any depth, the symbols' line with the
    group bands above it and a units row under it."""
    line = lines[i]
    header = header_of(line, cmap, edges)
    if header is not None and cmap.positions and not is_head_like(line):
        header = None  # columns named by position: only a line of heads opens a table, never a row
    if header is None:
        if i + 1 < len(lines) and MAYBE_HEADER.search(line.text) and header_of(lines[i + 1], cmap, edges) is None:
            header = header_of(stacked(line, lines[i + 1]), cmap, edges)
            if header is not None:
                return header, [i, i + 1]
        if not (cmap.bands or MAYBE_HEADER.search(line.text)) or not is_head_like(line):
            return None
    top, bottom = i, i
    first_x1 = head_cells(line)[0][2] if line.words else 0.0
    while (
        top - 1 >= 0
        and taken.get(top - 1, "running").startswith("running")  # a line taken for a running head may be a band
        and bottom - top + 1 < SETTINGS.head_bands
        and is_head_like(lines[top - 1])
        and close_below(lines[top - 1], lines[top])
        and (len(cells_of(lines[top - 1])) >= 2 or lines[top - 1].words[0][1] > first_x1)
    ):
        top -= 1  # a band over the symbols (a group label, cells merged down the rows)
    while (
        bottom + 1 < len(lines)
        and bottom - top + 1 < SETTINGS.head_bands
        and close_below(lines[bottom], lines[bottom + 1])
        and all(UNIT_CELL.match(c[0].strip()) for c in head_cells(lines[bottom + 1]))
    ):
        bottom += 1  # a units row under the symbols
    if top == bottom:
        if header is not None and i > 0 and (primed := primed_under_groups(lines[i - 1], line)) is not None:
            header = header_of(primed, cmap, edges) or header  # a near-support group over some columns
        return (header, [i]) if header is not None else None
    band = lines[top : bottom + 1]
    deep = header_of(lines[i], cmap, edges, compose(band, edges))
    if header is None:  # the line alone names too little: the head read as bands may name enough
        return (deep, list(range(top, bottom + 1))) if deep is not None else None
    if deep is None or sum(1 for f in deep.fields if f) < sum(1 for f in header.fields if f):
        return header, [i]
    return deep, list(range(top, bottom + 1))


def claims_of_page(
    lines: list[Line],
    state: _State,
    cmap: ColumnMap,
    name: str,
    warnings: list[str],
    edges: list[EdgeT] | None = None,
    unread: list[Unread] | None = None,
    roles: dict[int, str] | None = None,
) -> list[Claim]:
    """The page's claims. Every line that looks like a row of numbers and yields no claim goes to
    ``unread`` with its position; ``roles`` (given) gets what each line became, by index."""
    out: list[Claim] = []
    unread = unread if unread is not None else []
    roles = roles if roles is not None else {}
    table = state.table if state.open_at_end else None
    continuing = table is not None  # lines above the first row (a running header) do not end it
    row_table: Table | None = None
    last_row_index = -1
    just_headed = False
    skip: set[int] = set()
    unnamed_reported: set[tuple[str, str]] = set()
    # the page's numbers: the calc's decimal mark, and the marks its own values show beyond doubt
    numbers = Numbers(
        state.decimal, marks_seen(line.text for line in lines) if state.decimal != "either" else frozenset()
    )
    for i, line in enumerate(lines):
        if i in skip:
            continue  # a later line of a head or an equation read with an earlier one
        head = head_at(lines, i, cmap, edges, roles)
        if head is not None:
            header, band = head
            for n, k in enumerate(band, start=1):
                roles[k] = f"head, band {n} of {len(band)}" if len(band) > 1 else "head"
            skip.update(k for k in band if k > i)
            state.table_count += 1
            table = replace(header, name=f"table {state.table_count} (p. {line.page})")
            roles[band[-1]] += "; " + _columns_role(table)
            state.last_location = ""
            row_table, continuing, just_headed = None, False, True
            continue
        has_eq = EQUATION_HINT.search(line.text) is not None  # most lines hold no equation
        eq = find_equation(line.text) if has_eq else None
        eq_line = line
        if eq is None and has_eq and (joined := joined_equation(lines, i)) is not None:
            eq, eq_line, last = joined  # an equation over several lines; its later line is read with it
            skip.add(last)
            roles[last] = "equation (its second line)"
        if eq:
            try:
                claim = claim_from_equation(eq, eq_line, lines[:i], name, numbers)
                if claim:
                    out.append(claim)
                    roles[i] = f"claim {claim.label}: {claim.kind} (worked equation)"
            except InputError as exc:
                warnings.append(exc.one_line())
                unread.append(_unread(line, f"equation not read: {exc.message}"))
                roles[i] = f"not read: {exc.message}"
            table, row_table, continuing = None, None, False
            continue
        if table is None:
            continue
        if just_headed and (units := unit_row(line, table)):
            table = replace(table, units={**table.units, **units})  # a row of units under the header
            just_headed = False
            roles[i] = "units: " + ", ".join(f"{k} {v}" for k, v in units.items())
            continue
        just_headed = False
        cells = row_cells(line, table)
        if cells is None or not any(STARTS_NUMERIC.match(cells.get(f, "")) for f in (*NUMERIC_FIELDS, "Qf'", "Qr'")):
            if continuing and i < SETTINGS.running_lines:
                roles[i] = "running head of the page"
                continue
            named = {k for k in cells or {} if not k.startswith("#")}
            if (
                cells is not None
                and named
                and named <= LABEL_FIELDS
                and i + 1 < len(lines)
                and _is_row(lines[i + 1], table)
            ):
                roles[i] = f"group: {line.text[:60]}"
                continue  # a group row (a level or member heading) between rows: the table goes on
            if cells is not None and (units := unit_row(line, table)):
                table = replace(table, units={**table.units, **units})  # units repeated under a group row
                roles[i] = "units: " + ", ".join(f"{k} {v}" for k, v in units.items())
                continue
            if (
                row_table is not None
                and HAS_DIGIT.search(line.text)
                and i + 1 < len(lines)
                and _is_row(lines[i + 1], table)
            ):
                continue  # a row the table cannot place; reported below with its position; the table goes on
            table = None  # running text or a new block ends the table
            continue
        continuing = False
        if SUBTOTAL.match(cells.get("location", "")):
            unread.append(_unread(line, "table row not read: a total, not a check"))
            roles[i] = "not read: a total, not a check"
            continue
        try:
            claims = pair_claims(cells, table, line, state, cmap, name, numbers)
            out += claims
            row_table, last_row_index = table, i
            roles[i] = "claim " + "; ".join(f"{c.label}: {c.kind}" for c in claims)
            _report_unnamed_numbers(cells, table, warnings, unnamed_reported)
        except InputError as exc:
            warnings.append(f"{exc.one_line()} (text: '{line.text[:120]}')")
            unread.append(_unread(line, f"table row not read: {exc.message}"))
            roles[i] = f"not read: {exc.message}"
    _report_numeric_rows(lines, roles, unread)
    # a table whose last row stands at the foot of the page (only a footer below) may go on
    state.open_at_end = row_table is not None and last_row_index >= len(lines) - SETTINGS.footer_lines
    state.table = row_table
    return out


def _columns_role(table: Table) -> str:
    labels = table.labels or ("",) * len(table.fields)
    columns = [
        f"{n}: {f or 'not understood'} ('{label}')"
        for n, (f, label) in enumerate(zip(table.fields, labels, strict=False), start=1)
    ]
    return "columns " + ", ".join(columns) + (f"; kind {table.kind}" if table.kind else "")


def _report_unnamed_numbers(cells: dict[str, str], table: Table, warnings: list[str], seen: set) -> None:
    """A number in a column whose head was not understood: named once per table and column."""
    for key, text in cells.items():
        if key.startswith("#") and STARTS_NUMERIC.match(text) and (table.name, key) not in seen:
            seen.add((table.name, key))
            index = int(key[1:]) - 1
            label = table.labels[index] if index < len(table.labels) else key
            warnings.append(
                f"{table.name}: numbers under column {index + 1} '{label}', a head not understood, are not read "
                "(name it in a --map if it matters)"
            )


def _unread(line: Line, what: str) -> Unread:
    return Unread(line.page, what, line.text[:160], round(line.words[0][1], 1), round(line.top, 1))


def _report_numeric_rows(lines: list[Line], roles: dict[int, str], unread: list[Unread]) -> None:
    """Every line left that reads as a row of numbers (two cells or more, a number among them) is
    reported by row: never dropped because another table on the page read."""
    numeric = [i not in roles and _numeric_row(line) for i, line in enumerate(lines)]
    for i, line in enumerate(lines):
        if not numeric[i]:
            continue
        numbers = sum(1 for c in cells_of(line) if NUMBER_CELL.match(c[0].strip()))
        neighbours = (i > 0 and numeric[i - 1]) or (i + 1 < len(lines) and numeric[i + 1])
        if numbers < 2 and not neighbours:
            continue
        why = _why_not_read(lines, i, roles)
        unread.append(_unread(line, f"table row not read: {why}"))
        roles[i] = f"not read: {why}"


def _off(x: float, cell: tuple[str, float, float]) -> float:
    return 0.0 if cell[1] <= x <= cell[2] else min(abs(cell[1] - x), abs(cell[2] - x))


def _numeric_row(line: Line) -> bool:
    cells = head_cells(line)  # a spreadsheet's row number alone does not make a row of numbers
    return len(cells) >= 2 and any(NUMBER_CELL.match(c[0].strip()) for c in cells)


def _why_not_read(lines: list[Line], i: int, roles: dict[int, str]) -> str:
    """Why a row of numbers gave no claim: the head above it that names no Qf or Qr (with the heads its
    numbers stand under), or no head at all."""
    for k in range(i - 1, max(-1, i - 40), -1):
        role = roles.get(k, "")
        if role.startswith("head"):
            return "gave no claim; its table's columns do not fit it (a --map can name them by position)"
        if k not in roles and is_head_like(lines[k]) and len(cells_of(lines[k])) >= 2:
            heads = cells_of(lines[k])
            under = []
            for text, x0, x1 in cells_of(lines[i]):
                if NUMBER_CELL.match(text.strip()):
                    centre = (x0 + x1) / 2
                    head = min(
                        heads,
                        key=lambda h: 0 if h[1] <= centre <= h[2] else min(abs(h[1] - centre), abs(h[2] - centre)),
                    )
                    under.append(f"'{head[0]}'")
            listed = ", ".join(dict.fromkeys(under))
            return f"gave no claim: numbers under {listed}, a head not understood (give a --map naming it)"
    return "gave no claim: no table head above it that names Qf, Qr or a utilisation"


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
    x: float | None = None  # where on the page (points from the left and from the top), for a row
    y: float | None = None

    def line(self) -> str:
        at = f" (x {self.x:.0f}, y {self.y:.0f})" if self.x is not None and self.y is not None else ""
        return f"page {self.page}{at}: {self.what}: '{self.text}'"


def extract(
    path: Path | str,
    pages: str | None = None,
    cmap: ColumnMap | None = None,
    workers: int | None = None,
    progress: Callable[[int], None] | None = None,
    standard_headers: dict[str, str] | None = None,
    decimal_mark: str | None = None,
    standard_decimal: str | None = None,
) -> Extraction:
    """Read the claimed bearing checks of a calc package PDF; ``standard_headers``: a standard's own symbols.
    How its numbers mark decimals (point, comma, either): ``decimal_mark`` (the reviewer's), else the column
    map's ``decimal_mark``, else ``standard_decimal`` (the standard's declaration), else points."""
    path = Path(path)
    cmap = cmap or default_map(standard_headers)
    doc = open_document(path)
    count = len(doc)
    doc.close()
    wanted = parse_pages(pages or cmap.pages, count, Location(str(path), 0, 0, "pages"))
    # a reviewer's own map may name heads without the trade's symbols: then every page with text is read;
    # the standard's own heads (its claim_headers) are its vocabulary, as the trade's symbols are
    custom_headers = cmap.headers != default_map(standard_headers).headers or bool(cmap.positions)
    vocabulary = page_vocabulary(standard_headers, any_text=custom_headers)
    del workers  # pages are read in the one pass, in order (kept for callers that name it)
    state = _State(decimal=decimal_in_force(decimal_mark, cmap, standard_decimal))
    claims: list[Claim] = []
    unread: list[Unread] = []
    warnings: list[str] = []
    per_page: dict[int, int] = {}
    parsed: dict = {}
    done: set[int] = set()

    def goes_on(number: int) -> bool:
        """The table at the foot of the page before may go on over this page without a header."""
        return state.open_at_end and number - 1 in done

    found = Scan()
    for number, data in scan_pages(path, wanted, vocabulary, goes_on, found):
        if data is None:
            data = page_words(path, [number], 1)[number]
        parsed[number] = data
        words, edges, problem = data
        if problem:
            warnings.append(problem)
        if state.open_at_end and number - 1 not in done:
            state.open_at_end = False
        done.add(number)
        page_claims = claims_of_page(group_lines(number, words), state, cmap, str(path), warnings, edges, unread)
        per_page[number] = len(page_claims)
        claims += page_claims
        if progress:
            progress(1)
    candidates, empty = found.candidates, found.empty
    warnings = found.warnings + warnings
    numbered = tuple(replace(c, id=f"p{c.where.page}-{i + 1}") for i, c in enumerate(claims))
    with_rows = {u.page for u in unread}
    for number in candidates:
        if per_page.get(number, 0) == 0 and number not in with_rows:
            unread.append(
                Unread(
                    number, "page with bearing-check vocabulary gave no claim", _vocabulary(parsed, number, vocabulary)
                )
            )
    unread.sort(key=lambda u: (u.page, u.what))
    return Extraction(
        numbered, tuple(warnings), len(wanted), tuple(sorted(done)), tuple(empty), tuple(candidates), tuple(unread)
    )


def decimal_in_force(given: str | None, cmap: ColumnMap, standard: str | None = None) -> str:
    """The decimal mark a calc is read with: the reviewer's on the command line, else a column map's, else
    the standard's own declaration, else decimal points."""
    mark = given or cmap.decimal_mark or standard or "point"
    if mark not in DECIMAL_MARKS:
        raise InputError(f"decimal mark '{mark}' must be one of {', '.join(DECIMAL_MARKS)}", Location("--decimal-mark"))
    return mark


def show_page(
    path: Path | str,
    number: int,
    cmap: ColumnMap | None = None,
    standard_headers: dict[str, str] | None = None,
    decimal_mark: str | None = None,
    standard_decimal: str | None = None,
) -> str:
    """The page as the reader sees it: each line with its position and what it became (a head and the
    columns found, units, a group, a claim, not read and why), and the cells of each head with their
    positions, so a reviewer can write a --map naming a head, a band or a column by its number."""
    path = Path(path)
    cmap = cmap or default_map(standard_headers)
    doc = open_document(path)
    count = len(doc)
    doc.close()
    if not 1 <= number <= count:
        raise InputError(f"page {number} is not in the document (1 to {count})", Location(str(path), 0, 0, "--show"))
    wanted = [n for n in (number - 1, number) if n >= 1]
    parsed = page_words(path, wanted, 1)
    state = _State(decimal=decimal_in_force(decimal_mark, cmap, standard_decimal))
    out = [f"{path.name}, page {number} as the reader sees it (x and y in points from the page's top left)"]
    for n in wanted:
        words, edges, problem = parsed[n]
        lines = group_lines(n, words)
        roles: dict[int, str] = {}
        warnings: list[str] = []
        unread: list[Unread] = []
        claims_of_page(lines, state, cmap, str(path), warnings, edges, unread, roles)
        if n != number:
            continue
        if problem:
            out.append(f"  {problem}")
        for i, line in enumerate(lines):
            role = roles.get(i, "")
            out.append(f"  y {line.top:6.1f}  x {line.words[0][1]:6.1f}  {line.text[:70]:<70}  {_arrow(role)}")
            if role.startswith("head"):
                cells = "  ".join(f"[{t} | x {x0:.0f}-{x1:.0f}]" for t, x0, x1 in head_cells(line))
                out.append(f"  {'':20}  cells: {cells}")
        for w in warnings:
            out.append(f"  warning: {w}")
    return "\n".join(out) + "\n"


def _arrow(role: str) -> str:
    return f"-> {role}" if role else ""


def _vocabulary(parsed: dict, number: int, vocabulary: Vocabulary) -> str:
    """The page's first line with the trade's symbols, to say where to look."""
    words = parsed.get(number, ([], [], ""))[0]
    for line in group_lines(number, words):
        if vocabulary.search(line.text):
            return line.text[:160]
    return ""


# ---------------------------------------------------------------- writing the claims file


def _force(value: float | None) -> str | None:
    return None if value is None else f"{value / 1000:.9g} kN"


def claims_yaml(extraction: Extraction, source: str, symbols: dict[str, Symbol] | None = None) -> str:
    """The claims file, its factors in the standard's own symbols (``symbols``; O86's words when None)."""
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
            item["factors"] = {standard_symbol(k, symbols or {}): _factor_text(k, v) for k, v in c.factors.items()}
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
    return header + _dump_claims(items)


# Characters that both PyYAML emitters write as they are: where every string of the file is made of them,
# libyaml's emitter gives the same bytes as PyYAML's own (tests/test_extract_speed.py checks it) in a
# tenth of the time. Others (tabs, control characters, line and paragraph separators, a byte-order mark,
# characters past U+FFFF) are escaped and folded differently by the two: the Python emitter writes those.
_C_EMITTER_SAFE = re.compile("[\x20-\x7e\xa0-\u2027\u202a-\ud7ff\ue000-\ufefe\uff00-\ufffd]*")


def _strings(node) -> list[str]:
    if isinstance(node, str):
        return [node]
    if isinstance(node, dict):
        return [s for k, v in node.items() for s in (*_strings(k), *_strings(v))]
    if isinstance(node, list):
        return [s for v in node for s in _strings(v)]
    return []


def _dump_claims(items: list[dict]) -> str:
    import yaml

    data = {"claims": items}
    fast = getattr(yaml, "CSafeDumper", None)
    dumper = fast if fast is not None and _C_EMITTER_SAFE.fullmatch("".join(_strings(data))) else yaml.SafeDumper
    return yaml.dump(data, Dumper=dumper, sort_keys=False, allow_unicode=True, width=120)


def _factor_text(name: str, value: float) -> float | str:
    if name == "fcp":
        return f"{value / 1e6:.4g} MPa"
    if name == "Ab":
        return f"{value * 1e6:.6g} mm**2"
    if name == "length":
        return f"{value * 1000:.4g} mm"
    return round(value, 6)
