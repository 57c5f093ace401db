"""Stage 7: write the review memo (one self-contained HTML file) and the findings exports.

The memo is rendered by jinja2 with autoescaping from plain view data built here; it loads
no stylesheet, font, script or image from anywhere. Output is deterministic: the date comes
from the model or the command line, and everything is ordered.
"""

from __future__ import annotations

import datetime as dt
from collections.abc import Iterator
from dataclasses import dataclass, replace
from typing import Any

import jinja2

from audit import __version__
from audit.core.natural import natural_key, natural_sorted
from audit.core.units import Display
from audit.inputs.read_claims import Claim
from audit.report.export import check_record, name_of
from audit.review.comments import WEIGHT_WORDS, Comment, build_comments
from audit.review.findings import KINDS, SEVERITIES, Finding, counted
from audit.review.pack_use import pack_use_sentence
from audit.review.reconcile import Reconciliation, failing_without_claims
from audit.review.review import Review, uplift_threshold
from audit.review.rounds import Round
from audit.standards.resistance import STRENGTH

STATUS_WORDS = {
    "failing": "FAILS",
    "missing": "MISSING",
    "mis-loaded": "MIS-LOADED",
    "resistance-differs": "QR DIFFERS",
    "confirmed": "CONFIRMED",
    "covered": "COVERED (TYP.)",
    "not-covered": "NOT COVERED",
    "computed": "PASSES",
}
LETTER_PLACES = 5  # places a comment names in the letter; the appendix lists every place of a longer one
EVERY_CHECK_LIMIT = 2000  # above this many checks the appendix lists the checks with comments; every check: workbook
TABLE_ROWS = 150  # rows per table in the appendix: long tables are split so a browser prints them in pieces
DERIVATION_LIMIT = 2000  # above this many checks the appendix derives failing checks only,
LARGE_DERIVATIONS = 100  # at most this many
SKETCH_LIMIT = 400  # members drawn; a larger building draws those with comments, at most LARGE_SKETCHES
LARGE_SKETCHES = 40

STRENGTHS = ("fcp", "Fc-perp", "fc,90,k")  # factors that are strengths, shown in MPa
CAUTIONS = (
    "This memo supports the reviewer's judgement and never replaces it.",
    "Every factor in the rule pack must be verified against the edition of {standard} and the building code "
    "adopted where the building stands; values marked 'from memory: verify' have not been checked against a "
    "printed edition.",
    "The engineer of record, local codes and licensed practice govern.",
    "bearing-audit recomputes only what the review model states: a member, bearing or load missing from the "
    "model is missing from this review. It does not design.",
)


@dataclass(frozen=True)
class MemoOptions:
    date: dt.date | None = None
    title: str = "Bearing review memo"
    all_derivations: bool = False  # derivations of confirmed and covered checks too (they are in the JSON)
    comments: tuple[Comment, ...] | None = None  # the review's comments, where the caller has built them already
    round: Round | None = None  # where each comment stands against the last review round
    appendix: str | None = None  # the appendix's file name, as the letter names it; None: not written
    workbook: str | None = None  # the workbook's file name, where one is written beside the appendix
    json: str | None = None  # the JSON export's file name, where one is written


def _env() -> jinja2.Environment:
    return jinja2.Environment(
        loader=jinja2.PackageLoader("audit.report", "templates"),
        autoescape=jinja2.select_autoescape(default=True, default_for_string=True),
        undefined=jinja2.StrictUndefined,
        trim_blocks=True,
        lstrip_blocks=True,
    )


def kn(value: float | None, display: Display | None = None) -> str:
    """A force as a number in the display unit (kN unless the project says otherwise)."""
    if value is None:
        return "—"
    text = (display or Display()).number(value)
    return text[1:] if text.startswith("-") and not text.strip("-0.,") else text


def _factor_value(name: str, value: float) -> str:
    return f"{value / 1e6:.2f} MPa" if name in STRENGTHS else f"{value:.3f}"


def _slot(lines: dict[str, str], name: str) -> list[str]:
    return [lines[name]] if name in lines else []


