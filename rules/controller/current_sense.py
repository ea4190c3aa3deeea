"""controller.current-sense: whether the measurement a current limit acts on can see the current
it must limit, and reads its average rightly and in time."""

from __future__ import annotations

from collections.abc import Iterator

from firstride_rules.controller._datasheet import DATASHEET, has_ratings, sealed
from firstride_rules.controller._drive import (
    STALL,
    ceil_whole,
    current_limit,
    magnitude,
    number,
    stall_missing,
    worst_stall,
)

from reviewer import figures
from reviewer import units as u
from reviewer.build import Build, Controller, LimitKind
from reviewer.engineering.switching import (
    averaging_window,
    periods_in_window,
    spans_whole_periods,
    whole_period_frequency,
    whole_period_sample_count,
)
from reviewer.findings import Comparison, DerivedFigure, Finding, Severity, Source
from reviewer.profile import Limit, Profile
from reviewer.rule import Output, Rule

SATURATION = Source.common_practice(
    "A current sensor reads no higher than its range: size it for the largest current the "
    "circuit can carry, the stall current, not only the limit"
)
WHOLE_PERIODS = Source.common_practice(
    "The mean of a periodic waveform is its average over a whole number of periods: average a "
    "PWM-chopped current over whole PWM periods"
)
RATED = Source.from_memory(
    "IEC 60034-1: rated output for continuous running duty (S1), which the rated current goes with"
)
_A = u.unit("A")
_KHZ = u.unit("kHz")  # build frequencies are held in kHz: read them so, no conversion
_S = u.unit("s")
_MS = u.unit("ms")
_SENSOR_FIELDS = ("current_sensor_range", "current_samples_averaged", "current_sample_rate")


def check(build: Build, profile: Profile) -> Iterator[Output]:
    """The current sensor's range, its averaging window, and the current limit against the motor.

    What it checks
      - Range: ``controller.current_sensor_range`` against the current limit
        (``controller.motor_current_limit``) and the highest cold stall current on the full pack
        (shared stall loop). A saturated sensor hides the very current the limit must see.
      - Averaging window: ``current_samples_averaged`` / ``current_sample_rate`` seconds, against
        the PWM period 1 / ``pwm_frequency``. The motor current the sensor sees is chopped or
        rippled at the PWM frequency; only a window spanning a whole number of periods (within
        the profile's ``controller.current_sense.whole_period_tolerance``, in periods) gives its
        true average. The window is also the limit's response time: a stall current flows that
        long before the average shows it in full. It is shown as a derived figure.
      - Limit against rating: the current limit against each motor's ``rated_current``; above it
        the winding's copper loss, I^2 R, exceeds its rated figure by (I_limit / I_rated)^2
        (motor.cooling gives the temperature that brings). Only when a current limit is set.

    Severities
      - stop: sensor range below the current limit (the limit can never be seen).
      - fix: range below the stall current; a window shorter than one PWM period or not spanning
        a whole number of them.
      - advise: a current limit above a motor's rated continuous current.
      - pass: each within its bound; or no sensor described and no current limit claimed, a
        hardware limit stated, or a sealed controller with its datasheet ratings (judged by
        controller.switch-thermal); likewise no sampling described (a sensor feeding a hardware
        limit): no averaging window.
      - unassessed: no sensor, or no sampling, described while the limit is software or of
        unstated kind (taken as software); a sensor field, ``pwm_frequency``, the stall
        current's inputs or a motor's
        ``rated_current`` absent (the missing fields are named).

    Remedies give values: the sensor range needed (the stall current), a sample count that spans
    whole periods or a PWM frequency that fits the window, the current limit at the rating.
    """
    controller = build.controller
    described = controller is not None and any(
        getattr(controller, name) is not None for name in _SENSOR_FIELDS
    )
    if controller is None or not described:
        yield _undescribed(build, controller)
    else:
        yield _range_finding(build, controller)
        tolerance = profile.limit("controller.current_sense.whole_period_tolerance")
        yield from _window_findings(controller, tolerance)
    yield from _rating_findings(build)


