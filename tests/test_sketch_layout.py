"""The member sketches as geometry: no two text boxes overlap, loads carry their size, checks are listed left to
right and each marker carries the number of the comment on its check."""

from __future__ import annotations

import re

import pytest

from audit.inputs.read_claims import read_claims
from audit.report.memo import MemoOptions, appendix_view, render_appendix
from audit.report.sketch import _Item, place_in_rows
from audit.review.comments import build_comments
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
    return render_appendix(review, rec, claims, MemoOptions())


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


def test_checks_are_listed_left_to_right_beneath_the_sketch():
    review = review_dict(beam_on_posts([3.0, 3.0]))
    sketch = appendix_view(review, None, (), MemoOptions())["sketches"][0]
    centre = {r.check.id: r.check.contact.centre for r in review.results}
    xs = [centre[row["id"]] for row in sketch["legend"]]
    assert xs == sorted(xs) and len(xs) == 3


def test_each_marker_carries_the_number_of_the_comment_on_its_check():
    review = review_model(DEMO)
    claims = read_claims(ROOT / "fixtures/demo/claims.yaml")
    rec = reconcile(review, claims)
    on_check = {p.check_id: c.number for c in build_comments(review, rec, claims) for p in c.places}
    sketches = appendix_view(review, rec, claims, MemoOptions())["sketches"]
    numbered = 0
    for s in sketches:
        assert sorted(str(m["n"]) for m in s["marks"]) == sorted(str(row["n"]) for row in s["legend"])
        for row in s["legend"]:
            assert str(row["n"]) == str(on_check.get(row["id"], "")), row["id"]
            numbered += bool(row["n"])
    assert numbered >= 10  # the demo's sketches carry comment numbers, not 1, 2, 3 per sketch
    html = render_appendix(review, rec, claims, MemoOptions())
    wp1 = next(svg for svg in _svgs(html) if 'aria-label="Elevation of member WP1"' in svg)
    drawn = re.findall(r'<text x="[\d.]+" y="[\d.]+" font-size="8" text-anchor="middle">(\d+)</text>', wp1)
    assert sorted(drawn) == sorted(str(on_check[i]) for i in ("GB1/WP1:WP1", "WP1/W1-pack:WP1", "WP1/W1-pack:WP1:near"))


def test_labels_in_a_row_never_overlap_even_when_crowded():
    items = [_Item(x, x + 60.0, x + 1.0) for x in (10.0, 12.0, 14.0, 200.0, 230.0)]
    rows = place_in_rows(items)
    for i, a in enumerate(items):
        for b in items[i + 1 :]:
            assert a.row != b.row or a.x1 <= b.x0 or b.x1 <= a.x0
    assert rows >= 3  # three labels at nearly one spot need three rows
