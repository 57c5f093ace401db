"""Stage 5 (from a PDF): pull the claimed bearing checks out of a calc package.

A cheap text scan (pdfium) finds the pages that carry the trade's symbols; only those are
parsed for word positions (pdfplumber), in parallel over the cores. Lines of words become
tables by their headers (Qf, Qr, KB, ...), whether the table is ruled or aligned by position
only, and tables continue onto following pages with or without repeated headers. Worked
equations ("Qr = 45.2 kN >= Qf = 31.0 kN") are read with the location label above them. Every
claim keeps its page, its position and the raw text it came from.
"""

from __future__ import annotations

import os
import re
from collections.abc import Callable, Iterable
from concurrent.futures import ProcessPoolExecutor
from dataclasses import dataclass, field, replace
from pathlib import Path

from audit.core.errors import ErrorCollector, InputError, Location
from audit.core.located_yaml import read_yaml_file
from audit.core.units import parse_quantity
from audit.inputs.read_claims import Claim, Where

# ---------------------------------------------------------------- column map

# Order matters: the first field whose pattern matches a header cell takes it.
DEFAULT_HEADERS: dict[str, str] = {
    "length": r"^(bearing\s+length|length|l\s*b)\b",
    "utilisation": r"^(util|q\s*f\s*/\s*q\s*r|ratio|usage)",
    "Qf": r"^q\s*'?\s*f\s*'?(?![a-z])",
    "Qr": r"^q\s*'?\s*r\s*'?(?![a-z])",
    "KB": r"^k\s*b$",
    "KZcp": r"^k\s*zcp$",
    "KD": r"^k\s*d$",
    "KScp": r"^k\s*scp$",
    "fcp": r"^f\s*cp\b",
    "Ab": r"^a\s*b\s*'?(?![a-z])",
    "member": r"^(member|checked)\b",
    "kind": r"^(kind|check\s+type|type)\b",
    "adequate": r"^(ok\??|status|result|adequate|pass|check)\b",
    "location": r"^(location|bearing|label|mark|grid|at)\b",
}
NUMERIC_FIELDS = ("Qf", "Qr", "utilisation")
FIELD_DIMENSION = {"Qf": "force", "Qr": "force", "fcp": "stress", "Ab": "area", "length": "length"}
FACTOR_FIELDS = ("KB", "KZcp", "KD", "KScp", "fcp", "Ab", "length")
UNIT_ALIASES = {
    "kips": "kip",
    "k": "kip",
    "lbs": "lbf",
    "lb": "lbf",
    "#": "lbf",
    "kn": "kN",
    "mpa": "MPa",
    "mm2": "mm**2",
    "mm²": "mm**2",
    "in2": "in**2",
    "in²": "in**2",
}
CANDIDATE = re.compile(r"Q\s?'?\s?[fr]\b|Q[fr]'|F\s?cp|K\s?ZCP|KZcp|Qf|Qr", re.IGNORECASE)
MAX_PAGE_TEXT = 400_000  # characters; a page with more is skipped with a warning
MAX_PAGE_OBJECTS = 100_000  # drawing objects; a page with more is skipped with a warning


@dataclass(frozen=True)
class ColumnMap:
    headers: dict[str, re.Pattern[str]]
    units: dict[str, str] = field(default_factory=dict)
    pages: str | None = None
    kind: str = ""  # a kind for every claim read with this map


def default_map() -> ColumnMap:
    return ColumnMap({k: re.compile(v, re.IGNORECASE) for k, v in DEFAULT_HEADERS.items()})


