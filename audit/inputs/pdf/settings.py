"""Every tolerance of the PDF reader in one place: how close words must be to share a line, how
wide a gap splits cells, how much of a page is too much to read."""

from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class Tolerances:
    word_x: float = 1.5  # pt: characters closer than this make one word (pdfplumber x_tolerance)
    word_y: float = 2.5  # pt: and as close vertically (pdfplumber y_tolerance)
    line: float = 2.5  # pt: words whose tops differ by at most this stand on one line
    cell_gap: float = 7.0  # pt: a wider gap between words starts a new cell
    cell_slack: float = 3.0  # pt: a cell may overhang its column by this much
    min_ruling: float = 3.0  # pt: vertical rules shorter than this are not column rules
    running_lines: int = 3  # lines at a page's head (running header) that do not end a continued table
    footer_lines: int = 3  # a table whose last row is this near the foot of the page may go on
    max_page_text: int = 400_000  # characters; a page with more is skipped with a warning
    max_page_objects: int = 100_000  # drawing objects; a page with more is skipped with a warning
    max_document_text: int = 20_000_000  # characters in all pages read; the pages past it are named, not read


SETTINGS = Tolerances()
