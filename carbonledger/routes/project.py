"""The whole project model, assembled from the sections every project has and those the
route modules of the registry own.

``load_project(path, overrides)`` reads, overrides and validates a project file and returns the
model with the file's sha256; ``validate_project(data, source)`` validates a raw dict (from a
workbook, for example) through the same model and the same one-line errors.
"""

from __future__ import annotations

import hashlib
from pathlib import Path
from typing import Literal, Optional

from pydantic import create_model, model_validator

from ..model.project import (
    Lifetime,
    P,
    ProjectInfo,
    Section,
    apply_overrides,
    parse_override,
    read_project_file,
    validate_with,
)
from . import HYDROGEN_ROUTES, REGISTRY, owned_sections
from .base import SectionError
from .electricity import Electricity

Hydrogen = create_model(
    "Hydrogen",
    __base__=Section,
    route=(Literal[tuple(HYDROGEN_ROUTES)], P(description="Hydrogen production route")),
    conditioning_kwh_per_kg_h2=(
        float,
        P(0.0, "kWh/kg H2", "Compression and purification to the delivery specification", ge=0),
    ),
)


class _ProjectRules(Section):
    """Rules across sections: the chosen route's sections present, other routes' absent, then each module's
    own rules."""

    @model_validator(mode="after")
    def _sections_fit_the_routes(self):
        route = HYDROGEN_ROUTES[self.hydrogen.route]
        for name in route.sections:
            if getattr(self, name) is None:
                raise SectionError(name, f"a [{name}] section for route '{route.name}'")
        allowed = set(route.sections) | set(route.optional_sections)
        for other in HYDROGEN_ROUTES.values():
            for name in set(other.sections) | set(other.optional_sections):
                if name not in allowed and getattr(self, name) is not None:
                    raise SectionError(name, f"no [{name}] section for route '{route.name}'")
        for module in REGISTRY:
            if module.kind != "hydrogen_route" or module is route:
                module.validate(self)
        self._lifetime_fits()
        if self.natural_gas is None and any(
            module.uses_natural_gas(self) for module in REGISTRY if module.kind != "hydrogen_route" or module is route
        ):
            raise SectionError(
                "natural_gas",
                "a [natural_gas] section with methane_emission_share and methane_emission_basis, "
                "since the project burns natural gas",
            )
        return self

    def _lifetime_fits(self) -> None:
        life = self.lifetime
        if life is None:
            return
        if (
            life.grid_trajectory_csv or life.grid_trajectory_factors
        ) and life.grid_source not in self.electricity.sources:
            raise SectionError(
                "lifetime.grid_source",
                f"the name of an electricity source ({', '.join(self.electricity.sources)}), got '{life.grid_source}'",
            )
        if bool(life.renewables_mw) != bool(life.renewables_construction_factor):
            raise SectionError(
                "lifetime.renewables_mw", "renewables_mw and renewables_construction_factor given together"
            )
        oldest = (life.stack_replacement_years or life.operating_years) - 1
        if life.efficiency_loss_per_year * oldest >= 1:
            raise SectionError(
                "lifetime.efficiency_loss_per_year",
                f"a loss that leaves some efficiency at a stack age of {oldest} years",
            )

    def uses_natural_gas(self) -> bool:
        route = HYDROGEN_ROUTES[self.hydrogen.route]
        return any(
            module.uses_natural_gas(self) for module in REGISTRY if module.kind != "hydrogen_route" or module is route
        )


_route_sections = {name: (Optional[model], None) for name, model in owned_sections().items() if name != "electricity"}
Project = create_model(
    "Project",
    __base__=_ProjectRules,
    project=(ProjectInfo, ...),
    hydrogen=(Hydrogen, ...),
    electricity=(Electricity, ...),
    **_route_sections,
    lifetime=(Optional[Lifetime], None),
)
SECTIONS: tuple[str, ...] = tuple(Project.model_fields)


def validate_project(data: dict, source: str):
    """A raw project dict (TOML, workbook) -> the validated model, or one InputError line.

    Parameters
    ----------
    data : dict
        The project as read (sections of fields, numbers in each field's unit).
    source : str
        The file's name, for the error message.

    Returns
    -------
    Project
        The validated project model.

    Raises
    ------
    InputError
        Naming the file, the field and what was expected.
    """
    return validate_with(Project, data, source)


def load_project(path: str | Path, overrides: list[str] | None = None):
    """Read, override and validate a project file; return the model and the file's sha256.

    Parameters
    ----------
    path : str or Path
        The project file (TOML).
    overrides : list of str, optional
        ``section.field=value`` texts applied before validation (``--set``).

    Returns
    -------
    tuple of (Project, str)
        The validated project and the sha256 of the file's bytes (hex).

    Raises
    ------
    InputError
        Naming the file, the field and what was expected.
    """
    data, raw = read_project_file(path)
    data.pop("uncertainty", None)  # distributions of inputs: read by the uncertainty analysis, not part of the model
    parsed = [parse_override(text) for text in overrides or []]
    # freshly read: no copy needed without overrides
    data = apply_overrides(data, parsed, str(path)) if parsed else data
    return validate_project(data, str(path)), hashlib.sha256(raw).hexdigest()
