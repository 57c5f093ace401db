"""Load combinations as a review takes them from a combination pack: the pack's, each wind direction, storage live
load at its own factor, and one per group of factored loads; their names as calcs print them; the factored force."""

from __future__ import annotations

import math
import re
from dataclasses import dataclass, field

from audit.engine.model import FACTORED_PREFIX, STORAGE_LIVE, WIND_PRESSURE, WIND_SUCTION, Model, base_case
from audit.engine.take_down import Forces
from audit.standards.packs import CombinationPack

LONG_TERM_CASE = "D"


@dataclass(frozen=True, slots=True)
class LoadCombination:
    name: str
    factors: dict[str, float]  # load case (or factored key) -> load factor
    duration: str  # permanent | standard | short
    clause: str = ""
    factored: bool = False  # a group of already-factored loads
    # the cases of the principal load, with the cases split from it (set from ``factors``)
    principal_cases: tuple[str, ...] = field(init=False, compare=False, repr=False)

    def __post_init__(self) -> None:
        object.__setattr__(self, "principal_cases", _principal_cases(self.factors))


def _principal_cases(factors: dict[str, float]) -> tuple[str, ...]:
    """The cases of the principal load (the largest factor but dead load's; dead load for a dead-only one), with the
    cases split from it (W:suction, L:storage)."""
    live = {case: f for case, f in factors.items() if case != LONG_TERM_CASE}
    if not live:
        return (LONG_TERM_CASE,)
    principal = base_case(max(live, key=lambda case: live[case]))
    return tuple(case for case in live if base_case(case) == principal)


def load_combinations(model: Model, cpack: CombinationPack) -> tuple[LoadCombination, ...]:
    """The pack's combinations for specified loads, plus one per group of factored loads.

    Where the model gives wind as pressure and suction, a combination with wind is taken once
    each way; storage live load takes the live-load factor where live load leads and the pack's
    storage companion factor where it accompanies.
    """
    cases = {load.case for load in model.loads}
    out = []
    for c in cpack.combinations:
        factors = dict(c.factors)
        live = factors.get("L", 0.0)
        if STORAGE_LIVE in cases and live and STORAGE_LIVE not in factors:  # a combination may state its own
            leads = live >= max(f for case, f in factors.items() if case != LONG_TERM_CASE)
            factors[STORAGE_LIVE] = live if leads else cpack.storage_companion.value
        name = labelled(c.name, factors, "L" in cases)
        wind = factors.get("W", 0.0)
        directions = [d for d in (WIND_PRESSURE, WIND_SUCTION) if d in cases]
        if wind and directions:
            for direction in directions:
                way = direction.split(":")[1]
                out.append(
                    LoadCombination(f"{name} (wind {way})", {**factors, direction: wind}, c.duration, c.source.clause)
                )
            continue
        out.append(LoadCombination(name, factors, c.duration, c.source.clause))
    for group in sorted(model.factored_groups.values(), key=lambda g: g.label):
        out.append(LoadCombination(group.label, {FACTORED_PREFIX + group.label: 1.0}, group.duration, "", True))
    return tuple(out)


LOAD_TERM = re.compile(r"(?:(?<=^)|(?<=\+))(\d+(?:\.\d+)?)([A-Z])(?=\+|$|\s)")


def factor_text(value: float) -> str:
    """A load factor as combination names print it: 1.0, 0.5, 1.05."""
    text = f"{value:.2f}".rstrip("0")
    return text + "0" if text.endswith(".") else text


def labelled(name: str, factors: dict[str, float], plain_live: bool) -> str:
    """The pack's name of a combination, stating storage live load at the factor it takes where that is not the
    live-load factor the name prints: '1.25D+1.5S+1.0L' where all live load is storage, else '+1.0L (storage)'."""
    storage, live = factors.get(STORAGE_LIVE), factors.get("L", 0.0)
    if storage is None or abs(storage - live) < 1e-9:
        return name
    terms = [m for m in LOAD_TERM.finditer(name) if abs(float(m.group(1)) - live) < 1e-9 and m.group(2) != "D"]
    live_term = next((m for m in terms if m.group(2) in ("L", "Q")), None)
    letter = live_term.group(2) if live_term else "L"
    if live_term is not None and not plain_live:
        return name[: live_term.start(1)] + factor_text(storage) + name[live_term.end(1) :]
    return f"{name}+{factor_text(storage)}{letter} (storage)"


def counteracted(name: str, dead: float, counteracting: float) -> str:
    """The name of a combination as uplift is looked for: its dead-load factor lowered to the counteracting one
    ('1.25D+1.4W' -> '0.9D+1.4W'); the name unchanged where the dead load is already at or below it."""
    if dead <= counteracting + 1e-9:
        return name
    match = LOAD_TERM.match(name)
    if match is None or match.group(2) not in ("D", "G") or abs(float(match.group(1)) - dead) > 1e-9:
        return f"{name} with {factor_text(counteracting)}D"
    return factor_text(counteracting) + name[match.end(1) :]


def factored_force(forces: Forces, combo: LoadCombination) -> float:
    return math.fsum(factor * forces.get(case, 0.0) for case, factor in combo.factors.items())
