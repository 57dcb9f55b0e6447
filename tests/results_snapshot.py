"""The figures and verdicts of every demo at every boundary, as the snapshot test and its script record them."""

from __future__ import annotations

from pathlib import Path

from carbonledger.api import Assessment, load_factor_set, score

ROOT = Path(__file__).resolve().parent.parent
SNAPSHOT = ROOT / "tests" / "snapshots" / "demo_results.json"
BOUNDARIES = ("cradle-to-gate", "well-to-tank", "well-to-wake")


def demos() -> list[Path]:
    return sorted((ROOT / "demo_projects").glob("*.toml")) + sorted((ROOT / "demo_projects" / "portfolio").glob("*.toml"))


def demo_figures() -> dict:
    """{demo path (relative) | boundary: figures}; each project in its default assessment year."""
    out = {}
    factor_set = load_factor_set()
    for path in demos():
        for boundary in BOUNDARIES:
            r = score(path, Assessment(factor_set, boundary=boundary))
            out[f"{path.relative_to(ROOT).as_posix()}|{boundary}"] = {
                "assessment_year": r.assessment_year,
                "total": r.total,
                "by_stage": r.by_stage,
                "by_gas": r.by_gas,
                "intensity": r.intensity.model_dump(),
                "hydrogen_gate": r.hydrogen_production_kg_co2e_per_kg_h2,
                "checks": {c.scheme: {"status": c.status, "value": c.value, "tier": c.tier} for c in r.checks},
            }
    return out
