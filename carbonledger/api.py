"""Library API: score a project file (or a validated project) against a factor set.

``score`` is what the command line calls; notebook users call it directly. Per-project work is
a pure function of (project, factor set, options) so that portfolios can be mapped over workers.
"""

from __future__ import annotations

import functools
from dataclasses import dataclass
from pathlib import Path

import numpy as np

from . import CAUTION, __version__
from .engine import build_matrices, solve
from .errors import InputError
from .factors import DEFAULT_SET, FactorSet, load_factor_set
from .inventory import FLOWS, NON_GHG_FLOWS, STAGES, NumericInputs, build_inventory, check_physical_limits
from .project import BOUNDARIES, Project, load_project
from .reference import ReferenceValue
from .results import Check, ExchangeRow, FactorSetRef, FactorUsed, Intensity, ScoreResult
from .schemes import Scheme, load_schemes, select_schemes
from .stages.ammonia import hydrogen_mass_fraction_of_ammonia

DEFAULT_GWP = "ar6"
FUNCTIONAL_UNITS = {"ammonia": ("1 t NH3 at the plant gate", "kg CO2e/t NH3"), "hydrogen": ("1 kg H2 at the plant gate", "kg CO2e/kg H2")}


@functools.cache
def _schemes() -> dict[str, Scheme]:
    return load_schemes()


def gwp_sets(factor_set: FactorSet) -> list[str]:
    return sorted({key.split(".")[1] for key in factor_set.ids_with_prefix("gwp.") if key.endswith(".co2")})


def characterisation(inputs: NumericInputs, gwp: str) -> np.ndarray:
    """GWP100 factor per flow, in the order of ``FLOWS``; pre-characterised CO2e counts 1."""
    known = gwp_sets(inputs.factor_set)
    if gwp not in known:
        raise InputError("--gwp", gwp, f"one of {', '.join(known)}")
    values = []
    for flow in FLOWS:
        if flow == "co2e_precharacterised":
            values.append(1.0)
        elif flow in NON_GHG_FLOWS:
            values.append(0.0)
        else:
            gas = flow.split("_")[0]
            factor_id = f"gwp.{gwp}.{gas}" if gas == "co2" else f"gwp.{gwp}.{flow}"
            values.append(inputs.factor(factor_id, f"kg CO2e/kg {gas.upper()}"))
    return np.array(values)


def intensities(total_per_unit: float, product: str, hydrogen_lhv: float, ammonia_lhv: float, hydrogen_fraction: float) -> dict[str, float | None]:
    """The same result per t NH3, per kg NH3, per kg H2 (contained, for ammonia) and per MJ (LHV)."""
    if product == "hydrogen":
        return {
            "kg_co2e_per_t_nh3": None,
            "kg_co2e_per_kg_nh3": None,
            "kg_co2e_per_kg_h2": total_per_unit,
            "g_co2e_per_mj": total_per_unit * 1000.0 / hydrogen_lhv,
        }
    return {
        "kg_co2e_per_t_nh3": total_per_unit,
        "kg_co2e_per_kg_nh3": total_per_unit / 1000.0,
        "kg_co2e_per_kg_h2": total_per_unit / 1000.0 / hydrogen_fraction,
        "g_co2e_per_mj": total_per_unit / ammonia_lhv,
    }


def _factor_rows(used: dict) -> list[FactorUsed]:
    rows = []
    for key in sorted(used):
        item = used[key]
        if isinstance(item, ReferenceValue):
            rows.append(FactorUsed(id=item.id, value=item.value, unit=item.unit, source=item.source))
        else:
            rows.append(FactorUsed(**{k: getattr(item, k) for k in FactorUsed.model_fields}))
    return rows


@dataclass
class Prepared:
    """A project made ready to solve: its inventory, matrices, characterisations and schemes.

    Everything here depends on (project, factor set, options) only, so a portfolio run can
    prepare many projects and solve those that share a matrix structure together.
    """

    project: Project
    factor_set: FactorSet
    params: dict
    inputs: NumericInputs
    inventory: object
    chosen: list[Scheme]
    gwp: str
    headline: np.ndarray
    per_gwp: dict[str, np.ndarray]
    matrices: object
    demands: list[str]
    hydrogen_lhv: float
    ammonia_lhv: float
    fraction: float


