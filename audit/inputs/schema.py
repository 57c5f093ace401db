"""JSON Schemas of the input files, so editors can validate and complete them.

The schema describes the shape; the reader (read_model, read_claims) is the authority and
checks what a schema cannot (units, references, geometry).
"""

from __future__ import annotations

from typing import Any

from audit.inputs.read_claims import claim_factors
from audit.standards.registry import standards

QUANTITY = {"type": "string", "description": "a number with a unit, e.g. '130 mm', '5.125 in', '12 kN'"}
LENGTH = {**QUANTITY, "description": "a length with a unit, e.g. '130 mm' or '5.5 in'"}
FORCE = {**QUANTITY, "description": "a force with a unit, e.g. '12.5 kN' or '2800 lbf'"}
CASES = ["D", "L", "S", "W", "E"]


def _obj(props: dict[str, Any], required: list[str], description: str = "") -> dict[str, Any]:
    out: dict[str, Any] = {"type": "object", "properties": props, "required": required, "additionalProperties": False}
    if description:
        out["description"] = description
    return out


SIDE = {
    "oneOf": [
        {"type": "string", "description": "member id"},
        _obj(
            {
                "member": {"type": "string"},
                "at": {**LENGTH, "description": "bearing centre along a horizontal member, from its start"},
                "length": {**LENGTH, "description": "bearing length along this member's grain"},
                "width": {**LENGTH, "description": "seat width across this member's grain (no wider than its b)"},
                "angle": {**QUANTITY, "description": "angle between load and grain, e.g. '60 deg' (default 90 deg)"},
                "notch": {**LENGTH, "description": "depth cut out of this member at the bearing (a notched end)"},
            },
            ["member"],
        ),
    ]
}

