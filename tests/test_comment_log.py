"""Review comments: one per check with every point, alike ones grouped, numbered the same on every run;
the comment log as CSV, JSON and a workbook read back with openpyxl."""

from __future__ import annotations

import pytest

from audit.inputs.read_claims import read_claims
from audit.review.comments import build_comments
from audit.review.reconcile import reconcile
from audit.review.review import review_model
from tests.conftest import DEMO, ROOT


@pytest.fixture(scope="module")
def demo():
    review = review_model(DEMO)
    claims = read_claims(ROOT / "fixtures/demo/claims.yaml")
    rec = reconcile(review, claims)
    return review, rec, claims, build_comments(review, rec, claims)


def test_every_check_with_findings_is_in_exactly_one_comment(demo):
    _, rec, _, comments = demo
    with_findings = {f.check_id for f in rec.findings if f.check_id}
    in_comments = [p.check_id for c in comments for p in c.places if p.check_id]
    assert sorted(in_comments) == sorted(with_findings)


def test_a_check_with_several_findings_gets_one_comment_with_every_point(demo):
    _, rec, _, comments = demo
    # GB2/P1 near-support: fails, and its Qf and Qr both differ from the calc's
    kinds = {f.kind for f in rec.findings if f.check_id == "GB2/P1:GB2:near"}
    assert kinds == {"failing", "mis-loaded", "resistance-differs"}
    mine = [c for c in comments if any(p.check_id == "GB2/P1:GB2:near" for p in c.places)]
    assert len(mine) == 1 and len(mine[0].places[0].points) == 3 and mine[0].kind == "failing"


def test_alike_missing_checks_are_one_comment_per_kind_of_detail_naming_the_worst_place(demo):
    review, _, _, comments = demo
    grouped = next(
        c for c in comments if c.title.startswith("Lumber joists on glulam beams: the bearing of each joist")
    )
    assert [p.check_id for p in grouped.places] == ["J1/GB1:J1", "J3/GB1:J3", "J4/GB1:J4"]
    ratios = {p.bearing: review.result(p.check_id).governing.utilisation for p in grouped.places}
    worst = next(p for p in grouped.places if ratios[p.bearing] == max(ratios.values()))
    assert "3 places" in grouped.title and f"the worst, {worst.calc_label} ({worst.bearing})" in grouped.title
    assert f"Qf/Qr {ratios[worst.bearing]:.2f}" in grouped.title
    assert "one typical check" in grouped.ask and worst.calc_label in grouped.ask


def test_the_demo_gives_its_count_of_comments(demo):
    _, rec, _, comments = demo
    asking = [c for c in comments if not c.quiet]
    # 44 findings become 29 comments: 21 that ask for something (one: the sill on the footing states no
    # separation), 8 for the record (the header LH1 under the 38 mm point load header-floor fails and is not in
    # the calc: two findings, one comment)
    assert (len(rec.findings), len(comments), len(asking)) == (44, 29, 21)


def test_comment_numbers_are_the_same_on_every_run(demo):
    _, _, claims, comments = demo
    again = build_comments(review_model(DEMO), reconcile(review_model(DEMO), claims), claims)
    assert [(c.number, c.title) for c in again] == [(c.number, c.title) for c in comments]
    assert [c.number for c in comments] == list(range(1, len(comments) + 1))


def test_the_workbook_reads_back_with_a_frozen_header_an_open_reply_column_and_every_check(demo):
    import io

    from openpyxl import load_workbook

    from audit.report.comment_log import comments_xlsx

    review, rec, _, comments = demo
    book = load_workbook(io.BytesIO(comments_xlsx(review, rec, comments)))
    sheet = book["Comments"]
    assert sheet.freeze_panes == "A2"
    header = [c.value for c in sheet[1]]
    assert header[0] == "No."
    assert header[-4:] == ["Designer's response", "Disposition", "Reviewer's reply", "Deferred to"]
    rows = list(sheet.iter_rows(min_row=2, values_only=True))
    assert len(rows) == len([c for c in comments if not c.quiet]) and all(set(r[-4:]) <= {None, ""} for r in rows)
    assert sheet.cell(row=2, column=4).alignment.wrap_text
    checks = list(book["Checks"].iter_rows(min_row=2, values_only=True))
    assert len(checks) == len(review.results)
