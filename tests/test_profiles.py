"""Profiles that build on others, change a rule's severity or switch a rule off (only with a
recorded justification), and the errors a profile author can make."""

from __future__ import annotations

import datetime
from pathlib import Path

import pytest

from reviewer.cli import main
from reviewer.engine import review
from reviewer.errors import InputError
from reviewer.findings import Finding, Severity, Source, Verdict
from reviewer.profile import load_profile, parse_profile
from reviewer.report import render_markdown
from reviewer.rule import Rule
from reviewer.session import built_in_profile
from reviewer.testing import make_build, severities

SOURCES = (Source.common_practice("test rule"),)
BUILD = make_build({})


def _rule(rule_id: str, *found: Severity) -> Rule:
    def check(build, profile):
        """Yields the given severities, one subject each."""
        for index, severity in enumerate(found):
            yield Finding(severity, f"subject {index}", f"gave {severity.value}")

    return Rule(id=rule_id, title=rule_id, check=check, sources=SOURCES)


@pytest.fixture
def write(tmp_path: Path):
    def write(name: str, text: str) -> Path:
        path = tmp_path / name
        path.parent.mkdir(parents=True, exist_ok=True)
        path.write_text(text, encoding="utf-8")
        return path

    return write


LIMIT = '[limits.{key}]\nvalue = "{value}"\nsource = "{source}"\nstatus = "common practice"\n'


# --- extends --------------------------------------------------------------------------------


def test_extending_the_built_in_profile_inherits_and_overrides(write) -> None:
    path = write(
        "club.toml",
        '[profile]\nname = "club"\nextends = "default"\nmandatory_rules = ["club.extra"]\n'
        + LIMIT.format(key="speed.max_speed.youth", value="15 km/h", source="club rule 3"),
    )
    base, club = built_in_profile(), built_in_profile(path)
    assert club.name == "club" and club.extends == ("(built-in) default.toml",)
    assert club.limit("speed.max_speed.youth").magnitude("km/h") == pytest.approx(15)
    assert club.limit("speed.max_speed.youth").source.citation == "club rule 3"
    adult = "speed.max_speed.adult"
    assert club.limit(adult).value == base.limit(adult).value  # inherited, with its source
    assert club.limit(adult).source == base.limit(adult).source
    assert club.mandatory_rules == (*base.mandatory_rules, "club.extra")
    assert club.fingerprint not in (base.fingerprint, "")


def test_extends_follows_relative_paths_through_several_levels(write) -> None:
    write(
        "shared/region.toml",
        '[profile]\nname = "region"\nextends = "default"\n'
        + LIMIT.format(key="speed.max_speed.adult", value="20 km/h", source="region"),
    )
    write(
        "shared/club.toml",
        '[profile]\nname = "club"\nextends = "region.toml"\nrequired_packs = ["clubone"]\n',
    )
    event = write(
        "event.toml",
        '[profile]\nname = "event"\nextends = "shared/club.toml"\n'
        'required_packs = ["clubtwo"]\n'
        + LIMIT.format(key="speed.max_speed.child", value="8 km/h", source="event"),
    )
    profile = load_profile(event)
    assert profile.limit("speed.max_speed.adult").magnitude("km/h") == pytest.approx(20)
    assert profile.limit("speed.max_speed.child").magnitude("km/h") == pytest.approx(8)
    assert profile.required_packs == ("clubone", "clubtwo")
    assert [Path(p).name for p in profile.extends[:2]] == ["club.toml", "region.toml"]


def test_a_cycle_in_extends_is_an_input_error(write) -> None:
    write("a.toml", '[profile]\nname = "a"\nextends = "b.toml"\n')
    b = write("b.toml", '[profile]\nname = "b"\nextends = "a.toml"\n')
    with pytest.raises(InputError, match="no cycle") as caught:
        load_profile(b)
    assert caught.value.field == "profile.extends"


def test_a_profile_extending_itself_is_a_cycle(write) -> None:
    path = write("self.toml", '[profile]\nname = "self"\nextends = "self.toml"\n')
    with pytest.raises(InputError, match="no cycle"):
        load_profile(path)


