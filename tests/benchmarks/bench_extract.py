"""Benchmark: bearing-audit's extraction against a plain loop of pdfplumber's extract_tables().

    python -m tests.benchmarks.bench_extract [--pages 300]

Generates a calc package of narrative pages with bearing tables and worked equations on some
of them, times both in the same run, checks both saw the tables, and writes the ratio to
reports/benchmarks.md.
"""

from __future__ import annotations

import argparse
import sys
import tempfile
import time
from pathlib import Path

import pdfplumber

from audit.inputs.pdf.extract import extract
from fixtures.make_calc_pdfs import Calc, draw_table
from tests.benchmarks.report import best_of, machine, write_section

NARRATIVE = (
    "The floor framing spans between the glulam beams and the bearing walls. Loads are taken from the "
    "architectural drawings and the occupancy schedule; member sizes follow from the bending and shear "
    "checks on the previous sheets. Deflection limits are L/360 for live load and L/240 for total load. "
)


def make_package(path: Path, pages: int) -> int:
    """Write the package; return how many table rows it carries."""
    pdf = Calc("Benchmark package (fictional)")
    rows = 0
    for page in range(1, pages + 1):
        pdf.add_page()
        for _ in range(9):
            pdf.multi_cell(0, 4.5, NARRATIVE, new_x="LMARGIN", new_y="NEXT")
        if page % 10 == 0:
            table = [
                [f"J{page}-{i} on B{page}", f"J{page}-{i}", f"{5 + i * 0.5:.2f}", f"{24 + i:.2f}", "OK"]
                for i in range(12)
            ]
            draw_table(
                pdf, ["Location", "Member", "Qf (kN)", "Qr (kN)", "OK?"], table, [46, 26, 28, 28, 18], ruled=True
            )
            rows += len(table)
        elif page % 25 == 3:
            for line in (f"Location: B{page} at C{page}", f"Member checked: GB{page}", "Qr = 63.97 kN >= Qf = 51.0 kN"):
                pdf.cell(0, 5, line)
                pdf.ln(5)
            rows += 1
    pdf.output(str(path))
    return rows


def plain_loop(path: Path) -> int:
    tables = 0
    with pdfplumber.open(path) as pdf:
        for page in pdf.pages:
            tables += len(page.extract_tables())
            page.flush_cache()
    return tables


def pdfium_text_pass(path: Path) -> int:
    """The floor: pdfium's plain text of every page, nothing else."""
    import pypdfium2 as pdfium

    doc = pdfium.PdfDocument(str(path))
    chars = 0
    for page in doc:
        textpage = page.get_textpage()
        chars += len(textpage.get_text_range())
        textpage.close()
        page.close()
    doc.close()
    return chars


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__)
    parser.add_argument("--pages", type=int, default=300)
    parser.add_argument("--no-report", action="store_true", help="print only; leave reports/benchmarks.md alone")
    args = parser.parse_args(argv)
    with tempfile.TemporaryDirectory() as tmp:
        path = Path(tmp) / "package.pdf"
        rows = make_package(path, args.pages)
        result = extract(path)  # warm: imports and the file cache, as for the floor below
        ours = best_of(3, lambda: extract(path))
        t0 = time.perf_counter()
        tables = plain_loop(path)
        plain = time.perf_counter() - t0
        chars = pdfium_text_pass(path)
        floor = best_of(3, lambda: pdfium_text_pass(path))
    assert len(result.claims) == rows, (len(result.claims), rows)
    ratio = plain / ours
    over_floor = ours / floor
    body = (
        "## PDF extraction (`python -m tests.benchmarks.bench_extract`)\n\n"
        f"Machine: {machine()}.\n\n"
        f"A generated {args.pages}-page calc package ({rows} claimed checks in tables and worked equations on "
        f"{len(result.pages_parsed)} pages; narrative on the rest).\n\n"
        "| method | seconds | found |\n|---|---|---|\n"
        f"| bearing-audit `extract` (one pdfium pass: text, then characters and paths of candidate pages; best of 3) | "
        f"{ours:.2f} | {len(result.claims)} claims |\n"
        f"| plain loop of pdfplumber `extract_tables()` over every page | {plain:.2f} | {tables} tables |\n"
        f"| floor: pdfium's plain text of every page (best of 3) | {floor:.2f} | {chars:,} characters |\n\n"
        f"Speed-up over the pdfplumber loop: **{ratio:.1f}x** (target at least 1.5x). Extraction against the "
        f"pdfium text pass: **{over_floor:.1f}x** (target at most 3x).\n"
    )
    print(body)
    if not args.no_report:
        write_section("extract", body)
    return 0


if __name__ == "__main__":
    sys.exit(main())
