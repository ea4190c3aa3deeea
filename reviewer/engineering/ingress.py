"""IP codes (IEC 60529; ISO 20653 uses the same digits for road vehicles).

An IP code is ``IP``, a solids digit (0-6, clause 5), a water digit (0-9, clause 6), then an
optional additional letter A-D (access to hazardous parts) and optional supplementary letters
H, M, S, W in alphabetical order. ``X`` stands for a digit that was not tested, which meets no
requirement above 0. A part tested to both jets and immersion is dual-marked, ``IPX5/IPX7``:
it claims each code, and this parser keeps every water digit it claims.
"""

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
JET_DIGITS = (5, 6)
IMMERSION_DIGITS = (7, 8)

_IP_RE = re.compile(
    r"^IP(?P<solids>[0-9X])(?P<water>[0-9X])(?P<additional>[A-D]?)(?P<supplementary>[HMSW]*)$"
)
_MAX_TEXT = 32
_ONE_CODE = r"[Ii] *[Pp] *[0-9Xx] *[0-9Xx] *[A-Da-d]? *[HMSWhmsw]*"
#: What an IP code may look like, for a JSON Schema: one code, or several joined by '/'
#: (later ones may leave out the IP); case and spaces are free, as the parser allows.
IP_PATTERN = rf"^ *{_ONE_CODE}( */ *([Ii] *[Pp])? *[0-9Xx] *[0-9Xx] *[A-Da-d]? *[HMSWhmsw]*)* *$"


@dataclass(frozen=True)
class IngressCode:
    """A parsed IP code. ``solids`` and ``water`` are None where the digit is X.

    For a dual marking, ``solids`` is the best solids digit claimed, ``water`` the highest
    water digit, and ``water_marks`` every water digit claimed; the water test is met if any
    one mark meets it.
    """

    text: str
    solids: int | None
    water: int | None
    additional: str = ""
    supplementary: str = ""
    water_marks: tuple[int, ...] = ()

    def meets_water(self, required: int) -> bool:
        """IEC 60529 clause 6: up to 6 a digit implies the lower ones; 7, 8 and 9 do not
        imply 5 or 6 (jets): a part must be dual-marked (IPX5/IPX7) to claim both.

        Readings beyond the standard's wording, chosen so that an immersion rating is not
        wrongly failed for rain: 7, 8 and 9 are read as covering drips, spray and splashing
        (1-4); 8 covers 7 (IEC 60529 requires the numeral 8 conditions to be more severe
        than those of 7); 9 covers neither immersion nor 5-6. An X digit meets only 0.
        """
        _check_digit(required, 9, "water")
        if required == 0:
            return True
        return any(_mark_meets_water(mark, required) for mark in self.water_marks)

    def meets_solids(self, required: int) -> bool:
        """IEC 60529 clause 5: each solids digit implies the lower ones; X meets only 0."""
        _check_digit(required, 6, "solids")
        if required == 0:
            return True
        return self.solids is not None and self.solids >= required

    def meets(self, minimum: IngressCode) -> tuple[bool, bool]:
        """(solids met, water met) against a minimum code; an X digit in it requires nothing."""
        solids_ok = self.meets_solids(minimum.solids or 0)
        water_ok = all(self.meets_water(mark) for mark in minimum.water_marks)
        return solids_ok, water_ok

    @property
    def water_protected(self) -> bool:
        """Any tested protection against water at all (a digit above 0)."""
        return self.meets_water(1)

    @property
    def immersion_only(self) -> bool:
        """Rated for immersion (7, 8) or hot jets (9) but not for ordinary jets (5, 6)."""
        marks = self.water_marks
        return any(m > 6 for m in marks) and not any(m in JET_DIGITS for m in marks)


def _check_digit(required: int, highest: int, what: str) -> None:
    if not 0 <= required <= highest:
        raise ValueError(f"an IP {what} digit runs from 0 to {highest}, not {required}")


