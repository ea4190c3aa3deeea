"""wiring.stall-current: every battery and motor wire against the current a stalled motor drives.

A locked wheel (a kerb, a foot, a jammed belt) turns the motor into a resistor across the full
pack. Its wires carry that stall current until something interrupts it, or for ever if nothing
does, and then the controller's limit for the rest of the ride.
"""

from __future__ import annotations

from collections.abc import Iterator

from firstride_rules.wiring._calc import REMEDY_GAUGES
from firstride_rules.wiring._findings import (
    ADIABATIC,
    AMBIENT,
    BUNDLING,
    DATASHEET,
    FAA_TABLE,
    GENERAL_K,
    NEC_TABLE,
    RUNNING,
    STALL,
    THIN_WIRE,
    path_finding,
    stall_figures,
    wire_finding,
)
from firstride_rules.wiring._model import (
    POWER_CIRCUITS,
    StallContext,
    fuse_from,
    limits_of,
    power_wires,
)

from reviewer import figures
from reviewer.build import Build
from reviewer.findings import Finding, Severity, Source, SourceStatus
from reviewer.profile import Profile
from reviewer.rule import Output, Rule
from reviewer.units import format_number, in_unit

__all__ = ["REMEDY_GAUGES", "RULE", "check"]


def _missing(build: Build) -> tuple[str, ...]:
    missing = ["battery"] if build.battery is None else []
    if not build.motors:
        missing.append("motors")
    missing += [
        f"motors[{i}].winding_resistance"
        for i, motor in enumerate(build.motors)
        if motor.winding_resistance is None
    ]
    if not any(w.circuit in POWER_CIRCUITS for w in build.wires):
        missing.append("wires")
    return tuple(missing)


