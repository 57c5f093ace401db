"""The memo and the findings exports: deterministic, complete, escaped, self-contained."""

from __future__ import annotations

import csv
import io
import json
import re

from audit.inputs.read_claims import read_claims
from audit.report.memo import MemoOptions, render_memo
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
    assert result.exit_code == 1  # the demo has critical and major findings
    for name in ("demo-memo.html", "demo-findings.json", "demo-findings.csv"):
        fresh = (tmp_path / name).read_bytes()
        committed = (ROOT / "reports" / name).read_bytes()
        assert fresh == committed, f"reports/{name} is stale: run the README's demo command"


def test_memo_is_self_contained():
    review = review_model(DEMO)
    html = render_memo(review, reconcile(review, read_claims(CLAIMS)), read_claims(CLAIMS), MemoOptions())
    assert not re.search(r"""(src|href)\s*=\s*["']?(https?:|//)""", html)
    assert "@import" not in html and "<link" not in html and "<script" not in html
    assert "default-src 'none'" in html


def test_memo_lists_every_required_check_once_in_the_full_table():
    review = review_model(DEMO)
    claims = read_claims(CLAIMS)
    html = render_memo(review, reconcile(review, claims), claims, MemoOptions())
    table = html.split('id="checks"')[1].split('id="sketches"')[0]
    for r in review.results:
        assert table.count(f"<td>{r.check.id}</td>") == 1, r.check.id


def test_memo_shows_the_cautions_and_the_readings_used():
    review = review_model(DEMO)
    html = render_memo(review, None, (), MemoOptions())
    assert "never replaces it" in html
    assert "verified against the edition" in html
    assert "stiffness method" in html and "1.5 L1" in html


def test_markup_in_labels_is_escaped_in_the_memo():
    data = base_model()
    evil = "<script>alert(1)</script><img src=x onerror=alert(2)>"
    data["project"]["title"] = evil
    data["members"][0]["label"] = evil
    data["bearings"][2]["aliases"] = [evil]
    review = review_dict(data)
    claims = claims_from([{"location": evil, "member": "J1", "Qf": "1 kN", "text": evil, "where": {"table": evil}}])
    html = render_memo(review, reconcile(review, claims), claims, MemoOptions())
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
