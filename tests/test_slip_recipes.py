"""Each slip recipe reproduces the number a calc that made it would print, and is named for it.

Numbers are worked by hand here; factors are the packs' (from memory: verify). Where two slips
give the same number, the claim's own factor list decides between them.
"""

from __future__ import annotations

import math

from tests.conftest import base_model
from tests.test_reconcile import QR_J1, claim, outcome
from tests.verification.details import beam_on_posts


def _slips(quantity: str, model, claimed: float, check_id: str, location: str, member: str, factors=None):
    c = claim(location, member, **{quantity: claimed})
    if factors:
        c["factors"] = factors
    out, _ = outcome(model, [c], check_id)
    compared = out.qf if quantity == "Qf" else out.qr
    assert compared is not None and not compared.within
    return [s.name for s in compared.slips]


def _qf_slips(*args, **kwargs) -> list[str]:
    return _slips("Qf", *args, **kwargs)


def _qr_slips(*args, **kwargs) -> list[str]:
    return _slips("Qr", *args, **kwargs)


def test_simple_span_reactions_for_a_continuous_beam_are_named():
    # three equal 4 m spans, D 1 kN/m, L 2 kN/m; interior support as simple spans: w x 4 m each case,
    # D 4 kN and L 8 kN -> 1.25 x 4 + 1.5 x 8 = 17.0 kN (continuous with patterns: 19.9 kN)
    slips = _qf_slips(beam_on_posts([4.0, 4.0, 4.0]), 17.0e3, "B/C2:B", "B/C2", "B")
    assert slips == ["simple-span-reactions"]


def test_full_loading_only_is_named_where_a_pattern_governs():
    # every span loaded: D 1.1 x 4 = 4.4 kN, L 1.1 x 8 = 8.8 kN -> 1.25 x 4.4 + 1.5 x 8.8 = 18.7 kN;
    # the worst pattern (spans 1 and 2) gives L 1.2 x 8 = 9.6 kN -> 19.9 kN
    slips = _qf_slips(beam_on_posts([4.0, 4.0, 4.0]), 18.7e3, "B/C2:B", "B/C2", "B")
    assert slips == ["pattern-loading-ignored"]


def test_the_long_term_kd_ignored_is_named():
    data = base_model()
    data["loads"][0]["specified"] = {"D": "5 kN/m", "L": "1 kN/m"}
    # PL = 10 kN > PS = 2 kN: KD = 0.6505, Qr = 24.09 x 0.6505; the calc took KD = 1.0: 24.09 kN
    assert _qr_slips(data, QR_J1, "J1/B1:J1", "J1/B1", "J1") == ["long-term-kd-ignored"]


def test_hankinsons_angle_taken_as_the_roof_slope_is_named():
    data = base_model()
    data["bearings"][2]["upper"]["angle"] = "60 deg"  # between load and grain; a 30 deg roof slope
    area = 0.038 * 0.130
    qr, pr = 0.8 * 5.3e6 * area * 1.15, 0.8 * 11.5e6 * area
    slope = math.radians(30)
    slipped = pr * qr / (pr * math.sin(slope) ** 2 + qr * math.cos(slope) ** 2)
    assert _qr_slips(data, slipped, "J1/B1:J1", "J1/B1", "J1") == ["hankinson-roof-slope"]


def test_the_wrong_species_fcp_is_named_with_the_species():
    # J1 is S-P-F (5.3 MPa); the calc used D.Fir-L's 7.0 MPa: 24.09 x 7.0 / 5.3 = 31.81 kN
    out, _ = outcome(base_model(), [claim("J1/B1", "J1", Qr=QR_J1 * 7.0 / 5.3)], "J1/B1:J1")
    assert [s.name for s in out.qr.slips] == ["wrong-species-fcp"]
    assert "D.Fir-L (7.00 MPa)" in out.qr.slips[0].text


def _plate_qr() -> float:
    # the plate W1 under J1: 38 mm along x 140 mm across; KB 1.25 (38 mm, far from the ends); KZcp 1.00
    return 0.8 * 5.3e6 * (0.038 * 0.140) * 1.25 * 1.00


def test_two_slips_with_one_number_are_told_apart_by_the_claims_own_factors():
    # KZcp 1.15 for the flat plate and KD 1.15 both give 1.15 x Qr
    both = _qr_slips(base_model(), _plate_qr() * 1.15, "J1/W1:W1", "J1/W1", "W1")
    assert set(both) == {"kzcp-flat-plate", "short-term-kd"}
    kzcp = _qr_slips(base_model(), _plate_qr() * 1.15, "J1/W1:W1", "J1/W1", "W1", {"KZcp": 1.15, "KD": 1.0})
    assert kzcp == ["kzcp-flat-plate"]
    kd = _qr_slips(base_model(), _plate_qr() * 1.15, "J1/W1:W1", "J1/W1", "W1", {"KD": 1.15})
    assert kd == ["short-term-kd"]


def test_a_slip_the_claims_factors_rule_out_is_not_offered():
    # the claim lists KD 1.0 only: the short-term KD slip is ruled out, KZcp stays (the claim is silent on it)
    slips = _qr_slips(base_model(), _plate_qr() * 1.15, "J1/W1:W1", "J1/W1", "W1", {"KD": 1.0})
    assert slips == ["kzcp-flat-plate"]
