"""millrace.deck-height: a board's deck height against the club's maximum."""

from __future__ import annotations

from collections.abc import Iterator

from firstride_millrace.inputs import EMPTY, PACK, MillraceInputs
from reviewer.build import Build, VehicleKind
from reviewer.extensions import extension
from reviewer.findings import Comparison, Finding, Severity, Source
from reviewer.profile import Profile
from reviewer.rule import Output, Rule

ROOT_SOURCE = Source.common_practice(
    "Millrace Park Riders club rules 4.3: boards only; the limit is in the pack's limits.toml"
)
_FIELD = f"extensions.{PACK}.deck_height"


def check(build: Build, profile: Profile) -> Iterator[Output]:
    """Deck height of a board against the club's maximum (``millrace.deck_height.max``).

    What it checks
      The height of the deck top above level ground (``extensions.millrace.deck_height``)
      of a skateboard (``vehicle.kind``) against the limit ``millrace.deck_height.max``
      (160 mm in the pack's limits.toml; a profile may set its own). The higher the deck, the
      further a rider steps down when bailing out at speed.

    Severities
      - fix: the deck is higher than the limit.
      - pass: at or below the limit; or the vehicle is not a skateboard (the club's rule
        covers boards only: reported as a pass that says so).
      - unassessed: a skateboard whose deck height is not given.
    """
    if build.vehicle.kind is not VehicleKind.SKATEBOARD:
        yield Finding(
            Severity.PASS,
            f"vehicle ({build.vehicle.kind.value})",
            "The club's deck-height rule covers skateboards only.",
            sources=(ROOT_SOURCE,),
        )
        return
    limit = profile.limit(f"{PACK}.deck_height.max")
    inputs = extension(build, PACK, MillraceInputs) or EMPTY
    if inputs.deck_height is None:
        yield Finding(
            Severity.UNASSESSED,
            "deck",
            "The build does not give the deck height.",
            missing=(_FIELD,),
            sources=(limit.source,),
        )
        return
    height, maximum = inputs.deck_height.m_as("mm"), limit.magnitude("mm")
    over = height > maximum + 1e-9
    yield Finding(
        Severity.FIX if over else Severity.PASS,
        "deck",
        f"The deck top is {height:g} mm above the ground; the club allows {maximum:g} mm.",
        measured=inputs.deck_height,
        limit=limit.quantity,
        comparison=Comparison.AT_MOST,
        remedy=f"lower the deck to {maximum:g} mm or less (lower trucks, a drop-through mount "
        "or smaller wheels)"
        if over
        else None,
        sources=(limit.source,),
    )


RULE = Rule(
    id="millrace.deck-height",
    title="Board deck height",
    check=check,
    sources=(ROOT_SOURCE,),
    inputs=("vehicle.kind", _FIELD),
    severities=(Severity.FIX, Severity.PASS, Severity.UNASSESSED),
)
