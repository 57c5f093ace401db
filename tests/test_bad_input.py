"""Bad input: one line per error naming file, line, column and key path; exit status 2."""

from __future__ import annotations

import re

import pytest

from tests.conftest import base_model

LINE = re.compile(r"^error: (?P<file>[^:]+):(?P<line>\d+):(?P<col>\d+): (?P<key>\S+): (?P<msg>.+)$")


def _set(path, value):
    def mutate(d):
        target = d
        for k in path[:-1]:
            target = target[k]
        target[path[-1]] = value

    return mutate


def _del(path):
    def mutate(d):
        target = d
        for k in path[:-1]:
            target = target[k]
        del target[path[-1]]

    return mutate


def _append_bearing(upper: str, upper_at: str, lower: str, lower_at: str):
    bearing = {"upper": {"member": upper, "at": upper_at}, "lower": {"member": lower, "at": lower_at}}
    return lambda d: d["bearings"].append(bearing)


CASES = {
    "unknown member reference": (
        _set(["bearings", 2, "lower", "member"], "B9"),
        "unknown member 'B9'",
        "bearings[2].lower.member",
        "B9",
    ),
    "unknown material reference": (
        _set(["members", 0, "material"], "GLX"),
        "unknown material 'GLX'",
        "members[0].material",
        "GLX",
    ),
    "duplicate member id": (
        lambda d: d["members"].append(dict(d["members"][3])),
        "duplicate member id 'J1'",
        "members[5].id",
        "J1",
    ),
    "duplicate bearing id": (
        _append_bearing("J1", "1 m", "W1", "1 m"),
        "duplicate bearing id 'J1/W1'",
        "bearings[4]",
        "upper",
    ),
    "missing field": (_del(["members", 0, "d"]), "missing field 'd'", "members[0].d", "B1"),
    "unknown key": (_set(["members", 0, "depth"], "380 mm"), "unknown key 'depth'", "members[0].depth", "depth"),
    "wrong dimension": (_set(["members", 0, "b"], "130 kN"), "is a force, not a length", "members[0].b", "130 kN"),
    "bare number": (_set(["members", 0, "b"], 130), "bare number 130", "members[0].b", "130"),
    "non-positive size": (_set(["members", 3, "d"], "0 mm"), "d must be positive", "members[3].d", "0 mm"),
    "negative size": (_set(["members", 3, "b"], "-38 mm"), "b must be positive", "members[3].b", "-38 mm"),
    "bearing outside the member": (
        _set(["bearings", 2, "lower", "at"], "7 m"),
        "outside member 'B1'",
        "bearings[2].lower.at",
        "7 m",
    ),
    "bearing length longer than the member": (
        _set(["bearings", 2, "lower", "length"], "8 m"),
        "longer than member 'B1'",
        "bearings[2].lower.length",
        "8 m",
    ),
    "unknown species": (
        _set(["materials", "SPF", "species"], "Oakish"),
        "species 'Oakish' is not in rule pack",
        "materials.SPF.species",
        "Oakish",
    ),
    "unknown grade": (
        _set(["materials", "SPF", "grade"], "No.7"),
        "grade 'No.7' is not listed",
        "materials.SPF.grade",
        "No.7",
    ),
    "member bearing on itself": (
        _append_bearing("J1", "1 m", "J1", "2 m"),
        "cannot bear on itself",
        "bearings[4]",
        "upper",
    ),
    "cycle in the support graph": (
        _append_bearing("B1", "2 m", "J1", "2 m"),
        "cycle",
        "bearings[",
        "upper",
    ),
    "fewer than two supports": (lambda d: d["bearings"].pop(1), "has 1 support(s)", "members[0]", "B1"),
}


@pytest.mark.parametrize("name", list(CASES))
def test_bad_input_gives_one_located_line_and_exit_2(name, write_model, run_cli):
    mutate, message, key, token = CASES[name]
    data = base_model()
    mutate(data)
    path = write_model(data)
    result = run_cli("review", path)
    assert result.exit_code == 2, result.output
    assert "Traceback" not in result.output
    lines = [ln for ln in result.stderr.splitlines() if ln.startswith("error: ")]
    match = next((LINE.match(ln) for ln in lines if message in ln), None)
    assert match, f"no line with {message!r} in:\n{result.stderr}"
    assert match["file"] == str(path)
    assert match["key"].startswith(key)
    source_line = path.read_text().splitlines()[int(match["line"]) - 1]
    assert token in source_line, (source_line, match["line"])


def test_all_errors_of_a_file_are_reported_in_one_run(write_model, run_cli):
    data = base_model()
    data["members"][0]["b"] = "130 kN"
    data["members"][3]["material"] = "NOPE"
    data["members"][4]["colour"] = "red"
    result = run_cli("review", write_model(data))
    assert result.exit_code == 2
    errors = [ln for ln in result.stderr.splitlines() if ln.startswith("error: ")]
    assert len(errors) >= 3


@pytest.mark.parametrize(
    ("text", "message"),
    [
        ("", "file is empty"),
        ("project: [unclosed", "not valid YAML"),
        ("- just\n- a list\n", "expected a mapping for the model"),
        ("project: {title: a}\nproject: {title: b}\n", "duplicate key 'project'"),
    ],
)
def test_unreadable_files_give_a_clear_line(text, message, write_model, run_cli):
    result = run_cli("review", write_model(text))
    assert result.exit_code == 2
    assert message in result.stderr
    assert "Traceback" not in result.output


def test_missing_file_is_an_input_error(run_cli, tmp_path):
    result = run_cli("review", tmp_path / "nope.yaml")
    assert result.exit_code == 2
    assert "file not found" in result.stderr and "nope.yaml" in result.stderr


def test_non_utf8_file_names_the_line(write_model, run_cli, tmp_path):
    path = tmp_path / "latin.yaml"
    path.write_bytes(b"project:\n  title: caf\xe9\n")
    result = run_cli("review", path)
    assert result.exit_code == 2
    assert ":2:1:" in result.stderr and "not UTF-8" in result.stderr


def test_near_support_point_load_without_bearing_length_is_an_input_error(write_model, run_cli):
    data = base_model()
    data["loads"].append({"id": "p", "member": "B1", "type": "point", "at": "200 mm", "specified": {"D": "5 kN"}})
    result = run_cli("review", write_model(data))
    assert result.exit_code == 2
    assert "give its bearing 'length'" in result.stderr
