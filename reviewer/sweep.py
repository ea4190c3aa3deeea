"""The what-if sweep: one build reviewed at every point of a range of one or two of its fields.

A builder after a no-go asks which gearing, current limit or wire gauge would pass everything.
The sweep answers it by reviewing each variant exactly as a full review would (the build file's
tree with the field changed, validated into a fresh model, every rule run), without writing or
rendering anything, and reports the verdict and the binding rule at each point and the
envelope: the values for which the review is ``go``. A variant that is not a valid build (a
value outside a field's range) is an input error at that point, never a pass.
"""

from __future__ import annotations

import copy
import itertools
import math
import multiprocessing
import re
from collections.abc import Sequence
from concurrent.futures import ProcessPoolExecutor
from dataclasses import dataclass
from typing import Any

from pydantic import ValidationError

from reviewer.errors import InputError
from reviewer.findings import Severity, Verdict

#: The most points one sweep reviews.
MAX_POINTS = 100_000
#: Points of a range given without a step.
DEFAULT_STEPS = 10
_NUMBER = re.compile(
    r"^\s*(?P<number>[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*(?P<unit>.*?)\s*$"
)
_GAUGE = re.compile(r"^\s*(?P<number>\d{1,2})\s*AWG\s*$", re.IGNORECASE)
_TOKEN = re.compile(r"([A-Za-z_][A-Za-z0-9_]*)|\[(\d{1,4})\]")


@dataclass(frozen=True)
class Axis:
    """One varied field and the values it takes, as the build file would write them."""

    field: str
    path: tuple[str | int, ...]
    values: tuple[Any, ...]
    numbers: tuple[float, ...]  # the values as numbers, for the envelope
    unit: str  # "" for a plain number, "AWG" for a gauge


@dataclass(frozen=True)
class Point:
    """The review of one variant."""

    values: tuple[Any, ...]
    verdict: str  # a Verdict's value, or "input error"
    binding: str  # the rule that set the verdict ("" for go)
    severity: str  # that rule's worst severity
    detail: str  # the finding's subject, or the input error

    @property
    def passes(self) -> bool:
        return self.verdict == Verdict.GO.value


def parse_path(field: str) -> tuple[str | int, ...]:
    """``motors[0].kv`` -> ("motors", 0, "kv")."""
    tokens: list[str | int] = []
    for part in field.split("."):
        pieces = list(_TOKEN.finditer(part))
        if not pieces or "".join(m.group(0) for m in pieces) != part or pieces[0].group(1) is None:
            raise InputError("--vary", field, "a field path such as controller.current_limit")
        for match in pieces:
            tokens.append(match.group(1) if match.group(1) is not None else int(match.group(2)))
    return tuple(tokens)


def known_field(field: str, path: Sequence[str | int]) -> None:
    """Raise an InputError unless ``path`` names a field of the build model (a misspelt
    field would make every point an input error; this says so once, before any point)."""
    from reviewer.build import Build
    from reviewer.loader import _inner_model, _suggest

    model: Any = Build
    for part in path:
        if model is None:  # a free-form table (a pack's [extensions]): its pack's model checks
            return
        if isinstance(part, int):
            continue
        info = model.model_fields.get(part)
        if info is None:
            hint = _suggest(tuple(p for p in path[: path.index(part) + 1]), Build)
            raise InputError("--vary", field, f"a field of the build file{hint}")
        model = _inner_model(info.annotation)


def parse_axis(text: str, data: dict[str, Any]) -> Axis:
    """``FIELD=START:STOP[:STEP]`` with values written as in the build file."""
    field, sep, span = text.partition("=")
    if not sep or not field.strip():
        raise InputError("--vary", text[:80], "FIELD=START:STOP[:STEP]")
    field = field.strip()
    path = parse_path(field)
    known_field(field, path)
    parts = span.split(":")
    if len(parts) not in (2, 3):
        raise InputError("--vary", field, "START:STOP or START:STOP:STEP")
    current = _get(data, path)
    gauges = [_GAUGE.match(p) for p in parts[:2]]
    if all(gauges):  # gauges step in whole AWG numbers, thinner or thicker
        start, stop = (int(m["number"]) for m in gauges if m)
        step_text = parts[2].strip().upper().removesuffix("AWG").strip() if len(parts) == 3 else "1"
        if not step_text.isdigit() or int(step_text) == 0:
            raise InputError("--vary", field, "a gauge STEP in whole AWG numbers, like 2")
        step = int(step_text)
        direction = 1 if stop >= start else -1
        numbers = tuple(float(n) for n in range(start, stop + direction, direction * step))
        return Axis(field, path, tuple(f"{int(n)} AWG" for n in numbers), numbers, "AWG")
    parsed = [_NUMBER.match(p) for p in parts]
    if not all(parsed):
        raise InputError("--vary", field, "numbers, each with the field's unit, like 20 A:40 A:2 A")
    units = {m["unit"] for m in parsed if m and m["unit"]}
    if len(units) > 1:
        raise InputError("--vary", field, "the same unit in START, STOP and STEP")
    unit = units.pop() if units else ""
    start, stop = (float(m["number"]) for m in parsed[:2] if m)
    step = float(parsed[2]["number"]) if len(parsed) == 3 and parsed[2] else None
    integral = isinstance(current, int) and not isinstance(current, bool) and not unit
    if step is None:  # a count steps by one; anything else in ten steps
        step = math.copysign(1.0, stop - start) if integral else (stop - start) / DEFAULT_STEPS
    if not all(math.isfinite(v) for v in (start, stop, step)):
        raise InputError("--vary", field, "finite numbers")
    if start == stop:
        count = 1
    elif step == 0 or (stop - start) * step < 0:
        raise InputError("--vary", field, "a STEP that moves from START towards STOP")
    else:
        count = math.floor((stop - start) / step + 1e-9) + 1
    if count > MAX_POINTS:
        raise InputError("--vary", field, f"at most {MAX_POINTS} points")
    numbers = tuple(start + i * step for i in range(count))
    if integral and not all(float(n).is_integer() for n in numbers):
        raise InputError("--vary", field, "whole numbers: the field is a count")
    values = tuple(_written(n, unit, integral) for n in numbers)
    return Axis(field, path, values, numbers, unit)


