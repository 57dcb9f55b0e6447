"""The audit workbook: formulas agree with the engine, inputs round-trip, text stays text."""

from __future__ import annotations

import math
import re
from pathlib import Path

import openpyxl
import pytest
from helpers import assessment_with
from workbook_support import (
    DEMO,
    LIBREOFFICE_JOBS,
    VERDICT_WORDS,
    labelled,
    libreoffice_job,
    recalculate_with_formulas,
    run_cli,
    sheet,
)

from carbonledger.api import score
from carbonledger.io.labels import INTENSITY_LABELS, gas_name, stage_name
from carbonledger.io.workbook.cells import Term

DEMOS = sorted(DEMO.glob("*.toml"))


def write(project: Path, out: Path, *options: str) -> Path:
    code, _, err = run_cli("workbook", str(project), "-o", str(out), *options)
    assert code == 0, err
    return out


def close(a, b, rel=1e-9):
    return math.isclose(a, b, rel_tol=rel, abs_tol=1e-12)


def assert_agrees(values_workbook, result) -> None:
    """Every recalculated figure equals the engine's (bw2calc) figure to 1e-9."""
    results = labelled(sheet(values_workbook, "Results"))
    assert close(results["Total"], result.total), (results["Total"], result.total)
    for stage, value in result.by_stage.items():
        assert close(results[stage_name(stage)], value), (stage, results[stage_name(stage)], value)
    for flow, value in result.by_gas.items():
        assert close(results[gas_name(flow)], value), (flow, results[gas_name(flow)], value)
    for key, value in result.intensity.model_dump().items():
        if value is not None:
            assert close(results[INTENSITY_LABELS[key]], value), key
    assert close(results["Hydrogen at the hydrogen plant gate"], result.hydrogen_production_kg_co2e_per_kg_h2)
    ws = sheet(values_workbook, "Results")
    rows = {}
    for row in ws.iter_rows(min_row=1, max_row=ws.max_row):
        rows.setdefault(row[0].value, row)  # check rows come before the thresholds table
    for check in result.checks:
        row = rows[check.scheme]
        if str(check.co_products.get("note", "")).startswith("scheme value rescored"):
            # the scheme's co-product rule is not the project's: the live row keeps the project's method and says so;
            # the engine's rescored value and status stand beside it (columns P and Q)
            assert row[11].value.endswith("(scheme's co-product rule, column P)") and close(row[15].value, check.value)
            assert row[16].value == check.status and "scheme value rescored" in row[17].value
            continue
        assert close(row[9].value, check.value), check.scheme
        assert close(row[10].value, check.limit)
        assert row[11].value == VERDICT_WORDS[check.status]  # live formula within the rules read at writing
        assert row[16].value == VERDICT_WORDS[check.status] and row[17].value.startswith(check.reasons[0])
        if check.margin is None:  # not eligible: no margin (the verdict carries no threshold judgement)
            assert row[12].value in (None, "")
        else:
            assert close(row[12].value, check.margin)
        assert row[13].value == (check.tier or "none")


# formula text -----------------------------------------------------------------------------
def _evaluate(text: str, values: dict[str, float]) -> float:
    """Python evaluates the spreadsheet text (same precedence for + - * / and parentheses)."""
    return eval(re.sub(r"\$?([A-Z]+)\$?(\d+)", lambda m: repr(values[m.group(1) + m.group(2)]), text))


def test_formula_text_keeps_the_order_of_operations():
    a, b, c = Term("A1"), Term("B1"), Term("C1")
    values = {"A1": 2.0, "B1": 3.0, "C1": 5.0}
    cases = [
        (a - (b - c), 2.0 - (3.0 - 5.0)),
        (a / (b * c), 2.0 / (3.0 * 5.0)),
        ((a + b) * c, (2.0 + 3.0) * 5.0),
        (-(a + b) * c, -(2.0 + 3.0) * 5.0),
        (1.0 / (1.0 - a / 10.0), 1.0 / (1.0 - 2.0 / 10.0)),
        (a * (1.0 - b) - c, 2.0 * (1.0 - 3.0) - 5.0),
        (a - b * -c, 2.0 - 3.0 * -5.0),
        (a / b / c, 2.0 / 3.0 / 5.0),
        (a * 1e-05 + 0.1 * b, 2.0 * 1e-05 + 0.1 * 3.0),
        (-2.5 * a - (-b), -2.5 * 2.0 - (-3.0)),
    ]
    for term, expected in cases:
        assert _evaluate(term.text, values) == expected, term.text


