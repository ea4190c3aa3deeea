"""A review in the form asked for: Markdown (the form you sign), HTML (from that Markdown), JSON,
SARIF (for checkers in CI; it needs the build file's text for line and column positions).

Each renderer is imported only when its form is asked for.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

if TYPE_CHECKING:
    from reviewer.engine import Review

FORMS = ("md", "html", "json", "sarif")


def render_review(
    result: Review,
    form: str,
    build_text: str | None = None,
    chart_links: list[tuple[str, str]] | None = None,
) -> str:
    """The review in the asked-for form; HTML is rendered from the same Markdown. SARIF points
    into ``build_text`` (without it, every result is at line 1). ``chart_links``: (title, link)
    of charts written beside a Markdown review (``--plots DIR``)."""
    if form == "sarif":
        from reviewer.sarif import render_sarif

        return render_sarif(result, build_text or "", result.build_path)
    from reviewer.report import render_markdown

    if form == "json":
        from reviewer.export import render_json

        return render_json(result, result.build_data)
    markdown = render_markdown(result, chart_links if form == "md" else None)
    if form == "html":
        from reviewer.html import render_html

        return render_html(result, markdown)
    return markdown
