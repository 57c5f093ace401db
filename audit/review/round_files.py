"""The files of an earlier round, checked before use: the last round's JSON and the designer's comment log.

Both come back from outside (a designer returns the log, anyone may edit the JSON), so each
value the next round reads is checked for its shape and its range, and a fault is one line
naming the file, the line and the key: a list where a mapping belongs, text where a number
belongs, a number JSON allows but no review writes (NaN, Infinity, 1e400), a comment number
that is not whole, a short row, a response longer than a workbook cell holds or with a control
character in it, a workbook whose sheet cannot be read or whose formula has no saved value.
Fields this version does not read are left alone, so a later version's JSON still reads.
"""

from __future__ import annotations

import csv
import io
import json
import json.scanner
import math
import re
import sys
from collections.abc import Iterator
from contextlib import contextmanager
from pathlib import Path
from typing import Any

from audit.core.errors import InputError, InputErrors, Location
from audit.core.located_yaml import MAX_FILE_BYTES, join_key
from audit.core.outfiles import require_input_file

STATUSES = ("new", "open", "changed", "split", "deferred", "merged", "closed", "withdrawn")
# this version's weights, then the words of round files written before they were renamed (still read)
WEIGHTS = ("safety", "revise", "clarify", "record", "critical", "major", "minor", "info")
MAX_NUMBER = 1_000_000_000  # a comment or round number; no review comes near it
CELL_CHARACTERS = 32_767  # the most a workbook cell holds; a response or a title longer than that cannot be written
MAX_ERRORS = 20  # a forged file gets its first faults listed, not a million lines
WORKBOOK_EXPANDED_BYTES = 4 * MAX_FILE_BYTES  # a workbook is a zip: its parts may not expand past this
# the characters a workbook cell refuses (and a terminal would act on): C0 controls but tab, line feed, return
_CONTROL = re.compile(r"[\x00-\x08\x0b\x0c\x0e-\x1f\x7f]")
_WHOLE = re.compile(r"^\+?(\d{1,12})(\.0*)?$")


class _Unreadable:
    """A number JSON lets through but no review writes (NaN, Infinity, 1e400, 40 digits)."""

    def __init__(self, raw: str) -> None:
        self.raw = raw


def _float(raw: str) -> float | _Unreadable:
    value = float(raw)
    return value if math.isfinite(value) else _Unreadable(raw)


def _int(raw: str) -> int | _Unreadable:
    return int(raw) if len(raw.lstrip("-")) <= 18 else _Unreadable(raw)


# ---------------------------------------------------------------- where a value is in JSON text

_DECODER: Any = json.JSONDecoder(parse_float=lambda s: 0.0, parse_int=lambda s: 0, parse_constant=lambda s: 0.0)
_POSITIONS: Any = json.scanner.make_scanner(_DECODER)
_SPACE = re.compile(r"[ \t\n\r]*")


def _skip(text: str, at: int) -> int:
    match = _SPACE.match(text, at)
    return match.end() if match else at


def json_offset(text: str, path: tuple[str | int, ...]) -> int:
    """The offset of the value at ``path`` in JSON text (or of the deepest part of it found).

    Walked only when an error is reported, with the C scanner skipping every other value."""
    at = _skip(text, 0)
    try:
        for part in path:
            opener = "{" if isinstance(part, str) else "["
            if text[at] != opener:
                return at
            j, index = _skip(text, at + 1), 0
            while text[j] not in "}]":
                if opener == "{":
                    key, j = _POSITIONS(text, j)
                    j = _skip(text, _skip(text, j) + 1)  # past the colon
                    if key == part:
                        break
                elif index == part:
                    break
                _, j = _POSITIONS(text, j)
                j, index = _skip(text, j), index + 1
                if text[j] == ",":
                    j = _skip(text, j + 1)
            else:
                return at
            at = j
    except (StopIteration, IndexError, ValueError):
        pass
    return at


def _location(name: str, text: str, path: tuple[str | int, ...]) -> Location:
    offset = json_offset(text, path)
    line = text.count("\n", 0, offset) + 1
    column = offset - (text.rfind("\n", 0, offset) + 1) + 1
    key = ""
    for part in path:
        key = join_key(key, part)
    return Location(name, line, column, key or "(document)")


# ---------------------------------------------------------------- the last round's JSON


