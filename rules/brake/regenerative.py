"""brake.regenerative: regenerative braking charges the pack: against the cells' charge rating,
the parts' voltage ratings, and the full pack that refuses it and takes the brake away.
"""

from __future__ import annotations

from collections.abc import Iterator

from firstride_rules._shared.regen import ENERGY_BALANCE, regen_current
from firstride_rules.brake._capability import FRICTION_FIELDS

from reviewer import figures
from reviewer import units as u
from reviewer.build import Battery, BrakeKind, Build
from reviewer.findings import Assumption, Comparison, Finding, Severity, Source, SourceStatus
from reviewer.profile import Profile
from reviewer.rule import Output, Rule
from reviewer.units import in_unit

FULL_PACK = Source.common_practice(
    "Regenerative current into a full pack lifts it above its full-charge voltage; the BMS or "
    "the controller then stops regeneration, and the electric brake is gone. It can never be "
    "the only brake"
)
OHM_LAW = Source(
    "Terminal voltage while charging V = OCV + I R_pack, R_pack = cells in series x R_cell / "
    "strings in parallel (Ohm's law; Linden, Handbook of Batteries, from memory)",
    SourceStatus.FROM_MEMORY,
)
CELL_RATING = Source(
    "The cell datasheet's largest charge current, as entered in the build", SourceStatus.USER
)
PART_RATING = Source(
    "The parts' datasheet voltage ratings, as entered in the build", SourceStatus.USER
)
_A = u.unit("A")
_V = u.unit("V")


def check(build: Build, profile: Profile) -> Iterator[Output]:
    """Regenerative braking's current into the cells, the voltage it lifts the pack to, and
    whether it is there at all on a full pack.

    What it checks
      Regeneration is present when ``brakes[]`` lists a regenerative brake or
      ``controller.regen`` is true. Its pack current is ``controller.regen_current_limit``.
      1. Full pack: at the profile's ``brake.regenerative_state_of_charge`` (a pack just off
         the charger) the pack sits at full charge (open-circuit voltage taken linear in the
         state of charge between cut-off and full); any charging current lifts it above, so
         the BMS or controller stops regeneration: the brake is gone.
      2. Cells: the current per string (``battery.cells_parallel``) against
         ``battery.cell_max_charge_current``.
      3. Voltage: the full pack plus the regenerative current through its internal resistance
         (``battery.cell_internal_resistance``), V_full + I R_pack, against the lowest DC
         rating on the pack's terminals: ``controller.max_input_voltage``,
         ``fuses[].voltage_rating``, ``brakes[].relay_contact_voltage``.

    Severities
      - stop: regenerative braking is the only brake and vanishes on a full pack; it lifts
        the pack above a part's voltage rating.
      - fix: more charge current per string than the cells are rated for.
      - pass: within limits; no regeneration (``controller.regen`` false and no such brake);
        the full-pack loss beside another brake (stated: ``brake.stopping`` judges the stop
        without it).
      - unassessed: ``controller.regen`` not stated on a build listing no regenerative brake;
        the regen current, cell charge rating, cell resistance or controller rating missing.
    """
    regenerative = [b for b in build.brakes or () if b.kind is BrakeKind.REGENERATIVE]
    controller = build.controller
    stated = controller.regen if controller is not None else None
    if not regenerative and stated is not True:
        if controller is not None and stated is None:
            yield Finding(
                Severity.UNASSESSED,
                "regenerative braking",
                "Whether the controller regenerates is not stated, and many do by default: "
                "what it would drive into the pack is not known.",
                missing=("controller.regen",),
            )
        else:
            yield Finding(
                Severity.PASS,
                "regenerative braking",
                "Nothing regenerates (no regenerative brake listed, "
                + (
                    "no controller described)."
                    if controller is None
                    else "controller.regen false)."
                ),
            )
        return
    battery = build.battery
    if battery is None:
        yield Finding(
            Severity.UNASSESSED,
            "regenerative braking",
            "Regeneration charges the pack, which the build does not describe.",
            missing=("battery",),
        )
        return
    current = regen_current(build)
    yield _full_pack(build, profile, battery, current)
    if current is None:
        yield Finding(
            Severity.UNASSESSED,
            "regenerative current",
            "The current regenerative braking drives into the pack is not given, so neither "
            "the cells' charge nor the voltage it lifts the pack to is known.",
            missing=("controller.regen_current_limit",),
            sources=(ENERGY_BALANCE,),
        )
        return
    yield from _cells(battery, current)
    yield from _voltage(build, battery, current)


def _full_pack(build: Build, profile: Profile, battery: Battery, current: float | None) -> Finding:
    f = u.format_number
    volts = figures.pack_voltages(battery)
    state = in_unit(profile.limit("brake.regenerative_state_of_charge").quantity, "percent")
    ocv = volts.cutoff + state / 100.0 * (volts.full - volts.cutoff)
    resistance = figures.pack_resistance(battery)
    assert ocv <= volts.full + 1e-9, "no state of charge lies above full"
    if state >= 100.0 or resistance is None or current is None:
        vanishes = True
        how = f"at {f(state)} % charge the pack is at {f(ocv)} V"
        how += ", its full charge: any charging current lifts it above"
        if state < 100.0:
            how += " (the pack's resistance or the regen current is not given: taken to lift it)"
    else:
        lifted = ocv + current * resistance
        vanishes = lifted > volts.full
        how = (
            f"at {f(state)} % charge the pack is at {f(ocv)} V and {f(current)} A through "
            f"{f(resistance)} ohm lifts it to {f(lifted)} V against {f(volts.full)} V full"
        )
    others = [b for b in build.brakes or () if b.kind is not BrakeKind.REGENERATIVE]
    subject = "regenerative braking on a full pack"
    if not vanishes:
        return Finding(
            Severity.PASS,
            subject,
            f"Just off the charger, {how}: regeneration stays within full charge.",
            sources=(FULL_PACK, OHM_LAW),
        )
    text = (
        f"Just off the charger, {how}: the BMS or the controller stops regeneration, so the "
        "electric brake is gone at the top of the first hill."
    )
    if not others:
        return Finding(
            Severity.STOP,
            subject,
            text + " It is the only brake: the rider then has none.",
            measured="no brake on a full pack",
            limit="a brake that does not depend on the pack's charge",
            remedy="fit a friction brake (disc, drum or rim) that stops the vehicle on its own "
            f"({FRICTION_FIELDS})",
            sources=(FULL_PACK, OHM_LAW),
        )
    return Finding(
        Severity.PASS,
        subject,
        text + " Other brakes are fitted; brake.stopping judges the stop without it.",
        sources=(FULL_PACK, OHM_LAW),
    )


