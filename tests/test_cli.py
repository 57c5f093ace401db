"""The command line: exit statuses, the check table, JSON export, explain, rules, schema."""

from __future__ import annotations

import json

from tests.conftest import DEMO, ROOT, base_model


def test_review_exits_0_when_every_check_passes(write_model, run_cli):
    result = run_cli("review", write_model(base_model()))
    assert result.exit_code == 0, result.output
    assert "0 failing" in result.output


def test_review_exits_1_when_a_check_fails(write_model, run_cli):
    data = base_model()
    data["loads"][0]["specified"] = {"D": "5 kN/m", "L": "20 kN/m"}
    result = run_cli("review", write_model(data))
    assert result.exit_code == 1
    assert "FAILS" in result.output


def test_demo_review_lists_every_required_check(run_cli, tmp_path):
    out = tmp_path / "checks.json"
    result = run_cli("review", DEMO, "--json", out)
    data = json.loads(out.read_text())
    ids = {c["id"] for c in data["checks"]}
    assert "GB2/P1:GB2:near" in ids and "J1/GB1:J1" in ids and "J1/GB1:GB1" in ids
    assert result.exit_code == 1  # the demo has a failing near-support check
    near = next(c for c in data["checks"] if c["id"] == "GB2/P1:GB2:near")
    assert not near["passes"]
    names = {f["name"] for f in near["factors"]}
    assert {"phi", "fcp", "KScp", "KT", "KB", "KZcp", "2/3"} <= names
    assert all(f["reason"] for f in near["factors"])
    assert data["rule_pack"]["id"] == "o86-2019-recalled"


def test_json_export_carries_every_combination_with_kd(run_cli, tmp_path):
    out = tmp_path / "c.json"
    run_cli("review", DEMO, "--json", out)
    check = json.loads(out.read_text())["checks"][0]
    assert check["combination_columns"] == ["name", "Qf_kN", "KD", "Fcp_MPa", "Qr_kN", "utilisation"]
    assert check["combinations"] and all(len(c) == 6 for c in check["combinations"])
    governing = next(c for c in check["combinations"] if c[0] == check["governing"])
    assert governing[5] == check["utilisation"] and check["KD_reason"].startswith("KD =")
    fcp = next(f["value"] for f in check["factors"] if f["name"] == "fcp")
    assert governing[3] == round(fcp / 1e6 * governing[2], 4)  # dry, untreated: Fcp = fcp KD


def test_explain_prints_the_full_derivation(run_cli):
    result = run_cli("explain", DEMO, "GB2/P1:GB2:near")
    assert result.exit_code == 0
    for text in ("Ab' =", "KB =", "KZcp =", "KD =", "<- governs", "FAILS"):
        assert text in result.output


def test_explain_unknown_check_suggests_close_ids(run_cli):
    result = run_cli("explain", DEMO, "GB2/P1:P1")
    assert result.exit_code == 2
    assert "did you mean" in result.stderr and "GB2/P1:GB2" in result.stderr
    several = run_cli("explain", DEMO, "GB2/P1")  # a bearing id with two checks (P1 is a post): each is printed
    assert several.exit_code == 0
    headings = [line.split(": ")[0] for line in several.output.splitlines() if line.startswith("Check ")]
    assert headings == ["Check GB2/P1:GB2", "Check GB2/P1:GB2:near"]


def test_rules_lists_values_with_provenance(run_cli):
    result = run_cli("rules")
    assert result.exit_code == 0
    assert "o86-2019-recalled" in result.output and "nbcc-2015-recalled" in result.output
    assert "from memory: verify" in result.output
    assert "kb.table" in result.output


def test_schema_validates_the_demo_model(run_cli):
    import jsonschema
    import yaml

    result = run_cli("schema", "model")
    schema = json.loads(result.output)
    # as an editor sees it: YAML dates are text in JSON
    data = json.loads(json.dumps(yaml.safe_load(DEMO.read_text()), default=str))
    jsonschema.validate(data, schema)


def test_schema_validates_the_layout_demo_and_its_explicit_model(run_cli):
    import jsonschema
    import yaml

    schema = json.loads(run_cli("schema", "model").output)
    for path in (ROOT / "fixtures" / "demo-layout" / "model.yaml", ROOT / "reports" / "layout-demo-explicit.yaml"):
        data = json.loads(json.dumps(yaml.safe_load(path.read_text(encoding="utf-8")), default=str))
        jsonschema.validate(data, schema)


def test_schema_rejects_an_unknown_key(run_cli):
    import jsonschema
    import pytest

    schema = json.loads(run_cli("schema", "model").output)
    data = base_model()
    data["members"][0]["colour"] = "red"
    with pytest.raises(jsonschema.ValidationError):
        jsonschema.validate(data, schema)


