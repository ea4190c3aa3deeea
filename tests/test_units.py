"""The quantity gate: conversions are right, and nothing but a number and a unit gets through."""

from __future__ import annotations

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from reviewer import quantity_text as qt
from reviewer import units as u


@pytest.mark.parametrize(
    ("text", "dimension", "expected"),
    [
        ("3.8 Ah", u.CHARGE, 3800.0),  # SI prefixes: 1 Ah = 1000 mAh
        ("10 mph", u.SPEED, 16.09344),  # NIST SP 811: 1 mile = 1609.344 m exactly
        ("77 degF", u.TEMPERATURE, 25.0),  # NIST SP 811: t/degC = (t/degF - 32) / 1.8
        ("298.15 K", u.TEMPERATURE, 25.0),  # NIST SP 811: t/degC = T/K - 273.15
        ("3.5 in", u.DIAMETER, 88.9),  # NIST SP 811: 1 inch = 25.4 mm exactly
        ("2.5 mm^2", u.AREA, 2.5),
        ("120 mohm", u.RESISTANCE, 0.12),
        ("0.35 Ω", u.RESISTANCE, 0.35),
        ("190 rpm/V", u.KV, 190.0),
        ("16 kHz", u.FREQUENCY, 16.0),
        ("8 %", u.GRADE, 8.0),
        ("0.6 m**2", u.DRAG_AREA, 0.6),
    ],
)
def test_conversion(text: str, dimension: u.Dimension, expected: float) -> None:
    quantity = qt.parse_quantity(text, dimension)
    assert math.isclose(quantity.magnitude, expected, rel_tol=1e-9)
    assert quantity.units == u.unit(dimension.unit)


@pytest.mark.parametrize(
    "text",
    [
        "24",
        "V",
        "24 kg",
        "2 4 V",
        "24 V V V 1",
        "1/0 V",
        "9**9**9 V",
        "__import__ V",
        "24 V; rm",
        "",
    ],
)
def test_rejected(text: str) -> None:
    with pytest.raises(u.QuantityError):
        qt.parse_quantity(text, u.VOLTAGE)


@settings(max_examples=300, deadline=None)
@given(st.text(max_size=80))
def test_any_text_is_parsed_or_rejected_cleanly(text: str) -> None:
    try:
        quantity = qt.parse_quantity(text, u.VOLTAGE)
    except u.QuantityError:
        return
    assert math.isfinite(quantity.magnitude)
    assert 0 < quantity.magnitude <= 1000


def test_format_quantity_is_short_and_stable() -> None:
    assert u.format_quantity(u.quantity(23.876, "A")) == "23.9 A"
    assert u.format_quantity(u.quantity(0.0012345, "ohm")) == "0.00123 Ω"
    assert u.format_quantity(None) == "n/a"


@pytest.mark.parametrize(
    ("value", "text"),
    [(2431.7, "2430"), (1000.0, "1000"), (150.0, "150"), (0.00005, "5×10^-5"), (1.5e7, "1.5×10^7")],
)
def test_format_number_keeps_three_figures_without_needless_powers(value: float, text: str) -> None:
    assert u.format_number(value) == text
