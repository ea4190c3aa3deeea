"""Signed reviews: who signed which review of which exact build, and whether a byte changed since.

A signed review is the rendered review, byte for byte (the body), then the marker line, a
``## Signatures`` heading and one ``### Signature N`` block per signer. Each block is signed with
Ed25519 over a canonical payload: a version tag, the block's number, its own fields and the
SHA-256 of all text before the block. A later signature so covers the body and every signature
before it: re-ordering or removing an earlier one breaks the chain. Removing the last signatures
cannot be seen in the document itself, so a caller that needs two signers must ask for two.

The format is frozen: a change in escaping or field spelling would break every review signed
before it, which is why this module escapes names itself instead of sharing the report's escaper.
"""

from __future__ import annotations

import base64
import binascii
import hashlib
import re
from collections.abc import Sequence
from dataclasses import dataclass, field
from datetime import UTC, datetime

from cryptography.exceptions import InvalidSignature
from cryptography.hazmat.primitives.asymmetric.ed25519 import Ed25519PrivateKey, Ed25519PublicKey

from reviewer.signing_keys import (
    SigningError,
    generate_key_pair,
    key_fingerprint,
    load_private_key,
    load_public_key,
    public_key_bytes,
)
from reviewer.signing_names import escaped, name_problem, normalised, read_name

__all__ = [
    "SignatureCheck",
    "SigningError",
    "all_valid",
    "generate_key_pair",
    "key_fingerprint",
    "load_private_key",
    "load_public_key",
    "public_key_bytes",
    "sign_review",
    "verify_review",
    "verify_review_bytes",
]

FORMAT_TAG = "firstride-review-signature-v1"
MARKER = (
    "<!-- firstride signature section: the signed review body is every byte above this line -->"
)
SECTION_OPENING = MARKER + "\n\n## Signatures\n"
TIME_FORMAT = "%Y-%m-%dT%H:%M:%SZ"

SIGNER, ROLE, SIGNED_AT = "Signer", "Role", "Signed at (UTC)"
BUILD, BODY, PRECEDING = (
    "Build fingerprint",
    "Review body fingerprint",
    "Preceding text fingerprint",
)
PUBLIC_KEY, KEY_FINGERPRINT, SIGNATURE = "Public key (Ed25519)", "Key fingerprint", "Signature"
# Every block holds exactly these fields in this order; the value is how a field is spelt.
FIELDS = {
    SIGNER: "name",
    ROLE: "name",
    SIGNED_AT: "time",
    BUILD: "digest",
    BODY: "digest",
    PRECEDING: "digest",
    PUBLIC_KEY: "key",
    KEY_FINGERPRINT: "digest",
    SIGNATURE: "signature",
}

_BUILD_LABEL = "| Build fingerprint (SHA-256) |"
_BUILD_LINE = re.compile(r"\| Build fingerprint \(SHA-256\) \| `([0-9a-f]{64})` \|")
_BLOCK_START = re.compile(r"\n### Signature ")
_HEADING = re.compile(r"### Signature ([1-9][0-9]{0,5})")
_FIELD_LINE = re.compile(r"- ([^:]+): (.*)")
_SPELLING = {
    "time": (re.compile(r"[0-9]{4}-[0-9]{2}-[0-9]{2}T[0-9]{2}:[0-9]{2}:[0-9]{2}Z"), "a UTC time"),
    "digest": (re.compile(r"`(sha256:[0-9a-f]{64})`"), "`sha256:` and 64 lowercase hex digits"),
    "key": (re.compile(r"`([A-Za-z0-9+/]{43}=)`"), "base64 of 32 bytes in backticks"),
    "signature": (re.compile(r"`([A-Za-z0-9+/]{86}==)`"), "base64 of 64 bytes in backticks"),
}
_STRAY = re.compile(r"^### Signature [0-9]|^- Signature: |" + re.escape(MARKER), re.M)


