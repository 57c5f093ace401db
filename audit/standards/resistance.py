"""The records and the evaluation loop every standard shares; no standard's own rule is here.

A standard turns each required check into its resistance inputs (the factors with their reasons)
and a duration rule (the factor that changes with the load combination); this module runs every
combination at every check, places the patterned cases, and keeps the governing one. O86, NDS and
EC5 import this module and never each other. The records are frozen slots dataclasses: a building
of 17k checks makes them by the hundred thousand.
"""

from __future__ import annotations

import itertools
import math
from collections.abc import Callable
from dataclasses import dataclass, field, replace
from typing import TypeVar

from audit.core.errors import ErrorCollector, InputError
from audit.engine.model import Material, Model, base_case
from audit.engine.take_down import Forces, force_floor, sizes_at
from audit.standards.checks import NEAR, CheckList, RequiredCheck
from audit.standards.combinations import LONG_TERM_CASE, LoadCombination, factored_force, load_combinations
from audit.standards.packs import CombinationPack, PackCore

PASS_LIMIT = 1.0 + 1e-9


# What a factor does in a bearing resistance, whichever standard names it (O86 / NDS / EN 1995-1-1):
STRENGTH = "strength"  # the specified strength perpendicular to grain, Pa: fcp / Fc-perp / fc,90,k
RESISTANCE = "resistance"  # a resistance factor, on the strength parallel to grain too: phi / phi (LRFD)
MATERIAL = "material"  # a partial factor the strength is divided by, parallel to grain too: gamma_M
COEFFICIENT = "coefficient"  # on the resistance perpendicular to grain only: 2/3 / KF, the 0.02 in limit
SERVICE = "service"  # wet or dry service: KScp / CM
TREATMENT = "treatment"  # KT
TEMPERATURE = "temperature"  # Ct
LENGTH = "length"  # changes with the bearing length: KB / Cb / kc,90
SIZE = "size"  # KZcp
INCISING = "incising"  # Ci
ANGLE = "angle"  # the angle between load and grain, stated (Hankinson or 6.2.2 use it through ``angle``)
DURATION = "duration"  # changes with the combination: KD / kmod (never among the inputs; ``evaluate`` finds it)
DERIVED = "derived"  # a value a calc prints that the standard derives from its factors (EC5 fc,90,d): claims only
# The order the product is taken in: coefficients, then the modified strength, the area, the factors after it.
_BEFORE = (COEFFICIENT, RESISTANCE, MATERIAL)
_ON_STRENGTH = (SERVICE, TREATMENT, TEMPERATURE)
_AFTER = (LENGTH, SIZE, INCISING)
ROLES = (STRENGTH, *_BEFORE, *_ON_STRENGTH, *_AFTER, ANGLE, DURATION)


@dataclass(frozen=True, slots=True)
class Factor:
    name: str  # the standard's own symbol: KB, Cb, kc,90
    value: float
    reason: str
    clause: str = ""
    role: str = ""  # what it does in the resistance (one of ROLES); "" only for a factor not yet placed


@dataclass(frozen=True, slots=True)
class Symbol:
    """A symbol a standard names a factor by: its role, and how a claim states it (None: a plain number, else the
    dimension it is read in)."""

    role: str
    dimension: str | None = None


def with_roles(factors: tuple[Factor, ...], symbols: dict[str, Symbol]) -> tuple[Factor, ...]:
    """The factors, each with the role its standard gives its symbol."""
    return tuple(f if f.role else replace(f, role=symbols[f.name].role) for f in factors)


def duration_symbol(symbols: dict[str, Symbol]) -> str:
    """The standard's symbol of its duration factor (KD, kmod), or "" where none applies (NDS on Fc-perp)."""
    return next((name for name, s in symbols.items() if s.role == DURATION), "")


def factor_values(inputs: ResistanceInputs, duration: float, symbols: dict[str, Symbol]) -> dict[str, float]:
    """Each factor's value by the standard's symbol at a check, with the duration factor of one combination: what
    a claim's factors are compared with."""
    out = {f.name: f.value for f in inputs.factors}
    if symbol := duration_symbol(symbols):
        out[symbol] = duration
    return out


