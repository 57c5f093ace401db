"""A rule pack as a sheet a firm can verify, and the sheet read back into a firm pack.

Every value of a pack file (a mapping with ``value`` or ``factors`` and a ``status``) is one row of the
sheet 'Values', named by its key (``fcp/sawn_lumber/D.Fir-L``, ``combinations/D+L``), with the value as
recalled, its clause, source and status, and empty columns for the value as printed, the edition, the page,
who verified it and when. Read back, each verified value is checked on its own (its form against the recalled
one, then through the pack reader, plausible ranges and all) and every problem is one line naming the file,
the sheet, the row and the column. The firm pack is the source pack with the verified values and their
provenance; a value left unverified keeps its recalled value and status.
"""

from __future__ import annotations

import copy
import datetime as dt
import math
from collections.abc import Callable
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import yaml

from audit.core.errors import ErrorCollector, InputError, InputErrors, Location
from audit.core.located_yaml import MAX_FILE_BYTES, Node, read_yaml_text
from audit.core.outfiles import require_input_file
from audit.core.units import DIMENSIONS, is_number_and_unit, parse_quantity

VALUES_SHEET = "Values"
PACK_SHEET = "Pack"
# The columns of sheet 'Values', written and read by these names (report/pack_sheet.py writes them)
COLUMNS = (
    "key",
    "recalled value",
    "unit",
    "clause",
    "source",
    "status",
    "verified value",
    "edition",
    "page",
    "verified by",
    "date",
)
FILLED_BY_FIRM = COLUMNS[6:]
# The rows of sheet 'Pack': label -> what it holds
PACK_ROWS = ("source pack", "source file", "firm pack id", "firm pack title")
HEAD_KEYS = ("kind", "id", "title", "edition", "provenance", "standard", "format", "cases")
VALUE_FIELDS = ("value", "factors")  # the field of a sourced entry that holds its value
SIBLING_VALUES = ("tension_face", "ratio")  # a second value that shares its entry's clause, source and status
WORKBOOK_EXPANDED_BYTES = 4 * MAX_FILE_BYTES
CELL_TEXT = 32_767  # the most a spreadsheet cell holds: a list or mapping longer than that is not one typed
VERIFIED = "verified"  # a status that starts so is verified; one with "from memory" is recalled


@dataclass(frozen=True)
class PackValue:
    """One value of a pack file: where it sits and what the file says of it."""

    key: str
    path: tuple[str | int, ...]  # to the entry (the mapping that holds value, clause, source and status)
    field: str  # value, factors or tension_face
    value: Any
    unit: str
    clause: str
    source: str
    status: str


def pack_values(data: dict[str, Any]) -> list[PackValue]:
    """Every value of a pack file's data, in the file's order."""
    out: list[PackValue] = []
    for key, item in data.items():
        if key not in HEAD_KEYS:
            _walk(item, (key,), out)
    return out


def _walk(node: Any, path: tuple[str | int, ...], out: list[PackValue]) -> None:
    if isinstance(node, dict):
        field = next((f for f in VALUE_FIELDS if f in node), None)
        if field is not None and "status" in node:
            for name in (field, *(s for s in SIBLING_VALUES if s in node)):
                key = "/".join(str(p) for p in path) + ("" if name == field else f"/{name}")
                text = {k: str(node.get(k, "")) for k in ("unit", "clause", "source", "status")}
                out.append(PackValue(key, path, name, node[name], text["unit"], *(text[k] for k in COLUMNS[3:6])))
            return
        for key, item in node.items():
            _walk(item, (*path, key), out)
    elif isinstance(node, list):
        for i, item in enumerate(node):
            named = item.get("name") if isinstance(item, dict) else None
            _walk(item, (*path, str(named) if named is not None else i), out)


def shown(value: Any) -> Any:
    """A value as a cell holds it: a number or text as it is, a list or mapping in YAML's flow form."""
    if isinstance(value, (list, dict)):
        return yaml.safe_dump(value, default_flow_style=True, sort_keys=False, width=10_000).strip()
    return value


