"""Tests of the Millrace Park Riders pack, written with firstride's helpers for pack authors.

Run them after `pip install -e examples/millrace` with `python -m pytest examples/millrace/tests`.
"""

from __future__ import annotations

from pathlib import Path

import firstride_millrace
import pytest

from reviewer.errors import InputError
from reviewer.findings import Severity, Verdict
from reviewer.loader import load_build, parse_build
from reviewer.testing import load_pack, profile_from, severities

HERE = Path(__file__).resolve().parent.parent
CLUB_PROFILE = HERE / "club-profile.toml"
BOARD = HERE / "builds" / "mountainboard.toml"
PACK = load_pack(firstride_millrace, "millrace")
CLUB = load_pack(firstride_millrace, "millrace", profile=CLUB_PROFILE)


def board(**inputs: object) -> dict:
    return {"vehicle": {"name": "t", "kind": "skateboard"}, "extensions": {"millrace": inputs}}


def test_pack_registers_both_rules_with_its_prefix() -> None:
    assert set(PACK.rules) == {"millrace.kill-switch", "millrace.deck-height"}


# --- millrace.kill-switch ----------------------------------------------------------------------


@pytest.mark.parametrize(
    ("inputs", "expected"),
    [
        ({"kill_switch_lanyard": False}, [Severity.STOP]),  # club rules 2.1 (invented club)
        ({"kill_switch_lanyard": True, "kill_switch_cuts": "throttle-signal"}, [Severity.FIX]),
        ({"kill_switch_lanyard": True, "kill_switch_cuts": "motor-power"}, [Severity.PASS]),
    ],
)
def test_kill_switch_severities(inputs: dict, expected: list[Severity]) -> None:
    assert severities(PACK.run("millrace.kill-switch", board(**inputs))) == expected


def test_missing_kill_switch_input_names_the_field() -> None:
    (finding,) = PACK.run("millrace.kill-switch", {"vehicle": {"name": "t", "kind": "kart"}})
    assert finding.severity is Severity.UNASSESSED
    assert finding.missing == ("extensions.millrace.kill_switch_lanyard",)


@pytest.mark.parametrize(
    ("chemistry", "series", "rating", "expected"),
    [
        # Linden, Handbook of Batteries: Li-ion full charge 4.2 V per cell (from memory):
        # 10S is 42 V, so a 32 V switch falls short and a 48 V one does not.
        ("li-ion", 10, "32 V", Severity.FIX),
        ("li-ion", 10, "48 V", Severity.PASS),
        ("li-ion", 10, "42 V", Severity.PASS),  # exactly at the limit
        # Linden: LiFePO4 full charge 3.65 V per cell (from memory): 16S is 58.4 V.
        ("lifepo4", 16, "48 V", Severity.FIX),
        ("lifepo4", 16, "60 V", Severity.PASS),
    ],
)
def test_switch_rating_against_full_pack_voltage(chemistry, series, rating, expected) -> None:
    data = board(
        kill_switch_lanyard=True, kill_switch_cuts="motor-power", kill_switch_voltage_rating=rating
    )
    data["battery"] = {"chemistry": chemistry, "cells_series": series}
    findings = PACK.run("millrace.kill-switch", data)
    rated = [f for f in findings if f.subject == "kill switch voltage rating"]
    assert severities(rated) == [expected]
    if expected is Severity.FIX:
        full = {"li-ion": "42 V", "lifepo4": "58.4 V"}[chemistry]
        assert f"rated at least {full} DC" in (rated[0].remedy or "")


# --- millrace.deck-height ----------------------------------------------------------------------


@pytest.mark.parametrize(
    ("height", "expected"),
    [
        ("140 mm", Severity.PASS),
        ("160 mm", Severity.PASS),  # exactly the club's 160 mm (club rules 4.3, invented club)
        ("161 mm", Severity.FIX),
        # 1 in = 25.4 mm exactly (international yard and pound agreement, 1959): 6.5 in is
        # 165.1 mm, over 160 mm; 6 in is 152.4 mm, under it.
        ("6.5 in", Severity.FIX),
        ("6 in", Severity.PASS),
    ],
)
def test_deck_height(height: str, expected: Severity) -> None:
    findings = PACK.run("millrace.deck-height", board(deck_height=height))
    assert severities(findings) == [expected]


