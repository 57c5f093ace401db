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

NONE = dict.fromkeys(("new", "open", "changed", "split", "deferred", "merged", "closed", "withdrawn"), 0)


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
    # not claimed: J1 on B1 and J1 on W1 (two bearings of the joist missing); W1's support is not in
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
    """(kind, first bearing) -> the round comment."""
    return {(c["kind"], c["keys"][0][0]): c for c in data["round_comments"]}


@pytest.fixture
def three_rounds(tmp_path, run_cli):
    one = _run(run_cli, tmp_path, "r1", *_round_one())
    two = _run(run_cli, tmp_path, "r2", *_round_two(), "--previous", tmp_path / "r1.json")
    three = _run(run_cli, tmp_path, "r3", *_round_three(), "--previous", tmp_path / "r2.json")
    return tmp_path, one, two, three


def test_round_one_has_five_comments_all_new(three_rounds):
    _, one, _, _ = three_rounds
    assert one["round"]["number"] == 1 and one["round"]["previous"] is None
    found = sorted((c["kind"], c["keys"][0][0], c["status"]) for c in one["round_comments"])
    assert found == [
        ("mis-loaded", "J1/W1", "new"),
        ("missing", "J1/B1", "new"),
        ("missing", "J1/W1", "new"),
        ("not-checked", "J1/W1", "new"),
        ("resistance-differs", "B1/C1", "new"),
    ]


def test_round_two_closes_the_fixed_keeps_the_open_through_a_rename_and_adds_the_broken(three_rounds):
    _, one, two, _ = three_rounds
    first, second = _by_code(one), _by_code(two)
    assert two["round"]["number"] == 2 and two["round"]["previous"]["number"] == 1
    # fixed: the missing reverse check of J1 on B1 and the mis-load on W1
    assert second[("missing", "J1/B1")]["status"] == "closed"
    assert second[("mis-loaded", "J1/W1")]["status"] == "closed"
    assert "agrees with the calc" in second[("mis-loaded", "J1/W1")]["reason"]
    # still open, same numbers, through the rename of J1 to JST1
    still = second[("missing", "JST1/W1")]
    assert still["status"] == "open" and still["number"] == first[("missing", "J1/W1")]["number"]
    assert [h[:2] for h in still["history"]] == [[1, "new"], [2, "open"]]
    assert second[("resistance-differs", "B1/C1")]["status"] == "open"
    assert second[("resistance-differs", "B1/C1")]["number"] == first[("resistance-differs", "B1/C1")]["number"]
    assert second[("not-checked", "JST1/W1")]["status"] == "open"
    # broken this round: a new comment, numbered after every number of round one
    new = second[("mis-loaded", "B1/C2")]
    assert new["status"] == "new" and new["number"] > one["round"]["last_number"]
    assert two["round"]["counts"] == {**NONE, "new": 1, "open": 3, "closed": 2}


def test_round_three_closes_all_but_the_one_the_model_cannot_settle(three_rounds):
    _, _, two, three = three_rounds
    third = _by_code(three)
    assert three["round"]["counts"] == {**NONE, "open": 1, "closed": 3}
    assert third[("not-checked", "JST1/W1")]["status"] == "open"
    assert [h[1] for h in third[("not-checked", "JST1/W1")]["history"]] == ["new", "open", "open"]
    assert third[("mis-loaded", "B1/C2")]["number"] == _by_code(two)[("mis-loaded", "B1/C2")]["number"]
    assert third[("mis-loaded", "B1/C2")]["status"] == "closed"


def test_numbers_are_never_used_twice_across_rounds(three_rounds):
    _, one, two, three = three_rounds
    for data in (one, two, three):
        numbers = [c["comment"] for c in data["comments"]]
        assert len(numbers) == len(set(numbers))
    asked = {c["number"]: c["kind"] for data in (one, two, three) for c in data["round_comments"]}
    for data in (one, two, three):
        for c in data["round_comments"]:
            assert asked[c["number"]] == c["kind"]  # a number always names the same comment


