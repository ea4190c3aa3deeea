"""The power switch of a PWM motor drive: its losses and junction temperature, the freewheel
diode beside it, and the sampled current measurement a current limit acts on.

Losses of a MOSFET switching an inductive load (Mohan, Undeland and Robbins, Power
Electronics; from memory): conduction loss I^2 Rds(on,hot) D while it is on, and a switching
loss of about 0.5 V I (tr + tf) f_sw from the overlap of voltage and current at each edge.
Rds(on) rises with junction temperature, about 1.5-2 x from 25 degC to 125-150 degC, so the loss
uses the hot figure. The junction sits above the air by the loss times the thermal resistances
in series (JEDEC JESD51 definitions): Tj = Ta + P (R_jc + R_cs + R_sa).

A motor winding is an inductor: when the switch opens, its current must keep flowing. With a
freewheel diode across the motor it circulates through the diode for the off part of each period,
on average about I (1 - D). Without one, the switch takes the stored energy as avalanche.

All values are SI floats: A, V, ohm, s, Hz, W, K/W, degC. No knowledge of builds or rules.
"""

from __future__ import annotations

import math


def hot_on_resistance(on_resistance_25c: float, hot_factor: float) -> float:
    """Rds(on) at a hot junction from the datasheet's 25 degC figure and a rise factor."""
    if on_resistance_25c < 0 or hot_factor <= 0:
        raise ValueError("on-resistance must not be negative and the factor must be positive")
    return on_resistance_25c * hot_factor


def conduction_loss(current: float, on_resistance: float, duty: float) -> float:
    """I^2 R D in W: the switch carries ``current`` through ``on_resistance`` for ``duty``."""
    if not 0.0 <= duty <= 1.0:
        raise ValueError("duty must be between 0 and 1")
    return current * current * on_resistance * duty


def switching_loss(
    voltage: float, current: float, rise_time: float, fall_time: float, frequency: float
) -> float:
    """About 0.5 V I (tr + tf) f_sw in W: voltage and current overlap on each edge."""
    if min(voltage, current, rise_time, fall_time, frequency) < 0:
        raise ValueError("switching-loss inputs must not be negative")
    return 0.5 * voltage * current * (rise_time + fall_time) * frequency


def junction_temperature(ambient_c: float, power: float, *thermal_resistances: float) -> float:
    """Tj = Ta + P (R_jc + R_cs + R_sa) in degC, for any chain of resistances in K/W."""
    return ambient_c + power * sum(thermal_resistances)


def largest_sink_to_air(
    ambient_c: float, power: float, target_c: float, junction_case: float, case_sink: float
) -> float:
    """The highest sink-to-air resistance (K/W) that keeps Tj at or below ``target_c``.

    Zero or negative means no heatsink can do it: the junction-to-case and case-to-sink steps
    alone already use the whole temperature budget. Infinite when there is no loss.
    """
    if power <= 0:
        return math.inf
    return (target_c - ambient_c) / power - junction_case - case_sink


def largest_current(
    ambient_c: float,
    target_c: float,
    total_thermal_resistance: float,
    on_resistance_hot: float,
    duty: float,
    voltage: float,
    switching_time: float,
    frequency: float,
) -> float:
    """The highest switch current (A) whose loss keeps Tj at or below ``target_c``.

    Loss is a I^2 + b I with a = R D (conduction) and b = 0.5 V (tr + tf) f (switching), and the
    budget is (target - Ta) / R_total, so I is the positive root of a quadratic.
    """
    budget = (target_c - ambient_c) / total_thermal_resistance
    if budget <= 0:
        return 0.0
    a = on_resistance_hot * duty
    b = 0.5 * voltage * switching_time * frequency
    if a <= 0:
        return budget / b if b > 0 else math.inf
    return (-b + math.sqrt(b * b + 4.0 * a * budget)) / (2.0 * a)


def freewheel_average_current(current: float, duty: float) -> float:
    """Average diode current I (1 - D): it carries the motor current while the switch is off."""
    if not 0.0 <= duty <= 1.0:
        raise ValueError("duty must be between 0 and 1")
    return current * (1.0 - duty)


def worst_freewheel_average_current(stall_current: float, current_limit: float | None) -> float:
    """The highest average freewheel-diode current over every duty, in A.

    The worst case is a locked rotor (no back-EMF): at duty D its average current is D I_stall
    (V = I R with the average voltage D V), held down to the limit I_L once that is reached,
    and the diode carries it for (1 - D). f(D) = min(D I_stall, I_L) (1 - D) peaks at D = 0.5
    with I_stall / 4 when the limit is at least half the stall current (or absent); otherwise at
    the duty that just reaches the limit, D = I_L / I_stall, with I_L (1 - I_L / I_stall).
    """
    if stall_current <= 0:
        raise ValueError("stall current must be positive")
    if current_limit is None or current_limit >= 0.5 * stall_current:
        return 0.25 * stall_current
    return freewheel_average_current(current_limit, current_limit / stall_current)


def averaging_window(samples: int, sample_rate: float) -> float:
    """The time the averaged samples span, n / f_s, in s; also how long a new current (a stall)
    flows before the average fully shows it."""
    if samples < 1 or sample_rate <= 0:
        raise ValueError("samples and sample rate must be positive")
    return samples / sample_rate


def periods_in_window(window: float, frequency: float) -> float:
    """How many PWM periods the averaging window spans."""
    return window * frequency


def spans_whole_periods(periods: float, tolerance: float) -> bool:
    """At least one period, and within ``tolerance`` (a fraction of a period) of a whole number.

    A window holding a part period over-counts the on- or off-part of that period, so the
    average of a chopped current reads high or low by up to (part period / periods) of the peak.
    """
    return periods >= 1.0 - tolerance and abs(periods - round(periods)) <= tolerance


def whole_period_sample_count(
    sample_rate: float, frequency: float, tolerance: float, near: int, most: int = 1_000_000
) -> int | None:
    """The sample count closest to ``near`` (the larger on a tie) whose window spans whole PWM
    periods within ``tolerance``; None if none lies within reach (at most ``most`` samples)."""
    per_period = sample_rate / frequency  # samples in one PWM period
    # Whole-period counts recur within about (per_period + 1) / tolerance samples of each other.
    reach = min(most, max(near, math.ceil((per_period + 1.0) / max(tolerance, 1e-3)) + 16))
    for distance in range(reach + 1):
        for count in (near + distance, near - distance):
            if 1 <= count <= most and spans_whole_periods(count / per_period, tolerance):
                return count
    return None


def whole_period_frequency(window: float, frequency: float) -> float:
    """The PWM frequency nearest ``frequency`` whose period fits the window a whole number of
    times (at least once), in Hz."""
    periods = max(1, round(periods_in_window(window, frequency)))
    return periods / window