def test_deck_height_limit_can_be_set_by_a_profile() -> None:
    stricter = profile_from(
        '[profile]\nname = "event"\nextends = "default"\n'
        '[limits.millrace.deck_height.max]\nvalue = "120 mm"\n'
        'source = "event rules (invented)"\nstatus = "common practice"\n'
    )
    findings = PACK.run("millrace.deck-height", board(deck_height="140 mm"), profile=stricter)
    assert severities(findings) == [Severity.FIX]
    assert findings[0].limit.m_as("mm") == pytest.approx(120)


def test_deck_height_is_for_boards_only_and_needs_its_input() -> None:
    scooter = PACK.run("millrace.deck-height", {"vehicle": {"name": "t", "kind": "scooter"}})
    assert severities(scooter) == [Severity.PASS]
    (missing,) = PACK.run("millrace.deck-height", board())
    assert missing.missing == ("extensions.millrace.deck_height",)


# --- the pack's inputs are validated before any rule runs -------------------------------------


@pytest.mark.parametrize(
    ("inputs", "field"),
    [
        ({"deck_height": "140 V"}, "extensions.millrace.deck_height"),
        ({"deck_hieght": "140 mm"}, "extensions.millrace.deck_hieght"),
        ({"kill_switch_cuts": "the throttle"}, "extensions.millrace.kill_switch_cuts"),
    ],
)
def test_bad_inputs_are_input_errors_naming_the_field(inputs: dict, field: str) -> None:
    with pytest.raises(InputError) as caught:
        PACK.run("millrace.deck-height", board(**inputs))
    assert caught.value.field == field


# --- the club's profile over the sample build ------------------------------------------------


def test_club_rules_pass_on_the_sample_board() -> None:
    build = load_build(BOARD).build
    club = CLUB.review(build)
    ours = [f for f in club.findings if f.rule_id.startswith("millrace.")]
    assert {f.rule_id for f in ours} == {"millrace.kill-switch", "millrace.deck-height"}
    assert set(severities(ours)) == {Severity.PASS}
    assert not club.problems
    # The club's rules add nothing to act on: the verdict is the built-in rules' own.
    assert club.verdict is PACK.review(build).verdict


def _speed_findings(result):
    return [f for f in result.findings if f.rule_id == "speed.rider-class"]


def test_club_junior_speed_limit_is_tighter_than_the_default() -> None:
    text = BOARD.read_text("utf-8")
    text = text.replace('class = "adult"', 'class = "youth"').replace('"78 kg"', '"45 kg"')
    text = text.replace("[controller]\n", '[controller]\nmax_duty = "70 %"\n')
    build = parse_build(text.encode(), "junior board").build
    # About 16 km/h for this rider: within the default youth limit of 20 km/h, over the club's
    # 15 km/h (club rules 3.2, invented club); a youth over the limit is a stop.
    assert severities(_speed_findings(PACK.review(build))) == [Severity.PASS]
    assert severities(_speed_findings(CLUB.review(build))) == [Severity.STOP]
    assert CLUB.review(build).verdict is Verdict.NO_GO


def test_club_profile_escalates_an_ingress_shortfall_to_stop() -> None:
    text = BOARD.read_text("utf-8").replace('electronics_ip = "IP55"', 'electronics_ip = "IP43"')
    build = parse_build(text.encode(), "damp board").build
    # IEC 60529 clause 6: water digit 3 (spray) falls short of 4 (splashing), the default
    # minimum for damp riding: a fix under the default profile, a stop under the club's.
    default = [f for f in PACK.review(build).findings if f.subject == "electronics enclosure"]
    club = [f for f in CLUB.review(build).findings if f.subject == "electronics enclosure"]
    assert severities(default) == [Severity.FIX]
    assert severities(club) == [Severity.STOP]
    assert "escalates" in club[0].rationale
