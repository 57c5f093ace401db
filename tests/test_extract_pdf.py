"""Reading claimed checks out of calc PDFs: every layout, value for value and page for page,
against the data that generated the PDF (fixtures/make_calc_pdfs.py)."""

from __future__ import annotations

import pytest
import yaml

from audit.inputs.pdf.extract import claims_yaml, extract, read_column_map
from tests.conftest import DEMO, ROOT

PDFS = ROOT / "fixtures" / "pdf"
LAYOUTS = ["ruled", "borderless", "continued", "equations", "no-text-first-page", "spreadsheet"]


def _same(extracted, expected):
    assert len(extracted) == len(expected)
    for got, want in zip(extracted, expected, strict=True):
        assert got.where.page == want["page"]
        assert (got.label, got.member, got.kind) == (want["location"], want["member"], want["kind"])
        for value, ref in ((got.qf, want["Qf_N"]), (got.qr, want["Qr_N"])):
            assert (value is None) == (ref is None)
            if ref is not None:
                assert value == pytest.approx(ref, rel=1e-9)
        assert got.adequate == want["adequate"]
        if want["utilisation"] is not None:
            assert got.utilisation == pytest.approx(want["utilisation"])


@pytest.mark.parametrize("layout", LAYOUTS)
def test_committed_pdf_gives_back_the_claims_that_generated_it(layout):
    expected = yaml.safe_load((PDFS / f"{layout}.expected.yaml").read_text())["claims"]
    _same(extract(PDFS / f"{layout}.pdf").claims, expected)


def test_freshly_generated_pdfs_give_back_their_claims(tmp_path):
    from fixtures.make_calc_pdfs import write_layouts

    for layout, expected in write_layouts(tmp_path).items():
        _same(extract(tmp_path / f"{layout}.pdf").claims, expected)


def test_table_continued_over_pages_without_a_header_is_read():
    claims = extract(PDFS / "continued.pdf").claims
    assert {c.where.page for c in claims} == {1, 2, 3}
    assert sum(1 for c in claims if c.where.page == 3) == 12


def test_pages_without_text_layer_are_named():
    result = extract(PDFS / "no-text-first-page.pdf")
    assert result.no_text_pages == (1,)


def test_every_claim_keeps_page_position_and_raw_text():
    for c in extract(PDFS / "ruled.pdf").claims:
        assert c.where.page == 1 and c.where.x is not None and c.where.y is not None
        assert c.label in c.text


def test_page_selection_reads_only_those_pages():
    claims = extract(PDFS / "continued.pdf", pages="2").claims
    assert {c.where.page for c in claims} == {2}


def test_extracted_claims_file_reads_back_with_the_same_values(tmp_path):
    from audit.inputs.read_claims import read_claims

    result = extract(PDFS / "borderless.pdf")
    path = tmp_path / "claims.yaml"
    path.write_text(claims_yaml(result, "borderless.pdf"))
    back = read_claims(path)
    for a, b in zip(result.claims, back, strict=True):
        assert (a.label, a.member, a.kind, a.where.page) == (b.label, b.member, b.kind, b.where.page)
        assert b.qf == pytest.approx(a.qf, rel=1e-5) and b.qr == pytest.approx(a.qr, rel=1e-5)


def test_column_map_reads_a_table_with_unusual_headers(tmp_path):
    from fpdf import FPDF

    pdf = FPDF()
    pdf.add_page()
    pdf.set_font("helvetica", size=9)
    for row in (["Grid ref", "Factored load", "Resistance"], ["J9 on B4", "3.25", "11.50"]):
        for text in row:
            pdf.cell(45, 7, text, border=1)
        pdf.ln(7)
    pdf.output(str(tmp_path / "odd.pdf"))
    assert extract(tmp_path / "odd.pdf").claims == ()  # headers without the trade's symbols
    cmap_path = tmp_path / "map.yaml"
    cmap_path.write_text(
        "columns:\n  location: {header: '^grid'}\n  Qf: {header: '^factored', unit: kip}\n"
        "  Qr: {header: '^resist', unit: kip}\n"
    )
    claims = extract(tmp_path / "odd.pdf", cmap=read_column_map(cmap_path)).claims
    kip = 4448.2216152605  # N
    assert [c.label for c in claims] == ["J9 on B4"]
    assert claims[0].qf == pytest.approx(3.25 * kip) and claims[0].qr == pytest.approx(11.5 * kip)


