"""Timber on concrete or masonry with no separation stated: a clarify note asking what keeps them apart.

The rule (common practice; NBC 9.23.2.2 and IRC R317.1 as recalled, from memory: verify): wood in
contact with concrete or masonry is separated from it by a damp-proof membrane or sill gasket, or is
preservative-treated. The review cannot see the detail, so it asks only where the model states neither.
"""

from __future__ import annotations

from pathlib import Path

import yaml

from tests.conftest import review_dict

DEMO = Path(__file__).resolve().parents[1] / "fixtures" / "demo" / "model.yaml"


def _demo() -> dict:
    return yaml.safe_load(DEMO.read_text(encoding="utf-8"))


def _notes(data: dict) -> list:
    return [f for f in review_dict(data).engine_findings if f.kind == "no-separation"]


def _member(data: dict, member_id: str) -> dict:
    return next(m for m in data["members"] if m["id"] == member_id)


def test_the_demo_sill_plate_on_the_footing_asks_for_its_separation():
    [note] = _notes(_demo())  # SP1: DF-2 flat on CONC (a concrete strip footing), nothing stated, KT 1.0
    assert note.member == "SP1" and note.weight == "clarify"
    assert "concrete" in note.message and "membrane" in note.message
    assert "NBC 9.23.2.2" in note.clause and "from memory: verify" in note.clause


def test_a_stated_separation_on_the_sill_answers_the_note():
    data = _demo()
    _member(data, "SP1")["separation"] = "sill gasket on the footing"
    assert not _notes(data)


def test_treated_wood_on_concrete_needs_no_separation():
    data = _demo()
    _member(data, "SP1")["KT"] = 0.85  # a treatment factor other than 1.0: the plate is treated wood
    assert not _notes(data)


def test_a_member_bearing_on_a_concrete_pier_is_asked_at_that_bearing_unless_stated():
    data = _demo()
    _member(data, "SP1")["separation"] = "sill gasket"
    data["members"].append(
        {
            "id": "PIER",
            "material": "CONC",
            "b": "300 mm",
            "d": "300 mm",
            "length": "1 m",
            "support": "continuous",
            "bears_on": "CONC",
        }
    )
    post_base = next(b for b in data["bearings"] if b["id"] == "P1/SP1")
    post_base["id"], post_base["lower"] = "P1/PIER", {"member": "PIER", "at": "0.5 m"}
    [note] = _notes(data)
    assert note.member == "P1" and note.bearing == "P1/PIER" and "at bearing P1/PIER" in note.message
    post_base["separation"] = "membrane under the post base"
    assert not _notes(data)
