"""One scoring path: a validated project and a factor set -> one ``ScoreResult``.

``prepare`` builds everything up to the matrices (inventory, characterisation vectors, the
schemes to check). The solved inventories come either from bw2calc (``solve_with_bw2calc``,
one project) or from stacked numpy solves (``solve_stacked``, many projects of one matrix
structure, one member of each structure checked against bw2calc). Both hand their solutions to
``assemble``, the one place where totals, stages, gases, intensities and scheme checks are
computed, so the two solvers cannot drift apart.

Per-project work is a pure function of (project, factor set, options) so that portfolios can be
mapped over workers.
"""

from __future__ import annotations

import datetime as dt
import functools
import math
from dataclasses import dataclass, field

import numpy as np

from ..about import CAUTION, __version__
from ..errors import InputError, did_you_mean, match_id
from ..model.factors import Factor, FactorSet
from ..model.flows import APART_FLOWS, BIOGENIC_FLOWS, FLOWS, NON_GHG_FLOWS
from ..model.project import as_date, boundary_id
from ..model.rulebooks import Scheme, grade_note, load_schemes, select_schemes, user_rulebooks
from ..model.statuses import Status
from ..routes import HYDROGEN_ROUTES, STAGES
from ..routes.project import validate_project
from ..stages.ammonia import hydrogen_mass_fraction_of_ammonia
from .engine import Matrices, build_matrices, solve, solve_many, structure_key
from .inputs import NumericInputs
from .inventory import Inventory, build_inventory, check_physical_limits
from .results import (
    Check,
    CheckFigures,
    ExchangeRow,
    FactorSetRef,
    Intensity,
    ResultFigures,
    ScoreResult,
    constructed,
)
from .verdicts import (
    FIRST_YEAR,
    LAST_YEAR,
    MET,
    NOT_MET,
    NOTE,
    UNKNOWN,
    Finding,
    Period,
    Reading,
    assessment_year,
    boundary_findings,
    declared_e_td,
    electricity_reading,
    eligibility_findings,
    figure,
    ordered_reasons,
    renewable_energy_findings,
    status_of,
)

DEFAULT_GWP = "ar6"
FUNCTIONAL_UNITS = {
    "ammonia": ("1 t NH3 at the plant gate", "kg CO2e/t NH3"),
    "hydrogen": ("1 kg H2 at the plant gate", "kg CO2e/kg H2"),
}
AGREEMENT = {"rtol": 1e-9, "atol": 1e-12}  # numpy characterisation against bw2calc's own score
EXCHANGE_FIELDS = set(ExchangeRow.model_fields)  # every field of an exchange row is set: one set shared by all rows
CHECK_FIELDS = tuple(Check.model_fields)  # a check's fields in order (``check_of``)
CHECK_SET = set(CHECK_FIELDS) - {"electricity_matching", "co_products"}  # those a check of ``scheme_checks`` sets
CHECK_AMENDED = CHECK_SET | {"co_products"}  # those of a check given its co-product rule (``amended``)
CO_PRODUCT_STATEMENTS: dict[
    tuple, dict
] = {}  # a check's co_products statement -> the one dict holding it (``amended``)
SCHEME_FIELDS: dict[int, tuple] = {}  # id of a rulebook -> (the rulebook, its fields of a check)


@functools.cache
def shipped_rulebooks() -> dict[str, Scheme]:
    """Every rulebook of the factors folder, loaded once per process (an empty folder is an error).

    Returns
    -------
    dict of str to Scheme
        The validated scheme rulebooks of ``factors/schemes/*.toml``, by scheme id.

    Raises
    ------
    InputError
        When the folder holds no rulebook, or a rulebook is not valid TOML or breaks the rulebook model.
    """
    return load_schemes()


def rulebooks() -> dict[str, Scheme]:
    """The shipped rulebooks and the user rulebooks in use (``model.rulebooks.using_rulebooks``).

    Returns
    -------
    dict of str to Scheme
        Every rulebook checked in this context, by scheme id.
    """
    return {**shipped_rulebooks(), **user_rulebooks()}


def gwp_sets(factor_set: FactorSet) -> list[str]:
    """The GWP100 sets a factor set holds: those with a factor for CO2 (``gwp.<set>.co2``).

    Parameters
    ----------
    factor_set : FactorSet
        The loaded factor set.

    Returns
    -------
    list of str
        The set ids, sorted (ar4, ar5 and ar6 in the shipped set).
    """
    return sorted({key.split(".")[1] for key in factor_set.ids_with_prefix("gwp.") if key.endswith(".co2")})


def gwp_set(gwp: str, factor_set: FactorSet, where: str = "--gwp") -> str:
    """The GWP100 set id as the factor set spells it (ids are case-insensitive: AR6 = ar6).

    Parameters
    ----------
    gwp : str
        The set asked for (ar4, ar5, ar6), in any case.
    factor_set : FactorSet
        The loaded factor set, whose ``gwp.`` rows name the sets it knows.
    where : str
        The field an error names: the option (``--gwp``) or a rulebook's ``gwp``.

    Returns
    -------
    str
        The set id as the factor set spells it.

    Raises
    ------
    InputError
        When the factor set holds no such set (the known ones and the closest spelling are named).
    """
    known = gwp_sets(factor_set)
    found = match_id(gwp, known)
    if found is None:
        raise InputError(where, gwp, f"one of {', '.join(known)}{did_you_mean(gwp, known)}")
    return found


def characterisation(inputs, gwp: str, where: str = "--gwp") -> np.ndarray:
    """GWP100 factor per flow, in the order of ``FLOWS``; pre-characterised CO2e counts 1.

    The flows counted apart (``APART_FLOWS``: ammonia slip, leaked hydrogen, biogenic CO2) count 0.

    Parameters
    ----------
    inputs : NumericInputs, DrawInputs or SymbolicInputs
        Where the factor values come from: numbers, Monte Carlo draws or the workbook's symbolic cells.
    gwp : str
        GWP100 set (ar4, ar5, ar6), as ``gwp_set`` accepts it.
    where : str
        The field an error names: the option (``--gwp``) or a rulebook's ``gwp``.

    Returns
    -------
    ndarray
        kg CO2e per kg of each flow, shape (flows,); (flows, draws) when a GWP factor is drawn; the workbook's
        symbolic cells for symbolic inputs.

    Raises
    ------
    InputError
        When the set is unknown, or a factor of the set is missing or in a unit that does not convert.

    References
    ----------
    .. [1] IPCC AR4 WG1, Forster et al. (2007), Ch. 2, Table 2.14 (GWP100 of the factor ids ``gwp.ar4.*``).
    .. [2] IPCC AR5 WG1, Myhre et al. (2013), Ch. 8, Table 8.7 (``gwp.ar5.*``).
    .. [3] IPCC AR6 WG1, Forster et al. (2021), Ch. 7, Table 7.15 (``gwp.ar6.*``).
    """
    gwp = gwp_set(gwp, inputs.factor_set, where)
    values = []
    for flow in FLOWS:
        if flow == "co2e_precharacterised":
            values.append(1.0)
        elif flow in APART_FLOWS:
            values.append(0.0)
        else:
            gas = flow.split("_")[0]
            factor_id = f"gwp.{gwp}.{gas}" if gas == "co2" else f"gwp.{gwp}.{flow}"
            values.append(inputs.factor(factor_id, f"kg CO2e/kg {gas.upper()}"))
    if any(isinstance(v, np.ndarray) and v.ndim for v in values):  # Monte Carlo draws of a GWP factor: (flows, draws)
        return np.stack(np.broadcast_arrays(*(np.asarray(v, dtype=float) for v in values)))
    return np.array(values)  # numbers, or the workbook's symbolic cells


SET_CHARACTERISATIONS: dict[
    tuple[str, str, str], tuple[np.ndarray, dict]
] = {}  # (set sha256, gwp, where) -> vector, rows read


