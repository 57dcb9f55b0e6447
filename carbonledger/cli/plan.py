"""The ``plan`` command: an operating plan that keeps a project qualifying, written as a time series CSV."""

from __future__ import annotations

import json
from pathlib import Path
from typing import Annotated, Optional

import typer

from .. import api
from ..about import CAUTION
from ..analyses.plan import PlanResult, parse_part_load, plan_csv
from ..errors import InputError
from ..io.csv_text import csv_text
from ..io.files import atomic_write
from ..io.ledger import ledger_for_run, record_run
from .options import (
    FactorsOption,
    ForceOption,
    FormatOption,
    GwpOption,
    LedgerOption,
    NoLedgerOption,
    OutputFormat,
    RebalanceOption,
    RulebookOption,
    SetOption,
    YearOption,
    assessment_of,
    check_output_path,
    fail,
    render,
    with_rebalance,
)


def summary(plan: PlanResult) -> dict:
    lost = plan.baseline_hydrogen_kg - float(plan.hydrogen_kg.sum())
    figures = {
        "scheme": plan.scheme,
        "tier": plan.tier,
        "limit": plan.limit,
        "unit": plan.unit,
        "matching": plan.granularity,
        "rated_kw": plan.rated_kw,
        "qualifies": plan.qualifies,
        "status": plan.status,
        "deciding_reason": plan.deciding_reason,
        "value": plan.value,
        "matched_share": plan.matched_share,
        "hydrogen_kg": float(plan.hydrogen_kg.sum()),
        "full_load_hours": plan.full_load_hours,
        "baseline_hydrogen_kg": plan.baseline_hydrogen_kg,
        "baseline_full_load_hours": plan.baseline_full_load_hours,
        "baseline_value": plan.baseline_value,
        "baseline_matched_share": plan.baseline_matched_share,
        "hydrogen_lost_kg": lost,
        "hydrogen_lost_share": lost / plan.baseline_hydrogen_kg if plan.baseline_hydrogen_kg else 0.0,
        "kwh_per_kg_h2": plan.kwh_per_kg_h2,
        "design_kwh_per_kg_h2": plan.design_kwh_per_kg_h2,
        "score_back_set": plan.score_back,
        "notes": plan.notes,
    }
    if plan.margin is not None:
        figures.update(margin=plan.margin, baseline_margin=plan.baseline_margin)
    return figures


def ledger_summary(figures: dict, output: Path) -> dict:
    """What the run ledger keeps of a plan: its figures and a one-line headline (``history`` shows it)."""
    headline = (
        f"operating plan for {figures['scheme']} ({figures['tier']}, matching {figures['matching']}): "
        f"{figures['hydrogen_kg'] / 1000:,.1f} t hydrogen"
        f" ({figures['hydrogen_lost_share']:.1%} less than at rated power), value {figures['value']:.4g} "
        f"{figures['unit']}, {figures['status'].replace('_', ' ')}; written to {output}"
    )
    return {"analysis": "plan", "headline": headline, "output": str(output), **figures}


def table(figures: dict, output: Path) -> str:
    at_tier = figures["qualifies"] or figures["status"] != "qualifies"
    tier_note = "" if at_tier else ", not at the tier asked"
    lines = [
        f"Operating plan for {figures['scheme']} ({figures['tier']}, limit {figures['limit']:g} {figures['unit']}), "
        f"matching {figures['matching']}, rated {figures['rated_kw']:,.0f} kW",
        f"                        hydrogen (t)   full-load hours   matched share   value ({figures['unit']})",
        f"  run at rated power    {figures['baseline_hydrogen_kg'] / 1000:12,.1f}   "
        f"{figures['baseline_full_load_hours']:15,.0f}   {figures['baseline_matched_share']:13.1%}   "
        f"{figures['baseline_value']:.3f}",
        f"  plan                  {figures['hydrogen_kg'] / 1000:12,.1f}   {figures['full_load_hours']:15,.0f}   "
        f"{figures['matched_share']:13.1%}   {figures['value']:.3f} "
        f"({figures['status'].replace('_', ' ')}{tier_note})",
        f"What qualifying costs: {figures['hydrogen_lost_kg'] / 1000:,.1f} t hydrogen "
        f"({figures['hydrogen_lost_share']:.1%} of running at rated power).",
    ]
    if "margin" in figures:
        lines.append(
            f"Margin: plan {figures['margin']:,.0f}, at rated power {figures['baseline_margin']:,.0f} (currency of the "
            "price column)."
        )
    if figures["score_back_set"]:
        lines.append(
            f"Electricity per kg H2 at the planned loads (part-load curve): {figures['kwh_per_kg_h2']:.3f} kWh/kg "
            f"(design {figures['design_kwh_per_kg_h2']:.3f}); the value above uses it."
        )
        lines.append(
            "Score the plan back at that efficiency with: "
            + " ".join(f"--set {item}" for item in figures["score_back_set"])
        )
    lines += [f"note: {note}" for note in figures["notes"]]
    lines.append(f"wrote {output}")
    lines.append(
        "Caution: a screening estimate, not a certification; the scheme's official methodology and verifier decide."
    )
    return "\n".join(lines)


