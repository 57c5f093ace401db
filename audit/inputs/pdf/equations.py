"""Worked equations as the trade writes them, under each standard's symbols, with the location (and
member) lines above:

    Qr = phi Fcp Ab KB KZcp = 0.8 x 7.0 x 19500 x 1.0 x 1.0 = 109.2 kN > Qf = 15.8 kN OK      (CSA O86)
    P = 4,200 lb <= P' = Fc' Ab = 625 psi x 12.38 in2 = 7,738 lb                                 (US NDS)
    F_c,90,d = 15.8 kN <= k_c,90 f_c,90,d A_ef = 1.5 x 2.5 MPa x 19500 mm2 = 73.1 kN             (EN 1995-1-1)

Each side of the comparison is a symbol (or a formula) followed by '= ...' steps, x, ×, * or · between
the factors, ending in a value with its unit; one side is the load, the other the resistance (known
by its symbol, or as the side that is not the load). An equation may stand over two lines, each line
one side.
"""

from __future__ import annotations

import re
from dataclasses import dataclass

from audit.core.errors import InputError, Location
from audit.inputs.pdf.tables import Line
from audit.inputs.pdf.values import (
    NUMBER_TEXT,
    POINT,
    NumberProblem,
    Numbers,
    lenient_number,
    parse_adequate,
    quantity,
    read_number,
)
from audit.inputs.read_claims import Claim, Where

OPERATOR = re.compile(r">=|≥|=>|<=|≤|=<|>|<")
VALUE = re.compile(rf"^\s*(?P<v>[-\u2212]?(?:{NUMBER_TEXT}|\.\d+))\s*(?P<u>[A-Za-z]+(?:\*\*2|²|2)?)?(?P<tail>.*)$")
_Q = r"Q\s?'?\s?(?P<q>[fr])\s?'?"
_EC5_LOAD = r"F\s?_?\s?c\s?,?\s?90\s?,?\s?d"
_EC5_RESIST = r"F\s?_?\s?c\s?,?\s?90\s?,?\s?R\s?d"
SYMBOL = re.compile(rf"(?:^|(?<=[\s:(]))(?P<s>{_Q}|{_EC5_RESIST}|{_EC5_LOAD}|P\s?'|P)\s*$")
SYMBOL_ALONE = re.compile(rf"^\s*(?P<s>{_Q}|{_EC5_RESIST}|{_EC5_LOAD}|P\s?'|P)(?![A-Za-z0-9])(?P<rest>.*)$")
RESISTANCE_FORMULA = re.compile(
    r"k\s?_?\s?c\s?,?\s?90|f\s?_?\s?c\s?,?\s?90|φ|phi|F\s?c\s?p|F\s?c\s?⊥|A\s?_?\s?ef", re.I
)
EQUATION_HINT = re.compile(r"=")  # every worked equation has one: most lines need no further look


@dataclass(frozen=True)
class Side:
    role: str  # "Qf" (the load), "Qr" (the resistance) or "" (known only as the other side)
    near: bool  # a primed O86 symbol: the near-support check
    value: float | None
    unit: str
    symbol: str
    prefix: str  # text before the symbol: a label on the same line
    tail: str  # words after the value: a verdict
    number: str = ""  # the value as printed, read with the page's decimal mark when the claim is made


@dataclass(frozen=True)
class Worked:
    """An equation read: its load and resistance sides and the text it was read from."""

    text: str
    load: Side
    resistance: Side

    @property
    def tail(self) -> str:
        return self.resistance.tail or self.load.tail


def parse_side(text: str) -> Side | None:
    """'Qr = phi ... = 109.2 kN' or '15.8 kN OK' (a bare value) or 'Qr OK' (a symbol alone)."""
    parts = text.split("=")
    if len(parts) == 1 and (alone := SYMBOL_ALONE.match(text)) is not None:
        return Side(
            _role(alone["s"], ""),
            "'" in alone["s"] and bool(alone["q"]),
            None,
            "",
            alone["s"],
            "",
            alone["rest"].strip(),
        )
    head = parts[0].rstrip()
    last = parts[-1] if len(parts) > 1 else head
    symbol_match = SYMBOL.search(head)
    symbol = symbol_match["s"] if symbol_match else ""
    prefix = head[: symbol_match.start("s")].strip() if symbol_match else ""
    value = VALUE.match(last) if len(parts) > 1 or not symbol else None
    if not symbol and value is None:
        return None
    if not symbol and len(parts) > 1 and not RESISTANCE_FORMULA.search(head):
        return None  # 'x = 3 kN' of some other quantity
    role = _role(symbol, head)
    near = bool(symbol_match and symbol_match["q"] and "'" in symbol)
    if value is None:
        tail = head[symbol_match.end("s") :] if symbol_match else ""
        return Side(role, near, None, "", symbol, prefix, tail.strip())
    return Side(
        role, near, lenient_number(value["v"]), value["u"] or "", symbol, prefix, value["tail"].strip(), value["v"]
    )


def _role(symbol: str, head: str) -> str:
    s = symbol.replace(" ", "")
    if re.fullmatch(r"Q'?f'?", s) or re.fullmatch(_EC5_LOAD.replace(r"\s?", ""), s) or s == "P":
        return "Qf"
    if re.fullmatch(r"Q'?r'?", s) or s.startswith("P'") or re.fullmatch(_EC5_RESIST.replace(r"\s?", ""), s):
        return "Qr"
    if not symbol and RESISTANCE_FORMULA.search(head):
        return "Qr"
    return ""