def set_characterisation(inputs: NumericInputs, gwp: str, where: str = "--gwp") -> np.ndarray:
    """``characterisation`` of a factor set's numbers, worked out once per set content and GWP set
    (a portfolio prepares many projects under one set); the rows it reads are recorded in
    ``inputs.used`` as if read again. The vector is shared: it is read-only.

    Parameters
    ----------
    inputs : NumericInputs
        Numeric inputs of the factor set (the rows read are recorded in ``inputs.used``).
    gwp : str
        The GWP100 set: ar4, ar5 or ar6.
    where : str
        Where the set was asked for, named in an error.

    Returns
    -------
    ndarray
        kg CO2e per kg of each flow, in the order of ``FLOWS`` (read-only).
    """
    key = (inputs.factor_set.sha256, gwp, where)
    if key not in SET_CHARACTERISATIONS:
        reader = NumericInputs(inputs.factor_set, inputs.source)
        vector = characterisation(reader, gwp, where)
        vector.setflags(write=False)
        SET_CHARACTERISATIONS[key] = (vector, dict(reader.used))
    vector, used = SET_CHARACTERISATIONS[key]
    inputs.used.update(used)
    return vector


def intensities(
    total_per_unit: float, product: str, hydrogen_lhv: float, ammonia_lhv: float, hydrogen_fraction: float
) -> dict[str, float | None]:
    """The same result per t NH3, per kg NH3, per kg H2 (contained, for ammonia) and per MJ (LHV).

    Parameters
    ----------
    total_per_unit : float or ndarray
        kg CO2e per functional unit: per t NH3 for ammonia, per kg H2 for hydrogen (arrays of draws allowed).
    product : str
        The product the total is per unit of: ammonia or hydrogen.
    hydrogen_lhv : float
        Lower heating value of hydrogen, MJ/kg.
    ammonia_lhv : float
        Lower heating value of ammonia, MJ/kg (unused for hydrogen).
    hydrogen_fraction : float
        Hydrogen contained in ammonia, kg H2 per kg NH3 (about 0.1776; unused for hydrogen).

    Returns
    -------
    dict of str to float or None
        ``kg_co2e_per_t_nh3`` and ``kg_co2e_per_kg_nh3`` (None for hydrogen), ``kg_co2e_per_kg_h2`` and
        ``g_co2e_per_mj`` (g CO2e per MJ of the product's LHV).

    References
    ----------
    .. [1] US DOE Hydrogen Program, Hydrogen Analysis Resource Center, Lower and Higher Heating Values of Fuels
       (2023): hydrogen LHV 119.96 MJ/kg (factor ``heating_value.hydrogen.lhv``).
    .. [2] IEA Advanced Motor Fuels TCP, Fuel information: Ammonia, Table 1 (2023): LHV 18.6 MJ/kg
       (factor ``heating_value.ammonia.lhv``).
    """
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


def zero_rated(
    scheme: Scheme, inventory: Inventory, activity_key: str, counted_zero=frozenset(), charged_as_grid=None
) -> str:
    """Why a scheme does not count an activity's own direct emissions ('' when it counts them).

    The factor id's name alone never zero-rates a source.

    Parameters
    ----------
    scheme : Scheme
        The rulebook read (its ``excluded_stages``).
    inventory : Inventory
        The project's inventory.
    activity_key : str
        The activity asked about.
    counted_zero : set of str
        The electricity activities the scheme's electricity rules count at zero (``Check.electricity_counted_zero``).
    charged_as_grid : dict of str to str, optional
        Failing electricity activity -> the grid source's activity whose intensity it is charged
        (``Check.electricity_charged_as_grid``).

    Returns
    -------
    str
        The reason in words, or '' when the scheme counts the activity's own emissions.

    References
    ----------
    .. [1] Commission Delegated Regulation (EU) 2023/1185, Annex Part A point 6: electricity counted fully
       renewable counts zero; other electricity at the grid's intensity (rulebook ``eu-rfnbo``).
    """
    activity = inventory.activities[activity_key]
    if activity_key in counted_zero:
        return "electricity counted fully renewable under this scheme's rules: zero"
    if charged_as_grid and activity_key in charged_as_grid:
        return f"electricity failing this scheme's rules: charged at the intensity of {charged_as_grid[activity_key]}"
    if activity.stage in scheme.excluded_stages:
        return "stage outside this scheme's boundary"
    return ""


def unit_intensity(inventory: Inventory, activity_key: str, flow_keys, characterisation):
    """kg CO2e of an activity's own emissions per unit of its product.

    Parameters
    ----------
    inventory : Inventory
        The project's inventory.
    activity_key : str
        The activity whose biosphere exchanges are summed.
    flow_keys : sequence of str
        Flow keys in the order of the characterisation's last axis.
    characterisation : ndarray
        kg CO2e per kg of each flow, shape (flows,) or (draws, flows).

    Returns
    -------
    float or ndarray
        kg CO2e per unit of the activity's product (per kWh for an electricity source); an array over draws
        when ``characterisation`` is (draws, flows) or the amounts are arrays.
    """
    flow_index = {flow: number for number, flow in enumerate(flow_keys)}
    return sum(
        (
            characterisation[..., flow_index[e.input]] * np.asarray(e.amount, dtype=float)
            for e in inventory.activities[activity_key].exchanges
            if e.kind == "biosphere"
        ),
        0.0,
    )


def charged_source_intensities(
    scheme: Scheme, inventory: Inventory, flow_keys, characterisation, reading: Reading
) -> dict[str, object]:
    """Each electricity source's intensity as the scheme charges it, by source name.

    Zero where its rules count it fully renewable, the grid source's where it fails them and the rulebook
    charges grid electricity, else its own factor.

    Parameters
    ----------
    scheme : Scheme
        The rulebook the reading comes from.
    inventory : Inventory
        The project's inventory (its ``electricity_sources``: activity key -> source name).
    flow_keys : sequence of str
        Flow keys in the order of the characterisation's last axis.
    characterisation : ndarray
        The scheme's characterisation, kg CO2e per kg of each flow, (flows,) or (draws, flows).
    reading : Reading
        The scheme's rules read on the project (``read_rules``).

    Returns
    -------
    dict of str to float or ndarray
        kg CO2e/kWh by source name: numbers, or arrays over draws.

    References
    ----------
    .. [1] Commission Delegated Regulation (EU) 2023/1185, Annex Part A point 6 and Part C: electricity that
       does not count fully renewable is charged as grid electricity of the bidding zone.
    .. [2] 26 CFR 1.45V-4(a)(2): electricity without qualifying certificates at the regional average
       (rulebook ``us-45v``, secondary).
    """
    charged = {}
    for key, name in inventory.electricity_sources.items():
        if key in reading.counted_zero:
            charged[name] = 0.0
        else:
            charged[name] = unit_intensity(
                inventory, reading.charged_as_grid.get(key, key), flow_keys, characterisation
            )
    return charged


def declared_addition(scheme: Scheme, inventory: Inventory, params: dict) -> float:
    """What a declared e_td adds to the scheme's value (0 where it does not apply): ``verdicts.declared_e_td``.

    Parameters
    ----------
    scheme : Scheme
        The rulebook read.
    inventory : Inventory
        The project's inventory (the stages it models).
    params : dict
        The project's parameters (``Project.model_dump``); ``project.declared_e_td_g_co2e_per_mj`` is read.

    Returns
    -------
    float
        g CO2e/MJ added to the scheme's value.

    References
    ----------
    .. [1] Commission Delegated Regulation (EU) 2023/1185, Annex Part A, term e_td (point 16: storage and
       distribution of the finished fuel).
    """
    present = {activity.stage for activity in inventory.activities.values()}
    return declared_e_td(scheme, present, params["project"]) or 0.0


def scheme_mask(scheme: Scheme, inventory: Inventory, keys: list[str], reading: Reading) -> np.ndarray:
    """Activities whose own emissions the scheme's value leaves out (counted zero, charged as grid, outside it).

    Parameters
    ----------
    scheme : Scheme
        The rulebook read.
    inventory : Inventory
        The project's inventory.
    keys : list of str
        Activity keys in matrix column order.
    reading : Reading
        The scheme's rules read on the project (``read_rules``).

    Returns
    -------
    ndarray of bool
        One entry per key: True where the activity's own emissions are left out (``zero_rated``).
    """
    return np.array(
        [bool(zero_rated(scheme, inventory, key, reading.counted_zero, reading.charged_as_grid)) for key in keys]
    )