STATICS_LINE = (
    "Members on two supports are solved by statics; members on three or more supports by the stiffness "
    "method for a continuous beam of constant EI on unyielding supports."
)
PATTERN_PATH_LINE = (
    "The worst and the least pattern at each support pass down the load path: the members below (posts, sills, "
    "girders, plates) take each force from above at whichever of the two is worse at each of their own checks, in "
    "their reactions, local checks and near-support loads. Each combination is evaluated with every patterned case "
    "at its worst pattern, on every span, and at its least downward placing, and the highest Qf/Qr kept: less live "
    "or snow load can lower the load-duration factor more than the load."
)
SPANS_LINE = "Spans run between bearing centres; loads beyond an end support act on an overhang."
STUD_WALL_LINE = (
    "A plate on a stud wall (support: studs) stands on studs placed at their spacing from the plate's start, "
    "with an end stud, and on the stud packs the model gives, each replacing the studs it covers; the plate is "
    "checked over each loaded stud and pack and squeezed where a load above lies within d of one. Members "
    "continuously supported (support: continuous) get local checks under every bearing on them; their "
    "underside is checked only where the model shows what is under them, and point loads on one whose support "
    "is not shown are listed as not checked. A bearing no load passes through needs no check. A point load that "
    "states its bearing length (an equipment leg, a post of framing not modelled) gets a local check of the "
    "member under it, across the load's stated width or else the member's b; one that states no length is "
    "listed as not checked."
)
CONTACT_LINE = (
    "Contact area on each member: along its grain, the bearing length on it (where the model gives none, "
    "the other member's width for a square crossing, or a post's depth); across its grain, the least of its "
    "own width b, the other member's extent across it (a post's width, or a crossing member's seat along its "
    "own grain) and any stated plate or seat width. A stated plate or seat limits the contact, never widens it."
)
# How the model is read, the same on every job: stated in full in the appendix, named in the letter. The
# letter keeps the readings a reviewer weighs (rule-pack readings, patterns, loads, KD, uplift, calc forces).
METHOD_TOPICS = (
    "statics, patterns down the load path, spans, where near-support checks are made, stud walls and continuous "
    "supports, contact areas, glulam faces"
)


def _method_lines(review: Review) -> set[str]:
    lines = review.standard.assumption_lines(review)
    standard_lines = [*_slot(lines, "faces"), *_slot(lines, "near_support")]
    return {STATICS_LINE, PATTERN_PATH_LINE, SPANS_LINE, STUD_WALL_LINE, CONTACT_LINE, *standard_lines}


def letter_assumptions(review: Review) -> list[str]:
    """The assumptions the letter states; the rest (``_method_lines``) are in the appendix's full list."""
    method = _method_lines(review)
    return [line for line in assumptions(review) if line not in method]


def assumptions(review: Review) -> list[str]:
    pack = review.pack
    lines = review.standard.assumption_lines(review)  # what the standard of the rule pack says
    out = [
        STATICS_LINE,
        *_pattern_lines(review),
        SPANS_LINE,
        *(
            f"{choice.title}: {choice.text(review.readings[name])} [reading {review.readings[name]}]."
            for name, choice in pack.choices.items()
        ),
        *_slot(lines, "near_support"),
        STUD_WALL_LINE,
        CONTACT_LINE,
        *_slot(lines, "faces"),
        "Specified loads are taken as given: snow, wind and earthquake loads must already include their "
        "importance factors (the tool applies none). Wind given as pressure and suction is taken each way in every "
        "combination with wind; live load marked storage takes the pack's storage companion factor"
        + lines.get("storage", "")
        + ".",
        *_slot(lines, "duration"),
    ]
    threshold, whose = uplift_threshold(review.model, pack)
    out.append(
        f"Calculated uplift below {threshold / 1000:.2f} kN ({whose}), which the ordinary framing nails hold, is "
        "noted for the record and asks nothing; larger uplift is a comment asking for the tie-down. Uplift under a "
        "ten-thousandth of the load through its bearing is not uplift."
        if threshold > 0
        else "Every calculated uplift is a comment asking for the tie-down (no note threshold set by the project or "
        "the rule pack); uplift under a ten-thousandth of the load through its bearing is not uplift."
    )
    if review.model.factored_groups:
        out.append(
            "Already-factored loads act in their own groups, each with its stated duration; they are not "
            "combined with specified loads."
        )
    given = [b.id for b in review.model.bearings if b.calc_force]
    if given:
        shown = ", ".join(given[:12]) + (f" and {len(given) - 12} more" if len(given) > 12 else "")
        out.append(
            f"Forces taken from the calc, not from the take-down (calc_force), at {len(given)} bearing(s): {shown}. "
            "The members below carry them as given; where the model's own loads reach such a bearing too, a "
            "difference beyond the project's tolerance is a comment."
        )
    return out