def _read_text(path: Path, option: str) -> str:
    size = require_input_file(path, option).st_size
    if size > MAX_FILE_BYTES:
        raise InputError(f"{option}: file is {size} bytes, over the {MAX_FILE_BYTES} byte limit", Location(str(path)))
    raw = path.read_bytes()
    try:
        return raw.decode("utf-8-sig")
    except UnicodeDecodeError as exc:
        line = raw[: exc.start].count(b"\n") + 1
        raise InputError(
            f"{option}: file is not UTF-8 text (byte {exc.start} cannot be decoded)", Location(str(path), line, 1)
        ) from None


def load_round_json(path: Path) -> dict[str, Any]:
    """The last round's JSON, every value the next round reads checked; faults raised together, located."""
    name = str(path)
    text = _read_text(path, "--previous")
    try:
        data = json.loads(text, parse_float=_float, parse_int=_int, parse_constant=_Unreadable)
    except json.JSONDecodeError as exc:
        where = Location(name, exc.lineno, exc.colno, "(document)")
        raise InputError("--previous: not the JSON of a review (not valid JSON here)", where) from None
    except RecursionError:
        raise InputError("--previous: JSON is nested too deeply to read", Location(name, 1, 1)) from None
    check = _RoundCheck(name, text)
    check.review(data)
    check.raise_if_any()
    return data


class _RoundCheck:
    """Walks the JSON of a round, noting each value of the wrong shape or range where it stands."""

    def __init__(self, name: str, text: str) -> None:
        self.name, self.text = name, text
        self.errors: list[InputError] = []
        self.more = 0

    def fail(self, path: tuple[str | int, ...], message: str) -> None:
        if len(self.errors) < MAX_ERRORS:
            self.errors.append(InputError(f"--previous: {message}", _location(self.name, self.text, path)))
        else:
            self.more += 1

    def raise_if_any(self) -> None:
        if self.more:
            self.errors.append(InputError(f"--previous: {self.more} more faults not listed", Location(self.name)))
        if self.errors:
            raise InputErrors(self.errors)

    def review(self, data: Any) -> None:
        tool = data.get("tool") if isinstance(data, dict) else None
        if not isinstance(tool, dict) or tool.get("name") != "bearing-audit":
            self.fail((), "not the JSON of a bearing-audit review (no 'tool')")
            self.raise_if_any()
        round_ = data.get("round")
        if not isinstance(round_, dict) or "number" not in round_:
            self.fail(
                ("round",) if "round" in data else (), "the JSON states no review round (written by an older version?)"
            )
            self.raise_if_any()
        self.whole(("round", "number"), round_["number"], low=1)
        self.words(("round", "project"), round_.get("project", ""))
        if "last_number" in round_:
            self.whole(("round", "last_number"), round_["last_number"], low=0)
        inputs = round_.get("inputs", {})
        if not isinstance(inputs, dict):
            self.fail(("round", "inputs"), "expected a mapping of input role to hash")
        else:
            for role, value in inputs.items():
                self.words(("round", "inputs", role), value)
        comments = data.get("round_comments", [])
        if not isinstance(comments, list):
            self.fail(("round_comments",), "expected a list of round comments")
            return
        seen: set[int] = set()
        for i, item in enumerate(comments):
            number = self.comment(("round_comments", i), item)
            if number is not None and number in seen:
                self.fail(("round_comments", i, "number"), f"comment number {number} is used twice")
            seen.add(number if number is not None else -1)

    def comment(self, at: tuple[str | int, ...], item: Any) -> int | None:
        if not isinstance(item, dict):
            self.fail(at, "a round comment must be a mapping")
            return None
        missing = [k for k in ("number", "status", "weight", "title", "keys", "numbers", "history") if k not in item]
        if "kind" not in item and "code" not in item:  # 'code' in files written before the one vocabulary
            missing.append("kind")
        if missing:
            self.fail(at, f"a round comment lacks {', '.join(repr(k) for k in missing)}")
            return None
        number = item["number"] if self.whole((*at, "number"), item["number"], low=1) else None
        self.choice((*at, "status"), item["status"], STATUSES)
        self.choice((*at, "weight"), item["weight"], WEIGHTS)
        for key in ("code", "kind", "title"):
            if key in item:
                self.words((*at, key), item[key])
        for j, row in self.rows((*at, "keys"), item["keys"], 4, "bearing, member, kind and identity"):
            for k, value in enumerate(row):
                self.words((*at, "keys", j, k), value)
        for j, row in self.rows((*at, "numbers"), item["numbers"], 3, "quantity, claimed and recomputed"):
            self.words((*at, "numbers", j, 0), row[0])
            for k in (1, 2):
                self.number_or_null((*at, "numbers", j, k), row[k])
        for j, row in self.rows((*at, "history"), item["history"], 4, "round, status, code and summary"):
            self.whole((*at, "history", j, 0), row[0], low=1)
            self.choice((*at, "history", j, 1), row[1], STATUSES)
            for k in (2, 3):
                self.words((*at, "history", j, k), row[k])
        return number

    def rows(self, at: tuple[str | int, ...], value: Any, width: int, what: str) -> Iterator[tuple[int, list[Any]]]:
        if not isinstance(value, list):
            self.fail(at, f"expected a list of rows of {what}")
            return
        for j, row in enumerate(value):
            if not isinstance(row, list) or len(row) != width:
                self.fail((*at, j), f"expected a row of {width} values: {what}")
            else:
                yield j, row

    def whole(self, at: tuple[str | int, ...], value: Any, low: int) -> bool:
        if isinstance(value, bool) or not isinstance(value, int) or not low <= value <= MAX_NUMBER:
            self.fail(at, f"expected a whole number from {low} to {MAX_NUMBER:,}, got {_shown(value)}")
            return False
        return True

    def number_or_null(self, at: tuple[str | int, ...], value: Any) -> None:
        if value is None or (isinstance(value, (int, float)) and not isinstance(value, bool)):
            return
        self.fail(at, f"expected a finite number or null, got {_shown(value)}")

    def choice(self, at: tuple[str | int, ...], value: Any, allowed: tuple[str, ...]) -> None:
        if value not in allowed or not isinstance(value, str):
            self.fail(at, f"expected one of {', '.join(allowed)}, got {_shown(value)}")

    def words(self, at: tuple[str | int, ...], value: Any) -> None:
        if not isinstance(value, str):
            self.fail(at, f"expected text, got {_shown(value)}")
            return
        problem = text_problem(value)
        if problem:
            self.fail(at, f"the text {problem}")


