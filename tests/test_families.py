"""Each family cites its own clause, and glulam bears on its compression or its tension face.

The clause numbers are the pack's (from memory of CSA O86: verify); the two-face values come
from a firm's pack written in the test, so the arithmetic is checked by hand against them.
"""

from __future__ import annotations

import pytest

from audit.core.located_yaml import read_yaml_text
from audit.inputs.read_model import build_model
from audit.review.reconcile import reconcile
from audit.review.review import review_built
from audit.standards.bundled import builtin_rules_dir
from tests.conftest import base_model, claims_from, review_dict

REL = 1e-9


def test_a_missing_glulam_check_cites_the_glulam_clause_and_a_sawn_one_the_sawn_clause():
    review = review_dict(base_model())
    rec = reconcile(review, claims_from([]))
    clause = {(f.member, f.check_id.endswith(":near")): f.clause for f in rec.findings if f.kind == "missing"}
    assert clause[("B1", False)] == "O86 7.5.9.2"  # glulam beam under the joist
    assert clause[("J1", False)] == "O86 6.5.6.2"  # the sawn joist, its bearing on the beam


def _two_face_review(tmp_path, tension: str | None = "5.0 MPa"):
    text = (builtin_rules_dir() / "o86-2019-recalled.yaml").read_text()
    text = text.replace("id: o86-2019-recalled", "id: firm-two-face")
    face = f"      tension_face: {tension}\n" if tension else ""
    text = text.replace("      value: 7.0 MPa\n      tension_face: 7.0 MPa\n", f"      value: 7.0 MPa\n{face}")
    folder = tmp_path / "firm"
    folder.mkdir()
    (folder / "firm.yaml").write_text(text)
    data = base_model()
    data["project"]["rule_pack"] = "firm-two-face"
    data["bearings"][2]["lower"]["at"] = "300 mm"  # the joist within d of the support at 75 mm
    import yaml

    root = read_yaml_text(yaml.safe_dump(data, sort_keys=False), "model.yaml")
    model, pack, cpack = build_model(root, "model.yaml", (folder,))
    return review_built(model, pack, cpack)


def _fcp(result):
    return next(f for f in result.factors if f.name == "fcp")


def test_glulam_bears_on_its_compression_face_under_loads_and_its_tension_face_on_supports(tmp_path):
    review = _two_face_review(tmp_path)
    top = review.result("J1/B1:B1")  # the joist on the beam's top face
    under = review.result("B1/C1:B1")  # the beam's underside on its post
    assert _fcp(top).value == 7.0e6 and "compression-face" in _fcp(top).reason
    assert _fcp(under).value == 5.0e6 and "tension-face" in _fcp(under).reason
    # by hand: Ab = 130 x 150 (post depth, cut to 150 at the end: 75 mm centre), KB 1.0 at the end
    assert under.governing.qr == pytest.approx(0.8 * 5.0e6 * (0.130 * 0.150) * 1.0, rel=REL)


def test_a_near_support_check_on_glulam_takes_the_lesser_face(tmp_path):
    near = _two_face_review(tmp_path).result("B1/C1:B1:near")
    assert _fcp(near).value == 5.0e6 and "lesser" in _fcp(near).reason


def test_one_glulam_value_serves_both_faces(tmp_path):
    review = _two_face_review(tmp_path, tension=None)
    under, top = _fcp(review.result("B1/C1:B1")), _fcp(review.result("J1/B1:B1"))
    assert under.value == top.value == 7.0e6
    assert "one value for both faces" in under.reason