def _pattern_lines(review: Review) -> list[str]:
    cpack = review.cpack
    if not cpack.patterns:
        return ["Every span of a continuous member carries the whole of each load case (no pattern loading)."]
    placed = "; ".join(
        f"{case} at {low:g} or {high:g} of its value on each span [{p.clause}]"
        for case, p in sorted(cpack.patterns.items())
        for low, high in [p.value]
    )
    return [
        f"Pattern loading at the supports of members on three or more supports: {placed}, whichever is worse at each "
        "check; the check names its governing pattern. A plate on studs (and a wall's sole plate) is not "
        "patterned over its stud bays unless the model says so (studs: patterned: true).",
        PATTERN_PATH_LINE,
        f"Uplift is looked for under every combination with dead load at {cpack.counteracting_dead.value:g}D where it "
        "counteracts and every patterned case at its least favourable placing.",
        *_joint_maxima_line(review),
    ]


def _joint_maxima_line(review: Review) -> list[str]:
    """Members that carry two or more supports of one member above, each at its own worst pattern: named."""
    whose = {f"{b.upper.member} at {b.id}": b.upper.member for b in review.model.bearings}
    pairs: dict[str, set[str]] = {}
    for member_id, items in review.flow.on_top.items():
        if review.model.members[member_id].vertical:
            continue  # a post passes on what it carries; the member it stands on is named
        seen: dict[str, set[str]] = {}  # member above -> the forces on this member that carry its patterns
        for item in items:
            for env in item.envelope.values():
                for tag in env.high_from:
                    if tag in whose:
                        seen.setdefault(whose[tag], set()).add(item.source)
        above = {upper for upper, sources in seen.items() if len(sources) > 1}
        if above:
            pairs[member_id] = above
    if not pairs:
        return []
    named = sorted(pairs)
    shown = "; ".join(f"{m} under {', '.join(sorted(pairs[m]))}" for m in named[:6])
    more = f" and {len(named) - 6} more" if len(named) > 6 else ""
    return [
        f"Members carrying two or more supports of one continuous member above ({shown}{more}) take each support's "
        "worst pattern together, although the maxima do not occur under one pattern: conservative."
    ]


def _round_view(r: Round | None) -> dict[str, Any] | None:
    """The round summary and each comment's standing; None for a first round (nothing to compare)."""
    if r is None or r.previous is None:
        return None
    ended = [t for t in r.tracked if t.status in ("merged", "closed", "withdrawn")]
    return {
        "number": r.number,
        "previous": r.previous.number,
        "counts": r.counts(),
        "ended": sorted(ended, key=lambda t: t.number),
        "open": sorted(
            (t for t in r.tracked if t.status in ("open", "changed", "split", "deferred")), key=lambda t: t.number
        ),
        "flagged": sum(t.flagged for t in r.tracked),
    }


HISTORY_WORDS = {
    "new": "raised in round {round}",
    "open": "still open in round {round}",
    "changed": "changed in round {round}",
    "closed": "closed in round {round}",
    "withdrawn": "withdrawn in round {round}",
    "split": "split off in round {round}",
    "merged": "merged into another comment in round {round}",
    "deferred": "deferred in round {round}",
}


