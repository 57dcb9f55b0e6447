"""The audit workbook's Matching and Intervals sheets: an electricity time series, one row per interval,
matched with contracted generation as live formulas, recalculated by the `formulas` library and by
LibreOffice equal to the engine's matching to 1e-9."""

from __future__ import annotations

import math
from pathlib import Path

import openpyxl
import pytest
from helpers import assessment_with
from workbook_support import DEMO, LIBREOFFICE_JOBS, libreoffice_job, recalculate_with_formulas, run_cli, sheet

from carbonledger.api import score
from tests.test_matching import PROJECT


def close(a, b, rel=1e-9):
    return math.isclose(a, b, rel_tol=rel, abs_tol=1e-9)


def summary_rows(values_workbook) -> dict[str, tuple]:
    """scheme -> (use, matched, matched share, grid kWh/kg H2, engine share, engine grid kWh/kg) of the Matching sheet."""
    ws = sheet(values_workbook, "Matching")
    found = {}
    for row in ws.iter_rows(min_row=1, max_row=ws.max_row, values_only=True):
        if row[0] == "month":
            break
        if row[0] != "scheme" and isinstance(row[3], str) and row[3].startswith("matching "):
            found[row[0]] = (row[4], row[5], row[6], row[7], row[8], row[9])
    return found


def month_rows(values_workbook) -> dict[str, tuple]:
    ws = sheet(values_workbook, "Matching")
    rows = list(ws.iter_rows(min_row=1, max_row=ws.max_row, values_only=True))
    header = next(number for number, row in enumerate(rows) if row[0] == "month")
    return {row[0]: row for row in rows[header + 1 :] if row[0]}, rows[header]


def assert_matching_agrees(values_workbook, result) -> None:
    """Every scheme's matched share and grid kWh/kg H2, and every month's use and matched energy, equal the engine's."""
    summary = summary_rows(values_workbook)
    months, header = month_rows(values_workbook)
    checked = 0
    for check in result.checks:
        matching = check.electricity_matching
        use, matched, share, grid, *_ = summary[check.scheme]
        assert close(use, matching.load_kwh), (check.scheme, use, matching.load_kwh)
        assert close(matched, matching.matched_kwh), (check.scheme, matched, matching.matched_kwh)
        assert close(share, matching.matched_share), (check.scheme, share, matching.matched_share)
        assert close(grid, matching.grid_kwh_per_kg_h2), (check.scheme, grid, matching.grid_kwh_per_kg_h2)
        column = list(header).index(f"{check.scheme}: matched (kWh)")
        for month in matching.monthly:
            row = months[month.month]
            assert close(row[1], month.load_kwh) and close(row[column], month.matched_kwh), (check.scheme, month.month)
            assert close(row[column + 1], month.unmatched_kwh) and close(row[column + 2], month.matched_share)
        checked += 1
    assert checked == len(summary) > 0


SMALL_HEADER = "timestamp,electrolyser [kWh],generation.solar [kWh],generation.wind [kWh],grid_intensity [g CO2e/kWh]"


def small_project(folder: Path, rows: list[str], header: str = SMALL_HEADER) -> Path:
    folder.mkdir(parents=True, exist_ok=True)
    (folder / "p.toml").write_text(PROJECT, encoding="utf-8")
    (folder / "series.csv").write_text(header + "\n" + "\n".join(rows) + "\n", encoding="utf-8")
    return folder / "p.toml"


def hand_rows() -> list[str]:
    """Four hours across a month end (+01:00): use 100 kWh each; solar 150, 0, 60, 0; wind 0, 30, 0, 0;
    grid 300, 200, 250, 400 g CO2e/kWh."""
    stamps = ["2026-01-31T22:00+01:00", "2026-01-31T23:00+01:00", "2026-02-01T00:00+01:00", "2026-02-01T01:00+01:00"]
    return [f"{s},100,{solar},{wind},{grid}" for s, solar, wind, grid in zip(stamps, (150, 0, 60, 0), (0, 30, 0, 0), (300, 200, 250, 400), strict=True)]


def write_workbook(project: Path, out: Path, *options: str) -> Path:
    code, _, err = run_cli("workbook", str(project), "-o", str(out), "--no-ledger", *options)
    assert code == 0, err
    return out


