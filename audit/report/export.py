"""Plain-data views of a review for JSON and CSV exports and the text table.

Values are given in display units (kN, mm, MPa) with the unit in the key name, so a comment
log can take them as they are.
"""

from __future__ import annotations

import csv
import io
import json
from collections.abc import Iterator
from typing import Any

from audit import __version__
from audit.engine.contacts import Contact
from audit.report.quantities import quantities_of
from audit.review.comments import own_comment_threshold
from audit.review.review import Review
from audit.review.wording import check_name
from audit.standards.hangers import CAPACITY, HangerCheck
from audit.standards.resistance import CheckResult, placed_forces


def _contact(c: Contact) -> dict[str, Any]:
    return {
        "source": c.source,
        "length_mm": round(c.length * 1000, 2),
        "width_mm": round(c.width * 1000, 2),
        "end_distance_mm": round(c.end_distance * 1000, 2),
        "length_note": c.length_note,
        "width_note": c.width_note,
    }


def check_record(r: CheckResult, name: str = "", symbols: tuple[str, str] = ("KD", "Fcp")) -> dict[str, Any]:
    """One check as the JSON states it; ``name``: the check as engineers name it (``wording.check_name``);
    ``symbols``: the standard's own names of its duration factor and of the strength it modifies."""
    c = r.check
    g = r.governing
    return {
        "id": c.id,
        "name": name,
        "kind": c.kind,
        "member": c.member,
        "material": r.material,
        "bearing": c.bearing,
        **({"point_load": c.load} if c.load else {}),
        "other_member": c.other_member,
        "face": c.face,
        "why_required": c.why,
        "contact": _contact(c.contact),
        "opposite": [_contact(o) for o in c.opposite],
        "area_mm2": round(r.inputs.area * 1e6, 1),
        "area_reason": r.area_reason,
        "factors": [
            {"name": f.name, "value": round(f.value, 4), "reason": f.reason, "clause": f.clause} for f in r.factors
        ],
        "forces_kN": {case: round(v / 1000, 3) for case, v in sorted(c.forces.items())},
        # every combination as [name, Qf kN, KD, Fcp MPa, Qr kN, Qf/Qr] (in the standard's symbols); the governing
        # one's KD reason below
        "combination_columns": ["name", "Qf_kN", symbols[0], f"{symbols[1]}_MPa", "Qr_kN", "utilisation"],
        "combinations": [
            [
                x.combination,
                round(x.qf / 1000, 3),
                round(x.kd, 4),
                round(_fcp(r, x.kd) / 1e6, 4),
                round(x.qr / 1000, 3),
                round(x.utilisation, 4),
            ]
            for x in r.combinations
        ],
        "governing": g.combination,
        "governing_pattern": g.pattern,
        "pattern_envelope_kN": {
            case: [round(e.low / 1000, 3), round(e.high / 1000, 3)] for case, e in sorted(c.envelope.items())
        },
        "KD_reason": g.kd_reason,
        "Qf_kN": round(g.qf / 1000, 3),
        "Qr_kN": round(g.qr / 1000, 3),
        "utilisation": round(g.utilisation, 4),
        "passes": r.passes,
        "uplift_in": list(r.uplift),
    }


def _fcp(r: CheckResult, kd: float) -> float:
    """Fcp = fcp (KD KScp KT), Pa."""
    return r.inputs.modified_strength(kd)


def hanger_record(h: HangerCheck) -> dict[str, Any]:
    """One hanger's reaction against its listed capacity, as the JSON gives it."""
    return {
        "kind": CAPACITY,
        "bearing": h.bearing,
        "hanger": h.hanger,
        "carried": h.carried,
        "carrier": h.carrier,
        "governing": h.combination,
        "duration": h.duration,
        "Qf_kN": round(h.qf / 1000, 3),
        "capacity_kN": round(h.capacity / 1000, 3),
        "capacity_taken": h.capacity_reason,
        "utilisation": round(h.utilisation, 4),
        "passes": h.passes,
        "clause": h.source,
    }


def review_record(review: Review) -> dict[str, Any]:
    record = _review_record(review)
    if review.hangers:  # only where the model has hangers: the JSON of a model without them is unchanged
        record["hangers"] = [hanger_record(h) for h in review.hangers]
    return record


