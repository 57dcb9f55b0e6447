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


_WATER, _HYDROGEN, _OXYGEN = "7732-18-5", "1333-74-0", "7782-44-7"
STANDARD_TEMPERATURE_K = 298.15


@functools.cache
def water_splitting_gibbs_j_per_mol(temperature_k: float, steam: bool) -> float:
    """Gibbs energy of H2O -> H2 + 1/2 O2 at 1 bar, J/mol: the least work (electricity) per mol H2.

    Liquid water at 298.15 K, or steam at ``temperature_k``: dG = dH - T dS, with standard
    enthalpies of formation and entropies at 298.15 K (``chemicals.reaction.Hfg``/``Hfl``,
    ``S0g``/``S0l``) carried to T by the ideal-gas heat capacities of ``chemicals.heat_capacity``
    (TRC correlations, valid 50 to 5000 K). The balance, T dS, may come as heat.
    """
    from chemicals.heat_capacity import TRC_gas_data, TRCCp_integral, TRCCp_integral_over_T
    from chemicals.reaction import Hfg, Hfl, S0g, S0l

    entropy_products = S0g(_HYDROGEN) + 0.5 * S0g(_OXYGEN)
    if not steam:
        t = STANDARD_TEMPERATURE_K
        return float(-Hfl(_WATER) - t * (entropy_products - S0l(_WATER)))
    t0, t = STANDARD_TEMPERATURE_K, float(temperature_k)

    def rise(cas: str) -> tuple[float, float]:
        row = TRC_gas_data.loc[cas]
        coefficients = [row[f"a{i}"] for i in range(8)]
        enthalpy = TRCCp_integral(t, *coefficients) - TRCCp_integral(t0, *coefficients)
        entropy = TRCCp_integral_over_T(t, *coefficients) - TRCCp_integral_over_T(t0, *coefficients)
        return enthalpy, entropy

    (h_h2, s_h2), (h_o2, s_o2), (h_w, s_w) = rise(_HYDROGEN), rise(_OXYGEN), rise(_WATER)
    enthalpy = -Hfg(_WATER) + h_h2 + 0.5 * h_o2 - h_w
    entropy = entropy_products - S0g(_WATER) + s_h2 + 0.5 * s_o2 - s_w
    return float(enthalpy - t * entropy)


def water_splitting_gibbs(temperature_k: float, steam: bool) -> ReferenceValue:
    where = f"steam at {temperature_k:g} K" if steam else "liquid water at 298.15 K"
    return ReferenceValue(
        id=f"reference.water_splitting_gibbs.{'steam_' + format(temperature_k, 'g') + 'k' if steam else 'liquid_298k'}",
        value=water_splitting_gibbs_j_per_mol(temperature_k, steam) / 1000.0,
        unit="kJ/mol H2",
        source=f"chemicals {_chemicals_version()} (reaction.Hfg/Hfl/S0g/S0l at 298.15 K; heat_capacity TRC ideal-gas correlations), {where}",
    )
