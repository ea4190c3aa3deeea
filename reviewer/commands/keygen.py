"""``firstride keygen PREFIX``: a new Ed25519 key pair for signing reviews."""

from __future__ import annotations

import argparse
import os
import stat

from reviewer.commands import EXIT_GO

NAME = "keygen"
HELP = "make an Ed25519 key pair (PREFIX.key, owner-only, and PREFIX.pub) for signing reviews"


def add_arguments(parser: argparse.ArgumentParser) -> None:
    parser.add_argument("prefix", help="path prefix: writes PREFIX.key and PREFIX.pub")


def run(args: argparse.Namespace) -> int:
    from reviewer.signing_keys import generate_key_pair

    private, public = f"{args.prefix}.key", f"{args.prefix}.pub"
    fingerprint = generate_key_pair(private, public)  # new files only (reviewer.output)
    mode = stat.S_IMODE(os.stat(private).st_mode)
    print(f"private key: {private} (keep it to yourself; mode {mode:o})")
    print(f"public key:  {public} (give it to whoever verifies your signatures)")
    print(f"fingerprint: {fingerprint}")
    return EXIT_GO