def plan(
    project: Annotated[Path, typer.Argument(help="Project TOML file with [electricity] time_series.")],
    scheme: Annotated[str, typer.Option("--scheme", help="Scheme id to qualify for.")],
    output: Annotated[
        Path, typer.Option("--output", "-o", help="Where to write the plan (a time series CSV that `score` reads).")
    ],
    rulebook: RulebookOption = None,
    tier: Annotated[
        Optional[str],
        typer.Option("--tier", help="Tier to reach (part of its name, or its limit); default the loosest."),
    ] = None,
    rated_kw: Annotated[
        Optional[float],
        typer.Option("--rated-kw", help="Electrolyser rated power, kW; default the largest load in the series."),
    ] = None,
    min_load: Annotated[
        float,
        typer.Option("--min-load", help="Minimum stable load, fraction of rated power (the plant may also stop)."),
    ] = 0.0,
    part_load: Annotated[
        Optional[str],
        typer.Option(
            "--part-load",
            help="Part-load curve: FRACTION:KWH_PER_KG points (the project's electricity per kg H2 at that load), "
            "e.g. 0.2:58,0.5:52,1:54; the scheme value uses the kWh/kg the curve implies at the planned loads.",
        ),
    ] = None,
    hydrogen_price: Annotated[
        Optional[float],
        typer.Option(
            "--hydrogen-price",
            help="Hydrogen price per kg (currency of the price column): maximise margin instead of hydrogen.",
        ),
    ] = None,
    matching: Annotated[
        Optional[str],
        typer.Option(
            "--matching", help="rule (the scheme's dated rule, default), or interval, hour, month, quarter, year."
        ),
    ] = None,
    factors: FactorsOption = "default-2026",
    gwp: GwpOption = "ar6",
    set_: SetOption = None,
    rebalance: RebalanceOption = None,
    year: YearOption = None,
    force: ForceOption = False,
    output_format: FormatOption = OutputFormat.table,
    ledger: LedgerOption = None,
    no_ledger: NoLedgerOption = False,
) -> None:
    """Plan the electrolyser load interval by interval: most hydrogen (or margin) while the project qualifies."""
    set_ = with_rebalance(set_, rebalance)
    try:
        where = ledger_for_run(ledger, not no_ledger)
        check_output_path(output, force, "--output")
        assessment = assessment_of(factors, gwp, None, set_, year=year, matching=matching)
        result, series = api.plan(
            project,
            scheme=scheme,
            tier=tier,
            rated_kw=rated_kw,
            min_load=min_load,
            part_load=parse_part_load(part_load),
            hydrogen_price=hydrogen_price,
            assessment=assessment,
        )
        text = plan_csv(series, result)
        figures = summary(result)
        # everything is rendered before the plan file is written: a refusal never follows a write
        shown = _plan_text(output_format, figures, output)
        atomic_write(output, lambda tmp: tmp.write_text(text, encoding="utf-8"), force=force)
        if where is not None:
            record = api.analysis_record(
                "plan", project, ledger_summary(figures, output), assessment.but(schemes=(result.scheme,))
            )
            record_run("plan", [record], ledger=where)
    except InputError as error:
        fail(error)
    typer.echo(shown, nl=False)


def _plan_text(output_format: OutputFormat, figures: dict, output: Path) -> str:
    """The plan's figures in the chosen format (the plan itself goes to its CSV file)."""
    return render(
        output_format,
        table=lambda: table(figures, output),
        json=lambda: json.dumps({**figures, "caution": CAUTION}, indent=2, allow_nan=False),
        csv=lambda: csv_text(
            ("section", "key", "value", "unit"),
            [("plan", k, v, "") for k, v in figures.items() if k not in ("notes", "score_back_set")],
            caution=CAUTION,
        ),
    )
