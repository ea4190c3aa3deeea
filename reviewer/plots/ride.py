"""The ride plot: winding temperature and pack voltage over a ride, from plain time series (a ride
simulation supplies them), with the winding insulation's limit and, if given, the pack's low
voltage cut-off as lines."""

from __future__ import annotations

import itertools
import math
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

from reviewer.plots import _style
from reviewer.units import format_number

#: Above this many seconds the time axis reads in minutes.
MINUTES_FROM_S = 600.0


@dataclass(frozen=True)
class RideSeries:
    """A ride's time series, checked: equal lengths, finite, time rising."""

    times_s: tuple[float, ...]
    temperatures_c: tuple[float, ...]
    voltages_v: tuple[float, ...]

    @classmethod
    def of(
        cls,
        times_s: Sequence[float],
        temperatures_c: Sequence[float],
        voltages_v: Sequence[float],
    ) -> RideSeries:
        times = tuple(float(t) for t in times_s)
        temperatures = tuple(float(t) for t in temperatures_c)
        voltages = tuple(float(v) for v in voltages_v)
        if not times:
            raise ValueError("the ride plot needs at least one point")
        if not len(times) == len(temperatures) == len(voltages):
            raise ValueError(
                f"time, temperature and voltage differ in length: {len(times)}, "
                f"{len(temperatures)}, {len(voltages)}"
            )
        if not all(math.isfinite(x) for x in (*times, *temperatures, *voltages)):
            raise ValueError("the ride's series must be finite numbers")
        if any(b < a for a, b in itertools.pairwise(times)):
            raise ValueError("the ride's times must not decrease")
        return cls(times, temperatures, voltages)

    def peak_temperature(self) -> tuple[float, float]:
        """(time s, temperature degC) of the hottest point, the first if several."""
        index = max(range(len(self.temperatures_c)), key=self.temperatures_c.__getitem__)
        return self.times_s[index], self.temperatures_c[index]


def ride_svg(
    times_s: Sequence[float],
    temperatures_c: Sequence[float],
    voltages_v: Sequence[float],
    *,
    insulation_limit_c: float | None = None,
    cutoff_v: float | None = None,
    title: str | None = None,
) -> str:
    """Winding temperature (degC, upper axes) and pack voltage (V, lower axes) against time as
    SVG text. ``insulation_limit_c`` (the winding insulation's class temperature) and
    ``cutoff_v`` (the pack's low-voltage cut-off) are drawn as lines when given."""
    _style.require_matplotlib()
    ride = RideSeries.of(times_s, temperatures_c, voltages_v)
    minutes = ride.times_s[-1] > MINUTES_FROM_S
    scale = 1.0 / 60.0 if minutes else 1.0
    times = [t * scale for t in ride.times_s]

    def draw(figure: Any) -> None:
        heat, volts = figure.subplots(2, 1, sharex=True, height_ratios=(3, 2))
        heat.plot(times, ride.temperatures_c, color=_style.colour(0), label="winding")
        peak_t, peak_c = ride.peak_temperature()
        heat.plot([peak_t * scale], [peak_c], marker="o", color=_style.colour(0), linestyle="none")
        dx, align = _style.beside(peak_t * scale, times[0], times[-1])
        heat.annotate(
            f"peak {format_number(peak_c)} °C",
            xy=(peak_t * scale, peak_c),
            xytext=(dx, 6),
            textcoords="offset points",
            ha=align,
            fontsize=7.5,
            color=_style.colour(0),
        )
        highest = max(ride.temperatures_c)
        if insulation_limit_c is not None:
            heat.axhline(
                insulation_limit_c,
                color=_style.LIMIT_COLOUR,
                linestyle="--",
                linewidth=1.2,
                label=f"insulation limit {format_number(insulation_limit_c)} °C",
            )
            highest = max(highest, insulation_limit_c)
        lowest = min(ride.temperatures_c)
        span = max(highest - lowest, 1.0)
        heat.set_ylim(lowest - 0.05 * span, highest + 0.12 * span)
        heat.set_ylabel("winding temperature (°C)")
        heat.legend(loc="lower right", frameon=False)
        heat.set_title(title or "Winding temperature and pack voltage over the ride")

        volts.plot(times, ride.voltages_v, color=_style.colour(2), label="pack voltage")
        if cutoff_v is not None:
            volts.axhline(
                cutoff_v,
                color=_style.LIMIT_COLOUR,
                linestyle=":",
                linewidth=1.2,
                label=f"low-voltage cut-off {format_number(cutoff_v)} V",
            )
        volts.set_ylabel("pack voltage (V)")
        volts.set_xlabel("time (min)" if minutes else "time (s)")
        volts.set_xlim(times[0], times[-1] if times[-1] > times[0] else times[0] + 1.0)
        volts.legend(loc="lower left", frameon=False)

    return _style.render("ride", draw, (_style.FIGURE_SIZE[0], 5.2))
