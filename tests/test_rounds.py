"""Review rounds: a revised calc reviewed against the last round, comment by comment.

An invented three-round review of the base model (joist J1 on beam B1 and wall plate W1, B1 on
posts C1 and C2). Hand values: J1 carries 1 kN/m D and 2 kN/m L over 4 m, symmetric on its two
supports, so each takes D 2.0 kN and L 4.0 kN, Qf = 1.25 x 2.0 + 1.5 x 4.0 = 8.5 kN; B1 takes
J1 at its middle, so each post takes half: Qf = 4.25 kN (statics of a simple span, common
practice). A claimed Qr of 500 kN is far beyond any recomputed Qr of these small contacts.
"""

from __future__ import annotations

import csv
import io
import json
from pathlib import Path

import pytest
import yaml

from tests.conftest import base_model


def _claim(cid: str, location: str, member: str, qf: str, qr: str | None = None) -> dict:
    item = {"id": cid, "where": {"page": 3, "item": cid}, "location": location, "member": member, "Qf": qf}
    if qr:
        item["Qr"] = qr
    return item


def _round_one() -> tuple[dict, list[dict]]:
    model = base_model()
    claims = [
        _claim("c1", "J1/B1", "B1", "8.5 kN"),  # the beam under the joist: agrees
        _claim("c2", "J1/W1", "W1", "2.0 kN"),  # the plate under the joist: mis-loaded (8.5 kN)
        _claim("c3", "B1/C1", "B1", "4.25 kN", "500 kN"),  # the beam on C1: the resistance does not hold
        _claim("c4", "B1/C2", "B1", "4.25 kN"),  # agrees
    ]
    # not claimed: J1 on B1 and J1 on W1 (two reverse-direction checks missing); W1's support is not in
    # the model (a note): five comments in all
    return model, claims


def _round_two() -> tuple[dict, list[dict]]:
    model = base_model()
    # J1 is renamed JST1; its aliases keep the earlier round's comments on it
    model["members"][3].update({"id": "JST1", "aliases": ["J1"]})
    for b in model["bearings"]:
        if b["upper"]["member"] == "J1":
            b["upper"]["member"] = "JST1"
    model["loads"][0]["member"] = "JST1"
    claims = [
        _claim("c1", "JST1/B1", "B1", "8.5 kN"),
        _claim("c2", "JST1/W1", "W1", "8.5 kN"),  # fixed
        _claim("c3", "B1/C1", "B1", "4.25 kN", "500 kN"),  # still wrong
        _claim("c4", "B1/C2", "B1", "1.0 kN"),  # broken this round
        _claim("c5", "JST1/B1", "JST1", "8.5 kN"),  # fixed: the missing reverse check given
    ]
    return model, claims


def _round_three() -> tuple[dict, list[dict]]:
    model, claims = _round_two()
    claims[2] = _claim("c3", "B1/C1", "B1", "4.25 kN")  # the resistance claim withdrawn by the designer
    claims[3] = _claim("c4", "B1/C2", "B1", "4.25 kN")
    claims.append(_claim("c6", "JST1/W1", "JST1", "8.5 kN"))
    return model, claims


def _run(run_cli, folder: Path, name: str, model: dict, claims: list[dict], *extra) -> dict:
    model_path, claims_path = folder / f"{name}-model.yaml", folder / f"{name}-claims.yaml"
    model_path.write_text(yaml.safe_dump(model, sort_keys=False), encoding="utf-8")
    claims_path.write_text(yaml.safe_dump({"claims": claims}, sort_keys=False), encoding="utf-8")
    out = folder / f"{name}.json"
    args = ["review", model_path, "--claims", claims_path, "--json", out, "--csv", folder / f"{name}.csv"]
    args += ["--memo", folder / f"{name}.html", "--xlsx", folder / f"{name}.xlsx", *extra]
    result = run_cli(*args)
    assert result.exit_code in (0, 1), result.output
    return json.loads(out.read_text(encoding="utf-8"))


def _by_code(data: dict) -> dict[tuple[str, str], dict]:
    """(code, first bearing) -> the round comment."""
    return {(c["code"], c["keys"][0][0]): c for c in data["round_comments"]}


