"""A standard is a plug-in: one defined here, in the tests, with its own pack, reviews a model end to end.

The "toy" standard is invented for this test (no real standard states it): Qr = phi_b fb Ab, with phi_b from its
pack and no duration factor. Adding it touches only this module, its pack (written below) and one registry line,
which the fixture makes: ``monkeypatch.setitem(registry.STANDARDS, TOY.id, TOY)``.

Hand values: B (89 x 235 mm) spans 2911 mm between post centres under D 2, L 3 kN/m over its 3 m: each post takes
D 3, L 4.5 kN; Qf = 1.25 x 3 + 1.5 x 4.5 = 10.5 kN (NBCC 2015 as recalled); Qr = 0.7 x 5.0 MPa x 89 x 89 mm²
= 27.72 kN.
"""

from __future__ import annotations

import json
from dataclasses import dataclass, field, replace
from typing import Any

import pytest
import yaml

from audit.core.errors import ErrorCollector, InputError
from audit.core.located_yaml import Node
from audit.engine.model import Model
from audit.engine.take_down import Forces, TakeDown
from audit.standards import registry
from audit.standards.checks import LOCAL, CheckList, RequiredCheck, local_only
from audit.standards.packs import (
    PACK_HEAD_KEYS,
    CombinationPack,
    PackCore,
    PackReader,
    Sourced,
    read_core_fields,
    refuse_unknown_fields,
)
from audit.standards.resistance import (
    RESISTANCE,
    STRENGTH,
    CheckResult,
    Factor,
    ResistanceInputs,
    ResistanceSlip,
    Symbol,
    factor_values,
    fcp_on_face,
    pack_as,
    resist_each,
    with_roles,
)
from tests.verification.standards import contact_model

SYMBOLS = {"fb": Symbol(STRENGTH, "stress"), "phi_b": Symbol(RESISTANCE)}


@dataclass(frozen=True)
class ToyPack(PackCore):
    phi_b: Sourced

    def all_sourced(self) -> list[tuple[str, Sourced]]:
        return [*self.core_sourced(), ("phi_b", self.phi_b)]


def read_toy_pack(root: Node, path: str) -> ToyPack:
    errors = ErrorCollector()
    r = PackReader(errors)
    refuse_unknown_fields(root, (*PACK_HEAD_KEYS, "timber_families", "clauses", "fcp", "fc", "uplift", "phi_b"), "toy",
                          errors)  # fmt: skip
    core = read_core_fields(root, r, errors)
    phi_b = r.sourced(r.mapping(root, "phi_b"), lambda node, _parent: float(node.value))
    errors.raise_if_any()
    if phi_b is None:
        raise InputError("rule pack lacks phi_b", root.loc)
    return ToyPack(id=r.text(root, "id"), title=r.text(root, "title", ""), edition="", provenance="", path=path,
                   standard="toy", choices={}, phi_b=phi_b, **core)  # fmt: skip


def toy_inputs(check: RequiredCheck, model: Model, pack: ToyPack) -> tuple[ResistanceInputs, tuple[Factor, ...], str]:
    material = model.materials[model.members[check.member].material]
    fb, _ = fcp_on_face(check, material)
    factors = with_roles(
        (
            Factor("phi_b", pack.phi_b.value, f"phi_b = {pack.phi_b.value:.2f}"),
            Factor("fb", fb, f"fb = {fb / 1e6} MPa"),
        ),
        SYMBOLS,
    )
    c = check.contact
    area = c.length * c.width
    return ResistanceInputs(factors, area, False, None, None), factors, f"Ab = {area * 1e6:,.0f} mm²"


def _no_duration(_forces: Forces, _combo: Any) -> tuple[float, str]:
    return 1.0, "no duration factor in the toy standard"


@dataclass(frozen=True)
class _Toy:
    id: str = "toy"
    title: str = "the toy standard"
    check_kinds: dict[str, str] = field(default_factory=lambda: {LOCAL: "toy bearing"})
    length_factor: str = ""
    symbols: dict[str, Symbol] = field(default_factory=lambda: SYMBOLS)
    column_symbols: tuple[str, str] = ("no duration factor", "fb")
    force_symbols: tuple[str, str] = ("Pd", "Pr")
    combination_formats: tuple[str, ...] = ("limit-states",)
    claim_headers: dict[str, str] = field(default_factory=dict)

    def read_pack(self, root: Node, path: str) -> ToyPack:
        return read_toy_pack(root, path)

    def list_checks(self, model: Model, flow: TakeDown, pack: PackCore, readings: dict[str, str]) -> CheckList:
        return local_only(model, flow, pack)

    def resist(
        self, checklist: CheckList, model: Model, pack: PackCore, cpack: CombinationPack
    ) -> tuple[CheckResult, ...]:
        p = pack_as(pack, ToyPack)
        return resist_each(checklist, model, cpack, lambda check: toy_inputs(check, model, p),
                           lambda check, inputs: _no_duration, lambda check: 1.0)  # fmt: skip

    def formula(self, kind: str) -> str:
        return "Qr = phi_b fb Ab"

    def claim_values(self, inputs: ResistanceInputs, duration: float) -> dict[str, float]:
        return factor_values(inputs, duration, SYMBOLS)

    def assumption_lines(self, review: Any) -> dict[str, str]:
        return {"duration": "The toy standard applies no duration factor."}

    def resistance_variants(self, result: CheckResult, model: Model, pack: PackCore, kd: float) -> list[ResistanceSlip]:
        phi = result.inputs.factor("phi_b")
        assert phi is not None
        return [ResistanceSlip("phi-b-left-out", "phi_b was left out", (replace(phi, value=1.0),))]

    def duration_reason(
        self, check: RequiredCheck, forces: Forces, combination: Any, model: Model, pack: PackCore
    ) -> str:
        return _no_duration(forces, combination)[1]


