"""The command line. Each verb lives in :mod:`reviewer.commands`; this module parses arguments,
turns every error a user can cause into one line on stderr and picks the exit code.

Exit codes (naming.md): 0 go, 1 the review found stop, fix or incomplete, 2 usage or input error.
"""

from __future__ import annotations

import argparse
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


def _parser() -> tuple[argparse.ArgumentParser, dict[str, object]]:
    parser = _Parser(
        prog="firstride",
        description="Design review of a home-built light electric vehicle before its first ride.",
    )
    parser.add_argument("--version", action="version", version=f"firstride {__version__}")
    verbs = parser.add_subparsers(dest="verb", required=True, parser_class=_Parser)
    modules: dict[str, object] = {}
    for name in VERBS:
        module = importlib.import_module(f"reviewer.commands.{name.replace('-', '_')}")
        sub = verbs.add_parser(module.NAME, help=module.HELP, description=module.HELP)
        module.add_arguments(sub)
        modules[module.NAME] = module
    return parser, modules


def main(argv: Sequence[str] | None = None) -> int:
    parser, modules = _parser()
    args = parser.parse_args(argv)
    try:
        return int(modules[args.verb].run(args))  # type: ignore[attr-defined]
    except InputError as exc:
        print(f"firstride: {exc}", file=sys.stderr)
        return EXIT_INPUT
    except ValueError as exc:
        from reviewer.signing_keys import SigningError

        if not isinstance(exc, SigningError):
            raise
        print(f"firstride: {exc}", file=sys.stderr)
        return EXIT_INPUT
    except KeyboardInterrupt:
        return 130
    except BrokenPipeError:
        # the reader went away (``firstride rules | head``): stop quietly, as shell tools do
        os.dup2(os.open(os.devnull, os.O_WRONLY), sys.stdout.fileno())
        return EXIT_GO
