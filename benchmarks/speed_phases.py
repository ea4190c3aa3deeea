"""Where the time of a review goes: each step of a whole ``firstride review`` process and of an
in-process review, as minimum and median milliseconds (``review_speed.py --phases`` prints them).

    python benchmarks/speed_phases.py [BUILD] [--runs 15]
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


def process_environment() -> dict[str, str]:
    """Bytecode caching switched on, as after a normal pip install."""
    return {k: v for k, v in os.environ.items() if k != "PYTHONDONTWRITEBYTECODE"}


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
    parser, _ = cli._parser(["review", build])
    args = parser.parse_args(["review", build])
    from reviewer.loader import load_build
    from reviewer.profile import load_profile
    from reviewer.session import open_session

    mark("command line, engine modules")
    loaded = load_build(args.build[0])
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
    child = [python, __file__, str(build), "--process-steps"]
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


def print_table(title: str, rows: list[tuple[str, list[float]]], unit: str) -> None:
    print(f"\n{title}")
    print(f"  {'step':40s} {'min':>9s} {'median':>9s}  ({unit})")
    for name, values in rows:
        print(f"  {name:40s} {min(values):9.3f} {statistics.median(values):9.3f}")


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument(
        "build", nargs="?", default=str(ROOT / "sample_builds" / "allotment-cargo-trike.toml")
    )
    parser.add_argument("--runs", type=int, default=15)
    parser.add_argument("--process-steps", action="store_true", help=argparse.SUPPRESS)
    args = parser.parse_args()
    if args.process_steps:
        _process_steps(args.build)
        return 0
    sample = Path(args.build)
    print_table("whole process, step by step", process_phases(sample, args.runs), "ms")
    print_table("one in-process review, step by step", in_process_phases(sample), "ms")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
