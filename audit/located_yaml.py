"""Read YAML into a tree that remembers where every value stood.

PyYAML's composer gives nodes with start marks; we turn them into small wrappers so any
reader can name file, line, column and key path in an error. Aliases are followed within a
node budget (a crafted "alias bomb" is refused), duplicate keys are refused, and the text is
decoded as UTF-8 with a clear error when it is not.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

import yaml

from audit.errors import InputError, Location

MAX_NODES = 2_000_000
MAX_FILE_BYTES = 64 * 1024 * 1024


@dataclass(slots=True)
class Node:
    """A YAML value with its location; ``value`` is a dict, list or scalar."""

    value: Any
    loc: Location
    key_locs: dict[str, Location] = field(default_factory=dict)

    def child_loc(self, key: str | int) -> Location:
        return Location(self.loc.file, self.loc.line, self.loc.column, join_key(self.loc.key, key))


def join_key(path: str, key: str | int) -> str:
    if isinstance(key, int):
        return f"{path}[{key}]"
    return f"{path}.{key}" if path else str(key)


def read_yaml_file(path: Path | str) -> Node:
    """Read a YAML file into located nodes; raise InputError for any unreadable file."""
    path = Path(path)
    name = str(path)
    try:
        size = path.stat().st_size
    except OSError as exc:
        raise InputError(f"cannot read file: {exc.strerror or exc}", Location(name)) from None
    if size > MAX_FILE_BYTES:
        raise InputError(f"file is {size} bytes, over the {MAX_FILE_BYTES} byte limit", Location(name))
    raw = path.read_bytes()
    try:
        text = raw.decode("utf-8-sig")
    except UnicodeDecodeError as exc:
        line = raw[: exc.start].count(b"\n") + 1
        raise InputError(
            f"file is not UTF-8 text (byte {exc.start} cannot be decoded)", Location(name, line, 1)
        ) from None
    return read_yaml_text(text, name)


# libyaml's parser when PyYAML was built with it (much faster); it gives the same nodes and marks
_LOADER = getattr(yaml, "CSafeLoader", yaml.SafeLoader)


def read_yaml_text(text: str, name: str) -> Node:
    loader = _LOADER(text)
    try:
        root = loader.get_single_node()
    except yaml.MarkedYAMLError as exc:
        mark = exc.problem_mark or exc.context_mark
        line, col = (mark.line + 1, mark.column + 1) if mark else (0, 0)
        what = exc.problem or exc.context or "not valid YAML"
        raise InputError(f"not valid YAML: {what}", Location(name, line, col)) from None
    except yaml.YAMLError as exc:
        raise InputError(f"not valid YAML: {exc}", Location(name)) from None
    except RecursionError:
        raise InputError("YAML is nested too deeply", Location(name)) from None
    finally:
        loader.dispose()
    if root is None:
        raise InputError("file is empty", Location(name, 1, 1))
    budget = [MAX_NODES]
    try:
        return _convert(root, name, "", loader, budget)
    except RecursionError:
        raise InputError("YAML is nested too deeply", _loc(root, name, "")) from None


def _loc(node: yaml.Node, name: str, key: str) -> Location:
    return Location(name, node.start_mark.line + 1, node.start_mark.column + 1, key)


def _convert(node: yaml.Node, name: str, key: str, loader, budget: list[int]) -> Node:
    budget[0] -= 1
    if budget[0] < 0:
        raise InputError("document expands to too many values (aliases nested too deeply?)", _loc(node, name, key))
    loc = _loc(node, name, key)
    if isinstance(node, yaml.MappingNode):
        out: dict[str, Node] = {}
        key_locs: dict[str, Location] = {}
        for k_node, v_node in node.value:
            if k_node.tag == "tag:yaml.org,2002:merge":
                raise InputError("YAML merge keys (<<) are not supported", _loc(k_node, name, key))
            if not isinstance(k_node, yaml.ScalarNode):
                raise InputError("a mapping key must be plain text", _loc(k_node, name, key))
            k = str(k_node.value)
            child_key = join_key(key, k)
            if k in out:
                raise InputError(f"duplicate key '{k}'", _loc(k_node, name, child_key))
            key_locs[k] = _loc(k_node, name, child_key)
            out[k] = _convert(v_node, name, child_key, loader, budget)
        return Node(out, loc, key_locs)
    if isinstance(node, yaml.SequenceNode):
        items = [_convert(item, name, join_key(key, i), loader, budget) for i, item in enumerate(node.value)]
        return Node(items, loc)
    if node.tag == _STR_TAG:
        return Node(node.value, loc)  # most scalars are text: no constructor needed
    try:
        value = loader.construct_object(node, deep=True)
    except (yaml.YAMLError, ValueError, OverflowError) as exc:
        raise InputError(f"cannot read value: {exc}", loc) from None
    return Node(value, loc)


_STR_TAG = "tag:yaml.org,2002:str"
