"""The reconciler's one tolerance rule: the larger of an absolute and a relative slack on the recomputed number
(worked by hand: 2 % of 10 kN is 0.2 kN, more than 0.1 kN)."""

from __future__ import annotations

from audit.review.tolerance import FACTOR_TOLERANCE, Tolerance


def test_a_number_agrees_within_the_larger_of_the_absolute_and_the_relative_slack():
    rule = Tolerance(absolute=100.0, relative=0.02)
    assert rule.slack(10_000.0) == 200.0 and rule.slack(1_000.0) == 100.0
    assert rule.agrees(10_190.0, 10_000.0) and not rule.agrees(10_210.0, 10_000.0)
    assert rule.agrees(1_090.0, 1_000.0) and not rule.agrees(1_110.0, 1_000.0)


def test_a_factor_agrees_within_a_hundredth_of_its_value():
    # KB 1.25 against 1.26 (0.8 %) agrees; against 1.27 (1.6 %) it differs
    assert FACTOR_TOLERANCE.agrees(1.26, 1.25) and not FACTOR_TOLERANCE.agrees(1.27, 1.25)
