"""The claims of a calc's PDF as a command reads them: what the reader says of the document, and a
located refusal when it found no check to read."""

from __future__ import annotations

from pathlib import Path

from audit.core.errors import InputError, Location
from audit.inputs.pdf.extract import Extraction


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
