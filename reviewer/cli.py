"""The command line. Each verb lives in :mod:`reviewer.commands`; this module parses arguments,
turns every error a user can cause into one line on stderr and picks the exit code.

Exit codes (naming.md): 0 go, 1 the review found stop, fix or incomplete, 2 usage or input error.
"""

from __future__ import annotations

import argparse
import gc
import importlib
import os
import sys
from collections.abc import Sequence

from reviewer import __version__
from reviewer.commands import EXIT_GO, EXIT_INPUT, VERBS
from reviewer.errors import InputError


class _Parser(argparse.ArgumentParser):
    def error(self, message: str) -> None:  # one line, exit 2, as for any input error
        self.exit(EXIT_INPUT, f"firstride: {message} (see firstride --help)\n")


def _invoked(argv: Sequence[str]) -> str | None:
    """The verb ``argv`` names (its first word not an option), if it is one of ours."""
    first = next((word for word in argv if not word.startswith("-")), None)
    return first if first in VERBS else None


def _parser(
    argv: Sequence[str] | None = None,
) -> tuple[argparse.ArgumentParser, dict[str, object]]:
    """The command line's parser. With ``argv`` naming a verb, only that verb's module is
    imported and its options added (a review does not pay for the web server's); otherwise,
    as for ``--help`` or a mistyped verb, every verb's."""
    invoked = _invoked(sys.argv[1:] if argv is None else argv)
    parser = _Parser(
        prog="firstride",
        description="Design review of a home-built light electric vehicle before its first ride.",
    )
    parser.add_argument("--version", action="version", version=f"firstride {__version__}")
    verbs = parser.add_subparsers(dest="verb", required=True, parser_class=_Parser)
    modules: dict[str, object] = {}
    for name in VERBS if invoked is None else (invoked,):
        module = importlib.import_module(f"reviewer.commands.{name.replace('-', '_')}")
        sub = verbs.add_parser(module.NAME, help=module.HELP, description=module.HELP)
        module.add_arguments(sub)
        modules[module.NAME] = module
    return parser, modules


def main(argv: Sequence[str] | None = None) -> int:
    parser, modules = _parser(argv)
    args = parser.parse_args(argv)
    try:
        return int(modules[args.verb].run(args))  # type: ignore[attr-defined]
    except InputError as exc:  # SigningError too; str() makes the line safe to print
        print(f"firstride: {exc}", file=sys.stderr)
        return EXIT_INPUT
    except KeyboardInterrupt:
        return 130
    except BrokenPipeError:
        # the reader went away (``firstride rules | head``): stop quietly, as shell tools do
        os.dup2(os.open(os.devnull, os.O_WRONLY), sys.stdout.fileno())
        return EXIT_GO


#: The collector's first threshold while firstride runs as a program (Python's own is 700):
#: more than a whole review allocates and keeps, so a normal run needs no collection at all.
PROGRAM_GC_THRESHOLD = 100_000


def run() -> None:
    """The program: :func:`main` in a process of its own (``python -m reviewer``).

    Two settings suit a short process and change nothing it writes or returns:

    - Starting up (pint's registry, pydantic's models, the rule packs) keeps some 70,000
      objects and makes next to no cyclic garbage, yet the collector, woken every 700
      allocations, walks the young objects again and again: 20 to 30 ms. It is woken every
      100,000 here; it still runs, so a rule that makes cyclic garbage is still cleaned up.
    - At exit the objects still alive are frozen, so the interpreter does not walk them all
      once more only to free memory the operating system takes back anyway: about 100 ms.
      Exit handlers, the flushing of streams and the joining of threads happen as before.
    """
    gc.set_threshold(PROGRAM_GC_THRESHOLD, *gc.get_threshold()[1:])
    try:
        code = main()
    finally:
        gc.freeze()
    raise SystemExit(code)