TOY = _Toy()

PACK = {
    "kind": "resistance",
    "standard": "toy",
    "id": "toy-1",
    "title": "the toy standard (invented for a test)",
    "timber_families": {"value": ["sawn_lumber"], "source": "invented", "status": "invented for a test"},
    "clauses": {"sawn_lumber": {"value": {"local": "T 1", "near_support": "T 1"}, "source": "invented",
                                "status": "invented for a test"}},
    "fcp": {"sawn_lumber": {"Spruce-Pine-Fir": {"value": "5.0 MPa", "grades": [], "source": "invented",
                                                "status": "invented for a test"}}},
    "uplift": {"note_below": {"value": "0.5 kN", "source": "invented", "status": "invented for a test"}},
    "phi_b": {"value": 0.7, "clause": "T 2", "source": "invented", "status": "invented for a test"},
}  # fmt: skip


@pytest.fixture
def toy(monkeypatch, tmp_path):
    monkeypatch.setitem(registry.STANDARDS, TOY.id, TOY)  # the one registry line
    rules = tmp_path / "rules"
    rules.mkdir()
    (rules / "toy-1.yaml").write_text(yaml.safe_dump(PACK, sort_keys=False), encoding="utf-8")
    model = contact_model("nds-asd")  # Spruce-Pine-Fir No.2, as the toy pack names it
    model["project"].update({"rule_pack": "toy-1", "combinations": "nbcc-2015-recalled"})
    path = tmp_path / "model.yaml"
    path.write_text(yaml.safe_dump(model, sort_keys=False), encoding="utf-8")
    return path, rules


def test_a_standard_defined_in_the_tests_reviews_a_model_with_its_own_pack(toy, tmp_path, run_cli):
    model, rules = toy
    claims = tmp_path / "claims.yaml"
    claims.write_text(yaml.safe_dump({"claims": [
        {"id": "c1", "location": "B/P1", "member": "B", "Qf": "10.5 kN", "Qr": "27.7 kN", "factors": {"phi_b": 0.7}},
        {"id": "c2", "location": "B/P2", "member": "B", "Qf": "10.5 kN", "Qr": "39.6 kN", "factors": {"phi_b": 1.0}},
    ]}), encoding="utf-8")  # fmt: skip
    out = tmp_path / "out.json"
    result = run_cli("review", model, "--claims", claims, "--rules-dir", rules, "--json", out, "--memo",
                     tmp_path / "memo.html")  # fmt: skip
    assert result.exit_code in (0, 1), result.output
    data = json.loads(out.read_text(encoding="utf-8"))
    checks = {c["id"]: c for c in data["checks"]}
    assert set(checks) == {"B/P1:B", "B/P2:B"}  # the steel posts get no timber check
    for c in checks.values():
        assert c["Qf_kN"] == pytest.approx(10.5, abs=1e-3)
        assert c["Qr_kN"] == pytest.approx(0.7 * 5.0e6 * 0.089 * 0.089 / 1000, abs=1e-3)
        assert {f["name"] for f in c["factors"]} == {"phi_b", "fb"}
    found = {(f["kind"], f["claim"]): f["message"] for f in data["findings"]}
    assert ("confirmed", "c1") in found and ("resistance-differs", "c2") in found
    differs = found[("resistance-differs", "c2")]
    assert "phi_b claimed 1.000, recomputed 0.700" in differs and "phi_b was left out" in differs
    assert "the toy standard" in (tmp_path / "memo.html").read_text(encoding="utf-8")


def test_the_toy_standards_claims_refuse_o86_symbols(toy, tmp_path, run_cli):
    model, rules = toy
    claims = tmp_path / "claims.yaml"
    claims.write_text("claims:\n  - location: B/P1\n    Qr: 27 kN\n    factors: {KB: 1.1}\n", encoding="utf-8")
    result = run_cli("review", model, "--claims", claims, "--rules-dir", rules)
    assert result.exit_code == 2
    assert "'KB' is a symbol of CSA O86, not of the toy standard" in result.output and "phi_b" in result.output
