"""The memo in a real browser: printed to PDF and read back, markup inert, no network."""

from __future__ import annotations

import re
import shutil

import pdfplumber

from audit.inputs.read_claims import read_claims
from audit.report.memo import MemoOptions, render_appendix, render_memo
from audit.review.comments import build_comments
from audit.review.findings import KINDS, PART_KINDS
from audit.review.reconcile import reconcile
from audit.review.review import review_model
from tests import browser
from tests.conftest import DEMO, ROOT, base_model, claims_from, review_dict

CLAIMS = ROOT / "fixtures" / "demo" / "claims.yaml"
ARTEFACTS = ROOT / "reports" / "artefacts"


def _squash(text: str) -> str:
    return re.sub(r"\s+", "", text)


def test_printed_letter_and_appendix_carry_every_finding_and_no_table_runs_off_the_page(tmp_path):
    review = review_model(DEMO)
    claims = read_claims(CLAIMS)
    rec = reconcile(review, claims)
    text = ""
    for name, render in (("memo", render_memo), ("appendix", render_appendix)):
        page = tmp_path / f"{name}.html"
        page.write_text(render(review, rec, claims, MemoOptions(appendix="appendix.html")), encoding="utf-8")
        pdf_path = browser.print_pdf(page, tmp_path / f"{name}.pdf", tmp_path / f"profile-{name}")
        ARTEFACTS.mkdir(parents=True, exist_ok=True)
        shutil.copy(pdf_path, ARTEFACTS / f"{name}.pdf")
        if name == "memo":
            browser.screenshot(page, ARTEFACTS / "memo-first-page.png", tmp_path / "profile2")
        with pdfplumber.open(pdf_path) as pdf:
            text += _squash("\n".join(p.extract_text() or "" for p in pdf.pages))
            words = {w["text"] for p in pdf.pages for w in p.extract_words()}
            if name == "appendix":  # status words are printed whole in the check table
                assert {"CONFIRMED", "MISSING", "FAILS"} <= words and not {"CONFIRME", "MISSIN"} & words
            for p in pdf.pages:
                xs = [o["x1"] for o in (*p.chars, *p.rects, *p.lines)]
                x0s = [o["x0"] for o in (*p.chars, *p.rects, *p.lines)]
                assert not xs or max(xs) <= p.width + 0.5, f"{name} page {p.page_number} runs off the right edge"
                assert not x0s or min(x0s) >= -0.5, f"{name} page {p.page_number} runs off the left edge"
    shown = [f for f in rec.findings if f.kind != "confirmed"]
    assert shown
    for f in shown:
        for needle in (f.check_id, f.bearing, f.page):
            if needle:
                assert _squash(needle) in text, (f.kind, needle)
        for value in f.numbers.values():
            assert f"{value / 1000:.2f}".lstrip("-") in text, (f.kind, value)


def test_letter_and_appendix_fit_an_a4_page_as_well_as_letter(tmp_path):
    review = review_model(DEMO)
    claims = read_claims(CLAIMS)
    rec = reconcile(review, claims)
    for name, render in (("memo", render_memo), ("appendix", render_appendix)):
        html = render(review, rec, claims, MemoOptions())
        page = tmp_path / f"a4-{name}.html"
        page.write_text(html.replace("@page { margin", "@page { size: A4; margin"), encoding="utf-8")
        pdf_path = browser.print_pdf(page, tmp_path / f"a4-{name}.pdf", tmp_path / f"profile-{name}")
        with pdfplumber.open(pdf_path) as pdf:
            assert round(pdf.pages[0].width) == 595  # A4 in points
            for p in pdf.pages:
                xs = [o["x1"] for o in (*p.chars, *p.rects, *p.lines)]
                assert not xs or max(xs) <= p.width + 0.5, f"{name} page {p.page_number} runs off the right edge"


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


def test_letter_and_appendix_make_no_network_request(tmp_path):
    review = review_model(DEMO)
    claims = read_claims(CLAIMS)
    rec = reconcile(review, claims)
    for name, render in (("memo", render_memo), ("appendix", render_appendix)):
        page = tmp_path / f"{name}.html"
        page.write_text(render(review, rec, claims, MemoOptions()), encoding="utf-8")
        netlog = tmp_path / f"net-{name}.json"
        dom = browser.dump_dom(page, tmp_path / f"profile-{name}", netlog)
        assert "Bearing review memo" in dom
        assert browser.page_requests(netlog) == set()