@pytest.fixture
def three_rounds(tmp_path, run_cli):
    one = _run(run_cli, tmp_path, "r1", *_round_one())
    two = _run(run_cli, tmp_path, "r2", *_round_two(), "--previous", tmp_path / "r1.json")
    three = _run(run_cli, tmp_path, "r3", *_round_three(), "--previous", tmp_path / "r2.json")
    return tmp_path, one, two, three


def test_round_one_has_five_comments_all_new(three_rounds):
    _, one, _, _ = three_rounds
    assert one["round"]["number"] == 1 and one["round"]["previous"] is None
    found = sorted((c["code"], c["keys"][0][0], c["status"]) for c in one["round_comments"])
    assert found == [
        ("ABSENT", "J1/B1", "new"),
        ("ABSENT", "J1/W1", "new"),
        ("CAPACITY", "B1/C1", "new"),
        ("LOAD", "J1/W1", "new"),
        ("UNSEEN", "J1/W1", "new"),
    ]


def test_round_two_closes_the_fixed_keeps_the_open_through_a_rename_and_adds_the_broken(three_rounds):
    _, one, two, _ = three_rounds
    first, second = _by_code(one), _by_code(two)
    assert two["round"]["number"] == 2 and two["round"]["previous"]["number"] == 1
    # fixed: the missing reverse check of J1 on B1 and the mis-load on W1
    assert second[("ABSENT", "J1/B1")]["status"] == "closed"
    assert second[("LOAD", "J1/W1")]["status"] == "closed"
    assert "agrees with the calc" in second[("LOAD", "J1/W1")]["reason"]
    # still open, same numbers, through the rename of J1 to JST1
    still = second[("ABSENT", "JST1/W1")]
    assert still["status"] == "open" and still["number"] == first[("ABSENT", "J1/W1")]["number"]
    assert [h[:2] for h in still["history"]] == [[1, "new"], [2, "open"]]
    assert second[("CAPACITY", "B1/C1")]["status"] == "open"
    assert second[("CAPACITY", "B1/C1")]["number"] == first[("CAPACITY", "B1/C1")]["number"]
    assert second[("UNSEEN", "JST1/W1")]["status"] == "open"
    # broken this round: a new comment, numbered after every number of round one
    new = second[("LOAD", "B1/C2")]
    assert new["status"] == "new" and new["number"] > one["round"]["last_number"]
    assert two["round"]["counts"] == {"new": 1, "open": 3, "changed": 0, "closed": 2, "withdrawn": 0}


def test_round_three_closes_all_but_the_one_the_model_cannot_settle(three_rounds):
    _, _, two, three = three_rounds
    third = _by_code(three)
    assert three["round"]["counts"] == {"new": 0, "open": 1, "changed": 0, "closed": 3, "withdrawn": 0}
    assert third[("UNSEEN", "JST1/W1")]["status"] == "open"
    assert [h[1] for h in third[("UNSEEN", "JST1/W1")]["history"]] == ["new", "open", "open"]
    assert third[("LOAD", "B1/C2")]["number"] == _by_code(two)[("LOAD", "B1/C2")]["number"]
    assert third[("LOAD", "B1/C2")]["status"] == "closed"


def test_numbers_are_never_used_twice_across_rounds(three_rounds):
    _, one, two, three = three_rounds
    for data in (one, two, three):
        numbers = [c["comment"] for c in data["comments"]]
        assert len(numbers) == len(set(numbers))
    asked = {c["number"]: c["code"] for data in (one, two, three) for c in data["round_comments"]}
    for data in (one, two, three):
        for c in data["round_comments"]:
            assert asked[c["number"]] == c["code"]  # a number always names the same comment


def test_a_changed_comment_is_still_wrong_but_differently(tmp_path, run_cli):
    model, claims = _round_one()
    _run(run_cli, tmp_path, "r1", model, claims)
    claims[1] = _claim("c2", "J1/W1", "W1", "5.0 kN")  # still mis-loaded, by another amount
    two = _run(run_cli, tmp_path, "r2", model, claims, "--previous", tmp_path / "r1.json")
    changed = _by_code(two)[("LOAD", "J1/W1")]
    assert changed["status"] == "changed" and "numbers changed" in changed["reason"]


