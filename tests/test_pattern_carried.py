"""The worst pattern of a continuous member carried down the load path, and the placing that governs Qf/Qr.

Hand methods named at each test: the three-moment equation for four equal spans (worked in
tests/verification/details.py), beam-table coefficients for three equal spans (from memory, and
re-solved here with anastruct, a general-purpose frame solver from PyPI), statics of a simple span.
"""

from __future__ import annotations

import itertools
import math

import pytest

from tests.conftest import review_dict
from tests.verification.cases import _anastruct_reactions
from tests.verification.details import beam_on_posts, four_span_on_sill, three_moment_end_reaction

W_D, W_L, SPAN = 1000.0, 2000.0, 4.0  # N/m, N/m, m


def test_the_sill_under_the_end_post_takes_the_beams_worst_pattern():
    # three-moment equation, four equal spans: every span 0.393 wL, spans 1 and 3 loaded 0.446 wL
    review = review_dict(four_span_on_sill())
    every = three_moment_end_reaction([True] * 4, W_L, SPAN)
    worst = three_moment_end_reaction([True, False, True, False], W_L, SPAN)
    assert worst / (W_L * SPAN) == pytest.approx(0.446, abs=5e-4)  # beam tables (from memory)
    assert review.flow.bearing_forces["P1/S"]["L"] == pytest.approx(every, rel=1e-9)
    env = review.flow.envelopes["P1/S"]["L"]
    assert env.high == pytest.approx(worst, rel=1e-9)
    sill = review.result("P1/S:S")
    dead = three_moment_end_reaction([True] * 4, W_D, SPAN)
    assert sill.governing.combination == "1.25D+1.5L"
    assert sill.governing.qf == pytest.approx(1.25 * dead + 1.5 * worst, rel=1e-9)
    assert sill.governing.pattern == "L at the worst pattern of B at B/P1"


def test_the_sills_derivation_says_whose_pattern_it_carries():
    from audit.report.export import explain

    review = review_dict(four_span_on_sill())
    text = explain(review, "P1/S:S")
    assert "worst pattern of B at B/P1" in text


def _girder_model() -> dict:
    """Three equal 4 m spans of B; its interior posts P2, P3 stand on a girder G (supports 0.1 and 5.9 m, P2 at
    0.5 m, within d = 608 mm of the support on post GP1, P3 at 4.5 m); GP1 stands on a sill S."""
    data = beam_on_posts([4.0, 4.0, 4.0])
    data["materials"]["DF"] = {"family": "timber", "species": "D.Fir-L", "grade": "No.1"}
    data["materials"]["SPF"] = {"family": "sawn_lumber", "species": "S-P-F", "grade": "No.2"}
    data["materials"]["CONC"] = {"family": "concrete"}
    for member in data["members"]:
        if member["id"] in ("C2", "C3"):
            member.update({"material": "DF", "b": "140 mm", "d": "140 mm"})
    data["members"] += [
        {"id": "G", "material": "GL", "b": "130 mm", "d": "608 mm", "length": "6 m"},
        {"id": "GP1", "material": "DF", "b": "140 mm", "d": "140 mm", "length": "3 m", "orientation": "vertical"},
        {"id": "GP2", "material": "STEEL", "b": "152 mm", "d": "152 mm", "length": "3 m", "orientation": "vertical"},
        {"id": "S", "material": "SPF", "b": "140 mm", "d": "38 mm", "length": "1 m", "support": "continuous",
         "bears_on": "CONC"},
    ]  # fmt: skip
    data["bearings"] += [
        {"id": "C2/G", "upper": "C2", "lower": {"member": "G", "at": "0.5 m"}},
        {"id": "C3/G", "upper": "C3", "lower": {"member": "G", "at": "4.5 m"}},
        {"id": "G/GP1", "upper": {"member": "G", "at": "0.1 m"}, "lower": "GP1"},
        {"id": "G/GP2", "upper": {"member": "G", "at": "5.9 m"}, "lower": "GP2"},
        {"id": "GP1/S", "upper": "GP1", "lower": {"member": "S", "at": "0.5 m"}},
    ]
    return data


