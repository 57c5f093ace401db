"""Properties of reconciliation: everything is accounted for once; input order changes nothing."""

from __future__ import annotations

import random

from hypothesis import given, settings
from hypothesis import strategies as st

from audit.review.reconcile import reconcile
from tests.conftest import base_model, claims_from, review_dict

REVIEW = review_dict(base_model())
LABELS = [b.id for b in REVIEW.model.bearings] + ["nowhere", "B1 at the wall", ""]
MEMBERS = ["B1", "J1", "W1", "C1", "", "ZZ"]

claim_items = st.lists(
    st.fixed_dictionaries(
        {
            "location": st.sampled_from(LABELS).filter(bool),
            "member": st.sampled_from(MEMBERS),
            "kind": st.sampled_from(["local", "near-support"]),
            "Qf": st.floats(0.1, 80).map(lambda v: f"{v:.3f} kN"),
            "Qr": st.floats(1, 120).map(lambda v: f"{v:.3f} kN"),
            "adequate": st.booleans(),
        }
    ),
    max_size=12,
)


def accounted(reconciliation, review, claims) -> bool:
    """The test's own oracle: every required check and every claim appears exactly once."""
    checks = [o.check_id for o in reconciliation.checks]
    claim_ids = [o.claim_id for o in reconciliation.claims]
    return sorted(checks) == sorted(r.check.id for r in review.results) and sorted(claim_ids) == sorted(
        c.id for c in claims
    )


@settings(max_examples=80, deadline=None)
@given(claim_items)
def test_every_check_and_every_claim_is_accounted_for_exactly_once(items):
    for i, item in enumerate(items):
        item["id"] = f"c{i}"
        if not item["member"]:
            del item["member"]
    claims = claims_from(items)
    rec = reconcile(REVIEW, claims)
    assert accounted(rec, REVIEW, claims)
    matched = [o.check_id for o in rec.claims if o.check_id]
    assert len(matched) == len(set(matched))  # no check is claimed twice
    for o in rec.claims:
        assert (o.check_id == "") == (o.finding is not None and o.finding.kind == "unmatched-claim")


def _outcomes(data, items):
    review = review_dict(data)
    rec = reconcile(review, claims_from(items))
    checks = {o.check_id: (o.status, o.claim_id, tuple(sorted(f.kind for f in o.findings))) for o in rec.checks}
    results = {r.check.id: (round(r.governing.qf, 6), round(r.governing.qr, 6)) for r in review.results}
    claim_map = {o.claim_id: o.check_id for o in rec.claims}
    return checks, results, claim_map


@settings(max_examples=25, deadline=None)
@given(st.randoms(use_true_random=False))
def test_reordering_the_yaml_entries_changes_nothing(rnd: random.Random):
    items = [
        {"id": "a", "location": "J1/B1", "member": "J1", "Qf": "8.5 kN", "Qr": "24.09 kN"},
        {"id": "b", "location": "J1/B1", "member": "B1", "Qf": "7 kN", "Qr": "40 kN"},
        {"id": "c", "location": "B1/C1", "member": "B1", "Qf": "4 kN"},
        {"id": "d", "location": "nowhere", "member": "B1", "Qf": "4 kN"},
    ]
    data = base_model()
    data["loads"].append({"id": "p", "member": "B1", "type": "point", "at": "2 m", "specified": {"S": "5 kN"}})
    expected = _outcomes(data, items)
    shuffled = base_model()
    shuffled["loads"] = list(data["loads"])
    for key in ("members", "bearings", "loads"):
        rnd.shuffle(shuffled[key])
    shuffled["materials"] = dict(rnd.sample(list(data["materials"].items()), len(data["materials"])))
    order = list(items)
    rnd.shuffle(order)
    assert _outcomes(shuffled, order) == expected
