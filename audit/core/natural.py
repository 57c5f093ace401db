"""Natural order of ids: the digits in an id compare as numbers, so stud2 sorts before stud10."""

from __future__ import annotations

import re

_DIGITS = re.compile(r"(\d+)")


def natural_key(text: str) -> tuple:
    """A sort key that reads each run of digits as a number and the rest as text (case folded).

    The text itself closes the key, so ids that differ only in case or leading zeros still sort the
    same way on every run."""
    parts = _DIGITS.split(text)
    return (tuple((0, int(p), "") if i % 2 else (1, 0, p.casefold()) for i, p in enumerate(parts) if p), text)


def natural_sorted(items, key=None) -> list:
    """``items`` in natural order of ``key(item)`` (the item itself by default)."""
    pick = key or (lambda item: item)
    return sorted(items, key=lambda item: natural_key(pick(item)))
