"""The shortcuts taken for speed give exactly what the slow, plain way gives.

The reference for every quantity shortcut is pint itself (its constructor, ``m_as`` and
``to``); for the escaping shortcut, ``str.translate`` over the escape table; for the finding
copy, ``dataclasses.replace``. A shortcut that drifted from its reference would change a
review's bytes, so each is compared value for value, over many inputs.
"""

from __future__ import annotations

import dataclasses
import gc
import subprocess
import sys
from fractions import Fraction

import pint
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from reviewer import quantity_text as qt
from reviewer import units as u
from reviewer.cli import PROGRAM_GC_THRESHOLD, main
from reviewer.findings import Comparison, Finding, Severity, Source
from reviewer.report import _MD_TABLE, markdown_text

from .conftest import ROOT, SAMPLES

FINITE = st.floats(min_value=-1e12, max_value=1e12, allow_nan=False, allow_infinity=False)
UNITS = ["A", "mA", "V", "ohm", "mm", "m", "mm**2", "km/h", "rpm/V", "kg", "W", "percent"]
# Pairs of the same dimension: a factor conversion each way, and offset scales.
PAIRS = [
    ("km/h", "m/s"),
    ("mph", "km/h"),
    ("mm", "m"),
    ("in", "mm"),
    ("mA", "A"),
    ("mm**2", "m**2"),
    ("rpm/V", "rad/s/V"),
    ("percent", "dimensionless"),
    ("Wh", "J"),
    ("lb", "kg"),
    ("degC", "kelvin"),
    ("kelvin", "degC"),
    ("degF", "degC"),
]


@settings(max_examples=200, deadline=None)
@given(value=FINITE | st.integers(-(10**9), 10**9), unit_text=st.sampled_from(UNITS))
def test_quantity_is_what_pint_builds(value: float, unit_text: str) -> None:
    fast = u.quantity(value, unit_text)
    plain = u.Quantity(value, u.unit(unit_text))
    assert type(fast) is type(plain)
    assert fast.__dict__ == plain.__dict__  # the same magnitude, the same units, nothing else
    assert type(fast.magnitude) is type(plain.magnitude)
    assert u.format_quantity(fast) == u.format_quantity(plain)
    assert fast == plain


def test_quantity_of_anything_but_a_plain_number_goes_through_pint() -> None:
    assert u.quantity(Fraction(1, 3), "V").magnitude == Fraction(1, 3)
    with pytest.raises(TypeError):  # pint refuses a bool magnitude; so must the shortcut
        u.quantity(True, "V")


@settings(max_examples=300, deadline=None)
@given(value=FINITE, pair=st.sampled_from(PAIRS))
def test_in_unit_equals_pint_conversion(value: float, pair: tuple[str, str]) -> None:
    source, target = pair
    amount = u.Quantity(value, source)  # parsed by pint from text: not the cached unit object
    assert u.in_unit(amount, target) == float(amount.m_as(target))
    assert u.in_units_of(amount, u.Quantity(1.0, target)) == float(amount.m_as(target))


def test_in_unit_of_equal_units_in_other_objects_is_the_magnitude() -> None:
    amount = u.Quantity(12.3456789, "kilometer / hour")  # a container of its own
    assert amount._units is not u.unit("km/h")._units
    assert u.in_unit(amount, "km/h") == 12.3456789 == float(amount.m_as("km/h"))


def test_in_unit_across_dimensions_fails_as_pint_does() -> None:
    with pytest.raises(pint.DimensionalityError):
        u.in_unit(u.quantity(3.0, "V"), "A")


@pytest.mark.parametrize(
    ("text", "dimension"),
    [
        ("29.4 V", u.VOLTAGE),
        ("3.5 in", u.DIAMETER),
        ("10 mph", u.SPEED),
        ("77 degF", u.TEMPERATURE),
        ("2.5 mm^2", u.AREA),
        ("120 mohm", u.RESISTANCE),
        ("8 %", u.GRADE),
    ],
)
def test_parsed_quantity_is_pints_conversion_in_the_fixed_unit(text, dimension) -> None:
    parsed = qt.parse_quantity(text, dimension)
    number, _, written = text.partition(" ")
    reference = u.Quantity(float(number), u.unit(written.replace("^", "**"))).to(dimension.unit)
    assert parsed.magnitude == pytest.approx(reference.magnitude, rel=1e-12)
    assert parsed._units is u.unit(dimension.unit)._units  # shared: in_unit needs no conversion
    assert qt.parse_quantity(text, dimension).__dict__ == parsed.__dict__  # again, from the cache


