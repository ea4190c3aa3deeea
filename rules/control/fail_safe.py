"""control.fail-safe: the drive must not start by itself or run on when the throttle's command
is lost: at power-up, with a broken throttle wire, when a remote's radio link drops; and the
rider needs a way to remove drive power.
"""

from __future__ import annotations

from collections.abc import Iterator

from reviewer import units as u
from reviewer.build import Build, RiderClass, ThrottleKind
from reviewer.findings import Comparison, Finding, Severity, Source
from reviewer.profile import Profile
from reviewer.rule import Output, Rule
from reviewer.units import in_unit

UNINTENDED_START = Source(
    "EN 17128:2020 (personal light electric vehicles) names protection against unintended "
    "start and driving power management in its scope; its figures are not quoted here"
)
PRACTICE = Source.common_practice(
    "A drive that starts at power-up, reads a broken throttle wire as full throttle or runs on "
    "after a remote's link is lost accelerates a rider who did not ask for it"
)
_S = u.unit("s")
_YOUNG = (RiderClass.CHILD, RiderClass.YOUTH)


def check(build: Build, profile: Profile) -> Iterator[Output]:
    """How the throttle's command can fail, and what stops the drive when it does.

    What it checks (``control``)
      1. Power-up: ``control.power_up_inhibit``, the drive off until the throttle reads zero.
      2. A broken throttle wire (``control.fault_reads_zero``): a hall throttle whose ground
         breaks can read full scale; it must read as zero. A wireless remote has no wire.
      3. A wireless remote (``control.throttle`` wireless-remote): ``link_loss_cutoff`` and
         ``link_loss_time`` against the profile's ``control.max_link_loss_time``.
      4. ``control.kill_switch``: a switch or lanyard the rider reaches removes drive power.

    Severities
      - stop: a wireless remote with no link-loss cut-off, or one slower than the profile's
        limit; no power-up inhibit with a child or youth rider; a throttle fault read as full.
      - fix: no power-up inhibit with adult riders only; no kill switch.
      - pass: each protection stated.
      - unassessed: no ``control`` section; each protection not stated (named).

    Remedies name the controller setting or part: a controller with throttle-zero start,
    out-of-range throttle detection or a pull-down, a remote with a fail-safe, a lanyard.
    """
    control = build.control
    if control is None:
        yield Finding(
            Severity.UNASSESSED,
            "throttle and drive fail-safes",
            "The build does not describe its throttle (control.throttle) nor what stops the "
            "drive when its command fails.",
            missing=("control",),
            sources=(UNINTENDED_START,),
        )
        return
    young = [r.name for r in build.riders if r.rider_class in _YOUNG]
    yield _power_up(control.power_up_inhibit, young)
    if control.throttle is ThrottleKind.WIRELESS_REMOTE:
        yield _link(control.link_loss_cutoff, control.link_loss_time, profile)
    else:
        yield _wire_fault(control.fault_reads_zero, control.throttle)
    yield _kill(control.kill_switch)


def _power_up(inhibit: bool | None, young: list[str]) -> Finding:
    subject = "start at power-up"
    if inhibit is None:
        return Finding(
            Severity.UNASSESSED,
            subject,
            "Whether the drive stays off at power-up until the throttle reads zero is not stated.",
            missing=("control.power_up_inhibit",),
            sources=(UNINTENDED_START,),
        )
    if inhibit:
        return Finding(
            Severity.PASS,
            subject,
            "The drive stays off at power-up until the throttle reads zero.",
            sources=(UNINTENDED_START,),
        )
    severity = Severity.STOP if young else Severity.FIX
    text = (
        "The drive runs as soon as it is powered, whatever the throttle reads: a throttle held "
        "or stuck open launches the vehicle at switch-on."
    )
    if young:
        text += f" A child or youth rider ({', '.join(young)}) is the one on it when that happens."
    return Finding(
        severity,
        subject,
        text,
        measured="no inhibit",
        limit="drive off until the throttle reads zero",
        remedy="enable the controller's throttle-zero start (or fit one that has it) and set "
        "control.power_up_inhibit = true",
        sources=(UNINTENDED_START, PRACTICE),
    )


