"""``firstride sign REVIEW.md``: append a signature block to a Markdown review."""

from __future__ import annotations

import argparse
from datetime import UTC, datetime
from pathlib import Path

from reviewer.commands import EXIT_GO
from reviewer.errors import InputError

NAME = "sign"
HELP = "sign a Markdown review (appends a signature block; each signature covers those before it)"


def add_arguments(parser: argparse.ArgumentParser) -> None:
    parser.add_argument("review", help="the Markdown review to sign")
    parser.add_argument("--key", required=True, help="your private key file (from keygen)")
    parser.add_argument(
        "--signer",
        required=True,
        help="your name as it should appear (one script, no invisible characters)",
    )
    parser.add_argument("--role", required=True, help="e.g. builder, safety officer, technician")
    parser.add_argument("-o", "--output", help="write the signed review here (default: in place)")


def run(args: argparse.Namespace) -> int:
    """Read, sign and write back under a lock on the file written, so two people signing
    the same review at once both end up in it (the second signs after the first). Everything
    is checked once before the lock is taken, so a refused run leaves no file behind."""
    from reviewer.output import locked, writable_target, write_whole
    from reviewer.signing import sign_review
    from reviewer.signing_keys import SigningError, load_private_key

    path = Path(args.review)
    signer = checked_name(args.signer, "--signer", path)
    role = checked_name(args.role, "--role", path)
    key = load_private_key(args.key, "--key")
    target = Path(args.output) if args.output else path
    protected = [args.key]  # never written onto the private key

    def signed_now() -> str:
        try:
            return sign_review(read_review_text(path), key, signer, role, datetime.now(UTC))
        except SigningError as error:
            raise error.at(str(path), "signatures") from None

    signed_now()  # a bad review or target is refused before the lock file is made
    writable_target(target, protected)
    with locked(target):
        signed = signed_now()  # afresh: another signer may have finished meanwhile
        write_whole(target, signed, inputs=protected)
    count = signed.count("\n### Signature ")
    print(f"firstride: signed {target} as signature {count} ({signer}, {role})")
    return EXIT_GO


def checked_name(value: str, option: str, review: Path) -> str:
    """A signer's name or role as it will be signed (NFKC), or an InputError saying why not."""
    from reviewer.signing_names import name_problem, normalised

    name = normalised(value)
    problem = name_problem(name)
    if problem:
        raise InputError(
            str(review), option, f"a name in one script, without invisible characters; it {problem}"
        )
    return name


def read_review_text(path: Path) -> str:
    from reviewer.inputs import MAX_REVIEW_BYTES, read_text

    return read_text(path, "Markdown review", limit=MAX_REVIEW_BYTES)
