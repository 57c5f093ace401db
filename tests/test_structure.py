"""The shape of `audit/`: no import cycles, no import upward in the stage order, no module too long.

Every import is read with `ast`, function-local ones included (a local import that closes a loop is
still a loop: the modules still need each other). The stage order is the one the contributor guide
and the target layout give: core < engine < standards < inputs < review < report < cli.
"""

from __future__ import annotations

import ast
from pathlib import Path

import pytest

AUDIT = Path(__file__).resolve().parents[1] / "audit"

STAGES = ("core", "engine", "standards", "inputs", "review", "report", "cli")

MAX_LINES = 500

# Cycles other work still has to close: a cycle all of whose modules lie in one of these packages is
# let through. Nothing new goes here; the integrator deletes a line once its cycle is gone.
CYCLES_FOR_NOW: set[str] = set()

# Upward imports other work still has to remove, as (importer, imported).
UPWARD_FOR_NOW: set[tuple[str, str]] = set()

# Modules other work still has to split (each by its own branch); the integrator deletes a line
# once its module is under MAX_LINES. Nothing new goes here: split the module instead.
TOO_LONG_FOR_NOW = {
    "audit/report/memo.py",  # the letter's own work
    "audit/inputs/pdf/extract.py",  # the PDF reader's own work
}


def module_name(path: Path, root: Path = AUDIT) -> str:
    parts = path.relative_to(root.parent).with_suffix("").parts
    return ".".join(parts[:-1] if parts[-1] == "__init__" else parts)


def modules(root: Path = AUDIT) -> dict[str, Path]:
    return {module_name(p, root): p for p in sorted(root.rglob("*.py"))}


def imported(tree: ast.AST, name: str, is_package: bool, known: set[str]) -> set[str]:
    """Every audit module a module's code imports, at any depth of the tree (function bodies too)."""
    package = name if is_package else name.rpartition(".")[0]
    found: set[str] = set()
    for node in ast.walk(tree):
        if isinstance(node, ast.Import):
            targets = [alias.name for alias in node.names]
        elif isinstance(node, ast.ImportFrom):
            base = node.module or ""
            if node.level:
                anchor = package.split(".")[: len(package.split(".")) - node.level + 1]
                base = ".".join([*anchor, base] if base else anchor)
            # `from audit.standards import plausible` imports the module audit.standards.plausible
            targets = [f"{base}.{a.name}" if f"{base}.{a.name}" in known else base for a in node.names]
        else:
            continue
        for target in targets:
            while target and target not in known:  # `import audit.x.y` names a module; trim to one we have
                target = target.rpartition(".")[0]
            if target.startswith("audit") and target != name:
                found.add(target)
    return found


def import_graph(root: Path = AUDIT) -> dict[str, set[str]]:
    found = modules(root)
    known = set(found)
    return {
        name: imported(ast.parse(path.read_text(encoding="utf-8")), name, path.name == "__init__.py", known)
        for name, path in found.items()
    }


def cycles(graph: dict[str, set[str]]) -> list[list[str]]:
    """The strongly connected groups of more than one module (Tarjan), each sorted: every import cycle."""
    index: dict[str, int] = {}
    low: dict[str, int] = {}
    stack: list[str] = []
    on_stack: set[str] = set()
    groups: list[list[str]] = []

    def visit(node: str) -> None:
        index[node] = low[node] = len(index)
        stack.append(node)
        on_stack.add(node)
        for nxt in sorted(graph.get(node, ())):
            if nxt not in index:
                visit(nxt)
                low[node] = min(low[node], low[nxt])
            elif nxt in on_stack:
                low[node] = min(low[node], index[nxt])
        if low[node] == index[node]:
            group = []
            while True:
                top = stack.pop()
                on_stack.discard(top)
                group.append(top)
                if top == node:
                    break
            if len(group) > 1:
                groups.append(sorted(group))

    for node in sorted(graph):
        if node not in index:
            visit(node)
    return sorted(groups)


