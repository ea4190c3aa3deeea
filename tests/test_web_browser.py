"""The counter page in a real browser (headless Chromium through Playwright), served by
``firstride serve``'s own server on a free loopback port: a sample build typed in field by
field and one uploaded, each reviewed to its verdict; an invalid value shown at its field; rows
added and removed; nothing fetched from elsewhere; screenshots kept with the test's files."""

from __future__ import annotations

import os
import re
import shutil
import threading
import tomllib
from pathlib import Path

import pytest

from .conftest import SAMPLES

pytest.importorskip("flask")
CHROMIUM = shutil.which("chromium") or shutil.which("chromium-browser")
pytestmark = pytest.mark.skipif(
    CHROMIUM is None, reason="Debian's chromium is not installed (apt-get install chromium)"
)


@pytest.fixture(scope="module")
def server():
    from werkzeug.serving import make_server

    from reviewer.session import open_session
    from reviewer.web.app import create_app
    from reviewer.web.counter import Counter
    from reviewer.web.server import QuietHandler

    app = create_app(Counter(open_session()))
    running = make_server("127.0.0.1", 0, app, threaded=True, request_handler=QuietHandler)
    thread = threading.Thread(target=running.serve_forever, daemon=True)
    thread.start()
    yield f"http://127.0.0.1:{running.server_port}"
    running.shutdown()
    thread.join(timeout=10)
    running.server_close()


@pytest.fixture(scope="module")
def browser():
    sync_api = pytest.importorskip("playwright.sync_api")
    with sync_api.sync_playwright() as playwright:
        launched = playwright.chromium.launch(executable_path=CHROMIUM, args=["--no-sandbox"])
        yield launched
        launched.close()


@pytest.fixture
def page(browser, server):
    opened = browser.new_page(viewport={"width": 1100, "height": 900})
    requests: list[str] = []
    opened.on("request", lambda request: requests.append(request.url))
    opened.goto(server + "/")
    opened.requests = requests  # type: ignore[attr-defined]
    yield opened
    opened.close()


def _keep(page, path: Path) -> None:
    """A screenshot into the test's folder, and into $FIRSTRIDE_ARTEFACTS when that is set."""
    page.screenshot(path=str(path), full_page=False)
    folder = os.environ.get("FIRSTRIDE_ARTEFACTS")
    if folder:
        Path(folder).mkdir(parents=True, exist_ok=True)
        shutil.copyfile(path, Path(folder) / f"web-{path.name}")


def _open_section(page, name: str) -> None:
    section = page.locator(f"details.section:has([name='{name}'])").first
    if section.get_attribute("open") is None:
        section.locator("summary").first.click()


def _fill(page, name: str, value: str) -> None:
    field = page.locator(f"[name='{name}']")
    if field.count() == 0:  # a later row: add it as a user would, with the group's button
        group = name[: name.rfind("[")]
        page.locator(f"[data-add='{_group_id(group)}']").click()
    _open_section(page, name)
    if field.evaluate("e => e.tagName") == "SELECT":
        field.select_option(value)
    else:
        field.fill(value)


def _group_id(path: str) -> str:
    from reviewer.web.views import dom_id

    return dom_id(path) + "-rows"


def test_a_sample_typed_in_field_by_field_reviews_to_its_verdict(page, server, tmp_path) -> None:
    from reviewer.web.form_data import form_values
    from reviewer.web.schema_form import build_form_shape

    sample = SAMPLES / "quayside-commuter.toml"
    values = form_values(tomllib.loads(sample.read_text(encoding="utf-8")), build_form_shape())
    for name, value in values.items():
        _fill(page, name, value)
    _keep(page, tmp_path / "form-filled.png")
    page.locator("button.main").click()
    page.wait_for_selector(".verdict")
    assert page.locator(".verdict").first.text_content() == "Verdict: GO"
    assert page.locator(".counter-bar").is_visible()
    shot = tmp_path / "review.png"
    _keep(page, shot)
    assert shot.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n" and shot.stat().st_size > 10_000
    assert all(url.startswith(server) for url in page.requests)  # nothing from elsewhere


