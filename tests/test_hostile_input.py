"""Hostile input, fail closed: a corpus of several hundred bad inputs (``hostile_corpus``), each
played through the real command line in one process of its own (``hostile_runner``).

Each must give exit status 2 and exactly one line on stderr that names the file and the field,
holds no control character, no traceback and no pint object, takes under a second, and leaves
every file as it was: nothing written, nothing replaced.
"""

from __future__ import annotations

import collections
import json
import re
import subprocess
import sys
from pathlib import Path

import pytest

from reviewer.errors import printable

from .hostile_corpus import as_json, prepare

HERE = Path(__file__).resolve().parent
WARM = HERE.parent / "sample_builds" / "quayside-commuter.toml"
#: Each case's limit: a refusal is a few checks, never a parse of a huge file or a hang.
CASE_SECONDS = 1.0
MIN_CASES = 200


@pytest.fixture(scope="module")
def played(tmp_path_factory: pytest.TempPathFactory) -> tuple[list[dict], list[dict]]:
    folder = tmp_path_factory.mktemp("corpus")
    cases = json.loads(as_json(prepare(folder)))
    listing = folder.parent / "cases.json"
    listing.write_text(json.dumps(cases), encoding="utf-8")
    done = subprocess.run(
        [sys.executable, str(HERE / "hostile_runner.py"), str(listing), str(folder), str(WARM)],
        capture_output=True,
        text=True,
        timeout=120,  # a hang is a defect; this bound only stops the test run
        cwd=folder,
    )
    assert done.returncode == 0, done.stderr[-3000:]
    results = [json.loads(line) for line in done.stdout.splitlines()]
    assert len(results) == len(cases)
    return cases, results


def problems(case: dict, result: dict) -> list[str]:
    """What is wrong with how one case was refused."""
    wrong = []
    if result["code"] != 2:
        wrong.append(f"exit status {result['code']!r}, not 2")
    if result["stdout"]:
        wrong.append(f"wrote to stdout: {result['stdout'][:120]!r}")
    lines = result["stderr"].split("\n")
    if len(lines) != 2 or lines[1] != "":
        wrong.append(f"{len(lines) - 1} lines on stderr: {result['stderr'][:300]!r}")
    line = lines[0]
    if "Traceback" in result["stderr"]:
        wrong.append("a traceback")
    if not line.isprintable():
        wrong.append(f"a control or invisible character in {line[:200]!r}")
    if len(line) > 1100:
        wrong.append(f"a line of {len(line)} characters")
    if "<Quantity" in line or "<Unit" in line or "UnitsContainer" in line:
        wrong.append("a pint object in the line")
    # the file, then its line when the error is about one place in it (``build.toml:12: ``)
    named = re.match(rf"firstride: {re.escape(printable(case['file']))}(?::[0-9]+)?: ", line)
    if named is None:
        wrong.append(f"does not name the file {case['file']!r}: {line[:200]!r}")
    else:
        field = line[named.end() :].split(": ", 1)[0]
        if case["field"] is not None and case["field"] not in field:
            wrong.append(f"field {field[:100]!r}, expected it to name {case['field']!r}")
        if not field:
            wrong.append("no field named")
    if result["changed"]:
        wrong.append(f"changed files: {result['changed'][:3]}")
    if result["seconds"] > CASE_SECONDS:
        wrong.append(f"took {result['seconds']:.2f} s")
    return wrong


def test_the_corpus_is_large_and_covers_every_class(played) -> None:
    cases, _ = played
    kinds = collections.Counter(case["kind"] for case in cases)
    assert len(cases) >= MIN_CASES, kinds
    for kind in (
        "bad quantity",
        "wrong type",
        "control characters in keys",
        "nesting bombs",
        "bad UTF-8",
        "huge files",
        "special files",
        "previous reviews",
        "waivers",
        "outputs",
        "signer names",
    ):
        assert kinds[kind] >= 5, (kind, kinds)
    assert len({case["name"] for case in cases}) == len(cases)


def test_every_bad_input_is_refused_in_one_line(played) -> None:
    cases, results = played
    failures = []
    for case, result in zip(cases, results, strict=True):
        wrong = problems(case, result)
        if wrong:
            failures.append(f"{case['name']}: {'; '.join(wrong)}")
    assert not failures, f"{len(failures)} of {len(cases)} cases:\n" + "\n".join(failures[:40])


@pytest.mark.parametrize(
    ("argv", "expected"),
    [
        (["--require", "0"], "between 1 and"),
        (["--require", "-1"], "between 1 and"),
        (["--require", "two"], "a whole number"),
        (["--trust", "k.pub", "--integrity-only"], "not allowed with"),
    ],
)
def test_verify_usage_errors_exit_2_in_one_line(argv, expected, tmp_path: Path, capsys) -> None:
    from reviewer.cli import main

    review = tmp_path / "r.md"
    review.write_text("# a review\n")
    with pytest.raises(SystemExit) as stopped:
        main(["verify", str(review), *argv])
    assert stopped.value.code == 2
    err = capsys.readouterr().err
    assert len(err.strip().splitlines()) == 1 and expected in err, err


def test_a_fifo_as_the_build_is_refused_by_the_real_program_at_once(tmp_path: Path) -> None:
    fifo = tmp_path / "build.toml"
    import os

    os.mkfifo(fifo)
    done = subprocess.run(
        [sys.executable, "-m", "reviewer", "review", str(fifo)],
        capture_output=True,
        text=True,
        timeout=60,  # reading the FIFO would block for ever: the bound only stops the test
    )
    assert done.returncode == 2
    assert done.stdout == ""
    assert (
        done.stderr
        == f"firstride: {fifo}: (file): a build file (a regular file); this is a named pipe (FIFO)\n"
    )
