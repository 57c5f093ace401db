"""Messages of issue 24 (items 14 and 16): what is in an id is shown, and a layout's errors come with the rest."""

from __future__ import annotations

from audit import cli
from audit.core.errors import visible


def test_a_layout_with_an_error_in_a_material_still_warns_of_an_invisible_character_in_its_ids(tmp_path, capsys):
    from fixtures.make_hostile_corpus import LAYOUT

    text = LAYOUT.replace("id: C1,", 'id: "C1\\u200b",').replace("species: S-P-F", "species: S-P-X")
    model = tmp_path / "layout.yaml"
    model.write_text(text, encoding="utf-8")
    for command in (["review", str(model)], ["expand", str(model), "-o", str(tmp_path / "x.yaml")]):
        assert cli.run(command) == 2
        err = capsys.readouterr().err
        assert "materials.SPF.species" in err and "did you mean 'S-P-F'?" in err  # the material's own error
        warning = next(ln for ln in err.splitlines() if "layout.posts[0]" in ln)
        assert warning.startswith("warning: ") and "'C1<U+200B>'" in warning and "\u200b" not in err


def test_a_no_break_space_or_a_line_separator_in_a_message_is_written_as_its_code_point():
    # both look like (or break) plain text on a terminal; a plain space stays itself (common practice)
    assert visible("J\u00a01 on B\u20281") == "J<U+00A0>1 on B<U+2028>1"
    assert visible("J1 on B1") == "J1 on B1"
