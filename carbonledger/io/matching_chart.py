"""Chart of one project's temporal matching: monthly matched and unmatched electricity, and a heat
map of the unmatched share by hour of day and month (matplotlib, imported only when asked for)."""

from __future__ import annotations

from pathlib import Path

import numpy as np

from ..analyses.matching import unmatched_share_by_hour_and_month
from ..errors import InputError
from .chart_files import write_figure
from .palette import CHART_STYLE, MATCHED, UNMATCHED, ramp_colormap


def matching_figure(local: np.ndarray, load_kwh: np.ndarray, matched_kwh: np.ndarray, title: str):
    import matplotlib

    matplotlib.use("Agg")
    import matplotlib.pyplot as plt

    plt.rcParams.update(CHART_STYLE)
    names, share = unmatched_share_by_hour_and_month(local, load_kwh, matched_kwh)
    months = local.astype("datetime64[M]")
    _, column = np.unique(months, return_inverse=True)
    use = np.bincount(column, load_kwh) / 1000.0
    matched = np.bincount(column, matched_kwh) / 1000.0
    figure, (bars, heat) = plt.subplots(1, 2, figsize=(12, 4.8), layout="constrained")
    positions = np.arange(len(names))
    bars.bar(positions, matched, color=MATCHED, label="matched")
    bars.bar(positions, use - matched, bottom=matched, color=UNMATCHED, label="unmatched (grid)")
    bars.set_xticks(positions, names, rotation=60, ha="right", fontsize=7)
    bars.set_ylabel("electricity use, MWh")
    bars.legend(fontsize=8)
    bars.set_title("Electricity use by month", fontsize=10)
    image = heat.imshow(
        share, aspect="auto", origin="lower", cmap=ramp_colormap(), vmin=0, vmax=1, interpolation="nearest"
    )
    heat.set_xticks(positions, names, rotation=60, ha="right", fontsize=7)
    heat.set_yticks(range(0, 24, 3))
    heat.set_ylabel("local hour of day")
    heat.set_title("Unmatched share of use, by hour and month", fontsize=10)
    figure.colorbar(image, ax=heat, label="unmatched / use")
    figure.suptitle(title, fontsize=10)
    figure.supxlabel(
        "Screening estimate, not a certification: the scheme's official "
        "methodology and an accredited verifier take precedence.",
        fontsize=6.5,
    )
    return figure


def write_matching_chart(local, load_kwh, matched_kwh, title: str, path: str | Path, force: bool = False) -> Path:
    """Write the chart as PNG or SVG (by suffix), atomically, refusing to overwrite without ``force``."""
    path = Path(path)
    if path.exists() and not force:
        raise InputError(path, "--chart", "a new file (it exists; pass --force to overwrite)")
    return write_figure(path, lambda: matching_figure(local, load_kwh, matched_kwh, title), force)
