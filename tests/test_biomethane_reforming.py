"""Biomethane reforming: biogenic CO2 counted apart, captured biogenic CO2 stated and never netted.

Worked example by hand with published values (each named beside its number):
- molar masses CO2 44.0095, CH4 16.0425 g/mol (IUPAC standard atomic weights: C 12.011, O 15.999,
  H 1.008; the package reads them from the ``chemicals`` library);
- methane LHV 50.04 MJ/kg (CRC Handbook via Fay and Golomb, Table 3.1: factor heating_value.methane.lhv);
- IPCC 2006 Vol. 2 Table 2.2: 1 kg CH4 and 0.1 kg N2O per TJ burnt (natural gas; biogas has the same
  defaults, from memory);
- AR6 GWP100: non-fossil CH4 27.0, N2O 273 (IPCC AR6 WG1 Table 7.15);
- biomethane upstream 14 g CO2e/MJ: Directive (EU) 2018/2001 Annex VI Part B, biowaste, close digestate,
  off-gas combustion, default value (FROM MEMORY, flagged so in the factor row);
- onshore wind 11 g CO2e/kWh: IPCC AR5 WG3 Annex III Table A.III.2 median.
"""

from __future__ import annotations

import json
import shutil

import pytest
from helpers import ROOT, assert_one_line_error, assessment_with, run_cli, write

from carbonledger.api import score

PROJECT = """\
[project]
name = "Biomethane worked example (invented)"
product = "hydrogen"

[hydrogen]
route = "biomethane_reforming"
conditioning_kwh_per_kg_h2 = 1.0

[biomethane_reforming]
biomethane_gj_per_kg_h2 = 0.165
electricity_kwh_per_kg_h2 = 0.6
process_co2_share = 0.6
upstream_factor = "biomethane.upstream.biowaste_closed_digestate_offgas_combustion"
capture_rate = {capture}
capture_applies_to = "process"
compression_kwh_per_t_co2 = 110
transport_storage_loss_fraction = 0.02

[electricity.sources.wind]
share = 1.0
factor = "electricity.renewable.wind_onshore"
"""

CO2_PER_GJ = 44.0095 / 16.0425 / 50.04 * 1000  # kg CO2 per GJ (LHV) of methane
DIRECT = 0.165 * CO2_PER_GJ  # kg biogenic CO2 per kg H2 formed from the biomethane's carbon
CAPTURED = 0.9 * 0.6 * DIRECT  # capture rate x process share
STORED = CAPTURED * (1 - 0.02)
RELEASED = DIRECT - CAPTURED + CAPTURED * 0.02
FUEL_GJ = 0.165 * (1 - 0.6)
COUNTED_NO_CAPTURE = 0.165 * 14 + FUEL_GJ / 1000 * (1.0 * 27.0 + 0.1 * 273) + (0.6 + 1.0) * 11 / 1000


def _project(tmp_path, capture=0.9):
    return write(tmp_path / "bio.toml", PROJECT.format(capture=capture))


def test_worked_example_by_hand(tmp_path):
    result = score(_project(tmp_path), assessment=assessment_with(schemes=["us-45v"]))
    counted = COUNTED_NO_CAPTURE + CAPTURED * 110 / 1000 * 11 / 1000  # plus the capture compression electricity
    assert result.total == pytest.approx(counted, rel=1e-4)
    assert result.biogenic_co2_kg["released"] == pytest.approx(RELEASED, rel=1e-4)
    assert result.biogenic_co2_kg["captured_and_stored"] == pytest.approx(STORED, rel=1e-4)
    # biogenic CO2 is not in the fossil CO2 of the result, nor in by_gas at all
    assert result.by_gas.get("co2_fossil", 0.0) == 0.0
    assert "co2_biogenic" not in result.by_gas and "co2_biogenic_stored" not in result.by_gas
    assert sum(result.by_gas.values()) == pytest.approx(result.total, rel=1e-12)


def test_captured_biogenic_co2_is_never_netted(tmp_path):
    """Capture adds only its compression electricity: the 4.79 kg stored CO2 is not subtracted from the
    total or from a scheme value (no shipped rulebook nets it)."""
    with_capture = score(_project(tmp_path, 0.9), assessment=assessment_with(schemes=["us-45v"]))
    without = score(_project(tmp_path, 0.0), assessment=assessment_with(schemes=["us-45v"]))
    assert without.total == pytest.approx(COUNTED_NO_CAPTURE, rel=1e-4)
    assert with_capture.total > without.total
    assert with_capture.checks[0].value > without.checks[0].value
    assert without.biogenic_co2_kg == {"released": pytest.approx(DIRECT, rel=1e-4), "captured_and_stored": 0.0}


def test_a_rulebook_that_nets_stored_biogenic_co2(tmp_path, monkeypatch):
    """Only a rulebook that says so subtracts the stored CO2 (nets_stored_biogenic_co2 = true, set here
    on a copy of the 45V rulebook for the test); the headline total never changes."""
    from carbonledger.core import scoring

    factors = tmp_path / "factors"
    shutil.copytree(ROOT / "factors", factors)
    scheme = factors / "schemes" / "us-45v.toml"
    scheme.write_text(scheme.read_text().replace("nets_stored_biogenic_co2 = false", "nets_stored_biogenic_co2 = true"))
    plain = score(_project(tmp_path), assessment=assessment_with(schemes=["us-45v"]))
    monkeypatch.setenv("CARBONLEDGER_FACTORS", str(factors))
    scoring.shipped_rulebooks.cache_clear()
    try:
        netted = score(_project(tmp_path), assessment=assessment_with(schemes=["us-45v"], factors=str(factors / "sets" / "default-2026")))
    finally:
        scoring.shipped_rulebooks.cache_clear()
    assert netted.total == pytest.approx(plain.total, rel=1e-12)
    assert plain.checks[0].value - netted.checks[0].value == pytest.approx(STORED, rel=1e-4)


def test_every_output_states_the_biogenic_co2(tmp_path):
    path = _project(tmp_path)
    as_json = json.loads(run_cli("score", path, "--no-ledger", "--format", "json").stdout)
    assert as_json["biogenic_co2_kg"]["captured_and_stored"] == pytest.approx(STORED, rel=1e-4)
    as_csv = run_cli("score", path, "--no-ledger", "--format", "csv").stdout
    assert "biogenic_co2,captured_and_stored," in as_csv
    as_table = run_cli("score", path, "--no-ledger").stdout
    assert "captured and stored" in as_table and "not netted" in as_table


def test_biomethane_below_the_stoichiometric_floor(tmp_path):
    """CH4 + 2 H2O -> CO2 + 4 H2: at least 16.0425 / (4 x 2.016) x 50.04 / 1000 = 0.0996 GJ per kg H2."""
    path = write(tmp_path / "bio.toml", PROJECT.format(capture=0.0).replace("biomethane_gj_per_kg_h2 = 0.165", "biomethane_gj_per_kg_h2 = 0.09"))
    result = run_cli("score", path, "--no-ledger")
    assert_one_line_error(result)
    assert "biomethane_reforming.biomethane_gj_per_kg_h2" in result.stderr and "0.099" in result.stderr


def test_demo_at_an_invented_site():
    result = score(ROOT / "demo_projects" / "biomethane_reforming_hydrogen.toml")
    assert "invented" in result.project
    assert result.biogenic_co2_kg["captured_and_stored"] > 0
