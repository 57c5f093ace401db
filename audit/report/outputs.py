"""The files a review run writes (letter, appendix, JSON, comment logs), all at once or none."""

from __future__ import annotations

import datetime as dt
from dataclasses import dataclass
from pathlib import Path

from audit.core.outfiles import Output, output_limit, write_outputs
from audit.report.comment_log import comments_csv, comments_xlsx
from audit.report.memo import MemoOptions, appendix_chunks, findings_json_chunks, memo_chunks
from audit.review.run import ReviewRun


@dataclass(frozen=True)
class RunOutputs:
    """Where a run writes each of its files (None: not written), and what the letter holds."""

    memo: Path | None = None
    appendix: Path | None = None
    json: Path | None = None
    csv: Path | None = None
    xlsx: Path | None = None
    date: dt.date | None = None
    all_derivations: bool = False

    def by_option(self) -> tuple[tuple[str, Path | None], ...]:
        """Each output by the option that names it, as the files are checked before the run reads anything."""
        return (
            ("--memo", self.memo),
            ("--appendix", self.appendix),
            ("--json", self.json),
            ("--csv", self.csv),
            ("--xlsx", self.xlsx),
        )


def run_outputs(run: ReviewRun, wanted: RunOutputs) -> list[Output]:
    """The outputs asked for, each with the maker of its text (nothing is rendered yet)."""
    result, rec, claims, comments, round_ = run.review, run.reconciliation, run.claims, run.comments, run.round
    options = MemoOptions(
        date=wanted.date,
        all_derivations=wanted.all_derivations,
        comments=comments,
        round=round_,
        appendix=wanted.appendix.name if wanted.appendix else None,  # the letter names its appendix by the file's name
        workbook=wanted.xlsx.name if wanted.xlsx else None,
        json=wanted.json.name if wanted.json else None,
    )
    outputs = []
    if wanted.memo:
        outputs.append(Output("--memo", wanted.memo, lambda: memo_chunks(result, rec, claims, options)))
    if wanted.appendix:
        outputs.append(Output("--appendix", wanted.appendix, lambda: appendix_chunks(result, rec, claims, options)))
    if wanted.json:
        outputs.append(
            Output("--json", wanted.json, lambda: findings_json_chunks(result, rec, run.findings, comments, round_))
        )
    if wanted.csv:
        outputs.append(Output("--csv", wanted.csv, lambda: comments_csv(comments, round_)))
    if wanted.xlsx:
        outputs.append(Output("--xlsx", wanted.xlsx, lambda: [comments_xlsx(result, rec, comments, round_)]))
    return outputs


def write_run(run: ReviewRun, wanted: RunOutputs) -> tuple[Path, ...]:
    """Write every output asked for, or none (an InputError says why); the paths written, in order."""
    outputs = run_outputs(run, wanted)
    write_outputs(outputs, output_limit(run.input_bytes))
    return tuple(out.path for out in outputs)