def stage(name: str) -> int | None:
    """The stage a module belongs to (audit.review.rounds -> review), None for the package's own files."""
    parts = name.split(".")
    return STAGES.index(parts[1]) if len(parts) > 1 and parts[1] in STAGES else None


def upward_imports(graph: dict[str, set[str]]) -> list[str]:
    found = []
    for name, targets in sorted(graph.items()):
        own = stage(name)
        for target in sorted(targets):
            theirs = stage(target)
            if own is not None and theirs is not None and theirs > own:
                found.append(f"{name} imports {target} ({STAGES[theirs]} is above {STAGES[own]})")
    return found


def _tolerated(cycle: list[str]) -> bool:
    return any(all(m.startswith(package + ".") for m in cycle) for package in CYCLES_FOR_NOW)


def test_no_import_cycles_between_audit_modules():
    assert [c for c in cycles(import_graph()) if not _tolerated(c)] == []


def test_the_cycles_let_through_are_still_there():
    # a package whose cycles are closed leaves CYCLES_FOR_NOW, so the list only shrinks
    found = cycles(import_graph())
    gone = [p for p in CYCLES_FOR_NOW if not any(all(m.startswith(p + ".") for m in c) for c in found)]
    assert gone == [], "these packages have no cycle any more: remove them from CYCLES_FOR_NOW"


def test_no_module_imports_a_later_stage():
    graph = import_graph()
    for importer, imported in UPWARD_FOR_NOW:
        graph[importer] = graph.get(importer, set()) - {imported}
    assert upward_imports(graph) == []


def test_the_upward_imports_let_through_are_still_there():
    graph = import_graph()
    gone = [(a, b) for a, b in UPWARD_FOR_NOW if b not in graph.get(a, set())]
    assert gone == [], "these imports are gone: remove them from UPWARD_FOR_NOW"


def _lines(path: Path) -> int:
    return len(path.read_text(encoding="utf-8").splitlines())


def test_no_module_is_longer_than_the_limit_outside_the_allowlist():
    lengths = {path.relative_to(AUDIT.parent).as_posix(): _lines(path) for path in modules().values()}
    over = {p: n for p, n in lengths.items() if n > MAX_LINES and p not in TOO_LONG_FOR_NOW}
    assert over == {}


def test_every_module_on_the_allowlist_is_still_too_long():
    # a module split (or renamed) leaves TOO_LONG_FOR_NOW, so the list only shrinks
    fine = [p for p in TOO_LONG_FOR_NOW if not (AUDIT.parent / p).is_file() or _lines(AUDIT.parent / p) <= MAX_LINES]
    assert fine == [], "these modules are split: remove them from TOO_LONG_FOR_NOW"


def write_package(root: Path, files: dict[str, str]) -> Path:
    for rel, text in files.items():
        path = root / "audit" / rel
        path.parent.mkdir(parents=True, exist_ok=True)
        path.write_text(text, encoding="utf-8")
    return root / "audit"


@pytest.mark.parametrize(
    "b_text",
    [
        "from audit.core.a import x\n",
        "def f():\n    from audit.core import a\n    return a\n",  # a function-local import closes it too
        "from . import a\n",
        "import audit.core.a\n",
    ],
)
def test_a_cycle_through_two_modules_is_found_however_it_is_written(tmp_path, b_text):
    root = write_package(
        tmp_path,
        {"__init__.py": "", "core/__init__.py": "", "core/a.py": "from audit.core.b import y\n", "core/b.py": b_text},
    )
    assert cycles(import_graph(root)) == [["audit.core.a", "audit.core.b"]]


def test_a_function_local_import_from_a_later_stage_is_upward(tmp_path):
    root = write_package(
        tmp_path,
        {
            "__init__.py": "",
            "engine/__init__.py": "",
            "engine/model.py": "def f():\n    from audit.review.review import r\n    return r\n",
            "review/__init__.py": "",
            "review/review.py": "r = 1\n",
        },
    )
    assert upward_imports(import_graph(root)) == [
        "audit.engine.model imports audit.review.review (review is above engine)"
    ]
