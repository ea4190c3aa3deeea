"""A corpus of bad inputs, made at test time: every one must be refused with exit status 2 and
one line naming the file and the field, with no traceback and nothing written.

Most cases are mutations of the valid files the project ships (every sample build that loads,
the sample waivers and previous review): each leaf value of a build is replaced, line by line,
by values of the wrong type or by hostile quantity text, so the corpus grows with the samples.
The rest are made from nothing: special files in every place a file is read, files nested a
few thousand deep, files too large, bytes that are not UTF-8, keys holding escape sequences,
outputs that would land on an input, a key, a device or a folder.

A case is plain data (JSON), so a runner in another process can play it (``hostile_runner``).
"""

from __future__ import annotations

import json
import os
import re
import socket
from dataclasses import asdict, dataclass
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
SAMPLES = ROOT / "sample_builds"
RECORDS = SAMPLES / "records"

#: Quantity fields mutated per sample build: enough to cover every dimension in the samples.
QUANTITY_FIELDS_PER_SAMPLE = 8
#: Other leaf fields mutated per sample build.
OTHER_FIELDS_PER_SAMPLE = 12


@dataclass(frozen=True)
class Case:
    name: str
    argv: list[str]
    file: str  # the file the error line must name
    field: str | None  # text the field part must contain (None: any field)
    kind: str  # the corpus class, for the summary


# Values a quantity field must refuse, whatever its dimension. {n} is the sample's number,
# {u} its unit; each is TOML text for a basic string.
HOSTILE_QUANTITIES = {
    "leading plus": '"+{n} {u}"',
    "line break inside": '"{n}\\n{u}"',
    "tab inside": '"{n}\\t{u}"',
    "next-line character": '"{n} {u}\\u0085"',
    "Arabic-Indic digits": '"\\u0662\\u0664 {u}"',
    "bidi override": '"{n} \\u202e{u}"',
    "zero-width space": '"{n} {u}\\u200b"',
    "escape sequence": '"{n} \\u001b[31m{u}"',
    "not a number": '"nan {u}"',
    "infinite": '"1e999 {u}"',
    "logarithmic unit": '"{n} {u}/dB"',
    "a number, not text": "{n}",
}
HOSTILE_QUANTITY_ON_SCALE = {  # not for temperatures, which may be near zero or negative
    "subnormal magnitude": '"5e-324 {u}"',
    "temperature difference": '"{n} delta_degC"',
}
WRONG_TYPES = {
    "int": {
        "as text": '"7"',
        "as a fraction": "7.5",
        "as a switch": "true",
        "as a table": "{ x = 1 }",
    },
    "float": {"as text": '"0.5"', "as a switch": "true", "as an array": "[0.5]"},
    "bool": {"as yes": '"yes"', "as one": "1", "as off": '"off"'},
    "text": {"as a table": "{ x = 1 }", "as an array of tables": "[{ x = 1 }]"},
    "array": {"as a number": "7", "as a table": "{ x = 1 }"},
}
HOSTILE_KEYS = {
    "ANSI escape in a key": '"\\u001b[31mred\\u001b[0m"',
    "5000-character key": '"' + "k" * 5000 + '"',
    "next-line in a key": '"na\\u0085me"',
    "bidi override in a key": '"\\u202eeman"',
    "zero-width in a key": '"nam\\u200be"',
    "line break in a key": '"na\\nme"',
    "C1 control in a key": '"na\\u009bme"',
}
BAD_UTF8 = {
    "a lone 0xff": b"\xff",
    "an overlong slash": b"\xc0\xaf",
    "an encoded surrogate": b"\xed\xa0\x80",
    "a truncated sequence": b"\xe2\x82",
    "UTF-16 with its mark": "name".encode("utf-16"),
}
_LINE = re.compile(r"^(?P<key>[A-Za-z0-9_]+)\s*=\s*(?P<value>.+?)\s*(?:#.*)?$")
_QUANTITY = re.compile(r'^"(?P<n>-?[0-9.]+(?:e-?[0-9]+)?) (?P<u>[^"]+)"$')


def _kind(value: str) -> str | None:
    if _QUANTITY.match(value):
        return "quantity"
    if value in ("true", "false"):
        return "bool"
    if re.fullmatch(r"-?[0-9]+", value):
        return "int"
    if re.fullmatch(r"-?[0-9]+\.[0-9]+", value):
        return "float"
    if value.startswith('"'):
        return "text"
    if value.startswith("[") and value.endswith("]"):
        return "array"
    return None


