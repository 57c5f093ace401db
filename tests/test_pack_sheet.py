"""Packs a firm can verify: `rules --sheet` writes every value of a pack to a workbook, `rules --adopt` reads the
filled workbook back into a firm pack, and the memo counts the verified values a review used.

The firm's values in these tests are invented (5.5 MPa for S-P-F is not a printed value). The hand check: under
CSA O86 6.5.6.2 (as recalled) Qr = phi fcp (KD KScp KT) Ab KB KZcp is proportional to fcp, so a joist's Qr with
fcp 5.5 MPa instead of 5.3 MPa is 5.5 / 5.3 times the recalled one at every combination.
"""

from __future__ import annotations

import pytest
import yaml
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from openpyxl import load_workbook

from audit.inputs.pack_sheet import COLUMNS, PACK_SHEET, VALUES_SHEET
from audit.review.review import review_model
from tests.conftest import base_model

O86 = "o86-2019-recalled"
VERIFIED_BY = ("CSA O86:19", "112", "A. Checker (fictional)", "2026-12-02")


def _sheet(run_cli, tmp_path, pack: str = O86):
    out = tmp_path / "sheet.xlsx"
    result = run_cli("rules", "--sheet", pack, "-o", out)
    assert result.exit_code == 0, result.output
    return out


def _rows(path) -> dict[str, tuple[int, tuple]]:
    rows = list(load_workbook(path)[VALUES_SHEET].iter_rows(values_only=True))
    assert rows[0] == COLUMNS
    return {r[0]: (i, r) for i, r in enumerate(rows, start=1) if i > 1}


def _fill(path, out, values: dict[str, object], extra: dict[tuple[str, str], object] | None = None) -> None:
    """Enter verified values (key -> value) with the edition, page, who and when; ``extra``: (key, column) -> cell."""
    book = load_workbook(path)
    sheet = book[VALUES_SHEET]
    rows = _rows(path)
    for key, value in values.items():
        row = rows[key][0]
        for column, cell in zip(COLUMNS[6:], (value, *VERIFIED_BY), strict=True):
            sheet.cell(row, COLUMNS.index(column) + 1, cell)
    for (key, column), cell in (extra or {}).items():
        sheet.cell(rows[key][0], COLUMNS.index(column) + 1, cell)
    book.save(out)


def test_the_sheet_holds_every_value_with_its_clause_and_status_and_empty_columns_to_verify(run_cli, tmp_path):
    rows = _rows(_sheet(run_cli, tmp_path))
    # as rules/o86-2019-recalled.yaml states them
    _, spf = rows["fcp/sawn_lumber/S-P-F"]
    assert spf[1:6] == (
        "5.3 MPa",
        None,
        "Table 6.3.1A",
        "CSA O86 specified strengths, structural joists and planks",
        "from memory: verify",
    )
    assert spf[6:] == (None,) * 5
    assert rows["phi"][1][1] == 0.8 and rows["kb/table"][1][2] == "mm"
    assert rows["fcp/glulam/D.Fir-L/tension_face"][1][1] == "7.0 MPa"
    about = {r[0]: r[1] for r in load_workbook(tmp_path / "sheet.xlsx")[PACK_SHEET].iter_rows(values_only=True)}
    assert about["source pack"] == O86


def test_a_combination_packs_sheet_lists_each_combination_with_its_factors(run_cli, tmp_path):
    rows = _rows(_sheet(run_cli, tmp_path, "asce7-16-asd-recalled"))
    assert rows["combinations/D+L"][1][1:4] == ("{D: 1.0, L: 1.0}", None, "2.4.1 (2)")