CALC_FORCE = {
    "type": "object",
    "description": "the calc's own force through the bearing per load case: the take-down is skipped for it",
    "propertyNames": {"enum": CASES},
    "additionalProperties": FORCE,
}
POINT = {
    "description": "a grid point 'A/1', coordinates [x, y], or {grid: A/1, dx, dy}",
    "oneOf": [
        {"type": "string"},
        {"type": "array", "items": LENGTH, "minItems": 2, "maxItems": 2},
        _obj({"grid": {"type": "string"}, "dx": LENGTH, "dy": LENGTH}, ["grid"]),
    ],
}
LINE = {"description": "a grid line name, or {x: ..} / {y: ..}", "oneOf": [{"type": "string"}, {"type": "object"}]}
PASSED: dict[str, Any] = {
    "material": {"type": "string"},
    "b": LENGTH,
    "d": LENGTH,
    "service": {"enum": ["dry", "wet"]},
    "KT": {"type": "number"},
    "plies": {"type": "integer", "minimum": 1, "maximum": 20},
    "ply_thickness": LENGTH,
    "label": {"type": "string"},
}
ENDS = {
    "description": "one length for both ends, or [start, end]",
    "oneOf": [LENGTH, {"type": "array", "items": LENGTH}],
}
LAYOUT = _obj(
    {
        "levels": {"type": "object", "additionalProperties": LENGTH, "description": "level name -> elevation"},
        "grids": _obj(
            {
                "x": {"type": "object", "additionalProperties": LENGTH, "description": "lines of constant x"},
                "y": {"type": "object", "additionalProperties": LENGTH, "description": "lines of constant y"},
            },
            [],
        ),
        "members": {
            "type": "array",
            "items": _obj(
                {
                    "id": {"type": "string"},
                    "from": POINT,
                    "to": POINT,
                    "level": {"type": "string"},
                    "drop": {**LENGTH, "description": "top below its level"},
                    "extend": ENDS,
                    "free_ends": {"type": "array", "items": {"enum": ["start", "end"]}},
                    "support": {"enum": ["bearings", "continuous"]},
                    "bears_on": {"type": "string"},
                    "studs": {"type": "object"},
                    "calc_force": {"type": "object", "description": "by end: {start: {D: ..}, end: ..}"},
                    "notch": {"type": "object", "description": "notch depth by end: {start: 50 mm, end: ..}"},
                    **PASSED,
                },
                ["id", "from", "to", "level", "material", "b", "d"],
            ),
        },
        "runs": {
            "type": "array",
            "items": _obj(
                {
                    "id": {"type": "string"},
                    "prefix": {"type": "string"},
                    "between": {"type": "array", "items": LINE, "minItems": 2, "maxItems": 2},
                    "span": {"type": "array", "items": LINE, "minItems": 2, "maxItems": 2},
                    "spacing": LENGTH,
                    "first": LENGTH,
                    "last": LENGTH,
                    "level": {"type": "string"},
                    "drop": LENGTH,
                    "extend": ENDS,
                    "typical": {"type": "string"},
                    "hanger": {"type": "string", "description": "its members frame into their carriers in this hanger"},
                    "calc_force": {"type": "object", "description": "by span line: {A: {D: ..}, B: ..}"},
                    "notch": {"type": "object", "description": "notch depth by span line: {A: 50 mm, B: ..}"},
                    **PASSED,
                },
                ["id", "between", "span", "spacing", "level", "material", "b", "d"],
            ),
        },
        "posts": {
            "type": "array",
            "items": _obj(
                {
                    "id": {"type": "string"},
                    "at": POINT,
                    "base": {"type": "string"},
                    "drop": LENGTH,
                    "top": {"type": "string"},
                    "d_along": {"enum": ["x", "y"]},
                    **{k: v for k, v in PASSED.items() if k not in ("plies", "ply_thickness")},
                },
                ["id", "at", "base", "top", "material", "b", "d"],
            ),
        },
        "walls": {
            "type": "array",
            "items": _obj(
                {
                    "id": {"type": "string"},
                    "from": POINT,
                    "to": POINT,
                    "base": {"type": "string"},
                    "drop": LENGTH,
                    "top": {"type": "string"},
                    "extend": ENDS,
                    "studs": {"type": "object"},
                    "sole": _obj(
                        {
                            **{k: v for k, v in PASSED.items() if k not in ("service", "KT")},
                            "bears_on": {"type": "string"},
                        },
                        ["material", "b", "d"],
                        "the wall's bottom plate: the studs stand on it, it bears on what is under the wall",
                    ),
                    **PASSED,
                },
                ["id", "from", "to", "base", "top", "material", "b", "d"],
            ),
        },
        "areas": {
            "type": "array",
            "items": _obj(
                {
                    "id": {"type": "string"},
                    "level": {"type": "string"},
                    "corners": {"type": "array", "items": POINT, "minItems": 2, "maxItems": 2},
                    "span": {"enum": ["x", "y"]},
                    "loads": {"type": "object", "propertyNames": {"enum": CASES}},
                    "live": {"enum": ["occupancy", "storage"]},
                    "openings": {"type": "array", "items": {"type": "array", "items": POINT}},
                    "carried_by": {"type": "array", "items": {"type": "string"}},
                },
                ["id", "level", "corners", "span", "loads"],
            ),
        },
        "labels": {
            "type": "object",
            "additionalProperties": {"type": "array", "items": {"type": "string"}},
            "description": "a found bearing's id (UPPER/LOWER) -> the calc's labels for it, as a bearing's aliases",
        },
    },
    ["levels"],
    "a framing layout: the tool places the members, finds the bearings and shares the area loads",
)
PLACE = {"type": "object", "description": "where the member stands (written by expand): from/to/top, or at/base/top"}

