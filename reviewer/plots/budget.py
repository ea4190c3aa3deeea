"""The current budget of the power path: what each part carries against its rating.

``budget_svg`` draws any list of (name, carried A, rating A or None) as horizontal bars, the
rating as a mark across each bar. ``budget_items`` gathers that list from a build with the
figures the rules judge the same parts by, and leaves out every part whose current or rating the
build does not give:

- battery side (pack, BMS, battery fuses, battery wires, battery connectors, the controller's
  battery limit): the pack demand of battery.discharge and power.connectors (the most the
  motors draw from the pack at once, ``firstride_rules._shared.demand``);
- the pack's rating is its continuous current (cell rating, or C-rate x capacity, the lower,
  times the strings in parallel); a wire's is its ampacity as wiring.stall-current reads it (at
  ``usage.ambient_temperature`` or the profile's default);
- motor side (motor and phase connectors, a motor fuse of a one-motor build): the motor's
  locked-rotor current with the controller's limits acting (``figures.stall_point``), the peak
  phase current for a field-oriented or unstated brushless drive.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from typing import Any, NamedTuple

from reviewer import figures
from reviewer.build import Build, ConnectorCircuit
from reviewer.engineering.cells import pack_continuous_current, string_continuous_current
from reviewer.plots import _style
from reviewer.profile import Profile
from reviewer.units import format_number, in_unit


class BudgetItem(NamedTuple):
    name: str
    carried_a: float
    rating_a: float | None  # None: not known; drawn without a rating mark


def _pack_rating(build: Build) -> float | None:
    battery = build.battery
    if battery is None:
        return None
    rated = (
        None
        if battery.cell_continuous_current is None
        else in_unit(battery.cell_continuous_current, "A")
    )
    capacity = None if battery.cell_capacity is None else in_unit(battery.cell_capacity, "A*h")
    string = string_continuous_current(rated, battery.cell_c_rate, capacity)
    return None if string is None else pack_continuous_current(string, battery.cells_parallel or 1)


def _battery_side(build: Build, profile: Profile, demand: float) -> list[BudgetItem]:
    items = [BudgetItem("pack (cells, continuous)", demand, _pack_rating(build))]
    bms = build.battery.bms if build.battery is not None else None
    if bms is not None and bms.fitted and bms.continuous_discharge_current is not None:
        rating = in_unit(bms.continuous_discharge_current, "A")
        items.append(BudgetItem("BMS (continuous discharge)", demand, rating))
    for fuse in build.fuses:
        if fuse.location in ("battery-positive", "battery-negative"):
            items.append(BudgetItem(f"fuse '{fuse.name}'", demand, in_unit(fuse.rating, "A")))
    default = profile.limit("usage.default_ambient_temperature").quantity
    ambient = figures.ambient_temperature(build, in_unit(default, "degC"))
    for wire in figures.shared_wires(build):
        ampacity = figures.wire_ampacity(wire, ambient)
        rating = None if ampacity is None else ampacity.current
        items.append(BudgetItem(f"wire '{wire.name}'", demand, rating))
    for connector in build.connectors or ():
        if connector.circuit is ConnectorCircuit.BATTERY:
            rating = connector.current_rating
            items.append(
                BudgetItem(
                    f"{connector.kind.value} '{connector.name}'",
                    demand,
                    None if rating is None else in_unit(rating, "A"),
                )
            )
    limit = figures.battery_limit(build)
    if limit is not None and build.motors:
        items.append(BudgetItem("controller battery limit", demand, limit * len(build.motors)))
    return items


def _motor_side(build: Build) -> list[BudgetItem]:
    items: list[BudgetItem] = []
    carried: dict[str, float] = {}
    for motor in build.motors:
        point = figures.stall_point(build, motor.name)
        if point is not None:
            carried[motor.name] = figures.phase_conductor_current(build, motor, point.motor_current)
    for connector in build.connectors or ():
        if connector.circuit not in (ConnectorCircuit.MOTOR, ConnectorCircuit.PHASE):
            continue
        motor = next((m for m in build.motors if connector.motor in (None, m.name)), None)
        if motor is None or motor.name not in carried or connector.current_rating is None:
            continue
        items.append(
            BudgetItem(
                f"{connector.kind.value} '{connector.name}'",
                carried[motor.name],
                in_unit(connector.current_rating, "A"),
            )
        )
    if len(build.motors) == 1 and build.motors[0].name in carried:
        amps = carried[build.motors[0].name]
        for fuse in build.fuses:
            if fuse.location == "motor":
                items.append(BudgetItem(f"fuse '{fuse.name}'", amps, in_unit(fuse.rating, "A")))
    return items


def budget_items(build: Build, profile: Profile) -> list[BudgetItem]:
    """The parts of the power path whose current and rating are both known, battery side
    first; empty when none are."""
    from firstride_rules._shared.demand import pack_demand  # the figure the rules judge by

    items: list[BudgetItem] = []
    demand = pack_demand(build).current
    if demand is not None:
        items += _battery_side(build, profile, demand)
    items += _motor_side(build)
    return [item for item in items if item.rating_a is not None]


def _check(items: Sequence[tuple[str, float, float | None]]) -> list[BudgetItem]:
    checked = []
    for name, carried, rating in items:
        finite = math.isfinite(carried) and (rating is None or math.isfinite(rating))
        if not finite or carried < 0 or (rating is not None and rating <= 0):
            raise ValueError(f"{name!r}: currents must be finite, carried >= 0 and rating > 0")
        checked.append(
            BudgetItem(str(name), float(carried), None if rating is None else float(rating))
        )
    return checked


def budget_label(item: BudgetItem) -> str:
    """'20 A of 30 A (67 %)', or '20 A, rating not known'."""
    carried = format_number(item.carried_a)
    if item.rating_a is None:
        return f"{carried} A, rating not known"
    share = format_number(100.0 * item.carried_a / item.rating_a)
    over = " OVER" if item.carried_a > item.rating_a else ""
    return f"{carried} A of {format_number(item.rating_a)} A ({share} %){over}"


def budget_svg(items: Sequence[tuple[str, float, float | None]], title: str | None = None) -> str:
    """The current budget as SVG text: one horizontal bar per part, its carried current (A),
    with its rating as a mark; a part over its rating is drawn hatched and labelled OVER."""
    _style.require_matplotlib()
    rows = _check(items)
    if not rows:
        raise ValueError("the current budget needs at least one part")
    height = min(1.4 + 0.42 * len(rows), 12.0)

    def draw(figure: Any) -> None:
        ax = figure.add_subplot()
        positions = list(range(len(rows)))[::-1]  # the first part at the top
        top = max(max(r.carried_a, r.rating_a or 0.0) for r in rows)
        for y, row in zip(positions, rows, strict=True):
            over = row.rating_a is not None and row.carried_a > row.rating_a
            ax.barh(
                y,
                row.carried_a,
                height=0.55,
                color=_style.OVER_COLOUR if over else _style.WITHIN_COLOUR,
                hatch="///" if over else None,
                edgecolor="#222222",
                linewidth=0.6,
            )
            if row.rating_a is not None:
                ax.plot(
                    [row.rating_a, row.rating_a],
                    [y - 0.38, y + 0.38],
                    color=_style.LIMIT_COLOUR,
                    linewidth=2.0,
                    solid_capstyle="butt",
                )
            ax.annotate(
                budget_label(row),
                xy=(max(row.carried_a, row.rating_a or 0.0), y),
                xytext=(5, 0),
                textcoords="offset points",
                va="center",
                fontsize=7.5,
            )
        ax.set_yticks(positions, [row.name for row in rows])
        ax.set_xlim(0.0, 1.45 * top if top > 0 else 1.0)
        ax.set_ylim(-0.7, len(rows) - 0.3)
        ax.grid(axis="y", visible=False)
        ax.set_xlabel("current (A); the red mark is the part's rating")
        ax.set_title(title or "Current budget of the power path")

    return _style.render("budget", draw, (_style.FIGURE_SIZE[0], height))


def budget_chart(build: Build, profile: Profile, title: str | None = None) -> str | None:
    """The current budget of a validated build as SVG text; None when no part's current and
    rating are both known."""
    _style.require_matplotlib()
    items = budget_items(build, profile)
    return budget_svg(items, title) if items else None
