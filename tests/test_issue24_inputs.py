"""Model input that reads as plausible but would give a wrong number (issue 24): refused or warned, located.

Each case runs the command line and checks the exit status, the located line and our own words.
"""

from __future__ import annotations

import re

import yaml

from audit import cli
from tests.conftest import base_model

ERROR = re.compile(r"^error: (?P<file>.+?):(?P<line>\d+):(?P<col>\d+): (?P<key>[^:]+?): (?P<msg>.+)$")


def _review(tmp_path, capsys, model: dict, *args) -> tuple[int, str]:
    path = tmp_path / "model.yaml"
    path.write_text(yaml.safe_dump(model, sort_keys=False), encoding="utf-8")
    code = cli.run(["review", str(path), *map(str, args)])
    return code, capsys.readouterr().err


def test_a_bearing_id_differing_only_in_case_is_refused_so_no_claim_lands_on_it(tmp_path, capsys):
    model = base_model()
    first = model["bearings"][0]
    twin = {**first, "id": "b1/c1"}  # the default id of the first bearing is B1/C1
    twin["upper"] = {**first["upper"]}
    model["bearings"].append(twin)
    code, err = _review(tmp_path, capsys, model)
    errors = [m for m in map(ERROR.match, err.splitlines()) if m]
    assert code == 2 and len(errors) == 1
    assert errors[0]["key"] == f"bearings[{len(model['bearings']) - 1}].id"
    assert "'b1/c1'" in errors[0]["msg"] and "'B1/C1'" in errors[0]["msg"] and "only in case" in errors[0]["msg"]


def test_a_member_id_differing_only_in_case_is_refused_once(tmp_path, capsys):
    model = base_model()
    model["members"].append({**model["members"][3], "id": "j1"})
    code, err = _review(tmp_path, capsys, model)
    errors = [m for m in map(ERROR.match, err.splitlines()) if m]
    assert code == 2 and [e["key"] for e in errors] == [f"members[{len(model['members']) - 1}].id"]
    assert "differs from member 'J1' only in case" in errors[0]["msg"]
