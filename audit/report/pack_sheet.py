"""A rule pack as a workbook a firm fills in to verify it (read back by ``inputs/pack_sheet.py``).

Sheet 'Values': one row per value of the pack with its key, the value as recalled, its clause, source and
status, and empty columns for the value as printed, the edition, the page, who verified it and when. Sheet
'Pack': the pack it was written from, and the id and title the firm pack will take (the output file's name
and the source's title where left empty).
"""

from __future__ import annotations

import io
from pathlib import Path
from typing import Any

import yaml

from audit.core.errors import InputError, Location
from audit.inputs.pack_sheet import COLUMNS, PACK_ROWS, PACK_SHEET, VALUES_SHEET, pack_values, shown
from audit.report.comment_log import _cell, _shape

WIDTHS = [34, 30, 8, 22, 50, 20, 30, 28, 8, 16, 12]
NOTE = (
    "Enter the value as printed in 'verified value' (the recalled one where it agrees), with the edition, the page, "
    "who checked it and the date; leave a row empty to keep it as recalled ('from memory: verify'). Then run "
    "bearing-audit rules --adopt THIS.xlsx -o FOLDER/firm-pack.yaml and review with --rules-dir FOLDER."
)


def pack_sheet(data: dict[str, Any], pack_id: str, file_name: str) -> bytes:
    """The workbook for the pack file's data."""
    from openpyxl import Workbook
    from openpyxl.styles import Alignment, Font

    book = Workbook()
    sheet = book.active
    sheet.title = VALUES_SHEET
    sheet.append(list(COLUMNS))
    for v in pack_values(data):
        sheet.append([_cell(x) for x in (v.key, shown(v.value), v.unit, v.clause, v.source, v.status)])
    _shape(sheet, WIDTHS, Alignment, Font)
    about = book.create_sheet(PACK_SHEET)
    for label, value in zip(PACK_ROWS, (pack_id, file_name, "", ""), strict=True):
        about.append([label, _cell(value)])
    about.append(["how to verify", NOTE])
    about.column_dimensions["A"].width = 18
    about.column_dimensions["B"].width = 90
    for row in about.iter_rows():
        row[0].font = Font(bold=True)
        for cell in row:
            cell.alignment = Alignment(wrap_text=True, vertical="top")
    buffer = io.BytesIO()
    book.save(buffer)
    return buffer.getvalue()


def _pack_file(pack_id: str, dirs: tuple[Path, ...], where: Location | None = None) -> Path:
    """The file of the resistance or combination pack of that id, among the bundled packs and ``dirs``."""
    from audit.standards.catalogue import load_all_packs

    resistance, combos = load_all_packs(dirs)
    found = resistance.get(pack_id) or combos.get(pack_id)
    if found is None:
        known = ", ".join(sorted({*resistance, *combos}))
        raise InputError(f"unknown rule pack '{pack_id}' (available: {known})", where or Location("--sheet"))
    return Path(found.path)


def _data(path: Path) -> dict[str, Any]:
    data = yaml.safe_load(path.read_text(encoding="utf-8-sig"))
    assert isinstance(data, dict)  # the pack reader has read it already
    return data


def _check_output(output: Path, dirs: tuple[Path, ...], inputs: list[tuple[str, Path]]) -> None:
    """An output may replace no pack and no input (every pack is an input of the next review)."""
    from audit.core.outfiles import check_outputs
    from audit.standards.bundled import builtin_rules_dir
    from audit.standards.catalogue import pack_files

    if output.resolve().parent == builtin_rules_dir().resolve():
        raise InputError(
            "is in the bundled rules folder; write a firm pack to a folder of your own and pass it as --rules-dir",
            Location(str(output), key="-o"),
        )
    check_outputs([("-o", output)], inputs + [("rule pack", p) for p in pack_files(dirs)])


def write_sheet(pack_id: str, output: Path, dirs: tuple[Path, ...]) -> list[str]:
    """``rules --sheet PACK -o FILE.xlsx``: the lines to print."""
    from audit.core.outfiles import write_atomic

    _check_output(output, dirs, [])
    path = _pack_file(pack_id, dirs)
    data = _data(path)
    write_atomic(output, pack_sheet(data, pack_id, path.name), "-o")
    count = len(pack_values(data))
    return [
        f"wrote {output}: the {count} values of rule pack {pack_id} ({path.name}), each with its clause, source "
        "and status, and columns for the verified value, edition, page, who verified it and when",
        f"fill it in, then: bearing-audit rules --adopt {output} -o FOLDER/firm-pack.yaml",
    ]


def adopt_pack(sheet: Path, output: Path, dirs: tuple[Path, ...]) -> list[str]:
    """``rules --adopt FILE.xlsx -o FILE.yaml``: writes the firm pack; the lines to print (every value that
    differs from the recalled one)."""
    from audit.core.outfiles import write_atomic
    from audit.inputs.pack_sheet import adopt_sheet, firm_pack_text

    _check_output(output, dirs, [("--adopt", sheet)])
    adoption = adopt_sheet(sheet, lambda pack_id, where: _data(_pack_file(pack_id, dirs, where)), output)
    _refuse_known_id(adoption.firm_id, dirs, output)
    write_atomic(output, firm_pack_text(adoption), "-o")
    differ = [v for v in adoption.verified if v.differs]
    lines = [
        f"wrote firm pack {adoption.firm_id} to {output}: {len(adoption.verified)} of {adoption.total} values "
        f"verified, {len(differ)} differ from the recalled ones; the other {adoption.total - len(adoption.verified)} "
        "keep their recalled value and status"
    ]
    for v in differ:
        where = f"{v.edition}, p. {v.page}" if v.page else v.edition
        lines.append(
            f"  {v.entry.key}: recalled {shown(v.entry.value)}, verified {shown(v.value)} ({where}; row {v.row})"
        )
    lines.append(
        f"select it with project.rule_pack: {adoption.firm_id} (or --rule-pack) and --rules-dir {output.parent}"
    )
    return lines


def _refuse_known_id(firm_id: str, dirs: tuple[Path, ...], output: Path) -> None:
    """The firm pack's id may be no other pack's: the next review would refuse both."""
    from audit.standards.catalogue import load_all_packs

    resistance, combos = load_all_packs(dirs)
    if firm_id in resistance or firm_id in combos:
        raise InputError(
            f"rule pack id '{firm_id}' is taken by another pack; name the firm pack on sheet 'Pack' (firm pack id) "
            "or choose another output file name",
            Location(str(output), key="-o"),
        )
