"""A near miss named back to the writer: the one suggestion every reader's error gives for a mistyped word."""

from __future__ import annotations

import difflib
from collections.abc import Iterable


def did_you_mean(word: str, choices: Iterable[str]) -> str:
    """' (did you mean 'X'?)' for a near miss, else nothing."""
    close = difflib.get_close_matches(word, list(choices), n=1, cutoff=0.5)
    return f" (did you mean '{close[0]}'?)" if close else ""
