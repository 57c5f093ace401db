"""Benchmark: expanding a framing layout (placing, finding contacts, sharing area loads).

    python -m tests.benchmarks.bench_layout [--bays 10 22] [--repeat 3]

A synthetic floor of square 4 m bays: a glulam beam along every grid line of constant y, on a
steel post at every grid point, and in every bay a run of joists at 400 mm spanning between
beams (staggered bay to bay, so joists meeting over a beam do not clash), one floor area over
all. Times the expansion alone (read the layout, reach posts
up, find every contact through the grid index, share the area) against reading the YAML text of
the layout, at two sizes: the cost per bearing should stay flat (no test of every pair).
"""

from __future__ import annotations

import argparse
import sys

import yaml

from audit.core.errors import ErrorCollector
from audit.core.located_yaml import read_yaml_text
from audit.inputs.expand_layout import model_sections
from tests.benchmarks.report import best_of, machine, write_section


def layout_model(bays: int) -> dict:
    xs = {f"X{i}": f"{4 * i} m" for i in range(bays + 1)}
    ys = {f"Y{j}": f"{4 * j} m" for j in range(bays + 1)}
    members = [
        {"id": f"B{j}", "material": "GL", "b": "130 mm", "d": "380 mm", "level": "L2", "drop": "235 mm",
         "from": f"X0/Y{j}", "to": f"X{bays}/Y{j}", "extend": "76 mm"}
        for j in range(bays + 1)
    ]  # fmt: skip
    runs = [
        {"id": f"J{i}-{j}", "material": "SPF", "b": "38 mm", "d": "235 mm", "level": "L2", "spacing": "400 mm",
         "first": "200 mm" if j % 2 == 0 else "100 mm", "last": "200 mm" if j % 2 == 0 else "100 mm",
         "between": [f"X{i}", f"X{i + 1}"], "span": [f"Y{j}", f"Y{j + 1}"], "extend": "65 mm"}
        for i in range(bays) for j in range(bays)
    ]  # fmt: skip
    posts = [
        {"id": f"C{i}-{j}", "material": "STEEL", "b": "152 mm", "d": "152 mm", "at": f"X{i}/Y{j}", "base": "L1",
         "top": "L2"}
        for i in range(bays + 1) for j in range(bays + 1)
    ]  # fmt: skip
    return {
        "project": {"title": "Layout benchmark (synthetic)"},
        "materials": {
            "GL": {"family": "glulam", "species": "D.Fir-L", "grade": "24f-EX"},
            "SPF": {"family": "sawn_lumber", "species": "S-P-F", "grade": "No.2"},
            "STEEL": {"family": "steel"},
        },
        "layout": {
            "levels": {"L1": "0 m", "L2": "3 m"},
            "grids": {"x": xs, "y": ys},
            "members": members,
            "runs": runs,
            "posts": posts,
            "areas": [
                {"id": "F", "level": "L2", "corners": ["X0/Y0", f"X{bays}/Y{bays}"], "span": "y",
                 "loads": {"D": "1.2 kPa", "L": "1.9 kPa"}}
            ],
        },
    }  # fmt: skip


def measure(bays: int, repeat: int) -> dict:
    text = yaml.safe_dump(layout_model(bays), sort_keys=False)
    read = best_of(repeat, lambda: read_yaml_text(text, "layout.yaml"))
    root = read_yaml_text(text, "layout.yaml")

    def expand():
        errors = ErrorCollector()
        sections = model_sections(root.value, root, errors)
        errors.raise_if_any()
        return sections

    sections = expand()
    seconds = best_of(repeat, expand)
    return {
        "bays": bays,
        "members": len(sections.members),
        "bearings": len(sections.bearings),
        "loads": len(sections.loads),
        "read": read,
        "expand": seconds,
    }


def render(rows: list[dict], repeat: int) -> str:
    lines = [
        "## Layout expansion (`python -m tests.benchmarks.bench_layout`)",
        "",
        f"Machine: {machine()}.",
        "",
        f"Square 4 m bays of joists at 400 mm on continuous glulam beams on posts, one floor area; best of {repeat}.",
        "Expansion is placing the members, finding every contact through the grid index and sharing the area;",
        "the YAML read of the same layout is the floor it is measured against. Both run with the cycle collector",
        "off (the reader and the expansion pause it, as in a review), so the floor is like for like.",
        "",
        "| bays | members | bearings found | area loads | YAML read s | expansion s | expansion / read "
        "| us per bearing |",
        "|---|---|---|---|---|---|---|---|",
    ]
    for r in rows:
        lines.append(
            f"| {r['bays']}x{r['bays']} | {r['members']:,} | {r['bearings']:,} | {r['loads']:,} | {r['read']:.3f} | "
            f"{r['expand']:.3f} | {r['expand'] / r['read']:.1f}x | {1e6 * r['expand'] / r['bearings']:.0f} |"
        )
    small, large = rows[0], rows[-1]
    growth = (large["expand"] / large["bearings"]) / (small["expand"] / small["bearings"])
    lines += [
        "",
        f"Cost per bearing at {large['bearings']:,} bearings is **{growth:.2f}x** that at {small['bearings']:,}: "
        "flat, as a grid index gives (a test of every pair would grow with the count).",
    ]
    return "\n".join(lines)


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__)
    parser.add_argument("--bays", type=int, nargs="+", default=[10, 22])
    parser.add_argument("--repeat", type=int, default=3)
    parser.add_argument("--no-report", action="store_true", help="print only; leave reports/benchmarks.md alone")
    args = parser.parse_args(argv)
    rows = [measure(b, args.repeat) for b in args.bays]
    body = render(rows, args.repeat)
    print(body)
    if not args.no_report:
        write_section("layout", body)
    return 0


if __name__ == "__main__":
    sys.exit(main())
