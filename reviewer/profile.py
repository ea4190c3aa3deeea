"""Profiles: the limits a jurisdiction, club or shop sets, each with its source.

A profile is a TOML file. Its ``[limits]`` tree nests freely; any table holding a ``value`` key
is one limit, named by its dotted path (``speed.max_speed.adult``). Quantity values are strings
with units and are parsed once, here, like build fields.

A profile can build on another (``[profile] extends = "default"`` for the built-in one, or a
path relative to the extending file) and then only says what differs:

- ``[limits]``: a limit of the same name replaces the inherited one (same kind of quantity);
- ``mandatory_rules`` and ``required_packs`` add to the inherited lists;
- ``[rules."rule.id"]`` replaces whatever the inherited profile said about that rule:
  ``escalate_to = "stop"`` reports every fix or advise finding of the rule as at least that
  severity; ``enabled = false`` switches the rule off, and must come with ``justification``,
  ``by`` and ``date``, which the review prints;
- ``rule_time_budget`` (a duration) replaces the inherited one.

Rule packs may ship default limits under their own name (``harbourclub.max_speed``); a profile
overrides them like any other limit (see :meth:`Profile.with_pack_limits`).
"""

from __future__ import annotations

import hashlib
import re
import tomllib
from dataclasses import dataclass, field, replace
from importlib import resources
from pathlib import Path
from typing import Any

import pint

from reviewer import quantity_text as qt
from reviewer import units as u
from reviewer.error_collector import Collector
from reviewer.errors import InputError
from reviewer.findings import Finding, Severity
from reviewer.names import PACK_NAME_RE, RULE_ID_RE
from reviewer.profile_limits import Limit, flatten_limits
from reviewer.rule_settings import RuleSetting, parse_rule_setting, suggest
from reviewer.watchdog import DEFAULT_BUDGET_S

DEFAULT_PROFILE = "default.toml"
#: The word ``extends`` uses for the profile shipped with the tool.
BUILT_IN = "default"
MAX_EXTENDS_DEPTH = 16
#: The top-level tables a profile may have; anything else is a typo that would drop limits.
TABLES = ("profile", "limits", "rules", "waivers")
_PROFILE_KEYS = (
    "name",
    "description",
    "extends",
    "mandatory_rules",
    "required_packs",
    "rule_time_budget",
)
#: A limit value that is an IP code ("IP54", "IPX5/IPX7").
_BUDGET = u.Dimension("s", "2 s", "a duration", 0.0, 600.0, allow_zero=True)


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
    allow_stop_waivers: bool = False  # [waivers] allow_stop = true: a stop may be waived
    required_packs: tuple[str, ...] = ()
    rule_settings: dict[str, RuleSetting] = field(default_factory=dict)
    rule_time_budget: float = DEFAULT_BUDGET_S  # seconds; 0 runs rules unfenced
    extends: tuple[str, ...] = ()  # the profiles this one builds on, nearest first

    def limit(self, key: str) -> Limit:
        try:
            return self.limits[key]
        except KeyError:
            raise MissingLimit(key) from None

    def get(self, key: str) -> Limit | None:
        return self.limits.get(key)

    def runs(self, rule_id: str) -> bool:
        """False for a rule this profile switched off."""
        setting = self.rule_settings.get(rule_id)
        return setting is None or setting.enabled

    @property
    def switched_off(self) -> list[RuleSetting]:
        """Rules switched off, with who, when and why, for the review to print."""
        return [s for _, s in sorted(self.rule_settings.items()) if not s.enabled]

    @property
    def escalations(self) -> list[RuleSetting]:
        return [s for _, s in sorted(self.rule_settings.items()) if s.escalate_to is not None]

    def adjust(self, finding: Finding) -> Finding:
        """Apply an ``escalate_to`` setting: a fix or advise finding becomes at least that bad."""
        setting = self.rule_settings.get(finding.rule_id)
        if setting is None or setting.escalate_to is None:
            return finding
        target, severity = setting.escalate_to, finding.severity
        if severity in (Severity.PASS, Severity.UNASSESSED) or severity.rank <= target.rank:
            return finding
        note = (
            f"Reported as {target.value} rather than {severity.value}: "
            f"profile '{self.name}' escalates this rule."
        )
        return replace(finding, severity=target, rationale=f"{finding.rationale} {note}".strip())

    def with_pack_limits(self, pack_limits: dict[str, Limit]) -> Profile:
        """This profile over the default limits rule packs ship: the profile's own win."""
        if not pack_limits:
            return self
        return replace(self, limits={**pack_limits, **self.limits})