def test_a_changed_comment_is_still_wrong_but_differently(tmp_path, run_cli):
    model, claims = _round_one()
    _run(run_cli, tmp_path, "r1", model, claims)
    claims[1] = _claim("c2", "J1/W1", "W1", "5.0 kN")  # still mis-loaded, by another amount
    two = _run(run_cli, tmp_path, "r2", model, claims, "--previous", tmp_path / "r1.json")
    changed = _by_code(two)[("mis-loaded", "J1/W1")]
    assert changed["status"] == "changed" and "numbers changed" in changed["reason"]


def test_a_comment_whose_bearing_is_gone_is_withdrawn_with_the_reason(tmp_path, run_cli):
    model, claims = _round_one()
    _run(run_cli, tmp_path, "r1", model, claims)
    # the plate W1 is replaced by a new plate W2 (no alias): the bearings on W1 are gone
    model["members"][4]["id"] = "W2"
    model["bearings"][3]["lower"]["member"] = "W2"
    claims = [c for c in claims if c["location"] != "J1/W1"]
    two = _run(run_cli, tmp_path, "r2", model, claims, "--previous", tmp_path / "r1.json")
    gone = _by_code(two)[("missing", "J1/W1")]
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
    fixed, still = first[("mis-loaded", "J1/W1")]["number"], first[("resistance-differs", "B1/C1")]["number"]
    fill(tmp_path / log, {fixed: "Load corrected to 8.5 kN.", still: "Qr per manufacturer."})
    two = _run(
        run_cli, tmp_path, "r2", *_round_two(), "--previous", tmp_path / "r1.json", "--responses", tmp_path / log
    )
    second = _by_code(two)
    assert second[("mis-loaded", "J1/W1")]["response"] == "Load corrected to 8.5 kN."
    assert second[("mis-loaded", "J1/W1")]["response_on_open_comment"] is False
    assert second[("resistance-differs", "B1/C1")]["response"] == "Qr per manufacturer."
    assert second[("resistance-differs", "B1/C1")]["response_on_open_comment"] is True
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


# ---------------------------------------------------------------- the reviewer's dispositions


def _fill_log(path: Path, answers: dict[int, tuple[str, str, str, str]]) -> None:
    """answers: comment -> (designer's response, disposition, reviewer's reply, deferred to), written into the CSV."""
    rows = list(csv.DictReader(io.StringIO(path.read_text(encoding="utf-8"))))
    for row in rows:
        given = answers.get(int(row["comment"]), ("", "", "", ""))
        row["designer_response"], row["disposition"], row["reviewer_reply"], row["deferred_to"] = given
    buffer = io.StringIO()
    writer = csv.DictWriter(buffer, fieldnames=list(rows[0]))
    writer.writeheader()
    writer.writerows(rows)
    path.write_text(buffer.getvalue(), encoding="utf-8")


@pytest.fixture
def disposed_rounds(tmp_path, run_cli):
    """Round 1, then the designer answers and the reviewer disposes: the resistance on B1/C1 is accepted, the
    missing check of J1 on W1 is not, and the plate's unseen support is deferred to the framing inspection."""
    one = _run(run_cli, tmp_path, "r1", *_round_one())
    first = _by_code(one)
    accepted = first[("resistance-differs", "B1/C1")]["number"]
    refused = first[("missing", "J1/W1")]["number"]
    deferred = first[("not-checked", "J1/W1")]["number"]
    _fill_log(
        tmp_path / "r1.csv",
        {
            accepted: ("Qr from the cap plate's test report, attached.", "accepted", "", ""),
            refused: ("The joist end is fine by inspection.", "not accepted", "Give the check: 8.5 kN on 38 mm.", ""),
            deferred: ("The wall below is on sheet S-3.", "deferred", "", "framing inspection"),
        },
    )
    log = tmp_path / "r1.csv"
    two = _run(run_cli, tmp_path, "r2", *_round_two(), "--previous", tmp_path / "r1.json", "--responses", log)
    three = _run(run_cli, tmp_path, "r3", *_round_two(), "--previous", tmp_path / "r2.json")
    return tmp_path, (accepted, refused, deferred), two, three