def check(build: Build, profile: Profile) -> Iterator[Output]:
    """Each battery and motor wire against a stalled motor, and each motor path's voltage drop.

    What it checks
      A locked wheel makes each motor a resistor across the full pack. The stall current is
      the pack's full voltage over the cold (20 °C) loop resistance: pack internal resistance
      (``battery.cell_internal_resistance``, if given), battery-circuit wires, controller switch
      (``controller.switch_on_resistance``), the motor's own wires and its winding
      (``motors[].winding_resistance``, line to line for a brushless motor). A locked
      three-phase motor carries its current line to line through two of its ``phase`` leads:
      the two of least resistance are counted (the higher stall current). Several motors share
      the battery wires: I_total = V G / (1 + R_shared G) with G the sum of the branch
      conductances, so a battery wire carries the total and a motor wire its motor's share.

      Which limit holds which wire (brief 11): a battery wire is held by what the controller
      draws from the pack while its limits hold (``controller.battery_current_limit``, or the
      motor limit where it is lower or alone); a motor or phase lead only by the motor limit
      (``controller.motor_current_limit``, as a DC-equivalent current, the largest reading
      where ``controller.motor_current_basis`` or ``drive`` is not given): a battery limit does
      not hold a stalled motor's current, since at a stall the pack supplies little power. A
      phase lead under field-oriented drive carries the peak phase current, DC-equivalent
      / (sqrt 3 / 2), which a locked rotor holds in one phase.

      For every wire on the ``battery``, ``motor`` or ``phase`` circuit:
      1. Stall survival. Protection acts if a fuse protects the wire (``fuses[].protects``
         names it, or the fuse's location is battery-positive) and is rated below the stall
         current through the fuse (every motor's for a fuse at the battery positive or on a
         battery wire, else that of the motors whose wires it names), or if the limit that
         holds the wire sits below its stall current. The earliest acts: a
         fuse after its ``clearing_time``; a fuse without one after the profile's
         ``wiring.assumed_clearing_time``, but only if its current is at least
         ``wiring.assumed_clearing_multiple`` times its rating (nearer its rating a fuse can
         hold for minutes); the limit after the one response every rule uses
         (``figures.limit_response``): a hardware limit's ``controller.current_limit_response``;
         a software limit (or one of unstated ``current_limit_kind``) no sooner than its
         averaging window, ``current_samples_averaged`` / ``current_sample_rate``; else the
         assumed clearing time, stated. The wire survives if t <= k^2 S^2 / I^2 (IEC 60364-4-43
         434.5.2, adiabatic, valid to 5 s; past 5 s a wire that carries the current
         continuously also survives). k comes from ``wires[].insulation`` (PVC 115, PVC 90 °C
         100, rubber 141, XLPE 143, silicone 132; PTFE from the general formula, 200 to 300 °C,
         from memory); a wire rated hotter than the table's starting temperature gets k from
         the general formula at its own rating. With no protection acting the stall current is
         sustained and must be within the wire's ampacity.
      2. Continuous current. The design current is the limit that holds the wire (summed over
         the motors for a battery wire; the peak phase current for a phase lead), or the stall
         current where no limit sits below it, and no more
         than the rating of a fuse on the wire (a fuse passes its rating indefinitely; IEC
         60364-4-43 433.1, Ib <= In <= Iz). It must be
         within the ampacity: the wire's ``rated_ampacity`` (datasheet, read as for 30 °C
         ambient) or else the higher of NEC Table 310.16 (14-8 AWG; 60/75/90 °C columns, 30 °C
         ambient) and FAA AC 43.13-1B Table 11-9 (18-10 AWG; 105/150/200 °C, bundled, 70 °C
         ambient), in the column at or below ``wires[].temperature_rating``. Corrections:
         ambient f = sqrt((T_col - T_amb)/(T_col - T_table)) with ``usage.ambient_temperature``
         or the profile's ``usage.default_ambient_temperature``; NEC 310.15(C)(1) for more than
         three loaded conductors (``wires[].bundled_with`` + 1; not on the FAA table, which is
         already for bundles). A metric wire is read as the heaviest AWG size not above its
         area, and an odd size as the next lighter row.
         A wire no table rates at its size and temperature but thinner than a table's
         smallest row (20 or 22 AWG; 16 or 18 AWG rated below 105 °C) carries at most what
         that smallest row carries in the column at or below its rating, with the same
         corrections, the most generous such figure over the tables: ampacity rises with
         size in every column. Above that upper bound it certainly fails; below it only its
         ``rated_ampacity`` can tell. The adiabatic check of step 1 needs no table.
      3. Voltage drop of each motor's path: its own wires and the battery wires (every
         conductor is listed, so feed and return both count) at the design currents (with no
         current limit, the stall currents), each
         wire at its FAA AC 43.13-1B 11-66 running temperature, as a fraction of the pack's
         nominal voltage, against the profile's ``wiring.voltage_drop.power``.

    Severities
      - stop: the wire cannot survive the stall current until protection acts, or nothing
        interrupts a stall current above its ampacity (or above the upper bound of a wire
        thinner than the tables).
      - fix: the continuous design current exceeds the ampacity (or that upper bound).
      - advise: a motor path's voltage drop exceeds the profile's limit.
      - pass: within every limit.
      - unassessed: no ``battery``, no ``motors``, a ``motors[i].winding_resistance`` or no
        battery or motor ``wires``; per wire, ``wires[i].insulation`` or
        ``wires[i].temperature_rating`` absent, or, with no ``wires[i].rated_ampacity``, a
        thinner wire whose current stays within the upper bound, a size heavier than both
        tables or a temperature rating below every column (under 60 °C).

    The remedy names the lightest tabulated AWG size that passes every check, re-run at that
    size (its lower resistance raises the stall current a little), a datasheet ampacity that
    would pass (not past a thin wire's upper bound, which no datasheet can beat), and, where
    the stall is sustained, a fuse or hardware current limit.
    """
    missing = _missing(build)
    loop = None if missing else figures.stall_loop(build)
    if loop is None or build.battery is None:
        yield Finding(
            Severity.UNASSESSED,
            "battery and motor wiring",
            "The stall current needs the pack, every motor's winding resistance and the wires "
            "that carry it.",
            missing=missing,
            sources=(STALL,),
        )
        return
    if build.usage.ambient_temperature is not None:
        ambient = in_unit(build.usage.ambient_temperature, "degC")
        default = None
    else:
        default = profile.limit("usage.default_ambient_temperature")
        ambient = in_unit(default.quantity, "degC")
    nominal = figures.pack_voltages(build.battery).nominal
    motor_limits, battery_limits, factors, held_by = limits_of(build)
    response = figures.limit_response(build)
    ctx = StallContext(
        profile, loop, nominal, ambient, motor_limits, battery_limits, factors, response, held_by
    )
    assumed = [
        m.name for m in build.motors if (lim := figures.motor_limit(build, m)) and lim.basis_assumed
    ]
    if assumed:
        text = (
            "controller.motor_current_basis (or controller.drive) not given: the motor current "
            "limit is read as the largest current it can mean (an rms figure under "
            "field-oriented drive) for the motor and phase wires."
        )
        ctx.note(text, CURRENT_BASIS)
    if default is not None:
        text = f"usage.ambient_temperature not given: {format_number(ambient)} °C taken for wires."
        ctx.note(text, default.source)
    if not loop.pack_resistance_known:
        text = (
            "battery.cell_internal_resistance not given: the stall current leaves out the "
            "pack's own resistance, which overstates it (conservative)."
        )
        ctx.note(text, STALL)
    wires = power_wires(build)
    if any(w.datasheet is not None for w in wires):
        text = (
            "A wire's datasheet ampacity is read as for one conductor in 30 °C air, then "
            "corrected for ambient and bundling."
        )
        ctx.note(text, DATASHEET)
    ctx.fuses = [fuse_from(fuse, wires) for fuse in build.fuses]
    yield from stall_figures(build, loop)
    for wire in wires:
        yield wire_finding(ctx, wire, wires)
    for motor in build.motors:
        yield path_finding(ctx, motor.name, wires)
    yield from ctx.assumptions.values()