def _undescribed(build: Build, controller: Controller | None) -> Finding:
    """No sensor described: say what that settles, and never pass a limit nobody measures."""
    sources = (SATURATION, WHOLE_PERIODS)
    if controller is None or not figures.any_limit(build):
        what = "No controller is described" if controller is None else "No current limit is claimed"
        return Finding(
            Severity.PASS,
            "current sensor",
            f"{what}, so there is no sensed limit to check; the wiring and fuse rules judge the "
            "stall current that flows instead.",
            sources=sources,
        )
    if sealed(controller) and has_ratings(controller):
        response = figures.limit_response(build)
        when = (
            f"it acts within {u.format_number(response.seconds * 1000)} ms ({response.basis})"
            if response.seconds is not None
            else "its response time is not known, so the wiring rules hold the stall current "
            "until a fuse clears"
        )
        return Finding(
            Severity.PASS,
            "current sensor",
            "A sealed controller measures its own current: its sensing is judged by its "
            "datasheet ratings (controller.switch-thermal checks the current it lets through "
            f"against them); {when}.",
            sources=(DATASHEET,),
        )
    if controller.current_limit_kind is LimitKind.HARDWARE:
        return Finding(
            Severity.PASS,
            "current sensor",
            "No current sensor is described (controller.current_sensor_range, "
            "current_samples_averaged and current_sample_rate not given) and the limit is a "
            "hardware one, so there is no sampled current measurement to check.",
            sources=sources,
        )
    said = "claims a software" if controller.current_limit_kind else "does not say what kind of"
    return Finding(
        Severity.UNASSESSED,
        "current sensor",
        f"The controller {said} current limit (a limit of unstated kind is taken as software) "
        "but no current sensor is described, so what the limit acts on cannot be checked. "
        'Describe the sensor, state controller.current_limit_kind = "hardware", or give a '
        "sealed controller's datasheet ratings.",
        missing=tuple(f"controller.{name}" for name in _SENSOR_FIELDS),
        sources=sources,
    )


def _range_finding(build: Build, controller: Controller) -> Finding:
    f = u.format_number
    subject = "current sensor range"
    if controller.current_sensor_range is None:
        return Finding(
            severity=Severity.UNASSESSED,
            subject=subject,
            rationale="The sensor's range is not given, so it cannot be compared with the "
            "current limit and the stall current.",
            missing=("controller.current_sensor_range",),
            sources=(SATURATION,),
        )
    span = magnitude(controller.current_sensor_range, _A)
    limit = current_limit(build)
    stall = worst_stall(build)
    needed = stall.current if stall is not None else limit
    remedy = (
        f"use a current sensor with a range of at least {ceil_whole(needed)} A "
        "(controller.current_sensor_range)"
        if needed is not None
        else None
    )
    if limit is not None and span < limit:
        return Finding(
            severity=Severity.STOP,
            subject=subject,
            rationale=(
                f"The sensor saturates at {f(span)} A, below the {f(limit)} A current limit: it "
                "can never report the current the limit is set to act on."
            ),
            measured=u.quantity(span, _A),
            limit=u.quantity(limit, _A),
            comparison=Comparison.AT_LEAST,
            remedy=remedy,
            sources=(SATURATION,),
        )
    if stall is None:
        return Finding(
            severity=Severity.UNASSESSED,
            subject=subject,
            rationale=(
                f"The sensor reads up to {f(span)} A"
                + (f", above the {f(limit)} A limit" if limit is not None else "")
                + "; the stall current it must also see is unknown."
            ),
            missing=stall_missing(build),
            sources=(SATURATION, STALL),
        )
    short = span < stall.current
    return Finding(
        severity=Severity.FIX if short else Severity.PASS,
        subject=subject,
        rationale=(
            f"The sensor reads up to {f(span)} A; motor '{stall.motor}' draws {f(stall.current)} A "
            "stalled cold on the full pack"
            + (
                ", so a stall reads as the sensor's range and its averaged current reads low."
                if short
                else ", within the range."
            )
        ),
        measured=u.quantity(span, _A),
        limit=u.quantity(stall.current, _A),
        comparison=Comparison.AT_LEAST,
        remedy=remedy if short else None,
        sources=(SATURATION, STALL),
    )