# --- parsing ----------------------------------------------------------------------------------


def parse_limits(text: str, where: str) -> dict[str, Limit]:
    """The ``[limits]`` of a TOML text (a rule pack's default limits, for instance)."""
    data = _toml(text, where)
    unknown = sorted(set(data) - {"limits"})
    if unknown:
        raise InputError(where, unknown[0], "only [limits.*] tables")
    limits: dict[str, Limit] = {}
    errors = Collector(where, text)
    flatten_limits(_table(data, "limits", where), "", where, limits, errors)
    errors.raise_any()
    return limits


def _toml(text: str, where: str) -> dict[str, Any]:
    try:
        return tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise InputError(where, "(file)", f"valid TOML ({exc})") from None


def _table(data: dict[str, Any], key: str, where: str) -> dict[str, Any]:
    table = data.get(key, {})
    if not isinstance(table, dict):
        raise InputError(where, key, "a table")
    return table


def _names(
    meta: dict[str, Any], key: str, where: str, pattern: re.Pattern[str], what: str
) -> tuple[str, ...]:
    items = meta.get(key, [])
    if not isinstance(items, list) or not all(isinstance(i, str) for i in items):
        raise InputError(where, f"profile.{key}", f"a list of {what}")
    for item in items:
        if not pattern.match(item):
            raise InputError(where, f"profile.{key}", f"{what}; {item!r} is not one")
    return tuple(items)


def parse_profile(text: str, where: str) -> Profile:
    """One profile from its text; ``extends`` is followed relative to ``where``'s folder."""
    return _without_switched_off(_layered(text, where, ()))


def _layered(text: str, where: str, seen: tuple[str, ...]) -> Profile:
    """The profile over everything it extends, switched-off rules still listed as mandatory
    (a profile further down may switch them back on)."""
    data = _toml(text, where)
    errors = Collector(where, text)  # every mistake of this file at once, each at its line
    for table in data:
        if table not in TABLES:
            errors.add(InputError(where, table, f"no such table{suggest(table, TABLES)}"))
    meta = data.get("profile")
    if not isinstance(meta, dict) or not isinstance(meta.get("name"), str):
        errors.add(InputError(where, "profile.name", "a [profile] table with a name"))
        meta = meta if isinstance(meta, dict) else {}
    for key in meta:
        if key not in _PROFILE_KEYS:
            errors.add(
                InputError(where, f"profile.{key}", f"no such key{suggest(key, _PROFILE_KEYS)}")
            )
    limits: dict[str, Limit] = {}
    flatten_limits(
        errors.attempt(_table, data, "limits", where, default={}), "", where, limits, errors
    )
    settings: dict[str, RuleSetting] = {}
    for rule_id, table in errors.attempt(_table, data, "rules", where, default={}).items():
        setting = errors.attempt(parse_rule_setting, rule_id, table, where, default=None)
        if setting is not None:
            settings[rule_id] = setting
    budget = None
    if "rule_time_budget" in meta:
        try:
            budget = qt.parse_quantity(meta["rule_time_budget"], _BUDGET).m_as("s")
        except u.QuantityError as exc:
            errors.add(InputError(where, "profile.rule_time_budget", str(exc)))
    mandatory = errors.attempt(
        _names, meta, "mandatory_rules", where, RULE_ID_RE, "rule ids", default=()
    )
    packs = errors.attempt(
        _names, meta, "required_packs", where, PACK_NAME_RE, "rule pack names", default=()
    )
    waivers = errors.attempt(_table, data, "waivers", where, default={})
    allow_stop = errors.attempt(_allow_stop, waivers, where, default=False)
    extends = meta.get("extends")
    if extends is not None and (not isinstance(extends, str) or not extends.strip()):
        errors.add(
            InputError(where, "profile.extends", f"'{BUILT_IN}' or the path of a profile file")
        )
    errors.raise_any()
    own = Profile(
        name=meta["name"],
        path=where,
        description=str(meta.get("description", "")),
        limits=limits,
        mandatory_rules=mandatory,
        fingerprint=hashlib.sha256(text.encode()).hexdigest(),
        allow_stop_waivers=allow_stop,
        required_packs=packs,
        rule_settings=settings,
        rule_time_budget=DEFAULT_BUDGET_S if budget is None else float(budget),
    )
    if extends is None:
        return own
    parent = _load_parent(extends.strip(), where, (*seen, _identity(where)))
    return _merge(parent, own, budget is not None, "waivers" in data, where)


