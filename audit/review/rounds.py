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
from dataclasses import dataclass, field, replace
from pathlib import Path
from typing import Any

from audit.core.errors import Location
from audit.engine.model import Model, normalise_label
from audit.review.comments import Comment

STATUSES = ("new", "open", "changed", "split", "deferred", "merged", "closed", "withdrawn")
ASKING = ("new", "open", "changed", "split")  # statuses of a comment that still asks for something
CARRIED = (*ASKING, "deferred")  # statuses of a last-round comment that this round follows up
ENDED = ("merged", "closed", "withdrawn")
DISPOSITIONS = ("accepted", "not accepted", "deferred")  # the reviewer's answer to a designer's response
Key = tuple[str, str, str, str]  # bearing, member, check kind (local | near | ""), other identity (kind:claim)
NUMBER_FIT = 0.01  # relative: numbers compared across rounds agree to 1 %


@dataclass(frozen=True)
class Step:
    """One round in a comment's history."""

    round: int
    status: str
    kind: str
    summary: str

    @property
    def code(self) -> str:
        return self.kind


@dataclass(frozen=True)
class Disposition:
    """The reviewer's answer to the designer's response on one comment of the last round."""

    number: int
    word: str  # one of DISPOSITIONS
    reply: str = ""  # the reviewer's reply (needed when not accepted)
    stage: str = ""  # deferred: the stage it is deferred to
    loc: Location = field(default=Location(""), compare=False)

    def words(self) -> str:
        if self.word == "deferred":
            return f"deferred to {self.stage}"
        return self.word + (f": {self.reply}" if self.reply else "")


@dataclass(frozen=True)
class Earlier:
    """A comment of the last round, as that round's JSON states it."""

    number: int
    status: str
    kind: str
    weight: str
    title: str
    keys: tuple[Key, ...]
    numbers: tuple[tuple[str, float | None, float | None], ...]
    history: tuple[Step, ...]
    by_response: bool = False  # closed by an accepted response
    deferred_to: str = ""


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
    """A comment of this round, or an earlier one now ended, with where it stands."""

    number: int
    status: str
    kind: str
    weight: str
    title: str
    keys: tuple[Key, ...]
    numbers: tuple[tuple[str, float | None, float | None], ...]
    history: tuple[Step, ...]
    reason: str = ""
    response: str = ""  # the designer's response to the last round's comment
    flagged: bool = False  # a response on a comment still open
    disposition: Disposition | None = None  # the reviewer's answer to that response
    by_response: bool = False  # closed by an accepted response
    deferred_to: str = ""

    @property
    def code(self) -> str:
        return self.kind


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
            out.append((p.bearing, p.member, "", f"{c.kind}:{p.claim_id}"))
    return tuple(dict.fromkeys(out))


def comment_numbers(c: Comment) -> tuple[tuple[str, float | None, float | None], ...]:
    return tuple((n.quantity, n.claimed, n.recomputed) for p in c.places for n in p.compared)


def _summary(kind: str, numbers, places: int = 0) -> str:
    shown = [f"{q} {'-' if a is None else f'{a:.2f}'} / {'-' if b is None else f'{b:.2f}'}" for q, a, b in numbers[:3]]
    where = f"{places} places" if places > 1 else ""
    said = "; ".join(x for x in (where, f"claimed / recomputed: {'; '.join(shown)}" if shown else "") if x)
    return kind + (f" ({said})" if said else "")


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
        if other.startswith(("unmatched-claim:", "ORPHAN:")):
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
            c.kind,
            c.weight,
            c.title,
            comment_keys(c),
            comment_numbers(c),
            (Step(1, "new", c.kind, _summary(c.kind, comment_numbers(c), len(c.places))),),
        )
        for c in comments
        if not c.quiet
    )
    return Round(1, project, inputs, None, tracked, max((c.number for c in comments), default=0))


