"""A review run before any claim of the calc is entered still writes a comment for every check that fails.

Hand check (O86 as recalled, from memory: verify; NBCC 2015 combinations as recalled): glulam B1,
130 mm wide, on a 150 mm steel column at its end (bearing centre 75 mm from the end, so KB = 1.0 and
glulam takes no KZcp), Ab = 130 x 150 mm. A uniform D 10 kN/m, L 20 kN/m over its whole 6 m length
on two symmetric supports: each reaction is w L / 2 = 3 w. 1.25D + 1.5L: 1.25 x 30 + 1.5 x 60 =
127.5 kN; the dead load is less than the live, so KD = 1.0; Qr = 0.8 x 7.0 MPa x 19,500 mm2 = 109.2 kN.
"""

from __future__ import annotations

import json

import pytest

from tests.conftest import base_model

QF = 1.25 * 30e3 + 1.5 * 60e3  # N
QR = 0.8 * 7.0e6 * 0.130 * 0.150 * 1.0  # N


def _overloaded_beam() -> dict:
    data = base_model()
    data["loads"] = [{"id": "roof", "member": "B1", "type": "uniform", "specified": {"D": "10 kN/m", "L": "20 kN/m"}}]
    return data


def test_a_failing_check_is_a_comment_of_its_own_when_no_claims_are_given(tmp_path, write_model, run_cli):
    out, letter = tmp_path / "out.json", tmp_path / "letter.html"
    result = run_cli("review", write_model(_overloaded_beam()), "--json", out, "--memo", letter)
    assert result.exit_code == 1
    data = json.loads(out.read_text(encoding="utf-8"))
    failing = [c for c in data["comments"] if c["kind"] == "failing"]
    # both ends carry the same reaction by symmetry: each fails, each in a comment of its own
    assert sorted({p["check"] for p in c["places"]}.pop() for c in failing) == ["B1/C1:B1", "B1/C2:B1"]
    assert {c["weight"] for c in failing} == {"safety"}
    check = {c["id"]: c for c in data["checks"]}["B1/C1:B1"]
    assert check["governing"] == "1.25D+1.5L" and check["Qf_kN"] * 1000 == pytest.approx(QF, rel=1e-6)
    assert check["Qr_kN"] * 1000 == pytest.approx(QR, rel=1e-6)
    text = letter.read_text(encoding="utf-8")
    assert "no claims of the calc were given to compare" in text and "the calc does not check it" not in text
