"""Rule packs: discovery, registration checks, blocking, strictness, and a pack that goes wrong
in every way we could think of never losing other findings or turning a review `go`.

Installed packs are simulated with real distribution metadata (a ``*.dist-info`` folder with an
``entry_points.txt``) on ``sys.path``, so discovery goes through ``importlib.metadata`` exactly
as for a pip-installed pack.
"""

from __future__ import annotations

import itertools
import sys
import threading
import time
from pathlib import Path

import pytest

from reviewer import hookimpl
from reviewer.cli import main
from reviewer.engine import review
from reviewer.errors import InputError
from reviewer.findings import Finding, Severity, Source, Verdict
from reviewer.plugins import (
    BLOCK_ENVIRONMENT,
    PackError,
    PackManager,
    PackRefused,
    load_packs,
    rule_problems,
)
from reviewer.profile import parse_profile
from reviewer.report import render_markdown
from reviewer.rule import Rule
from reviewer.testing import load_pack, make_build, severities

ROOT = Path(__file__).resolve().parent.parent
EXAMPLE = ROOT / "examples" / "millrace"
_unique = itertools.count()

GOOD_PACK = '''
from reviewer import hookimpl
from reviewer.findings import Finding, Severity, Source
from reviewer.rule import Rule

__version__ = "2.3.4"


def check(build, profile):
    """Passes every build: a stand-in for a club's own check, for the loader's tests."""
    yield Finding(Severity.PASS, "whole vehicle", "nothing to see")


@hookimpl
def firstride_register_rules():
    return [Rule(id="{name}.always", title="Always passes", check=check,
                 sources=(Source.common_practice("test pack"),))]
'''


def _profile(extra: str = "", budget: str = "2 s"):
    text = f'[profile]\nname = "packs test"\nrule_time_budget = "{budget}"\n{extra}'
    return parse_profile(text, "packs-test.toml")


SOURCES = (Source.common_practice("test rule"),)


def _rule(rule_id: str, check) -> Rule:
    return Rule(id=rule_id, title=f"title of {rule_id}", check=check, sources=SOURCES)


def _passing(build, profile):
    """Always passes."""
    yield Finding(Severity.PASS, "whole vehicle", "fine")


class _Pack:
    """An inline pack holding the given rules."""

    def __init__(self, *rules: Rule) -> None:
        self._rules = list(rules)

    @hookimpl
    def firstride_register_rules(self):
        return self._rules


@pytest.fixture
def site(tmp_path: Path, monkeypatch: pytest.MonkeyPatch):
    """Install fake packs: ``site(pack_name, source)`` writes a module and its dist-info."""
    root = tmp_path / "site"
    root.mkdir()
    monkeypatch.syspath_prepend(str(root))
    modules: list[str] = []

    def install(name: str, source: str, version: str = "1.0") -> str:
        module = f"fake_pack_{name.replace('-', '_')}_{next(_unique)}"
        (root / f"{module}.py").write_text(source.replace("{name}", name), encoding="utf-8")
        info = root / f"{module}-{version}.dist-info"
        info.mkdir()
        (info / "METADATA").write_text(
            f"Metadata-Version: 2.1\nName: {module}\nVersion: {version}\n", encoding="utf-8"
        )
        (info / "entry_points.txt").write_text(
            f"[firstride.packs]\n{name} = {module}\n", encoding="utf-8"
        )
        modules.append(module)
        return module

    yield install
    for module in modules:
        sys.modules.pop(module, None)


# --- discovery ------------------------------------------------------------------------------


def test_installed_pack_is_found_with_its_version_and_origin(site) -> None:
    module = site("clubone", GOOD_PACK, version="2.3.4")
    manager = load_packs()
    rules = {rule.id: rule for rule in manager.rules()}
    assert rules["clubone.always"].pack == "clubone"
    assert rules["clubone.always"].pack_version == "2.3.4"
    assert module in manager.packs["clubone"].origin
    assert "wiring.stall-current" in rules  # the built-in pack, through the same door
    assert not manager.problems


