"""speed.descent: the speed the vehicle runs to down its steepest descent, coasting and with
regenerative braking only, against the rider's class limit; and what the motor's back-EMF does
to the controller and the pack at that speed.
"""

from __future__ import annotations

import math
from collections.abc import Iterator

from firstride_rules._shared.regen import ENERGY_BALANCE, RegenForce, regen_force
from firstride_rules._shared.wording import drive_model

from reviewer import figures
from reviewer import units as u
from reviewer.build import Build, Rider
from reviewer.engineering.motor import back_emf_constant
from reviewer.engineering.roadload import Drive, motor_speed_for, ms_to_kmh, road_load_force
from reviewer.engineering.stopping import terminal_speed_on_descent
from reviewer.findings import Comparison, DerivedFigure, Finding, Severity, Source
from reviewer.profile import Profile
from reviewer.rule import Output, Rule
from reviewer.units import in_unit

TERMINAL = Source(
    "Terminal speed downhill where m g sin(theta) equals the road load m g Crr cos(theta) + "
    "0.5 rho CdA v^2 (rho 1.225 kg/m^3 ISA, g 9.80665 m/s^2 CGPM)"
)
BACK_FEED = Source.common_practice(
    "A permanent-magnet motor turned faster than its no-load speed generates more than the pack "
    "voltage: through the controller's switch diodes it charges the pack whether or not the "
    "controller commands it, and above the controller's voltage rating it can destroy it"
)
BACK_EMF = Source("SI definition of the motor constants: Ke = 60 / (2 pi Kv), E = Ke w")
_KMH = u.unit("km/h")
_V = u.unit("V")


def check(build: Build, profile: Profile) -> Iterator[Output]:
    """The speed down ``usage.steepest_grade`` with the drive off and with regenerative braking
    only, and the motors' back-EMF there.

    What it checks
      For each rider (mass with ``vehicle.mass``): the terminal speed coasting down the
      steepest grade (gravity against rolling resistance and drag, the drive off) and with
      regenerative braking only (``rules._shared.regen``: F = V I / v above the fade speed),
      against the profile's ``speed.max_speed.<class>``. For the fastest rider downhill
      at the speed down the descent at full throttle (a motor above its no-load speed taken to
      brake nothing), each motor's back-EMF E = Ke w against the pack's full voltage and
      ``controller.max_input_voltage``.

    Severities
      - fix: a motor's back-EMF on the descent above the controller's input rating.
      - advise: coasting down the descent runs past the rider's class limit (the rider must
        brake all the way down); back-EMF above the full pack (the motor charges the pack
        through the controller's diodes, uncommanded).
      - pass: within limits.
      - unassessed: no ``usage.steepest_grade``, riders or drive-model inputs; back-EMF above
        the full pack with ``controller.max_input_voltage`` not given.
    """
    grade = build.usage.steepest_grade
    drive, notes, missing = drive_model(build, profile)
    lacking = (("usage.steepest_grade",) if grade is None else ()) + (
        ("riders",) if not build.riders else ()
    )
    lacking += tuple(missing)
    if drive is None or grade is None or lacking:
        yield Finding(
            Severity.UNASSESSED,
            "speed on the steepest descent",
            "The speed downhill needs the steepest grade, the riders, the vehicle's mass and "
            "the drive model's inputs.",
            missing=lacking,
            sources=(TERMINAL,),
        )
        return
    yield from notes
    percent = in_unit(grade, "percent")
    assert build.vehicle.mass is not None
    vehicle = in_unit(build.vehicle.mass, "kg")
    regen = regen_force(build, drive, profile) if _regenerates(build) else None
    for rider in build.riders:
        yield from _rider(
            profile, drive, rider, vehicle + in_unit(rider.mass, "kg"), percent, regen
        )
    masses = [vehicle + in_unit(r.mass, "kg") for r in build.riders]
    yield from _back_emf(build, drive, masses, percent)


def _regenerates(build: Build) -> bool:
    regenerative = any(b.kind.value == "regenerative" for b in build.brakes or ())
    return regenerative or (build.controller is not None and build.controller.regen is True)


def _with_regen(
    drive: Drive, mass: float, percent: float, regen: RegenForce
) -> tuple[float, float | None]:
    """What regenerative braking alone does down the descent: the speed below which it holds
    the vehicle back (``math.inf`` at every speed; its fade speed if not even there), and the
    speed it runs on to from a higher one (None where it never runs away; ``math.inf`` where
    nothing balances the slope). A power-limited force V I / v falls with speed, so it can hold
    a slow vehicle and let a fast one run away."""

    def surplus(v: float) -> float:
        load = road_load_force(mass, v, drive.rolling_resistance, drive.drag_area, -percent)
        return -(load + regen(v))

    def root(low: float, high: float) -> float:
        rising = surplus(high) > surplus(low)
        for _ in range(50):
            middle = 0.5 * (low + high)
            if (surplus(middle) > 0.0) == rising:
                high = middle
            else:
                low = middle
        return 0.5 * (low + high)

    step = 0.25  # m/s: a scan, then bisection at each crossing
    v = regen.fade_speed + 1e-6
    previous = surplus(v)
    held = math.inf if previous <= 0.0 else regen.fade_speed
    while v < 200.0:
        following = surplus(v + step)
        if previous <= 0.0 < following:
            held = root(v, v + step)
        elif previous > 0.0 >= following:
            return held, root(v, v + step)
        previous, v = following, v + step
    return held, (math.inf if previous > 0.0 else None)


