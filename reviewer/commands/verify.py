"""``firstride verify REVIEW.md``: is every signature valid, and (with --trust) trusted?"""

from __future__ import annotations

import argparse
from pathlib import Path

from reviewer.commands import EXIT_FINDINGS, EXIT_GO
from reviewer.errors import InputError

NAME = "verify"
HELP = "check every signature of a signed review, and optionally the build file it reviewed"


def add_arguments(parser: argparse.ArgumentParser) -> None:
    parser.add_argument("review", help="the signed Markdown review")
    parser.add_argument(
        "--build", help="the build file: must match the fingerprint the review states"
    )
    parser.add_argument(
        "--trust",
        action="append",
        default=[],
        metavar="KEYFILE",
        help="a trusted public key (repeatable); every signature must then come from one",
    )
    parser.add_argument(
        "--require",
        type=int,
        default=1,
        metavar="N",
        help="the least number of signatures expected (default 1): removing the last "
        "signatures cannot be seen in the document itself",
    )


def run(args: argparse.Namespace) -> int:
    from reviewer.signing import all_valid, verify_review_bytes
    from reviewer.signing_keys import load_public_key

    path = Path(args.review)
    try:
        data = path.read_bytes()
    except OSError as exc:
        raise InputError(str(path), "(file)", f"a readable review file ({exc.strerror})") from None
    build_bytes = None
    if args.build:
        try:
            build_bytes = Path(args.build).read_bytes()
        except OSError as exc:
            raise InputError(
                args.build, "(file)", f"a readable build file ({exc.strerror})"
            ) from None
    trusted = [load_public_key(key) for key in args.trust] or None
    checks = verify_review_bytes(data, build_bytes=build_bytes, trusted=trusted)
    if not checks:
        print(f"{path}: no signatures")
        return EXIT_FINDINGS
    for check in checks:
        state = "valid" if check.valid else "INVALID"
        print(
            f"signature {check.index}: {state}: {check.signer} ({check.role}), "
            f"key {check.key_fingerprint}, signed {check.signed_at or 'at an unreadable time'}"
        )
        for reason in check.reasons:
            print(f"    - {reason}")
    ok = all_valid(checks, require_trusted=trusted is not None)
    if len(checks) < args.require:
        print(f"{path}: {len(checks)} signature(s), {args.require} required")
        ok = False
    print(f"{path}: {'all signatures hold' if ok else 'verification failed'}")
    return EXIT_GO if ok else EXIT_FINDINGS
