"""A model with its layout expanded, written out as a model file of the explicit format.

``explicit_model_text`` writes the sections the model was read from, one entry per line with a
comment saying where it came from: reviewing that file gives the same outputs as reviewing the
layout. The model is read (and checked) by ``read_model``, which expands the layout once.
"""

from __future__ import annotations

import json
import re
from functools import lru_cache
from pathlib import Path

import yaml

from audit.core.located_yaml import Node, read_yaml_file
from audit.inputs.expand_layout import Sections
from audit.inputs.read_model import build_model_and_sections

_PLAIN = re.compile(r"^[A-Za-z0-9_][A-Za-z0-9_ .\-/+()'*]*$")


@lru_cache(maxsize=65536)
def _plain_ok(text: str) -> bool:
    if not _PLAIN.match(text) or text != text.strip() or "  " in text:
        return False
    try:
        return yaml.safe_load(text) == text
    except yaml.YAMLError:
        return False


def flow(node: Node) -> str:
    """A node as one line of YAML flow style, reading back to the same values and text."""
    value = node.value
    if isinstance(value, dict):
        return "{" + ", ".join(f"{_key(k)}: {flow(v)}" for k, v in value.items()) + "}"
    if isinstance(value, list):
        return "[" + ", ".join(flow(v) for v in value) + "]"
    if value is None:
        return "null"
    if isinstance(value, str):
        return value if _plain_ok(value) else json.dumps(value, ensure_ascii=False)
    return node.raw or str(value)


def _key(key: str) -> str:
    return key if _plain_ok(key) else json.dumps(key, ensure_ascii=False)


def explicit_model_text(root: Node, sections: Sections, source: str, shown_as: str = "") -> str:
    """The model with its layout expanded, as a model file of the explicit format."""
    top = root.value
    lines = [
        f"# The explicit model of {shown_as or source}, written by bearing-audit expand.",
        "# Every member, bearing and load the layout placed, found or shared is written out, each after",
        "# a comment saying where it came from; reviewing this file gives the same outputs as the layout.",
    ]
    for key in ("project", "materials"):
        if key in top:
            lines.append(f"{key}:")
            lines += [f"  {_key(k)}: {flow(v)}" for k, v in top[key].value.items()]
    if sections.frame is not None:
        lines.append("layout:  # levels and grids only, for the plans; everything else is written out below")
        lines += [f"  {_key(k)}: {flow(v)}" for k, v in sections.frame.value.items()]
    for key, items in (("members", sections.members), ("bearings", sections.bearings), ("loads", sections.loads)):
        lines.append(f"{key}:" if items else f"{key}: []")
        for item in items:
            where = sections.origin.get(id(item))
            if where:
                if shown_as and where.startswith(source):
                    where = shown_as + where[len(source) :]  # the file's name, wherever it was read from
                lines.append(f"  # {where}")
            lines.append(f"  - {flow(item)}")
    return "\n".join(lines) + "\n"


def explicit_model_file(path: Path, rules_dirs: tuple[Path, ...] = (), rule_pack: str | None = None) -> str:
    """Read and check a model (every error it would give a review), then write it out explicit."""
    return explicit_model_with_warnings(path, rules_dirs, rule_pack)[0]


def explicit_model_with_warnings(
    path: Path, rules_dirs: tuple[Path, ...] = (), rule_pack: str | None = None
) -> tuple[str, tuple[str, ...]]:
    """The explicit model, and the warnings a review of it would give (an area no member reaches, ...)."""
    root = read_yaml_file(path)
    # the entries the model was read from: the layout is expanded once, for the check and the writing
    model, _, _, sections = build_model_and_sections(root, str(path), rules_dirs, rule_pack)
    return explicit_model_text(root, sections, str(path), path.name), model.warnings