def is_verified(status: str) -> bool:
    return status.strip().lower().startswith(VERIFIED)


def is_recalled(status: str) -> bool:
    return "from memory" in status.lower()


# ---------------------------------------------------------------- reading the sheet back


@dataclass(frozen=True)
class Verified:
    """A value the firm verified, and where on the sheet it was given."""

    entry: PackValue
    value: Any
    clause: str
    edition: str
    page: str
    by: str
    date: str
    row: int

    @property
    def differs(self) -> bool:
        return not _same(self.value, self.entry.value)


@dataclass(frozen=True)
class Adoption:
    source_id: str
    firm_id: str
    firm_title: str
    verified: tuple[Verified, ...]
    data: dict[str, Any]  # the firm pack's data, ready to write
    total: int  # values in the pack


def _cells(path: Path, data_only: bool) -> dict[str, list[list[Any]]]:
    from openpyxl import load_workbook

    where = Location(str(path))
    try:
        book = load_workbook(path, read_only=True, data_only=data_only)
    except Exception:  # openpyxl, zipfile and the XML parser each raise their own kinds on a damaged file
        raise InputError("--adopt: not a readable workbook", where) from None
    try:
        out = {}
        for sheet in (VALUES_SHEET, PACK_SHEET):
            if sheet not in book.sheetnames:
                raise InputError(f"--adopt: the workbook has no sheet '{sheet}' (write one with rules --sheet)", where)
            out[sheet] = [list(row) for row in book[sheet].iter_rows(values_only=True)]
        return out
    except InputError:
        raise
    except Exception:  # a sheet whose XML is broken fails only when its rows are read
        raise InputError("--adopt: not a readable workbook: a sheet is damaged", where) from None
    finally:
        book.close()


def read_sheet(path: Path) -> tuple[dict[str, list[list[Any]]], dict[str, list[list[Any]]]]:
    """The cells of both sheets, as values and as written (formulas), or one located line."""
    from zipfile import BadZipFile, ZipFile

    size = require_input_file(path, "--adopt").st_size
    if size > MAX_FILE_BYTES:
        raise InputError(f"--adopt: file is {size} bytes, over the {MAX_FILE_BYTES} byte limit", Location(str(path)))
    try:
        with ZipFile(path) as archive:
            expanded = sum(info.file_size for info in archive.infolist())
    except (BadZipFile, OSError, ValueError):
        raise InputError("--adopt: not a readable workbook (not a zip file)", Location(str(path))) from None
    if expanded > WORKBOOK_EXPANDED_BYTES:
        raise InputError(
            f"--adopt: the workbook expands to {expanded:,} bytes, over the {WORKBOOK_EXPANDED_BYTES:,} limit",
            Location(str(path)),
        )
    return _cells(path, True), _cells(path, False)


def _text(value: Any) -> str:
    if value is None:
        return ""
    if isinstance(value, dt.datetime):
        return value.date().isoformat()
    if isinstance(value, float) and value.is_integer():
        return str(int(value))
    return str(value).strip()


class _Sheet:
    """Cells of one sheet with located errors: file [sheet]:row:column: column name."""

    def __init__(self, path: Path, sheet: str, values: list[list[Any]], written: list[list[Any]]) -> None:
        self.name, self.sheet, self.values, self.written = str(path), sheet, values, written
        self.errors = ErrorCollector()

    def at(self, row: int, col: int, column: str) -> Location:
        return Location(f"{self.name} [{self.sheet}]", row, col + 1, column)

    def cell(self, row: int, col: int, column: str) -> Any:
        """The value of a cell (1-based row, 0-based column); a formula with no saved value is an error."""
        line = self.values[row - 1] if row <= len(self.values) else []
        value = line[col] if col < len(line) else None
        if value is None:
            formula = self.written[row - 1] if row <= len(self.written) else []
            if col < len(formula) and isinstance(formula[col], str) and formula[col].startswith("="):
                self.errors.add(
                    "a formula with no saved value (the workbook was not recalculated); type the value",
                    self.at(row, col, column),
                )
        return value


