"""Bad input: each case exits 2 with one clear line naming the file and field, no traceback,
and no output file written."""

from __future__ import annotations

import re
import subprocess
import sys
from pathlib import Path

import pytest

from reviewer.cli import main

BASE = """\
[vehicle]
name = "Bench Test"
kind = "scooter"
"""

CASES: dict[str, tuple[str | None, str]] = {
    # name: (build text, or None for no file; text expected in the error line)
    "missing file": (None, "an existing build file"),
    "empty file": ("", "empty"),
    "not toml": ("this is = = not toml\n", "valid TOML"),
    "binary": ("\x00\x01\x02", "valid TOML"),
    "unknown key with suggestion": (
        BASE + '[battery]\nchemistry = "lipo"\ncells_series = 6\ncell_capasity = "3000 mAh"\n',
        "did you mean 'cell_capacity'",
    ),
    "unknown top-level table": (BASE + "[moter]\n", "did you mean 'motors'"),
    "wrong dimension": (
        BASE
        + '[battery]\nchemistry = "lipo"\ncells_series = 6\ncell_internal_resistance = "24 kg"\n',
        "battery.cell_internal_resistance",
    ),
    "voltage given as mass": (
        BASE + '[controller]\nswitch_max_voltage = "24 kg"\n',
        "is not a voltage",
    ),
    "no unit": (BASE + '[[motors]]\ntype = "brushed"\nwinding_resistance = "0.3"\n', "has no unit"),
    "number not string": (
        BASE + '[[motors]]\ntype = "brushed"\nwinding_resistance = 0.3\n',
        "as a string with a unit",
    ),
    "negative resistance": (
        BASE + '[[motors]]\ntype = "brushed"\nwinding_resistance = "-0.3 ohm"\n',
        "below the physical range",
    ),
    "zero resistance": (
        BASE + '[[motors]]\ntype = "brushed"\nwinding_resistance = "0 ohm"\n',
        "must not be zero",
    ),
    "nan": (
        BASE + '[[motors]]\ntype = "brushed"\nwinding_resistance = "nan ohm"\n',
        "not a number followed by a unit",
    ),
    "toml nan float": (BASE + "[usage]\nrolling_resistance = nan\n", "finite number"),
    "infinity": (
        BASE + '[[motors]]\ntype = "brushed"\nrated_voltage = "1e999 V"\n',
        "not a finite number",
    ),
    "absurd magnitude": (
        BASE + '[[motors]]\ntype = "brushed"\nrated_voltage = "1e30 V"\n',
        "above the physical range",
    ),
    "power tower": (
        BASE + '[[motors]]\ntype = "brushed"\nrated_voltage = "9**9**9 V"\n',
        "not a number followed by a unit",
    ),
    "division by zero": (
        BASE + '[[motors]]\ntype = "brushed"\nrated_voltage = "1/0 V"\n',
        "not a number followed by a unit",
    ),
    "unknown unit": (
        BASE + '[[motors]]\ntype = "brushed"\nrated_voltage = "24 volts_ish"\n',
        "unknown unit",
    ),
    "malformed ip code": (BASE + '[enclosure]\nelectronics_ip = "IP7X"\n', "not an IP code"),
    "pin the part lacks": (
        BASE
        + '[logic]\npins = ["P1", "P2"]\n[[logic.loads]]\nname = "lamp"\npins = ["P9"]\ncurrent = "10 mA"\n',
        "which the part does not have",
    ),
    "too many riders": (
        BASE
        + "".join(
            f'[[riders]]\nname = "r{i}"\nmass = "70 kg"\nclass = "adult"\n' for i in range(40)
        ),
        "riders",
    ),
    "over-long string": (BASE.replace("Bench Test", "x" * 5000), "vehicle.name"),
    "bad enum": (BASE.replace("scooter", "hovercraft"), "one of"),
    "missing required": ('[vehicle]\nname = "No kind"\n', "vehicle.kind: this field is required"),
    "bad gauge": (
        BASE + '[[wires]]\nname = "a"\ncircuit = "battery"\ngauge = "12 SWG"\nlength = "1 m"\n',
        "not an AWG size",
    ),
    "overlong quantity": (
        BASE + f'[[motors]]\ntype = "brushed"\nrated_voltage = "{"1" * 80} V"\n',
        "longer than",
    ),
    "wire names unknown motor": (
        BASE + '[[motors]]\nname = "rear"\ntype = "brushed"\n'
        '[[wires]]\nname = "a"\ncircuit = "motor"\nmotor = "front"\ngauge = "12 AWG"\nlength = "1 m"\n',
        "not in motors",
    ),
}