def test_an_accepted_response_closes_its_comment_and_it_stays_closed(disposed_rounds):
    tmp_path, (accepted, _, _), two, three = disposed_rounds
    second = {c["number"]: c for c in two["round_comments"]}
    assert second[accepted]["status"] == "closed" and second[accepted]["closed_by_response"] is True
    assert second[accepted]["disposition"]["word"] == "accepted"
    assert "closed by response" in second[accepted]["reason"]
    assert accepted not in {int(r["comment"]) for r in csv.DictReader(io.StringIO((tmp_path / "r2.csv").read_text()))}
    memo = (tmp_path / "r2.html").read_text(encoding="utf-8")
    assert "closed by response" in memo
    # round 3 has the same calc: the comment stays closed, and is not raised again as new
    third = {c["number"]: c for c in three["round_comments"]}
    assert third[accepted]["status"] == "closed" and third[accepted]["closed_by_response"] is True
    assert not [c for c in three["round_comments"] if c["status"] == "new"]


def test_a_response_not_accepted_stays_open_with_the_reviewers_reply(disposed_rounds):
    _, (_, refused, _), two, _ = disposed_rounds
    second = {c["number"]: c for c in two["round_comments"]}
    assert second[refused]["status"] == "open" and second[refused]["response_on_open_comment"] is True
    assert second[refused]["disposition"] == {
        "word": "not accepted",
        "reply": "Give the check: 8.5 kN on 38 mm.",
        "deferred_to": "",
    }
    assert "response not accepted: Give the check: 8.5 kN on 38 mm" in second[refused]["reason"]


def test_a_deferred_comment_is_carried_to_the_stage_named(disposed_rounds):
    _, (_, _, deferred), two, three = disposed_rounds
    second = {c["number"]: c for c in two["round_comments"]}
    third = {c["number"]: c for c in three["round_comments"]}
    for data in (second, third):
        assert data[deferred]["status"] == "deferred" and data[deferred]["deferred_to"] == "framing inspection"
    assert two["round"]["counts"]["deferred"] == 1 and three["round"]["counts"]["deferred"] == 1


def test_dispositions_from_a_yaml_file(tmp_path, run_cli):
    one = _run(run_cli, tmp_path, "r1", *_round_one())
    number = _by_code(one)[("resistance-differs", "B1/C1")]["number"]
    given = tmp_path / "dispositions.yaml"
    given.write_text(f"dispositions:\n  - {{comment: {number}, disposition: accepted}}\n", encoding="utf-8")
    two = _run(run_cli, tmp_path, "r2", *_round_two(), "--previous", tmp_path / "r1.json", "--dispositions", given)
    assert {c["number"]: c["status"] for c in two["round_comments"]}[number] == "closed"


@pytest.mark.parametrize(
    ("entry", "words"),
    [
        ("{comment: NUMBER, disposition: acepted}", "not one of accepted, not accepted, deferred (did you mean"),
        ("{comment: 999, disposition: accepted}", "comment 999 is not a comment of round 1"),
        ("{comment: NUMBER, disposition: not accepted}", "give the reviewer's reply"),
        ("{comment: NUMBER, disposition: deferred}", "name the stage it is deferred to"),
    ],
)
def test_a_bad_disposition_gives_one_located_line_and_exit_2(tmp_path, run_cli, entry, words):
    one = _run(run_cli, tmp_path, "r1", *_round_one())
    number = _by_code(one)[("resistance-differs", "B1/C1")]["number"]
    given = tmp_path / "dispositions.yaml"
    given.write_text("dispositions:\n  - " + entry.replace("NUMBER", str(number)) + "\n", encoding="utf-8")
    model, claims = _round_two()
    (tmp_path / "m.yaml").write_text(yaml.safe_dump(model), encoding="utf-8")
    (tmp_path / "c.yaml").write_text(yaml.safe_dump({"claims": claims}), encoding="utf-8")
    result = run_cli(
        "review", tmp_path / "m.yaml", "--claims", tmp_path / "c.yaml", "--previous", tmp_path / "r1.json",
        "--dispositions", given,
    )  # fmt: skip
    assert result.exit_code == 2, result.output
    errors = [line for line in result.output.splitlines() if line.startswith("error:")]
    assert len(errors) == 1 and words in errors[0] and f"{given}:2:" in errors[0]
    assert "Traceback" not in result.output