MODEL_SCHEMA: dict[str, Any] = {
    "$schema": "https://json-schema.org/draft/2020-12/schema",
    "title": "bearing-audit review model",
    **_obj(
        {
            "project": _obj(
                {
                    "title": {"type": "string"},
                    "calc": {"type": "string", "description": "the calculation package under review"},
                    "reviewer": {"type": "string"},
                    "rule_pack": {"type": "string", "default": "o86-2019-recalled"},
                    "combinations": {"type": "string", "default": "nbcc-2015-recalled"},
                    "service": {"enum": ["dry", "wet"], "default": "dry"},
                    "tolerance": _obj(
                        {"relative": {"type": "number", "minimum": 0, "maximum": 1}, "absolute": FORCE}, []
                    ),
                    "date": {"type": "string", "format": "date"},
                    "near_support_area": {"type": "string", "description": "a reading named in the rule pack"},
                    "near_support_kb": {"type": "string", "description": "a reading named in the rule pack"},
                    "units": {"enum": ["SI", "US"], "default": "SI", "description": "how forces are shown"},
                    "readings": {
                        "type": "object",
                        "description": "rule-pack choice -> reading, e.g. {kzcp.built_up: combined}",
                        "additionalProperties": {"type": "string"},
                    },
                    "uplift_note_below": {
                        "type": "string",
                        "description": "a force, e.g. '0.5 kN': a smaller calculated uplift (continuity noise at a "
                        "nailed plate) is a note that weighs clarify and states this threshold; larger uplift "
                        "weighs revise",
                    },
                    "own_comment_from": {
                        "type": "number",
                        "minimum": 0,
                        "maximum": 1,
                        "description": "a Qf/Qr (default 0.9): a missing check that recomputes at this or more is a "
                        "review comment of its own; below it, alike missing checks are grouped by kind of detail",
                    },
                },
                ["title"],
            ),
            "layout": LAYOUT,
            "materials": {
                "type": "object",
                "additionalProperties": _obj(
                    {
                        "family": {
                            "enum": ["sawn_lumber", "timber", "glulam", "engineered", "steel", "concrete", "masonry"]
                        },
                        "species": {"type": "string"},
                        "grade": {"type": "string"},
                        "fcp": {**QUANTITY, "description": "engineered products only: specified fcp"},
                        "fc": {**QUANTITY, "description": "engineered products only: fc, for bearing at an angle"},
                        "factors": {"type": "array", "items": {"enum": ["KD", "KScp", "KB", "KZcp", "KT"]}},
                        "wet_factor": {"type": "number", "exclusiveMinimum": 0, "maximum": 1},
                        "source": {"type": "string"},
                    },
                    ["family"],
                ),
            },
            "members": {
                "type": "array",
                "items": _obj(
                    {
                        "id": {"type": "string"},
                        "material": {"type": "string"},
                        "b": {**LENGTH, "description": "width across the bearing face"},
                        "plies": {"type": "integer", "minimum": 1, "maximum": 20, "description": "built-up members"},
                        "ply_thickness": {**LENGTH, "description": "plies make up d (laid flat) or b (side by side)"},
                        "d": {**LENGTH, "description": "depth through which bearing loads pass"},
                        "length": LENGTH,
                        "orientation": {"enum": ["horizontal", "vertical"], "default": "horizontal"},
                        "service": {"enum": ["dry", "wet"]},
                        "KT": {"type": "number"},
                        "support": {"enum": ["bearings", "continuous", "studs"], "default": "bearings"},
                        "bears_on": {"type": "string", "description": "continuous members: the material under them"},
                        "studs": _obj(
                            {
                                "material": {"type": "string", "description": "default: the plate's material"},
                                "thickness": {**LENGTH, "description": "along the wall, e.g. '38 mm'"},
                                "depth": {**LENGTH, "description": "across the wall; default the plate's b"},
                                "spacing": {**LENGTH, "description": "centre to centre, e.g. '406 mm'"},
                                "first": {**LENGTH, "description": "centre of the first stud; default flush"},
                                "height": LENGTH,
                                "sole": {"type": "string", "description": "the member the studs stand on"},
                                "patterned": {
                                    "type": "boolean",
                                    "default": False,
                                    "description": "place live and snow load on the plate (and its sole) bay by bay "
                                    "between studs, as on a continuous floor beam; default: every bay loaded",
                                },
                                "packs": {
                                    "type": "array",
                                    "items": _obj(
                                        {
                                            "id": {"type": "string"},
                                            "at": LENGTH,
                                            "studs": {"type": "integer", "minimum": 1, "maximum": 12},
                                            "width": {**LENGTH, "description": "along the wall, instead of studs"},
                                        },
                                        ["at"],
                                    ),
                                },
                            },
                            ["thickness", "spacing"],
                            "support: studs: the wall under a plate, placed by the tool",
                        ),
                        "level": {"type": "string"},
                        "label": {"type": "string"},
                        "place": PLACE,
                        "note": {"type": "string"},
                        "aliases": {
                            "type": "array",
                            "items": {"type": "string"},
                            "description": "the member's earlier ids, so a renamed member keeps its comments",
                        },
                        "separation": {"type": "string", "description": "a sill on concrete: what separates them"},
                    },
                    ["id", "material", "b", "d", "length"],
                ),
            },
            "bearings": {
                "type": "array",
                "items": _obj(
                    {
                        "id": {"type": "string"},
                        "upper": SIDE,
                        "lower": SIDE,
                        "width": {**LENGTH, "description": "a plate or seat between the members: limits, never widens"},
                        "aliases": {"type": "array", "items": {"type": "string"}},
                        "typical": {
                            "type": "array",
                            "items": {"type": "string"},
                            "description": "labels several bearings share, as a calc's typical claim names them",
                        },
                        "calc_force": CALC_FORCE,
                        "separation": {"type": "string", "description": "what keeps timber off concrete here"},
                        "note": {"type": "string"},
                        "hanger": {"type": "string", "description": "the id of a hanger in the firm's connector pack"},
                    },
                    ["upper", "lower"],
                ),
            },
            "loads": {
                "type": "array",
                "items": _obj(
                    {
                        "id": {"type": "string"},
                        "member": {"type": "string"},
                        "type": {"enum": ["point", "uniform"]},
                        "at": LENGTH,
                        "from": LENGTH,
                        "to": LENGTH,
                        "length": {
                            **LENGTH,
                            "description": "bearing length of a point load along the member: the member under it is "
                            "checked for crushing (without it, listed as not checked)",
                        },
                        "width": {
                            **LENGTH,
                            "description": "contact width of a point load across the member (default b)",
                        },
                        "specified": {
                            "type": "object",
                            "description": "specified loads by case; S, W and E must already include their "
                            "importance factors",
                            "propertyNames": {"enum": CASES},
                            "additionalProperties": {
                                "oneOf": [
                                    QUANTITY,
                                    _obj(
                                        {"pressure": QUANTITY, "suction": QUANTITY},
                                        [],
                                        "W both ways: pressure acts down, suction up (each a size)",
                                    ),
                                ]
                            },
                        },
                        "live": {
                            "enum": ["occupancy", "storage"],
                            "description": "storage: storage, equipment or service-room live load",
                        },
                        "factored": QUANTITY,
                        "duration": {"enum": ["permanent", "standard", "short"]},
                        "label": {"type": "string"},
                        "note": {"type": "string"},
                    },
                    ["member", "type"],
                ),
            },
        },
        ["project", "materials"],
    ),
    "anyOf": [{"required": ["layout"]}, {"required": ["members", "bearings"]}],
}

