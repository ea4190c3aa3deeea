"""What a review says on the terminal beside the review itself: the verdict line always (unless
``--quiet``); on a terminal, also the counts and the first things to do, in colour unless
``NO_COLOR`` is set. Nothing but the verdict line goes into a pipe or a log.
"""

from __future__ import annotations

import os
from typing import TYPE_CHECKING, TextIO

from reviewer.errors import printable
from reviewer.findings import Severity

if TYPE_CHECKING:
    from reviewer.engine import Review

#: How many actions the terminal summary lists; the review lists them all.
SHOWN = 3
_ORDER = (Severity.STOP, Severity.FIX, Severity.ADVISE, Severity.UNASSESSED, Severity.PASS)
_COLOUR = {
    Severity.STOP: "\033[1;31m",
    Severity.FIX: "\033[1;33m",
    Severity.ADVISE: "\033[1;36m",
    Severity.UNASSESSED: "\033[1;35m",
}
_VERDICT = {"go": "\033[1;32m", "no-go": "\033[1;31m", "conditional": "\033[1;33m"}
_RESET = "\033[0m"


def colour_wanted(stream: TextIO) -> bool:
    """Colour only on a terminal, and never with NO_COLOR set (any non-empty value) or a dumb
    terminal."""
    if os.environ.get("NO_COLOR") or os.environ.get("TERM") == "dumb":
        return False
    isatty = getattr(stream, "isatty", None)
    return bool(isatty and isatty())


def summary(review: Review, *, tty: bool, colour: bool) -> str:
    """The stderr text: one verdict line; on a terminal, counts and the first actions."""
    verdict = review.verdict.value
    paint = (lambda code, text: f"{code}{text}{_RESET}") if colour else (lambda _c, text: text)
    line = f"firstride: verdict {paint(_VERDICT.get(verdict, chr(27) + '[1;35m'), verdict)}"
    if not tty:
        return f"firstride: verdict {verdict}\n"
    counts = ", ".join(f"{s.value} {review.count(s)}" for s in _ORDER if review.count(s))
    lines = [f"{line} ({counts})" if counts else line]
    acted = [
        f
        for severity in _ORDER[:4]
        for f in review.findings
        if f.severity is severity and not f.waiver
    ]
    for number, finding in enumerate(acted[:SHOWN], 1):
        word = paint(_COLOUR[finding.severity], finding.severity.value.upper())
        what = finding.remedy or (
            "give " + ", ".join(finding.missing) if finding.missing else finding.rationale
        )
        text = printable(f"{finding.rule_id}, {finding.subject}: {what}")
        lines.append(f"  {number}. {word} {text[:160]}{'…' if len(text) > 160 else ''}")
    if len(acted) > SHOWN:
        lines.append(f"  ... {len(acted) - SHOWN} more in the review")
    return "\n".join(lines) + "\n"


def report(review: Review, stream: TextIO, *, quiet: bool = False) -> None:
    """Write the summary to ``stream`` (stderr), or nothing with ``quiet``."""
    if quiet:
        return
    tty = bool(getattr(stream, "isatty", None) and stream.isatty())
    stream.write(summary(review, tty=tty, colour=colour_wanted(stream)))
