"""Decimal commas in calc PDFs. A calc whose standard (or reviewer) says it writes decimal commas reads
'3,125 kN' as 3.125 kN; one with decimal points reads it as 3125 kN, as before. Where a number's comma
or point could mean either (a page that writes decimals both ways, a calc declared 'either', a number
with both marks) the row is reported as not read with the reason: the reader never guesses thousands.

Hand values: ISO 80000-1 allows a comma or a point as the decimal marker, and in the countries that use
the comma the point or a space groups thousands (common practice); the EN 1995-1-1 6.1.5 resistance
below is worked by hand: kc,90 fc,90,d Aef = 1.5 x 2.5 MPa x 19500 mm2 = 73,125 N = 73.1 kN."""

from __future__ import annotations

from pathlib import Path

import pytest

from audit.inputs.pdf.extract import extract
from audit.inputs.pdf.values import POINT, NumberProblem, Numbers, marks_seen, read_number
from audit.standards.registry import standard_named

EC5 = standard_named("ec5", None)
KN = 1000.0  # N


def _sheet(path: Path, rows: list[list[str]], lines: tuple[str, ...] = ()) -> Path:
    """One EN 1995 table (F_c,90,d and F_c,90,Rd in kN) and any lines of text under it."""
    from fixtures.make_calc_pdfs import Calc, draw_table

    pdf = Calc("Decimal marks (fictional)")
    pdf.add_page()
    draw_table(pdf, ["Location", "F_c,90,d (kN)", "F_c,90,Rd (kN)"], rows, [50, 34, 34], ruled=True)
    for text in lines:
        pdf.cell(0, 6, text, new_x="LMARGIN", new_y="NEXT")
    pdf.output(str(path))
    return path


def _read(path: Path, **options):
    return extract(path, workers=1, standard_headers=EC5.claim_headers, **options)


def test_an_en_1995_calc_reads_a_decimal_comma_as_decimals(tmp_path):
    pdf = _sheet(tmp_path / "c.pdf", [["J1 on W1", "3,125", "11,8"], ["J2 on W1", "4,2", "11,8"]])
    result = _read(pdf, standard_decimal=EC5.decimal_mark)
    assert [(c.label, c.qf, c.qr) for c in result.claims] == [
        ("J1 on W1", pytest.approx(3.125 * KN), pytest.approx(11.8 * KN)),
        ("J2 on W1", pytest.approx(4.2 * KN), pytest.approx(11.8 * KN)),
    ]
    assert not result.unread


def test_a_calc_with_decimal_points_still_reads_a_comma_as_thousands(tmp_path):
    pdf = _sheet(tmp_path / "p.pdf", [["J1 on W1", "3,125", "11,800"]])
    (claim,) = _read(pdf, decimal_mark="point").claims
    assert claim.qf == pytest.approx(3125 * KN) and claim.qr == pytest.approx(11800 * KN)


def test_a_comma_before_three_digits_on_a_page_that_writes_decimals_both_ways_is_reported_not_guessed(tmp_path):
    # '12.5' shows this page also writes decimal points: '1,250' may be 1250 or 1.25
    pdf = _sheet(tmp_path / "m.pdf", [["J1 on W1", "1,250", "12.5"], ["J2 on W1", "4,75", "12.5"]])
    result = _read(pdf, standard_decimal="comma")
    assert [(c.label, c.qf) for c in result.claims] == [("J2 on W1", pytest.approx(4.75 * KN))]
    (row,) = [u for u in result.unread if u.text.startswith("J1")]
    assert "table row not read" in row.what and "'1,250' is ambiguous" in row.what
    assert any("'1,250' is ambiguous" in w for w in result.warnings)


def test_a_number_with_both_marks_is_reported_not_read(tmp_path):
    pdf = _sheet(tmp_path / "b.pdf", [["J1 on W1", "1.250,5", "2.400,0"], ["J2 on W1", "4,2", "11,8"]])
    result = _read(pdf, standard_decimal="comma")
    assert [c.label for c in result.claims] == ["J2 on W1"]
    (row,) = [u for u in result.unread if u.text.startswith("J1")]
    assert "'1.250,5' is ambiguous" in row.what and "a comma and a point" in row.what


def test_a_calc_declared_either_reads_only_what_has_one_reading(tmp_path):
    pdf = _sheet(tmp_path / "e.pdf", [["J1 on W1", "3,12", "0,800"], ["J2 on W1", "3,125", "11,8"]])
    result = _read(pdf, decimal_mark="either")
    assert [(c.label, c.qf, c.qr) for c in result.claims] == [
        ("J1 on W1", pytest.approx(3.12 * KN), pytest.approx(0.8 * KN))
    ]
    assert any(u.text.startswith("J2") and "'3,125' is ambiguous" in u.what for u in result.unread)


