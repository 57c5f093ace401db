"""Runs the stages in order. Each stage is a module; this file only wires them."""

from __future__ import annotations

from dataclasses import dataclass
from functools import cached_property
from pathlib import Path

from audit.core.units import Display
from audit.engine.model import Bearing, Model
from audit.engine.take_down import TakeDown, force_floor, take_down
from audit.inputs.read_model import read_model
from audit.review import wording
from audit.review.details import member_roles
from audit.review.findings import KINDS, Finding
from audit.review.hanger_findings import hanger_findings
from audit.review.load_path import no_path_findings
from audit.review.minimum_bearing import short_bearing_findings
from audit.review.notches import notched_end_findings
from audit.review.separation import no_separation_findings
from audit.standards.base import Standard
from audit.standards.checks import NO_LENGTH, CheckList, RequiredCheck
from audit.standards.combinations import LoadCombination, counteracted, load_combinations
from audit.standards.hangers import HangerCheck, flange_fits, hanger_checks
from audit.standards.packs import CombinationPack, PackCore
from audit.standards.registry import standard_named
from audit.standards.resistance import CheckResult


@dataclass(frozen=True)
class Review:
    model: Model
    pack: PackCore
    cpack: CombinationPack
    flow: TakeDown
    checklist: CheckList
    results: tuple[CheckResult, ...]
    engine_findings: tuple[Finding, ...]  # uplift, and supports the model does not show
    hangers: tuple[HangerCheck, ...] = ()  # each hanger's reaction against its listed capacity

    @cached_property
    def combinations(self) -> tuple[LoadCombination, ...]:
        return load_combinations(self.model, self.cpack)

    @cached_property
    def _by_id(self) -> dict[str, CheckResult]:
        return {r.check.id: r for r in self.results}

    @cached_property
    def _by_place(self) -> dict[tuple[str, str, str], CheckResult]:
        return {(r.check.bearing, r.check.member, r.check.kind): r for r in self.results}

    @cached_property
    def checks_on(self) -> dict[str, tuple[RequiredCheck, ...]]:
        """Member id -> the checks of that member."""
        out: dict[str, list[RequiredCheck]] = {}
        for r in self.results:
            out.setdefault(r.check.member, []).append(r.check)
        return {member: tuple(checks) for member, checks in out.items()}

    def result(self, check_id: str) -> CheckResult:
        return self._by_id[check_id]

    def result_at(self, bearing: str, member: str, kind: str) -> CheckResult | None:
        """The check of ``member`` of that kind at ``bearing``, if the design requires one."""
        return self._by_place.get((bearing, member, kind))

    @cached_property
    def display(self) -> Display:
        """How the project shows forces."""
        return Display.for_project(self.model.project.units)

    @cached_property
    def _combinations_by_name(self) -> dict[str, LoadCombination]:
        return {c.name: c for c in self.combinations}

    def combination(self, name: str) -> LoadCombination | None:
        """The load combination of that name ('no load' has none)."""
        return self._combinations_by_name.get(name)

    @cached_property
    def supports_of(self) -> dict[str, list[Bearing]]:
        """Member id -> the bearings it sits on."""
        out: dict[str, list[Bearing]] = {}
        for b in self.model.bearings:
            out.setdefault(b.upper.member, []).append(b)
        return out

    @cached_property
    def standard(self) -> Standard:
        """The standard the rule pack declares, which listed the checks and computed their resistance."""
        return standard_named(self.pack.standard)

    @cached_property
    def readings(self) -> dict[str, str]:
        """The reading in force at each of the pack's choices."""
        return self.pack.in_force(self.model.project.readings)


def review_model(model_path: Path | str, rules_dirs: tuple[Path, ...] = (), rule_pack: str | None = None) -> Review:
    model, pack, cpack = read_model(model_path, rules_dirs, rule_pack)
    return review_built(model, pack, cpack)


def review_built(model: Model, pack: PackCore, cpack: CombinationPack) -> Review:
    flow = take_down(model, {case: p.value for case, p in cpack.patterns.items()})
    standard = standard_named(pack.standard)
    checklist = standard.list_checks(model, flow, pack, pack.in_force(model.project.readings))
    results = standard.resist(checklist, model, pack, cpack)
    threshold, whose = uplift_threshold(model, pack)
    factors = {c.name: c.factors for c in load_combinations(model, cpack)}
    display = Display.for_project(model.project.units)
    engine = (
        uplift_findings(results, threshold, whose, factors, display, cpack.counteracting_dead.value)
        + unseen_support_findings(checklist)
        + calc_force_findings(model, flow, display)
        + short_bearing_findings(model, checklist, pack.standard, display)
        + notched_end_findings(model)
        + no_path_findings(model, member_roles(model))
        + no_separation_findings(model)
    )
    hangers = hanger_checks(model, flow, cpack)
    engine += hanger_findings(model, hangers, flange_fits(model), display)
    return Review(model, pack, cpack, flow, checklist, results, engine, hangers)


