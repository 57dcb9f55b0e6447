"""Electricity shares moved together: which sources take up the difference so the shares still sum to 1.

One place for everything that moves shares (``--set`` with ``--rebalance``, Monte Carlo draws of
shares, the levers of ``qualify``, ``headroom``): the moved sources take their new values at once, and each difference
from a moved source's own share is taken up either by one named source (``absorbers``: moved
source -> absorbing source) or, by default, by the sources nobody moves, in proportion to their
shares. For an unmoved source j with share s_j, moved shares v_i (project value n_i), the moved
sources P that are taken up in proportion and those A_j that name j:

    s_j' = s_j - sum_{i in A_j} (v_i - n_i) - s_j / S x sum_{i in P} (v_i - n_i),   S = sum of unmoved shares

With one moved source this is the familiar s_j (1 - v) / (1 - n). Arithmetic only, so it runs
on floats and on arrays of draws alike. A share that comes out below 0 cannot be rebalanced:
``negative_shares`` finds those (draws are left out; a levers file is refused).
"""

from __future__ import annotations

from typing import Any


def rebalanced_shares(
    shares: dict[str, float], moved: dict[str, Any], absorbers: dict[str, str] | None = None
) -> dict[str, Any]:
    """Every source's share after the moved sources take their values (``moved``: name -> value,
    numbers or arrays). ``shares``: the sources' shares before (name -> share). Sources that take
    up a difference in proportion need unmoved shares summing above 0 (``check_rebalancing``)."""
    absorbers = absorbers or {}
    unmoved = {name: share for name, share in shares.items() if name not in moved}
    total = sum(unmoved.values())
    pooled = sum(value - shares[name] for name, value in moved.items() if name not in absorbers)
    found = dict(moved)
    for name, share in unmoved.items():
        own = sum(
            value - shares[moved_name] for moved_name, value in moved.items() if absorbers.get(moved_name) == name
        )
        found[name] = share - own - (share / total * pooled if total > 0 else 0.0 * pooled)
    return found


def rebalancing_problem(shares: dict[str, float], moved: list[str], absorbers: dict[str, str]) -> str:
    """Why these moved sources cannot be rebalanced ('' when they can): an absorber that does not
    exist or is moved itself, or differences taken up in proportion with no unmoved share above 0."""
    for name, absorber in absorbers.items():
        if absorber not in shares:
            return (
                f"'{absorber}' (taking up {name}'s difference) is not a source "
                f"of the project: one of {', '.join(sorted(shares))}"
            )
        if absorber in moved:
            return f"'{absorber}' (taking up {name}'s difference) is moved itself"
    pooled = [name for name in moved if name not in absorbers]
    if pooled and not sum(share for name, share in shares.items() if name not in moved) > 0:
        return (
            f"other sources to take up the rest of {', '.join(pooled)} (the "
            "shares always sum to 1; no unmoved source has a share above 0)"
        )
    return ""


def rest_of(shares: dict[str, Any], name: str) -> Any:
    """The share left for source ``name``: 1 less the other sources' shares (``--rebalance``), a number
    or an array of draws."""
    return 1 - sum(share for other, share in shares.items() if other != name)


def negative_shares(found: dict[str, Any]) -> dict[str, Any]:
    """The sources whose rebalanced share falls below 0 (name -> mask or truth value)."""
    return {name: share < -1e-12 for name, share in found.items()}
