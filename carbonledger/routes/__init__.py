"""The route registry: every production route, supply, conversion and delivery leg, in chain order.

Adding a route or a delivery leg is one module here (its sections, exchanges, limits, metered
parameters and starter text, declared as a ``Route``) plus one line in ``REGISTRY``. The
inventory builder, project validation, metered periods, ``carbonledger init`` and lifetime
scoring loop over this list; none of them names a route.
"""

from __future__ import annotations

from . import (
    ammonia,
    ammonia_overland,
    biomethane_reforming,
    chlor_alkali,
    cracking,
    electricity,
    electrolysis,
    end_use,
    hydrogen_pipeline,
    hydrogen_truck,
    liquid_hydrogen,
    methane_pyrolysis,
    natural_gas,
    reforming,
    shipping,
)
from .base import Route

REGISTRY: tuple[Route, ...] = (
    natural_gas.ROUTE,
    electricity.ROUTE,
    reforming.STEAM_METHANE_REFORMING,
    reforming.AUTOTHERMAL_REFORMING,
    electrolysis.ROUTE,
    methane_pyrolysis.ROUTE,
    biomethane_reforming.ROUTE,
    chlor_alkali.ROUTE,
    ammonia.ROUTE,
    ammonia_overland.AMMONIA_PIPELINE,
    ammonia_overland.AMMONIA_RAIL,
    shipping.ROUTE,
    cracking.ROUTE,
    hydrogen_pipeline.ROUTE,
    hydrogen_truck.ROUTE,
    liquid_hydrogen.ROUTE,
    end_use.ROUTE,
)

HYDROGEN_ROUTES: dict[str, Route] = {route.name: route for route in REGISTRY if route.kind == "hydrogen_route"}
DELIVERY_LEGS: tuple[Route, ...] = tuple(route for route in REGISTRY if route.kind == "delivery_leg")
STAGES: tuple[str, ...] = tuple(dict.fromkeys(stage for route in REGISTRY for stage in route.stages))


def owned_sections() -> dict[str, type]:
    """Every project-file section a route module owns (name -> model), in registry order.

    Returns
    -------
    dict of str to type
        Section name -> its pydantic model (required and optional sections).
    """
    sections: dict[str, type] = {}
    for route in REGISTRY:
        sections.update(route.sections)
        sections.update(route.optional_sections)
    return sections


def routes_of(params: dict) -> list[Route]:
    """The route modules that take part in a project (at its boundary), in chain order.

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``); each route's ``applies`` reads
        which sections are there, ``hydrogen.route``, ``project.product`` and ``project.boundary``.

    Returns
    -------
    list of Route
        The registered routes whose ``applies`` is true for the project.
    """
    return [route for route in REGISTRY if route.applies(params)]


def metered_parameters(params: dict) -> dict[str, list[str]]:
    """Parameter paths scaled by metered natural gas and electricity, for a project's routes.

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``); the choice of paths depends
        on text options and sections only, not on numbers.

    Returns
    -------
    dict of str to list of str
        ``natural_gas`` and ``electricity`` -> parameter paths (``section.field``).
    """
    paths: dict[str, list[str]] = {"natural_gas": [], "electricity": ["hydrogen.conditioning_kwh_per_kg_h2"]}
    for route in routes_of(params):
        for quantity, names in route.metered(params).items():
            paths[quantity].extend(names)
    return paths
