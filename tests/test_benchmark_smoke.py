"""The benchmark scripts run end to end at their smallest size; timings are not asserted."""

from __future__ import annotations

from tests.benchmarks import bench_scale


def test_scale_benchmark_completes_with_well_formed_output(capsys):
    assert bench_scale.main(["--sizes", "1000", "--no-report", "--no-browser"]) == 0
    out = capsys.readouterr().out
    assert "| bearings | checks |" in out
    lines = out.splitlines()
    header = next(i for i, line in enumerate(lines) if line.startswith("| bearings | checks |"))
    row = lines[header + 2]  # the row under the header's separator
    cells = [c.strip() for c in row.strip("|").split("|")]
    assert len(cells) == 7 and float(cells[2]) > 0 and float(cells[3]) > 0


def test_pattern_benchmark_completes_and_finds_continuous_members(capsys):
    from tests.benchmarks import bench_patterns

    assert bench_patterns.main(["--bearings", "300", "--repeat", "1", "--no-report"]) == 0
    out = capsys.readouterr().out
    row = next(line for line in out.splitlines() if line.startswith("| with L and S patterns"))
    assert int(row.rstrip("|").split("|")[-1].strip().replace(",", "")) > 0  # envelopes were made
