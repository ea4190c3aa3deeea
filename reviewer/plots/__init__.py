"""Charts of a review as deterministic SVG text (the ``plots`` extra: matplotlib).

Importing this package does not import matplotlib; each chart function imports it when called
and raises :class:`PlotsUnavailable` (naming ``pip install 'firstride[plots]'``) without it.
Every chart has a data function beside it returning the plain numbers it draws, and nothing here
writes a file: the caller embeds the text or writes it where it wants.

Two renders of the same input are byte-identical (fixed figure size, fonts as text, fixed SVG
id salt, no date or creator in the metadata); text from the build is XML-escaped by matplotlib.

=============================  ==============================================================
operating chart                ``operating_chart(build, profile)``; ``operating_data`` /
                               ``operating_data_for(drive, riders, grade)``; ``operating_svg``
speed against grade            ``grade_chart(build, profile)``; ``grade_data`` /
                               ``grade_data_for(drive, riders, steepest)``; ``grade_svg``
current budget                 ``budget_chart(build, profile)``; ``budget_items``;
                               ``budget_svg([(name, carried A, rating A or None), ...])``
ride                           ``ride_svg(times s, temperatures degC, voltages V, ...)``
sweep                          ``sweep_svg(axes, points)`` (:mod:`reviewer.sweep`); ``sweep_marks``
=============================  ==============================================================

The ``*_chart`` functions return None when the build lacks what the chart needs.
"""

from __future__ import annotations

from reviewer.plots._style import INSTALL_HINT, PlotsUnavailable
from reviewer.plots.budget import BudgetItem, budget_chart, budget_items, budget_svg
from reviewer.plots.grade import (
    GradeCurve,
    GradeData,
    grade_chart,
    grade_data,
    grade_data_for,
    grade_svg,
)
from reviewer.plots.operating import (
    OperatingData,
    RoadLoad,
    operating_chart,
    operating_data,
    operating_data_for,
    operating_svg,
    steady_speed,
)
from reviewer.plots.ride import RideSeries, ride_svg


def available() -> bool:
    """Whether matplotlib can be imported (imports it if so)."""
    try:
        from reviewer.plots._style import require_matplotlib

        require_matplotlib()
    except PlotsUnavailable:
        return False
    return True


__all__ = [
    "INSTALL_HINT",
    "BudgetItem",
    "GradeCurve",
    "GradeData",
    "OperatingData",
    "PlotsUnavailable",
    "RideSeries",
    "RoadLoad",
    "available",
    "budget_chart",
    "budget_items",
    "budget_svg",
    "grade_chart",
    "grade_data",
    "grade_data_for",
    "grade_svg",
    "operating_chart",
    "operating_data",
    "operating_data_for",
    "operating_svg",
    "ride_svg",
    "steady_speed",
]
