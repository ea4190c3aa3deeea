"""The engine fails closed: a rule that crashes, lies or lacks data never lets a review pass."""

from __future__ import annotations

import pytest

from reviewer import hookimpl
from reviewer.engine import review
from reviewer.findings import Finding, Severity, Source, Verdict
from reviewer.plugins import PackManager
from reviewer.profile import load_profile, parse_profile
from reviewer.rule import Rule
from reviewer.session import default_profile
from reviewer.testing import make_build

SOURCE = (Source.common_practice("test rule"),)
PROFILE = parse_profile(
    '[profile]\nname = "test"\nmandatory_rules = ["test.ok"]\n', "test-profile.toml"
)


def _rule(rule_id: str, check) -> Rule:
    return Rule(id=rule_id, title=f"title of {rule_id}", check=check, sources=SOURCE)


def _passing(build, profile):
    """Always passes."""
    yield Finding(Severity.PASS, "whole vehicle", "nothing to see")


def _crashing(build, profile):
    """Raises."""
    raise ZeroDivisionError("boom")


def _wrong_type(build, profile):
    """Returns a string."""
    return ["not a finding"]


def _silent(build, profile):
    """Returns nothing."""
    return []


def _needs_limit(build, profile):
    """Reads a limit the profile lacks."""
    profile.limit("nowhere.to.be.found")
    yield Finding(Severity.PASS, "x", "y")


def _stop(build, profile):
    """Always stops."""
    yield Finding(Severity.STOP, "whole vehicle", "stopped")


BUILD = make_build({})


def test_passing_mandatory_rule_gives_go() -> None:
    result = review(BUILD, PROFILE, [_rule("test.ok", _passing)])
    assert result.verdict is Verdict.GO


@pytest.mark.parametrize("check", [_crashing, _wrong_type, _silent, _needs_limit])
def test_faulty_optional_rule_makes_review_incomplete(check) -> None:
    result = review(BUILD, PROFILE, [_rule("test.ok", _passing), _rule("test.bad", check)])
    assert result.verdict is Verdict.INCOMPLETE
    bad = [f for f in result.findings if f.rule_id == "test.bad"]
    assert [f.severity for f in bad] == [Severity.UNASSESSED]
    assert bad[0].error


def test_crash_error_is_named_in_the_finding() -> None:
    result = review(BUILD, PROFILE, [_rule("test.ok", _crashing)])
    assert "ZeroDivisionError: boom" in result.findings[0].rationale


def test_missing_mandatory_rule_makes_review_incomplete() -> None:
    result = review(BUILD, PROFILE, [])
    assert result.verdict is Verdict.INCOMPLETE
    assert result.findings[0].rule_id == "test.ok"


def test_stop_outranks_incomplete() -> None:
    result = review(BUILD, PROFILE, [_rule("test.ok", _crashing), _rule("test.stop", _stop)])
    assert result.verdict is Verdict.NO_GO


def test_unassessed_mandatory_finding_makes_review_incomplete() -> None:
    def partly(build, profile):
        """One subject assessed, one not."""
        yield Finding(Severity.PASS, "a", "ok")
        yield Finding(Severity.UNASSESSED, "b", "no data", missing=("x.y",))

    result = review(BUILD, PROFILE, [_rule("test.ok", partly)])
    assert result.verdict is Verdict.INCOMPLETE


def test_findings_are_sorted_worst_first_then_by_rule() -> None:
    def mixed(build, profile):
        """Mixed severities."""
        yield Finding(Severity.PASS, "b", "ok")
        yield Finding(Severity.FIX, "a", "fix")
        yield Finding(Severity.STOP, "c", "stop")

    result = review(BUILD, PROFILE, [_rule("test.ok", mixed), _rule("test.aa", mixed)])
    order = [(f.severity, f.rule_id) for f in result.findings]
    assert order == sorted(order, key=lambda p: (p[0].rank, p[1]))
    assert order[0] == (Severity.STOP, "test.aa")


class _GoodPack:
    @hookimpl
    def firstride_register_rules(self):
        return [_rule("good.one", _passing)]


def test_pack_manager_collects_rules(pack_manager: PackManager) -> None:
    pack_manager.register(_GoodPack(), "good", "1.0")
    rules = pack_manager.rules()
    assert [(r.id, r.pack, r.pack_version) for r in rules] == [("good.one", "good", "1.0")]


def test_misspelled_hook_is_an_error(pack_manager: PackManager) -> None:
    class Misspelled:
        @hookimpl
        def firstride_register_rule(self):  # missing the final s
            return []

    with pytest.raises(Exception, match="unknown hook"):
        pack_manager.register(Misspelled(), "typo")


def test_duplicate_and_invalid_rules_are_refused(pack_manager: PackManager) -> None:
    class Duplicate:
        @hookimpl
        def firstride_register_rules(self):
            return [_rule("good.one", _passing)]

    class NoSource:
        @hookimpl
        def firstride_register_rules(self):
            return [Rule(id="bad.rule", title="t", check=_passing, sources=())]

    pack_manager.register(_GoodPack(), "good")
    pack_manager.register(Duplicate(), "dup")
    pack_manager.register(NoSource(), "nosource")
    rules = pack_manager.rules()
    assert [r.id for r in rules] == ["good.one"]
    problems = {p.pack: p.error for p in pack_manager.problems}
    assert "already registered" in problems["dup"]
    assert "no source" in problems["nosource"]


def test_built_in_profile_sources_every_limit() -> None:
    assert not load_profile().limits  # the engine's profile: rules and metadata only
    profile = default_profile()  # over the built-in pack's limits
    assert profile.limits
    for limit in profile.limits.values():
        assert limit.source.citation
