"""A winding's thermal time constant: given, estimated from the motor's mass, or the profile's
short default; every estimate stated. ``motor.cooling`` (a stall ended by a cut-off) and
``ride.heating`` (heat over a ride) both need it.
"""

from __future__ import annotations

from reviewer.build import Motor
from reviewer.engineering.ride_thermal import time_constant_from_mass
from reviewer.findings import Assumption
from reviewer.profile import Profile
from reviewer.units import in_unit


def winding_time_constant(
    motor: Motor, thermal_resistance: float, profile: Profile
) -> tuple[float, Assumption | None]:
    """tau in s for a winding of ``thermal_resistance`` K/W, and the assumption it rests on."""
    if motor.thermal_time_constant is not None:
        return in_unit(motor.thermal_time_constant, "s"), None
    if motor.mass is not None:
        tau = time_constant_from_mass(in_unit(motor.mass, "kg"), thermal_resistance)
        return tau, Assumption(
            f"Motor '{motor.name}': motors[].thermal_time_constant not given: {tau / 60:.3g} min "
            "estimated from its mass (copper and iron heat capacity, the lower estimate)."
        )
    default = profile.limit("ride.default_time_constant")
    tau = in_unit(default.quantity, "s")
    return tau, Assumption(
        f"Motor '{motor.name}': neither motors[].thermal_time_constant nor motors[].mass given: "
        f"{tau / 60:.3g} min taken, the short end for small motors.",
        default.source,
    )
