"""The logic supply: a linear regulator's heat, and a switching regulator's input current.

A linear regulator drops the whole difference between its input and its output across its pass
transistor, at the full load current, and draws a small quiescent (ground) current besides:
P = (Vin - Vout) I_out + Vin I_q. That heat leaves through the junction-to-air thermal resistance,
so the junction runs at Tj = Ta + P R_th(j-a) (JEDEC JESD51 definitions). From a lithium pack of
ten or more cells a linear part quickly passes its junction limit: the usual cure is a switching
regulator, whose loss is a fraction of the power delivered rather than of the voltage dropped.

All quantities are SI floats: V, A, W, K/W, degC.
"""

from __future__ import annotations

import math


def linear_regulator_loss(
    input_voltage: float, output_voltage: float, load_current: float, quiescent_current: float = 0.0
) -> float:
    """Heat in W in a linear regulator: (Vin - Vout) I_out + Vin I_q."""
    if input_voltage < output_voltage:
        raise ValueError("a linear regulator's input must be at or above its output")
    if load_current < 0 or quiescent_current < 0:
        raise ValueError("currents must not be negative")
    return (input_voltage - output_voltage) * load_current + input_voltage * quiescent_current


def junction_temperature(ambient_c: float, power: float, thermal_resistance: float) -> float:
    """Tj = Ta + P R_th in degC, with R_th the junction-to-air thermal resistance in K/W."""
    if power < 0 or thermal_resistance < 0:
        raise ValueError("power and thermal resistance must not be negative")
    return ambient_c + power * thermal_resistance


def linear_load_budget(
    input_voltage: float,
    output_voltage: float,
    thermal_resistance: float,
    ambient_c: float,
    max_junction_c: float,
    quiescent_current: float = 0.0,
) -> float:
    """The most load current in A a linear regulator passes with its junction at or below
    ``max_junction_c``: ((Tj_max - Ta) / R_th - Vin I_q) / (Vin - Vout).

    0 when the quiescent loss alone, or the ambient, already uses the whole allowance;
    ``math.inf`` when the input equals the output (no voltage across the pass transistor).
    """
    if thermal_resistance <= 0:
        raise ValueError("thermal resistance must be positive")
    allowed = (max_junction_c - ambient_c) / thermal_resistance - input_voltage * quiescent_current
    if allowed <= 0:
        return 0.0
    headroom = input_voltage - output_voltage
    if headroom <= 0:
        return math.inf
    return allowed / headroom


def largest_thermal_resistance(power: float, ambient_c: float, max_junction_c: float) -> float:
    """The highest junction-to-air R_th in K/W (a heatsink's job) that keeps Tj within limit."""
    if power <= 0:
        return math.inf
    return max(max_junction_c - ambient_c, 0.0) / power


def switching_input_current(
    input_voltage: float, output_voltage: float, load_current: float, efficiency: float
) -> float:
    """A switching regulator's input current in A: the output power over efficiency, at the
    input voltage (Vout I_out / (eta Vin)). Its loss is (1/eta - 1) x the output power."""
    if not 0 < efficiency <= 1:
        raise ValueError("efficiency must be in (0, 1]")
    if input_voltage <= 0:
        raise ValueError("input voltage must be positive")
    return output_voltage * load_current / (efficiency * input_voltage)


def switching_loss(output_voltage: float, load_current: float, efficiency: float) -> float:
    """Heat in W in a switching regulator: Vout I_out (1 / eta - 1)."""
    if not 0 < efficiency <= 1:
        raise ValueError("efficiency must be in (0, 1]")
    return output_voltage * load_current * (1.0 / efficiency - 1.0)
