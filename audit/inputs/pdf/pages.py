"""Pages: which to read, the cheap text scan (pdfium) for candidates, and word positions and rulings
(pdfplumber) of the candidates, in parallel over the cores."""

from __future__ import annotations

import re
from collections.abc import Callable, Iterator
from concurrent.futures import ProcessPoolExecutor
from dataclasses import dataclass, field
from pathlib import Path

from audit.core.errors import InputError, Location
from audit.inputs.pdf.columns import Vocabulary
from audit.inputs.pdf.pdfium_words import page_words_pdfium
from audit.inputs.pdf.settings import SETTINGS


def parse_pages(spec: str | None, count: int, where: Location) -> list[int]:
    """'12-30,35' -> [12..30, 35] (1-based), within the document."""
    if not spec:
        return list(range(1, count + 1))
    out: list[int] = []
    for part in str(spec).split(","):
        m = re.fullmatch(r"\s*(\d+)\s*(?:-\s*(\d+)\s*)?", part)
        if not m:
            raise InputError(f"pages '{spec}' must look like 12-30,35", where)
        a, b = int(m[1]), int(m[2] or m[1])
        if a < 1 or b < a:
            raise InputError(f"page range '{part.strip()}' is empty or starts below 1", where)
        if a > count:
            raise InputError(f"page {a} is beyond the document's {count} pages", where)
        out += range(a, min(b, count) + 1)
    return sorted(set(out))


def open_document(path: Path):
    """Open with pdfium, turning every failure into a one-line InputError."""
    import pypdfium2 as pdfium

    where = Location(str(path), 1, 1, "(document)")
    try:
        with path.open("rb") as handle:
            head = handle.read(1024)
    except OSError as exc:
        raise InputError(f"cannot read file: {exc.strerror or exc}", where) from None
    if b"%PDF-" not in head:
        raise InputError("not a PDF file (no %PDF- header)", where)
    try:
        return pdfium.PdfDocument(str(path))
    except pdfium.PdfiumError as exc:
        text = str(exc).lower()
        if "password" in text:
            raise InputError(
                "the PDF is encrypted: open it with its password and save an unprotected copy", where
            ) from None
        raise InputError(f"the PDF is damaged or truncated and cannot be read ({exc})", where) from None


def count_objects(raw, page, limit: int) -> int:
    """A page's drawing objects, those inside form objects (nested or not) included; the count stops once
    it passes ``limit``, so a page of a million objects costs no more than the limit to count."""
    total = 0
    todo = [(None, raw.FPDFPage_CountObjects(page))]  # (form object or None for the page, its object count)
    while todo and total <= limit:
        form, count = todo.pop()
        total += max(count, 0)
        for i in range(max(count, 0)):
            if total > limit:
                break
            obj = raw.FPDFPage_GetObject(page, i) if form is None else raw.FPDFFormObj_GetObject(form, i)
            if obj and raw.FPDFPageObj_GetType(obj) == raw.FPDF_PAGEOBJ_FORM:
                todo.append((obj, raw.FPDFFormObj_CountObjects(obj)))
    return total


@dataclass
class Scan:
    """What the cheap pass found, filled as it goes: candidate pages, pages with no text layer, warnings."""

    candidates: list[int] = field(default_factory=list)
    empty: list[int] = field(default_factory=list)
    warnings: list[str] = field(default_factory=list)


def content_keys(path: Path) -> dict[int, str]:
    """page -> what it draws as the file says it (its content streams, resources, boxes and rotation), from
    the page tree alone (no page is loaded): pages with one key draw the same thing. Empty where the file
    cannot be read that way. Asked for only once a document's work has grown large."""
    try:
        from pdfminer.pdfdocument import PDFDocument
        from pdfminer.pdfpage import PDFPage
        from pdfminer.pdfparser import PDFParser

        keys: dict[int, str] = {}
        with path.open("rb") as handle:
            document = PDFDocument(PDFParser(handle))
            for number, page in enumerate(PDFPage.create_pages(document), start=1):
                attrs = page.attrs
                if "Contents" not in attrs:
                    continue
                keys[number] = repr(
                    tuple(attrs.get(k) for k in ("Contents", "Resources", "MediaBox", "CropBox", "Rotate"))
                )
        return keys
    except Exception:  # a file pdfminer cannot walk: every page is read on its own
        return {}