def _pairs(
    comments: list[Comment], carried: list[Earlier], mapped: dict[int, set[Key]]
) -> tuple[dict[int, Earlier], dict[int, list[Earlier]]]:
    """Each comment of this round with the earlier one it continues (the most places shared, then the lowest
    number; each earlier comment continued once), and every earlier comment each one shares a place with."""
    by_number = {e.number: e for e in carried}
    holders: dict[Key, list[int]] = {}  # place -> the earlier comments that held it
    for e in carried:
        for key in mapped[e.number]:
            holders.setdefault(key, []).append(e.number)
    shared: list[tuple[int, int, int]] = []  # (-places shared, earlier number, comment index)
    touching: dict[int, list[Earlier]] = {}
    for i, c in enumerate(comments):
        counts: dict[int, int] = {}
        for key in set(comment_keys(c)):
            for number in holders.get(key, ()):
                counts[number] = counts.get(number, 0) + 1
        for number, n in sorted(counts.items()):
            shared.append((-n, number, i))
            touching.setdefault(i, []).append(by_number[number])
    continues: dict[int, Earlier] = {}
    taken: set[int] = set()
    for _, number, i in sorted(shared):
        if i in continues or number in taken:
            continue
        continues[i] = by_number[number]
        taken.add(number)
    return continues, touching


def next_round(
    comments: tuple[Comment, ...],
    last: LastRound,
    model: Model,
    inputs: dict[str, str],
    responses: dict[int, str] | None = None,
    dispositions: dict[int, Disposition] | None = None,
) -> tuple[tuple[Comment, ...], Round]:
    """This round's comments renumbered to carry the last round's numbers, and where every comment stands.

    A comment that continues an earlier one (the most places shared) keeps its number; one that takes
    places from an earlier comment continued elsewhere is *split* from it; an earlier comment whose places
    all went to others is *merged* into them. The reviewer's dispositions of the designer's responses
    apply: accepted closes the comment (closed by response, kept closed while it stays the same), not
    accepted keeps it open with the reviewer's reply, deferred carries it to the stage named.
    """
    responses = responses or {}
    dispositions = dispositions or {}
    renames = Renames(model)
    number = last.number + 1
    carried = [e for e in last.comments if e.status in CARRIED or (e.status == "closed" and e.by_response)]
    renamed: dict[int, list[tuple[Key | None, str]]] = {e.number: [renames.key(k) for k in e.keys] for e in carried}
    mapped = {n: {k for k, _ in keys if k is not None} for n, keys in renamed.items()}
    asking = [c for c in comments if not c.quiet]
    continues, touching = _pairs(asking, carried, mapped)
    next_number = max(last.last_number, max((e.number for e in last.comments), default=0)) + 1
    numbered: dict[int, int] = {}  # id(comment) -> its number this round
    closed_now: set[int] = set()  # id(comment) closed by an accepted response
    tracked: list[Tracked] = []
    carried_by: dict[int, list[int]] = {}  # earlier number -> this round's numbers that carry its places
    split_from: dict[int, int] = {}
    for i, c in enumerate(asking):
        earlier = continues.get(i)
        if earlier is not None:
            numbered[id(c)] = earlier.number
        else:
            numbered[id(c)], next_number = next_number, next_number + 1
            if i in touching:
                split_from[i] = min(e.number for e in touching[i])
        for e in touching.get(i, []):
            carried_by.setdefault(e.number, []).append(numbered[id(c)])
    for i, c in enumerate(asking):
        n = numbered[id(c)]
        keys, numbers = comment_keys(c), comment_numbers(c)
        earlier = continues.get(i)
        others = sorted({e.number for e in touching.get(i, [])} - {n})
        t = _standing(c, n, number, keys, numbers, earlier, responses, dispositions)
        notes = [t.reason] if t.reason else []
        if i in split_from:
            notes.append(f"split from #{split_from[i]}")
            t = replace(t, status="split")
        if others and earlier is not None:
            notes.append("merged with " + ", ".join(f"#{x}" for x in others))
        if earlier is not None and len(carried_by.get(earlier.number, [])) > 1:
            notes.append("part of it split into " + ", ".join(f"#{x}" for x in carried_by[earlier.number] if x != n))
        t = replace(t, reason="; ".join(notes))
        if t.by_response:
            closed_now.add(id(c))
        tracked.append(t)
    continued = {t.number for t in tracked}
    ended = [e for e in carried if e.number not in continued]
    tracked += _ended_earlier(ended, carried_by, renamed, _quiet_at(comments), number, responses, dispositions)
    for c in comments:
        if c.quiet:  # for the record: numbered after every comment that asks for something
            numbered[id(c)] = next_number
            next_number += 1
    ordered = tuple(replace(c, number=numbered[id(c)], closed=c.closed or id(c) in closed_now) for c in comments)
    return ordered, Round(number, last.project, inputs, last, tuple(tracked), next_number - 1)


