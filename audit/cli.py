"""The command line (typer). Input errors print one line each and exit 2; no traceback."""

from __future__ import annotations

import gc
import sys
from pathlib import Path
from typing import NoReturn

import typer

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


@app.command()
def review(
    model: Path = typer.Argument(..., help="The review model (YAML).", metavar="MODEL"),
    claims: Path | None = typer.Option(
        None, "--claims", help="What the calc claims (YAML), to reconcile.", metavar="FILE"
    ),
    calc_pdf: Path | None = typer.Option(
        None, "--calc-pdf", help="Extract the claims from the calc's PDF.", metavar="FILE"
    ),
    pages: str | None = typer.Option(
        None, "--pages", help="With --calc-pdf: pages to read, e.g. 12-30,35.", metavar="PAGES"
    ),
    column_map: Path | None = typer.Option(None, "--map", help="With --calc-pdf: a column map (YAML).", metavar="FILE"),
    memo: Path | None = typer.Option(
        None,
        "--memo",
        metavar="FILE",
        help="Write the review letter as HTML: summary, comments, assumptions, cautions.",
    ),
    appendix: Path | None = typer.Option(
        None,
        "--appendix",
        help="Write the letter's appendix as HTML: every check and claim, plans, elevations, derivations.",
        metavar="FILE",
    ),
    all_derivations: bool = typer.Option(
        False, "--all-derivations", help="In the appendix, derive confirmed and covered checks too."
    ),
    json_out: Path | None = typer.Option(None, "--json", help="Write every check and finding as JSON.", metavar="FILE"),
    csv_out: Path | None = typer.Option(
        None, "--csv", help="Write the comment log as CSV (one row per place, a reply column).", metavar="FILE"
    ),
    xlsx_out: Path | None = typer.Option(
        None, "--xlsx", help="Write the comment log as a workbook, with a sheet of every check.", metavar="FILE"
    ),
    date: str | None = typer.Option(
        None, "--date", help="Memo date (YYYY-MM-DD); default project.date.", metavar="YYYY-MM-DD"
    ),
    previous: Path | None = typer.Option(
        None, "--previous", metavar="LAST.json", help="The JSON of the last review round, to match comments with."
    ),
    responses: Path | None = typer.Option(
        None,
        "--responses",
        metavar="LOG",
        help="With --previous: the last round's comment log (CSV or workbook) with the designer's responses "
        "(and the reviewer's dispositions, where its disposition column is filled in).",
    ),
    dispositions: Path | None = typer.Option(
        None,
        "--dispositions",
        metavar="FILE",
        help="With --previous: the reviewer's dispositions of the designer's responses (YAML).",
    ),
    all_rows: bool = typer.Option(
        False,
        "--all-rows",
        help=f"List every check in the terminal (past {TERMINAL_ROWS} checks only the failing ones are listed).",
    ),
    rules_dir: list[Path] | None = RulesDir,
    rule_pack: str | None = RulePack,
) -> None:
    """Recompute every required bearing check; with --claims, reconcile the calc's claims."""
    import datetime as dt

    from audit.core.outfiles import Output, output_limit, write_outputs
    from audit.inputs.read_claims import merge_claim_sources, read_claims
    from audit.report.comment_log import comments_csv, comments_xlsx
    from audit.report.export import summary_line
    from audit.report.memo import MemoOptions, appendix_chunks, findings_json_chunks, memo_chunks
    from audit.review.comments import build_comments
    from audit.review.reconcile import failing_without_claims, reconcile
    from audit.review.review import review_model
    from audit.review.round_files import responses_left_out
    from audit.review.rounds import (
        ASKING,
        check_dispositions,
        first_round,
        input_hashes,
        next_round,
        read_dispositions,
        read_last_round,
        read_log,
    )

    for option, given in (("--responses", responses), ("--dispositions", dispositions)):
        if given and not previous:
            typer.echo(f"error: {option}: give the last round's JSON with --previous too", err=True)
            raise typer.Exit(2)
    try:
        memo_date = dt.date.fromisoformat(date) if date else None
    except ValueError:
        typer.echo(f"error: --date: expected YYYY-MM-DD, got {date!r}", err=True)
        raise typer.Exit(2) from None
    try:
        input_bytes = _check_files(
            {
                "MODEL": model,
                "--claims": claims,
                "--calc-pdf": calc_pdf,
                "--map": column_map,
                "--previous": previous,
                "--responses": responses,
                "--dispositions": dispositions,
            },
            {"--memo": memo, "--appendix": appendix, "--json": json_out, "--csv": csv_out, "--xlsx": xlsx_out},
            _dirs(rules_dir),
        )
        result = review_model(model, _dirs(rules_dir), rule_pack)
        claim_list = read_claims(claims) if claims else ()
        if calc_pdf:
            extracted = _extract(
                calc_pdf, pages, column_map, result.standard.claim_headers, _decimal_of(result.standard)
            )
            claim_list = merge_claim_sources(claim_list, extracted.claims, calc_pdf.name)
    except InputError as exc:
        _fail(exc)
    from audit.core.errors import visible

    for warning in result.model.warnings:
        typer.echo(f"warning: {visible(warning)}", err=True)
    input_bytes = max(input_bytes, expanded_bytes(result.model))
    rec = reconcile(result, claim_list) if (claims or calc_pdf) else None
    findings = rec.findings if rec else result.engine_findings + failing_without_claims(result)
    comments = build_comments(result, rec, claim_list)
    inputs = input_hashes({"model": model, "claims": claims, "calc_pdf": calc_pdf, "map": column_map})
    title = result.model.project.title
    try:
        if previous:
            last = read_last_round(previous, title)
            answers = read_log(responses) if responses else None
            disposed = dict(answers.dispositions) if answers else {}
            if dispositions:
                for number, d in read_dispositions(dispositions).items():
                    if number in disposed and disposed[number] != d:
                        raise InputError(f"comment {number} has another disposition at {disposed[number].loc}", d.loc)
                    disposed[number] = d
            check_dispositions(disposed, last)
            if answers:
                asked = {e.number for e in last.comments if e.status in ASKING}
                known = {e.number for e in last.comments}
                for warning in responses_left_out(answers.responses, asked, known, str(responses)):
                    typer.echo(f"warning: {warning}", err=True)
            comments, round_ = next_round(
                comments, last, result.model, inputs, answers.responses if answers else {}, disposed
            )
        else:
            round_ = first_round(comments, title, inputs)
    except InputError as exc:
        _fail(exc)
    typer.echo(_terminal_checks(result, all_rows))
    for comment in comments:
        if not comment.quiet:
            typer.echo(f"{comment.number:>3}. [{comment.weight}] {comment.kind}: {comment.title}")
    typer.echo(summary_line(result))
    if rec is not None:
        counts = rec.counts()
        typer.echo("findings: " + ", ".join(f"{n} {k}" for k, n in counts.items()))
    outputs = []
    memo_options = MemoOptions(
        date=memo_date,
        all_derivations=all_derivations,
        comments=comments,
        round=round_,
        appendix=appendix.name if appendix else None,  # the letter names its appendix by the file's name
        workbook=xlsx_out.name if xlsx_out else None,
        json=json_out.name if json_out else None,
    )
    if memo:
        outputs.append(Output("--memo", memo, lambda: memo_chunks(result, rec, claim_list, memo_options)))
    if appendix:
        outputs.append(Output("--appendix", appendix, lambda: appendix_chunks(result, rec, claim_list, memo_options)))
    if json_out:
        outputs.append(
            Output("--json", json_out, lambda: findings_json_chunks(result, rec, findings, comments, round_))
        )
    if csv_out:
        outputs.append(Output("--csv", csv_out, lambda: comments_csv(comments, round_)))
    if xlsx_out:
        outputs.append(Output("--xlsx", xlsx_out, lambda: [comments_xlsx(result, rec, comments, round_)]))
    try:
        write_outputs(outputs, output_limit(input_bytes))
    except InputError as exc:
        _fail(exc)
    for out in outputs:
        typer.echo(f"wrote {out.path}")
    serious = any(f.severity in ("safety", "revise") for f in findings)
    failing = any(not r.passes for r in result.results)
    raise typer.Exit(1 if serious or failing else 0)