NUMBER_FACTOR = {"type": "number", "minimum": 0}


def _claim_factor_properties() -> dict[str, Any]:
    """Every factor a claim may state under some standard (the reader takes only its project's standard's)."""
    shapes: dict[str | None, dict[str, Any]] = {
        None: NUMBER_FACTOR,
        "length": LENGTH,
        "area": {**QUANTITY, "description": "an area, e.g. '19500 mm**2'"},
    }
    out: dict[str, Any] = {}
    for standard in standards().values():
        for name, dimension in claim_factors(standard).items():
            out.setdefault(name, shapes.get(dimension, QUANTITY))
    return out


CLAIMS_SCHEMA: dict[str, Any] = {
    "$schema": "https://json-schema.org/draft/2020-12/schema",
    "title": "bearing-audit claims (what the calc package claims for its bearing checks)",
    **_obj(
        {
            "claims": {
                "type": "array",
                "items": _obj(
                    {
                        "id": {"type": ["string", "number"], "description": "read as text: 5.3 is the id '5.3'"},
                        "where": {
                            "oneOf": [
                                {"type": "string"},
                                {"type": "integer", "minimum": 1},
                                _obj(
                                    {
                                        "page": {"type": "integer", "minimum": 1},
                                        "sheet": {"type": ["string", "integer"]},
                                        "table": {"type": "string"},
                                        "item": {"type": ["string", "integer"]},
                                        "x": {"type": "number"},
                                        "y": {"type": "number"},
                                    },
                                    [],
                                ),
                            ]
                        },
                        "location": {
                            "oneOf": [
                                {
                                    "type": "string",
                                    "description": "the calc's label: a bearing id, alias, shared "
                                    "typical label, pattern (J*/B1) or range (J1-J4/B1)",
                                },
                                {"type": "array", "items": {"type": "string"}, "description": "a typical claim"},
                            ]
                        },
                        "member": {"type": "string"},
                        "kind": {"enum": ["local", "near-support"], "default": "local"},
                        "Qf": FORCE,
                        "Qr": FORCE,
                        "utilisation": {"type": "number", "minimum": 0},
                        "factors": _obj(_claim_factor_properties(), [], "in the symbols of the project's standard"),
                        "adequate": {"type": "boolean"},
                        "text": {"type": "string", "description": "the calc's own words"},
                    },
                    ["location"],
                ),
            }
        },
        ["claims"],
    ),
}

SCHEMAS: dict[str, dict[str, Any]] = {"model": MODEL_SCHEMA, "claims": CLAIMS_SCHEMA}
