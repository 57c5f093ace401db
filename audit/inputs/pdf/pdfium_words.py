"""Words and vertical rules of a page straight from pdfium: its characters with their loose (font)
boxes, and its path objects. Much faster than a full layout parse; pdfplumber stays the fallback
for what this cannot read (text turned sideways, a page pdfium will not open)."""

from __future__ import annotations

import ctypes
import itertools

from audit.inputs.pdf.settings import SETTINGS

WordT = tuple[str, float, float, float, float]
EdgeT = tuple[float, float, float]


class Sideways(Exception):
    """Most of the page's text runs sideways: the caller reads it another way."""


def page_words_pdfium(page, textpage=None) -> tuple[list[WordT], list[EdgeT]]:
    """(words, vertical rules) in pdfplumber's frame: x from the left, top from the top of the page."""
    import pypdfium2.raw as raw

    height = page.get_height()
    if textpage is not None:
        return _words(raw, textpage, height), _rules(raw, page, height)
    own = page.get_textpage()
    try:
        words = _words(raw, own, height)
    finally:
        own.close()
    return words, _rules(raw, page, height)


def _words(raw, textpage, height: float) -> list[WordT]:
    """Characters into words as they are read. One call fetches every character's code; one more per
    character its loose (font) box. Runs of characters on one line are split into words where a gap is
    wide for the font (relative to the characters' height and to the run's own letter spacing), never
    at a fixed distance: letter-spaced text and text of any size read as the words they print. The
    spaces pdfium guesses are ignored (they split letter-spaced words); the file's own spaces and line
    ends always end a word."""
    count = textpage.count_chars()
    if count <= 0:
        return []
    buffer = (ctypes.c_ushort * (count + 1))()
    raw.FPDFText_GetText(textpage.raw, 0, count, buffer)
    rect = raw.FS_RECTF()
    get_box = raw.FPDFText_GetLooseCharBox
    generated = raw.FPDFText_IsGenerated
    handle = textpage.raw
    runs: list[list[CharT]] = []
    run: list[CharT] = []
    for i in range(count):
        code = buffer[i]
        if code <= 32 or code >= 0xFFFE:
            if code == 32 and generated(handle, i) == 1:
                continue  # pdfium's own guess at a space: the gap rule below decides
            if run:
                runs.append(run)
                run = []
            continue
        if not get_box(handle, i, rect):
            continue
        c = (chr(code), rect.left, rect.right, height - rect.top, height - rect.bottom)
        if run and not _same_run(run[-1], c):
            runs.append(run)
            run = []
        run.append(c)
    if run:
        runs.append(run)
    # letter spacing is a property of a line's style: estimated from every run of one line and size
    gaps_of_line: dict[tuple[int, int], list[float]] = {}
    for r in runs:
        gaps_of_line.setdefault(_line_key(r), []).extend(b[1] - a[2] for a, b in itertools.pairwise(r))
    estimates = {key: _letter_spacing(gaps, key[1]) for key, gaps in gaps_of_line.items()}
    spacing = {key: _settled(key, value, estimates) for key, value in estimates.items()}
    words: list[WordT] = []
    for r in runs:
        words += _split_run(r, spacing[_line_key(r)])
    sample = range(0, count, 16)  # the text's direction, from every sixteenth character
    printed = [i for i in sample if 32 < buffer[i] < 0xFFFE]
    if sum(1 for i in printed if raw.FPDFText_GetCharAngle(handle, i) not in (0.0, -1.0)) * 2 > len(printed):
        raise Sideways()
    return words


CharT = tuple[str, float, float, float, float]  # (text, left, right, top, bottom)