def find_equation(text: str) -> Worked | None:
    """The comparison of a load and a resistance on one line, both with values; None otherwise."""
    ops = list(OPERATOR.finditer(text))
    if len(ops) != 1:
        return None
    op = ops[0]
    a, b = parse_side(text[: op.start()]), parse_side(text[op.end() :])
    return _pair(text, a, b)


def _pair(text: str, a: Side | None, b: Side | None) -> Worked | None:
    if a is None or b is None or a.value is None or b.value is None:
        return None
    roles = {a.role, b.role} - {""}
    if len(roles) == 1:  # one side known: the other is its counterpart
        known = roles.pop()
        other = "Qr" if known == "Qf" else "Qf"
        a = a if a.role else _as(a, other)
        b = b if b.role else _as(b, other)
    if {a.role, b.role} != {"Qf", "Qr"}:
        return None
    load, resistance = (a, b) if a.role == "Qf" else (b, a)
    return Worked(text, load, resistance)


def _as(side: Side, role: str) -> Side:
    return Side(role, side.near, side.value, side.unit, side.symbol, side.prefix, side.tail, side.number)


def half_of(text: str) -> Side | None:
    """One valued side standing alone on a line (an equation over two lines)."""
    if OPERATOR.search(text):
        return None
    side = parse_side(text)
    return side if side is not None and side.value is not None and side.role else None


def joined_equation(lines: list[Line], i: int) -> tuple[Worked, Line, int] | None:
    """An equation written over two or three lines ('Qr = ... = 45.2 kN' / 'Qf = 31.0 kN  OK', or
    'Qf' = 7.13 kN <= Qr' OK'), read as one; None when the lines at ``i`` are not one."""
    first = half_of(lines[i].text)
    if first is None:
        return None
    for j in (i + 1, i + 2):
        if j >= len(lines):
            break
        text = lines[j].text
        second = half_of(text)
        if second is None:
            ops = list(OPERATOR.finditer(text))
            if len(ops) == 1:
                sides = [parse_side(text[: ops[0].start()]), parse_side(text[ops[0].end() :])]
                valued = [s for s in sides if s is not None and s.value is not None]
                bare = [s for s in sides if s is not None and s.value is None]
                if len(valued) == 1 and bare:
                    second = Side(
                        valued[0].role, valued[0].near or bare[0].near, valued[0].value, valued[0].unit,
                        valued[0].symbol, valued[0].prefix, valued[0].tail or bare[0].tail, valued[0].number,
                    )  # fmt: skip
        if second is not None and second.role and second.role != first.role:
            joined = f"{lines[i].text} / {text}"
            worked = _pair(joined, first, second)
            if worked is not None:
                return worked, _with_text(lines[i], joined), j
        if second is not None:
            break
    return None


def _with_text(line: Line, text: str) -> Line:
    """The equation as one line, placed where its first line stands."""
    first = line.words[0]
    return Line(line.page, line.top, ((text, first[1], first[2], first[3], first[4]),))


LABEL_LINE = re.compile(r"^(location|bearing|at|check at)\s*[:=\-–]\s*(?P<label>.+?)\s*$", re.IGNORECASE)
MEMBER_LINE = re.compile(r"member(\s+checked)?\s*[:=\-–]\s*(?P<member>[^\s,;]+)", re.IGNORECASE)
NEAR_HEADING = re.compile(r"near[- ]?(the\s+)?support|squeez|within\s+d\b", re.IGNORECASE)


def claim_from_equation(
    worked: Worked, line: Line, above: list[Line], name: str, numbers: Numbers = POINT
) -> Claim | None:
    where = Location(name, line.page, int(line.words[0][1]), "equation")
    values: dict[str, float] = {}
    for key, side in (("Qf", worked.load), ("Qr", worked.resistance)):
        if not side.unit:
            raise InputError(f"'{worked.text}' gives {key} without a unit", where)
        try:
            number = read_number(side.number, numbers) if side.number else side.value or 0.0
        except NumberProblem as problem:
            raise InputError(f"{key} {problem}", where) from None
        values[key] = quantity(number, side.unit, "force", where)
    label = ""
    member = ""
    prefix = (worked.load.prefix or worked.resistance.prefix).rstrip(":").strip()
    if prefix and not LABEL_LINE.match(prefix):
        label = prefix
    near = worked.load.near or worked.resistance.near
    for k, previous in enumerate(reversed(above[-8:])):
        text = previous.text
        if not label and (m := LABEL_LINE.match(text)):
            label = m["label"]
            heading = above[-k - 2].text if k + 2 <= len(above) else ""
            near = near or bool(NEAR_HEADING.search(heading))  # the heading over the block names its kind
        if not member and (m := MEMBER_LINE.search(text)):
            member = m["member"]
        if label and member:
            break
    if not label:
        raise InputError(f"'{worked.text}' has no location label above it", where)
    mm = MEMBER_LINE.search(line.text)
    if mm:
        member = mm["member"]
    words = worked.tail.split()
    adequate = parse_adequate(" ".join(words[:2])) if len(words) >= 2 else None
    if adequate is None and words:
        adequate = parse_adequate(words[0])
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
