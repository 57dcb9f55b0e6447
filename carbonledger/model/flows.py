"""The elementary flows of the inventory, written once: their keys in matrix order, their names in
words and what a reader must know of each (the engine, the scoring, the route modules, the tables and
the workbook all read them here).

Flows other than the greenhouse gases are kept in the inventory and reported apart: ammonia slip and
leaked hydrogen (``NON_GHG_FLOWS``), and biogenic CO2 released or captured and stored
(``BIOGENIC_FLOWS``). They are characterised at zero in the headline and left out of the sums by gas.
"""

from __future__ import annotations

# key -> (name in words, what a reader must know of it); the order is the order of the matrices' rows
FLOW_WORDS = {
    "co2_fossil": ("CO2, fossil", ""),
    "ch4_fossil": ("Methane (CH4), fossil", ""),
    "ch4_non_fossil": ("Methane (CH4), non-fossil", ""),
    "n2o": ("Nitrous oxide (N2O)", ""),
    "co2e_precharacterised": (
        "Life-cycle CO2e (already characterised)",
        "given by a life-cycle factor, not split by gas",
    ),
    "nh3": ("NH3 (ammonia slip)", "not a greenhouse gas, reported separately"),
    "h2": ("H2 (hydrogen leakage)", "an indirect greenhouse effect, reported separately, in no scheme value"),
    "co2_biogenic": ("CO2, biogenic, released", "counted apart at zero, reported separately"),
    "co2_biogenic_stored": (
        "CO2, biogenic, captured and stored",
        "reported separately; never netted unless a rulebook says so",
    ),
}
FLOW_NAMES = {key: name for key, (name, _) in FLOW_WORDS.items()}
FLOWS = {key: f"{name} ({note})" if note else name for key, (name, note) in FLOW_WORDS.items()}  # key -> full label
NON_GHG_FLOWS = ("nh3", "h2")  # in the inventory, characterised at zero, left out of by_gas
# carbon from biomass: counted apart, reported in biogenic_co2_kg
BIOGENIC_FLOWS = (
    "co2_biogenic",
    "co2_biogenic_stored",
)
APART_FLOWS = NON_GHG_FLOWS + BIOGENIC_FLOWS  # characterised at zero in the headline, left out of by_gas
