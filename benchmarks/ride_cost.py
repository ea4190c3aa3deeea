"""What the ride simulation costs a review (a measurement, not a test).

Targets (issue "A ride, not a moment"): a review with the ride rules within 1.5 x the per-review
time without them, in process, on every sample; no review slower than 50 ms in process on the
largest sample. A review in process is what ``Session.review_loaded(parse_build(bytes))`` and
the Markdown render do: parse and validate the build file's bytes, run the rules, render (the
session is shared, as in a fleet); the ratio of the rules and render alone, on one validated
build, is printed beside it, as the stricter figure. Medians of --runs, timed in turn, the
collector off while a review is timed and run between reviews.

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
from reviewer.loader import parse_build
from reviewer.report import render_markdown
from reviewer.session import built_in_session

ROOT = Path(__file__).resolve().parent.parent
RIDE = ("ride.heating", "ride.energy")


def medians_ms(raw: bytes, name: str, profile, both, runs: int) -> list[float]:
    """Median ms of each rule list, timed in turn so a busy machine's drift hits both: the
    whole in-process review from the bytes, and the rules and render on one validated build."""
    build = parse_build(raw, name).build
    times: list[list[float]] = [[], [], [], []]
    for _ in range(runs):
        for k, rules in enumerate(both):
            _LAST.clear()  # the ride is simulated once per build: a new build each review
            gc.collect()  # each timed review starts on a clean heap (the collector is off)
            start = time.perf_counter()
            render_markdown(review(parse_build(raw, name).build, profile, rules))
            times[k].append(time.perf_counter() - start)
            _LAST.clear()
            gc.collect()
            start = time.perf_counter()
            render_markdown(review(build, profile, rules))
            times[2 + k].append(time.perf_counter() - start)
    return [statistics.median(t) * 1000.0 for t in times]


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--runs", type=int, default=41)
    args = parser.parse_args()
    session = built_in_session()
    rules = session.manager.rules()
    without = [r for r in rules if r.id not in RIDE]
    gc.disable()
    print(f"{'sample':30} {'with ride':>9} {'without':>8} {'ratio':>5}   rules+render only")
    worst = worst_strict = slowest = 0.0
    samples = sorted((ROOT / "sample_builds").glob("*.toml"))
    largest = max(samples, key=lambda p: p.stat().st_size)
    for path in samples:
        raw = path.read_bytes()
        render_markdown(review(parse_build(raw, str(path)).build, session.profile, rules))
        full, base, strict_full, strict_base = medians_ms(
            raw, str(path), session.profile, (rules, without), args.runs
        )
        worst = max(worst, full / base)
        worst_strict = max(worst_strict, strict_full / strict_base)
        if path == largest:
            slowest = full
        mark = "  (largest)" if path == largest else ""
        print(
            f"{path.name:30} {full:6.1f} ms {base:5.1f} ms {full / base:5.2f}   "
            f"{strict_full:5.1f} / {strict_base:5.1f} ms = {strict_full / strict_base:4.2f}{mark}"
        )
    gc.enable()
    print(f"worst ratio, whole in-process review: {worst:.2f} (target <= 1.50)")
    print(f"worst ratio, rules and render only:   {worst_strict:.2f}")
    print(f"largest sample with the ride: {slowest:.1f} ms (target <= 50 ms)")


if __name__ == "__main__":
    main()