def test_claims_schema_validates_the_demo_claims_and_an_extracted_file(run_cli, tmp_path):
    import jsonschema
    import yaml

    from tests.conftest import ROOT

    schema = json.loads(run_cli("schema", "claims").output)
    for demo in ("demo", "demo-nds", "demo-ec5"):  # each in its own standard's symbols
        jsonschema.validate(yaml.safe_load((ROOT / "fixtures" / demo / "claims.yaml").read_text()), schema)
    out = tmp_path / "x.yaml"
    assert run_cli("extract", ROOT / "fixtures/demo/calc.pdf", "-o", out).exit_code == 0
    jsonschema.validate(yaml.safe_load(out.read_text()), schema)


def test_version_prints_the_version(run_cli):
    from audit import __version__

    result = run_cli("--version")
    assert result.exit_code == 0 and __version__ in result.output


def test_a_bad_rule_pack_option_is_blamed_on_the_option_not_the_model(run_cli, write_model):
    result = run_cli("review", write_model(base_model()), "--rule-pack", "no-such-pack")
    assert result.exit_code == 2
    assert result.stderr.startswith("error: --rule-pack:") and "model.yaml" not in result.stderr


def test_explain_accepts_the_calcs_label_for_a_bearing_with_one_check(run_cli, write_model):
    data = base_model()
    data["bearings"][0]["aliases"] = ["B1 at C1"]
    result = run_cli("explain", write_model(data), "B1 at C1")
    assert result.exit_code == 0 and "Check B1/C1:B1" in result.output


def test_explain_prints_each_check_where_a_calc_label_names_several(run_cli, write_model):
    data = base_model()
    data["bearings"][2]["aliases"] = ["J1 on B1"]
    result = run_cli("explain", write_model(data), "J1 on B1")
    assert result.exit_code == 0, result.output
    assert "'J1 on B1' is bearing J1/B1, which has 2 checks: J1/B1:B1, J1/B1:J1" in result.output
    headings = [line for line in result.output.splitlines() if line.startswith("Check ")]
    assert [h.split(":")[0] + ":" + h.split(":")[1] for h in headings] == ["Check J1/B1:B1", "Check J1/B1:J1"]
    assert result.output.count("Result: ") == 2  # each check's derivation in full, to its result line


def test_grades_and_species_are_read_whatever_their_case():
    from tests.conftest import review_dict

    data = base_model()
    data["materials"]["GL"]["grade"] = "24F-EX"
    data["materials"]["SPF"]["species"] = "s-p-f"
    review = review_dict(data)
    assert review.model.materials["GL"].grade == "24f-EX" and review.model.materials["SPF"].species == "S-P-F"


def test_the_appendix_may_not_be_the_letter_itself(run_cli, tmp_path):
    same = tmp_path / "memo.html"
    result = run_cli("review", DEMO, "--memo", same, "--appendix", same)
    assert result.exit_code == 2 and "--appendix" in result.stderr and not same.exists()


def test_review_writes_the_letter_and_the_appendix_it_names(run_cli, tmp_path):
    result = run_cli("review", DEMO, "--memo", tmp_path / "letter.html", "--appendix", tmp_path / "rest.html")
    assert result.exit_code == 1  # the demo has a failing check
    assert "accompanied by its appendix, rest.html" in (tmp_path / "letter.html").read_text(encoding="utf-8")
    assert 'id="checks"' in (tmp_path / "rest.html").read_text(encoding="utf-8")


def _table_rows(output: str) -> dict[str, str]:
    """check id -> its status word, from the terminal's check table."""
    rows = {}
    for line in output.splitlines():
        cells = line.split()
        status = next((cell for cell in cells[1:] if cell in ("passes", "FAILS")), None)
        if status:
            rows[cells[0]] = status
    return rows


def test_past_the_row_limit_the_terminal_lists_only_the_failing_checks(run_cli, monkeypatch):
    every = _table_rows(run_cli("review", DEMO).output)
    failing = sorted(i for i, status in every.items() if status == "FAILS")
    assert len(every) > 5 and 1 < len(failing) <= 5  # the demo: a few failing checks among many passing ones
    monkeypatch.setattr("audit.cli.TERMINAL_ROWS", 5)
    result = run_cli("review", DEMO)
    assert result.exit_code == 1
    assert _table_rows(result.output) == dict.fromkeys(failing, "FAILS")
    assert f"{len(every)} checks: the {len(failing)} failing listed above (every check: --all-rows)" in result.output
    assert _table_rows(run_cli("review", DEMO, "--all-rows").output) == every


def test_past_the_row_limit_at_most_that_many_failing_checks_are_listed(run_cli, monkeypatch):
    monkeypatch.setattr("audit.cli.TERMINAL_ROWS", 1)
    result = run_cli("review", DEMO)
    assert len(_table_rows(result.output)) == 1
    assert "checks: the first 1 of " in result.output and " failing listed above" in result.output


def test_past_the_row_limit_a_building_with_no_failing_check_gets_one_line(write_model, run_cli, monkeypatch):
    monkeypatch.setattr("audit.cli.TERMINAL_ROWS", 1)
    result = run_cli("review", write_model(base_model()))
    assert result.exit_code == 0 and not _table_rows(result.output)
    assert "checks, none failing (every check: --all-rows)" in result.output
