"""IP codes against IEC 60529: digit meanings, which code meets which, and what is not a code."""

from __future__ import annotations

import pytest
from pydantic import ValidationError

from reviewer.engineering.ingress import (
    SOLIDS,
    WATER,
    describe_code,
    parse_ip_code,
    required_code_text,
)
from reviewer.testing import make_build

# --- digit meanings ---------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("digit", "words"),
    [
        (0, "not protected"),  # IEC 60529, clause 5
        (1, "50 mm"),  # IEC 60529, clause 5
        (2, "12.5 mm"),  # IEC 60529, clause 5 (a finger)
        (3, "2.5 mm"),  # IEC 60529, clause 5
        (4, "1.0 mm"),  # IEC 60529, clause 5
        (5, "dust-protected"),  # IEC 60529, clause 5
        (6, "dust-tight"),  # IEC 60529, clause 5
    ],
)
def test_solids_digit_meaning(digit: int, words: str) -> None:
    assert words in SOLIDS[digit]
    code = parse_ip_code(f"IP{digit}X")
    assert code.solids == digit
    assert code.water is None
    assert words in describe_code(code)


def test_solids_digits_stop_at_six() -> None:
    assert sorted(SOLIDS) == list(range(7))  # IEC 60529, clause 5: digits 0 to 6


@pytest.mark.parametrize(
    ("digit", "words"),
    [
        (0, "not protected"),  # IEC 60529, clause 6
        (1, "vertically falling drops"),  # IEC 60529, clause 6
        (2, "15 degrees"),  # IEC 60529, clause 6
        (3, "60 degrees"),  # IEC 60529, clause 6
        (4, "splashing"),  # IEC 60529, clause 6
        (5, "6.3 mm nozzle, 12.5 l/min"),  # IEC 60529, clause 6
        (6, "12.5 mm nozzle, 100 l/min"),  # IEC 60529, clause 6
        (7, "30 min at 1 m"),  # IEC 60529, clause 6
        (8, "continuous immersion"),  # IEC 60529, clause 6
        (9, "high-pressure, high-temperature"),  # IEC 60529, clause 6
    ],
)
def test_water_digit_meaning(digit: int, words: str) -> None:
    assert words in WATER[digit]
    code = parse_ip_code(f"IPX{digit}")
    assert code.water == digit
    assert code.solids is None
    assert words in describe_code(code)


# --- which code meets which -------------------------------------------------------------------


@pytest.mark.parametrize("held", range(7))
def test_solids_digit_implies_every_lower_one(held: int) -> None:
    code = parse_ip_code(f"IP{held}0")
    for required in range(7):  # IEC 60529, clause 5: a digit implies the lower ones
        assert code.meets_solids(required) is (required <= held)


@pytest.mark.parametrize("held", range(7))
def test_water_digit_up_to_six_implies_every_lower_one(held: int) -> None:
    code = parse_ip_code(f"IP0{held}")
    for required in range(7):  # IEC 60529, clause 6: up to 6 a digit implies the lower ones
        assert code.meets_water(required) is (required <= held)


def test_ipx6_meets_ipx4() -> None:
    assert parse_ip_code("IPX6").meets_water(4)  # IEC 60529, clause 6


@pytest.mark.parametrize("immersion", ["IPX7", "IPX8"])
def test_immersion_does_not_meet_jets(immersion: str) -> None:
    code = parse_ip_code(immersion)
    assert not code.meets_water(5)  # IEC 60529, clause 6: 7 and 8 do not imply 5 or 6
    assert not code.meets_water(6)  # IEC 60529, clause 6
    assert code.immersion_only


def test_jets_do_not_meet_immersion() -> None:
    assert not parse_ip_code("IPX6").meets_water(7)  # IEC 60529, clause 6
    assert not parse_ip_code("IPX5").meets_water(8)  # IEC 60529, clause 6


def test_ipx9_implies_neither_jets_nor_immersion() -> None:
    code = parse_ip_code("IPX9")
    assert code.meets_water(9)  # IEC 60529, clause 6
    assert not code.meets_water(5)  # IEC 60529, clause 6: 9 does not imply 5 or 6
    assert not code.meets_water(6)
    assert not code.meets_water(7)


def test_immersion_is_read_as_covering_splashing() -> None:
    # Reading chosen by this tool (IEC 60529 says only that 7-9 do not imply 5 or 6): an
    # immersion rating is taken to cover drips, spray and splashing.
    assert parse_ip_code("IPX7").meets_water(4)  # from memory
    assert parse_ip_code("IPX8").meets_water(7)  # IEC 60529: the 8 test is more severe than 7


def test_dual_marking_claims_both() -> None:
    code = parse_ip_code("IPX5/IPX7")
    assert code.meets_water(5)  # IEC 60529, clause 6: dual marking claims both codes
    assert code.meets_water(7)
    assert code.meets_water(4)
    assert not code.meets_water(6)  # neither mark covers powerful jets
    assert code.water_marks == (5, 7)
    assert not code.immersion_only


