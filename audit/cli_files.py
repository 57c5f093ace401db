"""`bearing-audit ifc` and `schema`, registered by `audit/cli.py` (kept apart only because cli.py is at its size limit).

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


def schema(which: str = typer.Argument("model", help="Which input file: model or claims.", metavar="WHICH")) -> None:
    """Print the JSON Schema of an input file, for editors that validate and complete YAML."""
    import json

    from audit.inputs.schema import SCHEMAS

    if which not in SCHEMAS:
        typer.echo(f"error: no schema '{which}' (known: {', '.join(SCHEMAS)})", err=True)
        raise typer.Exit(2)
    typer.echo(json.dumps(SCHEMAS[which], indent=2))
