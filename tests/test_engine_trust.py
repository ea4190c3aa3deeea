"""The engine trusts no rule: a finding that contradicts itself, a severity that is not one, a
non-finite number, an exception of any kind, a flood of findings, a review that runs out of
time or a rule that prints are each made harmless, and never a ``go``."""

from __future__ import annotations

import math
import time
from dataclasses import dataclass
from pathlib import Path

import pytest

from reviewer import engine
from reviewer.cli import main
from reviewer.engine import review
from reviewer.finding_checks import MAX_FINDINGS, finding_problem
from reviewer.findings import Comparison, Finding, Severity, Source, Verdict
from reviewer.profile import parse_profile
from reviewer.rule import Rule
from reviewer.testing import make_build
from reviewer.units import quantity
from reviewer.watchdog import ReviewTimeout, call_each_with_budget

SOURCE = (Source.common_practice("test rule"),)
BUILD = make_build({})


def _profile(budget: str = "2 s"):
    text = (
        f'[profile]\nname = "t"\nmandatory_rules = ["test.rule"]\nrule_time_budget = "{budget}"\n'
    )
    return parse_profile(text, "trust-profile.toml")


def _rule(check, rule_id: str = "test.rule") -> Rule:
    return Rule(id=rule_id, title="a rule under test", check=check, sources=SOURCE)


def _review_of(check, budget: str = "2 s"):
    return review(BUILD, _profile(budget), [_rule(check)])


def _one(*findings):
    def check(build, profile):
        """Gives the findings it was made with."""
        yield from findings

    return check


AMPS = quantity(5.0, "A")
LIMIT = quantity(10.0, "A")


@pytest.mark.parametrize(
    ("finding", "reason"),
    [
        (Finding("pass", "x", "y"), "severity is 'pass'"),  # type: ignore[arg-type]
        (Finding(None, "x", "y"), "severity is None"),  # type: ignore[arg-type]
        (Finding(Severity.PASS, "x", "y", measured=quantity(math.nan, "A")), "not finite"),
        (
            Finding(Severity.PASS, "x", "y", measured=quantity(math.inf, "A"), limit=LIMIT),
            "not finite",
        ),
        (Finding(Severity.FIX, "x", "y", limit=quantity(-math.inf, "A")), "not finite"),
        (
            Finding(Severity.PASS, "x", "y", measured=quantity(12.0, "A"), limit=LIMIT),
            "above its limit",
        ),
        (
            Finding(
                Severity.PASS, "x", "y", measured=AMPS, limit=LIMIT, comparison=Comparison.AT_LEAST
            ),
            "below its limit",
        ),
        (Finding(Severity.PASS, "x", "y", measured=AMPS, limit=quantity(3.0, "V")), "same kind"),
        (Finding(Severity.PASS, 7, "y"), "subject is 7"),  # type: ignore[arg-type]
        (Finding(Severity.PASS, "x", "y", measured=5.0), "not a quantity or text"),  # type: ignore[arg-type]
        (Finding(Severity.PASS, "x", "y", sources=("a citation",)), "Source objects"),  # type: ignore[arg-type]
        (Finding(Severity.PASS, "x", "y", comparison="at most"), "comparison"),  # type: ignore[arg-type]
    ],
)
def test_an_untrustworthy_finding_becomes_unassessed_with_the_reason(finding, reason) -> None:
    assert reason in (finding_problem(finding) or "")
    result = _review_of(_one(finding))
    (shown,) = result.findings
    assert shown.severity is Severity.UNASSESSED and reason in shown.rationale
    assert result.verdict is Verdict.INCOMPLETE


def test_a_pass_on_its_limit_or_within_rounding_stays_a_pass() -> None:
    on_the_limit = Finding(Severity.PASS, "x", "y", measured=LIMIT, limit=LIMIT)
    rounding = Finding(Severity.PASS, "x", "y", measured=quantity(10.0 + 1e-12, "A"), limit=LIMIT)
    other_unit = Finding(Severity.PASS, "x", "y", measured=quantity(9999.0, "mA"), limit=LIMIT)
    for finding in (on_the_limit, rounding, other_unit):
        assert finding_problem(finding) is None
    result = _review_of(_one(on_the_limit, rounding, other_unit))
    assert [f.severity for f in result.findings] == [Severity.PASS] * 3
    assert result.verdict is Verdict.GO


def test_a_pass_just_past_its_limit_in_another_unit_is_caught() -> None:
    finding = Finding(Severity.PASS, "x", "y", measured=quantity(10_001.0, "mA"), limit=LIMIT)
    assert "above its limit" in (finding_problem(finding) or "")


def test_a_temperature_pass_is_judged_on_the_kelvin_scale() -> None:
    hot = Finding(
        Severity.PASS, "x", "y", measured=quantity(130.0, "degC"), limit=quantity(125.0, "degC")
    )
    cool = Finding(
        Severity.PASS, "x", "y", measured=quantity(300.0, "kelvin"), limit=quantity(125.0, "degC")
    )
    assert "above its limit" in (finding_problem(hot) or "")
    assert finding_problem(cool) is None  # 300 K is 26.85 degC (ITS-90: 0 degC = 273.15 K)