def test_network_check_detects_a_page_that_does_request(tmp_path):
    # control: the same check must see a request when a page makes one (loopback discard port)
    page = tmp_path / "control.html"
    page.write_text('<!DOCTYPE html><p>x</p><img src="http://127.0.0.1:9/probe.png">', encoding="utf-8")
    netlog = tmp_path / "net.json"
    browser.dump_dom(page, tmp_path / "profile", netlog)
    assert browser.page_requests(netlog) == {"http://127.0.0.1:9/probe.png"}


def _print_letter(tmp_path, review, rec, claims, comments=None):
    page = tmp_path / "letter.html"
    options = MemoOptions(appendix="demo-appendix.html", comments=comments)
    page.write_text(render_memo(review, rec, claims, options), encoding="utf-8")
    return browser.print_pdf(page, tmp_path / "letter.pdf", tmp_path / "profile")


def test_the_demo_letter_prints_on_six_letter_pages_with_the_summary_and_first_comment_on_page_1(tmp_path):
    # the whole memo took 25 pages when the appendix was part of it; the letter alone takes 6
    review = review_model(DEMO)
    claims = read_claims(CLAIMS)
    rec = reconcile(review, claims)
    first = next(c for c in build_comments(review, rec, claims) if not c.quiet)
    with pdfplumber.open(_print_letter(tmp_path, review, rec, claims)) as pdf:
        assert (round(pdf.pages[0].width), round(pdf.pages[0].height)) == (612, 792)  # Letter, in points
        assert len(pdf.pages) <= 6, f"the letter takes {len(pdf.pages)} pages"
        page_1 = _squash(pdf.pages[0].extract_text() or "")
    assert "Summary" in page_1 and "Reviewcomments" in page_1
    assert _squash(f"{first.number}. {first.weight_word.upper()}") in page_1 and _squash(first.title[:40]) in page_1


def test_no_header_or_name_of_the_summary_table_is_split_mid_word_on_letter(tmp_path):
    review = review_model(DEMO)
    claims = read_claims(CLAIMS)
    with pdfplumber.open(_print_letter(tmp_path, review, reconcile(review, claims), claims)) as pdf:
        words = {w["text"] for w in pdf.pages[0].extract_words()}
    listed = [k for k in KINDS.values() if k.name not in PART_KINDS]  # a part's kinds: only where found
    for word in ("finding", "code", "count", *(k.name for k in listed), *(k.code for k in listed)):
        assert word in words, f"'{word}' is not printed whole on page 1"


LETTER_PAGE_LIMIT = 10  # issue 22: the letter of the layout demo prints on at most 10 Letter pages


def test_the_layout_demo_letter_prints_on_at_most_ten_letter_pages_with_the_summary_and_comment_1_on_page_1(
    tmp_path,
):
    import json

    import pypdfium2
    from typer.testing import CliRunner

    from audit.cli import app

    demo = ROOT / "fixtures" / "demo-layout"
    letter, out = tmp_path / "layout-demo-memo.html", tmp_path / "layout-demo-findings.json"
    args = ["review", str(demo / "model.yaml"), "--claims", str(demo / "claims.yaml"), "--memo", str(letter)]
    args += ["--appendix", str(tmp_path / "layout-demo-appendix.html"), "--json", str(out)]
    assert CliRunner().invoke(app, args, catch_exceptions=False).exit_code == 1
    first = next(c for c in json.loads(out.read_text(encoding="utf-8"))["comments"] if c["comment"] == 1)
    pdf_path = browser.print_pdf(letter, tmp_path / "layout-demo-memo.pdf", tmp_path / "profile")
    ARTEFACTS.mkdir(parents=True, exist_ok=True)
    shutil.copy(pdf_path, ARTEFACTS / "layout-demo-memo.pdf")
    pdf = pypdfium2.PdfDocument(pdf_path)
    try:
        width, height = pdf[0].get_size()
        assert (round(width), round(height)) == (612, 792)  # Letter, in points
        pages = len(pdf)
        page_1 = _squash(pdf[0].get_textpage().get_text_range())
    finally:
        pdf.close()
    assert pages <= LETTER_PAGE_LIMIT, f"the layout demo's letter takes {pages} Letter pages"
    assert "Summary" in page_1 and _squash("Of 499 required bearing checks") in page_1
    assert _squash(f"1. {first['weight'].upper()}") in page_1 and _squash(first["title"][:40]) in page_1