def test_matching_sheet_by_hand(tmp_path):
    """Worked by hand (PROJECT: 50 kWh/kg H2, no other electricity). Per interval (UK standard: its own
    interval): MIN(100, 150) + MIN(100, 30) + MIN(100, 60) + MIN(100, 0) = 100 + 30 + 60 + 0 = 190 of 400 kWh,
    share 0.475, grid (1 - 0.475) x 50 = 26.25 kWh/kg H2. Per calendar month (EU RFNBO until 2029,
    Delegated Regulation (EU) 2023/1184 Art. 6): January MIN(200, 180) = 180, February MIN(200, 60) = 60,
    240 of 400, share 0.6, grid 20 kWh/kg H2."""
    project = small_project(tmp_path / "hand", hand_rows())
    values = recalculate_with_formulas(write_workbook(project, tmp_path / "hand.xlsx"), tmp_path / "calc")
    summary = summary_rows(values)
    assert summary["uk-lchs"][:4] == pytest.approx((400.0, 190.0, 0.475, 26.25), rel=1e-12)
    assert summary["eu-rfnbo"][:4] == pytest.approx((400.0, 240.0, 0.6, 20.0), rel=1e-12)
    months, header = month_rows(values)
    column = list(header).index("eu-rfnbo: matched (kWh)")
    assert (months["2026-01"][column], months["2026-02"][column]) == pytest.approx((180.0, 60.0))
    assert_matching_agrees(values, score(project))


def test_interval_formulas_are_live(tmp_path):
    """The matched energy is a formula over the use and generation cells, not a number."""
    book = openpyxl.load_workbook(write_workbook(small_project(tmp_path / "live", hand_rows()), tmp_path / "live.xlsx"))
    ws = book["Intervals"]
    header = [cell.value for cell in ws[3]]
    matched = [number for number, text in enumerate(header) if text and text.endswith("matched (kWh)")]
    assert matched and all(str(ws.cell(row=4, column=number + 1).value).startswith(("=MIN(", "=IF(")) for number in matched)
    assert ws["B4"].value == 100 and ws["B4"].fill.start_color.rgb.endswith("F6ECD9")  # an input, styled as one
    assert book["Matching"]["B3"].value.startswith("=Calculation!")


def test_hydrogen_series_and_sub_hourly_intervals_under_an_hourly_rule(tmp_path):
    """15-minute data in 2030 (EU RFNBO hourly from 1 January 2030, Delegated Regulation (EU) 2023/1184
    Art. 6): each hour's four intervals form one period. A series of hydrogen (kg) gives the use as
    hydrogen x the Calculation sheet's kWh per kg, a live formula."""
    rows = []
    for quarter in range(16):
        hour, minute = divmod(quarter * 15, 60)
        rows.append(f"2030-03-01T{hour:02d}:{minute:02d}+01:00,{0.5 + 0.1 * (quarter % 3)},{[40, 0, 10, 5][quarter % 4]},{[0, 12, 3, 0][quarter // 4]},{200 + 10 * quarter}")
    header = "timestamp,hydrogen [kg],generation.solar [kWh],generation.wind [kWh],grid_intensity [g CO2e/kWh]"
    project = small_project(tmp_path / "quarter", rows, header)
    values = recalculate_with_formulas(write_workbook(project, tmp_path / "quarter.xlsx", "--year", "2030"), tmp_path / "calc")
    result = score(project, assessment=assessment_with(year=2030))
    rfnbo = next(check for check in result.checks if check.scheme == "eu-rfnbo").electricity_matching
    assert rfnbo.granularity == "hour" and rfnbo.periods == 4
    assert_matching_agrees(values, result)


HOURLY_DEMO = "demo-hybrid_hourly_hydrogen"  # the same job (and name) as test_workbook's demo workbooks
if HOURLY_DEMO not in LIBREOFFICE_JOBS:
    libreoffice_job(HOURLY_DEMO)(lambda out: write_workbook(DEMO / "hybrid_hourly_hydrogen.toml", out))


@libreoffice_job("intervals-hand")
def _hand_for_libreoffice(out: Path) -> Path:
    return write_workbook(small_project(out.parent / "intervals-hand", hand_rows()), out)