def grid_charge(reading: Reading, keys: list[str], supply, unit_intensities: dict):
    """kg CO2e per basis unit that failing electricity adds at the grid's intensity.

    The failing source's kWh times the grid source's intensity, summed over the failing sources.

    Parameters
    ----------
    reading : Reading
        The scheme's rules read on the project; ``charged_as_grid`` names the failing sources and their grid.
    keys : list of str
        Activity keys in matrix column order.
    supply : ndarray
        Units of each activity per basis unit (kWh for electricity), indexed like ``keys`` on the last axis.
    unit_intensities : dict of str to float or ndarray
        Grid activity key -> kg CO2e/kWh (``unit_intensity``).

    Returns
    -------
    float or ndarray
        kg CO2e per basis unit (0.0 when nothing fails); arrays over draws for arrays.

    References
    ----------
    .. [1] Commission Delegated Regulation (EU) 2023/1185, Annex Part A point 6 and Part C (grid electricity of
       the bidding zone).
    """
    index = {key: number for number, key in enumerate(keys)}
    return sum((supply[..., index[key]] * unit_intensities[grid] for key, grid in reading.charged_as_grid.items()), 0.0)


@dataclass
class Prepared:
    """A project made ready to solve: its inventory, matrices, characterisations and schemes.

    Everything here depends on (project, factor set, options) only, so a portfolio run can
    prepare many projects and solve those that share a matrix structure together.
    """

    project: object
    factor_set: FactorSet
    params: dict
    inputs: NumericInputs
    inventory: Inventory
    chosen: list[Scheme]
    gwp: str
    headline: np.ndarray
    per_gwp: dict[str, np.ndarray]
    matrices: Matrices
    demands: list[str]
    hydrogen_lhv: float
    ammonia_lhv: float
    fraction: float
    source: str = "project"
    project_sha256: str = ""
    period: Period = field(default_factory=lambda: Period.year(dt.date.today().year))
    matching: dict | None = None
    readings: dict = field(default_factory=dict)  # scheme id -> Reading, read once (``scheme_reading``)


def prepare(
    project,
    factor_set: FactorSet,
    *,
    gwp: str = DEFAULT_GWP,
    schemes: list[str] | None = None,
    source: str = "project",
    boundary: str | None = None,
    project_sha256: str = "",
    year: int | None = None,
    matching: dict | None = None,
) -> Prepared:
    """Validated project + factor set -> inventory, matrices and characterisation vectors.

    Parameters
    ----------
    project : Project
        The validated project.
    factor_set : FactorSet
        The loaded factor set.
    gwp : str
        GWP100 set of the headline result (ar4, ar5, ar6).
    schemes : list of str or None
        Scheme ids to check; None for every scheme that applies to the product.
    source : str
        Where the project comes from (its file), named in errors and in the result.
    boundary : str or None
        Cradle-to-gate, well-to-tank or well-to-wake; overrides the project's own.
    project_sha256 : str
        SHA-256 of the project file, recorded in the result.
    year : int or None
        The calendar year whose dates the scheme rules are read on (default: ``verdicts.assessment_year``).
    matching : dict or None
        Electricity source name -> the finest period a time series shows it matched (supplied by a matching
        analysis; without it hourly rules cannot be judged).

    Returns
    -------
    Prepared
        Inventory, matrices, characterisation vectors, chosen schemes, heating values (MJ/kg LHV), demands and
        the assessment period.

    Raises
    ------
    InputError
        For a year outside 2000 to 2100 or before commissioning, an unknown GWP set, boundary or scheme, a value
        physics forbids, or a factor missing from the set.
    """
    params = project_params(project, boundary)
    period = Period.year(checked_year(params, year, source))
    gwp = gwp_set(gwp, factor_set)
    inputs = NumericInputs(factor_set, source)
    check_physical_limits(params, inputs, source)
    staged = run_stages(params, inputs, gwp, schemes)
    inventory = staged.inventory
    matrices = build_matrices(inventory)
    return Prepared(
        project,
        factor_set,
        params,
        inputs,
        inventory,
        staged.chosen,
        gwp,
        staged.headline,
        staged.per_gwp,
        matrices,
        demands_of(inventory),
        staged.hydrogen_lhv,
        staged.ammonia_lhv,
        staged.fraction,
        source,
        project_sha256,
        period,
        matching,
    )


def project_params(project, boundary: str | None = None) -> dict:
    """A validated project's parameters as the stages read them (``Project.model_dump``), with the run's boundary.

    Parameters
    ----------
    project : Project
        The validated project.
    boundary : str or None
        Cradle-to-gate, well-to-tank or well-to-wake; overrides the project's own.

    Returns
    -------
    dict
        A new nested dict of the project's sections.
    """
    params = project.model_dump()
    if boundary is not None:
        params["project"]["boundary"] = boundary_id(boundary)
    return params


@dataclass
class Staged:
    """The stage arithmetic of a project on one kind of inputs: numbers (``NumericInputs``), arrays of
    Monte Carlo draws (``DrawInputs``) or the workbook's symbolic cells (``SymbolicInputs``).

    The one evaluation core: ``prepare`` (a score), ``analyses.uncertainty.evaluate`` (the draws) and the
    workbook's symbolic model all start here, so they build the same inventory and characterise it alike.
    """

    inventory: Inventory
    chosen: list[Scheme]  # the schemes checked, in rulebook order
    headline: object  # GWP100 per flow under the headline set (``characterisation``)
    per_gwp: dict[str, object]  # GWP set -> its vector, for the headline set and every chosen scheme's
    hydrogen_lhv: object  # MJ/kg
    ammonia_lhv: object  # MJ/kg (NaN for a hydrogen product)
    fraction: object  # kg H2 per kg NH3 (1 for a hydrogen product)


def run_stages(params: dict, inputs, gwp: str, schemes: list[str] | None) -> Staged:
    """Build the inventory from ``params`` with ``inputs``, choose the schemes for its product, and
    characterise it under the headline GWP set and each scheme's own.

    Parameters
    ----------
    params : dict
        The project's parameters (numbers, arrays of draws or symbolic cells), as ``Project.model_dump``.
    inputs : NumericInputs, DrawInputs or SymbolicInputs
        Where factor and reference values come from.
    gwp : str
        GWP100 set of the headline result (ar4, ar5, ar6).
    schemes : list of str or None
        Scheme ids to check; None for every scheme that applies to the product.

    Returns
    -------
    Staged
        Inventory, chosen schemes, characterisation vectors and heating values (MJ/kg LHV).
    """
    inventory = build_inventory(params, inputs)
    product = inventory.product
    chosen = select_schemes(rulebooks(), schemes, product)
    characterise = (
        set_characterisation if type(inputs) is NumericInputs else characterisation
    )  # draws and cells: their own
    headline = characterise(inputs, gwp)
    per_gwp = {gwp: headline}
    for scheme in chosen:
        if scheme.gwp not in per_gwp:
            per_gwp[scheme.gwp] = characterise(inputs, scheme.gwp, f"rulebook {scheme.id}: gwp")
    hydrogen_lhv = inputs.factor("heating_value.hydrogen.lhv", "MJ/kg")
    ammonia = product == "ammonia"
    ammonia_lhv = inputs.factor("heating_value.ammonia.lhv", "MJ/kg") if ammonia else float("nan")
    fraction = hydrogen_mass_fraction_of_ammonia(inputs.molar_mass("H2"), inputs.molar_mass("NH3")) if ammonia else 1.0
    return Staged(inventory, chosen, headline, per_gwp, hydrogen_lhv, ammonia_lhv, fraction)


def demands_of(inventory: Inventory) -> list[str]:
    """The demands solved for: the reference product, the plant gate product and hydrogen (each once).

    Parameters
    ----------
    inventory : Inventory
        The project's inventory.

    Returns
    -------
    list of str
        Activity keys, one unit of whose product is demanded in turn, the functional unit's first.
    """
    return list(dict.fromkeys([inventory.reference, inventory.gate, inventory.hydrogen]))


