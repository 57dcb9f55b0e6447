"""Delivery leg: hydrogen compressed into a pipeline and carried to the destination.

Builds ``hydrogen_piped`` (stage ``hydrogen_pipeline``, per kg H2 delivered): hydrogen taken in
(leaks included), compressor electricity where the hydrogen is (the project's mix, or the destination's after cracking),
hydrogen leaked (reported as
hydrogen leakage, never in a scheme value).
"""

from __future__ import annotations

from ..errors import InputError
from ..model.project import P, Section
from ..stages import hydrogen_delivery
from .base import Activity, Route, SectionError


class HydrogenPipeline(Section):
    destination: str = P("pipeline end", description="Where the pipeline delivers the hydrogen (free text)")
    length_km: float = P(unit="km", description="Pipeline length from the plant to the destination", gt=0, le=20000)
    compression_kwh_per_kg_h2: float = P(
        0.0, "kWh/kg H2", "Electricity of the compressors (inlet and boosters), from the project's mix", ge=0
    )
    leakage_share_per_100_km: float = P(
        0.0, "fraction per 100 km", "Share of the hydrogen fed in that leaks per 100 km of pipeline", ge=0, lt=1
    )


def loss_share(leg: dict):
    """Share of the hydrogen fed that leaks along the pipeline.

    Parameters
    ----------
    leg : dict
        The ``[hydrogen_pipeline]`` section (leakage as a share per 100 km, length in km).

    Returns
    -------
    float or ndarray
        Share of the intake leaked (dimensionless).
    """
    return hydrogen_delivery.pipeline_loss_share(leg["leakage_share_per_100_km"], leg["length_km"])


def build(params: dict, inputs, chain) -> list[Activity]:
    """Activity of hydrogen carried by pipeline, per kg H2 delivered: hydrogen fed in (leaks included),
    compressor electricity where the hydrogen is, hydrogen leaked.

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its
        field states (e.g. ``hydrogen_pipeline.compression_kwh_per_kg_h2`` in kWh/kg H2).
    inputs : NumericInputs
        Factor values (``inputs.factor``) and reference values (``inputs.molar_mass``), each recorded
        as it is used.
    chain : Chain
        What the route modules before this one left: the reference activity and its product, the place,
        shared fuel supplies (``extra``) and figures.

    Returns
    -------
    list of Activity
        The activities it adds; their exchanges are amounts per unit of each activity (kg H2).
    """
    leg = params["hydrogen_pipeline"]
    lost = loss_share(leg)
    pipe = Activity("hydrogen_piped", "hydrogen_pipeline", f"hydrogen, piped to {leg['destination']}", "kg H2")
    pipe.consume(
        chain.reference,
        hydrogen_delivery.intake_per_unit_delivered(lost),
        "hydrogen fed into the pipeline (leaks included)",
        "kg H2",
    )
    pipe.consume(chain.electricity, leg["compression_kwh_per_kg_h2"], "electricity, compression", "kWh")
    pipe.emit("h2", hydrogen_delivery.lost_per_unit_delivered(lost), "hydrogen leaked from the pipeline")
    chain.reference, chain.place = pipe.key, f"at {leg['destination']}"
    chain.figures["hydrogen_pipeline"] = {"loss_share": lost, "length_km": leg["length_km"]}
    return [pipe]


def check_limits(params: dict, inputs, source: str) -> None:
    """The leaks must leave hydrogen to deliver (a share below 1 over the whole pipeline).

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its
        field states (e.g. ``hydrogen_pipeline.length_km`` in km).
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
    lost = loss_share(params["hydrogen_pipeline"])
    if not lost < 1.0:
        raise InputError(
            source,
            "hydrogen_pipeline.leakage_share_per_100_km",
            f"leaks that leave hydrogen to deliver (the whole pipeline loses {lost:.0%})",
        )


def validate(project) -> None:
    """Hydrogen to carry: product hydrogen, or ammonia cracked back to hydrogen.

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
    if project.hydrogen_pipeline is not None and project.project.product == "ammonia" and project.cracking is None:
        raise SectionError(
            "hydrogen_pipeline",
            "hydrogen to carry: product 'hydrogen', or ammonia cracked back to hydrogen ([cracking])",
        )


ROUTE = Route(
    name="hydrogen_pipeline",
    kind="delivery_leg",
    stages=("hydrogen_pipeline",),
    applies=lambda params: (
        params.get("hydrogen_pipeline") is not None and params["project"]["boundary"] != "cradle-to-gate"
    ),
    build=build,
    optional_sections={"hydrogen_pipeline": HydrogenPipeline},
    validate=validate,
    check_limits=check_limits,
    description="Hydrogen compressed and carried by pipeline (well-to-tank and well-to-wake)",
)