def test_a_comment_whose_bearing_is_gone_is_withdrawn_with_the_reason(tmp_path, run_cli):
    model, claims = _round_one()
    _run(run_cli, tmp_path, "r1", model, claims)
    # the plate W1 is replaced by a new plate W2 (no alias): the bearings on W1 are gone
    model["members"][4]["id"] = "W2"
    model["bearings"][3]["lower"]["member"] = "W2"
    claims = [c for c in claims if c["location"] != "J1/W1"]
    two = _run(run_cli, tmp_path, "r2", model, claims, "--previous", tmp_path / "r1.json")
    gone = _by_code(two)[("ABSENT", "J1/W1")]
    assert gone["status"] == "withdrawn" and gone["reason"] == "bearing J1/W1 is no longer in the model"


def _fill_csv(path: Path, answers: dict[int, str]) -> None:
    rows = list(csv.DictReader(io.StringIO(path.read_text(encoding="utf-8"))))
    for row in rows:
        row["designer_response"] = answers.get(int(row["comment"]), "")
    buffer = io.StringIO()
    writer = csv.DictWriter(buffer, fieldnames=list(rows[0]))
    writer.writeheader()
    writer.writerows(rows)
    path.write_text(buffer.getvalue(), encoding="utf-8")


def _fill_workbook(path: Path, answers: dict[int, str]) -> None:
    from openpyxl import load_workbook

    book = load_workbook(path)
    sheet = book["Comments"]
    head = [c.value for c in sheet[1]]
    number, response = head.index("No.") + 1, head.index("Designer's response") + 1
    for row in range(2, sheet.max_row + 1):
        sheet.cell(row, response).value = answers.get(int(sheet.cell(row, number).value))
    book.save(path)


@pytest.mark.parametrize(("log", "fill"), [("r1.csv", _fill_csv), ("r1.xlsx", _fill_workbook)])
def test_designer_responses_are_read_back_and_a_response_on_an_open_comment_is_flagged(tmp_path, run_cli, log, fill):
    one = _run(run_cli, tmp_path, "r1", *_round_one())
    first = _by_code(one)
    fixed, still = first[("LOAD", "J1/W1")]["number"], first[("CAPACITY", "B1/C1")]["number"]
    fill(tmp_path / log, {fixed: "Load corrected to 8.5 kN.", still: "Qr per manufacturer."})
    two = _run(
        run_cli, tmp_path, "r2", *_round_two(), "--previous", tmp_path / "r1.json", "--responses", tmp_path / log
    )
    second = _by_code(two)
    assert second[("LOAD", "J1/W1")]["response"] == "Load corrected to 8.5 kN."
    assert second[("LOAD", "J1/W1")]["response_on_open_comment"] is False
    assert second[("CAPACITY", "B1/C1")]["response"] == "Qr per manufacturer."
    assert second[("CAPACITY", "B1/C1")]["response_on_open_comment"] is True
    memo = (tmp_path / "r2.html").read_text(encoding="utf-8")
    assert "Qr per manufacturer." in memo and "(the comment is still open)" in memo
    assert "Review round 2" in memo
    rows = list(csv.DictReader(io.StringIO((tmp_path / "r2.csv").read_text(encoding="utf-8"))))
    assert {r["previous_response"] for r in rows if int(r["comment"]) == still} == {"Qr per manufacturer."}


def test_a_previous_round_of_another_project_is_refused(tmp_path, run_cli):
    _run(run_cli, tmp_path, "r1", *_round_one())
    data = json.loads((tmp_path / "r1.json").read_text(encoding="utf-8"))
    data["round"]["project"] = "Another building (fictional)"
    other = tmp_path / "other.json"
    other.write_text(json.dumps(data), encoding="utf-8")
    model, _claims = _round_one()
    (tmp_path / "m.yaml").write_text(yaml.safe_dump(model), encoding="utf-8")
    result = run_cli("review", tmp_path / "m.yaml", "--previous", other)
    assert result.exit_code == 2
    assert "a round of project 'Another building (fictional)', not of this project" in result.output
    assert str(other) in result.output


