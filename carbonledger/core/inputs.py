"""Factor and reference values as the route modules ask for them, recording every one used.

``NumericInputs`` gives numbers; the audit workbook's ``SymbolicInputs`` gives cells. What is
recorded in ``used`` is what a result cites, what the workbook lists and what ``recalc``
compares between factor sets, so every value that reaches a result must come through here.
"""

from __future__ import annotations

import difflib
from typing import Any

from ..errors import InputError
from ..model.factors import FactorSet
from ..model.reference import (
    ammonia_formation_enthalpy,
    ammonia_latent_heat,
    co2_formation_enthalpy,
    hydrogen_latent_heat,
    molar_mass,
)
from ..model.units import UnitMismatch, conversion_factor, spelling_hint


def close_factor_ids(factor_id: str, known_ids) -> list[str]:
    """Up to three known ids that look like ``factor_id``: the last segment is compared among ids of the
    same namespace (``electricity.grid.germany_2022`` finds ``electricity.grid.germany_2019``), else the
    whole id among all ids.

    Parameters
    ----------
    factor_id : str
        The id asked for (not in the set).
    known_ids : iterable of str
        The ids of the factor set.

    Returns
    -------
    list of str
        At most three ids, the closest first (``difflib`` ratio at least 0.6 within the namespace, 0.75 across).
    """
    namespace, _, leaf = factor_id.rpartition(".")
    leaves = {known.rpartition(".")[2]: known for known in known_ids if known.rpartition(".")[0] == namespace}
    if leaves:
        return [leaves[match] for match in difflib.get_close_matches(leaf, leaves, n=3, cutoff=0.6)]
    return difflib.get_close_matches(factor_id, list(known_ids), n=3, cutoff=0.75)


class NumericInputs:
    """Factor and reference values as numbers, recording every one that is used."""

    def __init__(self, factor_set: FactorSet, source: str = "project"):
        self.factor_set = factor_set
        self.source = source  # the project file, named when one of its factor ids is unknown
        self.used: dict[str, Any] = {}

    def _row(self, factor_id: str, where: str):
        if where != "factor" and factor_id not in self.factor_set.factors:
            close = close_factor_ids(factor_id, self.factor_set.factors)
            hint = f"; did you mean {' or '.join(repr(c) for c in close)}?" if close else ""
            raise InputError(
                self.source,
                where,
                f"a factor id known to set '{self.factor_set.name}', got "
                f"'{factor_id}'{hint} (see `carbonledger factors list`)",
            )
        return self.factor_set.get(factor_id, where)

    def factor(self, factor_id: str, unit: str, where: str = "factor"):
        row = self._row(factor_id, where)
        self.used[factor_id] = row
        try:
            return row.value * conversion_factor(row.unit, unit)
        except UnitMismatch as error:
            if where != "factor":  # the project named a factor of the wrong kind: blame the project
                raise InputError(
                    self.source,
                    where,
                    f"a factor id whose unit converts to {unit}; '{factor_id}' "
                    f"is in {row.unit}{spelling_hint(row.unit)}",
                ) from None
            raise InputError(
                row.origin or self.factor_set.name, factor_id, f"a value in {unit}: {error}{spelling_hint(row.unit)}"
            ) from None

    def factor_unit(self, factor_id: str, where: str = "factor") -> str:
        return self._row(factor_id, where).unit

    def _reference(self, value):
        self.used[value.id] = value
        return value.value

    def molar_mass(self, formula: str):
        return self._reference(molar_mass(formula))

    def latent_heat_ammonia(self):
        """kJ/kg at 1 atm (see ``model.reference.ammonia_latent_heat``)."""
        return self._reference(ammonia_latent_heat())

    def latent_heat_hydrogen(self):
        """kJ/kg at 1 atm, from CoolProp (imported only by projects that carry liquid hydrogen)."""
        return self._reference(hydrogen_latent_heat())

    def formation_enthalpy_co2(self):
        """kJ/mol, CO2(g) at 298.15 K, from the chemicals library (the heat of combustion of solid carbon)."""
        return self._reference(co2_formation_enthalpy())

    def formation_enthalpy_ammonia(self):
        """kJ/mol, NH3(g) at 298.15 K, from the chemicals library."""
        return self._reference(ammonia_formation_enthalpy())


class DrawInputs(NumericInputs):
    """Factor values as numbers, except the uncertain ones: arrays of Monte Carlo draws.

    ``draws`` maps a factor id to its draws in the factor's own unit (as its row states it); the
    route modules receive them converted to the unit they ask for, like any other factor, so the
    same stage code builds every draw at once.
    """

    def __init__(self, factor_set: FactorSet, draws: dict, source: str = "project"):
        super().__init__(factor_set, source)
        self.draws = draws

    def factor(self, factor_id: str, unit: str, where: str = "factor"):
        value = super().factor(factor_id, unit, where)
        if factor_id not in self.draws:
            return value
        row = self.factor_set.get(factor_id, where)
        return self.draws[factor_id] * (value / row.value if row.value else conversion_factor(row.unit, unit))
