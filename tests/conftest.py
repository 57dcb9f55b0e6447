import pytest


@pytest.fixture(autouse=True)
def _ledger_in_tmp(tmp_path, monkeypatch):
    """Every test records runs in its own temporary ledger, never in the user's data folder."""
    path = tmp_path / "ledger.sqlite"
    monkeypatch.setenv("CARBONLEDGER_LEDGER", str(path))
    return path
