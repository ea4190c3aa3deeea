"""``firstride schema``: the build file's JSON Schema, for editor completion."""

from __future__ import annotations

import argparse
import json

from reviewer.commands import EXIT_GO

NAME = "schema"
HELP = "print the build file's JSON Schema"


def add_arguments(parser: argparse.ArgumentParser) -> None:
    """No options."""


def run(args: argparse.Namespace) -> int:
    from reviewer.build import build_json_schema

    print(json.dumps(build_json_schema(), indent=2, sort_keys=True))
    return EXIT_GO
