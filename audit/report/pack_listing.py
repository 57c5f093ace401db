"""The listing of `bearing-audit rules`: every rule pack, each value with its clause, source and status."""

from __future__ import annotations

from collections.abc import Iterator

from audit.standards import plausible
from audit.standards.bundled import builtin_rules_dir
from audit.standards.packs import CombinationPack, PackCore
from audit.standards.registry import standard_named


def pack_lines(resistance: dict[str, PackCore], combos: dict[str, CombinationPack]) -> Iterator[str]:
    """The lines of the listing: resistance packs, combination packs, then the plausible ranges."""
    for pack in resistance.values():
        yield f"resistance pack {pack.id}: {pack.title}\n  edition: {pack.edition}\n  file: {pack.path}"
        yield f"  provenance: {pack.provenance}"
        kinds = standard_named(pack.standard).check_kinds.values()
        yield f"  standard: {pack.standard}; checks: {'; '.join(kinds)}"
        for name, value in pack.all_sourced():
            yield f"  {name} = {shown_value(name, value.value)}  [{value.clause}; {value.source}; {value.status}]"
            if name in pack.choices:
                for reading, text in pack.choices[name].readings.items():
                    mark = "default" if reading == value.value else "choose with project.readings"
                    yield f"      {reading} ({mark}): {text}"
    for cpack in combos.values():
        yield f"combinations pack {cpack.id}: {cpack.title}\n  edition: {cpack.edition}\n  file: {cpack.path}"
        yield f"  provenance: {cpack.provenance}"
        for c in cpack.combinations:
            yield f"  {c.name} ({c.duration} term)  [{c.source.clause}; {c.source.source}; {c.source.status}]"
        extras = [("counteracting_dead", cpack.counteracting_dead), ("storage_live.companion", cpack.storage_companion)]
        extras += [(f"patterns.{case}", value) for case, value in cpack.patterns.items()]
        for name, value in extras:
            shown = " or ".join(f"{v:g}" for v in value.value) if isinstance(value.value, tuple) else f"{value.value:g}"
            yield f"  {name} = {shown}  [{value.clause}; {value.source}; {value.status}]"
    bounds = plausible.ranges()
    yield f"plausible ranges (a value outside is refused)\n  file: {builtin_rules_dir() / plausible.FILE}"
    named = [(f"fcp of {fam}", r) for fam, r in bounds.fcp.items()] + [(f"fc of {f}", r) for f, r in bounds.fc.items()]
    named += [("load factor", bounds.load_factor), ("section dimension", bounds.section)]
    for name, r in named:
        yield f"  {name}: {r.shown()}  [{r.source}]"


def shown_value(name: str, value: object) -> str:
    """A pack value in the unit its listing names: lengths in mm, strengths in MPa, 4 figures."""
    if hasattr(value, "points"):
        in_mm = name.startswith("kb.")  # KB is tabulated by bearing length; KZcp by a plain ratio
        return ", ".join(f"{x * 1000:g} mm -> {y:.4g}" if in_mm else f"{x:.4g} -> {y:.4g}" for x, y in value.points)
    if isinstance(value, dict) and name.startswith("fc"):
        return ", ".join(f"{key} {shown_value(name, item)}" for key, item in value.items())
    if isinstance(value, float):
        if name.startswith("fc"):
            return f"{value / 1e6:g} MPa"
        if name.startswith("kb.m"):
            return f"{value * 1000:g} mm"
        return f"{value:.4g}"
    return str(value)
