"""The benchmark scripts run end to end at their smallest size; timings are not asserted."""

from __future__ import annotations

from tests.benchmarks import bench_scale


def test_scale_benchmark_completes_with_well_formed_output(capsys):
    assert bench_scale.main(["--sizes", "1000", "--repeat", "1", "--no-report", "--no-browser"]) == 0
    out = capsys.readouterr().out
    assert "| bearings | checks |" in out
    lines = out.splitlines()
    header = next(i for i, line in enumerate(lines) if line.startswith("| bearings | checks |"))
    row = lines[header + 2]  # the row under the header's separator
    cells = [c.strip() for c in row.strip("|").split("|")]
    assert len(cells) == 12 and float(cells[2]) > 0 and float(cells[3]) > 0
    # both floors are measured (collector on and off), and the ratio to each is given
    assert float(cells[4]) > 0 and float(cells[5]) > 0 and float(cells[6]) > 0 and float(cells[7].strip("*")) > 0


def test_pattern_benchmark_completes_and_finds_continuous_members(capsys):
    from tests.benchmarks import bench_patterns

    assert bench_patterns.main(["--bearings", "300", "--repeat", "1", "--no-report"]) == 0
    out = capsys.readouterr().out
    row = next(line for line in out.splitlines() if line.startswith("| with L and S patterns"))
    assert int(row.rstrip("|").split("|")[-1].strip().replace(",", "")) > 0  # envelopes were made


def test_layout_benchmark_completes_and_finds_every_joist_bearing(capsys):
    from tests.benchmarks import bench_layout

    assert bench_layout.main(["--bays", "2", "3", "--repeat", "1", "--no-report"]) == 0
    out = capsys.readouterr().out
    rows = [line for line in out.splitlines() if line.startswith("| 2x2") or line.startswith("| 3x3")]
    assert len(rows) == 2
    # 2x2 bays: two runs of 10 joists (0.2 to 3.8 m at 400 mm), two of 11 (0.1 to 3.7 m, and one at 3.9 m),
    # 2 bearings each; and 3 beams on 3 posts each
    bearings = int(rows[0].split("|")[3].strip().replace(",", ""))
    assert bearings == (2 * 10 + 2 * 11) * 2 + 3 * 3


def test_compare_benchmark_runs_two_commits_side_by_side(capsys):
    import subprocess

    from tests.benchmarks import bench_compare

    if subprocess.run(["git", "rev-parse", "HEAD"], cwd=bench_compare.ROOT, capture_output=True).returncode:
        import pytest

        pytest.skip("not a git checkout")
    args = ["HEAD", "HEAD", "--sizes", "200", "--rounds", "1", "--bays", "2", "--no-report"]
    assert bench_compare.main(args) == 0
    out = capsys.readouterr().out
    rows = [line for line in out.splitlines() if line.startswith("| review, ") or line.startswith("| expand, 2x2")]
    assert len(rows) == 2
    cells = [c.strip() for c in rows[0].strip("|").split("|")]
    assert len(cells) == 4 and all(float(c) > 0 for c in cells[1:])  # two commits' CPU seconds and their ratio
