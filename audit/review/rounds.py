"""Review rounds: this round's comments against the last round's, matched by place, not by position.

A comment's place is the bearing, the member and the kind of check it is about (or, for a
claim that matches nothing, the claim). Each comment of the last round that asked for
something is, this round: still **open** (the same comment at the same place, the same
numbers), **changed** (still wrong at that place, but differently), **closed** (no comment
asks for anything there now: the check confirms, a typical claim covers it, or no longer
needs one) or **withdrawn** (its bearing or member is no longer in the model). A comment with
no earlier one at its place is **new**. Comment numbers carry over from the earlier round;
new ones continue the sequence, and no number is used twice. Renamed ids are followed through
the ``aliases`` of the new model's bearings and members.

The JSON of every round states its round number, its project and the hash of each input, so
a later round refuses a file that is not an earlier round of the same project.
"""

from __future__ import annotations

import hashlib
from dataclasses import dataclass, replace
from pathlib import Path
from typing import Any

from audit.core.errors import InputError, Location
from audit.core.outfiles import require_input_file
from audit.engine.model import Model, normalise_label
from audit.review.comments import Comment
from audit.review.round_files import check_response_rows, load_round_json, read_csv_rows, read_workbook_rows

STATUSES = ("new", "open", "changed", "closed", "withdrawn")
ASKING = ("new", "open", "changed")  # statuses of a comment that still asks for something
Key = tuple[str, str, str, str]  # bearing, member, check kind (local | near | ""), other identity (code:claim)
NUMBER_FIT = 0.01  # relative: numbers compared across rounds agree to 1 %


@dataclass(frozen=True)
class Step:
    """One round in a comment's history."""

    round: int
    status: str
    code: str
    summary: str


@dataclass(frozen=True)
class Earlier:
    """A comment of the last round, as that round's JSON states it."""

    number: int
    status: str
    code: str
    kind: str
    weight: str
    title: str
    keys: tuple[Key, ...]
    numbers: tuple[tuple[str, float | None, float | None], ...]
    history: tuple[Step, ...]


@dataclass(frozen=True)
class LastRound:
    file: str
    number: int
    project: str
    inputs: dict[str, str]
    last_number: int
    comments: tuple[Earlier, ...]


@dataclass(frozen=True)
class Tracked:
    """A comment of this round, or an earlier one now closed or withdrawn, with where it stands."""

    number: int
    status: str
    code: str
    kind: str
    weight: str
    title: str
    keys: tuple[Key, ...]
    numbers: tuple[tuple[str, float | None, float | None], ...]
    history: tuple[Step, ...]
    reason: str = ""
    response: str = ""  # the designer's response to the last round's comment
    flagged: bool = False  # a response on a comment still open


@dataclass(frozen=True)
class Round:
    number: int
    project: str
    inputs: dict[str, str]
    previous: LastRound | None
    tracked: tuple[Tracked, ...]
    last_number: int

    def counts(self) -> dict[str, int]:
        return {s: sum(t.status == s for t in self.tracked) for s in STATUSES}


def input_hashes(paths: dict[str, Path | None]) -> dict[str, str]:
    """The SHA-256 of each input file given, by role (model, claims, calc_pdf, map)."""
    return {role: "sha256:" + hashlib.sha256(p.read_bytes()).hexdigest() for role, p in paths.items() if p}


# ---------------------------------------------------------------- places


def comment_keys(c: Comment) -> tuple[Key, ...]:
    out = []
    for p in c.places:
        if p.check_id:
            out.append((p.bearing, p.member, "near" if p.check_id.endswith(":near") else "local", ""))
        else:
            out.append((p.bearing, p.member, "", f"{c.code}:{p.claim_id}"))
    return tuple(dict.fromkeys(out))


def comment_numbers(c: Comment) -> tuple[tuple[str, float | None, float | None], ...]:
    return tuple((n.quantity, n.claimed, n.recomputed) for p in c.places for n in p.compared)


def _summary(code: str, numbers) -> str:
    shown = [f"{q} {'-' if a is None else f'{a:.2f}'} / {'-' if b is None else f'{b:.2f}'}" for q, a, b in numbers[:3]]
    return code + (f" (claimed / recomputed: {'; '.join(shown)})" if shown else "")


