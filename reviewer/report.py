"""Turn a Review into Markdown through the Jinja2 templates in ``templates/``.

Every ``{{ expression }}`` in a template passes through :func:`markdown_text` on its way out,
so text that came from a build file (a rider called ``| # <script>``) cannot break a table,
start a heading or inject HTML. Templates mark their own table syntax with the ``raw`` filter.
"""

from __future__ import annotations

import re
from functools import cache
from importlib import resources
from importlib.resources.abc import Traversable
from typing import Any
from urllib.parse import quote

import jinja2

from reviewer.engine import Review
from reviewer.findings import Comparison, Finding, Severity, Source
from reviewer.template_cache import bytecode_cache
from reviewer.units import format_number, format_quantity

SEVERITY_ORDER = (
    Severity.STOP,
    Severity.UNASSESSED,
    Severity.FIX,
    Severity.ADVISE,
    Severity.PASS,
)
_MD_TABLE = {ord(c): "\\" + c for c in "\\`*_{}[]#|~!"}
_MD_TABLE.update({ord("<"): "&lt;", ord(">"): "&gt;", ord("&"): "&amp;"})
_MD_TABLE.update({ord(c): " " for c in "\r\n\t"})
_MD_TABLE.update({c: None for c in range(32) if chr(c) not in "\r\n\t"})
_MD_TABLE.update({0x7F: None, 0x2028: " ", 0x2029: " "})
# U+0085 (next line) ends a line for str.splitlines and some viewers, as U+2028/2029 do: a
# space. The other C1 controls, bidi embeddings, overrides, isolates and marks (which can
# show a name reversed or a number changed), zero-width and other invisible format characters
# (which make two different names look the same): removed.
_MD_TABLE[0x85] = " "
_INVISIBLE_RANGES = (
    (0x80, 0x9F),
    (0xAD, 0xAD),
    (0x061C, 0x061C),
    (0x180E, 0x180E),
    (0x200B, 0x200F),
    (0x202A, 0x202E),
    (0x2060, 0x2064),
    (0x2066, 0x206F),
    (0xFEFF, 0xFEFF),
    (0xFFF9, 0xFFFB),
    (0x1D173, 0x1D17A),
    (0xE0001, 0xE0001),
    (0xE0020, 0xE007F),
)
for _low, _high in _INVISIBLE_RANGES:
    _MD_TABLE.update({c: None for c in range(_low, _high + 1) if c != 0x85})
#: Any character the table changes: most text has none, and a set test in C is ten times
#: cheaper than a regular expression's character class (measured on a review's 900 values).
_MD_SPECIAL = frozenset(map(chr, _MD_TABLE))


class Raw(str):
    """Template-authored Markdown that must pass through unescaped."""


def markdown_text(value: Any) -> str:
    """Escape text for inline Markdown: one line, no table breaks, no HTML, no emphasis."""
    if type(value) is str:  # most values: plain text from a finding or the build
        text = value
    elif isinstance(value, Raw):
        return str(value)
    elif value is None:
        return ""
    else:
        text = str(value)
    if _MD_SPECIAL.isdisjoint(text):
        return text
    return text.translate(_MD_TABLE)


def _quantity(value: Any) -> str:
    if value is None:
        return Raw("n/a")
    if isinstance(value, str):
        return value  # text from a rule or build: still escaped on output
    return Raw(format_quantity(value))


def _margin(finding: Finding) -> str:
    margin = finding.margin
    if margin is None:
        headroom = finding.headroom
        if headroom is None:
            return Raw("n/a")
        sign = "+" if headroom.magnitude >= 0 else ""
        return Raw(f"{sign}{format_quantity(headroom)}")
    return Raw(f"{'+' if margin >= 0 else ''}{format_number(margin * 100, 3)} %")


def _limit(finding: Finding) -> str:
    if finding.limit is None:
        return Raw("n/a")
    word = "≤" if finding.comparison is Comparison.AT_MOST else "≥"
    if isinstance(finding.limit, str):
        return f"{word} {finding.limit}"  # text: escaped on output
    return Raw(f"{word} {format_quantity(finding.limit)}")


