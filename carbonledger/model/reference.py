"""Physical reference data taken from general-purpose reference libraries, never typed in.

Molar masses, ammonia's enthalpy of formation and its enthalpy of vaporisation come from the
``chemicals`` library (standard atomic weights; Active Thermochemical Tables; CRC Handbook), the
states of liquid hydrogen from CoolProp. Each value is reported with its source so that it can be
listed beside the factors of a result. Values at fixed states are stored in ``reference_table``
(scripts/make_reference_table.py writes it; tests/test_reference_values.py recomputes them).

References
----------
Bell, C. et al., chemicals: Chemical properties component of Chemical Engineering Design
Library (ChEDL), https://github.com/CalebBell/chemicals (atomic weights per IUPAC).
"""

from __future__ import annotations

import functools

from . import reference_table as stored
from .factors import Factor
from .grades import Grade


class ReferenceValue(Factor):
    """A physical reference value taken from a library (chemicals, CoolProp), cited like a factor row.

    Graded "verbatim secondary" when the library ships the published table it is read from (IUPAC
    atomic weights, the CRC Handbook, the Active Thermochemical Tables), "secondary" when the library
    computes it (CoolProp's equation of state, heat-capacity correlations carried to a temperature).
    """

    grade: Grade = Grade.VERBATIM_SECONDARY


@functools.cache
def molar_mass_g_per_mol(formula: str) -> float:
    """Molar mass of a chemical formula in g/mol, from ``chemicals.elements`` (stored in
    ``reference_table`` for the formulas the routes use, else computed)."""
    if formula in stored.MOLAR_MASS_G_PER_MOL:
        return stored.MOLAR_MASS_G_PER_MOL[formula]
    from chemicals.elements import molecular_weight, simple_formula_parser

    return float(molecular_weight(simple_formula_parser(formula)))


def _chemicals_version() -> str:
    """The chemicals version the stored reference values were read with (tests check they still equal
    the installed chemicals' values)."""
    return stored.CHEMICALS_VERSION


@functools.cache
def molar_mass(formula: str) -> ReferenceValue:
    return ReferenceValue(
        id=f"reference.molar_mass.{formula.lower()}",
        value=molar_mass_g_per_mol(formula),
        unit="g/mol",
        source=f"chemicals {_chemicals_version()} (chemicals.elements.molecular_weight, IUPAC standard atomic weights)",
    )


_AMMONIA_CAS = "7664-41-7"
_CRC_VAPORISATION_TABLE = "CRC Handbook Heat of Vaporization.tsv"


def ammonia_vaporisation_at_normal_boiling_point() -> tuple[float, float]:
    """Normal boiling point (K) and molar enthalpy of vaporisation there (J/mol) of ammonia, as
    stored in ``reference_table`` from ``live_ammonia_vaporisation``."""
    boiling_point_k, molar_j_per_mol = stored.AMMONIA_NORMAL_BOILING_POINT_K_AND_VAPORISATION_J_PER_MOL
    return boiling_point_k, molar_j_per_mol


def live_ammonia_vaporisation() -> tuple[float, float]:
    """Read from the CRC Handbook table that ``chemicals`` ships (``chemicals.phase_change``
    registers it; ``Hvap_data_CRC`` is the same table). Only this table is read: the module
    attribute ``Hvap_data_CRC`` would load every phase-change table at once (about a second).
    """
    import chemicals.phase_change  # noqa: F401  (registers the phase-change tables)
    from chemicals.data_reader import data_source

    row = data_source(_CRC_VAPORISATION_TABLE).loc[_AMMONIA_CAS]
    return float(row["Tb"]), float(row["HvapTb"])


@functools.cache
def ammonia_latent_heat() -> ReferenceValue:
    """Latent heat of vaporisation of ammonia at its normal boiling point (1 atm, refrigerated cargo), kJ/kg.

    The molar enthalpy of vaporisation at the normal boiling point (CRC Handbook, through the
    ``chemicals`` library) divided by the molar mass of NH3 (``chemicals.elements``); J/mol over
    g/mol is kJ/kg. tests/test_reference_values.py checks it against CoolProp's equation of state.

    References
    ----------
    Haynes, W. M. (ed.), CRC Handbook of Chemistry and Physics, 95th ed., "Enthalpy of
    vaporization" (as tabulated in chemicals' ``Phase Change/CRC Handbook Heat of Vaporization.tsv``).
    """
    boiling_point_k, molar_j_per_mol = ammonia_vaporisation_at_normal_boiling_point()
    return ReferenceValue(
        id="reference.latent_heat.ammonia",
        value=molar_j_per_mol / molar_mass_g_per_mol("NH3"),
        unit="kJ/kg",
        source=(
            f"chemicals {_chemicals_version()} (CRC Handbook of Chemistry "
            "and Physics, 95th ed. 2014, enthalpy of vaporization "
            f"at the normal boiling point {boiling_point_k:.2f} K: {molar_j_per_mol / 1000:.2f} kJ/mol, "
            "divided by the molar mass of NH3)"
        ),
    )


def _ammonia_formation_enthalpy_j_per_mol() -> float:
    return stored.GAS_FORMATION_ENTHALPY_J_PER_MOL["ammonia"]  # chemicals.reaction.Hfg(_AMMONIA_CAS)


@functools.cache
def ammonia_formation_enthalpy() -> ReferenceValue:
    """Standard enthalpy of formation of gaseous ammonia at 298.15 K, kJ/mol (negative)."""
    return ReferenceValue(
        id="reference.formation_enthalpy.ammonia_gas",
        value=_ammonia_formation_enthalpy_j_per_mol() / 1000.0,
        unit="kJ/mol",
        source=f"chemicals {_chemicals_version()} (chemicals.reaction.Hfg, "
        "default method: Active Thermochemical Tables)",
    )