def test_a_previous_file_that_is_not_a_review_is_refused(tmp_path, run_cli):
    bad = tmp_path / "bad.json"
    bad.write_text("{not json", encoding="utf-8")
    model, _ = _round_one()
    (tmp_path / "m.yaml").write_text(yaml.safe_dump(model), encoding="utf-8")
    result = run_cli("review", tmp_path / "m.yaml", "--previous", bad)
    assert result.exit_code == 2 and "not the JSON of a review" in result.output


def test_the_json_states_the_hash_of_each_input(tmp_path, run_cli):
    import hashlib

    one = _run(run_cli, tmp_path, "r1", *_round_one())
    expected = "sha256:" + hashlib.sha256((tmp_path / "r1-model.yaml").read_bytes()).hexdigest()
    assert one["round"]["inputs"]["model"] == expected
    assert one["round"]["inputs"]["claims"].startswith("sha256:")


def test_responses_without_the_previous_round_are_refused(tmp_path, run_cli):
    model, _ = _round_one()
    (tmp_path / "m.yaml").write_text(yaml.safe_dump(model), encoding="utf-8")
    (tmp_path / "log.csv").write_text("comment,designer_response\n1,done\n", encoding="utf-8")
    result = run_cli("review", tmp_path / "m.yaml", "--responses", tmp_path / "log.csv")
    assert result.exit_code == 2 and "--previous" in result.output


def test_a_comment_log_without_the_response_column_is_refused_with_its_name(tmp_path, run_cli):
    _run(run_cli, tmp_path, "r1", *_round_one())
    (tmp_path / "log.csv").write_text("comment,reply\n1,done\n", encoding="utf-8")
    _model, _claims = _round_one()
    result = run_cli(
        "review", tmp_path / "r1-model.yaml", "--previous", tmp_path / "r1.json", "--responses", tmp_path / "log.csv"
    )
    assert result.exit_code == 2 and "no column 'designer_response'" in result.output


def test_the_history_of_a_comment_reads_as_a_sentence():
    from audit.report.memo import history_sentence
    from audit.review.rounds import Step

    grouped = (
        Step(1, "new", "ABSENT", "ABSENT (claimed / recomputed: Qf - / 3.20; Qr - / 12.00; Qf - / 2.90)"),
        Step(2, "open", "ABSENT", "ABSENT (claimed / recomputed: Qf - / 3.20; Qr - / 12.00; Qf - / 2.90)"),
    )
    assert history_sentence(grouped, grouped=True) == "Raised in round 1 as ABSENT; still open in round 2."
    single = (
        Step(1, "new", "LOAD", "LOAD (claimed / recomputed: Qf 2.00 / 8.50)"),
        Step(2, "changed", "LOAD", "LOAD (claimed / recomputed: Qf 3.00 / 8.50)"),
        Step(3, "open", "LOAD", "LOAD (claimed / recomputed: Qf 3.00 / 8.50)"),
    )
    assert history_sentence(single, grouped=False) == (
        "Raised in round 1 as LOAD (claimed / recomputed: Qf 2.00 / 8.50); changed in round 2, now LOAD "
        "(claimed / recomputed: Qf 3.00 / 8.50); still open in round 3."
    )


def test_a_grouped_comment_in_round_two_shows_its_history_as_a_sentence(tmp_path, run_cli):
    from tests.conftest import DEMO, ROOT

    claims = ROOT / "fixtures" / "demo" / "claims.yaml"
    run_cli("review", DEMO, "--claims", claims, "--json", tmp_path / "r1.json")
    run_cli("review", DEMO, "--claims", claims, "--previous", tmp_path / "r1.json", "--memo", tmp_path / "r2.html")
    html = (tmp_path / "r2.html").read_text(encoding="utf-8")
    first = json.loads((tmp_path / "r1.json").read_text())["round_comments"]
    grouped = [c for c in first if len(c["keys"]) > 1 and c["weight"] in ("critical", "major")]
    assert grouped  # the demo's reverse-direction checks of J1, J3 and J4 on GB1, and others
    heads = {d.split("</span>")[0].split(">")[-1].split(".")[0]: d for d in html.split('<div class="finding ')[1:]}
    for c in grouped:
        assert f"History: Raised in round 1 as {c['code']}; still open in round 2." in heads[str(c["number"])]
    assert "History: Raised in round 1 as ABSENT; still open in round 2." in html
