"""Input errors that name the file, line, column and key path.

One base class that is also a ``ValueError``; readers collect every error of a file and
raise them together so the reviewer fixes a file in one pass.
"""

from __future__ import annotations

import unicodedata
from dataclasses import dataclass


def visible(text: str) -> str:
    """Text with every invisible format or control character written as <U+XXXX>: a message must show
    what is in an id (a zero-width space, a direction override that would reorder the line), not hide it."""
    if text.isascii() and text.isprintable():
        return text
    return "".join(f"<U+{ord(ch):04X}>" if _hidden(ch) else ch for ch in text)


def _hidden(ch: str) -> bool:
    """A character a terminal does not show as itself: format and control characters, line and paragraph
    separators, and spaces other than the plain one (a no-break space looks like a space)."""
    category = unicodedata.category(ch)
    return category in ("Cf", "Cc", "Zl", "Zp") or (category == "Zs" and ch != " ")


@dataclass(frozen=True, slots=True)
class Location:
    """Where a value came from: file, 1-based line and column, and the key path."""

    file: str
    line: int = 0
    column: int = 0
    key: str = ""

    def __str__(self) -> str:
        if not self.line:
            return f"{self.file}: {self.key}" if self.key else self.file
        # an error about the document as a whole still names a key, so every line reads alike
        return f"{self.file}:{self.line}:{self.column}: {self.key or '(document)'}"


class InputError(ValueError):
    """A problem with something the reviewer supplied; the CLI exits with status 2."""

    def __init__(self, message: str, location: Location | None = None) -> None:
        self.message = message
        self.location = location
        super().__init__(self.one_line())

    def one_line(self) -> str:
        text = " ".join(self.message.split())
        if len(text) > 300:
            text = text[:297] + "..."
        return visible(f"{self.location}: {text}" if self.location else text)


class InputErrors(InputError):
    """Several input errors found in one pass."""

    def __init__(self, errors: list[InputError], warnings: tuple[str, ...] = ()) -> None:
        self.errors = list(errors)
        self.warnings = warnings  # found before the errors stopped the run, printed with them
        super().__init__(self.errors[0].message, self.errors[0].location)

    def lines(self) -> list[str]:
        return [e.one_line() for e in self.errors]


class ErrorCollector:
    """Collects input errors so that all of a file's errors are reported in one run."""

    def __init__(self) -> None:
        self.errors: list[InputError] = []
        self.warnings: list[str] = []  # raised with the errors, so a warning that explains one is not lost

    def add(self, message: str, location: Location | None) -> None:
        self.errors.append(InputError(message, location))

    def extend(self, error: InputError) -> None:
        if isinstance(error, InputErrors):
            self.errors.extend(error.errors)
        else:
            self.errors.append(error)

    def raise_if_any(self) -> None:
        """Raise every error collected, once each: the same cause met at several places is one line."""
        if self.errors:
            unique = list({e.one_line(): e for e in self.errors}.values())
            raise InputErrors(unique, tuple(dict.fromkeys(self.warnings)))
