"""Rule packs are data: every value carries provenance; a firm's own pack changes results
without code changes."""

from __future__ import annotations

import pytest

from audit.standards.bundled import builtin_rules_dir
from audit.standards.catalogue import load_all_packs
from tests.conftest import base_model


def test_every_resistance_value_carries_source_and_status():
    resistance, _ = load_all_packs()
    for pack in resistance.values():
        for name, value in pack.all_sourced():
            assert value.source, name
            assert value.status, name


def test_every_combination_carries_a_duration_and_source():
    _, combos = load_all_packs()
    for pack in combos.values():
        for c in pack.combinations:
            assert c.duration in ("permanent", "standard", "short")
            assert c.source.source and c.source.status


def test_a_firms_own_pack_is_selected_by_id_and_changes_the_result(tmp_path, write_model, run_cli):
    text = (builtin_rules_dir() / "o86-2019-recalled.yaml").read_text()
    text = text.replace("id: o86-2019-recalled", "id: firm-verified-2026")
    text = text.replace("value: 5.3 MPa", "value: 4.3 MPa")
    (tmp_path / "firm").mkdir()
    (tmp_path / "firm" / "firm.yaml").write_text(text)
    data = base_model()
    data["project"]["rule_pack"] = "firm-verified-2026"
    path = write_model(data)
    base = run_cli("explain", path, "J1/B1:J1", "--rules-dir", tmp_path / "firm")
    assert base.exit_code == 0, base.output
    assert "fcp = 4.30 MPa" in base.output


def test_unknown_rule_pack_is_an_input_error(write_model, run_cli):
    data = base_model()
    data["project"]["rule_pack"] = "no-such-pack"
    result = run_cli("review", write_model(data))
    assert result.exit_code == 2
    assert "unknown rule pack 'no-such-pack'" in result.stderr


def test_a_pack_value_without_provenance_is_refused(tmp_path, run_cli):
    text = (builtin_rules_dir() / "o86-2019-recalled.yaml").read_text()
    text = text.replace("id: o86-2019-recalled", "id: bad-pack")
    text = text.replace("  source: CSA O86 resistance factor for compression perpendicular to grain\n", "")
    (tmp_path / "bad").mkdir()
    (tmp_path / "bad" / "bad.yaml").write_text(text)
    result = run_cli("rules", "--rules-dir", tmp_path / "bad")
    assert result.exit_code == 2
    assert "provenance" in result.stderr


def test_rules_listing_prints_lengths_in_mm_and_factors_to_four_figures(run_cli):
    out = run_cli("rules").stdout
    kb_line = next(line for line in out.splitlines() if "kb.table =" in line)
    assert "12.5 mm -> 1.75" in kb_line and "150 mm -> 1" in kb_line  # the table's own mm, not metres
    factor_line = next(line for line in out.splitlines() if "near_support.factor =" in line)
    assert "= 0.6667" in factor_line and "0.66666" not in factor_line
    assert "common practice" not in factor_line  # the 2/3 is part of the clause's formula


def test_each_code_edition_is_its_own_pack_and_the_project_chooses_it():
    from tests.conftest import review_dict

    def companion_qf(edition: str) -> dict[str, float]:
        data = base_model()
        data["project"]["combinations"] = edition
        data["loads"][0]["specified"] = {"D": "1 kN/m", "L": "2 kN/m", "S": "1 kN/m"}
        return {c.combination: c.qf for c in review_dict(data).result("J1/B1:J1").combinations}

    # J1 reaction on B1 (4 m joist, symmetric): D 2 kN, L 4 kN, S 2 kN. As recalled, the live-led
    # case took 0.5S in NBCC 2010 and 1.0S from 2015 (from memory: verify)
    assert companion_qf("nbcc-2010-recalled")["1.25D+1.5L+0.5S"] == pytest.approx(1.25 * 2000 + 1.5 * 4000 + 0.5 * 2000)
    assert companion_qf("nbcc-2015-recalled")["1.25D+1.5L+1.0S"] == pytest.approx(1.25 * 2000 + 1.5 * 4000 + 1.0 * 2000)
    assert "1.25D+1.5L+1.0S" in companion_qf("nbcc-2020-recalled")


def test_a_combination_pack_states_patterns_counteracting_dead_and_storage_companion(run_cli):
    out = run_cli("rules").stdout
    assert "counteracting_dead = 0.9" in out and "patterns.L = 0 or 1" in out and "patterns.S = 0.5 or 1" in out
    assert "storage_live.companion = 1" in out
