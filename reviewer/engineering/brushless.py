"""Brushless (and brushed) drives seen through the currents a controller quotes, in SI floats.

A hobby controller quotes one motor (phase) current and one battery current (domain brief 11).
What a quoted motor amp does depends on the drive kind:

- ``brushed`` and ``six-step`` (trapezoidal): the quoted current flows through the loop (two
  phases in series for six-step), so T = Ke I and P_cu = I^2 R, with Ke and R line to line;
- ``field-oriented`` (sinusoidal) with a peak phase current I_pk: the three-phase power balance
  gives T = (sqrt 3 / 2) Ke_LL I_pk and P_cu = (3/4) I_pk^2 R_LL (derived, brief 11); an rms
  figure is I_pk = sqrt 2 I_rms.

Both kinds reduce to one DC-equivalent current I_dc with T = Ke_LL I_dc and P_cu = I_dc^2 R_LL
(for field-oriented drive I_dc = (sqrt 3 / 2) I_pk), which is what the torque-speed line in
reviewer.engineering.motor and the current limits below work in.

Seen from the pack, the controller is a buck converter: V I_b = E I + I^2 R (switch losses
aside), so I_b = d I with d = (E + I R) / V (Mohan, Undeland and Robbins, from memory; energy
balance). Kv is quoted line to line: Ke_LL [V s/rad, peak] = 60 / (2 pi Kv [rpm/V]).
A star winding has R_LL = 2 R_phase (circuit theory).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from reviewer.engineering.motor import back_emf_constant

BRUSHED = "brushed"
SIX_STEP = "six-step"
FIELD_ORIENTED = "field-oriented"
DRIVE_KINDS = (BRUSHED, SIX_STEP, FIELD_ORIENTED)
PEAK = "peak"
RMS = "rms"

SQRT3_OVER_2 = math.sqrt(3.0) / 2.0
#: Hottest phase over the mean phase loss with the current vector standing still (derived below).
LOCKED_ROTOR_HOTTEST_PHASE_FACTOR = 2.0
#: Relative slack for the energy-balance assertions: float rounding only.
_SLACK = 1e-9


def line_to_line_ke(kv_rpm_per_v: float) -> float:
    """Ke_LL in V s/rad (peak line-to-line volts per rad/s) from a Kv quoted line to line.

    60 / (2 pi Kv); the same number as the DC machine's Ke, because Kv is measured between two
    terminals (brief 11).
    """
    return back_emf_constant(kv_rpm_per_v)


def line_to_line_resistance(phase_resistance: float) -> float:
    """R_LL in ohm of a star winding: two phases in series between any two terminals."""
    if phase_resistance <= 0:
        raise ValueError("phase resistance must be positive")
    return 2.0 * phase_resistance


def _check_drive(drive: str, basis: str | None) -> None:
    if drive not in DRIVE_KINDS:
        raise ValueError(f"unknown drive kind {drive!r}; expected one of {', '.join(DRIVE_KINDS)}")
    if drive == FIELD_ORIENTED and basis not in (PEAK, RMS):
        # Which basis is the pessimistic one depends on the check, so none is assumed here.
        raise ValueError("a field-oriented current needs its basis: 'peak' or 'rms'")


def phase_peak_current(current: float, drive: str, basis: str | None = None) -> float:
    """The peak current in A one phase conductor carries for a quoted motor current.

    Brushed and six-step: the quoted current itself (flat-topped). Field-oriented: I_pk, which
    is sqrt 2 times an rms figure.
    """
    _check_drive(drive, basis)
    if drive == FIELD_ORIENTED and basis == RMS:
        return math.sqrt(2.0) * current
    return current


def dc_equivalent_current(current: float, drive: str, basis: str | None = None) -> float:
    """The DC-equivalent current in A (T = Ke_LL I_dc, P_cu = I_dc^2 R_LL) of a quoted current.

    Field-oriented: I_dc = (sqrt 3 / 2) I_pk, so a quoted peak amp gives about 13 % less torque
    than a six-step amp (brief 11).
    """
    peak = phase_peak_current(current, drive, basis)
    return SQRT3_OVER_2 * peak if drive == FIELD_ORIENTED else peak


def quoted_current(dc_current: float, drive: str, basis: str | None = None) -> float:
    """The inverse of ``dc_equivalent_current``: the quoted figure for a DC-equivalent current."""
    return dc_current / dc_equivalent_current(1.0, drive, basis)


def torque_per_amp(ke_ll: float, drive: str, basis: str | None = None) -> float:
    """Shaft torque in N m per quoted motor amp, iron and friction losses aside.

    Ke_LL for brushed and six-step; (sqrt 3 / 2) Ke_LL per peak amp and sqrt(3/2) Ke_LL per rms
    amp for field-oriented drive.
    """
    return ke_ll * dc_equivalent_current(1.0, drive, basis)


def motor_torque(ke_ll: float, current: float, drive: str, basis: str | None = None) -> float:
    """Shaft torque in N m at a quoted motor current (no-load current not subtracted)."""
    return torque_per_amp(ke_ll, drive, basis) * current


def winding_copper_loss(
    current: float, resistance_ll: float, drive: str, basis: str | None = None
) -> float:
    """Copper loss in W at a quoted motor current through a winding of R_LL ohm.

    I^2 R_LL for brushed and six-step (for brushed, R_LL is the loop resistance); (3/4) I_pk^2
    R_LL for field-oriented drive: three phases of R_phase = R_LL / 2, each carrying I_pk^2 / 2
    on average.
    """
    if resistance_ll <= 0:
        raise ValueError("winding resistance must be positive")
    dc = dc_equivalent_current(current, drive, basis)
    return dc * dc * resistance_ll


def duty_cycle(back_emf: float, motor_current: float, resistance: float, voltage: float) -> float:
    """The averaged duty d = (E + I R) / V, clipped to [0, 1]: what the bridge must apply."""
    if voltage <= 0:
        raise ValueError("pack voltage must be positive")
    return min(1.0, max(0.0, (back_emf + motor_current * resistance) / voltage))


def battery_current(
    back_emf: float, motor_current: float, resistance: float, voltage: float
) -> float:
    """Battery current in A drawn for a DC-equivalent motor current: I_b = d I_m.

    At a stall (E = 0) this is I_m^2 R / V, a small part of the motor current: the pack and its
    fuse see much less than the winding does (brief 11).
    """
    return duty_cycle(back_emf, motor_current, resistance, voltage) * motor_current


def current_for_battery_limit(
    back_emf: float, resistance: float, voltage: float, battery_limit: float
) -> float:
    """The DC-equivalent motor current in A whose battery draw is exactly ``battery_limit``.

    The positive root of R I^2 + E I - I_b V = 0, written 2 I_b V / (E + sqrt(E^2 + 4 R I_b V))
    so it does not lose digits when E^2 dwarfs 4 R I_b V.
    """
    if battery_limit < 0 or resistance <= 0 or voltage <= 0:
        raise ValueError("battery limit must not be negative; R and V must be positive")
    emf = max(back_emf, 0.0)
    product = battery_limit * voltage
    if product == 0:
        return 0.0
    return 2.0 * product / (emf + math.sqrt(emf * emf + 4.0 * resistance * product))


@dataclass(frozen=True)
class DriveCurrents:
    """One operating point with both controller limits applied (DC-equivalent motor current)."""

    motor_current: float  # A
    battery_current: float  # A
    limited_by: str  # "pack voltage", "motor current limit" or "battery current limit"
    electrical_input: float  # W, V I_b
    copper_loss: float  # W, I_m^2 R


def limited_currents(
    back_emf: float,
    voltage: float,
    resistance: float,
    motor_current_limit: float | None,
    battery_current_limit: float | None,
) -> DriveCurrents:
    """Motor and battery current in A at back-EMF ``back_emf`` V (from the speed) on a pack at
    ``voltage`` V through ``resistance`` ohm, with both limits acting together.

    I_m = min(I_m,limit, (V - E) / R, the current whose draw is I_b,limit); a limit of None is
    no limit. ``motor_current_limit`` is DC-equivalent: convert a quoted field-oriented figure
    with ``dc_equivalent_current`` first. Pass the hot resistance for heating, the cold one for
    peak currents. Above the no-load speed (E >= V) the drive delivers nothing (regeneration is
    not modelled). Asserts that the copper loss does not exceed the electrical input and that
    the battery current does not exceed the motor current.
    """
    if voltage <= 0 or resistance <= 0:
        raise ValueError("pack voltage and winding resistance must be positive")
    if back_emf < 0:
        raise ValueError("back-EMF must not be negative (take its magnitude)")
    candidates = [(max(0.0, (voltage - back_emf) / resistance), "pack voltage")]
    if motor_current_limit is not None:
        if motor_current_limit < 0:
            raise ValueError("motor current limit must not be negative")
        candidates.append((motor_current_limit, "motor current limit"))
    if battery_current_limit is not None:
        candidates.append(
            (
                current_for_battery_limit(back_emf, resistance, voltage, battery_current_limit),
                "battery current limit",
            )
        )
    motor, limited_by = min(candidates, key=lambda pair: pair[0])
    battery = battery_current(back_emf, motor, resistance, voltage)
    electrical = voltage * battery
    copper = motor * motor * resistance
    assert copper <= electrical + _SLACK * (1.0 + electrical), "copper loss above input"
    assert battery <= motor + _SLACK * (1.0 + motor), "battery current above motor current"
    return DriveCurrents(motor, battery, limited_by, electrical, copper)


def locked_rotor_phase_currents(
    peak_current: float, electrical_angle: float
) -> tuple[float, float, float]:
    """Phase currents in A of a balanced three-phase set frozen at ``electrical_angle`` rad.

    Under field-oriented control a locked rotor stops the current vector: the phases carry
    I_pk cos(a), I_pk cos(a - 120 deg), I_pk cos(a + 120 deg) as steady DC.
    """
    third = 2.0 * math.pi / 3.0
    return (
        peak_current * math.cos(electrical_angle),
        peak_current * math.cos(electrical_angle - third),
        peak_current * math.cos(electrical_angle + third),
    )


def locked_rotor_hottest_phase_loss(
    peak_current: float, phase_resistance: float, electrical_angle: float | None = None
) -> float:
    """Copper loss in W of the hottest phase of a locked rotor under field-oriented control.

    The three losses always sum to (3/2) I_pk^2 R_phase = (3/4) I_pk^2 R_LL, but with the vector
    standing still they need not be shared: at the worst angle (``None``, the default) one phase
    carries the whole I_pk, I_pk^2 R_phase, twice the mean phase loss (brief 11, from memory;
    this function derives it).
    """
    if phase_resistance <= 0:
        raise ValueError("phase resistance must be positive")
    if electrical_angle is None:
        electrical_angle = 0.0
    currents = locked_rotor_phase_currents(peak_current, electrical_angle)
    return max(i * i * phase_resistance for i in currents)


def kv_from_no_load(
    no_load_speed_rpm: float, voltage: float, no_load_current: float, resistance: float
) -> float:
    """Kv in rpm/V from a no-load test: speed ``no_load_speed_rpm`` at ``voltage`` V while the
    winding (R ohm, the resistance the motor model will use) carries ``no_load_current`` A.

    The back-EMF at no load is V - I0 R, so Kv = n0 / (V - I0 R). A motor model built on this Kv
    subtracts the I0 R drop again itself; taking Kv = n0 / V instead counts the drop twice and
    predicts a slower motor than the one tested, the unsafe side for a speed limit.
    """
    if no_load_speed_rpm <= 0:
        raise ValueError("no-load speed must be positive")
    if no_load_current < 0 or resistance < 0:
        raise ValueError("no-load current and resistance must not be negative")
    back_emf = voltage - no_load_current * resistance
    if back_emf <= 0:
        raise ValueError("the drop I0 R is not below the test voltage")
    return no_load_speed_rpm / back_emf
