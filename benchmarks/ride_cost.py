"""What the ride simulation costs a review (a measurement, not a test).

Targets (issue "A ride, not a moment"): a review with the ride rules within 1.5 x the per-review
time without them, in process, on every sample; no review slower than 50 ms in process on the
largest sample. Each review here is the rules and the Markdown render on a validated build (the
session and the build's parsing are shared, as in a fleet or a sweep); medians of --runs.

    python benchmarks/ride_cost.py [--runs 41]
"""

from __future__ import annotations

import argparse
import gc
import statistics
import time
from pathlib import Path

from firstride_rules.ride._model import _LAST

from reviewer.engine import review
from reviewer.loader import load_build
from reviewer.report import render_markdown
from reviewer.session import built_in_session

ROOT = Path(__file__).resolve().parent.parent
RIDE = ("ride.heating", "ride.energy")


def medians_ms(build, profile, both, runs: int) -> tuple[float, float]:
    """Median ms of each rule list, timed alternately so a busy machine's drift hits both."""
    times: tuple[list[float], list[float]] = ([], [])
    for _ in range(runs):
        for rules, kept in zip(both, times, strict=True):
            _LAST.clear()  # the ride is simulated once per build: a new build each review
            start = time.perf_counter()
            render_markdown(review(build, profile, rules))
            kept.append(time.perf_counter() - start)
    return statistics.median(times[0]) * 1000.0, statistics.median(times[1]) * 1000.0


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--runs", type=int, default=41)
    args = parser.parse_args()
    session = built_in_session()
    rules = session.manager.rules()
    without = [r for r in rules if r.id not in RIDE]
    gc.disable()
    print(f"{'sample':32} {'with ride':>10} {'without':>10} {'ratio':>6}")
    worst = 0.0
    samples = sorted((ROOT / "sample_builds").glob("*.toml"))
    largest = max(samples, key=lambda p: p.stat().st_size)
    for path in samples:
        build = load_build(path).build
        render_markdown(review(build, session.profile, rules))  # warm
        full, base = medians_ms(build, session.profile, (rules, without), args.runs)
        worst = max(worst, full / base)
        mark = "  (largest)" if path == largest else ""
        print(f"{path.name:32} {full:8.1f} ms {base:8.1f} ms {full / base:6.2f}{mark}")
    gc.enable()
    print(f"worst ratio {worst:.2f} (target <= 1.50)")


if __name__ == "__main__":
    main()