def test_a_symbolic_value_refuses_a_branch():
    with pytest.raises(TypeError):
        bool(Term("A1"))


# recalculation agreement ------------------------------------------------------------------
# The formulas library, the second independent engine, recalculates a demo of each kind of chain
# (capture and a ship; electricity and a delivered, cracked boundary; a co-product route); LibreOffice
# recalculates every demo below in the session's one start, and the interval sheets are recalculated
# by the formulas library on small series in test_workbook_intervals. Compiling a workbook in the
# formulas library takes seconds, so it does not repeat LibreOffice's full sweep.
FORMULAS_DEMOS = [DEMO / f"{name}.toml" for name in ("blue_atr_ammonia_shipped", "green_ammonia_cracked_hydrogen", "turquoise_pyrolysis_hydrogen")]


@pytest.mark.parametrize("project", FORMULAS_DEMOS, ids=lambda p: p.stem)
def test_formulas_library_recalculates_the_engine_figures(project, tmp_path):
    out = without_interval_sheets(write(project, tmp_path / f"{project.stem}.xlsx"))
    # the Calculation and Results sheets hold the declared annual shares; the interval matching is on its own sheets
    assert_agrees(recalculate_with_formulas(out, tmp_path / "calc"), score(project, assessment=assessment_with(matching="declared")))


def without_interval_sheets(path: Path) -> Path:
    """The workbook without its Matching and Intervals sheets (nothing else refers to them). The `formulas`
    library takes minutes over a year of hourly intervals; those sheets are recalculated by it on small
    series in test_workbook_intervals, and for the whole demo year by LibreOffice."""
    book = openpyxl.load_workbook(path)
    if "Intervals" not in book.sheetnames:
        return path
    for name in ("Matching", "Intervals"):
        del book[name]
    book.save(path)
    return path


def test_agreement_holds_for_other_gwp_sets_and_a_chosen_scheme(tmp_path):
    project = DEMO / "blue_smr_hydrogen.toml"
    out = write(project, tmp_path / "b.xlsx", "--gwp", "ar4", "--scheme", "us-45v", "--set", "natural_gas.methane_emission_share=0.02")
    result = score(project, assessment=assessment_with(gwp="ar4", schemes=["us-45v"], overrides=["natural_gas.methane_emission_share=0.02"]))
    assert_agrees(recalculate_with_formulas(out, tmp_path / "calc"), result)


def test_grid_electrolysis_by_hand(tmp_path):
    """Worked example: (52 + 1.5) kWh/kg H2 x 281 g CO2e/kWh (EEA IND-353, EU-27 2018) = 15.0335 kg CO2e/kg H2."""
    out = write(DEMO / "grid_electrolysis_hydrogen.toml", tmp_path / "g.xlsx")
    results = labelled(sheet(recalculate_with_formulas(out, tmp_path / "calc"), "Results"))
    assert close(results["Total"], (52.0 + 1.5) * 281.0 / 1000.0)


for _project in DEMOS:
    if f"demo-{_project.stem}" not in LIBREOFFICE_JOBS:  # test_workbook_intervals may have registered the hourly demo
        libreoffice_job(f"demo-{_project.stem}")(lambda out, project=_project: write(project, out))


@pytest.mark.parametrize("project", DEMOS, ids=lambda p: p.stem)
def test_libreoffice_recalculates_the_engine_figures(project, libreoffice_recalculated):
    _, recalculated = libreoffice_recalculated[f"demo-{project.stem}"]
    assert_agrees(openpyxl.load_workbook(recalculated, data_only=True), score(project, assessment=assessment_with(matching="declared")))


