"""The command line (typer). Input errors print one line each and exit 2; no traceback."""

from __future__ import annotations

import gc
import sys
from pathlib import Path
from typing import Any, NoReturn

import typer

from audit.cli_files import ifc, schema
from audit.core.errors import InputError, InputErrors, Location

app = typer.Typer(
    add_completion=False,
    rich_markup_mode=None,
    pretty_exceptions_enable=False,
    no_args_is_help=True,
    help="Peer-review the timber bearing checks (CSA O86, compression perpendicular to grain) of a calc package.",
)

# past this many checks the terminal lists only the failing ones: a long table scrolls by unread
TERMINAL_ROWS = 500

RulesDir = typer.Option(
    None, "--rules-dir", metavar="DIR", help="A folder of your own rule packs (searched before the bundled ones)."
)
RulePack = typer.Option(None, "--rule-pack", metavar="ID", help="Rule pack id; overrides project.rule_pack.")


def _version(value: bool) -> None:
    if value:
        from audit import __version__

        typer.echo(f"bearing-audit {__version__}")
        raise typer.Exit(0)


@app.callback()
def _main(
    version: bool = typer.Option(
        False, "--version", callback=_version, is_eager=True, help="Print the version and exit."
    ),
) -> None:
    """Peer-review the timber bearing checks (CSA O86, compression perpendicular to grain) of a calc package."""


def _fail(error: InputError) -> NoReturn:
    from audit.core.errors import visible

    for warning in getattr(error, "warnings", ()):
        typer.echo(f"warning: {visible(warning)}", err=True)
    lines = error.lines() if isinstance(error, InputErrors) else [error.one_line()]
    for line in lines:
        typer.echo(f"error: {line}", err=True)
    if len(lines) > 1:
        typer.echo(f"{len(lines)} errors; nothing was reviewed.", err=True)
    raise typer.Exit(2)


def _dirs(rules_dir: list[Path] | None) -> tuple[Path, ...]:
    return tuple(rules_dir or ())


# the review command's options (declared here so that the command reads as what it does)
MODEL_ARGUMENT = typer.Argument(..., help="The review model (YAML).", metavar="MODEL")
CLAIMS_OPTION = typer.Option(None, "--claims", help="What the calc claims (YAML), to reconcile.", metavar="FILE")
CALC_PDF_OPTION = typer.Option(None, "--calc-pdf", help="Extract the claims from the calc's PDF.", metavar="FILE")
PAGES_OPTION = typer.Option(None, "--pages", help="With --calc-pdf: pages to read, e.g. 12-30,35.", metavar="PAGES")
COLUMN_MAP_OPTION = typer.Option(None, "--map", help="With --calc-pdf: a column map (YAML).", metavar="FILE")
MEMO_OPTION = typer.Option(
    None,
    "--memo",
    metavar="FILE",
    help="Write the review letter as HTML: summary, comments, assumptions, cautions.",
)
APPENDIX_OPTION = typer.Option(
    None,
    "--appendix",
    help="Write the letter's appendix as HTML: every check and claim, plans, elevations, derivations.",
    metavar="FILE",
)
ALL_DERIVATIONS_OPTION = typer.Option(
    False, "--all-derivations", help="In the appendix, derive confirmed and covered checks too."
)
JSON_OUT_OPTION = typer.Option(None, "--json", help="Write every check and finding as JSON.", metavar="FILE")
CSV_OUT_OPTION = typer.Option(
    None, "--csv", help="Write the comment log as CSV (one row per place, a reply column).", metavar="FILE"
)
XLSX_OUT_OPTION = typer.Option(
    None, "--xlsx", help="Write the comment log as a workbook, with a sheet of every check.", metavar="FILE"
)
DATE_OPTION = typer.Option(None, "--date", help="Memo date (YYYY-MM-DD); default project.date.", metavar="YYYY-MM-DD")
PREVIOUS_OPTION = typer.Option(
    None, "--previous", metavar="LAST.json", help="The JSON of the last review round, to match comments with."
)
RESPONSES_OPTION = typer.Option(
    None,
    "--responses",
    metavar="LOG",
    help="With --previous: the last round's comment log (CSV or workbook) with the designer's responses "
    "(and the reviewer's dispositions, where its disposition column is filled in).",
)
DISPOSITIONS_OPTION = typer.Option(
    None,
    "--dispositions",
    metavar="FILE",
    help="With --previous: the reviewer's dispositions of the designer's responses (YAML).",
)
ALL_ROWS_OPTION = typer.Option(
    False,
    "--all-rows",
    help=f"List every check in the terminal (past {TERMINAL_ROWS} checks only the failing ones are listed).",
)


