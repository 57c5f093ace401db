"""The files of an earlier round come back from outside: each forged value is one located line, exit 2.

The corpus (tests/hostile/previous-*, responses-*) holds one forged file per fault; these tests pin
what the corpus cannot: the line found in a review's own multi-line JSON, the size limit, the
responses that no comment can carry (a warning, not silence), whole numbers written as 2.0, and
that a bad file writes nothing.
"""

from __future__ import annotations

import json
import re
from pathlib import Path

import pytest
import yaml

from audit import cli
from audit.core.located_yaml import MAX_FILE_BYTES
from tests.conftest import base_model

ERROR = re.compile(r"^error: (?P<file>.+?):(?P<line>\d+):(?P<col>\d+): (?P<key>[^:]+?): (?P<msg>.+)$")


@pytest.fixture
def last_round(tmp_path, run_cli) -> tuple[Path, Path, dict]:
    """A real first round of the base model (one comment per line in its JSON), and its comment log."""
    model = tmp_path / "model.yaml"
    model.write_text(yaml.safe_dump(base_model(), sort_keys=False), encoding="utf-8")
    claims = tmp_path / "claims.yaml"
    mis_loaded = {"id": "c2", "where": {"page": 3, "item": "c2"}, "location": "J1/W1", "member": "W1", "Qf": "2.0 kN"}
    claims.write_text(yaml.safe_dump({"claims": [mis_loaded]}, sort_keys=False), encoding="utf-8")
    result = run_cli("review", model, "--claims", claims, "--json", tmp_path / "r1.json", "--csv", tmp_path / "r1.csv")
    assert result.exit_code in (0, 1), result.output
    data = json.loads((tmp_path / "r1.json").read_text(encoding="utf-8"))
    assert len(data["round_comments"]) >= 2, "the base model must give the round comments these tests forge"
    return model, tmp_path / "r1.json", data


def _review(capsys, *args) -> tuple[int, str]:
    code = cli.run(["review", *map(str, args)])
    return code, capsys.readouterr().err


def test_a_forged_comment_number_is_refused_at_its_own_line_of_the_json(last_round, capsys):
    model, path, data = last_round
    lines = path.read_text(encoding="utf-8").splitlines()
    second = data["round_comments"][1]["number"]
    # the writer puts one comment per line: find the second comment's line by its own text
    at = next(i for i, ln in enumerate(lines, 1) if ln.lstrip().startswith(f'{{"number": {second}, '))
    lines[at - 1] = lines[at - 1].replace(f'{{"number": {second}, ', '{"number": 2.7, ', 1)
    path.write_text("\n".join(lines) + "\n", encoding="utf-8")
    code, err = _review(capsys, model, "--previous", path)
    assert code == 2 and "internal error" not in err
    match = ERROR.match(err.splitlines()[0])
    assert match and match["file"] == str(path) and int(match["line"]) == at
    assert match["key"] == "round_comments[1].number" and "whole number" in match["msg"]


def test_every_fault_of_a_forged_round_is_listed_in_one_run(last_round, capsys):
    model, path, data = last_round
    data["round"]["number"] = -7
    data["round_comments"][0]["keys"] = [["J1/B1"]]
    path.write_text(json.dumps(data), encoding="utf-8")
    code, err = _review(capsys, model, "--previous", path)
    assert code == 2
    keys = [m["key"] for m in map(ERROR.match, err.splitlines()) if m]
    assert keys == ["round.number", "round_comments[0].keys[0]"]


def test_a_previous_file_over_the_size_limit_is_refused_unread(last_round, capsys):
    model, path, _ = last_round
    with path.open("ab") as handle:
        handle.truncate(MAX_FILE_BYTES + 1)  # sparse: nothing written
    code, err = _review(capsys, model, "--previous", path)
    assert code == 2 and str(path) in err and "byte limit" in err


def test_a_responses_file_over_the_size_limit_is_refused_unread(last_round, tmp_path, capsys):
    model, path, _ = last_round
    log = tmp_path / "log.csv"
    log.write_text("comment,designer_response\n")
    with log.open("ab") as handle:
        handle.truncate(MAX_FILE_BYTES + 1)
    code, err = _review(capsys, model, "--previous", path, "--responses", log)
    assert code == 2 and str(log) in err and "byte limit" in err


def test_a_whole_comment_number_written_as_a_decimal_is_read(last_round, tmp_path, capsys):
    model, path, data = last_round
    number = data["round_comments"][0]["number"]
    log = tmp_path / "log.csv"
    log.write_text(f"comment,designer_response\n{number}.0,Added the check\n", encoding="utf-8")
    out = tmp_path / "r2.json"
    code, err = _review(capsys, model, "--previous", path, "--responses", log, "--json", out)
    assert code in (0, 1), err
    again = {c["number"]: c for c in json.loads(out.read_text(encoding="utf-8"))["round_comments"]}
    assert again[number]["response"] == "Added the check"


def test_a_fractional_comment_number_is_refused_not_rounded(last_round, tmp_path, capsys):
    model, path, data = last_round
    number = data["round_comments"][0]["number"]
    log = tmp_path / "log.csv"
    log.write_text(f"comment,designer_response\n{number}.7,Added the check\n", encoding="utf-8")
    out = tmp_path / "r2.json"
    code, err = _review(capsys, model, "--previous", path, "--responses", log, "--json", out)
    match = ERROR.match(err.splitlines()[0])
    assert code == 2 and match and (match["line"], match["key"]) == ("2", "comment") and not out.exists()


def test_a_response_to_a_number_the_last_round_lacks_is_named_in_a_warning(last_round, tmp_path, capsys):
    model, path, data = last_round
    unknown = max(c["number"] for c in data["round_comments"]) + 40
    log = tmp_path / "log.csv"
    log.write_text(f"comment,designer_response\n{unknown},Done\n", encoding="utf-8")
    code, err = _review(capsys, model, "--previous", path, "--responses", log)
    assert code in (0, 1)
    warning = next(ln for ln in err.splitlines() if ln.startswith("warning: ") and str(log) in ln)
    assert f"({unknown})" in warning and "not shown" in warning


def test_a_response_with_a_control_character_stops_before_the_workbook_is_written(last_round, tmp_path, capsys):
    model, path, data = last_round
    number = data["round_comments"][0]["number"]
    log = tmp_path / "log.csv"
    log.write_text(f'comment,designer_response\n{number},"Done\x0b"\n', encoding="utf-8")
    out = tmp_path / "r2.xlsx"
    code, err = _review(capsys, model, "--previous", path, "--responses", log, "--xlsx", out)
    assert code == 2 and "U+000B" in err and "internal error" not in err and not out.exists()


def test_a_workbook_formula_whose_value_was_never_saved_is_refused(last_round, tmp_path, capsys):
    from openpyxl import Workbook

    model, path, data = last_round
    book = Workbook()
    sheet = book.active
    sheet.title = "Comments"
    sheet.append(["No.", "Designer's response"])
    sheet.append([data["round_comments"][0]["number"], '=CONCATENATE("Added ", "the check")'])
    book.save(tmp_path / "log.xlsx")  # openpyxl saves a formula without its value
    code, err = _review(capsys, model, "--previous", path, "--responses", tmp_path / "log.xlsx")
    assert code == 2 and "formula with no saved value" in err
    assert "log.xlsx [Comments]:2:2: Designer's response" in err