def stage_and_gas_sums(contributions, keys: list[str], flow_keys: list[str], inventory: Inventory) -> tuple[dict, dict]:
    """kg CO2e by stage (in ``STAGES`` order) and by gas (without the flows counted apart).

    Parameters
    ----------
    contributions : ndarray
        kg CO2e per functional unit shaped (..., flows, activities): one project's numbers or
        (draws, flows, activities).
    keys : list of str
        Activity keys in the order of the last axis.
    flow_keys : list of str
        Flow keys in the order of the flows axis.
    inventory : Inventory
        The project's inventory (each activity's stage).

    Returns
    -------
    tuple of (dict, dict)
        Stage -> kg CO2e (stages the project models only) and flow -> kg CO2e (flows of ``APART_FLOWS`` left
        out); numbers, or arrays over draws.
    """
    by_activity = contributions.sum(axis=-2)
    columns: dict[str, list[int]] = {}  # stage -> its activities' columns, in key order
    for number, key in enumerate(keys):
        columns.setdefault(inventory.activities[key].stage, []).append(number)
    by_stage = {stage: by_activity[..., columns[stage]].sum(axis=-1) for stage in STAGES if stage in columns}
    gases = contributions.sum(axis=-1)
    return by_stage, {flow: gases[..., n] for n, flow in enumerate(flow_keys) if flow not in APART_FLOWS}


def checked_year(params: dict, year: int | None, source: str = "project") -> int:
    """The assessment year, refused outside 2000 to 2100 or before the plant is in service.

    The year given, else ``verdicts.assessment_year``'s default.

    Parameters
    ----------
    params : dict
        The project's parameters (``Project.model_dump``); ``project.commissioning`` is read.
    year : int or None
        The year asked for (``--year``), or None for the default.
    source : str
        The project's file, named in an error.

    Returns
    -------
    int
        The calendar year whose dates the scheme rules are read on.

    Raises
    ------
    InputError
        For a year outside 2000 to 2100, or a commissioning date after the end of the chosen year.
    """
    if year is not None and not FIRST_YEAR <= year <= LAST_YEAR:
        raise InputError("--year", str(year), f"an assessment year from {FIRST_YEAR} to {LAST_YEAR}")
    commissioning = as_date(params["project"].get("commissioning", ""))
    chosen = assessment_year(commissioning, year)
    if commissioning is not None and commissioning > dt.date(chosen, 12, 31):
        raise InputError(
            source,
            "project.commissioning",
            f"a date in or before the assessment year {chosen} (the plant is placed in service "
            f"{commissioning.isoformat()}; choose --year {assessment_year(commissioning, None)} or later)",
        )
    return chosen


def basis_of(scheme: Scheme, inventory: Inventory) -> tuple[str, str]:
    """(demand activity, product) of a scheme's basis.

    The delivered product where the rulebook counts delivery (the project's own reference, as far as it models
    it), else the plant gate or the hydrogen plant's gate.

    Parameters
    ----------
    scheme : Scheme
        The rulebook read (its ``basis``: delivered, product or hydrogen_production).
    inventory : Inventory
        The project's inventory.

    Returns
    -------
    tuple of (str, str)
        The activity key whose one unit is the scheme's basis, and its product (ammonia or hydrogen).
    """
    if scheme.basis == "delivered":
        return inventory.reference, inventory.reference_product
    if scheme.basis == "product":
        return inventory.gate, inventory.product
    return inventory.hydrogen, "hydrogen"


def scheme_reading(prepared: Prepared, scheme: Scheme) -> Reading:
    """The scheme's rules on this project before the threshold: counted electricity, findings, versions.

    Parameters
    ----------
    prepared : Prepared
        The prepared project (its inventory, parameters, period and matching).
    scheme : Scheme
        The rulebook read.

    Returns
    -------
    Reading
        As ``read_rules`` gives it.
    """
    reading = prepared.readings.get(scheme.id)  # read once per prepared project and scheme, never changed once made
    if reading is None:
        reading = prepared.readings[scheme.id] = read_rules(
            scheme, prepared.inventory, prepared.params, prepared.period, prepared.matching
        )
    return reading


def read_rules(
    scheme: Scheme, inventory: Inventory, params: dict, period: Period, matching: dict | None = None
) -> Reading:
    """The scheme's rules read on ``period``'s dates, before the threshold.

    The electricity counted at zero and charged as grid electricity, the findings (eligibility, electricity,
    dates, boundary) and the rule versions used. Used by every solver (bw2calc, stacked, Monte Carlo draws) so
    that they read the rules alike.

    Parameters
    ----------
    scheme : Scheme
        The rulebook read.
    inventory : Inventory
        The project's inventory (electricity sources and kinds, the stages modelled).
    params : dict
        The project's parameters (``Project.model_dump``).
    period : Period
        The assessment period whose dates the rules are read on.
    matching : dict or None
        Source name -> the interval of a time series that shows its generation.

    Returns
    -------
    Reading
        Counted-zero and charged-as-grid electricity, the findings in the order eligibility, electricity,
        dates, boundary, and the rulebook's and rules' versions.

    References
    ----------
    .. [1] The order of the steps and the rules applied: ``carbonledger.core.verdicts`` and the rulebooks of
       ``factors/schemes``.
    """
    reading = electricity_reading(
        scheme, params, inventory.electricity_sources, inventory.electricity_kinds, period, matching
    )
    renewable = renewable_energy_findings(scheme, params, reading, inventory.electricity_sources, matching)
    reading.findings = eligibility_findings(scheme, params, period) + renewable + reading.findings
    commissioning = as_date(params["project"].get("commissioning", ""))
    if commissioning is not None and period.end < commissioning:
        reading.findings.append(
            Finding(
                "dates",
                NOTE,
                f"the plant is not in operation in {period.label()} (commissioning {commissioning.isoformat()}): the "
                f"rules are read on {period.label()}'s dates; use --year for an operating year",
            )
        )
    present = {inventory.activities[key].stage for key in inventory.activities}
    reading.findings += boundary_findings(
        scheme,
        present,
        inventory.reference_product,
        inventory.product,
        params["project"]["boundary"],
        params["project"],
    )
    if scheme.version:
        reading.versions.insert(0, scheme.version)
    return reading


def threshold_finding(scheme: Scheme, value: float) -> Finding:
    """The value against the tiers: the tier met (its limit and source), or the loosest limit missed.

    Parameters
    ----------
    scheme : Scheme
        The rulebook whose thresholds apply.
    value : float
        The scheme's value, in the scheme's unit (``scheme.unit``).

    Returns
    -------
    Finding
        Step ``threshold``: met with the tier and its source, or not met against the loosest limit.

    References
    ----------
    .. [1] 26 U.S.C. 45V(b)(2)(A) to (D): tiers at 4, 2.5, 1.5 and 0.45 kg CO2e/kg H2.
    .. [2] Directive (EU) 2018/2001 Art. 29a(1) as amended by Directive (EU) 2023/2413 (70 % saving) and
       Delegated Regulation (EU) 2023/1185, Annex (comparator 94 g CO2e/MJ): 28.2 g CO2e/MJ; the same limit for
       low-carbon fuels, Directive (EU) 2024/1788 and Delegated Regulation (EU) 2025/2359.
    .. [3] UK Low Carbon Hydrogen Standard, version 4: 20 g CO2e/MJ LHV (secondary).
    .. [4] Basic Hydrogen Strategy (June 2023): 3.4 kg CO2e/kg H2 and 0.84 kg CO2e/kg NH3.
    """
    tier = scheme.tier_met(value)
    unit = scheme.unit
    if tier is not None:
        operator = "<=" if tier.inclusive else "<"
        return Finding(
            "threshold",
            MET,
            f"value {figure(value)} {unit} {operator} {tier.limit:g}: {tier.tier} "
            f"[{grade_note(tier.source, tier.grade)}]",
        )
    loosest = scheme.loosest()
    operator = "<=" if loosest.inclusive else "<"
    return Finding(
        "threshold",
        NOT_MET,
        f"value {figure(value)} {unit} not {operator} {loosest.limit:g} ({loosest.tier}) "
        f"[{grade_note(loosest.source, loosest.grade)}]",
    )


