"""Fleet review: several builds in one command, each review the same bytes as a review alone."""

from __future__ import annotations

import json
import shutil
from pathlib import Path

import pytest

from reviewer.cli import main
from reviewer.errors import InputError
from reviewer.fleet import collect_builds, output_names

from .conftest import SAMPLES

BUILDS = sorted(SAMPLES.glob("*.toml"))


def _alone(path: Path, tmp_path: Path, form: str = "md") -> str:
    out = tmp_path / f"alone-{path.stem}.{form}"
    main(["review", str(path), "-o", str(out), "--format", form])
    return out.read_text(encoding="utf-8")


@pytest.mark.parametrize("jobs", ["1", "2"])
def test_each_fleet_review_is_the_review_alone(tmp_path: Path, jobs: str) -> None:
    folder = tmp_path / "out"
    status = main(["review", str(SAMPLES), "-o", str(folder), "--jobs", jobs])
    assert status == 1  # the fleet holds a no-go build: the worst status wins
    for build in BUILDS:
        assert (folder / f"{build.stem}.md").read_text(encoding="utf-8") == _alone(build, tmp_path)
    summary = (folder / "fleet-summary.md").read_text(encoding="utf-8")
    assert summary.count("\n| ") == len(BUILDS) + 1  # header and one row per build


def test_a_bad_build_is_a_row_and_the_others_still_run(tmp_path: Path, capsys) -> None:
    bad = tmp_path / "broken.toml"
    bad.write_text("[vehicle\n", encoding="utf-8")
    folder = tmp_path / "out"
    status = main(["review", str(BUILDS[0]), str(bad), "-o", str(folder), "--format", "json"])
    assert status == 2  # an unreadable build file is the worst outcome
    data = json.loads((folder / "fleet-summary.json").read_text(encoding="utf-8"))
    rows = {Path(row["source"]).name: row for row in data["builds"]}
    assert rows["broken.toml"]["verdict"] == "input error"
    assert "valid TOML" in rows["broken.toml"]["error"]
    assert rows[BUILDS[0].name]["review"] == f"{BUILDS[0].stem}.json"
    assert (folder / f"{BUILDS[0].stem}.json").is_file()
    assert not (folder / "broken.json").exists()
    assert "1 could not be read" in capsys.readouterr().err


def test_the_summary_names_the_first_action(tmp_path: Path) -> None:
    folder = tmp_path / "out"
    main(["review", str(SAMPLES), "-o", str(folder), "--format", "json"])
    data = json.loads((folder / "fleet-summary.json").read_text(encoding="utf-8"))
    for row in data["builds"]:
        if row["verdict"] == "go":  # a go may still carry advice, never more
            assert row["first_action"].split(":")[0] in ("", "advise")
        else:
            assert row["first_action"].split(":")[0] in ("stop", "fix", "unassessed")
        assert sum(row["counts"].values()) > 0


def test_html_summary_is_one_page_with_no_outside_reference(tmp_path: Path) -> None:
    folder = tmp_path / "out"
    main(["review", str(SAMPLES), "-o", str(folder), "--format", "html"])
    page = (folder / "fleet-summary.html").read_text(encoding="utf-8")
    assert page.startswith("<!DOCTYPE html>") and "<table>" in page
    assert "http://" not in page and "https://" not in page


def test_builds_of_the_same_name_are_told_apart_by_their_folders(tmp_path: Path) -> None:
    for member in ("alice", "bob"):
        (tmp_path / member).mkdir()
        shutil.copy(BUILDS[0], tmp_path / member / "board.toml")
    builds = collect_builds([tmp_path / "alice", tmp_path / "bob"])
    names = output_names(builds, "md")
    assert sorted(names.values()) == ["alice-board.md", "bob-board.md"]


def test_a_build_named_like_the_summary_gets_another_name(tmp_path: Path) -> None:
    (tmp_path / "club").mkdir()
    path = tmp_path / "club" / "fleet-summary.toml"
    shutil.copy(BUILDS[0], path)
    assert output_names([path], "md") == {path: "club-fleet-summary.md"}


@pytest.mark.parametrize(
    ("extra", "expected"),
    [
        ([], "a folder for the fleet's reviews (-o DIR)"),
        (["-o", "x", "--waivers", "w.toml"], "one build file"),
        (["-o", "x", "--since", "p.json"], "one build file"),
    ],
)
def test_fleet_usage_errors_are_one_line(tmp_path: Path, capsys, extra, expected) -> None:
    status = main(["review", str(BUILDS[0]), str(BUILDS[1]), *extra])
    err = capsys.readouterr().err
    assert status == 2 and expected in err and err.count("\n") == 1


def test_an_empty_folder_is_an_input_error(tmp_path: Path) -> None:
    with pytest.raises(InputError, match=r"at least one \.toml"):
        collect_builds([tmp_path])


def test_a_review_that_would_land_on_an_input_stops_the_fleet_before_any_review(
    tmp_path: Path, capsys
) -> None:
    # a build file named like another build's review: nothing is written, the input stays
    folder = tmp_path / "fleet"
    folder.mkdir()
    sample = (SAMPLES / "quayside-commuter.toml").read_bytes()
    (folder / "c.toml").write_bytes(sample)
    (folder / "a.md").write_bytes(sample)
    assert main(["review", str(folder / "c.toml"), str(folder / "a.md"), "-o", str(folder)]) == 2
    assert "not an input of this run" in capsys.readouterr().err
    assert sorted(p.name for p in folder.iterdir()) == ["a.md", "c.toml"]
    assert (folder / "a.md").read_bytes() == sample
