"""Every tolerance of the PDF reader in one place: how close words must be to share a line, how
wide a gap splits cells, how much of a page is too much to read."""

from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class Tolerances:
    word_x: float = 1.5  # pt: characters closer than this make one word (pdfplumber x_tolerance)
    word_y: float = 2.5  # pt: and as close vertically (pdfplumber y_tolerance)
    word_gap: float = 0.15  # of the font's height: a gap wider than the letter spacing by this starts a word
    max_letter_spacing: float = 0.5  # of the font's height: the widest letter spacing read as such
    alike_letter_spacing: float = 0.2  # of the font's height: even gaps narrower than this are letter spacing
    run_gap: float = 1.0  # of the font's height: a wider gap always ends a word (a space or a new cell)
    line: float = 2.5  # pt: words whose tops differ by at most this stand on one line
    cell_gap: float = 7.0  # pt: a wider gap between words starts a new cell
    head_cell_words: int = 5  # a cell of more words is text, not a band of a table head
    band_pitch: float = 2.0  # of the text height: bands of one head stand at most this far apart
    head_bands: int = 5  # the deepest head read (bands over the symbols, the symbols, a units row)
    cell_slack: float = 3.0  # pt: a cell may overhang its column by this much
    min_ruling: float = 3.0  # pt: vertical rules shorter than this are not column rules
    running_lines: int = 3  # lines at a page's head (running header) that do not end a continued table
    footer_lines: int = 3  # a table whose last row is this near the foot of the page may go on
    max_page_text: int = 400_000  # characters; a page with more is skipped with a warning
    max_page_objects: int = 100_000  # drawing objects; a page with more is skipped with a warning
    max_document_text: int = 20_000_000  # characters in all pages read; the pages past it are named, not read
    max_document_objects: int = 2_000_000  # drawing objects (in form objects too) of all pages; likewise
    shared_content_after: int = 2_000_000  # characters read: past it, pages that share content are read once


SETTINGS = Tolerances()
