"""`bearing-audit ifc`: framing read from an IFC building model (IFC2X3 and IFC4) into a layout.

The fictional building of `fixtures/make_ifc.py` is built with IfcOpenShell's API, imported, and
reviewed beside the same building written by hand as a layout: the same bearings, the same forces.
"""

from __future__ import annotations

import copy
from pathlib import Path

import pytest
import yaml

ifcopenshell = pytest.importorskip("ifcopenshell")

from audit.inputs.ifc_layout import read_framing  # noqa: E402
from fixtures import make_ifc  # noqa: E402
from tests.conftest import ROOT, review_dict  # noqa: E402

MAP = ROOT / "fixtures" / "ifc" / "map.yaml"
FORMS = [("IFC4", "mm"), ("IFC2X3", "ft")]
# The building stands 10 m east and 20 m north of its site's origin (make_ifc.Writer).
X0, Y0 = 10.0, 20.0
FLOOR_LOADS = {"D": "1.2 kPa", "L": "1.9 kPa"}


def _areas() -> list[dict]:
    corners = [[f"{X0} m", f"{Y0} m"], [f"{X0 + 8} m", f"{Y0 + 4.5} m"]]
    return [
        {"id": f"floor-{n}", "level": f"Level {n}", "corners": corners, "span": "y", "loads": FLOOR_LOADS}
        for n in (2, 3)
    ]


def hand_layout() -> dict:
    """The building of make_ifc.py written by hand from its description, with grids, runs and posts."""
    steel = {"material": "STEEL", "b": "152 mm", "d": "152 mm"}
    glulam = {"material": "GL24", "b": "130 mm", "d": "380 mm", "extend": "76 mm"}
    joists = {"material": "SPF-2", "b": "38 mm", "d": "235 mm", "spacing": "400 mm", "first": "200 mm"}
    joists |= {"last": "200 mm", "between": ["1", "3"], "span": ["A", "B"], "extend": "70 mm"}
    plate = {"material": "SPF-2", "b": "140 mm", "d": "38 mm", "from": "A/1", "to": "A/3"}
    posts = [
        {"id": f"C-{line}{n}", **steel, "at": f"{line}/{n}", "base": "Level 1", "top": "Level 2"}
        for line in "AB"
        for n in (1, 2, 3)
    ]
    posts += [
        {"id": f"C-B{n}-2", **steel, "at": f"B/{n}", "base": "Level 2", "drop": "235 mm", "top": "Level 3"}
        for n in (1, 2, 3)
    ]
    # studs at 400 mm from 100 mm past grid 1, on the sole plate (raised 38 mm), up to the top plate
    posts += [
        {
            "id": f"WA-stud-{n}",
            "material": "SPF-2",
            "b": "140 mm",
            "d": "38 mm",
            "at": {"grid": "A/1", "dx": f"{100 + 400 * (n - 1)} mm"},
            "base": "Level 2",
            "drop": "-38 mm",
            "top": "Level 3",
        }
        for n in range(1, 21)
    ]
    return {
        "project": {"title": "Fictional block written by hand", "date": "2026-12-01"},
        "materials": {
            "SPF-2": {"family": "sawn_lumber", "species": "S-P-F", "grade": "No.2"},
            "GL24": {"family": "glulam", "species": "D.Fir-L", "grade": "24f-EX"},
            "STEEL": {"family": "steel"},
        },
        "layout": {
            "levels": {"Level 1": "0 m", "Level 2": "3 m", "Level 3": "6 m"},
            "grids": {
                "x": {"1": f"{X0} m", "2": f"{X0 + 4} m", "3": f"{X0 + 8} m"},
                "y": {"A": f"{Y0} m", "B": f"{Y0 + 4.5} m"},
            },
            "runs": [
                {"id": "J2", "prefix": "J2-", "level": "Level 2", **joists},
                {"id": "J3", "prefix": "J3-", "level": "Level 3", **joists},
            ],
            "members": [
                {"id": "GA2", **glulam, "level": "Level 2", "drop": "235 mm", "from": "A/1", "to": "A/3"},
                {"id": "GB2", **glulam, "level": "Level 2", "drop": "235 mm", "from": "B/1", "to": "B/3"},
                {"id": "GB3", **glulam, "level": "Level 3", "drop": "235 mm", "from": "B/1", "to": "B/3"},
                {"id": "WA-sole", **plate, "level": "Level 2", "drop": "-38 mm"},
                {"id": "WA-top", **plate, "level": "Level 3", "drop": "235 mm"},
            ],
            "posts": posts,
            "areas": _areas(),
        },
    }