def history_sentence(steps, grouped: bool) -> str:
    """A comment's history as one sentence: 'Raised in round 1 as ABSENT; still open in round 2.'

    A comment of one place says its numbers where a round raised or changed it; a grouped comment's
    numbers belong to many places (listed with the comment), so only its code is said."""
    parts = []
    for i, s in enumerate(steps):
        text = HISTORY_WORDS.get(s.status, s.status + " in round {round}").format(round=s.round)
        numbers = s.summary[len(s.code) :].strip().strip("()") if s.summary.startswith(s.code) else s.summary
        detail = "" if grouped or not numbers else f" ({numbers})"
        if s.status == "new":
            text += f" as {s.code}{detail}"
        elif s.status == "changed" or (i and steps[i - 1].code != s.code):
            text += f", now {s.code}{detail}"
        parts.append(text)
    sentence = "; ".join(parts)
    return (sentence[:1].upper() + sentence[1:] + ".") if sentence else ""


def _place_view(p) -> dict[str, Any]:
    numbers = [
        (
            n.quantity,
            n.unit,
            ("listed" if n.quantity == "capacity" else "not claimed") if n.claimed is None else f"{n.claimed:.2f}",
            "" if n.recomputed is None else f"{n.recomputed:.2f}",
        )
        for n in p.compared
    ]
    return {
        "where": p.calc_label or p.bearing or p.claim_id,
        "id": p.check_id or p.bearing,
        "page": p.page,
        "numbers": numbers,
        "points": p.points,
    }


def _comment_view(c: Comment, standing: Any = None, shown: int | None = None) -> dict[str, Any]:
    """A comment as the letter shows it: its first ``shown`` places (all by default), the rest counted."""
    places = [_place_view(p) for p in (c.places if shown is None else c.places[:shown])]
    history = standing.history if standing is not None and len(standing.history) > 1 else ()
    return {
        "number": c.number,
        "weight": c.weight,
        "weight_word": c.weight_word,
        "code": c.code,
        "kind": c.kind,
        "title": c.title,
        "ask": c.ask,
        "clause": c.clause,
        "places": places,
        "count": len(c.places),
        "more": len(c.places) - len(places),
        "status": standing.status if standing is not None else "",
        "reason": standing.reason if standing is not None else "",
        "response": standing.response if standing is not None else "",
        "flagged": bool(standing.flagged) if standing is not None else False,
        "history": history_sentence(history, len(c.places) > 1) if history else "",
    }


def worst_places_first(c: Comment, utilisation: dict[str, float], shown: int) -> Comment:
    """The comment with its ``shown`` worst places (highest recomputed Qf/Qr) first, each group in the comment's own
    order: the places a letter shows of a longer comment, so the worst place its title names is among them."""
    if len(c.places) <= shown:
        return c
    ranked = sorted(range(len(c.places)), key=lambda i: (-utilisation.get(c.places[i].check_id, 0.0), i))
    keep = set(ranked[:shown])
    first = tuple(p for i, p in enumerate(c.places) if i in keep)
    return replace(c, places=first + tuple(p for i, p in enumerate(c.places) if i not in keep))


def _status_of(review: Review, rec: Reconciliation | None) -> dict[str, str]:
    if rec is not None:
        return {o.check_id: o.status for o in rec.checks}
    return {r.check.id: ("failing" if not r.passes else "computed") for r in review.results}


def comment_numbers_by_check(comments) -> dict[str, int]:
    """The number of the comment on each check (every check is in one comment at most)."""
    out: dict[str, int] = {}
    for c in comments:
        for p in c.places:
            if p.check_id:
                out.setdefault(p.check_id, c.number)
    return out


