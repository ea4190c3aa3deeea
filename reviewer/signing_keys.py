"""Ed25519 key pairs for signing reviews: made, written owner-only, loaded with clear errors."""

from __future__ import annotations

import hashlib
import os
from pathlib import Path

from cryptography.exceptions import UnsupportedAlgorithm
from cryptography.hazmat.primitives import serialization
from cryptography.hazmat.primitives.asymmetric.ed25519 import Ed25519PrivateKey, Ed25519PublicKey

MAX_KEY_FILE_BYTES = 64 * 1024


class SigningError(ValueError):
    """A key, review or signature problem, stated in one line for the command-line edge."""


def public_key_bytes(public_key: Ed25519PublicKey) -> bytes:
    return public_key.public_bytes(serialization.Encoding.Raw, serialization.PublicFormat.Raw)


def key_fingerprint(public_key: Ed25519PublicKey) -> str:
    """``sha256:`` and the hex SHA-256 of the raw 32-byte public key."""
    return "sha256:" + hashlib.sha256(public_key_bytes(public_key)).hexdigest()


def generate_key_pair(private_path: Path | str, public_path: Path | str) -> str:
    """Write a new key pair and return its fingerprint; never overwrites an existing file.

    The private key file gets mode 0o600 in the call that creates it, so it is never readable
    by others, not even for an instant.
    """
    private_path, public_path = Path(private_path), Path(public_path)
    if private_path.resolve() == public_path.resolve():
        raise SigningError("the private and public key files must be different paths")
    for path in (private_path, public_path):
        if path.exists() or path.is_symlink():
            raise SigningError(f"{path}: already exists; refusing to overwrite a key file")
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
    try:
        descriptor = os.open(path, os.O_WRONLY | os.O_CREAT | os.O_EXCL, mode)
    except FileExistsError:
        raise SigningError(f"{path}: already exists; refusing to overwrite a key file") from None
    except OSError as error:
        raise SigningError(f"{path}: cannot create the key file: {error.strerror}") from None
    try:
        with os.fdopen(descriptor, "wb") as handle:
            handle.write(data)
    except OSError as error:
        path.unlink(missing_ok=True)
        raise SigningError(f"{path}: cannot write the key file: {error.strerror}") from None


def _read_key_file(path: Path | str) -> bytes:
    try:
        with open(path, "rb") as handle:
            data = handle.read(MAX_KEY_FILE_BYTES + 1)
    except OSError as error:
        raise SigningError(f"{path}: cannot read the key file: {error.strerror}") from None
    if len(data) > MAX_KEY_FILE_BYTES:
        raise SigningError(f"{path}: too large to be a key file")
    return data


def load_private_key(path: Path | str) -> Ed25519PrivateKey:
    data = _read_key_file(path)
    try:
        key = serialization.load_pem_private_key(data, password=None)
    except TypeError:
        raise SigningError(
            f"{path}: the private key is encrypted; use an unencrypted key"
        ) from None
    except (ValueError, UnsupportedAlgorithm):
        raise SigningError(f"{path}: not a PEM private key") from None
    if not isinstance(key, Ed25519PrivateKey):
        raise SigningError(f"{path}: not an Ed25519 private key")
    return key


def load_public_key(path: Path | str) -> Ed25519PublicKey:
    data = _read_key_file(path)
    try:
        key = serialization.load_pem_public_key(data)
    except (ValueError, UnsupportedAlgorithm):
        raise SigningError(f"{path}: not a PEM public key") from None
    if not isinstance(key, Ed25519PublicKey):
        raise SigningError(f"{path}: not an Ed25519 public key")
    return key