@pytest.fixture(scope="module", params=FORMS, ids=[f"{s}-{u}" for s, u in FORMS])
def imported(request, tmp_path_factory) -> tuple[Path, dict]:
    """The building written as IFC in one schema and unit, and the model `bearing-audit ifc` wrote from it."""
    from audit.cli import run

    schema, unit = request.param
    folder = tmp_path_factory.mktemp(f"ifc-{schema}")
    ifc = folder / "building.ifc"
    make_ifc.write_building(ifc, schema, unit)
    out = folder / "layout.yaml"
    assert run(["ifc", str(ifc), "-o", str(out), "--map", str(MAP)]) == 0
    return ifc, yaml.safe_load(out.read_text(encoding="utf-8"))


def _forces(review) -> dict[str, float]:
    return {r.check.id: r.governing.qf for r in review.results}


def test_the_imported_building_finds_the_same_bearings_and_forces_as_the_hand_written_layout(imported):
    _, data = imported
    data = copy.deepcopy(data)
    data["layout"]["areas"] = _areas()  # loads are not in the file: the reviewer adds them, as by hand
    from_ifc, by_hand = review_dict(data), review_dict(hand_layout())
    assert set(from_ifc.model.bearings_by_id) == set(by_hand.model.bearings_by_id)
    # the bearings every part of the building rests on, named here from its description
    for bearing in (
        "GA2/C-A2",
        "J2-1/GA2",
        "J2-20/GB2",
        "WA-sole/J2-5",
        "WA-stud-3/WA-sole",
        "J3-7/WA-top",
        "GB3/C-B2-2",
    ):
        assert bearing in from_ifc.model.bearings_by_id
    qf_ifc, qf_hand = _forces(from_ifc), _forces(by_hand)
    assert set(qf_ifc) == set(qf_hand)
    for check_id, qf in qf_hand.items():
        assert qf_ifc[check_id] == pytest.approx(qf, rel=1e-6, abs=1e-3), check_id


def test_each_member_keeps_its_global_id_and_name_in_its_label(imported):
    ifc, data = imported
    ids = {e.Name: e.GlobalId for e in ifcopenshell.open(str(ifc)).by_type("IfcElement")}
    placed = data["layout"]["members"] + data["layout"]["posts"]
    assert len(placed) == len(make_ifc.building())
    for entry in placed:
        assert entry["label"] == f"IFC {ids[entry['id']]} {entry['id']}"


def test_storeys_are_levels_and_lengths_are_read_in_metres_whatever_the_file_unit(imported):
    _, data = imported
    layout = data["layout"]
    assert layout["levels"] == {"Level 1": "0 m", "Level 2": "3 m", "Level 3": "6 m"}
    beam = next(m for m in layout["members"] if m["id"] == "GA2")
    # from the building's description: 76 mm short of grid 1 at x = 10 m; its top 235 mm under level 2.
    # The foot file converts by 0.3048 m per foot (the international foot, exact by definition).
    assert beam["from"] == ["9.924 m", "20 m"] and beam["to"] == ["18.076 m", "20 m"]
    assert (beam["b"], beam["d"], beam["level"], beam["drop"]) == ("130 mm", "380 mm", "Level 2", "0.235 m")
    stud = next(p for p in layout["posts"] if p["id"] == "WA-stud-1")
    assert (stud["base"], stud["drop"], stud["top"], stud["at"]) == (
        "Level 2",
        "-0.038 m",
        "Level 3",
        ["10.1 m", "20 m"],
    )


