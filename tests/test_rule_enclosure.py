"""enclosure.ingress: IP codes against the riding conditions, and lithium packs under a deck."""

from __future__ import annotations

from typing import Any

from firstride_rules.enclosure.ingress import RULE

from reviewer.findings import Severity
from reviewer.testing import rule_outputs, run_rule_on

LITHIUM = {"chemistry": "li-ion", "cells_series": 10, "cells_parallel": 2}


def _build(
    conditions: str | None = "wet",
    kind: str = "scooter",
    battery: dict[str, Any] | None = None,
    **enclosure: Any,
) -> dict[str, Any]:
    data: dict[str, Any] = {
        "vehicle": {"name": "test deck", "kind": kind},
        "battery": LITHIUM if battery is None else battery,
        "enclosure": enclosure,
    }
    if conditions is not None:
        data["usage"] = {"conditions": conditions}
    return data


def _by_subject(data: dict[str, Any]) -> dict[str, Any]:
    findings = run_rule_on(RULE, data)
    subjects = [f.subject for f in findings]
    assert len(subjects) == len(set(subjects)), "one finding per subject"
    return {f.subject: f for f in findings}


def test_rule_identity() -> None:
    assert RULE.id == "enclosure.ingress"
    assert "IEC 60529" in RULE.doc
    assert RULE.sources


def test_pass_with_codes_that_meet_wet_use() -> None:
    found = _by_subject(
        _build(electronics_ip="IP66", battery_ip="IP65/IP67", battery_hard_case=True)
    )
    # IEC 60529, clauses 5 and 6: 6 >= 5 for both digits; 5 of a dual marking meets 5
    assert found["electronics enclosure"].severity is Severity.PASS
    assert found["battery enclosure"].severity is Severity.PASS
    assert found["battery housing"].severity is Severity.PASS
    assert "IP55" in found["electronics enclosure"].rationale  # the profile's wet minimum


def test_derived_figure_names_the_minimum() -> None:
    _, figures, _ = rule_outputs(RULE, _build(conditions="damp", electronics_ip="IP54"))
    assert [(f.name, f.value) for f in figures] == [("minimum IP code for damp use", "IP44")]


def test_water_below_minimum_is_fix_with_the_code_needed() -> None:
    found = _by_subject(_build(conditions="damp", electronics_ip="IP43", battery_ip="IP54"))
    electronics = found["electronics enclosure"]
    assert electronics.severity is Severity.FIX  # IEC 60529, clause 6: 3 does not meet 4
    assert "IP44" in (electronics.remedy or "")
    assert found["battery enclosure"].severity is Severity.PASS


def test_solids_below_minimum_is_fix() -> None:
    found = _by_subject(_build(conditions="dry", electronics_ip="IP10", battery_ip="IP20"))
    assert found["electronics enclosure"].severity is Severity.FIX  # clause 5: 1 < 2 (finger)
    assert "solids digit 1" in found["electronics enclosure"].rationale
    assert found["battery enclosure"].severity is Severity.PASS


def test_immersion_rated_battery_does_not_meet_jets_and_says_so() -> None:
    found = _by_subject(_build(electronics_ip="IP65", battery_ip="IP67", battery_hard_case=True))
    battery = found["battery enclosure"]
    # IEC 60529, clause 6: 7 does not imply 5; the pack still has water protection: fix
    assert battery.severity is Severity.FIX
    assert "does not cover water jets" in battery.rationale
    assert "IPX5/IPX7" in (battery.remedy or "")
    assert "IP55" in (battery.remedy or "")


def test_dual_marked_battery_meets_jets() -> None:
    found = _by_subject(
        _build(electronics_ip="IP65", battery_ip="IP5X/IPX5/IPX7", battery_hard_case=True)
    )
    assert found["battery enclosure"].severity is Severity.PASS  # IEC 60529, clause 6


def test_wet_battery_with_no_water_protection_is_stop() -> None:
    for code in ("IP50", "IP5X"):  # IEC 60529, clause 6: 0 not protected, X not tested
        found = _by_subject(_build(electronics_ip="IP55", battery_ip=code, battery_hard_case=True))
        assert found["battery enclosure"].severity is Severity.STOP, code
        assert found["electronics enclosure"].severity is Severity.PASS


def test_wet_electronics_with_no_water_protection_stays_fix() -> None:
    found = _by_subject(_build(electronics_ip="IP50", battery_ip="IP55", battery_hard_case=True))
    assert found["electronics enclosure"].severity is Severity.FIX


def test_unprotected_battery_in_damp_use_is_fix_not_stop() -> None:
    found = _by_subject(_build(conditions="damp", electronics_ip="IP44", battery_ip="IP40"))
    assert found["battery enclosure"].severity is Severity.FIX  # clause 6: 0 < 4


def test_unhoused_lithium_pack_under_a_skateboard_deck_is_stop() -> None:
    findings, _, assumptions = rule_outputs(
        RULE,
        _build(
            kind="skateboard", electronics_ip="IP55", battery_ip="IP55", battery_hard_case=False
        ),
    )
    housing = next(f for f in findings if f.subject == "battery housing")
    assert housing.severity is Severity.STOP  # common practice: soft lithium pack under a deck
    assert "rigid" in (housing.remedy or "")
    assert any("under the deck" in a.text for a in assumptions)


def test_unhoused_lithium_pack_stated_under_deck_is_stop() -> None:
    data = _build(battery_ip="IP55", battery_hard_case=False, battery_under_deck=True)
    data["battery"] = {"chemistry": "lipo", "cells_series": 6}
    assert _by_subject(data)["battery housing"].severity is Severity.STOP  # common practice


def test_unhoused_lithium_pack_not_under_a_deck_is_advise() -> None:
    data = _build(battery_hard_case=False, battery_under_deck=False)
    assert _by_subject(data)["battery housing"].severity is Severity.ADVISE  # common practice


def test_non_lithium_pack_gets_no_housing_finding() -> None:
    lead = {"chemistry": "lead-acid", "cells_series": 12}
    found = _by_subject(_build(kind="skateboard", battery=lead, battery_hard_case=False))
    assert "battery housing" not in found


def test_unknown_conditions_are_unassessed() -> None:
    found = _by_subject(_build(conditions=None, electronics_ip="IP55", battery_ip="IP55"))
    for subject in ("electronics enclosure", "battery enclosure"):
        assert found[subject].severity is Severity.UNASSESSED
        assert found[subject].missing == ("usage.conditions",)


def test_missing_codes_are_unassessed_and_named() -> None:
    found = _by_subject(_build(kind="scooter"))
    assert found["electronics enclosure"].missing == ("enclosure.electronics_ip",)
    assert found["battery enclosure"].missing == ("enclosure.battery_ip",)
    assert found["battery housing"].severity is Severity.UNASSESSED
    assert found["battery housing"].missing == (
        "enclosure.battery_hard_case",
        "enclosure.battery_under_deck",
    )


def test_no_enclosure_and_no_battery_sections() -> None:
    found = _by_subject({"vehicle": {"name": "bare", "kind": "kart"}})
    assert all(f.severity is Severity.UNASSESSED for f in found.values())
    assert found["battery housing"].missing == ("battery.chemistry",)
    assert found["electronics enclosure"].missing == (
        "usage.conditions",
        "enclosure.electronics_ip",
    )
