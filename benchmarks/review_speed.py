"""Speed of firstride against the targets of the fleet-and-sweep issue, measured in one run.

Every figure is a median, every ratio is taken between commands timed in turn in this run, and
each target is printed with its measured value and whether it holds:

- whole-process Markdown review within 1.2 x the floor of importing the libraries a review
  imports (pint, pydantic, pluggy, jinja2, tomllib; same interpreter, same collector settings as
  ``firstride``) and within 1.6 x a bare ``import pint``;
- at least 1,000 in-process Markdown reviews/s and 300 HTML reviews/s on the first-attempt
  sample (``allotment-cargo-trike.toml``; an in-process review reads the bytes, validates,
  runs every rule and renders; HTML without the plots extra, as the target predates the charts,
  and with them, for information);
- the sweep at least 2,000 variants/s on one core, and 10,000 points within 5 s on two;
- a 1,000-build fleet within 3 s in one command on two cores;
- cost linear in wires, riders and motors: the exponent of the added cost of a build with n of
  them (beyond one), between the two largest counts of 1 to 500 wires, 1 to 50 riders and 1 to
  8 motors, with the collector set as ``firstride`` sets it (past a table's cap in the build
  file, a validated build is extended in memory).

    python benchmarks/review_speed.py [--runs 15] [--seconds 3] [--quick] [--phases]

``--quick`` shrinks the fleet and the sweeps tenfold (their targets are then not judged);
``--phases`` adds ``speed_phases.py``'s step-by-step tables.
"""

from __future__ import annotations

import argparse
import contextlib
import copy
import gc
import math
import os
import shutil
import statistics
import subprocess
import sys
import tempfile
import time
import tomllib
from collections.abc import Callable, Iterator
from pathlib import Path
from typing import Any

ROOT = Path(__file__).resolve().parent.parent
SAMPLE = ROOT / "sample_builds" / "allotment-cargo-trike.toml"
QUIET = {"stdout": subprocess.DEVNULL, "stderr": subprocess.DEVNULL}
LIBRARIES = ("pint", "pydantic", "pluggy", "jinja2", "tomllib")


def environment() -> dict[str, str]:
    """Bytecode caching switched on, as after a normal pip install."""
    return {k: v for k, v in os.environ.items() if k != "PYTHONDONTWRITEBYTECODE"}


def process_medians(commands: dict[str, list[str]], runs: int) -> dict[str, float]:
    """Median wall seconds of whole processes, after one warm-up each, taking turns so that a
    noisy machine loads each command alike."""
    env = environment()
    for command in commands.values():
        subprocess.run(command, check=False, env=env, **QUIET)
    times: dict[str, list[float]] = {name: [] for name in commands}
    for _ in range(runs):
        for name, command in commands.items():
            start = time.perf_counter()
            subprocess.run(command, check=False, env=env, **QUIET)
            times[name].append(time.perf_counter() - start)
    return {name: statistics.median(values) for name, values in times.items()}


def floor_command() -> list[str]:
    from reviewer.cli import PROGRAM_GC_THRESHOLD

    code = (
        f"import gc; gc.set_threshold({PROGRAM_GC_THRESHOLD}, *gc.get_threshold()[1:]); "
        f"import {', '.join(LIBRARIES)}; gc.freeze()"
    )
    return [sys.executable, "-c", code]


def rate(one: Callable[[], object], seconds: float) -> float:
    """Median calls per second of ``one`` over five slices of ``seconds``."""
    one()  # caches: templates, unit references
    rates = []
    for _ in range(5):
        count, start = 0, time.perf_counter()
        while time.perf_counter() - start < seconds / 5:
            one()
            count += 1
        rates.append(count / (time.perf_counter() - start))
    return statistics.median(rates)