ATMOSPHERE_PA = 101325.0
HYDROGEN_FLUID = "Hydrogen"  # CoolProp's normal hydrogen (Leachman et al. 2009); ortho-para conversion not included
AMBIENT_TEMPERATURE_K = 298.15


def live_hydrogen_states() -> dict[str, float]:
    """Saturated liquid and vapour at 1 atm, and the gas at 25 degC and 1 atm, from CoolProp (SI units:
    J/kg, J/kg/K). Stored in ``reference_table`` (``HYDROGEN_STATES_SI``) by scripts/make_reference_table.py:
    CoolProp is a test dependency only (its import costs seconds), and the test suite recomputes these."""
    from CoolProp.CoolProp import PropsSI

    return {
        "h_liquid": PropsSI("H", "P", ATMOSPHERE_PA, "Q", 0, HYDROGEN_FLUID),
        "s_liquid": PropsSI("S", "P", ATMOSPHERE_PA, "Q", 0, HYDROGEN_FLUID),
        "h_vapour": PropsSI("H", "P", ATMOSPHERE_PA, "Q", 1, HYDROGEN_FLUID),
        "h_ambient": PropsSI("H", "P", ATMOSPHERE_PA, "T", AMBIENT_TEMPERATURE_K, HYDROGEN_FLUID),
        "s_ambient": PropsSI("S", "P", ATMOSPHERE_PA, "T", AMBIENT_TEMPERATURE_K, HYDROGEN_FLUID),
    }


def _hydrogen_states() -> dict[str, float]:
    return stored.HYDROGEN_STATES_SI


def hydrogen_latent_heat() -> ReferenceValue:
    """Latent heat of vaporisation of hydrogen at 1 atm (liquid hydrogen cargo), kJ/kg."""
    states = _hydrogen_states()
    return ReferenceValue(
        id="reference.latent_heat.hydrogen",
        value=(states["h_vapour"] - states["h_liquid"]) / 1000.0,
        unit="kJ/kg",
        source=f"CoolProp {stored.COOLPROP_VERSION} (PropsSI, saturated normal "
        "hydrogen at 101325 Pa: h_vapour - h_liquid; stored)",
        grade=Grade.SECONDARY,
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


def _co2_formation_enthalpy_j_per_mol() -> float:
    return stored.GAS_FORMATION_ENTHALPY_J_PER_MOL["co2"]  # chemicals.reaction.Hfg(_CO2_CAS)


@functools.cache
def co2_formation_enthalpy() -> ReferenceValue:
    """Standard enthalpy of formation of CO2(g) at 298.15 K, kJ/mol (negative): the heat of combustion of graphite."""
    return ReferenceValue(
        id="reference.formation_enthalpy.co2_gas",
        value=_co2_formation_enthalpy_j_per_mol() / 1000.0,
        unit="kJ/mol",
        source=f"chemicals {_chemicals_version()} (chemicals.reaction.Hfg, "
        "default method: Active Thermochemical Tables)",
    )


_WATER, _HYDROGEN, _OXYGEN = "7732-18-5", "1333-74-0", "7782-44-7"
STANDARD_TEMPERATURE_K = 298.15


@functools.cache
def water_splitting_gibbs_j_per_mol(temperature_k: float, steam: bool) -> float:
    """Gibbs energy of H2O -> H2 + 1/2 O2 at 1 bar, J/mol: the least work (electricity) per mol H2.

    Liquid water at 298.15 K (stored in ``reference_table`` from
    ``live_liquid_water_splitting_gibbs_j_per_mol``), or steam at ``temperature_k``: dG = dH - T dS,
    with standard enthalpies of formation and entropies at 298.15 K (``chemicals.reaction.Hfg``/``Hfl``,
    ``S0g``/``S0l``) carried to T by the ideal-gas heat capacities of ``chemicals.heat_capacity``
    (TRC correlations, valid 50 to 5000 K). The balance, T dS, may come as heat.
    """
    if not steam:
        return stored.WATER_SPLITTING_GIBBS_LIQUID_298K_J_PER_MOL
    from chemicals.heat_capacity import TRC_gas_data, TRCCp_integral, TRCCp_integral_over_T
    from chemicals.reaction import Hfg, S0g

    entropy_products = S0g(_HYDROGEN) + 0.5 * S0g(_OXYGEN)
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


def live_liquid_water_splitting_gibbs_j_per_mol() -> float:
    """dG = -Hf(liquid water) - T (S(H2) + S(O2)/2 - S(liquid water)) at 298.15 K, from chemicals."""
    from chemicals.reaction import Hfl, S0g, S0l

    t = STANDARD_TEMPERATURE_K
    return float(-Hfl(_WATER) - t * (S0g(_HYDROGEN) + 0.5 * S0g(_OXYGEN) - S0l(_WATER)))


@functools.cache
def water_splitting_gibbs(temperature_k: float, steam: bool) -> ReferenceValue:
    where = f"steam at {temperature_k:g} K" if steam else "liquid water at 298.15 K"
    return ReferenceValue(
        id=f"reference.water_splitting_gibbs.{'steam_' + format(temperature_k, 'g') + 'k' if steam else 'liquid_298k'}",
        value=water_splitting_gibbs_j_per_mol(temperature_k, steam) / 1000.0,
        unit="kJ/mol H2",
        source=f"chemicals {_chemicals_version()} (reaction.Hfg/Hfl/S0g/S0l at "
        f"298.15 K; heat_capacity TRC ideal-gas correlations), {where}",
        grade=Grade.SECONDARY,
    )