def prepare(
    project: Project,
    factor_set: FactorSet,
    *,
    gwp: str = DEFAULT_GWP,
    schemes: list[str] | None = None,
    source: str = "project",
    boundary: str | None = None,
) -> Prepared:
    """Validated project + factor set -> inventory, matrices and characterisation vectors.

    ``boundary`` (cradle-to-gate, well-to-tank, well-to-wake) overrides the project's own.
    """
    params = project.model_dump()
    if boundary is not None:
        if boundary not in BOUNDARIES:
            raise InputError("--boundary", boundary, f"one of {', '.join(BOUNDARIES)}")
        params["project"]["boundary"] = boundary
    inputs = NumericInputs(factor_set, source)
    check_physical_limits(params, inputs, source)
    inventory = build_inventory(params, inputs)
    product = inventory.product
    chosen = select_schemes(_schemes(), schemes, product)
    headline = characterisation(inputs, gwp)
    per_gwp = {gwp: headline}
    for scheme in chosen:
        if scheme.gwp not in per_gwp:
            per_gwp[scheme.gwp] = characterisation(inputs, scheme.gwp)
    matrices = build_matrices(inventory)
    demands = list(dict.fromkeys([inventory.reference, inventory.gate, inventory.hydrogen]))
    hydrogen_lhv = inputs.factor("heating_value.hydrogen.lhv", "MJ/kg")
    ammonia_lhv = inputs.factor("heating_value.ammonia.lhv", "MJ/kg") if product == "ammonia" else float("nan")
    fraction = hydrogen_mass_fraction_of_ammonia(inputs.molar_mass("H2"), inputs.molar_mass("NH3")) if product == "ammonia" else 1.0
    return Prepared(project, factor_set, params, inputs, inventory, chosen, gwp, headline, per_gwp, matrices, demands, hydrogen_lhv, ammonia_lhv, fraction)


def scheme_checks(prepared: Prepared, solutions: dict) -> list[Check]:
    """Each chosen scheme's value and verdict under its own rulebook, from solved inventories."""
    inventory = prepared.inventory
    keys = prepared.matrices.activity_keys
    stage_of = {key: inventory.activities[key].stage for key in keys}
    checks = []
    for scheme in prepared.chosen:
        zero_rated = np.array(
            [
                (scheme.electricity == "renewable_at_zero" and inventory.electricity_kinds.get(key) == "renewable")
                or stage_of[key] in scheme.excluded_stages
                for key in keys
            ]
        )
        basis_demand = inventory.gate if scheme.basis == "product" else inventory.hydrogen
        basis_product = inventory.product if scheme.basis == "product" else "hydrogen"
        scheme_total = float(solutions[basis_demand].contributions(prepared.per_gwp[scheme.gwp], zero_rated).sum())
        value = intensities(scheme_total, basis_product, prepared.hydrogen_lhv, prepared.ammonia_lhv, prepared.fraction)[scheme.quantity]
        verdict = scheme.evaluate(value)
        checks.append(
            Check(
                scheme=scheme.id,
                name=scheme.name,
                quantity=scheme.quantity,
                basis=scheme.basis,
                boundary=scheme.boundary,
                gwp_basis=scheme.gwp,
                electricity_rule=scheme.electricity,
                unit=scheme.unit,
                value=value,
                from_memory=scheme.from_memory or any(t.from_memory for t in scheme.thresholds),
                note=scheme.note,
                **verdict,
            )
        )
    return checks


