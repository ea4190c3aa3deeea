"""``firstride new-pack NAME``: write a ready-to-install rule pack skeleton in ./NAME."""

from __future__ import annotations

import argparse
from pathlib import Path

from reviewer.commands import EXIT_GO

NAME = "new-pack"
HELP = "write a ready-to-install rule pack (one example rule, its limit and tests) in ./NAME"


def add_arguments(parser: argparse.ArgumentParser) -> None:
    parser.add_argument(
        "name",
        help="the pack's name: lowercase letters, digits and inner hyphens; "
        "every rule id of the pack starts with it (NAME.check-name)",
    )
    parser.add_argument(
        "--directory", default=".", help="create the pack's folder here (default: current folder)"
    )


def run(args: argparse.Namespace) -> int:
    from reviewer.scaffold import FILES, placeholders, render, write_pack

    target = write_pack(args.name, Path(args.directory))
    values = placeholders(args.name)
    print(f"firstride: wrote rule pack {args.name} in {target}/:")
    for destination in FILES.values():
        print(f"  {render(destination, values)}")
    print("next, in the environment firstride is installed in:")
    print(f"  pip install -e {target}")
    print(f"  firstride rules {args.name}.vehicle-mass")
    print(f"  firstride review {target / 'sample_build.toml'}")
    print(f"  python -m pytest {target / 'tests'}")
    return EXIT_GO
