"""The rule-pack guide in DEVELOPERS.md cannot rot: its code is run here.

Fenced blocks of the section "Writing a rule pack of your own" whose info string names a file
(```python file=firstride_harbourclub/rules.py) are written to that path in a fresh folder;
the other Python blocks are run in order, in one namespace, from that folder. Then the guide's
own test file is run with pytest, as its reader would.
"""

from __future__ import annotations

import re
import subprocess
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent
SECTION = "## Writing a rule pack of your own"
FENCE = re.compile(r"^```(?P<info>[^\n]*)\n(?P<body>.*?)^```\s*$", re.MULTILINE | re.DOTALL)


def guide_blocks() -> list[tuple[str, str | None, str]]:
    """(language, file name or None, code) of every fenced block in the guide's section."""
    text = (ROOT / "DEVELOPERS.md").read_text("utf-8")
    start = text.index(SECTION)
    following = text.find("\n## ", start + len(SECTION))
    section = text[start : following if following != -1 else len(text)]
    blocks = []
    for match in FENCE.finditer(section):
        words = match["info"].split()
        language = words[0] if words else ""
        names = [w.removeprefix("file=") for w in words[1:] if w.startswith("file=")]
        blocks.append((language, names[0] if names else None, match["body"]))
    return blocks


BLOCKS = guide_blocks()


def test_the_guide_has_files_and_runnable_snippets() -> None:
    files = {name for _, name, _ in BLOCKS if name}
    assert {
        "firstride_harbourclub/rules.py",
        "firstride_harbourclub/__init__.py",
        "firstride_harbourclub/limits.toml",
        "tests/test_harbourclub.py",
        "club-profile.toml",
    } <= files
    runnable = [code for language, name, code in BLOCKS if language == "python" and not name]
    assert len(runnable) >= 3


@pytest.fixture
def guide_folder(tmp_path: Path, monkeypatch: pytest.MonkeyPatch):
    for _, name, code in BLOCKS:
        if name:
            path = tmp_path / name
            path.parent.mkdir(parents=True, exist_ok=True)
            path.write_text(code, encoding="utf-8")
    monkeypatch.chdir(tmp_path)
    monkeypatch.syspath_prepend(str(tmp_path))
    yield tmp_path
    for module in [m for m in sys.modules if m.startswith("firstride_harbourclub")]:
        del sys.modules[module]


def test_the_guide_snippets_run_in_order(guide_folder: Path) -> None:
    namespace: dict[str, object] = {"__name__": "guide"}
    for index, (language, name, code) in enumerate(BLOCKS):
        if language == "python" and not name:
            exec(compile(code, f"DEVELOPERS.md guide block {index}", "exec"), namespace)


def test_the_guide_pack_passes_its_own_tests(guide_folder: Path) -> None:
    result = subprocess.run(
        [sys.executable, "-m", "pytest", "-q", "-p", "no:cacheprovider", "tests"],
        cwd=guide_folder,
        env={"PYTHONPATH": str(guide_folder), "PATH": ""},
        capture_output=True,
        text=True,
        timeout=120,
    )
    assert result.returncode == 0, result.stdout + result.stderr
    assert " passed" in result.stdout


def test_the_guide_pack_is_lint_clean(guide_folder: Path) -> None:
    ruff = Path(sys.executable).with_name("ruff")
    if not ruff.exists():
        pytest.skip("ruff is not installed next to this Python")
    python_files = [str(p) for p in guide_folder.rglob("*.py")]
    result = subprocess.run(
        [
            *(str(ruff), "check", "--no-cache", "--config", str(ROOT / "pyproject.toml")),
            # Seen from the pack, firstride is a third-party library and the pack first-party.
            *("--config", "lint.isort.known-first-party = ['firstride_harbourclub']"),
            *("--config", "lint.isort.known-third-party = ['reviewer']"),
            *python_files,
        ],
        capture_output=True,
        text=True,
        timeout=60,
    )
    assert result.returncode == 0, result.stdout + result.stderr