def test_a_worked_en_1995_equation_with_decimal_commas(tmp_path):
    from fixtures.make_calc_pdfs import Calc

    pdf = Calc("Worked check (fictional)")
    pdf.add_page()
    for text in (
        "Location: J4 on W2",
        "F_c,90,d = 4,2 kN <= k_c,90 f_c,90,d A_ef = 1,5 x 2,5 MPa x 19500 mm2 = 73,1 kN",
        "Location: J5 on W2",
        "F_c,90,d = 1,250 kN <= k_c,90 f_c,90,d A_ef = 73.1 kN",
    ):
        pdf.cell(0, 6, text, new_x="LMARGIN", new_y="NEXT")
    pdf.output(str(tmp_path / "eq.pdf"))
    result = _read(tmp_path / "eq.pdf", standard_decimal="comma")
    assert [(c.label, c.qf, c.qr) for c in result.claims] == [
        ("J4 on W2", pytest.approx(4.2 * KN), pytest.approx(73.1 * KN, abs=1.0))
    ]
    # '73.1' shows the page writes decimal points too: the second equation's '1,250' is not guessed
    assert any("equation not read" in u.what and "'1,250' is ambiguous" in u.what for u in result.unread)


def test_the_command_reads_with_the_standards_habit_and_the_reviewers_override(tmp_path, run_cli):
    pdf = _sheet(tmp_path / "c.pdf", [["J1 on W1", "3,125", "11,800"]])
    done = run_cli("extract", pdf, "--standard", "ec5", "-o", tmp_path / "ec5.yaml")
    assert done.exit_code == 0, done.output
    written = (tmp_path / "ec5.yaml").read_text()
    assert "Qf: 3.125 kN" in written and "Qr: 11.8 kN" in written
    done = run_cli("extract", pdf, "--standard", "ec5", "--decimal-mark", "point", "-o", tmp_path / "pt.yaml")
    assert done.exit_code == 0, done.output
    written = (tmp_path / "pt.yaml").read_text()
    assert "Qf: 3125 kN" in written and "Qr: 11800 kN" in written
    done = run_cli("extract", pdf, "--standard", "o86", "-o", tmp_path / "o86.yaml", "--map", _map(tmp_path))
    assert done.exit_code == 0, done.output  # O86 sheets write decimal points: thousands
    assert "Qf: 3125 kN" in (tmp_path / "o86.yaml").read_text()
    done = run_cli("extract", pdf, "--decimal-mark", "dot", "-o", tmp_path / "x.yaml")
    assert done.exit_code == 2 and "--decimal-mark" in done.output and "Traceback" not in done.output


def _map(tmp_path: Path) -> Path:
    """The EN 1995 heads named for a reading under O86's defaults."""
    path = tmp_path / "heads.yaml"
    path.write_text("columns:\n  Qf: {header: '^F_c,90,d'}\n  Qr: {header: '^F_c,90,Rd'}\n")
    return path


def test_a_column_map_may_say_how_the_calc_marks_decimals(tmp_path, run_cli):
    pdf = _sheet(tmp_path / "c.pdf", [["J1 on W1", "3,125", "11,8"]])
    (tmp_path / "map.yaml").write_text("decimal_mark: comma\n")
    done = run_cli("extract", pdf, "--standard", "ec5", "--map", tmp_path / "map.yaml", "-o", tmp_path / "m.yaml")
    assert done.exit_code == 0, done.output
    assert "Qf: 3.125 kN" in (tmp_path / "m.yaml").read_text()
    (tmp_path / "bad.yaml").write_text("decimal_mark: dot\n")
    done = run_cli("extract", pdf, "--map", tmp_path / "bad.yaml", "-o", tmp_path / "b.yaml")
    assert done.exit_code == 2 and "bad.yaml" in done.output and "decimal_mark" in done.output


@pytest.mark.parametrize(
    ("text", "numbers", "value"),
    [
        ("3,125", POINT, 3125.0),  # thousands, as calcs with decimal points print them
        ("1,250.5", POINT, 1250.5),
        ("3,125", Numbers("comma"), 3.125),
        ("-2,5", Numbers("comma"), -2.5),
        ("19500", Numbers("comma"), 19500.0),
        ("12.5", Numbers("comma"), 12.5),  # a point before other than three digits groups no thousands
        ("0.800", Numbers("comma"), 0.8),  # nor after a whole part of 0
        ("3,12", Numbers("point", frozenset({"comma"})), 3.12),
        ("1250,5", Numbers("either"), 1250.5),  # more than three whole digits: no thousands group
    ],
)
def test_numbers_with_one_reading_are_read(text, numbers, value):
    assert read_number(text, numbers) == pytest.approx(value)


@pytest.mark.parametrize(
    ("text", "numbers"),
    [
        ("1,250", Numbers("either")),
        ("1,250", Numbers("comma", frozenset({"point"}))),
        ("1,250", Numbers("point", frozenset({"comma"}))),
        ("1.250", Numbers("comma")),  # a point may group thousands where decimals take a comma
        ("1.250,5", Numbers("comma")),
        ("1,250.5", Numbers("either")),
        ("1,250,000", Numbers("comma")),
        ("3,12", POINT),  # a decimal comma in a calc read with decimal points
    ],
)
def test_numbers_that_read_two_ways_or_none_are_refused_with_the_reason(text, numbers):
    with pytest.raises(NumberProblem, match=f"'{text}'"):
        read_number(text, numbers)


def test_the_marks_a_page_shows_beyond_doubt():
    assert marks_seen(["F_c,90,d = 4,2 kN", "EN 1995-1-1 6.1.5 of 03.12.2026"]) == {"comma"}
    assert marks_seen(["P = 4,200 lb", "lb = 1.5 in"]) == {"point"}
    assert marks_seen(["3,125 kN and 1.250 kN"]) == set()  # three digits after: either habit