def _review_record(review: Review) -> dict[str, Any]:
    p = review.model.project
    return {
        "tool": {"name": "bearing-audit", "version": __version__},
        "project": {
            "title": p.title,
            "calc": p.calc,
            "reviewer": p.reviewer,
            "date": p.date.isoformat() if p.date else None,
        },
        "rule_pack": {"id": review.pack.id, "edition": review.pack.edition, "provenance": review.pack.provenance},
        "combinations_pack": {"id": review.cpack.id, "edition": review.cpack.edition},
        "readings": dict(review.readings),
        "triage": _triage(review),
        "checks": (check_record(r, name_of(review, r), review.standard.column_symbols) for r in review.results),
        "not_checked": [
            {"bearing": e.bearing, "member": e.member, "reason": e.reason} for e in review.checklist.exempt
        ],
        "engine_findings": [
            {"kind": f.kind, "weight": f.severity, "message": f.message, "bearing": f.bearing}
            for f in review.engine_findings
        ],
    }


def _triage(review: Review) -> dict[str, Any]:
    value, whose = own_comment_threshold(review)
    return {"own_comment_from": value, "whose": whose}


def json_chunks(data: dict[str, Any]) -> Iterator[str]:
    """JSON with one line per item of each list: readable, diff-friendly, written by the C
    encoder (an indented dump goes through the slow pure-Python encoder), and produced in
    chunks so a large review is never held as one string. Lists may be given as iterables."""
    yield "{"
    for n, (key, value) in enumerate(data.items()):
        yield ("," if n else "") + f"\n  {_compact(key)}: "
        if isinstance(value, (list, tuple, Iterator)):
            first = True
            for item in value:
                yield ("[\n    " if first else ",\n    ") + _compact(item)
                first = False
            yield "[]" if first else "\n  ]"
        else:
            yield _compact(value)
    yield "\n}\n"


def _compact(value: Any) -> str:
    return json.dumps(value, ensure_ascii=False, separators=(", ", ": "))


def rows_to_csv(header: list[str], rows: list[list[Any]]) -> str:
    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\n")
    writer.writerow(header)
    writer.writerows([[_csv_safe(v) for v in row] for row in rows])
    return buffer.getvalue()


def _csv_safe(value: Any) -> Any:
    # a cell starting with = + - @ is read as a formula by spreadsheets; quote it as text
    if isinstance(value, str) and value[:1] in ("=", "+", "-", "@", "\t", "\r"):
        return "'" + value
    return value


def name_of(review: Review, r: CheckResult) -> str:
    """The check as engineers name it: 'bearing of GB2 on post P1', 'B1 under J1'."""
    return check_name(r.check, review.model.members.get(r.check.other_member))


def check_table(review: Review) -> str:
    d = review.display  # in the project's units: kN, or kip
    header = ["check", "member", "kind", f"Qf {d.force_unit}", f"Qr {d.force_unit}", "Qf/Qr", "governing", "status"]
    header.append("what")
    rows = []
    for r in review.results:
        g = r.governing
        rows.append(
            [
                r.check.id,
                r.check.member,
                r.check.kind,
                f"{d.value(g.qf):.2f}",
                f"{d.value(g.qr):.2f}",
                f"{g.utilisation:.2f}",
                g.combination,
                "passes" if r.passes else "FAILS",
                name_of(review, r),
            ]
        )
    widths = [max(len(str(x)) for x in col) for col in zip(header, *rows, strict=False)]
    numeric = {3, 4, 5}
    lines = []
    for row in [header, *rows]:
        cells = [
            str(v).rjust(w) if i in numeric else str(v).ljust(w)
            for i, (v, w) in enumerate(zip(row, widths, strict=False))
        ]
        lines.append("  ".join(cells).rstrip())
    lines.insert(1, "  ".join("-" * w for w in widths))
    return "\n".join(lines)


def summary_line(review: Review) -> str:
    failing = sum(1 for r in review.results if not r.passes)
    near = sum(1 for r in review.results if r.check.kind == "near-support")
    return (
        f"{len(review.results)} required checks ({near} near-support) at {len(review.model.bearings)} bearings; "
        f"{failing} failing; {len(review.checklist.exempt)} members in bearings not checked here; "
        f"{sum(f.kind == 'uplift' for f in review.engine_findings)} uplift findings."
    )


