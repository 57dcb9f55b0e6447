"""Metered periods: the month blocks against a hand-computed month, the engine and the meters."""

from __future__ import annotations

import math

import pytest
from workbook_support import DEMO, VERDICT_WORDS, libreoffice_job, recalculate_with_formulas, run_cli, sheet

from carbonledger.analyses.periods import month_results, read_meters
from carbonledger.api import score
from carbonledger.core.assessment import Assessment
from carbonledger.model.factors import load_factor_set
from carbonledger.routes.project import load_project

GREEN = DEMO / "green_electrolysis_ammonia.toml"
GREEN_METERS = """month,electricity.solar [MWh],electricity.wind [MWh],hydrogen [t],ammonia [t]
2026-01,30000,40000,1250,6900
2026-02,36000,35000,1290,7100
"""


def close(a, b, rel=1e-9):
    return math.isclose(a, b, rel_tol=rel, abs_tol=1e-9)


def summary(values_workbook) -> dict[str, tuple]:
    ws = sheet(values_workbook, "Periods")
    rows = {}
    for row in ws.iter_rows(min_row=1, max_row=ws.max_row, values_only=True):
        if isinstance(row[0], str) and row[0] not in rows:
            rows[row[0]] = row
    return rows


def test_a_month_by_hand(tmp_path):
    """January: 30,000 MWh of solar at 48 g CO2e/kWh and 40,000 MWh of wind at 11 g CO2e/kWh
    (IPCC AR5 WG3 Annex III medians, recorded from memory in the factor set) for 6,900 t NH3.
    Every emission of this project is electricity, so
    (30,000,000 kWh x 0.048 + 40,000,000 kWh x 0.011) kg / 6,900 t = (1,440,000 + 440,000) / 6,900
    = 272.4638 kg CO2e/t NH3. February: (36e6 x 0.048 + 35e6 x 0.011) / 7,100 = 2,113,000 / 7,100.
    The year is output-weighted: (1,880,000 + 2,113,000) / (6,900 + 7,100)."""
    meters = tmp_path / "m.csv"
    meters.write_text(GREEN_METERS)
    out = tmp_path / "p.xlsx"
    code, _, err = run_cli("workbook", str(GREEN), "-o", str(out), "--periods", str(meters))
    assert code == 0, err
    rows = summary(recalculate_with_formulas(out, tmp_path / "calc"))
    assert close(rows["2026-01"][2], 1_880_000 / 6_900)
    assert close(rows["2026-01"][3], 1_880_000)
    assert close(rows["2026-02"][2], 2_113_000 / 7_100)
    assert close(rows["all months (output-weighted)"][2], (1_880_000 + 2_113_000) / (6_900 + 7_100))
    assert close(rows["all months (output-weighted)"][1], 14_000)


GREY_METERS_NM3 = """# invented readings for the invented grey ammonia demo plant
month,electricity.grid [kWh],natural_gas [Nm3],ammonia [t]
2026-05,9100000,24500000,30000
2026-06,8700000,23100000,28500
2026-07,9900000,26800000,32800
"""


MONTH_BLOCK_CASES = {
    "grey-nm3": (DEMO / "grey_smr_ammonia.toml", GREY_METERS_NM3),
    "blue-smr-capture-gas": (DEMO / "blue_smr_hydrogen.toml", "month,electricity.grid [MWh],natural_gas [TJ],hydrogen [t]\n2026-01,5400,1820,10100\n2026-02,5100,1710,9600\n"),
}


def _month_block_job(case: str):
    project, text = MONTH_BLOCK_CASES[case]

    def build(out):
        meters = out.with_suffix(".csv")
        meters.write_text(text)
        code, _, err = run_cli("workbook", str(project), "-o", str(out), "--periods", str(meters))
        assert code == 0, err
        return out

    return build


for _case in MONTH_BLOCK_CASES:
    libreoffice_job(f"periods-{_case}")(_month_block_job(_case))


@pytest.mark.parametrize("case", sorted(MONTH_BLOCK_CASES))
def test_month_blocks_agree_with_the_engine_and_the_meters(case, libreoffice_recalculated):
    # recalculated in the session's one LibreOffice start (a month by hand above uses the formulas library)
    import openpyxl

    written, recalculated = libreoffice_recalculated[f"periods-{case}"]
    project, _ = MONTH_BLOCK_CASES[case]
    assert_months_agree(openpyxl.load_workbook(recalculated, data_only=True), project, written.with_suffix(".csv"))


@libreoffice_job("blue-atr-periods")
def _blue_atr_periods(out):
    code, _, err = run_cli("workbook", str(DEMO / "blue_atr_ammonia.toml"), "-o", str(out), "--periods", str(DEMO / "blue_atr_ammonia_meters_2026.csv"))
    assert code == 0, err
    return out


