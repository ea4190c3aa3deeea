"""brake.stopping, part two: what each brake gives one rider at each speed, what the tyres let
the brakes use, and the stop they make together.

A friction or foot brake gives what the builder knows of it: a force at the ground, a mean
deceleration or a tested stop (v^2 / 2 s), at the mass it was rated or tested with. A heavier
rider gets the same force, so less deceleration (a x m_test / m); a lighter one is given no more
than the rating (the pessimistic side both ways). A dynamic brake gives its shorted-winding
force, in proportion to speed (brake.dynamic's loops, with the winding inductance); a
regenerative one the energy-balance force of ``rules._shared.regen``. Tyre friction caps each
axle at mu g cos(theta) x its share of the weight while braking, and all brakes together at
mu g cos(theta) (brief 14; Coulomb friction on an incline).

The stop is integrated over speed, s = v t_r + integral of v dv / (a(v) - g sin theta), with
the speed gained on a descent during the reaction time counted (rolling resistance and drag,
which help, left out). A brake set whose net deceleration is not positive down to standstill
never brings the vehicle to rest: the distance is infinite.

SI floats throughout: m/s, m/s^2, kg, m, s.
"""

from __future__ import annotations

import itertools
import math
from collections.abc import Callable
from dataclasses import dataclass

from firstride_rules._shared.regen import regen_force
from firstride_rules.brake._loops import braking_loops, force_per_speed, inductive_share

from reviewer.build import Brake, BrakeKind, BrakePosition, Build
from reviewer.engineering.roadload import STANDARD_GRAVITY, Drive
from reviewer.engineering.stopping import grade_percent_to_angle
from reviewer.profile import Profile
from reviewer.units import in_unit

_STEPS = 64  # Simpson intervals over each smooth piece of the speed range

#: Where a fitted friction brake goes in the build file, for a remedy to name.
FRICTION_FIELDS = 'then a [[brakes]] entry: brakes[].kind = "friction", brakes[].deceleration'


@dataclass(frozen=True)
class BrakeEffect:
    """One brake's deceleration for one rider, against speed (None where it is unknown)."""

    index: int
    brake: Brake
    axle: str  # "front", "rear" or "all"
    at: Callable[[float], float] | None
    how: str  # what the figure rests on, in words
    missing: tuple[str, ...] = ()

    @property
    def label(self) -> str:
        return brake_label(self.brake, self.index)


def brake_label(brake: Brake, index: int) -> str:
    """'brake 'rear disc'' or 'brakes[1] (friction)'."""
    if brake.name is not None:
        return f"brake '{brake.name}'"
    return f"brakes[{index}] ({brake.kind.value})"


def axle_of(brake: Brake) -> str:
    """The axle group a brake's grip comes from; a motor's or an unstated one is the rear,
    the axle with the least grip under braking."""
    if brake.acts_on is BrakePosition.FRONT:
        return "front"
    if brake.acts_on is BrakePosition.BOTH:
        return "all"
    return "rear"


def grip_caps(profile: Profile, friction: float, descent_percent: float) -> dict[str, float]:
    """What tyre friction lets the brakes of each axle group use, m/s^2."""
    whole = friction * STANDARD_GRAVITY * math.cos(grade_percent_to_angle(descent_percent))
    front = float(profile.limit("brake.axle_share.front").value)  # type: ignore[arg-type]
    rear = float(profile.limit("brake.axle_share.rear").value)  # type: ignore[arg-type]
    return {"front": whole * front, "rear": whole * rear, "all": whole}


def combined(effects: list[BrakeEffect], caps: dict[str, float], speed: float) -> float:
    """All the given brakes together at ``speed``, each axle group and the whole capped by the
    tyres' grip, before the slope's pull (m/s^2); unknown brakes count nothing."""
    groups = {"front": 0.0, "rear": 0.0, "all": 0.0}
    for effect in effects:
        if effect.at is not None:
            value = effect.at(speed)
            assert value >= 0.0, "a brake never accelerates the vehicle"
            groups[effect.axle] += value
    total = min(groups["front"], caps["front"]) + min(groups["rear"], caps["rear"])
    return min(total + groups["all"], caps["all"])


def stopping_distance(
    deceleration: Callable[[float], float],
    speed: float,
    reaction_time: float,
    descent_percent: float = 0.0,
    *,
    constant: bool = False,
    kinks: tuple[float, ...] = (),
) -> float:
    """Distance in m from the moment a hazard appears to standstill (``math.inf`` if the net
    deceleration is not positive all the way down). ``constant``: the deceleration does not
    depend on speed (v^2 / 2a, exact); else Simpson's rule over speed, split at ``kinks`` (speeds
    where it jumps, a regenerative brake's fade)."""
    pull = STANDARD_GRAVITY * math.sin(grade_percent_to_angle(descent_percent))
    gain = max(pull, 0.0)  # a climb's help during the reaction is left out
    braking_from = speed + gain * reaction_time
    reaction = speed * reaction_time + 0.5 * gain * reaction_time * reaction_time

    def net(v: float) -> float:
        return deceleration(v) - pull

    if net(0.0) <= 0.0:
        return math.inf
    if constant:
        return reaction + braking_from * braking_from / (2.0 * net(0.0))
    edges = [0.0, *sorted(k for k in kinks if 0.0 < k < braking_from), braking_from]
    total = 0.0
    for low, high in itertools.pairwise(edges):
        # just inside each piece, so a jump at an edge is taken from the side it belongs to
        piece = _simpson(net, low + 1e-9 * (high - low), high - 1e-9 * (high - low))
        if math.isinf(piece):
            return math.inf
        total += piece
    return reaction + total


