"""The firm's connector packs: hangers it has entered from its own verified listings.

Nothing of any maker is bundled. A connector pack is a YAML file in a ``--rules-dir`` folder with
``kind: connectors`` (the format is in ``fixtures/demo-framing/rules/connectors.yaml``); the pack loader
skips it, and this module reads every one in the folders given, so a model's bearings can name a hanger.
"""

from __future__ import annotations

from pathlib import Path

from audit.core.errors import ErrorCollector
from audit.core.located_yaml import Node, read_yaml_file
from audit.core.suggest import did_you_mean
from audit.engine.model import DURATIONS, HANGER_KINDS, Hanger
from audit.inputs.fields import FieldReader, list_items

KIND = "connectors"
PACK_KEYS = {"kind", "id", "title", "provenance", "hangers"}
HANGER_KEYS = {"id", "kind", "seat", "flange_length", "capacity", "source", "status", "note"}
SEAT_KEYS = {"width", "length"}


def connector_files(rules_dirs: tuple[Path, ...]) -> list[Path]:
    """The YAML files of the given folders that declare ``kind: connectors``."""
    out = []
    for folder in rules_dirs:
        if not folder.is_dir():
            continue  # the pack loader names a missing folder
        for path in sorted(folder.glob("*.yaml")):
            root = read_yaml_file(path)
            kind = root.value.get("kind") if isinstance(root.value, dict) else None
            if kind is not None and kind.value == KIND:
                out.append(path)
    return out


def read_connectors(rules_dirs: tuple[Path, ...]) -> dict[str, Hanger]:
    """Every hanger of every connector pack in the folders, by id; a hanger id given twice is an error."""
    hangers: dict[str, Hanger] = {}
    errors = ErrorCollector()
    for path in connector_files(rules_dirs):
        for hanger in _read_pack(read_yaml_file(path), errors):
            if hanger.id in hangers:
                errors.add(f"hanger id '{hanger.id}' is also given at {hangers[hanger.id].loc}", hanger.loc)
                continue
            hangers[hanger.id] = hanger
    errors.raise_if_any()
    return hangers


def _read_pack(root: Node, errors: ErrorCollector) -> list[Hanger]:
    f = FieldReader(root, PACK_KEYS, errors, "connector pack")
    pack_id = f.text("id")
    if not f.ok or "hangers" not in f.map:
        if f.ok:
            errors.add("missing field 'hangers'", root.child_loc("hangers"))
        return []
    out = []
    for item in list_items(f.map["hangers"], "hangers", errors):
        hanger = _read_hanger(item, pack_id, errors)
        if hanger is not None:
            out.append(hanger)
    return out


def _read_hanger(node: Node, pack_id: str, errors: ErrorCollector) -> Hanger | None:
    f = FieldReader(node, HANGER_KEYS, errors, "hanger")
    if not f.ok:
        return None
    hanger_id = f.text("id", limit=120)
    kind = f.choice("kind", HANGER_KINDS)
    source = f.text("source")
    status = f.text("status")
    seat = FieldReader(f.map["seat"], SEAT_KEYS, errors, "hanger seat") if f.has("seat") else None
    if seat is None:
        errors.add("missing field 'seat' ({width, length} of the hanger's seat)", node.child_loc("seat"))
        return None
    width = seat.quantity("width", "length", positive=True)
    length = seat.quantity("length", "length", positive=True)
    flange = f.quantity("flange_length", "length", required=kind == "top-flange", positive=True)
    if kind == "face-mount" and f.has("flange_length"):
        errors.add("a face-mount hanger has no top flange: give no 'flange_length'", f.loc("flange_length"))
        return None
    capacity = _read_capacity(f, errors)
    if not (f.ok and seat.ok) or width is None or length is None or capacity is None:
        return None
    return Hanger(hanger_id, kind, width, length, flange, capacity, source, status, pack_id, node.loc)


def _read_capacity(f: FieldReader, errors: ErrorCollector) -> tuple[tuple[str, float], ...] | None:
    """The listed capacity per load duration, e.g. {standard: 7.2 kN, short: 8.3 kN}."""
    if not f.has("capacity"):
        errors.add("missing field 'capacity' (listed capacity per load duration)", f.loc("capacity"))
        return None
    node = f.map["capacity"]
    if not isinstance(node.value, dict) or not node.value:
        errors.add("capacity gives the listed capacity per load duration, e.g. {standard: 7.2 kN}", node.loc)
        return None
    c = FieldReader(node, set(DURATIONS), errors, "hanger capacity")
    out = []
    for duration in DURATIONS:
        if c.has(duration):
            value = c.quantity(duration, "force", positive=True)
            if value is not None:
                out.append((duration, value))
    return tuple(out) if c.ok else None


def unknown_hanger(name: str, hangers: dict[str, Hanger]) -> str:
    """The error for a bearing naming a hanger no connector pack holds."""
    where = ", ".join(sorted(hangers)) if hangers else "none: give --rules-dir with the firm's connector pack"
    hint = did_you_mean(name, hangers) or f" (hangers known: {where})"
    return f"unknown hanger '{name}'{hint}"
