"""Compiled templates kept between runs: the same output, and never a reason to fail."""

from __future__ import annotations

import os
import subprocess
import sys
from pathlib import Path

import jinja2
import pytest

from reviewer import report, template_cache
from reviewer.engine import Review
from reviewer.session import review_file
from reviewer.template_cache import TemplateCache, bytecode_cache, settings_key

from .conftest import SAMPLES

TEMPLATE = "review.md.j2"


def _environment(cache: jinja2.BytecodeCache | None, **changed: bool) -> jinja2.Environment:
    """An environment like the report's own, with the cache (or none) and settings given."""
    folder = report.template_folder()
    settings = {"trim_blocks": True, "lstrip_blocks": True, **changed}
    env = jinja2.Environment(
        loader=jinja2.FunctionLoader(lambda name: folder.joinpath(name).read_text("utf-8")),
        bytecode_cache=cache,
        finalize=report.markdown_text,
        keep_trailing_newline=True,
        undefined=jinja2.StrictUndefined,
        **settings,
    )
    env.filters.update(report.environment().filters)
    return env


@pytest.fixture(scope="module")
def result() -> Review:
    return review_file(SAMPLES / "quayside-commuter.toml")


def _render(result: Review, env: jinja2.Environment, monkeypatch: pytest.MonkeyPatch) -> str:
    monkeypatch.setattr(report, "environment", lambda: env)
    return report.render_markdown(result)


def test_cached_template_renders_the_same_bytes(tmp_path: Path, result, monkeypatch) -> None:
    expected = _render(result, _environment(None), monkeypatch)
    first = _render(result, _environment(bytecode_cache(tmp_path)), monkeypatch)
    assert list(tmp_path.glob("*.cache"))  # compiled once and stored
    second = _render(result, _environment(bytecode_cache(tmp_path)), monkeypatch)  # from file
    assert first == second == expected


def test_stored_code_is_used_on_the_next_load(tmp_path: Path, monkeypatch) -> None:
    _environment(bytecode_cache(tmp_path)).get_template(TEMPLATE)
    compiled: list[object] = []
    original = jinja2.Environment.compile

    def counting(self, *args, **kwargs):  # type: ignore[no-untyped-def]
        compiled.append(args)
        return original(self, *args, **kwargs)

    monkeypatch.setattr(jinja2.Environment, "compile", counting)
    _environment(bytecode_cache(tmp_path)).get_template(TEMPLATE)
    assert compiled == []
    _environment(None).get_template(TEMPLATE)
    assert len(compiled) == 1  # the counter does count: without the cache it compiles


def test_other_settings_never_share_compiled_code(tmp_path: Path, result, monkeypatch) -> None:
    plain = _environment(bytecode_cache(tmp_path))
    other = _environment(bytecode_cache(tmp_path), trim_blocks=False)
    assert settings_key(plain) != settings_key(other)
    plain.get_template(TEMPLATE)
    expected = _render(result, _environment(None, trim_blocks=False), monkeypatch)
    assert _render(result, other, monkeypatch) == expected
    assert len(list(tmp_path.glob("*.cache"))) == 2


def test_edited_template_is_compiled_afresh(tmp_path: Path) -> None:
    sources = {"t.j2": "one {{ x }}"}
    loader = jinja2.FunctionLoader(sources.get)
    env = jinja2.Environment(loader=loader, bytecode_cache=bytecode_cache(tmp_path))
    assert env.get_template("t.j2").render(x=1) == "one 1"
    sources["t.j2"] = "two {{ x }}"
    fresh = jinja2.Environment(loader=loader, bytecode_cache=bytecode_cache(tmp_path))
    assert fresh.get_template("t.j2").render(x=1) == "two 1"


def test_damaged_cache_file_is_compiled_over(tmp_path: Path, result, monkeypatch) -> None:
    _environment(bytecode_cache(tmp_path)).get_template(TEMPLATE)
    (stored,) = tmp_path.glob("*.cache")
    stored.write_bytes(stored.read_bytes()[:40] + b"\x00not a pickle or marshal stream")
    expected = _render(result, _environment(None), monkeypatch)
    assert _render(result, _environment(bytecode_cache(tmp_path)), monkeypatch) == expected


def test_unwritable_folder_means_no_cache(tmp_path: Path, monkeypatch) -> None:
    monkeypatch.setattr(template_cache.os, "access", lambda path, mode: False)
    assert bytecode_cache(tmp_path) is None


def test_folder_others_may_write_to_means_no_cache(tmp_path: Path) -> None:
    shared = tmp_path / "shared"
    shared.mkdir()
    shared.chmod(0o777)
    assert bytecode_cache(shared) is None
    shared.chmod(0o700)
    assert bytecode_cache(shared) is not None


def test_folder_that_cannot_be_made_means_no_cache(tmp_path: Path) -> None:
    blocker = tmp_path / "a-file"
    blocker.write_text("not a folder")
    assert bytecode_cache(blocker / "templates") is None
    assert bytecode_cache(blocker) is None


def test_failing_write_is_ignored(tmp_path: Path, result, monkeypatch) -> None:
    cache = TemplateCache(str(tmp_path / "gone"))  # its folder does not exist: writes fail
    expected = _render(result, _environment(None), monkeypatch)
    assert _render(result, _environment(cache), monkeypatch) == expected
    assert not (tmp_path / "gone").exists()


def test_no_platformdirs_means_no_cache(monkeypatch) -> None:
    monkeypatch.setitem(sys.modules, "platformdirs", None)  # the import fails
    assert template_cache.default_folder() is None
    assert bytecode_cache() is None


def test_default_folder_is_the_users_cache(monkeypatch, tmp_path: Path) -> None:
    monkeypatch.setenv("XDG_CACHE_HOME", str(tmp_path))
    folder = template_cache.default_folder()
    assert folder is not None and folder.is_relative_to(tmp_path)
    assert bytecode_cache() is not None and folder.is_dir()


def test_review_is_the_same_without_a_usable_cache_folder(tmp_path: Path) -> None:
    """A home whose cache folder cannot be made (here: a file stands in its way) costs speed,
    never the review: pint's definitions and the templates are then compiled afresh."""
    blocker = tmp_path / "not-a-folder"
    blocker.write_text("x")
    build = SAMPLES / "quayside-commuter.toml"
    outputs = []
    for cache_home in (str(tmp_path / "cache"), str(blocker)):
        env = {**os.environ, "XDG_CACHE_HOME": cache_home}
        done = subprocess.run(
            [sys.executable, "-m", "reviewer", "review", str(build)],
            env=env,
            capture_output=True,
            text=True,
            check=False,
        )
        assert done.returncode == 0, done.stderr
        outputs.append(done.stdout)
    assert outputs[0] == outputs[1]