def test_adopted_values_carry_their_provenance_and_a_review_uses_them(run_cli, tmp_path, write_model):
    sheet = _sheet(run_cli, tmp_path)
    filled = tmp_path / "filled.xlsx"
    _fill(sheet, filled, {"fcp/sawn_lumber/S-P-F": "5.5 MPa", "phi": 0.8})  # one changed, one confirmed
    (tmp_path / "firm").mkdir()
    firm = tmp_path / "firm" / "firm-o86.yaml"
    result = run_cli("rules", "--adopt", filled, "-o", firm)
    assert result.exit_code == 0, result.output
    assert "fcp/sawn_lumber/S-P-F: recalled 5.3 MPa, verified 5.5 MPa" in result.output
    assert "phi:" not in result.output  # the same as recalled: not listed as a difference
    data = yaml.safe_load(firm.read_text())
    assert data["id"] == "firm-o86"
    spf = data["fcp"]["sawn_lumber"]["S-P-F"]
    assert spf["value"] == "5.5 MPa" and spf["status"] == "verified 2026-12-02 A. Checker (fictional)"
    assert spf["source"].startswith("CSA O86:19, p. 112")
    assert data["fcp"]["sawn_lumber"]["D.Fir-L"]["status"] == "from memory: verify"  # left unverified

    model = base_model()  # J1 is S-P-F No.2 sawn lumber
    recalled = review_model(write_model(model, "recalled.yaml"))
    model["project"]["rule_pack"] = "firm-o86"
    verified = review_model(write_model(model, "firm.yaml"), (tmp_path / "firm",))
    before, after = recalled.result("J1/B1:J1"), verified.result("J1/B1:J1")
    for x, y in zip(before.combinations, after.combinations, strict=True):
        assert y.qr == pytest.approx(x.qr * 5.5 / 5.3, rel=1e-9)

    from audit.review.pack_use import pack_use

    used_recalled, used_verified = pack_use(recalled), pack_use(verified)
    assert used_recalled.verified == 0 and used_verified.verified == 2  # phi and S-P-F's fcp, both used here
    assert used_verified.recalled == used_recalled.recalled - 2 and used_verified.used == used_recalled.used
    memo = tmp_path / "memo.html"
    reviewed = run_cli("review", tmp_path / "firm.yaml", "--rules-dir", tmp_path / "firm", "--memo", memo)
    assert reviewed.exit_code in (0, 1), reviewed.output
    sentence = "review used (firm-o86, nbcc-2015-recalled), 2 are verified against a printed edition and "
    assert sentence + f"{used_verified.recalled} are from memory" in memo.read_text()


def test_a_broken_sheet_gives_one_located_line_and_exit_2(run_cli, tmp_path):
    sheet = _sheet(run_cli, tmp_path)
    filled = tmp_path / "filled.xlsx"
    _fill(sheet, filled, {"fcp/sawn_lumber/S-P-F": "about 5.5"})
    out = tmp_path / "firm.yaml"
    result = run_cli("rules", "--adopt", filled, "-o", out)
    assert result.exit_code == 2
    lines = result.stderr.strip().splitlines()
    row = _rows(sheet)["fcp/sawn_lumber/S-P-F"][0]
    assert len(lines) == 1
    assert lines[0].startswith(f"error: {filled} [Values]:{row}:7: verified value: 'about 5.5' is not a stress")
    assert not out.exists()


def test_a_verified_value_the_pack_reader_refuses_is_named_at_its_cell(run_cli, tmp_path):
    sheet = _sheet(run_cli, tmp_path)
    filled = tmp_path / "filled.xlsx"
    _fill(sheet, filled, {"fcp/sawn_lumber/S-P-F": "53 MPa"})  # a slipped decimal: outside the plausible range
    result = run_cli("rules", "--adopt", filled, "-o", tmp_path / "firm.yaml")
    assert result.exit_code == 2
    row = _rows(sheet)["fcp/sawn_lumber/S-P-F"][0]
    assert result.stderr.startswith(f"error: {filled} [Values]:{row}:7: verified value:")
    assert "fcp of sawn_lumber" in result.stderr


def test_a_signature_without_a_value_and_a_bad_date_are_each_located(run_cli, tmp_path):
    sheet = _sheet(run_cli, tmp_path)
    filled = tmp_path / "filled.xlsx"
    _fill(
        sheet,
        filled,
        {"phi": 0.8},
        {("phi", "date"): "yesterday", ("kd/short", "verified by"): "A. Checker (fictional)"},
    )
    result = run_cli("rules", "--adopt", filled, "-o", tmp_path / "firm.yaml")
    assert result.exit_code == 2
    rows = _rows(sheet)
    errors = [line for line in result.stderr.splitlines() if line.startswith("error:")]
    assert any(f"[Values]:{rows['phi'][0]}:11: date: date 'yesterday' is not a date" in e for e in errors)
    assert any(f"[Values]:{rows['kd/short'][0]}:7: verified value: verified by or date is filled" in e for e in errors)


def test_rules_with_an_output_but_no_sheet_or_adopt_is_refused(run_cli, tmp_path):
    result = run_cli("rules", "-o", tmp_path / "x.xlsx")
    assert result.exit_code == 2 and "--sheet PACK -o FILE.xlsx" in result.stderr


