"""A rule pack's provenance texts are read whole: in a one-line {...} mapping an unquoted comma would end the text
and start a key of its own (YAML 1.1 flow mappings, the YAML specification 7.4), so such a key is refused."""

from __future__ import annotations

from pathlib import Path

from typer.testing import CliRunner

from audit.cli import app

ROOT = Path(__file__).resolve().parents[1]
PACK = ROOT / "rules" / "o86-2019-recalled.yaml"


def test_every_bundled_pack_reads_with_its_texts_whole():
    result = CliRunner().invoke(app, ["rules"])
    assert result.exit_code == 0
    assert "CSA O86 sawn lumber, compressive resistance perpendicular to grain" in result.output


def test_an_unquoted_comma_in_a_packs_source_is_refused_with_its_line(tmp_path):
    text = PACK.read_text(encoding="utf-8").replace("id: o86-2019-recalled", "id: firm-o86", 1)
    quoted = 'source: "CSA O86 sawn lumber, compressive resistance perpendicular to grain"'
    assert quoted in text
    broken = text.replace(quoted, "source: CSA O86 sawn lumber, compressive resistance perpendicular to grain", 1)
    (tmp_path / "firm.yaml").write_text(broken, encoding="utf-8")
    result = CliRunner().invoke(app, ["rules", "--rules-dir", str(tmp_path)])
    assert result.exit_code == 2
    assert "firm.yaml" in result.stderr and "quote a text that holds a comma" in result.stderr