def _check_rows(
    review: Review,
    reconciliation: Reconciliation | None,
    claims: dict[str, Claim],
    numbers: dict[str, int],
    only: set[str] | None = None,
):
    """The every-check table (of the checks in ``only``, where given) by level and member, in tables of at
    most TABLE_ROWS rows: a browser prints many short tables in pieces, one long one all at once."""
    display = review.display
    groups: dict[tuple[str, str], list[dict[str, Any]]] = {}
    for r in review.results:
        if only is not None and r.check.id not in only:
            continue
        member = review.model.members[r.check.member]
        outcome = reconciliation.outcome(r.check.id) if reconciliation else None
        status = outcome.status if outcome else ("failing" if not r.passes else "computed")
        claim = claims.get(outcome.claim_id) if outcome and outcome.claim_id else None
        groups.setdefault((member.level or "(no level)", member.id), []).append(
            {
                "id": r.check.id,
                "kind": name_of(review, r),
                "qf": kn(r.governing.qf, display),
                "qr": kn(r.governing.qr, display),
                "util": f"{r.governing.utilisation:.2f}",
                "governing": r.governing.combination,
                "claim": f"{claim.id} ({claim.where.cite()})" if claim else "—",
                "status": STATUS_WORDS[status],
                "status_class": status,
                "comment": numbers.get(r.check.id, ""),
            }
        )
    rank = {m: i for i, m in enumerate(review.flow.order)}  # the take-down order: the top of the building first
    top_of_level: dict[str, int] = {}
    for level, m in groups:
        top_of_level[level] = min(top_of_level.get(level, len(rank)), rank.get(m, len(rank)))
    out = []
    for level in sorted(top_of_level, key=lambda lv: (top_of_level[lv], natural_key(lv))):
        members = sorted((m for lv, m in groups if lv == level), key=lambda m: (rank.get(m, len(rank)), natural_key(m)))
        tables: list[list[dict[str, Any]]] = [[]]
        rows_in_table = 0
        for m in members:
            rows = natural_sorted(groups[(level, m)], key=lambda row: row["id"])
            if rows_in_table and rows_in_table + len(rows) > TABLE_ROWS:
                tables.append([])
                rows_in_table = 0
            tables[-1].append({"id": m, "rows": rows})
            rows_in_table += len(rows) + 1
        out.append({"level": level, "tables": tables})
    return out


def _claim_rows(rec: Reconciliation | None, claims: tuple[Claim, ...], numbers: dict[str, int]) -> list[dict]:
    """Every claim once, in natural order of its id: the check it matched, or that it matched none."""
    if rec is None:
        return []
    covers: dict[str, list[str]] = {}
    for check in rec.checks:
        if check.claim_id:
            covers.setdefault(check.claim_id, []).append(check.check_id)
    by_id = {c.id: c for c in claims}
    rows = []
    for o in rec.claims:
        claim = by_id.get(o.claim_id)
        checks = natural_sorted(covers.get(o.claim_id, []))
        if len(checks) > 1:
            matched = f"covers {len(checks)} checks ({checks[0]} to {checks[-1]})"
        elif checks or o.check_id:
            matched = checks[0] if checks else o.check_id
        else:
            matched = "matches no required check"
        comment = next((numbers[c] for c in checks if c in numbers), numbers.get(o.check_id, ""))
        rows.append(
            {
                "id": o.claim_id,
                "where": claim.where.cite() if claim else "",
                "label": claim.label if claim else "",
                "matched": matched,
                "comment": comment,
            }
        )
    return natural_sorted(rows, key=lambda row: row["id"])


QUIET_STATUSES = ("confirmed", "covered", "computed")


def _derivations(
    review: Review, status_of: dict[str, str], every: bool, numbers: dict[str, int]
) -> tuple[list[dict[str, Any]], bool]:
    """Derivations of the checks with findings (of every check on request), or on a large building of the
    first failing ones."""
    display = review.display
    out: list[dict[str, Any]] = []
    all_checks = len(review.results) <= DERIVATION_LIMIT
    for r in natural_sorted(review.results, key=lambda r: r.check.id):
        if not all_checks and (status_of.get(r.check.id) != "failing" or len(out) >= LARGE_DERIVATIONS):
            continue
        if all_checks and not every and status_of.get(r.check.id) in QUIET_STATUSES:
            continue
        rec = check_record(r)
        out.append(
            {
                "id": r.check.id,
                "comment": numbers.get(r.check.id, ""),
                "why": r.check.why,
                "formula": review.standard.formula(r.check.kind),
                "area": r.area_reason,
                "factors": [
                    (
                        f.name,
                        f"{f.value / 1e6:.2f} MPa" if f.role == STRENGTH else f"{f.value:.3f}",
                        f.reason,
                        f.clause,
                    )
                    for f in r.factors
                ],
                "forces": ", ".join(
                    _force_text(case, v * 1000, r.check.envelope, display) for case, v in rec["forces_kN"].items()
                )
                or "none",
                "pattern": r.governing.pattern,
                "governing": r.governing,
                "kd_reason": r.governing.kd_reason,
                "qf": kn(r.governing.qf, display),
                "qr": kn(r.governing.qr, display),
                "util": f"{r.governing.utilisation:.3f}",
            }
        )
    return out, all_checks


