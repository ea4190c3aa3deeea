"""Copper conductors: AWG geometry (ASTM B258), resistance (IEC 60028), short-circuit withstand
(IEC 60364-4-43 clause 434.5.2 / IEC 60364-5-54 Annex A), tabulated ampacity (with an upper
bound for wires thinner than the tables) and voltage drop.

Everything here is a pure function of floats (mm, mm^2, m, A, s, degC) so each figure can be
checked against the handbook it comes from. Which figure a review uses, and why, is the rule's
business; these functions only say what the tables and formulas give.
"""

from __future__ import annotations

import bisect
import math
import re
from dataclasses import dataclass
from functools import lru_cache

# IEC 60028: annealed copper, 100 % IACS, resistivity at 20 degC in ohm mm^2 / m.
COPPER_RESISTIVITY_20C = 1 / 58
# Inferred zero-resistance temperature of copper: R2/R1 = (234.5 + T2) / (234.5 + T1).
COPPER_INFERRED_ZERO = 234.5

_AWG_RE = re.compile(r"^\s*(?P<n>\d{1,2})(?P<aught>/0)?\s*(?:AWG)?\s*$", re.IGNORECASE)
#: What an AWG size may look like, for a JSON Schema (ECMA-262: the case spelled out).
AWG_PATTERN = r"^\s*\d{1,2}(/0)?\s*([Aa][Ww][Gg])?\s*$"


# --- AWG geometry and resistance ------------------------------------------------------------


def parse_awg(text: str) -> int:
    """'12 AWG' -> 12; '2/0 AWG' -> -1 (n/0 sizes map to n = 1 - m, ASTM B258)."""
    match = _AWG_RE.match(text)
    if match is None:
        raise ValueError(f"{text!r} is not an AWG size; expected e.g. '12 AWG' or '2/0 AWG'")
    n = int(match["n"])
    if match["aught"]:
        if not 1 <= n <= 4:
            raise ValueError(f"{text!r}: n/0 sizes run from 1/0 to 4/0")
        return 1 - n
    if not 0 <= n <= 40:
        raise ValueError(f"{text!r}: AWG sizes run from 4/0 to 40")
    return n


def awg_label(n: int) -> str:
    """12 -> '12 AWG'; 0 -> '1/0 AWG'; -3 -> '4/0 AWG' (the inverse of parse_awg)."""
    return f"{1 - n}/0 AWG" if n <= 0 else f"{n} AWG"


def awg_diameter_mm(n: int) -> float:
    """ASTM B258: d = 0.127 mm x 92^((36 - n) / 39)."""
    return 0.127 * 92 ** ((36 - n) / 39)


@lru_cache(maxsize=256)
def awg_area(gauge: str | int) -> float:
    """Cross-section in mm^2 of a solid conductor of that gauge."""
    n = parse_awg(gauge) if isinstance(gauge, str) else gauge
    d = awg_diameter_mm(n)
    return math.pi * d * d / 4


# A metric size rounded to three figures (3.3 mm^2 for 12 AWG's 3.309) still counts as that gauge.
AREA_ROUNDING = 0.005


def awg_for_area(area_mm2: float) -> int:
    """The heaviest AWG size whose area does not exceed ``area_mm2`` (within 0.5 % rounding).

    Used to look a metric conductor up in an AWG table: rounding down is conservative.
    """
    if area_mm2 <= 0:
        raise ValueError("a conductor area must be positive")
    diameter = math.sqrt(4 * area_mm2 * (1 + AREA_ROUNDING) / math.pi)
    exact = 36 - 39 * math.log(diameter / 0.127) / math.log(92)
    return max(-3, math.ceil(exact - 1e-9))


def conductor_resistance(area_mm2: float, length_m: float, temperature_c: float = 20.0) -> float:
    """Resistance in ohm of a copper conductor: rho L / A at 20 degC (IEC 60028), corrected
    with R2/R1 = (234.5 + T2) / (234.5 + T1)."""
    r20 = COPPER_RESISTIVITY_20C * length_m / area_mm2
    return r20 * (COPPER_INFERRED_ZERO + temperature_c) / (COPPER_INFERRED_ZERO + 20.0)


def voltage_drop(current_a: float, resistance_per_m: float, length_m: float) -> float:
    """V = I R over a conductor's length. Each conductor of a loop is counted on its own, so a
    feed and its return together give the round-trip drop."""
    return current_a * resistance_per_m * length_m


def conductor_temperature(
    ambient_c: float, rating_c: float, current_a: float, ampacity_a: float
) -> float:
    """FAA AC 43.13-1B para 11-66: T2 = T1 + (T_rating - T1)(I2/I_max)^2, a conservative
    estimate of a conductor's running temperature below its rated current."""
    return ambient_c + (rating_c - ambient_c) * (current_a / ampacity_a) ** 2


