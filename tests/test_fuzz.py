"""Fuzzing the whole command line with generated and mutated models and claims.

Property: every run ends with exit status 0, 1 or 2 and a message, never an uncaught
exception; for valid input, every required check and every claim is accounted for in the JSON
and the memo. A short run is part of every test run; the dedicated job runs thousands:

    FUZZ_EXAMPLES=3000 python -m pytest -m fuzz -q
"""

from __future__ import annotations

import json
import os
import tempfile
from pathlib import Path

import pytest
import yaml
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from audit import cli
from tests.conftest import base_model
from tests.verification.details import post_on_stud_wall

EXAMPLES = int(os.environ.get("FUZZ_EXAMPLES", "40"))
SETTINGS = settings(max_examples=EXAMPLES, deadline=None, suppress_health_check=list(HealthCheck))
pytestmark = pytest.mark.fuzz

JUNK = st.one_of(
    st.none(),
    st.booleans(),
    st.integers(-(10**6), 10**6),
    st.floats(allow_nan=True, allow_infinity=True),
    st.text(max_size=30),
    st.sampled_from(
        [
            "130 mm",
            "-1 mm",
            "0 m",
            "nan mm",
            "1e400 kN",
            "5 kN/m",
            "12 kip",
            "3 deg",
            "7 MPa",
            "<script>x</script>",
            "B1",
            "J1",
            "C1",
            "W1",
            "local",
            "near-support",
            "",
            "1,000 lbf",
            "∞ m",
            "130 mm + 10 mm",
            "400 mm - 20 mm",
            "9**9**9**9 mm",
            "(1+2) kN",
            "130 mm**3",
            "NO",
            "ON",
            "2026-01-15",
            "base\x1b[31m",
            "J\x001",
            "J\u200b1",
            "J\u04271",
            "B1/C2",
        ]
    ),
    st.lists(st.integers(), max_size=3),
    st.dictionaries(st.text(max_size=5), st.integers(), max_size=2),
)


def _as_written(value) -> str:
    """An id as the YAML file spells it (ids are read as written: false, 1.0e+20), not Python's str()."""
    return value if isinstance(value, str) else yaml.safe_dump(value).split("\n")[0]


def _paths(data) -> list[tuple]:
    out = []

    def walk(node, path):
        out.append(path)
        if isinstance(node, dict):
            for k, v in node.items():
                walk(v, (*path, k))
        elif isinstance(node, list):
            for i, v in enumerate(node):
                walk(v, (*path, i))

    walk(data, ())
    return out


def _mutate(data, choice, junk, action):
    paths = [p for p in _paths(data) if p]
    if not paths:
        return data
    path = paths[choice % len(paths)]
    parent = data
    for k in path[:-1]:
        parent = parent[k]
    last = path[-1]
    if action == "delete":
        if isinstance(parent, dict):
            del parent[last]
        else:
            parent.pop(last)
    elif action == "duplicate" and isinstance(parent, list):
        parent.append(parent[last])
    elif action == "rename" and isinstance(parent, dict):
        parent[f"{last}_x"] = parent.pop(last)
    else:
        parent[last] = junk
    return data


mutations = st.lists(
    st.tuples(st.integers(0, 10_000), JUNK, st.sampled_from(["replace", "delete", "duplicate", "rename"])),
    min_size=0,
    max_size=4,
)


def _claims_for(data) -> list[dict]:
    items = []
    for i, b in enumerate(data["bearings"]):
        upper = b["upper"]["member"] if isinstance(b["upper"], dict) else b["upper"]
        lower = b["lower"]["member"] if isinstance(b["lower"], dict) else b["lower"]
        items.append({"id": f"c{i}", "location": f"{upper}/{lower}", "member": upper, "Qf": "5 kN", "Qr": "20 kN"})
    return items


def _run(model_text: bytes, claims: list | dict | str) -> None:
    with tempfile.TemporaryDirectory() as tmp:
        folder = Path(tmp)
        model = folder / "model.yaml"
        model.write_bytes(model_text)
        claims_path = folder / "claims.yaml"
        claims_path.write_text(claims if isinstance(claims, str) else yaml.safe_dump(claims, allow_unicode=True))
        out, memo, appendix = folder / "out.json", folder / "memo.html", folder / "appendix.html"
        import contextlib
        import io

        err = io.StringIO()
        with contextlib.redirect_stderr(err), contextlib.redirect_stdout(io.StringIO()):
            code = cli.run(
                [
                    "review",
                    str(model),
                    "--claims",
                    str(claims_path),
                    "--json",
                    str(out),
                    "--memo",
                    str(memo),
                    "--appendix",
                    str(appendix),
                ]
            )
        text = err.getvalue()
        assert code in (0, 1, 2), code
        assert "Traceback" not in text and "internal error" not in text, text
        if code == 2:
            # one line per error, after any warnings (an invisible character is named before the errors it causes)
            rest = [line for line in text.splitlines() if not line.startswith("warning: ")]
            assert rest and rest[0].startswith("error: "), text
            return
        data = json.loads(out.read_text())
        check_ids = [c["id"] for c in data["checks"]]
        assert sorted(o["check"] for o in data["check_outcomes"]) == sorted(check_ids)
        items = yaml.safe_load(claims_path.read_text())["claims"] or []
        claim_ids = [_as_written(c["id"]) if "id" in c else f"claim{n + 1}" for n, c in enumerate(items)]
        assert sorted(o["claim"] for o in data["claim_outcomes"]) == sorted(claim_ids)
        assert memo.read_text().rstrip().endswith("</html>")
        html = appendix.read_text()  # the appendix lists every check
        assert all(f"<td>{cid}</td>" in html for cid in check_ids if "<" not in cid and "&" not in cid)


