"""Shared by the benchmark scripts: machine facts and writing one section of reports/benchmarks.md."""

from __future__ import annotations

import datetime as dt
import os
import platform
import re
import time
from pathlib import Path

REPORT = Path(__file__).resolve().parents[2] / "reports" / "benchmarks.md"
TITLE = "# Benchmarks\n\nEach section is rewritten by the script named in it; timings are measured, never asserted.\n"


def machine() -> str:
    cpu = platform.processor() or platform.machine()
    try:
        for line in Path("/proc/cpuinfo").read_text().splitlines():
            if line.startswith("model name"):
                cpu = line.split(":", 1)[1].strip()
                break
    except OSError:
        pass
    return (
        f"{cpu}, {os.cpu_count()} cores, Python {platform.python_version()} on {platform.system()}, "
        f"run {dt.date.today().isoformat()}"
    )


def write_section(name: str, body: str) -> None:
    """Replace the section ``name`` (between its markers) or append it."""
    text = REPORT.read_text(encoding="utf-8") if REPORT.exists() else TITLE
    start, end = f"<!-- {name}:start -->", f"<!-- {name}:end -->"
    block = f"{start}\n{body.rstrip()}\n{end}"
    if start in text:
        text = re.sub(re.escape(start) + r".*?" + re.escape(end), lambda _: block, text, flags=re.S)
    else:
        text = text.rstrip() + "\n\n" + block + "\n"
    REPORT.parent.mkdir(parents=True, exist_ok=True)
    REPORT.write_text(text, encoding="utf-8")


def best_of(repeat: int, run) -> float:
    """The shortest of ``repeat`` runs, in seconds: the least disturbed by the rest of the machine."""
    times = []
    for _ in range(repeat):
        start = time.perf_counter()
        run()
        times.append(time.perf_counter() - start)
    return min(times)
