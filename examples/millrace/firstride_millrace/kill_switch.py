"""millrace.kill-switch: a tethered kill switch that opens the motor supply, rated for the pack."""

from __future__ import annotations

from collections.abc import Iterator

from firstride_millrace.inputs import EMPTY, PACK, MillraceInputs
from reviewer import figures
from reviewer.build import Build
from reviewer.extensions import extension
from reviewer.findings import Comparison, Finding, Severity, Source
from reviewer.profile import Profile
from reviewer.rule import Output, Rule
from reviewer.units import quantity

CLUB_RULE = Source.common_practice(
    "Millrace Park Riders club rules 2.1: every powered vehicle on club ground carries a kill "
    "switch tethered to the rider, which stops the drive when the rider comes off"
)
FAULT_PATH = Source.common_practice(
    "A controller whose output switch fails shorted drives the motor at full voltage whatever "
    "its throttle input says; only opening the motor supply stops it"
)
DC_BREAKING = Source.common_practice(
    "A switch that breaks direct current must be rated for the circuit's DC voltage: a DC arc "
    "has no current zero to go out at"
)
CELL_VOLTAGES = Source.from_memory(
    "Linden, Handbook of Batteries: full-charge cell voltages (Li-ion 4.2 V, LiFePO4 3.65 V)"
)
_FIELD = f"extensions.{PACK}"


def check(build: Build, profile: Profile) -> Iterator[Output]:
    """A kill switch tethered to the rider that opens the motor supply, rated for the pack.

    What it checks
      1. A kill switch on a lanyard is fitted (``extensions.millrace.kill_switch_lanyard``).
      2. Pulling it opens the motor supply (``kill_switch_cuts = "motor-power"``) rather than
         only cutting the throttle signal: a controller whose output switch has failed shorted
         ignores its throttle.
      3. The switch or contactor it opens is rated for the pack's full-charge voltage
         (``kill_switch_voltage_rating`` against ``battery.cells_series`` times the chemistry's
         full cell voltage, the same figure every built-in rule uses). Checked only when the
         rating is given.

    Severities
      - stop: no lanyard kill switch (``kill_switch_lanyard = false``): club rule 2.1.
      - fix: the lanyard only cuts the throttle signal; or the switch's DC rating is below the
        pack's full-charge voltage.
      - pass: a lanyard kill switch that opens the motor supply (and, when its rating is given,
        is rated for the pack).
      - unassessed: ``kill_switch_lanyard`` or ``kill_switch_cuts`` not given; the rating check
        is unassessed when ``battery`` is absent.
    """
    inputs = extension(build, PACK, MillraceInputs) or EMPTY
    subject = "kill switch"
    if inputs.kill_switch_lanyard is None:
        yield _missing(subject, "whether a lanyard kill switch is fitted", "kill_switch_lanyard")
        return
    if not inputs.kill_switch_lanyard:
        yield Finding(
            Severity.STOP,
            subject,
            "No kill switch tethered to the rider: a rider who comes off leaves the vehicle "
            "driving on its own.",
            measured="none",
            limit="lanyard kill switch",
            comparison=Comparison.AT_LEAST,
            remedy="fit a kill switch on a lanyard to the rider's wrist or belt that opens the "
            "motor supply",
            sources=(CLUB_RULE,),
        )
        return
    if inputs.kill_switch_cuts is None:
        yield _missing(subject, "what pulling the lanyard interrupts", "kill_switch_cuts")
        return
    if inputs.kill_switch_cuts == "throttle-signal":
        yield Finding(
            Severity.FIX,
            subject,
            "The lanyard only cuts the throttle signal; a controller with a shorted output "
            "switch keeps driving the motor whatever the throttle says.",
            measured="throttle signal",
            limit="motor supply",
            comparison=Comparison.AT_LEAST,
            remedy="make the lanyard open the motor supply (a switch or contactor in the pack "
            "positive line, rated for the pack voltage)",
            sources=(CLUB_RULE, FAULT_PATH),
        )
    else:
        yield Finding(
            Severity.PASS,
            subject,
            "A lanyard kill switch opens the motor supply.",
            measured="motor supply",
            limit="motor supply",
            comparison=Comparison.AT_LEAST,
            sources=(CLUB_RULE,),
        )
    yield from _rating(build, inputs)


def _rating(build: Build, inputs: MillraceInputs) -> Iterator[Output]:
    rating = inputs.kill_switch_voltage_rating
    if rating is None:
        return
    subject = "kill switch voltage rating"
    if build.battery is None:
        yield Finding(
            Severity.UNASSESSED,
            subject,
            "The pack's voltage is unknown, so the switch's rating cannot be compared with it.",
            missing=("battery",),
            sources=(DC_BREAKING,),
        )
        return
    full = figures.pack_voltages(build.battery).full
    rated = rating.m_as("V")
    sources = (DC_BREAKING, CELL_VOLTAGES)
    common = {
        "measured": rating,
        "limit": quantity(full, "V"),
        "comparison": Comparison.AT_LEAST,
        "sources": sources,
    }
    if rated + 1e-9 < full:
        yield Finding(
            Severity.FIX,
            subject,
            f"The switch is rated {rated:g} V DC; the pack reaches {full:g} V at full charge, "
            "so the switch may fail to break the current when pulled.",
            remedy=f"use a switch or contactor rated at least {full:g} V DC",
            **common,
        )
    else:
        yield Finding(
            Severity.PASS,
            subject,
            f"Rated {rated:g} V DC for a pack of {full:g} V at full charge.",
            **common,
        )


def _missing(subject: str, what: str, key: str) -> Finding:
    return Finding(
        Severity.UNASSESSED,
        subject,
        f"The build does not say {what}.",
        missing=(f"{_FIELD}.{key}",),
        sources=(CLUB_RULE,),
    )


RULE = Rule(
    id="millrace.kill-switch",
    title="Lanyard kill switch opens the motor supply",
    check=check,
    sources=(CLUB_RULE, FAULT_PATH, DC_BREAKING, CELL_VOLTAGES),
    inputs=(
        f"{_FIELD}.kill_switch_lanyard",
        f"{_FIELD}.kill_switch_cuts",
        f"{_FIELD}.kill_switch_voltage_rating",
        "battery.chemistry",
        "battery.cells_series",
    ),
    severities=(Severity.STOP, Severity.FIX, Severity.PASS, Severity.UNASSESSED),
)
