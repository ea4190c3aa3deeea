"""Power-switch losses, junction temperature, freewheel current and averaging windows."""

from __future__ import annotations

import pytest

from reviewer.engineering.switching import (
    averaging_window,
    conduction_loss,
    freewheel_average_current,
    hot_on_resistance,
    junction_temperature,
    largest_current,
    largest_sink_to_air,
    periods_in_window,
    spans_whole_periods,
    switching_loss,
    whole_period_frequency,
    whole_period_sample_count,
    worst_freewheel_average_current,
)


def test_conduction_loss_textbook_arithmetic() -> None:
    # P = I^2 R: 10 A through 10 mOhm (hot) for the whole period is 1 W
    assert conduction_loss(10.0, 0.010, 1.0) == pytest.approx(1.0)
    # P = I^2 R D: conducting half the time halves it
    assert conduction_loss(10.0, 0.010, 0.5) == pytest.approx(0.5)


def test_hot_on_resistance_scales_the_25c_figure() -> None:
    # from memory: Rds(on) rises about 1.5-2 x from 25 degC to 125-150 degC; 1.7 x 6 mOhm
    assert hot_on_resistance(0.006, 1.7) == pytest.approx(0.0102)
    with pytest.raises(ValueError):
        hot_on_resistance(0.006, 0.0)


def test_switching_loss_worked_example() -> None:
    # from memory: Mohan, Undeland and Robbins, P_sw = 0.5 V I (tr + tf) f_sw
    # 48 V, 20 A, 50 ns + 50 ns edges at 20 kHz: 0.5 x 48 x 20 x 100e-9 x 20e3 = 0.96 W
    assert switching_loss(48.0, 20.0, 50e-9, 50e-9, 20e3) == pytest.approx(0.96)
    # the loss is linear in frequency: twice the PWM frequency, twice the loss
    assert switching_loss(48.0, 20.0, 50e-9, 50e-9, 40e3) == pytest.approx(1.92)


def test_junction_temperature_is_the_jesd51_sum() -> None:
    # from memory: JEDEC JESD51, Tj = Ta + P (R_jc + R_cs + R_sa)
    # 2 W through 1.0 + 0.5 + 4.0 K/W from 25 degC: 25 + 2 x 5.5 = 36 degC
    assert junction_temperature(25.0, 2.0, 1.0, 0.5, 4.0) == pytest.approx(36.0)


def test_largest_sink_to_air_lands_on_the_target() -> None:
    # JEDEC JESD51 sum inverted: (125 - 25) / 5 W - 1.0 - 0.5 = 18.5 K/W
    sink = largest_sink_to_air(25.0, 5.0, 125.0, 1.0, 0.5)
    assert sink == pytest.approx(18.5)
    assert junction_temperature(25.0, 5.0, 1.0, 0.5, sink) == pytest.approx(125.0)
    # a junction-to-case step that alone uses the budget leaves no heatsink that works
    assert largest_sink_to_air(25.0, 50.0, 125.0, 1.5, 0.5) <= 0


def test_largest_current_is_the_root_of_the_loss_quadratic() -> None:
    # conduction only: 10 K/W, 100 K budget -> 10 W; I = sqrt(10 W / 0.1 ohm) = 10 A (P = I^2 R)
    assert largest_current(25.0, 125.0, 10.0, 0.1, 1.0, 0.0, 0.0, 0.0) == pytest.approx(10.0)
    # with switching loss too, the returned current puts Tj exactly on the target
    amps = largest_current(25.0, 125.0, 5.5, 0.017, 1.0, 29.4, 200e-9, 4e3)
    power = conduction_loss(amps, 0.017, 1.0) + switching_loss(29.4, amps, 100e-9, 100e-9, 4e3)
    assert junction_temperature(25.0, power, 5.5) == pytest.approx(125.0)
    assert largest_current(130.0, 125.0, 5.5, 0.017, 1.0, 29.4, 200e-9, 4e3) == 0.0


def test_freewheel_average_current() -> None:
    # from memory: the diode carries I for the off part of the period, I (1 - D)
    assert freewheel_average_current(30.0, 0.25) == pytest.approx(22.5)
    with pytest.raises(ValueError):
        freewheel_average_current(30.0, 1.5)


@pytest.mark.parametrize("limit", [None, 10.0, 30.0, 49.0, 50.0, 80.0, 120.0])
def test_worst_freewheel_current_is_the_maximum_over_duty(limit: float | None) -> None:
    # derived: locked rotor, I(D) = min(D I_stall, I_limit), diode average I(D) (1 - D);
    # the closed form must equal a brute-force maximum over a fine grid of duties
    stall = 100.0
    cap = stall if limit is None else limit
    brute = max(min(d / 10_000 * stall, cap) * (1 - d / 10_000) for d in range(10_001))
    assert worst_freewheel_average_current(stall, limit) == pytest.approx(brute, rel=1e-6)


def test_worst_freewheel_current_closed_forms() -> None:
    # derived: no limit -> I_stall / 4 at D = 0.5; 30 A limit on 100 A stall -> 30 x 0.7 = 21 A
    assert worst_freewheel_average_current(100.0, None) == pytest.approx(25.0)
    assert worst_freewheel_average_current(100.0, 30.0) == pytest.approx(21.0)


def test_two_hundred_samples_at_10_khz_span_whole_4_khz_periods() -> None:
    # common practice: 200 samples at 10 kHz = 20 ms = 80 whole periods of a 4 kHz PWM
    window = averaging_window(200, 10e3)
    assert window == pytest.approx(0.020)
    periods = periods_in_window(window, 4e3)
    assert periods == pytest.approx(80.0)
    assert spans_whole_periods(periods, 0.05)


def test_two_hundred_samples_at_12_khz_miss_whole_5_khz_periods() -> None:
    # common practice: 200 samples at 12 kHz = 16.67 ms = 83.3 periods of a 5 kHz PWM: fails
    window = averaging_window(200, 12e3)
    assert window == pytest.approx(0.016667, rel=1e-4)
    periods = periods_in_window(window, 5e3)
    assert periods == pytest.approx(83.333, rel=1e-4)
    assert not spans_whole_periods(periods, 0.05)


def test_a_window_under_one_period_never_spans_whole_periods() -> None:
    # common practice: half a period is not a whole number of periods
    assert not spans_whole_periods(0.5, 0.05)
    assert not spans_whole_periods(0.0, 0.05)
    assert spans_whole_periods(1.0, 0.05)


def test_whole_period_sample_count_nearest() -> None:
    # 12 kHz / 5 kHz = 2.4 samples per period: only multiples of 12 samples (5 periods) fit;
    # nearest to 200 is 204 (85 periods), not 192 (80 periods)
    assert whole_period_sample_count(12e3, 5e3, 0.05, 200) == 204
    assert whole_period_sample_count(10e3, 4e3, 0.05, 200) == 200
    # sampling slower than the PWM: every count spans 16 whole periods of a 16 kHz PWM at 1 kHz
    assert whole_period_sample_count(1e3, 16e3, 0.05, 3) == 3


def test_whole_period_frequency_fits_the_window() -> None:
    # 16.67 ms holds 83.3 periods of 5 kHz; 83 whole periods need 4.98 kHz
    window = averaging_window(200, 12e3)
    frequency = whole_period_frequency(window, 5e3)
    assert frequency == pytest.approx(4980.0)
    assert spans_whole_periods(periods_in_window(window, frequency), 1e-9)
    # a window shorter than one period gets the frequency of exactly one period in it
    assert whole_period_frequency(1e-4, 4e3) == pytest.approx(1e4)