def _force_text(case: str, value: float, envelope: dict, display: Display) -> str:
    """A case's force through a check: with every span loaded, and its range over the patterns where it has one."""
    env = envelope.get(case)
    if env is None:
        return f"{case} {display.force(value)}"
    span = f"{display.force(env.low)} to {display.force(env.high)}"
    return f"{case} {display.force(value)} (every span loaded; {span} by pattern)"


@dataclass(frozen=True)
class _Context:
    """What both the letter and the appendix are built from."""

    comments: tuple[Comment, ...]
    status_of: dict[str, str]
    numbers: dict[str, int]  # check id -> its comment's number
    standing: dict[int, Any]  # comment number -> where it stands against the last round
    counts: dict[str, int]  # findings by kind


def _context(
    review: Review, reconciliation: Reconciliation | None, claims: tuple[Claim, ...], options: MemoOptions
) -> _Context:
    findings = reconciliation.findings if reconciliation else review.engine_findings + failing_without_claims(review)
    counts = counted(findings)
    comments = options.comments if options.comments is not None else build_comments(review, reconciliation, claims)
    shown_round = options.round if options.round is not None and options.round.previous is not None else None
    return _Context(
        comments=comments,
        status_of=_status_of(review, reconciliation),
        numbers=comment_numbers_by_check(comments),
        standing={t.number: t for t in shown_round.tracked} if shown_round else {},
        counts=counts,
    )


def _head(review: Review, options: MemoOptions) -> dict[str, Any]:
    p = review.model.project
    date = options.date or p.date
    return {
        "project": p,
        "date": date.isoformat() if date else "undated",
        "version": __version__,
        "pack": review.pack,
        "cpack": review.cpack,
        "cautions": [c.format(standard=review.standard.title) for c in CAUTIONS] + [pack_use_sentence(review)],
        "force_unit": review.display.force_unit,
    }


def _count_rows(counts: dict[str, int]) -> list[list[tuple[str, int]]]:
    """The findings by kind in rows of two (kind, count): a table that reads on a Letter page."""
    items = [(KINDS[k].name, n) for k, n in counts.items()]
    half = (len(items) + 1) // 2
    return [[items[i], *([items[i + half]] if i + half < len(items) else [])] for i in range(half)]


def _where_the_rest_is(review: Review, options: MemoOptions) -> str:
    if len(review.results) > EVERY_CHECK_LIMIT:  # the appendix of a large building: see _every_check_words
        also = " and the JSON" if options.json else ""
        listed = (
            f"the checks a comment is on (every check is in the workbook's sheet 'Checks'{also}), "
            f"every place of a comment that names more than {LETTER_PLACES}, "
        )
    else:
        listed = (
            "every required check with its outcome, every claim of the calc, every place of a comment that names "
            f"more than {LETTER_PLACES}, the comments for the record, "
        )
    what = (
        listed
        + ("the level plans, " if review.model.frame is not None else "")
        + "the elevations of the members with comments, the derivation of each check with a comment and every "
        "assumption of the review"
    )
    json_words = (
        f" Every check and finding is also in the JSON export, {options.json}."
        if options.json
        else " --json FILE writes every check and finding as JSON."
    )
    if options.appendix:
        return f"This letter is accompanied by its appendix, {options.appendix}, which holds {what}.{json_words}"
    return (
        "The appendix was not written with this letter: give --appendix FILE to bearing-audit review to write it. "
        f"It holds {what}.{json_words}"
    )


