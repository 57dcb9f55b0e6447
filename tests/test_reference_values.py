"""Physical constants and stoichiometry against reference libraries and handbook values."""

from pathlib import Path

import pytest

from carbonledger.model.reference import (
    ammonia_latent_heat,
    ammonia_vaporisation_at_normal_boiling_point,
    molar_mass_g_per_mol,
)
from carbonledger.stages import ammonia, electrolysis, reforming

pytestmark = pytest.mark.xdist_group("coolprop")  # CoolProp takes about 4 s to import: one worker imports it

ROOT = Path(__file__).resolve().parent.parent


@pytest.mark.parametrize(
    "formula, coolprop_name",
    [("NH3", "Ammonia"), ("H2", "Hydrogen"), ("N2", "Nitrogen"), ("H2O", "Water"), ("CH4", "Methane")],
)
def test_molar_masses_agree_with_coolprop(formula, coolprop_name):
    # Independent reference library: CoolProp's molar mass (kg/mol) for the same substance.
    assert molar_mass_g_per_mol(formula) == pytest.approx(PropsSI("M", coolprop_name) * 1000.0, rel=2e-4)


def test_ammonia_latent_heat_from_chemicals_agrees_with_coolprop():
    # The score takes the CRC Handbook value shipped with the chemicals library (23.33 kJ/mol at
    # 239.82 K); CoolProp's reference equation of state for ammonia (Gao et al. 2020 in CoolProp 8), saturated
    # liquid and vapour at 101325 Pa, gives 1369.67 kJ/kg. The two agree within 0.05 %.
    vapour = PropsSI("H", "P", 101325.0, "Q", 1, "Ammonia")
    liquid = PropsSI("H", "P", 101325.0, "Q", 0, "Ammonia")
    assert ammonia_latent_heat().value == pytest.approx((vapour - liquid) / 1000.0, rel=5e-4)
    # Same for the normal boiling point: CoolProp 239.83 K, CRC 239.82 K.
    boiling_point_k, _ = ammonia_vaporisation_at_normal_boiling_point()
    assert boiling_point_k == pytest.approx(PropsSI("T", "P", 101325.0, "Q", 0, "Ammonia"), abs=0.05)


def test_molar_masses_agree_with_iupac_atomic_weights():
    # IUPAC conventional atomic weights (CRC Handbook): H 1.008, N 14.007.
    assert molar_mass_g_per_mol("NH3") == pytest.approx(14.007 + 3 * 1.008, abs=0.002)
    assert molar_mass_g_per_mol("H2") == pytest.approx(2 * 1.008, abs=0.001)


def test_stoichiometric_hydrogen_and_nitrogen_per_tonne_of_ammonia():
    # 3 H2 + N2 -> 2 NH3. With IUPAC atomic weights (H 1.008, N 14.007):
    # H2: 1000 * 3 * 2.016 / (2 * 17.031) = 177.55 kg; N2: 1000 * 28.014 / (2 * 17.031) = 822.44 kg.
    h2 = ammonia.stoichiometric_hydrogen_kg_per_t_nh3(molar_mass_g_per_mol("H2"), molar_mass_g_per_mol("NH3"))
    n2 = ammonia.stoichiometric_nitrogen_kg_per_t_nh3(molar_mass_g_per_mol("N2"), molar_mass_g_per_mol("NH3"))
    assert h2 == pytest.approx(177.55, abs=0.05)
    assert n2 == pytest.approx(822.44, abs=0.05)
    assert h2 + n2 == pytest.approx(1000.0, abs=1e-6)  # conservation of mass
    # The same ratio from CoolProp's molar masses (an independent library).
    coolprop = 1000 * 3 * PropsSI("M", "Hydrogen") / (2 * PropsSI("M", "Ammonia"))
    assert h2 == pytest.approx(coolprop, rel=2e-4)


def test_hydrogen_mass_fraction_of_ammonia():
    # 3 * 1.008 / 17.031 = 0.17756 (IUPAC atomic weights)
    fraction = ammonia.hydrogen_mass_fraction_of_ammonia(molar_mass_g_per_mol("H2"), molar_mass_g_per_mol("NH3"))
    assert fraction == pytest.approx(0.17756, abs=5e-5)


