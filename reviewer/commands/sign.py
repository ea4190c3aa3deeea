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
    parser.add_argument("--signer", required=True, help="your name as it should appear")
    parser.add_argument("--role", required=True, help="e.g. builder, safety officer, technician")
    parser.add_argument("-o", "--output", help="write the signed review here (default: in place)")


def run(args: argparse.Namespace) -> int:
    from reviewer.output import write_whole
    from reviewer.signing import sign_review
    from reviewer.signing_keys import load_private_key

    path = Path(args.review)
    text = read_review_text(path)
    key = load_private_key(args.key)
    signed = sign_review(text, key, args.signer, args.role, datetime.now(UTC))
    target = Path(args.output) if args.output else path
    write_whole(target, signed)
    count = signed.count("\n### Signature ")
    print(f"firstride: signed {target} as signature {count} ({args.signer}, {args.role})")
    return EXIT_GO


def read_review_text(path: Path) -> str:
    try:
        data = path.read_bytes()
    except FileNotFoundError:
        raise InputError(str(path), "(file)", "an existing review file") from None
    except OSError as exc:
        raise InputError(str(path), "(file)", f"a readable file ({exc.strerror})") from None
    try:
        return data.decode("utf-8")
    except UnicodeDecodeError:
        raise InputError(str(path), "(file)", "a UTF-8 Markdown review") from None