# every exchange is a formula --------------------------------------------------------------
def test_exchange_amounts_are_formulas_not_numbers(tmp_path):
    out = write(DEMO / "blue_atr_ammonia.toml", tmp_path / "a.xlsx")
    ws = openpyxl.load_workbook(out)["Calculation"]
    amounts = [row[6] for row in ws.iter_rows() if row[2].value in ("input", "emission")]
    assert len(amounts) > 20
    numbers = [cell.value for cell in amounts if not (isinstance(cell.value, str) and cell.value.startswith("="))]
    assert numbers == [1.0]  # only the constant 1 kg CO2 sent to storage per kg captured (x*0 terms are left out)


def test_changing_an_input_moves_the_result(tmp_path):
    """Edit an input with openpyxl; the recalculated total follows (Excel-side of the round trip)."""
    out = write(DEMO / "grid_electrolysis_hydrogen.toml", tmp_path / "g.xlsx")
    book = openpyxl.load_workbook(out)
    inputs = book["Inputs"]
    row = next(r for r in range(1, inputs.max_row + 1) if inputs.cell(r, 1).value == "electrolysis.electricity_kwh_per_kg_h2")
    inputs.cell(row, 2).value = 48.0
    book.save(out)
    results = labelled(sheet(recalculate_with_formulas(out, tmp_path / "calc"), "Results"))
    assert close(results["Total"], (48.0 + 1.5) * 281.0 / 1000.0)


# round trip -------------------------------------------------------------------------------
def _edit_input(path: Path, parameter: str, value) -> str:
    book = openpyxl.load_workbook(path)
    ws = book["Inputs"]
    row = next(r for r in range(1, ws.max_row + 1) if ws.cell(r, 1).value == parameter)
    ws.cell(row, 2).value = value
    book.save(path)
    return f"B{row}"


def test_round_trip_with_an_edited_input(tmp_path):
    project = DEMO / "green_electrolysis_ammonia.toml"
    out = write(project, tmp_path / "g.xlsx", "--gwp", "ar5")
    _edit_input(out, "electrolysis.electricity_kwh_per_kg_h2", 49.5)
    code, text, err = run_cli("score", "--from-workbook", str(out), "--format", "json")
    assert code == 0, err
    import json

    from_workbook = json.loads(text)
    expected = score(project, assessment=assessment_with(gwp="ar5", overrides=["electrolysis.electricity_kwh_per_kg_h2=49.5"]))
    assert from_workbook["gwp_basis"] == "ar5"  # the cover's setting, not the command's default
    assert close(from_workbook["total"], expected.total)
    assert from_workbook["by_stage"] == pytest.approx(expected.by_stage, rel=1e-12)
    recalculated = labelled(sheet(recalculate_with_formulas(out, tmp_path / "calc"), "Results"))
    assert close(recalculated["Total"], from_workbook["total"])


def test_round_trip_of_an_edited_factor(tmp_path):
    out = write(DEMO / "grid_electrolysis_hydrogen.toml", tmp_path / "g.xlsx")
    book = openpyxl.load_workbook(out)
    ws = book["Factors"]
    row = next(r for r in range(1, ws.max_row + 1) if ws.cell(r, 1).value == "electricity.grid.eu27_2018")
    ws.cell(row, 2).value = 200.0
    book.save(out)
    code, text, err = run_cli("score", "--from-workbook", str(out), "--format", "json")
    assert code == 0, err
    import json

    assert close(json.loads(text)["total"], 53.5 * 200.0 / 1000.0)
    recalculated = labelled(sheet(recalculate_with_formulas(out, tmp_path / "calc"), "Results"))
    assert close(recalculated["Total"], 53.5 * 200.0 / 1000.0)


def test_workbook_from_workbook_keeps_the_edit(tmp_path):
    out = write(DEMO / "grid_electrolysis_hydrogen.toml", tmp_path / "g.xlsx")
    _edit_input(out, "hydrogen.conditioning_kwh_per_kg_h2", 3.0)
    code, _, err = run_cli("workbook", "--from-workbook", str(out), "-o", str(tmp_path / "again.xlsx"))
    assert code == 0, err
    results = labelled(sheet(recalculate_with_formulas(tmp_path / "again.xlsx", tmp_path / "calc"), "Results"))
    assert close(results["Total"], (52.0 + 3.0) * 281.0 / 1000.0)


