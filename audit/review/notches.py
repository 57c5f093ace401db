"""Notched ends at bearings: what the review checks there and what it leaves to the standard's notch clause.

A notch cut out of a member at a bearing (``notch`` on the bearing's side) leaves the depth d less
the notch at that support: the near-support check reaches that depth (``standards/checks.depth_at``).
The notch's own shear (the square corner's stress concentration, the reduced shear resistance) is
another clause, not checked here: each notched bearing is a finding of weight record saying so.
"""

from __future__ import annotations

from audit.engine.model import Model
from audit.review.findings import KINDS, Finding


def notched_end_findings(model: Model) -> tuple[Finding, ...]:
    out = []
    for b in model.bearings:
        for side in (b.upper, b.lower):
            if side.notch <= 0.0:
                continue
            member = model.members[side.member]
            left = member.d - side.notch
            out.append(
                Finding(
                    "notched-end",
                    KINDS["notched-end"].severity,
                    f"{member.id} is notched {side.notch * 1000:.0f} mm at bearing {b.id}: its depth there is "
                    f"{left * 1000:.0f} mm of d = {member.d * 1000:.0f} mm, and the near-support check reaches "
                    f"{left * 1000:.0f} mm. The notch's shear is not checked here (the standard's clause for "
                    "notched members governs it).",
                    bearing=b.id,
                    member=member.id,
                    numbers={"notch": side.notch, "depth_left": left},
                )
            )
    return tuple(out)
