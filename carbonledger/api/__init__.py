"""The library API: what the command line calls, and what a notebook user calls directly.

Each function takes file paths, one ``Assessment`` (the options of the run: factor set, GWP set,
schemes, overrides, boundary, year, matching; None for the defaults) and the options of its own
analysis, loads and validates them at the edge, and calls the core and the analyses; none of them prints. ``score``
returns a ``ScoreResult``; ``compare``
a ``ComparisonResult``; ``audit_workbook`` an openpyxl workbook and the engine's result.

One module per command family, so that a command imports only what it uses (``carbonledger
score`` loads ``api.scoring`` and none of the analyses):

- ``api.scoring``: score, and the shared edges (assessment_or_default, factor_set_of, boundary_overrides);
- ``api.workbooks``: audit_workbook, score_workbook, cover_assessment, load_any_project;
- ``api.comparison``: compare;
- ``api.portfolios``: recalc (recalc_and_record), lifetime;
- ``api.operating_plan``: plan, matching_chart;
- ``api.monte_carlo``: uncertainty, uncertainty_many, headroom, sensitivity, load_uncertainty, ledger records of
analyses;
- ``api.levers``: qualify;
- ``api.reports``: report, report_items;
- ``api.evidence_pack``: pack, verify_pack.

Every public name is available here (``from carbonledger.api import score``, ``api.compare``):
this package imports the module that holds a name the first time the name is asked for.
"""

from __future__ import annotations

import importlib

# public name -> the module of this package (or of the library) that holds it
WHERE = {
    "score": ".scoring",
    "stating_rebalance": ".scoring",
    "user_rulebooks": ".scoring",
    "using_rulebooks": "carbonledger.model.rulebooks",
    "AuditWorkbook": ".workbooks",
    "PACK_RULEBOOK_FOLDER": ".evidence_pack",
    "factor_set_of": ".scoring",
    "boundary_overrides": "carbonledger.model.project",
    "score_workbook": ".workbooks",
    "cover_assessment": ".workbooks",
    "audit_workbook": ".workbooks",
    "load_any_project": ".workbooks",
    "compare": ".comparison",
    "recalc": ".portfolios",
    "recalc_and_record": ".portfolios",
    "lifetime": ".portfolios",
    "plan": ".operating_plan",
    "matching_chart": ".operating_plan",
    "load_uncertainty": ".monte_carlo",
    "uncertainty": ".monte_carlo",
    "uncertainty_one": ".monte_carlo",
    "uncertainty_many": ".monte_carlo",
    "headroom": ".monte_carlo",
    "headroom_record": ".monte_carlo",
    "sensitivity": ".monte_carlo",
    "analysis_record": ".monte_carlo",
    "qualify": ".levers",
    "report": ".reports",
    "report_items": ".reports",
    "report_date": ".reports",
    "pack": ".evidence_pack",
    "verify_pack": ".evidence_pack",
    "files_read_by": ".evidence_pack",
    "packed_figures": ".evidence_pack",
    "PACK_PROJECT_FOLDER": ".evidence_pack",
    "load_project": "carbonledger.routes.project",
    "load_factor_set": "carbonledger.model.factors",
    "project_series": "carbonledger.analyses.electricity_series",
    "assess": "carbonledger.analyses.pipeline",
    "assessment_or_default": ".scoring",
    "Assessment": "carbonledger.core.assessment",
    "DEFAULT_SEED": "carbonledger.analyses.uncertainty",
    "DEFAULT_DRAWS": "carbonledger.analyses.uncertainty",
}

__all__ = [
    "Assessment",
    "assess",
    "score",
    "score_workbook",
    "compare",
    "audit_workbook",
    "recalc",
    "lifetime",
    "plan",
    "report",
    "report_items",
    "load_project",
    "load_factor_set",
    "load_any_project",
    "uncertainty",
    "load_uncertainty",
    "headroom",
    "qualify",
    "sensitivity",
    "uncertainty_many",
    "pack",
    "verify_pack",
    "user_rulebooks",
    "using_rulebooks",
]


def __getattr__(name: str):
    """A public name, from the module that holds it (imported now, once)."""
    if name not in WHERE:
        raise AttributeError(f"module {__name__!r} has no attribute {name!r}")
    value = getattr(importlib.import_module(WHERE[name], __name__), name)
    globals()[name] = value
    return value


def __dir__() -> list[str]:
    return sorted({*globals(), *WHERE})
