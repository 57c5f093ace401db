"""The standards bearing-audit implements, by the id their rule packs declare."""

from __future__ import annotations

from audit.core.errors import InputError, Location
from audit.standards.base import Standard
from audit.standards.ec5 import EC5
from audit.standards.nds import NDS
from audit.standards.o86 import O86

# Every standard bearing-audit implements: adding one is its module, its packs, its tests and a line here.
STANDARDS: dict[str, Standard] = {s.id: s for s in (O86, NDS, EC5)}
DEFAULT_STANDARD = "o86"  # the standard of a claims file read without a project


def standards() -> dict[str, Standard]:
    return STANDARDS


def standard_named(name: str, where: Location | None = None) -> Standard:
    found = standards().get(name)
    if found is None:
        raise InputError(f"unknown standard '{name}' (implemented: {', '.join(standards())})", where)
    return found
