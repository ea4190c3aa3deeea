"""IP codes (IEC 60529; ISO 20653 uses the same digits for road vehicles)."""

from __future__ import annotations

import re
from dataclasses import dataclass

# IEC 60529, clause 5 (first characteristic numeral: protection against solid foreign objects)
SOLIDS = {
    0: "not protected",
    1: "objects of 50 mm diameter and greater",
    2: "objects of 12.5 mm diameter and greater (a finger)",
    3: "objects of 2.5 mm diameter and greater",
    4: "objects of 1.0 mm diameter and greater",
    5: "dust-protected",
    6: "dust-tight",
}
# IEC 60529, clause 6 (second characteristic numeral: protection against water)
WATER = {
    0: "not protected",
    1: "vertically falling drops",
    2: "vertically falling drops with the enclosure tilted up to 15 degrees",
    3: "spraying water, up to 60 degrees from vertical",
    4: "splashing water from any direction",
    5: "water jets (6.3 mm nozzle, 12.5 l/min)",
    6: "powerful water jets (12.5 mm nozzle, 100 l/min)",
    7: "temporary immersion (30 min at 1 m)",
    8: "continuous immersion, as agreed with the maker",
    9: "high-pressure, high-temperature water jets",
}
_IP_RE = re.compile(r"^IP(?P<solids>[0-6X])(?P<water>[0-9X])(?P<extra>[A-D]?[HMSW]?)$")


@dataclass(frozen=True)
class IngressCode:
    text: str
    solids: int | None  # None where the digit is X (not tested)
    water: int | None
    extra: str = ""

    def meets_water(self, required: int) -> bool:
        """IEC 60529 clause 6: up to 6 a digit implies the lower ones; 7, 8 and 9 do not
        imply 5 or 6 (jets): a part must be dual-marked (IPX5/IPX7) to claim both.

        Immersion (7, 8) and hot jets (9) are read as covering drips and splashing (1-4).
        8 is read as covering 7 (from memory: makers test 8 beyond the 7 conditions).
        """
        if required == 0:
            return True
        if self.water is None:
            return False
        if required <= 4:
            return self.water >= required
        if required in (5, 6):
            return required <= self.water <= 6
        if required == 7:
            return self.water in (7, 8)
        return self.water == required

    def meets_solids(self, required: int) -> bool:
        if required == 0:
            return True
        return self.solids is not None and self.solids >= required


def parse_ip_code(text: str) -> IngressCode:
    """Parse ``IP54``, ``IPX7``, ``IP2X``, ``IP20D``; dual markings like ``IPX5/IPX7`` too."""
    cleaned = text.strip().upper().replace(" ", "")
    if "/" in cleaned:
        parts = [parse_ip_code(p if p.startswith("IP") else "IP" + p) for p in cleaned.split("/")]
        solids = [p.solids for p in parts if p.solids is not None]
        return _Dual(cleaned, max(solids) if solids else None, None, "", tuple(parts))
    match = _IP_RE.match(cleaned)
    if match is None:
        raise ValueError(
            f"{text!r} is not an IP code (IEC 60529): expected IP, a solids digit 0-6 or X, "
            "a water digit 0-9 or X, e.g. 'IP54' or 'IPX7'"
        )
    solids = None if match["solids"] == "X" else int(match["solids"])
    water = None if match["water"] == "X" else int(match["water"])
    return IngressCode(cleaned, solids, water, match["extra"])


@dataclass(frozen=True)
class _Dual(IngressCode):
    parts: tuple[IngressCode, ...] = ()

    def meets_water(self, required: int) -> bool:
        return any(p.meets_water(required) for p in self.parts)
