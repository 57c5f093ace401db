"""PDF faults: crowded pages, very long documents, markup in the text. Bounded time and
memory (a child process under a memory cap; the timeout only catches a hang), clear messages,
escaped output."""

from __future__ import annotations

import zlib
from pathlib import Path

from tests.test_hostile_input import _capped_child


def raw_pdf(path: Path, page_streams: list[bytes]) -> None:
    """A minimal PDF written by hand: one content stream per page (shared when identical), Helvetica."""
    objects: list[bytes] = []

    def add(body: bytes) -> int:
        objects.append(body)
        return len(objects)

    font = add(b"<< /Type /Font /Subtype /Type1 /BaseFont /Helvetica >>")
    streams: dict[bytes, int] = {}
    page_ids = []
    pages_id = len(objects) + 1 + len(set(page_streams)) + len(page_streams)  # reserved below
    for content in page_streams:
        if content not in streams:
            packed = zlib.compress(content, 9)
            streams[content] = add(
                b"<< /Length %d /Filter /FlateDecode >>\nstream\n" % len(packed) + packed + b"\nendstream"
            )
        page_ids.append(
            add(
                b"<< /Type /Page /Parent %d 0 R /MediaBox [0 0 612 792] /Contents %d 0 R "
                b"/Resources << /Font << /F1 %d 0 R >> >> >>" % (pages_id, streams[content], font)
            )
        )
    kids = b" ".join(b"%d 0 R" % i for i in page_ids)
    assert add(b"<< /Type /Pages /Kids [%s] /Count %d >>" % (kids, len(page_ids))) == pages_id
    catalog = add(b"<< /Type /Catalog /Pages %d 0 R >>" % pages_id)
    out = bytearray(b"%PDF-1.7\n")
    offsets = []
    for number, body in enumerate(objects, start=1):
        offsets.append(len(out))
        out += b"%d 0 obj\n" % number + body + b"\nendobj\n"
    xref = len(out)
    out += b"xref\n0 %d\n0000000000 65535 f \n" % (len(objects) + 1)
    out += b"".join(b"%010d 00000 n \n" % o for o in offsets)
    out += b"trailer\n<< /Size %d /Root %d 0 R >>\nstartxref\n%d\n%%%%EOF\n" % (len(objects) + 1, catalog, xref)
    path.write_bytes(bytes(out))


def text_lines(lines: list[str], top: float = 740.0) -> bytes:
    ops = [b"BT /F1 10 Tf"]
    for i, line in enumerate(lines):
        escaped = line.replace("\\", "\\\\").replace("(", "\\(").replace(")", "\\)").encode("latin-1")
        ops.append(b"1 0 0 1 60 %.1f Tm (%s) Tj" % (top - 14 * i, escaped))
    ops.append(b"ET")
    return b"\n".join(ops) + b"\n"


EQUATION = ["Location: B1 at C1", "Member checked: GB1", "Qr = 109.2 kN >= Qf = 15.8 kN OK"]