def judged(scheme: Scheme, value: float, findings: list[Finding]) -> dict:
    """The verdict of a scheme value under the scheme's findings.

    A value under the limit qualifies only when no rule is broken or open; a not-eligible check has no margin,
    tier or threshold sentence; an undetermined one says how much room the terms it cannot judge have.

    Parameters
    ----------
    scheme : Scheme
        The rulebook whose thresholds apply.
    value : float
        The scheme's value, in the scheme's unit.
    findings : list of Finding
        The scheme's findings before the threshold (``Reading.findings``).

    Returns
    -------
    dict
        ``status``, ``reasons``, ``passes``, ``tier``, ``limit`` and ``margin`` (limit - value, in the
        scheme's unit), as ``Check`` takes them.
    """
    verdict = verdict_of(scheme, value, findings)
    status = verdict["status"]
    if status == Status.UNDETERMINED:
        room = (
            f"qualifies if what cannot be judged adds at most {figure(verdict['margin'])} {scheme.unit} and meets its "
            "rule"
        )
        findings = [
            Finding(f.step, f.outcome, f"{f.text}; {room}", f.charged)
            if f.outcome == UNKNOWN and f.step == "boundary"
            else f
            for f in findings
        ]
    return {**verdict, "reasons": ordered_reasons(status, findings, threshold_finding(scheme, value))}


def verdict_of(scheme: Scheme, value: float, findings: list[Finding]) -> dict:
    """The status of a scheme value under the scheme's findings, without the sentences (``judged`` adds them).

    Parameters
    ----------
    scheme : Scheme
        The rulebook whose thresholds apply.
    value : float
        The scheme's value, in the scheme's unit.
    findings : list of Finding
        The scheme's findings before the threshold (``Reading.findings``).

    Returns
    -------
    dict
        ``status``, ``passes`` (qualifies only), ``tier`` (only when it qualifies), ``limit`` (the loosest) and
        ``margin`` (limit - value, in the scheme's unit; None when not eligible).

    References
    ----------
    .. [1] The order of the steps: ``carbonledger.core.verdicts.status_of``.
    """
    verdict = scheme.evaluate(value)
    status = status_of(findings, verdict["passes"])
    verdict["status"] = status
    verdict["passes"] = status == Status.QUALIFIES
    if status != Status.QUALIFIES:
        verdict["tier"] = None
    if status == Status.NOT_ELIGIBLE:
        verdict["margin"] = None
    return verdict


def scheme_characterisation(vector, scheme: Scheme):
    """A scheme's GWP vector; stored biogenic CO2 counts -1 only where its rulebook nets it.

    Parameters
    ----------
    vector : ndarray
        The scheme's GWP set as ``characterisation`` gives it: kg CO2e per kg of each flow, (flows,) or
        (draws, flows).
    scheme : Scheme
        The rulebook read (``nets_stored_biogenic_co2``).

    Returns
    -------
    ndarray
        ``vector`` itself, or a copy with -1 for ``co2_biogenic_stored``.
    """
    if not scheme.nets_stored_biogenic_co2:
        return vector
    netted = np.array(vector, dtype=float, copy=True)
    netted[..., list(FLOWS).index("co2_biogenic_stored")] = -1.0
    return netted


def scheme_value(
    scheme: Scheme,
    inventory: Inventory,
    keys: list[str],
    flow_keys,
    reading: Reading,
    vector,
    contributions,
    supply,
    figures: tuple,
    params: dict,
):
    """The scheme's value per unit of its basis: the one sum for a score (numbers) and Monte Carlo draws (arrays).

    Own emissions of the activities the scheme counts, plus failing electricity at the grid's intensity, in the
    scheme's quantity, plus a producer's declared e_td where it counts.

    Parameters
    ----------
    scheme : Scheme
        The rulebook read.
    inventory : Inventory
        The project's inventory.
    keys : list of str
        Activity keys in matrix column order.
    flow_keys : sequence of str
        Flow keys in matrix row order.
    reading : Reading
        The scheme's rules read on the project (``read_rules``).
    vector : ndarray
        The scheme's characterisation (``scheme_characterisation``), kg CO2e per kg of each flow.
    contributions : ndarray
        kg CO2e by (..., flow, activity) per basis unit under ``vector``.
    supply : ndarray
        Units of each activity per basis unit, (..., activity).
    figures : tuple
        (basis product, hydrogen LHV in MJ/kg, ammonia LHV in MJ/kg, hydrogen mass fraction in kg H2/kg NH3).
    params : dict
        The project's parameters (``Project.model_dump``).

    Returns
    -------
    float or ndarray
        The value in the scheme's quantity (``scheme.quantity``: kg CO2e/kg H2, g CO2e/MJ, ...).

    References
    ----------
    .. [1] Commission Delegated Regulation (EU) 2023/1185, Annex Part A: E = e_i + e_p + e_td + e_u - e_ccs, and
       point 6 (electricity).
    """
    own = (contributions * ~scheme_mask(scheme, inventory, keys, reading)).sum(axis=(-2, -1))
    grid_kg = {
        grid: unit_intensity(inventory, grid, flow_keys, vector) for grid in set(reading.charged_as_grid.values())
    }
    total = own + grid_charge(reading, keys, supply, grid_kg)
    basis_product, hydrogen_lhv, ammonia_lhv, fraction = figures
    return intensities(total, basis_product, hydrogen_lhv, ammonia_lhv, fraction)[scheme.quantity] + declared_addition(
        scheme, inventory, params
    )


def _rescored_check(prepared: Prepared, scheme: Scheme, parameter: str, method: str) -> Check:
    """The scheme's check of the project with its co-product method set to ``method`` (a full rescore)."""
    data = prepared.project.model_dump()
    section, name = parameter.split(".")
    data[section][name] = method
    variant = validate_project(data, prepared.source)
    ready = prepare(
        variant,
        prepared.factor_set,
        gwp=prepared.gwp,
        schemes=[scheme.id],
        source=prepared.source,
        boundary=prepared.params["project"]["boundary"],
        project_sha256=prepared.project_sha256,
        year=prepared.period.start.year,
        matching=prepared.matching,
    )
    return scheme_checks(ready, solve_with_bw2calc(ready))[0]


@dataclass(frozen=True)
class CoProductRule:
    """What a scheme's co-product rule asks of a project: the method it requires, the project's own, and
    whether the route can rescore with it (``rescore``), keeps an upper bound (``upper_bound``: the project
    gives the co-product no burden) or cannot apply it (``missing``: what is lacking)."""

    co_product: str
    required: str
    method: str
    parameter: str
    rescore: bool
    upper_bound: bool
    missing: str

    @property
    def differs(self) -> bool:
        return self.required not in ("not_stated", self.method)


def co_product_rule(scheme: Scheme, params: dict) -> CoProductRule | None:
    """The co-product rule of ``scheme`` read on a project (None: the route has no co-product).

    The one decision that score (``co_product_checks``) and the Monte Carlo (``analyses.uncertainty.evaluate``)
    take.

    Parameters
    ----------
    scheme : Scheme
        The rulebook read (its ``co_products`` section).
    params : dict
        The project's parameters (``Project.model_dump``): the route and the project's co-product method.

    Returns
    -------
    CoProductRule or None
        The method required, the project's own, and whether the route can rescore with it.

    References
    ----------
    .. [1] Commission Delegated Regulation (EU) 2023/1185, Annex Part A (co-products: energy content; economic
       value without energy content; system expansion for rigid processes), from memory.
    .. [2] ISO/TS 19870:2023, co-product handling is a choice the methodology or scheme fixes (from memory).
    """
    route = HYDROGEN_ROUTES.get(params["hydrogen"]["route"])
    co = route.co_product if route else None
    if co is None:
        return None
    section, name = co.parameter.split(".")
    method = params[section][name]
    book = scheme.co_products
    required = book.for_co_product(co.carries_energy, co.rigid) if book else "not_stated"
    can = required in co.methods and not co.missing(params, required)
    missing = (
        ""
        if can
        else (
            f"the project lacks {co.missing(params, required)}"
            if required in co.methods
            else f"the route cannot apply {required}"
        )
    )
    return CoProductRule(co.name, required, method, co.parameter, can, method == "none", missing)


