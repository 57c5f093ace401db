"""The standard interface: what a design standard contributes to a review.

A standard (CSA O86, US NDS, EN 1995-1-1) is one module that provides an object with this
shape, registered in ``registry.py``; its rule packs declare ``standard: <id>``. The engine
knows geometry and statics and no standard; everything a standard decides is asked here: which
checks a contact requires, how each check resists and why, its clauses and its memo wording.
Adding a standard is its module, its packs and its tests (see the contributor guide).
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any, Protocol

if TYPE_CHECKING:
    from audit.core.located_yaml import Node
    from audit.engine.model import Model
    from audit.engine.take_down import TakeDown
    from audit.standards.checks import CheckList
    from audit.standards.packs import CombinationPack, PackCore
    from audit.standards.resistance import CheckResult, ResistanceInputs, ResistanceSlip, Symbol


class Standard(Protocol):
    @property
    def id(self) -> str:  # as packs name it: standard: o86
        ...

    @property
    def title(self) -> str:  # as the memo names it
        ...

    @property
    def check_kinds(self) -> dict[str, str]:  # the kinds of check it requires -> the memo's words for each
        ...

    @property
    def length_factor(self) -> str:  # the name of its factor that changes with the bearing length (KB, Cb, kc,90)
        ...

    @property
    def symbols(self) -> dict[str, Symbol]:  # its own symbol of each factor -> the factor's role, how claims state it
        ...

    @property
    def column_symbols(
        self,
    ) -> tuple[str, str]:  # its duration factor and the strength it modifies, as outputs name them
        ...

    @property
    def force_symbols(self) -> tuple[str, str]:  # its symbols of the force on a check and its resistance (Qf, Qr)
        ...

    @property
    def combination_formats(self) -> tuple[str, ...]:  # formats of combination pack it reads
        ...

    @property
    def claim_headers(self) -> dict[str, str]:  # claim field -> the header pattern of its calc sheets
        ...

    def read_pack(self, root: Node, path: str) -> PackCore: ...

    def list_checks(self, model: Model, flow: TakeDown, pack: PackCore, readings: dict[str, str]) -> CheckList: ...

    def resist(
        self, checklist: CheckList, model: Model, pack: PackCore, cpack: CombinationPack
    ) -> tuple[CheckResult, ...]: ...

    def formula(self, kind: str) -> str: ...

    def claim_values(self, inputs: ResistanceInputs, duration: float) -> dict[str, float]:
        """The value of each symbol a claim may state (its factors, and what it derives from them, EC5's fc,90,d)
        at a check under one duration factor."""
        ...

    def assumption_lines(self, review: Any) -> dict[str, str]: ...

    def resistance_variants(self, result: CheckResult, model: Model, pack: PackCore, kd: float) -> list[ResistanceSlip]:
        """The standard's own slips in a resistance, each with the inputs it changes ('kd' for the duration factor);
        ``kd``: the duration factor of the loads the calc used. The reconciler recomputes each through the
        standard's resistance and names those that reproduce a claim."""
        ...

    def duration_reason(
        self, check: Any, forces: dict[str, float], combination: Any, model: Model, pack: PackCore
    ) -> str:
        """Why the load-duration (or modification) factor took its value at a check under one combination."""
        ...
