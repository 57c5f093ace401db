"""The memo and the findings exports: deterministic, complete, escaped, self-contained."""

from __future__ import annotations

import csv
import io
import json
import re
from dataclasses import replace

import pytest
from markupsafe import escape as html_escape

from audit.inputs.read_claims import read_claims
from audit.report.memo import MemoOptions, render_appendix, render_memo
from audit.review.reconcile import reconcile
from audit.review.review import review_model
from tests.conftest import DEMO, ROOT, base_model, claims_from, review_dict

CLAIMS = ROOT / "fixtures" / "demo" / "claims.yaml"
DEMO_COMMAND = [
    "review",
    DEMO,
    "--claims",
    CLAIMS,
    "--memo",
    "{out}/demo-memo.html",
    "--appendix",
    "{out}/demo-appendix.html",
    "--json",
    "{out}/demo-findings.json",
    "--csv",
    "{out}/demo-findings.csv",
]


def _run_demo(run_cli, out):
    args = [str(a).replace("{out}", str(out)) for a in DEMO_COMMAND]
    return run_cli(*args)


def test_committed_demo_outputs_are_byte_identical_to_a_fresh_run(run_cli, tmp_path):
    result = _run_demo(run_cli, tmp_path)
    assert result.exit_code == 1  # the demo has comments that weigh safety and revise
    for name in ("demo-memo.html", "demo-appendix.html", "demo-findings.json", "demo-findings.csv"):
        fresh = (tmp_path / name).read_bytes()
        committed = (ROOT / "reports" / name).read_bytes()
        assert fresh == committed, f"reports/{name} is stale: run the README's demo command"


def test_letter_and_appendix_are_self_contained():
    review = review_model(DEMO)
    claims = read_claims(CLAIMS)
    rec = reconcile(review, claims)
    for html in (render_memo(review, rec, claims, MemoOptions()), render_appendix(review, rec, claims, MemoOptions())):
        assert not re.search(r"""(src|href)\s*=\s*["']?(https?:|//)""", html)
        assert "@import" not in html and "<link" not in html and "<script" not in html
        assert "default-src 'none'" in html


def test_the_appendix_lists_every_required_check_and_every_claim_once():
    review = review_model(DEMO)
    claims = read_claims(CLAIMS)
    html = render_appendix(review, reconcile(review, claims), claims, MemoOptions())
    table = html.split('id="checks"')[1].split('id="claims"')[0]
    for r in review.results:
        assert table.count(f"<tr><td>{r.check.id}</td>") == 1, r.check.id
    claim_table = html.split('id="claims"')[1].split("</section>")[0]
    for c in claims:
        assert claim_table.count(f"<tr><td>{c.id}</td>") == 1, c.id


def test_the_letter_has_no_table_of_every_check_nor_sketches_nor_derivations():
    review = review_model(DEMO)
    claims = read_claims(CLAIMS)
    html = render_memo(review, reconcile(review, claims), claims, MemoOptions())
    for section in ('id="checks"', 'id="sketches"', 'id="derivations"', 'id="plans"', "<svg"):
        assert section not in html
    quiet = [r.check.id for r in review.results if r.passes and f"<td>{r.check.id}</td>" not in html]
    assert quiet  # checks no comment is on are named only in the appendix


def test_the_letter_says_where_the_appendix_is_or_which_option_writes_it():
    review = review_model(DEMO)
    claims = read_claims(CLAIMS)
    rec = reconcile(review, claims)
    alone = render_memo(review, rec, claims, MemoOptions())
    assert "was not written with this letter: give --appendix FILE" in alone
    written = render_memo(review, rec, claims, MemoOptions(appendix="demo-appendix.html"))
    assert "accompanied by its appendix, demo-appendix.html, which holds every required check" in written
    assert "was not written" not in written


