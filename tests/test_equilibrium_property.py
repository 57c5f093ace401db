"""Equilibrium: for any beam and loads, the reactions add up to the loads (per case)."""

from __future__ import annotations

import itertools
import math

from hypothesis import given, settings
from hypothesis import strategies as st

from audit.engine.beam_statics import reactions
from tests.conftest import base_model, review_dict

positions = st.floats(min_value=0.0, max_value=12.0, allow_nan=False)


@st.composite
def beams(draw):
    n = draw(st.integers(min_value=2, max_value=6))
    supports = sorted(draw(st.lists(positions, min_size=n, max_size=n, unique=True)))
    if any(b - a < 0.05 for a, b in itertools.pairwise(supports)):
        supports = [i * 2.0 for i in range(n)]
    points = draw(st.lists(st.tuples(positions, st.floats(-50, 50)), max_size=6))
    uniforms = []
    for a, b, w in draw(st.lists(st.tuples(positions, positions, st.floats(-10, 10)), max_size=3)):
        if abs(b - a) > 1e-3:
            uniforms.append((min(a, b), max(a, b), w))
    return supports, points, uniforms


@settings(max_examples=300, deadline=None)
@given(beams())
def test_reactions_sum_to_applied_loads(beam):
    supports, points, uniforms = beam
    total = math.fsum(p for _, p in points) + math.fsum(w * (b - a) for a, b, w in uniforms)
    r = reactions(supports, points, uniforms)
    assert math.fsum(r) == _approx(total)


@settings(max_examples=300, deadline=None)
@given(beams())
def test_moments_about_first_support_balance(beam):
    supports, points, uniforms = beam
    r = reactions(supports, points, uniforms)
    s0 = supports[0]
    applied = math.fsum(p * (x - s0) for x, p in points) + math.fsum(
        w * (b - a) * ((a + b) / 2 - s0) for a, b, w in uniforms
    )
    resisting = math.fsum(ri * (s - s0) for ri, s in zip(r, supports, strict=True))
    assert resisting == _approx(applied)


def _approx(value: float):
    import pytest

    return pytest.approx(value, rel=1e-7, abs=1e-6)


@settings(max_examples=40, deadline=None)
@given(
    dead=st.floats(0.1, 20.0),
    live=st.floats(0.0, 20.0),
    where=st.floats(0.4, 5.6),
)
def test_take_down_delivers_every_case_to_the_posts(dead, live, where):
    data = base_model()
    data["bearings"][2]["lower"]["at"] = f"{where} m"
    data["loads"] = [
        {"id": "floor", "member": "J1", "type": "uniform", "specified": {"D": f"{dead} kN/m", "L": f"{live} kN/m"}},
        {"id": "beam", "member": "B1", "type": "point", "at": "2 m", "specified": {"D": f"{dead} kN"}},
    ]
    review = review_dict(data)
    forces = review.flow.bearing_forces
    to_posts_d = forces["B1/C1"]["D"] + forces["B1/C2"]["D"] + forces["J1/W1"]["D"]
    assert to_posts_d == _approx(dead * 4000 + dead * 1000)
    to_posts_l = forces["B1/C1"].get("L", 0.0) + forces["B1/C2"].get("L", 0.0) + forces["J1/W1"].get("L", 0.0)
    assert to_posts_l == _approx(live * 4000)


@settings(max_examples=60, deadline=None)
@given(beams())
def test_every_pattern_of_loaded_spans_is_in_equilibrium(beam):
    from audit.engine.take_down import AppliedForce, case_shares, piece_owners, span_pieces

    supports, points, uniforms = beam
    if len(supports) < 3:
        return
    length = max([supports[-1], *(x for x, _ in points), *(b for _, b, _ in uniforms)]) + 0.5
    applied = tuple(
        AppliedForce(f"p{i}", False, "point", x, forces={"L": p}) for i, (x, p) in enumerate(points)
    ) + tuple(AppliedForce(f"u{i}", False, "uniform", None, a, b, {"L": w}) for i, (a, b, w) in enumerate(uniforms))
    pieces = span_pieces(supports, length)
    shares = case_shares(supports, applied, "L", pieces, piece_owners(applied, pieces))
    for mask in range(1, 2 ** len(pieces)):
        loaded = [k for k in range(len(pieces)) if mask >> k & 1]
        placed = math.fsum(p for x, p in points if any(_owns(pieces, k, x) for k in loaded))
        placed += math.fsum(
            w * max(0.0, min(b, pieces[k][1]) - max(a, pieces[k][0])) for a, b, w in uniforms for k in loaded
        )
        total = math.fsum(math.fsum(shares[k]) for k in loaded)
        scale = 1.0 + sum(abs(p) for _, p in points) + sum(abs(w) * (b - a) for a, b, w in uniforms)
        assert abs(total - placed) <= 1e-9 * scale


def _owns(pieces, k: int, x: float) -> bool:
    # the test's own rule: a point load belongs to the last piece that starts before it (one on a
    # support goes to the piece on its left)
    starts = [i for i, (a, _, _) in enumerate(pieces) if a < x - 1e-12]
    return (starts[-1] if starts else 0) == k
