"""Output files are replaced only by complete ones: a failure mid-write leaves the old file."""

from __future__ import annotations

import pytest

from audit.core.outfiles import write_atomic


def test_a_failure_while_writing_keeps_the_previous_file_and_leaves_no_temporary(tmp_path):
    target = tmp_path / "memo.html"
    target.write_text("the good memo")

    def chunks():
        yield "<html>half a memo"
        raise RuntimeError("crash while rendering")

    with pytest.raises(RuntimeError):
        write_atomic(target, chunks())
    assert target.read_text() == "the good memo"
    assert [p.name for p in tmp_path.iterdir()] == ["memo.html"]


def test_a_complete_write_replaces_the_file(tmp_path):
    target = tmp_path / "findings.csv"
    write_atomic(target, iter(["a,b\n", "1,2\n"]))
    assert target.read_text() == "a,b\n1,2\n"
    assert oct(target.stat().st_mode & 0o777) != "0o600"  # readable like any other file the user writes


def test_review_with_an_input_error_writes_nothing(tmp_path, run_cli, write_model):
    from tests.conftest import base_model

    memo = tmp_path / "memo.html"
    memo.write_text("previous memo")
    data = base_model()
    data["members"][0]["b"] = "130 kN"
    result = run_cli("review", write_model(data), "--memo", memo)
    assert result.exit_code == 2
    assert memo.read_text() == "previous memo"
