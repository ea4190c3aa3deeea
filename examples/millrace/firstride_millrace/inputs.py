"""The club's own build inputs: the ``[extensions.millrace]`` table of a build file.

[extensions.millrace]
kill_switch_lanyard = true
kill_switch_cuts = "motor-power"      # or "throttle-signal"
kill_switch_voltage_rating = "60 V"   # DC rating of the switch or contactor it opens
deck_height = "140 mm"                # deck top above level ground, boards only
"""

from __future__ import annotations

from typing import Annotated, Literal

import pint
from pydantic import BaseModel, ConfigDict, Field

from reviewer import quantity_text as qt
from reviewer import units as u

PACK = "millrace"
DECK_HEIGHT = u.Dimension("mm", "140 mm", "a deck height", 0.0, 1000.0)

Voltage = Annotated[pint.Quantity, qt.QuantityField(u.VOLTAGE)]
Height = Annotated[pint.Quantity, qt.QuantityField(DECK_HEIGHT)]


class MillraceInputs(BaseModel):
    """Unknown keys are errors here too: a misspelt key must not silently skip a check."""

    model_config = ConfigDict(extra="forbid", frozen=True, arbitrary_types_allowed=True)

    kill_switch_lanyard: bool | None = Field(
        None, description="a kill switch tethered to the rider by a lanyard is fitted"
    )
    kill_switch_cuts: Literal["motor-power", "throttle-signal"] | None = Field(
        None, description="what pulling the lanyard interrupts"
    )
    kill_switch_voltage_rating: Voltage | None = Field(
        None, description="DC voltage rating of the switch or contactor the lanyard opens"
    )
    deck_height: Height | None = Field(None, description="deck top above level ground")


EMPTY = MillraceInputs()