def _loads_made(review: Review, check) -> list:
    """The loads on the checked member (and the member above) that a layout made, each once, with how."""
    bearing = review.model.bearings_by_id.get(check.bearing)
    members = {check.member} | ({bearing.upper.member} if bearing is not None else set())
    seen: dict[str, object] = {}
    for load in review.model.loads:
        if load.member in members and load.note and load.id not in seen:
            seen[load.id] = load
    return list(seen.values())


def explain(review: Review, check_id: str) -> str:
    r = review.result(check_id)
    c = r.check
    q = quantities_of(review)  # lengths, forces and stresses in the project's units
    lines = [
        f"Check {c.id}: {check_name(c, review.model.members.get(c.other_member))} ({r.material}), "
        f"{review.standard.check_kinds.get(c.kind, c.kind)}, "
        + (f"at point load {c.load}" if c.load else f"at bearing {c.bearing}"),
        f"Why required: {c.why}",
        f"Contact on the {c.face} face: {q.size(c.contact.length)} along the grain ({c.contact.length_note}), "
        f"{q.size(c.contact.width)} across ({c.contact.width_note}), "
        f"{q.length(c.contact.end_distance)} from the member end",
    ]
    for o in c.opposite:
        lines.append(
            f"Load within d on the opposite face: {o.source}, {q.size(o.length)} long, "
            f"{q.size(o.width)} wide, centre at {q.length(o.centre or 0.0)}"
        )
    lines.append(r.area_reason)
    lines += [f"  {f.reason}" + (f"  [{f.clause}]" if f.clause else "") for f in r.factors]
    lines.append(review.standard.formula(c.kind))
    lines.append(
        "Forces through the check (specified, per case): "
        + ", ".join(f"{case} = {q.force(v)}" for case, v in sorted(c.forces.items()))
    )
    bearing = review.model.bearings_by_id.get(c.bearing)
    if bearing is not None and bearing.calc_force:
        lines.append(f"  taken from the calc at bearing {bearing.id} (calc_force), not from the take-down")
    for load in _loads_made(review, c):
        lines.append(f"  load {load.id} on {load.member}: {load.note}")
    for case, e in sorted(c.envelope.items()):
        if e.own and not e.high_from and not e.low_from:
            lines.append(
                f"Pattern loading of {case} on {c.member}'s spans: {q.force(e.low).split()[0]} to {q.force(e.high)} "
                f"(most with {e.high_spans or 'every span'} loaded; least with {e.low_spans or 'no span'})"
            )
        else:
            lines.append(
                f"Pattern loading of {case} at {c.bearing}: {q.force(e.low).split()[0]} to {q.force(e.high)} "
                f"(most {e.placing(True)}; least {e.placing(False)})"
            )
    combos = {c.name: c for c in review.combinations}
    duration_symbol, strength_symbol = review.standard.column_symbols  # each standard's own words
    force, resist = review.standard.force_symbols  # Qf/Qr, P/P', Fc,90,d/Fc,90,Rd
    for x in r.combinations:
        mark = "  <- governs" if x is r.governing else ""
        combo = combos.get(x.combination)
        placed = placed_forces(c.forces, c.envelope, combo, x.placing)[0] if combo is not None else c.forces
        reason = x.kd_reason or (
            review.standard.duration_reason(c, placed, combos[x.combination], review.model, review.pack)
            if r.inputs.uses_duration and x.combination in combos
            else (duration_symbol if duration_symbol.startswith("no ") else f"{duration_symbol} = {x.kd:.2f}")
        )
        lines.append(
            f"  {x.combination:28s} {force} = {q.force(x.qf, 8)}  {reason:60.60s}  "
            f"{strength_symbol} = {q.stress(_fcp(r, x.kd), 5)}  "
            f"{resist} = {q.force(x.qr, 8)}  {force}/{resist} = {x.utilisation:.3f}{mark}"
        )
        if x.pattern:
            lines.append(f"      placed: {x.pattern}")
    verdict = "passes" if r.passes else "FAILS"
    governing = r.governing
    lines.append(f"Result: {verdict} ({force}/{resist} = {governing.utilisation:.3f} under {governing.combination})")
    if r.uplift:
        lines.append(f"Uplift (upward force) under: {', '.join(r.uplift)}")
    return "\n".join(lines)
