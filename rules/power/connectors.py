"""power.connectors: every connector and switch the drive's current passes through, against
that current and the pack's DC voltage, and the pre-charge a large pack voltage calls for.
"""

from __future__ import annotations

from collections.abc import Iterator

from firstride_rules._shared.demand import pack_demand

from reviewer import figures
from reviewer import units as u
from reviewer.build import Build, Connector, ConnectorCircuit, ConnectorKind
from reviewer.findings import Comparison, Finding, Severity, Source, SourceStatus
from reviewer.profile import Profile
from reviewer.rule import Output, Rule
from reviewer.units import in_unit

RATINGS = Source(
    "The connector's or switch's datasheet continuous current and DC voltage ratings, as "
    "entered in the build",
    SourceStatus.USER,
)
HEATING = Source.common_practice(
    "A contact carrying more than its rated current heats, its resistance rises with the "
    "heat, and it melts its housing; a DC contact rated below the pack voltage draws an arc it "
    "cannot break"
)
PHASE = Source(
    "Peak phase current of a field-oriented drive: the DC-equivalent motor current / "
    "(sqrt 3 / 2), held in one phase by a locked rotor (brief 11)",
    SourceStatus.DERIVED,
)
_A = u.unit("A")
_V = u.unit("V")


def check(build: Build, profile: Profile) -> Iterator[Output]:
    """Each ``connectors[]`` entry's current and voltage ratings against what it carries, and
    a pre-charge path where the pack voltage calls for one.

    What it checks
      1. Current per contact: a ``battery`` connector or switch carries the most the motors
         draw from the pack at once (``battery.discharge``'s demand); a ``motor`` or ``phase``
         connector its motor's current with both limits holding a locked rotor (``motor.cooling``'s
         point), as the peak phase current under field-oriented drive; a ``charge`` port the
         ``charger.current``. Against ``current_rating``.
      2. DC voltage: the pack's full voltage (the charger's, if higher, for a charge port)
         against ``voltage_rating``.
      3. Pre-charge: above the profile's ``power.precharge_voltage`` some battery connector or
         switch pre-charges the controller's capacitors (``precharge``, or kind anti-spark).

    Severities
      - stop: a switch rated below the pack's DC voltage (it cannot break the arc).
      - fix: a contact rated below its current; a connector rated below the DC voltage; no
        pre-charge above the threshold.
      - pass: within each rating; ``connectors = []`` (the build says there are none).
      - unassessed: no ``connectors`` list; a rating or the current it is judged at not known.
    """
    connectors = build.connectors
    if connectors is None:
        yield Finding(
            Severity.UNASSESSED,
            "power connectors and switches",
            "The build lists no connectors or switches (connectors = [] says there are none), "
            "so what the drive's current passes through is not known.",
            missing=("connectors",),
            sources=(RATINGS,),
        )
        return
    if not connectors:
        yield Finding(
            Severity.PASS,
            "power connectors and switches",
            "The build says the power path has no connector or switch (connectors = []): "
            "nothing here to check.",
        )
        return
    full = figures.pack_voltages(build.battery).full if build.battery is not None else None
    for index, connector in enumerate(connectors):
        yield from _current(build, index, connector)
        yield _voltage(build, index, connector, full)
    yield from _precharge(build, connectors, full, profile)


def _carried(build: Build, connector: Connector) -> tuple[float | None, str, tuple[str, ...]]:
    """The current one contact carries (A), how, and what is missing."""
    f = u.format_number
    if connector.circuit is ConnectorCircuit.BATTERY:
        demand = pack_demand(build)
        return demand.current, demand.how, demand.missing
    if connector.circuit is ConnectorCircuit.CHARGE:
        if build.charger is None or build.charger.current is None:
            return None, "", ("charger.current",)
        return in_unit(build.charger.current, "A"), "the charger's current", ()
    motors = [m for m in build.motors if connector.motor in (None, m.name)]
    if not motors:
        return None, "", ("motors",)
    motor = motors[0]
    point = figures.stall_point(build, motor.name)
    if point is None:
        return None, "", (f"motors[{build.motors.index(motor)}].winding_resistance",)
    phase = figures.phase_conductor_current(build, motor, point.motor_current)
    how = f"motor '{motor.name}' held at a locked rotor by the {point.limited_by}"
    if phase > point.motor_current:
        how += f" ({f(point.motor_current)} A DC-equivalent, the peak phase current)"
    return phase, how, ()