@app.command()
def review(
    model: Path = MODEL_ARGUMENT,
    claims: Path | None = CLAIMS_OPTION,
    calc_pdf: Path | None = CALC_PDF_OPTION,
    pages: str | None = PAGES_OPTION,
    column_map: Path | None = COLUMN_MAP_OPTION,
    memo: Path | None = MEMO_OPTION,
    appendix: Path | None = APPENDIX_OPTION,
    all_derivations: bool = ALL_DERIVATIONS_OPTION,
    json_out: Path | None = JSON_OUT_OPTION,
    csv_out: Path | None = CSV_OUT_OPTION,
    xlsx_out: Path | None = XLSX_OUT_OPTION,
    date: str | None = DATE_OPTION,
    previous: Path | None = PREVIOUS_OPTION,
    responses: Path | None = RESPONSES_OPTION,
    dispositions: Path | None = DISPOSITIONS_OPTION,
    all_rows: bool = ALL_ROWS_OPTION,
    rules_dir: list[Path] | None = RulesDir,
    rule_pack: str | None = RulePack,
) -> None:
    """Recompute every required bearing check; with --claims, reconcile the calc's claims."""
    import datetime as dt

    from audit.report.outputs import RunOutputs, write_run
    from audit.review.run import RunRequest, run_review

    for option, given in (("--responses", responses), ("--dispositions", dispositions)):
        if given and not previous:
            typer.echo(f"error: {option}: give the last round's JSON with --previous too", err=True)
            raise typer.Exit(2)
    try:
        memo_date = dt.date.fromisoformat(date) if date else None
    except ValueError:
        typer.echo(f"error: --date: expected YYYY-MM-DD, got {date!r}", err=True)
        raise typer.Exit(2) from None
    wanted = RunOutputs(
        memo=memo,
        appendix=appendix,
        json=json_out,
        csv=csv_out,
        xlsx=xlsx_out,
        date=memo_date,
        all_derivations=all_derivations,
    )
    request = RunRequest(
        model=model,
        claims=claims,
        calc_pdf=calc_pdf,
        pages=pages,
        column_map=column_map,
        previous=previous,
        responses=responses,
        dispositions=dispositions,
        outputs=wanted.by_option(),
        rules_dirs=_dirs(rules_dir),
        rule_pack=rule_pack,
    )
    try:
        run = run_review(request, _extract, lambda line: typer.echo(line, err=True))
    except InputError as exc:
        _fail(exc)
    _print_run(run, all_rows)
    try:
        written = write_run(run, wanted)
    except InputError as exc:
        _fail(exc)
    for path in written:
        typer.echo(f"wrote {path}")
    raise typer.Exit(1 if run.needs_revision else 0)


def _print_run(run, all_rows: bool) -> None:
    """The run in the terminal: the checks, every comment that asks for something, the counts."""
    from audit.report.export import summary_line

    typer.echo(_terminal_checks(run.review, all_rows))
    for comment in run.comments:
        if not comment.quiet:
            typer.echo(f"{comment.number:>3}. [{comment.weight}] {comment.kind}: {comment.title}")
    typer.echo(summary_line(run.review))
    if run.reconciliation is not None:
        counts = run.reconciliation.counts()
        typer.echo("findings: " + ", ".join(f"{n} {k}" for k, n in counts.items()))


