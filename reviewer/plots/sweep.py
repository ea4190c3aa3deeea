"""The what-if sweep's chart: what the review says at each point of one or two varied fields.

One field: each point sits on the row of the rule that set its verdict (``go`` on a row of its
own), so the chart shows which rule binds where along the range and where the envelope ends.
Two fields: the grid itself, one marker per point. Every outcome differs by marker shape as
well as colour, so the chart reads in greyscale; values are plotted at their place on the axis
(a gauge in AWG as its number, which runs the other way to the wire's size, and is labelled
so).
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

from reviewer.plots import _style

#: Marker, colour and legend text of each outcome, in the legend's order.
OUTCOMES: dict[str, tuple[str, str, str]] = {
    "go": ("o", "#2e7d4f", "go"),
    "advise": ("D", "#4a7fb0", "go, with advice"),
    "fix": ("s", "#b9770e", "fix"),
    "stop": ("X", "#b03a2e", "stop"),
    "unassessed": ("^", "#566573", "unassessed (incomplete)"),
    "input error": ("x", "#111111", "not a valid build"),
}


@dataclass(frozen=True)
class SweepMark:
    """One point as the chart draws it: its values as numbers, its outcome and binding rule."""

    numbers: tuple[float, ...]
    outcome: str  # a key of OUTCOMES
    rule: str  # the binding rule ("" for go or an input error)


def outcome_of(verdict: str, severity: str) -> str:
    """The chart's outcome for a point's verdict and its binding finding's severity."""
    if verdict == "input error":
        return "input error"
    if not severity:
        return "go"
    if severity not in OUTCOMES:
        raise ValueError(f"no outcome for severity {severity!r}")
    return severity


def sweep_marks(axes: Sequence[Any], points: Sequence[Any]) -> list[SweepMark]:
    """The marks of a sweep's points (``reviewer.sweep.Axis`` and ``Point``), in grid order."""
    position = [dict(zip(a.values, a.numbers, strict=True)) for a in axes]
    return [
        SweepMark(
            tuple(p[v] for p, v in zip(position, point.values, strict=True)),
            outcome_of(point.verdict, point.severity),
            point.binding,
        )
        for point in points
    ]


def _label(axis: Any) -> str:
    if axis.unit == "AWG":
        return f"{axis.field} (AWG: a larger number is a thinner wire)"
    return f"{axis.field} ({axis.unit})" if axis.unit else axis.field


def sweep_svg(axes: Sequence[Any], points: Sequence[Any], title: str | None = None) -> str:
    """The sweep's chart as SVG text (one or two axes)."""
    if not 1 <= len(axes) <= 2:
        raise ValueError("a sweep chart has one or two axes")
    _style.require_matplotlib()
    marks = sweep_marks(axes, points)
    rows = ["", *sorted({m.rule for m in marks if m.rule})]  # "" is go / input error

    def draw(figure: Any) -> None:
        ax = figure.add_subplot()
        for outcome, (shape, colour, text) in OUTCOMES.items():
            chosen = [m for m in marks if m.outcome == outcome]
            if not chosen:
                continue
            xs = [m.numbers[-1] for m in chosen]
            if len(axes) == 2:
                ys = [m.numbers[0] for m in chosen]
            else:
                ys = [rows.index(m.rule) for m in chosen]
            ax.scatter(xs, ys, marker=shape, color=colour, s=36, label=text, zorder=3)
        ax.set_xlabel(_label(axes[-1]))
        if len(axes) == 2:
            ax.set_ylabel(_label(axes[0]))
        else:
            ax.set_yticks(range(len(rows)), ["no binding rule", *rows[1:]])
            ax.set_ylim(-0.6, len(rows) - 0.4)
            ax.set_ylabel("the rule that sets the verdict")
        ax.set_title(title or "What the review says across the sweep")
        ax.legend(loc="upper left", bbox_to_anchor=(1.01, 1.0), frameon=False)

    return _style.render("sweep", draw)