@dataclass(frozen=True, slots=True)
class ResistanceInputs:
    """Everything a resistance depends on but the duration factor, each factor with its role and symbol; diagnosis
    and remedies change them one at a time (``changed``)."""

    factors: tuple[Factor, ...]  # every factor but the duration one, in the standard's order, each with its role
    area: float  # m^2: Ab, Ab' or Aef
    uses_duration: bool  # False where the product's report applies no duration factor
    fc_parallel: float | None  # Pa, strength parallel to grain as modified, for a load at an angle; else None
    angle: float | None
    # set from ``factors``: the products the resistance is taken from, in its order
    before: float = field(init=False, compare=False, repr=False)
    parallel: float = field(init=False, compare=False, repr=False)
    strength: float = field(init=False, compare=False, repr=False)
    on_strength: tuple[float, ...] = field(init=False, compare=False, repr=False)
    after: tuple[float, ...] = field(init=False, compare=False, repr=False)

    def __post_init__(self) -> None:
        before, parallel, strength = 1.0, 1.0, 0.0
        for f in self.factors:
            if f.role not in ROLES or f.role == DURATION:
                raise ValueError(f"factor {f.name} has no role in a resistance: {f.role!r}")
            if f.role in _BEFORE:
                value = 1.0 / f.value if f.role == MATERIAL else f.value
                before *= value
                if f.role != COEFFICIENT:
                    parallel *= value
            elif f.role == STRENGTH:
                strength = f.value
        object.__setattr__(self, "before", before)
        object.__setattr__(self, "parallel", parallel)
        object.__setattr__(self, "strength", strength)
        object.__setattr__(self, "on_strength", tuple(f.value for f in self.factors if f.role in _ON_STRENGTH))
        object.__setattr__(self, "after", tuple(f.value for f in self.factors if f.role in _AFTER))

    def factor(self, symbol: str) -> Factor | None:
        return next((f for f in self.factors if f.name == symbol), None)

    def value(self, symbol: str, default: float = 1.0) -> float:
        """The factor's value, ``default`` where the standard did not apply it here."""
        found = self.factor(symbol)
        return default if found is None else found.value

    def of_role(self, role: str) -> Factor | None:
        return next((f for f in self.factors if f.role == role), None)

    def changed(
        self, factors: tuple[Factor, ...] = (), area: float | None = None, angle: float | None = None
    ) -> ResistanceInputs:
        """The inputs with each given factor in place of the one of its symbol (added where there is none)."""
        given = {f.name: f for f in factors}
        kept = tuple(given.pop(f.name, f) for f in self.factors)
        return replace(
            self,
            factors=kept + tuple(given.values()),
            area=self.area if area is None else area,
            angle=self.angle if angle is None else angle,
        )

    def modified_strength(self, duration: float) -> float:
        """The strength with the duration factor and the factors on it (O86's Fcp, NDS's Fc-perp before Cb), Pa."""
        value = self.strength * (duration if self.uses_duration else 1.0)
        for factor in self.on_strength:
            value *= factor
        return value


# How a combination places one patterned case: "worst" (its envelope in the direction of its factor), "every"
# (every span loaded) or "least" (its least downward placing, where that is still downward).
Placing = tuple[tuple[str, str], ...]
WORST, EVERY_SPAN, LEAST = "worst", "every", "least"


@dataclass(frozen=True, slots=True)
class CombinationResult:
    combination: str
    duration: str
    qf: float  # N
    kd: float
    kd_reason: str
    qr: float  # N
    utilisation: float
    pattern: str = ""  # how the patterned cases were placed for this Qf ("" : every span loaded)
    qf_low: float = 0.0  # N, the least force under this combination: counteracting dead load, worst patterns
    placing: Placing = ()  # the placing of each patterned case that gave this row (() : each at its worst)


def placings(forces: Forces, envelope: dict, combo: LoadCombination) -> list[Placing]:
    """Every placing of the patterned cases a combination is evaluated with, the worst-force one first.

    The largest force is not always the worst Qf/Qr: where the duration factor falls with the share of
    short-term load (O86's long-term KD, dead-heavy members), less live or snow load can govern."""
    options = []
    floor = force_floor(sizes_at(forces, envelope))
    for case, env in sorted(envelope.items()):
        factor = combo.factors.get(case, 0.0)
        if factor == 0.0:
            continue
        worst, other = (env.high, env.low) if factor > 0 else (env.low, env.high)
        every = forces.get(case, 0.0)
        choice = [(case, WORST)]
        if abs(every - worst) > floor:
            choice.append((case, EVERY_SPAN))
        if factor > 0 and other > floor and min(abs(other - worst), abs(other - every)) > floor:
            choice.append((case, LEAST))
        options.append(choice)
    return [tuple(p) for p in itertools.product(*options)]


