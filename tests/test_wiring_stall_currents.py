"""The what-if stall currents the wire rules' remedies ask for, with some wires resized: the
loop equations on the changed resistances, at a cost that does not grow with the wires left
alone."""

from __future__ import annotations

import random

import pytest
from firstride_rules.wiring._model import Conductor, StallContext

from reviewer import figures
from reviewer.figures.stall import StallLoop

PAIR = figures.PHASES_IN_SERIES


def _conductor(index: int, motor: str | None, r20: float, phase: bool = False) -> Conductor:
    return Conductor(index, f"w{index}", motor, 2.0, 14, 1.0, r20, None, None, 1, None, phase)


def _context(voltage: float, shared: float, branches: dict[str, float]) -> StallContext:
    loop = StallLoop(voltage, shared, dict(branches), {}, 0.0, True)
    return StallContext(None, loop, voltage, 25.0, {}, {}, {}, None)  # type: ignore[arg-type]


def _by_every_wire(ctx: StallContext, changed: dict[int, float], wires: list[Conductor]):
    """The same currents by visiting every wire: the oracle for the cheaper walk."""
    shared = ctx.loop.shared_resistance
    branches = dict(ctx.loop.branch_resistance)
    phases: dict[str, tuple[list[float], list[float]]] = {}
    for wire in wires:
        now = changed.get(wire.index, wire.r20)
        if wire.phase and wire.motor is not None:
            before, after = phases.setdefault(wire.motor, ([], []))
            before.append(wire.r20)
            after.append(now)
        elif wire.index in changed:
            if wire.motor is None:
                shared += now - wire.r20
            else:
                branches[wire.motor] += now - wire.r20
    for motor, (before, after) in phases.items():
        branches[motor] += sum(sorted(after)[:PAIR]) - sum(sorted(before)[:PAIR])
    return figures.stall_currents(ctx.loop.voltage, shared, branches)


def test_one_motor_stall_follows_ohms_law_with_a_wire_resized() -> None:
    # Ohm's law, I = V / R (any circuits text): 36 V across 0.05 ohm shared and 0.25 ohm in the
    # motor's branch gives 120 A; a battery wire cut from 0.02 to 0.005 ohm takes 0.015 ohm out
    wires = [_conductor(0, None, 0.02), _conductor(1, "m", 0.03)]
    ctx = _context(36.0, 0.05, {"m": 0.25})
    total, per_motor = ctx.currents({}, wires)
    assert total == pytest.approx(120.0) and per_motor["m"] == pytest.approx(120.0)
    total, _ = ctx.currents({0: 0.005}, wires)
    assert total == pytest.approx(36.0 / (0.3 - 0.015))
    # the two phase leads of least resistance carry a brushless stall (line to line)
    leads = [_conductor(2 + k, "m", r, phase=True) for k, r in enumerate((0.01, 0.02, 0.04))]
    total, _ = ctx.currents({4: 0.001}, wires + leads)  # the 0.04 lead becomes the least
    assert total == pytest.approx(36.0 / (0.3 - 0.03 + 0.011))


def test_the_changed_wires_alone_give_what_every_wire_gives() -> None:
    rng = random.Random(20261203)
    motors = ["front", "rear", "aux"]
    wires = []
    for index in range(120):
        motor = rng.choice([None, *motors])
        phase = motor is not None and rng.random() < 0.5
        wires.append(_conductor(index, motor, rng.uniform(0.001, 0.05), phase))
    ctx = _context(48.0, 0.04, {m: rng.uniform(0.1, 0.4) for m in motors})
    for _ in range(200):
        chosen = rng.sample(range(len(wires)), rng.randint(0, 6))
        changed = {i: rng.uniform(0.0005, 0.06) for i in chosen}
        assert ctx.currents(changed, wires) == _by_every_wire(ctx, changed, wires)
