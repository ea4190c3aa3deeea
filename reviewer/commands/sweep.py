"""``firstride sweep BUILD --vary FIELD=START:STOP[:STEP]``: what if one or two fields changed.

Every point is a full review of the build with the field set (validated, every rule run; nothing
rendered or written per point); the result is the verdict and binding rule at each point and the
envelope of values for which the review is ``go``.
"""

from __future__ import annotations

import argparse
import json
import os
import sys

NAME = "sweep"
HELP = "review a build over a range of one or two of its fields, and report the envelope"


def add_arguments(parser: argparse.ArgumentParser) -> None:
    from reviewer.commands.review import _jobs

    parser.add_argument("build", help="the build file (TOML)")
    parser.add_argument(
        "--vary",
        action="append",
        required=True,
        metavar="FIELD=START:STOP[:STEP]",
        help="a field path and a range written as in the build file, e.g. "
        "'controller.motor_current_limit=10 A:40 A:2 A' or 'wires[0].gauge=18 AWG:10 AWG' "
        "(once or twice)",
    )
    parser.add_argument("--profile", help="a profile of limits (TOML); default: built-in")
    parser.add_argument("--format", choices=["md", "json"], default="md")
    parser.add_argument("-o", "--output", help="write the result here instead of stdout")
    parser.add_argument("--jobs", type=_jobs, default=1, metavar="N", help="processes (0: cores)")
    parser.add_argument(
        "--plots",
        metavar="DIR",
        help="also draw the sweep as DIR/sweep.svg, linked from the Markdown (the plots extra)",
    )


def run(args: argparse.Namespace) -> int:
    from reviewer.commands import EXIT_FINDINGS, EXIT_GO
    from reviewer.errors import InputError
    from reviewer.loader import load_build
    from reviewer.profile import load_profile
    from reviewer.sweep import envelope, parse_axis, run_sweep

    if len(args.vary) > 2:
        raise InputError("--vary", "(usage)", "one or two fields to vary")
    loaded = load_build(args.build)
    load_profile(args.profile)  # a bad profile is one error before any point runs
    if args.plots:  # and so is a chart that cannot be drawn
        from reviewer.plots import INSTALL_HINT, available

        if not available():
            raise InputError("--plots", "(usage)", f"charts need matplotlib: {INSTALL_HINT}")
        from reviewer.output import output_folder

        output_folder(args.plots, "the chart (--plots)")
    axes = [parse_axis(text, loaded.data) for text in args.vary]
    if len({a.field for a in axes}) < len(axes):
        raise InputError("--vary", axes[0].field, "two different fields")
    points = run_sweep(
        loaded.data, axes, profile=args.profile, jobs=args.jobs or (os.cpu_count() or 1)
    )
    limits = envelope(axes, points)
    chart = _write_chart(args, axes, points) if args.plots else None
    if args.format == "json":
        document = sweep_json(args.build, axes, points, limits)
        if chart is not None:
            document["chart"] = chart
        text = json.dumps(document, ensure_ascii=False) + "\n"
    else:
        text = sweep_markdown(args.build, axes, points, limits, chart)
    if args.output:
        from pathlib import Path

        from reviewer.output import write_whole

        write_whole(Path(args.output), text, inputs=[args.build, args.profile])
    else:
        sys.stdout.write(text)
    passing = sum(1 for p in points if p.passes)
    print(f"firstride: {passing} of {len(points)} points go", file=sys.stderr)
    return EXIT_GO if passing else EXIT_FINDINGS


def _write_chart(args: argparse.Namespace, axes, points) -> str:
    """Write ``--plots DIR/sweep.svg`` (a whole, guarded write) and return its link relative to
    the output's folder."""
    from pathlib import Path

    from reviewer.errors import InputError
    from reviewer.output import output_folder, write_whole
    from reviewer.plots import INSTALL_HINT, PlotsUnavailable
    from reviewer.plots.sweep import sweep_svg

    try:
        svg = sweep_svg(axes, points)
    except PlotsUnavailable:
        raise InputError("--plots", "(usage)", f"charts need matplotlib: {INSTALL_HINT}") from None
    folder = output_folder(args.plots, "the chart (--plots)")
    path = folder / "sweep.svg"
    write_whole(path, svg, inputs=[args.build, args.profile])
    base = Path(args.output).parent if args.output else Path()
    return Path(os.path.relpath(path, base)).as_posix()


def sweep_json(build: str, axes, points, limits) -> dict:
    return {
        "format": "firstride-sweep",
        "format_version": 1,
        "build": build,
        "fields": [{"field": a.field, "values": list(a.values)} for a in axes],
        "points": [
            {
                "values": list(p.values),
                "verdict": p.verdict,
                "binding_rule": p.binding,
                "severity": p.severity,
                "detail": p.detail,
            }
            for p in points
        ],
        "envelope": limits,
    }


def sweep_markdown(build: str, axes, points, limits, chart: str | None = None) -> str:
    from urllib.parse import quote

    from reviewer.report import Raw, environment

    link = Raw(quote(chart)) if chart else None
    grid = None
    if len(axes) == 2:
        cells = {p.values: p for p in points}
        grid = [
            (row, [cells[(row, column)] for column in axes[1].values]) for row in axes[0].values
        ]
    text = (
        environment()
        .get_template("sweep.md.j2")
        .render(build=build, axes=axes, points=points, envelope=limits, grid=grid, chart=link)
    )
    return "\n".join(line.rstrip() for line in text.splitlines()) + "\n"