@dataclass(frozen=True)
class SignatureCheck:
    """The verdict on one signature block; ``reasons`` is empty when it holds."""

    index: int
    signer: str
    role: str
    key_fingerprint: str
    signed_at: str = ""
    build_fingerprint: str = ""  # as the block states it, "sha256:<hex>"
    trusted: bool | None = None  # None: no trusted keys were given
    reasons: list[str] = field(default_factory=list)

    @property
    def valid(self) -> bool:
        return not self.reasons


# The text format -----------------------------------------------------------------------------


def stated_build_fingerprint(body: str) -> str:
    """The one build fingerprint the review's header table states, as ``sha256:<hex>``."""
    found: set[str] = set()
    for line in body.split("\n"):
        if line.startswith(_BUILD_LABEL):
            match = _BUILD_LINE.fullmatch(line)
            if match is None:
                raise SigningError("the review's build fingerprint line is malformed")
            found.add("sha256:" + match.group(1))
    if not found:
        raise SigningError(f"the review states no build fingerprint (no '{_BUILD_LABEL}' line)")
    if len(found) > 1:
        raise SigningError("the review states two different build fingerprints")
    return found.pop()


def _show(name: str, value: str) -> str:
    """How a field's value is written in the block."""
    kind = FIELDS[name]
    return escaped(value) if kind == "name" else value if kind == "time" else f"`{value}`"


def _read(name: str, shown: str) -> str:
    """Undo :func:`_show`, accepting only the one spelling it writes; ValueError says why not."""
    kind = FIELDS[name]
    if kind == "name":
        return read_name(name, shown)
    pattern, spelling = _SPELLING[kind]
    match = pattern.fullmatch(shown)
    if match is None or not _canonical(kind, match.group(match.lastindex or 0)):
        raise ValueError(f"{name} is not {spelling}")
    return match.group(match.lastindex or 0)


def _canonical(kind: str, value: str) -> bool:
    """Base64 and dates have spellings that read the same; only the one we write is accepted."""
    try:
        if kind == "time":
            return datetime.strptime(value, TIME_FORMAT).strftime(TIME_FORMAT) == value
        if kind in ("key", "signature"):
            return base64.b64encode(base64.b64decode(value, validate=True)).decode() == value
    except (ValueError, binascii.Error):
        return False
    return True


def _payload(index: int, values: dict[str, str]) -> bytes:
    """What a signature covers: every field but the signature, one ``name: value`` per line."""
    lines = [FORMAT_TAG, f"Signature {index}"]
    lines += [f"{name}: {values[name]}" for name in FIELDS if name != SIGNATURE]
    return ("\n".join(lines) + "\n").encode("utf-8")


def _render_block(index: int, values: dict[str, str]) -> str:
    lines = "".join(f"- {name}: {_show(name, values[name])}\n" for name in FIELDS)
    return f"\n### Signature {index}\n\n{lines}"


def _parse_block(chunk: str) -> tuple[int, dict[str, str]]:
    """The number and field values of one block (which starts with its line break).

    Raises ValueError naming what is wrong; the caller turns it into a failed check.
    """
    if not chunk.endswith("\n"):
        raise ValueError("the block is truncated (it does not end with a line break)")
    lines = chunk[1:-1].split("\n")
    heading = _HEADING.fullmatch(lines[0])
    if heading is None or len(lines) < 2 or lines[1] != "":
        raise ValueError("the block does not open with '### Signature <number>' and a blank line")
    shown: dict[str, str] = {}
    for number, line in enumerate(lines[2:], start=1):
        match = _FIELD_LINE.fullmatch(line)
        if match is None:
            raise ValueError(f"line {number} of the field list is not a '- Field: value' line")
        name, value = match.groups()
        if name not in FIELDS or name in shown:
            raise ValueError(f"unexpected or repeated field {name[:40]!r}")
        shown[name] = value
    missing = [name for name in FIELDS if name not in shown]
    if missing:
        raise ValueError("missing field " + ", ".join(f"'{name}'" for name in missing))
    if list(shown) != list(FIELDS):
        raise ValueError("fields out of order")
    values = {name: _read(name, text) for name, text in shown.items()}
    if values[KEY_FINGERPRINT] != _raw_fingerprint(values[PUBLIC_KEY]):
        raise ValueError("the key fingerprint does not match the public key")
    return int(heading.group(1)), values