def test_parallel_and_serial_extraction_agree(tmp_path):
    from fixtures.make_calc_pdfs import Calc, draw_table

    pdf = Calc("Many pages")
    for page in range(1, 13):
        pdf.add_page()
        draw_table(
            pdf,
            ["Location", "Member", "Qf (kN)", "Qr (kN)"],
            [[f"J{page} on B{i}", "GB1", f"{page + i / 10:.2f}", "30.00"] for i in range(5)],
            [46, 26, 28, 28],
            ruled=True,
        )
    pdf.output(str(tmp_path / "many.pdf"))
    serial = extract(tmp_path / "many.pdf", workers=1).claims
    parallel = extract(tmp_path / "many.pdf", workers=2).claims
    assert serial == parallel and len(serial) == 60


@pytest.mark.parametrize(
    ("make", "message"),
    [
        (lambda p: p.write_text("just some text\n"), "not a PDF"),
        (lambda p: p.write_bytes((PDFS / "ruled.pdf").read_bytes()[:1200]), "damaged or truncated"),
        (lambda p: p.write_bytes(b""), "not a PDF"),
    ],
)
def test_broken_pdfs_give_one_line_and_exit_2(make, message, tmp_path, run_cli):
    path = tmp_path / "calc.pdf"
    make(path)
    result = run_cli("extract", path, "-o", tmp_path / "out.yaml")
    assert result.exit_code == 2
    assert message in result.stderr and "Traceback" not in result.output
    assert not (tmp_path / "out.yaml").exists()


def test_encrypted_pdf_is_refused_with_a_clear_message(tmp_path, run_cli):
    from fpdf import FPDF
    from fpdf.enums import EncryptionMethod

    pdf = FPDF()
    pdf.add_page()
    pdf.set_font("helvetica")
    pdf.cell(0, 10, "Location: B1 at C1")
    pdf.set_encryption(owner_password="o", user_password="u", encryption_method=EncryptionMethod.RC4)
    pdf.output(str(tmp_path / "locked.pdf"))
    result = run_cli("extract", tmp_path / "locked.pdf", "-o", tmp_path / "out.yaml")
    assert result.exit_code == 2
    assert "encrypted" in result.stderr


def test_pdf_with_no_text_at_all_says_it_needs_ocr(tmp_path, run_cli):
    from fpdf import FPDF

    pdf = FPDF()
    pdf.add_page()
    pdf.rect(10, 10, 50, 50)
    pdf.output(str(tmp_path / "scan.pdf"))
    result = run_cli("extract", tmp_path / "scan.pdf", "-o", tmp_path / "out.yaml")
    assert result.exit_code == 2
    assert "pages 1 have no text layer" in result.stderr and "no bearing checks found" in result.stderr


def test_review_from_the_calc_pdf_matches_review_from_typed_claims(run_cli, tmp_path):
    typed = run_cli("review", DEMO, "--claims", ROOT / "fixtures/demo/claims.yaml", "--json", tmp_path / "a.json")
    pdf = run_cli(
        "review",
        DEMO,
        "--calc-pdf",
        ROOT / "fixtures/demo/calc.pdf",
        "--json",
        tmp_path / "b.json",
        "--memo",
        tmp_path / "m.html",
    )
    assert typed.exit_code == pdf.exit_code == 1
    import json

    a = json.loads((tmp_path / "a.json").read_text())
    b = json.loads((tmp_path / "b.json").read_text())
    assert sorted(f["kind"] for f in a["findings"]) == sorted(f["kind"] for f in b["findings"])
    assert "p. 2" in (tmp_path / "m.html").read_text()  # the memo cites the calc's pages


