"""Every hook a firstride rule pack can implement. One module, one docstring per hook.

A pack is a module (or an object) with functions marked ``@reviewer.hookimpl`` whose names
match the specs below. Installed packs announce themselves through the ``firstride.packs``
entry-point group; the built-in pack uses the same door.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

import pluggy

if TYPE_CHECKING:
    from reviewer.rule import Rule

PROJECT = "firstride"
hookspec = pluggy.HookspecMarker(PROJECT)


@hookspec
def firstride_register_rules() -> list[Rule]:  # type: ignore[empty-body]
    """Return the rules this pack contributes.

    Each :class:`reviewer.rule.Rule` carries its id (``area.name``, or ``pack.name`` for a
    third-party pack), title, sources, the build fields it reads and a check function
    ``check(build, profile)`` that yields findings, derived figures and assumptions.
    Called once per review session; the engine validates every rule it receives.
    """
