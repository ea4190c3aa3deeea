"""Speed of a review: whole process against the floor of importing pint, and in-process rate.

Targets: the whole `firstride review` process within 2x a bare `python -c "import pint"`, and at
least 200 in-process reviews (load, rules, render) per second on the largest sample build.

    python benchmarks/review_speed.py [--runs 15] [--seconds 3] [--phases]

``--phases`` adds where the time goes: each step of a whole review process (minimum and median
over the runs), and each step of an in-process review (minimum and median of many).
"""

from __future__ import annotations

import argparse
import itertools
import json
import os
import statistics
import subprocess
import sys
import time
from collections.abc import Callable
from pathlib import Path
from typing import Any

ROOT = Path(__file__).resolve().parent.parent
SAMPLES = ROOT / "sample_builds"
QUIET = {"stdout": subprocess.DEVNULL, "stderr": subprocess.DEVNULL}


def largest_sample() -> Path:
    return max(SAMPLES.glob("*.toml"), key=lambda p: p.stat().st_size)


def process_environment() -> dict[str, str]:
    """Bytecode caching switched on, as after a normal pip install."""
    return {k: v for k, v in os.environ.items() if k != "PYTHONDONTWRITEBYTECODE"}


def process_seconds(commands: dict[str, list[str]], runs: int) -> dict[str, list[float]]:
    """Wall times of whole processes. One warm-up run of each fills the bytecode, unit registry
    and template caches first; then the commands take turns, so that on a noisy machine each
    sees the same load as the other and their ratio is fair."""
    env = process_environment()
    for command in commands.values():
        subprocess.run(command, check=False, env=env, **QUIET)
    times: dict[str, list[float]] = {name: [] for name in commands}
    for _ in range(runs):
        for name, command in commands.items():
            start = time.perf_counter()
            subprocess.run(command, check=False, env=env, **QUIET)
            times[name].append(time.perf_counter() - start)
    return times


def in_process_rate(sample: Path, seconds: float) -> tuple[float, float]:
    from reviewer.loader import parse_build
    from reviewer.report import render_markdown
    from reviewer.session import open_session

    raw = sample.read_bytes()
    session = open_session()  # packs and profile loaded once, as for a fleet

    def one() -> None:
        render_markdown(session.review_loaded(parse_build(raw, str(sample))))

    one()  # warm caches (templates, unit references)
    rates = []
    for _ in range(5):
        count, start = 0, time.perf_counter()
        while time.perf_counter() - start < seconds / 5:
            one()
            count += 1
        rates.append(count / (time.perf_counter() - start))
    return statistics.median(rates), 1000 / statistics.median(rates)


# --- where the time goes -----------------------------------------------------------------------


def _process_steps(build: str) -> None:
    """One review the way ``python -m reviewer review BUILD`` does it, with a clock between
    steps; prints the steps as JSON (milliseconds) and the wall clock at the end."""
    marks = [("start", time.perf_counter())]

    def mark(name: str) -> None:
        marks.append((name, time.perf_counter()))

    import gc

    from reviewer import cli  # what ``python -m reviewer`` imports before its run()

    gc.set_threshold(cli.PROGRAM_GC_THRESHOLD, *gc.get_threshold()[1:])
    mark("reviewer package and CLI (pluggy)")
    import pint  # noqa: F401

    mark("import pint")
    from pydantic import BaseModel  # noqa: F401

    mark("import pydantic")
    import reviewer.units

    mark("unit registry")
    import reviewer.build  # noqa: F401

    mark("build models")
    parser, _ = cli._parser()
    args = parser.parse_args(["review", build])
    from reviewer.loader import load_build
    from reviewer.profile import load_profile
    from reviewer.session import open_session

    mark("command line, engine modules")
    loaded = load_build(args.build)
    mark("read and validate the build")
    profile = load_profile(args.profile)
    mark("profile")
    from reviewer.commands.pack_options import packs_from

    session = open_session(profile, packs_from(args))
    mark("rule packs (imports the rules)")
    result = session.review_loaded(loaded)
    mark("rules run")
    from reviewer.report import environment, render_markdown

    environment().get_template("review.md.j2")
    mark("jinja2 and the template")
    render_markdown(result)
    mark("render")
    steps = {b[0]: (b[1] - a[1]) * 1000 for a, b in itertools.pairwise(marks)}
    gc.freeze()  # as cli.run() does before exit
    print(json.dumps({"steps": steps, "end": time.time()}))


def process_phases(build: Path, runs: int) -> list[tuple[str, list[float]]]:
    env = process_environment()
    python = sys.executable
    child = [python, __file__, "--process-steps", str(build)]
    subprocess.run(child, check=False, env=env, capture_output=True)
    rows: dict[str, list[float]] = {"interpreter start (python -c pass)": []}
    for _ in range(runs):
        start = time.perf_counter()
        subprocess.run([python, "-c", "pass"], check=False, env=env)
        rows["interpreter start (python -c pass)"].append((time.perf_counter() - start) * 1000)
        done = subprocess.run(child, check=True, env=env, capture_output=True, text=True)
        ended = time.time()
        report = json.loads(done.stdout)
        for name, ms in report["steps"].items():
            rows.setdefault(name, []).append(ms)
        rows.setdefault("exit (after the last step)", []).append((ended - report["end"]) * 1000)
    return list(rows.items())


