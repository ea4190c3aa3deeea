"""The build file's JSON Schema documents every field: an editor's hover help or a generated form
shows what the field is, where to find it and its unit; every quantity and free value carries an
example of its own (a switch rise time reads "40 ns", not a generic duration); every enumeration
lists its values and its field says what each means. A build file whose first line is a
``#:schema`` comment for the editor still reviews."""

from __future__ import annotations

import re
import typing
from collections import defaultdict
from collections.abc import Iterator
from pathlib import Path
from typing import Annotated, Any

import pytest
from pydantic import BaseModel, ConfigDict, TypeAdapter

import reviewer.build as build_models
from reviewer import units as u
from reviewer.build import Build, build_json_schema
from reviewer.cli import main
from reviewer.quantity_text import QUANTITY_RE

from .conftest import SAMPLES

SCHEMA = build_json_schema()
QUANTITY_PATTERN = re.sub(r"\(\?P<\w+>", "(", QUANTITY_RE.pattern)
#: The one example per dimension a quantity field shows when it gives none of its own.
DIMENSIONS = [d for d in vars(u).values() if isinstance(d, u.Dimension)]
GENERIC_EXAMPLES = {d.example for d in DIMENSIONS}
#: Quantity fields of different names whose example is the same thing, with the reason.
SAME_THING: dict[frozenset[str], str] = {}


def _resolve(node: dict[str, Any]) -> dict[str, Any]:
    while "$ref" in node:
        ref = node["$ref"]
        assert ref.startswith("#/$defs/"), ref
        node = SCHEMA["$defs"][ref.removeprefix("#/$defs/")]
    return node


def _objects() -> Iterator[tuple[str, dict[str, Any]]]:
    """Every object schema reachable from the root, by the dotted path it is first met at."""
    seen: set[int] = set()
    stack: list[tuple[str, dict[str, Any]]] = [("", SCHEMA)]
    while stack:
        path, node = stack.pop()
        node = _resolve(node)
        if id(node) in seen:
            continue
        seen.add(id(node))
        if "properties" in node:
            yield path, node
            for name, prop in node["properties"].items():
                stack.append((f"{path}{name}.", prop))
        if isinstance(node.get("items"), dict):
            stack.append((path, node["items"]))


PROPERTIES = [
    (f"{path}{name}", prop)
    for path, node in _objects()
    for name, prop in node["properties"].items()
]


def _is_quantity(prop: dict[str, Any]) -> bool:
    return prop.get("type") == "string" and prop.get("pattern") == QUANTITY_PATTERN


def _enum_values(prop: dict[str, Any]) -> list[str] | None:
    target = _resolve(prop)
    return target.get("enum")


def test_the_walk_reaches_every_model() -> None:
    reached = {node.get("title") for _, node in _objects()}
    assert set(SCHEMA["$defs"]) - {"firstride build file"} <= reached | {
        name for name, d in SCHEMA["$defs"].items() if "enum" in d
    }
    assert len(PROPERTIES) > 150


@pytest.mark.parametrize("path,prop", PROPERTIES, ids=[p for p, _ in PROPERTIES])
def test_every_property_has_a_description(path: str, prop: dict[str, Any]) -> None:
    assert prop.get("description", "").strip(), f"{path} has no description"


@pytest.mark.parametrize("path,prop", PROPERTIES, ids=[p for p, _ in PROPERTIES])
def test_every_quantity_and_free_value_has_an_example_of_its_own(
    path: str, prop: dict[str, Any]
) -> None:
    target = _resolve(prop)
    if target.get("type") in ("boolean", "object") or "enum" in target:
        return
    if target.get("type") == "array" and _resolve(target["items"]).get("type") == "object":
        return
    examples = prop.get("examples")
    assert examples, f"{path} has no example"
    if _is_quantity(prop):
        assert not set(examples) <= GENERIC_EXAMPLES, (
            f"{path} shows only its dimension's generic example {examples}: give one of its own"
        )


