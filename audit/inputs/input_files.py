"""Every file a command names, checked before anything is read: inputs readable, outputs harmless."""

from __future__ import annotations

from pathlib import Path

from audit.core.outfiles import check_outputs, require_input_file


def check_files(
    inputs: dict[str, Path | None], outputs: dict[str, Path | None], rules_dirs: tuple[Path, ...] | None = None
) -> int:
    """Inputs must be readable regular files; outputs may destroy nothing. Before any reading.

    With ``rules_dirs`` (a command that reads rule packs), every pack file, the reviewer's and the
    bundled ones, is an input too: an output onto a pack would replace it. Returns the inputs'
    total size (packs left out), which bounds the outputs."""
    given_inputs = [(option, path) for option, path in inputs.items() if path is not None]
    total = sum(require_input_file(path, option).st_size for option, path in given_inputs)
    packs: list[tuple[str, Path]] = []
    if rules_dirs is not None:
        from audit.standards.catalogue import pack_files

        packs = [("rule pack", path) for path in pack_files(rules_dirs)]
    check_outputs([(o, p) for o, p in outputs.items() if p is not None], given_inputs + packs)
    return total
