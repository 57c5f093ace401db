"""Every factor of every bundled combination pack, pinned by a factored force worked by hand.

A joist on two supports carries, at midspan, D 10 kN, L 7 kN (occupancy), L 3 kN marked storage,
S 5 kN, W 4 kN and E 2 kN, so each support takes half of each: every factor of a combination
moves its Qf, and a pack whose factor changes fails here. The factors below are written from
the clauses as printed in each code, from memory (verify against the edition in force), the same
recollection the packs state; the storage rule (storage takes the live-load factor where live
load leads, the pack's storage companion factor where another load leads) is the tool's reading.
"""

from __future__ import annotations

import re

import pytest

from tests.conftest import review_dict

D, L, LS, S, W, E = 5000.0, 3500.0, 1500.0, 2500.0, 2000.0, 1000.0  # N at each support: half of each load

# the material each standard's check reads, and the pack of resistances that reads the combinations' format
STANDARD_OF = {
    "o86": ("o86-2019-recalled", {"family": "sawn_lumber", "species": "S-P-F", "grade": "No.2"}),
    "nds": ("nds-2018-recalled", {"family": "sawn_lumber", "species": "Spruce-Pine-Fir", "grade": "No.2"}),
    "ec5": ("ec5-2004-recalled", {"family": "sawn_lumber", "species": "C24", "grade": "EN 338"}),
}

NBCC_STORAGE = 1.0  # NBCC Table 4.1.3.2.-A note: storage, equipment and service rooms take 1.0L as companion
NBCC_2015_AND_2020 = {  # NBCC 2015 and 2020 Table 4.1.3.2.-A (from memory: verify); 2015 raised case 2's 0.5S to 1.0S
    "1.4D": 1.4 * D,
    "1.25D+1.5L": 1.25 * D + 1.5 * L + 1.5 * LS,
    "1.25D+1.5L+1.0S": 1.25 * D + 1.5 * L + 1.5 * LS + 1.0 * S,
    "1.25D+1.5L+0.4W": 1.25 * D + 1.5 * L + 1.5 * LS + 0.4 * W,
    "1.25D+1.5S": 1.25 * D + 1.5 * S,
    "1.25D+1.5S+0.5L": 1.25 * D + 1.5 * S + 0.5 * L + NBCC_STORAGE * LS,
    "1.25D+1.5S+0.4W": 1.25 * D + 1.5 * S + 0.4 * W,
    "1.25D+1.4W": 1.25 * D + 1.4 * W,
    "1.25D+1.4W+0.5L": 1.25 * D + 1.4 * W + 0.5 * L + NBCC_STORAGE * LS,
    "1.25D+1.4W+0.5S": 1.25 * D + 1.4 * W + 0.5 * S,
    "0.9D+1.4W": 0.9 * D + 1.4 * W,
    "1.0D+1.0E+0.5L+0.25S": 1.0 * D + 1.0 * E + 0.5 * L + NBCC_STORAGE * LS + 0.25 * S,
}
NBCC_2010 = {  # NBCC 2010 Table 4.1.3.2.-A (from memory: verify): case 2 with 0.5S
    **{k: v for k, v in NBCC_2015_AND_2020.items() if k != "1.25D+1.5L+1.0S"},
    "1.25D+1.5L+0.5S": 1.25 * D + 1.5 * L + 1.5 * LS + 0.5 * S,
}
ASD_STORAGE = 0.75  # ASCE 7-16 2.4.1 (from memory: verify): companion live load at 0.75
ASCE7_16_ASD = {  # ASCE 7-16 2.4.1 basic combinations for allowable stress design (from memory: verify)
    "D": 1.0 * D,
    "D+L": 1.0 * D + 1.0 * L + 1.0 * LS,
    "D+S": 1.0 * D + 1.0 * S,
    "D+0.75L+0.75S": 1.0 * D + 0.75 * L + 0.75 * LS + 0.75 * S,  # live load leads (ties with snow): 0.75
    "D+0.6W": 1.0 * D + 0.6 * W,
    "D+0.75L+0.45W+0.75S": 1.0 * D + 0.75 * L + 0.75 * LS + 0.45 * W + 0.75 * S,
    "0.6D+0.6W": 0.6 * D + 0.6 * W,
    "D+0.7E": 1.0 * D + 0.7 * E,
}
LRFD_STORAGE = 1.0  # ASCE 7-16 2.3.1 (from memory: verify): storage keeps 1.0L as companion (no 0.5 reduction)
ASCE7_16_LRFD = {  # ASCE 7-16 2.3.1 basic combinations for strength design (from memory: verify)
    "1.4D": 1.4 * D,
    "1.2D+1.6L+0.5S": 1.2 * D + 1.6 * L + 1.6 * LS + 0.5 * S,
    "1.2D+1.6S+L": 1.2 * D + 1.6 * S + 1.0 * L + LRFD_STORAGE * LS,
    "1.2D+1.6S+0.5W": 1.2 * D + 1.6 * S + 0.5 * W,
    "1.2D+1.0W+L+0.5S": 1.2 * D + 1.0 * W + 1.0 * L + 1.0 * LS + 0.5 * S,  # live ties with wind: leads
    "0.9D+1.0W": 0.9 * D + 1.0 * W,
    "1.2D+1.0E+L+0.2S": 1.2 * D + 1.0 * E + 1.0 * L + 1.0 * LS + 0.2 * S,
}
EN1990_STORAGE = 1.5  # EN 1990 Table A1.2(B) (from memory: verify): storage as a companion, gamma_Q psi0 = 1.5 x 1.0
EN1990_STORAGE_SEISMIC = 0.8  # EN 1990 6.4.3.4 (from memory: verify): storage psi2 = 0.8 in the seismic combination
EN1990 = {  # EN 1990 6.10 and 6.12b with the UK-style psi of category A floors (from memory: verify)
    "1.35G": 1.35 * D,
    "1.35G+1.5Q": 1.35 * D + 1.5 * L + 1.5 * LS,
    "1.35G+1.5Q+0.75S": 1.35 * D + 1.5 * L + 1.5 * LS + 0.75 * S,  # snow psi0 0.5
    "1.35G+1.5S+1.05Q": 1.35 * D + 1.5 * S + 1.05 * L + EN1990_STORAGE * LS,  # imposed psi0 0.7
    "1.35G+1.5W+1.05Q+0.75S": 1.35 * D + 1.5 * W + 1.05 * L + EN1990_STORAGE * LS + 0.75 * S,
    "1.0G+1.5W": 1.0 * D + 1.5 * W,
    "1.0G+1.0E+0.3Q": 1.0 * D + 1.0 * E + 0.3 * L + EN1990_STORAGE_SEISMIC * LS,  # imposed psi2 0.3
}