@pytest.mark.parametrize(
    ("text", "message"),
    [
        ("21 Vx", "unknown unit 'Vx' in '21 Vx'"),
        ("21 A", "'21 A' is not a voltage; expected a unit like 'V', e.g. '24 V'"),
    ],
)
def test_unit_errors_are_the_same_each_time(text: str, message: str) -> None:
    for _ in range(2):  # the second time, after the first was not cached
        with pytest.raises(u.QuantityError) as caught:
            qt.parse_quantity(text, u.VOLTAGE)
        assert str(caught.value) == message


def test_is_offset_matches_pint() -> None:
    for unit_text in ["degC", "degF", "kelvin", "V", "mm**2", "percent"]:
        one = u.Quantity(1.0, unit_text)
        assert u.is_offset(one) is (not one._is_multiplicative)


def _finding() -> Finding:
    return Finding(
        Severity.FIX,
        "wire 'pack positive'",
        "Too thin.",
        u.quantity(31.0, "A"),
        u.quantity(25.0, "A"),
        Comparison.AT_MOST,
        "use 12 AWG or heavier",
        (Source("NEC (NFPA 70) Table 310.16"),),
    )


def test_stamped_finding_is_the_replaced_one() -> None:
    finding = _finding()
    _ = finding.margin  # a cached figure on the original is carried over unchanged
    stamped = finding.stamped("wiring.stall-current", "Wire survives the stall")
    replaced = dataclasses.replace(
        finding, rule_id="wiring.stall-current", title="Wire survives the stall"
    )
    assert stamped == replaced
    assert dataclasses.asdict(stamped) == dataclasses.asdict(replaced)
    assert stamped.margin == replaced.margin and stamped.headroom == replaced.headroom
    assert finding.rule_id == ""  # the original is untouched
    with pytest.raises(dataclasses.FrozenInstanceError):
        stamped.subject = "x"  # type: ignore[misc]


def test_stamping_a_finding_subclass_uses_replace() -> None:
    @dataclasses.dataclass(frozen=True)
    class Checked(Finding):
        def __post_init__(self) -> None:
            if self.rule_id.startswith("refused."):
                raise ValueError("refused rule id")

    with pytest.raises(ValueError, match="refused rule id"):  # __init__ ran again, as replace does
        Checked(Severity.PASS, "s", "r").stamped("refused.one", "T")


@settings(max_examples=500)
@given(text=st.text())
def test_markdown_escaping_shortcut_equals_the_full_table(text: str) -> None:
    assert markdown_text(text) == text.translate(_MD_TABLE)


def test_program_exit_and_output_match_main(tmp_path) -> None:
    """``python -m reviewer`` writes the same review and exits with the same code as main()
    called in this process; main() alone leaves the collector as it found it."""
    build = SAMPLES / "allotment-cargo-trike.toml"
    here, there = tmp_path / "here.md", tmp_path / "there.md"
    before = gc.get_threshold()
    code = main(["review", str(build), "-o", str(here)])
    assert gc.get_threshold() == before
    done = subprocess.run(
        [sys.executable, "-m", "reviewer", "review", str(build), "-o", str(there)],
        cwd=ROOT,
        capture_output=True,
        text=True,
        check=False,
    )
    assert done.returncode == code
    assert there.read_bytes() == here.read_bytes()


def test_program_sets_the_collector_and_freezes_at_exit(tmp_path) -> None:
    probe = (
        "import gc, sys\n"
        "from reviewer import cli\n"
        f"sys.argv = ['firstride', 'review', {str(SAMPLES / 'quayside-commuter.toml')!r},"
        f" '-o', {str(tmp_path / 'r.md')!r}]\n"
        "try:\n"
        "    cli.run()\n"
        "except SystemExit as exc:\n"
        "    print(exc.code, gc.get_threshold()[0], gc.get_freeze_count() > 0)\n"
    )
    done = subprocess.run(
        [sys.executable, "-c", probe], cwd=ROOT, capture_output=True, text=True, check=True
    )
    assert done.stdout.split() == ["0", str(PROGRAM_GC_THRESHOLD), "True"]
