"""Finding and choosing rule packs: every pack file read by the standard it declares.

With ``registry.py`` this is the only module in ``standards/`` that knows every standard: the pack
reader of each standard is handed its own packs, and no standard imports this module.
"""

from __future__ import annotations

from pathlib import Path

from audit.core.errors import InputError, Location
from audit.core.located_yaml import Node, read_yaml_file
from audit.standards import minimum_bearing, plausible
from audit.standards.bundled import builtin_rules_dir
from audit.standards.packs import CombinationPack, PackCore, read_combination_pack
from audit.standards.registry import standard_named

CONNECTORS = "connectors"


def pack_files(extra_dirs: tuple[Path, ...] = ()) -> list[Path]:
    """Pack files: the reviewer's own folders first, then the bundled packs."""
    out: list[Path] = []
    for folder in (*extra_dirs, builtin_rules_dir()):
        if not folder.is_dir():
            raise InputError("rules folder does not exist", Location(str(folder)))
        out += sorted(folder.glob("*.yaml"))
    return out


def load_all_packs(
    extra_dirs: tuple[Path, ...] = (),
) -> tuple[dict[str, PackCore], dict[str, CombinationPack]]:
    resistance: dict[str, PackCore] = {}
    combos: dict[str, CombinationPack] = {}
    ids: dict[tuple[str, str], tuple[Path, Location]] = {}  # (kind, id) -> the file that gave it, and where
    for path in pack_files(extra_dirs):
        root = read_yaml_file(path)
        if not isinstance(root.value, dict):
            raise InputError("a rule pack must be a mapping", root.loc)
        kind = root.value.get("kind")
        kind_value = kind.value if kind else None
        if kind_value == "resistance":
            named = root.value.get("standard")
            standard = standard_named(
                str(named.value) if named is not None else "o86", named.loc if named else root.loc
            )
            pack = standard.read_pack(root, str(path))
            _refuse_same_id(("resistance", pack.id), path, root, ids)
            resistance[pack.id] = pack
        elif kind_value in (plausible.KIND, minimum_bearing.KIND) and path.parent == builtin_rules_dir():
            continue  # plausible ranges and minimum bearing lengths: bundled data, not a pack to select
        elif kind_value == CONNECTORS:
            continue  # a firm's connector pack (inputs/connectors.py): hangers, not a pack to select
        elif kind_value == "combinations":
            cpack = read_combination_pack(root, str(path))
            _refuse_same_id(("combinations", cpack.id), path, root, ids)
            combos[cpack.id] = cpack
        else:
            raise InputError("kind must be 'resistance' or 'combinations'", root.child_loc("kind"))
    return resistance, combos


def _refuse_same_id(
    key: tuple[str, str], path: Path, root: Node, ids: dict[tuple[str, str], tuple[Path, Location]]
) -> None:
    """Two packs of one id: whichever came first would win without a word, so neither is used. The
    reviewer's own pack is blamed (the bundled one is not theirs to change)."""
    node = root.value.get("id") if isinstance(root.value, dict) else None
    where = node.loc if node is not None else root.child_loc("id")
    if key not in ids:
        ids[key] = (path, where)
        return
    earlier, earlier_where = ids[key]
    bundled = path.parent == builtin_rules_dir()
    other, blamed = (path, earlier_where) if bundled else (earlier, where)
    whose = "a bundled pack" if bundled else "the pack"
    raise InputError(
        f"rule pack id '{key[1]}' is also the id of {whose} {other}; give each pack its own id (a pack of "
        "your own is selected by its id: copy the bundled one and give the copy a new id)",
        blamed,
    )


def select_packs(
    resistance_id: str,
    combinations_id: str,
    extra_dirs: tuple[Path, ...] = (),
    where: Location | None = None,
) -> tuple[PackCore, CombinationPack]:
    resistance, combos = load_all_packs(extra_dirs)
    if resistance_id not in resistance:
        raise InputError(f"unknown rule pack '{resistance_id}' (available: {', '.join(sorted(resistance))})", where)
    if combinations_id not in combos:
        raise InputError(
            f"unknown combination pack '{combinations_id}' (available: {', '.join(sorted(combos))})",
            where,
        )
    pack, cpack = resistance[resistance_id], combos[combinations_id]
    formats = standard_named(pack.standard).combination_formats
    if cpack.format not in formats:
        fitting = sorted(c.id for c in combos.values() if c.format in formats)
        raise InputError(
            f"combination pack '{cpack.id}' is {cpack.format}; rule pack {pack.id} ({pack.standard}) reads "
            f"{' or '.join(formats)} combinations (e.g. {', '.join(fitting) or 'none installed'})",
            where,
        )
    return pack, cpack
