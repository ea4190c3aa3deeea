"""What the counter page does, apart from the web: read a build from bytes the browser sent,
write the form's build as TOML, review it, render it, sign it. No Flask here.

A build from the page goes through :func:`reviewer.loader.parse_build`, the loader the command
line uses (its size cap, UTF-8, nesting and validation, every error with its field path), and is
reviewed by the same :class:`~reviewer.session.Session`, so the Markdown review of a build is
byte for byte what ``firstride review NAME.toml`` writes for the TOML file the page offers.
Nothing here opens a file: the only file read is the key, once, when the command starts.
"""

from __future__ import annotations

import re
import threading
import unicodedata
from collections.abc import Mapping
from dataclasses import dataclass
from datetime import UTC, datetime
from typing import TYPE_CHECKING, Any

from reviewer.errors import InputError, InputErrors, shown, without_pint
from reviewer.web.form_data import FormTree, form_tree, form_values
from reviewer.web.schema_form import FormShape, build_form_shape
from reviewer.web.toml_text import dumps

if TYPE_CHECKING:
    from cryptography.hazmat.primitives.asymmetric.ed25519 import Ed25519PrivateKey

    from reviewer.engine import Review
    from reviewer.loader import LoadedBuild
    from reviewer.session import Session

#: The forms a review is offered in, with their file suffix and media type.
DOWNLOADS = {
    "toml": ("toml", "application/toml"),
    "md": ("md", "text/markdown"),
    "html": ("html", "text/html"),
    "json": ("json", "application/json"),
}
#: Longest message shown at a field.
MAX_MESSAGE = 400


@dataclass
class Problems(Exception):
    """Input errors of a build from the page: (field path, message) pairs."""

    errors: list[tuple[str, str]]


def slug(name: object) -> str:
    """A file name stem from a vehicle's name: ASCII letters, digits and dashes only."""
    text = unicodedata.normalize("NFKD", name if isinstance(name, str) else "")
    text = re.sub(r"[^a-z0-9]+", "-", text.encode("ascii", "ignore").decode().lower())
    return text.strip("-")[:60].strip("-") or "build"


def file_name(tree: Mapping[str, Any]) -> str:
    """The build file's name for a tree: from ``vehicle.name``, as the page offers it."""
    vehicle = tree.get("vehicle")
    return slug(vehicle.get("name") if isinstance(vehicle, Mapping) else None) + ".toml"


def problems_of(error: InputError, tree: FormTree | None = None) -> list[tuple[str, str]]:
    """Every error of an InputError (or InputErrors) as (form field path, message)."""
    errors = error.errors if isinstance(error, InputErrors) else (error,)
    found = []
    for one in errors:
        field = one.field if tree is None else tree.form_path(one.field)
        found.append((field, shown(without_pint(str(one.expected)), MAX_MESSAGE)))
    if isinstance(error, InputErrors) and error.total > len(errors):
        more = error.total - len(errors)
        found.append(("(file)", f"and {more} more; put these right and review again"))
    return found


class Counter:
    """The page's work on one machine: a session of packs and profile, and the optional key
    (the key object only; its file is never read again and never sent)."""

    def __init__(
        self,
        session: Session,
        key: Ed25519PrivateKey | None = None,
        shape: FormShape | None = None,
    ) -> None:
        self.session = session
        self.key = key
        self.shape = shape or build_form_shape()
        self._lock = threading.Lock()  # one review at a time: charts draw with matplotlib

    @property
    def can_sign(self) -> bool:
        return self.key is not None

    def uploaded(self, raw: bytes) -> tuple[dict[str, str], list[tuple[str, str]], list[str]]:
        """An uploaded build file as form values, its input errors and notes about it."""
        from reviewer.inputs import decode, load_toml
        from reviewer.loader import MAX_BUILD_BYTES

        where = "upload"
        try:
            if len(raw) > MAX_BUILD_BYTES:
                limit = f"a build file of at most {MAX_BUILD_BYTES} bytes"
                raise InputError(where, "(file)", f"{limit}; this one is larger")
            tree = load_toml(decode(raw, where, "a build file"), where)
        except InputError as error:
            return {}, problems_of(error), []
        notes = [
            f"[{key}] is not on this form and is left out of the build it writes"
            for key in self.shape.left_out
            if key in tree
        ]
        try:
            self.load(raw, file_name(tree))
        except Problems as found:
            return form_values(tree, self.shape), found.errors, notes
        return form_values(tree, self.shape), [], notes

    def from_form(self, form: Mapping[str, str]) -> tuple[str, FormTree]:
        """The TOML text a submitted form describes, and where its rows came from."""
        tree = form_tree(form, self.shape)
        return dumps(tree.tree), tree

    def load(self, raw: bytes, name: str, tree: FormTree | None = None) -> LoadedBuild:
        """The build validated as the command line validates a file, or :class:`Problems`."""
        from reviewer.loader import parse_build

        try:
            loaded = parse_build(raw, name)
            self.session.manager.check_extensions(loaded.build, name)
        except InputError as error:
            raise Problems(problems_of(error, tree)) from None
        return loaded

    def review(self, loaded: LoadedBuild) -> Review:
        with self._lock:
            return self.session.review_loaded(loaded)

    def render(self, result: Review, form: str) -> str:
        from reviewer.formats import render_review

        with self._lock:
            return render_review(result, form)

    def sign(self, result: Review, signer: str, role: str) -> str:
        """The Markdown review signed with the machine's key, or :class:`Problems` naming the
        signer or role field (checked as ``firstride sign`` checks them)."""
        from reviewer.signing import sign_review

        if self.key is None:
            raise Problems([("(file)", "this page was started without --key")])
        names, errors = {}, []
        for field, value in (("signer", signer), ("role", role)):
            checked, problem = checked_name(value)
            names[field] = checked
            if problem:
                errors.append((field, problem))
        if errors:
            raise Problems(errors)
        markdown = self.render(result, "md")
        return sign_review(markdown, self.key, names["signer"], names["role"], datetime.now(UTC))


def checked_name(value: str) -> tuple[str, str | None]:
    """A signer's name or role as it will be signed (NFKC) and what is wrong with it, if
    anything: the test ``firstride sign`` applies to ``--signer`` and ``--role``."""
    from reviewer.signing_names import name_problem, normalised

    name = normalised(value)
    if not name.strip():
        return name, "a name is needed"
    problem = name_problem(name)
    if problem:
        return name, f"a name in one script, without invisible characters; it {problem}"
    return name, None
