"""Checks of the model as a whole: ids that look alike, supports apart and without a cycle."""

from __future__ import annotations

import itertools
import unicodedata

from audit.core.errors import ErrorCollector
from audit.engine.contacts import shorter
from audit.engine.model import Bearing, Load, Member

# ---------------------------------------------------------------- support graph


def suspicious_characters(text: str) -> str:
    """Why an id may not be what it looks like: invisible characters, or letters of two scripts."""
    for ch in text:
        if unicodedata.category(ch) in ("Cf", "Zl", "Zp") or (unicodedata.category(ch) == "Zs" and ch != " "):
            return f"holds the invisible character U+{ord(ch):04X} {unicodedata.name(ch, '')}".rstrip()
    scripts = {unicodedata.name(ch, "").split(" ")[0] for ch in text if ch.isalpha()}
    if len(scripts) > 1 and "LATIN" in scripts:
        odd = next(ch for ch in text if ch.isalpha() and not unicodedata.name(ch, "").startswith("LATIN"))
        return f"mixes scripts: U+{ord(odd):04X} {unicodedata.name(odd, '')} beside Latin letters (a look-alike?)"
    return ""


def id_warnings(members: dict[str, Member], bearings: tuple[Bearing, ...], loads: tuple[Load, ...]):
    named = [(m.id, m.loc, "member id") for m in members.values()]
    for b in bearings:
        named.append((b.id, b.loc, "bearing id"))
        named += [(a, b.loc, "alias") for a in b.aliases]
    named += [(ld.id, ld.loc, "load id") for ld in loads]
    for text, loc, what in named:
        why = suspicious_characters(text)
        if why:
            yield f"{loc}: {what} '{text}' {why}"  # the CLI writes the character as <U+XXXX>


def _support_extent(b: Bearing, members: dict[str, Member]) -> tuple[float, float]:
    """Where a support's contact lies along the member above: its stated length, else a post's depth or the width of
    the member below."""
    at = b.upper.at if b.upper.at is not None else 0.0
    lower = members[b.lower.member]
    length = b.upper.length or (lower.d if lower.vertical else lower.b)
    return at - length / 2, at + length / 2


def _check_supports_apart(
    member: Member, below: list[Bearing], members: dict[str, Member], errors: ErrorCollector
) -> None:
    """Two supports of one member whose contacts overlap are one support typed twice, not two."""
    placed = sorted((b for b in below if b.upper.at is not None), key=lambda b: b.upper.at or 0.0)
    for first, second in itertools.pairwise(placed):
        end_first = _support_extent(first, members)[1]
        start_second = _support_extent(second, members)[0]
        if shorter(start_second, end_first):  # ties at the stated resolution: touching is apart
            errors.add(
                f"supports '{first.id}' and '{second.id}' of '{member.id}' overlap along it "
                f"(centres {(first.upper.at or 0.0) * 1000:.0f} mm and {(second.upper.at or 0.0) * 1000:.0f} mm); "
                "give one bearing, or move them apart",
                second.loc,
            )


def check_support_graph(members: dict[str, Member], bearings: tuple[Bearing, ...], errors: ErrorCollector) -> None:
    supports: dict[str, list[Bearing]] = {m: [] for m in members}
    for b in bearings:
        supports[b.upper.member].append(b)
    for member in members.values():
        below = supports[member.id]
        if member.vertical and len(below) > 1:
            errors.add(
                f"post '{member.id}' bears on {len(below)} members; a post has one bearing at its foot",
                below[1].loc,
            )
        elif not member.vertical and member.continuous and below:
            errors.add(
                f"'{member.id}' is continuously supported and cannot also bear on other members",
                below[0].loc,
            )
        elif not member.vertical and not member.continuous and len(below) < 2:
            errors.add(
                f"horizontal member '{member.id}' has {len(below)} support(s); it needs at least two "
                "bearings, or 'support: continuous'",
                member.loc,
            )
        _check_supports_apart(member, below, members, errors)
    cycle = find_support_cycle(members, bearings)
    if cycle:
        first = next(b for b in bearings if b.upper.member == cycle[0] and b.lower.member == cycle[1])
        errors.add(f"members support each other in a cycle: {' -> '.join(cycle)}", first.loc)


def find_support_cycle(members: dict[str, Member], bearings: tuple[Bearing, ...]) -> list[str]:
    """A list of member ids forming a cycle (upper -> lower -> ... -> upper), or []."""
    below: dict[str, list[str]] = {m: [] for m in members}
    for b in bearings:
        below[b.upper.member].append(b.lower.member)
    state: dict[str, int] = {}
    for start in sorted(members):
        if state.get(start):
            continue
        stack: list[tuple[str, int]] = [(start, 0)]
        path: list[str] = []
        while stack:
            node, i = stack.pop()
            if i == 0:
                state[node] = 1
                path.append(node)
            nxt = below[node]
            if i < len(nxt):
                stack.append((node, i + 1))
                child = nxt[i]
                if state.get(child) == 1:
                    return [*path[path.index(child) :], child]
                if not state.get(child):
                    stack.append((child, 0))
            else:
                state[node] = 2
                path.pop()
    return []