def _raw_fingerprint(public_key_b64: str) -> str:
    return "sha256:" + hashlib.sha256(base64.b64decode(public_key_b64)).hexdigest()


def _sha256(text: str) -> str:
    return "sha256:" + hashlib.sha256(text.encode("utf-8")).hexdigest()


def _split(text: str) -> tuple[str, list[tuple[int, str]]] | None:
    """The body and each block (offset, text); None when the text has no signature section."""
    try:
        text.encode("utf-8")
    except UnicodeEncodeError:
        raise SigningError("the review is not UTF-8 text (it holds a lone surrogate)") from None
    if text.startswith(MARKER + "\n"):
        body_end = 0
    else:
        at = text.find("\n" + MARKER + "\n")
        if at < 0:
            if _STRAY.search(text):
                hint = " (were its line endings changed?)" if "\r\n" in text else ""
                raise SigningError(
                    f"signature section malformed: its opening marker line is missing{hint}"
                )
            return None
        body_end = at + 1
    if not text.startswith(SECTION_OPENING, body_end):
        raise SigningError("signature section malformed: no '## Signatures' after the marker")
    first = body_end + len(SECTION_OPENING)
    if first == len(text):
        raise SigningError("signature section malformed: it holds no signature")
    starts = [match.start() for match in _BLOCK_START.finditer(text, first)]
    if not starts or starts[0] != first:
        raise SigningError("signature section malformed: text before the first signature block")
    ends = [*starts[1:], len(text)]
    blocks = [(start, text[start:end]) for start, end in zip(starts, ends, strict=True)]
    return text[:body_end], blocks


# Signing and verifying -----------------------------------------------------------------------


def sign_review(
    text: str, private_key: Ed25519PrivateKey, signer: str, role: str, now: datetime
) -> str:
    """Return the review with one more signature block appended.

    Refuses a review whose existing signatures do not hold (nobody countersigns a review changed
    after the first signature) and a key that already signed it.
    """
    if not isinstance(private_key, Ed25519PrivateKey):
        raise SigningError("the signing key is not an Ed25519 private key")
    signer, role = normalised(signer), normalised(role)  # the one spelling verify accepts
    for what, value in (("signer", signer), ("role", role)):
        problem = name_problem(value)
        if problem:
            raise SigningError(f"the {what} {problem}")
    if now.tzinfo is None or now.utcoffset() is None:
        raise SigningError("the signing time must carry a time zone")
    section = _split(text)
    if section is None:
        body = text if text.endswith("\n") or not text else text + "\n"
        prefix, index = body + SECTION_OPENING, 1
    else:
        body, blocks = section
        prefix, index = text, len(blocks) + 1
        fingerprint = key_fingerprint(private_key.public_key())
        for check in verify_review(text):
            if not check.valid:
                raise SigningError(
                    f"signature {check.index} does not hold ({check.reasons[0]}); "
                    "refusing to add another"
                )
            if check.key_fingerprint == fingerprint:
                raise SigningError("this key has already signed this review")
    signed_at = now.astimezone(UTC).strftime(TIME_FORMAT)
    return prefix + _signature_block(prefix, body, index, private_key, signer, role, signed_at)


def _signature_block(
    prefix: str,
    body: str,
    index: int,
    private_key: Ed25519PrivateKey,
    signer: str,
    role: str,
    signed_at: str,
) -> str:
    """The block a signer appends after ``prefix``, checking nothing already there."""
    public_key = private_key.public_key()
    values = {
        SIGNER: signer,
        ROLE: role,
        SIGNED_AT: signed_at,
        BUILD: stated_build_fingerprint(body),
        BODY: _sha256(body),
        PRECEDING: _sha256(prefix),
        PUBLIC_KEY: base64.b64encode(public_key_bytes(public_key)).decode("ascii"),
        KEY_FINGERPRINT: key_fingerprint(public_key),
    }
    signature = private_key.sign(_payload(index, values))
    values[SIGNATURE] = base64.b64encode(signature).decode("ascii")
    return _render_block(index, values)


