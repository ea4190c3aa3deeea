"""A review in the form asked for: Markdown (the form you sign), HTML (from that Markdown), JSON.

Each renderer is imported only when its form is asked for.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

if TYPE_CHECKING:
    from reviewer.engine import Review

FORMS = ("md", "html", "json")


def render_review(result: Review, form: str) -> str:
    """The review in the asked-for form; HTML is rendered from the same Markdown."""
    from reviewer.report import render_markdown

    if form == "json":
        from reviewer.export import render_json

        return render_json(result, result.build_data)
    markdown = render_markdown(result)
    if form == "html":
        from reviewer.html import render_html

        return render_html(result, markdown)
    return markdown
