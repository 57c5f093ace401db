"""Benchmark: the letter and its appendix as a reviewer prints them, in headless Chromium.

    python -m tests.benchmarks.bench_letter [--bearings 10000] [--no-report]

Prints the letter and the appendix of the plain demo and of the layout demo to PDF (Letter, the
browser's default paper) and counts their pages; then generates the synthetic building of
tests/benchmarks/make_building.py (10k bearings by default), writes its letter, appendix, JSON and
workbook, and prints the appendix to PDF with Chromium's default print settings, measuring the
wall time (best of two prints) and the peak memory of Chromium's whole process tree (the sum of
the proportional set size of every process, sampled every 0.1 s; the higher of the two). Nothing
is asserted about speed.
"""

from __future__ import annotations

import argparse
import os
import shutil
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import pypdfium2

from tests.benchmarks.make_building import write
from tests.benchmarks.report import machine, write_section

ROOT = Path(__file__).resolve().parents[2]
FLAGS = [
    "--headless",
    "--no-sandbox",
    "--disable-gpu",
    "--no-first-run",
    "--disable-background-networking",
    "--disable-component-update",
    "--disable-sync",
    "--disable-extensions",
]
DEMOS = {
    "plain demo": ("fixtures/demo/model.yaml", "fixtures/demo/claims.yaml"),
    "layout demo": ("fixtures/demo-layout/model.yaml", "fixtures/demo-layout/claims.yaml"),
}


def _pss(pid: int) -> int:
    """Proportional set size of one process in bytes (0 once it is gone)."""
    try:
        with open(f"/proc/{pid}/smaps_rollup", encoding="ascii") as handle:
            for line in handle:
                if line.startswith("Pss:"):
                    return int(line.split()[1]) * 1024
    except OSError:
        pass
    return 0


def tree_memory(root: int) -> int:
    """The summed proportional set size of ``root`` and every process under it."""
    children: dict[int, list[int]] = {}
    for name in os.listdir("/proc"):
        if not name.isdigit():
            continue
        try:
            with open(f"/proc/{name}/stat", encoding="ascii", errors="replace") as handle:
                parent = int(handle.read().rsplit(")", 1)[1].split()[1])
        except (OSError, IndexError, ValueError):
            continue
        children.setdefault(parent, []).append(int(name))
    total, stack = 0, [root]
    while stack:
        pid = stack.pop()
        total += _pss(pid)
        stack.extend(children.get(pid, []))
    return total


def print_pdf(page: Path, out: Path) -> dict:
    """Print ``page`` to ``out`` with the browser's default print settings; time, peak memory, pages."""
    chromium = shutil.which("chromium") or shutil.which("chromium-browser")
    if chromium is None:
        raise SystemExit("chromium is not installed (apt-get install -y chromium)")
    with tempfile.TemporaryDirectory() as profile:
        cmd = [chromium, *FLAGS, f"--user-data-dir={profile}", f"--print-to-pdf={out}", page.resolve().as_uri()]
        start = time.perf_counter()
        proc = subprocess.Popen(cmd, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
        peak = 0
        while proc.poll() is None:
            peak = max(peak, tree_memory(proc.pid))
            time.sleep(0.1)
        seconds = time.perf_counter() - start
    pages = len(pypdfium2.PdfDocument(str(out))) if out.exists() and out.stat().st_size else 0
    return {"seconds": seconds, "peak_mb": peak / 2**20, "pages": pages, "exit": proc.returncode}


def review(model: Path, claims: Path, out: Path, extra: tuple[str, ...] = ()) -> tuple[Path, Path]:
    letter, appendix = out / "letter.html", out / "appendix.html"
    args = [str(model), "--claims", str(claims), "--memo", str(letter), "--appendix", str(appendix), *extra]
    subprocess.run([sys.executable, "-m", "audit.cli", "review", *args], capture_output=True, check=False, cwd=ROOT)
    if not (letter.exists() and appendix.exists()):
        raise SystemExit(f"review of {model} wrote no letter or appendix")
    return letter, appendix


def comments_asking(letter: Path) -> int:
    return letter.read_text(encoding="utf-8").count('<div class="finding ')


def page_1_text(pdf: Path) -> str:
    document = pypdfium2.PdfDocument(str(pdf))
    try:
        return " ".join(document[0].get_textpage().get_text_range().split()) if len(document) else ""
    finally:
        document.close()


def run(bearings: int) -> str:
    load = os.getloadavg()[0]  # the machine may be shared: timings are read against it
    rows = []
    with tempfile.TemporaryDirectory() as tmp:
        for name, (model, claims) in DEMOS.items():
            out = Path(tmp) / name.replace(" ", "-")
            out.mkdir()
            letter, appendix = review(ROOT / model, ROOT / claims, out)
            printed = [print_pdf(page, page.with_suffix(".pdf")) for page in (letter, appendix)]
            page_1 = page_1_text(letter.with_suffix(".pdf"))
            holds = "yes" if "Summary" in page_1 and "Review comments 1. " in page_1 else "no"
            rows.append((name, str(comments_asking(letter)), printed[0]["pages"], holds, printed[1]["pages"]))
        folder = Path(tmp) / "building"
        model, claims, count = write(folder, bearings)
        out = folder / "out"
        out.mkdir()
        extra = ("--json", str(out / "findings.json"), "--xlsx", str(out / "log.xlsx"))
        _, appendix = review(model, claims, out, extra)
        runs = [print_pdf(appendix, out / "appendix.pdf") for _ in range(2)]  # the machine may be shared
        big = {**min(runs, key=lambda r: r["seconds"]), "peak_mb": max(r["peak_mb"] for r in runs)}
        appendix_mb = appendix.stat().st_size / 1e6
    lines = [
        "## The letter and its appendix in print (`python -m tests.benchmarks.bench_letter`)",
        "",
        f"Machine: {machine()}; load average {load:.1f} when the run began.",
        "",
        "Each printed to PDF by headless Chromium with its default print settings (Letter paper), pages counted.",
        "",
        "| review | comments asking for something | letter pages | page 1: summary and comment 1 | appendix pages |",
        "|---|---|---|---|---|",
        *(f"| {name} | {n} | {letter} | {one} | {appendix} |" for name, n, letter, one, appendix in rows),
        "",
        "Target: the letter of the layout demo on at most 10 Letter pages (at most 30 comments asking for "
        "something), page 1 carrying the summary and the first comments; "
        "`tests/test_memo_browser.py` asserts it.",
        "",
        f"The appendix of the synthetic building of `make_building` with {count:,} bearings ({appendix_mb:.1f} MB of "
        f"HTML; above 2,000 checks it lists the checks with comments and leaves every check to the workbook): "
        f"printed in **{big['seconds']:.1f} s** (best of 2; slowest {max(r['seconds'] for r in runs):.1f} s) with a "
        f"peak of **{big['peak_mb']:,.0f} MB** (the higher of the 2) over Chromium's processes (summed proportional "
        f"set size), {big['pages']:,} pages, exit status {big['exit']}. "
        "Target: under 90 s and under 2 GB.",
    ]
    return "\n".join(lines) + "\n"


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__)
    parser.add_argument("--bearings", type=int, default=10000)
    parser.add_argument("--no-report", action="store_true", help="print only; leave reports/benchmarks.md alone")
    args = parser.parse_args(argv)
    text = run(args.bearings)
    print(text)
    if not args.no_report:
        write_section("letter", text)
    return 0


if __name__ == "__main__":
    sys.exit(main())