def test_a_bad_disposition_in_the_comment_log_names_its_row_and_column(tmp_path, run_cli):
    one = _run(run_cli, tmp_path, "r1", *_round_one())
    number = _by_code(one)[("resistance-differs", "B1/C1")]["number"]
    _fill_log(tmp_path / "r1.csv", {number: ("Done.", "approved", "", "")})
    rows = (tmp_path / "r1.csv").read_text(encoding="utf-8").splitlines()
    line = next(i for i, row in enumerate(rows, start=1) if ",approved," in row)
    column = rows[0].split(",").index("disposition") + 1
    model, _ = _round_two()
    (tmp_path / "m.yaml").write_text(yaml.safe_dump(model), encoding="utf-8")
    result = run_cli(
        "review", tmp_path / "m.yaml", "--previous", tmp_path / "r1.json", "--responses", tmp_path / "r1.csv"
    )
    assert result.exit_code == 2
    assert f"r1.csv:{line}:{column}: disposition: disposition 'approved' of comment {number}" in result.output


# ---------------------------------------------------------------- groups that split and merge


def _joists(own_from: float | None = None, heavier: bool = False) -> tuple[dict, list[dict]]:
    from tests.test_triage import joists_on_a_wall

    model = joists_on_a_wall(own_from=own_from)
    if heavier:  # J4's floor load up by a fifth: Qf/Qr of TP under it 0.30 x 1.2 = 0.36
        j4 = next(load for load in model["loads"] if load["member"] == "J4")
        j4["specified"] = {"D": "1.2 kN/m", "L": "2.4 kN/m"}
    return model, []


def test_a_group_that_splits_and_merges_back_is_reported_as_such(tmp_path, run_cli):
    one = _run(run_cli, tmp_path, "r1", *_joists())
    group = next(c for c in one["comments"] if c["title"].startswith("Lumber joists on lumber wall plates: the check"))
    # round 2: J4 heavier and the project's own-comment threshold at 0.35: TP under J4 stands alone
    two = _run(run_cli, tmp_path, "r2", *_joists(0.35, heavier=True), "--previous", tmp_path / "r1.json")
    second = {c["number"]: c for c in two["round_comments"]}
    split = [c for c in two["round_comments"] if c["status"] == "split" and ["J4/TP", "TP", "local", ""] in c["keys"]]
    assert len(split) == 1 and f"split from #{group['comment']}" in split[0]["reason"]
    assert second[group["comment"]]["status"] == "changed"
    assert f"part of it split into #{split[0]['number']}" in second[group["comment"]]["reason"]
    # round 3: back as in round 1: the split comment is merged into the group again
    three = _run(run_cli, tmp_path, "r3", *_joists(), "--previous", tmp_path / "r2.json")
    third = {c["number"]: c for c in three["round_comments"]}
    assert third[split[0]["number"]]["status"] == "merged"
    assert third[split[0]["number"]]["reason"] == f"merged into #{group['comment']}"
    assert third[group["comment"]]["status"] in ("open", "changed")