def _mark_meets_water(mark: int, required: int) -> bool:
    if required <= 4:
        return mark >= required
    if required in JET_DIGITS:
        return required <= mark <= 6
    if required == 7:
        return mark in IMMERSION_DIGITS
    return mark == required


def parse_ip_code(text: str) -> IngressCode:
    """Parse ``IP54``, ``IPX7``, ``IP2X``, ``IP20D``, ``IP54M``; dual markings like
    ``IPX5/IPX7`` too. Raise ValueError naming what is wrong with anything else."""
    if not isinstance(text, str) or len(text) > _MAX_TEXT:
        raise ValueError(f"{text!r} is not an IP code (IEC 60529), e.g. 'IP54' or 'IPX7'")
    cleaned = text.strip().upper().replace(" ", "")
    if "/" in cleaned:
        parts = [
            _parse_single(piece if piece.startswith("IP") else "IP" + piece, text)
            for piece in cleaned.split("/")
        ]
        tested_solids = [p.solids for p in parts if p.solids is not None]
        marks = tuple(sorted({m for p in parts for m in p.water_marks}))
        return IngressCode(
            text=cleaned,
            solids=max(tested_solids) if tested_solids else None,
            water=max(marks) if marks else None,
            additional=max((p.additional for p in parts), default=""),
            supplementary="".join(sorted({c for p in parts for c in p.supplementary})),
            water_marks=marks,
        )
    return _parse_single(cleaned, text)


def _parse_single(cleaned: str, original: str) -> IngressCode:
    match = _IP_RE.match(cleaned)
    if match is None:
        raise ValueError(
            f"{original!r} is not an IP code (IEC 60529): expected IP, a solids digit 0-6 or X, "
            "a water digit 0-9 or X, then optional letters A-D and H, M, S, W, "
            "e.g. 'IP54' or 'IPX7'"
        )
    if match["solids"] not in "0123456X":
        raise ValueError(
            f"{original!r} is not an IP code: the first (solids) digit runs from 0 to 6 "
            "(IEC 60529, clause 5)"
        )
    supplementary = match["supplementary"]
    if list(supplementary) != sorted(set(supplementary)):
        raise ValueError(
            f"{original!r} is not an IP code: supplementary letters H, M, S, W appear once "
            "each, in alphabetical order (IEC 60529)"
        )
    solids = None if match["solids"] == "X" else int(match["solids"])
    water = None if match["water"] == "X" else int(match["water"])
    return IngressCode(
        text=cleaned,
        solids=solids,
        water=water,
        additional=match["additional"],
        supplementary=supplementary,
        water_marks=() if water is None else (water,),
    )


def describe_code(code: IngressCode) -> str:
    """Plain words for a code's digits, e.g. 'dust-protected; water jets (...)'."""
    solids = "solids not tested" if code.solids is None else SOLIDS[code.solids]
    if not code.water_marks:
        water = "water not tested"
    else:
        water = " and ".join(WATER[m] for m in code.water_marks)
    return f"{solids}; {water}"


def required_code_text(minimum: IngressCode) -> str:
    """How to ask for an enclosure that meets ``minimum``, warning where the digits mislead.

    A jets requirement (5, 6) is not met by an immersion rating alone, and an immersion
    requirement (7, 8) is not met by a jets rating: both are easy mistakes when buying.
    """
    text = f"an enclosure rated {minimum.text} or better"
    marks = set(minimum.water_marks)
    jets = sorted(marks & set(JET_DIGITS))
    immersion = sorted(marks & set(IMMERSION_DIGITS))
    if jets and not immersion:
        text += (
            "; note IPX7 alone does not cover jets: an immersion-rated part must be "
            f"dual-marked, e.g. IPX{jets[-1]}/IPX7"
        )
    elif immersion and not jets:
        text += (
            f"; note a jets rating (IPX5, IPX6) alone does not cover immersion (IPX{immersion[0]})"
        )
    return text
