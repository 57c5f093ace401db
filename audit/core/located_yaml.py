"""Read YAML into a tree that remembers where every value stood.

PyYAML's composer gives nodes with start marks; we turn them into small wrappers so any
reader can name file, line, column and key path in an error. Aliases are followed within a
node budget (a crafted "alias bomb" is refused), duplicate keys are refused, and the text is
decoded as UTF-8 with a clear error when it is not.
"""

from __future__ import annotations

import gc
import re
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import yaml

from audit.core.errors import InputError, Location
from audit.core.outfiles import require_input_file

MAX_NODES = 2_000_000
# A model is a handful of levels deep; our own limit fires long before the parser's, so the
# message is ours whatever the parser's release
MAX_DEPTH = 64
MAX_FILE_BYTES = 64 * 1024 * 1024
# distinct plain scalars remembered per file: the repeats (sizes, materials, keys' values) come
# early; unique ids past the cap are resolved each time rather than held for the whole read
PLAIN_CACHE = 50_000


@dataclass(slots=True)
class Node:
    """A YAML value with where it stood; ``value`` is a dict of Nodes, a list of Nodes or a scalar.

    Locations are made only when asked for (an error), which keeps reading large files cheap.
    """

    value: Any
    file: str
    line: int
    column: int
    key: str
    key_marks: dict[str, tuple[int, int]] | None = None
    raw: str = ""  # a scalar's text as written, so ids such as NO, ON or 1e3 stay text where text is wanted

    @property
    def loc(self) -> Location:
        return Location(self.file, self.line, self.column, self.key)

    def child_loc(self, key: str | int) -> Location:
        return Location(self.file, self.line, self.column, join_key(self.key, key))

    def key_loc(self, key: str) -> Location:
        """Where a mapping key itself stands."""
        line, column = (self.key_marks or {}).get(key, (self.line, self.column))
        return Location(self.file, line, column, join_key(self.key, key))


def node_text(node: Node) -> str:
    """A scalar as text, as written: NO, ON, 1e3 and 2026-01-15 stay text where text is wanted."""
    return node.value if isinstance(node.value, str) else (node.raw or str(node.value))


def join_key(path: str, key: str | int) -> str:
    if isinstance(key, int):
        return f"{path}[{key}]"
    return f"{path}.{key}" if path else str(key)


def read_yaml_file(path: Path | str) -> Node:
    """Read a YAML file into located nodes; raise InputError for any unreadable file."""
    path = Path(path)
    name = str(path)
    size = require_input_file(path).st_size
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
    # the node trees are acyclic and short-lived: pausing the cycle collector while they are
    # built saves it from walking hundreds of thousands of young objects again and again
    enabled = gc.isenabled()
    gc.disable()
    try:
        return _read_yaml_text(text, name)
    finally:
        if enabled:
            gc.enable()


def _read_yaml_text(text: str, name: str) -> Node:
    loader = _LOADER(text)
    try:
        return _compose(loader, name)
    except yaml.MarkedYAMLError as exc:
        mark = exc.problem_mark or exc.context_mark
        line, col = (mark.line + 1, mark.column + 1) if mark else (0, 0)
        if mark is not None and flow_depth(text, mark.index) > MAX_DEPTH:
            # the parser refuses deep flow nesting before we see an event; word it ourselves
            raise InputError(f"YAML is nested more than {MAX_DEPTH} levels deep", Location(name, line, col)) from None
        what = exc.problem or exc.context or "not valid YAML"
        raise InputError(f"not valid YAML: {what}", Location(name, line, col)) from None
    except yaml.YAMLError as exc:
        raise InputError(f"not valid YAML: {exc}", Location(name)) from None
    except RecursionError:
        raise InputError("YAML is nested too deeply", Location(name)) from None
    finally:
        loader.dispose()


