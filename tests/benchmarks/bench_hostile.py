"""Benchmark: how long each malformed input takes to be refused, and the memory of the largest.

    python -m tests.benchmarks.bench_hostile [--no-report]

Runs every file of the corpus in tests/hostile/ through the command line in one process (the
time of each refusal), then the large generated inputs in fresh processes (time and peak
memory). Writes its section of reports/benchmarks.md. Nothing is asserted.
"""

from __future__ import annotations

import argparse
import contextlib
import io
import json
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import yaml

from audit import cli
from fixtures.make_hostile_corpus import MODEL
from tests.benchmarks.report import machine, write_section

CORPUS = Path(__file__).resolve().parents[1] / "hostile"

CHILD = """
import json, resource, sys, time
t = time.perf_counter()
from audit.cli import run
code = run(sys.argv[1:])
print(json.dumps({"seconds": time.perf_counter() - t, "exit": code,
                  "peak_mb": resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024}))
"""

LARGE = {
    "10 MB label": lambda: MODEL.replace("Hostile corpus base (invented)", "x" * 10_000_000),
    "200,000 nested brackets": lambda: "project: " + "[" * 200_000 + "]" * 200_000 + "\n",
    "alias bomb (9^10 values if expanded)": lambda: (CORPUS / "model-alias-bomb.yaml").read_text(),
}


def corpus_times(base_model: Path) -> list[tuple[str, float, int]]:
    manifest = yaml.safe_load((CORPUS / "expected.yaml").read_text())
    with contextlib.redirect_stderr(io.StringIO()), contextlib.redirect_stdout(io.StringIO()):
        cli.run(["review", str(base_model)])  # warm the imports once
    out = []
    for name, case in sorted(manifest.items()):
        path = CORPUS / name
        argv = ["review", str(path)] if case["input"] == "model" else ["review", str(base_model), "--claims", str(path)]
        with contextlib.redirect_stderr(io.StringIO()), contextlib.redirect_stdout(io.StringIO()):
            t = time.perf_counter()
            code = cli.run(argv)
            out.append((name, time.perf_counter() - t, code))
    return out


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__)
    parser.add_argument("--no-report", action="store_true")
    args = parser.parse_args(argv)
    with tempfile.TemporaryDirectory() as tmp:
        base = Path(tmp) / "model.yaml"
        base.write_text(MODEL)
        times = corpus_times(base)
        large = []
        for label, make in LARGE.items():
            path = Path(tmp) / "large.yaml"
            path.write_text(make())
            done = subprocess.run(
                [sys.executable, "-c", CHILD, "review", str(path)], capture_output=True, text=True, check=True
            )
            large.append((label, json.loads(done.stdout.strip().splitlines()[-1])))
    seconds = [t for _, t, _ in times]
    slowest = max(times, key=lambda x: x[1])
    lines = [
        "## Hostile input (`python -m tests.benchmarks.bench_hostile`)",
        "",
        f"Machine: {machine()}.",
        "",
        f"{len(times)} malformed files of `tests/hostile/`, each refused with exit status "
        f"{sorted({c for _, _, c in times})} in one warm process: median {statistics.median(seconds) * 1000:.1f} ms, "
        f"slowest {slowest[1] * 1000:.1f} ms (`{slowest[0]}`).",
        "",
        "| large input, fresh process | exit | seconds (with start-up) | peak memory (MB) |",
        "|---|---|---|---|",
    ]
    lines += [f"| {label} | {r['exit']} | {r['seconds']:.2f} | {r['peak_mb']:.0f} |" for label, r in large]
    text = "\n".join(lines) + "\n"
    print(text)
    if not args.no_report:
        write_section("hostile", text)
    return 0


if __name__ == "__main__":
    sys.exit(main())