def adopt_sheet(path: Path, source_of: Callable[[str, Location], dict[str, Any]], out: Path) -> Adoption:
    """The firm pack a filled sheet makes of its source pack (``source_of`` gives a pack file's data by id),
    or every problem, located."""
    values, written = read_sheet(path)
    pack = _Sheet(path, PACK_SHEET, values[PACK_SHEET], written[PACK_SHEET])
    labels = {_text(r[0]) if r else "": i for i, r in enumerate(pack.values, start=1)}
    given = {name: _text(pack.cell(labels[name], 1, name)) if name in labels else "" for name in PACK_ROWS}
    source_id = given["source pack"]
    if not source_id:
        raise InputError(
            "the pack the sheet was written from is not named", pack.at(labels.get("source pack", 1), 1, "source pack")
        )
    source = source_of(source_id, pack.at(labels["source pack"], 1, "source pack"))
    sheet = _Sheet(path, VALUES_SHEET, values[VALUES_SHEET], written[VALUES_SHEET])
    head = [_text(h) for h in (sheet.values[0] if sheet.values else [])]
    missing = [c for c in COLUMNS if c not in head]
    if missing:
        where = sheet.at(1, len(head), missing[0])
        raise InputError(f"the header row lacks the column '{missing[0]}' (write the sheet with rules --sheet)", where)
    col = {c: head.index(c) for c in COLUMNS}
    entries = {e.key: e for e in pack_values(source)}
    seen: dict[str, int] = {}
    verified: list[Verified] = []
    for row in range(2, len(sheet.values) + 1):
        cells = {c: sheet.cell(row, col[c], c) for c in ("key", *FILLED_BY_FIRM, "clause")}
        key = _text(cells["key"])
        if not key and not any(_text(cells[c]) for c in FILLED_BY_FIRM):
            continue  # an empty row
        if key not in entries:
            sheet.errors.add(
                f"no value '{key}' in rule pack {source_id}; keep the keys as written", sheet.at(row, col["key"], "key")
            )
            continue
        if key in seen:
            sheet.errors.add(
                f"'{key}' is also on row {seen[key]}; give each value once", sheet.at(row, col["key"], "key")
            )
            continue
        seen[key] = row
        found = _verified_row(sheet, row, col, cells, entries[key])
        if found is not None:
            verified.append(found)
    _check_shared_status(sheet, verified, entries, col)
    sheet.errors.errors.extend(pack.errors.errors)
    for item in verified:
        _check_through_reader(sheet, source, item, col)
    sheet.errors.raise_if_any()
    firm_id = given["firm pack id"] or out.stem
    if firm_id == source_id:
        where = pack.at(labels.get("firm pack id", 1), 1, "firm pack id")
        raise InputError(f"the firm pack needs an id of its own, not {source_id}", where)
    data = firm_pack(source, verified, firm_id, given["firm pack title"], source_id)
    return Adoption(source_id, firm_id, str(data["title"]), tuple(verified), data, len(entries))


def _verified_row(
    sheet: _Sheet, row: int, col: dict[str, int], cells: dict[str, Any], entry: PackValue
) -> Verified | None:
    raw = cells["verified value"]
    who, when = _text(cells["verified by"]), cells["date"]
    if raw is None or _text(raw) == "":
        if who or _text(when):
            sheet.errors.add(
                "verified by or date is filled but the verified value is empty: enter the value as printed "
                "(the recalled one where it agrees)",
                sheet.at(row, col["verified value"], "verified value"),
            )
        return None
    before = len(sheet.errors.errors)
    value = _read_value(sheet, row, col["verified value"], raw, entry.value)
    edition = _text(cells["edition"])
    if not edition:
        sheet.errors.add("the edition the value was checked against is empty", sheet.at(row, col["edition"], "edition"))
    if not who:
        sheet.errors.add("who verified the value is empty", sheet.at(row, col["verified by"], "verified by"))
    date = _date(sheet, row, col["date"], when)
    if len(sheet.errors.errors) > before:
        return None
    clause = _text(cells["clause"]) or entry.clause
    return Verified(entry, value, clause, edition, _text(cells["page"]), who, date, row)


