"""`firstride new-pack NAME`: a ready-to-install pack that loads, reviews and tests cleanly, and
a command that never overwrites and refuses names that cannot prefix a rule id."""

from __future__ import annotations

import subprocess
import sys
import tomllib
from pathlib import Path

import pytest

from reviewer.cli import main
from reviewer.findings import Severity
from reviewer.testing import load_pack, severities

ROOT = Path(__file__).resolve().parent.parent


@pytest.fixture
def new_pack(tmp_path: Path, monkeypatch: pytest.MonkeyPatch, capsys):
    """Run `firstride new-pack NAME` in a fresh folder and import the result."""
    monkeypatch.chdir(tmp_path)
    names: list[str] = []

    def make(name: str) -> Path:
        assert main(["new-pack", name]) == 0
        names.append(name)
        monkeypatch.syspath_prepend(str(tmp_path / name))
        return tmp_path / name

    yield make
    for name in names:
        module = f"firstride_{name.replace('-', '_')}"
        for loaded in [m for m in sys.modules if m == module or m.startswith(f"{module}.")]:
            del sys.modules[loaded]


def test_the_pack_declares_its_entry_point(new_pack) -> None:
    folder = new_pack("my-club")
    project = tomllib.loads((folder / "pyproject.toml").read_text("utf-8"))
    assert project["project"]["name"] == "firstride-my-club"
    assert project["project"]["entry-points"]["firstride.packs"] == {"my-club": "firstride_my_club"}
    assert project["tool"]["setuptools"]["package-data"]["firstride_my_club"] == ["limits.toml"]
    assert {p.relative_to(folder).as_posix() for p in folder.rglob("*") if p.is_file()} == {
        "pyproject.toml",
        "README.md",
        "firstride_my_club/__init__.py",
        "firstride_my_club/rules.py",
        "firstride_my_club/limits.toml",
        "tests/test_my_club.py",
        "sample_build.toml",
    }


def test_the_example_rule_loads_strictly_and_reports(new_pack) -> None:
    new_pack("my-club")
    import firstride_my_club

    pack = load_pack(firstride_my_club, "my-club")  # strict: raises on any problem
    rule = pack.rule("my-club.vehicle-mass")
    assert rule.inputs == ("vehicle.mass",) and len(rule.doc) > 100
    heavy = {"vehicle": {"name": "t", "kind": "kart", "mass": "45 kg"}}
    (finding,) = pack.run("my-club.vehicle-mass", heavy)
    assert finding.severity is Severity.FIX
    assert finding.remedy == "bring the vehicle's mass to 30 kg or less"
    assert finding.sources[0].citation.startswith("Example limit of the my-club pack")


def test_the_sample_build_shows_the_packs_finding_in_a_review(new_pack, capsys) -> None:
    folder = new_pack("my-club")
    status = main(
        ["review", str(folder / "sample_build.toml"), "--rules", str(_single_file(folder))]
    )
    out = capsys.readouterr().out
    assert status == 1  # the sample gives only the vehicle: the built-in rules are unassessed
    assert "**FIX** my-club.vehicle-mass, vehicle (34 kg, limit ≤ 30 kg" in out


def _single_file(folder: Path) -> Path:
    """The pack as one file, for --rules: its package re-exported under its name."""
    path = folder / "my-club.py"
    path.write_text(
        "from firstride_my_club import firstride_pack_limits, firstride_register_rules  # noqa\n",
        encoding="utf-8",
    )
    return path


def test_the_packs_own_tests_pass(new_pack) -> None:
    folder = new_pack("harbour-lane")
    result = subprocess.run(
        [sys.executable, "-m", "pytest", "-q", "-p", "no:cacheprovider", "tests"],
        cwd=folder,
        env={"PYTHONPATH": str(folder), "PATH": ""},
        capture_output=True,
        text=True,
        timeout=120,
    )
    assert result.returncode == 0, result.stdout + result.stderr
    assert "5 passed" in result.stdout


def test_the_pack_is_lint_and_format_clean(new_pack) -> None:
    folder = new_pack("harbour-lane")
    ruff = Path(sys.executable).with_name("ruff")
    if not ruff.exists():
        pytest.skip("ruff is not installed next to this Python")
    for command in (["check", "--no-cache"], ["format", "--check", "--no-cache"]):
        result = subprocess.run(
            [str(ruff), *command, str(folder)], capture_output=True, text=True, timeout=60
        )
        assert result.returncode == 0, result.stdout + result.stderr


def test_new_pack_never_overwrites(tmp_path: Path, monkeypatch, capsys) -> None:
    monkeypatch.chdir(tmp_path)
    (tmp_path / "my-club").mkdir()
    (tmp_path / "my-club" / "notes.txt").write_text("mine", encoding="utf-8")
    assert main(["new-pack", "my-club"]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "never overwrites" in err[0]
    assert [p.name for p in (tmp_path / "my-club").iterdir()] == ["notes.txt"]
    assert [p.name for p in tmp_path.iterdir()] == ["my-club"]  # no half-written staging


@pytest.mark.parametrize("name", ["My_Club", "9lives", "club-", "a--b", "core", "x" * 41, ""])
def test_new_pack_refuses_names_that_cannot_prefix_a_rule_id(
    name: str, tmp_path: Path, monkeypatch, capsys
) -> None:
    monkeypatch.chdir(tmp_path)
    assert main(["new-pack", name]) == 2
    assert len(capsys.readouterr().err.strip().splitlines()) == 1
    assert list(tmp_path.iterdir()) == []


def test_new_pack_into_another_folder(tmp_path: Path, capsys) -> None:
    assert main(["new-pack", "clubone", "--directory", str(tmp_path)]) == 0
    assert (tmp_path / "clubone" / "firstride_clubone" / "rules.py").is_file()
    assert f"pip install -e {tmp_path / 'clubone'}" in capsys.readouterr().out
    assert main(["new-pack", "clubtwo", "--directory", str(tmp_path / "absent")]) == 2


def test_generated_rule_severities_at_the_limit(new_pack) -> None:
    new_pack("clubthree")
    import firstride_clubthree

    pack = load_pack(firstride_clubthree, "clubthree")
    at_limit = {"vehicle": {"name": "t", "kind": "kart", "mass": "30 kg"}}
    assert severities(pack.run("clubthree.vehicle-mass", at_limit)) == [Severity.PASS]
