"""The review as one self-contained HTML page, rendered from the same Markdown.

markdown-it-py renders with raw HTML disabled, so text from a build file stays text even if the
Markdown escaping were ever bypassed. The page shell and its print stylesheet live in
``templates/review.html.j2``; nothing is fetched from elsewhere.
"""

from __future__ import annotations

import re
from functools import cache

import jinja2
from markdown_it import MarkdownIt
from markupsafe import Markup

from reviewer.engine import Review
from reviewer.report import template_folder
from reviewer.template_cache import bytecode_cache


@cache
def _markdown() -> MarkdownIt:
    # commonmark with raw HTML off, plus GFM tables; links are validated by markdown-it itself
    return MarkdownIt("commonmark", {"html": False, "linkify": False}).enable("table")


@cache
def _environment() -> jinja2.Environment:
    folder = template_folder()
    return jinja2.Environment(
        loader=jinja2.FunctionLoader(lambda name: folder.joinpath(name).read_text("utf-8")),
        bytecode_cache=bytecode_cache(),
        autoescape=True,
        undefined=jinja2.StrictUndefined,
    )


# The review's own bold severity words and verdict, as markdown-it renders them; text from a
# build file is escaped before it reaches Markdown, so it can never produce these tags.
_SEVERITY = re.compile(r"<strong>(STOP|FIX|ADVISE)( \(WAIVED\))?</strong>")
_VERDICT = re.compile(r"<strong>Verdict: (GO|NO-GO|CONDITIONAL|INCOMPLETE)</strong>")


def markdown_to_html(markdown: str) -> str:
    return _markdown().render(markdown)


def _mark_severities(html: str) -> str:
    html = _SEVERITY.sub(
        lambda m: (
            f'<strong class="sev sev-{m.group(1).lower()}">{m.group(1)}{m.group(2) or ""}</strong>'
        ),
        html,
    )
    return _VERDICT.sub(
        lambda m: (
            f'<strong class="verdict verdict-{m.group(1).lower()}">Verdict: {m.group(1)}</strong>'
        ),
        html,
    )


def page_from_markdown(markdown: str, *, title: str) -> str:
    """Any Markdown of ours (a fleet summary) as a page in the same shell as a review."""
    from reviewer import __version__

    body = Markup(markdown_to_html(markdown))  # markdown-it output with raw HTML disabled
    template = _environment().get_template("page.html.j2")
    return template.render(title=title, tool_version=__version__, body=body) + "\n"


def render_html(review: Review, markdown: str) -> str:
    # markdown-it output with raw HTML disabled, with the review's own severity words marked
    html = _mark_severities(markdown_to_html(markdown))
    from reviewer.charts import review_charts
    from reviewer.plots import INSTALL_HINT, PlotsUnavailable

    try:
        charts = review_charts(review)
    except PlotsUnavailable:
        charts, missing = [], INSTALL_HINT
    else:
        missing = None
    # the charts go where the derived figures end: before the assumptions
    marker = "<h2>Assumptions and defaults used</h2>"
    head, found, tail = html.partition(marker)
    section = _environment().get_template("charts.html.j2").render(charts=charts, missing=missing)
    body = Markup(head + section + found + tail if found else html + section)
    template = _environment().get_template("review.html.j2")
    return template.render(review=review, body=body) + "\n"
