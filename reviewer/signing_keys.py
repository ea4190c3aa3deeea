"""Ed25519 key pairs for signing reviews: made, written owner-only, loaded with clear errors."""

from __future__ import annotations

import hashlib
from pathlib import Path

from cryptography.exceptions import UnsupportedAlgorithm
from cryptography.hazmat.primitives import serialization
from cryptography.hazmat.primitives.asymmetric.ed25519 import Ed25519PrivateKey, Ed25519PublicKey

from reviewer.errors import MAX_EXPECTED, InputError, shown
from reviewer.inputs import MAX_KEY_BYTES, read_bytes

MAX_KEY_FILE_BYTES = MAX_KEY_BYTES


class SigningError(InputError, ValueError):
    """A key, review or signature problem, stated in one line for the command-line edge.

    An :class:`InputError` (exit status 2, one line), still a ValueError for older callers.
    Raised deep in the signing code it may not know the file yet: :meth:`at` names it."""

    def __init__(self, expected: str, file: str = "", field: str = "") -> None:
        super().__init__(file, field, expected)

    def at(self, file: str, field: str) -> SigningError:
        """This error naming ``file`` and ``field``, unless it names a file already."""
        if self.file:
            return self
        located = SigningError(self.expected, file, field)
        located.__suppress_context__ = True
        return located

    def __str__(self) -> str:
        if self.file:
            return super().__str__()
        return shown(self.expected, MAX_EXPECTED)


def public_key_bytes(public_key: Ed25519PublicKey) -> bytes:
    return public_key.public_bytes(serialization.Encoding.Raw, serialization.PublicFormat.Raw)


def key_fingerprint(public_key: Ed25519PublicKey) -> str:
    """``sha256:`` and the hex SHA-256 of the raw 32-byte public key."""
    return "sha256:" + hashlib.sha256(public_key_bytes(public_key)).hexdigest()


def generate_key_pair(private_path: Path | str, public_path: Path | str) -> str:
    """Write a new key pair and return its fingerprint; never overwrites an existing file.

    The private key file gets mode 0o600 (less the umask) in the call that creates it, so it
    is never readable by others, not even for an instant; the public key 0o644 less the umask.
    Both are flushed to the disk; on any failure neither is left behind.
    """
    private_path, public_path = Path(private_path), Path(public_path)
    if private_path.resolve() == public_path.resolve():
        raise SigningError("the private and public key files must be different paths")
    for path in (private_path, public_path):
        if path.exists() or path.is_symlink():
            raise SigningError(
                "a new path; it already exists (refusing to overwrite a key file)",
                str(path),
                "(key file)",
            )
    key = Ed25519PrivateKey.generate()
    private_pem = key.private_bytes(
        serialization.Encoding.PEM,
        serialization.PrivateFormat.PKCS8,
        serialization.NoEncryption(),
    )
    public_pem = key.public_key().public_bytes(
        serialization.Encoding.PEM, serialization.PublicFormat.SubjectPublicKeyInfo
    )
    _write_new_file(private_path, private_pem, 0o600)
    try:
        _write_new_file(public_path, public_pem, 0o644)
    except SigningError:
        private_path.unlink(missing_ok=True)
        raise
    return key_fingerprint(key.public_key())


def _write_new_file(path: Path, data: bytes, mode: int) -> None:
    from reviewer.output import write_new  # only keygen writes keys

    try:
        write_new(path, data, mode)
    except InputError as error:
        expected = error.expected.replace("it already exists", "it already exists (a key file?)")
        raise SigningError(expected, error.file, "(key file)") from None


def _read_key_file(path: Path | str, field: str) -> bytes:
    """A key file's bytes: a regular file of at most MAX_KEY_FILE_BYTES (reviewer.inputs)."""
    try:
        return read_bytes(path, "key file", field=field, limit=MAX_KEY_FILE_BYTES)
    except InputError as error:
        raise SigningError(error.expected, error.file, error.field) from None


def load_private_key(path: Path | str, field: str = "--key") -> Ed25519PrivateKey:
    data = _read_key_file(path, field)
    where = str(path)
    try:
        key = serialization.load_pem_private_key(data, password=None)
    except TypeError:
        raise SigningError(
            "an unencrypted key; the private key is encrypted", where, field
        ) from None
    except (ValueError, UnsupportedAlgorithm):
        raise SigningError("a key file from keygen; not a PEM private key", where, field) from None
    if not isinstance(key, Ed25519PrivateKey):
        raise SigningError("a key file from keygen; not an Ed25519 private key", where, field)
    return key


def load_public_key(path: Path | str, field: str = "--trust") -> Ed25519PublicKey:
    data = _read_key_file(path, field)
    where = str(path)
    try:
        key = serialization.load_pem_public_key(data)
    except (ValueError, UnsupportedAlgorithm):
        raise SigningError("a .pub file from keygen; not a PEM public key", where, field) from None
    if not isinstance(key, Ed25519PublicKey):
        raise SigningError("a .pub file from keygen; not an Ed25519 public key", where, field)
    return key
