"""Worked equations: 'Qr = 45.2 kN >= Qf = 31.0 kN' with the location (and member) lines above."""

from __future__ import annotations

import re

from audit.core.errors import InputError, Location
from audit.core.units import parse_quantity
from audit.inputs.pdf.tables import Line
from audit.inputs.pdf.values import parse_adequate, parse_number, unit_name
from audit.inputs.read_claims import Claim, Where

FORMULA = r"(?:[^=<>≥≤\n]*?=\s*)?"  # the formula written out before the result: 'Qr = 0.8 x 7.0 x Ab = 45.2 kN'
EQUATION = re.compile(
    rf"(?P<a>Q\s?'?\s?[rf]\s?'?)\s*=\s*{FORMULA}(?P<av>[-\d,]*\.?\d+)\s*(?P<au>[A-Za-z]+)?\s*"
    r"(?P<op>>=|≥|=>|>|<=|≤|=<|<)\s*"
    rf"(?P<b>Q\s?'?\s?[rf]\s?'?)\s*=\s*{FORMULA}(?P<bv>[-\d,]*\.?\d+)\s*(?P<bu>[A-Za-z]+)?",
)
# One side of a worked equation on a line of its own (an equation written over several lines).
HALF = re.compile(rf"^(?P<s>Q\s?'?\s?[rf]\s?'?)\s*=\s*{FORMULA}(?P<v>[-\d,]*\.?\d+)\s*(?P<u>[A-Za-z]+)\b")


def joined_equation(lines: list[Line], i: int) -> tuple[re.Match, Line, int] | None:
    """An equation written over two or three lines ('Qr = ... = 45.2 kN' / 'Qf = 31.0 kN  Qr >= Qf'), read
    as one line; None when the lines at ``i`` are not one."""
    first = HALF.match(lines[i].text)
    if first is None:
        return None
    for j in (i + 1, i + 2):
        if j >= len(lines):
            break
        second = HALF.match(lines[j].text)
        if second and second["s"].replace(" ", "").lower()[:2] != first["s"].replace(" ", "").lower()[:2]:
            rest = lines[j].text[second.end() :]
            text = f"{first[0]} >= {second[0]}{rest}"
            match = EQUATION.search(text)
            if match is not None:
                return match, _with_text(lines[i], text), j
    return None


def _with_text(line: Line, text: str) -> Line:
    """The equation as one line, placed where its first line stands."""
    first = line.words[0]
    return Line(line.page, line.top, ((text, first[1], first[2], first[3], first[4]),))


LABEL_LINE = re.compile(r"^(location|bearing|at|check at)\s*[:=\-–]\s*(?P<label>.+?)\s*$", re.IGNORECASE)
MEMBER_LINE = re.compile(r"member(\s+checked)?\s*[:=\-–]\s*(?P<member>[^\s,;]+)", re.IGNORECASE)


def claim_from_equation(match: re.Match, line: Line, above: list[Line], name: str) -> Claim | None:
    where = Location(name, line.page, int(line.words[0][1]), "equation")
    values: dict[str, float] = {}
    raw_symbols = ""
    for sym, val, unit in (("a", "av", "au"), ("b", "bv", "bu")):
        symbol = match[sym].replace(" ", "")
        raw_symbols += symbol
        key = "Qr" if "r" in symbol.lower() else "Qf"
        if not match[unit]:
            raise InputError(f"'{match[0]}' gives {key} without a unit", where)
        values[key] = parse_quantity(f"{parse_number(match[val])!r} {unit_name(match[unit])}", "force", where)
    if set(values) != {"Qf", "Qr"}:
        return None
    label = ""
    member = ""
    prefix = line.text[: line.text.find(match[0])].strip().rstrip(":").strip()
    if prefix and not LABEL_LINE.match(prefix):
        label = prefix
    near = "'" in raw_symbols
    for previous in reversed(above[-8:]):
        text = previous.text
        if not label and (m := LABEL_LINE.match(text)):
            label = m["label"]
        if not member and (m := MEMBER_LINE.search(text)):
            member = m["member"]
        near = near or bool(re.search(r"near[- ]support|squeez", text, re.IGNORECASE))
        if label and member:
            break
    if not label:
        raise InputError(f"'{match[0]}' has no location label above it", where)
    mm = MEMBER_LINE.search(line.text)
    if mm:
        member = mm["member"]
    tail = line.text[line.text.find(match[0]) + len(match[0]) :]
    adequate = parse_adequate(tail.split()[0]) if tail.split() else None
    if adequate is None:
        adequate = values["Qr"] >= values["Qf"]
    return Claim(
        id="",
        where=Where(page=line.page, table="worked equation", x=round(line.words[0][1], 1), y=round(line.top, 1)),
        label=label,
        member=member,
        kind="near-support" if near else "local",
        qf=values["Qf"],
        qr=values["Qr"],
        utilisation=None,
        adequate=adequate,
        text=line.text,
        loc=where,
    )