# A layout is short for the model it expands to (about 65 times smaller): outputs are bounded by
# the expanded model as if it had been typed, each member, bearing and load entry counted at a
# little less than the explicit model writes one (the layout demo: 545 entries in 96 KB, 176 each).
BYTES_PER_ENTRY = 160


def expanded_bytes(model) -> int:
    """A lower estimate of the size of the explicit model a layout expands to (0 for a typed model)."""
    if model.frame is None:
        return 0
    return BYTES_PER_ENTRY * (len(model.members) + len(model.bearings) + len(model.loads))


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
    """Inputs must be readable regular files; outputs may destroy nothing. Before any reading.

    With ``rules_dirs`` (a command that reads rule packs), every pack file, the reviewer's and the
    bundled ones, is an input too: an output onto a pack would replace it. Returns the inputs'
    total size (packs left out), which bounds the outputs."""
    from audit.core.outfiles import check_outputs, require_input_file

    given_inputs = [(option, path) for option, path in inputs.items() if path is not None]
    total = sum(require_input_file(path, option).st_size for option, path in given_inputs)
    packs: list[tuple[str, Path]] = []
    if rules_dirs is not None:
        from audit.standards.packs import pack_files

        packs = [("rule pack", path) for path in pack_files(rules_dirs)]
    check_outputs([(o, p) for o, p in outputs.items() if p is not None], given_inputs + packs)
    return total


