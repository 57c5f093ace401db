"""The column map: which header text names which field of a claim, the default and the reviewer's own."""

from __future__ import annotations

import re
from dataclasses import dataclass, field
from pathlib import Path

from audit.core.errors import ErrorCollector, InputError
from audit.core.located_yaml import read_yaml_file
from audit.standards.resistance import DURATION, LENGTH, SERVICE, SIZE, STRENGTH, Symbol

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
# The reader names a factor column by its role, in O86's words; under another standard the column is that
# standard's own symbol of the role (KB is NDS's Cb and EN 1995's kc,90; fcp is Fc-perp and fc,90,k).
FACTOR_ROLES = {"KB": LENGTH, "KZcp": SIZE, "KD": DURATION, "KScp": SERVICE, "fcp": STRENGTH}


def standard_symbol(name: str, symbols: dict[str, Symbol]) -> str:
    """The standard's own symbol for a factor the reader named (the name itself where the standard uses it, or
    where it has no symbol of that role: the claims reader then names the key and the symbols it takes)."""
    if name in symbols or name not in FACTOR_ROLES:
        return name
    return next((s for s, sym in symbols.items() if sym.role == FACTOR_ROLES[name]), name)


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
# The trade's symbols on a page worth reading: O86 (Qf, Qr, Fcp, KZcp), US NDS (P', Fc⊥), EN 1995 (F_c,90,d).
# Every symbol starts with one of the letters in the lookahead, which lets the search skip the other
# characters of a page's text quickly (this search runs over the text of every page).
CANDIDATE = re.compile(
    r"(?=[fkpq])(?:Q\s?'?\s?[fr]\b|Q[fr]'|F\s?cp|K\s?ZCP|KZcp|Qf|Qr|\bP\s?'\s?=|F\s?c\s?⊥|F\s?c\s?-?perp|[Ff]\s?_?c\s?,\s?90)",
    re.IGNORECASE,
)


@dataclass(frozen=True)
class Vocabulary:
    """What makes a page worth reading: the trade's symbols, and the head texts of a standard's value
    columns (its claim_headers for Qf, Qr, the utilisation and the factors, found as words anywhere on
    the page). ``any_text``: every page with text (a reviewer's own column map names heads the reader
    cannot guess)."""

    patterns: tuple[re.Pattern[str], ...] = (CANDIDATE,)
    any_text: bool = False

    def search(self, text: str) -> re.Match[str] | None:
        for pattern in self.patterns:
            if (found := pattern.search(text)) is not None:
                return found
        return None

    def picks(self, text: str) -> bool:
        return bool(text.strip()) and (self.any_text or self.search(text) is not None)


def page_vocabulary(standard_headers: dict[str, str] | None = None, any_text: bool = False) -> Vocabulary:
    """The vocabulary of the pages to read under a standard whose sheets use ``standard_headers``."""
    own = [_on_the_page(v) for k, v in (standard_headers or {}).items() if k in (*NUMERIC_FIELDS, *FACTOR_FIELDS)]
    if not own:
        return Vocabulary(any_text=any_text)
    try:
        words = re.compile(r"(?<![A-Za-z0-9])(?:" + "|".join(f"(?:{p})" for p in own) + ")", re.IGNORECASE)
    except re.error:  # a head pattern that does not read unanchored: every page with text is read
        return Vocabulary(any_text=True)
    return Vocabulary((CANDIDATE, words), any_text)


def _on_the_page(head: str) -> str:
    """A head cell's pattern (anchored at the cell's start and end) as a pattern for a word of a page."""
    head = re.sub(r"(?<![\\\[])\^", "", head)
    return re.sub(r"(?<!\\)\$", "(?![A-Za-z0-9])", head)


@dataclass(frozen=True)
class ColumnMap:
    headers: dict[str, re.Pattern[str]]
    units: dict[str, str] = field(default_factory=dict)
    pages: str | None = None
    kind: str = ""  # a kind for every claim read with this map
    positions: dict[int, str] = field(default_factory=dict)  # column number (from 1, left) -> field
    bands: dict[str, re.Pattern[str]] = field(default_factory=dict)  # field -> a band over its column
    decimal_mark: str = ""  # how the calc's numbers mark decimals (point, comma, either); '' the standard's
    # every header pattern in one: a cell none of them names (most cells of a page: its running text) is
    # known as such in one search; None where the patterns cannot be joined (back references, mixed flags)
    any_head: re.Pattern[str] | None = field(init=False, default=None, compare=False, repr=False)

    def __post_init__(self) -> None:
        object.__setattr__(self, "any_head", _joined(tuple(self.headers.values())))


