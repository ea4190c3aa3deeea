"""Speed of a review: whole process against the floor of importing pint, and in-process rate.

Targets: the whole `firstride review` process within 2x a bare `python -c "import pint"`, and at
least 200 in-process reviews (load, rules, render) per second on the largest sample build.

    python benchmarks/review_speed.py [--runs 15] [--seconds 3]
"""

from __future__ import annotations

import argparse
import os
import statistics
import subprocess
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
SAMPLES = ROOT / "sample_builds"


def largest_sample() -> Path:
    return max(SAMPLES.glob("*.toml"), key=lambda p: p.stat().st_size)


def process_seconds(command: list[str], runs: int) -> float:
    """Median wall time of a whole process. Bytecode caching is switched on (as after a normal
    pip install) and one warm-up run fills it and the unit registry's cache first."""
    env = {k: v for k, v in os.environ.items() if k != "PYTHONDONTWRITEBYTECODE"}
    quiet = {"stdout": subprocess.DEVNULL, "stderr": subprocess.DEVNULL, "env": env}
    subprocess.run(command, check=False, **quiet)
    times = []
    for _ in range(runs):
        start = time.perf_counter()
        subprocess.run(command, check=False, **quiet)
        times.append(time.perf_counter() - start)
    return statistics.median(times)


def in_process_rate(sample: Path, seconds: float) -> tuple[float, float]:
    from reviewer.engine import review
    from reviewer.loader import parse_build
    from reviewer.plugins import default_manager
    from reviewer.profile import load_profile
    from reviewer.report import render_markdown

    raw = sample.read_bytes()
    profile = load_profile()
    rules = default_manager().rules()

    def one() -> None:
        loaded = parse_build(raw, str(sample))
        result = review(loaded.build, profile, rules, build_fingerprint=loaded.fingerprint)
        render_markdown(result)

    one()  # warm caches (templates, unit references)
    rates = []
    for _ in range(5):
        count, start = 0, time.perf_counter()
        while time.perf_counter() - start < seconds / 5:
            one()
            count += 1
        rates.append(count / (time.perf_counter() - start))
    return statistics.median(rates), 1000 / statistics.median(rates)


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--runs", type=int, default=15)
    parser.add_argument("--seconds", type=float, default=3.0)
    args = parser.parse_args()
    sample = largest_sample()
    python = sys.executable
    floor = process_seconds([python, "-c", "import pint"], args.runs)
    whole = process_seconds([python, "-m", "reviewer", "review", str(sample)], args.runs)
    rate, ms = in_process_rate(sample, args.seconds)
    print(f"sample: {sample.relative_to(ROOT)} ({sample.stat().st_size} bytes)")
    print(f"floor  python -c 'import pint':  median {floor * 1000:7.1f} ms over {args.runs} runs")
    print(f"whole  firstride review:         median {whole * 1000:7.1f} ms over {args.runs} runs")
    print(f"ratio  whole / floor:            {whole / floor:7.2f}  (target <= 2.00)")
    print(f"in-process reviews per second:   {rate:7.1f}  ({ms:.2f} ms each; target >= 200)")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
