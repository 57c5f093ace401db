"""The published JSON Schemas (`bearing-audit schema model|claims`) hold the readers' own vocabulary:
every key a reader accepts is in the schema, and the schema offers no key the reader refuses; the
words of the readers' choices (families, services, supports, durations) are the schema's enums."""

from __future__ import annotations

from typing import Any

import pytest

from audit.inputs import layout_records as layout
from audit.inputs import model_keys as model
from audit.inputs import read_claims as claims
from audit.inputs.area_loads import AREA_KEYS
from audit.inputs.schema import CLAIMS_SCHEMA, MODEL_SCHEMA
from audit.inputs.stud_walls import PACK_KEYS, STUD_KEYS
from audit.standards.packs import ALL_FAMILIES, DURATIONS, SERVICES
from audit.standards.registry import standards


def at(schema: dict[str, Any], *path: str) -> dict[str, Any]:
    """The schema node at a path of property names; 'items' and 'values' step into arrays and maps."""
    node = schema
    for step in path:
        node = _object_of(node)
        if step == "items":
            node = node["items"]
        elif step == "values":
            node = node["additionalProperties"]
        else:
            node = node["properties"][step]
    return _object_of(node)


def _object_of(node: dict[str, Any]) -> dict[str, Any]:
    """A node that may be given several ways (a member id or a mapping, ...): its mapping form."""
    for alternative in node.get("oneOf", ()):
        if "properties" in alternative:
            return alternative
    return node


def keys(schema: dict[str, Any], *path: str) -> set[str]:
    return set(at(schema, *path)["properties"])


def _named(value: object) -> str:
    return ".".join(value) if isinstance(value, tuple) and all(isinstance(s, str) for s in value) else ""


MODEL_MAPPINGS = [
    ((), model.TOP_KEYS),
    (("project",), model.PROJECT_KEYS),
    (("project", "tolerance"), model.TOLERANCE_KEYS),
    (("materials", "values"), model.MATERIAL_KEYS),
    (("members", "items"), model.MEMBER_KEYS),
    (("members", "items", "studs"), STUD_KEYS),
    (("members", "items", "studs", "packs", "items"), PACK_KEYS),
    (("bearings", "items"), model.BEARING_KEYS),
    (("bearings", "items", "upper"), model.SIDE_KEYS),
    (("bearings", "items", "lower"), model.SIDE_KEYS),
    (("loads", "items"), model.LOAD_KEYS),
    (("loads", "items", "specified", "values"), model.WIND_KEYS),
    (("layout",), layout.LAYOUT_KEYS),
    (("layout", "grids"), layout.GRID_KEYS),
    (("layout", "members", "items"), layout.MEMBER_KEYS),
    (("layout", "members", "items", "from"), layout.POINT_KEYS),
    (("layout", "runs", "items"), layout.RUN_KEYS),
    (("layout", "posts", "items"), layout.POST_KEYS),
    (("layout", "walls", "items"), layout.WALL_KEYS),
    (("layout", "walls", "items", "sole"), layout.SOLE_KEYS),
    (("layout", "areas", "items"), AREA_KEYS),
]

CLAIMS_MAPPINGS = [
    ((), claims.FILE_KEYS),
    (("claims", "items"), claims.CLAIM_KEYS),
    (("claims", "items", "where"), claims.WHERE_KEYS),
    # every standard's symbols: the reader takes those of the project's standard
    (("claims", "items", "factors"), {name for s in standards().values() for name in claims.claim_factors(s)}),
]


@pytest.mark.parametrize(
    ("path", "accepted"), MODEL_MAPPINGS, ids=lambda v: ".".join(v) if isinstance(v, tuple) else ""
)
def test_every_mapping_of_the_model_schema_names_exactly_the_keys_the_reader_accepts(path, accepted):
    assert keys(MODEL_SCHEMA, *path) == set(accepted)


@pytest.mark.parametrize(
    ("path", "accepted"), CLAIMS_MAPPINGS, ids=lambda v: ".".join(v) if isinstance(v, tuple) else ""
)
def test_every_mapping_of_the_claims_schema_names_exactly_the_keys_the_reader_accepts(path, accepted):
    assert keys(CLAIMS_SCHEMA, *path) == set(accepted)


@pytest.mark.parametrize(
    ("path", "words"),
    [
        (("materials", "values", "family"), ALL_FAMILIES),
        (("project", "service"), SERVICES),
        (("members", "items", "service"), SERVICES),
        (("members", "items", "support"), model.SUPPORTS),
        (("loads", "items", "live"), model.LIVE_KINDS),
        (("loads", "items", "duration"), DURATIONS),
    ],
    ids=_named,
)
def test_the_schema_offers_the_readers_own_words_for_each_choice(path, words):
    assert set(at(MODEL_SCHEMA, *path)["enum"]) == set(words)


def test_the_schema_offers_the_factors_a_material_may_list():
    assert set(at(MODEL_SCHEMA, "materials", "values", "factors")["items"]["enum"]) == set(model.ENGINEERED_FACTORS)


def test_the_schema_accepts_the_aliases_the_reader_takes_on_a_member():
    jsonschema = pytest.importorskip("jsonschema")
    document = {
        "project": {"title": "Aliases"},
        "materials": {"SPF": {"family": "sawn_lumber", "species": "SPF", "grade": "No.1/No.2"}},
        "members": [
            {"id": "B1", "material": "SPF", "b": "89 mm", "d": "235 mm", "length": "3 m", "aliases": ["B-1"]},
        ],
        "bearings": [],
    }
    jsonschema.validate(document, MODEL_SCHEMA)