def _shown(value: Any) -> str:
    if isinstance(value, _Unreadable):
        return f"{value.raw[:20]} (not a finite number)"
    if isinstance(value, bool):
        return "true" if value else "false"
    if value is None:
        return "null"
    if isinstance(value, dict):
        return "a mapping"
    if isinstance(value, list):
        return "a list"
    if isinstance(value, str):
        return repr(value[:20] + ("..." if len(value) > 20 else ""))
    return str(value)


def text_problem(text: str) -> str:
    """What makes a text unfit to carry into this round's outputs, or ''."""
    if len(text) > CELL_CHARACTERS:
        return f"is {len(text):,} characters long, over the {CELL_CHARACTERS:,} a comment log cell holds"
    bad = _CONTROL.search(text)
    if bad:
        return f"holds the control character U+{ord(bad.group()):04X}, which no comment log can carry"
    return ""


# ---------------------------------------------------------------- the designer's comment log


@contextmanager
def _long_csv_fields() -> Iterator[None]:
    """Let the CSV reader take fields as long as the file, so a long response gets our own message."""
    previous = csv.field_size_limit()
    csv.field_size_limit(min(sys.maxsize, 2 * MAX_FILE_BYTES))
    try:
        yield
    finally:
        csv.field_size_limit(previous)


def read_csv_rows(path: Path) -> list[list[str]]:
    """The rows of a CSV comment log; a file over the size limit, not UTF-8 or not CSV is one located line."""
    size = require_input_file(path, "--responses").st_size
    if size > MAX_FILE_BYTES:
        raise InputError(
            f"--responses: file is {size} bytes, over the {MAX_FILE_BYTES} byte limit", Location(str(path))
        )
    try:
        text = path.read_text(encoding="utf-8-sig")
    except UnicodeDecodeError:
        raise InputError("--responses: not a UTF-8 CSV comment log", Location(str(path))) from None
    reader = csv.reader(io.StringIO(text))
    rows: list[list[str]] = []
    with _long_csv_fields():
        try:
            rows.extend(reader)
        except csv.Error:
            where = Location(str(path), reader.line_num + 1, 1, "(row)")
            raise InputError("--responses: this row of the comment log cannot be read as CSV", where) from None
    return rows


