"""The documentation's generated pages cover every stage module and every registered delivery leg,
so a new stage or leg cannot be left out of the methodology (docs/gen_pages.py writes them; the
site is built strict by .ci/run)."""

from __future__ import annotations

import ast
import re
import sys
from pathlib import Path

import pytest

from carbonledger.routes import DELIVERY_LEGS, REGISTRY

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT / "docs"))
import gen_pages  # noqa: E402
from equations import equations  # noqa: E402


@pytest.fixture(scope="module")
def pages():
    return gen_pages.pages()


def nav_files(nav) -> list[str]:
    files = []
    for entry in nav:
        for value in entry.values():
            files += nav_files(value) if isinstance(value, list) else [value]
    return files


def stage_files() -> list[str]:
    """The stage modules as files on disk (not the generator's own listing)."""
    return sorted(p.stem for p in (ROOT / "carbonledger" / "stages").glob("*.py") if p.stem != "__init__")


def public_functions(path: Path) -> list[str]:
    tree = ast.parse(path.read_text(encoding="utf-8"))
    return [node.name for node in tree.body if isinstance(node, ast.FunctionDef) and not node.name.startswith("_")]


def test_a_page_per_stage_module_with_an_equation_per_function(pages):
    listed = nav_files(gen_pages.nav())
    for stage in stage_files():
        page = f"generated/methodology/stages/{stage}.md"
        assert page in pages and page in listed, stage
        text = pages[page]
        for function in public_functions(ROOT / "carbonledger" / "stages" / f"{stage}.py"):
            assert f"### `{function}`" in text, (stage, function)
        assert f"::: carbonledger.stages.{stage}" in text  # docstrings with their References
        assert "## Factors read by the routes that use it" in text


def test_a_page_per_registered_leg_with_parameters_equations_and_factors(pages):
    listed = nav_files(gen_pages.nav())
    legs = [route for route in REGISTRY if route.kind == "delivery_leg"]
    assert legs == list(DELIVERY_LEGS) and len(legs) >= 8
    for route in legs:
        page = f"generated/methodology/legs/{route.name}.md"
        assert page in pages and page in listed, route.name
        text = pages[page]
        for section, model in {**route.sections, **route.optional_sections}.items():
            for field in model.model_fields:
                assert f"`{section}.{field}`" in text, (route.name, field)
        assert "## Equations" in text and "$$" in text, route.name
        assert "## Factors it reads" in text


def test_the_shipping_leg_lists_the_marine_fuel_factors_it_reads(pages):
    """The shipping leg reads the IMO conversion factor of its fuel (MEPC.376(80) Cf, t CO2/t fuel):
    the page lists that factor id pattern and the demo's fuel row."""
    text = pages["generated/methodology/legs/shipping.md"]
    assert "`marine_fuel.{fuel}.co2`" in text
    assert re.search(r"`marine_fuel\.\w+\.co2` \| 3\.\d+ \| t CO2/t fuel", text)


def test_generated_equation_of_a_worked_formula():
    """Ideal work of liquefaction w = (h_l - h_0) - T_0 (s_l - s_0) (Barron, Cryogenic Systems,
    1985, ch. 3), divided by 3600 kJ/kWh: the generated LaTeX has that structure."""
    from carbonledger.stages.hydrogen_delivery import ideal_liquefaction_work_kwh_per_kg, pipeline_loss_share

    [(condition, latex)] = equations(ideal_liquefaction_work_kwh_per_kg)
    assert condition == ""
    assert latex.endswith(
        r"= \frac{\mathrm{h\_liquid\_kj\_per\_kg} - \mathrm{h\_ambient\_kj\_per\_kg} - \mathrm{ambient\_temperature\_k} \cdot \left(\mathrm{s\_liquid\_kj\_per\_kg\_k} - \mathrm{s\_ambient\_kj\_per\_kg\_k}\right)}{3600}"
    )
    [(_, latex)] = equations(pipeline_loss_share)
    assert latex.endswith(r"\frac{\mathrm{leakage\_share\_per\_100\_km} \cdot \mathrm{length\_km}}{100}")


def test_text_options_give_one_equation_each():
    """Capture on the process CO2 only leaves the flue CO2 uncaptured (common practice: a reformer's
    capture unit treats the concentrated process stream, or the flue gas as well)."""
    from carbonledger.stages.capture import captured_flue_share

    conditions = dict(equations(captured_flue_share))
    assert any(latex.endswith(r"= \mathrm{capture\_rate}") and "process_and_flue" in condition for condition, latex in conditions.items())
    assert any(latex.endswith("= 0") and "otherwise" in condition for condition, latex in conditions.items())


def test_api_reference_covers_the_facade(pages):
    assert "::: carbonledger.api" in pages["generated/reference/carbonledger.api.md"]
    listed = nav_files(gen_pages.nav())
    for module in gen_pages.PUBLIC_MODULES:
        assert f"generated/reference/{module}.md" in listed
