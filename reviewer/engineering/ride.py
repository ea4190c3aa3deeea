"""One rider on a route, stepped in time: speed, motor currents, winding heat and the pack.

Quasi-static and deterministic. Each step the operating point is read off the drive
(:class:`reviewer.engineering.roadload.Drive`, its torque-speed lines with both current limits):

- cruising: speed = min(target, the drive's steady top speed on the grade); the wheel force is
  the road load (brief 3), the total motor torque F r / (reduction x efficiency), shared among
  the motors in proportion to what each line gives at that speed (equally for identical
  motors), and I = T / Kt + I0, never above the line. A demand at or below zero (a descent the
  rider holds with the brakes) draws no current; regeneration is left out.
- from rest (a stop, the start of the ride) or below the cruise speed: full throttle, each
  motor on its line, a = (F_drive - F_road) / m, a midpoint step on speed (second order); the
  explicit and the midpoint speed differ by the step's error estimate, and the next step grows
  from the profile's step, up to the cruise step, while that estimate stays within
  ``accel_tolerance`` (the usual controller of an embedded pair); a step ends early where the
  cruise speed or a segment end is reached.
  Braking to a stop is instant and there is no dwell (no cooling credited while stopped).

The lines use the pack's open-circuit voltage at the step's state of charge (rounded down to
``voltage_step``) and each winding's resistance at its present temperature (rounded up to
``temperature_step`` K): the drive's branch resistances are taken as at 20 degC, its shared
resistance as the pack's plus the shared wiring. Both roundings give a little less current and
speed than the pack and the hot winding allow, never a faster climb (a hot winding on the
voltage-limited part of its line pulls less: the vehicle stays longer on the hill). Motor input
per motor is P = (E + I R) I, E = Ke w, R the motor's branch with the winding at its present
temperature; the battery current delivers the sum through the pack's and ``wiring_resistance``
(:func:`reviewer.engineering.ride_pack.battery_current`). Windings step exactly
(:func:`reviewer.engineering.ride_thermal.ride_stepper`), runaway allowed and timed.

A ride ends early, with ``stop_reason`` set, when the drive cannot climb a grade, the pack
cannot deliver the power, or the pack is empty; the series then run to that point.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass

from reviewer.engineering.ride_drive import DriveAt, SharedLines
from reviewer.engineering.ride_drive import RideModelError as RideModelError
from reviewer.engineering.ride_pack import PackModel, PackPowerExceeded, battery_current
from reviewer.engineering.ride_result import Recorder
from reviewer.engineering.ride_result import RideResult as RideResult
from reviewer.engineering.ride_thermal import Winding, ride_stepper
from reviewer.engineering.roadload import AIR_DENSITY_ISA, Drive, road_load_force

_MAX_STEPS = 2_000_000
_SNAP = 1e-3  # relative: within this of the cruise speed counts as there (saves the asymptote)
_EPS_M = 1e-9  # m: a distance this short is no step
_CHECK = 1e-9  # relative tolerance of the invariants
_ACCEL_TOLERANCE = 0.01  # m/s: the speed error estimate below which a full-throttle step grows


@dataclass(frozen=True)
class Segment:
    """A stretch of route: ``grade_percent`` positive uphill, ``target_speed_ms`` None for as fast
    as the drive goes, ``stops`` starts from rest spread evenly inside it (at k / (stops + 1)
    of its length)."""

    length_m: float
    grade_percent: float
    target_speed_ms: float | None = None
    stops: int = 0

    def __post_init__(self) -> None:
        if not (self.length_m > 0 and math.isfinite(self.length_m)):
            raise ValueError("a segment's length must be positive and finite")
        if not math.isfinite(self.grade_percent):
            raise ValueError("a segment's grade must be finite")
        if self.target_speed_ms is not None and not self.target_speed_ms > 0:
            raise ValueError("a target speed must be positive (None for the drive's top speed)")
        if self.stops < 0:
            raise ValueError("stops must not be negative")


@dataclass(frozen=True)
class _Leg:
    start_m: float
    end_m: float
    grade: float
    target: float | None
    from_rest: bool


def _legs(segments: Sequence[Segment]) -> list[_Leg]:
    legs, start = [], 0.0
    for segment in segments:
        pieces = segment.stops + 1
        for k in range(pieces):
            a = start + segment.length_m * k / pieces
            b = start + segment.length_m * (k + 1) / pieces
            legs.append(_Leg(a, b, segment.grade_percent, segment.target_speed_ms, k > 0))
        start += segment.length_m
    return legs


def simulate(
    drive: Drive,
    total_mass: float,
    segments: Sequence[Segment],
    winding: Winding | Sequence[Winding],
    pack: PackModel,
    dt: float = 1.0,
    *,
    cutoff_voltage: float | None = None,
    wiring_resistance: float = 0.0,
    start_speed_ms: float = 0.0,
    voltage_step: float = 0.05,
    temperature_step: float = 5.0,
    cruise_dt: float | None = None,
    accel_dt: float | None = None,
    accel_tolerance: float = _ACCEL_TOLERANCE,
    shared: SharedLines | None = None,
) -> RideResult:
    """Ride ``segments`` in order with ``total_mass`` kg (vehicle and rider) and step ``dt`` s.

    ``winding``: one per motor of the drive, or one for all. ``cutoff_voltage``: the terminal
    voltage below which the controller or BMS cuts (the pack chemistry's cut-off when None);
    crossing it is recorded, the ride goes on. ``wiring_resistance``: shared wiring between the
    pack and the controller, ohm. ``start_speed_ms``: speed at the start (rest). ``voltage_step``
    (V) and ``temperature_step`` (K): the grids the drive's lines are taken on. ``shared``:
    the lines of states other riders' rides on this drive, windings and grids have met.
    """
    t_step = temperature_step
    windings = tuple(winding) if isinstance(winding, Sequence) else (winding,) * len(drive.motors)
    if shared is None:
        shared = SharedLines(drive, windings, voltage_step, t_step)
    elif shared.identity != (drive, windings, voltage_step, t_step):
        raise ValueError("shared lines belong to another drive, windings or grid")
    if len(windings) != len(drive.motors):
        raise ValueError("give one winding per motor of the drive, or one for all")
    extra_r = []  # ohm: each motor's branch besides its winding (switch, wires)
    for motor, w in zip(drive.motors, windings, strict=True):
        if motor.branch_resistance < w.resistance_20c * (1.0 - _CHECK):
            raise ValueError("a motor's branch resistance is below its winding's own resistance")
        extra_r.append(max(motor.branch_resistance - w.resistance_20c, 0.0))
    if not (
        dt > 0 and total_mass > 0 and voltage_step > 0 and t_step > 0 and wiring_resistance >= 0
    ):
        raise ValueError("dt, mass and the steps must be positive, wiring resistance >= 0")
    if not segments:
        raise ValueError("a route needs at least one segment")
    cruise_step = dt if cruise_dt is None else cruise_dt
    accel_step = dt if accel_dt is None else accel_dt
    if not (cruise_step > 0 and accel_step > 0):
        raise ValueError("the cruise and acceleration steps must be positive")

    result = RideResult(cutoff_v=pack.cutoff_voltage if cutoff_voltage is None else cutoff_voltage)
    radius, ratio, eff = drive.wheel_radius, drive.reduction, drive.efficiency
    crr, drag = drive.rolling_resistance, 0.5 * AIR_DENSITY_ISA * drive.drag_area
    r_total = pack.resistance + wiring_resistance
    capacity_as = pack.capacity_ah * 3600.0
    open_circuit_voltage = pack.open_circuit_voltage_function()
    steppers = [ride_stepper(w) for w in windings]
    drives: dict[tuple[int, ...], DriveAt] = {}
    hints: dict[tuple[float, float | None], float] = {}  # the last top speed per grade, target

    t, x, v, soc = 0.0, 0.0, max(start_speed_ms, 0.0), pack.state_of_charge
    thetas = [w.initial_c for w in windings]
    result.peak_winding_c = max(thetas)
    result.peak_motor = thetas.index(result.peak_winding_c)
    # the winding's R(theta) = R20 (1 + alpha (theta - 20)) of Winding.resistance, inline
    coils = [(w.resistance_20c, w.alpha, extra) for w, extra in zip(windings, extra_r, strict=True)]
    motors = range(len(windings))
    floor, ceil = math.floor, math.ceil
    record = Recorder(result)
    steps = 0
    for leg in _legs(segments):
        if leg.from_rest:
            v = 0.0
        h = accel_step  # the next full-throttle step: grows where the estimate allows
        grade, target, end = leg.grade, leg.target, leg.end_m
        steady = road_load_force(total_mass, 0.0, crr, 0.0, grade)  # N, then + drag v^2
        while x < end - _EPS_M:
            steps += 1
            if steps > _MAX_STEPS:
                raise ValueError("the ride needs too many steps; use a longer dt")
            ocv = open_circuit_voltage(soc)
            key = (floor(ocv / voltage_step), *[ceil(theta / t_step) for theta in thetas])
            at = drives.get(key)
            if at is None:
                hot = [
                    w.resistance(n * t_step) - w.resistance_20c
                    for w, n in zip(windings, key[1:], strict=True)
                ]
                volts = key[0] * voltage_step
                lines_here = shared.lines_for(key, volts, hot)
                at = drives[key] = DriveAt(drive, lines_here, total_mass, hints)
            lines = at.lines
            cruise = at.cruise(grade, target)
            if cruise <= 0.0:
                result.stop_reason = (
                    f"the drive cannot climb {grade:g} % at {ocv:.3g} V (stalled at {x:.0f} m)"
                )
                return record.finished()
            if v > cruise:
                v = cruise
            remaining = end - x
            if v < cruise * (1.0 - _SNAP):  # full throttle: a midpoint step on speed
                pull = at.pull(v)
                start = ((pull if pull > 0.0 else 0.0) - (steady + drag * v * v)) / total_mass
                if not start > 0:
                    raise RideModelError("below the top speed the drive must outpull the load")
                # min() and max() written out: the same values, in the loop's hottest lines
                step = (cruise - v) / start
                step = h if h <= step else step
                middle = v + 0.5 * start * step
                middle = middle if middle <= cruise else cruise
                load = steady + drag * middle * middle
                pull = at.pull(middle)
                accel = ((pull if pull > 0.0 else 0.0) - load) / total_mass
                accel = accel if accel >= 0.5 * start else 0.5 * start
                last = (cruise - v) / accel
                step = step if step <= last else last
                h = _next_step(
                    h, abs(accel - start) * step, accel_tolerance, accel_step, cruise_step
                )
                omega = middle / radius * ratio  # the step's currents and power at its middle
                currents = [max(line.current(omega), 0.0) for line in lines]
                distance = v * step + 0.5 * accel * step * step
                if distance > remaining:
                    step = 2.0 * remaining / (v + math.sqrt(v * v + 2.0 * accel * remaining))
                    distance = remaining
                v_next = v + accel * step
                v_next = v_next if v_next <= cruise else cruise
            else:  # cruise
                v = cruise
                omega = v / radius * ratio
                load = steady + drag * v * v
                currents = at.cruise_currents(grade, target, load * radius / (eff * ratio))
                step = remaining / v
                step = cruise_step if cruise_step <= step else step
                distance = v * step
                if distance > remaining or remaining - distance < _EPS_M:
                    distance = remaining
                v_next = v

            # Electrical input, copper loss and the pack.
            power = 0.0
            shaft = 0.0
            for k in motors:
                line, current = lines[k], currents[k]
                r20, alpha, extra = coils[k]
                r_winding = r20 * (1.0 + alpha * (thetas[k] - 20.0))
                electrical = (line.ke * omega + current * (extra + r_winding)) * current
                if not current * current * r_winding <= electrical * (1 + _CHECK) + 1e-12:
                    raise RideModelError("copper loss > input")
                power += electrical
                if current > line.no_load_current:
                    shaft += line.kt * (current - line.no_load_current) * omega
            try:
                i_batt = battery_current(ocv, r_total, power)
            except PackPowerExceeded as exc:
                result.stop_reason = f"{exc} (at {x:.0f} m, state of charge {soc:.3f})"
                return record.finished()
            terminal = ocv - i_batt * pack.resistance
            delivered = terminal * i_batt - i_batt * i_batt * wiring_resistance
            if not abs(delivered - power) <= _CHECK * (power if power > 1.0 else 1.0):
                raise RideModelError("pack power != drive input")

            runaway = False
            for k in motors:
                theta, past = steppers[k](thetas[k], currents[k], step, v)
                thetas[k] = theta
                runaway = runaway or past
                if not math.isfinite(theta):
                    result.stop_reason = f"thermal runaway beyond any temperature at {x:.0f} m"
                    return record.finished()
            soc_next = soc - i_batt * step / capacity_as
            t += step
            x = end if distance >= remaining else x + distance
            v = v_next
            record.step(
                t, x, v, currents, i_batt, thetas, terminal, soc_next if soc_next > 0.0 else 0.0
            )
            record.cell_wh += ocv * i_batt * step / 3600.0
            record.terminal_wh += terminal * i_batt * step / 3600.0
            record.shaft_wh += shaft * step / 3600.0
            record.charge_ah += i_batt * step / 3600.0
            if runaway:
                record.runaway_s += step
            if not soc_next <= soc:
                raise RideModelError("state of charge must not rise while driving")
            soc = soc_next
            if soc <= 0.0:
                result.stop_reason = f"the pack is empty at {x:.0f} m"
                return record.finished()
    return record.finished()


def _next_step(h: float, estimate: float, tolerance: float, least: float, most: float) -> float:
    """The next full-throttle step after one of ``h`` s whose speed error estimate is
    ``estimate`` m/s (the explicit and the midpoint step's speeds differ by that much): the usual
    controller of an embedded pair, h (tolerance / estimate)^(1/2) with a 0.9 safety factor,
    at most doubling, never below ``least`` (the profile's step) nor above ``most``."""
    grown = 2.0 * h if estimate <= 0.0 else h * min(2.0, 0.9 * math.sqrt(tolerance / estimate))
    return min(max(grown, least), max(most, least))