def test_pack_raising_on_import_is_reported_and_the_others_still_run(site) -> None:
    site("crashy", "raise RuntimeError('half-installed dependency')\n")
    site("clubone", GOOD_PACK)
    manager = load_packs()
    ids = {rule.id for rule in manager.rules()}
    assert {"clubone.always", "speed.rider-class"} <= ids
    (problem,) = manager.problems
    assert problem.pack == "crashy"
    assert "RuntimeError: half-installed dependency" in problem.error


def test_pack_exiting_on_import_does_not_end_the_review(site) -> None:
    site("quitter", "import sys\nsys.exit(3)\n")
    manager = load_packs()
    assert [p.pack for p in manager.problems] == ["quitter"]
    assert "SystemExit" in manager.problems[0].error


def test_misspelled_hook_in_an_installed_pack_is_a_pack_problem(site) -> None:
    site("typo", GOOD_PACK.replace("def firstride_register_rules", "def firstride_register_rule"))
    manager = load_packs()
    (problem,) = manager.problems
    assert problem.pack == "typo"
    assert "unknown hook 'firstride_register_rule'" in problem.error
    assert "did you mean 'firstride_register_rules'" in problem.error
    assert "typo" not in {rule.pack for rule in manager.rules()}


def test_unmarked_hook_is_a_pack_problem(site) -> None:
    site("nomark", GOOD_PACK.replace("@hookimpl\n", ""))
    problem = load_packs().problems[0]
    assert "firstride_register_rules is not marked with @reviewer.hookimpl" in problem.error


def test_pack_importing_another_pack_module_is_not_mistaken_for_a_hook(site) -> None:
    site("reuser", "import firstride_rules\n" + GOOD_PACK)
    assert not load_packs().problems


def test_pack_name_must_be_a_slug(site) -> None:
    site("Club_One", GOOD_PACK)
    problem = load_packs().problems[0]
    assert "lowercase slug" in problem.error


