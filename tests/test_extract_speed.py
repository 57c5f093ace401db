"""What keeps `extract` fast without changing what it writes: the claims YAML from libyaml's emitter is
byte for byte what PyYAML's own emitter writes; pint stays off the path; a standard's own heads pick
its pages in the cheap scan (so NDS and EN 1995 packages skip their narrative pages as O86 ones do)."""

from __future__ import annotations

import subprocess
import sys
from dataclasses import replace
from pathlib import Path

import pytest
import yaml
from hypothesis import example, given, settings
from hypothesis import strategies as st

from audit.inputs.pdf import extract as extract_module
from audit.inputs.pdf.columns import page_vocabulary
from audit.inputs.pdf.extract import claims_yaml, extract
from audit.standards.registry import standard_named
from tests.conftest import ROOT

PDFS = [*sorted((ROOT / "fixtures" / "pdf").glob("*.pdf")), ROOT / "fixtures" / "demo" / "calc.pdf"]


def python_emitter_yaml(text: str) -> str:
    """The claims part of a claims file written again by PyYAML's pure-Python emitter (the reference)."""
    data = yaml.safe_load(text)
    return yaml.dump(data, Dumper=yaml.SafeDumper, sort_keys=False, allow_unicode=True, width=120)


def claims_part(text: str) -> str:
    return "".join(line for line in text.splitlines(keepends=True) if not line.startswith("#"))


@pytest.mark.parametrize("pdf", PDFS, ids=lambda p: p.parent.name + "/" + p.name)
def test_the_claims_file_is_what_pythons_yaml_emitter_writes_for_every_fixture(pdf):
    written = claims_yaml(extract(pdf, workers=1), pdf.name)
    assert yaml.__with_libyaml__, "libyaml is part of the pinned PyYAML wheel"
    assert claims_part(written) == python_emitter_yaml(written)


TEXTS = st.text(
    alphabet=st.sampled_from(list(" abcQfr0123456789.,:;-#'\"?![]{}&*|>%@`=+/\\()<~^_$≤×·é⊥\u00a0\t\x01\u2028\ufeff")),
    max_size=300,
)


@settings(max_examples=150, deadline=None)
@given(texts=st.lists(TEXTS, min_size=1, max_size=4))
@example(texts=["a\tb " * 40])  # long rows with characters to escape: the emitters fold them differently
@example(texts=["x\x01 y" * 40, "\ufeff" + "Qr 12.5 kN " * 20])
def test_a_claims_file_of_any_text_is_what_pythons_yaml_emitter_writes(texts):
    # long rows, quotes, colons, hashes, tabs, control characters, line separators: the two emitters fold
    # and escape some of these differently, and the file must be the same whichever writes it
    base = extract(ROOT / "fixtures" / "pdf" / "ruled.pdf", workers=1)
    claims = tuple(replace(c, text=t, label=t or "B1") for c, t in zip(base.claims, texts, strict=False))
    written = claims_yaml(replace(base, claims=claims), "ruled.pdf")
    assert claims_part(written) == python_emitter_yaml(written)


def test_the_libyaml_emitter_writes_a_plain_claims_file(monkeypatch):
    # the fast path is taken (else the tests above would pass on the slow path alone)
    used = []
    real_dump = yaml.dump

    def spy(data, **kwargs):
        used.append(kwargs["Dumper"])
        return real_dump(data, **kwargs)

    monkeypatch.setattr(yaml, "dump", spy)
    claims_yaml(extract(ROOT / "fixtures" / "pdf" / "ruled.pdf", workers=1), "ruled.pdf")
    assert used == [yaml.CSafeDumper]


def test_extract_does_not_import_pint(tmp_path):
    # a fresh interpreter: the command as a user runs it, then the modules it loaded
    script = (
        "import sys\n"
        "from audit.cli import app\n"
        "try:\n"
        f"    app(['extract', {str(ROOT / 'fixtures' / 'demo' / 'calc.pdf')!r}, '-o', {str(tmp_path / 'c.yaml')!r}])\n"
        "except SystemExit as exit_:\n"
        "    assert exit_.code in (0, None), exit_.code\n"
        "print('pint' in sys.modules)\n"
    )
    done = subprocess.run([sys.executable, "-c", script], capture_output=True, text=True, timeout=120, cwd=ROOT)
    assert done.returncode == 0, done.stderr
    assert done.stdout.strip().splitlines()[-1] == "False"
    assert "claims:" in (tmp_path / "c.yaml").read_text()