def _decimal_of(standard: object) -> str:
    """How a standard's calc sheets mark decimals (its ``decimal_mark``; points where it declares none)."""
    return str(getattr(standard, "decimal_mark", "point"))


def _extract(
    pdf: Path,
    pages: str | None,
    column_map: Path | None,
    headers: dict[str, str] | None = None,
    standard_decimal: str | None = None,
    decimal_mark: str | None = None,
):
    """Run the extraction with a progress bar on long documents; warnings go to stderr."""
    from audit.inputs.pdf.extract import extract, read_column_map

    cmap = read_column_map(column_map, headers) if column_map else None
    bar = None
    if sys.stderr.isatty():
        from rich.progress import Progress  # rich comes with typer

        bar = Progress(transient=True)
        bar.start()
        task = bar.add_task("reading pages", total=None)

        def advance(n: int) -> None:
            bar.update(task, advance=n)

    try:
        result = extract(
            pdf,
            pages,
            cmap,
            progress=advance if bar else None,
            standard_headers=headers,
            decimal_mark=decimal_mark,
            standard_decimal=standard_decimal,
        )
    finally:
        if bar:
            bar.stop()
    for warning in result.warnings:
        typer.echo(f"warning: {warning}", err=True)
    if result.no_text_pages:
        listed = ", ".join(str(p) for p in result.no_text_pages[:30])
        more = " ..." if len(result.no_text_pages) > 30 else ""
        typer.echo(f"warning: {pdf}: pages {listed}{more} have no text layer: they need OCR first", err=True)
    for item in result.unread:
        typer.echo(f"warning: {pdf}: {item.line()}", err=True)
    typer.echo(f"{pdf}: {result.coverage()}", err=True)
    if not result.claims:
        where = f"pages {pages}" if pages else f"{result.pages_scanned} pages"
        if result.candidate_pages:
            listed = ", ".join(str(p) for p in result.candidate_pages[:20])
            raise InputError(
                f"bearing-check symbols on pages {listed}, but no check could be read there: look at those pages "
                "and give a --map naming their column headers (see the README, Claims from the calc's PDF)",
                Location(str(pdf), 1, 1, "(document)"),
            )
        raise InputError(
            f"no bearing checks found in {where} (no table headed Qf/Qr and no line such as 'Qr = 45.2 kN >= "
            "Qf = 31.0 kN'); give a --map for unusual headers",
            Location(str(pdf), 1, 1, "(document)"),
        )
    return result


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
    from audit.inputs.expand_layout import explicit_model_with_warnings

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
        write_atomic(output, claims_yaml(result, pdf.name), "--output")
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
def rules(rules_dir: list[Path] | None = RulesDir) -> None:
    """List the rule packs and every value with its provenance."""
    from audit.standards.packs import load_all_packs
    from audit.standards.registry import standard_named

    try:
        resistance, combos = load_all_packs(_dirs(rules_dir))
    except InputError as exc:
        _fail(exc)
    for pack in resistance.values():
        typer.echo(f"resistance pack {pack.id}: {pack.title}\n  edition: {pack.edition}\n  file: {pack.path}")
        typer.echo(f"  provenance: {pack.provenance}")
        kinds = standard_named(pack.standard).check_kinds.values()
        typer.echo(f"  standard: {pack.standard}; checks: {'; '.join(kinds)}")
        for name, value in pack.all_sourced():
            typer.echo(f"  {name} = {_shown(name, value.value)}  [{value.clause}; {value.source}; {value.status}]")
            if name in pack.choices:
                for reading, text in pack.choices[name].readings.items():
                    mark = "default" if reading == value.value else "choose with project.readings"
                    typer.echo(f"      {reading} ({mark}): {text}")
    for cpack in combos.values():
        typer.echo(f"combinations pack {cpack.id}: {cpack.title}\n  edition: {cpack.edition}\n  file: {cpack.path}")
        typer.echo(f"  provenance: {cpack.provenance}")
        for c in cpack.combinations:
            typer.echo(f"  {c.name} ({c.duration} term)  [{c.source.clause}; {c.source.source}; {c.source.status}]")
        extras = [("counteracting_dead", cpack.counteracting_dead), ("storage_live.companion", cpack.storage_companion)]
        extras += [(f"patterns.{case}", value) for case, value in cpack.patterns.items()]
        for name, value in extras:
            shown = " or ".join(f"{v:g}" for v in value.value) if isinstance(value.value, tuple) else f"{value.value:g}"
            typer.echo(f"  {name} = {shown}  [{value.clause}; {value.source}; {value.status}]")
    from audit.standards import plausible
    from audit.standards.packs import builtin_rules_dir

    bounds = plausible.ranges()
    typer.echo(f"plausible ranges (a value outside is refused)\n  file: {builtin_rules_dir() / plausible.FILE}")
    named = [(f"fcp of {fam}", r) for fam, r in bounds.fcp.items()] + [(f"fc of {f}", r) for f, r in bounds.fc.items()]
    named += [("load factor", bounds.load_factor), ("section dimension", bounds.section)]
    for name, r in named:
        typer.echo(f"  {name}: {r.shown()}  [{r.source}]")