def _ended_earlier(
    ended: list[Earlier],
    carried_by: dict[int, list[int]],
    renamed: dict[int, list[tuple[Key | None, str]]],
    quiet_at: dict[Key, str],
    number: int,
    responses: dict[int, str],
    dispositions: dict[int, Disposition],
) -> list[Tracked]:
    """The earlier comments no comment of this round continues: merged into others, or ended."""
    out = []
    for e in ended:
        if e.status == "closed":
            continue  # closed by a response in an earlier round, and nothing asks there now
        into = sorted(set(carried_by.get(e.number, [])))
        if into:
            status, reason = "merged", "merged into " + ", ".join(f"#{x}" for x in into)
        else:
            status, reason = _ended(renamed[e.number], quiet_at)
        out.append(
            Tracked(
                e.number, status, e.kind, e.weight, e.title, e.keys, e.numbers,
                (*e.history, Step(number, status, e.kind, reason)), reason, responses.get(e.number, ""),
                disposition=dispositions.get(e.number),
            )
        )  # fmt: skip
    return out


def _standing(
    c: Comment,
    n: int,
    number: int,
    keys: tuple[Key, ...],
    numbers,
    earlier: Earlier | None,
    responses: dict[int, str],
    dispositions: dict[int, Disposition],
) -> Tracked:
    """Where one comment of this round stands against the earlier one it continues."""
    summary = _summary(c.kind, numbers, len(c.places))
    if earlier is None:
        return Tracked(n, "new", c.kind, c.weight, c.title, keys, numbers, (Step(number, "new", c.kind, summary),))
    same = earlier.kind == c.kind and _same_numbers(earlier.numbers, numbers)
    status = "open" if same else "changed"
    reason = "" if same else _what_changed(earlier, c, numbers)
    response = responses.get(n, "")
    disposition = dispositions.get(n)
    by_response, deferred_to = False, ""
    if disposition is not None and disposition.word == "accepted":
        status, by_response = "closed", True
        reason = f"closed by response, accepted by the reviewer in round {number}" + (f" ({reason})" if reason else "")
    elif disposition is not None and disposition.word == "deferred":
        status, deferred_to = "deferred", disposition.stage
        reason = f"deferred to {disposition.stage}" + (f" ({reason})" if reason else "")
    elif disposition is None and earlier.by_response and same:
        status, by_response, reason = "closed", True, "closed by response in an earlier round; unchanged since"
    elif disposition is None and earlier.status == "deferred" and same:
        status, deferred_to, reason = "deferred", earlier.deferred_to, f"deferred to {earlier.deferred_to}"
    elif disposition is None and earlier.by_response:
        reason = f"reopened: changed since its response was accepted ({reason})"
    elif disposition is not None:  # not accepted: open, with the reviewer's reply
        reason = "; ".join(x for x in (reason, f"response not accepted: {disposition.reply.rstrip('.')}") if x)
    history = (*earlier.history, Step(number, status, c.kind, summary))
    return Tracked(
        n, status, c.kind, c.weight, c.title, keys, numbers, history, reason, response,
        bool(response) and status in ASKING, disposition, by_response, deferred_to,
    )  # fmt: skip


def _quiet_at(comments: tuple[Comment, ...]) -> dict[Key, str]:
    out: dict[Key, str] = {}
    for c in comments:
        if c.kind in ("confirmed", "covered"):
            for key in comment_keys(c):
                out.setdefault(key, c.kind)
    return out


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
        return f"was {earlier.kind}, now {c.kind}"
    return f"numbers changed: {_summary(earlier.kind, earlier.numbers)} then, {_summary(c.kind, numbers)} now"


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


# ---------------------------------------------------------------- the round as the JSON holds it


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
            "kind": t.kind,
            "weight": t.weight,
            "title": t.title,
            "keys": [list(k) for k in t.keys],
            "numbers": [list(n) for n in t.numbers],
            "reason": t.reason,
            "response": t.response,
            "response_on_open_comment": t.flagged,
            "disposition": None
            if t.disposition is None
            else {"word": t.disposition.word, "reply": t.disposition.reply, "deferred_to": t.disposition.stage},
            "closed_by_response": t.by_response,
            "deferred_to": t.deferred_to,
            "history": [[s.round, s.status, s.kind, s.summary] for s in t.history],
        }
        for t in sorted(r.tracked, key=lambda t: t.number)
    ]
    return head, items