def scan_pages(
    path: Path, pages: list[int], vocabulary: Vocabulary, wants: Callable[[int], bool], found: Scan
) -> Iterator[tuple[int, PageData | None]]:
    """One pass over ``pages`` in order: each page's text is read and searched for the ``vocabulary``
    (the trade's symbols and the standard's heads; every page with text under a column map of the
    reviewer's own heads). Yields (page, its words and rules) for every candidate, and for every other
    page that ``wants(page)`` asks for when the pass reaches it (the page after one whose table goes on:
    the caller has read the pages before by then); words None where pdfium cannot give them (sideways
    text): ``page_words`` reads those. The work is bounded per document as well as per page: characters
    and drawing objects (those in form objects counted) of all pages read so far."""
    import pypdfium2.raw as pdfium_raw

    doc = open_document(path)
    scanned = objects_seen = 0
    refused: set[int] = set()  # pages too large to read
    # once the work grows large, pages that draw what an earlier page drew (one content stream shared by
    # many pages) are known from the page tree and take that page's outcome without being loaded
    keys: dict[int, str] | None = None
    first_of: dict[str, int] = {}  # a content key -> the first page read with it
    outcome: dict[int, tuple[bool, bool, PageData | None]] = {}  # page -> (no text, candidate, words)
    try:
        for at, number in enumerate(pages):
            if (bound := _document_bound(scanned, objects_seen)) is not None:
                rest = pages[at:]
                span = f"page {rest[0]}" if len(rest) == 1 else f"pages {rest[0]} to {rest[-1]} ({len(rest)} pages)"
                found.warnings.append(
                    f"{span}: not read, the pages before already hold more than {bound} (the bound of one "
                    "document's work); give --pages to read the rest"
                )
                break
            data: PageData | None = None
            if keys is None and (refused or scanned > SETTINGS.shared_content_after):
                keys = content_keys(path)
                for earlier in sorted(refused):
                    if earlier in keys:
                        first_of.setdefault(keys[earlier], earlier)
            key = keys.get(number) if keys else None
            if key is not None and (same := first_of.get(key)) is not None:
                if same in refused:
                    found.warnings.append(f"page {number}: draws what page {same} draws, too much to read; skipped")
                    continue
                if same in outcome:
                    no_text, candidate, data = outcome[same]
                    if no_text:
                        found.empty.append(number)
                    elif candidate:
                        found.candidates.append(number)
                    if candidate or wants(number):
                        yield number, data
                    continue
            if key is not None:
                first_of.setdefault(key, number)
            try:
                page = doc[number - 1]
                try:
                    objects = count_objects(pdfium_raw, page.raw, SETTINGS.max_page_objects)
                    objects_seen += objects
                    if objects > SETTINGS.max_page_objects:
                        found.warnings.append(f"page {number}: {objects} drawing objects, too many to read; skipped")
                        refused.add(number)
                        continue
                    textpage = page.get_textpage()
                    try:
                        count = textpage.count_chars()
                        scanned += max(count, 0)
                        if count > SETTINGS.max_page_text:
                            found.warnings.append(f"page {number}: {count} characters, too many to read; skipped")
                            refused.add(number)
                            continue
                        text = textpage.get_text_range() if count else ""
                        candidate = vocabulary.picks(text)
                        if candidate or wants(number):
                            try:
                                data = (*page_words_pdfium(page, textpage), "") if text.strip() else ([], [], "")
                            except Exception:  # sideways text or the like: page_words reads it
                                data = None
                            read = True
                        else:
                            read = False
                    finally:
                        textpage.close()
                finally:
                    page.close()
            except Exception as exc:  # a damaged page must not stop the others
                found.warnings.append(f"page {number}: cannot be read ({type(exc).__name__}); skipped")
                continue
            if not text.strip():
                found.empty.append(number)
            elif candidate:
                found.candidates.append(number)
            if key is not None and (read or not candidate):
                outcome[number] = (not text.strip(), candidate, data if read else None)
            if read:
                yield number, data
    finally:
        doc.close()


def _document_bound(characters: int, objects: int) -> str | None:
    if characters > SETTINGS.max_document_text:
        return f"{SETTINGS.max_document_text:,} characters"
    if objects > SETTINGS.max_document_objects:
        return f"{SETTINGS.max_document_objects:,} drawing objects"
    return None


