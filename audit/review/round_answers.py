"""What the last round brings back to the next: its comments (from its JSON), the designer's responses
(from its comment log) and the reviewer's dispositions.

The last round's JSON is refused unless it is an earlier round of this project. The designer's
responses and the reviewer's dispositions (accepted, not accepted, deferred) are read from the
columns ``log_columns`` names, which the comment log's writer writes; every value is checked
against the last round before it is used.
"""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path
from typing import Any

from audit.core.errors import ErrorCollector, InputError, Location
from audit.core.outfiles import require_input_file
from audit.engine.model import normalise_label
from audit.review.log_columns import READ_BACK
from audit.review.round_files import check_response_rows, load_round_json, read_csv_rows, read_workbook_rows
from audit.review.rounds import CARRIED, DISPOSITIONS, Disposition, Earlier, LastRound, Step


def read_last_round(path: Path, project: str) -> LastRound:
    """The comments of an earlier round's JSON; refused unless it is an earlier round of this project."""
    where = Location(str(path))
    data = load_round_json(path)  # every value read below is checked there, each fault located
    round_ = data["round"]
    theirs = str(round_.get("project", ""))
    if normalise_label(theirs) != normalise_label(project):
        raise InputError(
            f"--previous: a round of project '{theirs}', not of this project '{project}'; give an earlier round "
            "of the same project",
            where,
        )
    try:
        comments = tuple(_earlier(item) for item in data.get("round_comments", []))
    except (KeyError, TypeError, ValueError) as exc:
        raise InputError(f"--previous: a round comment cannot be read ({exc})", where) from None
    return LastRound(
        str(path),
        round_["number"],
        theirs,
        dict(round_.get("inputs", {})),
        int(round_.get("last_number", 0)),
        comments,
    )


def _earlier(item: dict[str, Any]) -> Earlier:
    return Earlier(
        int(item["number"]),
        str(item["status"]),
        str(item.get("kind", item.get("code", ""))),
        str(item["weight"]),
        str(item["title"]),
        tuple(tuple(str(v) for v in k) for k in item["keys"]),  # type: ignore[misc]
        tuple((str(q), a, b) for q, a, b in item["numbers"]),
        tuple(Step(int(r), str(s), str(c), str(t)) for r, s, c, t in item["history"]),
        bool(item.get("closed_by_response", False)),
        str(item.get("deferred_to", "")),
    )


@dataclass(frozen=True)
class Answers:
    """What the last round's comment log brings back: the designer's responses and the reviewer's dispositions."""

    responses: dict[int, str]
    dispositions: dict[int, Disposition]


def read_responses(path: Path) -> dict[int, str]:
    """Comment number -> the designer's response, from the last round's comment log (CSV or workbook)."""
    return read_log(path).responses


def read_log(path: Path) -> Answers:
    """The responses and dispositions of the last round's comment log (CSV or workbook)."""
    require_input_file(path, "--responses")
    if path.suffix.lower() == ".xlsx":
        rows = read_workbook_rows(path, "Comments", (READ_BACK["number"][1], READ_BACK["response"][1]))
        return _answers(rows, 1, f"{path} [Comments]")
    return _answers(read_csv_rows(path), 0, str(path))


