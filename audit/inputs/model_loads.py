"""The model's ``loads``: point and line loads on members, specified or factored, with their durations."""

from __future__ import annotations

from audit.core.errors import ErrorCollector
from audit.core.located_yaml import Node
from audit.engine.model import FACTORED_PREFIX, STORAGE_LIVE, WIND_PRESSURE, WIND_SUCTION, FactoredGroup, Load, Member
from audit.inputs.fields import FieldReader, list_items
from audit.inputs.model_keys import LIVE_KINDS, LOAD_KEYS, WIND_KEYS
from audit.inputs.model_members import KnownMembers
from audit.standards.packs import DURATIONS, CombinationPack


def read_loads(
    node: Node, known: KnownMembers, combos: CombinationPack, errors: ErrorCollector
) -> tuple[tuple[Load, ...], dict[str, FactoredGroup]]:
    out: list[Load] = []
    groups: dict[str, FactoredGroup] = {}
    ids: set[str] = set()
    for index, item in enumerate(list_items(node, "loads", errors)):
        f = FieldReader(item, LOAD_KEYS, errors, "load")
        member_id = f.text("member")
        kind = f.choice("type", ("point", "uniform"))
        if not f.ok:
            continue
        found = known.resolve(member_id, f.loc("member"), errors)
        if found is None:
            if member_id in known.broken:
                _check_load_values(f, kind, combos, errors)  # its own errors too, in the same pass
            continue
        member = found
        load_id = f.text("id", required=False) or f"load{index + 1}"
        if load_id in ids:
            errors.add(f"duplicate load id '{load_id}'", f.loc("id"))
            continue
        ids.add(load_id)
        dimension = "force" if kind == "point" else "line_load"
        if member.vertical and kind != "point":
            errors.add(f"'{member_id}' is vertical: give its loads as type: point (axial)", f.loc("type"))
            continue
        geometry = _load_geometry(f, kind, member)
        if geometry is None:
            continue
        at, start, end, length, width = geometry
        note = f.text("note", required=False)
        has_specified, has_factored = f.has("specified"), f.has("factored")
        if has_specified == has_factored:
            errors.add("give either 'specified' (loads by case) or 'factored' (with 'duration')", item.loc)
            continue
        entries: list[tuple[str, float]] = []
        live_kind = f.choice("live", LIVE_KINDS, required=False, default="occupancy")
        if has_specified:
            s = FieldReader(f.map["specified"], set(combos.cases), errors, "specified loads")
            for case in s.map:
                if case == "W" and isinstance(s.map[case].value, dict):
                    entries += _wind_both_ways(s.map[case], dimension, errors)
                elif case in combos.cases:
                    value = s.quantity(case, dimension)
                    if value is not None:
                        entries.append((STORAGE_LIVE if case == "L" and live_kind == "storage" else case, value))
            if f.has("live") and "L" not in s.map:
                errors.add("'live' says what kind of live load this is: give an L load too", f.loc("live"))
            if not s.map and s.ok:
                errors.add("no load cases given", f.loc("specified"))
            if not s.ok:
                continue
            for key in ("duration", "label"):
                if f.has(key):
                    errors.add(f"'{key}' is only for factored loads", f.loc(key))
        else:
            value = f.quantity("factored", dimension)
            duration = f.choice("duration", DURATIONS)
            if value is None or not f.ok:
                continue
            label = f.text("label", required=False) or f"factored, {duration} term"
            prior = groups.get(label)
            if prior is not None and prior.duration != duration:
                errors.add(
                    f"factored loads labelled '{label}' must share one duration (another says {prior.duration})",
                    f.loc("duration"),
                )
                continue
            groups[label] = FactoredGroup(label, duration)
            entries.append((FACTORED_PREFIX + label, value))
        for case, value in entries:
            out.append(Load(load_id, member_id, kind, case, value, at, start, end, length, width, note, item.loc))
    return tuple(out), groups


def _check_load_values(f: FieldReader, kind: str, combos: CombinationPack, errors: ErrorCollector) -> None:
    """The values of a load on a member with an error of its own: read for their own errors only."""
    dimension = "force" if kind == "point" else "line_load"
    if f.has("specified"):
        s = FieldReader(f.map["specified"], set(combos.cases), errors, "specified loads")
        for case in s.map:
            if case == "W" and isinstance(s.map[case].value, dict):
                _wind_both_ways(s.map[case], dimension, errors)
            elif case in combos.cases:
                s.quantity(case, dimension)
    elif f.has("factored"):
        f.quantity("factored", dimension)


def _wind_both_ways(node: Node, dimension: str, errors: ErrorCollector) -> list[tuple[str, float]]:
    """W given as {pressure, suction}: each a size; pressure acts down, suction up."""
    w = FieldReader(node, WIND_KEYS, errors, "wind both ways")
    out = []
    for key, case, sign in (("pressure", WIND_PRESSURE, 1.0), ("suction", WIND_SUCTION, -1.0)):
        if w.has(key):
            value = w.quantity(key, dimension)
            if value is not None:
                out.append((case, sign * abs(value)))
    if not w.map and w.ok:
        errors.add("give W as pressure, suction or both, e.g. {pressure: 0.4 kN/m, suction: 0.9 kN/m}", node.loc)
    return out


def _load_geometry(
    f: FieldReader, kind: str, member: Member
) -> tuple[float | None, float | None, float | None, float | None, float | None] | None:
    length = f.quantity("length", "length", required=False, positive=True)
    width = f.quantity("width", "length", required=False, positive=True)
    if member.vertical:
        for key in ("at", "from", "to"):
            if f.has(key):
                f.errors.add(f"'{member.id}' is vertical: its loads act at its top, give no '{key}'", f.loc(key))
                return None
        return None, None, None, length, width
    if kind == "point":
        at = f.quantity("at", "length")
        if at is None:
            return None
        return at, None, None, length, width
    start = f.quantity("from", "length", required=False)
    end = f.quantity("to", "length", required=False)
    start = 0.0 if start is None else start
    end = member.length if end is None else end
    if end <= start:
        f.errors.add("'to' must be beyond 'from'", f.loc("to"))
        return None
    return None, start, end, None, None


def check_loads_within_members(members: dict[str, Member], loads: tuple[Load, ...], errors: ErrorCollector) -> None:
    for load in loads:
        member = members[load.member]
        positions = [p for p in (load.at, load.start, load.end) if p is not None]
        if any(not -1e-9 <= p <= member.length + 1e-9 for p in positions):
            errors.add(
                f"load lies outside member '{member.id}' (length {member.length * 1000:.0f} mm)",
                load.loc,
            )
