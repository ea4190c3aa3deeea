"""Which signer names and roles a signature block may carry.

A name in a signature block is what a reader looks at to decide whose signature it is, so it
must read as exactly one thing. It is NFKC-normalised when signed (full-width letters,
ligatures and other compatibility forms become their plain form) and verification accepts only
the normalised spelling. It must then be:

- at most :data:`MAX_NAME_LENGTH` characters, with no white space at either end and no two
  spaces in a row;
- free of control, format, bidi, zero-width and other invisible characters (``Cc``, ``Cf``,
  ``Cs``, ``Co``, ``Cn``, line and paragraph separators, Hangul fillers, variation selectors);
- written in one script: every letter's Unicode name starts with the same script word (LATIN,
  CYRILLIC, GREEK, ARABIC...), so ``Pаul`` with a Cyrillic ``а`` is refused. Digits, spaces,
  punctuation and combining marks go with any script; Japanese may mix CJK ideographs with
  Hiragana and Katakana, Korean CJK ideographs with Hangul, as those languages are written.

This cannot tell a name written wholly in another script that looks Latin from a Latin one;
what proves who signed is the key, which ``firstride verify --trust`` checks.
"""

from __future__ import annotations

import re
import unicodedata

MAX_NAME_LENGTH = 80
_HIDDEN_CATEGORIES = frozenset({"Cc", "Cf", "Cs", "Co", "Cn", "Zl", "Zp"})
#: Letters or marks that show as nothing.
_INVISIBLE = frozenset("\u115f\u1160\u3164\uffa0\u2800\u034f\u17b4\u17b5\u180e")
_MIXES = (
    frozenset({"CJK", "HIRAGANA", "KATAKANA"}),  # Japanese
    frozenset({"CJK", "HANGUL"}),  # Korean
)
#: Markdown specials a name is written with a backslash before, and HTML's three entities.
_BACKSLASHED = frozenset("\\`*_{}[]#|~!")
_ENTITIES = {"<": "&lt;", ">": "&gt;", "&": "&amp;"}
_UNESCAPE = re.compile(r"\\(.)|&(lt|gt|amp);")


def escaped(value: str) -> str:
    """A name or role as a signature block writes it: Markdown specials backslashed, ``<``,
    ``>`` and ``&`` as entities, so the block renders as the text and nothing else."""
    return "".join("\\" + c if c in _BACKSLASHED else _ENTITIES.get(c, c) for c in value)


def read_name(field: str, shown: str) -> str:
    """Undo :func:`escaped`, accepting only the one spelling it writes of an acceptable name;
    ValueError names the field and says why not."""
    entities = {"lt": "<", "gt": ">", "amp": "&"}
    value = _UNESCAPE.sub(lambda m: m.group(1) or entities[m.group(2)], shown)
    problem = name_problem(value)
    if problem or escaped(value) != shown:
        raise ValueError(f"{field} {problem or 'is not escaped as signing writes it'}")
    return value


def normalised(value: str) -> str:
    """The spelling a name is signed under: NFKC, outer white space removed."""
    return unicodedata.normalize("NFKC", value).strip()


def script_of(char: str) -> str | None:
    """The script word of a letter's Unicode name (``LATIN``, ``CYRILLIC``); None for a
    character that goes with any script (digits, punctuation, marks, spaces)."""
    if not unicodedata.category(char).startswith("L"):
        return None
    name = unicodedata.name(char, "")
    word = name.split(" ", 1)[0]
    if word in ("FULLWIDTH", "HALFWIDTH"):  # NFKC leaves only a few of these
        word = name.split(" ", 2)[1]
    return word or None


def name_problem(value: str) -> str | None:
    """Why ``value`` cannot be a signer's name or role, or None when it can."""
    if not value:
        return "is empty"
    if len(value) > MAX_NAME_LENGTH:
        return f"is longer than {MAX_NAME_LENGTH} characters"
    if value != value.strip():
        return "starts or ends with white space"
    if unicodedata.normalize("NFKC", value) != value:
        return "is not in NFKC normal form"
    for char in value:
        code = ord(char)
        if (
            unicodedata.category(char) in _HIDDEN_CATEGORIES
            or char in _INVISIBLE
            or 0xFE00 <= code <= 0xFE0F
            or 0xE0100 <= code <= 0xE01EF
        ):
            return f"contains a control or invisible character (U+{code:04X})"
        if char.isspace() and char != " ":
            return f"contains white space other than a plain space (U+{code:04X})"
    if "  " in value:
        return "contains two spaces in a row"
    scripts = {script for script in map(script_of, value) if script is not None}
    if len(scripts) > 1 and not any(scripts <= mix for mix in _MIXES):
        return "mixes letters of several scripts (" + ", ".join(sorted(scripts)).lower() + ")"
    return None
