"""Write carbonledger/model/reference_table.py: the reference values scoring asks for most, read
from the ``chemicals`` library and CoolProp once and stored, so that a run loads neither chemicals'
data tables (read with pandas: about a second of CPU) nor the chemicals package itself (about 0.2 s),
nor CoolProp (seconds to import; a test dependency only).

Run after upgrading chemicals or CoolProp when tests/test_reference_values.py reports a stored value that no
longer equals chemicals' own. Only values with fixed arguments are stored; anything else (steam
electrolysis at the project's temperature, a formula not listed) is computed live.

Run: python scripts/make_reference_table.py
"""

from __future__ import annotations

from importlib.metadata import version
from pathlib import Path

FORMULAS = ("C", "CH4", "CO2", "Cl2", "H2", "H2O", "N2", "NH3", "NaOH", "O2")
GAS_FORMATION_CAS = {"co2": "124-38-9", "ammonia": "7664-41-7"}
TARGET = Path(__file__).resolve().parent.parent / "carbonledger" / "model" / "reference_table.py"


def live_values() -> dict:
    """The values as chemicals computes them now (the same calls carbonledger.model.reference makes live)."""
    from chemicals.elements import molecular_weight, simple_formula_parser
    from chemicals.reaction import Hfg

    from carbonledger.model import reference

    return {
        "CHEMICALS_VERSION": version("chemicals"),
        "MOLAR_MASS_G_PER_MOL": {f: float(molecular_weight(simple_formula_parser(f))) for f in FORMULAS},
        "GAS_FORMATION_ENTHALPY_J_PER_MOL": {name: float(Hfg(cas)) for name, cas in GAS_FORMATION_CAS.items()},
        "WATER_SPLITTING_GIBBS_LIQUID_298K_J_PER_MOL": reference.live_liquid_water_splitting_gibbs_j_per_mol(),
        "AMMONIA_NORMAL_BOILING_POINT_K_AND_VAPORISATION_J_PER_MOL": reference.live_ammonia_vaporisation(),
        "COOLPROP_VERSION": version("CoolProp"),
        "HYDROGEN_STATES_SI": {name: float(value) for name, value in reference.live_hydrogen_states().items()},
    }


def main() -> None:
    values = live_values()
    lines = [
        '"""Reference values read from the ``chemicals`` library and CoolProp and stored (written by',
        "scripts/make_reference_table.py; do not edit). tests/test_reference_values.py checks every",
        'value against chemicals and CoolProp themselves, so a change in either cannot pass unnoticed."""',
        "",
    ]
    lines += [f"{name} = {value!r}" for name, value in values.items()]
    TARGET.write_text("\n".join(lines) + "\n", encoding="utf-8")
    print(f"wrote {TARGET}")


if __name__ == "__main__":
    main()