def placed_forces(forces: Forces, envelope: dict, combo: LoadCombination, placing: Placing = ()) -> tuple[Forces, str]:
    """The forces of each case as the combination places it: patterned cases at their envelope (``placing``: each
    case's placing, default its worst), with how they were placed."""
    placed = dict(forces)
    notes = []
    chosen = dict(placing)
    floor = force_floor(sizes_at(forces, envelope))
    for case, env in sorted(envelope.items()):
        factor = combo.factors.get(case, 0.0)
        how = chosen.get(case, WORST)
        if factor == 0.0 or how == EVERY_SPAN:
            continue
        high = (factor > 0) == (how == WORST)
        value = env.high if high else env.low
        placed[case] = value
        if abs(value - forces.get(case, 0.0)) > floor:
            least = ", its least here (worse through the load-duration factor)" if how == LEAST else ""
            notes.append(f"{case} {env.placing(high)}{least}")
    return placed, "; ".join(notes)


def least_force(forces: Forces, envelope: dict, combo: LoadCombination, counteracting: float) -> float:
    """The least force through the bearing under a combination: dead load at its counteracting factor where
    that is lower, every patterned case at its least favourable placing (uplift is looked for here)."""
    total = []
    for case, factor in combo.factors.items():
        if case == LONG_TERM_CASE:
            factor = min(factor, counteracting) if forces.get(case, 0.0) > 0 else factor
        env = envelope.get(case)
        if env is None:
            total.append(factor * forces.get(case, 0.0))
        else:
            total.append(factor * (env.low if factor > 0 else env.high))
    return math.fsum(total)


@dataclass(frozen=True, slots=True)
class CheckResult:
    check: RequiredCheck
    material: str
    inputs: ResistanceInputs
    factors: tuple[Factor, ...]  # phi, fcp, KScp, KT, KB, KZcp (and 2/3): value and reason
    area_reason: str
    combinations: tuple[CombinationResult, ...]
    governing: CombinationResult
    uplift: tuple[str, ...]  # combinations in which the bearing force is upward
    passes: bool


def fcp_on_face(check: RequiredCheck, material: Material) -> tuple[float, str]:
    """fcp on the face the check bears on, and how it was chosen (glulam has a compression and a tension face).

    For a layup installed as designed a beam's top face, where loads land, is its compression
    face and its underside, on its supports, its tension face; a near-support check loads both
    and takes the lesser.
    """
    compression = material.fcp if material.fcp is not None else 0.0
    if material.family != "glulam":
        return compression, ""
    tension = material.fcp_tension_face
    if tension is None:
        return compression, ", one value for both faces"
    if check.kind == NEAR:
        value = min(compression, tension)
        return value, (
            f", lesser of the compression face ({compression / 1e6:.2f} MPa) and tension face "
            f"({tension / 1e6:.2f} MPa): the load passes through both"
        )
    if check.face == "top":
        return compression, ", compression-face laminations (loads on the beam's top face)"
    return tension, ", tension-face laminations (the beam's underside on its support)"


def resistance(inputs: ResistanceInputs, kd: float) -> float:
    """The product every standard here states its bearing resistance as: coefficients, resistance and partial
    factors, the strength with its duration factor and the factors on it, the area, and the factors after it
    (O86: (2/3) phi fcp (KD KScp KT) Ab KB KZcp; NDS: KF phi Fc-perp CM Ct Ab Cb Ci; EC5: fc,90,k kmod / gamma_M
    Aef kc,90), with Hankinson's formula for a load at an angle to the grain."""
    kd_used = kd if inputs.uses_duration else 1.0
    qr = inputs.before * inputs.modified_strength(kd) * inputs.area
    for factor in inputs.after:
        qr *= factor
    if inputs.fc_parallel is None or inputs.angle is None:
        return qr
    pr = inputs.parallel * inputs.fc_parallel * kd_used * inputs.area
    s, c = math.sin(inputs.angle), math.cos(inputs.angle)
    return pr * qr / (pr * s * s + qr * c * c)


def _principal_present(combo: LoadCombination, forces: Forces, floor: float = 0.0) -> bool:
    """A combination whose principal load is absent here only repeats another; skip it.

    The principal is the case with the largest load factor other than dead load (dead load
    itself for a dead-only combination).
    """
    return any(abs(forces.get(case, 0.0)) > floor for case in combo.principal_cases)


def _wind_absent(combo: LoadCombination, forces: Forces, envelope: dict, floor: float = 0.0) -> bool:
    """A combination with wind at a check no wind reaches only repeats the one without it: skip it."""
    wind = [case for case, factor in combo.factors.items() if factor and base_case(case) == "W"]
    return bool(wind) and all(abs(forces.get(case, 0.0)) <= floor and case not in envelope for case in wind)


DurationRule = Callable[[Forces, LoadCombination], tuple[float, str]]


