"""pytest fixtures for rule-pack authors, offered through the ``pytest11`` entry point.

Installing firstride makes them available in every pytest run, so a pack's tests need no
conftest boilerplate: ask for ``pack_manager`` (a fresh manager, no packs loaded) or
``built_in_profile`` (the default profile over the built-in pack's limits) by name. The helpers
themselves live in :mod:`reviewer.testing`, which imports without pytest.
"""

from __future__ import annotations

from collections.abc import Iterator

import pytest

from reviewer.plugins import PackManager
from reviewer.profile import Profile


@pytest.fixture
def pack_manager() -> Iterator[PackManager]:
    """A fresh pack manager with no packs loaded; register inline packs in the test."""
    yield PackManager()


@pytest.fixture
def built_in_profile() -> Profile:
    """The default profile completed with the built-in pack's limits, as a plain review has."""
    from reviewer.session import default_profile

    return default_profile()