def test_a_rule_cannot_waive_its_own_stop() -> None:
    from datetime import date

    from reviewer.waivers import Waiver

    waiver = Waiver(
        rule="test.rule", subject="x", justification="j", accepted_by="me", date=date(2026, 1, 1)
    )
    result = _review_of(_one(Finding(Severity.STOP, "x", "y", waiver=waiver)))
    assert result.findings[0].severity is Severity.UNASSESSED
    assert result.verdict is Verdict.INCOMPLETE


def test_a_finding_subclass_is_read_once_as_a_plain_finding() -> None:
    @dataclass(frozen=True)
    class Shifty(Finding):
        @property
        def sort_key(self):  # would crash the sorting
            raise RuntimeError("no")

    result = _review_of(_one(Shifty(Severity.PASS, "x", "y")))
    assert type(result.findings[0]) is Finding and result.verdict is Verdict.GO


class Custom(BaseException):
    """Not an Exception: ``except Exception`` does not catch it."""


@pytest.mark.parametrize("budget", ["2 s", "0 s"])  # on the worker thread and inline
@pytest.mark.parametrize(
    "raised",
    [SystemExit(0), SystemExit(3), KeyboardInterrupt(), GeneratorExit(), Custom("deep")],
    ids=["exit0", "exit3", "interrupt", "generator-exit", "custom"],
)
def test_any_base_exception_from_a_rule_is_fenced(raised, budget) -> None:
    def check(build, profile):
        """Raises something that is not an Exception."""
        raise raised
        yield

    result = _review_of(check, budget)
    (shown,) = result.findings
    assert shown.severity is Severity.UNASSESSED
    assert type(raised).__name__ in shown.rationale
    assert result.verdict is Verdict.INCOMPLETE


def test_a_flood_of_findings_is_capped_with_the_worst_kept() -> None:
    passes = [Finding(Severity.PASS, f"item {i}", "fine") for i in range(1000)]
    stop = Finding(Severity.STOP, "the last item", "a stop hidden at the end")
    result = _review_of(_one(*passes, stop))
    assert len(result.findings) == MAX_FINDINGS + 1
    assert any(f.severity is Severity.STOP for f in result.findings)
    note = next(f for f in result.findings if f.severity is Severity.UNASSESSED)
    assert "1001 findings" in note.rationale
    assert result.verdict is Verdict.NO_GO
    only_passes = _review_of(_one(*passes))
    assert only_passes.verdict is Verdict.INCOMPLETE  # what was not shown was not reviewed


def test_an_endless_rule_is_cut_off_by_the_output_cap() -> None:
    def check(build, profile):
        """Never stops giving passes."""
        while True:
            yield Finding(Severity.PASS, "again", "and again")

    result = _review_of(check)
    assert result.verdict is Verdict.INCOMPLETE
    assert len(result.findings) == MAX_FINDINGS + 1


def test_the_whole_review_has_a_time_budget(monkeypatch) -> None:
    def slow():
        time.sleep(0.15)
        return "done"

    outcomes = call_each_with_budget([slow] * 5, budget_s=2.0, total_s=0.4)
    errors = [o.error for o in outcomes]
    assert [o.value for o in outcomes[:2]] == ["done", "done"]
    assert all(isinstance(e, ReviewTimeout) for e in errors[3:])
    inline = call_each_with_budget([slow] * 5, budget_s=0, total_s=0.2)
    assert isinstance(inline[-1].error, ReviewTimeout)

    monkeypatch.setattr(engine, "DEFAULT_REVIEW_BUDGET_S", 0.3)

    def sleepy(build, profile):
        """Takes a while."""
        time.sleep(0.2)
        yield Finding(Severity.PASS, "x", "y")

    rules = [_rule(sleepy, f"test.rule{i}") for i in range(4)]
    result = review(BUILD, _profile(), rules)
    late = [f for f in result.findings if "whole time budget" in f.rationale]
    assert late and result.verdict is Verdict.INCOMPLETE


PRINTING_PACK = '''
import sys
from reviewer import hookimpl
from reviewer.findings import Finding, Severity, Source
from reviewer.rule import Rule

print("LOADING PACK TEXT")


def check(build, profile):
    """Prints while it runs, and closes stdout for good measure."""
    print("RULE TEXT ON STDOUT")
    sys.stdout.close()
    yield Finding(Severity.PASS, "whole vehicle", "nothing to see")


@hookimpl
def firstride_register_rules():
    return [Rule(id="noisy.print", title="Prints", check=check,
                 sources=(Source.common_practice("test pack"),))]
'''


def test_stdout_carries_the_review_alone(tmp_path: Path, capsys) -> None:
    pack = tmp_path / "noisy.py"
    pack.write_text(PRINTING_PACK, "utf-8")
    build = tmp_path / "b.toml"
    build.write_text('[vehicle]\nname = "Quiet"\nkind = "kart"\n', "utf-8")
    main(["review", str(build), "--rules", str(pack), "--format", "json"])
    captured = capsys.readouterr()
    import json

    json.loads(captured.out)  # the whole of stdout is the review
    assert "TEXT" not in captured.out
    assert "LOADING PACK TEXT" in captured.err and "RULE TEXT ON STDOUT" in captured.err
