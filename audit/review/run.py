"""A review run: the files checked, the model read and reviewed, the claims read and reconciled,
the comments built and matched with the last round. The command line parses its options into a
``RunRequest``, calls ``run_review`` and prints the ``ReviewRun``; ``report/outputs.py`` writes it."""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass
from pathlib import Path

from audit.core.errors import InputError, visible
from audit.engine.model import Model
from audit.inputs.calc_pdf import decimal_mark_of
from audit.inputs.input_files import check_files
from audit.inputs.pdf.extract import Extraction
from audit.inputs.read_claims import Claim, merge_claim_sources, read_claims
from audit.review.comments import Comment, build_comments
from audit.review.findings import Finding
from audit.review.reconcile import Reconciliation, failing_without_claims, reconcile
from audit.review.review import Review, review_model
from audit.review.round_answers import check_dispositions, read_dispositions, read_last_round, read_log
from audit.review.round_files import responses_left_out
from audit.review.rounds import ASKING, Round, first_round, input_hashes, next_round

# what reads a calc's PDF for a run (the command line's, which shows progress and says what it read):
# (pdf, pages, column map, the standard's own symbols, its decimal mark) -> the extraction
ReadCalcPdf = Callable[[Path, str | None, Path | None, dict[str, str] | None, str | None], Extraction]

# A layout is short for the model it expands to (about 65 times smaller): outputs are bounded by
# the expanded model as if it had been typed, each member, bearing and load entry counted at a
# little less than the explicit model writes one (the layout demo: 545 entries in 96 KB, 176 each).
BYTES_PER_ENTRY = 160


@dataclass(frozen=True)
class RunRequest:
    """The files of one review run, by the option that named them."""

    model: Path
    claims: Path | None = None
    calc_pdf: Path | None = None
    pages: str | None = None
    column_map: Path | None = None
    previous: Path | None = None
    responses: Path | None = None
    dispositions: Path | None = None
    outputs: tuple[tuple[str, Path | None], ...] = ()  # (option, path), checked before anything is read
    rules_dirs: tuple[Path, ...] = ()
    rule_pack: str | None = None


@dataclass(frozen=True)
class ReviewRun:
    """Everything a run found, ready to print and write."""

    review: Review
    claims: tuple[Claim, ...]
    reconciliation: Reconciliation | None
    findings: tuple[Finding, ...]
    comments: tuple[Comment, ...]
    round: Round
    input_bytes: int  # bounds the outputs

    @property
    def needs_revision(self) -> bool:
        """A check fails, or a finding asks for safety or a revision."""
        serious = any(f.severity in ("safety", "revise") for f in self.findings)
        return serious or any(not r.passes for r in self.review.results)


def expanded_bytes(model: Model) -> int:
    """A lower estimate of the size of the explicit model a layout expands to (0 for a typed model)."""
    if model.frame is None:
        return 0
    return BYTES_PER_ENTRY * (len(model.members) + len(model.bearings) + len(model.loads))


def run_review(request: RunRequest, read_calc_pdf: ReadCalcPdf, warn: Callable[[str], None]) -> ReviewRun:
    """Run the review; ``warn`` is told each warning as it arises (a line for stderr). Raises InputError."""
    input_bytes = check_files(
        {
            "MODEL": request.model,
            "--claims": request.claims,
            "--calc-pdf": request.calc_pdf,
            "--map": request.column_map,
            "--previous": request.previous,
            "--responses": request.responses,
            "--dispositions": request.dispositions,
        },
        dict(request.outputs),
        request.rules_dirs,
    )
    result = review_model(request.model, request.rules_dirs, request.rule_pack)
    claim_list = read_claims(request.claims, result.standard) if request.claims else ()
    if request.calc_pdf:
        decimal = decimal_mark_of(result.standard)  # the standard's habit; points if none
        extracted = read_calc_pdf(
            request.calc_pdf, request.pages, request.column_map, result.standard.claim_headers, decimal
        )
        claim_list = merge_claim_sources(claim_list, extracted.claims, request.calc_pdf.name)
    for warning in result.model.warnings:
        warn(f"warning: {visible(warning)}")
    input_bytes = max(input_bytes, expanded_bytes(result.model))
    rec = reconcile(result, claim_list) if (request.claims or request.calc_pdf) else None
    findings = rec.findings if rec else result.engine_findings + failing_without_claims(result)
    comments = build_comments(result, rec, claim_list)
    comments, round_ = _matched_round(request, result, comments, warn)
    return ReviewRun(result, claim_list, rec, findings, comments, round_, input_bytes)


def _matched_round(
    request: RunRequest, result: Review, comments: tuple[Comment, ...], warn: Callable[[str], None]
) -> tuple[tuple[Comment, ...], Round]:
    """This round's comments, renumbered against the last round where one is given, and the round."""
    inputs = input_hashes(
        {"model": request.model, "claims": request.claims, "calc_pdf": request.calc_pdf, "map": request.column_map}
    )
    title = result.model.project.title
    if not request.previous:
        return comments, first_round(comments, title, inputs)
    last = read_last_round(request.previous, title)
    answers = read_log(request.responses) if request.responses else None
    disposed = dict(answers.dispositions) if answers else {}
    if request.dispositions:
        for number, d in read_dispositions(request.dispositions).items():
            if number in disposed and disposed[number] != d:
                raise InputError(f"comment {number} has another disposition at {disposed[number].loc}", d.loc)
            disposed[number] = d
    check_dispositions(disposed, last)
    if answers:
        asked = {e.number for e in last.comments if e.status in ASKING}
        known = {e.number for e in last.comments}
        for warning in responses_left_out(answers.responses, asked, known, str(request.responses)):
            warn(f"warning: {warning}")
    return next_round(comments, last, result.model, inputs, answers.responses if answers else {}, disposed)