def test_text_in_a_number_cell_names_the_sheet_and_cell(tmp_path):
    out = write(DEMO / "grey_smr_ammonia.toml", tmp_path / "g.xlsx")
    cell = _edit_input(out, "reforming.natural_gas_gj_per_kg_h2", "about 0.16")
    code, text, err = run_cli("score", "--from-workbook", str(out))
    assert code == 2 and text == ""
    assert err.count("\n") == 1 and err.startswith("error: ")
    assert f"sheet Inputs, cell {cell} (reforming.natural_gas_gj_per_kg_h2)" in err and "a number" in err


def test_a_deleted_sheet_is_named(tmp_path):
    out = write(DEMO / "grey_smr_ammonia.toml", tmp_path / "g.xlsx")
    book = openpyxl.load_workbook(out)
    del book["Inputs"]
    book.save(out)
    code, _, err = run_cli("score", "--from-workbook", str(out))
    assert code == 2 and "sheet Inputs" in err and err.count("\n") == 1


def test_text_in_a_factor_cell_is_named(tmp_path):
    out = write(DEMO / "grey_smr_ammonia.toml", tmp_path / "g.xlsx")
    book = openpyxl.load_workbook(out)
    book["Factors"]["B5"].value = "n/a"
    book.save(out)
    code, _, err = run_cli("score", "--from-workbook", str(out))
    assert code == 2 and "sheet Factors, cell B5" in err


def test_not_a_workbook(tmp_path):
    bad = tmp_path / "x.xlsx"
    bad.write_text("not a workbook")
    code, _, err = run_cli("score", "--from-workbook", str(bad))
    assert code == 2 and err.startswith("error: ")


# safety -----------------------------------------------------------------------------------
INJECTIONS = ['=HYPERLINK("http://example.invalid","x")', "+1+1", "-2+3", "@SUM(1,1)"]


def write_injection_workbook(out: Path) -> Path:
    """The grid demo with formula-like text in the name, site, note and an electricity source."""
    project = out.with_suffix(".toml")
    text = (DEMO / "grid_electrolysis_hydrogen.toml").read_text()
    text = re.sub(r'^name = .*$', 'name = """' + INJECTIONS[0] + '"""', text, count=1, flags=re.M)
    text = re.sub(r'^site = .*$', 'site = "' + INJECTIONS[1] + '"', text, count=1, flags=re.M)
    text = re.sub(r'^note = .*$', 'note = "' + INJECTIONS[2] + '"', text, count=1, flags=re.M)
    text = text.replace("[electricity.sources.grid]", '[electricity.sources."@SUM(1,1)"]')
    project.write_text(text)
    return write(project, out)


libreoffice_job("injection")(write_injection_workbook)


def test_formula_injection_strings_stay_text(tmp_path):
    out = write_injection_workbook(tmp_path / "p.xlsx")
    book = openpyxl.load_workbook(out)
    found = {}
    for ws in book.worksheets:
        for row in ws.iter_rows():
            for cell in row:
                for injection in INJECTIONS:
                    if isinstance(cell.value, str) and injection in cell.value:
                        found.setdefault(injection, set()).add(cell.data_type)
    assert set(found) == set(INJECTIONS)  # each string was written somewhere...
    assert all(kinds == {"s"} for kinds in found.values())  # ...and only ever as text
    values = recalculate_with_formulas(out, tmp_path / "calc")
    cover = labelled(sheet(values, "Cover"))
    assert cover["Project"] == INJECTIONS[0]
    # and the round trip gives the same text back
    code, text, err = run_cli("score", "--from-workbook", str(out), "--format", "json")
    assert code == 0, err
    assert '"project": "=HYPERLINK' in text


def test_formula_injection_strings_stay_text_in_libreoffice(libreoffice_recalculated):
    _, recalculated = libreoffice_recalculated["injection"]
    cover = labelled(sheet(openpyxl.load_workbook(recalculated, data_only=True), "Cover"))
    assert cover["Project"] == INJECTIONS[0]


def test_existing_file_is_not_overwritten_without_force(tmp_path):
    out = tmp_path / "w.xlsx"
    out.write_bytes(b"keep me")
    code, _, err = run_cli("workbook", str(DEMO / "grey_smr_ammonia.toml"), "-o", str(out))
    assert code == 2 and "--force" in err
    assert out.read_bytes() == b"keep me"
    code, _, err = run_cli("workbook", str(DEMO / "grey_smr_ammonia.toml"), "-o", str(out), "--force")
    assert code == 0, err
    assert out.read_bytes()[:2] == b"PK"
    assert not [p for p in tmp_path.iterdir() if p.name.endswith(".part")]


