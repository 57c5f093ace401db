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
    generated, get_box, handle, box = _box_reader(raw, textpage.raw, rect)
    text_handle = textpage.raw
    run_gap, word_y = SETTINGS.run_gap, SETTINGS.word_y
    codes = buffer[:count]
    # The hot loop of extraction (a few hundred thousand characters in a large package) keeps per run only
    # its span of character indices and its extent: (first, last, the tallest character's height, the
    # widest gap, x0, x1, top, bottom, the first character's top, every box read). The few runs that must
    # be split, or whose gaps give the line's letter spacing, read their characters' boxes again.
    runs: list[tuple[int, int, float, float, float, float, float, float, float, bool]] = []
    first = last = -1  # no run open
    size = widest = x0 = x1 = t = b = t0 = 0.0
    every_box = True
    pl = pr = pt = pb = ph = 0.0
    for i, code in enumerate(codes):
        if code <= 32 or code >= 0xFFFE:
            if code == 32 and generated(handle, i) == 1:
                continue  # pdfium's own guess at a space: the gap rule below decides
            if first >= 0:
                runs.append((first, last, size, widest, x0, x1, t, b, t0, every_box))
                first = -1
            continue
        if not get_box(handle, i, box):
            every_box = every_box and first < 0
            continue
        left = rect.left
        right = rect.right
        top = height - rect.top
        bottom = height - rect.bottom
        h = bottom - top
        if first >= 0:
            gap = left - pr
            # the same run: forward, within a loose gap (wider than any letter spacing, narrower than a
            # column gap: gap <= run_gap * max(h, ph, 1.0)), on the same line or a subscript or superscript
            # of the character before
            if (
                (gap <= run_gap * h or gap <= run_gap * ph or gap <= run_gap)
                and left >= pl - 0.5
                and (-word_y <= top - pt <= word_y or pt - 0.5 <= (top + bottom) / 2 <= pb + 0.5)
            ):
                if gap > widest:
                    widest = gap
                if h > size:
                    size = h
                if right > x1:
                    x1 = right
                if top < t:
                    t = top
                if bottom > b:
                    b = bottom
            else:
                runs.append((first, last, size, widest, x0, x1, t, b, t0, every_box))
                first, size, widest, x0, x1, t, b, t0, every_box = i, h, 0.0, left, right, top, bottom, top, True
        else:
            first, size, widest, x0, x1, t, b, t0, every_box = i, h, 0.0, left, right, top, bottom, top, True
        last = i
        pl = left
        pr = right
        pt = top
        pb = bottom
        ph = h
    if first >= 0:
        runs.append((first, last, size, widest, x0, x1, t, b, t0, every_box))
    word_x, word_gap = SETTINGS.word_x, SETTINGS.word_gap
    # a run with a gap wide enough to split it, whatever the spacing: gap > max(word_x, word_gap * height)
    wide = [r[3] > word_x and r[3] > word_gap * r[2] for r in runs]
    spacing: dict[tuple[int, int], float] = {}
    boxes: dict[int, tuple[list[CharT], list[float]]] = {}  # a run's characters and gaps, read again
    if any(wide):
        # letter spacing is a property of a line's style: estimated from every run of one line and size
        gaps_of_line: dict[tuple[int, int], list[float]] = {}
        for r in runs:
            boxes[r[0]] = _run_chars(codes, r[0], r[1], (get_box, handle, box), rect, height)
            gaps_of_line.setdefault(_line_key(r[8], r[2]), []).extend(boxes[r[0]][1])
        estimates = {key: _letter_spacing(g, key[1]) for key, g in gaps_of_line.items()}
        spacing = {key: _settled(key, value, estimates) for key, value in estimates.items()}
    units = "".join(map(chr, codes))  # one character per code, as the indices count them
    words: list[WordT] = []
    for r, split in zip(runs, wide, strict=True):
        if split:
            chars, gaps = boxes[r[0]]
            words += _split_run(chars, gaps, r[2], spacing[_line_key(r[8], r[2])])
        elif r[9]:  # within a run every space is pdfium's guess, left out
            words.append((units[r[0] : r[1] + 1].replace(" ", ""), r[4], r[5], r[6], r[7]))
        else:
            chars = _run_chars(codes, r[0], r[1], (get_box, handle, box), rect, height)[0]
            words.append(("".join([c[0] for c in chars]), r[4], r[5], r[6], r[7]))
    sample = range(0, count, 16)  # the text's direction, from every sixteenth character
    printed = [i for i in sample if 32 < buffer[i] < 0xFFFE]
    angle = _unchecked(raw.FPDFText_GetCharAngle, ctypes.c_float)
    angle, at = (angle, handle) if angle is not None else (raw.FPDFText_GetCharAngle, text_handle)
    if sum(1 for i in printed if angle(at, i) not in (0.0, -1.0)) * 2 > len(printed):
        raise Sideways()
    return words


CharT = tuple[str, float, float, float, float]  # (text, left, right, top, bottom)


def _unchecked(function, restype=ctypes.c_int):
    """pdfium's ``function`` called without ctypes' per-call argument conversion (pointers and ints passed
    as they are), in the library's own calling convention; the checked binding where that cannot be made.
    The calls below are made once per character of every page read, and the conversion costs more than
    the call itself."""
    try:
        fast = type(function)(ctypes.cast(function, ctypes.c_void_p).value)
        fast.restype = restype
        return fast
    except (TypeError, AttributeError, ValueError):
        return None


def _box_reader(raw, handle, rect):
    """(is generated, loose box, the text page handle, the rectangle argument) for calls as
    ``box(handle, index, rectangle)`` (the character's loose box into ``rect``) and ``generated(handle,
    index)``."""
    box, generated = _unchecked(raw.FPDFText_GetLooseCharBox), _unchecked(raw.FPDFText_IsGenerated)
    if box is None or generated is None:
        return raw.FPDFText_IsGenerated, raw.FPDFText_GetLooseCharBox, handle, rect
    return generated, box, ctypes.c_void_p(ctypes.cast(handle, ctypes.c_void_p).value), ctypes.byref(rect)


def _run_chars(codes, first: int, last: int, reader, rect, height: float) -> tuple[list[CharT], list[float]]:
    """The characters of one run with their boxes, and the gaps between them, as the scan read them: the
    run's spaces are pdfium's guesses and characters without a box are left out, as there."""
    get_box, handle, box = reader
    chars: list[CharT] = []
    gaps: list[float] = []
    for i in range(first, last + 1):
        code = codes[i]
        if code == 32 or not get_box(handle, i, box):
            continue
        left, right = rect.left, rect.right
        if chars:
            gaps.append(left - chars[-1][2])
        chars.append((chr(code), left, right, height - rect.top, height - rect.bottom))
    return chars, gaps


def _line_key(top: float, size: float) -> tuple[int, int]:
    """Runs of one line in one size share a key: (top, height) in whole points (top in steps of two)."""
    return round(top / 2), round(size)


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


def _split_run(run: list[CharT], gaps: list[float], size: float, spacing: float) -> list[WordT]:
    """A run of characters into words: a gap wider than the line's letter spacing by more than a
    fraction of the font height starts a word."""
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
