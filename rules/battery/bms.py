"""battery.bms: the battery management system's own ratings: a BMS that trips below the drive's
demand cuts the pack at speed (and any electric brake with it); a charge-only BMS guards
nothing while riding.
"""

from __future__ import annotations

from collections.abc import Iterator

from firstride_rules._shared.demand import pack_demand
from firstride_rules._shared.regen import regen_current

from reviewer import units as u
from reviewer.build import Battery, Bms, Build
from reviewer.findings import Comparison, Finding, Severity, Source, SourceStatus
from reviewer.profile import Profile
from reviewer.rule import Output, Rule
from reviewer.units import in_unit

BMS_RATINGS = Source(
    "The BMS datasheet's continuous and peak discharge and charge currents, as entered in the "
    "build",
    SourceStatus.USER,
)
CUT_AT_SPEED = Source.common_practice(
    "A BMS whose over-current protection trips under the drive's demand opens the pack at once, "
    "at speed; drive and any electric brake stop with it. A charge-only BMS (separate charge "
    "port) does not guard the discharge path at all"
)
_A = u.unit("A")


def check(build: Build, profile: Profile) -> Iterator[Output]:
    """The BMS's discharge ratings against the drive's demand from the pack, and its charge
    rating against the charger and regenerative braking.

    What it checks (``battery.bms``)
      1. It guards discharge (``guards_discharge``; false is a charge-only BMS).
      2. The most the motors draw from the pack at once (``battery.discharge``'s demand: the
         controller's battery limit, or motor limit where lower, or the stall current with no
         limit) against ``peak_discharge_current`` (it trips above: a cut at speed) and
         ``continuous_discharge_current`` (it overheats or trips on a long climb).
      3. The larger of ``charger.current`` and ``controller.regen_current_limit`` against
         ``charge_current``: above it the BMS stops charging, and takes regenerative braking
         with it.

    Severities
      - stop: the demand above the peak rating with no brake independent of the electronics.
      - fix: a charge-only BMS; the demand above the peak rating beside a friction or foot
        brake; above the continuous rating; charge or regen current above the charge rating.
      - pass: within each rating; no BMS fitted (``battery.protection`` judges that, stated).
      - unassessed: no ``battery.bms``; each rating or current not given (named).
    """
    battery = build.battery
    bms = battery.bms if battery is not None else None
    if battery is None or bms is None:
        yield Finding(
            Severity.UNASSESSED,
            "battery management system ratings",
            "The build does not describe the pack's battery management system.",
            missing=("battery.bms",) if battery is not None else ("battery",),
            sources=(BMS_RATINGS,),
        )
        return
    if not bms.fitted:
        yield Finding(
            Severity.PASS,
            "battery management system ratings",
            "The build says the pack has no BMS (battery.bms.fitted false): it has no ratings "
            "to check here; battery.protection judges the pack without one.",
        )
        return
    yield from _discharge(build, battery, bms)
    yield _charge(build, bms)


