"""Shared wording of shared figures: the stall current's source, the drive model's defaults, the
pack's small loads. One wording, so every rule that quotes the same figure says it the same way.
"""

from __future__ import annotations

from reviewer import figures
from reviewer.build import Build
from reviewer.engineering.roadload import Drive
from reviewer.findings import Assumption, Source
from reviewer.profile import Profile
from reviewer.units import in_unit, unit

#: Where the stall current V / R_loop comes from; every rule that quotes it cites this.
STALL_SOURCE = Source.from_memory(
    "Chapman, Electric Machinery Fundamentals: stall current V / R_loop"
)


#: The profile's Crr and CdA taken when the build gives none: the low ones, the fast side.
_FAST_SIDE = ("usage.default_rolling_resistance", "usage.default_drag_area")


def drive_model(
    build: Build,
    profile: Profile,
    bound: str = "high",
    defaults_from: tuple[str, str] = (
        "usage.default_rolling_resistance",
        "usage.default_drag_area",
    ),
) -> tuple[Drive | None, list[Assumption], tuple[str, ...]]:
    """:func:`reviewer.figures.drive_model` with the profile's default Crr and CdA, and each
    default the build relied on worded as an assumption of the review. ``bound`` is the reading
    of a motor limit whose basis or drive is unstated: ``high`` (most current: speed, heat),
    ``low`` (least torque: climbing). ``defaults_from``: the profile's keys of the Crr and CdA
    taken when the build gives none (the low ones by default: the fast side; a check for which
    more load is the pessimistic side names higher ones)."""
    crr_limit = profile.limit(defaults_from[0])
    cda_limit = profile.limit(defaults_from[1])
    drive, defaults, missing = figures.drive_model(
        build, float(crr_limit.value), in_unit(cda_limit.quantity, unit("m**2")), bound
    )
    notes = [
        Assumption(
            f"Motor '{name}': no_load_current not given, taken as 0 A "
            "(no friction), which errs on the fast side."
        )
        for name in defaults.no_load_current
    ]
    if defaults.rolling_resistance is not None:
        crr = defaults.rolling_resistance
        notes.append(
            Assumption(
                f"usage.rolling_resistance not given: Crr {crr:g} taken.",
                crr_limit.source,
            )
        )
    if defaults.drag_area is not None:
        cda = defaults.drag_area
        notes.append(
            Assumption(f"usage.drag_area not given: CdA {cda:g} m² taken.", cda_limit.source)
        )
    unstated = [
        m.name for m in build.motors if (lim := figures.motor_limit(build, m)) and lim.basis_assumed
    ]
    if unstated:
        reading = "the least torque it can mean" if bound == "low" else "the most current"
        notes.append(
            Assumption(
                "controller.motor_current_basis (or controller.drive) not given: the motor "
                f"current limit is read as {reading} (a peak or an rms figure, six-step or "
                "field-oriented drive)."
            )
        )
    if defaults.efficiency:
        notes.append(
            Assumption("drivetrain.efficiency not given: 100 % taken, which errs on the fast side.")
        )
    return drive, notes, missing


def small_loads(load: figures.AuxiliaryLoad) -> str:
    """'logic board 0.12 A, brake relay coil 0.06 A'."""
    return ", ".join(f"{name} {amps:.3g} A" for name, amps in load.parts)