def test_libreoffice_recalculates_the_period_blocks(libreoffice_recalculated):
    # The twelve demo months (the formulas library takes minutes on them; LibreOffice recalculates
    # them in the session's one start).
    import openpyxl

    _, recalculated = libreoffice_recalculated["blue-atr-periods"]
    months = assert_months_agree(openpyxl.load_workbook(recalculated, data_only=True), DEMO / "blue_atr_ammonia.toml", DEMO / "blue_atr_ammonia_meters_2026.csv")
    assert months == 12


def assert_months_agree(values_workbook, project, meters) -> int:
    """Each recalculated month equals the engine's month, reproduces its meters, and is checked
    against every scheme as the engine checks it; the year is the output-weighted mean. Returns
    the number of months."""
    model, _ = load_project(project)
    factor_set = load_factor_set()
    parsed = read_meters(meters, model)
    engine = month_results(parsed, model, Assessment(factor_set, "ar6"), design=score(project))
    rows = summary(values_workbook)
    volume_factor = factor_set.get("natural_gas.net_calorific_value_volume").value
    for month, values, result in zip(parsed.months, parsed.values, engine, strict=True):
        assert close(rows[month][2], result.total), month
        supply = {row.activity: row.activity_supply for row in result.exchanges}
        output = rows[month][1]
        # the month reproduces its meters: electricity and gas per functional unit x output
        electricity_kwh = sum(v * c.multiplier for c, v in zip(parsed.columns, values.values(), strict=True) if c.quantity == "electricity")
        assert close(supply["electricity_mix"] * output, electricity_kwh)
        gas = next(c for c in parsed.columns if c.quantity == "natural_gas")
        gas_gj = values[gas.header] * (volume_factor / 1000.0 if gas.by_volume else gas.multiplier)
        assert close(supply["natural_gas_supply"] * output, gas_gj)
    year = rows["all months (output-weighted)"]
    emissions = sum(r.total * rows[m][1] for m, r in zip(parsed.months, engine, strict=True))
    assert close(year[2], emissions / sum(rows[m][1] for m in parsed.months))
    assert close(year[4], year[2])  # the engine's metered year, written beside the formula, equals it
    # each month is checked against every scheme: value equals the engine's, verdict its pass/fail
    stages = len(score(project).by_stage)
    for month, result in zip(parsed.months, engine, strict=True):
        for position, check in enumerate(result.checks):
            column = 5 + stages + 3 * position
            assert close(rows[month][column], check.value), (month, check.scheme)
            assert rows[month][column + 1] == VERDICT_WORDS[check.status]
    for position, check in enumerate(engine[0].checks):
        column = 5 + stages + 3 * position
        weighted = sum(r.checks[position].value * rows[m][1] for m, r in zip(parsed.months, engine, strict=True)) / sum(rows[m][1] for m in parsed.months)
        assert close(year[column], weighted), check.scheme
    return len(parsed.months)


def test_the_metered_year_is_printed_and_formatted(tmp_path):
    """Issue 19 point 3: with meters the command prints the metered year, not the design figure, and the
    Periods sheet's year row shows it as a number with one decimal. Worked here from the meters CSV
    itself: the year = sum over months of (the month's kg CO2e/t NH3 x its metered ammonia, t) / the
    summed ammonia (the month figures are the sheet's engine column, checked against LibreOffice above)."""
    import csv

    import openpyxl

    out = tmp_path / "periods.xlsx"
    code, stdout, err = run_cli("workbook", str(DEMO / "blue_atr_ammonia.toml"), "-o", str(out), "--periods", str(DEMO / "blue_atr_ammonia_meters_2026.csv"), "--no-ledger")
    assert code == 0, err
    lines = [line for line in (DEMO / "blue_atr_ammonia_meters_2026.csv").read_text(encoding="utf-8").splitlines() if not line.startswith("#")]
    ammonia_t = {row["month"]: float(row["ammonia [t]"]) for row in csv.DictReader(lines)}
    ws = openpyxl.load_workbook(out)["Periods"]
    rows = {row[0].value: row for row in ws.iter_rows(min_row=5, max_col=5) if row[0].value}
    assert len(ammonia_t) == 12 and set(ammonia_t) <= set(rows)
    year = sum(rows[month][4].value * t for month, t in ammonia_t.items()) / sum(ammonia_t.values())
    design = score(DEMO / "blue_atr_ammonia.toml").total
    assert abs(year - design) > 1.0  # the metered year differs from the design figure, so printing the wrong one shows
    written = rows["all months (output-weighted)"]
    assert close(written[4].value, year)
    assert written[2].number_format == written[4].number_format == "#,##0.0"  # 564.5, not 17 digits
    assert f"metered year {year:,.4g} kg CO2e/t NH3" in stdout and f"design {design:,.4g}" in stdout