def co_product_checks(prepared: Prepared, checks: list[Check]) -> list[Check]:
    """Each check under its rulebook's co-product rule (the headline keeps the project's choice).

    Where the rulebook states a rule that differs from the project's method and the route can apply
    it, the scheme value is rescored with that rule; where the route cannot (or the project lacks the
    data), the value keeps the project's method and the status is undetermined, saying why; a scheme
    that does not cover the route keeps the project's method. Every check states what was done
    under ``co_products``.

    Parameters
    ----------
    prepared : Prepared
        The prepared project.
    checks : list of Check
        The checks under the project's own co-product method (``scheme_checks``).

    Returns
    -------
    list of Check
        The same checks, rescored or made undetermined where the rule requires, each with ``co_products``.

    References
    ----------
    .. [1] ISO/TS 19870:2023, co-product handling (subdivision, system expansion, allocation) is a
       choice the methodology or scheme fixes; results state it (from memory).
    """
    by_id = {scheme.id: scheme for scheme in prepared.chosen}
    return [co_product_check(prepared, by_id[check.scheme], check) for check in checks]


def co_product_check(prepared: Prepared, scheme: Scheme, check: Check) -> Check:
    """One check under its rulebook's co-product rule (``co_product_checks``), stating under
    ``co_products`` what was done.

    Parameters
    ----------
    prepared : Prepared
        The prepared project.
    scheme : Scheme
        The check's rulebook.
    check : Check
        The check under the project's own co-product method.

    Returns
    -------
    Check
        The check amended, rescored or made undetermined.
    """
    book = scheme.co_products
    info: dict = {
        "scheme_rule": book.rule if book else "not_stated",
        "source": book.source if book else "",
        "from_memory": book.from_memory if book else False,
    }
    rule = co_product_rule(scheme, prepared.params)
    if rule is None:
        return amended(check, co_products={**info, "co_product": "", "applied": "no co-product"})
    method, required = rule.method, rule.required
    info.update({"co_product": rule.co_product, "scheme_rule": required, "project_method": method})
    if not rule.differs:
        why = (
            "the rulebook states no co-product rule: the project's method is used"
            if required == "not_stated"
            else "the project's method is the scheme's rule"
        )
        return amended(check, co_products={**info, "applied": method, "note": why})
    if check.status == Status.NOT_ELIGIBLE:
        why = "the scheme does not cover this route: its rule is not applied"
        return amended(check, co_products={**info, "applied": method, "note": why})
    if rule.upper_bound and check.status == Status.QUALIFIES:
        why = (
            f"the project gives the {rule.co_product} no share of the burden, so the value is an upper bound of "
            f"the scheme's {required} "
            "(an allocation or a credit for the displaced product can only lower it): it qualifies under the "
            "scheme's rule too, at this tier or a better one"
        )
        return amended(check, co_products={**info, "applied": method, "note": why})
    if rule.rescore:
        rescored = _rescored_check(prepared, scheme, rule.parameter, required)
        why = f"scheme value rescored with {required}; the headline keeps the project's {method}"
        return amended(rescored, co_products={**info, "applied": required, "note": why})
    sentence = (
        f"cannot be judged: co-products: the rulebook requires {required} for the {rule.co_product} "
        f"({info['source']}); {rule.missing}; the value uses the project's {method}"
    )
    return amended(
        check,
        status=Status.UNDETERMINED.value,
        passes=False,
        tier=None,
        reasons=[sentence, *check.reasons],
        co_products={**info, "applied": method, "note": sentence},
    )


def amended(check: Check, **changes) -> Check:
    """A copy of a scheme check with some fields changed (as ``model_copy(update=...)``, the fields set shared).

    Parameters
    ----------
    check : Check
        A check of ``scheme_checks``.
    **changes
        Field name -> new value, of the field's type.

    Returns
    -------
    Check
        The copy; ``check`` is unchanged.
    """
    values = dict(check.__dict__)
    values.update(changes)
    if "co_products" in changes:  # text and truth values: the checks that state the same hold one dict
        values["co_products"] = CO_PRODUCT_STATEMENTS.setdefault(
            tuple(changes["co_products"].items()), changes["co_products"]
        )
    fields = check.model_fields_set | changes.keys()
    return constructed(Check, values, CHECK_AMENDED if fields == CHECK_AMENDED else fields)


def scheme_checks(prepared: Prepared, solutions: dict) -> list[Check]:
    """Each chosen scheme's value and verdict under its own rulebook, from solved inventories.

    Parameters
    ----------
    prepared : Prepared
        The prepared project.
    solutions : dict of str to Solution
        The solved inventories by demand activity key.

    Returns
    -------
    list of Check
        One check per chosen scheme, in rulebook order: value in the scheme's unit, status, reasons, tier and
        margin.
    """
    period = prepared.period.label()
    return [check_of(scheme, value, reading, period) for scheme, value, reading in scheme_values(prepared, solutions)]


def scheme_values(prepared: Prepared, solutions: dict) -> list[tuple[Scheme, float, Reading]]:
    """Each chosen scheme's value under its own rulebook, with the reading of its rules.

    Parameters
    ----------
    prepared : Prepared
        The prepared project.
    solutions : dict of str to Solution
        The solved inventories by demand activity key.

    Returns
    -------
    list of tuple
        (scheme, value in the scheme's unit, ``Reading``) per chosen scheme, in rulebook order.

    References
    ----------
    .. [1] Commission Delegated Regulation (EU) 2023/1185, Annex Part A: E = e_i + e_p + e_td + e_u - e_ccs
       (``scheme_value``).
    """
    inventory = prepared.inventory
    keys = prepared.matrices.activity_keys
    values = []
    for scheme in prepared.chosen:
        reading = scheme_reading(prepared, scheme)
        basis_demand, basis_product = basis_of(scheme, inventory)
        vector = scheme_characterisation(prepared.per_gwp[scheme.gwp], scheme)
        solution = solutions[basis_demand]
        figures = (basis_product, prepared.hydrogen_lhv, prepared.ammonia_lhv, prepared.fraction)
        value = scheme_value(
            scheme,
            inventory,
            keys,
            prepared.matrices.flow_keys,
            reading,
            vector,
            solution.contributions(vector),
            solution.supply,
            figures,
            prepared.params,
        )
        values.append((scheme, float(value), reading))
    return values


def scheme_check_fields(scheme: Scheme) -> dict:
    """What every check of a scheme states whatever the project: its names, units, grade and file.

    Made once per rulebook object (rulebooks are frozen) and shared by its checks' values.

    Parameters
    ----------
    scheme : Scheme
        The rulebook.

    Returns
    -------
    dict
        Check field -> value: scheme, name, quantity, basis, boundary, gwp_basis, electricity_rule, unit, note,
        from_memory (the rulebook or a threshold), grade, user_rulebook, rulebook_file.
    """
    held = SCHEME_FIELDS.get(id(scheme))
    if held is None or held[0] is not scheme:
        held = SCHEME_FIELDS[id(scheme)] = (
            scheme,
            {
                "scheme": scheme.id,
                "name": scheme.name,
                "quantity": scheme.quantity,
                "basis": scheme.basis,
                "boundary": scheme.boundary,
                "gwp_basis": scheme.gwp,
                "electricity_rule": scheme.electricity,
                "unit": scheme.unit,
                "note": scheme.note,
                "from_memory": scheme.from_memory or any(t.from_memory for t in scheme.thresholds),
                "grade": str(scheme.grade),
                "user_rulebook": bool(scheme.user_file),
                "rulebook_file": scheme.user_file,
            },
        )
    return held[1]


def check_of(scheme: Scheme, value: float, reading: Reading, period: str) -> Check:
    """A scheme's check of one project: its value judged under the reading's findings (``judged``).

    Parameters
    ----------
    scheme : Scheme
        The rulebook read.
    value : float
        The scheme's value, in the scheme's unit.
    reading : Reading
        The scheme's rules read on the project (``read_rules``).
    period : str
        The assessment period's label (a calendar year).

    Returns
    -------
    Check
        The check, every field of the type ``Check`` validates to (made without validating: a portfolio makes many).
    """
    verdict = judged(scheme, value, reading.findings)
    values = {
        **scheme_check_fields(scheme),
        "limit": float(verdict["limit"]),
        "value": value,
        "passes": bool(verdict["passes"]),
        "margin": None if verdict["margin"] is None else float(verdict["margin"]),
        "tier": verdict["tier"],
        "electricity_matching": None,
        "status": str(verdict["status"]),
        "reasons": list(verdict["reasons"]),
        "assessment_period": period,
        "rule_versions": list(reading.versions),
        "electricity_counted_zero": sorted(reading.counted_zero),
        "electricity_charged_as_grid": dict(sorted(reading.charged_as_grid.items())),
        "co_products": {},
    }
    return constructed(Check, {name: values[name] for name in CHECK_FIELDS}, CHECK_SET)