def leaves(text: str) -> list[tuple[int, str, str, str]]:
    """(line number, field path, key, value) of each one-line ``key = value`` of a build."""
    found = []
    table, counts = "", {}
    for number, line in enumerate(text.split("\n")):
        header = re.fullmatch(r"\[\[?([A-Za-z0-9_.]+)\]\]?\s*(#.*)?", line.strip())
        if header:
            name = header.group(1)
            if line.strip().startswith("[["):
                counts[name] = counts.get(name, -1) + 1
            parts, path = name.split("."), ""
            for depth in range(len(parts)):
                prefix = ".".join(parts[: depth + 1])
                path = f"{path}.{parts[depth]}" if path else parts[depth]
                if prefix in counts:
                    path += f"[{counts[prefix]}]"
            table = path
            continue
        match = _LINE.match(line)
        if match and not table.startswith("extensions"):
            key, value = match["key"], match["value"]
            if value.count("[") == value.count("]"):
                found.append((number, f"{table}.{key}" if table else key, key, value))
    return found


def _valid_builds() -> list[Path]:
    from reviewer.errors import InputError
    from reviewer.loader import load_build

    good = []
    for path in sorted(SAMPLES.glob("*.toml")):
        try:
            load_build(path)
        except InputError:
            continue
        good.append(path)
    return good


def _replaced(text: str, number: int, key: str, value: str) -> str:
    lines = text.split("\n")
    lines[number] = f"{key} = {value}"
    return "\n".join(lines)


def _spread(items: list, count: int) -> list:
    """``count`` items spread evenly over ``items`` (deterministic)."""
    if len(items) <= count:
        return items
    step = len(items) / count
    return [items[int(i * step)] for i in range(count)]