@SETTINGS
@given(mutations, mutations)
def test_mutated_models_and_claims_end_in_0_1_or_2_with_everything_accounted_for(model_mutations, claim_mutations):
    data = base_model()
    for choice, junk, action in model_mutations:
        data = _mutate(data, choice, junk, action)
    claims = {"claims": _claims_for(base_model())}
    for choice, junk, action in claim_mutations:
        claims = _mutate(claims, choice, junk, action)
    _run(yaml.safe_dump(data, allow_unicode=True).encode(), claims)


@SETTINGS
@given(st.lists(st.tuples(st.integers(0, 10_000), st.integers(0, 255)), min_size=1, max_size=6))
def test_byte_flipped_models_end_in_0_1_or_2(flips):
    raw = bytearray(yaml.safe_dump(base_model()).encode())
    for where, value in flips:
        raw[where % len(raw)] = value
    _run(bytes(raw), {"claims": []})


@SETTINGS
@given(st.text(max_size=400))
def test_arbitrary_text_as_claims_ends_in_0_1_or_2(text):
    _run(yaml.safe_dump(base_model()).encode(), text)


def _rich_model() -> dict:
    """The base frame with this project's other forms: a plate on studs with a pack, plies, readings,
    display units, shared typical labels, wind both ways and storage live load."""
    data = base_model()
    data["project"]["readings"] = {"near_support.opposite_bearings": "summed", "kzcp.built_up": "combined"}
    data["project"]["units"] = "US"
    data["materials"]["DF"] = {"family": "timber", "species": "D.Fir-L", "grade": "No.1"}
    data["members"].append(post_on_stud_wall()["members"][0])  # the double top plate on studs, with its pack
    data["members"].append(
        {"id": "P", "material": "DF", "b": "140 mm", "d": "140 mm", "length": "3 m", "orientation": "vertical"}
    )
    data["bearings"].append({"id": "P/WP", "upper": "P", "lower": {"member": "WP", "at": "1.2 m", "width": "120 mm"}})
    data["bearings"][2]["typical"] = ["joist on beam"]
    data["loads"].append(
        {
            "id": "roof",
            "member": "P",
            "type": "point",
            "specified": {"D": "10 kN", "W": {"pressure": "2 kN", "suction": "5 kN"}},
        }
    )
    data["loads"].append(
        {"id": "store", "member": "B1", "type": "uniform", "live": "storage", "specified": {"L": "1 kN/m"}}
    )
    return data


@SETTINGS
@given(mutations, mutations)
def test_mutated_models_with_every_short_form_end_in_0_1_or_2_with_everything_accounted_for(
    model_mutations, claim_mutations
):
    data = _rich_model()
    for choice, junk, action in model_mutations:
        data = _mutate(data, choice, junk, action)
    claims = {
        "claims": [
            {"id": "t1", "location": ["J1/B1", "joist on beam"], "member": "J1", "Qf": "8 kN", "Qr": "24 kN"},
            {"id": "t2", "location": "J*/B1", "member": "B1", "Qf": "1,900 lbf"},
            {"id": "t3", "location": "P/WP", "kind": "near-support", "Qf": "30 kN", "Qr": "50 kN"},
        ]
    }
    for choice, junk, action in claim_mutations:
        claims = _mutate(claims, choice, junk, action)
    _run(yaml.safe_dump(data, allow_unicode=True).encode(), claims)


def test_the_rich_base_model_itself_reviews_cleanly():
    # the mutations above start from a valid model: it reviews without an input error
    from tests.conftest import review_dict

    review = review_dict(_rich_model())
    assert review.result("WP/WP.pack1:WP:near") and review.model.project.units == "US"


def _run_round(last: str, log: str) -> None:
    """A review of the hostile base model against a (forged) last round and comment log."""
    import contextlib
    import io

    from fixtures.make_hostile_corpus import MODEL

    with tempfile.TemporaryDirectory() as tmp:
        folder = Path(tmp)
        (folder / "model.yaml").write_text(MODEL, encoding="utf-8")
        (folder / "last.json").write_text(last, encoding="utf-8", errors="surrogatepass")
        (folder / "log.csv").write_text(log, encoding="utf-8", errors="surrogatepass")
        err = io.StringIO()
        with contextlib.redirect_stderr(err):
            args = ["review", str(folder / "model.yaml"), "--previous", str(folder / "last.json")]
            args += ["--responses", str(folder / "log.csv"), "--json", str(folder / "r.json")]
            code = cli.run([*args, "--xlsx", str(folder / "r.xlsx"), "--memo", str(folder / "r.html")])
        text = err.getvalue()
        assert code in (0, 1, 2), code
        assert "Traceback" not in text and "internal error" not in text, text
        lines = [ln for ln in text.splitlines() if ln]
        assert all(ln.startswith(("error: ", "warning: ")) or ln.endswith("nothing was reviewed.") for ln in lines)
        if code != 2:
            again = json.loads((folder / "r.json").read_text(encoding="utf-8"))
            assert again["round"]["number"] >= 2


@SETTINGS
@given(mutations, st.lists(st.tuples(st.integers(0, 3), st.integers(0, 1), JUNK), max_size=4))
def test_forged_last_rounds_and_comment_logs_end_in_0_1_or_2(round_mutations, log_mutations):
    import csv
    import io

    from fixtures.make_hostile_corpus import PREVIOUS, RESPONSES

    last = json.loads(PREVIOUS)
    for choice, junk, action in round_mutations:
        last = _mutate(last, choice, junk, action)
    rows = list(csv.reader(io.StringIO(RESPONSES)))
    for row, col, junk in log_mutations:
        rows[row % len(rows)][col] = str(junk)
    buffer = io.StringIO()
    csv.writer(buffer).writerows(rows)
    _run_round(json.dumps(last), buffer.getvalue())