def _written(number: float, unit: str, integral: bool) -> Any:
    if integral:
        return round(number)
    text = f"{round(number, 9):.12g}"
    return f"{text} {unit}" if unit else float(text)


def _get(data: Any, path: Sequence[str | int]) -> Any:
    node = data
    for key in path:
        if isinstance(key, int):
            if not isinstance(node, list) or key >= len(node):
                return None
            node = node[key]
        else:
            if not isinstance(node, dict):
                return None
            node = node.get(key)
        if node is None:
            return None
    return node


def set_field(data: dict[str, Any], path: Sequence[str | int], value: Any, field: str) -> None:
    """Set a field in a build tree in place; tables along the way are made, list items not."""
    node: Any = data
    for position, key in enumerate(path[:-1]):
        following = path[position + 1]
        if isinstance(key, int):
            if not isinstance(node, list) or key >= len(node):
                raise InputError("--vary", field, f"an existing item [{key}] in the build file")
            node = node[key]
        else:
            if not isinstance(node, dict):
                raise InputError("--vary", field, "a path through tables of the build file")
            if key not in node:
                if isinstance(following, int):
                    raise InputError("--vary", field, f"an existing list {key!r} in the build")
                node[key] = {}
            node = node[key]
    last = path[-1]
    if isinstance(last, int) or not isinstance(node, dict):
        raise InputError("--vary", field, "a path ending in a field name")
    node[last] = value


# --- running -------------------------------------------------------------------------------


def variants(axes: Sequence[Axis]) -> list[tuple[Any, ...]]:
    grid = list(itertools.product(*(axis.values for axis in axes)))
    if len(grid) > MAX_POINTS:
        raise InputError("--vary", "(sweep)", f"at most {MAX_POINTS} points in all")
    return grid


def review_point(session: Any, data: dict[str, Any], axes: Sequence[Axis], values: tuple) -> Point:
    """One variant, reviewed as a full review would review its build file."""
    from reviewer.build import Build
    from reviewer.loader import validation_error

    tree = copy.deepcopy(data)
    for axis, value in zip(axes, values, strict=True):
        set_field(tree, axis.path, value, axis.field)
    try:
        build = Build.model_validate(tree)
    except ValidationError as exc:
        error = validation_error(exc, "(variant)", Build)
        return Point(values, "input error", "", "", f"{error.field}: {error.expected}")
    result = session.review_build(build)
    for finding in result.findings:
        if finding.waiver is None and finding.severity is not Severity.PASS:
            if result.verdict is Verdict.GO and finding.severity is Severity.ADVISE:
                continue  # advice does not bind
            return Point(
                values,
                result.verdict.value,
                finding.rule_id,
                finding.severity.value,
                finding.subject,
            )
    return Point(values, result.verdict.value, "", "", "")


_WORKER: tuple[Any, dict[str, Any], tuple[Axis, ...]] | None = None


def _init_worker(profile: str | None, data: dict[str, Any], axes: tuple[Axis, ...]) -> None:
    global _WORKER  # one session per worker process
    from reviewer.session import open_session

    _WORKER = (open_session(profile), data, axes)


def _in_worker(values: tuple) -> Point:
    assert _WORKER is not None
    session, data, axes = _WORKER
    return review_point(session, data, axes, values)


def run_sweep(
    data: dict[str, Any],
    axes: Sequence[Axis],
    *,
    profile: str | None = None,
    session: Any = None,
    jobs: int = 1,
) -> list[Point]:
    """Every point of the grid, in grid order (the first axis varies slowest)."""
    grid = variants(axes)
    if jobs <= 1 or len(grid) < 64:
        if session is None:
            from reviewer.session import open_session

            session = open_session(profile)
        return [review_point(session, data, axes, values) for values in grid]
    context = multiprocessing.get_context("spawn")  # see reviewer.fleet: no forked threads
    workers = min(jobs, len(grid))
    with ProcessPoolExecutor(
        workers, mp_context=context, initializer=_init_worker, initargs=(profile, data, tuple(axes))
    ) as pool:
        return list(pool.map(_in_worker, grid, chunksize=max(1, len(grid) // (workers * 8))))


def envelope(axes: Sequence[Axis], points: Sequence[Point]) -> list[dict[str, Any]]:
    """For each axis, the runs of its values at which the review is ``go`` (for two axes: at
    which the review is ``go`` for at least one value of the other), as [low, high] pairs."""
    result = []
    for index, axis in enumerate(axes):
        passing = {p.values[index] for p in points if p.passes}
        runs: list[list[Any]] = []
        previous_passed = False
        for value in axis.values:
            if value in passing:
                if previous_passed:
                    runs[-1][1] = value
                else:
                    runs.append([value, value])
            previous_passed = value in passing
        result.append({"field": axis.field, "passing": runs})
    return result