def _rider(
    profile: Profile,
    drive: Drive,
    rider: Rider,
    mass: float,
    percent: float,
    regen: RegenForce | None,
) -> Iterator[Output]:
    f = u.format_number
    coasting = terminal_speed_on_descent(mass, percent, drive.rolling_resistance, drive.drag_area)
    limit = profile.limit(f"speed.max_speed.{rider.rider_class.value}")
    cap = in_unit(limit.quantity, "km/h")
    kmh = ms_to_kmh(coasting)
    yield DerivedFigure(
        f"coasting speed down the {f(percent)} % descent, rider '{rider.name}'",
        u.quantity(kmh, _KMH),
        note="drive off, no brake: gravity against rolling resistance and drag",
        order=64,
    )
    text = (
        f"Coasting down the {f(percent)} % descent with no brake, rider '{rider.name}' "
        f"({f(mass)} kg with the vehicle) runs to {f(kmh)} km/h, against the "
        f"{rider.rider_class.value} limit of {f(cap)} km/h."
    )
    if regen is not None:
        held, runaway = _with_regen(drive, mass, percent, regen)
        fade = f(ms_to_kmh(regen.fade_speed))
        if runaway is None:
            value: object = u.quantity(ms_to_kmh(regen.fade_speed), _KMH)
            text += (
                f" Regenerative braking alone ({f(regen.current)} A into the pack) holds it back "
                f"at any speed, down to its {fade} km/h fade, while the pack accepts charge."
            )
        else:
            finite = math.isfinite(runaway)
            runs = f"{f(ms_to_kmh(runaway))} km/h" if finite else "no steady speed"
            value = u.quantity(ms_to_kmh(runaway), _KMH) if finite else "no steady speed"
            text += (
                f" Regenerative braking alone ({f(regen.current)} A, a force that falls with "
                f"speed) holds it back only below {f(ms_to_kmh(held))} km/h; from any higher "
                f"speed it runs on to {runs}."
            )
        yield DerivedFigure(
            f"speed down the descent on regenerative braking alone, rider '{rider.name}'",
            value,
            note=f"{f(regen.current)} A into the pack, F = V I / v, from the highest speed",
            order=65,
        )
    over = kmh > cap
    if over:
        text += " The rider must brake all the way down."
    yield Finding(
        Severity.ADVISE if over else Severity.PASS,
        f"speed on the steepest descent, rider '{rider.name}'",
        text,
        measured=u.quantity(kmh, _KMH),
        limit=u.quantity(cap, _KMH),
        comparison=Comparison.AT_MOST,
        remedy="brake before the descent and hold the speed on a friction brake down it, or "
        "avoid it with this rider"
        if over
        else None,
        sources=(TERMINAL, limit.source) + ((ENERGY_BALANCE,) if regen is not None else ()),
    )


def _back_emf(build: Build, drive: Drive, masses: list[float], percent: float) -> Iterator[Output]:
    f = u.format_number
    # downhill the heaviest rider runs fastest (gravity grows with mass, drag does not)
    speed = max(drive.descent_speed(mass, percent) for mass in masses)
    omega = motor_speed_for(speed, drive.reduction, drive.wheel_radius)
    assert build.battery is not None
    full = figures.pack_voltages(build.battery).full
    controller = build.controller
    rating = None
    if controller is not None and controller.max_input_voltage is not None:
        rating = in_unit(controller.max_input_voltage, "V")
    for motor, line in zip(build.motors, drive.motors, strict=True):
        emf = back_emf_constant(line.kv_rpm_per_v) * omega
        subject = f"back-EMF on the steepest descent, motor '{motor.name}'"
        text = (
            f"Down the {f(percent)} % descent the fastest rider reaches {f(ms_to_kmh(speed))} "
            f"km/h; motor '{motor.name}' then generates {f(emf)} V against the {f(full)} V full "
            "pack"
        )
        if emf <= full:
            yield Finding(
                Severity.PASS,
                subject,
                text + ": it stays below the pack.",
                measured=u.quantity(emf, _V),
                limit=u.quantity(full, _V),
                comparison=Comparison.AT_MOST,
                sources=(BACK_EMF, BACK_FEED),
            )
            continue
        text += ", so it charges the pack through the controller's switch diodes, uncommanded"
        if rating is None:
            yield Finding(
                Severity.UNASSESSED,
                subject,
                text + "; the controller's input rating is not given.",
                missing=("controller.max_input_voltage",),
                sources=(BACK_EMF, BACK_FEED),
            )
            continue
        over = emf > rating
        text += f"; the controller is rated {f(rating)} V."
        limit_v = rating if over else full
        yield Finding(
            Severity.FIX if over else Severity.ADVISE,
            subject,
            text,
            measured=u.quantity(emf, _V),
            limit=u.quantity(limit_v, _V),
            comparison=Comparison.AT_MOST,
            remedy=f"hold the speed below {f(ms_to_kmh(speed * limit_v / emf))} km/h on the "
            "descent with a friction brake, or gear the motor to turn slower",
            sources=(BACK_EMF, BACK_FEED),
        )


RULE = Rule(
    id="speed.descent",
    title="Speed down the steepest descent and the motor's back-EMF there",
    check=check,
    sources=(TERMINAL, BACK_FEED, BACK_EMF),
    inputs=(
        "usage.steepest_grade",
        "riders",
        "vehicle.mass",
        "battery",
        "motors",
        "drivetrain",
        "controller",
        "brakes",
        "usage.rolling_resistance",
        "usage.drag_area",
    ),
    severities=(Severity.FIX, Severity.ADVISE, Severity.PASS, Severity.UNASSESSED),
)
