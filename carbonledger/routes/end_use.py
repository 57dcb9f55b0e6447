"""Delivery leg: the delivered product used (well-to-wake).

Ammonia burnt in an engine or turbine: N2O, ammonia slip (reported, not a greenhouse gas) and
pilot fuel. Hydrogen used emits no greenhouse gas (hydrogen leakage is not counted here).
"""

from __future__ import annotations

from typing import Literal

from ..errors import InputError
from ..model.project import P, Section
from ..stages import end_use
from .base import Activity, Route, SectionError
from .marine_fuels import burn_ammonia, burn_marine_fuel, fuel_factors, marine_fuels


class EndUse(Section):
    converter: Literal["engine", "turbine"] = P(description="Where the delivered ammonia is burnt")
    n2o_g_per_kg_ammonia: float = P(
        unit="g N2O/kg NH3", description="N2O formed in combustion (engine or turbine data)", ge=0
    )
    ammonia_slip_g_per_kg_ammonia: float = P(
        unit="g NH3/kg NH3", description="Ammonia passing unburnt (reported, not a GHG)", ge=0
    )
    pilot_fuel: str = P("", description="Pilot fuel (a marine fuel of the factor set); empty for none")
    pilot_fuel_energy_share: float = P(
        0.0, "fraction of fuel energy", "Share of the fuel energy from the pilot fuel", ge=0, lt=1
    )


def build(params: dict, inputs, chain) -> list[Activity]:
    """Activity of the delivered product used, per unit delivered: ammonia burnt (N2O, slip, pilot fuel)
    or hydrogen used (no greenhouse gas).

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its
        field states (e.g. ``end_use.n2o_g_per_kg_ammonia`` in g N2O/kg NH3).
    inputs : NumericInputs
        Factor values (``inputs.factor``) and reference values (``inputs.molar_mass``), each recorded
        as it is used.
    chain : Chain
        What the route modules before this one left: the reference activity and its product, the place,
        shared fuel supplies (``extra``) and figures.

    Returns
    -------
    list of Activity
        The activities it adds; their exchanges are amounts per unit of each activity (t NH3 or kg H2).

    References
    ----------
    .. [1] Regulation (EU) 2023/1805 (FuelEU Maritime), Annex II: factors of the pilot fuel.
    """
    where = f"delivered {chain.place}"
    if chain.product == "hydrogen":
        use = Activity("end_use", "end_use", f"hydrogen {where}, used", "kg H2")
        use.consume(chain.reference, 1.0, "hydrogen used (no CO2; hydrogen leakage not counted)", "kg H2")
    else:
        u = params["end_use"]
        use = Activity("end_use", "end_use", f"ammonia {where}, burnt in an {u['converter']}", "t NH3")
        use.consume(chain.reference, 1.0, "ammonia burnt", "t NH3")
        burn_ammonia(use, 1000.0, u["n2o_g_per_kg_ammonia"], u["ammonia_slip_g_per_kg_ammonia"], u["converter"])
        if u["pilot_fuel"]:
            pilot = fuel_factors(inputs, u["pilot_fuel"], "", "end_use.pilot_fuel")
            pilot_kg = 1000.0 * end_use.pilot_fuel_kg_per_kg_ammonia(
                inputs.factor("heating_value.ammonia.lhv", "MJ/kg"), pilot["lhv"], u["pilot_fuel_energy_share"]
            )
            burn_marine_fuel(use, "end_use", u["pilot_fuel"], pilot, pilot_kg, "pilot fuel", chain.extra)
    chain.reference = use.key
    return [use]


def check_limits(params: dict, inputs, source: str) -> None:
    """An ``[end_use]`` section at the well-to-wake boundary, and a pilot fuel with factors in the set.

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its
        field states (e.g. ``end_use.pilot_fuel``, a fuel name).
    inputs : NumericInputs
        Factor values (``inputs.factor``) and reference values (``inputs.molar_mass``), each recorded
        as it is used.
    source : str
        The project file's name, for the error message.

    Returns
    -------
    None
        Nothing when the project is inside the limits.

    Raises
    ------
    InputError
        Naming the file, the field and what was expected, for the first limit broken.
    """
    use = params.get("end_use")
    if (
        params["project"]["boundary"] == "well-to-wake"
        and use is None
        and params["project"]["product"] == "ammonia"
        and not params.get("cracking")
    ):
        raise InputError(
            source, "end_use", "an [end_use] section (converter, N2O and ammonia slip) for boundary 'well-to-wake'"
        )
    if use and use["pilot_fuel"]:
        fuels = marine_fuels(inputs.factor_set)[:-1]
        if use["pilot_fuel"] not in fuels:
            raise InputError(
                source,
                "end_use.pilot_fuel",
                f"a marine fuel of set '{inputs.factor_set.name}' ({', '.join(fuels)}), got '{use['pilot_fuel']}'",
            )


def validate(project) -> None:
    """An ``[end_use]`` section only for ammonia, with a pilot fuel and its share together or neither.

    Parameters
    ----------
    project : Project
        The validated project (its sections as pydantic models).

    Returns
    -------
    None
        Nothing when the sections agree.

    Raises
    ------
    SectionError
        Naming the field and what was expected.
    """
    use = project.end_use
    if use is None:
        return
    if project.project.product != "ammonia":
        raise SectionError("end_use", "no [end_use] section for product 'hydrogen' (delivery is modelled for ammonia)")
    if bool(use.pilot_fuel) != (use.pilot_fuel_energy_share > 0):
        raise SectionError("end_use.pilot_fuel_energy_share", "a share above 0 together with a pilot_fuel, or neither")


ROUTE = Route(
    name="end_use",
    kind="delivery_leg",
    stages=("end_use",),
    applies=lambda params: params["project"]["boundary"] == "well-to-wake",
    build=build,
    optional_sections={"end_use": EndUse},
    validate=validate,
    check_limits=check_limits,
    description="The delivered fuel burnt or used (well-to-wake)",
)