def _terminal_checks(result, all_rows: bool) -> str:
    """The check table for the terminal: every check for a small building (or with --all-rows); for a
    large one the failing checks only (at most TERMINAL_ROWS) and a line saying so. Every check is
    in the memo, the JSON and the workbook whatever the terminal shows."""
    import dataclasses

    from audit.report.export import check_table

    count = len(result.results)
    if all_rows or count <= TERMINAL_ROWS:
        return check_table(result)
    failing = tuple(r for r in result.results if not r.passes)
    if not failing:
        return f"{count:,} checks, none failing (every check: --all-rows)"
    shown = failing[:TERMINAL_ROWS]
    which = (
        f"the {len(shown):,} failing"
        if len(shown) == len(failing)
        else f"the first {len(shown):,} of {len(failing):,} failing"
    )
    table = check_table(dataclasses.replace(result, results=shown))
    return f"{table}\n{count:,} checks: {which} listed above (every check: --all-rows)"


def _check_files(
    inputs: dict[str, Path | None], outputs: dict[str, Path | None], rules_dirs: tuple[Path, ...] | None = None
) -> int:
    """``input_files.check_files``: every file a command names, checked before anything is read."""
    from audit.inputs.input_files import check_files

    return check_files(inputs, outputs, rules_dirs)


def _decimal_of(standard: object) -> str:
    from audit.inputs.calc_pdf import decimal_mark_of

    return decimal_mark_of(standard)


def _extract(
    pdf: Path,
    pages: str | None,
    column_map: Path | None,
    headers: dict[str, str] | None = None,
    standard_decimal: str | None = None,
    decimal_mark: str | None = None,
) -> Any:
    """``calc_pdf.read_calc_pdf``, its notes on stderr."""
    from audit.inputs.calc_pdf import read_calc_pdf

    echo = lambda line: typer.echo(line, err=True)  # noqa: E731
    return read_calc_pdf(pdf, pages, column_map, headers, standard_decimal, decimal_mark, echo)


@app.command()
def expand(
    model: Path = typer.Argument(..., help="A review model with a layout section (YAML).", metavar="MODEL"),
    out: Path = typer.Option(..., "-o", "--out", metavar="FILE", help="Where to write the explicit model (YAML)."),
    rules_dir: list[Path] | None = RulesDir,
    rule_pack: str | None = RulePack,
) -> None:
    """Write the model with its layout expanded: every member, bearing and load, each with where it came from."""
    from audit.core.errors import visible
    from audit.core.outfiles import Output, output_limit, write_outputs
    from audit.inputs.explicit_model import explicit_model_with_warnings

    try:
        input_bytes = _check_files({"MODEL": model}, {"--out": out}, _dirs(rules_dir))
        text, warnings = explicit_model_with_warnings(model, _dirs(rules_dir), rule_pack)
        for warning in warnings:  # what a review would warn of, said when the layout is expanded too
            typer.echo(f"warning: {visible(warning)}", err=True)
        # the explicit model is the expanded model itself, bounded by the layout's own limit on members
        write_outputs([Output("--out", out, lambda: [text])], output_limit(max(input_bytes, len(text))))
    except InputError as exc:
        _fail(exc)
    typer.echo(f"wrote {out}")