def calc_force_findings(model: Model, flow: TakeDown, display: Display) -> tuple[Finding, ...]:
    """At each bearing whose force the calc states: a note that it is taken as given, and where the model's own
    loads reach it too, a comment when the two differ beyond the project's tolerance."""
    p = model.project
    out = []
    for b in model.bearings:
        if not b.calc_force:
            continue
        stated = dict(b.calc_force)
        out.append(
            Finding(
                "calc-force", "record", wording.calc_force(b.id, stated, display), bearing=b.id, member=b.upper.member
            )
        )
        own = flow.modelled.get(b.id, {})
        floor = force_floor([*stated.values(), *own.values()])  # relative to the loads there: alike when scaled
        modelled = {case: v for case, v in own.items() if abs(v) > floor}
        if not modelled:
            continue  # the model carries no load to this bearing: nothing to compare
        worst, share, higher = "", 0.0, False
        for case in sorted(set(stated) | set(modelled)):
            s, m = stated.get(case, 0.0), modelled.get(case, 0.0)
            gap = abs(s - m)
            if gap <= max(p.tolerance_relative * max(abs(s), abs(m)), p.tolerance_absolute):
                continue
            ratio = gap / max(abs(s), abs(m))
            if ratio > share:
                worst, share, higher = case, ratio, m > s
        if worst:
            out.append(
                Finding(
                    "force-differs",
                    "revise" if higher else "clarify",  # the calc taking less than the model's loads is the worse slip
                    wording.force_differs(b.id, stated, modelled, worst, share, display),
                    bearing=b.id,
                    member=b.upper.member,
                    numbers={"stated": stated.get(worst, 0.0), "modelled": modelled.get(worst, 0.0)},
                )
            )
    return tuple(out)


def unseen_support_findings(checklist: CheckList) -> tuple[Finding, ...]:
    """One note per continuous member that point loads land on while its support is not in the model, and one
    per member under point loads that state no bearing length (naming each load)."""
    out = []
    for item in checklist.unchecked:
        if item.why == NO_LENGTH:
            loads = [f"{source} at {at * 1000:.0f} mm" for source, at in item.spots]
            out.append(
                Finding(
                    "no-bearing-length",
                    KINDS["no-bearing-length"].severity,
                    wording.no_bearing_length(item.member, loads),
                    bearing=item.spots[0][0],
                    member=item.member,
                )
            )
            continue
        spots = ", ".join(f"{source} at {at * 1000:.0f} mm" for source, at in item.spots)
        out.append(
            Finding(
                "not-checked",
                KINDS["not-checked"].severity,
                wording.unseen_support(item.member, spots),
                bearing=item.spots[0][0],
                member=item.member,
            )
        )
    return tuple(out)


def _as_placed(combination: str, result: CheckResult, factors: dict[str, float], counteracting: float = 1.0) -> str:
    """The combination as uplift is looked for, named with the dead-load factor it takes ('0.9D+1.4W, from
    1.25D+1.4W with the dead load counteracting'), patterned cases at their least."""
    placed = [
        f"{case} {env.placing(False)}"
        for case, env in sorted(result.check.envelope.items())
        if factors.get(case, 0.0) > 0
    ]
    dead = factors.get("D", 0.0)
    has_dead = result.check.forces.get("D", 0.0) > 0.0
    named = counteracted(combination, dead, counteracting) if has_dead else combination
    origin = f", from {combination} with the dead load counteracting" if named != combination else ""
    return named + origin + (f" ({'; '.join(placed)})" if placed else "")


def uplift_threshold(model: Model, pack: PackCore) -> tuple[float, str]:
    """(N, whose) below which uplift is a note: the project's where it sets one, else the pack's."""
    if model.project.uplift_note_below is not None:
        return model.project.uplift_note_below, "the project's note threshold (uplift_note_below)"
    return pack.uplift_note_below.value, f"the note threshold of rule pack {pack.id} (uplift.note_below)"


def uplift_findings(
    results: tuple[CheckResult, ...],
    note_below: float = 0.0,
    whose: str = "the note threshold",
    factors: dict[str, dict[str, float]] | None = None,
    display: Display | None = None,
    counteracting: float = 1.0,
) -> tuple[Finding, ...]:
    """One finding per bearing with uplift; below the note threshold it is for the record and asks nothing."""
    factors = factors or {}
    display = display or Display()
    seen: set[str] = set()
    out = []
    for r in results:
        if not r.uplift or r.check.bearing in seen or r.check.kind != "local" or r.check.load:  # loads: not bearings
            continue
        seen.add(r.check.bearing)
        # of equal uplifts, the combination whose own name carries the counteracting dead load
        worst = min(
            r.combinations,
            key=lambda c: (round(c.qf_low, 3), factors.get(c.combination, {}).get("D", 0.0) > counteracting + 1e-9),
        )
        placed = _as_placed(worst.combination, r, factors.get(worst.combination, {}), counteracting)
        small = -worst.qf_low < note_below  # held by the ordinary nailing: for the record, asking nothing
        out.append(
            Finding(
                "uplift",
                "record" if small else KINDS["uplift"].severity,
                wording.uplift(r.check.bearing, placed, -worst.qf_low, small, note_below, whose, display),
                bearing=r.check.bearing,
                member=r.check.member,
                numbers={"qf": worst.qf_low},
            )
        )
    return tuple(out)