# --- Adiabatic short-circuit withstand (IEC 60364-4-43 clause 434.5.2) ----------------------

# Beyond this the adiabatic assumption no longer holds (heat leaves the conductor).
ADIABATIC_LIMIT_S = 5.0


@dataclass(frozen=True)
class InsulationTemperatures:
    """The temperatures behind an insulation's k: where a fault starts and the most it may
    reach. ``k`` is the tabulated value, or None where only the general formula applies."""

    initial_c: float
    final_c: float
    k: float | None
    published: bool


# IEC 60364-5-54 Annex A / IEC 60364-4-43 434.5.2, copper conductors.
INSULATION_TEMPERATURES: dict[str, InsulationTemperatures] = {
    "pvc": InsulationTemperatures(70, 160, 115, True),
    "pvc-90": InsulationTemperatures(90, 160, 100, True),
    "rubber": InsulationTemperatures(60, 200, 141, True),
    "xlpe": InsulationTemperatures(90, 250, 143, True),
    "silicone": InsulationTemperatures(180, 350, 132, True),
    # From memory: PTFE wire runs at up to 200 degC; 300 degC stays below its 327 degC melt.
    "ptfe": InsulationTemperatures(200, 300, None, False),
}


def copper_k(initial_c: float, final_c: float) -> float:
    """General form for copper: k = 226 sqrt(ln(1 + (theta_f - theta_i)/(234.5 + theta_i)))."""
    if final_c <= initial_c:
        return 0.0
    rise = (final_c - initial_c) / (COPPER_INFERRED_ZERO + initial_c)
    return 226.0 * math.sqrt(math.log1p(rise))


def adiabatic_k(insulation: str, temperature_rating_c: float | None = None) -> float:
    """k for a copper conductor with this insulation.

    The tables assume the fault starts at the insulation's usual maximum running temperature.
    A wire rated to run hotter than that (PVC rated 90 degC, silicone rated 200 degC) starts
    nearer its final limit, so k comes from the general formula at its own rating.
    """
    temps = INSULATION_TEMPERATURES[insulation]
    if temperature_rating_c is not None and temperature_rating_c > temps.initial_c:
        return copper_k(temperature_rating_c, temps.final_c)
    return temps.k if temps.k is not None else copper_k(temps.initial_c, temps.final_c)


def withstand_i2t(k: float, area_mm2: float) -> float:
    """Let-through energy a conductor survives, k^2 S^2 in A^2 s."""
    return k * k * area_mm2 * area_mm2


def withstand_time(k: float, area_mm2: float, current_a: float) -> float:
    """t = k^2 S^2 / I^2: how long the conductor survives ``current_a`` (valid up to 5 s)."""
    return withstand_i2t(k, area_mm2) / (current_a * current_a)


def minimum_area(current_a: float, time_s: float, k: float) -> float:
    """S = sqrt(I^2 t) / k: the least cross-section in mm^2 that survives I for t."""
    return math.sqrt(current_a * current_a * time_s) / k


# --- Tabulated continuous ampacity ------------------------------------------------------------


@dataclass(frozen=True)
class AmpacityTable:
    name: str
    ambient_c: float  # the ambient the table is stated for
    columns_c: tuple[float, ...]  # conductor temperature ratings
    rows: dict[int, tuple[float, ...]]  # AWG -> amperes per column
    bundled: bool  # the table already allows for bundling


# NEC (NFPA 70) Table 310.16: copper, 30 degC ambient, not more than three current-carrying
# conductors in a raceway, cable or earth.
NEC_310_16 = AmpacityTable(
    "NEC Table 310.16",
    30.0,
    (60.0, 75.0, 90.0),
    {14: (15, 20, 25), 12: (20, 25, 30), 10: (30, 35, 40), 8: (40, 50, 55)},
    bundled=False,
)
# FAA AC 43.13-1B Table 11-9: copper wire in bundles, groups or harnesses, 70 degC ambient.
FAA_11_9 = AmpacityTable(
    "FAA AC 43.13-1B Table 11-9",
    70.0,
    (105.0, 150.0, 200.0),
    {18: (6, 9, 12), 16: (7, 11, 14), 14: (10, 14, 18), 12: (13, 19, 25), 10: (17, 26, 32)},
    bundled=True,
)
AMPACITY_TABLES = (NEC_310_16, FAA_11_9)
DATASHEET_AMBIENT_C = 30.0  # a datasheet ampacity is read as for 30 degC ambient, single wire

