"""The audit workbook as a verifier reads and prints it: number formats, cell styles with a
legend, frozen headers, A4 landscape page set-up; LibreOffice prints it to PDF and the Results
pages carry every scheme name whole and the stages in words."""

from __future__ import annotations

import os
import re
import shutil
import subprocess

import openpyxl
import pytest
from workbook_support import DEMO, run_cli

from carbonledger.api import audit_workbook, score
from carbonledger.io.labels import stage_name
from carbonledger.io.workbook.style import FACTOR_FILL, INPUT_FILL

BLUE = DEMO / "blue_atr_ammonia.toml"
# ISO 216 A4 is 210 x 297 mm = 595.28 x 841.89 PostScript points; landscape puts the long side across.
A4_LANDSCAPE_PT = (841.89, 595.28)


@pytest.fixture(scope="module")
def workbook_file(tmp_path_factory):
    out = tmp_path_factory.mktemp("wb") / "blue.xlsx"
    code, _, err = run_cli("workbook", str(BLUE), "-o", str(out), "--no-ledger")
    assert code == 0, err
    return out


def _is_number_cell(cell) -> bool:
    value = cell.value
    if isinstance(value, bool):
        return False
    if isinstance(value, (int, float)):
        return True
    return isinstance(value, str) and value.startswith("=") and '"' not in value and not value.startswith("=IF(")


def test_every_number_has_a_format(workbook_file):
    book = openpyxl.load_workbook(workbook_file)
    unformatted = [(ws.title, cell.coordinate) for ws in book for row in ws.iter_rows() for cell in row if _is_number_cell(cell) and cell.number_format == "General"]
    assert unformatted == []
    results = book["Results"]
    shares = [row[2].number_format for row in results.iter_rows(min_row=6, max_row=12) if isinstance(row[2].value, str) and row[2].value.startswith("=IF(")]
    assert shares and all(fmt.endswith("%") for fmt in shares)  # shares of the total as percentages
    inputs = book["Inputs"]
    rate = next(row for row in inputs.iter_rows() if row[0].value == "capture.capture_rate")
    assert rate[1].number_format.endswith("%")  # a fraction input shows as a percentage
    factors = book["Factors"]
    co2 = next(row for row in factors.iter_rows() if row[0].value == "combustion.natural_gas.co2")
    assert "#,##0" in co2[1].number_format  # 56,100 kg CO2/TJ with a thousands separator
    assert all(row[5].number_format == "0" for row in factors.iter_rows(min_row=5) if isinstance(row[5].value, int))  # years without separators


def test_inputs_and_factors_look_different_from_formulas_with_a_legend(workbook_file):
    book = openpyxl.load_workbook(workbook_file)
    fill = lambda cell: (cell.fill.fgColor.rgb or "") if cell.fill and cell.fill.fill_type == "solid" else ""  # noqa: E731
    inputs = [row[1] for row in book["Inputs"].iter_rows(min_row=5) if isinstance(row[1].value, (int, float))]
    factors = [row[1] for row in book["Factors"].iter_rows(min_row=5) if isinstance(row[1].value, (int, float))]
    formulas = [cell for row in book["Calculation"].iter_rows() for cell in row if isinstance(cell.value, str) and cell.value.startswith("=")]
    assert inputs and factors and formulas
    assert {fill(c) for c in inputs} == {INPUT_FILL}
    assert {fill(c) for c in factors} == {FACTOR_FILL}
    assert not {fill(c) for c in formulas} & {INPUT_FILL, FACTOR_FILL}
    cover = book["Cover"]
    texts = [str(row[1].value) for row in cover.iter_rows() if row[1].value]
    assert any(t.startswith("Input:") for t in texts) and any(t.startswith("Factor") for t in texts) and any(t.startswith("Formula") for t in texts)


