"""Lifetime scoring: intensity year by year over a project's operating life.

Each operating year is the project with its own electrolyser electricity (stack ageing, reset
by stack replacement) and its own grid factor (a trajectory by calendar year, from a factor CSV
beside the project file or from rows ``PREFIX.YEAR`` of the factor set). All years share one
matrix structure, so they are solved together (``portfolio.score_portfolio``). The lifetime average
is weighted by each year's output; construction emissions are spread over the lifetime output
and added for the schemes whose rulebook counts them (``counts_construction``).

With an electricity time series (``[electricity] time_series``) every year's scheme checks are
matched against the series under the rule in force in that year (``portfolio.score_portfolio`` with each year's series,
as ``score`` matches them):

- a series of one calendar year is repeated: each operating year gets the same intervals at the
  same minute from the start of the year (local time; offsets as written), so the dated rules
  (EU monthly, then hourly from 2030) apply to the right years;
- a series of several calendar years is read year by year and must cover every operating year.

With a grid trajectory, a repeated series' grid intensity profile g_t is scaled to each year:
g_t(Y) = g_t F(Y) / F_0, with F(Y) the trajectory's factor of year Y and F_0 the trajectory's
factor of the series' own year (or, when the trajectory has no row for it, the grid source's
factor in the factor set). A series of one profile per year is used as written. Without a grid
intensity column the unmatched energy is charged at the year's grid factor (the trajectory).

References
----------
.. [1] ISO 14067:2018, 6.3 (capital goods).
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field, replace
from pathlib import Path

import numpy as np

from ..core.assessment import Assessment
from ..core.scoring import intensities, rulebooks
from ..errors import InputError
from ..model.factors import Factor, FactorSet, factor_row, read_factor_rows
from ..model.statuses import Status
from ..model.units import UnitMismatch, conversion_factor
from ..routes import routes_of
from ..routes.project import validate_project
from ..stages import lifetime as stage
from .electricity_series import ElectricitySeries, project_series
from .pipeline import PortfolioProject
from .portfolio import score_portfolio


@dataclass
class LifetimeYear:
    year: int
    stack_age_years: int
    efficiency_fraction: float
    output_t: float
    grid_factor: float | None
    grid_factor_unit: str
    total: float
    scheme_values: dict[str, float]
    passes: dict[
        str, bool
    ]  # the year qualifies under each scheme's rule (construction added where the rulebook counts it)
    factors_from_memory: list[str] = field(default_factory=list)  # ids of that year's factors recorded from memory
    grid_factor_id: str = ""  # the trajectory row used this year
    # its year: earlier than the operating year when held at the last published year
    grid_factor_year: int | None = None
    series_year: int | None = None  # calendar year of the time series intervals used (None: no series)
    grid_profile_scale: float | None = None  # F(Y) / F_0 applied to the series' grid intensity profile
    matched_share: dict[str, float] = field(default_factory=dict)  # per scheme, with a time series
    statuses: dict[str, str] = field(default_factory=dict)  # per scheme: qualifies, fails, not_eligible or undetermined


@dataclass
class LifetimeScheme:
    scheme: str
    unit: str
    limit: float
    counts_construction: bool
    average_without_construction: float
    average_with_construction: float
    lifetime_value: float  # the average the rulebook asks for
    passes: bool  # status == "qualifies"
    years_missed: list[int] = field(default_factory=list)  # years whose value misses the threshold
    from_memory: bool = False  # the rulebook or a threshold was recorded from memory
    status: str = ""  # qualifies, fails, not_eligible or undetermined (see year_status and lifetime_status)


def year_status(check_status: str, threshold_met: bool) -> str:
    """A year's verdict: the year's check (eligibility and every rule but the threshold) with the
    threshold read on the value the rulebook counts (construction added where it counts it).

    A check that fails while its value meets the threshold broke another rule; it stays failed."""
    if check_status == Status.NOT_ELIGIBLE:
        return Status.NOT_ELIGIBLE
    if not threshold_met or check_status == Status.FAILS:
        return Status.FAILS
    return check_status


def lifetime_status(year_statuses: list[str], lifetime_threshold_met: bool, years_missed: int) -> str:
    """The verdict over the lifetime: not eligible if any year is; fails if the lifetime value misses
    the threshold or a year broke a rule other than the threshold; undetermined if a year's rule
    cannot be judged; else qualifies (single years over the threshold are listed, not failed: the
    rulebook's value is the lifetime's)."""
    if Status.NOT_ELIGIBLE in year_statuses:
        return Status.NOT_ELIGIBLE
    rule_failures = year_statuses.count(Status.FAILS) - years_missed
    if not lifetime_threshold_met or rule_failures > 0:
        return Status.FAILS
    return Status.UNDETERMINED if Status.UNDETERMINED in year_statuses else Status.QUALIFIES


@dataclass
class LifetimeResult:
    project: str
    project_file: str
    product: str
    unit: str
    factor_set: str
    factor_set_sha256: str
    gwp: str
    operating_years: int
    lifetime_output_t: float
    construction_t_co2e: float
    construction_kg_co2e_per_unit: float
    average_without_construction: float
    average_with_construction: float
    years: list[LifetimeYear]
    schemes: list[LifetimeScheme]
    trajectory_source: str
    project_sha256: str = ""
    time_series: str = ""  # how the electricity time series was used ('' without one)
    boundary: str = ""
    parameters: dict = field(default_factory=dict)
    factors_used: list[dict] = field(default_factory=list)  # first operating year's rows

    @property
    def from_memory(self) -> dict[str, list[str]]:
        """Ids of the factors used (any year) and of the rulebooks checked that were recorded from memory."""
        return {
            "factors": sorted({key for year in self.years for key in year.factors_from_memory}),
            "rulebooks": [s.scheme for s in self.schemes if s.from_memory],
        }

    def summary(self) -> dict:
        """The compact result stored in the run ledger."""
        return {
            "lifetime": True,
            "total": self.average_without_construction,
            "total_with_construction": self.average_with_construction,
            "unit": self.unit,
            "checks": [
                {
                    "scheme": s.scheme,
                    "value": s.lifetime_value,
                    "unit": s.unit,
                    "limit": s.limit,
                    "passes": s.passes,
                    "status": s.status,
                    "years_missed": s.years_missed,
                }
                for s in self.schemes
            ],
        }

    def ledger_entry(self, kind: str = "lifetime") -> dict:
        """What the run ledger stores of this result."""
        return {
            "project_path": self.project_file,
            "project_name": self.project,
            "project_sha256": self.project_sha256,
            "factor_set": self.factor_set,
            "factor_set_sha256": self.factor_set_sha256,
            "schemes": [s.scheme for s in self.schemes],
            "boundary": self.boundary,
            "gwp": self.gwp,
            "results": self.summary(),
            "parameters": self.parameters,
            "factors_used": self.factors_used,
            "kind": "lifetime",
        }


YEAR_SUFFIX = re.compile(r"^(?P<region>.+?)[._](?P<year>\d{4})$")


def published_rows(factor_set: FactorSet, prefix: str) -> list[Factor]:
    """The yearly rows of one region in a factor set: ``PREFIX.YEAR`` or ``PREFIX_YEAR`` (four-digit year)."""
    prefix = prefix.rstrip("._")
    rows = []
    for key in factor_set.ids_with_prefix(prefix):
        match = YEAR_SUFFIX.match(key)
        if match and match["region"] == prefix:
            rows.append(factor_set.factors[key])
    return rows


def region_of(factor_id: str) -> str:
    """``electricity.grid.chile_2024`` -> ``electricity.grid.chile`` (the id without its year), or ''."""
    match = YEAR_SUFFIX.match(factor_id)
    return match["region"] if match else ""


def _by_year(rows: list[Factor], origin: str) -> dict[int, Factor]:
    by_year: dict[int, Factor] = {}
    for row in rows:
        if row.year is None:
            raise InputError(origin, row.id, "a calendar year in the year column of every trajectory row")
        if row.year in by_year:
            raise InputError(origin, row.id, f"one row per year, {row.year} appears twice")
        by_year[row.year] = row
    return by_year


def read_trajectory(
    project_file: str | Path, lifetime, factor_set: FactorSet, grid_factor_id: str = ""
) -> tuple[dict[int, Factor], str]:
    """Grid factor rows by calendar year of operation, and where they come from ({} when none is given).

    ``grid_trajectory_factors`` names a region of the factor set (``electricity.grid.chile``, or ``region``
    for the region of the grid source's own factor id): its published yearly rows (``REGION_YEAR`` or
    ``REGION.YEAR``) give their years. Years after the last published one come from ``grid_trajectory_csv``
    when it is given, else they are held at the last published year (the row's own year says so).
    A CSV alone must give every operating year.
    """
    wanted = range(lifetime.first_year, lifetime.first_year + lifetime.operating_years)
    csv_rows: dict[int, Factor] = {}
    origins = []
    if lifetime.grid_trajectory_csv:
        path = Path(project_file).parent / lifetime.grid_trajectory_csv
        csv_rows = _by_year(read_factor_rows(path), str(path))
        origins.append(str(path))
    published: dict[int, Factor] = {}
    if lifetime.grid_trajectory_factors:
        prefix = lifetime.grid_trajectory_factors
        if prefix == "region":
            prefix = region_of(grid_factor_id)
            if not prefix:
                raise InputError(
                    project_file,
                    "lifetime.grid_trajectory_factors",
                    f"'region' with a grid factor id ending in _YEAR, got '{grid_factor_id}'",
                )
        origin = f"factor set {factor_set.name}, rows {prefix.rstrip('._')}_YEAR or .YEAR"
        published = _by_year(published_rows(factor_set, prefix), origin)
        if not published:
            raise InputError(
                project_file,
                "lifetime.grid_trajectory_factors",
                f"rows '{prefix.rstrip('._')}_YEAR' or '.YEAR' in factor set '{factor_set.name}' (none found)",
            )
        origins.insert(0, origin)
    if not origins:
        return {}, ""
    by_year: dict[int, Factor] = {}
    last = max(published) if published else None
    for year in wanted:
        if year in published:
            by_year[year] = published[year]
        elif year in csv_rows and (last is None or year > last):
            by_year[year] = csv_rows[year]
        elif last is not None and year > last and not csv_rows:
            by_year[year] = published[last]  # held at the last published year
    missing = [year for year in wanted if year not in by_year]
    if missing:
        shown = ", ".join(str(y) for y in missing[:8]) + (" ..." if len(missing) > 8 else "")
        raise InputError(
            " and ".join(origins),
            "year",
            f"a grid factor for every operating year {wanted[0]}-{wanted[-1]}; missing {shown}",
        )
    documents = sorted({row.source for row in by_year.values()})
    held = sorted(year for year, row in by_year.items() if row.year != year)
    text = "; ".join(origins)
    if held:
        text += f"; {held[0]}-{held[-1]} held at the last published year {last}"
    if len(documents) > 1:
        text += f"; rows from {len(documents)} documents (bases may differ: see each row's note)"
    return by_year, text


def series_years(series: ElectricitySeries) -> np.ndarray:
    """Local calendar year of each interval."""
    return series.local.astype("datetime64[Y]").astype(np.int64) + 1970


def series_of_year(series: ElectricitySeries, year: int, repeated: bool, scale: float = 1.0) -> ElectricitySeries:
    """The series' intervals for one operating year: its own intervals of that year, or (``repeated``) the
    one-year series moved to that year, same minute from the local start of the year; grid profile x ``scale``."""
    if repeated:
        start = series.local.astype("datetime64[Y]")
        local = (start + (year - int(series_years(series)[0]))).astype("datetime64[m]") + (
            series.local - start.astype("datetime64[m]")
        )
        mask = slice(None)
        utc = local - series.offset_minutes.astype("timedelta64[m]")
    else:
        mask = series_years(series) == year
        utc = series.utc[mask]

    def cut(values):
        return None if values is None else values[mask]

    grid = cut(series.grid_g_co2e_per_kwh)
    return replace(
        series,
        utc=utc,
        offset_minutes=series.offset_minutes[mask],
        load_kwh=cut(series.load_kwh),
        hydrogen_kg=cut(series.hydrogen_kg),
        generation_kwh={name: values[mask] for name, values in series.generation_kwh.items()},
        grid_g_co2e_per_kwh=None if grid is None else grid * scale,
        price_per_mwh=cut(series.price_per_mwh),
    )


def _g_per_kwh(row: Factor, origin: str) -> float:
    try:
        return row.value * conversion_factor(row.unit, "g CO2e/kWh")
    except UnitMismatch:
        raise InputError(
            origin, row.id, f"a grid factor convertible to g CO2e/kWh to scale the series' grid profile, got {row.unit}"
        ) from None


def yearly_series(
    series: ElectricitySeries, years: list[int], trajectory: dict[int, Factor], base: Factor | None, origin: str
) -> tuple[list[ElectricitySeries], list[float | None], list[int], str]:
    """The series of every operating year, the grid profile scale of each, the calendar year whose intervals
    each uses, and a line saying how the series was used."""
    present = sorted(set(series_years(series).tolist()))
    if len(present) == 1:
        own = present[0]
        reference = trajectory.get(own, base)
        scales: list[float | None] = [None] * len(years)
        if trajectory and series.grid_g_co2e_per_kwh is not None and reference is not None:
            f0 = _g_per_kwh(reference, origin)
            if not f0 > 0:
                raise InputError(origin, reference.id, "a grid factor > 0 to scale the series' grid profile by")
            scales = [_g_per_kwh(trajectory[year], origin) / f0 for year in years]
        how = f"{series.path}: calendar year {own} repeated in every operating year" + (
            f", grid profile scaled by the trajectory (F(year) / F({own}) from "
            f"{'the trajectory' if own in trajectory else 'the grid source factor ' + reference.id})"
            if scales[0] is not None
            else ""
        )
        return (
            [
                series_of_year(series, year, True, 1.0 if scale is None else scale)
                for year, scale in zip(years, scales, strict=True)
            ],
            scales,
            [own] * len(years),
            how,
        )
    missing = [year for year in years if year not in present]
    if missing:
        raise InputError(
            series.path,
            "timestamp",
            f"intervals in every operating year {years[0]}-{years[-1]} (a series of one calendar year is repeated; "
            f"one of several years is read year by year), missing {', '.join(str(y) for y in missing[:8])}",
        )
    return (
        [series_of_year(series, year, False) for year in years],
        [None] * len(years),
        list(years),
        f"{series.path}: read year by year ({present[0]}-{present[-1]})",
    )


def _ageing_parameter(project) -> str:
    """The parameter path that stack ageing raises (declared by the hydrogen route), or ''."""
    return next((route.ageing for route in routes_of(project.model_dump()) if route.ageing), "")


def _with_value(data: dict, path: str, value) -> dict:
    section, name = path.split(".")
    return {**data, section: {**data[section], name: value}}


def _year_variants(
    project,
    life,
    factor_set: FactorSet,
    trajectory: dict,
    grid_factor_id: str,
    efficiency: np.ndarray,
    project_file: str,
    project_sha256: str,
):
    """One project per operating year (the ageing parameter aged) and one factor set per year (the grid
    source's factor replaced by the year's trajectory row): (projects, factor sets, calendar years)."""
    data = project.model_dump(exclude_none=True)
    ageing = _ageing_parameter(project)
    year_projects, year_sets, calendar_years = [], [], []
    for index in range(life.operating_years):
        year = life.first_year + index
        calendar_years.append(year)
        year_data = data
        if ageing:
            section, name = ageing.split(".")
            year_data = _with_value(
                data, ageing, stage.electricity_kwh_per_kg_h2_aged(data[section][name], float(efficiency[index]))
            )
        year_projects.append(PortfolioProject(project_file, validate_project(year_data, project_file), project_sha256))
        if trajectory:
            replaced = trajectory[year].model_copy(update={"id": grid_factor_id})
            year_sets.append(
                FactorSet(
                    f"{factor_set.name}+grid {year}",
                    factor_set.description,
                    factor_set.date,
                    {**factor_set.factors, grid_factor_id: replaced},
                    factor_set.layers,
                )
            )
        else:
            year_sets.append(factor_set)
    return year_projects, year_sets, calendar_years


def _construction_t_co2e(life, factor_set: FactorSet) -> float:
    """Construction emissions of the plant and its dedicated renewables, t CO2e."""
    construction_t = life.plant_construction_t_co2e + life.renewables_construction_t_co2e
    if life.renewables_mw:
        per_mw = factor_set.get(life.renewables_construction_factor, "lifetime.renewables_construction_factor")
        if per_mw.unit.replace(" ", "") != "tCO2e/MW":
            raise InputError(per_mw.origin or factor_set.name, per_mw.id, f"a factor in t CO2e/MW, got {per_mw.unit}")
        construction_t += stage.construction_t_co2e_from_capacity(life.renewables_mw, per_mw.value)
    return construction_t


def _construction_per_basis_unit(rulebook, first, construction_per_gate_unit: float) -> float:
    """Construction emissions per unit of the scheme's quantity (its basis: product, delivered or hydrogen)."""
    if rulebook.basis == "product":
        basis_product, per_basis_unit = first.product, construction_per_gate_unit
    elif rulebook.basis == "delivered":
        basis_product, per_basis_unit = (
            first.reference_product,
            construction_per_gate_unit * first.gate_product_per_unit,
        )
    else:
        basis_product, per_basis_unit = (
            "hydrogen",
            construction_per_gate_unit * first.gate_product_per_unit / first.hydrogen_kg_per_unit,
        )
    hydrogen_lhv = first.heating_values_mj_per_kg["hydrogen_lhv"]
    ammonia_lhv = first.heating_values_mj_per_kg.get("ammonia_lhv", float("nan"))
    return float(
        intensities(per_basis_unit, basis_product, hydrogen_lhv, ammonia_lhv, first.hydrogen_mass_fraction)[
            rulebook.quantity
        ]
    )


def _scheme_over_life(
    number: int,
    rulebook,
    scores: list,
    units: np.ndarray,
    construction_per_gate_unit: float,
    first_year: int,
    yearly_status: list[dict[str, str]],
) -> LifetimeScheme:
    """One scheme's lifetime value and status, and each year's status (filled into ``yearly_status``)."""
    first = scores[0]
    check = first.checks[number]
    values = np.array([score.checks[number].value for score in scores])
    added = _construction_per_basis_unit(rulebook, first, construction_per_gate_unit)
    without = float(stage.output_weighted_mean(values, units))
    counted = values + added if rulebook.counts_construction else values
    lifetime_value = without + added if rulebook.counts_construction else without
    missed, statuses = [], []
    for index, value in enumerate(counted):
        met = rulebook.evaluate(float(value))["passes"]
        status = year_status(scores[index].checks[number].status, met)
        yearly_status[index][check.scheme] = status
        statuses.append(status)
        if not met and status != Status.NOT_ELIGIBLE:
            missed.append(first_year + index)
    overall = lifetime_status(statuses, rulebook.evaluate(lifetime_value)["passes"], len(missed))
    return LifetimeScheme(
        scheme=check.scheme,
        unit=check.unit,
        limit=check.limit,
        counts_construction=rulebook.counts_construction,
        average_without_construction=without,
        average_with_construction=without + added,
        lifetime_value=lifetime_value,
        passes=overall == Status.QUALIFIES,
        status=overall,
        years_missed=missed,
        from_memory=check.from_memory,
    )


def _lifetime_year(
    score, year: int, grid, age: float, efficiency: float, output_t: float, statuses: dict[str, str], series_year, scale
) -> LifetimeYear:
    return LifetimeYear(
        year=year,
        stack_age_years=int(age),
        efficiency_fraction=float(efficiency),
        output_t=float(output_t),
        grid_factor=grid.value if grid else None,
        grid_factor_unit=grid.unit if grid else "",
        total=score.total,
        scheme_values={check.scheme: check.value for check in score.checks},
        passes={scheme: status == Status.QUALIFIES for scheme, status in statuses.items()},
        statuses=statuses,
        factors_from_memory=score.from_memory["factors"],
        grid_factor_id=grid.id if grid else "",
        grid_factor_year=grid.year if grid else None,
        series_year=series_year,
        grid_profile_scale=scale,
        matched_share={
            check.scheme: check.electricity_matching.matched_share
            for check in score.checks
            if check.electricity_matching is not None
        },
    )


def _factors_used(first, trajectory: dict) -> list[dict]:
    """The factors the first year used, and every trajectory row, once per year (as plain rows with their grade)."""
    rows = sorted({row.year: row for row in trajectory.values()}.values(), key=lambda row: row.year)
    return [factor_row(factor) for factor in first.factors_used] + [
        factor_row(row.model_copy(update={"id": f"trajectory.{row.year}"})) for row in rows
    ]


def _life_of(project, project_file: str):
    """The project's [lifetime] section, or one InputError line asking for it."""
    if project.lifetime is None:
        raise InputError(
            project_file,
            "lifetime",
            "a [lifetime] section (operating_years, first_year, nameplate_output_t_per_year) for --lifetime",
        )
    return project.lifetime


def _units_and_construction(life, factor_set, outputs: np.ndarray, first) -> tuple[np.ndarray, float, float]:
    """Functional units made each year (plant output in gate units, t NH3 or kg H2, over the gate product per
    functional unit), the construction emissions (t CO2e) and their share per gate unit (kg CO2e)."""
    gate_units = outputs * (1000.0 if first.product == "hydrogen" else 1.0)
    construction_t = _construction_t_co2e(life, factor_set)
    per_gate_unit = float(stage.construction_kg_co2e_per_unit(construction_t, gate_units.sum()))
    return gate_units / first.gate_product_per_unit, construction_t, per_gate_unit


def _with_yearly_series(year_projects: list, series, calendar_years: list[int], trajectory, base, origin: str):
    """Each operating year's project with its own year of the electricity time series (``yearly_series``), the
    grid scale and source year of each, and how the series was used; without a series, the projects as they are."""
    if series is None:
        return year_projects, [None] * len(calendar_years), [None] * len(calendar_years), ""
    per_year, scales, source_years, series_use = yearly_series(series, calendar_years, trajectory, base, origin)
    year_projects = [replace(item, series=one) for item, one in zip(year_projects, per_year, strict=True)]
    return year_projects, scales, source_years, series_use


def lifetime_score(
    project,
    assessment: Assessment,
    *,
    project_file: str = "project",
    project_sha256: str = "",
) -> LifetimeResult:
    """Score every operating year of a project and average over its life (see module notes), under the
    assessment's factor set, GWP set and schemes (each year's scheme rules are those of its calendar year)."""
    factor_set, gwp = assessment.factor_set, assessment.gwp
    life = _life_of(project, project_file)
    grid_factor_id = (
        project.electricity.sources[life.grid_source].factor if life.grid_source in project.electricity.sources else ""
    )
    trajectory, trajectory_origin = read_trajectory(project_file, life, factor_set, grid_factor_id)
    ages = stage.stack_age_years(np.arange(life.operating_years), life.stack_replacement_years or life.operating_years)
    efficiency = stage.efficiency_fraction_of_new(
        life.efficiency_loss_per_year if _ageing_parameter(project) else 0.0, ages
    )
    outputs = stage.annual_output_t(life.nameplate_output_t_per_year, life.capacity_factor, efficiency)
    year_projects, year_sets, calendar_years = _year_variants(
        project, life, factor_set, trajectory, grid_factor_id, efficiency, project_file, project_sha256
    )
    year_projects, scales, source_years, series_use = _with_yearly_series(
        year_projects,
        project_series(project, project_file),
        calendar_years,
        trajectory,
        factor_set.factors.get(grid_factor_id),
        trajectory_origin or factor_set.name,
    )
    scores = score_portfolio(
        year_projects, year_sets, gwp=gwp, schemes=assessment.scheme_list, year=calendar_years
    )  # each year's scheme rules
    first = scores[0]
    # plant output per year in gate units (t NH3, or kg H2), then in functional units (what the
    # totals are per: t NH3 or kg H2 at the gate, or delivered, or cracked to hydrogen)
    units, construction_t, construction_per_gate_unit = _units_and_construction(life, factor_set, outputs, first)
    construction_per_unit = construction_per_gate_unit * first.gate_product_per_unit
    average = float(stage.output_weighted_mean(np.array([score.total for score in scores]), units))
    books = rulebooks()
    yearly_status: list[dict[str, str]] = [{} for _ in scores]
    lifetime_schemes = [
        _scheme_over_life(
            number, books[check.scheme], scores, units, construction_per_gate_unit, life.first_year, yearly_status
        )
        for number, check in enumerate(first.checks)
    ]
    years = [
        _lifetime_year(
            score, life.first_year + index, trajectory.get(life.first_year + index) if trajectory else None, *figures
        )
        for index, (score, *figures) in enumerate(
            zip(scores, ages, efficiency, outputs, yearly_status, source_years, scales, strict=True)
        )
    ]
    return LifetimeResult(
        project=project.project.name,
        project_file=project_file,
        product=first.product,
        unit=first.unit,
        factor_set=factor_set.name,
        factor_set_sha256=factor_set.sha256,
        gwp=gwp,
        operating_years=life.operating_years,
        lifetime_output_t=float(outputs.sum()),
        construction_t_co2e=float(construction_t),
        construction_kg_co2e_per_unit=float(construction_per_unit),
        average_without_construction=average,
        average_with_construction=average + float(construction_per_unit),
        years=years,
        schemes=lifetime_schemes,
        trajectory_source=trajectory_origin,
        project_sha256=project_sha256,
        time_series=series_use,
        boundary=project.project.boundary,
        parameters=project.model_dump(),
        factors_used=_factors_used(first, trajectory),
    )
