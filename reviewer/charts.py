"""The review's charts: which are drawn for a review, under which file names, and how they are
put into the HTML page or beside a Markdown review.

The charts themselves are :mod:`reviewer.plots` (matplotlib, the ``plots`` extra), imported only
here and only when charts are asked for, so a Markdown review without ``--plots`` costs nothing
more. Without matplotlib an HTML review says how to get its charts instead of failing.
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from typing import TYPE_CHECKING

if TYPE_CHECKING:
    from reviewer.engine import Review

_PROLOGUE = re.compile(r"\A\s*(<\?xml[^>]*\?>\s*)?(<!DOCTYPE[^>]*>\s*)?", re.S)
_SAFE_NAME = re.compile(r"[^a-z0-9]+")


@dataclass(frozen=True)
class Chart:
    """One chart: its file name (``operating.svg``), its title, and its SVG text."""

    file: str
    title: str
    svg: str

    @property
    def inline(self) -> str:
        """The SVG without its XML prologue and doctype, to sit inside an HTML page."""
        return _PROLOGUE.sub("", self.svg, count=1)


def review_charts(review: Review) -> list[Chart]:
    """Every chart the review's build allows, in a fixed order; raises
    :class:`reviewer.plots.PlotsUnavailable` without matplotlib."""
    from reviewer import plots

    build, profile = review.build, review.profile
    charts = []
    for file, title, draw in (
        ("operating.svg", "Drive force and road load against speed", plots.operating_chart),
        ("grade.svg", "Steady speed against grade", plots.grade_chart),
        ("budget.svg", "Current budget of the power path", plots.budget_chart),
    ):
        svg = draw(build, profile)
        if svg is not None:
            charts.append(Chart(file, title, svg))
    for figure in review.figures:
        if not figure.name.startswith("peak winding temperature on the ride") or not figure.series:
            continue
        series = {name: values for name, _, values in figure.series}
        who = figure.name.split(", ", 1)[1]
        charts.append(
            Chart(
                f"ride-{_SAFE_NAME.sub('-', who.lower()).strip('-')}.svg",
                f"Winding temperature and pack voltage over the ride, {who}",
                plots.ride_svg(
                    series["time"],
                    series["winding temperature"],
                    series["pack voltage"],
                    title=f"Over the ride, {who}",
                ),
            )
        )
    return charts