def factor_rows(used: dict) -> list[Factor]:
    """The factor rows and reference values used, by id: rows are frozen, so results cite them as they are.

    Parameters
    ----------
    used : dict
        Factor or reference id -> its row, as ``NumericInputs.used`` records them.

    Returns
    -------
    list of Factor
        The rows in id order.
    """
    return [used[key] for key in sorted(used)]


def _plain(value):
    """Figures as JSON-ready floats and text."""
    if isinstance(value, dict):
        return {key: _plain(item) for key, item in value.items()}
    return value if isinstance(value, str) else float(value)


def flows_apart(kg_by_flow, flow_keys: list[str]) -> tuple[dict[str, float], dict[str, float]]:
    """The flows counted apart from the CO2e total: kg of NH3 and H2 (not greenhouse gases in the total)
    and kg of biogenic CO2 released or captured and stored, per functional unit.

    Parameters
    ----------
    kg_by_flow : ndarray
        kg of each flow per functional unit, in the order of ``flow_keys``.
    flow_keys : list of str
        The flows of the inventory.

    Returns
    -------
    tuple of dict
        (non-greenhouse flows -> kg, biogenic flows -> kg).
    """
    kg = {flow: float(value) for flow, value in zip(flow_keys, kg_by_flow, strict=True)}
    return {f: kg[f] for f in NON_GHG_FLOWS if f in kg}, {f: kg[f] for f in BIOGENIC_FLOWS if f in kg}


def exchange_rows(inventory: Inventory, supply: dict) -> list[ExchangeRow]:
    """Every exchange of the inventory with its activity's supply per functional unit, as the result lists them.

    Parameters
    ----------
    inventory : Inventory
        The project's activities and exchanges.
    supply : dict of str to float
        Units of each activity's product per functional unit.

    Returns
    -------
    list of ExchangeRow
        One row per exchange, in inventory order.
    """
    return [
        constructed(  # plain text and floats made here: nothing to validate (a portfolio makes many)
            ExchangeRow,
            {
                "activity": activity.key,
                "stage": activity.stage,
                "kind": exchange.kind,
                "input": exchange.input,
                "label": exchange.label,
                "amount": float(exchange.amount),
                "unit": exchange.unit,
                "activity_supply": float(supply[activity.key]),
            },
            EXCHANGE_FIELDS,
        )
        for activity in inventory.activities.values()
        for exchange in activity.exchanges
    ]


def assemble(prepared: Prepared, solutions: dict) -> ScoreResult:
    """The result of one project from its solved inventories: the one place figures are summed.

    Parameters
    ----------
    prepared : Prepared
        The prepared project.
    solutions : dict of str to Solution
        The solved inventories by demand activity key (``solve_with_bw2calc`` or ``solve_stacked``).

    Returns
    -------
    ScoreResult
        kg CO2e per functional unit, by stage, gas and activity, the intensities, the scheme checks, the
        exchanges and the factors used.

    Raises
    ------
    InputError
        When a figure is NaN or infinite (``finite_result``).

    References
    ----------
    .. [1] Sand, M. et al. (2023), A multi-model assessment of the Global Warming Potential of hydrogen,
       Communications Earth & Environment 4, 203: GWP100 11.6 of leaked hydrogen (``gwp_indirect.h2``).
    """
    params, inventory = prepared.params, prepared.inventory
    main = solutions[inventory.reference]
    figures, contributions = headline_figures(prepared, solutions)
    keys = prepared.matrices.activity_keys
    supply = dict(zip(keys, main.supply, strict=True))
    heating = {
        "hydrogen_lhv": prepared.hydrogen_lhv,
        **({"ammonia_lhv": prepared.ammonia_lhv} if inventory.product == "ammonia" else {}),
    }
    return finite_result(
        ScoreResult(
            **result_identity(prepared),
            **figures,
            hydrogen_kg_per_unit=float(supply[inventory.hydrogen]),
            gate_product_per_unit=float(supply[inventory.gate]),
            hydrogen_mass_fraction=float(prepared.fraction),
            **flows_counted_apart(prepared, main.inventory.sum(axis=1)),
            by_activity={key: float(v) for key, v in zip(keys, contributions.sum(axis=0), strict=True)},
            heating_values_mj_per_kg=heating,
            factors_used=factor_rows(prepared.inputs.used),
            checks=co_product_checks(prepared, scheme_checks(prepared, solutions)),
            exchanges=exchange_rows(inventory, supply),
            parameters=params,
            delivery=_plain(inventory.delivery),
            co_products=_plain(inventory.co_products),
        )
    )


def headline_figures(prepared: Prepared, solutions: dict) -> tuple[dict, np.ndarray]:
    """The headline of a result: kg CO2e per functional unit in total, as intensities, at the hydrogen plant's
    gate, by stage and by gas, under the headline GWP set.

    Parameters
    ----------
    prepared : Prepared
        The prepared project.
    solutions : dict of str to Solution
        The solved inventories by demand activity key.

    Returns
    -------
    tuple
        (``ScoreResult`` field -> value: total, intensity, hydrogen_production_kg_co2e_per_kg_h2, by_stage,
        by_gas; the contributions of the functional unit, kg CO2e by flow and activity).
    """
    inventory, headline = prepared.inventory, prepared.headline
    contributions = solutions[inventory.reference].contributions(headline)
    total = float(contributions.sum())
    stage_sums, gas_sums = stage_and_gas_sums(
        contributions, prepared.matrices.activity_keys, prepared.matrices.flow_keys, inventory
    )
    every = intensities(
        total, inventory.reference_product, prepared.hydrogen_lhv, prepared.ammonia_lhv, prepared.fraction
    )
    return {
        "total": total,
        "intensity": Intensity(**{k: every[k] for k in Intensity.model_fields}),
        "hydrogen_production_kg_co2e_per_kg_h2": float(solutions[inventory.hydrogen].contributions(headline).sum()),
        "by_stage": {stage: float(value) for stage, value in stage_sums.items()},
        "by_gas": {flow: float(value) for flow, value in gas_sums.items()},
    }, contributions


def figures_of(prepared: Prepared, solutions: dict) -> ResultFigures | None:
    """The figures a portfolio needs of a project (``ResultFigures``), made without the rest of a result:
    the headline as ``assemble`` gives it, and each check's value and verdict as ``scheme_checks`` gives
    them, without the sentences. None when a scheme's co-product rule differs from the project's method
    (only ``assemble``'s ``co_product_checks`` decides that check).

    Parameters
    ----------
    prepared : Prepared
        The prepared project.
    solutions : dict of str to Solution
        The solved inventories by demand activity key.

    Returns
    -------
    ResultFigures or None
        The figures, equal to ``ResultFigures.of(assemble(prepared, solutions))``.

    Raises
    ------
    InputError
        When a figure is NaN or infinite (``finite_result``).
    """
    if any(
        (rule := co_product_rule(scheme, prepared.params)) is not None and rule.differs for scheme in prepared.chosen
    ):
        return None
    identity = result_identity(prepared)
    figures, _ = headline_figures(prepared, solutions)
    flows_counted_apart(prepared, solutions[prepared.inventory.reference].inventory.sum(axis=1))  # reads its factors
    checks = tuple(
        check_figures(scheme, value, reading) for scheme, value, reading in scheme_values(prepared, solutions)
    )
    return finite_result(
        ResultFigures(
            **{name: value for name, value in identity.items() if name in ResultFigures.__dataclass_fields__},
            **figures,
            checks=checks,
            parameters=prepared.params,
            factors_used=tuple(factor_rows(prepared.inputs.used)),
        )
    )