def test_a_browser_printed_calc_sheet_reads_claim_for_claim_and_reports_what_it_cannot(tmp_path):
    # A second PDF maker: headless Chromium printing an HTML calc sheet (centred headers over
    # right-aligned numbers, a unit row, group rows, a Qf | Qr | Qf' | Qr' pair on one row)
    import yaml

    from fixtures.make_html_calc import PAGE
    from tests import browser

    html = tmp_path / "html-tables.html"
    html.write_text(PAGE.format(), encoding="utf-8")
    pdf = browser.print_pdf(html, tmp_path / "html.pdf", tmp_path / "profile")
    result = extract(pdf, workers=1)
    expected = yaml.safe_load((ROOT / "fixtures" / "pdf" / "html-tables.expected.yaml").read_text())
    got = [
        {
            "location": c.label,
            "member": c.member,
            "kind": c.kind,
            "Qf": round(c.qf / 1000, 2),
            "Qr": round(c.qr / 1000, 2),
            **({"adequate": c.adequate} if c.adequate is not None else {}),
        }
        for c in result.claims
    ]
    assert got == expected["claims"]
    assert sorted({u.page for u in result.unread}) == expected["not_read_pages"]
    assert "5 claims" in result.coverage() and "1 table rows" in result.coverage()


def test_a_package_with_check_symbols_but_nothing_readable_exits_2_saying_where_to_look(tmp_path, run_cli):
    from fixtures.make_calc_pdfs import Calc, draw_table

    pdf = Calc("Unreadable bearing table (fictional)")
    pdf.add_page()
    pdf.multi_cell(0, 5, "Plate crushing under posts: Qf and Qr per the tabulated resistance.")
    draw_table(
        pdf,
        ["Where", "Load on plate", "Plate capacity"],
        [["P1 on sill", "60.08 kN", "111.96 kN"]],
        [50, 50, 50],
        ruled=True,
    )
    path = tmp_path / "calc.pdf"
    pdf.output(str(path))
    result = run_cli("extract", path, "-o", tmp_path / "claims.yaml")
    assert result.exit_code == 2
    assert "bearing-check symbols on pages 1" in result.stderr and "--map" in result.stderr
    assert "gave no claim" in result.stderr  # the page itself is named, with its text


def _as_expected(result) -> list[dict]:
    return [
        {
            "location": c.label,
            "member": c.member,
            "kind": c.kind,
            "Qf": round(c.qf / 1000, 2),
            "Qr": round(c.qr / 1000, 2),
            "adequate": c.adequate,
        }
        for c in result.claims
    ]


def test_a_reportlab_drawn_sheet_reads_two_line_headers_subscripts_kip_split_equations_and_sideways_text(tmp_path):
    # A third PDF maker: reportlab (test-only). Header over two lines with Q and a lowered f drawn as
    # separate text, kip, an OK / N.G. column of no known name, an equation over two lines, and a
    # table turned sideways on page 2
    from fixtures.make_reportlab_calc import write

    result = extract(write(tmp_path / "sheet.pdf"), workers=1)
    expected = yaml.safe_load((ROOT / "fixtures" / "pdf" / "reportlab.expected.yaml").read_text())
    assert _as_expected(result) == expected["claims"]
    assert sorted({u.page for u in result.unread}) == expected["not_read_pages"]


def test_a_matplotlib_drawn_results_table_reads_claim_for_claim(tmp_path):
    # A fourth PDF maker: matplotlib's PDF backend (test-only), a ruled table of centred headers
    from fixtures.make_matplotlib_calc import write

    result = extract(write(tmp_path / "plot.pdf"), workers=1)
    expected = yaml.safe_load((ROOT / "fixtures" / "pdf" / "matplotlib.expected.yaml").read_text())
    assert _as_expected(result) == expected["claims"]
    assert not result.unread