def read_column_map(path: Path | str) -> ColumnMap:
    root = read_yaml_file(path)
    errors = ErrorCollector()
    if not isinstance(root.value, dict):
        raise InputError("a column map must be a mapping", root.loc)
    unknown = set(root.value) - {"columns", "pages", "kind"}
    for key in sorted(unknown):
        errors.add(f"unknown key '{key}' (allowed: columns, pages, kind)", root.key_loc(key))
    headers = dict(default_map().headers)
    units: dict[str, str] = {}
    columns = root.value.get("columns")
    for name, node in columns.value.items() if columns and isinstance(columns.value, dict) else []:
        if name not in DEFAULT_HEADERS:
            errors.add(f"unknown field '{name}' (known: {', '.join(DEFAULT_HEADERS)})", node.loc)
            continue
        spec = node.value if isinstance(node.value, dict) else {"header": node}
        pattern = spec.get("header")
        if pattern is not None:
            try:
                headers[name] = re.compile(str(pattern.value), re.IGNORECASE)
            except re.error as exc:
                errors.add(f"header pattern is not a valid regular expression: {exc}", pattern.loc)
        unit = spec.get("unit")
        if unit is not None:
            units[name] = str(unit.value)
    # fields named in the map are tried first, in the map's order
    if columns and isinstance(columns.value, dict):
        order = [k for k in columns.value if k in headers] + [k for k in headers if k not in columns.value]
        headers = {k: headers[k] for k in order}
    pages = root.value.get("pages")
    kind = root.value.get("kind")
    if kind is not None and kind.value not in ("local", "near-support"):
        errors.add("kind must be local or near-support", kind.loc)
    errors.raise_if_any()
    return ColumnMap(headers, units, str(pages.value) if pages else None, str(kind.value) if kind else "")


# ---------------------------------------------------------------- pages


def parse_pages(spec: str | None, count: int, where: Location) -> list[int]:
    """'12-30,35' -> [12..30, 35] (1-based), within the document."""
    if not spec:
        return list(range(1, count + 1))
    out: list[int] = []
    for part in str(spec).split(","):
        m = re.fullmatch(r"\s*(\d+)\s*(?:-\s*(\d+)\s*)?", part)
        if not m:
            raise InputError(f"pages '{spec}' must look like 12-30,35", where)
        a, b = int(m[1]), int(m[2] or m[1])
        if a < 1 or b < a:
            raise InputError(f"page range '{part.strip()}' is empty or starts below 1", where)
        if a > count:
            raise InputError(f"page {a} is beyond the document's {count} pages", where)
        out += range(a, min(b, count) + 1)
    return sorted(set(out))


def open_document(path: Path):
    """Open with pdfium, turning every failure into a one-line InputError."""
    import pypdfium2 as pdfium

    where = Location(str(path), 1, 1, "(document)")
    try:
        with path.open("rb") as handle:
            head = handle.read(1024)
    except OSError as exc:
        raise InputError(f"cannot read file: {exc.strerror or exc}", where) from None
    if b"%PDF-" not in head:
        raise InputError("not a PDF file (no %PDF- header)", where)
    try:
        return pdfium.PdfDocument(str(path))
    except pdfium.PdfiumError as exc:
        text = str(exc).lower()
        if "password" in text:
            raise InputError(
                "the PDF is encrypted: open it with its password and save an unprotected copy", where
            ) from None
        raise InputError(f"the PDF is damaged or truncated and cannot be read ({exc})", where) from None


def scan_pages(path: Path, pages: list[int], any_text: bool = False) -> tuple[list[int], list[int], list[str]]:
    """Cheap pass: (candidate pages, pages with no text layer, warnings).

    A candidate page carries the trade's symbols; with ``any_text`` (a column map of the
    reviewer's own headers) every page with text is a candidate.
    """
    import pypdfium2.raw as pdfium_raw

    doc = open_document(path)
    candidates, empty, warnings = [], [], []
    try:
        for number in pages:
            try:
                page = doc[number - 1]
                objects = pdfium_raw.FPDFPage_CountObjects(page.raw)
                if objects > MAX_PAGE_OBJECTS:
                    warnings.append(f"page {number}: {objects} drawing objects, too many to read; skipped")
                    page.close()
                    continue
                textpage = page.get_textpage()
                count = textpage.count_chars()
                if count > MAX_PAGE_TEXT:
                    warnings.append(f"page {number}: {count} characters, too many to read; skipped")
                    continue
                text = textpage.get_text_range() if count else ""
                textpage.close()
                page.close()
            except Exception as exc:  # a damaged page must not stop the others
                warnings.append(f"page {number}: cannot be read ({type(exc).__name__}); skipped")
                continue
            if not text.strip():
                empty.append(number)
            elif any_text or CANDIDATE.search(text):
                candidates.append(number)
    finally:
        doc.close()
    return candidates, empty, warnings