def _interior_reactions_by_anastruct(w: float) -> tuple[float, float]:
    """(every span, worst pattern) live reaction at the first interior support of three equal spans (anastruct)."""
    supports = [0.0, 4.0, 8.0, 12.0]
    pieces = [(0.0, 4.0), (4.0, 8.0), (8.0, 12.0)]
    every = _anastruct_reactions(supports, [], [(a, b, w) for a, b in pieces])[1]
    worst = max(
        _anastruct_reactions(supports, [], [(*pieces[i], w) for i in loaded])[1]
        for k in (1, 2, 3)
        for loaded in itertools.combinations(range(3), k)
    )
    return every, worst


def test_a_girder_under_two_supports_of_one_beam_takes_both_maxima_and_passes_them_down():
    # anastruct (PyPI): the interior reaction of three equal spans, every span and its worst pattern (beam tables:
    # 1.10 wL and 1.20 wL); then G by statics of a simple span: R(GP1) = sum P (5.9 - x) / 5.8
    review = review_dict(_girder_model())
    every, worst = _interior_reactions_by_anastruct(W_L)
    assert worst / (W_L * SPAN) == pytest.approx(1.20, abs=1e-6)
    # both posts at their own worst (spans 1 and 2 for C2, spans 2 and 3 for C3: not together, conservative)
    on_gp1 = (worst * (5.9 - 0.5) + worst * (5.9 - 4.5)) / 5.8
    env = review.flow.envelopes["G/GP1"]["L"]
    assert env.high == pytest.approx(on_gp1, rel=1e-6)
    assert review.flow.bearing_forces["G/GP1"]["L"] == pytest.approx(every * 6.8 / 5.8, rel=1e-6)
    assert set(env.high_from) == {"B at B/C2", "B at B/C3"}
    # ... down the post GP1 to the sill under it
    assert review.flow.envelopes["GP1/S"]["L"].high == pytest.approx(on_gp1, rel=1e-6)
    dead = 1.1 * W_D * SPAN * 6.8 / 5.8  # beam tables, 1.10 wL at the interior supports, D on every span
    sill = review.result("GP1/S:S")
    assert sill.governing.qf == pytest.approx(1.25 * dead + 1.5 * on_gp1, rel=1e-6)
    assert "worst pattern of B at B/C2 and of B at B/C3" in sill.governing.pattern


def test_the_girders_near_support_load_is_the_post_at_its_worst_pattern():
    # Qf' at G's support on GP1: only post C2 (0.4 m away, within d = 608 mm), at its worst pattern
    review = review_dict(_girder_model())
    _, worst = _interior_reactions_by_anastruct(W_L)
    near = review.result("G/GP1:G:near")
    assert near.governing.qf == pytest.approx(1.25 * 1.1 * W_D * SPAN + 1.5 * worst, rel=1e-6)
    assert near.governing.pattern == "L at the worst pattern of B at B/C2"


def test_uplift_under_an_end_post_reaches_the_sill():
    # three-moment equation, spans 2 m and 4 m (as in test_pattern_loading): live load on span 2 alone gives
    # R1 = -w L2^3 / (8 (L1 + L2) L1) = -4000 N; the post passes it to the sill under it
    data = beam_on_posts([2.0, 4.0], live="6 kN/m", dead="0.5 kN/m")
    data["materials"]["SPF"] = {"family": "sawn_lumber", "species": "S-P-F", "grade": "No.2"}
    data["members"].append(
        {"id": "S", "material": "SPF", "b": "140 mm", "d": "38 mm", "length": "1 m", "support": "continuous"}
    )
    data["bearings"].append({"id": "C1/S", "upper": "C1", "lower": {"member": "S", "at": "0.5 m"}})
    review = review_dict(data)
    assert review.flow.envelopes["C1/S"]["L"].low == pytest.approx(-6000.0 * 4.0**3 / (8 * 6.0) / 2.0, rel=1e-9)
    assert review.result("C1/S:S").uplift


def _kd(long_term: float, standard: float) -> float:
    """O86 long-term KD as recalled (from memory: verify): 1.0 - 0.50 log10(PL/PS), not less than 0.65."""
    return max(0.65, 1.0 - 0.5 * math.log10(long_term / standard)) if long_term > standard else 1.0