def _answers(rows: list[list[str]], form: int, name: str) -> Answers:
    """``form``: 0 for the CSV's headers, 1 for the workbook's."""
    if not rows:
        raise InputError("--responses: the comment log is empty", Location(name))
    head = [h.strip() for h in rows[0]]
    at = {column: head.index(cols[form]) for column, cols in READ_BACK.items() if cols[form] in head}
    for needed in ("number", "response"):
        if needed not in at:
            raise InputError(
                f"--responses: no column '{READ_BACK[needed][form]}' in the comment log", Location(name, 1)
            )
    check_response_rows(rows, READ_BACK["number"][form], READ_BACK["response"][form], name)
    responses: dict[int, list[str]] = {}
    dispositions: dict[int, Disposition] = {}

    def cell(row: list[str], field: str) -> str:
        i = at.get(field)
        return row[i].strip() if i is not None and i < len(row) else ""

    for line, row in enumerate(rows[1:], start=2):
        text, word = cell(row, "response"), cell(row, "disposition")
        if not text and not word:
            continue
        raw = cell(row, "number")
        try:
            number = int(float(raw))
        except ValueError:
            col = READ_BACK["number"][form]
            raise InputError(
                f"--responses: comment number {raw!r} is not a number", Location(name, line, at["number"] + 1, col)
            ) from None
        if text and text not in responses.setdefault(number, []):
            responses[number].append(text)
        if word:
            where = Location(name, line, at["disposition"] + 1, READ_BACK["disposition"][form])
            found = disposition_of(number, word, cell(row, "reply"), cell(row, "stage"), where)
            before = dispositions.get(number)
            if before is not None and (before.word, before.reply, before.stage) != (
                found.word,
                found.reply,
                found.stage,
            ):
                raise InputError(f"comment {number} has another disposition at {before.loc}", where)
            dispositions.setdefault(number, found)
    return Answers({n: " / ".join(texts) for n, texts in responses.items()}, dispositions)


def disposition_of(number: int, word: str, reply: str, stage: str, where: Location) -> Disposition:
    """One disposition, refused (with its place) when its word is unknown or what it needs is missing."""
    from audit.core.suggest import did_you_mean

    said = " ".join(word.lower().replace("_", " ").replace("-", " ").split())
    if said not in DISPOSITIONS:
        raise InputError(
            f"disposition {word!r} of comment {number} is not one of {', '.join(DISPOSITIONS)}"
            f"{did_you_mean(said, DISPOSITIONS)}",
            where,
        )
    if said == "not accepted" and not reply:
        raise InputError(f"comment {number} is not accepted: give the reviewer's reply", where)
    if said == "deferred" and not stage:
        raise InputError(f"comment {number} is deferred: name the stage it is deferred to", where)
    return Disposition(number, said, reply, stage if said == "deferred" else "", where)


def read_dispositions(path: Path) -> dict[int, Disposition]:
    """The reviewer's dispositions from a small YAML file: ``dispositions: [{comment, disposition, reply, to}]``."""
    from audit.core.located_yaml import read_yaml_file
    from audit.inputs.fields import FieldReader, list_items

    require_input_file(path, "--dispositions")
    root = read_yaml_file(path)
    errors = ErrorCollector()
    top = FieldReader(root, {"dispositions"}, errors, "the dispositions file")
    if top.ok and "dispositions" not in top.map:
        errors.add("missing section 'dispositions'", root.child_loc("dispositions"))
    errors.raise_if_any()
    out: dict[int, Disposition] = {}
    for item in list_items(top.map["dispositions"], "dispositions", errors):
        f = FieldReader(item, {"comment", "disposition", "reply", "to"}, errors, "disposition")
        if not f.ok:
            continue
        number = f.number("comment", 1, 10**9, 0)
        if not number or number != int(number):
            errors.add("comment must be a comment number", f.loc("comment"))
            continue
        try:
            found = disposition_of(
                int(number), f.text("disposition"), f.text("reply", required=False), f.text("to", required=False),
                f.loc("disposition"),
            )  # fmt: skip
        except InputError as exc:
            errors.add(exc.message, exc.location)
            continue
        if int(number) in out:
            errors.add(f"comment {int(number)} has another disposition at {out[int(number)].loc}", f.loc("comment"))
            continue
        out[int(number)] = found
    errors.raise_if_any()
    return out


def check_dispositions(dispositions: dict[int, Disposition], last: LastRound) -> None:
    """Every disposition must answer a comment the last round asked: one located line for the first that does not."""
    standing = {e.number: e for e in last.comments}
    for d in sorted(dispositions.values(), key=lambda d: d.number):
        e = standing.get(d.number)
        if e is None:
            raise InputError(f"comment {d.number} is not a comment of round {last.number} ({last.file})", d.loc)
        if e.status not in CARRIED:
            raise InputError(
                f"comment {d.number} was {e.status} in round {last.number}: it asks for nothing to dispose of", d.loc
            )