# A page's words as plain tuples (cheap to send between processes): (text, x0, x1, top, bottom)
WordT = tuple[str, float, float, float, float]
# A vertical ruling segment: (x, top, bottom)
EdgeT = tuple[float, float, float]
PageData = tuple[list[WordT], list[EdgeT], str]


def _words_of_pages(args: tuple[str, list[int]]) -> list[tuple[int, list[WordT], list[EdgeT], str]]:
    import pdfplumber

    path, pages = args
    out = []
    with pdfplumber.open(path) as pdf:
        for number in pages:
            try:
                page = pdf.pages[number - 1]
                words = page.extract_words(keep_blank_chars=False, x_tolerance=1.5, y_tolerance=2.5)
                edges = [
                    (round(e["x0"], 1), e["top"], e["bottom"])
                    for e in page.edges
                    if e["orientation"] == "v" and e["bottom"] - e["top"] > 3
                ]
                out.append((number, [(w["text"], w["x0"], w["x1"], w["top"], w["bottom"]) for w in words], edges, ""))
                page.flush_cache()
            except Exception as exc:
                out.append((number, [], [], f"page {number}: cannot be parsed ({type(exc).__name__}); skipped"))
    return out


def page_words(
    path: Path, pages: list[int], workers: int, progress: Callable[[int], None] | None = None
) -> dict[int, PageData]:
    """Word positions of the given pages, in parallel over ``workers`` processes."""
    if not pages:
        return {}
    if workers <= 1 or len(pages) < 8:
        results = _words_of_pages((str(path), pages))
        if progress:
            progress(len(pages))
        return {n: (w, e, p) for n, w, e, p in results}
    chunk = max(2, len(pages) // (workers * 4))
    chunks = [pages[i : i + chunk] for i in range(0, len(pages), chunk)]
    out: dict[int, PageData] = {}
    with ProcessPoolExecutor(max_workers=workers) as pool:
        for results in pool.map(_words_of_pages, [(str(path), c) for c in chunks]):
            for n, w, e, p in results:
                out[n] = (w, e, p)
            if progress:
                progress(len(results))
    return out


# ---------------------------------------------------------------- lines and cells


@dataclass(frozen=True)
class Line:
    page: int
    top: float
    words: tuple[WordT, ...]

    @property
    def text(self) -> str:
        return " ".join(w[0] for w in self.words)


def group_lines(page: int, words: Iterable[WordT], tolerance: float = 2.5) -> list[Line]:
    rows: list[list[WordT]] = []
    for w in sorted(words, key=lambda w: (round(w[3], 1), w[1])):
        if rows and abs(rows[-1][0][3] - w[3]) <= tolerance:
            rows[-1].append(w)
        else:
            rows.append([w])
    return [Line(page, r[0][3], tuple(sorted(r, key=lambda w: w[1]))) for r in rows]


def cells_of(line: Line, gap: float = 7.0) -> list[tuple[str, float, float]]:
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
    return Table(tuple(f[0] for f in found), tuple(bounds), units, "", "near-support" if near else "")


def _row_cells(line: Line, table: Table) -> dict[str, str] | None:
    """Words placed in the table's columns, or None when a word straddles columns (running text)."""
    texts: dict[int, list[str]] = {}
    for text, x0, x1, _, _ in line.words:
        centre = (x0 + x1) / 2
        index = next((i for i, (a, b) in enumerate(table.bounds) if a <= centre < b), None)
        if index is None:
            return None
        a, b = table.bounds[index]
        if x0 < a - 3 or x1 > b + 3:
            return None
        texts.setdefault(index, []).append(text)
    return {table.fields[i]: " ".join(t) for i, t in texts.items() if table.fields[i]}


# ---------------------------------------------------------------- values

STARTS_NUMERIC = re.compile(r"^\s*[-+\u2212]?\d")
NUMBER = re.compile(r"^[-+]?(\d{1,3}(,\d{3})+|\d+)(\.\d+)?$")


def parse_number(text: str) -> float | None:
    text = text.strip().replace("\u2212", "-")
    if not NUMBER.match(text):
        return None
    return float(text.replace(",", ""))


def unit_name(text: str) -> str:
    text = text.strip().strip(".")
    return UNIT_ALIASES.get(text.lower(), UNIT_ALIASES.get(text, text))


def parse_value(cell: str, name: str, table_units: dict[str, str], where: Location) -> float:
    """A cell's value in SI (N, Pa, m, m²) or as a plain number for factors."""
    cell = cell.strip()
    m = re.match(r"^([-+\u2212]?[\d,]*\.?\d+)\s*(.*)$", cell)
    if not m:
        raise InputError(f"'{cell}' is not a number", where)
    number = parse_number(m[1])
    if number is None:
        raise InputError(f"'{cell}' is not a number", where)
    unit = m[2].strip()
    if name == "utilisation":
        return number / 100.0 if unit == "%" else number
    dimension = FIELD_DIMENSION.get(name)
    if dimension is None:
        return number
    unit = unit or table_units.get(name, "")
    if not unit:
        raise InputError(f"'{cell}' for {name} has no unit in the cell or the header; give one in a --map", where)
    return parse_quantity(f"{number!r} {unit_name(unit)}", dimension, where)


def parse_adequate(text: str) -> bool | None:
    t = text.strip().lower().replace(".", "")
    if t in ("ok", "yes", "pass", "passes", "adequate", "✓", "y", "satisfactory"):
        return True
    if t in ("ng", "no", "fail", "fails", "inadequate", "not ok", "✗", "n"):
        return False
    return None


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
        adequate=parse_adequate(cells["adequate"]) if "adequate" in cells else None,
        text=line.text,
        loc=where,
    )