def _shown(name: str, value: object) -> str:
    """A pack value in the unit its listing names: lengths in mm, strengths in MPa, 4 figures."""
    if hasattr(value, "points"):
        in_mm = name.startswith("kb.")  # KB is tabulated by bearing length; KZcp by a plain ratio
        return ", ".join(f"{x * 1000:g} mm -> {y:.4g}" if in_mm else f"{x:.4g} -> {y:.4g}" for x, y in value.points)
    if isinstance(value, dict) and name.startswith("fc"):
        return ", ".join(f"{key} {_shown(name, item)}" for key, item in value.items())
    if isinstance(value, float):
        if name.startswith("fc"):
            return f"{value / 1e6:g} MPa"
        if name.startswith("kb.m"):
            return f"{value * 1000:g} mm"
        return f"{value:.4g}"
    return str(value)


@app.command()
def schema(which: str = typer.Argument("model", help="Which input file: model or claims.", metavar="WHICH")) -> None:
    """Print the JSON Schema of an input file, for editors that validate and complete YAML."""
    import json

    from audit.inputs.schema import SCHEMAS

    if which not in SCHEMAS:
        typer.echo(f"error: no schema '{which}' (known: {', '.join(SCHEMAS)})", err=True)
        raise typer.Exit(2)
    typer.echo(json.dumps(SCHEMAS[which], indent=2))


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