def letter_view(
    review: Review, reconciliation: Reconciliation | None, claims: tuple[Claim, ...], options: MemoOptions
) -> dict[str, Any]:
    ctx = _context(review, reconciliation, claims, options)
    asking = [c for c in ctx.comments if not c.quiet]
    utilisation = {r.check.id: r.governing.utilisation for r in review.results}
    return {
        **_head(review, options),
        "title": options.title,
        "summary": _summary(review, reconciliation, ctx.counts, claims),
        "count_rows": _count_rows(ctx.counts),
        "by_weight": {WEIGHT_WORDS[w]: sum(c.weight == w for c in asking) for w in SEVERITIES[:3]},
        "comments": [
            _comment_view(worst_places_first(c, utilisation, LETTER_PLACES), ctx.standing.get(c.number), LETTER_PLACES)
            for c in asking
        ],
        "for_record": sum(c.quiet for c in ctx.comments),
        "record_where": "in the JSON export" if len(review.results) > EVERY_CHECK_LIMIT else "in the appendix",
        "round": _round_view(options.round),
        "rest": _where_the_rest_is(review, options),
        "appendix": options.appendix,
        "letter_places": LETTER_PLACES,
        "assumptions": letter_assumptions(review),
        "method_topics": METHOD_TOPICS,
    }


def _every_check_words(review: Review, options: MemoOptions, listed: int) -> str:
    n = len(review.results)
    if n <= EVERY_CHECK_LIMIT:
        return ""
    where = (
        f"the sheet 'Checks' of the workbook {options.workbook}"
        if options.workbook
        else "the sheet 'Checks' of the comment log workbook (not written with this appendix: --xlsx FILE writes it)"
    )
    return (
        f"This building has {n:,} required checks, more than {EVERY_CHECK_LIMIT:,}: a table of all of them would "
        f"take hundreds of printed pages, so this appendix lists the {listed:,} checks that a comment is on. Every "
        f"check, with its outcome, is in {where}, and in the JSON export{f' ({options.json})' if options.json else ''}."
    )


def appendix_view(
    review: Review, reconciliation: Reconciliation | None, claims: tuple[Claim, ...], options: MemoOptions
) -> dict[str, Any]:
    from audit.report.plans import SHAPES, level_plans
    from audit.report.sketch import MAX_CHECKS_DRAWN, member_sketches

    ctx = _context(review, reconciliation, claims, options)
    claims_by_id = {c.id: c for c in claims}
    derivations, small = _derivations(review, ctx.status_of, options.all_derivations, ctx.numbers)
    large = len(review.results) > EVERY_CHECK_LIMIT
    asking = [c for c in ctx.comments if not c.quiet]
    on_comment = {p.check_id for c in asking for p in c.places if p.check_id}
    only = on_comment if large else None
    sketch_limit = SKETCH_LIMIT if small else LARGE_SKETCHES  # small: at most DERIVATION_LIMIT checks
    with_comments = {p.member for c in asking for p in c.places if p.member}
    return {
        **_head(review, options),
        "title": f"{options.title}: appendix",
        "letter_title": options.title,
        "places": [
            {
                "number": c.number,
                "title": c.title,
                "code": c.code,
                "kind": c.kind,
                "places": natural_sorted((_place_view(p) for p in c.places), key=lambda p: f"{p['where']} {p['id']}"),
            }
            for c in asking
            if len(c.places) > LETTER_PLACES
        ],
        "letter_places": LETTER_PLACES,
        "for_record": [] if large else [_comment_view(c) for c in ctx.comments if c.quiet],
        "record_elsewhere": sum(c.quiet for c in ctx.comments) if large else 0,
        "every_derivation": options.all_derivations,
        "groups": _check_rows(review, reconciliation, claims_by_id, ctx.numbers, only),
        "every_check": _every_check_words(review, options, len(on_comment)),
        "claim_rows": [] if large else _claim_rows(reconciliation, claims, ctx.numbers),
        "claims_elsewhere": large and reconciliation is not None,
        "json": options.json,
        "exempt": natural_sorted(review.checklist.exempt, key=lambda e: f"{e.bearing} {e.member}"),
        "sketches": member_sketches(
            review, ctx.status_of, STATUS_WORDS, sketch_limit, ctx.numbers, None if small else with_comments
        ),
        "sketch_limit": sketch_limit,
        "sketch_only_commented": not small,
        "plans": level_plans(review, ctx.status_of, list(ctx.comments)),
        "plan_legend": [(shape, words) for shape, words in SHAPES.values() if words],
        "max_checks_drawn": MAX_CHECKS_DRAWN,
        "derivations": derivations,
        "all_derivations": small,
        "derivation_limit": DERIVATION_LIMIT,
        "large_derivations": LARGE_DERIVATIONS,
        "has_claims": reconciliation is not None,
        "assumptions": assumptions(review),
        "kinds": [KINDS[k] for k in ctx.counts],
        "weight_words": WEIGHT_WORDS,
    }


