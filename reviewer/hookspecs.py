"""Every hook a firstride rule pack can implement. One module, one docstring per hook.

A pack is a module (or an object) with functions marked ``@reviewer.hookimpl`` whose names
match the specs below. Installed packs announce themselves through the ``firstride.packs``
entry-point group; the built-in pack uses the same door. A function named ``firstride_...``
that matches no spec, or is not marked, is refused: a misspelled hook is an error, not silence.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

import pluggy

if TYPE_CHECKING:
    from pydantic import BaseModel

    from reviewer.rule import Rule

PROJECT = "firstride"
hookspec = pluggy.HookspecMarker(PROJECT)


@hookspec
def firstride_register_rules() -> list[Rule]:  # type: ignore[empty-body]
    """Return the rules this pack contributes (required: every pack implements it).

    Each :class:`reviewer.rule.Rule` carries its id (``area.name`` in the built-in pack,
    ``<pack>.name`` in any other), title, sources, the build fields it reads and a check
    function ``check(build, profile)`` that yields findings, derived figures and assumptions.
    Called once per session; the engine validates every rule and refuses a pack with a faulty
    one, naming the rule and what it lacks.
    """


@hookspec
def firstride_pack_limits() -> str:  # type: ignore[empty-body]
    """Return this pack's default limits as TOML text (optional).

    The text holds ``[limits.<pack>.<key>]`` tables, each with ``value``, ``source`` and
    ``status``, exactly as in a profile; a pack may set limits only under its own name. Rules
    read them with ``profile.limit("<pack>.<key>")``. A profile the user passes overrides any
    of them by setting the same key, so a club can tighten a pack's limit without code.
    """


@hookspec
def firstride_build_extension() -> type[BaseModel]:  # type: ignore[empty-body]
    """Return a pydantic model of this pack's own build inputs (optional).

    A build file carries them in an ``[extensions.<pack>]`` table, which the core build model
    keeps as plain data. The review validates the table against this model before any rule
    runs, so a bad value is an input error naming the field (``extensions.<pack>.<field>``).
    Rules read the validated values with :func:`reviewer.extensions.extension`.
    """