def check_figures(scheme: Scheme, value: float, reading: Reading) -> CheckFigures:
    """A check's value and verdict as ``check_of`` makes them, without the sentences.

    Parameters
    ----------
    scheme : Scheme
        The rulebook read.
    value : float
        The scheme's value, in the scheme's unit.
    reading : Reading
        The scheme's rules read on the project (``read_rules``).

    Returns
    -------
    CheckFigures
        Scheme id, value, unit, loosest limit, passes, status, tier and whether the rulebook is from memory.
    """
    verdict = verdict_of(scheme, value, reading.findings)
    return CheckFigures(
        scheme.id,
        value,
        scheme.unit,
        float(verdict["limit"]),
        bool(verdict["passes"]),
        str(verdict["status"]),
        verdict["tier"],
        scheme_check_fields(scheme)["from_memory"],
    )


def result_identity(prepared: Prepared) -> dict:
    """What a result says of the project scored and how: names, file, year, boundary, units, GWP and factor set.

    Parameters
    ----------
    prepared : Prepared
        The prepared project.

    Returns
    -------
    dict
        ``ScoreResult`` field -> value.
    """
    params, inventory, factor_set = prepared.params, prepared.inventory, prepared.factor_set
    return {
        "carbonledger_version": __version__,
        "caution": CAUTION,
        "project": params["project"]["name"],
        "project_file": prepared.source,
        "project_sha256": prepared.project_sha256,
        "assessment_year": prepared.period.start.year,
        "product": inventory.product,
        "boundary": params["project"]["boundary"],
        "functional_unit": inventory.functional_unit,
        "reference_product": inventory.reference_product,
        "unit": FUNCTIONAL_UNITS[inventory.reference_product][1],
        "gwp_basis": prepared.gwp,
        "factor_set": FactorSetRef(name=factor_set.name, sha256=factor_set.sha256),
    }


LEAKED_HYDROGEN_GWP = "gwp_indirect.h2"  # read only where hydrogen leaks


def flows_counted_apart(prepared: Prepared, kg_by_flow) -> dict:
    """The result's flows outside the CO2e total: hydrogen leaked (kg, and its indirect kg CO2e), the
    other non-greenhouse flows and the biogenic CO2 released and stored, per functional unit.

    Parameters
    ----------
    prepared : Prepared
        The prepared project (its inputs give the GWP of leaked hydrogen).
    kg_by_flow : ndarray
        kg of each flow per functional unit, in the order of the matrices' flow keys.

    Returns
    -------
    dict
        ``ScoreResult`` field -> value: hydrogen_leakage_kg, hydrogen_leakage_kg_co2e, non_ghg_kg,
        biogenic_co2_kg.

    References
    ----------
    .. [1] Sand, M. et al. (2023), A multi-model assessment of the Global Warming Potential of hydrogen,
       Communications Earth & Environment 4, 203: GWP100 11.6 of leaked hydrogen (``gwp_indirect.h2``).
    """
    non_ghg, biogenic = flows_apart(kg_by_flow, prepared.matrices.flow_keys)
    leakage = non_ghg.get("h2", 0.0)
    leakage_co2e = leakage * prepared.inputs.factor(LEAKED_HYDROGEN_GWP, "kg CO2e/kg H2") if leakage > 0 else 0.0
    return {
        "hydrogen_leakage_kg": leakage,
        "hydrogen_leakage_kg_co2e": float(leakage_co2e),
        "non_ghg_kg": non_ghg,
        "biogenic_co2_kg": {
            "released": biogenic.get("co2_biogenic", 0.0),
            "captured_and_stored": biogenic.get("co2_biogenic_stored", 0.0),
        },
    }


def refuse_non_finite(source: str, field: str, value: float | None) -> None:
    """A total or scheme value that is NaN or infinite is an error naming the project, never an output.

    Parameters
    ----------
    source : str
        The project's file, named in the error.
    field : str
        The figure's name in the result (e.g. ``total``, ``by_stage.hydrogen_production``).
    value : float or None
        The figure; None is accepted.

    Returns
    -------
    None

    Raises
    ------
    InputError
        When ``value`` is NaN or infinite.
    """
    if value is not None and not math.isfinite(value):
        raise InputError(
            source,
            field,
            f"a finite result (the inputs give {value}; look for an infinite, missing or huge input or factor)",
        )


def finite_result(result: ScoreResult) -> ScoreResult:
    """The result itself when its total, intensities, stages, gases and scheme values are all finite.

    Parameters
    ----------
    result : ScoreResult
        The assembled result.

    Returns
    -------
    ScoreResult
        ``result``, unchanged.

    Raises
    ------
    InputError
        Naming the first figure that is NaN or infinite.
    """
    refuse_non_finite(result.project_file, "total", result.total)
    for key, value in result.intensity.model_dump().items():
        refuse_non_finite(result.project_file, f"intensity.{key}", value)
    refuse_non_finite(
        result.project_file, "hydrogen_production_kg_co2e_per_kg_h2", result.hydrogen_production_kg_co2e_per_kg_h2
    )
    for group, values in (("by_stage", result.by_stage), ("by_gas", result.by_gas)):
        for key, value in values.items():
            refuse_non_finite(result.project_file, f"{group}.{key}", value)
    for check in result.checks:
        refuse_non_finite(result.project_file, f"check {check.scheme}", check.value)
    return result


def _check_agreement(prepared: Prepared, solutions: dict, bw_score: float, what: str) -> None:
    fast = float(solutions[prepared.inventory.reference].contributions(prepared.headline).sum())
    refuse_non_finite(prepared.source, "total", fast)
    refuse_non_finite(prepared.source, "total", bw_score)
    if not np.isclose(fast, bw_score, **AGREEMENT):
        raise RuntimeError(f"{what} disagrees with bw2calc for {prepared.source}: {fast} vs {bw_score}")


def solve_with_bw2calc(prepared: Prepared) -> dict:
    """Solve one prepared project with bw2calc; the numpy characterisation must agree with it.

    Parameters
    ----------
    prepared : Prepared
        The prepared project.

    Returns
    -------
    dict of str to Solution
        The solved inventory by demand activity key.

    Raises
    ------
    InputError
        When the total is NaN or infinite.
    RuntimeError
        When the numpy total and bw2calc's score differ beyond rtol 1e-9.

    References
    ----------
    .. [1] Heijungs, R. and Suh, S. (2002). The Computational Structure of Life Cycle Assessment.
    """
    solutions, bw_score = solve(prepared.matrices, prepared.demands, prepared.headline)
    _check_agreement(prepared, solutions, bw_score, "characterisation")
    return solutions


def solve_stacked(prepared: list[Prepared], check_with_bw2calc: bool = True, checked: set | None = None) -> list[dict]:
    """Solve many prepared projects, one stacked numpy solve per matrix structure.

    Parameters
    ----------
    prepared : list of Prepared
        The prepared projects.
    check_with_bw2calc : bool
        Also solve one member of every structure group with bw2calc; it must agree to 1e-9 (relative).
    checked : set or None
        Structure keys already checked this way (a portfolio solved a chunk at a time checks each
        structure once); the new ones are added to it.

    Returns
    -------
    list of dict of str to Solution
        The solved inventories by demand activity key, in the order of ``prepared``.

    Raises
    ------
    InputError
        When a checked total is NaN or infinite.
    RuntimeError
        When a checked member disagrees with bw2calc.

    References
    ----------
    .. [1] Heijungs, R. and Suh, S. (2002). The Computational Structure of Life Cycle Assessment.
    """
    groups: dict[tuple, list[int]] = {}
    for number, ready in enumerate(prepared):
        groups.setdefault(structure_key(ready.matrices, ready.demands), []).append(number)
    checked = set() if checked is None else checked
    solutions: list[dict] = [{}] * len(prepared)
    for key, members in groups.items():
        solved = solve_many([prepared[n].matrices for n in members], prepared[members[0]].demands)
        for number, solution in zip(members, solved, strict=True):
            solutions[number] = solution
        if check_with_bw2calc and key not in checked:
            checked.add(key)
            reference = prepared[members[0]]
            _, bw_score = solve(reference.matrices, reference.demands, reference.headline)
            _check_agreement(reference, solutions[members[0]], bw_score, "stacked solve")
    return solutions