def _allow_stop(table: dict[str, Any], where: str) -> bool:
    """``[waivers]``: only ``allow_stop``, a true or false."""
    for key in table:
        if key != "allow_stop":
            raise InputError(where, f"waivers.{key}", f"no such key{suggest(key, ('allow_stop',))}")
    value = table.get("allow_stop", False)
    if not isinstance(value, bool):
        raise InputError(where, "waivers.allow_stop", "true or false")
    return value


def _identity(where: str) -> str:
    if where.startswith("(built-in)"):
        return where
    try:
        return str(Path(where).resolve())
    except OSError:
        return where


def _load_parent(extends: str, child: str, seen: tuple[str, ...]) -> Profile:
    if len(seen) > MAX_EXTENDS_DEPTH:
        raise InputError(child, "profile.extends", f"at most {MAX_EXTENDS_DEPTH} levels of extends")
    if extends == BUILT_IN:
        where = _BUILT_IN_WHERE
    else:
        base = Path(child).parent if not child.startswith("(") else Path.cwd()
        where = str(base / extends)
    if _identity(where) in seen:
        chain = " -> ".join([*seen, _identity(where)])
        raise InputError(child, "profile.extends", f"no cycle ({chain})")
    if where == _BUILT_IN_WHERE:
        return _layered(_built_in_text(), where, seen)
    return _layered(_read_text(where, "profile.extends", child), where, seen)


def _merge(
    parent: Profile, child: Profile, child_budget: bool, child_waivers: bool, where: str
) -> Profile:
    for key, limit in child.limits.items():
        inherited = parent.limits.get(key)
        if inherited is not None and not same_kind(inherited.value, limit.value):
            raise InputError(
                where, f"limits.{key}.value", f"the same kind of value as {inherited.value!r}"
            )
    return Profile(
        name=child.name,
        path=child.path,
        description=child.description or parent.description,
        limits={**parent.limits, **child.limits},
        mandatory_rules=tuple(dict.fromkeys((*parent.mandatory_rules, *child.mandatory_rules))),
        fingerprint=hashlib.sha256(
            f"{parent.fingerprint}\n{child.fingerprint}".encode()
        ).hexdigest(),
        allow_stop_waivers=(
            child.allow_stop_waivers if child_waivers else parent.allow_stop_waivers
        ),
        required_packs=tuple(dict.fromkeys((*parent.required_packs, *child.required_packs))),
        rule_settings={**parent.rule_settings, **child.rule_settings},
        rule_time_budget=child.rule_time_budget if child_budget else parent.rule_time_budget,
        extends=(parent.path, *parent.extends),
    )


def same_kind(old: object, new: object) -> bool:
    if isinstance(old, pint.Quantity) or isinstance(new, pint.Quantity):
        return (
            isinstance(old, pint.Quantity)
            and isinstance(new, pint.Quantity)
            and old.dimensionality == new.dimensionality
        )
    return type(old) is type(new)


def _without_switched_off(profile: Profile) -> Profile:
    """A switched-off rule is no longer mandatory: the review prints why it did not run."""
    off = {rule_id for rule_id, s in profile.rule_settings.items() if not s.enabled}
    if not off & set(profile.mandatory_rules):
        return profile
    return replace(
        profile, mandatory_rules=tuple(r for r in profile.mandatory_rules if r not in off)
    )


_BUILT_IN_WHERE = f"(built-in) {DEFAULT_PROFILE}"


def _built_in_text() -> str:
    return resources.files("reviewer.profiles").joinpath(DEFAULT_PROFILE).read_text("utf-8")


def _read_text(where: str, field: str = "(file)", referrer: str = "") -> str:
    """A profile's text: a regular file of at most 1 MiB, UTF-8, nested no deeper than
    reviewer.inputs allows (checked before it is parsed); errors name ``referrer`` if given."""
    from reviewer.inputs import read_text

    return read_text(where, "profile file", syntax="toml", field=field, reported=referrer or None)


def load_profile(path: str | Path | None = None) -> Profile:
    """Load a profile file, or the default one shipped with the tool."""
    if path is None:
        return parse_profile(_built_in_text(), _BUILT_IN_WHERE)
    return parse_profile(_read_text(str(path)), str(path))
