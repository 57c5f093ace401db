"""The member sketches as geometry: no two text boxes overlap, loads carry their size, markers run left to right."""

from __future__ import annotations

import re

import pytest

from audit.inputs.read_claims import read_claims
from audit.report.memo import MemoOptions, render_memo
from audit.report.sketch import _Item, place_in_rows
from audit.review.reconcile import reconcile
from audit.review.review import review_model
from tests.conftest import DEMO, ROOT, review_dict
from tests.verification.details import beam_on_posts, post_on_stud_wall

TEXT = re.compile(r'<text x="([-\d.]+)" y="([-\d.]+)" font-size="([\d.]+)"([^>]*)>([^<]*)</text>')
CHAR = 0.58  # an average character's width as a share of the font size (the test's own estimate)


def _boxes(svg: str) -> list[tuple[float, float, float, float, str]]:
    out = []
    for x, y, size, rest, text in TEXT.findall(svg):
        x, y, size = float(x), float(y), float(size)
        width = CHAR * size * len(text) * (1.15 if "bold" in rest or "700" in rest else 1.0)
        x0 = x - width / 2 if 'text-anchor="middle"' in rest else x
        out.append((x0, x0 + width, y - 0.78 * size, y + 0.22 * size, text))
    return out


def _svgs(html: str) -> list[str]:
    return re.findall(r"<svg .*?</svg>", html, flags=re.S)


def _memo(review, claims=()):
    rec = reconcile(review, claims) if claims else None
    return render_memo(review, rec, claims, MemoOptions())


@pytest.mark.parametrize(
    "review_of",
    [
        lambda: (review_model(DEMO), read_claims(ROOT / "fixtures/demo/claims.yaml")),
        lambda: (review_dict(beam_on_posts([1.0, 1.0, 1.0])), ()),  # crowded: supports and zones close together
        lambda: (review_dict(post_on_stud_wall()), ()),
    ],
)
def test_no_two_text_boxes_of_a_sketch_overlap(review_of):
    review, claims = review_of()
    svgs = _svgs(_memo(review, claims))
    assert svgs
    for svg in svgs:
        boxes = _boxes(svg)
        for i, a in enumerate(boxes):
            for b in boxes[i + 1 :]:
                apart = a[1] <= b[0] or b[1] <= a[0] or a[3] <= b[2] or b[3] <= a[2]
                assert apart, f"'{a[4]}' overlaps '{b[4]}'"


def test_every_load_is_labelled_with_its_size():
    svg = _svgs(_memo(review_dict(post_on_stud_wall())))
    text = " ".join(t for s in svg for *_, t in _boxes(s))
    assert "P/WP: D 10.00 + S 20.00 kN" in text  # the post's load on the plate, by case


def test_markers_are_numbered_left_to_right():
    html = _memo(review_dict(beam_on_posts([3.0, 3.0])))
    svg = _svgs(html)[0]
    mark = r'<circle cx="([\d.]+)" cy="[\d.]+" r="7"[^>]*/>'
    number = r'<text x="[\d.]+" y="[\d.]+" font-size="8" text-anchor="middle">(\d+)</text>'
    marks = re.findall(mark + number, svg)
    xs = [float(x) for x, n in sorted(marks, key=lambda m: int(m[1]))]
    assert xs == sorted(xs) and len(xs) == 3


def test_labels_in_a_row_never_overlap_even_when_crowded():
    items = [_Item(x, x + 60.0, x + 1.0) for x in (10.0, 12.0, 14.0, 200.0, 230.0)]
    rows = place_in_rows(items)
    for i, a in enumerate(items):
        for b in items[i + 1 :]:
            assert a.row != b.row or a.x1 <= b.x0 or b.x1 <= a.x0
    assert rows >= 3  # three labels at nearly one spot need three rows