@pytest.mark.parametrize("name", sorted(CASES))
def test_bad_build_exits_2_with_one_line(name: str, tmp_path: Path, capsys) -> None:
    text, expected = CASES[name]
    build = tmp_path / "build.toml"
    if text is not None:
        build.write_bytes(text.encode("utf-8"))
    output = tmp_path / "review.md"
    code = main(["review", str(build), "-o", str(output)])
    captured = capsys.readouterr()
    lines = captured.err.strip().splitlines()
    assert code == 2
    assert len(lines) == 1, captured.err
    assert re.match(rf"firstride: {re.escape(str(build))}(:[0-9]+)?: ", lines[0]), lines[0]
    assert expected in lines[0], lines[0]
    assert "Traceback" not in captured.err
    assert not output.exists()
    assert list(tmp_path.iterdir()) == ([build] if text is not None else [])


def test_bad_profile_is_an_input_error(tmp_path: Path, capsys) -> None:
    build = tmp_path / "build.toml"
    build.write_text(BASE)
    profile = tmp_path / "profile.toml"
    profile.write_text('[profile]\nname = "x"\n[limits.speed.max_speed.adult]\nvalue = "25 km/h"\n')
    code = main(["review", str(build), "--profile", str(profile)])
    err = capsys.readouterr().err.strip()
    assert code == 2
    assert (
        err == f"firstride: {profile}:3: limits.speed.max_speed.adult.source: every limit needs a "
        "source (text)"
    )


def test_a_profile_reports_every_mistake_at_its_line(tmp_path: Path, capsys) -> None:
    # as a build file does: the officer who writes a club's profile fixes it in one pass
    build = tmp_path / "build.toml"
    build.write_text(BASE)
    profile = tmp_path / "profile.toml"
    profile.write_text(
        "[profile]\n"  # 1
        'name = "club"\n'  # 2
        'colour = "blue"\n'  # 3: no such key
        'mandatory_rules = ["Not An Id"]\n'  # 4
        "[limits.speed.max_speed.adult]\n"  # 5
        'value = "25 km/h"\n'  # 6: no source
        "[limits.brake.deceleration]\n"  # 7
        'value = "3 wibbles"\n'  # 8: no such unit
        'source = "club rule 4"\n'  # 9
        "[waivers]\n"  # 10
        'allow_stop = "yes"\n'  # 11: not a boolean
    )
    assert main(["review", str(build), "--profile", str(profile)]) == 2
    lines = capsys.readouterr().err.strip().splitlines()
    fields = [line.split(": ")[2] for line in lines]
    assert fields == [
        "profile.colour",
        "profile.mandatory_rules",
        "limits.speed.max_speed.adult.source",
        "limits.brake.deceleration.value",
        "waivers.allow_stop",
    ], lines
    assert [line.split(": ")[1].rsplit(":", 1)[1] for line in lines] == ["3", "4", "5", "8", "11"]
    assert all(line.startswith(f"firstride: {profile}:") for line in lines)


def test_usage_error_is_one_line(capsys) -> None:
    with pytest.raises(SystemExit) as exit_info:
        main(["review"])
    assert exit_info.value.code == 2
    assert len(capsys.readouterr().err.strip().splitlines()) == 1


def test_pathological_input_in_a_real_process_has_no_traceback(tmp_path: Path) -> None:
    build = tmp_path / "b.toml"
    build.write_text(BASE + '[[motors]]\ntype = "brushed"\nrated_voltage = "9**9**9**9 V"\n')
    done = subprocess.run(
        [sys.executable, "-m", "reviewer", "review", str(build)],
        capture_output=True,
        text=True,
        timeout=60,  # a hang would be a defect; this bound only stops the test run
    )
    assert done.returncode == 2
    assert done.stdout == ""
    assert "Traceback" not in done.stderr
    assert len(done.stderr.strip().splitlines()) == 1


def test_a_profile_of_many_mistakes_spells_out_twenty(tmp_path: Path, capsys) -> None:
    build = tmp_path / "build.toml"
    build.write_text(BASE)
    profile = tmp_path / "profile.toml"
    tables = "".join(f'[limits.club.item{i}]\nvalue = "{i} A"\n' for i in range(25))
    profile.write_text('[profile]\nname = "club"\n' + tables)
    assert main(["review", str(build), "--profile", str(profile)]) == 2
    lines = capsys.readouterr().err.strip().splitlines()
    assert len(lines) == 21 and lines[-1].endswith("... and 5 more")
    assert lines[0].endswith(":3: limits.club.item0.source: every limit needs a source (text)")