@pytest.mark.parametrize(("schema", "unit"), FORMS)
def test_every_piece_fills_the_box_ifcopenshells_geometry_engine_gives_it(tmp_path, schema, unit):
    # checked against IfcOpenShell's own geometry engine (ifcopenshell.geom, a general-purpose library):
    # the world-coordinate box of each element's shape is the box of the piece we placed
    import numpy as np
    from ifcopenshell import geom

    ifc = tmp_path / "building.ifc"
    make_ifc.write_building(ifc, schema, unit)
    settings = geom.settings()
    settings.set("use-world-coords", True)
    model = ifcopenshell.open(str(ifc))
    for piece in read_framing(ifc).pieces:
        verts = np.array(geom.create_shape(settings, model.by_guid(piece.global_id)).geometry.verts).reshape(-1, 3)
        if piece.kind == "member":
            along_x = abs(piece.end[0] - piece.start[0]) > abs(piece.end[1] - piece.start[1])
            half = (0.0, piece.b / 2) if along_x else (piece.b / 2, 0.0)
            lo = (min(piece.start[0], piece.end[0]) - half[0], min(piece.start[1], piece.end[1]) - half[1])
            hi = (max(piece.start[0], piece.end[0]) + half[0], max(piece.start[1], piece.end[1]) + half[1])
        else:
            dx, dy = (piece.d, piece.b) if piece.d_along == "x" else (piece.b, piece.d)
            lo = (piece.start[0] - dx / 2, piece.start[1] - dy / 2)
            hi = (piece.start[0] + dx / 2, piece.start[1] + dy / 2)
        box = (*lo, piece.foot), (*hi, piece.top)
        assert verts.min(axis=0) == pytest.approx(box[0], abs=1e-6), piece.name
        assert verts.max(axis=0) == pytest.approx(box[1], abs=1e-6), piece.name


def test_an_unmapped_material_is_one_warning_naming_every_member_that_uses_it(tmp_path, capsys):
    from audit.cli import run

    ifc = tmp_path / "building.ifc"
    make_ifc.write_building(ifc)
    partial = tmp_path / "map.yaml"
    text = MAP.read_text(encoding="utf-8").replace("  Steel HSS: STEEL\n", "")
    partial.write_text(text, encoding="utf-8")
    assert run(["ifc", str(ifc), "-o", str(tmp_path / "out.yaml"), "--map", str(partial)]) == 0
    lines = [line for line in capsys.readouterr().err.splitlines() if "Steel HSS" in line]
    assert len(lines) == 1
    # the nine steel posts of the description: six in storey 1, three in storey 2
    posts = ["C-A1", "C-A2", "C-A3", "C-B1", "C-B2", "C-B3", "C-B1-2", "C-B2-2", "C-B3-2"]
    assert "used by 9:" in lines[0] and all(f"{p} (" in lines[0] for p in posts)
    assert f"{partial}:" in lines[0] and "names" in lines[0]


