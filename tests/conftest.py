"""Shared fixtures: paths to the samples and a helper that writes a build file.

The rule authors' fixtures (``pack_manager``, ``built_in_profile``) come from firstride's own
pytest plugin (``reviewer.pytest_plugin``, entry point ``pytest11``), as in any pack's tests.
"""

from __future__ import annotations

from collections.abc import Callable
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent
SAMPLES = ROOT / "sample_builds"

MINIMAL_BUILD = """\
[vehicle]
name = "Test Cart"
kind = "kart"
"""


@pytest.fixture
def write_build(tmp_path: Path) -> Callable[[str], Path]:
    def write(text: str, name: str = "build.toml") -> Path:
        path = tmp_path / name
        path.write_text(text, encoding="utf-8")
        return path

    return write
