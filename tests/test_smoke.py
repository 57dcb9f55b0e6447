from pathlib import Path

from carbonledger.api import score

DEMO = Path(__file__).resolve().parent.parent / "demo_projects"


def test_every_demo_project_scores_and_sums():
    for path in sorted(DEMO.glob("*.toml")):
        result = score(path)
        assert abs(sum(result.by_stage.values()) - result.total) < 1e-9 * max(1.0, abs(result.total))
        assert abs(sum(result.by_gas.values()) - result.total) < 1e-9 * max(1.0, abs(result.total))
