"""The findings of hangers: each reaction against its listed capacity, each top flange against its carrier's width,
and a note for the record where a face-mount hanger loads its carrier's side."""

from __future__ import annotations

from audit.core.units import Display
from audit.engine.model import Model
from audit.review import wording
from audit.review.findings import KINDS, Finding
from audit.standards.checks import face_mount_reason
from audit.standards.hangers import CAPACITY, FlangeFit, HangerCheck


def hanger_findings(
    model: Model, checks: tuple[HangerCheck, ...], fits: tuple[FlangeFit, ...], display: Display
) -> tuple[Finding, ...]:
    out = []
    for c in checks:
        weight = KINDS[CAPACITY].severity if not c.passes else "record"
        text = wording.hanger_capacity(
            c.bearing, c.hanger, c.combination, c.qf, c.capacity, c.capacity_reason, c.source, display
        )
        out.append(
            Finding(
                CAPACITY,
                weight,
                text,
                bearing=c.bearing,
                member=c.carrier,
                clause=c.source,  # the listing the capacity comes from
                numbers={"qf": c.qf, "capacity": c.capacity},
            )
        )
    for fit in fits:
        if not fit.fits:
            text = wording.hanger_flange(fit.bearing, fit.hanger, fit.carrier, fit.flange_length, fit.carrier_width)
            out.append(
                Finding("hanger-flange", KINDS["hanger-flange"].severity, text, bearing=fit.bearing, member=fit.carrier)
            )
    for b in model.bearings:
        if face_mount_reason(model, b):
            text = wording.hanger_side(b.lower.member, b.id, b.upper.member, b.hanger)
            out.append(Finding("hanger-side", "record", text, bearing=b.id, member=b.lower.member))
    return tuple(out)