def evaluate(
    check: RequiredCheck,
    inputs: ResistanceInputs,
    combos: tuple[LoadCombination, ...],
    duration: DurationRule,
    unloaded_factor: float,
    forces: Forces | None = None,
    counteracting: float = 1.0,
    patterned: bool = True,
) -> tuple[tuple[CombinationResult, ...], CombinationResult, tuple[str, ...]]:
    """Every combination's Qf, duration factor and resistance at the check; the governing one; the combinations
    with uplift. ``duration`` gives the standard's duration (or modification) factor of a combination;
    ``forces`` replaces the check's own (diagnosis); ``patterned`` False ignores pattern loading."""
    forces = check.forces if forces is None else forces
    envelope = check.envelope if patterned else {}
    results = []
    reasons = []  # kept aside: only the governing combination's reason is stored (memory on large buildings)
    uplift = []
    floor = force_floor(sizes_at(forces, envelope))  # relative to the load here: alike for scaled loads
    for combo in combos:
        if not _principal_present(combo, forces, floor) or _wind_absent(combo, forces, envelope, floor):
            continue
        low = least_force(forces, envelope, combo, counteracting)
        if low < -floor:
            uplift.append(combo.name)
        best: CombinationResult | None = None
        best_reason = ""
        for placing in placings(forces, envelope, combo) if envelope else [()]:
            placed, pattern = placed_forces(forces, envelope, combo, placing)
            qf = factored_force(placed, combo)
            kd, kd_reason = duration(placed, combo)
            qr = resistance(inputs, kd)
            utilisation = max(qf, 0.0) / qr
            row = CombinationResult(combo.name, combo.duration, qf, kd, "", qr, utilisation, pattern, low, placing)
            if best is None or row.utilisation > best.utilisation + 1e-12:
                best, best_reason = row, kd_reason
        assert best is not None
        results.append(best)
        reasons.append(best_reason)
    if not results:
        qr = resistance(inputs, unloaded_factor)
        results.append(CombinationResult("no load", "standard", 0.0, 1.0, "", qr, 0.0))
        reasons.append("no load reaches this bearing")
    index = max(range(len(results)), key=lambda i: results[i].utilisation)
    results[index] = replace(results[index], kd_reason=reasons[index])
    return tuple(results), results[index], tuple(uplift)


InputsOf = Callable[[RequiredCheck], tuple[ResistanceInputs, tuple[Factor, ...], str]]


def resist_each(
    checklist: CheckList,
    model: Model,
    cpack: CombinationPack,
    inputs_of: InputsOf,
    duration_of: Callable[[RequiredCheck, ResistanceInputs], DurationRule],
    unloaded_of: Callable[[RequiredCheck], float],
) -> tuple[CheckResult, ...]:
    """Every check's result under any standard: its inputs and reasons, each combination, the governing one.

    Errors in the inputs of several checks (a missing fc, a wet factor) are reported together."""
    combos = load_combinations(model, cpack)
    out = []
    errors = ErrorCollector()
    for check in checklist.checks:
        try:
            inputs, factors, area_reason = inputs_of(check)
        except InputError as exc:
            errors.extend(exc)
            continue
        results, governing, uplift = evaluate(
            check,
            inputs,
            combos,
            duration_of(check, inputs),
            unloaded_of(check),
            counteracting=cpack.counteracting_dead.value,
        )
        out.append(
            CheckResult(
                check=check,
                material=model.members[check.member].material,
                inputs=inputs,
                factors=factors,
                area_reason=area_reason,
                combinations=results,
                governing=governing,
                uplift=uplift,
                passes=governing.utilisation <= PASS_LIMIT,
            )
        )
    errors.raise_if_any()
    return tuple(out)


PackType = TypeVar("PackType", bound=PackCore)


def pack_as(pack: PackCore, kind: type[PackType]) -> PackType:
    """The pack as its standard's own type (a standard only ever receives its own packs)."""
    if not isinstance(pack, kind):
        raise TypeError(f"rule pack {pack.id} is a {pack.standard} pack, not a {kind.__name__}")
    return pack


@dataclass(frozen=True, slots=True)
class ResistanceSlip:
    """A standard's own slip in a resistance, as the reconciler recomputes it: its name, what the calc did, the
    inputs it changes and any value it would print besides them."""

    name: str
    text: str
    factors: tuple[Factor, ...] = ()  # each in place of the factor of its symbol (added where there is none)
    duration: float | None = None  # the duration factor it takes (None: the one of the loads)
    area: float | None = None  # m^2
    angle: float | None = None  # rad
    implies: dict[str, float] = field(default_factory=dict)  # other values it would print (a contact width)

    def inputs(self, inputs: ResistanceInputs) -> ResistanceInputs:
        return inputs.changed(self.factors, self.area, self.angle)
