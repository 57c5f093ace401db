"""Reason texts take their numbers from the rule pack, never from the code's text: a firm's pack that states other
values is quoted as it states them. The edited values below are invented for the test (no standard states them)."""

from __future__ import annotations

from audit.standards.bundled import builtin_rules_dir
from tests.conftest import review_dict
from tests.verification.standards import contact_model


def _pack_copy(tmp_path, name: str, new_id: str, edits: dict[str, str]):
    text = (builtin_rules_dir() / name).read_text(encoding="utf-8")
    old_id = name.removesuffix(".yaml")
    text = text.replace(f"id: {old_id}", f"id: {new_id}")
    for old, new in edits.items():
        assert old in text
        text = text.replace(old, new)
    folder = tmp_path / "rules"
    folder.mkdir(exist_ok=True)
    (folder / f"{new_id}.yaml").write_text(text, encoding="utf-8")
    return folder


def _reasons(data: dict, folder) -> str:
    import yaml

    from audit.core.located_yaml import read_yaml_text
    from audit.inputs.read_model import build_model
    from audit.review.review import review_built

    root = read_yaml_text(yaml.safe_dump(data, sort_keys=False), "model.yaml")
    model, pack, cpack = build_model(root, "model.yaml", (folder,))
    review = review_built(model, pack, cpack)
    return (
        " ".join(f.reason for r in review.results for f in r.factors)
        + " "
        + " ".join(r.area_reason for r in review.results)
    )


def test_the_nds_cb_reasons_quote_the_packs_end_distance_and_length(tmp_path):
    folder = _pack_copy(
        tmp_path,
        "nds-2018-recalled.yaml",
        "nds-firm",
        {"min_end_distance: {value: 3 in": "min_end_distance: {value: 4 in"},
    )
    data = contact_model("nds-asd")
    data["project"]["rule_pack"] = "nds-firm"
    text = _reasons(data, folder)
    assert "from the member end, less than 4 in" in text and "less than 3 in" not in text
    assert "less than 3 in" in " ".join(
        f.reason for r in review_dict(contact_model("nds-asd")).results for f in r.factors
    )


def test_the_ec5_reasons_quote_the_packs_spacing_condition(tmp_path):
    folder = _pack_copy(tmp_path, "ec5-2004-recalled.yaml", "ec5-firm", {"  spacing: 2.0": "  spacing: 3.0"})
    data = contact_model("ec5")
    data["project"]["rule_pack"] = "ec5-firm"
    text = _reasons(data, folder)
    assert ">= 3h" in text and "2h" not in text


def test_an_nds_pack_states_the_local_clause_alone_and_a_near_support_clause_is_refused(tmp_path):
    # the NDS has no near-support check: its pack declares no clause for one, and a pack that states one is refused
    import pytest

    from audit.core.errors import InputErrors
    from audit.standards.catalogue import load_all_packs

    folder = _pack_copy(
        tmp_path,
        "nds-2018-recalled.yaml",
        "nds-near",
        {'sawn_lumber: {value: {local: "NDS 3.10.2"}': 'sawn_lumber: {value: {local: "NDS 3.10.2", near_support: "x"}'},
    )
    with pytest.raises(InputErrors) as caught:
        load_all_packs((folder,))
    (error,) = caught.value.errors
    assert "expected {local: clause}" in str(error) and error.location.file.endswith("nds-near.yaml")
    assert load_all_packs()[0]["nds-2018-recalled"].clause_for("sawn_lumber", "local") == "NDS 3.10.2"
