"""The one path through a review: load, validate, run every rule, compare; rendering is apart.

The command line, the test helpers for pack authors, the benchmark and the sample tests all call
:func:`review_file` (or :func:`review_build` for a build already validated), so a review made
any of those ways is the same review. Packs are loaded once per :class:`Session` and reused for
every build reviewed with it (a fleet, a sweep).
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass, replace
from functools import cache
from pathlib import Path
from typing import TYPE_CHECKING, Any

from reviewer.engine import Review, review
from reviewer.loader import LoadedBuild, load_build
from reviewer.plugins import PackManager, load_packs
from reviewer.profile import Profile, load_profile

if TYPE_CHECKING:
    from reviewer.build import Build
    from reviewer.waivers import WaiverSet


@dataclass(frozen=True)
class Session:
    """Loaded packs and the profile completed with their default limits."""

    manager: PackManager
    profile: Profile

    def review_build(
        self,
        build: Build,
        *,
        where: str = "(build)",
        fingerprint: str = "",
        waivers: WaiverSet | None = None,
    ) -> Review:
        """A review of a validated build (its pack extensions are validated first)."""
        self.manager.check_extensions(build, where)
        return review(
            build,
            self.profile,
            self.manager.rules(),
            build_path=where,
            build_fingerprint=fingerprint,
            problems=self.manager.problems,
            waivers=waivers,
        )

    def review_loaded(
        self,
        loaded: LoadedBuild,
        *,
        waivers: WaiverSet | None = None,
        since: str | Path | None = None,
        previous: dict[str, Any] | None = None,
    ) -> Review:
        """A review of a build read from a file; ``since`` a previous JSON review to compare
        (``previous`` its content, when already read)."""
        if since is not None and previous is None:
            previous = _previous(since)
        result = self.review_build(
            loaded.build,
            where=Path(loaded.path).as_posix(),
            fingerprint=loaded.fingerprint,
            waivers=waivers,
        )
        result = replace(result, build_data=loaded.data)
        if since is not None and previous is not None:
            from reviewer.changes import compare

            changes = compare(previous, Path(since).as_posix(), result.findings, loaded.data)
            result = replace(result, changes=changes)
        return result


Packs = PackManager | Callable[[], PackManager] | None


def open_session(profile: Profile | str | Path | None = None, packs: Packs = None) -> Session:
    """Packs and the profile over their default limits.

    ``profile`` is a Profile, a profile file's path, or None for the default; ``packs`` a
    loaded manager, a function that loads one (called after every input file is read, so an
    input error is reported before any pack problem), or None for every installed pack.
    """
    manager = packs if isinstance(packs, PackManager) else (packs or load_packs)()
    base = profile if isinstance(profile, Profile) else load_profile(profile)
    return Session(manager, manager.complete_profile(base))


def review_file(
    path: str | Path,
    *,
    profile: Profile | str | Path | None = None,
    packs: Packs = None,
    waivers: str | Path | WaiverSet | None = None,
    since: str | Path | None = None,
) -> Review:
    """Review one build file: the whole sequence, as ``firstride review`` runs it.

    Reading order matches the command line's, so the first bad input reported is the same:
    the build, the profile, the waivers, the previous review, then the packs. The review keeps
    the build file's raw tree (``build_data``) for the JSON form and change reports.
    """
    loaded = load_build(path)
    base = profile if isinstance(profile, Profile) else load_profile(profile)
    waiver_set = _waivers(waivers)
    previous = _previous(since) if since is not None else None
    session = open_session(base, packs)
    return session.review_loaded(loaded, waivers=waiver_set, since=since, previous=previous)


def _previous(since: str | Path) -> dict[str, Any]:
    from reviewer.changes import load_previous  # only when asked: most reviews compare nothing

    return load_previous(since)


def _waivers(waivers: str | Path | WaiverSet | None) -> WaiverSet | None:
    if waivers is None or not isinstance(waivers, str | Path):
        return waivers
    from reviewer.waivers import load_waivers

    return load_waivers(waivers)


@cache
def built_in_session() -> Session:
    """The built-in pack alone under the default profile: what rule tests run against."""
    import firstride_rules

    from reviewer import __version__
    from reviewer.names import BUILT_IN_PACK

    manager = PackManager(strict=True)
    manager.register(firstride_rules, BUILT_IN_PACK, __version__)
    return open_session(None, manager)


def default_profile() -> Profile:
    """The default profile over the built-in pack's limits (what a plain review uses)."""
    return built_in_session().profile


def built_in_profile(path: str | Path | None = None) -> Profile:
    """A profile file (or the default) over the built-in pack's limits alone."""
    if path is None:
        return default_profile()
    return built_in_session().manager.complete_profile(load_profile(path))