def _discharge(build: Build, battery: Battery, bms: Bms) -> Iterator[Output]:
    f = u.format_number
    if bms.guards_discharge is None:
        yield Finding(
            Severity.UNASSESSED,
            "BMS discharge protection",
            "Whether the BMS switches the discharge path off on a fault, or guards charging "
            "only, is not stated.",
            missing=("battery.bms.guards_discharge",),
            sources=(CUT_AT_SPEED,),
        )
        return
    if not bms.guards_discharge:
        yield Finding(
            Severity.FIX,
            "BMS discharge protection",
            "The BMS guards charging only: while riding nothing stops a cell being drained "
            "below its cut-off or a short circuit drawing the pack's fault current but the "
            "controller's cut-off and the fuse.",
            measured="charge only",
            limit="discharge guarded",
            remedy="fit a BMS that switches the discharge path (rated for the drive's current; "
            "then battery.bms.guards_discharge = true), or make sure the controller's "
            "low-voltage cut-off and the fuse cover it",
            sources=(CUT_AT_SPEED,),
        )
        return
    demand = pack_demand(build)
    if demand.current is None:
        yield Finding(
            Severity.UNASSESSED,
            "BMS discharge rating",
            "The drive's demand from the pack is not known.",
            missing=demand.missing,
            sources=(BMS_RATINGS,),
        )
        return
    amps = demand.current
    independent = any(not b.kind.electric for b in build.brakes or ())
    for field, rating, subject in (
        ("peak_discharge_current", bms.peak_discharge_current, "BMS peak discharge rating"),
        (
            "continuous_discharge_current",
            bms.continuous_discharge_current,
            "BMS continuous discharge rating",
        ),
    ):
        if rating is None:
            yield Finding(
                Severity.UNASSESSED,
                subject,
                f"The drive draws up to {f(amps)} A from the pack ({demand.how}); the BMS's "
                f"{field.replace('_', ' ')} is not given.",
                missing=(f"battery.bms.{field}",),
                sources=(BMS_RATINGS,),
            )
            continue
        limit = in_unit(rating, "A")
        over = amps > limit
        severity = Severity.PASS
        text = f"The drive draws up to {f(amps)} A from the pack ({demand.how}), against "
        text += f"the BMS's {f(limit)} A {field.split('_')[0]} discharge rating."
        if over and field.startswith("peak"):
            severity = Severity.FIX if independent else Severity.STOP
            text += " Its over-current protection opens the pack at full throttle, at speed."
            if not independent:
                text += " Every brake is electric: they go with it."
        elif over:
            severity = Severity.FIX
            text += " It overheats or trips on a long climb."
        yield Finding(
            severity,
            subject,
            text,
            measured=u.quantity(amps, _A),
            limit=u.quantity(limit, _A),
            comparison=Comparison.AT_MOST,
            remedy=f"fit a BMS rated for at least {f(amps)} A (battery.bms), or lower "
            f"controller.battery_current_limit to {f(limit)} A"
            if over
            else None,
            sources=(BMS_RATINGS, CUT_AT_SPEED),
        )


#: The build field that sets each charge current, for the remedy to name.
_SETTING = {
    "the charger": " (charger.current)",
    "regenerative braking": " (controller.regen_current_limit)",
}


def _charge(build: Build, bms: Bms) -> Finding:
    f = u.format_number
    subject = "BMS charge rating"
    charger = build.charger.current if build.charger is not None else None
    currents = [("the charger", in_unit(charger, "A") if charger is not None else None)]
    regenerates = build.controller is not None and build.controller.regen is True
    regenerates = regenerates or any(b.kind.value == "regenerative" for b in build.brakes or ())
    if regenerates:
        currents.append(("regenerative braking", regen_current(build)))
    missing = [
        "charger.current" if name == "the charger" else "controller.regen_current_limit"
        for name, value in currents
        if value is None
    ]
    if bms.charge_current is None:
        missing.append("battery.bms.charge_current")
    if missing:
        return Finding(
            Severity.UNASSESSED,
            subject,
            "The BMS's charge rating, the charger's current or the regenerative current is "
            "not given.",
            missing=tuple(missing),
            sources=(BMS_RATINGS,),
        )
    assert bms.charge_current is not None
    rating = in_unit(bms.charge_current, "A")
    name, amps = max(((n, v) for n, v in currents if v is not None), key=lambda item: item[1])
    over = amps > rating
    text = f"The most charge current is {f(amps)} A, from {name}, against the BMS's {f(rating)} A."
    if over and name == "regenerative braking":
        text += " The BMS stops it: the regenerative brake vanishes under hard braking."
    return Finding(
        Severity.FIX if over else Severity.PASS,
        subject,
        text,
        measured=u.quantity(amps, _A),
        limit=u.quantity(rating, _A),
        comparison=Comparison.AT_MOST,
        remedy=f"keep {name}'s current at or below {f(rating)} A{_SETTING.get(name, '')}, or "
        f"fit a BMS rated for {f(amps)} A charge (battery.bms.charge_current)"
        if over
        else None,
        sources=(BMS_RATINGS,),
    )


RULE = Rule(
    id="battery.bms",
    title="Battery management system ratings against the drive, charger and regen",
    check=check,
    sources=(BMS_RATINGS, CUT_AT_SPEED),
    inputs=(
        "battery.bms",
        "battery",
        "motors",
        "controller",
        "charger.current",
        "brakes",
        "wires",
    ),
    severities=(Severity.STOP, Severity.FIX, Severity.PASS, Severity.UNASSESSED),
)