# NEC 310.15(C)(1): more than three current-carrying conductors. The first three bands are
# published; 21-30, 31-40 and 41+ (0.45, 0.40, 0.35) are from memory.
_BUNDLE_BANDS = ((3, 1.0), (6, 0.80), (9, 0.70), (20, 0.50), (30, 0.45), (40, 0.40))


def bundling_factor(loaded_conductors: int) -> float:
    for most, factor in _BUNDLE_BANDS:
        if loaded_conductors <= most:
            return factor
    return 0.35


def ambient_factor(rating_c: float, ambient_c: float, table_ambient_c: float) -> float:
    """f = sqrt((T_rating - T_ambient) / (T_rating - T_table)); 0 once ambient reaches the
    rating. Above 1 in cooler air than the table's, as in the NEC 310.15(B) table."""
    if ambient_c >= rating_c or rating_c <= table_ambient_c:
        return 0.0
    return math.sqrt((rating_c - ambient_c) / (rating_c - table_ambient_c))


@dataclass(frozen=True)
class Ampacity:
    """A continuous current rating with the basis it was read on and its corrections."""

    current: float  # A, after corrections
    tabulated: float  # A, as the basis states it
    table: str  # the table's name, or "wire datasheet"
    column_c: float  # the conductor temperature the figure belongs to
    row_awg: int | None  # the table row used (None for a datasheet)
    ambient_factor: float
    bundling_factor: float

    @property
    def basis(self) -> str:
        if self.row_awg is None:
            return f"{self.table}, corrected from {DATASHEET_AMBIENT_C:g} °C ambient"
        return f"{self.table}, {awg_label(self.row_awg)}, {self.column_c:g} °C column"


def table_ampacity(
    table: AmpacityTable, awg: int, rating_c: float, ambient_c: float, loaded_conductors: int = 1
) -> Ampacity | None:
    """One table's figure: the column at or below the wire's rating and the row of the gauge
    (an odd size between rows takes the lighter row). None outside the table."""
    gauges = sorted(table.rows)
    if not gauges[0] <= awg <= gauges[-1]:
        return None
    column = bisect.bisect_right(table.columns_c, rating_c) - 1
    if column < 0:
        return None
    row = gauges[bisect.bisect_left(gauges, awg)]
    column_c = table.columns_c[column]
    tabulated = float(table.rows[row][column])
    ambient = ambient_factor(column_c, ambient_c, table.ambient_c)
    bundling = 1.0 if table.bundled else bundling_factor(loaded_conductors)
    return Ampacity(
        tabulated * ambient * bundling, tabulated, table.name, column_c, row, ambient, bundling
    )


@lru_cache(maxsize=4096)
def tabulated_ampacity(
    awg: int, rating_c: float, ambient_c: float, loaded_conductors: int = 1
) -> Ampacity | None:
    """The higher corrected figure of the tables that cover this wire, or None if none does.

    Each table is a published basis valid for the wire; taking the lower would rate a 105 degC
    wire (FAA, 33-wire bundles) below a 90 degC one (NEC), which no builder could act on.
    """
    found = [
        a
        for table in AMPACITY_TABLES
        if (a := table_ampacity(table, awg, rating_c, ambient_c, loaded_conductors)) is not None
    ]
    return max(found, key=lambda a: a.current, default=None)


@lru_cache(maxsize=4096)
def thin_wire_ampacity_bound(
    awg: int, rating_c: float, ambient_c: float, loaded_conductors: int = 1
) -> Ampacity | None:
    """An upper bound on the ampacity of a wire thinner than a table's smallest size.

    Ampacity falls with cross-section (every column of both tables rises with size), so such a
    wire carries no more than the smallest size the table rates, read in the column at or
    below the wire's rating with the same corrections. Over the tables it is thinner than, the
    most generous figure is the bound. None where no such table has a column at or below the
    rating: a 50 degC wire is below every column, and nothing bounds it.
    """
    found = []
    for table in AMPACITY_TABLES:
        smallest = max(table.rows)  # the highest AWG number is the thinnest row
        if awg > smallest:
            bound = table_ampacity(table, smallest, rating_c, ambient_c, loaded_conductors)
            if bound is not None:
                found.append(bound)
    return max(found, key=lambda a: a.current, default=None)


def datasheet_ampacity(
    rated_a: float, rating_c: float, ambient_c: float, loaded_conductors: int = 1
) -> Ampacity:
    """A wire's own datasheet figure, read as for one conductor in 30 degC air and corrected
    like a table figure."""
    ambient = ambient_factor(rating_c, ambient_c, DATASHEET_AMBIENT_C)
    bundling = bundling_factor(loaded_conductors)
    return Ampacity(
        rated_a * ambient * bundling, rated_a, "wire datasheet", rating_c, None, ambient, bundling
    )