class Renames:
    """Ids of the last round as this round's model names them, through its aliases."""

    def __init__(self, model: Model) -> None:
        self.members = {m: m for m in model.members}
        for m in model.members.values():
            for alias in m.aliases:
                self.members.setdefault(alias, m.id)
        self.bearings = {normalise_label(b.id): b.id for b in model.bearings}
        for b in model.bearings:
            for alias in b.aliases:
                self.bearings.setdefault(normalise_label(alias), b.id)

    def member(self, old: str) -> str | None:
        return self.members.get(old)

    def bearing(self, old: str) -> str | None:
        found = self.bearings.get(normalise_label(old))
        if found is None and "/" in old:  # an id made of renamed members: J1/GB1 when GB1 is now B1
            upper, lower = old.split("/", 1)
            found = self.bearings.get(normalise_label(f"{self.member(upper) or upper}/{self.member(lower) or lower}"))
        return found

    def key(self, key: Key) -> tuple[Key | None, str]:
        """The key in this round's ids, or None with the reason it no longer exists."""
        bearing, member, kind, other = key
        if other.startswith("ORPHAN:"):
            return key, ""  # a claim that matches nothing: its member is the calc's, not the model's
        new_bearing = self.bearing(bearing) if bearing else ""
        if new_bearing is None:
            return None, f"bearing {bearing} is no longer in the model"
        new_member = self.member(member) if member else ""
        if new_member is None:
            return None, f"member {member} is no longer in the model"
        return (new_bearing, new_member, kind, other), ""


# ---------------------------------------------------------------- tracking


def first_round(comments: tuple[Comment, ...], project: str, inputs: dict[str, str]) -> Round:
    tracked = tuple(
        Tracked(
            c.number,
            "new",
            c.code,
            c.kind,
            c.weight,
            c.title,
            comment_keys(c),
            comment_numbers(c),
            (Step(1, "new", c.code, _summary(c.code, comment_numbers(c))),),
        )
        for c in comments
        if not c.quiet
    )
    return Round(1, project, inputs, None, tracked, max((c.number for c in comments), default=0))


def next_round(
    comments: tuple[Comment, ...],
    last: LastRound,
    model: Model,
    inputs: dict[str, str],
    responses: dict[int, str] | None = None,
) -> tuple[tuple[Comment, ...], Round]:
    """This round's comments renumbered to carry the last round's numbers, and where every comment stands."""
    responses = responses or {}
    renames = Renames(model)
    number = last.number + 1
    asking = [e for e in last.comments if e.status in ASKING]
    mapped: dict[int, list[tuple[Key | None, str]]] = {e.number: [renames.key(k) for k in e.keys] for e in asking}
    by_key: dict[Key, list[Earlier]] = {}
    for e in asking:
        for key, _ in mapped[e.number]:
            if key is not None:
                by_key.setdefault(key, []).append(e)
    taken: set[int] = set()
    next_number = max(last.last_number, max((e.number for e in last.comments), default=0)) + 1
    new_number: dict[int, int] = {}  # id(comment) -> its number this round
    tracked: list[Tracked] = []
    quiet_at: dict[Key, str] = {}
    for c in comments:
        if c.quiet:
            for key in comment_keys(c):
                quiet_at.setdefault(key, c.kind)
    for c in comments:
        if c.quiet:
            continue
        keys, numbers = comment_keys(c), comment_numbers(c)
        matched = sorted({e.number: e for k in keys for e in by_key.get(k, [])}.values(), key=lambda e: e.number)
        free = [e for e in matched if e.number not in taken]
        reason = ""
        if free:
            earlier: Earlier | None = free[0]
            assert earlier is not None
            taken.add(earlier.number)
            status = "open" if earlier.kind == c.kind and _same_numbers(earlier.numbers, numbers) else "changed"
            if status == "changed":
                reason = _what_changed(earlier, c, numbers)
            n = earlier.number
        else:
            earlier = matched[0] if matched else None
            status = "changed" if earlier else "new"
            reason = f"split from #{earlier.number}" if earlier else ""
            n, next_number = next_number, next_number + 1
        history = (earlier.history if earlier and free else ()) + (
            Step(number, status, c.code, _summary(c.code, numbers)),
        )
        response = responses.get(n, "") if earlier and free else ""
        new_number[id(c)] = n
        tracked.append(
            Tracked(
                n, status, c.code, c.kind, c.weight, c.title, keys, numbers, history, reason, response, bool(response)
            )
        )
    for e in asking:
        if e.number in taken:
            continue
        status, reason = _ended(mapped[e.number], quiet_at)
        step = Step(number, status, e.code, reason)
        tracked.append(
            Tracked(
                e.number, status, e.code, e.kind, e.weight, e.title, e.keys, e.numbers, (*e.history, step), reason,
                responses.get(e.number, ""),
            )
        )  # fmt: skip
    for c in comments:
        if c.quiet:  # for the record: numbered after every comment that asks for something
            new_number[id(c)] = next_number
            next_number += 1
    ordered = tuple(replace(c, number=new_number[id(c)]) for c in comments)
    return ordered, Round(number, last.project, inputs, last, tuple(tracked), next_number - 1)


