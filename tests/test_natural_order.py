"""Ids are listed in natural order wherever the tool lists them: stud2 before stud10, J9 before J10."""

from __future__ import annotations

import re

from audit.core.natural import natural_key, natural_sorted
from audit.report.memo import MemoOptions, appendix_view, render_appendix
from audit.review.comments import build_comments
from tests.conftest import base_model, reconcile_dicts

JOISTS = [f"J{i}" for i in range(1, 13)]


def test_digits_in_an_id_compare_as_numbers():
    ids = ["stud10", "stud2", "stud1", "J-A-B-10", "J-A-B-9", "P-B2-1", "P-B10-1", "WP1.stud11", "WP1.stud3"]
    assert natural_sorted(ids) == [
        "J-A-B-9",
        "J-A-B-10",
        "P-B2-1",
        "P-B10-1",
        "stud1",
        "stud2",
        "stud10",
        "WP1.stud3",
        "WP1.stud11",
    ]
    assert natural_key("stud2") < natural_key("stud10") and sorted(["stud2", "stud10"]) == ["stud10", "stud2"]


def _twelve_joists() -> dict:
    """Twelve joists J1..J12 at 400 mm on the beam B1 and the wall plate W1 (the base model's frame)."""
    data = base_model()
    data["members"] = [m for m in data["members"] if m["id"] != "J1"]
    data["bearings"] = data["bearings"][:2]
    data["loads"] = []
    for i, joist in enumerate(JOISTS, start=1):
        data["members"].append({"id": joist, "material": "SPF", "b": "38 mm", "d": "235 mm", "length": "4 m"})
        data["bearings"] += [
            {"upper": {"member": joist, "at": "3935 mm"}, "lower": {"member": "B1", "at": f"{400 * i} mm"}},
            {"upper": {"member": joist, "at": "65 mm"}, "lower": {"member": "W1", "at": f"{300 * i} mm"}},
        ]
        data["loads"].append(
            {"id": f"floor{i}", "member": joist, "type": "uniform", "specified": {"D": "1 kN/m", "L": "2 kN/m"}}
        )
    return data


def _joists_in(text: str) -> list[str]:
    return [m for m in re.findall(r"\b(J\d+)\b", text) if m in JOISTS]


def test_a_grouped_comment_lists_its_places_in_natural_order():
    review, claims, rec = reconcile_dicts(_twelve_joists(), [{"location": "nowhere", "Qf": "1 kN"}])
    comments = build_comments(review, rec, claims)
    grouped = [c for c in comments if len(c.places) == 12]
    assert grouped  # the checks of B1 under the joists, and the joists' own checks on B1 and W1
    for c in grouped:
        assert [p.bearing.split("/")[0] for p in c.places] == JOISTS, c.title


def test_the_appendix_lists_checks_and_sketches_in_natural_order():
    review, claims, rec = reconcile_dicts(_twelve_joists(), [{"location": "nowhere", "Qf": "1 kN"}])
    html = render_appendix(review, rec, claims, MemoOptions())
    table = html.split('id="checks"')[1].split('id="claims"')[0]
    b1 = table.split('<tr class="member"><th colspan="9">B1</th></tr>')[1].split('<tr class="member">')[0]
    assert list(dict.fromkeys(_joists_in(b1))) == JOISTS
    members = [s["member"] for s in appendix_view(review, rec, claims, MemoOptions())["sketches"]]
    typical = next(m for m in members if m.startswith("J1,"))
    assert _joists_in(typical) == JOISTS  # drawn once for all twelve, named in natural order
