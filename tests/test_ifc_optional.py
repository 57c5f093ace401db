"""Without the optional IfcOpenShell extra, `bearing-audit ifc` says in one line how to install it."""

from __future__ import annotations

import sys


def test_without_ifcopenshell_the_ifc_command_says_how_to_install_it_and_exits_2(tmp_path, monkeypatch, capsys):
    from audit.cli import run

    monkeypatch.setitem(sys.modules, "ifcopenshell", None)  # as if the extra were not installed
    model = tmp_path / "model.ifc"
    model.write_text("ISO-10303-21;\n", encoding="utf-8")
    out = tmp_path / "out.yaml"
    assert run(["ifc", str(model), "-o", str(out)]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "pip install 'bearing-audit[ifc]'" in err[0]
    assert not out.exists()


def test_the_other_commands_do_not_import_ifcopenshell():
    import subprocess

    code = "import sys, audit.cli; audit.cli.run(['schema']); print('ifcopenshell' in sys.modules)"
    result = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert result.stdout.strip().splitlines()[-1] == "False"
