"""Built-up members: the ply count, which way the plies run, and the KZcp reading.

Hand values are worked in tests/verification/details.py (pack values from memory: verify).
"""

from __future__ import annotations

import pytest

from audit.core.errors import InputErrors
from tests.conftest import review_dict
from tests.verification.details import (
    KZCP_COMBINED,
    QR_PLATE_COMBINED,
    QR_PLATE_PER_PLY,
    joist_on_built_up_plate,
)

REL = 1e-9


def _kzcp(result) -> tuple[float, str]:
    factor = next(f for f in result.factors if f.name == "KZcp")
    return factor.value, factor.reason


def test_a_two_ply_plate_laid_flat_takes_kzcp_of_one_ply_by_default():
    r = review_dict(joist_on_built_up_plate()).result("R/W:W")
    value, reason = _kzcp(r)
    assert value == 1.0  # one ply 89/38 = 2.34, past the table's 2.0
    assert r.governing.qr == pytest.approx(QR_PLATE_PER_PLY, rel=REL)
    assert "2-ply" in reason and "per_ply" in reason and "89/38" in reason


def test_the_combined_reading_takes_kzcp_of_the_whole_built_up_member():
    r = review_dict(joist_on_built_up_plate({"kzcp.built_up": "combined"})).result("R/W:W")
    value, reason = _kzcp(r)
    assert value == pytest.approx(KZCP_COMBINED, rel=REL)
    assert value == pytest.approx(1.124, abs=5e-4)  # 2-ply 38x89 flat: 1.12, as the hand check gives
    assert r.governing.qr == pytest.approx(QR_PLATE_COMBINED, rel=REL)
    assert "combined" in reason


def test_plies_side_by_side_never_raise_kzcp_above_the_whole_member():
    # 3-ply 38 x 89 on edge (b = 114 across the plies, d = 89): one ply 38/89 gives 1.15, the whole
    # member 114/89 = 1.28 gives 1.15 - 0.15 x 0.281 = 1.108; per ply keeps the lesser
    data = joist_on_built_up_plate(b="114 mm", d="89 mm", plies=3)
    value, _ = _kzcp(review_dict(data).result("R/W:W"))
    assert value == pytest.approx(1.15 - 0.15 * (114 / 89 - 1.0), rel=REL)


def test_plies_that_make_up_neither_b_nor_d_are_an_input_error():
    with pytest.raises(InputErrors) as caught:
        review_dict(joist_on_built_up_plate(ply_thickness="35 mm"))
    assert "members[4].ply_thickness" in str(caught.value) and "neither d" in str(caught.value)


def test_a_ply_count_without_a_thickness_is_an_input_error():
    data = joist_on_built_up_plate()
    del data["members"][4]["ply_thickness"]
    with pytest.raises(InputErrors) as caught:
        review_dict(data)
    assert "members[4].ply_thickness" in str(caught.value)