def test_missing_parent_is_an_input_error_naming_the_child(write) -> None:
    path = write("club.toml", '[profile]\nname = "club"\nextends = "nowhere.toml"\n')
    with pytest.raises(InputError) as caught:
        load_profile(path)
    assert caught.value.file == str(path) and caught.value.field == "profile.extends"


def test_override_must_keep_the_kind_of_value(write) -> None:
    path = write(
        "club.toml",
        '[profile]\nname = "club"\nextends = "default"\n'
        + LIMIT.format(key="speed.max_speed.adult", value="25 kg", source="typo"),
    )
    with pytest.raises(InputError, match="same kind"):
        built_in_profile(path)


@pytest.mark.parametrize(
    ("text", "field"),
    [
        ('[profile]\nname = "x"\nrequired_pack = ["a"]\n', "profile.required_pack"),
        ('[profile]\nname = "x"\nrequired_packs = ["Bad Name"]\n', "profile.required_packs"),
        ('[profile]\nname = "x"\nrule_time_budget = "fast"\n', "profile.rule_time_budget"),
        ('[profile]\nname = "x"\nrule_time_budget = "2 V"\n', "profile.rule_time_budget"),
        ('[profile]\nname = "x"\nextends = 3\n', "profile.extends"),
    ],
)
def test_profile_mistakes_are_input_errors(text: str, field: str) -> None:
    with pytest.raises(InputError) as caught:
        parse_profile(text, "x.toml")
    assert caught.value.field == field


def test_misspelt_top_level_table_is_an_input_error() -> None:
    text = '[profile]\nname = "x"\n' + LIMIT.format(key="speed.max", value="1 km/h", source="s")
    with pytest.raises(InputError, match="did you mean 'limits'"):
        parse_profile(text.replace("[limits.", "[limit."), "x.toml")


def test_misspelt_profile_key_gets_a_suggestion() -> None:
    with pytest.raises(InputError, match="did you mean 'required_packs'"):
        parse_profile('[profile]\nname = "x"\nrequired_pack = ["a"]\n', "x.toml")


def test_rule_time_budget_is_a_duration_and_is_inherited(write) -> None:
    parent = write("p.toml", '[profile]\nname = "p"\nrule_time_budget = "500 ms"\n')
    child = write("c.toml", '[profile]\nname = "c"\nextends = "p.toml"\n')
    assert load_profile(parent).rule_time_budget == pytest.approx(0.5)
    assert load_profile(child).rule_time_budget == pytest.approx(0.5)
    assert load_profile().rule_time_budget == pytest.approx(2.0)


# --- escalate_to ----------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("target", "found", "expected"),
    [
        ("stop", Severity.FIX, Severity.STOP),
        ("stop", Severity.ADVISE, Severity.STOP),
        ("fix", Severity.ADVISE, Severity.FIX),
        ("fix", Severity.STOP, Severity.STOP),  # never lowered
        ("stop", Severity.PASS, Severity.PASS),  # a pass stays a pass
        ("stop", Severity.UNASSESSED, Severity.UNASSESSED),
    ],
)
def test_escalate_to_raises_only_fix_and_advise(target, found, expected) -> None:
    profile = parse_profile(
        f'[profile]\nname = "club"\n[rules."club.check"]\nescalate_to = "{target}"\n', "c.toml"
    )
    result = review(BUILD, profile, [_rule("club.check", found)])
    assert severities(result.findings) == [expected]
    if expected is not found:
        assert "profile 'club' escalates this rule" in result.findings[0].rationale


def test_escalation_changes_the_verdict() -> None:
    profile = parse_profile(
        '[profile]\nname = "club"\n[rules."club.check"]\nescalate_to = "stop"\n', "c.toml"
    )
    assert review(BUILD, profile, [_rule("club.check", Severity.FIX)]).verdict is Verdict.NO_GO


