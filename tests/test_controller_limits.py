"""The controller's two limits as the build model and the shared figures read them (issue 10)."""

from __future__ import annotations

import math

import pytest

from reviewer import figures
from reviewer.cli import main
from reviewer.testing import make_build

BRUSHLESS = {"name": "hub", "type": "brushless", "kv": "12 rpm/V", "winding_resistance": "0.2 ohm"}
PACK = {"chemistry": "li-ion", "cells_series": 10}  # 42 V full (Linden, from memory)


def _build(controller: dict, motor: dict | None = None):
    return make_build({"battery": PACK, "motors": [motor or BRUSHLESS], "controller": controller})


def test_the_old_single_limit_is_an_input_error_that_explains_the_split(
    write_build, capsys
) -> None:
    path = write_build(
        '[vehicle]\nname = "x"\nkind = "kart"\n[controller]\ncurrent_limit = "20 A"\n'
    )
    assert main(["review", str(path)]) == 2
    err = capsys.readouterr().err
    assert err.count("\n") == 1
    assert "motor_current_limit" in err and "battery_current_limit" in err and "controller" in err


def test_a_field_oriented_peak_limit_is_sqrt3_over_2_of_its_amps() -> None:
    # brief 11, three-phase power balance: T = (sqrt 3 / 2) Ke_LL I_pk
    limit = figures.motor_limit(
        build := _build(
            {
                "drive": "field-oriented",
                "motor_current_limit": "40 A",
                "motor_current_basis": "peak",
            }
        ),
        build.motors[0],
    )
    assert limit.low == limit.high == pytest.approx(40 * math.sqrt(3) / 2)
    assert limit.phase_peak == pytest.approx(40.0)


def test_an_unstated_basis_spans_every_reading_and_says_so() -> None:
    build = _build({"drive": "field-oriented", "motor_current_limit": "40 A"})
    limit = figures.motor_limit(build, build.motors[0])
    # peak reading (least torque) to rms reading I_pk = sqrt 2 I_rms (most heat), brief 11
    assert limit.low == pytest.approx(40 * math.sqrt(3) / 2)
    assert limit.high == pytest.approx(40 * math.sqrt(2) * math.sqrt(3) / 2)
    assert limit.basis_assumed and limit.phase_peak == pytest.approx(40 * math.sqrt(2))


def test_a_brushed_limit_is_taken_as_it_stands() -> None:
    motor = {"name": "m", "type": "brushed", "kv": "100 rpm/V", "winding_resistance": "0.2 ohm"}
    build = _build({"motor_current_limit": "25 A"}, motor)
    limit = figures.motor_limit(build, build.motors[0])
    assert (limit.low, limit.high, limit.drive) == (25.0, 25.0, "brushed")


def test_battery_wires_see_the_battery_limit_and_the_motor_limit_where_it_is_lower() -> None:
    both = _build(
        {"drive": "six-step", "motor_current_limit": "35 A", "battery_current_limit": "15 A"}
    )
    assert figures.battery_design_current(both, both.motors[0]) == figures.DesignCurrent(
        15.0, "battery limit"
    )
    motor_only = _build({"drive": "six-step", "motor_current_limit": "35 A"})
    design = figures.battery_design_current(motor_only, motor_only.motors[0])
    assert design.amps == 35.0 and design.basis == "motor limit"  # duty near 1 at full speed
    assert figures.battery_design_current(_build({}), _build({}).motors[0]) is None


def test_a_locked_rotor_draws_little_from_the_pack_but_all_of_the_motor_limit() -> None:
    # energy balance at a stall: V I_b = I^2 R (brief 11): 35 A through 0.2 ohm from 42 V
    build = _build({"drive": "six-step", "motor_current_limit": "35 A"})
    point = figures.stall_point(build, "hub")
    assert point.motor_current == pytest.approx(35.0)
    assert point.battery_current == pytest.approx(35.0**2 * 0.2 / 42.0, rel=1e-9)
    assert point.copper_loss <= point.electrical_input + 1e-9


def test_a_battery_limit_alone_still_lets_sqrt_ib_v_over_r_into_a_locked_motor() -> None:
    # R I^2 = I_b V at a stall: 15 A x 42 V / 0.2 ohm -> 56.1 A (brief 11, derived)
    build = _build({"drive": "six-step", "battery_current_limit": "15 A"})
    point = figures.stall_point(build, "hub")
    assert point.motor_current == pytest.approx(math.sqrt(15 * 42 / 0.2), rel=1e-9)
    assert point.battery_current == pytest.approx(15.0)


@pytest.mark.parametrize(
    ("controller", "seconds", "kind", "basis"),
    [
        ({"motor_current_limit": "20 A"}, None, "software (kind unstated)", "not known"),
        (
            {
                "motor_current_limit": "20 A",
                "current_limit_kind": "hardware",
                "current_limit_response": "50 us",
            },
            50e-6,
            "hardware",
            "stated",
        ),
        # 200 samples at 10 kHz average over 20 ms: the limit can act no sooner
        (
            {
                "motor_current_limit": "20 A",
                "current_limit_kind": "software",
                "current_samples_averaged": 200,
                "current_sample_rate": "10 kHz",
                "current_limit_response": "1 ms",
            },
            0.02,
            "software",
            "averaging window",
        ),
        ({}, None, "none", "not known"),
    ],
)
def test_one_response_figure_for_every_rule(controller, seconds, kind, basis) -> None:
    response = figures.limit_response(_build(controller))
    assert response.kind == kind and response.basis == basis
    assert response.seconds == (None if seconds is None else pytest.approx(seconds))


def test_a_hub_motor_turns_with_its_wheel() -> None:
    build = make_build({"drivetrain": {"hub_motor": True, "wheel_diameter": "254 mm"}})
    assert build.drivetrain.reduction == 1.0
    with pytest.raises(Exception, match="hub motor"):
        make_build({"drivetrain": {"hub_motor": True, "ratio": 4}})


def test_kv_from_a_no_load_speed_takes_the_no_load_drop_out_once() -> None:
    # DC machine equation (Chapman, from memory): E = V - I0 R at no load; 3564 rpm at 36 V with
    # 1.2 A through 0.3 ohm: Kv = 3564 / 35.64 = 100 rpm/V, not 3564 / 36 = 99 rpm/V
    motor = {
        "name": "m",
        "type": "brushed",
        "no_load_speed": "3564 rpm",
        "rated_voltage": "36 V",
        "no_load_current": "1.2 A",
        "winding_resistance": "0.3 ohm",
    }
    build = make_build({"motors": [motor]})
    assert build.motors[0].effective_kv.m_as("rpm/V") == pytest.approx(100.0)


def test_the_schema_describes_the_new_fields_each_with_an_example_of_its_own() -> None:
    from reviewer.build import build_json_schema

    defs = build_json_schema()["$defs"]
    fields = {
        "Controller": (
            "motor_current_limit",
            "battery_current_limit",
            "rated_continuous_current",
            "peak_current",
            "peak_duration",
            "max_input_voltage",
            "regen_current_limit",
        ),
        "Motor": ("winding_inductance",),
    }
    for model, names in fields.items():
        for name in names:
            field = defs[model]["properties"][name]
            assert len(field["description"]) > 40, name  # its own words, then the unit's
            assert field["examples"], name
    controller = defs["Controller"]["properties"]
    assert controller["peak_duration"]["examples"] == ["10 s"]  # not the generic "10 ms"
    assert controller["motor_current_limit"]["description"].startswith("per motor")
    for name in ("drive", "current_limit_kind", "motor_current_basis"):
        assert controller[name].get("description"), name