@app.command()
def extract(
    pdf: Path = typer.Argument(..., help="The calc package (PDF).", metavar="PDF"),
    output: Path | None = typer.Option(None, "-o", "--output", help="Write the claims (YAML) here.", metavar="FILE"),
    pages: str | None = typer.Option(None, "--pages", help="Pages to read, e.g. 12-30,35.", metavar="PAGES"),
    column_map: Path | None = typer.Option(
        None, "--map", help="A column map (YAML) for unusual tables.", metavar="FILE"
    ),
    standard: str = typer.Option(
        "o86", "--standard", metavar="ID", help="Whose symbols the calc sheets use: o86, nds or ec5."
    ),
    show: int | None = typer.Option(
        None, "--show", metavar="PAGE", help="Print how the reader sees one page (heads, columns, each row)."
    ),
    decimal_mark: str | None = typer.Option(
        None,
        "--decimal-mark",
        metavar="MARK",
        help="How the calc's numbers mark decimals: point (3,125 is 3125), comma (3,125 is 3.125) or either "
        "(numbers that could be read both ways are reported, not read). Default: the standard's habit.",
    ),
) -> None:
    """Pull the claimed bearing checks out of a calc package PDF into a claims file."""
    from audit.core.outfiles import write_atomic
    from audit.inputs.pdf.extract import claims_yaml
    from audit.standards.registry import standard_named

    try:
        chosen = standard_named(standard, Location("--standard"))
        headers = chosen.claim_headers
        if show is not None:
            _show_page(pdf, show, column_map, headers, _decimal_of(chosen), decimal_mark)
            return
        if output is None:
            raise InputError("give -o FILE for the claims, or --show PAGE to see a page", Location("-o"))
        _check_files({"PDF": pdf, "--map": column_map}, {"--output": output})
        result = _extract(pdf, pages, column_map, headers, _decimal_of(chosen), decimal_mark)
        write_atomic(output, claims_yaml(result, pdf.name, chosen.symbols), "--output")
    except InputError as exc:
        _fail(exc)
    count = len(result.claims)
    typer.echo(f"wrote {output}: {count} claim{'' if count == 1 else 's'} from pages {_page_list(result.pages_parsed)}")


def _show_page(
    pdf: Path,
    page: int,
    column_map: Path | None,
    headers: dict[str, str],
    standard_decimal: str | None = None,
    decimal_mark: str | None = None,
) -> None:
    from audit.inputs.pdf.extract import read_column_map, show_page

    _check_files({"PDF": pdf, "--map": column_map}, {})
    cmap = read_column_map(column_map, headers) if column_map else None
    typer.echo(show_page(pdf, page, cmap, headers, decimal_mark, standard_decimal), nl=False)


def _page_list(pages: tuple[int, ...]) -> str:
    return ", ".join(str(p) for p in pages[:20]) + (" ..." if len(pages) > 20 else "")


@app.command()
def explain(
    model: Path = typer.Argument(..., help="The review model (YAML).", metavar="MODEL"),
    check_id: str = typer.Argument(
        ..., help="A check id as printed by 'review', or the calc's label for a bearing.", metavar="CHECK_ID"
    ),
    rules_dir: list[Path] | None = RulesDir,
    rule_pack: str | None = RulePack,
) -> None:
    """Print a check's full derivation: geometry, every factor and why, every combination.

    Given a bearing id or a calc label with several checks there, prints each of them."""
    from audit.core.natural import natural_sorted
    from audit.report.export import explain as explain_text
    from audit.review.review import review_model

    try:
        result = review_model(model, _dirs(rules_dir), rule_pack)
    except InputError as exc:
        _fail(exc)
    ids = [r.check.id for r in result.results]
    chosen = [check_id]
    if check_id not in ids:
        from audit.engine.model import normalise_label
        from audit.review.reconcile import label_index

        bearing = label_index(result).get(normalise_label(check_id))
        chosen = natural_sorted(i for i in ids if bearing is not None and i.split(":")[0] == bearing)
        if not chosen:
            close = [i for i in ids if check_id.split(":")[0] in i][:5]
            hint = f" (did you mean: {', '.join(close)})" if close else ""
            typer.echo(f"error: {model}: no check '{check_id}'{hint}", err=True)
            raise typer.Exit(2)
        if len(chosen) > 1:
            typer.echo(f"'{check_id}' is bearing {bearing}, which has {len(chosen)} checks: {', '.join(chosen)}\n")
    typer.echo("\n\n".join(explain_text(result, i) for i in chosen))