def _bad_building(path: Path, schema: str) -> dict[str, str]:
    """The building with six members that cannot be read, each for one reason; returns reason -> name."""
    writer = make_ifc.Writer(schema, "mm")
    for piece in make_ifc.building():
        writer.piece(piece)
    base = make_ifc.Piece(
        "IfcMember", "", "Level 2", (12.0, 22.0, 4.0), (1.0, 0.0, 0.0), 2.0, (0.0, 1.0, 0.0), 0.038, 0.140, "SPF"
    )
    f = writer.f
    cases = {}
    # a rafter sloping at 30 degrees
    sloped = make_ifc.Piece(**{**base.__dict__, "name": "R-sloped", "axis": (0.866025, 0.0, 0.5)})
    writer.piece(sloped)
    cases["slopes at 30.0 degrees"] = "R-sloped"
    # a joist rolled 30 degrees about its axis
    rolled = make_ifc.Piece(**{**base.__dict__, "name": "J-rolled", "x_dir": (0.0, 0.866025, 0.5)})
    writer.piece(rolled)
    cases["rolled 30.0 degrees"] = "J-rolled"
    # a round pole: a circle profile
    circle = f.createIfcCircleProfileDef(
        "AREA", None, f.createIfcAxis2Placement2D(f.createIfcCartesianPoint([0.0, 0.0]), None), 50.0
    )
    writer.piece(make_ifc.Piece(**{**base.__dict__, "name": "P-round"}), profile=circle)
    cases["IfcCircleProfileDef is not rectangular"] = "P-round"
    # a member with no shape at all
    bare = writer.piece(make_ifc.Piece(**{**base.__dict__, "name": "M-bare"}))
    bare.Representation = None
    cases["no shape"] = "M-bare"
    # a curved member: its profile revolved about an axis
    bent = writer.piece(make_ifc.Piece(**{**base.__dict__, "name": "M-bent"}))
    solid = bent.Representation.Representations[0].Items[0]
    axis = f.createIfcAxis1Placement(
        f.createIfcCartesianPoint([0.0, 5000.0, 0.0]), f.createIfcDirection([1.0, 0.0, 0.0])
    )
    revolved = f.createIfcRevolvedAreaSolid(solid.SweptArea, solid.Position, axis, 0.5)
    bent.Representation.Representations[0].Items = [revolved]
    cases["curved (IfcRevolvedAreaSolid)"] = "M-bent"
    # a member in no storey (contained nowhere)
    loose = writer.piece(make_ifc.Piece(**{**base.__dict__, "name": "M-loose"}))
    for rel in loose.ContainedInStructure:
        rel.RelatedElements = [e for e in rel.RelatedElements if e != loose]
    cases["outside every storey"] = "M-loose"
    # a wall whose framing the file does not carry
    writer.wall("W-plain", "Level 1", (2.0, 2.0, 0.0))
    cases["carries no framing members"] = "W-plain"
    # an I-shaped post (its outline is not its contact) and, read, an I-joist by its flange width
    i_shape = f.createIfcIShapeProfileDef(
        "AREA", None, f.createIfcAxis2Placement2D(f.createIfcCartesianPoint([0.0, 0.0]), None), 64.0, 302.0, 9.5, 38.0
    )
    post = {**base.__dict__, "name": "C-I", "axis": (0.0, 0.0, 1.0), "x_dir": (1.0, 0.0, 0.0)}
    writer.piece(make_ifc.Piece(**post), profile=i_shape)
    cases["an I-shaped post"] = "C-I"
    writer.piece(make_ifc.Piece(**{**base.__dict__, "name": "J-I"}), profile=i_shape)
    f.write(str(path))
    return cases


@pytest.mark.parametrize("schema", ["IFC2X3", "IFC4"])
def test_each_member_that_cannot_be_read_is_one_line_naming_it_and_the_rest_is_read(tmp_path, capsys, schema):
    from audit.cli import run

    ifc = tmp_path / "bad.ifc"
    cases = _bad_building(ifc, schema)
    out = tmp_path / "out.yaml"
    assert run(["ifc", str(ifc), "-o", str(out), "--map", str(MAP)]) == 0
    err = capsys.readouterr().err.splitlines()
    guid = {e.Name: e.GlobalId for e in ifcopenshell.open(str(ifc)).by_type("IfcElement")}
    for reason, name in cases.items():
        lines = [line for line in err if f"'{name}'" in line]
        assert len(lines) == 1, (name, err)
        assert reason in lines[0] and guid[name] in lines[0]
    data = yaml.safe_load(out.read_text(encoding="utf-8"))
    placed = {e["id"]: e for e in data["layout"]["members"] + data["layout"]["posts"]}
    assert set(placed) == {p.name for p in make_ifc.building()} | {"J-I"}
    # the I-joist: 64 mm flanges (its overall width, what bears), 302 mm deep, as its profile states
    assert (placed["J-I"]["b"], placed["J-I"]["d"]) == ("64 mm", "302 mm")


def test_a_file_that_is_not_ifc_is_one_line_and_exit_2(tmp_path, capsys):
    from audit.cli import run

    fake = tmp_path / "model.ifc"
    fake.write_text("project: {title: not an IFC file}\n", encoding="utf-8")
    out = tmp_path / "out.yaml"
    assert run(["ifc", str(fake), "-o", str(out)]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and str(fake) in err[0] and "not an IFC file" in err[0]
    assert not out.exists()


def test_a_map_naming_a_material_it_does_not_define_is_a_located_error(tmp_path, capsys):
    from audit.cli import run

    ifc = tmp_path / "building.ifc"
    make_ifc.write_building(ifc)
    bad = tmp_path / "map.yaml"
    bad.write_text(MAP.read_text(encoding="utf-8").replace("Steel HSS: STEEL", "Steel HSS: STEL"), encoding="utf-8")
    assert run(["ifc", str(ifc), "-o", str(tmp_path / "out.yaml"), "--map", str(bad)]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and f"{bad}:6:" in err[0] and "'STEL'" in err[0] and "names.Steel HSS" in err[0]
