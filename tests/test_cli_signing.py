"""The round trip a club runs: keygen -> review -> sign -> sign -> verify, from the CLI."""

from __future__ import annotations

from pathlib import Path

from reviewer.cli import main

from .conftest import SAMPLES

GO = SAMPLES / "quayside-commuter.toml"


def _signed_review(tmp_path: Path) -> Path:
    assert main(["keygen", str(tmp_path / "builder")]) == 0
    assert main(["keygen", str(tmp_path / "officer")]) == 0
    review = tmp_path / "review.md"
    assert main(["review", str(GO), "-o", str(review)]) == 0
    key = str(tmp_path / "builder.key")
    assert (
        main(["sign", str(review), "--key", key, "--signer", "A. Builder", "--role", "builder"])
        == 0
    )
    key = str(tmp_path / "officer.key")
    assert (
        main(
            [
                "sign",
                str(review),
                "--key",
                key,
                "--signer",
                "B. Officer",
                "--role",
                "safety officer",
            ]
        )
        == 0
    )
    return review


def test_round_trip_verifies_with_trusted_keys(tmp_path: Path, capsys) -> None:
    review = _signed_review(tmp_path)
    trust = ["--trust", str(tmp_path / "builder.pub"), "--trust", str(tmp_path / "officer.pub")]
    assert main(["verify", str(review), "--build", str(GO), "--require", "2", *trust]) == 0
    out = capsys.readouterr().out
    assert "signature 1: valid" in out and "signature 2: valid" in out


def test_untrusted_key_fails(tmp_path: Path, capsys) -> None:
    review = _signed_review(tmp_path)
    assert main(["verify", str(review), "--trust", str(tmp_path / "builder.pub")]) == 1
    assert "key not in the trusted keys" in capsys.readouterr().out


def test_other_build_fails(tmp_path: Path, capsys) -> None:
    review = _signed_review(tmp_path)
    other = SAMPLES / "allotment-cargo-trike.toml"
    assert main(["verify", str(review), "--build", str(other)]) == 1
    assert "build file differs" in capsys.readouterr().out


def test_missing_signatures_are_counted(tmp_path: Path) -> None:
    review = _signed_review(tmp_path)
    assert main(["verify", str(review), "--require", "3"]) == 1


def test_unsigned_review_fails(tmp_path: Path) -> None:
    review = tmp_path / "r.md"
    main(["review", str(GO), "-o", str(review)])
    assert main(["verify", str(review)]) == 1


def test_garbled_key_is_one_line(tmp_path: Path, capsys) -> None:
    review = tmp_path / "r.md"
    main(["review", str(GO), "-o", str(review)])
    bad = tmp_path / "bad.key"
    bad.write_text("not a key")
    capsys.readouterr()
    code = main(["sign", str(review), "--key", str(bad), "--signer", "x", "--role", "y"])
    err = capsys.readouterr().err.strip()
    assert code == 2
    assert len(err.splitlines()) == 1 and "not a PEM private key" in err
    assert "Signatures" not in review.read_text()
