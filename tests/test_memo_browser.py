"""The memo in a real browser: printed to PDF and read back, markup inert, no network."""

from __future__ import annotations

import re
import shutil

import pdfplumber

from audit.inputs.read_claims import read_claims
from audit.report.memo import MemoOptions, render_memo
from audit.review.reconcile import reconcile
from audit.review.review import review_model
from tests import browser
from tests.conftest import DEMO, ROOT, base_model, claims_from, review_dict

CLAIMS = ROOT / "fixtures" / "demo" / "claims.yaml"
ARTEFACTS = ROOT / "reports" / "artefacts"


def _squash(text: str) -> str:
    return re.sub(r"\s+", "", text)


def test_printed_memo_carries_every_finding_and_no_table_runs_off_the_page(tmp_path):
    review = review_model(DEMO)
    claims = read_claims(CLAIMS)
    rec = reconcile(review, claims)
    page = tmp_path / "memo.html"
    page.write_text(render_memo(review, rec, claims, MemoOptions()), encoding="utf-8")
    pdf_path = browser.print_pdf(page, tmp_path / "memo.pdf", tmp_path / "profile")
    ARTEFACTS.mkdir(parents=True, exist_ok=True)
    browser.screenshot(page, ARTEFACTS / "memo-first-page.png", tmp_path / "profile2")
    shutil.copy(pdf_path, ARTEFACTS / "memo.pdf")

    with pdfplumber.open(pdf_path) as pdf:
        text = _squash("\n".join(p.extract_text() or "" for p in pdf.pages))
        for p in pdf.pages:
            xs = [o["x1"] for o in (*p.chars, *p.rects, *p.lines)]
            x0s = [o["x0"] for o in (*p.chars, *p.rects, *p.lines)]
            assert not xs or max(xs) <= p.width + 0.5, f"page {p.page_number} runs off the right edge"
            assert not x0s or min(x0s) >= -0.5, f"page {p.page_number} runs off the left edge"
    shown = [f for f in rec.findings if f.kind != "confirmed"]
    assert shown
    for f in shown:
        for needle in (f.check_id, f.bearing, f.page):
            if needle:
                assert _squash(needle) in text, (f.kind, needle)
        for value in f.numbers.values():
            assert f"{value / 1000:.2f}".lstrip("-") in text, (f.kind, value)


def test_memo_fits_an_a4_page_as_well_as_letter(tmp_path):
    review = review_model(DEMO)
    claims = read_claims(CLAIMS)
    html = render_memo(review, reconcile(review, claims), claims, MemoOptions())
    page = tmp_path / "a4.html"
    page.write_text(html.replace("@page { margin", "@page { size: A4; margin"), encoding="utf-8")
    pdf_path = browser.print_pdf(page, tmp_path / "a4.pdf", tmp_path / "profile")
    with pdfplumber.open(pdf_path) as pdf:
        assert round(pdf.pages[0].width) == 595  # A4 in points
        for p in pdf.pages:
            xs = [o["x1"] for o in (*p.chars, *p.rects, *p.lines)]
            assert not xs or max(xs) <= p.width + 0.5, f"page {p.page_number} runs off the right edge"


def test_markup_in_any_field_is_text_in_the_dom_and_runs_nothing(tmp_path):
    evil = "<script>document.title='owned'</script><img src=x onerror=\"document.title='owned'\">"
    data = base_model()
    data["project"]["title"] = evil
    data["project"]["calc"] = evil
    data["members"][3]["label"] = evil
    data["bearings"][2]["aliases"] = [evil]
    review = review_dict(data)
    claims = claims_from(
        [{"location": evil, "member": "J1", "Qf": "1 kN", "text": evil, "where": {"table": evil, "sheet": evil}}]
    )
    page = tmp_path / "evil.html"
    page.write_text(render_memo(review, reconcile(review, claims), claims, MemoOptions()), encoding="utf-8")
    dom = browser.dump_dom(page, tmp_path / "profile")
    title = dom.split("</title>")[0].split("<title>")[1]
    assert title.startswith("Bearing review memo"), title  # a script that ran would have set it to 'owned'
    assert title != "owned"
    assert "&lt;script&gt;document.title='owned'&lt;/script&gt;" in dom
    assert "<script>" not in dom and "<img" not in dom


def test_memo_makes_no_network_request(tmp_path):
    review = review_model(DEMO)
    claims = read_claims(CLAIMS)
    page = tmp_path / "memo.html"
    page.write_text(render_memo(review, reconcile(review, claims), claims, MemoOptions()), encoding="utf-8")
    netlog = tmp_path / "net.json"
    dom = browser.dump_dom(page, tmp_path / "profile", netlog)
    assert "Bearing review memo" in dom
    assert browser.page_requests(netlog) == set()


def test_network_check_detects_a_page_that_does_request(tmp_path):
    # control: the same check must see a request when a page makes one (loopback discard port)
    page = tmp_path / "control.html"
    page.write_text('<!DOCTYPE html><p>x</p><img src="http://127.0.0.1:9/probe.png">', encoding="utf-8")
    netlog = tmp_path / "net.json"
    browser.dump_dom(page, tmp_path / "profile", netlog)
    assert browser.page_requests(netlog) == {"http://127.0.0.1:9/probe.png"}


def test_the_comment_part_of_the_demo_memo_prints_on_a_few_pages(tmp_path):
    # the memo before its appendix (summary, comments, assumptions, cautions): at most 9 Letter
    # pages, a third of the 27 the whole memo took when every check was derived in the body
    review = review_model(DEMO)
    claims = read_claims(CLAIMS)
    page = tmp_path / "memo.html"
    page.write_text(render_memo(review, reconcile(review, claims), claims, MemoOptions()), encoding="utf-8")
    pdf_path = browser.print_pdf(page, tmp_path / "memo.pdf", tmp_path / "profile")
    with pdfplumber.open(pdf_path) as pdf:
        starts = [p.page_number for p in pdf.pages if (p.extract_text() or "").lstrip().startswith("Appendix")]
        assert starts, "the appendix starts on a page of its own"
        assert starts[0] - 1 <= 9, f"the comment part takes {starts[0] - 1} pages"