def _cells(battery: Battery, current: float) -> Iterator[Output]:
    f = u.format_number
    strings = battery.cells_parallel or 1
    if battery.cells_parallel is None:
        yield Assumption(
            "battery.cells_parallel not given: one string takes all the regenerative current."
        )
    per_string = current / strings
    subject = "regenerative current into the cells"
    if battery.cell_max_charge_current is None:
        yield Finding(
            Severity.UNASSESSED,
            subject,
            f"Regeneration drives {f(current)} A into the pack, {f(per_string)} A per string; "
            "the cells' largest charge current is not given.",
            missing=("battery.cell_max_charge_current",),
            sources=(ENERGY_BALANCE,),
        )
        return
    rating = in_unit(battery.cell_max_charge_current, "A")
    over = per_string > rating
    yield Finding(
        Severity.FIX if over else Severity.PASS,
        subject,
        f"Regeneration drives {f(current)} A into the pack: {f(per_string)} A into each of "
        f"{strings} string(s), against the cells' {f(rating)} A charge rating.",
        measured=u.quantity(per_string, _A),
        limit=u.quantity(rating, _A),
        comparison=Comparison.AT_MOST,
        remedy=f"set controller.regen_current_limit to at most {f(rating * strings)} A"
        if over
        else None,
        sources=(CELL_RATING,),
    )


def _voltage(build: Build, battery: Battery, current: float) -> Iterator[Output]:
    f = u.format_number
    full = figures.pack_voltages(battery).full
    resistance = figures.pack_resistance(battery)
    subject = "pack voltage while regenerating"
    controller = build.controller
    rating = None
    if controller is not None and controller.max_input_voltage is not None:
        rating = in_unit(controller.max_input_voltage, "V")
    missing = tuple(
        name
        for name, value in (
            ("battery.cell_internal_resistance", battery.cell_internal_resistance),
            ("battery.cells_parallel", battery.cells_parallel),
            ("controller.max_input_voltage", rating),
        )
        if value is None
    )
    if resistance is None or rating is None:
        yield Finding(
            Severity.UNASSESSED,
            subject,
            f"Regenerating {f(current)} A into the {f(full)} V full pack lifts it by "
            "I R_pack; the pack's resistance or the controller's rating is not given.",
            missing=missing,
            sources=(OHM_LAW,),
        )
        return
    lifted = full + current * resistance
    assert lifted >= full, "a charging current never lowers the terminal voltage"
    parts = [("the controller", rating), *_other_parts(build)]
    name, lowest = min(parts, key=lambda part: part[1])
    over = lifted > lowest
    text = (
        f"Regenerating {f(current)} A into the {f(full)} V full pack through its {f(resistance)} "
        f"ohm lifts the terminals to {f(lifted)} V; the lowest rating on the pack's terminals "
        f"is {name}'s, {f(lowest)} V."
    )
    if battery.bms is not None and battery.bms.fitted:
        text += (
            " Should the BMS open while regenerating, nothing holds the controller's supply "
            "down: that case is not computed here."
        )
    yield Finding(
        Severity.STOP if over else Severity.PASS,
        subject,
        text,
        measured=u.quantity(lifted, _V),
        limit=u.quantity(lowest, _V),
        comparison=Comparison.AT_MOST,
        remedy=f"lower controller.regen_current_limit below {f((lowest - full) / resistance)} A "
        f"or use a part rated above {f(lifted)} V in place of {name}"
        if over
        else None,
        sources=(OHM_LAW, PART_RATING),
    )


def _other_parts(build: Build) -> list[tuple[str, float]]:
    """The pack's other parts with a DC voltage rating the build gives: fuses and relays."""
    parts = [
        (f"fuse '{fuse.name}'", in_unit(fuse.voltage_rating, "V"))
        for fuse in build.fuses
        if fuse.voltage_rating is not None
    ]
    parts += [
        (f"the relay of brakes[{index}]", in_unit(brake.relay_contact_voltage, "V"))
        for index, brake in build.relay_brakes()
        if brake.relay_contact_voltage is not None
    ]
    return parts


RULE = Rule(
    id="brake.regenerative",
    title="Regenerative braking: cells, voltage and the full pack",
    check=check,
    sources=(ENERGY_BALANCE, FULL_PACK, OHM_LAW),
    inputs=(
        "brakes",
        "controller.regen",
        "controller.regen_current_limit",
        "controller.max_input_voltage",
        "battery",
        "battery.cell_max_charge_current",
        "fuses[].voltage_rating",
        "brakes[].relay_contact_voltage",
    ),
    severities=(Severity.STOP, Severity.FIX, Severity.PASS, Severity.UNASSESSED),
)
