"""Write tests/snapshots/demo_results.json: every demo's figures and verdicts at every boundary.

The snapshot is reviewed in diffs: a change to it is a change of results, made on purpose (a method
or rule correction) and explained in its commit message. Run from the repository root:

    python scripts/snapshot_demo_results.py
"""

from __future__ import annotations

import json
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT / "tests"))

from results_snapshot import SNAPSHOT, demo_figures  # noqa: E402

if __name__ == "__main__":
    SNAPSHOT.write_text(json.dumps(demo_figures(), indent=1, sort_keys=True) + "\n", encoding="utf-8")
    print(f"wrote {SNAPSHOT.relative_to(ROOT)}")