def test_boundary_option(tmp_path):
    code, _, err = run_cli("workbook", str(DEMO / "grey_smr_ammonia.toml"), "-o", str(tmp_path / "a.xlsx"), "--boundary", "cradle-to-gate")
    assert code == 0, err
    code, _, err = run_cli("workbook", str(DEMO / "grey_smr_ammonia.toml"), "-o", str(tmp_path / "b.xlsx"), "--boundary", "to-the-moon")
    assert code == 2 and "--boundary" in err
    assert not (tmp_path / "b.xlsx").exists()


def test_well_to_wake_workbook_recalculates_the_engine_figures(tmp_path):
    project = DEMO / "grey_smr_ammonia_shipped.toml"
    out = write(project, tmp_path / "wake.xlsx", "--boundary", "well-to-wake")
    assert_agrees(recalculate_with_formulas(out, tmp_path / "calc"), score(project, assessment=assessment_with(boundary="well-to-wake")))


def test_cover_states_what_a_verifier_needs(tmp_path):
    from carbonledger import CAUTION, __version__
    from carbonledger.model.factors import load_factor_set

    out = write(DEMO / "blue_atr_ammonia.toml", tmp_path / "a.xlsx")
    book = openpyxl.load_workbook(out)
    cover = labelled(book["Cover"])
    assert cover["carbonledger version"] == __version__
    assert cover["Factor set sha256"] == load_factor_set().sha256
    assert cover["Boundary"] == "cradle-to-gate" and cover["GWP100 set of the headline result"] == "ar6"
    assert any(CAUTION in str(cell.value) for cell in book["Cover"]["A"])
    assert book["Results"]._charts, "a chart of contributions by stage"
    factors = labelled(book["Factors"], column=9)
    # source grades (factors/CHECKS.md section 16): the CO2 default repeated by Regulation (EU) 2018/2066, a faithful copy;
    # CH4 not read in any text
    assert factors["combustion.natural_gas.co2"] == "verbatim secondary"
    assert factors["combustion.natural_gas.ch4"] == "not yet verified against the source document"
    assert "reference.molar_mass.nh3" in factors


def _trees():
    from hypothesis import strategies as st

    leaves = st.sampled_from(["A1", "B1", "C1"]) | st.floats(min_value=-50, max_value=50, allow_nan=False).filter(lambda x: abs(x) > 1e-3)
    return st.recursive(leaves, lambda inner: st.tuples(st.sampled_from("+-*/n"), inner, inner), max_leaves=8)


def _build(tree, values, symbolic: bool):
    if isinstance(tree, str):
        return Term(tree) if symbolic else values[tree]
    if isinstance(tree, float):
        return tree
    operator, left, right = tree
    a, b = _build(left, values, symbolic), _build(right, values, symbolic)
    if operator == "n":
        return -a if not isinstance(a, float) or not symbolic else -Term.of(a)
    if operator == "/" and not symbolic and b == 0:
        raise ZeroDivisionError
    return {"+": lambda: a + b, "-": lambda: a - b, "*": lambda: a * b, "/": lambda: a / b}[operator]()


def test_any_expression_prints_with_the_right_parentheses():
    """Property: the formula text, evaluated with the usual precedence (Python's, the same as the
    spreadsheet's for + - * / and unary minus in parentheses), equals the float arithmetic."""
    from hypothesis import given, settings

    values = {"A1": 2.5, "B1": -3.25, "C1": 7.0}

    @settings(max_examples=150, deadline=None)
    @given(_trees())
    def check(tree):
        try:
            expected = _build(tree, values, symbolic=False)
        except ZeroDivisionError:
            return
        term = _build(tree, values, symbolic=True)
        text = term.text if isinstance(term, Term) else Term.of(term).text
        assert math.isclose(_evaluate(text, values), expected, rel_tol=1e-12, abs_tol=1e-12), text

    check()


