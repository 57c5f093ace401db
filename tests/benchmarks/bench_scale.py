"""Benchmark: a whole building reviewed with memo, JSON and CSV, against the YAML-load floors.

    python -m tests.benchmarks.bench_scale [--sizes 1000 10000 50000] [--repeat 3] [--no-report] [--no-browser]

For each size it generates a synthetic building and claims (tests/benchmarks/make_building.py),
then measures in fresh processes, in the same run: the wall time, CPU time and peak memory of
`bearing-audit review MODEL --claims CLAIMS --memo --appendix --json --csv`, and the floor of merely loading
the same two YAML files with PyYAML's C loader, twice: with the cycle collector on (Python's
default) and off (as the review runs, so the ratio compares like with like). Each round runs the
review and both floors one after the other, ``--repeat`` rounds; the figures are medians, and each
ratio is the median of the rounds' own ratios (paired, so a busy moment of a shared machine slows
both sides of one ratio). CPU time is the child's own (``time.process_time``), steadier than wall
time when other work shares the cores. It reports how time grows from the second size to the
largest, and how long headless Chromium takes to load the largest appendix. Outputs are checked for
form (JSON and CSV parse, the letter and appendix are complete); nothing is asserted about speed.
"""

from __future__ import annotations

import argparse
import csv
import json
import math
import os
import shutil
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

from tests.benchmarks.make_building import write
from tests.benchmarks.report import machine, write_section

CHILD_REVIEW = """
import json, resource, sys, time
t, cpu = time.perf_counter(), time.process_time()
from audit.cli import main
sys.argv = ["bearing-audit", "review", *sys.argv[1:]]
try:
    main()
except SystemExit as stop:
    code = stop.code
seconds, cpu = time.perf_counter() - t, time.process_time() - cpu
print(json.dumps({"seconds": seconds, "cpu": cpu,
                  "peak_mb": resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024, "exit": code}))
"""

# argv: "on" or "off" (the cycle collector), then the files
CHILD_FLOOR = """
import gc, json, resource, sys, time
if sys.argv[1] == "off":
    gc.disable()
t, cpu = time.perf_counter(), time.process_time()
import yaml
for path in sys.argv[2:]:
    with open(path, encoding="utf-8") as handle:
        yaml.load(handle.read(), Loader=yaml.CSafeLoader)
seconds, cpu = time.perf_counter() - t, time.process_time() - cpu
print(json.dumps({"seconds": seconds, "cpu": cpu,
                  "peak_mb": resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024}))
"""


def _child(code: str, args: list[str]) -> dict:
    done = subprocess.run([sys.executable, "-c", code, *args], capture_output=True, text=True, check=True)
    return json.loads(done.stdout.strip().splitlines()[-1])


def check_outputs(out: Path) -> int:
    """Assert the outputs are well-formed; return how many checks the JSON lists."""
    data = json.loads((out / "findings.json").read_text(encoding="utf-8"))
    assert data["checks"] and data["check_outcomes"] and len(data["checks"]) == len(data["check_outcomes"])
    with (out / "findings.csv").open(encoding="utf-8") as handle:
        rows = list(csv.DictReader(handle))
    assert len(rows) == sum(len(c["places"]) for c in data["comments"] if c["weight"] != "record")
    memo = (out / "memo.html").read_text(encoding="utf-8")
    assert memo.rstrip().endswith("</html>") and 'id="comments"' in memo
    appendix = (out / "appendix.html").read_text(encoding="utf-8")
    assert appendix.rstrip().endswith("</html>") and 'id="checks"' in appendix
    return len(data["checks"])


def browser_load_seconds(page: Path) -> float | None:
    """Time for headless Chromium to load, lay out and paint the first screen of the page (a
    screenshot), less the same for an empty page."""
    chromium = shutil.which("chromium") or shutil.which("chromium-browser")
    if chromium is None:
        return None
    flags = [
        "--headless",
        "--no-sandbox",
        "--disable-gpu",
        "--disable-background-networking",
        "--disable-component-update",
        "--disable-sync",
        "--no-first-run",
        "--dump-dom",
    ]

    def timed(target: Path) -> float:
        with tempfile.TemporaryDirectory() as profile:
            t = time.perf_counter()
            subprocess.run(
                [chromium, *flags, f"--user-data-dir={profile}", target.resolve().as_uri()],
                capture_output=True,
                timeout=600,
                check=False,
            )
            return time.perf_counter() - t

    with tempfile.TemporaryDirectory() as tmp:
        empty = Path(tmp) / "empty.html"
        empty.write_text("<!DOCTYPE html><title>empty</title><p>empty</p>")
        baseline = min(timed(empty) for _ in range(2))
    return max(0.0, timed(page) - baseline)


def _median(runs: list[dict], key: str) -> float:
    return statistics.median(r[key] for r in runs)


def _paired(top: list[dict], bottom: list[dict], key: str) -> float:
    """Median of the rounds' own ratios: each round's two figures were taken one after the other."""
    return statistics.median(a[key] / b[key] for a, b in zip(top, bottom, strict=True))


