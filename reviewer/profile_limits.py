"""One profile's limits: each ``[limits]`` table holding a ``value`` parsed once into a
:class:`Limit`, its quantity, IP code, number or text carried with its source."""

from __future__ import annotations

import re
from dataclasses import dataclass
from typing import Any

import pint

from reviewer import quantity_text as qt
from reviewer import units as u
from reviewer.engineering.ingress import IngressCode, parse_ip_code
from reviewer.error_collector import Collector
from reviewer.errors import InputError
from reviewer.findings import Source, SourceStatus

_STATUS = {s.value: s for s in SourceStatus}
_IP_LIKE = re.compile(r"^\s*IP[0-9X]", re.IGNORECASE)


@dataclass(frozen=True)
class Limit:
    key: str
    value: pint.Quantity | IngressCode | float | str | bool
    source: Source

    @property
    def quantity(self) -> pint.Quantity:
        if not isinstance(self.value, pint.Quantity):
            raise TypeError(f"profile limit {self.key} is not a quantity")
        return self.value

    def magnitude(self, unit: str) -> float:
        return float(self.quantity.m_as(unit))


def _parse_limit(key: str, table: dict[str, Any], where: str) -> Limit:
    allowed = {"value", "source", "status"}
    unknown = set(table) - allowed
    if unknown:
        raise InputError(where, f"limits.{key}", f"unknown key {sorted(unknown)[0]!r} in a limit")
    source = table.get("source")
    if not isinstance(source, str) or not source.strip():
        raise InputError(where, f"limits.{key}.source", "every limit needs a source (text)")
    status_text = table.get("status", "published")
    status = _STATUS.get(status_text)
    if status is None:
        raise InputError(where, f"limits.{key}.status", f"one of {', '.join(sorted(_STATUS))}")
    raw = table["value"]
    value: pint.Quantity | IngressCode | float | str | bool
    if isinstance(raw, bool):
        value = raw
    elif isinstance(raw, int | float):
        value = float(raw)
    elif isinstance(raw, str) and raw[:1].isdigit():
        try:
            value = qt.parse_quantity(raw, _guess_dimension(raw))
        except u.QuantityError as exc:
            raise InputError(where, f"limits.{key}.value", str(exc)) from None
    elif isinstance(raw, str) and _IP_LIKE.match(raw):
        try:  # an IP code is parsed here, once, like a build file's
            value = parse_ip_code(raw)
        except ValueError as exc:
            raise InputError(where, f"limits.{key}.value", str(exc)) from None
    elif isinstance(raw, str):
        value = raw
    else:
        raise InputError(where, f"limits.{key}.value", "a number, a quantity string or text")
    return Limit(key, value, Source(source.strip(), status))


def _guess_dimension(text: str) -> u.Dimension:
    """A profile value's dimension is whatever its unit says; parse with a permissive spec."""
    match = qt.QUANTITY_RE.match(text)
    unit = match["unit"].replace("^", "**") if match else "dimensionless"
    try:
        units = u.unit(unit)  # cached: profiles repeat a handful of units
    except Exception:  # noqa: BLE001 - reported as an unknown unit by parse_quantity
        return u.Dimension("dimensionless", "1", "a quantity")
    return u.Dimension(str(units), text, "a quantity", allow_zero=True)


def flatten_limits(
    tree: dict[str, Any], prefix: str, where: str, out: dict[str, Limit], errors: Collector
) -> None:
    for key, item in tree.items():
        path = f"{prefix}.{key}" if prefix else key
        if not isinstance(item, dict):
            errors.add(InputError(where, f"limits.{path}", "a table with value, source and status"))
        elif "value" in item:
            limit = errors.attempt(_parse_limit, path, item, where, default=None)
            if limit is not None:
                out[path] = limit
        else:
            flatten_limits(item, path, where, out, errors)