EQUATION = re.compile(
    r"(?P<a>Q\s?'?\s?[rf]\s?'?)\s*=\s*(?P<av>[-\d,]*\.?\d+)\s*(?P<au>[A-Za-z]+)?\s*"
    r"(?P<op>>=|≥|=>|>|<=|≤|=<|<)\s*"
    r"(?P<b>Q\s?'?\s?[rf]\s?'?)\s*=\s*(?P<bv>[-\d,]*\.?\d+)\s*(?P<bu>[A-Za-z]+)?",
)
LABEL_LINE = re.compile(r"^(location|bearing|at|check at)\s*[:=\-–]\s*(?P<label>.+?)\s*$", re.IGNORECASE)
MEMBER_LINE = re.compile(r"member(\s+checked)?\s*[:=\-–]\s*(?P<member>[^\s,;]+)", re.IGNORECASE)


def _claim_from_equation(match: re.Match, line: Line, above: list[Line], name: str) -> Claim | None:
    where = Location(name, line.page, int(line.words[0][1]), "equation")
    values: dict[str, float] = {}
    raw_symbols = ""
    for sym, val, unit in (("a", "av", "au"), ("b", "bv", "bu")):
        symbol = match[sym].replace(" ", "")
        raw_symbols += symbol
        key = "Qr" if "r" in symbol.lower() else "Qf"
        if not match[unit]:
            raise InputError(f"'{match[0]}' gives {key} without a unit", where)
        values[key] = parse_quantity(f"{parse_number(match[val])!r} {unit_name(match[unit])}", "force", where)
    if set(values) != {"Qf", "Qr"}:
        return None
    label = ""
    member = ""
    prefix = line.text[: line.text.find(match[0])].strip().rstrip(":").strip()
    if prefix and not LABEL_LINE.match(prefix):
        label = prefix
    near = "'" in raw_symbols
    for previous in reversed(above[-8:]):
        text = previous.text
        if not label and (m := LABEL_LINE.match(text)):
            label = m["label"]
        if not member and (m := MEMBER_LINE.search(text)):
            member = m["member"]
        near = near or bool(re.search(r"near[- ]support|squeez", text, re.IGNORECASE))
        if label and member:
            break
    if not label:
        raise InputError(f"'{match[0]}' has no location label above it", where)
    mm = MEMBER_LINE.search(line.text)
    if mm:
        member = mm["member"]
    tail = line.text[line.text.find(match[0]) + len(match[0]) :]
    adequate = parse_adequate(tail.split()[0]) if tail.split() else None
    if adequate is None:
        adequate = values["Qr"] >= values["Qf"]
    return Claim(
        id="",
        where=Where(page=line.page, table="worked equation", x=round(line.words[0][1], 1), y=round(line.top, 1)),
        label=label,
        member=member,
        kind="near-support" if near else "local",
        qf=values["Qf"],
        qr=values["Qr"],
        utilisation=None,
        adequate=adequate,
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
) -> list[Claim]:
    out: list[Claim] = []
    table = state.table if state.open_at_end else None
    continuing = table is not None  # lines above the first row (a running header) do not end it
    row_table: Table | None = None
    last_row_index = -1
    for i, line in enumerate(lines):
        header = header_of(line, cmap, edges)
        if header is not None:
            state.table_count += 1
            table = replace(header, name=f"table {state.table_count} (p. {line.page})")
            state.last_location = ""
            row_table, continuing = None, False
            continue
        eq = EQUATION.search(line.text)
        if eq:
            try:
                claim = _claim_from_equation(eq, line, lines[:i], name)
                if claim:
                    out.append(claim)
            except InputError as exc:
                warnings.append(exc.one_line())
            table, row_table, continuing = None, None, False
            continue
        if table is None:
            continue
        cells = _row_cells(line, table)
        if cells is None or not any(STARTS_NUMERIC.match(cells.get(f, "")) for f in NUMERIC_FIELDS):
            if not (continuing and i < 3):
                table = None  # running text or a new block ends the table
            continue
        continuing = False
        try:
            out.append(_claim_from_row(cells, table, line, state, cmap, name))
            row_table, last_row_index = table, i
        except InputError as exc:
            warnings.append(f"{exc.one_line()} (text: '{line.text[:120]}')")
    # a table whose last row stands at the foot of the page (only a footer below) may go on
    state.open_at_end = row_table is not None and last_row_index >= len(lines) - 3
    state.table = row_table
    return out