def read_workbook_rows(path: Path, sheet: str, columns: tuple[str, ...]) -> list[list[str]]:
    """The rows of a workbook's sheet as text; refused when the workbook cannot be read, would expand past
    its bound, or a formula in one of ``columns`` has no saved value (it would read as empty)."""
    from zipfile import BadZipFile, ZipFile

    name = str(path)
    size = require_input_file(path, "--responses").st_size
    if size > MAX_FILE_BYTES:
        raise InputError(f"--responses: file is {size} bytes, over the {MAX_FILE_BYTES} byte limit", Location(name))
    try:
        with ZipFile(path) as archive:
            expanded = sum(info.file_size for info in archive.infolist())
    except (BadZipFile, OSError, ValueError):
        raise InputError("--responses: not a readable workbook (not a zip file)", Location(name)) from None
    if expanded > WORKBOOK_EXPANDED_BYTES:
        raise InputError(
            f"--responses: the workbook expands to {expanded:,} bytes, over the {WORKBOOK_EXPANDED_BYTES:,} limit",
            Location(name),
        )
    values = _sheet_rows(path, sheet, data_only=True)
    formulas = _sheet_rows(path, sheet, data_only=False)
    head = [str(h).strip() for h in values[0]] if values else []
    for line, (row, written) in enumerate(zip(values, formulas, strict=False), start=1):
        for col in columns:
            at = head.index(col) if col in head else -1
            if 0 <= at < len(row) and row[at] == "" and at < len(written) and written[at].startswith("="):
                raise InputError(
                    "--responses: a formula with no saved value (the workbook was not recalculated); open and save "
                    "it in a spreadsheet program, or type the value",
                    Location(f"{name} [{sheet}]", line, at + 1, col),
                )
    return values


def _sheet_rows(path: Path, sheet: str, data_only: bool) -> list[list[str]]:
    from openpyxl import load_workbook

    where = Location(str(path))
    try:
        book = load_workbook(path, read_only=True, data_only=data_only)
    except Exception:  # openpyxl, zipfile and the XML parser each raise their own kinds on a damaged file
        raise InputError("--responses: not a readable workbook", where) from None
    try:
        if sheet not in book.sheetnames:
            raise InputError(f"--responses: the workbook has no sheet '{sheet}'", where)
        return [["" if v is None else str(v) for v in row] for row in book[sheet].iter_rows(values_only=True)]
    except InputError:
        raise
    except Exception:  # a sheet whose XML is broken fails only when its rows are read
        raise InputError(f"--responses: not a readable workbook: its sheet '{sheet}' is damaged", where) from None
    finally:
        book.close()


def check_response_rows(rows: list[list[str]], number_col: str, response_col: str, name: str) -> None:
    """Every row with a response names a whole comment number, and its response is text a log can carry."""
    head = [h.strip() for h in rows[0]] if rows else []
    if number_col not in head or response_col not in head:
        return  # the reader names the missing column
    n_at, r_at = head.index(number_col), head.index(response_col)
    errors: list[InputError] = []
    for line, row in enumerate(rows[1:], start=2):
        if len(row) <= max(n_at, r_at) or not row[r_at].strip():
            continue
        raw = row[n_at].strip()
        whole = _WHOLE.match(raw)
        if not whole or not 1 <= int(whole.group(1)) <= MAX_NUMBER:
            what = (
                "a response with no comment number"
                if not raw
                else f"comment number {raw[:20]!r} is not a whole number from 1"
            )
            errors.append(InputError(f"--responses: {what}", Location(name, line, n_at + 1, number_col)))
        problem = text_problem(row[r_at])
        if problem:
            errors.append(
                InputError(f"--responses: the response {problem}", Location(name, line, r_at + 1, response_col))
            )
        if len(errors) >= MAX_ERRORS:
            break
    if errors:
        raise InputErrors(errors)


def responses_left_out(answers: dict[int, str], asked: set[int], known: set[int], name: str) -> list[str]:
    """Warnings for responses that no comment of this round can carry: to a number the last round lacks,
    or to a comment the last round had already closed or withdrawn."""
    out = []
    unknown = sorted(n for n in answers if n not in known)
    if unknown:
        listed = ", ".join(str(n) for n in unknown[:20]) + (" ..." if len(unknown) > 20 else "")
        out.append(f"{name}: responses to comment numbers the last round does not have ({listed}); they are not shown")
    ended = sorted(n for n in answers if n in known and n not in asked)
    if ended:
        listed = ", ".join(str(n) for n in ended[:20]) + (" ..." if len(ended) > 20 else "")
        out.append(
            f"{name}: responses to comments the last round had already closed or withdrawn ({listed}); "
            "they are not shown"
        )
    return out
