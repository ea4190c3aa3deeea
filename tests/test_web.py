"""The counter page (``firstride serve``) through Flask's test client: the form is the schema's,
a build survives the round trip through the form, every input error shows at its field, the
token and the size cap hold, and the private key never reaches a response."""

from __future__ import annotations

import io
import re
import tomllib
from html.parser import HTMLParser
from pathlib import Path

import pytest
from hypothesis import given
from hypothesis import strategies as st

pytest.importorskip("flask")

from reviewer.cli import main
from reviewer.loader import MAX_BUILD_BYTES, parse_build
from reviewer.session import open_session
from reviewer.web.app import MAX_REQUEST_BYTES, create_app
from reviewer.web.counter import Counter
from reviewer.web.schema_form import build_form_shape, form_shape
from reviewer.web.toml_text import dumps, toml_string

from .conftest import SAMPLES

SAMPLE = SAMPLES / "quayside-commuter.toml"
ALL_SAMPLES = sorted(SAMPLES.glob("*.toml"))


class _Form(HTMLParser):
    """The values a browser would submit from a page's forms, template rows left out."""

    def __init__(self) -> None:
        super().__init__(convert_charrefs=True)
        self.values: dict[str, str] = {}
        self.hidden: dict[str, str] = {}
        self._template = 0
        self._select: str | None = None

    def handle_starttag(self, tag: str, attrs: list[tuple[str, str | None]]) -> None:
        a = {k: v or "" for k, v in attrs}
        if tag == "template":
            self._template += 1
        if self._template:
            return
        if tag == "input" and a.get("type") == "hidden":
            self.hidden[a["name"]] = a.get("value", "")
        elif tag == "input" and a.get("type") == "text" and a.get("value"):
            self.values[a["name"]] = a["value"]
        elif tag == "select":
            self._select = a["name"]
        elif tag == "option" and self._select and "selected" in a:
            self.values[self._select] = a.get("value", "")

    def handle_endtag(self, tag: str) -> None:
        if tag == "template":
            self._template -= 1
        elif tag == "select":
            self._select = None


def parsed(html: str) -> _Form:
    form = _Form()
    form.feed(html)
    return form


def errors_at(html: str) -> dict[str, list[str]]:
    """Each field path with the messages shown at it (the field's or its row's own)."""
    found: dict[str, list[str]] = {}
    pattern = r'<p class="(?:group-)?error" data-field="([^"]*)">([^<]*)</p>'
    for path, message in re.findall(pattern, html):
        found.setdefault(_unescape(path), []).append(_unescape(message))
    return found


def _unescape(text: str) -> str:
    import html

    return html.unescape(text)


@pytest.fixture(scope="module")
def counter() -> Counter:
    return Counter(open_session())


@pytest.fixture(scope="module")
def client(counter):
    return create_app(counter).test_client()


def upload(client, raw: bytes, **query):
    return client.post(
        "/upload",
        data={"build_file": (io.BytesIO(raw), "build.toml")},
        content_type="multipart/form-data",
        query_string=query,
    )


# The form is the schema's ----------------------------------------------------------------------


def test_every_field_of_the_schema_is_on_the_page(client) -> None:
    page = client.get("/").get_data(as_text=True)
    names = set(re.findall(r'name="([^"]+)"', page))
    for section in build_form_shape().sections:
        prefix = section.key + ("[0]" if section.repeated else "")
        for item in section.fields:
            assert f"{prefix}.{item.key}" in names
    assert 'name="riders[__ROW0__].mass"' in page  # the row an added rider copies
    assert "controller.motor_current_limit" in names and "battery.bms.fitted" in names


def test_a_new_field_in_the_schema_appears_with_no_page_code() -> None:
    schema = {
        "properties": {
            "gadget": {"$ref": "#/$defs/Gadget"},
            "bolts": {"type": "array", "items": {"$ref": "#/$defs/Gadget"}},
        },
        "$defs": {
            "Gadget": {
                "type": "object",
                "required": ["size"],
                "properties": {
                    "size": {"type": "string", "x-dimension": "[length]", "examples": ["4 mm"]},
                    "finish": {"enum": ["matt", "gloss"], "description": "how it looks"},
                },
            }
        },
    }
    shape = form_shape(schema)
    gadget, bolts = shape.sections
    assert not gadget.repeated and bolts.repeated
    size, finish = gadget.fields
    assert (size.kind, size.unit, size.required) == ("quantity", "mm", True)
    assert finish.choices == ("matt", "gloss") and finish.help == "how it looks"


# A build through the form and back ----------------------------------------------------------


@pytest.mark.parametrize("sample", ALL_SAMPLES, ids=lambda p: p.stem)
def test_a_sample_uploaded_and_written_back_validates_to_the_same_build(
    client, counter, sample: Path
) -> None:
    page = upload(client, sample.read_bytes()).get_data(as_text=True)
    assert errors_at(page) == {}
    text, _ = counter.from_form(parsed(page).values)
    again = parse_build(text.encode("utf-8"), "again.toml")
    assert again.build == parse_build(sample.read_bytes(), str(sample)).build
    assert again.data == tomllib.loads(sample.read_text(encoding="utf-8"))