def extract(
    path: Path | str,
    pages: str | None = None,
    cmap: ColumnMap | None = None,
    workers: int | None = None,
    progress: Callable[[int], None] | None = None,
) -> Extraction:
    """Read the claimed bearing checks of a calc package PDF."""
    path = Path(path)
    cmap = cmap or default_map()
    doc = open_document(path)
    count = len(doc)
    doc.close()
    wanted = parse_pages(pages or cmap.pages, count, Location(str(path), 0, 0, "pages"))
    custom_headers = cmap.headers != default_map().headers
    candidates, empty, warnings = scan_pages(path, wanted, any_text=custom_headers)
    workers = workers if workers is not None else max(1, min(os.cpu_count() or 1, 8))
    parsed = page_words(path, candidates, workers, progress)
    state = _State()
    claims: list[Claim] = []
    wanted_set = set(wanted)
    queue = sorted(parsed)
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
        claims += claims_of_page(group_lines(number, words), state, cmap, str(path), warnings, edges)
        following = number + 1
        if state.open_at_end and following in wanted_set and following not in done and following not in queue:
            queue.insert(0, following)  # the table may go on over the page without a header
    numbered = tuple(replace(c, id=f"p{c.where.page}-{i + 1}") for i, c in enumerate(claims))
    return Extraction(numbered, tuple(warnings), len(wanted), tuple(sorted(done)), tuple(empty))


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
        "# Confirm each against the calc (page, position and raw text are given) before relying on it.\n"
    )
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
