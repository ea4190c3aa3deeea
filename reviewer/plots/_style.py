"""The settings every chart shares, and the one place matplotlib is imported.

A chart is drawn on a ``matplotlib.figure.Figure`` of its own with the SVG canvas attached
directly: pyplot is never imported, so no global figure registry, interactive backend or
``plt.rcParams`` change leaks in or out. The settings are applied over matplotlib's own defaults
(not the user's matplotlibrc) for the duration of one render only:

- ``svg.hashsalt`` fixed per chart kind: the ids of clip paths and markers are hashes of their
  content with this salt, so two renders of the same input are byte-identical, and two different
  charts embedded in one HTML page do not share an id for different content;
- ``svg.fonttype = "none"``: text stays text (selectable, searchable, no glyph paths or font
  files embedded), laid out with the DejaVu Sans metrics matplotlib ships;
- ``text.parse_math = False``: a ``$`` in a rider's name is a dollar sign, not mathtext;
- fixed figure size and dpi, and no ``Date`` or ``Creator`` in the SVG metadata.
"""

from __future__ import annotations

import io
from collections.abc import Callable
from typing import Any

INSTALL_HINT = "pip install 'firstride[plots]'"

#: Figure size in inches (width, height) and dots per inch: SVG is vector, the dpi only fixes
#: the pixel grid matplotlib lays text and ticks out on.
FIGURE_SIZE = (7.0, 4.4)
DPI = 100

#: Line colours, picked for contrast on white and in greyscale (dark, mid, light alternate);
#: every series also differs by line style or marker, so no chart depends on colour alone.
COLOURS = ("#1f3a5f", "#c0392b", "#2e7d4f", "#7d3c98", "#b9770e", "#566573")
DRIVE_COLOUR = "#111111"
LIMIT_COLOUR = "#8e1b1b"
WITHIN_COLOUR = "#4a7fb0"
OVER_COLOUR = "#b03a2e"
GRID_COLOUR = "#d5d8dc"

METADATA: dict[str, Any] = {"Date": None, "Creator": None}

_RC: dict[str, Any] = {
    "svg.fonttype": "none",
    "svg.image_inline": True,
    "text.parse_math": False,
    "text.usetex": False,
    "font.family": "sans-serif",
    "font.sans-serif": ["DejaVu Sans"],
    "font.size": 9.0,
    "axes.titlesize": 10.0,
    "axes.labelsize": 9.0,
    "legend.fontsize": 8.0,
    "xtick.labelsize": 8.0,
    "ytick.labelsize": 8.0,
    "axes.grid": True,
    "grid.color": GRID_COLOUR,
    "grid.linewidth": 0.6,
    "axes.axisbelow": True,
    "axes.spines.top": False,
    "axes.spines.right": False,
    "lines.linewidth": 1.6,
    "path.simplify": False,  # every point drawn, whatever the renderer's thresholds
    "axes.unicode_minus": True,
}


class PlotsUnavailable(RuntimeError):
    """matplotlib is not installed: the charts need the ``plots`` extra."""

    def __init__(self) -> None:
        super().__init__(
            "The charts need matplotlib, which is not installed; install it with "
            f"{INSTALL_HINT}. The Markdown review needs nothing more."
        )


def _matplotlib() -> Any:
    try:
        import matplotlib
        import matplotlib.style
        from matplotlib.backends.backend_svg import FigureCanvasSVG
        from matplotlib.figure import Figure
    except ImportError:
        raise PlotsUnavailable() from None
    return matplotlib, Figure, FigureCanvasSVG


def require_matplotlib() -> None:
    """Raise :class:`PlotsUnavailable` now if matplotlib cannot be imported."""
    _matplotlib()


def render(
    kind: str,
    draw: Callable[[Any], None],
    size: tuple[float, float] = FIGURE_SIZE,
) -> str:
    """SVG text of one figure: ``draw(figure)`` adds the axes and artists; ``kind`` names the
    chart (it salts the SVG ids). Nothing is written to disk."""
    matplotlib, figure_class, canvas_class = _matplotlib()
    settings = dict(_RC, **{"svg.hashsalt": f"firstride-{kind}"})
    with matplotlib.style.context("default"), matplotlib.rc_context(settings):
        figure = figure_class(figsize=size, dpi=DPI, layout="constrained")
        canvas_class(figure)
        draw(figure)
        buffer = io.BytesIO()
        figure.savefig(buffer, format="svg", dpi=DPI, metadata=METADATA)
    return buffer.getvalue().decode("utf-8")


def colour(index: int) -> str:
    return COLOURS[index % len(COLOURS)]


LINE_STYLES = ("-", "--", "-.", ":")
MARKERS = ("o", "s", "^", "D", "v", "P")


def marker(index: int) -> str:
    return MARKERS[index % len(MARKERS)]


def beside(x: float, low: float, high: float, gap: float = 6.0) -> tuple[float, str]:
    """Horizontal offset in points and alignment for a label at ``x`` on an axis from ``low``
    to ``high``: to the right of the point, or to its left in the axis's right part, so the
    label stays inside the figure."""
    if high > low and x > low + 0.6 * (high - low):
        return -gap, "right"
    return gap, "left"
