"""The files ``firstride new-pack NAME`` writes: a ready-to-install rule pack with one example
rule, its default limit, its tests and a build to try it on.

The templates are package data (``*.tmpl``) so they are never imported, linted or collected as
tests here; placeholders are ``@PACK@`` (the pack name), ``@MODULE@`` (its import name),
``@DIST@`` (its distribution name), ``@SLUG@`` and ``@FIRSTRIDE@`` (the version it needs).
"""

from __future__ import annotations

import os
import re
import shutil
import tempfile
from importlib import resources
from pathlib import Path

from reviewer import __version__
from reviewer.errors import InputError

#: template file -> path inside the new pack's folder (placeholders allowed)
FILES = {
    "pyproject.toml.tmpl": "pyproject.toml",
    "README.md.tmpl": "README.md",
    "pack_init.py.tmpl": "@MODULE@/__init__.py",
    "pack_rules.py.tmpl": "@MODULE@/rules.py",
    "pack_limits.toml.tmpl": "@MODULE@/limits.toml",
    "test_pack.py.tmpl": "tests/test_@SLUG@.py",
    "sample_build.toml.tmpl": "sample_build.toml",
}
MAX_NAME = 40
_NAME_RE = re.compile(r"^[a-z][a-z0-9]*(?:-[a-z0-9]+)*$")


def check_name(name: str) -> None:
    """A pack name prefixes every rule id (``name.check``): a lowercase slug, not ``core``."""
    if not _NAME_RE.match(name) or len(name) > MAX_NAME:
        raise InputError(
            "(new-pack)",
            repr(name),
            f"a pack name of lowercase letters, digits and inner hyphens, at most {MAX_NAME} "
            "characters, starting with a letter (e.g. 'harbourclub')",
        )
    if name == "core":
        raise InputError("(new-pack)", repr(name), "a name other than 'core' (the built-in pack)")


def placeholders(name: str) -> dict[str, str]:
    slug = name.replace("-", "_")
    major_minor = ".".join(__version__.split(".")[:2])
    return {
        "@PACK@": name,
        "@MODULE@": f"firstride_{slug}",
        "@DIST@": f"firstride-{name}",
        "@SLUG@": slug,
        "@FIRSTRIDE@": major_minor,
    }


def render(text: str, values: dict[str, str]) -> str:
    for key, value in values.items():
        text = text.replace(key, value)
    return text


def write_pack(name: str, parent: Path) -> Path:
    """Write the pack into ``parent/name``; refuse if it exists. All files or none: they are
    written to a hidden temporary folder first and moved into place in one rename."""
    check_name(name)
    if not parent.is_dir():
        raise InputError(str(parent), "(folder)", "an existing folder to create the pack in")
    target = parent / name
    if target.exists() or target.is_symlink():
        raise InputError(str(target), "(folder)", "a name not yet taken: new-pack never overwrites")
    values = placeholders(name)
    templates = resources.files(__name__)
    staging = Path(tempfile.mkdtemp(prefix=f".{name}-", dir=parent))
    try:
        for template, destination in FILES.items():
            path = staging / render(destination, values)
            path.parent.mkdir(parents=True, exist_ok=True)
            text = templates.joinpath(template).read_text("utf-8")
            path.write_text(render(text, values), encoding="utf-8")
        os.rename(staging, target)
    except BaseException:
        shutil.rmtree(staging, ignore_errors=True)
        raise
    return target