class Shown:
    """A finding's figures as the review prints them, formatted once per render, with the
    numbers of its references and the build fields its remedy names. (A plain class: a
    dataclass would cost a millisecond to define on every start.)"""

    __slots__ = ("fields", "limit", "margin", "measured", "refs")

    def __init__(self, finding: Finding, refs: dict[Source, int]) -> None:
        self.measured = _quantity(finding.measured)
        self.limit = _limit(finding)
        self.margin = _margin(finding)
        numbers = sorted({refs[s] for s in finding.sources})
        self.refs = "[" + ", ".join(map(str, numbers)) + "]" if numbers else ""
        self.fields = remedy_fields(finding.remedy or "")


_FIELD_TEXT = re.compile(r"\b[a-z_]+(?:\[\d*\])?(?:\.[a-z_]+(?:\[\d*\])?)+\b")


@cache
def _field_names() -> frozenset[str]:
    """Every build-file field path with list indices left out (``motors.cooling.fan``)."""
    from pydantic import BaseModel

    from reviewer.build import Build

    names: set[str] = set()

    def walk(model: type[BaseModel], prefix: str) -> None:
        for name, field in model.model_fields.items():
            key = f"{prefix}{field.alias or name}"
            names.add(key)
            stack = [field.annotation]
            while stack:
                kind = stack.pop()
                if isinstance(kind, type) and issubclass(kind, BaseModel):
                    walk(kind, key + ".")
                stack.extend(getattr(kind, "__args__", ()))

    walk(Build, "")
    return frozenset(names)


def remedy_fields(remedy: str) -> tuple[str, ...]:
    """The build fields a remedy names (``controller.regen_current_limit``), in order."""
    found = []
    for match in _FIELD_TEXT.finditer(remedy):
        text = match.group(0)
        if re.sub(r"\[\d*\]", "", text) in _field_names() and text not in found:
            found.append(text)
    return tuple(found)


def references(review: Review, ordered: list[Finding]) -> dict[Source, int]:
    """Each source cited, numbered once in the order the review first cites it."""
    refs: dict[Source, int] = {}
    for finding in ordered:
        for source in finding.sources:
            refs.setdefault(source, len(refs) + 1)
    for assumption in review.assumptions:
        if assumption.source is not None:
            refs.setdefault(assumption.source, len(refs) + 1)
    return refs


def template_folder() -> Traversable:
    return resources.files("reviewer.templates")


@cache
def environment() -> jinja2.Environment:
    folder = template_folder()

    def load(name: str) -> str:
        return folder.joinpath(name).read_text("utf-8")

    env = jinja2.Environment(
        loader=jinja2.FunctionLoader(load),
        bytecode_cache=bytecode_cache(),
        finalize=markdown_text,
        autoescape=False,
        trim_blocks=True,
        lstrip_blocks=True,
        keep_trailing_newline=True,
        undefined=jinja2.StrictUndefined,
    )
    env.filters["raw"] = Raw
    env.filters["qty"] = _quantity
    env.filters["margin"] = _margin
    env.filters["limit"] = _limit
    return env


_ACT_ORDER = (Severity.STOP, Severity.FIX, Severity.ADVISE)


def render_markdown(review: Review, chart_links: list[tuple[str, str]] | None = None) -> str:
    template = environment().get_template("review.md.j2")
    findings = list(review.findings)
    counts = [(s, review.count(s)) for s in SEVERITY_ORDER]
    acted = [f for severity in _ACT_ORDER for f in findings if f.severity is severity]
    unassessed = [f for f in findings if f.severity is Severity.UNASSESSED]
    passed = [f for f in findings if f.severity is Severity.PASS]
    # a waived finding is still listed where its severity puts it, marked waived
    refs = references(review, acted + unassessed + passed)
    text = template.render(
        review=review,
        build=review.build,
        counts=counts,
        refs=refs,
        charts=[(title, Raw(quote(link))) for title, link in chart_links or ()],
        acted=[(f, Shown(f, refs)) for f in acted],
        passed=[(f, Shown(f, refs)) for f in passed],
        unassessed=[(f, Shown(f, refs)) for f in unassessed],
    )
    return "\n".join(line.rstrip() for line in text.splitlines()) + "\n"