def test_a_formula_typed_into_an_input_cell(tmp_path):
    out = write(DEMO / "grid_electrolysis_hydrogen.toml", tmp_path / "g.xlsx")
    cell = _edit_input(out, "electrolysis.electricity_kwh_per_kg_h2", "=50+2")
    code, _, err = run_cli("score", "--from-workbook", str(out))
    assert code == 2 and f"sheet Inputs, cell {cell}" in err and "no saved value" in err


@libreoffice_job("blue-atr-ar5")
def _blue_atr_ar5(out: Path) -> Path:
    return write(DEMO / "blue_atr_ammonia.toml", out, "--gwp", "ar5")


def test_round_trip_through_a_workbook_saved_by_libreoffice(libreoffice_recalculated):
    """A workbook opened and saved by LibreOffice still reads back: same inputs, same score."""
    import json

    _, saved_by_libreoffice = libreoffice_recalculated["blue-atr-ar5"]
    code, text, err = run_cli("score", "--from-workbook", str(saved_by_libreoffice), "--format", "json")
    assert code == 0, err
    data = json.loads(text)
    expected = score(DEMO / "blue_atr_ammonia.toml", assessment=assessment_with(gwp="ar5"))
    assert close(data["total"], expected.total) and data["factor_set"]["sha256"] == expected.factor_set.sha256


def test_a_loop_in_the_supply_chain_is_refused():
    from carbonledger.core.inventory import Inventory
    from carbonledger.errors import InputError
    from carbonledger.io.workbook.calculation import check_acyclic
    from carbonledger.routes.base import Activity

    gas = Activity("natural_gas_supply", "natural_gas_supply", "gas", "GJ")
    power = Activity("electricity_mix", "electricity_supply", "power", "kWh")
    gas.consume("electricity_mix", 2.0, "compression", "kWh")
    power.consume("natural_gas_supply", 0.01, "gas turbine", "GJ")
    inventory = Inventory({"natural_gas_supply": gas, "electricity_mix": power}, "electricity_mix", "electricity_mix", "hydrogen", {})
    with pytest.raises(InputError, match="without loops"):
        check_acyclic(inventory, "p.toml")
    power.exchanges.clear()
    assert check_acyclic(inventory, "p.toml") == ["natural_gas_supply", "electricity_mix"]  # consumer first


def test_library_functions_for_other_commands(tmp_path):
    """What `compare --from-workbook` can call: the validated project and the cover's settings."""
    from carbonledger.api import score_workbook
    from carbonledger.io.workbook.reader import load_project_from_workbook

    out = write(DEMO / "blue_atr_ammonia.toml", tmp_path / "a.xlsx", "--gwp", "ar4", "--scheme", "japan-ammonia")
    project, sha, settings = load_project_from_workbook(out, ["capture.capture_rate=0.9"])
    assert project.capture.capture_rate == 0.9 and len(sha) == 64
    assert (settings.gwp, settings.schemes, settings.factor_set) == ("ar4", ["japan-ammonia"], "default-2026")
    result = score_workbook(out)
    assert [c.scheme for c in result.checks] == ["japan-ammonia"] and result.gwp_basis == "ar4"


def test_override_factors_travel_with_the_workbook(tmp_path):
    """A factor override CSV shapes the workbook; the round trip still works once the CSV is gone,
    because every factor used is on the Factors sheet."""
    import json

    override = tmp_path / "site_grid.csv"
    override.write_text(
        "id,value,unit,source,table,year,region,note,from_memory\n"
        "electricity.grid.eu27_2018,150,g CO2e/kWh,Invented test value,,2026,,test only,true\n"
    )
    project = DEMO / "grid_electrolysis_hydrogen.toml"
    out = write(project, tmp_path / "g.xlsx", "--factors", str(override))
    assert labelled(openpyxl.load_workbook(out)["Cover"])["Factor set"] == "default-2026+site_grid"
    results = labelled(sheet(recalculate_with_formulas(out, tmp_path / "calc"), "Results"))
    assert close(results["Total"], 53.5 * 150.0 / 1000.0)
    override.unlink()
    code, text, err = run_cli("score", "--from-workbook", str(out), "--format", "json")
    assert code == 0, err
    assert close(json.loads(text)["total"], 53.5 * 150.0 / 1000.0)