def _same_run(prev: CharT, c: CharT) -> bool:
    """The character follows the one before on its line: it starts at or after it, within a loose gap
    (wider than any letter spacing, narrower than a column gap), and it stands on the same line or
    as a subscript or superscript of it (its middle within the earlier character's height)."""
    size = max(prev[4] - prev[3], c[4] - c[3], 1.0)
    gap = c[1] - prev[2]
    if gap > SETTINGS.run_gap * size or c[1] < prev[1] - 0.5:
        return False
    middle = (c[3] + c[4]) / 2
    return abs(c[3] - prev[3]) <= SETTINGS.word_y or prev[3] - 0.5 <= middle <= prev[4] + 0.5


def _line_key(run: list[CharT]) -> tuple[int, int]:
    """Runs of one line in one size share a key: (top, height) in whole points (top in steps of two)."""
    return round(run[0][3] / 2), round(max(c[4] - c[3] for c in run))


def _letter_spacing(gaps: list[float], size: float) -> tuple[float, float | None]:
    """A line's letter spacing, and its even gap where that is uncertain. Where the gaps fall in two
    groups (letters and the wider spaces between words) the spacing is the lower quartile gap; where
    they are all alike, letter spacing if narrower than a space; else uncertain (spaced letters of
    one-word cells, or one-letter words): settled by the page's other lines."""
    if len(gaps) < 2:
        return 0.0, None
    low = max(0.0, sorted(gaps)[len(gaps) // 4])
    two_groups = max(gaps) > low + SETTINGS.word_gap * size
    if two_groups or low <= SETTINGS.alike_letter_spacing * size:
        return min(low, SETTINGS.max_letter_spacing * size), None
    return 0.0, low


def _settled(key: tuple[int, int], estimate: tuple[float, float | None], all_: dict) -> float:
    """An uncertain line's spacing: its even gap where a certain line of the page in the same size is
    spaced alike (a letter-spaced table: its one-word cells and its longer ones), else none."""
    spacing, even = estimate
    if even is None:
        return spacing
    for (_, size), (other, other_even) in all_.items():
        if other_even is None and other > 0 and abs(size - key[1]) <= 1 and abs(other - even) <= 0.08 * key[1]:
            return even
    return 0.0


def _split_run(run: list[CharT], spacing: float) -> list[WordT]:
    """A run of characters into words: a gap wider than the line's letter spacing by more than a
    fraction of the font height starts a word."""
    gaps = [b[1] - a[2] for a, b in itertools.pairwise(run)]
    size = max(c[4] - c[3] for c in run)
    limit = max(SETTINGS.word_x, spacing + SETTINGS.word_gap * size)
    words: list[WordT] = []
    text = [run[0][0]]
    _, x0, x1, t, b = run[0]
    for c, gap in zip(run[1:], gaps, strict=True):
        if gap > limit:
            words.append(("".join(text), x0, x1, t, b))
            text, x0, x1, t, b = [c[0]], c[1], c[2], c[3], c[4]
            continue
        text.append(c[0])
        x1, t, b = max(x1, c[2]), min(t, c[3]), max(b, c[4])
    words.append(("".join(text), x0, x1, t, b))
    return words


def _rules(raw, page, height: float) -> list[EdgeT]:
    """Vertical rules: thin path objects, and the left and right sides of rectangles (cell walls)."""
    out: list[EdgeT] = []
    left, bottom, right, top = (ctypes.c_float() for _ in range(4))
    for i in range(raw.FPDFPage_CountObjects(page.raw)):
        obj = raw.FPDFPage_GetObject(page.raw, i)
        if raw.FPDFPageObj_GetType(obj) != raw.FPDF_PAGEOBJ_PATH:
            continue
        if not raw.FPDFPageObj_GetBounds(obj, left, bottom, right, top):
            continue
        x0, x1, y0, y1 = left.value, right.value, height - top.value, height - bottom.value
        if y1 - y0 <= SETTINGS.min_ruling:
            continue
        if x1 - x0 <= 2.0:
            out.append((round((x0 + x1) / 2, 1), y0, y1))
        else:
            out.append((round(x0, 1), y0, y1))
            out.append((round(x1, 1), y0, y1))
    return out