def _simpson(net: Callable[[float], float], low: float, high: float) -> float:
    """Integral of v / net(v) dv from ``low`` to ``high``; ``math.inf`` if net is not positive."""
    step = (high - low) / _STEPS
    total = 0.0
    for i in range(_STEPS + 1):
        v = low + i * step
        a = net(v)
        if a <= 0.0:
            return math.inf
        weight = 1.0 if i in (0, _STEPS) else (4.0 if i % 2 else 2.0)
        total += weight * v / a
    return total * step / 3.0


def reference_distance(speed: float, reaction_time: float, deceleration: float) -> float:
    """The stop a brake of exactly ``deceleration`` makes from ``speed`` on the flat."""
    return speed * reaction_time + speed * speed / (2.0 * deceleration)


def effects_for(
    build: Build, profile: Profile, drive: Drive, mass: float, reference_mass: float
) -> list[BrakeEffect]:
    """Every brake's effect for one rider (``mass`` with the vehicle, kg); ``reference_mass``
    is the mass a rating or test is taken at where the build gives none."""
    found = []
    for index, brake in enumerate(build.brakes or ()):
        axle = axle_of(brake)
        if brake.kind is BrakeKind.DYNAMIC:
            found.append(_dynamic(build, brake, index, axle, drive, mass))
        elif brake.kind is BrakeKind.REGENERATIVE and _stated(brake) is None:
            found.append(_regenerative(build, profile, brake, index, axle, drive, mass))
        else:
            found.append(_stated_effect(build, profile, brake, index, axle, mass, reference_mass))
    return found


def _stated(brake: Brake) -> tuple[str, float] | None:
    """('force', N) or ('deceleration', m/s^2) as the builder gives it, or None."""
    if brake.force is not None:
        return "force", in_unit(brake.force, "N")
    if brake.deceleration is not None:
        return "deceleration", in_unit(brake.deceleration, "m/s**2")
    if brake.tested_stopping_distance is not None and brake.tested_from_speed is not None:
        v = in_unit(brake.tested_from_speed, "m/s")
        return "deceleration", v * v / (2.0 * in_unit(brake.tested_stopping_distance, "m"))
    return None


def _stated_effect(
    build: Build,
    profile: Profile,
    brake: Brake,
    index: int,
    axle: str,
    mass: float,
    reference_mass: float,
) -> BrakeEffect:
    stated = _stated(brake)
    if stated is None:
        return BrakeEffect(
            index,
            brake,
            axle,
            None,
            "nothing known of its deceleration",
            (f"brakes[{index}].deceleration",),
        )
    kind, value = stated
    tested = reference_mass
    if brake.tested_with_mass is not None:
        tested = in_unit(brake.tested_with_mass, "kg")
    if kind == "force":
        decel = value / mass
        how = f"{value:.4g} N at the ground over {mass:.4g} kg"
    else:
        decel = value * min(1.0, tested / mass)
        how = f"{value:.3g} m/s² at {tested:.4g} kg"
        if tested < mass:
            how += f", the same force over {mass:.4g} kg"
    if brake.kind is not BrakeKind.REGENERATIVE:
        return BrakeEffect(index, brake, axle, lambda _v: decel, how)
    fade = in_unit(profile.limit("brake.regenerative_fade_speed").quantity, "m/s")
    how += f", nothing below {fade * 3.6:.3g} km/h"
    return BrakeEffect(index, brake, axle, lambda v: decel if v > fade else 0.0, how)


def _dynamic(
    build: Build, brake: Brake, index: int, axle: str, drive: Drive, mass: float
) -> BrakeEffect:
    loops = braking_loops(build, brake, drive)
    missing = tuple(
        f"motors[{i}].{field}"
        for i, motor in enumerate(build.motors)
        for field in ("winding_inductance", "pole_pairs")
        if inductive_share(loops[i], drive, 1.0) is None and getattr(motor, field) is None
    )
    if missing:
        return BrakeEffect(index, brake, axle, None, "the winding inductance is not given", missing)

    def decel(v: float) -> float:
        force = sum(
            force_per_speed(drive, [loop]) * (inductive_share(loop, drive, v) or 0.0)
            for loop in loops
        )
        return force * v / mass

    return BrakeEffect(
        index, brake, axle, decel, "the shorted winding's force, in proportion to speed"
    )


def _regenerative(
    build: Build,
    profile: Profile,
    brake: Brake,
    index: int,
    axle: str,
    drive: Drive,
    mass: float,
) -> BrakeEffect:
    force = regen_force(build, drive, profile)
    if force is None:
        missing = ("controller.regen_current_limit",)
        return BrakeEffect(index, brake, axle, None, "its braking current is not given", missing)
    return BrakeEffect(
        index,
        brake,
        axle,
        lambda v: force(v) / mass,
        f"{force.current:g} A into the pack at {force.pack_voltage:.3g} V, F = V I / v",
    )
