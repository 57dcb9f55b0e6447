"""Reference values read from the ``chemicals`` library and CoolProp and stored (written by
scripts/make_reference_table.py; do not edit). tests/test_reference_values.py checks every
value against chemicals and CoolProp themselves, so a change in either cannot pass unnoticed."""

CHEMICALS_VERSION = "1.5.2"
MOLAR_MASS_G_PER_MOL = {
    "C": 12.0107,
    "CH4": 16.04246,
    "CO2": 44.0095,
    "Cl2": 70.906,
    "H2": 2.01588,
    "H2O": 18.01528,
    "N2": 28.0134,
    "NH3": 17.03052,
    "NaOH": 39.99711,
    "O2": 31.9988,
}
GAS_FORMATION_ENTHALPY_J_PER_MOL = {"co2": -393474.0, "ammonia": -45558.0}
WATER_SPLITTING_GIBBS_LIQUID_298K_J_PER_MOL = 237137.105
AMMONIA_NORMAL_BOILING_POINT_K_AND_VAPORISATION_J_PER_MOL = (239.82, 23330.0)
COOLPROP_VERSION = "8.0.0"
HYDROGEN_STATES_SI = {
    "h_liquid": 3.7137540909796762e-06,
    "s_liquid": 1.698388584472903e-07,
    "h_vapour": 448711.43955450796,
    "h_ambient": 3931807.8619924113,
    "s_ambient": 53375.98931349795,
}
