"""Shared helpers: build small models in a temporary folder and run the CLI in-process."""

from __future__ import annotations

import copy
from pathlib import Path

import pytest
import yaml
from typer.testing import CliRunner

from audit.cli import app

ROOT = Path(__file__).resolve().parent.parent
DEMO = ROOT / "fixtures" / "demo" / "model.yaml"

# A minimal valid model: a sawn joist on a glulam beam on two steel posts and a plate.
BASE_MODEL = {
    "project": {"title": "Test frame (fictional)", "date": "2026-01-15"},
    "materials": {
        "GL": {"family": "glulam", "species": "D.Fir-L", "grade": "24f-EX"},
        "SPF": {"family": "sawn_lumber", "species": "S-P-F", "grade": "No.2"},
        "STEEL": {"family": "steel"},
    },
    "members": [
        {"id": "B1", "material": "GL", "b": "130 mm", "d": "380 mm", "length": "6 m"},
        {"id": "C1", "material": "STEEL", "b": "150 mm", "d": "150 mm", "length": "3 m", "orientation": "vertical"},
        {"id": "C2", "material": "STEEL", "b": "150 mm", "d": "150 mm", "length": "3 m", "orientation": "vertical"},
        {"id": "J1", "material": "SPF", "b": "38 mm", "d": "235 mm", "length": "4 m"},
        {"id": "W1", "material": "SPF", "b": "140 mm", "d": "38 mm", "length": "5 m", "support": "continuous"},
    ],
    "bearings": [
        {"upper": {"member": "B1", "at": "75 mm"}, "lower": "C1"},
        {"upper": {"member": "B1", "at": "5925 mm"}, "lower": "C2"},
        {"upper": {"member": "J1", "at": "3935 mm"}, "lower": {"member": "B1", "at": "3 m"}},
        {"upper": {"member": "J1", "at": "65 mm"}, "lower": {"member": "W1", "at": "2 m"}},
    ],
    "loads": [
        {"id": "floor", "member": "J1", "type": "uniform", "specified": {"D": "1 kN/m", "L": "2 kN/m"}},
    ],
}


def base_model() -> dict:
    return copy.deepcopy(BASE_MODEL)


@pytest.fixture
def write_model(tmp_path):
    def _write(data: dict | str, name: str = "model.yaml") -> Path:
        path = tmp_path / name
        text = data if isinstance(data, str) else yaml.safe_dump(data, sort_keys=False)
        path.write_text(text, encoding="utf-8")
        return path

    return _write


@pytest.fixture
def run_cli():
    runner = CliRunner()

    def _run(*args: str):
        return runner.invoke(app, [str(a) for a in args], catch_exceptions=False)

    return _run


def review_dict(data: dict):
    """Run the engine on a model given as a dict (no file)."""
    from audit.core.located_yaml import read_yaml_text
    from audit.inputs.read_model import build_model
    from audit.review.review import review_built

    root = read_yaml_text(yaml.safe_dump(data, sort_keys=False), "model.yaml")
    model, pack, cpack = build_model(root, "model.yaml")
    return review_built(model, pack, cpack)


def claims_from(items: list[dict]):
    from audit.core.located_yaml import read_yaml_text
    from audit.inputs.read_claims import build_claims

    return build_claims(read_yaml_text(yaml.safe_dump({"claims": items}, sort_keys=False), "claims.yaml"))


def reconcile_dicts(model: dict, claims: list[dict]):
    from audit.review.reconcile import reconcile

    review = review_dict(model)
    claim_list = claims_from(claims)
    return review, claim_list, reconcile(review, claim_list)
