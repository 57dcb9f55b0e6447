"""The project's one chart style: its colours and the matplotlib settings every chart file uses.

Ink-blue and harbour-teal on warm paper; stages in a fixed sequence; statuses in four colours
(qualifies, fails, not eligible, undetermined) with a legend wherever they are used; matched
electricity in kelp green, unmatched in stone; the heat map from teal mist through sandstone to
brick. The HTML report (hand-built SVG) and the matplotlib charts (score, compare, uncertainty,
sensitivity, matching) read these, so a reader sees one style across every deliverable.
"""

from __future__ import annotations

from ..model.statuses import Status

INK = "#1d2a33"
TEAL = "#24566b"
SAND = "#c9892b"
AXIS = "#8b949b"
MUTED = "#5d6870"
STAGE_COLOURS = (
    "#24566b",
    "#c9892b",
    "#6f9a73",
    "#a4452f",
    "#5a6aa3",
    "#b9a35f",
    "#744f7e",
    "#3a8f8b",
    "#d17a57",
    "#7d8088",
)
GAS_COLOURS = {
    "co2_fossil": "#24566b",
    "ch4_fossil": "#c9892b",
    "ch4_non_fossil": "#b9a35f",
    "n2o": "#744f7e",
    "co2e_precharacterised": "#6f9a73",
}
STATUS_COLOURS = {
    Status.QUALIFIES.words: "#2f6b45",
    Status.FAILS.words: "#a4452f",
    Status.NOT_ELIGIBLE.words: "#5b616c",
    Status.UNDETERMINED.words: "#8a6a10",
}
MATCHED, UNMATCHED = "#6f9a73", "#cbc3b1"
LOW, HIGH = TEAL, SAND  # a tornado's low and high ends
# Heat map ramp: harbour-teal mist (all matched) through sandstone to deep brick (nothing matched).
RAMP = ((0.0, (0xE4, 0xEE, 0xF0)), (0.5, (0xC9, 0x89, 0x2B)), (1.0, (0x6E, 0x24, 0x18)))
CHART_STYLE = {
    "axes.edgecolor": AXIS,
    "axes.labelcolor": INK,
    "axes.titlecolor": INK,
    "axes.spines.top": False,
    "axes.spines.right": False,
    "xtick.color": MUTED,
    "ytick.color": MUTED,
    "text.color": INK,
    "font.size": 8.5,
    "axes.formatter.useoffset": False,
}


def ramp_colormap():
    """The heat map's colours as a matplotlib colormap (matplotlib imported by the caller's chart)."""
    from matplotlib.colors import LinearSegmentedColormap

    return LinearSegmentedColormap.from_list(
        "carbonledger-unmatched", [(stop, tuple(c / 255 for c in rgb)) for stop, rgb in RAMP]
    )


def status_legend(figure, statuses) -> None:
    """A legend of the status colours used in ``figure`` (each status once, in the vocabulary's
    order), above the figure's foot, clear of every bar."""
    from matplotlib.patches import Patch

    shown = [s for s in STATUS_COLOURS if s in set(statuses)]
    if shown:
        figure.legend(
            handles=[Patch(color=STATUS_COLOURS[s], label=s) for s in shown],
            fontsize=7,
            loc="outside upper right",
            frameon=False,
            ncol=len(shown),
            title="bar colour: the scheme's status",
            title_fontsize=7,
        )
