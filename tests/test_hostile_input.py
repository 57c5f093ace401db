"""Hostile and malformed input: exit status 2, one line naming file, line and key, no traceback.

The corpus is tests/hostile/ (written by fixtures/make_hostile_corpus.py, which also states each
case's expected message, key and line in tests/hostile/expected.yaml). The largest inputs are
made here at run time and run in a child process under a memory cap and a hang timeout.
"""

from __future__ import annotations

import re
import resource
import subprocess
import sys
from pathlib import Path

import pytest
import yaml

from audit import cli
from fixtures.make_hostile_corpus import MODEL, PREVIOUS, RESPONSES
from tests.conftest import ROOT

CORPUS = ROOT / "tests" / "hostile"
MANIFEST = yaml.safe_load((CORPUS / "expected.yaml").read_text())
# an error about a file as a whole (an output, a damaged workbook) names no line: the manifest's line is 0
LINE = re.compile(r"^error: (?P<file>.+?)(?::(?P<line>\d+):(?P<col>\d+))?: (?P<key>[^:]+?): (?P<msg>.+)$")


def test_corpus_has_at_least_forty_cases():
    assert len(MANIFEST) >= 40
    files = {str(f.relative_to(CORPUS)) for f in CORPUS.rglob("*") if f.is_file()}
    assert files - {"expected.yaml"} == set(MANIFEST)


@pytest.fixture(scope="module")
def valid_model(tmp_path_factory) -> Path:
    path = tmp_path_factory.mktemp("base") / "model.yaml"
    path.write_text(MODEL)
    return path


@pytest.fixture(scope="module")
def last_round(tmp_path_factory) -> Path:
    path = tmp_path_factory.mktemp("round") / "last.json"
    path.write_text(PREVIOUS)
    return path


def _argv(kind: str, path: Path, model: Path, last: Path, out: Path) -> list[str]:
    given = {
        "model": [str(path)],
        "model-warns": [str(path)],
        "claims": [str(model), "--claims", str(path)],
        "previous": [str(model), "--previous", str(path)],
        "responses": [str(model), "--previous", str(last), "--responses", str(path)],
        "output-onto-pack": [str(model), "--rules-dir", str(path.parent), "--json", str(path)],
        "rules-dir": [str(model), "--rules-dir", str(path.parent)],
    }
    return ["review", *given[kind]]


def test_the_good_round_files_the_corpus_forges_are_read(valid_model, last_round, tmp_path, capsys):
    log = tmp_path / "log.csv"
    log.write_text(RESPONSES)
    assert cli.run(["review", str(valid_model), "--previous", str(last_round), "--responses", str(log)]) in (0, 1)
    assert "error" not in capsys.readouterr().err


@pytest.mark.parametrize("name", sorted(n for n, case in MANIFEST.items() if case["input"] != "companion"))
def test_malformed_file_gives_exit_2_and_a_located_line(name, valid_model, last_round, tmp_path, capsys):
    case = MANIFEST[name]
    path = CORPUS / name
    before = path.read_bytes()
    warns = case["input"].endswith("-warns")  # plausible but most likely a typo: reviewed, with a located warning
    code = cli.run(_argv(case["input"], path, valid_model, last_round, tmp_path / "out.json"))
    assert code in (0, 1) if warns else code == 2
    assert path.read_bytes() == before
    err = capsys.readouterr().err
    assert "Traceback" not in err and "internal error" not in err
    lines = [ln.replace("warning: ", "error: ", 1) for ln in err.splitlines() if ln.startswith("warning: ")]
    lines = lines if warns else [ln for ln in err.splitlines() if ln.startswith("error: ")]
    match = next((LINE.match(ln) for ln in lines if case["message"] in ln), None)
    assert match, f"no located line with {case['message']!r} in:\n{err}"
    assert match["file"] in (str(path), f"{path} [Comments]")
    assert match["key"].startswith(case["key"])
    if case["line"]:
        assert int(match["line"]) == case["line"]


def _capped_child(args: list[str], memory_mb: int = 1024, timeout: float = 60.0) -> subprocess.CompletedProcess:
    """Run the CLI in a child under an address-space cap; the timeout only catches a hang."""

    def cap() -> None:
        limit = memory_mb * 1024 * 1024
        resource.setrlimit(resource.RLIMIT_AS, (limit, limit))

    code = "import sys; from audit.cli import run; sys.exit(run(sys.argv[1:]))"
    return subprocess.run(
        [sys.executable, "-c", code, *args],
        capture_output=True,
        text=True,
        timeout=timeout,
        preexec_fn=cap,
        check=False,
    )


@pytest.mark.parametrize(
    ("make", "message"),
    [
        (lambda: MODEL.replace("Hostile corpus base (invented)", "x" * 10_000_000), "characters long"),
        (lambda: "project: " + "[" * 200_000 + "]" * 200_000 + "\n", "nested more than 64 levels deep"),
        (lambda: (CORPUS / "model-alias-bomb.yaml").read_text(), "too many values"),
        (
            lambda: (
                MODEL
                + "".join(
                    f"  - {{id: X{i}, member: J1, type: point, at: 1 m, specified: {{D: 1 kN}}}}\n"
                    for i in range(20_000)
                )
                + "  - {id: X7, member: J1, type: point, at: 1 m}\n"
            ),
            "duplicate load id",
        ),
    ],
    ids=["10MB-label", "deep-nesting", "alias-bomb", "20k-loads-then-a-fault"],
)
def test_large_hostile_inputs_stay_within_a_memory_cap(make, message, tmp_path):
    path = tmp_path / "big.yaml"
    path.write_text(make())
    done = _capped_child(["review", str(path)])
    assert done.returncode == 2, done.stderr[-2000:]
    assert message in done.stderr and "Traceback" not in done.stderr
    assert all(
        line.startswith(("error: ", "1 errors", "2 errors")) or "errors; nothing" in line
        for line in done.stderr.splitlines()
    )