def test_the_review_page_offers_the_build_and_its_review_the_cli_would_write(
    client, tmp_path: Path, monkeypatch
) -> None:
    values = parsed(upload(client, SAMPLE.read_bytes()).get_data(as_text=True)).values
    page = client.post("/review", data=values).get_data(as_text=True)
    assert "Verdict: GO" in page
    assert page.index('class="counter-bar"') < page.index("Verdict: GO")
    build = parsed(page).hidden["build"].replace("\n", "\r\n")  # as a browser sends it
    downloads = {}
    for form in ("toml", "md", "html", "json"):
        answer = client.post("/download", data={"build": build, "form": form})
        assert answer.status_code == 200
        downloads[form] = answer
    saved = downloads["toml"].headers["Content-Disposition"]
    assert saved == 'attachment; filename="quayside-commuter.toml"'
    (tmp_path / "quayside-commuter.toml").write_bytes(downloads["toml"].data)
    monkeypatch.chdir(tmp_path)
    main(["review", "quayside-commuter.toml", "-o", "cli.md", "-q"])
    assert downloads["md"].data == (tmp_path / "cli.md").read_bytes()
    assert downloads["json"].headers["Content-Type"].startswith("application/json")
    assert b"<!DOCTYPE html>" in downloads["html"].data


def test_edit_fills_the_form_from_the_review_page(client, counter) -> None:
    text = SAMPLE.read_text(encoding="utf-8")
    page = client.post("/edit", data={"build": text}).get_data(as_text=True)
    again, _ = counter.from_form(parsed(page).values)
    assert tomllib.loads(again) == tomllib.loads(text)


# Every error at its field -------------------------------------------------------------------


def test_every_error_shows_at_its_field_at_once(client) -> None:
    form = {
        "vehicle.name": "Yard Kart",
        "riders[0].name": "Ash",
        "riders[0].mass": "heavy",
        "riders[0].class": "giant",
        "battery.chemistry": "li-ion",
        "battery.cells_series": "seven",
        "wires[0].name": "pack lead",
        "wires[0].circuit": "battery",
    }
    page = client.post("/review", data=form).get_data(as_text=True)
    shown = errors_at(page)
    assert shown.keys() >= {
        "vehicle.kind",
        "riders[0].mass",
        "riders[0].class",
        "battery.cells_series",
        "wires[0].length",
    }
    assert shown["vehicle.kind"] == ["this field is required"]
    assert "integer" in shown["battery.cells_series"][0]
    assert "one of" in shown["riders[0].class"][0]
    listed = page.split('id="problems"')[1].split("</section>")[0]
    assert listed.count("<li>") == sum(map(len, shown.values()))  # each also in the list
    assert 'href="#f-riders-0--mass"' in listed
    assert parsed(page).values["riders[0].mass"] == "heavy"  # what was typed stays


def test_an_error_in_a_later_row_lands_on_that_row(client) -> None:
    form = {
        "vehicle.name": "Yard Kart",
        "vehicle.kind": "kart",
        "riders[0].name": "",  # an empty row: left out of the file
        "riders[3].name": "Ash",
        "riders[3].class": "adult",
        "riders[3].mass": "12 V",
    }
    shown = errors_at(client.post("/review", data=form).get_data(as_text=True))
    assert list(shown) == ["riders[3].mass"]


def test_an_uploaded_file_with_mistakes_fills_the_form_with_errors_at_their_fields(client) -> None:
    raw = b'[vehicle]\nname = "X"\nkind = "kart"\nwheelz = 3\n[battery]\ncells_series = 0\n'
    page = upload(client, raw).get_data(as_text=True)
    shown = errors_at(page)
    assert "battery.chemistry" in shown and "battery.cells_series" in shown
    assert any("wheelz" in m and "no such key" in m for m in shown["vehicle"])
    assert parsed(page).values["battery.cells_series"] == "0"


def test_a_file_that_is_not_toml_is_one_error_at_the_top(client) -> None:
    page = upload(client, b"[vehicle\n").get_data(as_text=True)
    assert 'id="problems"' in page and "valid TOML" in page


# Escaping, the token, the size cap -----------------------------------------------------------


def test_text_from_a_build_is_escaped_everywhere(client) -> None:
    hostile = '<script>alert("x")</script>'
    raw = f'[vehicle]\nname = {toml_string(hostile)}\nkind = "kart"\n'.encode()
    form_page = upload(client, raw).get_data(as_text=True)
    assert hostile not in form_page and "&lt;script&gt;" in form_page
    values = parsed(form_page).values
    review = client.post("/review", data=values)
    assert review.status_code == 200 and hostile not in review.get_data(as_text=True)
    policy = review.headers["Content-Security-Policy"]
    assert "default-src 'none'" in policy and "form-action 'self'" in policy


def test_nothing_on_the_pages_is_fetched_from_elsewhere(client) -> None:
    page = client.get("/").get_data(as_text=True)
    assert not re.search(r'(?:src|href|action)="(?:https?:)?//', page)
    assert "<link" not in page