CURRENT_BASIS = Source(
    "Controllers quote the phase limit as a peak or an rms figure; rms x sqrt 2 is the peak, "
    "and under field-oriented drive a locked rotor holds the peak in one phase",
    SourceStatus.DERIVED,
)


RULE = Rule(
    id="wiring.stall-current",
    title="Battery and motor wires against the stall current",
    check=check,
    sources=(
        STALL,
        ADIABATIC,
        GENERAL_K,
        NEC_TABLE,
        FAA_TABLE,
        THIN_WIRE,
        AMBIENT,
        BUNDLING,
        RUNNING,
        CURRENT_BASIS,
    ),
    inputs=(
        "battery.chemistry",
        "battery.cells_series",
        "battery.cells_parallel",
        "battery.cell_internal_resistance",
        "motors[].winding_resistance",
        "controller.motor_current_limit",
        "controller.motor_current_basis",
        "controller.battery_current_limit",
        "controller.drive",
        "controller.current_limit_kind",
        "controller.current_limit_response",
        "controller.current_samples_averaged",
        "controller.current_sample_rate",
        "controller.switch_on_resistance",
        "wires[].circuit",
        "wires[].motor",
        "wires[].gauge",
        "wires[].cross_section",
        "wires[].length",
        "wires[].insulation",
        "wires[].temperature_rating",
        "wires[].bundled_with",
        "wires[].rated_ampacity",
        "fuses[].location",
        "fuses[].rating",
        "fuses[].clearing_time",
        "fuses[].protects",
        "usage.ambient_temperature",
    ),
    severities=(Severity.STOP, Severity.FIX, Severity.ADVISE, Severity.PASS, Severity.UNASSESSED),
)