def test_dual_marking_keeps_the_best_solids_digit() -> None:
    code = parse_ip_code("IP65/IP67")
    assert code.solids == 6
    assert code.meets(parse_ip_code("IP55")) == (True, True)  # IEC 60529, clauses 5 and 6


def test_x_digits_meet_nothing_above_zero() -> None:
    code = parse_ip_code("IPXX")
    assert code.meets_solids(0) and code.meets_water(0)  # IEC 60529: X = not tested
    assert not code.meets_solids(1)
    assert not code.meets_water(1)
    assert not code.water_protected
    assert not parse_ip_code("IP2X").meets_water(1)
    assert not parse_ip_code("IPX4").meets_solids(1)


def test_water_digit_zero_is_no_protection() -> None:
    assert not parse_ip_code("IP60").water_protected  # IEC 60529, clause 6: 0 not protected
    assert parse_ip_code("IP61").water_protected


def test_meets_reports_each_digit_separately() -> None:
    minimum = parse_ip_code("IP55")
    assert parse_ip_code("IP54").meets(minimum) == (True, False)  # IEC 60529, clauses 5 and 6
    assert parse_ip_code("IP45").meets(minimum) == (False, True)
    assert parse_ip_code("IP66").meets(minimum) == (True, True)
    assert parse_ip_code("IPX7").meets(minimum) == (False, False)
    assert parse_ip_code("IP67").meets(parse_ip_code("IP2X")) == (True, True)


@pytest.mark.parametrize("required", [-1, 10])
def test_water_requirement_outside_the_digits_is_an_error(required: int) -> None:
    with pytest.raises(ValueError, match="0 to 9"):
        parse_ip_code("IPX4").meets_water(required)


def test_solids_requirement_outside_the_digits_is_an_error() -> None:
    with pytest.raises(ValueError, match="0 to 6"):
        parse_ip_code("IP4X").meets_solids(7)


# --- optional letters and spelling ------------------------------------------------------------


def test_additional_letter() -> None:
    code = parse_ip_code("IP20D")  # IEC 60529: additional letter A-D (access by a wire)
    assert (code.solids, code.water, code.additional, code.supplementary) == (2, 0, "D", "")


def test_supplementary_letter() -> None:
    code = parse_ip_code("IP54M")  # IEC 60529: supplementary letter M (moving during test)
    assert (code.solids, code.water, code.additional, code.supplementary) == (5, 4, "", "M")


def test_additional_and_supplementary_letters_together() -> None:
    code = parse_ip_code("IPX3CHW")  # IEC 60529: supplementary letters in alphabetical order
    assert (code.additional, code.supplementary) == ("C", "HW")


def test_case_and_spaces_are_forgiven() -> None:
    assert parse_ip_code(" ip 54 ").text == "IP54"
    assert parse_ip_code("IPX5/X7").water_marks == (5, 7)


# --- what is not an IP code -------------------------------------------------------------------


@pytest.mark.parametrize(
    "text",
    [
        "IP",  # no digits
        "54",  # no IP prefix
        "IPA4",  # a letter where the solids digit goes
        "IP5",  # one digit only
        "IP545",  # three digits
        "IPXA",  # a letter where the water digit goes
        "IP54E",  # E is neither an additional nor a supplementary letter
        "IP54MM",  # supplementary letter twice
        "IP54SM",  # supplementary letters out of alphabetical order
        "IPX5/",  # dual marking with an empty half
        "",
    ],
)
def test_malformed_codes_are_rejected(text: str) -> None:
    with pytest.raises(ValueError, match="IP code"):
        parse_ip_code(text)


@pytest.mark.parametrize("text", ["IP7X", "IP84", "IP9X"])
def test_solids_digit_above_six_is_rejected(text: str) -> None:
    with pytest.raises(ValueError, match="0 to 6"):  # IEC 60529, clause 5: first digit max 6
        parse_ip_code(text)


def test_build_rejects_a_malformed_code_at_load_time() -> None:
    with pytest.raises(ValidationError, match="0 to 6"):
        make_build({"enclosure": {"battery_ip": "IP7X"}})
    build = make_build({"enclosure": {"battery_ip": "IPX5/IPX7"}})
    assert build.enclosure is not None and build.enclosure.battery is not None
    assert build.enclosure.battery.meets_water(5)


# --- remedy wording ---------------------------------------------------------------------------


def test_jets_requirement_warns_about_immersion_only_parts() -> None:
    text = required_code_text(parse_ip_code("IP55"))
    assert text.startswith("an enclosure rated IP55 or better")
    assert "IPX7 alone does not cover jets" in text  # IEC 60529, clause 6
    assert "IPX5/IPX7" in text


def test_immersion_requirement_warns_about_jets_only_parts() -> None:
    text = required_code_text(parse_ip_code("IP67"))
    assert "does not cover immersion" in text  # IEC 60529, clause 6
    assert "IPX7" not in required_code_text(parse_ip_code("IP44"))