def test_quantity_fields_of_different_names_do_not_share_an_example() -> None:
    names: dict[tuple[str, ...], set[str]] = defaultdict(set)
    for path, prop in PROPERTIES:
        if _is_quantity(prop) and prop.get("examples"):
            names[tuple(prop["examples"])].add(path.rsplit(".", 1)[-1])
    shared = {
        examples: sorted(fields)
        for examples, fields in names.items()
        if len(fields) > 1 and frozenset(fields) not in SAME_THING
    }
    assert not shared, f"one example list for different fields: {shared}"


def test_every_quantity_description_names_its_unit() -> None:
    """An optional quantity's type adds "a unit like V"; a required one says "in V" itself."""
    symbols = sorted({d.unit for d in DIMENSIONS} | {"%"}, key=len, reverse=True)
    units = "|".join(map(re.escape, symbols))
    for path, prop in PROPERTIES:
        if _is_quantity(prop):
            assert re.search(rf"(a unit like|\bin) ({units})(?![\w/*])", prop["description"]), (
                f"{path}: the description does not say the unit: {prop['description']!r}"
            )


@pytest.mark.parametrize("path,prop", PROPERTIES, ids=[p for p, _ in PROPERTIES])
def test_every_enumeration_lists_its_values_and_says_what_each_means(
    path: str, prop: dict[str, Any]
) -> None:
    values = _enum_values(prop)
    if values is None:
        return
    assert values and all(isinstance(v, str) and v for v in values), path
    title = _resolve(prop).get("title")
    kind = getattr(build_models, title, None) if title else None
    if kind is not None:
        assert values == [member.value for member in kind], path
    description = prop["description"]
    for value in values:
        assert re.search(rf"(?<![\w-]){re.escape(value)}(?![\w-])", description), (
            f"{path}: the description does not say what {value!r} means: {description!r}"
        )


def _models(model: type[BaseModel] = Build) -> Iterator[type[BaseModel]]:
    seen: set[type[BaseModel]] = set()
    stack = [model]
    while stack:
        current = stack.pop()
        if current in seen:
            continue
        seen.add(current)
        yield current
        for field in current.model_fields.values():
            kinds = [field.annotation]
            while kinds:
                kind = kinds.pop()
                if isinstance(kind, type) and issubclass(kind, BaseModel):
                    stack.append(kind)
                kinds.extend(typing.get_args(kind))


FIELDS = [
    (f"{model.__name__}.{name}", field)
    for model in _models()
    for name, field in model.model_fields.items()
    if field.examples
]


@pytest.mark.parametrize("where,field", FIELDS, ids=[w for w, _ in FIELDS])
def test_every_example_is_a_valid_value_of_its_field(where: str, field: Any) -> None:
    kind = Annotated[field.annotation, *field.metadata] if field.metadata else field.annotation
    adapter = TypeAdapter(kind, config=ConfigDict(arbitrary_types_allowed=True))
    for example in field.examples:
        adapter.validate_python(example)


def test_a_build_file_that_names_its_schema_on_the_first_line_still_reviews(
    tmp_path: Path, capsys
) -> None:
    sample = SAMPLES / "quayside-commuter.toml"
    pointed = tmp_path / sample.name
    pointed.write_text(
        "#:schema ./firstride.schema.json\n" + sample.read_text(encoding="utf-8"),
        encoding="utf-8",
    )
    plain_out, pointed_out = tmp_path / "plain.md", tmp_path / "pointed.md"
    assert main(["review", str(sample), "-o", str(plain_out)]) == 0
    assert main(["review", str(pointed), "-o", str(pointed_out)]) == 0
    assert "verdict go" in capsys.readouterr().err

    def body(review: Path) -> list[str]:  # the file's path and fingerprint differ, as they should
        lines = review.read_text(encoding="utf-8").splitlines()
        return [line for line in lines if not line.startswith(("| Build file |", "| Build finger"))]

    assert body(pointed_out) == body(plain_out)
