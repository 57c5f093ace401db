"""Benchmark: the cost of pattern loading in the take-down, against the take-down without it.

    python -m tests.benchmarks.bench_patterns [--bearings 5000] [--repeat 3]

Builds the synthetic building of bench_scale (glulam beams continuous over posts), reads it
once, then times the take-down with every span loaded only and with the combinations pack's
L and S patterns, in the same process, and writes the ratio to reports/benchmarks.md.
Reactions are linear in the loads: each member is solved once per span and patterned case,
and every pattern's worst is combined from those shares (no solve per pattern).
"""

from __future__ import annotations

import argparse
import sys
import tempfile
from pathlib import Path

import yaml

from audit.engine.take_down import take_down
from audit.inputs.read_model import read_model
from tests.benchmarks.make_building import building
from tests.benchmarks.report import best_of, machine, write_section


def measure(bearings: int, repeat: int) -> dict:
    with tempfile.TemporaryDirectory() as tmp:
        path = Path(tmp) / "model.yaml"
        path.write_text(yaml.safe_dump(building(bearings), sort_keys=False), encoding="utf-8")
        model, _, cpack = read_model(path)
    patterns = {case: p.value for case, p in cpack.patterns.items()}
    plain = best_of(repeat, lambda: take_down(model))
    patterned = best_of(repeat, lambda: take_down(model, patterns))
    flow = take_down(model, patterns)
    continuous = sum(1 for m in model.members.values() if sum(b.upper.member == m.id for b in model.bearings) >= 3)
    return {
        "bearings": len(model.bearings),
        "continuous": continuous,
        "enveloped": len(flow.envelopes),
        "plain": plain,
        "patterned": patterned,
    }


def render(row: dict, repeat: int) -> str:
    ratio = row["patterned"] / row["plain"]
    return "\n".join(
        [
            "## Pattern loading (`python -m tests.benchmarks.bench_patterns`)",
            "",
            f"Machine: {machine()}.",
            "",
            f"The bench_scale building with {row['bearings']:,} bearings, {row['continuous']:,} members on three or "
            f"more supports; best of {repeat} take-downs each, same process.",
            "",
            "| take-down | seconds | supports with an envelope |",
            "|---|---|---|",
            f"| every span loaded | {row['plain']:.3f} | 0 |",
            f"| with L and S patterns (one solve per span and case) | {row['patterned']:.3f} | {row['enveloped']:,} |",
            "",
            f"Cost of patterns: **{ratio:.2f}x** the plain take-down.",
        ]
    )


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__)
    parser.add_argument("--bearings", type=int, default=5000)
    parser.add_argument("--repeat", type=int, default=3)
    parser.add_argument("--no-report", action="store_true", help="print only; leave reports/benchmarks.md alone")
    args = parser.parse_args(argv)
    row = measure(args.bearings, args.repeat)
    body = render(row, args.repeat)
    print(body)
    if not args.no_report:
        write_section("patterns", body)
    return 0


if __name__ == "__main__":
    sys.exit(main())