def _summary(review: Review, rec: Reconciliation | None, counts: dict[str, int], claims) -> str:
    n = len(review.results)
    if rec is None:
        failing = sum(1 for r in review.results if not r.passes)
        return f"{n} required bearing checks recomputed at {len(review.model.bearings)} bearings; {failing} fail."
    return (
        f"Of {n} required bearing checks at {len(review.model.bearings)} bearings, the calc claims "
        f"{n - counts['missing']} ({len(claims)} claims read). {counts['failing']} fail on recomputation, "
        f"{counts['missing']} are missing, {counts['mis-loaded']} carry a load that differs, "
        f"{counts['resistance-differs']} a resistance that differs, {counts['unmatched-claim']} claims match no "
        f"required check, and {counts['confirmed']} are confirmed."
    )


def render_memo(
    review: Review, reconciliation: Reconciliation | None, claims: tuple[Claim, ...], options: MemoOptions
) -> str:
    """The letter: summary, comments, assumptions and cautions."""
    return "".join(memo_chunks(review, reconciliation, claims, options))


def memo_chunks(
    review: Review, reconciliation: Reconciliation | None, claims: tuple[Claim, ...], options: MemoOptions
) -> Iterator[str]:
    """The letter in pieces, for writing without holding it whole."""
    view = letter_view(review, reconciliation, claims, options)
    return _env().get_template("memo.html.j2").generate(**view)


def render_appendix(
    review: Review, reconciliation: Reconciliation | None, claims: tuple[Claim, ...], options: MemoOptions
) -> str:
    """The appendix: every check and claim, the long place lists, plans, elevations and derivations."""
    return "".join(appendix_chunks(review, reconciliation, claims, options))


def appendix_chunks(
    review: Review, reconciliation: Reconciliation | None, claims: tuple[Claim, ...], options: MemoOptions
) -> Iterator[str]:
    view = appendix_view(review, reconciliation, claims, options)
    return _env().get_template("appendix.html.j2").generate(**view)


# ---------------------------------------------------------------- exports

FINDING_COLUMNS = [
    "kind",
    "weight",
    "check",
    "bearing",
    "member",
    "claim",
    "calc_reference",
    "clause",
    "claimed",
    "recomputed",
    "message",
]


def finding_rows(findings: tuple[Finding, ...]) -> list[list[Any]]:
    rows = []
    for f in findings:
        claimed = f.numbers.get("claimed")
        recomputed = f.numbers.get("recomputed", f.numbers.get("qf"))
        rows.append(
            [
                f.kind,
                f.severity,
                f.check_id,
                f.bearing,
                f.member,
                f.claim_id,
                f.page,
                f.clause,
                "" if claimed is None else f"{claimed / 1000:.3f}",
                "" if recomputed is None else f"{recomputed / 1000:.3f}",
                f.message,
            ]
        )
    return rows


def findings_json_chunks(
    review: Review,
    rec: Reconciliation | None,
    findings: tuple[Finding, ...],
    comments: tuple = (),
    round_: Round | None = None,
) -> Iterator[str]:
    from audit.report.comment_log import comment_records
    from audit.report.export import json_chunks, review_record
    from audit.review.rounds import round_record

    data = review_record(review)
    if round_ is not None:
        data["round"], data["round_comments"] = round_record(round_)
    data["comments"] = comment_records(comments)
    data["findings"] = (dict(zip(FINDING_COLUMNS, row, strict=True)) for row in finding_rows(findings))
    if rec is not None:
        data["check_outcomes"] = [
            {"check": o.check_id, "claim": o.claim_id or None, "status": o.status, "remedy": o.remedy or None}
            for o in rec.checks
        ]
        data["claim_outcomes"] = [
            {"claim": o.claim_id, "check": o.check_id or None, "candidates": list(o.candidates)} for o in rec.claims
        ]
    return json_chunks(data)