# pack -> (standard, the hand table, counteracting dead-load factor as printed)
PACKS = {
    "nbcc-2010-recalled": ("o86", NBCC_2010, 0.9),
    "nbcc-2015-recalled": ("o86", NBCC_2015_AND_2020, 0.9),
    "nbcc-2020-recalled": ("o86", NBCC_2015_AND_2020, 0.9),
    "asce7-16-asd-recalled": ("nds", ASCE7_16_ASD, 0.6),  # 2.4.1 combinations 7 and 8
    "asce7-16-lrfd-recalled": ("nds", ASCE7_16_LRFD, 0.9),  # 2.3.1 combinations 6 and 7
    "en1990-recalled": ("ec5", EN1990, 1.0),  # Table A1.2(A), favourable permanent action
}


def _joist(pack_id: str) -> dict:
    standard, _, _ = PACKS[pack_id]
    rule_pack, material = STANDARD_OF[standard]
    point = {"member": "J", "type": "point", "at": "2 m"}
    return {
        "project": {"title": "Combination factors (fictional)", "rule_pack": rule_pack, "combinations": pack_id},
        "materials": {"WOOD": material, "STEEL": {"family": "steel"}},
        "members": [
            {"id": "J", "material": "WOOD", "b": "89 mm", "d": "286 mm", "length": "4 m"},
            {"id": "C1", "material": "STEEL", "b": "152 mm", "d": "152 mm", "length": "3 m", "orientation": "vertical"},
            {"id": "C2", "material": "STEEL", "b": "152 mm", "d": "152 mm", "length": "3 m", "orientation": "vertical"},
        ],
        "bearings": [
            {"id": "J/C1", "upper": {"member": "J", "at": "0.5 m"}, "lower": "C1"},
            {"id": "J/C2", "upper": {"member": "J", "at": "3.5 m"}, "lower": "C2"},
        ],
        "loads": [
            {"id": "P", **point, "specified": {"D": "10 kN", "L": "7 kN", "S": "5 kN", "W": "4 kN", "E": "2 kN"}},
            {"id": "storage", **point, "specified": {"L": "3 kN"}, "live": "storage"},
        ],
    }