@app.command()
def rules(
    rules_dir: list[Path] | None = RulesDir,
    sheet: str | None = typer.Option(
        None, "--sheet", metavar="PACK", help="Write every value of pack PACK to a workbook (-o) a firm fills in."
    ),
    adopt: Path | None = typer.Option(
        None, "--adopt", metavar="FILE", help="Read a filled --sheet workbook and write the firm pack (-o, YAML)."
    ),
    output: Path | None = typer.Option(None, "-o", "--output", metavar="FILE", help="Where --sheet or --adopt writes."),
) -> None:
    """List the rule packs and every value with its provenance; --sheet and --adopt verify a pack."""
    from audit.report.pack_listing import pack_lines
    from audit.standards.catalogue import load_all_packs

    if sheet is not None or adopt is not None or output is not None:
        _verify_pack(sheet, adopt, output, _dirs(rules_dir))
        return
    try:
        resistance, combos = load_all_packs(_dirs(rules_dir))
    except InputError as exc:
        _fail(exc)
    for line in pack_lines(resistance, combos):
        typer.echo(line)


def _verify_pack(sheet: str | None, adopt: Path | None, output: Path | None, dirs: tuple[Path, ...]) -> None:
    """`rules --sheet PACK -o FILE.xlsx` or `rules --adopt FILE.xlsx -o FILE.yaml`."""
    from audit.report.pack_sheet import adopt_pack, write_sheet

    try:
        if (sheet is None) == (adopt is None) or output is None:
            raise InputError("give --sheet PACK -o FILE.xlsx, or --adopt FILE.xlsx -o FILE.yaml")
        lines = write_sheet(sheet, output, dirs) if sheet is not None else adopt_pack(adopt, output, dirs)  # type: ignore[arg-type]
    except InputError as exc:
        _fail(exc)
    typer.echo("\n".join(lines))


# `bearing-audit ifc` and `schema` live in audit/cli_files.py: this file is at the modules' size limit
app.command()(ifc)
app.command()(schema)


def run(argv: list[str] | None = None) -> int:
    """Run the command line and return its exit status; never lets a traceback out."""
    # A review builds millions of small records that form no reference cycles and live until
    # the run ends; the cycle collector would walk them again and again (a third of the run
    # time on a large building) and free nothing. Paused for the run only.
    enabled = gc.isenabled()
    gc.disable()
    try:
        return _run(argv)
    finally:
        if enabled:
            gc.enable()


def _run(argv: list[str] | None) -> int:
    from audit.core.outfiles import Interrupted

    try:
        code = app(args=argv, standalone_mode=False)
    except KeyboardInterrupt:
        typer.echo("error: interrupted; no output was written or replaced", err=True)
        return 130  # 128 + SIGINT, as a shell reports it
    except Interrupted as stop:
        typer.echo("error: interrupted; no output was written or replaced", err=True)
        return 128 + stop.signum  # 143 for SIGTERM, 129 for SIGHUP
    except typer.Exit as stop:
        return stop.exit_code
    except SystemExit as stop:
        return stop.code if isinstance(stop.code, int) else 2
    except Exception as exc:
        if type(exc).__name__ == "Abort":  # click's word for Ctrl-C
            typer.echo("error: interrupted; no output was written or replaced", err=True)
            return 130
        exit_code = getattr(exc, "exit_code", None)
        show = getattr(exc, "show", None)
        if callable(show) and isinstance(exit_code, int):
            show()  # a usage error of the command line itself (typer's own click)
            return exit_code
        return _unexpected(exc)
    return code if isinstance(code, int) else 0


def _unexpected(exc: Exception) -> int:
    """One line for an exception that escaped a command; exit status 2."""
    if isinstance(exc, InputError):  # an input error raised outside a command's own handling
        lines = [f"error: {line}" for line in (exc.lines() if isinstance(exc, InputErrors) else [exc.one_line()])]
    elif isinstance(exc, RecursionError):
        lines = ["error: input is nested too deeply to read"]
    elif isinstance(exc, MemoryError):
        lines = ["error: input is too large to read in the memory available"]
    else:  # a defect of ours: say so in one line rather than a traceback
        lines = [
            f"error: internal error ({type(exc).__name__}: {str(exc)[:200]}); nothing was written. "
            "Please report it with the input that caused it."
        ]
    for line in lines:
        typer.echo(line, err=True)
    return 2


def main() -> None:
    sys.exit(run())


if __name__ == "__main__":
    main()
