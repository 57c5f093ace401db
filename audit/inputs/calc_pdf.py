"""The claims of a calc's PDF as a command reads them: what the reader says of the document, and a
located refusal when it found no check to read."""

from __future__ import annotations

import sys
from collections.abc import Callable
from pathlib import Path

from audit.core.errors import InputError, Location
from audit.inputs.pdf.extract import Extraction


def decimal_mark_of(standard: object) -> str:
    """How a standard's calc sheets mark decimals (its ``decimal_mark``; points where it declares none)."""
    return str(getattr(standard, "decimal_mark", "point"))


def _to_stderr(line: str) -> None:
    print(line, file=sys.stderr)


def read_calc_pdf(
    pdf: Path,
    pages: str | None,
    column_map: Path | None,
    headers: dict[str, str] | None = None,
    standard_decimal: str | None = None,
    decimal_mark: str | None = None,
    warn: Callable[[str], None] = _to_stderr,
) -> Extraction:
    """Run the extraction with a progress bar on long documents (a terminal only); its notes go to ``warn``;
    a document that gave no claim is refused."""
    from audit.inputs.pdf.extract import extract, read_column_map

    cmap = read_column_map(column_map, headers) if column_map else None
    bar = None
    if sys.stderr.isatty():
        from rich.progress import Progress  # rich comes with typer

        bar = Progress(transient=True)
        bar.start()
        task = bar.add_task("reading pages", total=None)

        def advance(n: int) -> None:
            bar.update(task, advance=n)

    try:
        result = extract(
            pdf,
            pages,
            cmap,
            progress=advance if bar else None,
            standard_headers=headers,
            decimal_mark=decimal_mark,
            standard_decimal=standard_decimal,
        )
    finally:
        if bar:
            bar.stop()
    for line in extraction_notes(pdf, result):
        warn(line)
    require_claims(pdf, pages, result)
    return result


def extraction_notes(pdf: Path, result: Extraction) -> list[str]:
    """The lines the reader says of a document, warnings first, its coverage last."""
    notes = [f"warning: {warning}" for warning in result.warnings]
    if result.no_text_pages:
        listed = ", ".join(str(p) for p in result.no_text_pages[:30])
        more = " ..." if len(result.no_text_pages) > 30 else ""
        notes.append(f"warning: {pdf}: pages {listed}{more} have no text layer: they need OCR first")
    notes += [f"warning: {pdf}: {item.line()}" for item in result.unread]
    notes.append(f"{pdf}: {result.coverage()}")
    return notes


def require_claims(pdf: Path, pages: str | None, result: Extraction) -> None:
    """Refuse a document that gave no claim, naming where the trade's symbols were seen."""
    if result.claims:
        return
    where = f"pages {pages}" if pages else f"{result.pages_scanned} pages"
    if result.candidate_pages:
        listed = ", ".join(str(p) for p in result.candidate_pages[:20])
        raise InputError(
            f"bearing-check symbols on pages {listed}, but no check could be read there: look at those pages "
            "and give a --map naming their column headers (see the README, Claims from the calc's PDF)",
            Location(str(pdf), 1, 1, "(document)"),
        )
    raise InputError(
        f"no bearing checks found in {where} (no table headed Qf/Qr and no line such as 'Qr = 45.2 kN >= "
        "Qf = 31.0 kN'); give a --map for unusual headers",
        Location(str(pdf), 1, 1, "(document)"),
    )