def in_process_phases(sample: Path, repeats: int = 300) -> list[tuple[str, list[float]]]:
    import hashlib
    import tomllib
    from dataclasses import replace

    from reviewer.build import Build
    from reviewer.engine import review
    from reviewer.report import render_markdown
    from reviewer.session import open_session

    raw = sample.read_bytes()
    session = open_session()  # the steps of Session.review_loaded, timed one by one
    profile, rules = session.profile, session.manager.rules()
    inline = replace(profile, rule_time_budget=0)
    rows: dict[str, list[float]] = {}

    def timed(name: str, function: Callable[..., Any], *arguments: Any) -> Any:
        start = time.perf_counter()
        value = function(*arguments)
        rows.setdefault(name, []).append((time.perf_counter() - start) * 1000)
        return value

    for index in range(repeats + 1):
        data = timed("TOML parse", tomllib.loads, raw.decode("utf-8"))
        build = timed("validate (pydantic, quantities)", Build.model_validate, data)
        timed("fingerprint (SHA-256)", lambda: hashlib.sha256(raw).hexdigest())
        timed("rules, inline (budget 0)", review, build, inline, rules)
        result = timed("rules, on the fenced worker", review, build, profile, rules)
        timed("render Markdown", render_markdown, result)
        if index == 0:
            rows.clear()  # the first round fills caches
    return list(rows.items())


def fleet_seconds(sample: Path, builds: int, jobs: int) -> float:
    """One ``firstride review FOLDER -o DIR --jobs N`` process over ``builds`` copies of the
    sample: the club officer's fleet before an event."""
    import shutil
    import tempfile

    with tempfile.TemporaryDirectory() as folder:
        fleet = Path(folder) / "fleet"
        fleet.mkdir()
        for index in range(builds):
            shutil.copy(sample, fleet / f"member-{index:04d}.toml")
        command = [
            sys.executable,
            "-m",
            "reviewer",
            "review",
            str(fleet),
            "-o",
            str(Path(folder) / "out"),
            "--jobs",
            str(jobs),
        ]
        start = time.perf_counter()
        subprocess.run(command, check=False, env=process_environment(), **QUIET)
        return time.perf_counter() - start


def sweep_rate(sample: Path, points: int) -> float:
    """Variants per second of the in-process sweep on one core (validated copies, no render)."""
    import tomllib

    from reviewer.session import open_session
    from reviewer.sweep import parse_axis, run_sweep

    data = tomllib.loads(sample.read_text(encoding="utf-8"))
    axis = parse_axis(f"vehicle.mass=5 kg:{5 + points - 1} kg:1 kg", data)
    session = open_session()
    run_sweep(data, [axis][:1], session=session)  # warm
    start = time.perf_counter()
    run_sweep(data, [axis], session=session)
    return points / (time.perf_counter() - start)


def print_table(title: str, rows: list[tuple[str, list[float]]], unit: str) -> None:
    print(f"\n{title}")
    print(f"  {'step':40s} {'min':>9s} {'median':>9s}  ({unit})")
    for name, values in rows:
        print(f"  {name:40s} {min(values):9.3f} {statistics.median(values):9.3f}")


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--runs", type=int, default=15)
    parser.add_argument("--seconds", type=float, default=3.0)
    parser.add_argument("--phases", action="store_true", help="also show where the time goes")
    parser.add_argument("--process-steps", metavar="BUILD", help=argparse.SUPPRESS)
    parser.add_argument("--fleet", type=int, default=0, metavar="N", help="also time a fleet of N")
    parser.add_argument(
        "--sweep", type=int, default=0, metavar="N", help="also time N sweep points"
    )
    args = parser.parse_args()
    if args.process_steps:
        _process_steps(args.process_steps)
        return 0
    sample = largest_sample()
    python = sys.executable
    times = process_seconds(
        {
            "floor": [python, "-c", "import pint"],
            "whole": [python, "-m", "reviewer", "review", str(sample)],
        },
        args.runs,
    )
    floor, whole = (statistics.median(times[name]) for name in ("floor", "whole"))
    rate, ms = in_process_rate(sample, args.seconds)
    print(f"sample: {sample.relative_to(ROOT)} ({sample.stat().st_size} bytes)")
    print(f"floor  python -c 'import pint':  median {floor * 1000:7.1f} ms over {args.runs} runs")
    print(f"whole  firstride review:         median {whole * 1000:7.1f} ms over {args.runs} runs")
    print(f"ratio  whole / floor:            {whole / floor:7.2f}  (target <= 2.00)")
    print(f"in-process reviews per second:   {rate:7.1f}  ({ms:.2f} ms each; target >= 200)")
    if args.fleet:
        for jobs in (1, 2):
            seconds = fleet_seconds(sample, args.fleet, jobs)
            print(
                f"fleet of {args.fleet} in one command, --jobs {jobs}: {seconds:7.2f} s "
                f"({args.fleet / seconds:.0f} builds/s; target {args.fleet} within 3 s on 2 cores)"
            )
    if args.sweep:
        rate = sweep_rate(sample, args.sweep)
        print(f"sweep variants per second (one core): {rate:7.0f}  (target >= 2000)")
    if args.phases:
        print_table("whole process, step by step", process_phases(sample, args.runs), "ms")
        print_table("one in-process review, step by step", in_process_phases(sample), "ms")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