def test_strict_mode_turns_a_pack_failure_into_one_input_error(site, capsys) -> None:
    site("crashy", "raise RuntimeError('boom')\n")
    with pytest.raises(PackError, match="crashy"):
        load_packs(strict=True)
    assert main(["rules", "--strict-packs"]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "RuntimeError: boom" in err[0] and "--strict-packs" in err[0]


def test_rules_command_reports_a_failed_pack_and_exits_1(site, capsys) -> None:
    site("crashy", "raise RuntimeError('boom')\n")
    assert main(["rules"]) == 1
    captured = capsys.readouterr()
    assert "rule pack crashy failed: RuntimeError: boom" in captured.err
    assert "speed.rider-class" in captured.out


# --- blocking -------------------------------------------------------------------------------


def test_blocked_pack_is_never_imported(site, tmp_path: Path) -> None:
    marker = tmp_path / "imported"
    site("noisy", f"open({str(marker)!r}, 'w').close()\n" + GOOD_PACK)
    manager = load_packs(blocked=["noisy"])
    assert not marker.exists()
    assert [(p.pack, p.blocked) for p in manager.problems] == [("noisy", True)]
    assert "noisy.always" not in {rule.id for rule in manager.rules()}


def test_environment_blocks_packs_too(site, monkeypatch: pytest.MonkeyPatch, capsys) -> None:
    site("crashy", "raise RuntimeError('boom')\n")
    site("clubone", GOOD_PACK)
    monkeypatch.setenv(BLOCK_ENVIRONMENT, " crashy , clubone")
    manager = load_packs()
    assert {p.pack for p in manager.problems if p.blocked} == {"crashy", "clubone"}
    assert main(["rules"]) == 0  # blocking is a choice, not a failure
    assert "rule pack crashy not loaded" in capsys.readouterr().err


def test_blocked_required_pack_makes_the_review_incomplete(site) -> None:
    site("clubone", GOOD_PACK)
    manager = load_packs(blocked=["clubone"])
    profile = _profile('required_packs = ["clubone"]\n')
    result = review(make_build({}), profile, manager.rules(), problems=manager.problems)
    assert result.verdict is Verdict.INCOMPLETE
    text = render_markdown(result)
    assert "Rule pack clubone was not loaded: blocked" in text
    assert "requires rule pack clubone, which was blocked" in text


# --- local files (--rules) ------------------------------------------------------------------


def test_local_file_is_a_pack_named_after_its_stem(tmp_path: Path, capsys) -> None:
    path = tmp_path / "clubtwo.py"
    path.write_text(GOOD_PACK.replace("{name}", "clubtwo"), encoding="utf-8")
    assert main(["rules", "--rules", str(path), "clubtwo.always"]) == 0
    out = capsys.readouterr().out
    assert out.startswith("clubtwo.always: Always passes")
    assert f"file {path.as_posix()}" in out
    assert "2.3.4" in out  # the module's __version__


def test_local_file_may_name_its_pack(tmp_path: Path) -> None:
    path = tmp_path / "my_rules.py"
    path.write_text('PACK_NAME = "clubthree"\n' + GOOD_PACK.replace("{name}", "clubthree"), "utf-8")
    manager = load_packs([path])
    assert "clubthree.always" in {rule.id for rule in manager.rules()}


def test_missing_local_file_is_an_input_error(capsys) -> None:
    assert main(["rules", "--rules", "no/such/pack.py"]) == 2
    assert "an existing Python file of rules" in capsys.readouterr().err


def test_local_file_that_raises_is_a_problem_named_after_it(tmp_path: Path) -> None:
    path = tmp_path / "broken.py"
    path.write_text("1 / 0\n", encoding="utf-8")
    manager = load_packs([path])
    assert [(p.pack, p.error) for p in manager.problems] == [
        ("broken", "ZeroDivisionError: division by zero")
    ]


def test_local_file_cannot_claim_the_built_in_name(tmp_path: Path) -> None:
    path = tmp_path / "core.py"
    path.write_text(GOOD_PACK.replace("{name}", "core"), encoding="utf-8")
    manager = load_packs([path])
    assert manager.problems[0].pack == "core"
    assert manager.packs["core"].origin.startswith("firstride_rules")


# --- registration checks --------------------------------------------------------------------


def test_rule_id_must_carry_the_pack_prefix(pack_manager: PackManager) -> None:
    pack_manager.register(_Pack(_rule("wiring.extra-check", _passing)), "clubone")
    assert pack_manager.rules() == []
    error = pack_manager.problems[0].error
    assert "rule 'wiring.extra-check'" in error
    assert "must start with the pack's name: 'clubone.extra-check'" in error


def test_built_in_pack_uses_area_prefixes() -> None:
    rule = _rule("wiring.extra-check", _passing)
    assert rule_problems(rule, "core") == []
    assert rule_problems(rule, "clubone") != []


@pytest.mark.parametrize(
    ("rule", "lack"),
    [
        (Rule(id="clubone.x", title=" ", check=_passing, sources=(Source("s"),)), "no title"),
        (
            Rule(id="clubone.x", title="t", check=lambda b, p: [], sources=(Source("s"),)),
            "no documentation",
        ),
        (Rule(id="clubone.x", title="t", check=_passing, sources=()), "no source"),
        (Rule(id="clubone.x", title="t", check=_passing, sources=("a text",)), "not a Source"),
        (
            Rule(id="clubone.x", title="t", check=_passing, sources=(Source("s", "published"),)),
            "no SourceStatus",
        ),
        (
            Rule(id="ClubOne.X", title="t", check=_passing, sources=(Source("s"),)),
            "lowercase dotted slug",
        ),
        (
            Rule(
                id="clubone.x",
                title="t",
                check=_passing,
                sources=(Source("s"),),
                severities=("stop",),
            ),
            "Severity members",
        ),
    ],
)
def test_incomplete_rule_refuses_its_pack_naming_rule_and_lack(
    pack_manager: PackManager, rule: Rule, lack: str
) -> None:
    pack_manager.register(_Pack(_rule("clubone.fine", _passing), rule), "clubone")
    assert pack_manager.rules() == []  # refused whole
    (problem,) = pack_manager.problems
    assert problem.pack == "clubone" and lack in problem.error and repr(rule.id) in problem.error


def test_duplicate_id_within_a_pack_is_refused(pack_manager: PackManager) -> None:
    pack_manager.register(
        _Pack(_rule("clubone.a", _passing), _rule("clubone.a", _passing)), "clubone"
    )
    pack_manager.register(_Pack(_rule("clubtwo.b", _passing)), "clubtwo")
    assert [r.id for r in pack_manager.rules()] == ["clubtwo.b"]  # nothing else lost
    assert "already registered" in pack_manager.problems[0].error


@pytest.mark.parametrize("returned", [None, "clubone.a", 42])
def test_register_hook_returning_a_non_list_is_a_problem(pack_manager, returned) -> None:
    class Odd:
        @hookimpl
        def firstride_register_rules(self):
            return returned

    pack_manager.register(Odd(), "clubone")
    assert pack_manager.rules() == []
    assert "not a list of rules" in pack_manager.problems[0].error


def test_pack_with_no_hook_at_all_is_refused(pack_manager: PackManager) -> None:
    with pytest.raises(PackRefused, match="implements no hook"):
        pack_manager.register(object(), "empty")
    assert not pack_manager.packs


def test_two_packs_cannot_share_a_name(pack_manager: PackManager) -> None:
    pack_manager.register(_Pack(_rule("clubone.a", _passing)), "clubone")
    with pytest.raises(PackRefused, match="already loaded"):
        pack_manager.register(_Pack(_rule("clubone.b", _passing)), "clubone")


# --- default limits and build inputs of a pack ----------------------------------------------

LIMITS_PACK = '''
from reviewer import hookimpl
from reviewer.findings import Finding, Severity
from reviewer.rule import Rule
from reviewer.findings import Source


def check(build, profile):
    """Compares the vehicle's mass with the pack's own limit, for the loader's tests."""
    limit = profile.limit("{name}.max_mass")
    mass = build.vehicle.mass.m_as("kg")
    yield Finding(Severity.FIX if mass > limit.magnitude("kg") else Severity.PASS,
                  "vehicle", "mass", measured=build.vehicle.mass, limit=limit.quantity,
                  sources=(limit.source,))


@hookimpl
def firstride_register_rules():
    return [Rule(id="{name}.mass", title="Mass", check=check,
                 sources=(Source.common_practice("test pack"),))]


@hookimpl
def firstride_pack_limits():
    return """
[limits.{name}.max_mass]
value = "20 kg"
source = "test pack limit"
status = "common practice"
"""
'''


def test_pack_default_limits_apply_and_a_profile_overrides_them(tmp_path: Path) -> None:
    path = tmp_path / "clubfour.py"
    path.write_text(LIMITS_PACK.replace("{name}", "clubfour"), encoding="utf-8")
    sys.path_importer_cache.clear()
    manager = load_packs([path])
    rules = [r for r in manager.rules() if r.id == "clubfour.mass"]
    build = make_build({"vehicle": {"name": "t", "kind": "kart", "mass": "25 kg"}})
    default = manager.complete_profile(_profile())
    assert severities(review(build, default, rules).findings) == [Severity.FIX]
    looser = manager.complete_profile(
        _profile('[limits.clubfour.max_mass]\nvalue = "30 kg"\nsource = "event"\n')
    )
    assert severities(review(build, looser, rules).findings) == [Severity.PASS]


def test_pack_limits_outside_its_own_name_are_refused(tmp_path: Path) -> None:
    text = LIMITS_PACK.replace("{name}", "clubfive").replace(
        "[limits.clubfive.max_mass]", "[limits.speed.max_speed.adult]"
    )
    path = tmp_path / "clubfive.py"
    path.write_text(text, encoding="utf-8")
    manager = load_packs([path])
    limits = manager.pack_limits()
    assert not any(key.startswith("clubfive.") for key in limits)
    # the built-in pack's own value stands; the refused pack's never arrived
    assert limits["speed.max_speed.adult"].source.citation.startswith("EN 17128")
    assert "not under limits.clubfive" in manager.problems[0].error


def test_pack_build_inputs_are_validated_before_the_review(capsys) -> None:
    pytest.importorskip("pydantic")
    sys.path.insert(0, str(EXAMPLE))
    try:
        import firstride_millrace

        pack = load_pack(firstride_millrace, "millrace")
        bad = {
            "vehicle": {"name": "t", "kind": "skateboard"},
            "extensions": {"millrace": {"deck_height": "tall"}},
        }
        with pytest.raises(InputError) as caught:
            pack.run("millrace.deck-height", bad)
        assert caught.value.field == "extensions.millrace.deck_height"
    finally:
        sys.path.remove(str(EXAMPLE))


# --- reliability: nothing a pack does turns a review go, or loses other findings --------------


def _slow(build, profile):
    """Sleeps past the budget."""
    time.sleep(1.0)
    yield Finding(Severity.PASS, "whole vehicle", "late")


def _hung(build, profile):
    """Waits forever."""
    threading.Event().wait()
    yield Finding(Severity.PASS, "whole vehicle", "never")


def _spinning(build, profile):
    """An endless pure-Python loop."""
    while True:
        pass
    yield Finding(Severity.PASS, "whole vehicle", "never")  # pragma: no cover


def _not_a_finding(build, profile):
    """Returns text."""
    return ["all good"]


def _raising(build, profile):
    """Raises."""
    raise KeyError("missing table")


def _exiting(build, profile):
    """Calls sys.exit."""
    sys.exit("no")


@pytest.mark.parametrize("check", [_slow, _hung, _spinning, _not_a_finding, _raising, _exiting])
def test_faulty_rule_is_unassessed_and_the_review_never_go(check) -> None:
    profile = _profile('mandatory_rules = ["clubone.fine"]\n', budget="150 ms")
    rules = [
        _rule("clubone.before", _passing),
        _rule("clubone.faulty", check),
        _rule("clubone.fine", _passing),  # runs after the faulty one
    ]
    started = time.perf_counter()
    result = review(make_build({}), profile, rules)
    assert time.perf_counter() - started < 0.9  # never waited out the slow rule
    assert result.verdict is Verdict.INCOMPLETE
    by_rule = {
        rule.id: severities(f for f in result.findings if f.rule_id == rule.id) for rule in rules
    }
    assert by_rule["clubone.before"] == by_rule["clubone.fine"] == [Severity.PASS]  # none lost
    assert by_rule["clubone.faulty"] == [Severity.UNASSESSED]
    assert next(f.error for f in result.findings if f.rule_id == "clubone.faulty")


def test_each_rule_has_its_own_budget() -> None:
    def quick_sleeper(build, profile):
        """Takes 60 ms, well within its own budget."""
        time.sleep(0.06)
        yield Finding(Severity.PASS, "whole vehicle", "done")

    rules = [_rule(f"clubone.r{i}", quick_sleeper) for i in range(5)]  # 300 ms in all
    result = review(make_build({}), _profile(budget="150 ms"), rules)
    assert severities(result.findings) == [Severity.PASS] * 5


def test_time_budget_names_itself_in_the_finding() -> None:
    result = review(make_build({}), _profile(budget="100 ms"), [_rule("clubone.hung", _hung)])
    assert "did not finish within its time budget of 0.1 s" in result.findings[0].rationale


def test_abandoned_spinning_rule_is_stopped() -> None:
    threads: list[threading.Thread] = []

    def spinning(build, profile):
        """Records its thread, then loops for ever."""
        threads.append(threading.current_thread())
        while True:
            pass
        yield Finding(Severity.PASS, "whole vehicle", "never")  # pragma: no cover

    result = review(make_build({}), _profile(budget="100 ms"), [_rule("clubone.spin", spinning)])
    assert severities(result.findings) == [Severity.UNASSESSED]
    (worker,) = threads
    assert worker is not threading.main_thread() and worker.daemon
    worker.join(timeout=5)
    assert not worker.is_alive()  # told to stop, not left burning the processor


def test_zero_budget_runs_rules_inline() -> None:
    seen = []

    def where(build, profile):
        """Records its thread."""
        seen.append(threading.current_thread())
        yield Finding(Severity.PASS, "whole vehicle", "inline")

    review(make_build({}), _profile(budget="0 s"), [_rule("clubone.where", where)])
    assert seen == [threading.main_thread()]


@pytest.mark.parametrize("required", [True, False])
def test_pack_failing_to_import_never_turns_the_review_go(site, required: bool) -> None:
    site("crashy", "raise RuntimeError('boom')\n")
    manager = load_packs(blocked=["core"])
    extra = 'required_packs = ["crashy"]\n' if required else ""
    profile = _profile(extra + 'mandatory_rules = ["clubone.fine"]\n')
    rules = [_rule("clubone.fine", _passing), *manager.rules()]
    result = review(make_build({}), profile, rules, problems=manager.problems)
    assert result.verdict is (Verdict.INCOMPLETE if required else Verdict.GO)
    assert "Rule pack crashy failed to load: RuntimeError: boom" in render_markdown(result)


def test_required_pack_not_installed_makes_the_review_incomplete() -> None:
    profile = _profile('required_packs = ["absent"]\n')
    result = review(make_build({}), profile, [_rule("clubone.fine", _passing)])
    assert result.verdict is Verdict.INCOMPLETE
    assert "requires rule pack absent, which is not installed" in result.findings[0].rationale


# --- the worked example, end to end through the command line --------------------------------


def test_example_club_pack_in_a_review(tmp_path: Path, monkeypatch, capsys) -> None:
    monkeypatch.syspath_prepend(str(EXAMPLE))
    info = tmp_path / "firstride_millrace-0.1.0.dist-info"
    info.mkdir()
    (info / "METADATA").write_text(
        "Metadata-Version: 2.1\nName: firstride-millrace\nVersion: 0.1.0\n"
    )
    (info / "entry_points.txt").write_text("[firstride.packs]\nmillrace = firstride_millrace\n")
    monkeypatch.syspath_prepend(str(tmp_path))
    out = tmp_path / "review.md"
    status = main(
        [
            "review",
            str(EXAMPLE / "builds" / "mountainboard.toml"),
            "--profile",
            str(EXAMPLE / "club-profile.toml"),
            "--strict-packs",
            "-o",
            str(out),
        ]
    )
    text = out.read_text("utf-8")
    assert status in (0, 1)
    assert "millrace 0.1.0" in text
    assert "| millrace.kill-switch | kill switch voltage rating | 48 V | ≥ 29.4 V |" in text
    assert "Millrace Park Riders club limits" in text and "extends (built-in) default.toml" in text
    # Blocking the required pack leaves it unloaded and the review incomplete.
    assert (
        main(
            [
                "review",
                str(EXAMPLE / "builds" / "mountainboard.toml"),
                "--profile",
                str(EXAMPLE / "club-profile.toml"),
                "--block-pack",
                "millrace",
                "-o",
                str(out),
            ]
        )
        == 1
    )
    assert "requires rule pack millrace, which was blocked" in out.read_text("utf-8")
    sys.modules.pop("firstride_millrace", None)


def test_bad_pack_input_in_a_build_is_exit_2_with_one_line(
    tmp_path: Path, monkeypatch, capsys
) -> None:
    monkeypatch.syspath_prepend(str(EXAMPLE))
    pack = tmp_path / "millrace_local.py"
    pack.write_text(
        'PACK_NAME = "millrace"\nfrom firstride_millrace import *  # noqa\n'
        "from firstride_millrace import firstride_build_extension, "
        "firstride_pack_limits, firstride_register_rules  # noqa\n",
        "utf-8",
    )
    build = tmp_path / "b.toml"
    build.write_text(
        '[vehicle]\nname = "t"\nkind = "skateboard"\n[extensions.millrace]\ndeck_height = "9 V"\n'
    )
    assert main(["review", str(build), "--rules", str(pack)]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "extensions.millrace.deck_height" in err[0]
    # every mistake of the table at once, as for the core fields
    build.write_text(
        '[vehicle]\nname = "t"\nkind = "skateboard"\n[extensions.millrace]\n'
        'deck_height = "9 V"\nkill_switch_lanyard = "maybe"\ncolour = "red"\n'
    )
    assert main(["review", str(build), "--rules", str(pack)]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    fields = sorted(line.split(": ")[2] for line in err)
    assert fields == [
        "extensions.millrace.colour",
        "extensions.millrace.deck_height",
        "extensions.millrace.kill_switch_lanyard",
    ], err
    sys.modules.pop("firstride_millrace", None)
