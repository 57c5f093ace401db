"""The comment log's columns, written once: the writer (``report/comment_log.py``) writes them and the
next round's reader (``review/round_answers.py``) reads back the ones the designer and reviewer fill in."""

from __future__ import annotations

# the CSV: one row per number compared at each place
CSV_COLUMNS = (
    "comment",
    "weight",
    "kind",
    "title",
    "check",
    "bearing",
    "calc_label",
    "member",
    "claim",
    "calc_reference",
    "quantity",
    "unit",
    "claimed",
    "recomputed",
    "clause",
    "points",
    "round_status",
    "previous_response",
    "designer_response",
    "disposition",  # the reviewer fills these in on the designer's reply: accepted | not accepted | deferred
    "reviewer_reply",
    "deferred_to",
)

# the workbook's sheet 'Comments': one row per comment
WORKBOOK_COLUMNS = (
    "No.",
    "Weight",
    "Kind",
    "Comment",
    "Where, and the numbers compared",
    "Points",
    "Clause",
    "Calc reference",
    "Status",
    "Previous response",
    "Designer's response",
    "Disposition",
    "Reviewer's reply",
    "Deferred to",
)

# the columns read back, by what they hold: (CSV header, workbook header)
READ_BACK = {
    "number": ("comment", "No."),
    "response": ("designer_response", "Designer's response"),
    "disposition": ("disposition", "Disposition"),
    "reply": ("reviewer_reply", "Reviewer's reply"),
    "stage": ("deferred_to", "Deferred to"),
}

# the columns the writer leaves empty for the designer and the reviewer, in the order both forms end with
FILLED_IN = ("response", "disposition", "reply", "stage")
