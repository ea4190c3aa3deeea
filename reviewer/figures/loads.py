"""What the pack feeds besides the motors: the logic board and the brake relay coil."""

from __future__ import annotations

from dataclasses import dataclass

from reviewer.build import Build
from reviewer.units import in_unit


@dataclass(frozen=True)
class AuxiliaryLoad:
    """Current the pack feeds besides the motors: the logic board (through a regulator fed from
    the pack) and the brake relay's coil, in A; and the fields of parts present whose current
    the build does not give."""

    current: float
    parts: tuple[tuple[str, float], ...]  # ("logic board", 0.12): each part and its current, A
    missing: tuple[str, ...]


def auxiliary_current(build: Build) -> AuxiliaryLoad:
    """Logic board current (counted at the pack as drawn: a linear regulator passes its output
    current through, a switching one draws less, so this errs high) and brake relay coil."""
    current, parts, missing = 0.0, [], []
    logic = build.logic
    board = logic is not None and logic.present  # present = false: no separate logic board
    if board and (logic.regulator is None or logic.regulator.fed_from_pack):
        if logic.board_current is None:
            missing.append("logic.board_current")
        else:
            amps = in_unit(logic.board_current, "mA") / 1000
            current += amps
            parts.append(("logic board", amps))
    for index, brake in build.relay_brakes():
        if brake.coil_current is None:
            missing.append(f"brakes[{index}].coil_current")
        else:
            amps = in_unit(brake.coil_current, "mA") / 1000
            current += amps
            parts.append((_coil_name(build, index), amps))
    return AuxiliaryLoad(current, tuple(parts), tuple(missing))


def _coil_name(build: Build, index: int) -> str:
    """'brake relay coil', or with the brake's name where a build has several relays."""
    if len(build.relay_brakes()) == 1:
        return "brake relay coil"
    brake = (build.brakes or [])[index]
    return f"brake relay coil '{brake.name or f'brakes[{index}]'}'"
