"""The comment log's columns are written once (review/log_columns.py): the writer writes them, and the
next round reads back the ones the designer and the reviewer fill in, in the CSV and the workbook alike."""

from __future__ import annotations

import csv
import io

import pytest

from audit.inputs.read_claims import read_claims
from audit.report.comment_log import comments_csv, comments_xlsx
from audit.review.comments import build_comments
from audit.review.log_columns import CSV_COLUMNS, FILLED_IN, READ_BACK, WORKBOOK_COLUMNS
from audit.review.reconcile import reconcile
from audit.review.review import review_model
from audit.review.round_answers import read_log
from tests.conftest import DEMO, ROOT


@pytest.fixture(scope="module")
def demo():
    review = review_model(DEMO)
    claims = read_claims(ROOT / "fixtures/demo/claims.yaml")
    rec = reconcile(review, claims)
    return review, rec, build_comments(review, rec, claims)


def test_every_column_read_back_is_one_the_writer_writes_in_both_forms():
    for in_csv, in_book in READ_BACK.values():
        assert in_csv in CSV_COLUMNS and in_book in WORKBOOK_COLUMNS


def test_the_columns_left_to_fill_in_are_the_last_of_both_forms():
    # the writer appends one empty cell per FILLED_IN column: they must be the columns that end each row
    n = len(FILLED_IN)
    assert list(CSV_COLUMNS[-n:]) == [READ_BACK[role][0] for role in FILLED_IN]
    assert list(WORKBOOK_COLUMNS[-n:]) == [READ_BACK[role][1] for role in FILLED_IN]


def test_a_response_written_into_the_csv_log_reads_back_through_the_shared_columns(demo, tmp_path):
    _, _, comments = demo
    rows = list(csv.reader(io.StringIO(comments_csv(comments))))
    assert tuple(rows[0]) == CSV_COLUMNS
    at = rows[0].index(READ_BACK["response"][0])
    rows[1][at] = "Added the check on sheet S-4"
    log = tmp_path / "log.csv"
    with log.open("w", newline="", encoding="utf-8") as out:
        csv.writer(out).writerows(rows)
    first = int(rows[1][rows[0].index(READ_BACK["number"][0])])
    assert read_log(log).responses == {first: "Added the check on sheet S-4"}


def test_a_disposition_written_into_the_workbook_reads_back_through_the_shared_columns(demo, tmp_path):
    openpyxl = pytest.importorskip("openpyxl")
    review, rec, comments = demo
    book = openpyxl.load_workbook(io.BytesIO(comments_xlsx(review, rec, comments)))
    sheet = book["Comments"]
    head = [cell.value for cell in sheet[1]]
    assert tuple(head) == WORKBOOK_COLUMNS
    sheet.cell(2, head.index(READ_BACK["response"][1]) + 1, "Bearing length corrected")
    sheet.cell(2, head.index(READ_BACK["disposition"][1]) + 1, "not accepted")
    sheet.cell(2, head.index(READ_BACK["reply"][1]) + 1, "The plate is still 89 mm wide")
    log = tmp_path / "log.xlsx"
    book.save(log)
    number = sheet.cell(2, head.index(READ_BACK["number"][1]) + 1).value
    answers = read_log(log)
    assert answers.responses == {number: "Bearing length corrected"}
    assert answers.dispositions[number].word == "not accepted"
    assert answers.dispositions[number].reply == "The plate is still 89 mm wide"