class Corpus:
    """Writes the corpus's files under ``folder`` and lists its cases."""

    def __init__(self, folder: Path) -> None:
        self.folder = folder
        self.cases: list[Case] = []
        self.count = 0
        folder.mkdir(parents=True, exist_ok=True)

    def path(self, suffix: str) -> Path:
        self.count += 1
        return self.folder / f"c{self.count:04d}{suffix}"

    def write(self, suffix: str, content: str | bytes) -> Path:
        path = self.path(suffix)
        path.write_bytes(content.encode("utf-8") if isinstance(content, str) else content)
        return path

    def add(
        self, kind: str, name: str, argv: list[str], file: str | Path, field: str | None
    ) -> None:
        self.cases.append(Case(f"{kind}: {name}", [str(a) for a in argv], str(file), field, kind))

    # -- the classes ---------------------------------------------------------------------

    def build_mutations(self) -> None:
        for sample in _valid_builds():
            text = sample.read_text("utf-8")
            found = leaves(text)
            quantities = [leaf for leaf in found if _kind(leaf[3]) == "quantity"]
            others = [leaf for leaf in found if _kind(leaf[3]) not in (None, "quantity")]
            for number, field, key, value in _spread(quantities, QUANTITY_FIELDS_PER_SAMPLE):
                match = _QUANTITY.match(value)
                assert match is not None
                n, unit = match["n"], match["u"]
                hostile = dict(HOSTILE_QUANTITIES)
                if "deg" not in unit and unit not in ("K", "kelvin"):
                    hostile.update(HOSTILE_QUANTITY_ON_SCALE)
                for what, template in hostile.items():
                    bad = template.format(n=n, u=unit)
                    path = self.write(".toml", _replaced(text, number, key, bad))
                    self.add(
                        "bad quantity",
                        f"{sample.stem} {field} {what}",
                        ["review", path],
                        path,
                        field,
                    )
            for number, field, key, value in _spread(others, OTHER_FIELDS_PER_SAMPLE):
                for what, bad in WRONG_TYPES[_kind(value)].items():
                    path = self.write(".toml", _replaced(text, number, key, bad))
                    self.add(
                        "wrong type", f"{sample.stem} {field} {what}", ["review", path], path, key
                    )
            lines = text.split("\n")
            first_table = next(i for i, line in enumerate(lines) if line.startswith("["))
            for what, key in HOSTILE_KEYS.items():
                mutated = [*lines[: first_table + 1], f"{key} = 1", *lines[first_table + 1 :]]
                path = self.write(".toml", "\n".join(mutated))
                self.add(
                    "control characters in keys",
                    f"{sample.stem} {what}",
                    ["review", path],
                    path,
                    None,
                )

    def structure(self) -> None:
        """Depth bombs, huge files, bad UTF-8 and empty files as build, profile and waivers."""
        bombs = {
            "nested arrays": "a = " + "[" * 5000 + "]" * 5000 + "\n",
            "nested inline tables": "a = " + "{ b = " * 3000 + "1" + " }" * 3000 + "\n",
            "dotted keys": "a" + ".a" * 100_000 + " = 1\n",
            "dotted header": "[a" + ".a" * 100_000 + "]\nx = 1\n",
            "array-of-tables header": "[[a" + ".a" * 5000 + "]]\nx = 1\n",
            "nested arrays of inline tables": "a = " + "[{ b = " * 2000 + "1" + "}]" * 2000 + "\n",
        }
        build = self.write(".toml", (SAMPLES / "quayside-commuter.toml").read_bytes())
        roles = {
            "build": lambda p: ["review", p],
            "profile": lambda p: ["review", build, "--profile", p],
            "waivers": lambda p: ["review", build, "--waivers", p],
        }
        for role, argv in roles.items():
            for what, text in bombs.items():
                path = self.write(".toml", text)
                self.add("nesting bombs", f"{role}: {what}", argv(path), path, "(file)")
            for what, raw in BAD_UTF8.items():
                path = self.write(".toml", b'[vehicle]\nname = "' + raw + b'"\n')
                self.add("bad UTF-8", f"{role}: {what}", argv(path), path, "(file)")
            path = self.write(".toml", "# " + "x" * (1024 * 1024) + "\n")
            self.add("huge files", f"{role}: just over 1 MiB", argv(path), path, "(file)")
            path = self.path(".toml")
            with open(path, "wb") as sparse:
                sparse.truncate(8 * 1024**3)  # 8 GiB that take no room on the disk
            self.add("huge files", f"{role}: an 8 GiB sparse file", argv(path), path, "(file)")
            path = self.write(".toml", '[vehicle]\nname = "x\x00y"\n')
            self.add(
                "control characters in text", f"{role}: a NUL byte", argv(path), path, "(file)"
            )
        for what, text in {"empty": "", "white space only": " \n\t\n"}.items():
            path = self.write(".toml", text)
            self.add("empty files", f"build: {what}", ["review", path], path, "(file)")

    def special_files(self) -> None:
        """FIFOs, sockets, folders, devices and links in every place firstride reads a file."""
        special = self.folder / "special"
        special.mkdir(exist_ok=True)
        fifo = special / "a.fifo"
        os.mkfifo(fifo)
        sock = special / "a.sock"
        server = socket.socket(socket.AF_UNIX)
        server.bind(str(sock))
        server.close()  # the socket file stays
        (special / "to-fifo").symlink_to(fifo)
        (special / "dangling").symlink_to(special / "nothing-here")
        targets = {
            "a FIFO": fifo,
            "a socket": sock,
            "a folder": special,
            "/dev/zero": Path("/dev/zero"),
            "/dev/urandom": Path("/dev/urandom"),
            "/dev/null": Path("/dev/null"),
            "a link to a FIFO": special / "to-fifo",
            "a dangling link": special / "dangling",
            "a missing file": special / "missing.toml",
        }
        build = self.write(".toml", (SAMPLES / "quayside-commuter.toml").read_bytes())
        review = self.folder / "review.md"
        key = self.folder / "signer.key"
        for what, target in targets.items():
            child = self.write(".toml", f'[profile]\nname = "child"\nextends = "{target}"\n')
            plays = [
                ("build", ["review", target], target, "(file)"),
                ("profile", ["review", build, "--profile", target], target, "(file)"),
                ("waivers", ["review", build, "--waivers", target], target, "(file)"),
                ("previous review", ["review", build, "--since", target], target, "(file)"),
                (
                    "extended profile",
                    ["review", build, "--profile", child],
                    child,
                    "profile.extends",
                ),
                ("review to verify", ["verify", target, "--integrity-only"], target, "(file)"),
                ("build to verify", ["verify", review, "--build", target], target, "--build"),
                ("trusted key", ["verify", review, "--trust", target], target, "--trust"),
                (
                    "review to sign",
                    ["sign", target, "--key", key, "--signer", "A", "--role", "b"],
                    target,
                    "(file)",
                ),
                (
                    "signing key",
                    ["sign", review, "--key", target, "--signer", "A", "--role", "b"],
                    target,
                    "--key",
                ),
            ]
            if what == "a folder":  # several builds or a folder is a fleet review: not a build
                plays = plays[1:]
            for role, argv, file, field in plays:
                self.add("special files", f"{role}: {what}", argv, file, field)

    def profiles(self) -> None:
        build = self.write(".toml", (SAMPLES / "quayside-commuter.toml").read_bytes())
        a, b = self.path(".toml"), self.path(".toml")
        a.write_text(f'[profile]\nname = "a"\nextends = "{b.name}"\n')
        b.write_text(f'[profile]\nname = "b"\nextends = "{a.name}"\n')
        self.add(
            "profiles", "an extends cycle", ["review", build, "--profile", a], b, "profile.extends"
        )
        bad = {
            "a table that is a number": ("limits = 5\n", "limits"),
            "a limit with no source": (
                '[limits.speed.max_speed.adult]\nvalue = "25 km/h"\n',
                "limits.speed.max_speed.adult.source",
            ),
            "a limit with a hostile quantity": (
                '[limits.speed.max_speed.adult]\nvalue = "+25 km/h"\nsource = "x"\nstatus = "published"\n',
                "limits.speed.max_speed.adult",
            ),
            "an unknown top-level table": ("[limitz]\n", "limitz"),
        }
        for what, (text, field) in bad.items():
            path = self.write(".toml", '[profile]\nname = "p"\nextends = "default"\n' + text)
            self.add("profiles", what, ["review", build, "--profile", path], path, field)

    def waivers(self) -> None:
        source = next(iter(sorted(RECORDS.glob("*waivers*.toml"))), None)
        if source is None:
            return
        text = source.read_text("utf-8")
        build = self.write(".toml", (SAMPLES / "quayside-commuter.toml").read_bytes())
        swaps = {
            "a date as text": ("date", '"2026-11-30"'),
            "a date as a number": ("date", "0"),
            "a rule as a number": ("rule", "5"),
            "a justification of spaces": ("justification", '"    "'),
            "a bidi override in a justification": ("justification", '"ok \\u202eeno"'),
            "an empty acceptor": ("accepted_by", '""'),
            "a subject as a table": ("subject", "{ x = 1 }"),
        }
        for what, (key, value) in swaps.items():
            mutated = re.sub(
                rf"(?m)^{key} = .*$", lambda _, line=f"{key} = {value}": line, text, count=1
            )
            path = self.write(".toml", mutated)
            self.add("waivers", what, ["review", build, "--waivers", path], path, key)
        for what, body, field in (
            ("waiver as a number", "waiver = 5\n", "waiver"),
            ("an unknown key", text.replace("[[waiver]]", "[[waiver]]\nreason = 1", 1), "reason"),
        ):
            path = self.write(".toml", body)
            self.add("waivers", what, ["review", build, "--waivers", path], path, field)

    def previous_reviews(self) -> None:
        source = next(iter(sorted(RECORDS.glob("*.json"))), None)
        if source is None:
            return
        good = json.loads(source.read_text("utf-8"))
        build = self.write(".toml", (SAMPLES / "quayside-commuter.toml").read_bytes())

        def changed(path: tuple, value: object) -> object:
            data = json.loads(json.dumps(good))
            target = data
            for part in path[:-1]:
                target = target[part]
            target[path[-1]] = value
            return data

        shapes = {
            "an array": ([], "format"),
            "another format": (changed(("format",), "x"), "format"),
            "another version": (changed(("format_version",), 99), "format_version"),
            "findings as an object": (changed(("findings",), {}), "findings"),
            "a finding as a number": (changed(("findings", 0), 1), "findings[0]"),
            "a rule id as a number": (
                changed(("findings", 0, "rule_id"), 5),
                "findings[0].rule_id",
            ),
            "an unknown severity": (
                changed(("findings", 0, "severity"), "great"),
                "findings[0].severity",
            ),
            "measured as text": (changed(("findings", 0, "measured"), "x"), "findings[0].measured"),
            "a measured value as text": (
                changed(("findings", 0, "measured"), {"value": "x", "unit": "V"}),
                "findings[0].measured.value",
            ),
            "a measured value of NaN": (
                changed(("findings", 0, "measured"), {"value": float("nan"), "unit": "V"}),
                "findings[0].measured.value",
            ),
            "build as an array": (changed(("build",), []), "build"),
            "build fields as an array": (changed(("build", "fields"), []), "build.fields"),
            "a build fingerprint as a number": (changed(("build", "sha256"), 5), "build.sha256"),
            "a verdict as a number": (changed(("verdict",), 5), "verdict"),
        }
        for what, (data, field) in shapes.items():
            path = self.write(".json", json.dumps(data))
            self.add("previous reviews", what, ["review", build, "--since", path], path, field)
        raw = json.dumps(good)
        for what, text in {
            "not JSON": "this is not JSON",
            "cut in half": raw[: len(raw) // 2],
            "trailing text": raw + " and more",
            "nested 100000 deep": "[" * 100_000 + "]" * 100_000,
            "nested objects": '{"a":' * 50_000 + "1" + "}" * 50_000,
        }.items():
            path = self.write(".json", text)
            self.add("previous reviews", what, ["review", build, "--since", path], path, "(file)")
        path = self.write(".json", raw.encode() + b"\xff")
        self.add(
            "bad UTF-8",
            "previous review: a lone 0xff",
            ["review", build, "--since", path],
            path,
            "(file)",
        )

    def outputs(self) -> None:
        """Outputs that would land on an input, a key, a device, a FIFO, a socket or a folder."""
        from reviewer.signing_keys import generate_key_pair

        special = self.folder / "special"
        build = self.write(".toml", (SAMPLES / "quayside-commuter.toml").read_bytes())
        profile = self.write(".toml", '[profile]\nname = "p"\nextends = "default"\n')
        key = self.folder / "signer.key"
        if not key.exists():
            generate_key_pair(key, self.folder / "signer.pub")
        review = self.folder / "review.md"
        hard_link = self.path(".toml")
        os.link(build, hard_link)
        targets = {
            "the build": build,
            "the build, spelt another way": f"{self.folder}/./{build.name}",
            "a hard link to the build": hard_link,
            "the profile": profile,
            "a FIFO": special / "a.fifo",
            "a socket": special / "a.sock",
            "a folder": special,
            "a link to a FIFO": special / "to-fifo",
            "a dangling link": special / "dangling",
            "a file in a missing folder": special / "no-such-folder" / "r.md",
            "a private key": key,
        }
        for what, target in targets.items():
            argv = ["review", build, "--profile", profile, "-o", target]
            self.add("outputs", f"review -o {what}", argv, Path(target), "(output)")
        for what, target in {
            "the private key": key,
            "a FIFO": special / "a.fifo",
            "a folder": special,
        }.items():
            argv = [
                "sign",
                review,
                "--key",
                key,
                "--signer",
                "A. Builder",
                "--role",
                "builder",
                "-o",
                target,
            ]
            self.add("outputs", f"sign -o {what}", argv, target, "(output)")

    def signer_names(self) -> None:
        key = self.folder / "signer.key"
        review = self.folder / "review.md"
        names = {
            "a zero-width space": "A.\u200bBuilder",
            "a bidi override": "\u202eredliuB",
            "Latin and Cyrillic": "P\u0430ul",
            "an escape sequence": "A \x1b[31mB",
            "a next-line character": "A\u0085B",
            "two spaces": "A.  Builder",
            "81 characters": "A" * 81,
            "only spaces": "   ",
            "a Hangul filler": "A\u3164B",
        }
        for what, name in names.items():
            for option in ("--signer", "--role"):
                others = {"--signer": "A. Builder", "--role": "builder"}
                others[option] = name
                argv = [
                    "sign",
                    review,
                    "--key",
                    key,
                    "--signer",
                    others["--signer"],
                    "--role",
                    others["--role"],
                ]
                self.add("signer names", f"{option} with {what}", argv, review, option)
        not_a_review = self.write(".md", "# Just notes\n\nNo fingerprint here.\n")
        argv = ["sign", not_a_review, "--key", key, "--signer", "A", "--role", "b"]
        self.add("signer names", "a file that is not a review", argv, not_a_review, "signatures")


def prepare(folder: Path) -> list[Case]:
    """Write every file of the corpus under ``folder`` and return its cases."""
    from reviewer.cli import main
    from reviewer.signing_keys import generate_key_pair

    corpus = Corpus(folder)
    generate_key_pair(folder / "signer.key", folder / "signer.pub")
    import contextlib
    import io

    with contextlib.redirect_stdout(io.StringIO()), contextlib.redirect_stderr(io.StringIO()):
        main(["review", str(SAMPLES / "quayside-commuter.toml"), "-o", str(folder / "review.md")])
    corpus.build_mutations()
    corpus.structure()
    corpus.special_files()
    corpus.profiles()
    corpus.waivers()
    corpus.previous_reviews()
    corpus.outputs()
    corpus.signer_names()
    return corpus.cases


def as_json(cases: list[Case]) -> str:
    return json.dumps([asdict(case) for case in cases])
