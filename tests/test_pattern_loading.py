"""Live and snow load placed span by span on members on three or more supports.

Every pattern's reactions are checked against anastruct (PyPI, a general-purpose frame solver),
and the worst pattern's numbers by hand in tests/verification/details.py.
"""

from __future__ import annotations

import itertools

import pytest

from tests.conftest import review_dict
from tests.verification.cases import _anastruct_reactions
from tests.verification.details import beam_on_posts


def _subsets(n: int):
    for k in range(1, n + 1):
        yield from itertools.combinations(range(n), k)


@pytest.mark.parametrize(
    "spans, overhang", [([4.0, 4.0], 0.0), ([3.0, 4.5, 3.5], 0.0), ([4.0, 4.0, 4.0], 0.0), ([3.0, 5.0], 1.0)]
)
def test_live_envelope_is_the_worst_of_every_pattern_solved_by_anastruct(spans, overhang):
    # Source: anastruct frame solver, one run per set of loaded spans (overhangs count as spans)
    review = review_dict(beam_on_posts(spans, overhang_m=overhang))
    supports = [overhang + sum(spans[:i]) for i in range(len(spans) + 1)]
    length = supports[-1] + overhang
    cuts = [0.0, *supports, length]
    pieces = [(a, b) for a, b in itertools.pairwise(cuts) if b - a > 1e-9]
    per_pattern = []
    for loaded in _subsets(len(pieces)):
        uniforms = [(pieces[i][0], pieces[i][1], 2000.0) for i in loaded]
        per_pattern.append(_anastruct_reactions(supports, [], uniforms))
    for i in range(len(supports)):
        env = review.flow.envelopes[f"B/C{i + 1}"]["L"]
        assert env.high == pytest.approx(max(max(r[i] for r in per_pattern), 0.0), rel=1e-6, abs=1e-6)
        assert env.low == pytest.approx(min(min(r[i] for r in per_pattern), 0.0), rel=1e-6, abs=1e-6)


def test_every_pattern_is_in_equilibrium_with_its_loaded_spans():
    # Property: for any set of loaded spans, the supports' shares add up to the load placed there
    from audit.engine.take_down import case_shares, piece_owners, span_pieces

    review = review_dict(beam_on_posts([3.0, 4.5, 3.5], overhang_m=0.8))
    member = review.model.members["B"]
    supports = sorted(b.upper.at for b in review.model.bearings if b.upper.member == "B")
    pieces = span_pieces(supports, member.length)
    applied = review.flow.on_top["B"]
    shares = case_shares(supports, applied, "L", pieces, piece_owners(applied, pieces))
    for loaded in _subsets(len(pieces)):
        placed = sum(2000.0 * (pieces[k][1] - pieces[k][0]) for k in loaded)
        assert sum(sum(shares[k]) for k in loaded) == pytest.approx(placed, rel=1e-9)


def test_three_equal_spans_end_reaction_rises_an_eighth_and_interior_a_eleventh():
    flow = review_dict(beam_on_posts([4.0, 4.0, 4.0])).flow
    full = flow.bearing_forces
    # continuous-beam coefficients (beam tables, from memory): 0.40 -> 0.45 wL, 1.10 -> 1.20 wL
    assert flow.envelopes["B/C1"]["L"].high / full["B/C1"]["L"] == pytest.approx(0.45 / 0.40, rel=1e-6)
    assert flow.envelopes["B/C2"]["L"].high / full["B/C2"]["L"] == pytest.approx(1.20 / 1.10, rel=1e-6)
    assert flow.envelopes["B/C1"]["L"].high_spans == "spans 1 and 3"


def test_the_check_takes_its_worst_pattern_and_names_it():
    r = review_dict(beam_on_posts([4.0, 4.0, 4.0])).result("B/C1:B")
    row = next(c for c in r.combinations if c.combination == "1.25D+1.5L")
    # by hand: D end reaction 0.40 x 1 kN/m x 4 m = 1.6 kN; L worst 0.45 x 2 kN/m x 4 m = 3.6 kN
    assert row.qf == pytest.approx(1.25 * 1600 + 1.5 * 3600, rel=1e-6)
    assert row.pattern == "L on spans 1 and 3"


def test_uplift_is_looked_for_under_every_pattern_with_counteracting_dead_load():
    # spans of 2 m and 4 m: live load on the long span alone lifts the far end of the short one
    review = review_dict(beam_on_posts([2.0, 4.0], live="6 kN/m", dead="0.5 kN/m"))
    uplift = [f for f in review.engine_findings if f.kind == "uplift"]
    assert [f.bearing for f in uplift] == ["B/C1"]
    # by hand (three-moment equation, equal EI): M2 = -w (L1^3 + L2^3) / (8 (L1 + L2)) with every
    # span loaded, M2 = -w L2^3 / (8 (L1 + L2)) with span 2 alone; R1 = w L1 / 2 + M2 / L1
    dead = 500.0 * 2.0 / 2 - 500.0 * (2.0**3 + 4.0**3) / (8 * 6.0) / 2.0  # 500 - 375 = 125 N
    live = -6000.0 * 4.0**3 / (8 * 6.0) / 2.0  # -4000 N
    assert _anastruct_reactions([0.0, 2.0, 6.0], [], [(2.0, 6.0, 6000.0)])[0] == pytest.approx(live, rel=1e-6)
    # the worst is 1.25D + 1.5L (or its companions) with D at the counteracting 0.9
    assert uplift[0].numbers["qf"] == pytest.approx(0.9 * dead + 1.5 * live, rel=1e-6)
    assert "dead load counteracting" in uplift[0].message and "L on span 2" in uplift[0].message