def test_electrolysis_energy_floor_is_the_heating_value_of_hydrogen():
    # US DOE HyARC: HHV 141.88 MJ/kg = 39.41 kWh/kg; LHV 119.96 MJ/kg = 33.32 kWh/kg.
    assert electrolysis.energy_floor_kwh_per_kg_h2("pem", 119.96, 141.88) == pytest.approx(39.41, abs=0.01)
    assert electrolysis.energy_floor_kwh_per_kg_h2("alkaline", 119.96, 141.88) == pytest.approx(39.41, abs=0.01)
    assert electrolysis.energy_floor_kwh_per_kg_h2("solid_oxide", 119.96, 141.88) == pytest.approx(33.32, abs=0.01)


def test_stoichiometric_water_per_kg_hydrogen():
    # H2O -> H2 + 1/2 O2: 18.015 / 2.016 = 8.94 kg water per kg H2 (common practice: "about 9 L/kg").
    water = electrolysis.stoichiometric_water_kg_per_kg_h2(molar_mass_g_per_mol("H2O"), molar_mass_g_per_mol("H2"))
    assert water == pytest.approx(8.94, abs=0.01)


def test_reforming_stoichiometric_floor_and_co2():
    # CH4 + 2 H2O -> CO2 + 4 H2: 16.04 / (4 * 2.016) = 1.989 kg CH4 per kg H2, so with
    # methane LHV 50.04 MJ/kg the floor is 0.0995 GJ/kg H2, and the CO2 formed is
    # 44.01 / (4 * 2.016) = 5.46 kg CO2/kg H2 (the "about 5.5 kg" of the trade).
    floor = reforming.stoichiometric_gas_floor_gj_per_kg_h2(molar_mass_g_per_mol("CH4"), molar_mass_g_per_mol("H2"), 50.04)
    assert floor == pytest.approx(0.0995, abs=0.0002)
    # The reforming stage burns that floor with the IPCC natural gas factor (56.1 kg CO2/GJ,
    # 2006 IPCC Guidelines Vol. 2 Table 2.2): within 3 % of the 5.46 kg of the reaction, the gap
    # being natural gas (heavier hydrocarbons, some CO2) against pure methane.
    co2 = reforming.direct_co2_kg_per_kg_h2(floor, 56.1)
    assert co2 == pytest.approx(5.46, rel=0.03)


def test_stored_reference_values_equal_what_chemicals_computes_now():
    """carbonledger/model/reference_table.py stores values read from chemicals and CoolProp (so that a run
    loads neither chemicals' data tables nor CoolProp, a test dependency only); each must still equal the
    library's own value to 1e-9. If this fails after an upgrade, run scripts/make_reference_table.py."""
    import importlib.util

    from carbonledger.model import reference_table

    spec = importlib.util.spec_from_file_location("make_reference_table", ROOT / "scripts" / "make_reference_table.py")
    script = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(script)
    live = script.live_values()
    for name, value in live.items():
        if not name.endswith("_VERSION"):
            assert getattr(reference_table, name) == pytest.approx(value, rel=1e-9, abs=1e-9), name
    # and against the handbook: liquid water at 25 degC, dG = 237.1 kJ/mol (CRC Handbook, standard
    # Gibbs energy of formation of H2O(l), -237.1 kJ/mol); CO2(g) dHf = -393.5 kJ/mol (same table)
    assert reference_table.WATER_SPLITTING_GIBBS_LIQUID_298K_J_PER_MOL == pytest.approx(237100, abs=150)
    assert reference_table.GAS_FORMATION_ENTHALPY_J_PER_MOL["co2"] == pytest.approx(-393500, abs=100)
    # liquid hydrogen at 1 atm: latent heat 445.6 kJ/kg for normal hydrogen (NIST Chemistry WebBook,
    # fluid properties, Leachman et al. 2009 equation of state; recorded from memory) within 1 %
    states = reference_table.HYDROGEN_STATES_SI
    assert (states["h_vapour"] - states["h_liquid"]) / 1000.0 == pytest.approx(445.6, rel=0.01)


def PropsSI(*args):  # noqa: N802 (CoolProp's own name); imported on first use: CoolProp takes seconds to load
    from CoolProp.CoolProp import PropsSI as props

    return props(*args)
