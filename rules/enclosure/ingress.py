"""enclosure.ingress: IP codes of the electronics and the battery against the riding conditions,
and the mechanical housing of lithium cells under a deck."""

from __future__ import annotations

from collections.abc import Iterator

from reviewer.build import Build, Conditions, Enclosure, VehicleKind
from reviewer.engineering.ingress import (
    IngressCode,
    describe_code,
    required_code_text,
)
from reviewer.findings import Assumption, Comparison, DerivedFigure, Finding, Severity, Source
from reviewer.profile import Limit, Profile
from reviewer.rule import Output, Rule

IEC_60529 = Source("IEC 60529, clauses 5 and 6: IP code digits for solids and water")
SOFT_PACK_SOURCE = Source.common_practice(
    "Lithium cells that are crushed or punctured can short internally and go into thermal "
    "runaway; a pack under a deck takes ground strikes, so it needs a rigid case"
)
UL_2272 = Source("UL 2272: electrical systems of personal e-mobility devices, battery included")


def check(build: Build, profile: Profile) -> Iterator[Output]:
    """Ingress protection of the electronics and the battery, and the lithium pack's housing.

    What it checks
      1. Electronics enclosure: its IP code (``enclosure.electronics_ip``) against the profile's
         minimum for the build's riding conditions (``usage.conditions``: dry, damp or wet;
         limits ``enclosure.minimum_ip.dry`` / ``.damp`` / ``.wet``). The solids digit
         (IEC 60529 clause 5) and the water digit (clause 6) are compared separately.
      2. Battery enclosure: the same comparison for ``enclosure.battery_ip``.
      3. Battery housing, lithium packs only (``battery.chemistry`` li-ion, lipo, lifepo4):
         a pack with no hard case (``enclosure.battery_hard_case`` false) under the deck
         (``enclosure.battery_under_deck`` true; taken as true on a skateboard when not given).

    How digits compare (IEC 60529)
      Each solids digit implies the lower ones. Up to 6, a water digit implies the lower ones;
      7, 8 and 9 do not imply 5 or 6 (jets), so IPX7 does not meet an IPX5 requirement unless
      the part is dual-marked IPX5/IPX7. 7, 8 and 9 are read as covering 1-4, and 8 as covering
      7. An X (not tested) meets no requirement above 0.

    Severities
      - stop: a lithium pack with no hard case under a deck (a ground strike can crush a cell);
        or wet conditions and a battery with no water protection at all (water digit 0 or X):
        water across a pack's terminals and cell links corrodes them and can short the pack.
      - fix: the electronics' or the battery's code falls short of the minimum in either digit.
        The electronics stay at fix: a low rating is a weakness to correct before regular
        use, not by itself a hazard on a dry first ride; the battery is at fix unless the stop
        case above applies.
      - advise: a lithium pack with no hard case that is not under a deck: pad and cover it.
      - pass: the code meets the minimum in both digits; a lithium pack in a hard case.
      - unassessed: ``usage.conditions``, ``enclosure.electronics_ip``, ``enclosure.battery_ip``,
        ``battery.chemistry``, ``enclosure.battery_hard_case`` or (off a skateboard)
        ``enclosure.battery_under_deck`` absent where the check needs it.

    The remedy names the IP code needed and warns where digits mislead (immersion ratings do
    not cover jets). Sources: IEC 60529 clauses 5 and 6; the profile's minimum codes; common
    practice for the housing of lithium cells.
    """
    enclosure = build.enclosure or Enclosure()
    conditions = build.usage.conditions
    limit: Limit | None = None
    minimum: IngressCode | None = None
    if conditions is not None:
        limit = profile.limit(f"enclosure.minimum_ip.{conditions.value}")
        if not isinstance(limit.value, IngressCode):
            raise ValueError(f"profile limit {limit.key}: an IP code such as 'IP54'")
        minimum = limit.value
        yield DerivedFigure(
            name=f"minimum IP code for {conditions.value} use",
            value=minimum.text,
            note=describe_code(minimum),
            order=60,
        )
    yield _ip_finding(
        "electronics enclosure",
        "enclosure.electronics_ip",
        enclosure.electronics,
        conditions,
        minimum,
        limit,
        is_battery=False,
    )
    yield _ip_finding(
        "battery enclosure",
        "enclosure.battery_ip",
        enclosure.battery,
        conditions,
        minimum,
        limit,
        is_battery=True,
    )
    yield from _housing(build, enclosure, minimum)