# A page's words as plain tuples (cheap to send between processes): (text, x0, x1, top, bottom)
WordT = tuple[str, float, float, float, float]
# A vertical ruling segment: (x, top, bottom)
EdgeT = tuple[float, float, float]
PageData = tuple[list[WordT], list[EdgeT], str]


def _words_of_pages(args: tuple[str, list[int]]) -> list[tuple[int, list[WordT], list[EdgeT], str]]:
    """Words and rules of each page: from pdfium's characters and paths; from pdfplumber where the text runs
    sideways or pdfium cannot read the page."""
    import pypdfium2 as pdfium

    path, pages = args
    out = []
    plumber = None
    doc = pdfium.PdfDocument(path)
    try:
        for number in pages:
            try:
                page = doc[number - 1]
                try:
                    words, edges = page_words_pdfium(page)
                finally:
                    page.close()
                out.append((number, words, edges, ""))
                continue
            except Exception:  # sideways text, or objects pdfium will not give: the full layout parse reads it
                pass
            try:
                if plumber is None:
                    import pdfplumber

                    plumber = pdfplumber.open(path)
                ppage = plumber.pages[number - 1]
                words, edges = _upright_words(ppage)
                out.append((number, words, edges, ""))
                ppage.flush_cache()
            except Exception as exc:
                out.append((number, [], [], f"page {number}: cannot be parsed ({type(exc).__name__}); skipped"))
    finally:
        doc.close()
        if plumber is not None:
            plumber.close()
    return out


def _upright_words(page) -> tuple[list[WordT], list[EdgeT]]:
    """Words and vertical rules in the frame the text reads in: as printed, or turned back where most of the
    page's text runs sideways (a table drawn turned on a page that is not rotated)."""
    chars = page.chars
    sideways = [c for c in chars if not c.get("upright", True)]
    tolerances = {"keep_blank_chars": False, "x_tolerance": SETTINGS.word_x, "y_tolerance": SETTINGS.word_y}
    if len(sideways) * 2 <= len(chars):
        words = page.extract_words(**tolerances)
        edges = [
            (round(e["x0"], 1), e["top"], e["bottom"])
            for e in page.edges
            if e["orientation"] == "v" and e["bottom"] - e["top"] > SETTINGS.min_ruling
        ]
        return [(w["text"], w["x0"], w["x1"], w["top"], w["bottom"]) for w in words], edges
    upward = sum(1 for c in sideways if c["matrix"][1] > 0) * 2 >= len(sideways)  # turned a quarter anticlockwise
    words = page.extract_words(line_dir_rotated="ltr", char_dir_rotated="btt" if upward else "ttb", **tolerances)
    h, w_ = float(page.height), float(page.width)
    turned: list[WordT] = []
    for w in words:
        if upward:  # reading up the page; the next line lies to the right
            turned.append((w["text"], h - w["bottom"], h - w["top"], w["x0"], w["x1"]))
        else:  # reading down the page; the next line lies to the left
            turned.append((w["text"], w["top"], w["bottom"], w_ - w["x1"], w_ - w["x0"]))
    rules: list[EdgeT] = []
    for e in page.edges:
        if e["orientation"] == "h" and e["x1"] - e["x0"] > SETTINGS.min_ruling:
            if upward:
                rules.append((round(h - e["top"], 1), e["x0"], e["x1"]))
            else:
                rules.append((round(e["top"], 1), w_ - e["x1"], w_ - e["x0"]))
    return turned, rules


def page_words(
    path: Path, pages: list[int], workers: int, progress: Callable[[int], None] | None = None
) -> dict[int, PageData]:
    """Word positions of the given pages, in parallel over ``workers`` processes."""
    if not pages:
        return {}
    if workers <= 1 or len(pages) < 8:
        results = _words_of_pages((str(path), pages))
        if progress:
            progress(len(pages))
        return {n: (w, e, p) for n, w, e, p in results}
    chunk = max(2, len(pages) // (workers * 4))
    chunks = [pages[i : i + chunk] for i in range(0, len(pages), chunk)]
    out: dict[int, PageData] = {}
    with ProcessPoolExecutor(max_workers=workers) as pool:
        for results in pool.map(_words_of_pages, [(str(path), c) for c in chunks]):
            for n, w, e, p in results:
                out[n] = (w, e, p)
            if progress:
                progress(len(results))
    return out
