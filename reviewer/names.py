"""Names the whole engine shares: id patterns, the entry-point group, the built-in pack.

A leaf module (it imports nothing of the project), so that the profile, the rule object and the
pack manager can all use the same patterns without importing each other.
"""

from __future__ import annotations

import re

#: A rule id: lowercase dotted slugs, area (or pack) first: ``wiring.stall-current``.
RULE_ID_RE = re.compile(r"^[a-z][a-z0-9]*(?:-[a-z0-9]+)*(?:\.[a-z][a-z0-9]*(?:-[a-z0-9]+)*)+$")
#: A pack name is one segment of a rule id: its rules are ``<pack>.<check-name>``.
PACK_NAME_RE = re.compile(r"^[a-z][a-z0-9]*(?:-[a-z0-9]+)*$")
#: The entry-point group every rule pack, the built-in one included, is announced in.
ENTRY_POINT_GROUP = "firstride.packs"
#: The name the built-in pack is registered under.
BUILT_IN_PACK = "core"
#: The environment variable that blocks packs by name (comma-separated).
BLOCK_ENVIRONMENT = "FIRSTRIDE_BLOCK_PACKS"
