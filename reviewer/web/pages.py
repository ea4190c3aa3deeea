"""The counter page's pages, rendered from ``templates/web/`` (installed as part of
``reviewer.templates``) in an environment of their own with autoescaping on: every value a page
shows, from a build, an error or the schema, is written as text.

The review page is the HTML review exactly as ``firstride review --format html`` renders it,
with the page's bar (change, download, sign) put in right after its ``<body>`` tag: the review's
own template writes that tag, and text from a build reaches the review only escaped, so the
first ``<body>`` is always the review's own.
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from functools import cache
from typing import TYPE_CHECKING, Any

import jinja2

from reviewer.web.views import layout

if TYPE_CHECKING:
    from reviewer.web.counter import Counter

_BODY = "<body>"


@cache
def _environment() -> jinja2.Environment:
    from reviewer.report import template_folder
    from reviewer.template_cache import bytecode_cache

    folder = template_folder().joinpath("web")
    return jinja2.Environment(
        loader=jinja2.FunctionLoader(lambda name: folder.joinpath(name).read_text("utf-8")),
        bytecode_cache=bytecode_cache(),
        autoescape=True,
        undefined=jinja2.StrictUndefined,
        trim_blocks=True,
        lstrip_blocks=True,
    )


def _render(name: str, **values: Any) -> str:
    from reviewer import __version__

    return _environment().get_template(name).render(tool_version=__version__, **values) + "\n"


def form_page(
    counter: Counter,
    context: Mapping[str, Any],
    values: Mapping[str, str],
    errors: Sequence[tuple[str, str]] = (),
    notes: Sequence[str] = (),
    *,
    loaded: bool = False,
) -> str:
    """The form with ``values`` by field path and every error at its field."""
    sections, placed = layout(counter.shape, values, errors)
    return _render(
        "form.html.j2",
        sections=sections,
        problems=placed,
        notes=list(notes),
        loaded=loaded,
        **context,
    )


def review_page(
    counter: Counter,
    context: Mapping[str, Any],
    review_html: str,
    build_text: str,
    sign_form: Mapping[str, Any] | None = None,
) -> str:
    """The HTML review with the page's bar at its top."""
    form = dict(sign_form or {"signer": "", "role": "", "errors": []})
    errors = {field: message for field, message in form["errors"]}
    bar = _render("bar.html.j2", build=build_text, sign=form, sign_errors=errors, **context)
    head, found, tail = review_html.partition(_BODY)
    if not found:  # not a review page of ours: show nothing of it rather than guess
        raise ValueError("the review page has no <body> tag")
    return head + found + "\n" + bar + tail


def message_page(counter: Counter, context: Mapping[str, Any], title: str, text: str) -> str:
    return _render("message.html.j2", title=title, text=text, **context)