def test_the_firm_pack_is_never_written_into_the_bundled_rules(run_cli, tmp_path):
    from audit.standards.bundled import builtin_rules_dir

    sheet = _sheet(run_cli, tmp_path)
    target = builtin_rules_dir() / "firm-o86.yaml"
    result = run_cli("rules", "--adopt", sheet, "-o", target)
    assert result.exit_code == 2 and "bundled rules folder" in result.stderr and not target.exists()


def test_a_verified_combination_keeps_its_factors_and_carries_the_status(run_cli, tmp_path):
    sheet = _sheet(run_cli, tmp_path, "asce7-16-asd-recalled")
    filled = tmp_path / "filled.xlsx"
    _fill(sheet, filled, {"combinations/D+L": "{D: 1.0, L: 1.0}"})
    firm = tmp_path / "firm-asd.yaml"
    result = run_cli("rules", "--adopt", filled, "-o", firm)
    assert result.exit_code == 0, result.output
    assert "0 differ from the recalled ones" in result.output
    combos = {c["name"]: c for c in yaml.safe_load(firm.read_text())["combinations"]}
    assert combos["D+L"]["factors"] == {"D": 1.0, "L": 1.0}
    assert combos["D+L"]["status"].startswith("verified 2026-12-02")
    assert combos["D+S"]["status"] == "from memory: verify"


CELLS = st.one_of(
    st.none(),
    st.integers(-(10**6), 10**6),
    st.floats(allow_nan=True, allow_infinity=True),
    st.text(st.characters(blacklist_categories=("Cc", "Cs")), max_size=40),  # what a cell can hold
    st.sampled_from(["5.5 MPa", "[[1, 2], [0, 1]]", "{D: 1.0}", "&a [*a, *a]", "=1+1", "2026-02-30", "phi", "- x"]),
)


@settings(max_examples=25, deadline=None, suppress_health_check=list(HealthCheck))
@given(edits=st.lists(st.tuples(st.integers(2, 60), st.integers(1, 11), CELLS), min_size=1, max_size=8))
def test_any_edit_of_the_sheet_adopts_or_is_refused_in_located_lines(edits):
    """Fuzz (hypothesis): cells anywhere on sheet 'Values' changed to anything; every run ends in exit 0 or 2."""
    import contextlib
    import io
    import tempfile
    from pathlib import Path

    from audit import cli

    with tempfile.TemporaryDirectory() as folder:
        base = Path(folder)
        assert cli.run(["rules", "--sheet", O86, "-o", str(base / "s.xlsx")]) == 0
        book = load_workbook(base / "s.xlsx")
        for row, col, value in edits:
            book[VALUES_SHEET].cell(row, col, value)
        book.save(base / "e.xlsx")
        err = io.StringIO()
        with contextlib.redirect_stderr(err), contextlib.redirect_stdout(io.StringIO()):
            code = cli.run(["rules", "--adopt", str(base / "e.xlsx"), "-o", str(base / "firm.yaml")])
        assert code in (0, 2) and "internal error" not in err.getvalue()
        assert (code == 0) == (base / "firm.yaml").exists()
        if code == 0:  # what was adopted reads as a pack
            from audit.inputs.pack_sheet import read_pack_text

            read_pack_text((base / "firm.yaml").read_text(), "firm.yaml")


def test_a_glulam_strength_and_its_tension_face_are_verified_together(run_cli, tmp_path):
    sheet = _sheet(run_cli, tmp_path)
    filled = tmp_path / "filled.xlsx"
    _fill(sheet, filled, {"fcp/glulam/D.Fir-L": "7.0 MPa"})  # they share one status in the pack
    result = run_cli("rules", "--adopt", filled, "-o", tmp_path / "firm.yaml")
    assert result.exit_code == 2 and "'fcp/glulam/D.Fir-L/tension_face' shares this value's status" in result.stderr
    _fill(sheet, filled, {"fcp/glulam/D.Fir-L": "7.0 MPa", "fcp/glulam/D.Fir-L/tension_face": "6.5 MPa"})
    result = run_cli("rules", "--adopt", filled, "-o", tmp_path / "firm.yaml")
    assert result.exit_code == 0, result.stderr
    glulam = yaml.safe_load((tmp_path / "firm.yaml").read_text())["fcp"]["glulam"]["D.Fir-L"]
    assert (glulam["value"], glulam["tension_face"]) == ("7.0 MPa", "6.5 MPa")
    assert "fcp/glulam/D.Fir-L/tension_face: recalled 7.0 MPa, verified 6.5 MPa" in result.output
    assert "fcp/glulam/D.Fir-L:" not in result.output  # confirmed as recalled