def verify_review(
    text: str,
    build_bytes: bytes | None = None,
    trusted: Sequence[Ed25519PublicKey] | None = None,
) -> list[SignatureCheck]:
    """Check every signature; [] when the review carries none (the caller reports that)."""
    section = _split(text)
    if section is None:
        return []
    body, blocks = section
    try:
        body_build: str | None = stated_build_fingerprint(body)
    except SigningError:
        body_build = None
    body_digest = _sha256(body)
    build_digest = (
        None if build_bytes is None else "sha256:" + hashlib.sha256(build_bytes).hexdigest()
    )
    trusted_keys = None if trusted is None else {key_fingerprint(key) for key in trusted}
    running = hashlib.sha256(text[: blocks[0][0]].encode("utf-8"))
    seen: set[str] = set()
    checks = []
    for position, (_, chunk) in enumerate(blocks, start=1):
        preceding = "sha256:" + running.hexdigest()
        running.update(chunk.encode("utf-8"))
        try:
            index, values = _parse_block(chunk)
        except ValueError as error:
            reason = f"signature block malformed: {error}"
            checks.append(SignatureCheck(position, "", "", "", reasons=[reason]))
            continue
        reasons = []
        try:
            Ed25519PublicKey.from_public_bytes(base64.b64decode(values[PUBLIC_KEY])).verify(
                base64.b64decode(values[SIGNATURE]), _payload(index, values)
            )
        except (InvalidSignature, ValueError):
            reasons.append("signature does not match")
        if values[BODY] != body_digest:
            reasons.append("review body changed since signing")
        elif values[PRECEDING] != preceding or index != position:
            reasons.append("signatures re-ordered or removed")
        if body_build is None:
            reasons.append("the review body does not state exactly one build fingerprint")
        elif values[BUILD] != body_build:
            reasons.append("signed a review of a different build")
        if build_digest is not None and build_digest != (body_build or values[BUILD]):
            reasons.append("build file differs from the fingerprint the review states")
        fingerprint = values[KEY_FINGERPRINT]
        if fingerprint in seen:
            reasons.append("the same key signed twice")
        seen.add(fingerprint)
        is_trusted = None if trusted_keys is None else fingerprint in trusted_keys
        if is_trusted is False:
            reasons.append("key not in the trusted keys")
        checks.append(
            SignatureCheck(
                index=position,
                signer=values[SIGNER],
                role=values[ROLE],
                key_fingerprint=fingerprint,
                signed_at=values[SIGNED_AT],
                build_fingerprint=values[BUILD],
                trusted=is_trusted,
                reasons=reasons,
            )
        )
    return checks


def verify_review_bytes(
    data: bytes,
    build_bytes: bytes | None = None,
    trusted: Sequence[Ed25519PublicKey] | None = None,
) -> list[SignatureCheck]:
    """:func:`verify_review` for a file's bytes; text that is not UTF-8 is a SigningError."""
    try:
        text = data.decode("utf-8")
    except UnicodeDecodeError as error:
        raise SigningError(
            f"the review is not UTF-8 text (bad byte at offset {error.start})"
        ) from None
    return verify_review(text, build_bytes, trusted)


def all_valid(checks: Sequence[SignatureCheck], require_trusted: bool) -> bool:
    """True when there is at least one signature and every one holds.

    With ``require_trusted`` each key must also have been found among given trusted keys;
    without it an untrusted key still fails whenever trusted keys were given.
    """
    if not checks or not all(check.valid for check in checks):
        return False
    return not require_trusted or all(check.trusted is True for check in checks)