def _same_numbers(a, b) -> bool:
    if len(a) != len(b):
        return False
    for (qa, ca, ra), (qb, cb, rb) in zip(sorted(a, key=str), sorted(b, key=str), strict=True):
        if qa != qb:
            return False
        for x, y in ((ca, cb), (ra, rb)):
            if (x is None) != (y is None):
                return False
            if x is not None and y is not None and abs(x - y) > NUMBER_FIT * max(abs(x), abs(y), 1e-9):
                return False
    return True


def _what_changed(earlier: Earlier, c: Comment, numbers) -> str:
    if earlier.kind != c.kind:
        return f"was {earlier.code}, now {c.code}"
    return f"numbers changed: {_summary(earlier.code, earlier.numbers)} then, {_summary(c.code, numbers)} now"


def _ended(mapped: list[tuple[Key | None, str]], quiet_at: dict[Key, str]) -> tuple[str, str]:
    """Closed (with how) or withdrawn (with why) for an earlier comment that no comment of this round carries."""
    live = [key for key, _ in mapped if key is not None]
    if not live:
        return "withdrawn", "; ".join(dict.fromkeys(why for _, why in mapped))
    kinds = {quiet_at.get(key) for key in live}
    if "confirmed" in kinds:
        return "closed", "the check now agrees with the calc"
    if "covered" in kinds:
        return "closed", "a typical claim now covers it"
    return "closed", "no comment asks for anything there now"


# ---------------------------------------------------------------- reading the last round


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
        str(item["code"]),
        str(item["kind"]),
        str(item["weight"]),
        str(item["title"]),
        tuple(tuple(str(v) for v in k) for k in item["keys"]),  # type: ignore[misc]
        tuple((str(q), a, b) for q, a, b in item["numbers"]),
        tuple(Step(int(r), str(s), str(c), str(t)) for r, s, c, t in item["history"]),
    )


def round_record(r: Round) -> tuple[dict[str, Any], list[dict[str, Any]]]:
    """The JSON's 'round' and 'round_comments'."""
    head = {
        "number": r.number,
        "project": r.project,
        "inputs": r.inputs,
        "previous": None if r.previous is None else {"number": r.previous.number, "inputs": r.previous.inputs},
        "last_number": r.last_number,
        "counts": r.counts(),
    }
    items = [
        {
            "number": t.number,
            "status": t.status,
            "code": t.code,
            "kind": t.kind,
            "weight": t.weight,
            "title": t.title,
            "keys": [list(k) for k in t.keys],
            "numbers": [list(n) for n in t.numbers],
            "reason": t.reason,
            "response": t.response,
            "response_on_open_comment": t.flagged,
            "history": [[s.round, s.status, s.code, s.summary] for s in t.history],
        }
        for t in sorted(r.tracked, key=lambda t: t.number)
    ]
    return head, items


# ---------------------------------------------------------------- the designer's responses


def read_responses(path: Path) -> dict[int, str]:
    """Comment number -> the designer's response, from the last round's comment log (CSV or workbook)."""
    require_input_file(path, "--responses")
    if path.suffix.lower() == ".xlsx":
        return _responses_from_workbook(path)
    rows = read_csv_rows(path)
    return _responses(rows, "comment", "designer_response", str(path))


def _responses_from_workbook(path: Path) -> dict[int, str]:
    rows = read_workbook_rows(path, "Comments", ("No.", "Designer's response"))
    return _responses(rows, "No.", "Designer's response", f"{path} [Comments]")


def _responses(rows: list[list[str]], number_col: str, response_col: str, name: str) -> dict[int, str]:
    if not rows:
        raise InputError("--responses: the comment log is empty", Location(name))
    head = [h.strip() for h in rows[0]]
    for col in (number_col, response_col):
        if col not in head:
            raise InputError(f"--responses: no column '{col}' in the comment log", Location(name, 1))
    check_response_rows(rows, number_col, response_col, name)
    n_at, r_at = head.index(number_col), head.index(response_col)
    out: dict[int, list[str]] = {}
    for line, row in enumerate(rows[1:], start=2):
        if len(row) <= max(n_at, r_at) or not row[r_at].strip():
            continue
        try:
            number = int(float(row[n_at]))
        except ValueError:
            raise InputError(
                f"--responses: comment number {row[n_at]!r} is not a number", Location(name, line, n_at + 1, number_col)
            ) from None
        text = row[r_at].strip()
        if text not in out.setdefault(number, []):
            out[number].append(text)
    return {n: " / ".join(texts) for n, texts in out.items()}
