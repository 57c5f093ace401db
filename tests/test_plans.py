"""Level plans in the memo: labels never overlap, every bearing is marked by its outcome's shape."""

from __future__ import annotations

import re
from itertools import combinations

import pytest

from audit.report.plans import label_box
from tests.conftest import ROOT

LAYOUT_DEMO = ROOT / "fixtures" / "demo-layout"


@pytest.fixture(scope="module")
def memo(tmp_path_factory) -> str:
    from typer.testing import CliRunner

    from audit.cli import app

    out = tmp_path_factory.mktemp("plans") / "appendix.html"
    model, claims = str(LAYOUT_DEMO / "model.yaml"), str(LAYOUT_DEMO / "claims.yaml")
    args = ["review", model, "--claims", claims, "--appendix", str(out)]
    CliRunner().invoke(app, args, catch_exceptions=False)
    return out.read_text(encoding="utf-8")


def _plans(memo: str) -> dict[str, str]:
    section = memo[memo.index('<section id="plans">') : memo.index("</section>", memo.index('<section id="plans">'))]
    return dict(re.findall(r'aria-label="Plan of level (\w+)">(.*?)</svg>', section, re.S))


def test_the_memo_draws_a_plan_of_each_level_that_has_members(memo):
    # L1 shows the ground-floor wall's sole plate on the foundation
    assert sorted(_plans(memo)) == ["CANOPY", "L1", "L2", "L3", "R"]


def test_no_two_labels_of_a_plan_overlap(memo):
    for level, svg in _plans(memo).items():
        labels = [
            {"x": float(x), "y": float(y), "anchor": "middle" if middle else "start", "text": text}
            for x, y, middle, text in re.findall(
                r'<text x="([\d.-]+)" y="([\d.-]+)" font-size="8.5"( text-anchor="middle")?>([^<]*)</text>', svg
            )
        ]
        assert len(labels) >= 6, level  # the grid names at least
        for a, b in combinations(labels, 2):
            ax0, ay0, ax1, ay1 = label_box(a)
            bx0, by0, bx1, by1 = label_box(b)
            assert not (ax0 < bx1 and bx0 < ax1 and ay0 < by1 and by0 < ay1), (level, a["text"], b["text"])


def test_the_failing_bearing_is_drawn_as_a_cross_and_a_passing_one_as_a_circle(memo):
    svg = _plans(memo)["L2"]
    # GB2 on the storey-1 post of the stacked line fails its local check (see the demo's checks table)
    assert re.search(r"<path d=\"[^\"]+\" stroke=\"#111\" stroke-width=\"2.2\"><title>GB2/P-B2-1: fails</title>", svg)
    # a joist on GB2 passes and the typical claim S6-2/S6-3 covers it: a circle
    assert re.search(r"<circle [^>]+><title>J2-A-B-3/GB2: passes</title>", svg)
    # GB2 on its post at B/1 passes its local check but its near-support check is missing: a triangle
    assert re.search(r"<polygon [^>]+><title>GB2/SC-B1-1</title>", svg)
    # every bearing of a member drawn on the level has a mark
    assert len(re.findall(r"<title>J2-A-B-\d+/", svg)) == 2 * 20  # 20 joists at 400 mm from 0.2 m to 7.8 m


def test_a_model_without_a_layout_has_no_plans(tmp_path, run_cli):
    out = tmp_path / "appendix.html"
    run_cli("review", ROOT / "fixtures" / "demo" / "model.yaml", "--appendix", out)
    assert 'id="plans"' not in out.read_text(encoding="utf-8")
