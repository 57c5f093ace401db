"""Outside checks: each case names its source (see tests/verification/cases.py)."""

from __future__ import annotations

import pytest

from tests.verification.cases import all_cases, kb_cases, statics_cases, unit_cases
from tests.verification.details import detail_cases
from tests.verification.write_report import REPORT, render


@pytest.mark.parametrize("case", kb_cases(), ids=lambda c: c.name)
def test_kb_table_agrees_with_nds_bearing_area_factor(case):
    # Source: US NDS 3.10.4, Cb = (lb + 0.375 in) / lb
    assert abs(case.reference - case.computed) <= case.tolerance


@pytest.mark.parametrize("case", statics_cases(), ids=lambda c: c.name)
def test_support_reactions_agree_with_anastruct(case):
    # Source: anastruct (PyPI) frame solver
    assert abs(case.reference - case.computed) <= case.tolerance


@pytest.mark.parametrize("case", unit_cases(), ids=lambda c: c.name)
def test_unit_conversions_agree_with_pint(case):
    # Source: pint's default registry; the inch is exactly 25.4 mm by definition
    assert abs(case.reference - case.computed) <= case.tolerance


@pytest.mark.parametrize("case", detail_cases(), ids=lambda c: c.name)
def test_framing_details_agree_with_their_hand_derivations(case):
    # Source: the hand derivation written out beside each case in tests/verification/details.py
    assert abs(case.reference - case.computed) <= case.tolerance


def test_verification_report_is_current():
    assert REPORT.read_text(encoding="utf-8") == render(), "run: python -m tests.verification.write_report"


def test_every_case_names_its_source():
    assert all(c.source for c in all_cases())