def test_off_loopback_every_request_needs_the_token(counter) -> None:
    client = create_app(counter, token="s3cret-token").test_client()
    assert client.get("/").status_code == 403
    assert client.get("/?token=wrong").status_code == 403
    assert client.get("/?token=s3cret-token").status_code == 200
    assert client.get("/", headers={"X-Firstride-Token": "s3cret-token"}).status_code == 200
    assert client.post("/review", data={"vehicle.name": "x"}).status_code == 403
    page = client.post("/review", data={"token": "s3cret-token", "vehicle.name": "x"})
    assert page.status_code == 200 and 'name="token" value="s3cret-token"' in page.text


def test_on_loopback_a_foreign_host_name_is_refused(client) -> None:
    assert client.get("/", headers={"Host": "attacker.example:8750"}).status_code == 403
    assert client.get("/", headers={"Host": "127.0.0.1:8750"}).status_code == 200
    assert client.get("/", headers={"Host": "[::1]:8750"}).status_code == 200


def test_an_upload_over_the_size_cap_is_refused(client) -> None:
    raw = b"#" * (MAX_BUILD_BYTES + 1)
    page = upload(client, raw).get_data(as_text=True)
    assert f"at most {MAX_BUILD_BYTES} bytes" in page and 'id="problems"' in page
    huge = upload(client, b"#" * (MAX_REQUEST_BYTES + 1))
    assert huge.status_code == 413 and "at most" in huge.get_data(as_text=True)


def test_a_download_names_only_a_form_of_the_list(client) -> None:
    text = SAMPLE.read_text(encoding="utf-8")
    assert client.post("/download", data={"build": text, "form": "../x"}).status_code == 400
    assert client.post("/download", data={"build": "[vehicle", "form": "md"}).status_code == 400


# Signing ------------------------------------------------------------------------------------


def test_the_key_never_reaches_a_response_and_the_signature_holds(tmp_path: Path) -> None:
    from reviewer.signing import verify_review
    from reviewer.signing_keys import generate_key_pair, load_private_key

    key_file, public_file = tmp_path / "shop.key", tmp_path / "shop.pub"
    generate_key_pair(key_file, public_file)
    secret_lines = [
        line for line in key_file.read_text().splitlines() if line and "-----" not in line
    ]
    client = create_app(Counter(open_session(), load_private_key(key_file))).test_client()
    text = SAMPLE.read_text(encoding="utf-8")
    answers = [client.get("/"), upload(client, SAMPLE.read_bytes())]
    values = parsed(answers[-1].get_data(as_text=True)).values
    answers.append(client.post("/review", data=values))
    assert "Sign and download" in answers[-1].get_data(as_text=True)
    answers.append(client.post("/sign", data={"build": text, "signer": "Pаul", "role": "shop"}))
    assert "several scripts" in errors_at(answers[-1].get_data(as_text=True))["signer"][0]
    for form in ("toml", "md"):
        answers.append(client.post("/download", data={"build": text, "form": form}))
    signed = client.post("/sign", data={"build": text, "signer": "Robin Vale", "role": "tech"})
    answers.append(signed)
    assert signed.headers["Content-Disposition"].endswith('-review-signed.md"')
    for answer in answers:
        body = answer.get_data(as_text=True)
        assert all(line not in body for line in secret_lines)
    (check,) = verify_review(signed.get_data(as_text=True))
    assert check.valid and check.signer == "Robin Vale"


def test_without_a_key_there_is_no_sign_button_and_signing_is_refused(client) -> None:
    text = SAMPLE.read_text(encoding="utf-8")
    answer = client.post("/sign", data={"build": text, "signer": "Robin", "role": "tech"})
    assert "without --key" in answer.get_data(as_text=True)


# The TOML writer ----------------------------------------------------------------------------


@given(st.text())
def test_any_string_is_written_so_it_reads_back(text: str) -> None:
    expected = text.encode("utf-16", "surrogatepass").decode("utf-16", "replace")
    assert tomllib.loads(dumps({"t": {"k": text}}))["t"]["k"] == expected


def test_every_shape_of_the_schema_is_written_and_read_back() -> None:
    tree = {
        "vehicle": {"name": 'a "b" \\ c', "kind": "kart", "mass": "16 kg"},
        "battery": {"cells_series": 7, "cell_c_rate": 1.5e-3, "bms": {"fitted": False}},
        "motors": [{"name": "m", "cooling": {"fan": True}}, {"name": "n"}],
        "logic": {"pins": ["P3", "Q0"], "port_groups": [{"name": "p", "pins": []}]},
        "odd key": {"ünï": 1.0},
    }
    assert tomllib.loads(dumps(tree)) == tree


# The command --------------------------------------------------------------------------------


def test_serving_the_network_needs_an_explicit_option(capsys) -> None:
    from reviewer.commands.serve import is_loopback

    assert main(["serve", "--host", "0.0.0.0"]) == 2
    assert "--allow-network" in capsys.readouterr().err
    assert is_loopback("127.0.0.1") and is_loopback("::1") and is_loopback("localhost")
    assert not is_loopback("192.168.1.20")
