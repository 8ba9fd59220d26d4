"""The figure style shared by the design-review report and the comparison page: palette, rc style, a
Figure with its axes (without pyplot), fixed margins with plain log-axis labels, and the Figure as inline SVG.

A figure is made inside ``matplotlib.rc_context(STYLE)`` with ``figure_with_axes``, laid out with
``arrange`` and turned into an ``<svg>`` element by ``to_svg`` (text kept as text; dense artists rasterized).
"""
from __future__ import annotations

import io
import math

import matplotlib
from cycler import cycler
from matplotlib.figure import Figure
from matplotlib.ticker import FuncFormatter, LogLocator, NullLocator

# Figures: a style of our own (teal, brick, slate, ochre), text kept as text in the SVG.
PALETTE = ["#0b6e6e", "#b5482f", "#4f6d7a", "#d39b3a", "#6a4c93", "#5a8a3c", "#8c6d5a", "#2f3e46"]
STYLE = {
    "font.size": 9,
    "font.family": "sans-serif",
    "axes.titlesize": 10,
    "axes.titleweight": "bold",
    "axes.titlelocation": "left",
    "axes.titley": 1.0,  # a fixed title place: matplotlib would otherwise measure the axes to lift it
    "axes.labelcolor": "#2b2a26",
    "axes.edgecolor": "#6b6457",
    "axes.spines.top": False,
    "axes.spines.right": False,
    "axes.grid": True,
    "axes.prop_cycle": cycler(color=PALETTE),
    "grid.color": "#ddd8cc",
    "grid.linewidth": 0.6,
    "legend.frameon": False,
    "legend.fontsize": 8,
    "lines.linewidth": 1.6,
    "figure.facecolor": "white",
    "svg.fonttype": "none",
}
DROP_COLOUR, CRITICAL_COLOUR = "#8a8577", "#b5482f"

SUPERSCRIPT = str.maketrans("-0123456789", "⁻⁰¹²³⁴⁵⁶⁷⁸⁹")


def power_of_ten(value: float, _position=None) -> str:
    """A log-axis label as plain text, 10⁻³: no TeX-like markup to parse (that alone took 0.5 s per report)."""
    if not (value > 0 and math.isfinite(value)):
        return ""
    exponent = math.log10(value)
    if abs(exponent - round(exponent)) > 1e-9:
        return ""
    return "10" + str(int(round(exponent))).translate(SUPERSCRIPT)


def plain_log_labels(figure: Figure) -> None:
    """Every log-scaled axis of the figure (colour bars included) ticked and labelled at whole decades only, as
    plain text (minor ticks at 2…9 would be some 70 tick artists per axis, a third of a figure's drawing time)."""
    for ax in figure.axes:
        for axis in (ax.xaxis, ax.yaxis):
            if axis.get_scale() == "log":
                axis.set_major_locator(LogLocator(base=10.0, numticks=8))
                axis.set_major_formatter(FuncFormatter(power_of_ten))
                axis.set_minor_locator(NullLocator())


def figure_with_axes(figsize: tuple[float, float], nrows: int = 1, ncols: int = 1, **subplots_options):
    """A Figure and its axes (as ``Figure.subplots`` gives them), without pyplot: no figure manager, no GUI
    backend to load. figsize : (width, height) [inch]; subplots_options : passed to ``Figure.subplots``."""
    figure = Figure(figsize=figsize)
    return figure, figure.subplots(nrows, ncols, **subplots_options)


# Margins of every figure [inch]: fixed, wide enough for this report's labels (the widest tick labels, a
# colour bar's or a second axis's label on the right), so that no layout pass measures the text first (an
# automatic layout took half of the report's time).
MARGINS = {"left": 0.95, "right": 0.18, "bottom": 0.55, "top": 0.36}


def arrange(figure: Figure, hspace: float = 0.3, wspace: float = 0.2, **margins: float) -> Figure:
    """The figure with fixed margins and plain whole-decade log-axis labels, ready to draw; returns it.

    margins : left, right, bottom, top [inch], over MARGINS; hspace, wspace : between axes, as fractions of
    the average axes height and width (matplotlib's subplot parameters)
    """
    width, height = figure.get_size_inches()
    edge = {**MARGINS, **margins}
    figure.subplots_adjust(left=edge["left"] / width, right=1 - edge["right"] / width,
                           bottom=edge["bottom"] / height, top=1 - edge["top"] / height, hspace=hspace, wspace=wspace)
    plain_log_labels(figure)
    return figure


def to_svg(figure: Figure, name: str) -> str:
    """The figure as an inline <svg> element (no XML prologue, no date), drawn in STYLE.

    name : the figure's name, salting its element ids so that several figures can share one page
    """
    buffer = io.StringIO()
    with matplotlib.rc_context({**STYLE, "svg.hashsalt": name}):
        figure.savefig(buffer, format="svg", metadata={"Date": None})
    text = buffer.getvalue()
    return text[text.index("<svg"):]