def test_a_dead_heavy_support_governs_with_every_span_loaded_through_kd():
    # three equal 4 m spans, D 4 kN/m, L 1 kN/m; end support by beam tables (from memory; anastruct in
    # test_pattern_loading): D 0.40 wL on every span; L 0.40 wL every span, 0.45 wL at its worst pattern.
    review = review_dict(beam_on_posts([4.0, 4.0, 4.0], live="1 kN/m", dead="4 kN/m"))
    dead, live_every, live_worst = 0.40 * 16e3, 0.40 * 4e3, 0.45 * 4e3
    every = (1.25 * dead + 1.5 * live_every) / _kd(dead, live_every)  # 10.40 kN / 0.699
    worst = (1.25 * dead + 1.5 * live_worst) / _kd(dead, live_worst)  # 10.70 kN / 0.725
    assert every > worst * 1.005  # the largest load is not the worst check here
    row = next(c for c in review.result("B/C1:B").combinations if c.combination == "1.25D+1.5L")
    assert row.qf == pytest.approx(1.25 * dead + 1.5 * live_every, rel=1e-9)
    assert row.kd == pytest.approx(_kd(dead, live_every), rel=1e-9)
    assert row.pattern == ""  # every span loaded
    # Qf/Qr is Qf / (KD x the rest of Qr), the rest the same for both placings
    rest = row.qr / row.kd
    assert row.utilisation == pytest.approx(every / rest, rel=1e-9)


def test_a_light_dead_load_still_governs_at_the_worst_pattern():
    # the same beam with D 1 kN/m, L 2 kN/m: KD 1.0 either way, the larger force governs (0.45 wL)
    row = next(
        c for c in review_dict(beam_on_posts([4.0, 4.0, 4.0])).result("B/C1:B").combinations
        if c.combination == "1.25D+1.5L"
    )  # fmt: skip
    assert row.qf == pytest.approx(1.25 * 0.40 * 4e3 + 1.5 * 0.45 * 8e3, rel=1e-9)
    assert row.pattern == "L on spans 1 and 3"


def test_the_memo_states_that_the_girder_takes_two_maxima_that_do_not_occur_together():
    from audit.report.memo import assumptions

    lines = [line for line in assumptions(review_dict(_girder_model())) if "do not occur under one pattern" in line]
    assert len(lines) == 1 and "G under B" in lines[0] and "S under" not in lines[0]
    assert not [line for line in assumptions(review_dict(four_span_on_sill())) if "do not occur under" in line]


def test_the_least_snow_placing_governs_where_it_brings_kd_down_most():
    # three equal 4 m spans, D 2.1875 kN/m, S 1 kN/m; NBCC snow full or half on each span (from memory). End
    # support shares of snow on each span alone by anastruct (beam tables 0.433, -0.050, 0.017 wL): least snow
    # 0.175 wL = 0.70 kN, every span 0.40 wL = 1.60 kN, worst 0.425 wL = 1.70 kN; D 0.40 wL = 3.50 kN.
    data = beam_on_posts([4.0, 4.0, 4.0])
    data["loads"][0]["specified"] = {"D": "2.1875 kN/m", "S": "1 kN/m"}
    row = next(c for c in review_dict(data).result("B/C1:B").combinations if c.combination == "1.25D+1.5S")
    shares = [_anastruct_reactions([0.0, 4.0, 8.0, 12.0], [], [(a, a + 4.0, 1000.0)])[0] for a in (0.0, 4.0, 8.0)]
    dead = 0.40 * 2187.5 * 4.0
    least, every, worst = (sum(min(r, 0.5 * r) for r in shares), sum(shares), sum(max(r, 0.5 * r) for r in shares))
    ratio = {s: (1.25 * dead + 1.5 * s) / _kd(dead, s) for s in (least, every, worst)}  # Qf / KD
    assert ratio[least] > ratio[worst] > ratio[every]  # 8.34 > 8.21 > 8.16 kN
    assert row.qf == pytest.approx(1.25 * dead + 1.5 * least, rel=1e-6)
    assert row.kd == pytest.approx(_kd(dead, least), rel=1e-6)
    assert "its least here" in row.pattern and "S on span 2" in row.pattern


def test_the_memo_derivation_of_the_sill_names_the_pattern_and_the_range():
    from audit.report.memo import MemoOptions, render_appendix
    from tests.conftest import reconcile_dicts

    review, claims, rec = reconcile_dicts(four_span_on_sill(), [])
    html = render_appendix(review, rec, claims, MemoOptions(all_derivations=True))
    # every span 0.393 x 8 kN = 3.14 kN, the worst 0.446 x 8 = 3.57 kN, the least (spans 2 and 4) -0.054 x 8
    assert "Governing: 1.25D+1.5L with L at the worst pattern of B at B/P1" in html
    assert "L 3.14 kN (every span loaded; -0.43 kN to 3.57 kN by pattern)" in html
