"""What one simulated ride gives: its series and summaries (:class:`RideResult`), and the
recorder ``reviewer.engineering.ride.simulate`` fills step by step."""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass, field


@dataclass
class RideResult:
    """Series and summaries of one simulated ride.

    Sample k describes step k: time, distance, speed, winding temperatures and state of charge
    at the step's end; motor currents, battery current and terminal voltage held during it.
    """

    time_s: list[float] = field(default_factory=list)
    distance_m: list[float] = field(default_factory=list)
    speed_ms: list[float] = field(default_factory=list)
    motor_current_a: list[tuple[float, ...]] = field(default_factory=list)
    battery_current_a: list[float] = field(default_factory=list)
    winding_c: list[tuple[float, ...]] = field(default_factory=list)
    terminal_v: list[float] = field(default_factory=list)
    state_of_charge: list[float] = field(default_factory=list)
    cutoff_v: float = 0.0
    peak_winding_c: float = -math.inf
    peak_time_s: float = 0.0
    peak_distance_m: float = 0.0
    peak_motor: int = 0
    min_terminal_v: float = math.inf
    min_voltage_time_s: float = 0.0
    min_voltage_distance_m: float = 0.0
    min_voltage_soc: float = 1.0
    first_below_cutoff_s: float | None = None
    first_below_cutoff_m: float | None = None
    cell_energy_wh: float = 0.0  # integral of OCV I_b: what leaves the cells, internal loss in
    terminal_energy_wh: float = 0.0  # integral of V I_b at the pack terminals
    shaft_energy_wh: float = 0.0  # integral of T w over all motors: wheel energy / efficiency
    charge_ah: float = 0.0
    runaway_s: float = 0.0  # time with some winding past its runaway current
    stop_reason: str | None = None

    @property
    def completed(self) -> bool:
        return self.stop_reason is None

    @property
    def distance(self) -> float:
        return self.distance_m[-1] if self.distance_m else 0.0

    @property
    def duration(self) -> float:
        return self.time_s[-1] if self.time_s else 0.0

    @property
    def below_cutoff(self) -> bool:
        """Whether the terminal voltage fell below the cut-off under load at any step."""
        return self.first_below_cutoff_s is not None

    def wh_per_km(self, which: str = "cell") -> float:
        """Energy per km over the distance ridden: ``cell``, ``terminal`` or ``shaft``."""
        energy = {
            "cell": self.cell_energy_wh,
            "terminal": self.terminal_energy_wh,
            "shaft": self.shaft_energy_wh,
        }[which]
        return energy / (self.distance / 1000.0) if self.distance > 0 else math.nan


class Recorder:
    """The series of one ride, appended step by step, and its sums (kept on this object while
    the ride runs, the same additions in the same order as on the result); ``finished`` adds
    the sums to the result and reads the summaries off the series."""

    def __init__(self, result: RideResult) -> None:
        self.result = result
        self.cell_wh = self.terminal_wh = self.shaft_wh = self.charge_ah = self.runaway_s = 0.0
        self._appends = (
            result.time_s.append,
            result.distance_m.append,
            result.speed_ms.append,
            result.motor_current_a.append,
            result.battery_current_a.append,
            result.winding_c.append,
            result.terminal_v.append,
            result.state_of_charge.append,
        )

    def step(
        self,
        t: float,
        x: float,
        v: float,
        currents: Sequence[float],
        i_batt: float,
        thetas: list[float],
        terminal: float,
        soc: float,
    ) -> None:
        time_s, distance_m, speed_ms, motor_a, battery_a, winding_c, terminal_v, charge = (
            self._appends
        )
        time_s(t)
        distance_m(x)
        speed_ms(v)
        motor_a(tuple(currents))
        battery_a(i_batt)
        winding_c(tuple(thetas))
        terminal_v(terminal)
        charge(soc)

    def finished(self) -> RideResult:
        """The result with its sums, and the summaries read off the series: the first step at
        the hottest winding (the start's temperature when no step is hotter), the first at the
        lowest terminal voltage, and the first below the cut-off."""
        result = self.result
        result.cell_energy_wh += self.cell_wh
        result.terminal_energy_wh += self.terminal_wh
        result.shaft_energy_wh += self.shaft_wh
        result.charge_ah += self.charge_ah
        result.runaway_s += self.runaway_s
        if not result.time_s:
            return result
        hottest = list(map(max, result.winding_c))
        peak = max(hottest)
        if peak > result.peak_winding_c:
            k = hottest.index(peak)
            result.peak_winding_c, result.peak_time_s = peak, result.time_s[k]
            result.peak_distance_m = result.distance_m[k]
            result.peak_motor = result.winding_c[k].index(peak)
        terminal = result.terminal_v
        lowest = min(terminal)
        k = terminal.index(lowest)
        result.min_terminal_v, result.min_voltage_time_s = lowest, result.time_s[k]
        result.min_voltage_distance_m = result.distance_m[k]
        result.min_voltage_soc = result.state_of_charge[k]
        if lowest < result.cutoff_v:
            k = next(i for i, volts in enumerate(terminal) if volts < result.cutoff_v)
            result.first_below_cutoff_s = result.time_s[k]
            result.first_below_cutoff_m = result.distance_m[k]
        return result