def _ip_finding(
    subject: str,
    field: str,
    code: IngressCode | None,
    conditions: Conditions | None,
    minimum: IngressCode | None,
    limit: Limit | None,
    *,
    is_battery: bool,
) -> Finding:
    missing = tuple(
        name
        for name, absent in (("usage.conditions", conditions is None), (field, code is None))
        if absent
    )
    if missing or code is None or minimum is None or limit is None or conditions is None:
        return Finding(
            severity=Severity.UNASSESSED,
            subject=subject,
            rationale=f"The {subject}'s ingress protection could not be compared: "
            f"{' and '.join(missing)} not given.",
            sources=(IEC_60529,),
            missing=missing,
        )
    sources = (IEC_60529, limit.source)
    solids_ok, water_ok = code.meets(minimum)
    needs = (
        f"{conditions.value.capitalize()} use needs at least {minimum.text} "
        f"({describe_code(minimum)})"
    )
    if solids_ok and water_ok:
        return Finding(
            severity=Severity.PASS,
            subject=subject,
            rationale=f"The {subject} is {code.text} ({describe_code(code)}). {needs}.",
            measured=code.text,
            limit=minimum.text,
            comparison=Comparison.AT_LEAST,
            sources=sources,
        )
    shortfalls = []
    if not solids_ok:
        shortfalls.append(f"its solids digit {_digit(code.solids)} does not meet {minimum.solids}")
    if not water_ok:
        marks = "/".join(str(m) for m in code.water_marks) or "X"
        wanted = "/".join(str(m) for m in minimum.water_marks)
        text = f"its water digit {marks} does not meet {wanted}"
        if code.immersion_only and any(m in (5, 6) for m in minimum.water_marks):
            text += " (an immersion rating does not cover water jets)"
        shortfalls.append(text)
    rationale = f"The {subject} is {code.text}: {'; '.join(shortfalls)}. {needs}."
    severity = Severity.FIX
    if is_battery and conditions is Conditions.WET and not code.water_protected:
        severity = Severity.STOP
        rationale += (
            " A battery with no water protection in wet use can corrode and short across its "
            "terminals and cell links."
        )
    return Finding(
        severity=severity,
        subject=subject,
        rationale=rationale,
        measured=code.text,
        limit=minimum.text,
        comparison=Comparison.AT_LEAST,
        remedy=f"fit {required_code_text(minimum)} (then "
        f"enclosure.{'battery_ip' if is_battery else 'electronics_ip'})",
        sources=sources,
    )


def _digit(value: int | None) -> str:
    return "X (not tested)" if value is None else str(value)


def _housing(
    build: Build, enclosure: Enclosure, minimum: IngressCode | None
) -> Iterator[Finding | Assumption]:
    subject = "battery housing"
    sources = (SOFT_PACK_SOURCE, UL_2272)
    if build.battery is None:
        yield Finding(
            severity=Severity.UNASSESSED,
            subject=subject,
            rationale="The battery's chemistry is not given, so the need for a hard case "
            "could not be judged.",
            sources=sources,
            missing=("battery.chemistry",),
        )
        return
    chemistry = build.battery.chemistry
    if not chemistry.is_lithium:
        return
    under = enclosure.battery_under_deck
    if under is None and build.vehicle.kind is VehicleKind.SKATEBOARD:
        under = True
        yield Assumption(
            "A skateboard's battery is taken to sit under the deck, because "
            "enclosure.battery_under_deck is not given."
        )
    hard_case = enclosure.battery_hard_case
    missing = tuple(
        name
        for name, absent in (
            ("enclosure.battery_hard_case", hard_case is None),
            ("enclosure.battery_under_deck", under is None and hard_case is not True),
        )
        if absent
    )
    if hard_case is True:
        yield Finding(
            severity=Severity.PASS,
            subject=subject,
            rationale=f"The {chemistry.value} pack sits in a hard case.",
            sources=sources,
        )
    elif missing:
        yield Finding(
            severity=Severity.UNASSESSED,
            subject=subject,
            rationale=f"Whether the {chemistry.value} pack needs a hard case could not be "
            f"judged: {' and '.join(missing)} not given.",
            sources=sources,
            missing=missing,
        )
    elif under:
        rated = f", rated {minimum.text} or better," if minimum is not None else ""
        yield Finding(
            severity=Severity.STOP,
            subject=subject,
            rationale=f"The {chemistry.value} pack has no hard case and sits under the deck, "
            "where kerbs, stones and ground strikes reach it; a crushed or punctured lithium "
            "cell can short internally and burn.",
            remedy=f"house the cells in a rigid, impact-resistant case{rated} padded inside "
            "and fixed to the deck (e.g. an aluminium or polycarbonate box; then "
            "enclosure.battery_hard_case = true and enclosure.battery_ip)",
            sources=sources,
        )
    else:
        yield Finding(
            severity=Severity.ADVISE,
            subject=subject,
            rationale=f"The {chemistry.value} pack has no hard case; it is not under the deck, "
            "but a fall or a strap rubbing through the wrap can still damage a cell.",
            remedy="pad the pack and cover it in a rigid shell where it can be struck or rubbed",
            sources=sources,
        )


RULE = Rule(
    id="enclosure.ingress",
    title="Ingress protection and battery housing",
    check=check,
    sources=(IEC_60529, SOFT_PACK_SOURCE, UL_2272),
    inputs=(
        "usage.conditions",
        "enclosure.electronics_ip",
        "enclosure.battery_ip",
        "enclosure.battery_hard_case",
        "enclosure.battery_under_deck",
        "battery.chemistry",
        "vehicle.kind",
    ),
    severities=(
        Severity.STOP,
        Severity.FIX,
        Severity.ADVISE,
        Severity.PASS,
        Severity.UNASSESSED,
    ),
)
