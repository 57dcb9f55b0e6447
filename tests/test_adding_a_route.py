"""Walk through DEVELOPERS.md "How to add a route" once: a copy of the package gains one route
module and its import and line in the registry, and a project using the new route validates and scores.

The new route is deliberately trivial: hydrogen whose only input is electricity (kWh per kg H2),
so the expected total is written out by hand: kWh/kg x grid factor (g CO2e/kWh) / 1000."""

from __future__ import annotations

import json
import os
import shutil
import subprocess
import sys
import textwrap
from pathlib import Path

import carbonledger

ROOT = Path(__file__).resolve().parent.parent

NEW_ROUTE = '''
"""A trivial hydrogen route for the walk-through test: electricity in, hydrogen out."""

from ..model.project import P, Section
from .base import Activity, Route


class Electric(Section):
    electricity_kwh_per_kg_h2: float = P(unit="kWh/kg H2", description="Electricity per kg of hydrogen", gt=0)


def build(params, inputs, chain):
    plant = Activity("hydrogen_production", "hydrogen_production", "hydrogen, trivial electric route", "kg H2")
    plant.consume("electricity_mix", params["electric"]["electricity_kwh_per_kg_h2"], "electricity", "kWh")
    return [plant]


ROUTE = Route(
    name="trivial_electric",
    kind="hydrogen_route",
    stages=("hydrogen_production",),
    applies=lambda params: params["hydrogen"]["route"] == "trivial_electric",
    build=build,
    sections={"electric": Electric},
)
'''


def test_a_new_route_is_one_module_and_one_registry_line(tmp_path):
    package = tmp_path / "carbonledger"
    shutil.copytree(Path(carbonledger.__file__).resolve().parent, package, ignore=shutil.ignore_patterns("__pycache__"))
    (package / "routes" / "trivial_electric.py").write_text(NEW_ROUTE, encoding="utf-8")
    registry = package / "routes" / "__init__.py"
    text = registry.read_text(encoding="utf-8")
    text = text.replace("from . import (\n", "from . import (\n    trivial_electric,\n", 1)
    text = text.replace("    electrolysis.ROUTE,\n", "    electrolysis.ROUTE,\n    trivial_electric.ROUTE,\n", 1)
    registry.write_text(text, encoding="utf-8")
    project = tmp_path / "trivial.toml"
    project.write_text(
        textwrap.dedent(
            """
            [project]
            name = "Walk-through (invented)"
            product = "hydrogen"
            [hydrogen]
            route = "trivial_electric"
            [electric]
            electricity_kwh_per_kg_h2 = 50.0
            [electricity.sources.grid]
            share = 1.0
            factor = "electricity.grid.eu27_2018"
            """
        ),
        encoding="utf-8",
    )
    script = (
        "import json, sys; from carbonledger.api import score; from carbonledger.model.factors import load_factor_set; "
        "r = score(sys.argv[1]); f = load_factor_set('default-2026').factors['electricity.grid.eu27_2018']; "
        "print(json.dumps({'total': r.total, 'factor': f.value, 'unit': f.unit, 'stages': list(r.by_stage)}))"
    )
    env = {**os.environ, "PYTHONPATH": str(tmp_path), "CARBONLEDGER_FACTORS": str(ROOT / "factors")}
    done = subprocess.run([sys.executable, "-c", script, str(project)], capture_output=True, text=True, env=env, cwd=tmp_path, timeout=120)
    assert done.returncode == 0, done.stderr
    figures = json.loads(done.stdout)
    assert figures["unit"] == "g CO2e/kWh"
    # hand calculation: 50 kWh/kg H2 x factor g CO2e/kWh / 1000 g/kg
    assert abs(figures["total"] - 50.0 * figures["factor"] / 1000.0) < 1e-9
    assert figures["stages"] == ["electricity_supply", "hydrogen_production"]
