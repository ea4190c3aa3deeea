"""Shared fixtures: paths to the samples and a helper that writes a build file."""

from __future__ import annotations

from collections.abc import Callable
from pathlib import Path

import pytest

from reviewer.testing import pack_manager  # noqa: F401 - re-exported fixture for rule authors

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