# ---------------------------------------------------------------- the cheap scan under each standard

NARRATIVE = (
    "The floor framing spans between the glulam beams and the bearing walls. Member sizes follow from the "
    "bending and shear checks on the previous sheets. Deflection limits are L/360 for live load."
)


def _three_page_package(path: Path) -> Path:
    """Page 1 narrative; page 2 an NDS table (P and P' heads, no O86 symbol); page 3 an EN 1995 table."""
    from fixtures.make_calc_pdfs import Calc, draw_table

    pdf = Calc("Scan test (fictional)")
    pdf.add_page()
    pdf.multi_cell(0, 5, NARRATIVE, new_x="LMARGIN", new_y="NEXT")
    pdf.add_page()
    pdf.multi_cell(0, 5, "Bearing of joists on the girder, NDS 3.10.", new_x="LMARGIN", new_y="NEXT")
    draw_table(pdf, ["Location", "P (lb)", "P' (lb)"], [["J1 on G1", "2,100", "4,840"]], [50, 30, 30], ruled=True)
    pdf.add_page()
    pdf.multi_cell(0, 5, "Bearing of joists on the plate, EN 1995-1-1 6.1.5.", new_x="LMARGIN", new_y="NEXT")
    draw_table(
        pdf, ["Location", "F_c,90,d (kN)", "F_c,90,Rd (kN)"], [["J2 on W1", "4.2", "11.8"]], [50, 34, 34], ruled=True
    )
    pdf.output(str(path))
    return path


@pytest.mark.parametrize(
    ("standard", "page", "qf", "qr"),
    [("nds", 2, 2100 * 4.4482216152605, 4840 * 4.4482216152605), ("ec5", 3, 4200.0, 11800.0)],
)
def test_a_standards_own_heads_pick_its_page_and_leave_the_narrative_page(tmp_path, standard, page, qf, qr):
    # hand values: 1 lbf = 4.4482216152605 N (exact by definition); kN as printed
    headers = standard_named(standard, None).claim_headers
    result = extract(_three_page_package(tmp_path / "scan.pdf"), workers=1, standard_headers=headers)
    assert page in result.candidate_pages
    assert 1 not in result.candidate_pages  # the narrative page is not read word by word
    read = [c for c in result.claims if c.where.page == page]
    assert len(read) == 1 and read[0].qf == pytest.approx(qf) and read[0].qr == pytest.approx(qr)


def test_a_standards_vocabulary_finds_its_symbols_in_running_text_and_not_in_narrative():
    nds = page_vocabulary(standard_named("nds", None).claim_headers)
    ec5 = page_vocabulary(standard_named("ec5", None).claim_headers)
    assert nds.picks("Cb = 1.25 for a bearing of 1.5 in") and nds.picks("Location  P (lb)  P' (lb)")
    assert ec5.picks("k_c,90 = 1.5, A_ef = 19500 mm2") and ec5.picks("F c,90,d = 4.2 kN")
    for vocabulary in (nds, ec5, page_vocabulary()):
        assert not vocabulary.picks(NARRATIVE)
    assert page_vocabulary(any_text=True).picks(NARRATIVE)  # a reviewer's own map: every page with text


def test_a_reviewers_own_map_still_reads_every_page(tmp_path):
    headers = standard_named("nds", None).claim_headers
    cmap = extract_module.read_column_map(_map(tmp_path), headers)
    result = extract(_three_page_package(tmp_path / "scan.pdf"), cmap=cmap, workers=1, standard_headers=headers)
    assert result.candidate_pages == (1, 2, 3)


def _map(tmp_path: Path) -> Path:
    path = tmp_path / "map.yaml"
    path.write_text("columns:\n  Qf: {header: '^load'}\n")
    return path