def test_a_comment_with_many_places_names_the_first_in_the_letter_and_all_in_the_appendix():
    from audit.report.memo import LETTER_PLACES
    from audit.review.comments import build_comments

    review = review_model(DEMO)
    claims = read_claims(CLAIMS)
    rec = reconcile(review, claims)
    one = next(c for c in build_comments(review, rec, claims) if not c.quiet)
    many = replace(one, places=tuple(replace(one.places[0], calc_label=f"spot{i}") for i in range(12, 0, -1)))
    options = MemoOptions(comments=(many,), appendix="a.html")
    letter = render_memo(review, rec, claims, options)
    appendix = render_appendix(review, rec, claims, options)
    assert LETTER_PLACES < 12
    # places alike in Qf/Qr: the letter keeps the comment's own order
    shown = [int(n) for n in re.findall(r"<td>spot(\d+)</td>", letter)]
    assert shown == list(range(12, 12 - LETTER_PLACES, -1))
    more = (
        f"The {LETTER_PLACES} worst of 12 places shown; the other {12 - LETTER_PLACES} are under comment {many.number}"
    )
    assert f"{more} in the appendix and in the comment log" in letter
    places = appendix.split('id="places"')[1].split("</section>")[0]
    # the appendix lists every place once, in natural order (spot2 before spot10)
    assert [int(n) for n in re.findall(r"<td>spot(\d+)</td>", places)] == list(range(1, 13))


def test_memo_shows_the_cautions_and_the_readings_used():
    review = review_model(DEMO)
    html = render_memo(review, None, (), MemoOptions())
    assert "never replaces it" in html
    assert "verified against the edition" in html
    assert "1.5 L1" in html  # a reading of the rule pack: in the letter


def test_how_the_model_is_read_leaves_the_letter_for_the_appendix_and_the_letter_says_where():
    from audit.report.memo import assumptions, letter_assumptions

    review = review_model(DEMO)
    options = MemoOptions(appendix="a.html")
    letter = render_memo(review, None, (), options)
    appendix = render_appendix(review, None, (), options)
    every, kept = assumptions(review), letter_assumptions(review)
    assert set(kept) < set(every)
    assert "stiffness method" not in letter and "Contact area on each member" not in letter
    assert "How the model is read (statics," in letter and "in the appendix (a.html)" in letter
    listed = appendix.split('id="assumptions"')[1].split("</section>")[0]
    for line in every:  # every assumption, kept or not, is in the appendix
        assert str(html_escape(line)) in listed


def test_markup_in_labels_is_escaped_in_the_memo():
    data = base_model()
    evil = "<script>alert(1)</script><img src=x onerror=alert(2)>"
    data["project"]["title"] = evil
    data["members"][0]["label"] = evil
    data["bearings"][2]["aliases"] = [evil]
    review = review_dict(data)
    claims = claims_from([{"location": evil, "member": "J1", "Qf": "1 kN", "text": evil, "where": {"table": evil}}])
    rec = reconcile(review, claims)
    for html in (render_memo(review, rec, claims, MemoOptions()), render_appendix(review, rec, claims, MemoOptions())):
        assert "<script>alert" not in html and "<img src=x" not in html
        assert "&lt;script&gt;alert(1)&lt;/script&gt;" in html


def test_comment_log_csv_has_a_row_per_number_compared_and_neutralises_formulas(run_cli, tmp_path):
    _run_demo(run_cli, tmp_path)
    rows = list(csv.DictReader(io.StringIO((tmp_path / "demo-findings.csv").read_text())))
    data = json.loads((tmp_path / "demo-findings.json").read_text())
    asking = [c for c in data["comments"] if c["weight"] != "record"]  # the record ones stay in the JSON
    assert len(rows) == sum(len(c["places"]) for c in asking) > 0
    assert {r["kind"] for r in rows} >= {"failing", "missing", "mis-loaded", "resistance-differs", "unmatched-claim"}
    assert all(r["designer_response"] == "" for r in rows)
    assert not any(v.startswith(("=", "+", "@")) for r in rows for v in r.values())
    claimed = [r for r in rows if r["kind"] == "mis-loaded"]
    assert claimed and all(r["claim"] and r["calc_reference"] and r["quantity"] in ("Qf", "Qr") for r in claimed)
    assert {r["comment"] for r in claimed} == {r["comment"] for r in claimed if r["quantity"] == "Qf"}


