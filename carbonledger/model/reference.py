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


ATMOSPHERE_PA = 101325.0
_AMMONIA_CAS = "7664-41-7"


@functools.cache
def _coolprop_version() -> str:
    from importlib.metadata import version

    return version("CoolProp")


@functools.cache
def ammonia_saturation_at_one_atmosphere() -> tuple[float, float]:
    """Normal boiling point (K) and latent heat of vaporisation (kJ/kg) of ammonia, from CoolProp.

    CoolProp is imported here, not at module level: it takes about two seconds to load and only
    projects with a voyage or a cracker need it.
    """
    from CoolProp.CoolProp import PropsSI

    boiling_point_k = PropsSI("T", "P", ATMOSPHERE_PA, "Q", 0, "Ammonia")
    vapour = PropsSI("H", "P", ATMOSPHERE_PA, "Q", 1, "Ammonia")
    liquid = PropsSI("H", "P", ATMOSPHERE_PA, "Q", 0, "Ammonia")
    return float(boiling_point_k), float((vapour - liquid) / 1000.0)


def ammonia_latent_heat() -> ReferenceValue:
    """Latent heat of vaporisation of ammonia at 1 atm (refrigerated cargo), kJ/kg."""
    return ReferenceValue(
        id="reference.latent_heat.ammonia",
        value=ammonia_saturation_at_one_atmosphere()[1],
        unit="kJ/kg",
        source=f"CoolProp {_coolprop_version()} (PropsSI, saturated ammonia at 101325 Pa: h_vapour - h_liquid)",
    )


@functools.cache
def _ammonia_formation_enthalpy_j_per_mol() -> float:
    from chemicals.reaction import Hfg

    return float(Hfg(_AMMONIA_CAS))


def ammonia_formation_enthalpy() -> ReferenceValue:
    """Standard enthalpy of formation of gaseous ammonia at 298.15 K, kJ/mol (negative)."""
    return ReferenceValue(
        id="reference.formation_enthalpy.ammonia_gas",
        value=_ammonia_formation_enthalpy_j_per_mol() / 1000.0,
        unit="kJ/mol",
        source=f"chemicals {_chemicals_version()} (chemicals.reaction.Hfg, default method: Active Thermochemical Tables)",
    )


HYDROGEN_FLUID = "Hydrogen"  # CoolProp's normal hydrogen (Leachman et al. 2009); ortho-para conversion not included
AMBIENT_TEMPERATURE_K = 298.15


@functools.cache
def _hydrogen_states() -> dict[str, float]:
    """Saturated liquid and vapour at 1 atm, and the gas at 25 degC and 1 atm, from CoolProp (SI units)."""
    from CoolProp.CoolProp import PropsSI

    return {
        "h_liquid": PropsSI("H", "P", ATMOSPHERE_PA, "Q", 0, HYDROGEN_FLUID),
        "s_liquid": PropsSI("S", "P", ATMOSPHERE_PA, "Q", 0, HYDROGEN_FLUID),
        "h_vapour": PropsSI("H", "P", ATMOSPHERE_PA, "Q", 1, HYDROGEN_FLUID),
        "h_ambient": PropsSI("H", "P", ATMOSPHERE_PA, "T", AMBIENT_TEMPERATURE_K, HYDROGEN_FLUID),
        "s_ambient": PropsSI("S", "P", ATMOSPHERE_PA, "T", AMBIENT_TEMPERATURE_K, HYDROGEN_FLUID),
    }


def hydrogen_latent_heat() -> ReferenceValue:
    """Latent heat of vaporisation of hydrogen at 1 atm (liquid hydrogen cargo), kJ/kg."""
    states = _hydrogen_states()
    return ReferenceValue(
        id="reference.latent_heat.hydrogen",
        value=(states["h_vapour"] - states["h_liquid"]) / 1000.0,
        unit="kJ/kg",
        source=f"CoolProp {_coolprop_version()} (PropsSI, saturated normal hydrogen at 101325 Pa: h_vapour - h_liquid)",
    )


def hydrogen_liquefaction_states() -> dict[str, float]:
    """h (kJ/kg) and s (kJ/kg/K) of saturated liquid at 1 atm and of the gas at 25 degC, 1 atm."""
    states = _hydrogen_states()
    return {
        "h_liquid_kj_per_kg": states["h_liquid"] / 1000.0,
        "s_liquid_kj_per_kg_k": states["s_liquid"] / 1000.0,
        "h_ambient_kj_per_kg": states["h_ambient"] / 1000.0,
        "s_ambient_kj_per_kg_k": states["s_ambient"] / 1000.0,
        "ambient_temperature_k": AMBIENT_TEMPERATURE_K,
    }


_CO2_CAS = "124-38-9"


@functools.cache
def _co2_formation_enthalpy_j_per_mol() -> float:
    from chemicals.reaction import Hfg

    return float(Hfg(_CO2_CAS))


def co2_formation_enthalpy() -> ReferenceValue:
    """Standard enthalpy of formation of CO2(g) at 298.15 K, kJ/mol (negative): the heat of combustion of graphite."""
    return ReferenceValue(
        id="reference.formation_enthalpy.co2_gas",
        value=_co2_formation_enthalpy_j_per_mol() / 1000.0,
        unit="kJ/mol",
        source=f"chemicals {_chemicals_version()} (chemicals.reaction.Hfg, default method: Active Thermochemical Tables)",
    )
