"""How far a claimed number may lie from the recomputed one and still agree: the reconciler's one rule."""

from __future__ import annotations

from dataclasses import dataclass

from audit.review.review import Review

FACTOR_REL_TOL = 0.01


@dataclass(frozen=True, slots=True)
class Tolerance:
    """How far a claimed number may lie from the recomputed one and still agree: the larger of an absolute and a
    relative slack on the recomputed number. The reconciler's one tolerance rule: forces take the project's,
    Qf/Qr its printed two decimals or the project's share, factors a hundredth of their value."""

    absolute: float
    relative: float

    def slack(self, recomputed: float) -> float:
        return max(self.absolute, self.relative * abs(recomputed))

    def agrees(self, claimed: float, recomputed: float) -> bool:
        return abs(claimed - recomputed) <= self.slack(recomputed)


FACTOR_TOLERANCE = Tolerance(0.0, FACTOR_REL_TOL)


def force_tolerance(review: Review) -> Tolerance:
    """The project's tolerance on a force (Qf, Qr)."""
    p = review.model.project
    return Tolerance(p.tolerance_absolute, p.tolerance_relative)


UTILISATION_ABS_TOL = 0.01  # Qf/Qr as calcs print it, to two decimals


PRINTED_RATIO = Tolerance(UTILISATION_ABS_TOL, 0.0)