STORAGE_SUFFIX = re.compile(r"\+[\d.]+[LQ] \(storage\)$")


@pytest.mark.parametrize("pack_id", sorted(PACKS))
def test_every_combination_of_the_pack_gives_its_hand_worked_factored_force(pack_id):
    _, hand, _ = PACKS[pack_id]
    # a label states storage live load at its own factor ("+1.5Q (storage)"); the hand table is keyed by the pack's name
    rows = {
        STORAGE_SUFFIX.sub("", c.combination): c for c in review_dict(_joist(pack_id)).result("J/C1:J").combinations
    }
    assert set(rows) == set(hand), "a combination was added to or removed from the pack"
    for name, qf in hand.items():
        assert rows[name].qf == pytest.approx(qf, rel=1e-9, abs=1e-6), name


@pytest.mark.parametrize("pack_id", sorted(PACKS))
def test_the_pack_counteracting_dead_load_factor_sets_the_least_force(pack_id):
    # the dead-only combination at its least: dead load at its counteracting factor, where that is lower
    _, hand, counteracting = PACKS[pack_id]
    rows = review_dict(_joist(pack_id)).result("J/C1:J").combinations
    dead_only = next(c for c in rows if c.combination == next(iter(hand)))
    first_factor = hand[dead_only.combination] / D
    assert dead_only.qf_low == pytest.approx(min(first_factor, counteracting) * D, rel=1e-9)


def test_the_asd_storage_companion_is_stated_though_live_load_leads_or_ties_in_every_asd_combination():
    # ASCE 7-16 2.4.1 (from memory: verify): companion live load at 0.75. In each ASD combination with L, live
    # load leads or ties, so storage takes L's own factor (see the table above) and this value is only stated.
    from audit.standards.catalogue import load_all_packs

    cpack = load_all_packs()[1]["asce7-16-asd-recalled"]
    assert cpack.storage_companion.value == pytest.approx(ASD_STORAGE)


# pack -> case -> (factor on a span where it lowers the reaction, where it raises it), as printed (from memory):
# NBCC 4.1.5.3 live load on any part, 4.1.6.3 snow full on some spans and half on the rest; ASCE 7-16 4.3.3
# partial live loading; EN 1991-1-1 6.2.1 imposed load on the unfavourable parts
PATTERNS = {
    "nbcc-2010-recalled": {"L": (0.0, 1.0), "S": (0.5, 1.0)},
    "nbcc-2015-recalled": {"L": (0.0, 1.0), "S": (0.5, 1.0)},
    "nbcc-2020-recalled": {"L": (0.0, 1.0), "S": (0.5, 1.0)},
    "asce7-16-asd-recalled": {"L": (0.0, 1.0)},
    "asce7-16-lrfd-recalled": {"L": (0.0, 1.0)},
    "en1990-recalled": {"L": (0.0, 1.0)},
}


@pytest.mark.parametrize("pack_id", sorted(PATTERNS))
def test_the_pack_pattern_factors_give_the_end_support_envelope_of_three_spans(pack_id):
    # anastruct (PyPI): the end reaction of three equal 4 m spans from each span loaded alone (beam tables:
    # 0.433, -0.050, 0.017 wL); each span then takes the high or the low factor, whichever is worse
    from tests.verification.cases import _anastruct_reactions
    from tests.verification.details import beam_on_posts

    data = beam_on_posts([4.0, 4.0, 4.0])
    standard, _, _ = PACKS[pack_id]
    rule_pack, material = STANDARD_OF[standard]
    data["project"].update({"rule_pack": rule_pack, "combinations": pack_id})
    data["materials"]["GL"] = material
    data["loads"][0]["specified"] = {"D": "1 kN/m", "L": "2 kN/m", "S": "2 kN/m"}
    envelopes = review_dict(data).flow.envelopes["B/C1"]
    shares = [_anastruct_reactions([0.0, 4.0, 8.0, 12.0], [], [(a, a + 4.0, 2000.0)])[0] for a in (0.0, 4.0, 8.0)]
    assert set(envelopes) == set(PATTERNS[pack_id])
    for case, (low, high) in PATTERNS[pack_id].items():
        assert envelopes[case].high == pytest.approx(sum(max(low * r, high * r) for r in shares), rel=1e-6)
        assert envelopes[case].low == pytest.approx(sum(min(low * r, high * r) for r in shares), rel=1e-6)
