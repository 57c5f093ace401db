"""Words and vertical rules of a page straight from pdfium: its characters with their loose (font)
boxes, and its path objects. Much faster than a full layout parse; pdfplumber stays the fallback
for what this cannot read (text turned sideways, a page pdfium will not open)."""

from __future__ import annotations

import ctypes

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
    """Characters into words as they are read: same line (tops within the tolerance), no space and no gap
    between. One call fetches every character's code; one more per character its loose (font) box."""
    count = textpage.count_chars()
    if count <= 0:
        return []
    buffer = (ctypes.c_ushort * (count + 1))()
    raw.FPDFText_GetText(textpage.raw, 0, count, buffer)
    rect = raw.FS_RECTF()
    get_box = raw.FPDFText_GetLooseCharBox
    handle = textpage.raw
    gap_x, gap_y = SETTINGS.word_x, SETTINGS.word_y
    words: list[WordT] = []
    text: list[str] = []
    x0 = x1 = t = b = 0.0
    for i in range(count):
        code = buffer[i]
        if code <= 32 or code >= 0xFFFE:  # spaces, line ends and markers end a word
            if text:
                words.append(("".join(text), x0, x1, t, b))
                text = []
            continue
        if not get_box(handle, i, rect):
            continue
        left, right, top, bottom = rect.left, rect.right, height - rect.top, height - rect.bottom
        if text and abs(top - t) <= gap_y and left - x1 <= gap_x and left >= x0 - 0.5:
            text.append(chr(code))
            if right > x1:
                x1 = right
            if bottom > b:
                b = bottom
            if top < t:
                t = top
        else:
            if text:
                words.append(("".join(text), x0, x1, t, b))
            text, x0, x1, t, b = [chr(code)], left, right, top, bottom
    if text:
        words.append(("".join(text), x0, x1, t, b))
    sample = range(0, count, 16)  # the text's direction, from every sixteenth character
    printed = [i for i in sample if 32 < buffer[i] < 0xFFFE]
    if sum(1 for i in printed if raw.FPDFText_GetCharAngle(handle, i) not in (0.0, -1.0)) * 2 > len(printed):
        raise Sideways()
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