def test_page_with_a_million_tiny_objects_is_skipped_with_a_warning(tmp_path):
    crowded = b"".join(b"%d %d 0.2 0.2 re f\n" % (i % 600, (i // 600) % 780) for i in range(1_000_000))
    raw_pdf(tmp_path / "crowded.pdf", [text_lines(EQUATION) + crowded, text_lines(EQUATION)])
    done = _capped_child(["extract", str(tmp_path / "crowded.pdf"), "-o", str(tmp_path / "c.yaml")])
    assert done.returncode == 0, done.stderr
    assert "page 1:" in done.stderr and "too many to read; skipped" in done.stderr
    assert "page: 2" in (tmp_path / "c.yaml").read_text()


def test_thousands_of_pages_are_scanned_cheaply(tmp_path):
    blank = text_lines(["Narrative sheet with no bearing checks on it."])
    pages = [blank] * 3000
    pages[2876] = text_lines(EQUATION)
    raw_pdf(tmp_path / "long.pdf", pages)
    done = _capped_child(["extract", str(tmp_path / "long.pdf"), "-o", str(tmp_path / "l.yaml")])
    assert done.returncode == 0, done.stderr
    text = (tmp_path / "l.yaml").read_text()
    assert "page: 2877" in text and "from 1 of 3000 pages read" in text  # only that page was parsed


def test_markup_in_pdf_text_is_escaped_in_the_memo(tmp_path, run_cli):
    from tests.conftest import DEMO

    evil = ["Location: <script>alert(1)</script>", "Member checked: GB1", "Qr = 10 kN >= Qf = 5 kN OK"]
    raw_pdf(tmp_path / "evil.pdf", [text_lines(evil)])
    result = run_cli(
        "review", DEMO, "--calc-pdf", tmp_path / "evil.pdf", "--memo", tmp_path / "m.html", "--csv", tmp_path / "f.csv"
    )
    assert result.exit_code == 1
    html = (tmp_path / "m.html").read_text()
    assert "<script>alert(1)</script>" not in html
    assert "&lt;script&gt;alert(1)&lt;/script&gt;" in html


def test_a_pdf_of_only_blank_pages_says_no_checks_were_found(tmp_path):
    raw_pdf(tmp_path / "blank.pdf", [text_lines(["Cover sheet"])] * 5)
    done = _capped_child(["extract", str(tmp_path / "blank.pdf"), "-o", str(tmp_path / "b.yaml")])
    assert done.returncode == 2 and "no bearing checks found" in done.stderr
    assert not (tmp_path / "b.yaml").exists()


def _pdf_with_a_form_object(path: Path, drawn: int) -> None:
    """Page 1 draws its objects through one form object (a Do of a form XObject); page 2 is plain."""
    crowded = b"".join(b"%d %d 0.2 0.2 re f\n" % (i % 600, (i // 600) % 780) for i in range(drawn))
    objects: list[bytes] = []

    def add(body: bytes) -> int:
        objects.append(body)
        return len(objects)

    def stream(data: bytes, head: bytes = b"") -> int:
        packed = zlib.compress(data, 9)
        return add(b"<< %s/Length %d /Filter /FlateDecode >>\nstream\n" % (head, len(packed)) + packed + b"\nendstream")

    font = add(b"<< /Type /Font /Subtype /Type1 /BaseFont /Helvetica >>")
    form = stream(crowded, b"/Type /XObject /Subtype /Form /BBox [0 0 612 792] ")
    first, second = stream(text_lines(EQUATION) + b"q /Fm1 Do Q\n"), stream(text_lines(EQUATION))
    pages_id = len(objects) + 3
    resources = b"/Resources << /Font << /F1 %d 0 R >> /XObject << /Fm1 %d 0 R >> >>" % (font, form)
    kids = [
        add(b"<< /Type /Page /Parent %d 0 R /MediaBox [0 0 612 792] /Contents %d 0 R %s >>" % (pages_id, c, resources))
        for c in (first, second)
    ]
    assert add(b"<< /Type /Pages /Kids [%d 0 R %d 0 R] /Count 2 >>" % tuple(kids)) == pages_id
    catalog = add(b"<< /Type /Catalog /Pages %d 0 R >>" % pages_id)
    out = bytearray(b"%PDF-1.7\n")
    offsets = []
    for number, body in enumerate(objects, start=1):
        offsets.append(len(out))
        out += b"%d 0 obj\n" % number + body + b"\nendobj\n"
    xref = len(out)
    out += b"xref\n0 %d\n0000000000 65535 f \n" % (len(objects) + 1)
    out += b"".join(b"%010d 00000 n \n" % o for o in offsets)
    out += b"trailer\n<< /Size %d /Root %d 0 R >>\nstartxref\n%d\n%%%%EOF\n" % (len(objects) + 1, catalog, xref)
    path.write_bytes(bytes(out))


def test_drawing_objects_inside_a_form_object_count_against_the_page_limit(tmp_path):
    _pdf_with_a_form_object(tmp_path / "form.pdf", 150_000)  # over the 100,000 of the settings, all in one form
    done = _capped_child(["extract", str(tmp_path / "form.pdf"), "-o", str(tmp_path / "f.yaml")])
    assert done.returncode == 0, done.stderr
    assert "page 1:" in done.stderr and "too many to read; skipped" in done.stderr
    assert "page: 2" in (tmp_path / "f.yaml").read_text() and "page: 1" not in (tmp_path / "f.yaml").read_text()


def test_pages_past_the_documents_text_bound_are_named_not_read(tmp_path, monkeypatch):
    from dataclasses import replace

    from audit.inputs.pdf import pages
    from audit.inputs.pdf.extract import extract

    monkeypatch.setattr(pages, "SETTINGS", replace(pages.SETTINGS, max_document_text=100))
    raw_pdf(tmp_path / "three.pdf", [text_lines(EQUATION)] * 3)  # about 70 characters a page
    result = extract(tmp_path / "three.pdf")
    assert [c.where.page for c in result.claims] == [1, 2]  # 70, then 140 > 100: page 3 is not read
    assert any(w.startswith("page 3: not read") for w in result.warnings)


# ---------------------------------------------------------------- work bounded per document (issue 24, item 9)


def _text_stream(characters: int) -> bytes:
    """One page's worth of narrative drawn in tiny type, about ``characters`` long: costly for any text
    layout, and no check in it."""
    line = b"Narrative text of a hostile sheet with no checks on it at all, repeated many times over."
    count = characters // (len(line) + 5)
    return b"".join(
        b"BT /F1 1 Tf %d %d Td (%d %s) Tj ET\n" % ((i * 37) % 500, (i * 7) % 780, i, line) for i in range(count)
    )


def test_pages_sharing_one_text_stream_too_large_to_read_are_refused_once_and_known_again(tmp_path):
    # 300 pages draw one content stream of more characters than a page may hold: the first is read and
    # refused; the others are known from the page tree as the same drawing, without being laid out
    raw_pdf(tmp_path / "shared.pdf", [text_lines(EQUATION)] + [_text_stream(420_000)] * 300)
    done = _capped_child(["extract", str(tmp_path / "shared.pdf"), "-o", str(tmp_path / "s.yaml")])
    assert done.returncode == 0, done.stderr
    assert "page 2: " in done.stderr and "characters, too many to read; skipped" in done.stderr
    assert done.stderr.count("draws what page") >= 298 and "page 301: draws what page" in done.stderr
    assert "page: 1" in (tmp_path / "s.yaml").read_text()


def test_pages_sharing_one_large_text_stream_are_laid_out_once_the_work_is_large(tmp_path):
    raw_pdf(tmp_path / "shared.pdf", [text_lines(EQUATION)] + [_text_stream(300_000)] * 300)
    done = _capped_child(["extract", str(tmp_path / "shared.pdf"), "-o", str(tmp_path / "s.yaml")])
    assert done.returncode == 0, done.stderr
    assert "too many to read" not in done.stderr and "not read, the pages before" not in done.stderr
    assert "301 pages read" in done.stderr


def test_a_shared_page_gives_its_claims_on_every_page_that_shares_it(tmp_path, monkeypatch):
    from dataclasses import replace

    from audit.inputs.pdf import pages
    from audit.inputs.pdf.extract import extract

    raw_pdf(tmp_path / "same.pdf", [text_lines(EQUATION)] * 12)  # one stream, twelve pages
    read_each = extract(tmp_path / "same.pdf")
    monkeypatch.setattr(pages, "SETTINGS", replace(pages.SETTINGS, shared_content_after=100))
    shared = extract(tmp_path / "same.pdf")  # past page 2 the pages take page 1's outcome
    assert [c.where.page for c in shared.claims] == list(range(1, 13))
    assert [(c.where, c.qf, c.qr, c.label) for c in shared.claims] == [
        (c.where, c.qf, c.qr, c.label) for c in read_each.claims
    ]


def test_drawing_objects_in_form_objects_are_bounded_per_document(tmp_path, monkeypatch):
    from dataclasses import replace

    from audit.inputs.pdf import pages
    from audit.inputs.pdf.extract import extract

    _pdf_with_a_form_object(tmp_path / "form.pdf", 30_000)  # page 1 draws 30,000 objects through a form
    monkeypatch.setattr(pages, "SETTINGS", replace(pages.SETTINGS, max_document_objects=20_000))
    result = extract(tmp_path / "form.pdf")
    assert [c.where.page for c in result.claims] == [1]  # page 1 is under the page bound, and read
    assert any(w.startswith("page 2: not read") and "20,000 drawing objects" in w for w in result.warnings)
