"""The comment log: every review comment with the numbers compared and a column for the designer's reply.

Written as CSV (one row per place a comment concerns), in the JSON export, and as a workbook
(one row per comment, frozen header, wrapped text; a second sheet lists every check).
"""

from __future__ import annotations

import io
from typing import Any

from audit.report.export import rows_to_csv
from audit.review.comments import Comment
from audit.review.log_columns import CSV_COLUMNS, FILLED_IN, WORKBOOK_COLUMNS
from audit.review.reconcile import Reconciliation
from audit.review.review import Review
from audit.review.rounds import Round

COLUMNS = list(CSV_COLUMNS)


def _number(value: float | None) -> Any:
    return "" if value is None else round(value, 3)


def comment_rows(comments: tuple[Comment, ...], record: bool = True, round_: Round | None = None) -> list[list[Any]]:
    """One row per number compared at each place (one row for a place with none); ``record`` False leaves
    out the comments kept for the record (confirmed, covered), which ask the designer for nothing."""
    standing = {t.number: t for t in round_.tracked} if round_ is not None else {}
    rows = []
    for c in comments:
        if c.quiet and not record:
            continue
        t = standing.get(c.number)
        status, response = (t.status, t.response) if t is not None else ("", "")
        for p in c.places:
            for n in p.compared or (None,):
                rows.append(
                    [
                        c.number,
                        c.weight,
                        c.kind,
                        _asked(c),
                        p.check_id,
                        p.bearing,
                        p.calc_label,
                        p.member,
                        p.claim_id,
                        p.page,
                        n.quantity if n else "",
                        n.unit if n else "",
                        _number(n.claimed) if n else "",
                        _number(n.recomputed) if n else "",
                        c.clause,
                        " ".join(p.points),
                        status,
                        response,
                        *("" for _ in FILLED_IN),
                    ]
                )
    return rows


def comments_csv(comments: tuple[Comment, ...], round_: Round | None = None) -> str:
    """The log to send: every comment that asks for something (the record ones are in the JSON and the memo)."""
    return rows_to_csv(COLUMNS, comment_rows(comments, record=False, round_=round_))


def comment_records(comments: tuple[Comment, ...]) -> list[dict[str, Any]]:
    return [
        {
            "comment": c.number,
            "weight": c.weight,
            "kind": c.kind,
            "title": c.title,
            "ask": c.ask,
            "clause": c.clause,
            "places": [dict(zip(COLUMNS[4:16], row[4:16], strict=True)) for row in comment_rows((c,))],
            "closed_by_response": c.closed,
            "designer_response": "",
        }
        for c in comments
    ]


def _asked(c: Comment) -> str:
    return f"{c.title}. {c.ask}" if c.ask else c.title


def _place_lines(c: Comment) -> str:
    lines = []
    for p in c.places:
        where = (
            f"{p.calc_label} ({p.check_id or p.bearing})" if p.calc_label else (p.check_id or p.bearing or p.claim_id)
        )
        numbers = []
        for n in p.compared:
            unit = f" {n.unit}" if n.unit else ""
            claimed = "not claimed" if n.claimed is None else f"{n.claimed:.2f}{unit}"
            recomputed = "" if n.recomputed is None else f"{n.recomputed:.2f}{unit}"
            if n.quantity == "capacity":  # a hanger's listed capacity: the firm's listing, not a recomputed number
                numbers.append(f"listed capacity {recomputed}")
            else:
                numbers.append(f"{n.quantity} claimed {claimed}, recomputed {recomputed}")
        lines.append(where + (": " + "; ".join(numbers) if numbers else ""))
    return "\n".join(lines)


def comments_xlsx(
    review: Review, rec: Reconciliation | None, comments: tuple[Comment, ...], round_: Round | None = None
) -> bytes:
    """The log as a workbook: sheet 'Comments' (one row each, reply column open) and sheet 'Checks'."""
    from openpyxl import Workbook
    from openpyxl.styles import Alignment, Font

    book = Workbook()
    sheet = book.active
    sheet.title = "Comments"
    head = list(WORKBOOK_COLUMNS)
    sheet.append(head)
    standing = {t.number: t for t in round_.tracked} if round_ is not None else {}
    for c in (c for c in comments if not c.quiet):
        pages = "; ".join(dict.fromkeys(p.page for p in c.places if p.page))
        points = "\n".join(dict.fromkeys(point for p in c.places for point in p.points))
        t = standing.get(c.number)
        status, response = (t.status, t.response) if t is not None else ("", "")
        row = [c.number, c.weight, c.kind, _asked(c), _place_lines(c), points, c.clause, pages, status, response]
        row += ["" for _ in FILLED_IN]  # the designer's response and the reviewer's disposition, reply and stage
        sheet.append([_cell(v) for v in row])
    widths = [6, 10, 16, 50, 50, 80, 16, 22, 10, 40, 40, 14, 40, 20]
    _shape(sheet, widths, Alignment, Font)
    checks = book.create_sheet("Checks")
    checks.append(["Check", "Member", "Kind", "Qf (kN)", "Qr (kN)", "Qf/Qr", "Governing", "Status", "Claim"])
    outcome = {o.check_id: o for o in rec.checks} if rec is not None else {}
    for r in review.results:
        o = outcome.get(r.check.id)
        status = o.status if o else ("failing" if not r.passes else "computed")
        checks.append(
            [
                _cell(r.check.id),
                r.check.member,
                r.check.kind,
                round(r.governing.qf / 1000, 3),
                round(r.governing.qr / 1000, 3),
                round(r.governing.utilisation, 3),
                r.governing.combination,
                status,
                (o.claim_id if o else "") or "",
            ]
        )
    _shape(checks, [28, 12, 13, 10, 10, 8, 26, 18, 14], Alignment, Font)
    buffer = io.BytesIO()
    book.save(buffer)
    return buffer.getvalue()


def _cell(value: Any) -> Any:
    # text starting with = + - @ would be taken for a formula: keep it text
    if isinstance(value, str) and value[:1] in ("=", "+", "-", "@"):
        return "'" + value
    return value


def _shape(sheet, widths: list[int], alignment, font) -> None:
    from openpyxl.utils import get_column_letter

    sheet.freeze_panes = "A2"
    for i, width in enumerate(widths, start=1):
        sheet.column_dimensions[get_column_letter(i)].width = width
    for cell in sheet[1]:
        cell.font = font(bold=True)
    for row in sheet.iter_rows():
        for cell in row:
            cell.alignment = alignment(wrap_text=True, vertical="top")