def in_process_rates(seconds: float) -> tuple[float, float, float]:
    """Markdown, HTML without charts and HTML with charts (when matplotlib is there) per s."""
    from unittest import mock

    from reviewer.html import render_html
    from reviewer.loader import parse_build
    from reviewer.plots import PlotsUnavailable
    from reviewer.report import render_markdown
    from reviewer.session import open_session

    raw = SAMPLE.read_bytes()
    session = open_session()  # packs and profile once, as for a fleet

    def markdown() -> str:
        return render_markdown(session.review_loaded(parse_build(raw, str(SAMPLE))))

    def html() -> str:
        result = session.review_loaded(parse_build(raw, str(SAMPLE)))
        return render_html(result, render_markdown(result))

    md_rate = rate(markdown, seconds)
    with mock.patch("reviewer.charts.review_charts", side_effect=PlotsUnavailable):
        plain_rate = rate(html, seconds)
    try:
        import matplotlib  # noqa: F401
    except ImportError:
        return md_rate, plain_rate, math.nan
    return md_rate, plain_rate, rate(html, seconds / 3)


def sweep_seconds(points: int, jobs: int) -> float:
    """Seconds of one in-process sweep of ``points`` vehicle masses on ``jobs`` processes (a
    worker pool's start included)."""
    from reviewer.session import open_session
    from reviewer.sweep import parse_axis, run_sweep

    data = tomllib.loads(SAMPLE.read_text(encoding="utf-8"))
    axis = parse_axis(f"vehicle.mass=20 kg:{20 + (points - 1) * 0.01:.2f} kg:0.01 kg", data)
    assert len(axis.values) == points, len(axis.values)
    session = open_session() if jobs == 1 else None
    start = time.perf_counter()
    run_sweep(data, [axis], session=session, jobs=jobs)
    return time.perf_counter() - start


def fleet_seconds(builds: int, jobs: int) -> float:
    """One ``firstride review FOLDER -o DIR --jobs N`` process over ``builds`` copies."""
    with tempfile.TemporaryDirectory() as folder:
        fleet = Path(folder) / "fleet"
        fleet.mkdir()
        for index in range(builds):
            shutil.copy(SAMPLE, fleet / f"member-{index:04d}.toml")
        out = str(Path(folder) / "out")
        command = [sys.executable, "-m", "reviewer", "review", str(fleet), "-o", out]
        start = time.perf_counter()
        subprocess.run([*command, "--jobs", str(jobs)], check=False, env=environment(), **QUIET)
        return time.perf_counter() - start


def scaled(data: dict[str, Any], table: str, count: int) -> Any:
    """The sample's build with ``count`` copies of its first ``table`` entry, named apart.

    Past the build file's own cap on the table (64 wires, 12 riders), the copies are put into
    a validated build with ``model_copy``, each entry itself validated: the cap keeps a bad
    file small, and the benchmark asks how the rules scale beyond it."""
    from reviewer.build import Build

    tree = copy.deepcopy(data)
    first = tree[table][0]
    fits = min(count, 8 if table == "motors" else 12 if table == "riders" else 64)
    tree[table] = [dict(first, name=f"{first['name']} {i}") for i in range(fits)]
    if table == "motors":  # each motor-circuit wire goes to the first copy
        for wire in tree.get("wires", []):
            if wire.get("circuit") == "motor":
                wire["motor"] = f"{first['name']} 0"
    build = Build.model_validate(tree)
    if fits == count:
        return build
    one = getattr(build, table)[0]
    entries = [one.model_copy(update={"name": f"{first['name']} {i}"}) for i in range(count)]
    return build.model_copy(update={table: entries})


def review_ms(build: Any, repeats: int) -> float:
    """Median ms of rules and Markdown on the validated build (the ride simulated anew)."""
    from firstride_rules.ride._model import _LAST

    from reviewer.report import render_markdown
    from reviewer.session import open_session

    session = open_session()
    times = []
    for _ in range(repeats + 1):  # with the collector set as ``firstride`` sets it
        _LAST.clear()
        start = time.perf_counter()
        render_markdown(session.review_build(build))
        times.append(time.perf_counter() - start)
    return statistics.median(times[1:]) * 1000.0


@contextlib.contextmanager
def program_collector() -> Iterator[None]:
    """The collector's first threshold as ``firstride`` runs with it, restored after."""
    from reviewer.cli import PROGRAM_GC_THRESHOLD

    before = gc.get_threshold()
    gc.set_threshold(PROGRAM_GC_THRESHOLD, *before[1:])
    try:
        yield
    finally:
        gc.set_threshold(*before)