def _wire_fault(reads_zero: bool | None, throttle: ThrottleKind) -> Finding:
    subject = "broken throttle wire"
    kind = throttle.value
    if reads_zero is None:
        return Finding(
            Severity.UNASSESSED,
            subject,
            f"What the controller does when the {kind} throttle's ground, supply or signal "
            "wire breaks is not stated.",
            missing=("control.fault_reads_zero",),
            sources=(UNINTENDED_START,),
        )
    if reads_zero:
        return Finding(
            Severity.PASS,
            subject,
            f"A broken wire of the {kind} throttle reads as zero throttle.",
            sources=(UNINTENDED_START,),
        )
    return Finding(
        Severity.STOP,
        subject,
        f"A broken wire of the {kind} throttle can read as full throttle: a hall sensor whose "
        "ground breaks floats to its supply, the top of its range.",
        measured="full throttle",
        limit="zero throttle",
        remedy="use a controller that cuts drive on an out-of-range throttle signal, or add a "
        "pull-down so an open signal reads zero, then set control.fault_reads_zero = true",
        sources=(UNINTENDED_START, PRACTICE),
    )


def _link(cutoff: bool | None, time: object, profile: Profile) -> Finding:
    subject = "remote link loss"
    limit = profile.limit("control.max_link_loss_time")
    most = in_unit(limit.quantity, "s")
    if cutoff is None:
        return Finding(
            Severity.UNASSESSED,
            subject,
            "Whether the drive stops when the remote's radio link is lost is not stated.",
            missing=("control.link_loss_cutoff",),
            sources=(UNINTENDED_START,),
        )
    if not cutoff:
        return Finding(
            Severity.STOP,
            subject,
            "When the remote's link is lost (a flat remote battery, interference, range) the "
            "drive keeps its last command: a board under throttle runs on with no one able to "
            "stop it.",
            measured="no cut-off",
            limit=f"drive off within {u.format_number(most)} s",
            remedy=f"use a remote and receiver whose fail-safe stops the drive within "
            f"{u.format_number(most)} s of losing the link, and set control.link_loss_cutoff "
            "and control.link_loss_time",
            sources=(UNINTENDED_START, PRACTICE, limit.source),
        )
    if time is None:
        return Finding(
            Severity.UNASSESSED,
            subject,
            "The drive stops when the link is lost; how soon is not stated.",
            missing=("control.link_loss_time",),
            sources=(UNINTENDED_START, limit.source),
        )
    seconds = in_unit(time, "s")  # type: ignore[arg-type]
    over = seconds > most
    return Finding(
        Severity.STOP if over else Severity.PASS,
        subject,
        f"The drive stops {u.format_number(seconds)} s after the link is lost, against "
        f"{u.format_number(most)} s.",
        measured=u.quantity(seconds, _S),
        limit=u.quantity(most, _S),
        comparison=Comparison.AT_MOST,
        remedy=f"set the receiver's fail-safe to act within {u.format_number(most)} s"
        if over
        else None,
        sources=(UNINTENDED_START, limit.source),
    )


def _kill(kill: bool | None) -> Finding:
    subject = "kill switch"
    if kill is None:
        return Finding(
            Severity.UNASSESSED,
            subject,
            "Whether the rider can remove drive power with a kill switch or lanyard is not stated.",
            missing=("control.kill_switch",),
            sources=(UNINTENDED_START,),
        )
    if kill:
        return Finding(
            Severity.PASS,
            subject,
            "A kill switch or lanyard within the rider's reach removes drive power.",
            sources=(UNINTENDED_START,),
        )
    return Finding(
        Severity.FIX,
        subject,
        "Nothing the rider can reach removes drive power: a runaway drive runs until the pack "
        "is empty or the rider is off.",
        measured="none",
        limit="a kill switch or lanyard",
        remedy="fit a kill switch or a lanyard that opens the controller's enable or power "
        "line, within reach while riding (then control.kill_switch = true)",
        sources=(UNINTENDED_START, PRACTICE),
    )


RULE = Rule(
    id="control.fail-safe",
    title="Unintended start, broken throttle, lost link and kill switch",
    check=check,
    sources=(UNINTENDED_START, PRACTICE),
    inputs=("control", "riders"),
    severities=(Severity.STOP, Severity.FIX, Severity.PASS, Severity.UNASSESSED),
)