def test_libreoffice_recalculates_the_matching_of_the_hourly_demo(libreoffice_recalculated):
    """The demo's year of hourly intervals (8,760 rows), as LibreOffice recalculates it (the workbook is
    the one of test_workbook's demo job: one LibreOffice start for all)."""
    _, recalculated = libreoffice_recalculated[HOURLY_DEMO]
    values = openpyxl.load_workbook(recalculated, data_only=True)
    assert_matching_agrees(values, score(DEMO / "hybrid_hourly_hydrogen.toml"))
    _, recalculated = libreoffice_recalculated["intervals-hand"]
    summary = summary_rows(openpyxl.load_workbook(recalculated, data_only=True))
    assert summary["uk-lchs"][:4] == pytest.approx((400.0, 190.0, 0.475, 26.25), rel=1e-12)  # the hand figures above


def sheet_rows(path: Path, name: str, first: int) -> list[tuple]:
    ws = openpyxl.load_workbook(path)[name]
    return list(ws.iter_rows(min_row=first, values_only=True))


def test_from_workbook_keeps_the_intervals_of_the_hourly_demo(tmp_path):
    """Issue 19 point 6: a workbook written with --from-workbook from the hourly demo's workbook keeps its
    Intervals sheet, every cell from the header row down the same (8,760 hourly rows: times, use,
    generation, grid intensity as inputs, the matching as formulas), and the Matching sheet below its title."""
    first = write_workbook(DEMO / "hybrid_hourly_hydrogen.toml", tmp_path / "first.xlsx")
    code, _, err = run_cli("workbook", "--from-workbook", str(first), "-o", str(tmp_path / "again.xlsx"), "--no-ledger")
    assert code == 0, err
    again = tmp_path / "again.xlsx"
    assert openpyxl.load_workbook(again).sheetnames == openpyxl.load_workbook(first).sheetnames
    original = sheet_rows(first, "Intervals", 3)
    assert len(original) == 1 + 8760 and original[1][0].startswith("2026-01-01T00:00")  # header and one year of hours
    assert sheet_rows(again, "Intervals", 3) == original
    assert sheet_rows(again, "Matching", 2) == sheet_rows(first, "Matching", 2)


def test_from_workbook_keeps_a_hydrogen_series_and_its_hand_figures(tmp_path):
    """A series of hydrogen (kg) in 15-minute intervals is read back from the hydrogen column (the use
    column is then a formula), and the hand-worked figures of test_matching_sheet_by_hand hold in the
    workbook written from the first one: 190 of 400 kWh matched per interval, 240 per month."""
    project = small_project(tmp_path / "hand", hand_rows())
    first = write_workbook(project, tmp_path / "hand.xlsx")
    code, _, err = run_cli("workbook", "--from-workbook", str(first), "-o", str(tmp_path / "again.xlsx"), "--no-ledger")
    assert code == 0, err
    summary = summary_rows(recalculate_with_formulas(tmp_path / "again.xlsx", tmp_path / "calc"))
    assert summary["uk-lchs"][:4] == pytest.approx((400.0, 190.0, 0.475, 26.25), rel=1e-12)
    assert summary["eu-rfnbo"][:4] == pytest.approx((400.0, 240.0, 0.6, 20.0), rel=1e-12)
    rows = [f"2030-03-01T{q // 4:02d}:{15 * (q % 4):02d}+01:00,{0.5 + 0.1 * (q % 3)},{[40, 0, 10, 5][q % 4]},{[0, 12, 3, 0][q // 4]},{200 + 10 * q}" for q in range(16)]
    hydrogen = small_project(tmp_path / "quarter", rows, "timestamp,hydrogen [kg],generation.solar [kWh],generation.wind [kWh],grid_intensity [g CO2e/kWh]")
    first = write_workbook(hydrogen, tmp_path / "quarter.xlsx", "--year", "2030")
    code, _, err = run_cli("workbook", "--from-workbook", str(first), "-o", str(tmp_path / "quarter-again.xlsx"), "--no-ledger", "--year", "2030")
    assert code == 0, err
    assert sheet_rows(tmp_path / "quarter-again.xlsx", "Intervals", 3) == sheet_rows(first, "Intervals", 3)
