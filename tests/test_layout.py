"""The layout keeps its promises: a rule's module is found from its id, modules stay small,
imports only go one way, the test helpers import without pytest, every package is installed."""

from __future__ import annotations

import ast
import subprocess
import sys
import tomllib
from pathlib import Path

import firstride_rules
import pytest

from reviewer.plugins import default_manager

ROOT = Path(__file__).resolve().parent.parent
#: Where each import name's source lives in the tree.
PACKAGES = {"reviewer": ROOT / "reviewer", "firstride_rules": ROOT / "rules"}
MAX_LINES = 400


def _modules() -> dict[str, Path]:
    found = {}
    for name, folder in PACKAGES.items():
        for path in sorted(folder.rglob("*.py")):
            parts = path.relative_to(folder).with_suffix("").parts
            if parts[-1] == "__init__":
                parts = parts[:-1]
            found[".".join((name, *parts))] = path
    return found


def test_every_built_in_rule_lives_in_the_module_named_from_its_id() -> None:
    core = [r for r in default_manager().rules() if r.pack == "core"]
    assert {r.id for r in core} == set(firstride_rules.RULE_IDS)
    for rule in core:
        area, name = rule.id.split(".", 1)
        expected = f"firstride_rules.{area}.{name.replace('-', '_')}"
        assert rule.check.__module__ == expected, rule.id
        assert (ROOT / "rules" / area / f"{name.replace('-', '_')}.py").is_file()


def test_every_public_rule_module_holds_one_rule() -> None:
    """A module without a leading underscore in an area package is a rule: the next rule
    follows the layout, and helpers are named as helpers."""
    ids = set(firstride_rules.RULE_IDS)
    for area in sorted(p for p in (ROOT / "rules").iterdir() if (p / "__init__.py").is_file()):
        if area.name.startswith("_"):
            continue  # helpers several areas share
        for module in sorted(area.glob("[!_]*.py")):
            rule_id = f"{area.name}.{module.stem.replace('_', '-')}"
            assert rule_id in ids, f"{module.relative_to(ROOT)} is not a rule's module"


@pytest.mark.parametrize("module", sorted(_modules()))
def test_modules_stay_under_the_line_guide(module: str) -> None:
    lines = _modules()[module].read_text(encoding="utf-8").count("\n")
    assert lines <= MAX_LINES, f"{module}: {lines} lines"


def _imports(path: Path, module: str) -> set[str]:
    """Project modules this one imports at module level or in functions (TYPE_CHECKING-only
    imports excluded: they never run)."""
    tree = ast.parse(path.read_text(encoding="utf-8"))
    checking: set[int] = set()
    for node in ast.walk(tree):
        if isinstance(node, ast.If) and "TYPE_CHECKING" in ast.unparse(node.test):
            checking.update(id(n) for child in node.body for n in ast.walk(child))
    package = module if path.name == "__init__.py" else module.rpartition(".")[0]
    names: set[str] = set()
    for node in ast.walk(tree):
        if id(node) in checking:
            continue
        if isinstance(node, ast.Import):
            names.update(alias.name for alias in node.names)
        elif isinstance(node, ast.ImportFrom):
            base = node.module or ""
            if node.level:
                anchor = package.rsplit(".", node.level - 1)[0] if node.level > 1 else package
                base = f"{anchor}.{base}".rstrip(".")
            names.add(base)
            names.update(f"{base}.{alias.name}" for alias in node.names)
    return names


def test_no_import_cycle_between_modules() -> None:
    modules = _modules()
    graph = {
        name: sorted(
            target
            for target in _imports(path, name)
            if target in modules and target != name and not name.startswith(f"{target}.")
        )
        for name, path in modules.items()
    }
    state: dict[str, int] = {}
    cycle: list[str] = []

    def visit(node: str, trail: list[str]) -> bool:
        state[node] = 1
        for target in graph[node]:
            if state.get(target) == 1:
                cycle.extend([*trail[trail.index(target) :], target])
                return True
            if target not in state and visit(target, [*trail, target]):
                return True
        state[node] = 2
        return False

    for start in sorted(graph):
        if start not in state and visit(start, [start]):
            break
    assert not cycle, " -> ".join(cycle)


def test_the_test_helpers_import_without_pytest() -> None:
    code = "import sys; sys.modules['pytest'] = None; import reviewer.testing"
    done = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True)
    assert done.returncode == 0, done.stderr


def test_every_package_in_the_tree_is_installed() -> None:
    listed = set(
        tomllib.loads((ROOT / "pyproject.toml").read_text())["tool"]["setuptools"]["packages"]
    )
    for name, path in _modules().items():
        if path.name == "__init__.py" and path.parent != ROOT / "templates":
            assert name in listed, f"{name} is missing from pyproject.toml's packages"


def test_the_fixtures_reach_tests_through_the_pytest_plugin(pack_manager, built_in_profile) -> None:
    # no conftest imports them: the pytest11 entry point does
    assert pack_manager.packs == {}
    assert built_in_profile.limit("speed.max_speed.adult").magnitude("km/h") == 25
