"""A rule pack's own build inputs: the ``[extensions.<pack>]`` table of a build file.

The core build model forbids unknown keys (a misspelt key would silently drop a check), yet a
club's rules need inputs the core does not know: a kill-switch lanyard, a deck height. So the
build file has one free-form table per pack, which the core keeps as plain data, and each pack
describes its table with a pydantic model of its own (``firstride_build_extension``). The review
validates every table before the rules run; a rule reads its pack's table with
:func:`extension`.

Quantities in a pack's model use :class:`reviewer.quantity_text.QuantityField`, exactly as the core
model does, so ``"95 mm"`` is parsed once, strictly, into a pint quantity.
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any, TypeVar

from pydantic import BaseModel, ValidationError

from reviewer.errors import MAX_REPORTED, InputError, InputErrors

if TYPE_CHECKING:
    from reviewer.build import Build

M = TypeVar("M", bound=BaseModel)


def extension(build: Build, pack: str, model: type[M]) -> M | None:
    """The build's ``[extensions.<pack>]`` table as ``model``, or None when the build has none.

    Raises pydantic's ValidationError on bad values; a review has already reported those as
    input errors before any rule runs, so inside a rule this only fails in a hand-made build.
    """
    data = build.extensions.get(pack)
    if data is None:
        return None
    return model.model_validate(data)


def validate_extension(build: Build, pack: str, model: type[BaseModel], where: str) -> None:
    """Raise :class:`InputErrors` naming each bad ``extensions.<pack>.<field>`` of the table:
    every one pydantic finds, not only the first."""
    data = build.extensions.get(pack)
    if data is None:
        return
    try:
        model.model_validate(data)
    except ValidationError as exc:
        found = [_one(error, pack, model, where) for error in exc.errors(include_url=False)]
        kept = found[:MAX_REPORTED]
        raise InputErrors(kept, more=len(found) - len(kept)) from None


def _one(error: dict[str, Any], pack: str, model: type[BaseModel], where: str) -> InputError:
    path = "".join(f"[{p}]" if isinstance(p, int) else f".{p}" for p in error["loc"])
    field = f"extensions.{pack}{path}"
    if error["type"] == "extra_forbidden":
        known = ", ".join(sorted(model.model_fields))
        return InputError(where, field, f"no such key; known keys: {known}")
    return InputError(where, field, str(error["msg"]).removeprefix("Value error, "))
