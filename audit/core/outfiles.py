"""Files in and out, safely: inputs must be regular readable files, outputs never destroy anything.

Outputs are checked before anything is read (an output that is an input, another output, a
link, a device, a directory or a FIFO is refused), written to temporary files beside their
targets, and moved into place together only when every one is complete. SIGINT, SIGTERM and
SIGHUP are held off while the moves run, so an interrupted run leaves all of the outputs or none,
and never a temporary file.
"""

from __future__ import annotations

import os
import signal
import stat
import tempfile
from collections.abc import Callable, Iterable, Iterator
from contextlib import contextmanager
from dataclasses import dataclass
from pathlib import Path
from typing import IO, Any

from audit.core.errors import InputError, Location

Chunks = str | bytes | Iterable[str] | Iterable[bytes]  # text is written as UTF-8


class OutputError(InputError):
    """An output that cannot or must not be written; the CLI exits with status 2."""


@dataclass(frozen=True)
class Output:
    """One requested output: the option that named it, its path, and a maker of its text."""

    option: str
    path: Path
    make: Callable[[], Chunks]


def _kind_of(mode: int) -> str:
    if stat.S_ISDIR(mode):
        return "a directory"
    if stat.S_ISFIFO(mode):
        return "a FIFO (named pipe)"
    if stat.S_ISCHR(mode) or stat.S_ISBLK(mode):
        return "a device"
    if stat.S_ISSOCK(mode):
        return "a socket"
    return "not a regular file"


def require_input_file(path: Path | str, option: str = "") -> os.stat_result:
    """Stat an input without opening it: a FIFO with no writer must never make us wait."""
    name = str(path)
    where = Location(name, key=option) if option else Location(name)
    try:
        info = os.stat(name)
    except FileNotFoundError:
        raise InputError("file not found", where) from None
    except OSError as exc:
        raise InputError(f"cannot read file: {exc.strerror or exc}", where) from None
    if not stat.S_ISREG(info.st_mode):
        raise InputError(f"is {_kind_of(info.st_mode)}, not a file to read", where)
    if not os.access(name, os.R_OK):
        raise InputError("cannot read file: permission denied", where)
    return info


def _same(a: Path, b: Path) -> bool:
    try:
        return os.path.samefile(a, b)
    except OSError:
        return os.path.abspath(a) == os.path.abspath(b)


def check_outputs(outputs: Iterable[tuple[str, Path]], inputs: Iterable[tuple[str, Path]]) -> None:
    """Refuse, before anything is read, every output that would destroy something."""
    outs = list(outputs)
    ins = list(inputs)
    for i, (option, path) in enumerate(outs):
        where = Location(str(path), key=option)
        for in_option, in_path in ins:
            if _same(path, in_path):
                raise OutputError(f"is also the input {in_option} {in_path}; choose another output file", where)
        for other_option, other in outs[:i]:
            if _same(path, other):
                raise OutputError(f"is also the output of {other_option}; give each output its own file", where)
        _check_output_path(path, where)


def _check_output_path(path: Path, where: Location) -> None:
    try:
        info = os.lstat(path)
    except FileNotFoundError:
        info = None
    except OSError as exc:
        raise OutputError(f"cannot write here: {exc.strerror or exc}", where) from None
    if info is not None:
        if stat.S_ISLNK(info.st_mode):
            raise OutputError("is a symbolic link; it is not replaced. Name the file itself", where)
        if not stat.S_ISREG(info.st_mode):
            raise OutputError(f"is {_kind_of(info.st_mode)}; it is not replaced", where)
    parent = path.parent if str(path.parent) else Path(".")
    if not parent.exists():
        raise OutputError(f"folder {parent} does not exist", where)
    if not parent.is_dir():
        raise OutputError(f"{parent} is not a folder", where)
    if not os.access(parent, os.W_OK | os.X_OK):
        raise OutputError(f"folder {parent} is not writable", where)


# Output is bounded by input: labels and aliases repeated in every view of a memo must not turn
# a small file into hundreds of MB. Each output may be this many times the inputs, and at least
# the floor.
OUTPUT_PER_INPUT = 50
OUTPUT_FLOOR = 16 * 1024 * 1024


