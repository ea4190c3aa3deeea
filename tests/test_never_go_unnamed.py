"""No `go` from an input the review does not name (issue 11), property-based.

From each sample that reviews `go`, hypothesis removes any subset of its leaf fields. Whatever
the result, a `go` is allowed only when the review names every removed input: in a stated
assumption, in a finding's missing inputs, or in a finding's text (a pass that says what it took
in the input's place). A removal that makes the file invalid is refused at the edge, which is
not a review at all. And any rule made to fail (raise) keeps the review from `go`.
"""

from __future__ import annotations

import copy
import tomllib
from pathlib import Path
from typing import Any

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from pydantic import ValidationError

from reviewer.build import Build
from reviewer.findings import Verdict
from reviewer.rule import Rule
from reviewer.session import built_in_session

SAMPLES = Path(__file__).resolve().parent.parent / "sample_builds"
GO_SAMPLES = ("quayside-commuter.toml", "saltmarsh-hub-scooter.toml")
#: Labels and descriptions: removing them changes no figure a rule judges.
LABELS = {"name", "revision", "builder", "conditions"}


def leaves(tree: Any, path: tuple = ()) -> list[tuple]:
    """Every removable leaf of a TOML tree, as a path of keys and list indexes."""
    if isinstance(tree, dict):
        return [leaf for key, value in tree.items() for leaf in leaves(value, (*path, key))]
    if isinstance(tree, list) and tree and all(isinstance(item, dict) for item in tree):
        return [leaf for i, value in enumerate(tree) for leaf in leaves(value, (*path, i))]
    return [path]


def without(tree: dict, removed: list[tuple]) -> dict:
    data = copy.deepcopy(tree)
    for path in sorted(removed, key=lambda p: [str(k) for k in p], reverse=True):
        node = data
        for key in path[:-1]:
            node = node[key]
        if isinstance(node, dict):
            node.pop(path[-1], None)
    return data


def dotted(path: tuple) -> str:
    """``("motors", 0, "kv")`` as the review writes it: ``motors[0].kv``."""
    text = ""
    for key in path:
        text += f"[{key}]" if isinstance(key, int) else (f".{key}" if text else key)
    return text


def names(review: Any, path: tuple) -> bool:
    """Whether the review names this removed input anywhere a reader would see it."""
    full, field = dotted(path), str(path[-1])
    section = str(path[0])
    texts = [a.text for a in review.assumptions]
    for finding in review.findings:
        texts += [finding.rationale, finding.remedy or "", *finding.missing]
    return any(full in t or field in t for t in texts) or any(
        m == section or (m.startswith(section) and field in m)
        for f in review.findings
        for m in f.missing
    )


SESSION = built_in_session()


@pytest.mark.parametrize("sample", GO_SAMPLES)
def test_the_sample_itself_reviews_go(sample: str) -> None:
    data = tomllib.loads((SAMPLES / sample).read_text())
    assert SESSION.review_build(Build.model_validate(data)).verdict is Verdict.GO


@pytest.mark.parametrize("sample", GO_SAMPLES)
@settings(
    max_examples=60,
    deadline=None,
    derandomize=True,  # the same cases on every run: CI is never flaky on a new seed
    suppress_health_check=[HealthCheck.too_slow, HealthCheck.filter_too_much],
)
@given(data=st.data())
def test_no_go_from_a_removed_input_the_review_does_not_name(sample: str, data: Any) -> None:
    tree = tomllib.loads((SAMPLES / sample).read_text())
    removable = [p for p in leaves(tree) if str(p[-1]) not in LABELS and p[0] != "vehicle"]
    removed = data.draw(st.lists(st.sampled_from(removable), min_size=1, max_size=6, unique=True))
    try:
        build = Build.model_validate(without(tree, removed))
    except ValidationError:
        return  # refused at the edge: an input error, not a review
    review = SESSION.review_build(build)
    if review.verdict is Verdict.GO:
        unnamed = [dotted(p) for p in removed if not names(review, p) and used(tree, p)]
        assert not unnamed, f"go without naming removed inputs {unnamed}"


def outcome(review: Any) -> tuple:
    """What a review judges: its verdict, findings and assumptions (a derived figure that is
    only reported, such as the pack's energy, judges nothing)."""
    return review.verdict, review.findings, review.assumptions


def used(tree: dict, path: tuple) -> bool:
    """Whether any rule used this input: the review changes when it alone is removed (an input
    no rule of this build needs, such as a dynamic brake's figures on a friction-braked
    vehicle, cannot make a pass false)."""
    full = SESSION.review_build(Build.model_validate(tree))
    try:
        alone = SESSION.review_build(Build.model_validate(without(tree, [path])))
    except ValidationError:
        return True
    return outcome(alone) != outcome(full)


def test_any_rule_that_fails_keeps_the_review_from_go(monkeypatch) -> None:
    tree = tomllib.loads((SAMPLES / "saltmarsh-hub-scooter.toml").read_text())
    build = Build.model_validate(tree)
    for rule in SESSION.manager.rules():

        def broken(build: Build, profile: Any, _id: str = rule.id) -> Any:
            raise RuntimeError(f"{_id} made to fail")

        failing = Rule(**{**rule.__dict__, "check": broken})
        rules = [failing if r.id == rule.id else r for r in SESSION.manager.rules()]
        monkeypatch.setattr(SESSION.manager, "rules", lambda rules=rules: rules)
        assert SESSION.review_build(build).verdict is not Verdict.GO, rule.id
        monkeypatch.undo()


@pytest.mark.parametrize("sample", GO_SAMPLES)
def test_no_single_removed_input_gives_an_unnamed_go(sample: str) -> None:
    # every leaf, one at a time: the exhaustive companion of the property test above
    tree = tomllib.loads((SAMPLES / sample).read_text())
    unnamed = []
    for path in leaves(tree):
        if str(path[-1]) in LABELS or path[0] == "vehicle":
            continue
        try:
            build = Build.model_validate(without(tree, [path]))
        except ValidationError:
            continue
        review = SESSION.review_build(build)
        if review.verdict is Verdict.GO and not names(review, path) and used(tree, path):
            unnamed.append(dotted(path))
    assert unnamed == [], unnamed