def test_escalating_a_rule_no_pack_provides_makes_the_review_incomplete() -> None:
    profile = parse_profile(
        '[profile]\nname = "club"\n[rules."club.chek"]\nescalate_to = "stop"\n', "c.toml"
    )
    result = review(BUILD, profile, [_rule("club.check", Severity.PASS)])
    assert result.verdict is Verdict.INCOMPLETE
    assert any("escalates rule club.chek" in f.rationale for f in result.findings)


# --- switching a rule off -------------------------------------------------------------------

OFF = """
[profile]
name = "club"
mandatory_rules = ["club.check", "club.other"]

[rules."club.check"]
enabled = false
justification = "Club karts carry no logic board"
by = "Safety officer (invented)"
date = 2025-03-01
"""


def test_switched_off_rule_does_not_run_and_the_review_says_why() -> None:
    profile = parse_profile(OFF, "club.toml")
    rules = [_rule("club.check", Severity.STOP), _rule("club.other", Severity.PASS)]
    result = review(BUILD, profile, rules)
    assert result.verdict is Verdict.GO  # the stop never ran; switched off is not mandatory
    assert [f.rule_id for f in result.findings] == ["club.other"]
    assert profile.mandatory_rules == ("club.other",)
    (setting,) = profile.switched_off
    assert setting.date == datetime.date(2025, 3, 1)
    text = render_markdown(result)
    assert "## Rules switched off by the profile" in text
    assert (
        "| club.check | Safety officer (invented) | 2025-03-01 | Club karts carry no logic board |"
        in text
    )


def test_no_section_when_nothing_is_switched_off() -> None:
    profile = parse_profile('[profile]\nname = "plain"\n', "plain.toml")
    text = render_markdown(review(BUILD, profile, [_rule("club.other", Severity.PASS)]))
    assert "switched off" not in text


@pytest.mark.parametrize("missing", ["justification", "by", "date"])
def test_switching_off_needs_justification_who_and_when(missing: str) -> None:
    lines = [line for line in OFF.splitlines() if not line.startswith(f"{missing} =")]
    with pytest.raises(InputError) as caught:
        parse_profile("\n".join(lines), "club.toml")
    assert caught.value.field == f"rules.club.check.{missing}"


@pytest.mark.parametrize(
    ("table", "field"),
    [
        ('enabled = false\njustification = " "\nby = "x"\ndate = 2025-01-01', "justification"),
        ('enabled = false\njustification = "j"\nby = "x"\ndate = "soon"', "date"),
        ('enabled = "no"', "enabled"),
        ('escalate_to = "worse"', "escalate_to"),
        ('escalate_to = "pass"', "escalate_to"),
        ('justification = "why"', "justification"),
        ('escalate_too = "stop"', "escalate_too"),
    ],
)
def test_rule_setting_mistakes_are_input_errors(table: str, field: str) -> None:
    with pytest.raises(InputError) as caught:
        parse_profile(f'[profile]\nname = "c"\n[rules."club.check"]\n{table}\n', "c.toml")
    assert caught.value.field == f"rules.club.check.{field}"


def test_a_child_can_switch_back_on_what_a_parent_switched_off(write) -> None:
    write("parent.toml", OFF)
    child = write(
        "child.toml",
        '[profile]\nname = "child"\nextends = "parent.toml"\n'
        '[rules."club.check"]\nescalate_to = "stop"\n',
    )
    profile = load_profile(child)
    assert profile.runs("club.check") and not profile.switched_off
    assert profile.mandatory_rules == ("club.check", "club.other")


def test_rules_command_shows_what_a_profile_does(write, capsys) -> None:
    path = write(
        "club.toml",
        '[profile]\nname = "club"\nextends = "default"\n'
        '[rules."logic.pin-current"]\nenabled = false\njustification = "no logic board"\n'
        'by = "officer"\ndate = 2025-03-01\n[rules."motor.cooling"]\nescalate_to = "stop"\n',
    )
    assert main(["rules", "--profile", str(path)]) == 0
    out = capsys.readouterr().out
    assert "(switched off by officer on 2025-03-01: no logic board)" in out
    assert "(fix and advise findings escalated to stop)" in out
