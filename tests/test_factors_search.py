"""`carbonledger factors search TEXT` finds a factor by words in its id, region, source or note
(issue 19: `factors list --prefix germany` found nothing, since ids start with their namespace)."""

from __future__ import annotations

import json

from helpers import run_cli


def search(*words: str) -> list[str]:
    result = run_cli("factors", "search", " ".join(words), "--format", "json")
    assert result.exit_code == 0, result.output
    return [row["id"] for row in json.loads(result.stdout)["factors"]]


def test_a_country_name_finds_its_grid_rows():
    found = search("germany")
    assert found and all("germany" in factor or "Germany" in factor for factor in found)
    assert "electricity.grid.germany_2019" in found
    assert run_cli("factors", "list", "--prefix", "germany").stdout.count("electricity.grid.germany") == 0  # what a prefix could not do


def test_words_are_found_in_region_and_source_not_only_the_id():
    # ERCT is the eGRID subregion "ERCOT All" (US EPA, eGRID2022 subregion list): the word is in the region, not the id
    assert "electricity.grid.us_erct_2022" in search("ercot")
    assert "electricity.grid.us_erct_2022" in search("egrid", "erct")  # every word must appear
    assert search("egrid", "germany") == []


def test_no_match_says_so_and_lists_nothing():
    result = run_cli("factors", "search", "nowhereland")
    assert result.exit_code == 0
    assert "No factor of set default-2026 mentions 'nowhereland'" in result.stderr
    assert "Caution:" in result.stdout