def _date(sheet: _Sheet, row: int, col: int, when: Any) -> str:
    if isinstance(when, (dt.date, dt.datetime)):
        return _text(when)
    text = _text(when)
    try:
        return dt.date.fromisoformat(text).isoformat()
    except ValueError:
        sheet.errors.add(f"date '{text}' is not a date (e.g. 2026-12-03)", sheet.at(row, col, "date"))
        return ""


def _dimension(text: str) -> str | None:
    for name in DIMENSIONS:
        try:
            parse_quantity(text, name, Location(""))
            return name
        except InputError:
            continue
    return None


def _read_value(sheet: _Sheet, row: int, col: int, raw: Any, recalled: Any) -> Any:
    """The verified cell in the recalled value's form: a number, a quantity of its kind, text, a list or mapping."""
    where = sheet.at(row, col, "verified value")
    if isinstance(recalled, bool) or recalled is None:
        return raw
    if isinstance(recalled, (int, float)):
        number = raw if isinstance(raw, (int, float)) and not isinstance(raw, bool) else _float(_text(raw))
        if number is None or not math.isfinite(number):
            sheet.errors.add(f"'{_text(raw)}' is not a plain number (the recalled value is {recalled})", where)
        return number
    if isinstance(recalled, str):
        text = _text(raw)
        if is_number_and_unit(recalled):
            kind = _dimension(recalled)
            if not is_number_and_unit(text) or _dimension(text) != kind:
                sheet.errors.add(f"'{text}' is not a {kind} with a unit, as the recalled '{recalled}' is", where)
        return text
    text = _text(raw)
    value = None
    if len(text) <= CELL_TEXT:
        try:  # the located reader: it refuses an alias bomb or deep nesting as it would in a pack file
            value = _plain(read_yaml_text(text, "(cell)"))
        except InputError:
            value = None
    if type(value) is not type(recalled):
        form = "a list in brackets, e.g. " if isinstance(recalled, list) else "a mapping in braces, e.g. "
        sheet.errors.add(f"'{_text(raw)}' cannot be read as {form}{shown(recalled)}", where)
    return value


def _plain(node: Node) -> Any:
    if isinstance(node.value, dict):
        return {str(k): _plain(v) for k, v in node.value.items()}
    if isinstance(node.value, list):
        return [_plain(v) for v in node.value]
    return node.value


def _float(text: str) -> float | None:
    try:
        return float(text)
    except ValueError:
        return None


def _check_shared_status(
    sheet: _Sheet, verified: list[Verified], entries: dict[str, PackValue], col: dict[str, int]
) -> None:
    """A value and its sibling (a glulam's tension-face strength) share one status: verify both or neither."""
    keys = {v.entry.key for v in verified}
    for v in verified:
        for other in entries.values():
            if other.path == v.entry.path and other.key != v.entry.key and other.key not in keys:
                sheet.errors.add(
                    f"'{other.key}' shares this value's status in the pack: verify it too, or neither",
                    sheet.at(v.row, col["verified value"], "verified value"),
                )


def _check_through_reader(sheet: _Sheet, source: dict[str, Any], item: Verified, col: dict[str, int]) -> None:
    """The pack with this one value changed must read: the reader's own checks (plausible ranges, shapes)."""
    trial = copy.deepcopy(source)
    _entry_of(trial, item.entry.path)[item.entry.field] = item.value
    try:
        read_pack_text(yaml.safe_dump(trial, sort_keys=False, allow_unicode=True), "(firm pack)")
    except InputError as exc:
        problems = exc.errors if isinstance(exc, InputErrors) else [exc]
        for problem in problems:
            sheet.errors.add(problem.message, sheet.at(item.row, col["verified value"], "verified value"))


