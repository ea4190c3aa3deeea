"""The HTML review in a real browser (headless Chromium through Playwright): readable on a phone
(nothing wider than the screen but tables, which scroll inside themselves), severity shown by
word and colour, no word broken mid-way, nothing fetched from the network; with a screenshot."""

from __future__ import annotations

import os
import shutil
from pathlib import Path

import pytest

from reviewer.formats import render_review
from reviewer.session import review_file

from .conftest import ROOT

CHROMIUM = shutil.which("chromium") or shutil.which("chromium-browser")
pytestmark = pytest.mark.skipif(CHROMIUM is None, reason="Debian's chromium is not installed")
PHONE = {"width": 390, "height": 844}  # a common phone viewport in CSS pixels


@pytest.fixture(scope="module")
def page_of_review(tmp_path_factory):
    sync_api = pytest.importorskip("playwright.sync_api")
    html = render_review(review_file(ROOT / "sample_builds" / "allotment-cargo-trike.toml"), "html")
    path = tmp_path_factory.mktemp("html") / "review.html"
    path.write_text(html, encoding="utf-8")
    requests: list[str] = []
    with sync_api.sync_playwright() as playwright:
        browser = playwright.chromium.launch(executable_path=CHROMIUM, args=["--no-sandbox"])
        page = browser.new_page(viewport=PHONE)
        page.on("request", lambda request: requests.append(request.url))
        page.goto(path.as_uri())
        yield page, path, requests
        browser.close()


def test_readable_on_a_phone_with_a_screenshot(page_of_review) -> None:
    page, path, _ = page_of_review
    shot = Path(path).with_suffix(".png")
    page.screenshot(path=str(shot), full_page=False)
    folder = os.environ.get("FIRSTRIDE_ARTEFACTS")  # kept as a test artefact where CI asks
    if folder:
        Path(folder).mkdir(parents=True, exist_ok=True)
        shutil.copyfile(shot, Path(folder) / "html-review-phone.png")
    assert shot.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n" and shot.stat().st_size > 10_000
    width = page.evaluate("document.documentElement.scrollWidth")
    assert width <= PHONE["width"]  # the page itself never scrolls sideways


def test_severity_by_word_and_colour(page_of_review) -> None:
    page, _, _ = page_of_review
    words = page.eval_on_selector_all(".sev", "els => els.map(e => e.textContent)")
    assert "STOP" in words and "FIX" in words
    colour = page.eval_on_selector(".sev-stop", "e => getComputedStyle(e).color")
    ink = page.eval_on_selector("body", "e => getComputedStyle(e).color")
    assert colour != ink
    verdict = page.eval_on_selector(".verdict", "e => e.textContent")
    assert verdict == "Verdict: NO-GO"


def test_no_word_is_broken_mid_way(page_of_review) -> None:
    page, _, _ = page_of_review
    wraps = page.eval_on_selector_all(
        "td, th, code, li",
        "els => [...new Set(els.map(e => getComputedStyle(e).overflowWrap + '/' + "
        "getComputedStyle(e).wordBreak))]",
    )
    assert all(not w.startswith("anywhere") and "break-all" not in w for w in wraps), wraps


def test_nothing_is_fetched(page_of_review) -> None:
    _, path, requests = page_of_review
    assert requests == [Path(path).as_uri()]
