"""Physical reference data taken from general-purpose reference libraries, never typed in.

Molar masses come from the ``chemicals`` library (standard atomic weights). Each value is
reported with its source so that it can be listed beside the factors of a result.

References
----------
Bell, C. et al., chemicals: Chemical properties component of Chemical Engineering Design
Library (ChEDL), https://github.com/CalebBell/chemicals (atomic weights per IUPAC).
"""

from __future__ import annotations

import functools
from dataclasses import dataclass


@dataclass(frozen=True)
class ReferenceValue:
    id: str
    value: float
    unit: str
    source: str


@functools.cache
def molar_mass_g_per_mol(formula: str) -> float:
    """Molar mass of a chemical formula in g/mol, from ``chemicals.elements``."""
    from chemicals.elements import molecular_weight, simple_formula_parser

    return float(molecular_weight(simple_formula_parser(formula)))


@functools.cache
def _chemicals_version() -> str:
    from importlib.metadata import version

    return version("chemicals")


def molar_mass(formula: str) -> ReferenceValue:
    return ReferenceValue(
        id=f"reference.molar_mass.{formula.lower()}",
        value=molar_mass_g_per_mol(formula),
        unit="g/mol",
        source=f"chemicals {_chemicals_version()} (chemicals.elements.molecular_weight, IUPAC standard atomic weights)",
    )
