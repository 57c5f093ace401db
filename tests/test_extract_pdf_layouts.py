"""Calc sheets in the layouts other programs print (a browser, drawing libraries, a spreadsheet):
each sheet is made from claims data by a fixture maker, and what the reader gives back is compared
with that data value by value; rows that give no claim must be reported row by row."""

from __future__ import annotations

import pytest
import yaml

from audit.inputs.pdf.extract import extract
from audit.standards.registry import standard_named
from tests.conftest import ROOT

PDFS = ROOT / "fixtures" / "pdf"


def claims_as_data(result) -> list[dict]:
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


def assert_reads_as(result, expected: dict) -> None:
    got = claims_as_data(result)
    want = expected["claims"]
    for n, (g, w) in enumerate(zip(got, want, strict=False)):
        assert g == w, f"claim {n + 1}"
    assert len(got) == len(want)
    # nothing silently dropped: every row the data says is no check is reported, and nothing else
    reported = [u.text for u in result.unread]
    for row in expected["not_read"]:
        assert any(text.startswith(row["text"]) for text in reported), row
    assert len(reported) == len(expected["not_read"]), reported


@pytest.mark.parametrize("kind", ["bands", "spaced", "equations-o86", "equations-nds", "equations-ec5"])
def test_a_browser_printed_sheet_gives_back_the_claims_it_was_made_from(kind, tmp_path):
    from fixtures.make_html_layouts import KINDS, expected_text
    from tests import browser

    html, data = KINDS[kind]()
    committed = (PDFS / f"html-{kind}.expected.yaml").read_text(encoding="utf-8")
    assert committed == expected_text(kind, data), "regenerate with python fixtures/make_html_layouts.py"
    page = tmp_path / f"{kind}.html"
    page.write_text(html, encoding="utf-8")
    pdf = browser.print_pdf(page, tmp_path / f"{kind}.pdf", tmp_path / "profile")
    headers = standard_named(data["standard"], None).claim_headers
    assert_reads_as(extract(pdf, workers=1, standard_headers=headers), yaml.safe_load(committed))