def read_pack_text(text: str, name: str) -> object:
    """Read a pack from text as ``--rules-dir`` would read the file: by its kind and its standard."""
    from audit.standards.packs import read_combination_pack
    from audit.standards.registry import standard_named

    root = read_yaml_text(text, name)
    kind = root.value.get("kind") if isinstance(root.value, dict) else None
    if kind is not None and kind.value == "combinations":
        return read_combination_pack(root, name)
    named = root.value.get("standard")
    return standard_named(str(named.value) if named is not None else "o86").read_pack(root, name)


def _entry_of(data: dict[str, Any], path: tuple[str | int, ...]) -> dict[str, Any]:
    node: Any = data
    for part in path:
        if isinstance(node, list):
            node = next(
                (x for i, x in enumerate(node) if (isinstance(x, dict) and str(x.get("name")) == part) or i == part)
            )
        else:
            node = node[part]
    return node


def _same(a: Any, b: Any) -> bool:
    if isinstance(a, str) and isinstance(b, str) and is_number_and_unit(a) and is_number_and_unit(b):
        kind = _dimension(a)
        if kind is None or kind != _dimension(b):
            return a == b
        x, y = parse_quantity(a, kind, Location("")), parse_quantity(b, kind, Location(""))
        return math.isclose(x, y, rel_tol=1e-9, abs_tol=1e-12)
    if isinstance(a, (int, float)) and isinstance(b, (int, float)) and not isinstance(a, bool):
        return math.isclose(a, b, rel_tol=1e-9, abs_tol=1e-12)
    if isinstance(a, list) and isinstance(b, list):
        return len(a) == len(b) and all(_same(x, y) for x, y in zip(a, b, strict=True))
    if isinstance(a, dict) and isinstance(b, dict):
        return a.keys() == b.keys() and all(_same(a[k], b[k]) for k in a)
    return bool(a == b)


def firm_pack(
    source: dict[str, Any], verified: list[Verified], firm_id: str, title: str, source_id: str
) -> dict[str, Any]:
    """The source pack's data with each verified value, its clause and its provenance; the rest as recalled."""
    data = copy.deepcopy(source)
    for v in verified:
        entry = _entry_of(data, v.entry.path)
        entry[v.entry.field] = v.value
        entry["clause"] = v.clause
        where = f"{v.edition}, p. {v.page}" if v.page else v.edition
        entry["source"] = f"{where}: {v.entry.source}" if v.entry.source else where
        entry["status"] = f"verified {v.date} {v.by}"
    editions = sorted({v.edition for v in verified})
    total = len(pack_values(source))
    data["id"] = firm_id
    if verified:  # the source's edition says its values were recalled: say which were checked since
        data["edition"] = f"{source.get('edition', '')}; {len(verified)} values verified against {'; '.join(editions)}"
    data["title"] = title or f"{source.get('title', source_id)} (firm pack: verified where marked)"
    data["provenance"] = (
        f"Adopted from rule pack {source_id}: {len(verified)} of {total} values verified against "
        f"{'; '.join(editions) or 'no printed edition'} (each marked 'verified' with its date and who checked it); "
        "the others keep their recalled value and status."
    )
    return data


def firm_pack_text(adoption: Adoption) -> str:
    head = (
        f"# bearing-audit firm rule pack, adopted from {adoption.source_id} with bearing-audit rules --adopt.\n"
        "# Every value is {value, clause, source, status}; a verified one says against which edition and page,\n"
        "# by whom and when. Select it with project.rule_pack (or --rule-pack) and --rules-dir FOLDER.\n"
    )
    return head + yaml.safe_dump(adoption.data, sort_keys=False, allow_unicode=True, width=120, default_flow_style=None)
