"""Where the bundled rule packs are: the one place that knows the folder."""

from __future__ import annotations

from importlib import resources
from pathlib import Path


def builtin_rules_dir() -> Path:
    """The bundled packs: installed as ``audit.rules``; a source checkout has them in rules/."""
    try:
        return Path(str(resources.files("audit.rules")))
    except ModuleNotFoundError:
        return Path(__file__).resolve().parents[2] / "rules"