def test_volume_factor_is_near_pure_methane():
    """From memory (flagged in the factor set): pipeline gas about 36 MJ/Nm3 (LHV). Check against
    pure methane as an ideal gas at 0 degC and 101.325 kPa: rho = p M / (R T) with M from the
    chemicals library and R = 8.314462618 J/(mol K) (CODATA 2018), times methane's LHV
    50.04 MJ/kg (CRC Handbook via Fay and Golomb, Table 3.1): about 35.8 MJ/Nm3."""
    from chemicals.elements import molecular_weight, simple_formula_parser

    molar_mass = molecular_weight(simple_formula_parser("CH4")) / 1000.0
    density = 101_325.0 * molar_mass / (8.314462618 * 273.15)
    methane = density * 50.04  # about 35.8 MJ/Nm3
    value = load_factor_set().get("natural_gas.net_calorific_value_volume").value
    assert abs(value - methane) / methane < 0.10


BAD = {
    "unknown column": ("month,electricity.solar [MWh],electricity.wind [MWh],ammonia [t],diesel [t]\n2026-01,1,1,1,1\n", "unknown column"),
    "unknown source": ("month,electricity.grid [MWh],electricity.wind [MWh],ammonia [t]\n2026-01,1,1,1\n", "electricity source of the project"),
    "missing month": ("month,electricity.solar [MWh],electricity.wind [MWh],ammonia [t]\n2026-01,1,1,1\n2026-03,1,1,1\n", "missing"),
    "repeated month": ("month,electricity.solar [MWh],electricity.wind [MWh],ammonia [t]\n2026-01,1,1,1\n2026-01,1,1,1\n", "appears twice"),
    "negative": ("month,electricity.solar [MWh],electricity.wind [MWh],ammonia [t]\n2026-01,1,-1,1\n", "line 2, electricity.wind [MWh]: a number >= 0"),
    "text": ("month,electricity.solar [MWh],electricity.wind [MWh],ammonia [t]\n2026-01,1,n/a,1\n", "line 2, electricity.wind [MWh]: a number, got 'n/a'"),
    "unit mismatch": ("month,electricity.solar [t],electricity.wind [MWh],ammonia [t]\n2026-01,1,1,1\n", "unit mismatch"),
    "no unit": ("month,electricity.solar,electricity.wind [MWh],ammonia [t]\n2026-01,1,1,1\n", "unit in brackets"),
    "missing column": ("month,electricity.solar [MWh],ammonia [t]\n2026-01,1,1\n", "electricity.wind [MWh]' (missing)"),
    "bad month": ("month,electricity.solar [MWh],electricity.wind [MWh],ammonia [t]\nJan 2026,1,1,1\n", "YYYY-MM"),
    "zero output": ("month,electricity.solar [MWh],electricity.wind [MWh],ammonia [t]\n2026-01,1,1,0\n", "production > 0"),
    "gas for an all-electric plant": ("month,electricity.solar [MWh],electricity.wind [MWh],ammonia [t],natural_gas [GJ]\n2026-01,1,1,1,5\n", "burns no natural gas"),
}


@pytest.mark.parametrize("case", list(BAD), ids=list(BAD))
def test_bad_meters_give_one_clear_line(case, tmp_path):
    text, expected = BAD[case]
    meters = tmp_path / "m.csv"
    meters.write_text(text)
    out = tmp_path / "p.xlsx"
    code, stdout, err = run_cli("workbook", str(GREEN), "-o", str(out), "--periods", str(meters))
    assert code == 2, (case, err)
    assert err.startswith("error: ") and err.count("\n") == 1 and "Traceback" not in err
    assert expected in err, err
    assert str(meters) in err
    assert not out.exists()


def test_a_month_below_the_physical_floor_is_refused(tmp_path):
    """1,000 MWh for 60 t H2 is 16.7 kWh/kg, below the higher heating value of hydrogen
    (141.88 MJ/kg = 39.41 kWh/kg, US DOE HyARC): a metering error, refused."""
    meters = tmp_path / "m.csv"
    meters.write_text("month,electricity.grid [MWh],hydrogen [t]\n2026-01,1000,60\n")
    code, _, err = run_cli("workbook", str(DEMO / "grid_electrolysis_hydrogen.toml"), "-o", str(tmp_path / "p.xlsx"), "--periods", str(meters))
    assert code == 2 and "month 2026-01" in err and "electrolysis.electricity_kwh_per_kg_h2" in err


def test_periods_need_the_plant_gate_boundary(tmp_path):
    # Meters describe the plant: a delivered boundary is refused, the plant gate accepted.
    project = DEMO / "blue_atr_ammonia_shipped.toml"
    meters = DEMO / "blue_atr_ammonia_meters_2026.csv"
    code, _, err = run_cli("workbook", str(project), "-o", str(tmp_path / "a.xlsx"), "--periods", str(meters))
    assert code == 2 and "cradle-to-gate" in err and len(err.strip().splitlines()) == 1
    assert not (tmp_path / "a.xlsx").exists()
    code, _, err = run_cli("workbook", str(project), "-o", str(tmp_path / "b.xlsx"), "--periods", str(meters), "--boundary", "cradle-to-gate")
    assert code == 0, err