def run(sizes: list[int], browser: bool, repeat: int = 3) -> tuple[list[dict], float | None]:
    rows = []
    load = None
    with tempfile.TemporaryDirectory() as tmp:
        for size in sizes:
            folder = Path(tmp) / f"b{size}"
            model, claims, bearings = write(folder, size)
            out = folder / "out"
            out.mkdir()
            args = [
                str(model),
                "--claims",
                str(claims),
                "--memo",
                str(out / "memo.html"),
                "--appendix",
                str(out / "appendix.html"),
                "--json",
                str(out / "findings.json"),
                "--csv",
                str(out / "findings.csv"),
            ]
            reviews, floors_on, floors_off = [], [], []
            for _ in range(repeat):
                reviews.append(_child(CHILD_REVIEW, args))
                floors_on.append(_child(CHILD_FLOOR, ["on", str(model), str(claims)]))
                floors_off.append(_child(CHILD_FLOOR, ["off", str(model), str(claims)]))
            checks = check_outputs(out)
            rows.append(
                {
                    "target": size,
                    "bearings": bearings,
                    "checks": checks,
                    "review": {k: _median(reviews, k) for k in ("seconds", "cpu", "peak_mb")},
                    "floor_on": {k: _median(floors_on, k) for k in ("seconds", "cpu", "peak_mb")},
                    "floor_off": {k: _median(floors_off, k) for k in ("seconds", "cpu", "peak_mb")},
                    "cpu_ratio_on": _paired(reviews, floors_on, "cpu"),
                    "cpu_ratio_off": _paired(reviews, floors_off, "cpu"),
                    "wall_ratio_off": _paired(reviews, floors_off, "seconds"),
                    "memo_mb": sum((out / name).stat().st_size for name in ("memo.html", "appendix.html")) / 1e6,
                }
            )
            if browser and size == max(sizes):
                load = browser_load_seconds(out / "appendix.html")
    return rows, load


def render(rows: list[dict], load: float | None, repeat: int = 3, loads: tuple[float, float] | None = None) -> str:
    lines = [
        "## Scale (`python -m tests.benchmarks.bench_scale`)",
        "",
        f"Machine: {machine()}.",
        "",
        "Synthetic buildings (storeys of a post grid, glulam beams continuous over the posts, sawn joists, "
        "posts stacked through beams), with claims in which about 5% of checks are left out and 5% carry a slip. "
        "`review` writes the letter and its appendix, the JSON and the CSV; the floor is loading the same model "
        "and claims YAML with PyYAML's C loader, with the cycle collector on (Python's default) and off "
        "(as the review runs). "
        f"Each figure is the median of {repeat} fresh processes; each ratio is the median of the rounds' own "
        "ratios (review and floors run one after the other in each round). CPU is the child's own time.",
        "",
    ]
    if loads is not None:
        lines += [
            f"Load average (1 min) {loads[0]:.1f} at the start and {loads[1]:.1f} at the end, on "
            f"{os.cpu_count()} cores: the machine was shared, so wall times spread widely; compare the CPU "
            "ratios, and only with other figures of the same run.",
            "",
        ]
    lines += [
        "| bearings | checks | review wall (s) | review CPU (s) | floor CPU, collector on (s) | "
        "floor CPU, collector off (s) | CPU ratio to floor on | CPU ratio to floor off | wall ratio to floor off "
        "| peak memory (MB) | floor peak (MB) | letter + appendix (MB) |",
        "|---|---|---|---|---|---|---|---|---|---|---|---|",
    ]
    for r in rows:
        lines.append(
            f"| {r['bearings']:,} | {r['checks']:,} | {r['review']['seconds']:.2f} | {r['review']['cpu']:.2f} | "
            f"{r['floor_on']['cpu']:.2f} | {r['floor_off']['cpu']:.2f} | {r['cpu_ratio_on']:.2f} | "
            f"**{r['cpu_ratio_off']:.2f}** | {r['wall_ratio_off']:.2f} | {r['review']['peak_mb']:.0f} | "
            f"{r['floor_off']['peak_mb']:.0f} | {r['memo_mb']:.1f} |"
        )
    lines.append("")
    lines.append(
        "Targets (2 cores): about 10k bearings within 2.5x of the collector-off floor (CPU); 1k within 3x; "
        "peak memory at 50k under 700 MB; 5x the bearings in at most 6x the time."
    )
    if len(rows) >= 2:
        a, b = rows[-2], rows[-1]
        n = b["bearings"] / a["bearings"]
        t = b["review"]["cpu"] / a["review"]["cpu"]
        nlogn = n * math.log(b["bearings"]) / math.log(a["bearings"])
        lines.append("")
        lines.append(
            f"Growth from {a['bearings']:,} to {b['bearings']:,} bearings ({n:.2f}x): CPU time {t:.2f}x "
            f"(n log n would be {nlogn:.2f}x; the target allows {6 * n / 5:.2f}x)."
        )
    if load is not None:
        lines.append("")
        lines.append(
            f"Headless Chromium loads the largest appendix (letter and appendix {rows[-1]['memo_mb']:.1f} MB, "
            f"{rows[-1]['checks']:,} checks) in {load:.2f} s beyond an empty page."
        )
    return "\n".join(lines) + "\n"


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__)
    parser.add_argument("--sizes", type=int, nargs="+", default=[1000, 10000, 50000])
    parser.add_argument("--no-report", action="store_true", help="print only; leave reports/benchmarks.md alone")
    parser.add_argument("--no-browser", action="store_true", help="skip the Chromium load measurement")
    parser.add_argument("--repeat", type=int, default=3, help="rounds per size (medians are reported)")
    args = parser.parse_args(argv)
    before = os.getloadavg()[0]
    rows, load = run(args.sizes, browser=not args.no_browser, repeat=args.repeat)
    text = render(rows, load, args.repeat, (before, os.getloadavg()[0]))
    print(text)
    if not args.no_report:
        write_section("scale", text)
    return 0


if __name__ == "__main__":
    sys.exit(main())
