"""Speed of the ride simulation: a 5 km route (1 km flat, 1.5 km at 8 %, back down, 1 km flat
home) at dt = 1 s, median of many runs in process. Target: well under 50 ms.

    python benchmarks/ride_speed.py [--runs 51] [--dt 1.0]

The build is invented for the demo (no real product's figures).
"""

from __future__ import annotations

import argparse
import statistics
import time

from reviewer.engineering.ride import Segment, simulate
from reviewer.engineering.ride_pack import PackModel
from reviewer.engineering.ride_thermal import AirflowCooling, winding_from_rating
from reviewer.engineering.roadload import Drive, DriveMotor, kmh_to_ms

DRIVE = Drive(
    motors=(DriveMotor(kv_rpm_per_v=12.0, branch_resistance=0.25, no_load_current=1.0),),
    full_voltage=42.0,
    reduction=1.0,
    wheel_radius=0.2,
    rolling_resistance=0.01,
    drag_area=0.6,
    shared_resistance=0.15,
    current_limit=30.0,
    battery_limit=25.0,
    efficiency=0.85,
)
WINDING = winding_from_rating(
    rated_current=20.0,
    resistance_20c=0.2,
    rise_limit=80.0,
    time_constant=600.0,
    ambient_c=30.0,
    cooling=AirflowCooling(still_air_factor=0.5, reference_speed_ms=kmh_to_ms(25.0)),
)
PACK = PackModel("li-ion", cells_series=10, capacity_ah=10.0, resistance=0.15)
ROUTE = (
    Segment(1000.0, 0.0, kmh_to_ms(25.0)),
    Segment(1500.0, 8.0, None),
    Segment(1500.0, -8.0, kmh_to_ms(25.0)),
    Segment(1000.0, 0.0, kmh_to_ms(25.0), stops=1),
)
MASS = 100.0


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--runs", type=int, default=51)
    parser.add_argument("--dt", type=float, default=1.0)
    args = parser.parse_args()
    simulate(DRIVE, MASS, ROUTE, WINDING, PACK, args.dt)  # warm-up
    times = []
    for _ in range(args.runs):
        start = time.perf_counter()
        result = simulate(DRIVE, MASS, ROUTE, WINDING, PACK, args.dt)
        times.append(time.perf_counter() - start)
    print(
        f"{len(result.time_s)} steps, {result.distance:.0f} m in {result.duration:.0f} s, "
        f"peak winding {result.peak_winding_c:.1f} degC, {result.wh_per_km():.2f} Wh/km, "
        f"lowest {result.min_terminal_v:.2f} V"
    )
    print(
        f"median {statistics.median(times) * 1000:.2f} ms, fastest {min(times) * 1000:.2f} ms "
        f"over {args.runs} runs (dt {args.dt} s)"
    )


if __name__ == "__main__":
    main()
