"""Temporal matching rules: over which period each scheme matches consumption with contracted generation.

One small table, kept apart so that the scheme rulebooks can take it over: for each scheme, the
granularity of temporal correlation and the dates between which it applies (the interval's
local calendar date decides). Granularities, from fine to coarse: ``interval`` (the series' own
interval), ``hour``, ``month``, ``quarter``, ``year``. A scheme that is not listed is matched
over the ``year`` (annual average), the reading of a scheme without a temporal rule.

Sources (see SOURCES.md; all recorded from memory or from secondary copies unless marked):

- EU RFNBO: Commission Delegated Regulation (EU) 2023/1184, Art. 6 (temporal correlation):
  the same calendar month until 31 December 2029, the same one-hour period from 1 January 2030
  (a Member State may bring the hourly rule forward to 1 July 2027: not modelled).
- US 45V: final regulations under 26 U.S.C. 45V (January 2025), energy attribute certificates:
  annual matching through calendar year 2029, hourly matching from 1 January 2030.
- UK Low Carbon Hydrogen Standard: 30-minute reporting units, matched within each unit
  (version 4, 2026; secondary). Modelled as ``interval``: the series' own interval, which
  should then be 30 minutes.
- Japan: no temporal rule found; annual (``year``), from memory.
"""

from __future__ import annotations

import datetime as _dt
from dataclasses import dataclass

GRANULARITIES = ("interval", "hour", "month", "quarter", "year")


@dataclass(frozen=True)
class MatchingRule:
    granularity: str
    starts: _dt.date | None  # first local date the rule applies (None: since ever)
    ends: _dt.date | None  # last local date (None: open)
    source: str
    from_memory: bool = True


TEMPORAL_MATCHING: dict[str, tuple[MatchingRule, ...]] = {
    "eu-rfnbo": (
        MatchingRule("month", None, _dt.date(2029, 12, 31), "Delegated Regulation (EU) 2023/1184 Art. 6(1): same calendar month until 31 December 2029"),
        MatchingRule("hour", _dt.date(2030, 1, 1), None, "Delegated Regulation (EU) 2023/1184 Art. 6(2): same one-hour period from 1 January 2030"),
    ),
    "us-45v": (
        MatchingRule("year", None, _dt.date(2029, 12, 31), "45V final regulations (January 2025), 26 CFR 1.45V-4: annual matching of energy attribute certificates through 2029"),
        MatchingRule("hour", _dt.date(2030, 1, 1), None, "45V final regulations (January 2025), 26 CFR 1.45V-4: hourly matching from 1 January 2030"),
    ),
    "uk-lchs": (MatchingRule("interval", None, None, "UK Low Carbon Hydrogen Standard v4 (2026): 30-minute reporting units (secondary)"),),
}
DEFAULT_RULE = (MatchingRule("year", None, None, "no temporal rule recorded for this scheme: annual matching"),)


def matching_rules(scheme_id: str) -> tuple[MatchingRule, ...]:
    """The dated matching rules of a scheme, oldest first (annual when none is recorded)."""
    return TEMPORAL_MATCHING.get(scheme_id, DEFAULT_RULE)


def granularity_on(scheme_id: str, day: _dt.date) -> str:
    """The matching granularity a scheme applies on a local calendar date."""
    for rule in matching_rules(scheme_id):
        if (rule.starts is None or day >= rule.starts) and (rule.ends is None or day <= rule.ends):
            return rule.granularity
    return "year"


def describe(scheme_id: str) -> str:
    """One line: the granularities and their dates, e.g. 'month until 2029-12-31, hour from 2030-01-01'."""
    parts = []
    for rule in matching_rules(scheme_id):
        if rule.starts is None and rule.ends is None:
            parts.append(rule.granularity)
        elif rule.starts is None:
            parts.append(f"{rule.granularity} until {rule.ends.isoformat()}")
        else:
            parts.append(f"{rule.granularity} from {rule.starts.isoformat()}")
    return ", ".join(parts)
