"""Benchmark: commits compared side by side, paired, in CPU time (for a shared machine).

    python -m tests.benchmarks.bench_compare BASE REV [REV ...] [--sizes 1000 5000] [--rounds 3] [--no-report]

Each commit's source is exported (``git archive``) to a temporary folder; each round runs, for
every commit one after the other in fresh processes: the review with memo, JSON and CSV of the
synthetic buildings of ``--sizes`` (tests/benchmarks/make_building.py), the demo review (memo
and JSON), and ``expand`` of a 22x22-bay layout (``--bays``) (tests/benchmarks/bench_layout.py); and once
per round the floors: PyYAML's C loader with the cycle collector off on the same files (and on
the expanded model), and a process that only imports yaml, jinja2, typer and pypdfium2. It
reports the median CPU time (the child's ``time.process_time``) of each, and each commit's
paired ratio to BASE (the median of the rounds' own ratios: a busy moment slows both commits of
one round alike). Nothing is asserted.
"""

from __future__ import annotations

import argparse
import io
import json
import os
import statistics
import subprocess
import sys
import tarfile
import tempfile
from pathlib import Path

import yaml

from tests.benchmarks.bench_layout import layout_model
from tests.benchmarks.bench_scale import CHILD_FLOOR, CHILD_REVIEW
from tests.benchmarks.make_building import write
from tests.benchmarks.report import machine, write_section

ROOT = Path(__file__).resolve().parents[2]
CHILD_COMMAND = CHILD_REVIEW.replace('"review", ', "")  # the command is the first argument
CHILD_IMPORTS = """
import json, resource, time
t, cpu = time.perf_counter(), time.process_time()
import yaml, jinja2, typer, pypdfium2
print(json.dumps({"seconds": time.perf_counter() - t, "cpu": time.process_time() - cpu,
                  "peak_mb": resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024}))
"""


def export(rev: str, into: Path) -> str:
    """The commit's files in ``into``; returns its short hash."""
    short = subprocess.run(
        ["git", "rev-parse", "--short", rev], cwd=ROOT, capture_output=True, text=True, check=True
    ).stdout.strip()
    archive = subprocess.run(["git", "archive", rev], cwd=ROOT, capture_output=True, check=True).stdout
    with tarfile.open(fileobj=io.BytesIO(archive)) as tar:
        tar.extractall(into, filter="data")
    return short


def child(code: str, args: list[str], cwd: Path) -> dict:
    """One fresh process; ``python -c`` puts its working folder first on the path, so it imports that tree."""
    done = subprocess.run([sys.executable, "-c", code, *args], capture_output=True, text=True, check=True, cwd=cwd)
    return json.loads(done.stdout.strip().splitlines()[-1])


Jobs = dict[str, tuple[str, list[str]]]


def jobs(tmp: Path, sizes: list[int], bays: int) -> tuple[Jobs, Jobs]:
    """(per-commit jobs, floors), each name -> (child code, arguments)."""
    out = tmp / "out"
    out.mkdir()
    per_commit: Jobs = {}
    floors: Jobs = {}
    for size in sizes:
        model, claims, bearings = write(tmp / f"b{size}", size)
        outputs = ["--memo", str(out / "m.html"), "--json", str(out / "f.json"), "--csv", str(out / "f.csv")]
        per_commit[f"review, {bearings:,} bearings"] = (CHILD_REVIEW, [str(model), "--claims", str(claims), *outputs])
        floors[f"YAML floor, collector off, {bearings:,} bearings"] = (CHILD_FLOOR, ["off", str(model), str(claims)])
    demo = ROOT / "fixtures" / "demo"
    demo_args = [str(demo / "model.yaml"), "--claims", str(demo / "claims.yaml")]
    per_commit["demo review (memo, JSON)"] = (
        CHILD_REVIEW,
        [*demo_args, "--memo", str(out / "d.html"), "--json", str(out / "d.json")],
    )
    floors["imports of yaml, jinja2, typer, pypdfium2"] = (CHILD_IMPORTS, [])
    layout = tmp / "layout.yaml"
    layout.write_text(yaml.safe_dump(layout_model(bays), sort_keys=False), encoding="utf-8")
    per_commit[f"expand, {bays}x{bays} bays"] = (CHILD_COMMAND, ["expand", str(layout), "-o", str(out / "x.yaml")])
    floors["YAML floor, collector off, the expanded model"] = (CHILD_FLOOR, ["off", str(out / "x.yaml")])
    return per_commit, floors


def run(revs: list[str], sizes: list[int], rounds: int, bays: int = 22) -> dict:
    with tempfile.TemporaryDirectory() as name:
        tmp = Path(name)
        trees = {}
        for rev in revs:
            folder = tmp / f"tree{len(trees)}"
            short = export(rev, folder)
            trees[short if short not in trees else f"{short}#{len(trees) + 1}"] = folder  # one commit twice: A/A
        per_commit, floors = jobs(tmp, sizes, bays)
        times: dict[tuple[str, str], list[float]] = {}
        load = [os.getloadavg()[0]]
        for _ in range(rounds):
            for job, (code, args) in per_commit.items():
                for short, folder in trees.items():
                    times.setdefault((job, short), []).append(child(code, args, folder)["cpu"])
            for job, (code, args) in floors.items():
                times.setdefault((job, ""), []).append(child(code, args, ROOT)["cpu"])
        load.append(os.getloadavg()[0])
    return {"commits": list(trees), "jobs": list(per_commit), "floors": list(floors), "times": times, "load": load}


def render(result: dict, rounds: int) -> str:
    commits, times = result["commits"], result["times"]
    base = commits[0]
    lines = [
        "## Commits compared (`python -m tests.benchmarks.bench_compare`)",
        "",
        f"Machine: {machine()}. Load average (1 min) {result['load'][0]:.1f} at the start and "
        f"{result['load'][1]:.1f} at the end, on {os.cpu_count()} cores: shared, so CPU time is the measure.",
        "",
        f"CPU seconds of fresh processes, median of {rounds} rounds; each commit's ratio to {base} is the "
        "median of the rounds' own ratios (the commits of a round run one after the other).",
        "",
        "| job | " + " | ".join(commits) + " | " + " | ".join(f"{c} / {base}" for c in commits[1:]) + " |",
        "|---|" + "---|" * (2 * len(commits) - 1),
    ]
    for job in result["jobs"]:
        medians = [f"{statistics.median(times[(job, c)]):.3f}" for c in commits]
        ratios = [
            f"{statistics.median(a / b for a, b in zip(times[(job, c)], times[(job, base)], strict=True)):.3f}"
            for c in commits[1:]
        ]
        lines.append(f"| {job} | " + " | ".join(medians) + " | " + " | ".join(ratios) + " |")
    lines += ["", "| floor | CPU seconds |", "|---|---|"]
    for job in result["floors"]:
        lines.append(f"| {job} | {statistics.median(times[(job, '')]):.3f} |")
    return "\n".join(lines) + "\n"


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__)
    parser.add_argument("revs", nargs="+", help="commits (the first is the base)")
    parser.add_argument("--sizes", type=int, nargs="+", default=[1000, 5000])
    parser.add_argument("--rounds", type=int, default=3)
    parser.add_argument("--bays", type=int, default=22, help="the layout expanded is bays x bays")
    parser.add_argument("--no-report", action="store_true", help="print only; leave reports/benchmarks.md alone")
    args = parser.parse_args(argv)
    text = render(run(args.revs, args.sizes, args.rounds, args.bays), args.rounds)
    print(text)
    if not args.no_report:
        write_section("compare", text)
    return 0


if __name__ == "__main__":
    sys.exit(main())
