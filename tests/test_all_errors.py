"""Every input error of a file at once: one line each, ``FILE:LINE: FIELD: what was expected``,
in file order, at most ``MAX_REPORTED`` and then one line counting the rest; exit status 2 and
nothing written. A TOML syntax error stays one line, at the line the parser names."""

from __future__ import annotations

import pickle
import re
import subprocess
import sys
from pathlib import Path

import pytest

from reviewer import loader
from reviewer.cli import main
from reviewer.errors import MAX_REPORTED, InputError, InputErrors
from reviewer.loader import _scan_positions, parse_build

from .hostile_corpus import leaves

SAMPLES = Path(__file__).resolve().parent.parent / "sample_builds"

# Three independent mistakes, in a file order unlike the model's (vehicle comes first there).
THREE_MISTAKES = """\
# a bench build with three mistakes
[battery]
chemistry = "lipo"
cells_series = "7"

[[motors]]
type = "brushed"
winding_resistance = "0.3 kg"

[vehicle]
name = "Bench Test"
kind = "scooter"
revison = "C"
"""


def line_of(text: str, needle: str) -> int:
    """The 1-based number of the one line of ``text`` holding ``needle``."""
    found = [n for n, line in enumerate(text.split("\n"), 1) if needle in line]
    assert len(found) == 1, (needle, found)
    return found[0]


def review(tmp_path: Path, text: str, capsys) -> tuple[int, list[str], Path]:
    build = tmp_path / "build.toml"
    build.write_text(text, encoding="utf-8")
    output = tmp_path / "review.md"
    code = main(["review", str(build), "-o", str(output)])
    captured = capsys.readouterr()
    assert captured.out == ""
    assert "Traceback" not in captured.err
    assert not output.exists()
    assert list(tmp_path.iterdir()) == [build]
    return code, captured.err.splitlines(), build


def test_three_independent_mistakes_are_all_reported_in_file_order(tmp_path, capsys) -> None:
    code, lines, build = review(tmp_path, THREE_MISTAKES, capsys)
    assert code == 2
    assert lines == [
        f"firstride: {build}:{line_of(THREE_MISTAKES, 'cells_series')}: "
        "battery.cells_series: Input should be a valid integer",
        f"firstride: {build}:{line_of(THREE_MISTAKES, 'winding_resistance')}: "
        "motors[0].winding_resistance: '0.3 kg' is not a resistance; expected a unit like "
        "'ohm', e.g. '0.35 ohm'",
        f"firstride: {build}:{line_of(THREE_MISTAKES, 'revison')}: "
        "vehicle.revison: no such key; did you mean 'revision'?",
    ]


def test_a_missing_field_is_placed_at_its_table_and_an_array_element_at_its_own(
    tmp_path, capsys
) -> None:
    text = (
        '[vehicle]\nname = "No kind"\n\n'
        '[[riders]]\nname = "a"\nmass = "70 kg"\nclass = "adult"\n\n'
        '[[riders]]\nname = "b"\nmass = "70 V"\nclass = "adult"\n'
    )
    code, lines, build = review(tmp_path, text, capsys)
    assert code == 2
    assert lines == [
        f"firstride: {build}:1: vehicle.kind: this field is required",
        f"firstride: {build}:{line_of(text, '70 V')}: riders[1].mass: '70 V' is not a mass; "
        "expected a unit like 'kg', e.g. '80 kg'",
    ]


def test_more_than_the_cap_are_counted_on_one_last_line(tmp_path, capsys) -> None:
    count = MAX_REPORTED + 7
    text = '[vehicle]\nname = "Many"\nkind = "scooter"\n' + "".join(
        f"zz_unknown_{i:02d} = 1\n" for i in range(count)
    )
    code, lines, build = review(tmp_path, text, capsys)
    assert code == 2
    assert len(lines) == MAX_REPORTED + 1
    for i, line in enumerate(lines[:-1]):
        assert line.startswith(
            f"firstride: {build}:{line_of(text, f'zz_unknown_{i:02d}')}: "
            f"vehicle.zz_unknown_{i:02d}: no such key"
        ), line
    assert lines[-1] == f"firstride: {build}: ... and 7 more"


def test_a_toml_syntax_error_is_one_line_at_the_parsers_line(tmp_path, capsys) -> None:
    text = THREE_MISTAKES + 'builder = = "x"\n[battery.extra]\n'
    code, lines, build = review(tmp_path, text, capsys)
    assert code == 2
    number = line_of(text, "builder = =")
    assert len(lines) == 1, lines
    assert lines[0].startswith(f"firstride: {build}:{number}: (file): valid TOML ("), lines[0]
    assert f"(at line {number}, column" in lines[0]


def test_a_toml_error_at_the_end_of_the_text_names_its_last_line(tmp_path, capsys) -> None:
    text = '[vehicle]\nname = "Open"\npins = [\n"P1",\n'
    code, lines, build = review(tmp_path, text, capsys)
    assert code == 2
    assert len(lines) == 1 and lines[0].startswith(f"firstride: {build}:4: (file): valid TOML")


def test_hostile_keys_are_escaped_on_every_line(tmp_path, capsys) -> None:
    text = (
        '[vehicle]\nname = "Bench"\nkind = "scooter"\n'
        '"\\u001b[31mred" = 1\n"\\u202eeman" = 2\n"' + "k" * 5000 + '" = 3\n'
    )
    code, lines, build = review(tmp_path, text, capsys)
    assert code == 2
    assert [line.split(": ")[1] for line in lines] == [
        f"{build}:4",
        f"{build}:5",
        f"{build}:6",
    ]
    assert all(line.isprintable() and len(line) < 1100 for line in lines)
    assert "\\x1b[31mred" in lines[0] and "\\u202eeman" in lines[1] and "…" in lines[2]


