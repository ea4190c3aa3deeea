"""A controller judged by its own datasheet when its insides are unknown (a sealed unit), and the
switch's current rating when they are known: the current it carries against what it is rated for.
"""

from __future__ import annotations

from collections.abc import Iterator

from firstride_rules.controller._drive import current_limit, floor_tenth, worst_stall

from reviewer.build import Build, Controller
from reviewer.findings import Assumption, Comparison, Finding, Severity, Source, SourceStatus
from reviewer.units import format_number, in_unit, quantity

DATASHEET = Source(
    "The controller's datasheet current ratings (continuous, peak), as entered in the build",
    SourceStatus.USER,
)
HELD = Source.common_practice(
    "A controller that holds its current limit into a locked wheel, with no stall cut-off, "
    "carries that current for as long as the wheel stays locked: its continuous rating applies"
)
INTERNALS = (
    "switch_on_resistance",
    "switch_rise_time",
    "switch_fall_time",
    "switch_max_junction_temperature",
    "switch_thermal_resistance_junction_case",
    "switch_thermal_resistance_case_sink",
    "switch_thermal_resistance_sink_air",
)


def sealed(controller: Controller | None) -> bool:
    """No switch internals given: a sealed unit, judged by its datasheet ratings."""
    return controller is not None and all(getattr(controller, f) is None for f in INTERNALS)


def has_ratings(controller: Controller | None) -> bool:
    return controller is not None and (
        controller.rated_continuous_current is not None or controller.peak_current is not None
    )


def carried(build: Build) -> tuple[float | None, str]:
    """The most current the controller's bridge or switch carries, and how it was found."""
    limit = current_limit(build)
    if limit is not None:
        return limit, "with its limits holding, against a locked wheel"
    stall = worst_stall(build)
    if stall is not None:
        return stall.current, f"with nothing limiting it, the cold stall current of '{stall.motor}'"
    return None, ""


def rating_findings(build: Build, required: tuple[str, ...] = ()) -> Iterator[Finding | Assumption]:
    """The current carried against the peak, continuous and switch current ratings given; a
    rating in ``required`` that the build leaves out is ``unassessed``, naming it."""
    controller = build.controller
    assert controller is not None
    amps, how = carried(build)
    if amps is None:
        yield Finding(
            Severity.UNASSESSED,
            "controller current ratings",
            "The current the controller carries is not known: it needs a motor or battery "
            "current limit, or the battery and every motor's winding resistance.",
            missing=("controller.motor_current_limit", "battery", "motors[].winding_resistance"),
            sources=(DATASHEET,),
        )
        return
    n = format_number
    checks = [
        ("peak_current", "peak", Severity.STOP, "its peak rating"),
        ("rated_continuous_current", "continuous", Severity.FIX, "its continuous rating"),
        ("switch_max_current", "switch current", Severity.STOP, "its switch's current rating"),
    ]
    for field, word, failing, what in checks:
        rating = getattr(controller, field)
        if rating is None:
            if field in required:
                yield Finding(
                    Severity.UNASSESSED,
                    f"controller {word} rating",
                    f"The controller's {word} current rating is not given, so the "
                    f"{n(amps)} A it carries {how} cannot be checked against it.",
                    missing=(f"controller.{field}",),
                    sources=(DATASHEET,),
                )
            continue
        rated = in_unit(rating, "A")
        over = amps > rated + 1e-9
        held = " (held for as long as the wheel stays locked)" if word == "continuous" else ""
        rationale = f"The controller carries up to {n(amps)} A {how}{held}; {what} is {n(rated)} A."
        remedy = None
        if over:
            remedy = (
                f"set controller.motor_current_limit to {floor_tenth(rated):g} A or less, or fit "
                f"a controller whose {word} rating is at least {n(amps)} A"
            )
        yield Finding(
            failing if over else Severity.PASS,
            f"controller {word} rating",
            rationale,
            quantity(amps, "A"),
            quantity(rated, "A"),
            Comparison.AT_MOST,
            remedy,
            (DATASHEET, HELD) if word == "continuous" else (DATASHEET,),
        )