def score_project(
    project: Project,
    factor_set: FactorSet,
    *,
    gwp: str = DEFAULT_GWP,
    schemes: list[str] | None = None,
    source: str = "project",
    project_sha256: str = "",
    boundary: str | None = None,
) -> ScoreResult:
    """Score a validated project with a loaded factor set (the reusable core of ``score``).

    ``boundary`` (cradle-to-gate, well-to-tank, well-to-wake) overrides the project's own.
    """
    prepared = prepare(project, factor_set, gwp=gwp, schemes=schemes, source=source, boundary=boundary)
    params, inputs, inventory, matrices = prepared.params, prepared.inputs, prepared.inventory, prepared.matrices
    product, headline = inventory.product, prepared.headline
    solutions, bw_score = solve(matrices, prepared.demands, headline)
    main = solutions[inventory.reference]
    contributions = main.contributions(headline)
    total = float(contributions.sum())
    if not np.isclose(total, bw_score, rtol=1e-9, atol=1e-12):
        raise RuntimeError(f"characterisation disagrees with bw2calc: {total} vs {bw_score}")

    keys = matrices.activity_keys
    stage_of = {key: inventory.activities[key].stage for key in keys}
    by_activity = {key: float(v) for key, v in zip(keys, contributions.sum(axis=0))}
    by_stage = {stage: 0.0 for stage in STAGES if any(s == stage for s in stage_of.values())}
    for key, value in by_activity.items():
        by_stage[stage_of[key]] += value
    by_gas = {flow: float(v) for flow, v in zip(matrices.flow_keys, contributions.sum(axis=1)) if flow not in NON_GHG_FLOWS}
    non_ghg = {flow: float(v) for flow, v in zip(matrices.flow_keys, main.inventory.sum(axis=1)) if flow in NON_GHG_FLOWS}

    hydrogen_lhv, ammonia_lhv, fraction = prepared.hydrogen_lhv, prepared.ammonia_lhv, prepared.fraction
    hydrogen_gate = float(solutions[inventory.hydrogen].contributions(headline).sum())
    checks = scheme_checks(prepared, solutions)

    supply = dict(zip(keys, main.supply))
    exchanges = [
        ExchangeRow(
            activity=activity.key,
            stage=activity.stage,
            kind=exchange.kind,
            input=exchange.input,
            label=exchange.label,
            amount=float(exchange.amount),
            unit=exchange.unit,
            activity_supply=float(supply[activity.key]),
        )
        for activity in inventory.activities.values()
        for exchange in activity.exchanges
    ]
    reference_product = inventory.reference_product
    unit = FUNCTIONAL_UNITS[reference_product][1]
    heating = {"hydrogen_lhv": hydrogen_lhv}
    if product == "ammonia":
        heating["ammonia_lhv"] = ammonia_lhv
    all_intensities = intensities(total, reference_product, hydrogen_lhv, ammonia_lhv, fraction)
    return ScoreResult(
        carbonledger_version=__version__,
        caution=CAUTION,
        project=project.project.name,
        project_file=source,
        project_sha256=project_sha256,
        product=product,
        boundary=params["project"]["boundary"],
        functional_unit=inventory.functional_unit,
        reference_product=reference_product,
        unit=unit,
        gwp_basis=gwp,
        factor_set=FactorSetRef(name=factor_set.name, sha256=factor_set.sha256),
        total=total,
        intensity=Intensity(**{k: all_intensities[k] for k in Intensity.model_fields}),
        hydrogen_production_kg_co2e_per_kg_h2=hydrogen_gate,
        by_stage=by_stage,
        by_gas=by_gas,
        non_ghg_kg=non_ghg,
        by_activity=by_activity,
        heating_values_mj_per_kg=heating,
        factors_used=_factor_rows(inputs.used),
        checks=checks,
        exchanges=exchanges,
        parameters=params,
        delivery=_plain(inventory.delivery),
    )


def _plain(value):
    """Figures as JSON-ready floats and text."""
    if isinstance(value, dict):
        return {key: _plain(item) for key, item in value.items()}
    return value if isinstance(value, str) else float(value)


def score(
    project_file: str | Path,
    *,
    factors: str | Path | FactorSet = DEFAULT_SET,
    gwp: str = DEFAULT_GWP,
    schemes: list[str] | None = None,
    overrides: list[str] | None = None,
    boundary: str | None = None,
) -> ScoreResult:
    """Score a project file: carbon intensity, by stage and gas, with scheme checks.

    Parameters
    ----------
    project_file : path of the project TOML.
    factors : factor set name, set folder, override CSV, or a loaded FactorSet.
    gwp : GWP100 set of the headline result ('ar4', 'ar5', 'ar6'); each scheme check uses its own.
    schemes : scheme ids to check; default all that apply to the product.
    overrides : 'dotted.parameter=value' strings applied to the project before validation.
    boundary : 'cradle-to-gate', 'well-to-tank' or 'well-to-wake'; default the project's own.
    """
    project, sha = load_project(project_file, overrides)
    factor_set = factors if isinstance(factors, FactorSet) else load_factor_set(factors)
    return score_project(project, factor_set, gwp=gwp, schemes=schemes, source=str(project_file), project_sha256=sha, boundary=boundary)