def _current(build: Build, index: int, connector: Connector) -> Iterator[Finding]:
    f = u.format_number
    subject = f"{connector.kind.value} '{connector.name}' current rating"
    amps, how, missing = _carried(build, connector)
    if connector.current_rating is None:
        missing = (*missing, f"connectors[{index}].current_rating")
    if amps is None or connector.current_rating is None:
        yield Finding(
            Severity.UNASSESSED,
            subject,
            "Its current rating or the current it carries is not known.",
            missing=missing,
            sources=(RATINGS,),
        )
        return
    rating = in_unit(connector.current_rating, "A")
    over = amps > rating
    yield Finding(
        Severity.FIX if over else Severity.PASS,
        subject,
        f"It carries up to {f(amps)} A ({how}) against its {f(rating)} A rating."
        + (" The contact heats and melts its housing." if over else ""),
        measured=u.quantity(amps, _A),
        limit=u.quantity(rating, _A),
        comparison=Comparison.AT_MOST,
        remedy=f"use a {connector.kind.value} rated for at least {f(amps)} A continuous "
        f"(connectors[{index}].current_rating)"
        if over
        else None,
        sources=(RATINGS, HEATING)
        + ((PHASE,) if connector.circuit is ConnectorCircuit.PHASE else ()),
    )


def _voltage(build: Build, index: int, connector: Connector, full: float | None) -> Finding:
    f = u.format_number
    subject = f"{connector.kind.value} '{connector.name}' voltage rating"
    volts = full
    if (
        connector.circuit is ConnectorCircuit.CHARGE
        and build.battery is not None
        and build.battery.charger_voltage is not None
    ):
        volts = max(volts or 0.0, in_unit(build.battery.charger_voltage, "V"))
    if volts is None or connector.voltage_rating is None:
        missing = ("battery",) if volts is None else ()
        if connector.voltage_rating is None:
            missing = (*missing, f"connectors[{index}].voltage_rating")
        return Finding(
            Severity.UNASSESSED,
            subject,
            "Its DC voltage rating or the pack's voltage is not known.",
            missing=missing,
            sources=(RATINGS,),
        )
    rating = in_unit(connector.voltage_rating, "V")
    over = volts > rating
    severity = Severity.PASS
    text = f"The pack reaches {f(volts)} V DC against its {f(rating)} V rating."
    if over:
        switch = connector.kind is ConnectorKind.SWITCH
        severity = Severity.STOP if switch else Severity.FIX
        text += (
            " A switch below the DC voltage cannot break the arc: it may not turn the drive off."
            if switch
            else " Unplugged under load it arcs and pits."
        )
    return Finding(
        severity,
        subject,
        text,
        measured=u.quantity(volts, _V),
        limit=u.quantity(rating, _V),
        comparison=Comparison.AT_MOST,
        remedy=f"use a {connector.kind.value} rated for at least {f(volts)} V DC "
        f"(connectors[{index}].voltage_rating)"
        if over
        else None,
        sources=(RATINGS, HEATING),
    )


def _precharge(
    build: Build, connectors: list[Connector], full: float | None, profile: Profile
) -> Iterator[Finding]:
    f = u.format_number
    limit = profile.limit("power.precharge_voltage")
    threshold = in_unit(limit.quantity, "V")
    battery = [c for c in connectors if c.circuit is ConnectorCircuit.BATTERY]
    subject = "pre-charge of the controller's capacitors"
    if full is None or not battery:
        return
    if full <= threshold:
        yield Finding(
            Severity.PASS,
            subject,
            f"The {f(full)} V pack is at or below {f(threshold)} V: connecting it sparks little.",
            measured=u.quantity(full, _V),
            limit=u.quantity(threshold, _V),
            comparison=Comparison.AT_MOST,
            sources=(limit.source,),
        )
        return
    states = [c.precharges for c in battery]
    if any(states):
        named = ", ".join(f"'{c.name}'" for c in battery if c.precharges)
        yield Finding(
            Severity.PASS,
            subject,
            f"Above {f(threshold)} V ({f(full)} V full), {named} pre-charges the controller.",
            sources=(limit.source,),
        )
        return
    if None in states:
        yield Finding(
            Severity.UNASSESSED,
            subject,
            f"The {f(full)} V pack is above {f(threshold)} V; whether a connector or switch "
            "pre-charges the controller is not stated.",
            missing=tuple(
                f"connectors[{connectors.index(c)}].precharge"
                for c in battery
                if c.precharges is None
            ),
            sources=(limit.source,),
        )
        return
    yield Finding(
        Severity.FIX,
        subject,
        f"The {f(full)} V pack is above {f(threshold)} V and nothing pre-charges the "
        "controller's capacitors: each connection sparks, pits the contacts and can weld a "
        "switch closed.",
        measured="no pre-charge",
        limit=f"pre-charge above {f(threshold)} V",
        remedy="fit an anti-spark connector or a pre-charge resistor and switch on the "
        'battery side (connectors[].kind = "anti-spark" or connectors[].precharge = true)',
        sources=(limit.source,),
    )


RULE = Rule(
    id="power.connectors",
    title="Connector and switch ratings and pre-charge",
    check=check,
    sources=(RATINGS, HEATING),
    inputs=("connectors", "battery", "motors", "controller", "charger.current", "wires"),
    severities=(Severity.STOP, Severity.FIX, Severity.PASS, Severity.UNASSESSED),
)