def test_an_uploaded_sample_fills_the_form_and_reviews_to_its_verdict(page, server) -> None:
    page.set_input_files("input[name=build_file]", str(SAMPLES / "allotment-cargo-trike.toml"))
    page.get_by_role("button", name="Fill the form from it").click()
    page.wait_for_selector("[role=status]")
    assert page.locator("[name='vehicle.name']").input_value() == "Allotment Cargo Trike"
    page.locator("button.main").click()
    page.wait_for_selector(".verdict")
    assert page.locator(".verdict").first.text_content() == "Verdict: NO-GO"
    with page.expect_download() as download:
        page.get_by_role("button", name="build file (TOML)").click()
    assert download.value.suggested_filename == "allotment-cargo-trike.toml"
    assert all(url.startswith(server) for url in page.requests)


def test_an_invalid_value_shows_its_message_at_its_field(page, tmp_path) -> None:
    _fill(page, "vehicle.name", "Yard Kart")
    _fill(page, "vehicle.kind", "kart")
    _fill(page, "battery.chemistry", "lifepo4")
    _fill(page, "battery.cells_series", "seven")
    _fill(page, "riders[0].name", "Ash")
    _fill(page, "riders[0].class", "adult")
    _fill(page, "riders[0].mass", "80 V")
    page.locator("button.main").click()
    page.wait_for_selector("#problems")
    at_cells = page.locator(".field:has([name='battery.cells_series']) .error")
    assert at_cells.is_visible() and "integer" in at_cells.text_content()
    at_mass = page.locator(".field:has([name='riders[0].mass']) .error")
    assert at_mass.is_visible() and re.search(r"mass|kg", at_mass.text_content())
    assert page.locator("[name='battery.cells_series']").input_value() == "seven"
    assert page.locator("[name='battery.cells_series']").get_attribute("aria-invalid") == "true"
    page.locator("#problems a").first.click()  # the list at the top links to the field
    shot = tmp_path / "invalid-value.png"
    _keep(page, shot)
    assert shot.stat().st_size > 10_000


def test_rows_are_added_and_removed(page) -> None:
    _open_section(page, "wires[0].name")
    add = page.locator(f"[data-add='{_group_id('wires')}']")
    add.click()
    add.click()
    assert page.locator("[name='wires[2].name']").count() == 1
    legends = page.locator("#f-wires-rows > .rows > fieldset > legend .row-number")
    assert legends.all_text_contents() == ["1", "2", "3"]
    page.locator("#f-wires-1-").get_by_role("button", name="Remove this one").click()
    assert page.locator("[name='wires[1].name']").count() == 0
    assert legends.all_text_contents() == ["1", "2"]
    _fill(page, "vehicle.name", "Yard Kart")
    _fill(page, "vehicle.kind", "kart")
    _fill(page, "wires[2].name", "pack lead")
    _fill(page, "wires[2].circuit", "battery")
    page.locator("button.main").click()
    page.wait_for_selector("#problems")
    # the written file's wires[0] is the form's third row: the error lands there
    assert page.locator(".field:has([name='wires[2].length']) .error").is_visible()


def test_the_first_row_of_each_group_submits_without_script(browser, server) -> None:
    context = browser.new_context(java_script_enabled=False)
    page = context.new_page()
    page.goto(server + "/")
    assert page.locator("[data-add]").first.is_hidden()  # no script: no add buttons
    page.locator("details.section:has([name='riders[0].name']) summary").click()
    for name, value in (("vehicle.name", "Yard Kart"), ("riders[0].name", "Ash")):
        page.locator(f"[name='{name}']").fill(value)
    page.locator("[name='vehicle.kind']").select_option("kart")
    page.locator("[name='riders[0].class']").select_option("adult")
    page.locator("[name='riders[0].mass']").fill("70 kg")
    page.locator("button.main").click()
    page.wait_for_selector(".verdict")
    assert page.locator(".verdict").first.text_content() == "Verdict: INCOMPLETE"
    context.close()


def test_screenshots_are_kept(tmp_path_factory) -> None:
    kept = Path(tmp_path_factory.getbasetemp())
    assert list(kept.rglob("review.png")) and list(kept.rglob("invalid-value.png"))
