"""The most current the motors can draw from the pack at once: what the pack, its BMS and the
battery-side connectors are judged against.
"""

from __future__ import annotations

from dataclasses import dataclass

from reviewer import figures
from reviewer.build import Build
from reviewer.units import format_number


def _n(value: float) -> str:
    return format_number(value)


@dataclass(frozen=True)
class Demand:
    """The most the motors can draw from the pack at once, in A, and why."""

    current: float | None
    how: str
    unlimited: bool  # no controller current limit: the stall current is the demand
    missing: tuple[str, ...] = ()


def pack_demand(build: Build) -> Demand:
    """Per motor what the controller draws from the pack while its limits hold (the battery
    limit, or the motor limit where it is lower or alone), capped by the motor's stall current;
    with no limit at all, the stall current of every motor at once."""
    if not build.motors:
        return Demand(None, "", False, ("motors",))
    loop = figures.stall_loop(build)
    count = len(build.motors)
    motors = f"{count} motors" if count > 1 else "the motor"
    if not figures.any_limit(build):
        if loop is None:
            missing = tuple(
                f"motors[{i}].winding_resistance"
                for i, motor in enumerate(build.motors)
                if motor.winding_resistance is None
            )
            return Demand(None, "", True, (*missing, "controller.battery_current_limit"))
        how = f"the stall current of {motors} on the full pack, as the controller sets no limit"
        return Demand(loop.total_current, how, True)
    designs = [figures.battery_design_current(build, motor) for motor in build.motors]
    amps = [d.amps for d in designs if d is not None]
    assert len(amps) == count  # any_limit: every motor has a battery or a motor limit
    each = " per motor" if count > 1 else ""
    basis = designs[0].basis if designs[0] is not None else "limit"
    how = f"the controller's {basis} of {_n(max(amps))} A{each}"
    if loop is None:
        return Demand(sum(amps), how, False)
    stalls = [loop.branch_current[motor.name] for motor in build.motors]
    if any(stall < limit for stall, limit in zip(stalls, amps, strict=True)):
        how += ", or the stall current where it is lower"
    return Demand(sum(min(a, st) for a, st in zip(amps, stalls, strict=True)), how, False)