def test_headers_frozen_and_pages_set_up(workbook_file):
    book = openpyxl.load_workbook(workbook_file)
    for name in ("Inputs", "Factors", "Calculation", "Results"):
        assert book[name].freeze_panes, name
    assert book["Inputs"].print_title_rows == "$4:$4" and book["Factors"].print_title_rows == "$4:$4"
    for ws in book:
        assert ws.page_setup.orientation == "landscape" and str(ws.page_setup.paperSize) == str(ws.PAPERSIZE_A4), ws.title
        assert ws.print_area, ws.title
    chart = book["Results"]._charts[0]
    assert chart.x_axis.title is not None
    labels = [row[0].value for row in book["Results"].iter_rows(min_row=6, max_row=14)]
    for stage in score(BLUE).by_stage:
        assert stage_name(stage) in labels  # chart categories in words
        assert stage not in labels or stage == stage_name(stage)


def test_no_literal_zero_or_one_factor_in_any_formula(tmp_path):
    # a literal 0 or 1 as a whole factor: x*1, x/1, x*(0), 1*x at the start or after an operator
    pattern = re.compile(r"[*/][01](?:\.0+)?(?![\w.(])|[*/]\(-?[01](?:\.0+)?\)|(?:^=|[(*/+\-])[01](?:\.0+)?\*")
    assert pattern.search("=a*0*b") and pattern.search("=a*1") and pattern.search("=1*a") and not pattern.search("=a*(1-b)*1000")
    for project in sorted(DEMO.glob("*.toml")):
        book, _, _ = audit_workbook(project)  # the workbook the command saves, read in memory
        for ws in book:
            for row in ws.iter_rows():
                for cell in row:
                    if isinstance(cell.value, str) and cell.value.startswith("="):
                        assert not pattern.search(cell.value), (project.stem, ws.title, cell.coordinate, cell.value)


def test_libreoffice_prints_every_sheet_readable_on_a4_landscape(workbook_file, tmp_path):
    soffice = shutil.which("soffice") or shutil.which("libreoffice")
    if soffice is None or shutil.which("pdftotext") is None:
        if os.environ.get("CI") == "true":
            pytest.fail("LibreOffice and poppler-utils are required under CI=true; .ci/run installs them")
        pytest.skip("LibreOffice or poppler-utils not installed here")
    subprocess.run([soffice, "--headless", "--norestore", f"-env:UserInstallation={(tmp_path / 'profile').as_uri()}", "--convert-to", "pdf", "--outdir", str(tmp_path), str(workbook_file)], check=True, capture_output=True, timeout=300)
    pdf = tmp_path / "blue.pdf"
    info = subprocess.run(["pdfinfo", str(pdf)], capture_output=True, text=True, check=True).stdout
    width, height = (float(v) for v in re.search(r"Page size:\s+([\d.]+) x ([\d.]+)", info).groups())
    assert (width, height) == (pytest.approx(A4_LANDSCAPE_PT[0], abs=1.5), pytest.approx(A4_LANDSCAPE_PT[1], abs=1.5))
    pages = int(re.search(r"Pages:\s+(\d+)", info).group(1))
    assert 5 <= pages <= 14  # cover, inputs, factors, calculation (2 across), results (2 across)
    text = subprocess.run(["pdftotext", str(pdf), "-"], capture_output=True, text=True, check=True).stdout
    results_pages = [page for page in text.split("\f") if re.search(r"Results, page \d+ of", page)]
    assert 1 <= len(results_pages) <= 3
    # the footer whole on every page, and the Results chart inside the print area (its title is printed)
    assert len(re.findall(r", page \d+ of \d+", text)) == pages
    assert "Screening estimate, not a certification" in text
    assert any("Contributions by stage" in page for page in results_pages)
    lines = {line.strip() for page in results_pages for line in page.splitlines()}
    result = score(BLUE)
    for check in result.checks:
        assert check.name in lines, check.name  # each scheme name whole on one line, not cut
    for stage in result.by_stage:
        assert stage_name(stage) in lines