def flow_depth(text: str, end: int) -> int:
    """Greatest depth of flow brackets ([ and {) in text[:end], skipping quoted text and comments."""
    depth = deepest = 0
    quote = ""
    comment = False
    for ch in text[:end]:
        if comment:
            comment = ch != "\n"
        elif quote:
            quote = "" if ch == quote else quote
        elif ch in "'\"":
            quote = ch
        elif ch == "#":
            comment = True
        elif ch in "[{":
            depth += 1
            deepest = max(deepest, depth)
        elif ch in "]}":
            depth -= 1
    return deepest


def _loc_of(event: yaml.Event, name: str, key: str) -> Location:
    return Location(name, event.start_mark.line + 1, event.start_mark.column + 1, key)


class _Composer:
    """Builds Nodes straight from the parser's events, so no second tree of PyYAML nodes is held.

    Aliases share the anchored Node; the node budget counts every expansion, so a crafted
    "alias bomb" is refused instead of exhausting memory in the readers that walk the tree.
    """

    def __init__(self, loader, name: str) -> None:
        self.loader = loader
        self.name = name
        self.anchors: dict[str, tuple[Node, int]] = {}
        self.budget = MAX_NODES
        self.depth = 0
        # plain scalar text -> its value: keys and most values repeat ("130 mm", "SPF", true), and the
        # implicit-tag resolution (a few regular expressions) is the composer's dearest step. Exact:
        # with no path resolvers (the safe loader has none) a plain scalar's tag depends on its text only
        self.plain: dict[str, Any] = {}

    def spend(self, count: int, event: yaml.Event, key: str) -> None:
        self.budget -= count
        if self.budget < 0:
            raise InputError(
                "document expands to too many values (aliases nested too deeply?)", _loc_of(event, self.name, key)
            )

    def node(self, event: yaml.Event, key: str) -> tuple[Node, int]:
        self.depth += 1
        try:
            if self.depth > MAX_DEPTH:
                raise InputError(f"YAML is nested more than {MAX_DEPTH} levels deep", _loc_of(event, self.name, key))
            return self._node(event, key)
        finally:
            self.depth -= 1

    def _node(self, event: yaml.Event, key: str) -> tuple[Node, int]:
        if isinstance(event, yaml.AliasEvent):
            if event.anchor not in self.anchors:
                raise InputError(f"unknown alias *{event.anchor}", _loc_of(event, self.name, key))
            found, size = self.anchors[event.anchor]
            self.spend(size, event, key)
            return found, size
        self.spend(1, event, key)
        mark = event.start_mark
        if isinstance(event, yaml.ScalarEvent):
            value = self.scalar(event, key)
            result, size = Node(value, self.name, mark.line + 1, mark.column + 1, key, None, event.value), 1
        elif isinstance(event, yaml.SequenceStartEvent):
            self._refuse_tag(event, _SEQ_TAG, key)
            items: list[Node] = []
            size = 1
            while not isinstance(nxt := self.loader.get_event(), yaml.SequenceEndEvent):
                child, child_size = self.node(nxt, join_key(key, len(items)))
                items.append(child)
                size += child_size
            result = Node(items, self.name, mark.line + 1, mark.column + 1, key)
        elif isinstance(event, yaml.MappingStartEvent):
            self._refuse_tag(event, _MAP_TAG, key)
            result, size = self.mapping(event, key)
        else:
            raise InputError(f"unexpected YAML event {type(event).__name__}", _loc_of(event, self.name, key))
        if getattr(event, "anchor", None):
            self.anchors[event.anchor] = (result, size)
        return result, size

    def mapping(self, event: yaml.Event, key: str) -> tuple[Node, int]:
        out: dict[str, Node] = {}
        marks: dict[str, tuple[int, int]] = {}
        size = 1
        while not isinstance(k_event := self.loader.get_event(), yaml.MappingEndEvent):
            if not isinstance(k_event, yaml.ScalarEvent):
                raise InputError("a mapping key must be plain text", _loc_of(k_event, self.name, key))
            # only the text "<<" or an explicit tag can make a merge key; the resolver is asked only then
            if (k_event.value == "<<" or (k_event.tag and k_event.tag != "!")) and self._tag(k_event) == _MERGE_TAG:
                raise InputError("YAML merge keys (<<) are not supported", _loc_of(k_event, self.name, key))
            k = k_event.value
            child_key = join_key(key, k)
            if k in out:
                raise InputError(f"duplicate key '{k}'", _loc_of(k_event, self.name, child_key))
            marks[k] = (k_event.start_mark.line + 1, k_event.start_mark.column + 1)
            out[k], child_size = self.node(self.loader.get_event(), child_key)
            size += child_size
        mark = event.start_mark
        return Node(out, self.name, mark.line + 1, mark.column + 1, key, marks), size

    def _refuse_tag(self, event: yaml.Event, plain: str, key: str) -> None:
        tag = getattr(event, "tag", None)
        if tag and tag not in ("!", plain):
            raise InputError(f"YAML tag {tag} is not accepted; write the value plainly", _loc_of(event, self.name, key))

    def _tag(self, event: yaml.ScalarEvent, key: str = "") -> str:
        if event.tag and event.tag != "!":
            if event.tag not in _PLAIN_SCALAR_TAGS:
                raise InputError(
                    f"YAML tag {event.tag} is not accepted; write the value plainly", _loc_of(event, self.name, key)
                )
            return event.tag
        return self.loader.resolve(yaml.ScalarNode, event.value, event.implicit)

    def scalar(self, event: yaml.ScalarEvent, key: str) -> Any:
        plain = event.implicit[0] and (not event.tag or event.tag == "!")
        if plain:
            known = self.plain.get(event.value, _UNSEEN)
            if known is not _UNSEEN:
                return known  # read before: passed the checks, and str, int, float, bool, None or a date
        value = self._scalar(event, key)
        if plain and len(self.plain) < PLAIN_CACHE:
            self.plain[event.value] = value
        return value

    def _scalar(self, event: yaml.ScalarEvent, key: str) -> Any:
        bad = _CONTROL.search(event.value)
        if bad:
            raise InputError(
                f"text holds the control character U+{ord(bad.group()):04X}; remove it", _loc_of(event, self.name, key)
            )
        tag = self._tag(event, key)
        if tag == _STR_TAG:
            return event.value  # most scalars are text: no constructor needed
        constructor = self.loader.yaml_constructors.get(tag)
        if constructor is None:
            raise InputError(f"unsupported YAML tag {tag}", _loc_of(event, self.name, key))
        node = yaml.ScalarNode(tag, event.value, event.start_mark, event.end_mark, event.style)
        try:
            return constructor(self.loader, node)
        except (yaml.YAMLError, ValueError, OverflowError) as exc:
            raise InputError(f"cannot read value: {exc}", _loc_of(event, self.name, key)) from None


def _compose(loader, name: str) -> Node:
    composer = _Composer(loader, name)
    loader.get_event()  # stream start
    event = loader.get_event()
    if isinstance(event, yaml.StreamEndEvent):
        raise InputError("file is empty", Location(name, 1, 1))
    root, _ = composer.node(loader.get_event(), "")  # after the document start
    loader.get_event()  # document end
    extra = loader.get_event()
    if not isinstance(extra, yaml.StreamEndEvent):
        raise InputError("the file holds more than one YAML document", _loc_of(extra, name, ""))
    return root


_STR_TAG = "tag:yaml.org,2002:str"
_SEQ_TAG = "tag:yaml.org,2002:seq"
_MAP_TAG = "tag:yaml.org,2002:map"
_PLAIN_SCALAR_TAGS = frozenset(f"tag:yaml.org,2002:{t}" for t in ("str", "int", "float", "bool", "null"))
# C0 controls but tab, newline and carriage return; DEL; C1 controls
_CONTROL = re.compile("[\x00-\x08\x0b\x0c\x0e-\x1f\x7f-\x9f]")
_MERGE_TAG = "tag:yaml.org,2002:merge"
_UNSEEN = object()
