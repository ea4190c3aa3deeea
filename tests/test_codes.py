"""Codes in a build file (wire gauges, IP codes) are parsed once, at validation, into values."""

from __future__ import annotations

import re

import pytest

from reviewer.build import Build, WireGauge, build_json_schema
from reviewer.engineering.ingress import IngressCode
from reviewer.errors import InputError
from reviewer.session import built_in_profile
from reviewer.testing import make_build

WIRE = {"name": "pack lead", "circuit": "battery", "length": "0.5 m"}


def test_a_gauge_becomes_a_structured_value() -> None:
    build = make_build(
        {"wires": [{**WIRE, "gauge": "2/0 AWG"}, {**WIRE, "name": "b", "gauge": "12"}]}
    )
    big, small = (w.gauge for w in build.wires)
    assert isinstance(big, WireGauge) and big.awg == -1 and big.label == "2/0 AWG"  # ASTM B258
    # ASTM B258: 12 AWG is 2.053 mm across, 3.309 mm^2
    assert small.awg == 12 and small.area_mm2 == pytest.approx(3.309, rel=1e-3)
    assert build.wires[1].area.m_as("mm**2") == pytest.approx(3.309, rel=1e-3)


def test_an_ip_code_becomes_a_structured_value() -> None:
    build = make_build({"enclosure": {"electronics_ip": "ipx5/ipx7", "battery_ip": "IP54"}})
    code = build.enclosure.electronics_ip
    assert isinstance(code, IngressCode)
    assert code.water_marks == (5, 7)  # IEC 60529 clause 6: a dual marking claims both
    assert build.enclosure.battery.solids == 5


@pytest.mark.parametrize(
    ("data", "message"),
    [
        ({"wires": [{**WIRE, "gauge": "5/0 AWG"}]}, "n/0 sizes run from 1/0 to 4/0"),
        ({"wires": [{**WIRE, "gauge": "twelve"}]}, "not an AWG size"),
        ({"wires": [{**WIRE, "gauge": "12 AWG plus more"}]}, "at most 12 characters"),
        ({"wires": [{**WIRE, "gauge": 12}]}, "text such as"),
        ({"enclosure": {"battery_ip": "IP7X"}}, "not an IP code"),
    ],
)
def test_bad_codes_fail_validation_with_their_reason(data, message) -> None:
    with pytest.raises(Exception, match=re.escape(message)):
        make_build(data)


def test_the_schema_gives_each_code_a_pattern_and_examples_of_its_own() -> None:
    defs = build_json_schema()["$defs"]
    gauge = defs["Wire"]["properties"]["gauge"]
    ip = defs["Enclosure"]["properties"]["battery_ip"]
    assert gauge["examples"] == ["12 AWG", "2/0 AWG"] and "(?P<" not in gauge["pattern"]
    assert ip["examples"][0] == "IP54" and ip["pattern"].startswith("^")
    for example in gauge["examples"]:
        assert re.match(gauge["pattern"], example)
        make_build({"wires": [{**WIRE, "gauge": example}]})
    for example in ip["examples"]:
        assert re.match(ip["pattern"], example)
        make_build({"enclosure": {"battery_ip": example}})


def test_the_profiles_minimum_ip_codes_are_parsed_at_load(write_build) -> None:
    profile = built_in_profile()
    assert isinstance(profile.limit("enclosure.minimum_ip.wet").value, IngressCode)
    bad = write_build(
        '[profile]\nname = "club"\nextends = "default"\n'
        '[limits.enclosure.minimum_ip.wet]\nvalue = "IP9Z"\nsource = "x"\n',
        "club.toml",
    )
    with pytest.raises(InputError) as caught:
        built_in_profile(bad)
    assert caught.value.field == "limits.enclosure.minimum_ip.wet.value"


def test_nothing_outside_the_build_model_parses_a_code() -> None:
    from pathlib import Path

    root = Path(__file__).resolve().parent.parent
    for path in [*(root / "rules").rglob("*.py"), *(root / "reviewer").rglob("*.py")]:
        text = path.read_text(encoding="utf-8")
        if path.parent.name in ("engineering", "build") or path.name in (
            "profile.py",
            "profile_limits.py",
        ):
            continue
        assert "parse_awg(" not in text and "parse_ip_code(" not in text, path
    assert Build  # the model the codes are fields of
