"""Profiles: the limits a jurisdiction, club or shop sets, each with its source.

A profile is a TOML file. Its ``[limits]`` tree nests freely; any table holding a ``value`` key
is one limit, named by its dotted path (``speed.max_speed.adult``). Quantity values are strings
with units and are parsed once, here, like build fields.
"""

from __future__ import annotations

import tomllib
from dataclasses import dataclass, field
from importlib import resources
from pathlib import Path
from typing import Any

import pint

from reviewer import units as u
from reviewer.errors import InputError
from reviewer.findings import Source, SourceStatus

DEFAULT_PROFILE = "default.toml"
_STATUS = {s.value: s for s in SourceStatus}


@dataclass(frozen=True)
class Limit:
    key: str
    value: pint.Quantity | float | str | bool
    source: Source

    @property
    def quantity(self) -> pint.Quantity:
        if not isinstance(self.value, pint.Quantity):
            raise TypeError(f"profile limit {self.key} is not a quantity")
        return self.value

    def magnitude(self, unit: str) -> float:
        return float(self.quantity.m_as(unit))


class MissingLimit(KeyError):
    """A rule asked for a limit its profile does not set: the rule is then unassessed."""

    def __str__(self) -> str:
        return f"the profile sets no limit {self.args[0]!r}"


@dataclass(frozen=True)
class Profile:
    name: str
    path: str
    description: str
    limits: dict[str, Limit]
    mandatory_rules: tuple[str, ...] = ()
    fingerprint: str = ""
    extra: dict[str, Any] = field(default_factory=dict)

    def limit(self, key: str) -> Limit:
        try:
            return self.limits[key]
        except KeyError:
            raise MissingLimit(key) from None

    def get(self, key: str) -> Limit | None:
        return self.limits.get(key)


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
    value: pint.Quantity | float | str | bool
    if isinstance(raw, bool):
        value = raw
    elif isinstance(raw, int | float):
        value = float(raw)
    elif isinstance(raw, str) and raw[:1].isdigit():
        try:
            value = u.parse_quantity(raw, _guess_dimension(raw))
        except u.QuantityError as exc:
            raise InputError(where, f"limits.{key}.value", str(exc)) from None
    elif isinstance(raw, str):
        value = raw
    else:
        raise InputError(where, f"limits.{key}.value", "a number, a quantity string or text")
    return Limit(key, value, Source(source.strip(), status))


def _guess_dimension(text: str) -> u.Dimension:
    """A profile value's dimension is whatever its unit says; parse with a permissive spec."""
    match = u._QUANTITY_RE.match(text)
    unit = match["unit"].replace("^", "**") if match else "dimensionless"
    try:
        units = u.ureg.parse_units(unit)
    except Exception:  # noqa: BLE001 - reported as an unknown unit by parse_quantity
        return u.Dimension("dimensionless", "1", "a quantity")
    return u.Dimension(str(units), text, "a quantity", allow_zero=True)


def _flatten(tree: dict[str, Any], prefix: str, where: str, out: dict[str, Limit]) -> None:
    for key, item in tree.items():
        path = f"{prefix}.{key}" if prefix else key
        if not isinstance(item, dict):
            raise InputError(where, f"limits.{path}", "a table with value, source and status")
        if "value" in item:
            out[path] = _parse_limit(path, item, where)
        else:
            _flatten(item, path, where, out)


def parse_profile(text: str, where: str) -> Profile:
    import hashlib

    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise InputError(where, "(file)", f"valid TOML ({exc})") from None
    meta = data.get("profile")
    if not isinstance(meta, dict) or not isinstance(meta.get("name"), str):
        raise InputError(where, "profile.name", "a [profile] table with a name")
    limits: dict[str, Limit] = {}
    _flatten(data.get("limits", {}), "", where, limits)
    mandatory = meta.get("mandatory_rules", [])
    if not isinstance(mandatory, list) or not all(isinstance(m, str) for m in mandatory):
        raise InputError(where, "profile.mandatory_rules", "a list of rule ids")
    return Profile(
        name=meta["name"],
        path=where,
        description=str(meta.get("description", "")),
        limits=limits,
        mandatory_rules=tuple(mandatory),
        fingerprint=hashlib.sha256(text.encode()).hexdigest(),
        extra={k: v for k, v in data.items() if k not in ("profile", "limits")},
    )


def load_profile(path: str | Path | None = None) -> Profile:
    """Load a profile file, or the default one shipped with the tool."""
    if path is None:
        text = resources.files("reviewer.profiles").joinpath(DEFAULT_PROFILE).read_text("utf-8")
        return parse_profile(text, f"(built-in) {DEFAULT_PROFILE}")
    where = str(path)
    try:
        text = Path(path).read_text("utf-8")
    except FileNotFoundError:
        raise InputError(where, "(file)", "an existing profile file") from None
    except (OSError, UnicodeDecodeError) as exc:
        raise InputError(where, "(file)", f"a readable UTF-8 text file ({exc})") from None
    return parse_profile(text, where)
