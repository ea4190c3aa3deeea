"""``firstride verify REVIEW.md``: is every signature intact, and from a trusted key?

A signature that is intact only proves that whoever held *some* key signed these bytes; anyone
can make a key and sign under any name. So without ``--trust`` the verdict is never that the
signatures hold: the command says no signer is trusted and exits 1, unless the reader asks
for ``--integrity-only`` (has the review changed since it was signed, whoever signed it?).
"""

from __future__ import annotations

import argparse
from pathlib import Path

from reviewer.commands import EXIT_FINDINGS, EXIT_GO

NAME = "verify"
HELP = "check every signature of a signed review, and optionally the build file it reviewed"
#: The most signatures ``--require`` may ask for.
MAX_REQUIRED = 1000


def add_arguments(parser: argparse.ArgumentParser) -> None:
    parser.add_argument("review", help="the signed Markdown review")
    parser.add_argument(
        "--build", help="the build file: must match the fingerprint the review states"
    )
    keys = parser.add_mutually_exclusive_group()
    keys.add_argument(
        "--trust",
        action="append",
        default=[],
        metavar="KEYFILE",
        help="a trusted public key (repeatable); every signature must come from one",
    )
    keys.add_argument(
        "--integrity-only",
        action="store_true",
        help="check only that the review is unchanged since each signature, trusting no key: "
        "the names shown are whatever the signers typed",
    )
    parser.add_argument(
        "--require",
        type=_required_count,
        default=1,
        metavar="N",
        help="the least number of signatures expected (default 1, at least 1): removing the "
        "last signatures cannot be seen in the document itself",
    )


def _required_count(text: str) -> int:
    try:
        value = int(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"a whole number of signatures, not {text!r}") from None
    if not 1 <= value <= MAX_REQUIRED:
        raise argparse.ArgumentTypeError(f"between 1 and {MAX_REQUIRED} signatures, not {value}")
    return value


def run(args: argparse.Namespace) -> int:
    from reviewer.errors import printable
    from reviewer.inputs import MAX_REVIEW_BYTES, read_bytes
    from reviewer.signing import all_valid, verify_review_bytes
    from reviewer.signing_keys import SigningError, load_public_key

    path = Path(args.review)
    data = read_bytes(path, "signed Markdown review", limit=MAX_REVIEW_BYTES)
    build_bytes = None
    if args.build:
        build_bytes = read_bytes(args.build, "build file", field="--build")
    trusted = [load_public_key(key, "--trust") for key in args.trust] or None
    try:
        checks = verify_review_bytes(data, build_bytes=build_bytes, trusted=trusted)
    except SigningError as error:
        raise error.at(str(path), "signatures") from None

    def say(line: str) -> None:
        print(printable(line))

    if not checks:
        say(f"{path}: no signatures")
        return EXIT_FINDINGS
    for check in checks:
        if not check.valid:
            state = "INVALID"
        elif check.trusted:
            state = "valid, trusted key"
        else:
            state = "intact, key not checked against trusted keys"
        say(
            f"signature {check.index}: {state}: {check.signer} ({check.role}), "
            f"key {check.key_fingerprint}, signed {check.signed_at or 'at an unreadable time'}"
        )
        for reason in check.reasons:
            say(f"    - {reason}")
    enough = len(checks) >= args.require
    if not enough:
        say(f"{path}: {len(checks)} signature(s), {args.require} required")
    if trusted is None:
        intact = enough and all_valid(checks, require_trusted=False)
        if not args.integrity_only:
            say(
                f"{path}: verification failed: no signer is trusted (give each signer's "
                "public key with --trust KEYFILE, or ask for --integrity-only)"
            )
            return EXIT_FINDINGS
        if intact:
            say(
                f"{path}: integrity only: every signature is intact; no signer is trusted, "
                "so who signed is not known"
            )
            return EXIT_GO
        say(f"{path}: verification failed")
        return EXIT_FINDINGS
    ok = enough and all_valid(checks, require_trusted=True)
    say(f"{path}: {'all signatures hold' if ok else 'verification failed'}")
    return EXIT_GO if ok else EXIT_FINDINGS
