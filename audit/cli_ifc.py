"""`bearing-audit ifc`, registered by `audit/cli.py` (kept apart only because cli.py is at its size limit).

An input error is raised on to `cli.run`, which prints it as one line and exits 2."""

from __future__ import annotations

from pathlib import Path

import typer


def ifc(
    model: Path = typer.Argument(..., help="The building model (IFC2X3 or IFC4).", metavar="MODEL.ifc"),
    out: Path = typer.Option(..., "-o", "--out", metavar="FILE", help="Where to write the model with its layout."),
    material_map: Path | None = typer.Option(
        None, "--map", metavar="FILE", help="IFC material names -> the model's material ids (YAML)."
    ),
) -> None:
    """Read the framing of an IFC building model into a layout: storeys, beams, columns and members."""
    from audit.core.errors import visible
    from audit.core.outfiles import Output, write_outputs
    from audit.inputs.ifc_write import ifc_to_layout
    from audit.inputs.input_files import check_files

    check_files({"MODEL.ifc": model, "--map": material_map}, {"--out": out})
    written = ifc_to_layout(model, material_map)
    for warning in written.warnings:
        typer.echo(f"warning: {visible(warning)}", err=True)
    write_outputs([Output("--out", out, lambda: [written.text])])
    typer.echo(f"wrote {out}")