def _window_findings(controller: Controller, tolerance_limit: Limit) -> Iterator[Output]:
    f = u.format_number
    subject = "current averaging window"
    missing = tuple(
        f"controller.{name}"
        for name in ("current_samples_averaged", "current_sample_rate", "pwm_frequency")
        if getattr(controller, name) is None
    )
    sampled = controller.current_samples_averaged is not None or (
        controller.current_sample_rate is not None
    )
    if not sampled and controller.current_limit_kind is not LimitKind.SOFTWARE:
        yield Finding(
            severity=Severity.PASS,
            subject=subject,
            rationale="No sampling of the current is described and the current limit is not "
            "claimed as software, so there is no averaging window to check.",
            sources=(WHOLE_PERIODS,),
        )
        return
    if missing:
        yield Finding(
            severity=Severity.UNASSESSED,
            subject=subject,
            rationale="The averaging window needs the samples averaged, the sample rate and the "
            "PWM frequency.",
            missing=missing,
            sources=(WHOLE_PERIODS,),
        )
        return
    assert controller.current_samples_averaged is not None
    assert controller.current_sample_rate is not None and controller.pwm_frequency is not None
    samples = controller.current_samples_averaged
    sample_rate = magnitude(controller.current_sample_rate, _KHZ) * 1000.0  # Hz
    pwm = magnitude(controller.pwm_frequency, _KHZ) * 1000.0
    tolerance = number(tolerance_limit)
    window = averaging_window(samples, sample_rate)
    periods = periods_in_window(window, pwm)
    yield DerivedFigure(
        "current limit response time",
        u.quantity(window * 1000.0, _MS),
        note="the averaging window: a stall current flows this long before the limit sees it",
        order=56,
    )
    described = (
        f"{samples} samples at {f(sample_rate / 1000)} kHz span {f(window * 1000)} ms, "
        f"{f(periods, 4)} periods of the {f(pwm / 1000)} kHz PWM"
    )
    response = (
        f" A stall current flows up to {f(window * 1000)} ms before the average shows it in full."
    )
    stated = controller.current_limit_response
    if stated is not None and magnitude(stated, _S) < window:
        response += f" The build states {f(magnitude(stated, _S) * 1000)} ms for the limit to act."
    if spans_whole_periods(periods, tolerance):
        yield Finding(
            severity=Severity.PASS,
            subject=subject,
            rationale=f"{described}: a whole number, so the average is read true.{response}",
            measured=f"{f(periods, 4)} periods",
            limit=f"whole periods within {f(tolerance)}",
            sources=(WHOLE_PERIODS, tolerance_limit.source),
        )
        return
    if periods < 1.0:
        why = "shorter than one period, so the reading depends on where in the period it falls"
    else:
        leftover = abs(periods - round(periods))
        why = (
            f"{f(leftover, 2)} of a period over a whole number, so a chopped current's average is "
            f"misread by up to {f(100 * leftover / periods, 2)} % of its peak, varying update "
            "to update"
        )
    yield Finding(
        severity=Severity.FIX,
        subject=subject,
        rationale=f"{described}: {why}.{response}",
        measured=f"{f(periods, 4)} periods",
        limit=f"whole periods within {f(tolerance)}",
        remedy=_window_remedy(samples, sample_rate, pwm, window, tolerance),
        sources=(WHOLE_PERIODS, tolerance_limit.source),
    )


def _window_remedy(
    samples: int, sample_rate: float, pwm: float, window: float, tolerance: float
) -> str:
    f = u.format_number
    options = []
    count = whole_period_sample_count(sample_rate, pwm, tolerance, samples)
    if count is not None:
        spans = round(count * pwm / sample_rate)
        options.append(
            f"average {count} samples per update ({spans} whole PWM periods, "
            f"{f(count / sample_rate * 1000)} ms)"
        )
    frequency = whole_period_frequency(window, pwm)
    options.append(
        f"set the PWM frequency to {f(frequency / 1000, 4)} kHz "
        f"({round(frequency * window)} whole periods in the {f(window * 1000)} ms window)"
    )
    return ", or ".join(options)


def _rating_findings(build: Build) -> Iterator[Finding]:
    limit = current_limit(build)
    if limit is None:
        return
    f = u.format_number
    for index, motor in enumerate(build.motors):
        subject = f"current limit against motor '{motor.name}'"
        if motor.rated_current is None:
            yield Finding(
                severity=Severity.UNASSESSED,
                subject=subject,
                rationale="The motor's rated continuous current is not given, so the current "
                "limit cannot be compared with it.",
                missing=(f"motors[{index}].rated_current",),
                sources=(RATED,),
            )
            continue
        rated = magnitude(motor.rated_current, _A)
        over = limit > rated * (1 + 1e-9)
        if over:
            rationale = (
                f"The {f(limit)} A current limit is above the motor's rated continuous "
                f"{f(rated)} A: held there, its copper loss (I² R) is {f((limit / rated) ** 2)} x "
                "the rated figure; motor.cooling gives the winding temperature that brings."
            )
        else:
            rationale = (
                f"The {f(limit)} A current limit is within the motor's rated continuous "
                f"{f(rated)} A."
            )
        yield Finding(
            severity=Severity.ADVISE if over else Severity.PASS,
            subject=subject,
            rationale=rationale,
            measured=u.quantity(limit, _A),
            limit=u.quantity(rated, _A),
            remedy=(
                f"set controller.motor_current_limit at or below {f(rated)} A, or hold it above "
                "that only for "
                "short bursts the motor.cooling check allows"
                if over
                else None
            ),
            sources=(RATED,),
        )


RULE = Rule(
    id="controller.current-sense",
    title="Current sensor range, averaging window and current limit",
    check=check,
    sources=(SATURATION, WHOLE_PERIODS, RATED, STALL),
    inputs=(
        "controller.current_sensor_range",
        "controller.current_samples_averaged",
        "controller.current_sample_rate",
        "controller.pwm_frequency",
        "controller.motor_current_limit",
        "controller.current_limit_kind",
        "controller.current_limit_response",
        "battery",
        "motors[].winding_resistance",
        "motors[].rated_current",
    ),
    severities=(
        Severity.STOP,
        Severity.FIX,
        Severity.ADVISE,
        Severity.PASS,
        Severity.UNASSESSED,
    ),
)
