"""Restructuring changes no result: every demo project, at every boundary, gives the figures and
verdicts of the reviewed snapshot tests/snapshots/demo_results.json (totals, stages, gases,
intensities and scheme values to 1e-9; statuses, tiers and assessment years exactly).

A change that alters results on purpose (a method or rule correction) rewrites the snapshot with
``python scripts/snapshot_demo_results.py`` and explains the diff in its commit message; until then
this test guards every refactoring. (It replaced a test that ran an old commit's code from git
history; when the snapshot was first written, every total, stage, gas, intensity and hydrogen-gate
figure equalled that commit's, 2edaf22, to 1e-9: only scheme values and statuses had changed, by the
verdict rules.)"""

from __future__ import annotations

import json
import math

from results_snapshot import SNAPSHOT, demo_figures, demos


def differences(old, new, where: str = "") -> list[str]:
    if isinstance(old, dict) and isinstance(new, dict):
        found = [f"{where}: keys {sorted(set(old) ^ set(new))}"] if set(old) != set(new) else []
        for key in sorted(set(old) & set(new)):
            found += differences(old[key], new[key], f"{where}/{key}")
        return found
    if isinstance(old, float) and isinstance(new, (int, float)) and not isinstance(new, bool):
        return [] if math.isclose(old, new, rel_tol=1e-9, abs_tol=1e-12) else [f"{where}: {old} vs {new}"]
    return [] if old == new else [f"{where}: {old!r} vs {new!r}"]


def test_every_demo_result_equals_the_reviewed_snapshot():
    recorded = json.loads(SNAPSHOT.read_text(encoding="utf-8"))
    now = demo_figures()
    assert len(demos()) >= 10 and len(now) == len(recorded)
    problems = differences(recorded, now)
    assert problems == [], "\n".join(problems[:20]) + "\n(an intended change: python scripts/snapshot_demo_results.py, and say why in the commit)"
