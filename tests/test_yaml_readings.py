"""YAML's old surprises and one error per cause: what a reviewer types is read as typed."""

from __future__ import annotations

from audit.cli import run
from tests.conftest import base_model


def _rename(data: dict, old: str, new: str) -> dict:
    for member in data["members"]:
        if member["id"] == old:
            member["id"] = new
    for bearing in data["bearings"]:
        for role in ("upper", "lower"):
            side = bearing[role]
            if side == old:
                bearing[role] = new
            elif isinstance(side, dict) and side["member"] == old:
                side["member"] = new
    for load in data["loads"]:
        if load["member"] == old:
            load["member"] = new
    return data


def test_member_ids_that_look_like_booleans_stay_text(write_model, capsys):
    # YAML 1.1 reads a plain NO or ON as a boolean; an id is text whatever it looks like
    text = write_model(_rename(_rename(base_model(), "J1", "NO"), "C1", "ON")).read_text()
    path = write_model(text.replace("'NO'", "NO").replace("'ON'", "ON"), "plain.yaml")
    assert "id: NO" in path.read_text()
    code = run(["review", str(path)])
    out = capsys.readouterr().out
    assert code in (0, 1) and "NO/B1:NO" in out and "B1/ON" in out


def test_a_numeric_looking_member_id_keeps_its_spelling(write_model, capsys):
    text = write_model(_rename(base_model(), "J1", "1e3")).read_text().replace("'1e3'", "1e3")
    code = run(["review", str(write_model(text, "plain.yaml"))])
    assert code in (0, 1) and "1e3/B1:1e3" in capsys.readouterr().out


def test_one_bad_value_on_a_member_gives_one_error_not_one_per_reference(write_model, capsys):
    data = base_model()
    data["members"][0]["b"] = "130 kN"  # B1: three bearings name it
    code = run(["review", str(write_model(data))])
    err = capsys.readouterr().err
    assert code == 2
    assert [line for line in err.splitlines() if line.startswith("error: ")] == [
        line for line in err.splitlines() if "members[0].b" in line
    ]
    assert "unknown member" not in err


def test_a_misspelt_member_reference_suggests_the_near_id(write_model, capsys):
    data = base_model()
    data["loads"][0]["member"] = "J2"
    run(["review", str(write_model(data))])
    assert "did you mean 'J1'?" in capsys.readouterr().err


def test_a_misspelt_key_suggests_the_near_key(write_model, capsys):
    data = base_model()
    data["members"][0]["lenght"] = data["members"][0].pop("length")
    run(["review", str(write_model(data))])
    assert "did you mean 'length'?" in capsys.readouterr().err


def test_an_id_with_a_cyrillic_look_alike_letter_is_warned_with_its_code_point(write_model, capsys):
    data = _rename(base_model(), "J1", "J\u04271")  # CYRILLIC CAPITAL LETTER CHE beside Latin J
    code = run(["review", str(write_model(data))])
    err = capsys.readouterr().err
    assert code in (0, 1) and "warning: " in err and "U+0427" in err and "members[3]" in err


def test_an_id_with_a_zero_width_or_bidirectional_character_is_warned(write_model, capsys):
    for hidden in ("\u200b", "\u202e"):
        data = _rename(base_model(), "J1", f"J{hidden}1")
        run(["review", str(write_model(data))])
        assert f"U+{ord(hidden):04X}" in capsys.readouterr().err


def test_plain_ids_give_no_warning(write_model, capsys):
    run(["review", str(write_model(base_model()))])
    assert "warning" not in capsys.readouterr().err


def test_errors_found_after_reading_are_all_reported_once_each(write_model, capsys):
    # two point loads within d of B1's support, neither with a bearing length: two errors, one
    # each, in one run (found while listing the near-support checks, not while reading)
    data = base_model()
    data["loads"] += [
        {"id": "p1", "member": "B1", "type": "point", "at": "200 mm", "specified": {"D": "5 kN"}},
        {"id": "p2", "member": "B1", "type": "point", "at": "5800 mm", "specified": {"D": "5 kN"}},
    ]
    code = run(["review", str(write_model(data))])
    err = capsys.readouterr().err
    lines = [line for line in err.splitlines() if line.startswith("error: ")]
    assert code == 2 and len(lines) == 2
    assert any("'p1'" in line for line in lines) and any("'p2'" in line for line in lines)


def _plain(node):
    """A located tree as plain Python values, to compare with PyYAML's own reading."""
    if isinstance(node.value, dict):
        return {k: _plain(v) for k, v in node.value.items()}
    if isinstance(node.value, list):
        return [_plain(v) for v in node.value]
    return node.value


def test_repeated_plain_scalars_read_as_pyyaml_reads_them_each_time():
    # the composer remembers what a plain scalar's text reads as; the reference is PyYAML's
    # safe_load (PyPI) of the same text, with the repeats quoted and tagged as well
    import yaml

    from audit.core.located_yaml import read_yaml_text

    values = ["130 mm", "1", "1.5", "1e3", "true", "NO", "~", "null", "2026-01-15", "0x1F", "1_000", "'1'", '"true"']
    text = "".join(f"k{i}: [{v}, {v}, !!str {v.strip(chr(39) + chr(34))}, {v}]\n" for i, v in enumerate(values))
    assert _plain(read_yaml_text(text, "t.yaml")) == yaml.safe_load(text)
    node = read_yaml_text(text, "t.yaml").value["k1"].value
    assert [type(n.value) for n in node] == [int, int, str, int] and node[1].raw == "1"


def test_a_merge_key_is_refused_wherever_it_repeats_and_a_quoted_one_is_a_plain_key():
    import pytest

    from audit.core.errors import InputError
    from audit.core.located_yaml import read_yaml_text

    assert read_yaml_text('a: {"<<": 1}\nb: {"<<": 2}\n', "t.yaml").value["b"].value["<<"].value == 2
    with pytest.raises(InputError, match="merge keys"):
        read_yaml_text("a: {x: 1}\nb: {<<: 2}\n", "t.yaml")
    with pytest.raises(InputError, match=r"tag:yaml\.org,2002:merge is not accepted"):
        read_yaml_text("a: {x: 1}\nb: {!!merge x: 1}\n", "t.yaml")


def test_a_control_character_is_refused_in_a_scalar_seen_before_elsewhere():
    import pytest

    from audit.core.errors import InputError
    from audit.core.located_yaml import read_yaml_text

    with pytest.raises(InputError, match="U\\+0001"):
        read_yaml_text('a: ok\nb: "o\\x01k"\nc: ok\n', "t.yaml")