def _joined(patterns: tuple[re.Pattern[str], ...]) -> re.Pattern[str] | None:
    """One pattern that matches wherever one of ``patterns`` does."""
    flags = {p.flags for p in patterns}
    if len(flags) != 1 or any(re.search(r"\\\d|\(\?P=|\(\?\(", p.pattern) for p in patterns):
        return None
    try:
        return re.compile("|".join(f"(?:{p.pattern})" for p in patterns), flags.pop())
    except re.error:
        return None


def default_map(standard_headers: dict[str, str] | None = None) -> ColumnMap:
    """The headers every calc sheet uses, with a standard's own symbols tried first (e.g. NDS P', Cb)."""
    extra = standard_headers or {}
    return ColumnMap(
        {
            k: re.compile(f"(?:{extra[k]})|(?:{v})" if k in extra else v, re.IGNORECASE)
            for k, v in DEFAULT_HEADERS.items()
        }
    )


def read_column_map(path: Path | str, standard_headers: dict[str, str] | None = None) -> ColumnMap:
    root = read_yaml_file(path)
    errors = ErrorCollector()
    if not isinstance(root.value, dict):
        raise InputError("a column map must be a mapping", root.loc)
    unknown = set(root.value) - {"columns", "pages", "kind", "decimal_mark"}
    for key in sorted(unknown):
        errors.add(f"unknown key '{key}' (allowed: columns, pages, kind, decimal_mark)", root.key_loc(key))
    headers = dict(default_map(standard_headers).headers)
    units: dict[str, str] = {}
    positions: dict[int, str] = {}
    bands: dict[str, re.Pattern[str]] = {}
    columns = root.value.get("columns")
    for name, node in columns.value.items() if columns and isinstance(columns.value, dict) else []:
        if name not in DEFAULT_HEADERS:
            errors.add(f"unknown field '{name}' (known: {', '.join(DEFAULT_HEADERS)})", node.loc)
            continue
        spec = node.value if isinstance(node.value, dict) else {"header": node}
        for key in sorted(set(spec) - {"header", "unit", "column", "band"}):
            errors.add(f"unknown key '{key}' (allowed: header, unit, column, band)", node.key_loc(key))
        pattern = spec.get("header")
        if pattern is not None:
            try:
                headers[name] = re.compile(str(pattern.value), re.IGNORECASE)
            except re.error as exc:
                errors.add(f"header pattern is not a valid regular expression: {exc}", pattern.loc)
        unit = spec.get("unit")
        if unit is not None:
            units[name] = str(unit.value)
        column = spec.get("column")
        if column is not None:
            if isinstance(column.value, bool) or not isinstance(column.value, int) or column.value < 1:
                errors.add("column must be a whole number from 1 (the leftmost column of the table)", column.loc)
            elif column.value in positions:
                errors.add(f"column {column.value} is already given to {positions[column.value]}", column.loc)
            else:
                positions[column.value] = name
        band = spec.get("band")
        if band is not None:
            try:
                bands[name] = re.compile(str(band.value), re.IGNORECASE)
            except re.error as exc:
                errors.add(f"band pattern is not a valid regular expression: {exc}", band.loc)
    # fields named in the map are tried first, in the map's order
    if columns and isinstance(columns.value, dict):
        order = [k for k in columns.value if k in headers] + [k for k in headers if k not in columns.value]
        headers = {k: headers[k] for k in order}
    pages = root.value.get("pages")
    kind = root.value.get("kind")
    if kind is not None and kind.value not in ("local", "near-support"):
        errors.add("kind must be local or near-support", kind.loc)
    decimal = root.value.get("decimal_mark")
    if decimal is not None and decimal.value not in ("point", "comma", "either"):
        errors.add("decimal_mark must be point, comma or either", decimal.loc)
    errors.raise_if_any()
    return ColumnMap(
        headers,
        units,
        str(pages.value) if pages else None,
        str(kind.value) if kind else "",
        positions,
        bands,
        str(decimal.value) if decimal is not None else "",
    )