def test_exit_status_is_0_when_nothing_is_above_minor(write_model, run_cli, tmp_path):
    data = base_model()
    claims = tmp_path / "claims.yaml"
    review = review_dict(data)
    items = []
    for r in review.results:
        bearing, member = r.check.bearing, r.check.member
        items.append(
            {
                "location": bearing,
                "member": member,
                "kind": r.check.kind,
                "Qf": f"{r.governing.qf / 1000:.4f} kN",
                "Qr": f"{r.governing.qr / 1000:.4f} kN",
            }
        )
    import yaml

    claims.write_text(yaml.safe_dump({"claims": items}))
    result = run_cli("review", write_model(data), "--claims", claims, "--memo", tmp_path / "m.html")
    assert result.exit_code == 0, result.output
    assert (tmp_path / "m.html").exists()


def test_json_accounts_for_every_check_and_every_claim(run_cli, tmp_path):
    _run_demo(run_cli, tmp_path)
    data = json.loads((tmp_path / "demo-findings.json").read_text())
    review = review_model(DEMO)
    claims = read_claims(CLAIMS)
    assert sorted(o["check"] for o in data["check_outcomes"]) == sorted(r.check.id for r in review.results)
    assert sorted(o["claim"] for o in data["claim_outcomes"]) == sorted(c.id for c in claims)


def test_above_the_size_limit_the_appendix_lists_checks_with_comments_and_names_the_workbook(monkeypatch):
    import io
    from html import unescape

    from openpyxl import load_workbook

    from audit.report import memo
    from audit.report.comment_log import comments_xlsx
    from audit.review.comments import build_comments

    monkeypatch.setattr(memo, "EVERY_CHECK_LIMIT", 10)  # the demo's checks count as a large building
    review = review_model(DEMO)
    claims = read_claims(CLAIMS)
    rec = reconcile(review, claims)
    comments = build_comments(review, rec, claims)
    on_comment = {p.check_id for c in comments if not c.quiet for p in c.places if p.check_id}
    html = unescape(render_appendix(review, rec, claims, MemoOptions(workbook="log.xlsx", json="f.json")))
    assert f"This building has {len(review.results)} required checks, more than 10" in html
    assert f"lists the {len(on_comment)} checks that a comment is on" in html
    assert "the sheet 'Checks' of the workbook log.xlsx, and in the JSON export (f.json)" in html
    table = html.split('id="checks"')[1].split('id="claims"')[0]
    for r in review.results:
        assert (f"<tr><td>{r.check.id}</td>" in table) == (r.check.id in on_comment), r.check.id
    assert 0 < len(on_comment) < len(review.results)
    sheet = load_workbook(io.BytesIO(comments_xlsx(review, rec, comments)))["Checks"]
    assert sorted(row[0] for row in sheet.iter_rows(min_row=2, values_only=True)) == sorted(
        r.check.id for r in review.results
    )
    unwritten = render_appendix(review, rec, claims, MemoOptions())
    assert "(not written with this appendix: --xlsx FILE writes it)" in unwritten
    letter = unescape(render_memo(review, rec, claims, MemoOptions(appendix="a.html")))
    assert "which holds the checks a comment is on (every check is in the workbook's sheet 'Checks')" in letter


def test_the_letter_shows_the_worst_places_of_a_long_comment_in_the_comments_own_order():
    from audit.report.memo import LETTER_PLACES, letter_view
    from audit.review.comments import build_comments

    demo = ROOT / "fixtures" / "demo-layout"
    review = review_model(demo / "model.yaml")
    claims = read_claims(demo / "claims.yaml")
    rec = reconcile(review, claims)
    view = letter_view(review, rec, claims, MemoOptions())
    # Qf/Qr of each check: its governing Qf over its governing Qr
    ratio = {r.check.id: r.governing.qf / r.governing.qr for r in review.results}
    long = [c for c in view["comments"] if c["more"]]
    assert long
    for c in long:
        full = next(x for x in build_comments(review, rec, claims) if x.number == c["number"])
        every = sorted((ratio[p.check_id] for p in full.places if p.check_id), reverse=True)
        shown = [ratio[p["id"]] for p in c["places"]]
        assert len(shown) == LETTER_PLACES
        assert sorted(shown, reverse=True) == pytest.approx(every[:LETTER_PLACES]), c["number"]
        order = [p.check_id for p in full.places]
        assert [order.index(p["id"]) for p in c["places"]] == sorted(order.index(p["id"]) for p in c["places"])