def output_limit(input_bytes: int) -> int:
    return max(OUTPUT_FLOOR, OUTPUT_PER_INPUT * input_bytes)


def write_outputs(outputs: Iterable[Output], limit: int | None = None) -> None:
    """Write every output to a temporary file, then move them all into place, or none.

    ``limit`` caps each output's size in characters; over it, nothing is written.
    """
    done: list[tuple[str, Path]] = []
    try:
        with _signals_as_interrupts():
            for out in outputs:
                done.append((_write_temporary(out.path, out.make(), out.option, limit), out.path))
            with _signals_held():
                for tmp, path in done:
                    os.replace(tmp, path)
                done.clear()
    finally:
        for tmp, _ in done:
            Path(tmp).unlink(missing_ok=True)


def write_atomic(path: Path | str, text: Chunks, option: str = "") -> None:
    """Write one output through a temporary file (see ``write_outputs``)."""
    target = Path(path)
    write_outputs([Output(option or str(target), target, lambda: text)])


def _write_temporary(path: Path, text: Chunks, option: str, limit: int | None = None) -> str:
    where = Location(str(path), key=option)
    try:
        fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".part", dir=path.parent)
    except OSError as exc:
        raise OutputError(f"cannot write here: {exc.strerror or exc}; nothing was written", where) from None
    try:
        os.chmod(tmp, 0o666 & ~_umask())
        pieces = [text] if isinstance(text, (str, bytes)) else text
        binary = isinstance(text, bytes) or (isinstance(pieces, list) and bool(pieces) and isinstance(pieces[0], bytes))
        handle: IO[Any] = os.fdopen(fd, "wb") if binary else os.fdopen(fd, "w", encoding="utf-8", newline="\n")
        with handle:
            written = 0
            for chunk in pieces:
                written += len(chunk)
                if limit is not None and written > limit:
                    raise OutputError(
                        f"would exceed {limit // (1024 * 1024)} MB ({OUTPUT_PER_INPUT} times the inputs); "
                        "nothing was written. Shorten repeated labels and aliases, or write fewer outputs",
                        where,
                    )
                handle.write(chunk)
            handle.flush()
            os.fsync(handle.fileno())
    except OSError as exc:
        Path(tmp).unlink(missing_ok=True)
        raise OutputError(f"cannot write: {exc.strerror or exc}; nothing was written", where) from None
    except OutputError:
        Path(tmp).unlink(missing_ok=True)
        raise
    except BaseException:
        Path(tmp).unlink(missing_ok=True)
        raise
    return tmp


class Interrupted(BaseException):
    """SIGTERM or SIGHUP while writing, turned into an exception so the temporary files are removed."""

    @property
    def signum(self) -> int:
        return int(self.args[0]) if self.args else int(signal.SIGTERM)


# signals that end a run while it writes: each unwinds like SIGINT, so the temporaries are removed
# (SIGHUP: the terminal closed)
ENDING = (signal.SIGTERM, signal.SIGHUP)


@contextmanager
def _signals_as_interrupts() -> Iterator[None]:
    """Let SIGTERM and SIGHUP unwind like SIGINT does, so cleanup runs (main thread only)."""
    previous = {}
    try:
        for signum in ENDING:
            previous[signum] = signal.signal(signum, _raise_interrupted)
    except ValueError:  # not the main thread: nothing to install
        yield
        return
    try:
        yield
    finally:
        for signum, handler in previous.items():
            signal.signal(signum, handler)


def _raise_interrupted(signum: int, frame: object) -> None:
    raise Interrupted(signum)


@contextmanager
def _signals_held() -> Iterator[None]:
    """Hold SIGINT, SIGTERM and SIGHUP while the moves run; they arrive once all outputs are in place."""
    held = {signal.SIGINT, *ENDING}
    previous = signal.pthread_sigmask(signal.SIG_BLOCK, held)
    try:
        yield
    finally:
        signal.pthread_sigmask(signal.SIG_SETMASK, previous)


def _umask() -> int:
    current = os.umask(0)
    os.umask(current)
    return current
