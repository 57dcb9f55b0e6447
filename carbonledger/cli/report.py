"""``carbonledger report``: the project report, one self-contained HTML file (and a PDF)."""

from __future__ import annotations

from pathlib import Path
from typing import Annotated, Optional

import typer

from .. import api
from ..about import CAUTION
from ..analyses.uncertainty import DEFAULT_DRAWS, DEFAULT_SEED, check_draws
from ..errors import InputError
from ..io.ledger import ledger_for_run, record_run
from ..io.report import PAPERS, print_pdf, render_report, write_report
from .options import (
    BoundaryOption,
    FactorsOption,
    ForceOption,
    GwpOption,
    LedgerOption,
    NoLedgerOption,
    RebalanceOption,
    RulebookOption,
    SchemeOption,
    SetOption,
    YearOption,
    assessment_of,
    check_output_path,
    fail,
    with_rebalance,
)


def report(
    projects: Annotated[list[Path], typer.Argument(help="Project TOML files, or folders of them.")],
    output: Annotated[Path, typer.Option("--output", "-o", help="The HTML file to write (REPORT.html).")],
    pdf: Annotated[
        Optional[Path], typer.Option("--pdf", help="Also print the report to this PDF file (headless Chromium).")
    ] = None,
    paper: Annotated[str, typer.Option("--paper", help="Page size of the PDF: a4 or letter.")] = "a4",
    scheme: SchemeOption = None,
    rulebook: RulebookOption = None,
    gwp: GwpOption = "ar6",
    factors: FactorsOption = "default-2026",
    set_: SetOption = None,
    rebalance: RebalanceOption = None,
    boundary: BoundaryOption = None,
    force: ForceOption = False,
    year: YearOption = None,
    draws: Annotated[
        int, typer.Option("--draws", help="Monte Carlo draws for a project with an [uncertainty] table.")
    ] = DEFAULT_DRAWS,
    seed: Annotated[
        int, typer.Option("--seed", help=f"Seed of the draws (default {DEFAULT_SEED}; printed in the report).")
    ] = DEFAULT_SEED,
    levers: Annotated[
        Optional[Path],
        typer.Option("--levers", help="Levers TOML file: add what it takes to qualify (docs/qualify.md)."),
    ] = None,
    ledger: LedgerOption = None,
    no_ledger: NoLedgerOption = False,
) -> None:
    """Write the project report: summary and verdicts, stages and gases, scheme limits, hourly matching, spread of the
    result, lifetime, inputs, factors and their sources."""
    set_ = with_rebalance(set_, rebalance)
    try:
        if output.suffix.lower() not in (".html", ".htm"):
            raise InputError(output, "--output", f"a file ending in .html, got '{output.suffix or 'no suffix'}'")
        check_draws(draws, seed)  # before any work, even when no project has an [uncertainty] table
        where = ledger_for_run(ledger, not no_ledger)
        if paper.lower() not in PAPERS:
            raise InputError("--paper", paper, "a4 or letter")
        for target in [output] + ([pdf] if pdf is not None else []):
            if target.exists() and not force:
                raise InputError(
                    target, "", "a path that does not exist yet (the file exists; pass --force to overwrite it)"
                )
            check_output_path(target, force, "--output" if target == output else "--pdf")
        if pdf is not None and pdf.suffix.lower() != ".pdf":
            raise InputError(pdf, "--pdf", f"a file ending in .pdf, got '{pdf.suffix or 'no suffix'}'")
        items = api.report_items(
            projects, assessment_of(factors, gwp, scheme, set_, boundary, year), draws=draws, seed=seed, levers=levers
        )
        generated = api.report_date()
        if pdf is not None:
            print_pdf(render_report(items, generated=generated, caution=CAUTION, paper=paper.lower()), pdf, force=force)
        write_report(render_report(items, generated=generated, caution=CAUTION), output, force=force)
        if where is not None:  # which figures went into which report: `history` lists the report run
            record_run("report", [item.result for item in items], ledger=where)
    except InputError as error:
        fail(error)
    typer.echo(f"wrote {output}" + (f" and {pdf}" if pdf is not None else ""), err=True)