def test_lines_are_found_past_comments_multi_line_strings_and_arrays(tmp_path, capsys) -> None:
    text = (
        "# [battery] = not a header\n"
        '[vehicle]  # kind = "x"\n'
        'name = "Bench"\n'
        'kind = "scooter"\n'
        '[logic]\npins = [\n  "P1",  # = [\n  "P2",\n]\n'
        "present = 'yes'\n"
        '[ "enclosure" ]\n'
        'electronics_ip = """IP7X"""\n'
    )
    code, lines, _ = review(tmp_path, text, capsys)
    assert code == 2
    assert [int(line.split(": ")[1].rsplit(":", 1)[1]) for line in lines] == [
        line_of(text, "present ="),
        line_of(text, "electronics_ip"),
    ], lines


@pytest.mark.parametrize("scanner", ["in use", "fallback"])
@pytest.mark.parametrize("sample", sorted(SAMPLES.glob("*.toml")), ids=lambda p: p.stem)
def test_every_leaf_of_every_sample_is_found_at_its_line(
    sample: Path, scanner, monkeypatch
) -> None:
    """Each one-line field of a sample, made a table where none belongs, is reported at its
    own line; all of them made so at once are reported in file order, then counted. Both with
    the positions the loader uses and with its own fallback scanner."""
    if scanner == "fallback":
        monkeypatch.setattr(loader, "_positions", _scan_positions)
    text = sample.read_text("utf-8")
    found = leaves(text)
    assert found
    lines = text.split("\n")
    for number, field, key, _ in found:
        bad = lines.copy()
        bad[number] = f"{key} = {{ x = 1 }}"
        with pytest.raises(InputErrors) as raised:
            parse_build("\n".join(bad).encode(), "b.toml")
        at = {  # the field itself, or a key inside it where a table is allowed (battery.bms)
            error.field: error.line
            for error in raised.value.errors
            if error.field == field or error.field.startswith((f"{field}.", f"{field}["))
        }
        assert at and set(at.values()) == {number + 1}, (field, at)
    every = lines.copy()
    for number, _, key, _ in found:
        every[number] = f"{key} = {{ x = 1 }}"
    with pytest.raises(InputErrors) as raised:
        parse_build("\n".join(every).encode(), "b.toml")
    errors = raised.value
    numbers = [error.line for error in errors.errors]
    assert numbers == sorted(numbers)
    assert errors.total == len(found)
    assert len(errors.errors) == min(len(found), MAX_REPORTED)


def test_the_fallback_scanner_counts_array_elements_and_nested_arrays() -> None:
    text = (
        '[[brakes]]\nkind = "friction"\n[[brakes]]\nkind = "foot"\n'
        '[logic]\n[[logic.loads]]\nname = "a"\n[[logic.loads]]\nname = "b"\n'
        "[battery.bms]\nrated = 1\n"
        'vehicle.name = "dotted"\n'
    )
    positions = _scan_positions(text)
    assert positions["brakes[1].kind"] == (4, 1)
    assert positions["logic.loads[1].name"] == (9, 1)
    assert positions["battery.bms.rated"] == (11, 1)
    assert positions["battery.bms.vehicle.name"] == (12, 1)


def test_one_line_callers_read_the_first_error_and_the_count() -> None:
    first = InputError("b.toml", "battery.cells_series", "a whole number", 3)
    errors = InputErrors([first, InputError("b.toml", "vehicle.kind", "one of a, b", 9)])
    assert (errors.file, errors.field, errors.line) == ("b.toml", "battery.cells_series", 3)
    assert str(errors) == "b.toml:3: battery.cells_series: a whole number (and 1 more)"
    again = pickle.loads(pickle.dumps(errors))  # a fleet worker may send it to its parent
    assert again.lines() == errors.lines()
    assert str(InputError("b.toml", "(file)", "a build file")) == "b.toml: (file): a build file"


def test_a_waivers_file_reports_every_bad_waiver(tmp_path, capsys) -> None:
    waivers = tmp_path / "w.toml"
    waivers.write_text(
        '[[waiver]]\nrule = "x.y"\nsubject = "s"\njustification = "j"\ndate = 2026-11-30\n'
        '[[waiver]]\nrule = "x.y"\nsubject = "s"\njustification = " "\naccepted_by = "A"\n'
        "date = 2026-11-30\n"
    )
    code = main(["review", str(SAMPLES / "quayside-commuter.toml"), "--waivers", str(waivers)])
    lines = capsys.readouterr().err.splitlines()
    assert code == 2
    assert [re.sub(r"^firstride: [^ ]+ ", "", line).split(":")[0] for line in lines] == [
        "waiver[0].accepted_by",
        "waiver[1].justification",
    ], lines


def test_in_a_real_process_every_error_and_no_traceback(tmp_path: Path) -> None:
    build = tmp_path / "b.toml"
    build.write_text(THREE_MISTAKES)
    output = tmp_path / "review.md"
    done = subprocess.run(
        [sys.executable, "-m", "reviewer", "review", str(build), "-o", str(output)],
        capture_output=True,
        text=True,
        timeout=60,  # a hang would be a defect; this bound only stops the test run
    )
    assert done.returncode == 2
    assert done.stdout == ""
    assert "Traceback" not in done.stderr
    assert len(done.stderr.splitlines()) == 3
    assert all(
        re.match(rf"firstride: {re.escape(str(build))}:\d+: ", x) for x in done.stderr.splitlines()
    )
    assert not output.exists()
