"""Words a designer reads: combination labels state the factors applied, uplift names the combination it comes
from, wind rows only where wind reaches the check, and checks are named as engineers name them.

Loads by hand: J1 of the base frame spans 65 mm to 3935 mm on a 4 m member, so a uniform w over it gives
w x 2 m at each support (symmetric). Combination factors are the NBCC 2015 pack's (from memory: verify).
"""

from __future__ import annotations

import pytest

from audit.standards.combinations import counteracted, labelled
from tests.conftest import base_model, review_dict


def _joist(specified: dict, **extra) -> dict:
    data = base_model()
    data["loads"][0] = {"id": "roof", "member": "J1", "type": "uniform", "specified": specified, **extra}
    return data


def test_a_combination_label_states_the_factor_storage_live_load_takes():
    # snow leading: storage live load takes the pack's storage companion 1.0, not the 0.5 occupancy companion
    data = _joist({"D": "1 kN/m", "L": "2 kN/m", "S": "1 kN/m"}, live="storage")
    rows = {c.combination: c for c in review_dict(data).result("J1/B1:J1").combinations}
    assert "1.25D+1.5S+0.5L" not in rows
    assert rows["1.25D+1.5S+1.0L"].qf == pytest.approx(1.25 * 2000 + 1.5 * 2000 + 1.0 * 4000)
    # live load leading: storage takes the live factor, and the label is the pack's
    assert rows["1.25D+1.5L"].qf == pytest.approx(1.25 * 2000 + 1.5 * 4000)


def test_a_label_with_both_kinds_of_live_load_states_each_factor():
    # occupancy live load (0.5 companion) and storage (1.0) both present: both factors are printed
    assert labelled("1.25D+1.5S+0.5L", {"D": 1.25, "S": 1.5, "L": 0.5, "L:storage": 1.0}, True) == (
        "1.25D+1.5S+0.5L+1.0L (storage)"
    )
    assert labelled("1.35G+1.5S+1.05Q", {"D": 1.35, "S": 1.5, "L": 1.05, "L:storage": 1.0}, False) == (
        "1.35G+1.5S+1.0Q"
    )
    assert labelled("1.25D+1.5L", {"D": 1.25, "L": 1.5, "L:storage": 1.5}, False) == "1.25D+1.5L"


def test_uplift_names_the_counteracting_dead_load_combination_it_comes_from():
    # D 1 kN/m, wind suction 3 kN/m up: 1.25D+1.4W with the dead load at 0.9 gives 0.9 x 2 - 1.4 x 6 = -6.6 kN
    data = _joist({"D": "1 kN/m", "W": {"suction": "3 kN/m"}})
    uplift = next(f for f in review_dict(data).engine_findings if f.kind == "uplift" and f.bearing == "J1/B1")
    assert uplift.numbers["qf"] == pytest.approx(0.9 * 2000 - 1.4 * 6000)
    assert "0.9D+1.4W" in uplift.message
    assert "1.25D+1.4W (wind suction) (dead load counteracting" not in uplift.message
    assert counteracted("1.25D+1.4W+0.5S", 1.25, 0.9) == "0.9D+1.4W+0.5S"
    assert counteracted("0.9D+1.4W", 0.9, 0.9) == "0.9D+1.4W"


def test_wind_rows_only_where_wind_reaches_the_check():
    # no wind in the model's loads at J1: no combination with wind is listed (each would repeat one without it)
    rows = [c.combination for c in review_dict(_joist({"D": "1 kN/m", "L": "2 kN/m"})).result("J1/B1:J1").combinations]
    assert rows and not any("W" in name for name in rows)
    windy = _joist({"D": "1 kN/m", "L": "2 kN/m", "W": "0.5 kN/m"})
    rows = {c.combination: c for c in review_dict(windy).result("J1/B1:J1").combinations}
    assert rows["1.25D+1.5L+0.4W"].qf == pytest.approx(1.25 * 2000 + 1.5 * 4000 + 0.4 * 1000)


def test_uplift_from_a_combination_with_no_counteracting_version_names_the_one_applied():
    # spans 2 m and 4 m, D 0.5 kN/m, L 6 kN/m on the long span only lifts C1 (three-moment equation, by hand in
    # test_pattern_loading): D 125 N, L -4000 N; 1.25D+1.5L with the dead load at 0.9: 0.9 x 125 - 1.5 x 4000
    from tests.verification.details import beam_on_posts

    review = review_dict(beam_on_posts([2.0, 4.0], live="6 kN/m", dead="0.5 kN/m"))
    uplift = next(f for f in review.engine_findings if f.kind == "uplift")
    assert uplift.numbers["qf"] == pytest.approx(0.9 * 125.0 - 1.5 * 4000.0, rel=1e-6)
    assert uplift.message.startswith("Bearing B/C1: 0.9D+1.5L, from 1.25D+1.5L with the dead load counteracting")


def test_checks_are_named_as_engineers_name_them_in_every_output(tmp_path, write_model, run_cli):
    # the base frame: glulam B1 on steel posts C1 and C2, joist J1 on B1. The beam on its post is "bearing of B1
    # on post C1"; the beam under the joist "B1 under J1"; the joist on the beam "bearing of J1 on B1"
    import json

    import yaml

    from tests.test_reconcile import claim

    model = write_model(base_model())
    claims = tmp_path / "claims.yaml"  # the calc checks B1 under J1 only: the joist's own bearing is missing
    claims.write_text(yaml.safe_dump({"claims": [claim("J1/B1", "B1", Qf=8500.0, Qr=34580.0)]}), encoding="utf-8")
    memo, out_json, out_csv = tmp_path / "m.html", tmp_path / "f.json", tmp_path / "f.csv"
    result = run_cli("review", model, "--claims", claims, "--memo", memo, "--json", out_json, "--csv", out_csv)
    assert "bearing of B1 on post C1" in result.output and "B1 under J1" in result.output
    names = {}
    for line in out_json.read_text(encoding="utf-8").splitlines():
        if '"name": "' in line and '"kind": "' in line:
            item = json.loads(line.rstrip(","))
            names[item["id"]] = item["name"]
    assert names["B1/C1:B1"] == "bearing of B1 on post C1"
    assert names["J1/B1:B1"] == "B1 under J1" and names["J1/B1:J1"] == "bearing of J1 on B1"
    for text in (memo.read_text(encoding="utf-8"), out_csv.read_text(encoding="utf-8")):
        assert "Bearing of J1 on B1: missing from the calc" in text and "reverse-direction" not in text.lower()
        assert "Missing from the calc: bearing of J1 on B1 at bearing J1/B1" in text
    explained = run_cli("explain", model, "J1/B1:J1").output
    assert explained.startswith("Check J1/B1:J1: bearing of J1 on B1")