def exponent(table: str, counts: tuple[int, ...]) -> tuple[float, list[float]]:
    """The exponent k of the added cost t(n) - t(1) ~ (n - 1)^k between the two largest counts
    (where a square law would show, and noise at small counts does not), and the median times."""
    data = tomllib.loads(SAMPLE.read_text(encoding="utf-8"))
    # nine reviews at every count: with three at 100 and 500, noise once read as 1.26
    times = [review_ms(scaled(data, table, n), 9) for n in counts]
    (m, n), (tm, tn) = counts[-2:], times[-2:]
    added_m, added_n = max(tm - times[0], 1e-6), max(tn - times[0], 1e-6)
    return math.log(added_n / added_m) / math.log((n - 1) / (m - 1)), times


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--runs", type=int, default=15)
    parser.add_argument("--seconds", type=float, default=3.0)
    parser.add_argument("--quick", action="store_true", help="a tenth of the fleet and sweeps")
    parser.add_argument("--phases", action="store_true", help="also show where the time goes")
    args = parser.parse_args()
    scale = 10 if args.quick else 1
    rows: list[tuple[str, str, str, bool | None]] = []

    def judged(name: str, measured: str, target: str, holds: bool | None) -> None:
        rows.append((name, measured, target, None if args.quick and "sweep" in name else holds))

    whole = [sys.executable, "-m", "reviewer", "review", str(SAMPLE)]
    seconds = process_medians(
        {"pint": [sys.executable, "-c", "import pint"], "floor": floor_command(), "whole": whole},
        args.runs,
    )
    w, f, p = seconds["whole"], seconds["floor"], seconds["pint"]
    print(f"sample {SAMPLE.name}; medians of {args.runs} runs, in turn:")
    print(f"  import pint {p * 1000:.0f} ms, import {', '.join(LIBRARIES)} {f * 1000:.0f} ms")
    print(f"  whole firstride review (Markdown to stdout) {w * 1000:.0f} ms")
    judged("whole review / import of its libraries", f"{w / f:.2f} x", "<= 1.20 x", w / f <= 1.2)
    judged("whole review / bare import pint", f"{w / p:.2f} x", "<= 1.60 x", w / p <= 1.6)

    md, html, charted = in_process_rates(args.seconds)
    judged("in-process Markdown reviews/s", f"{md:.0f}", ">= 1000", md >= 1000)
    judged("in-process HTML reviews/s (no charts)", f"{html:.0f}", ">= 300", html >= 300)
    if not math.isnan(charted):
        rows.append(("in-process HTML reviews/s (with charts)", f"{charted:.0f}", "-", None))

    points = 1000 // scale
    one_core = points / sweep_seconds(points, 1)
    judged("sweep variants/s, one core", f"{one_core:.0f}", ">= 2000", one_core >= 2000)
    big = 10_000 // scale
    two = sweep_seconds(big, 2)
    judged(f"sweep of {big} points, two cores", f"{two:.2f} s", "<= 5 s", two <= 5.0)
    builds = 1000 // scale
    fleet = fleet_seconds(builds, 2)
    holds = fleet <= 3.0 if not args.quick else None
    rows.append(
        (f"fleet of {builds} builds, one command, two cores", f"{fleet:.2f} s", "<= 3 s", holds)
    )

    for table, counts in (
        ("wires", (1, 5, 25, 100, 500)),
        ("riders", (1, 5, 10, 25, 50)),
        ("motors", (1, 2, 4, 8)),
    ):
        with program_collector():
            k, times = exponent(table, counts)
        shown = ", ".join(f"{n}: {t:.1f}" for n, t in zip(counts, times, strict=True))
        print(f"  {table}: ms per review at {shown}")
        judged(
            f"cost exponent in {table} ({counts[0]}-{counts[-1]})", f"{k:.2f}", "<= 1.15", k <= 1.15
        )

    width = max(len(r[0]) for r in rows)
    print(f"\n{'target':{width}}  {'measured':>10}  {'target':>9}  holds")
    for name, measured, target, holds in rows:
        mark = "n/a" if holds is None else "yes" if holds else "NO"
        print(f"{name:{width}}  {measured:>10}  {target:>9}  {mark}")
    held = [r for r in rows if r[3] is not None]
    print(f"\n{sum(1 for r in held if r[3])} of {len(held)} targets hold")
    if args.phases:
        subprocess.run(
            [sys.executable, str(Path(__file__).with_name("speed_phases.py"))], check=False
        )
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
