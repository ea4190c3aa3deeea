"""firstride rule pack of the Millrace Park Riders, an invented club.

Two rules of the club's own that the built-in pack does not check, each with its source and
remedy: a tethered kill switch that opens the motor supply (``millrace.kill-switch``) and a
maximum deck height for boards (``millrace.deck-height``). Their inputs live in the build file's
``[extensions.millrace]`` table (:mod:`firstride_millrace.inputs`); the club's default limits in
``limits.toml``. The club's speed limits for juniors need no code: ``club-profile.toml`` sets
them over the built-in ones.
"""

from __future__ import annotations

from importlib import resources

from reviewer import hookimpl
from reviewer.rule import Rule

__version__ = "0.1.0"


@hookimpl
def firstride_register_rules() -> list[Rule]:
    from firstride_millrace import deck_height, kill_switch

    return [kill_switch.RULE, deck_height.RULE]


@hookimpl
def firstride_pack_limits() -> str:
    return resources.files(__name__).joinpath("limits.toml").read_text("utf-8")


@hookimpl
def firstride_build_extension() -> type:
    from firstride_millrace.inputs import MillraceInputs

    return MillraceInputs