def test_dispositions_are_read_from_the_workbook_too(tmp_path, run_cli):
    from openpyxl import load_workbook

    one = _run(run_cli, tmp_path, "r1", *_round_one())
    number = _by_code(one)[("not-checked", "J1/W1")]["number"]
    book = load_workbook(tmp_path / "r1.xlsx")
    sheet = book["Comments"]
    head = [c.value for c in sheet[1]]
    for row in range(2, sheet.max_row + 1):
        if sheet.cell(row, head.index("No.") + 1).value == number:
            sheet.cell(row, head.index("Designer's response") + 1).value = "Wall below on sheet S-3."
            sheet.cell(row, head.index("Disposition") + 1).value = "Deferred"
            sheet.cell(row, head.index("Deferred to") + 1).value = "construction review"
    book.save(tmp_path / "r1.xlsx")
    log = tmp_path / "r1.xlsx"
    two = _run(run_cli, tmp_path, "r2", *_round_two(), "--previous", tmp_path / "r1.json", "--responses", log)
    second = {c["number"]: c for c in two["round_comments"]}
    assert second[number]["status"] == "deferred" and second[number]["deferred_to"] == "construction review"
    assert second[number]["response"] == "Wall below on sheet S-3."


def test_a_comment_closed_by_response_reopens_when_it_changes(disposed_rounds, run_cli):
    tmp_path, (accepted, _, _), _, _ = disposed_rounds
    model, claims = _round_two()
    claims[2] = _claim("c3", "B1/C1", "B1", "4.25 kN", "900 kN")  # the calc's resistance changed again
    four = _run(run_cli, tmp_path, "r4", model, claims, "--previous", tmp_path / "r3.json")
    fourth = {c["number"]: c for c in four["round_comments"]}
    assert fourth[accepted]["status"] == "changed" and fourth[accepted]["closed_by_response"] is False
    assert fourth[accepted]["reason"].startswith("reopened: changed since its response was accepted")


def test_the_history_of_a_comment_reads_as_a_sentence():
    from audit.report.memo import history_sentence
    from audit.review.rounds import Step

    grouped = (
        Step(1, "new", "missing", "missing (claimed / recomputed: Qf - / 3.20; Qr - / 12.00; Qf - / 2.90)"),
        Step(2, "open", "missing", "missing (claimed / recomputed: Qf - / 3.20; Qr - / 12.00; Qf - / 2.90)"),
    )
    assert history_sentence(grouped, grouped=True) == "Raised in round 1 as missing; still open in round 2."
    single = (
        Step(1, "new", "mis-loaded", "mis-loaded (claimed / recomputed: Qf 2.00 / 8.50)"),
        Step(2, "changed", "mis-loaded", "mis-loaded (claimed / recomputed: Qf 3.00 / 8.50)"),
        Step(3, "open", "mis-loaded", "mis-loaded (claimed / recomputed: Qf 3.00 / 8.50)"),
    )
    assert history_sentence(single, grouped=False) == (
        "Raised in round 1 as mis-loaded (claimed / recomputed: Qf 2.00 / 8.50); changed in round 2, now mis-loaded "
        "(claimed / recomputed: Qf 3.00 / 8.50); still open in round 3."
    )


def test_a_grouped_comment_in_round_two_shows_its_history_as_a_sentence(tmp_path, run_cli):
    from tests.conftest import DEMO, ROOT

    claims = ROOT / "fixtures" / "demo" / "claims.yaml"
    run_cli("review", DEMO, "--claims", claims, "--json", tmp_path / "r1.json")
    run_cli("review", DEMO, "--claims", claims, "--previous", tmp_path / "r1.json", "--memo", tmp_path / "r2.html")
    html = (tmp_path / "r2.html").read_text(encoding="utf-8")
    first = json.loads((tmp_path / "r1.json").read_text())["round_comments"]
    grouped = [c for c in first if len(c["keys"]) > 1 and c["weight"] in ("safety", "revise")]
    assert grouped  # the demo's bearings of J1, J3 and J4 on GB1, and others
    heads = {d.split("</span>")[0].split(">")[-1].split(".")[0]: d for d in html.split('<div class="finding ')[1:]}
    for c in grouped:
        assert f"History: Raised in round 1 as {c['kind']}; still open in round 2." in heads[str(c["number"])]
    assert "History: Raised in round 1 as missing; still open in round 2." in html
